/* comparison_md.c - the comparison in words: summary.md's section and the
 * text table printed by compare and score.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <string.h>

#include "../common/numfmt.h"
#include "report_impl.h"
#include "vecgauge/compare.h"

/* A p-value for people: two significant digits, "<0.0001" below that. */
static const char *format_p(double p, char buf[32]) {
    if (isnan(p))
        snprintf(buf, 32, "n/a");
    else if (p < 1e-4)
        snprintf(buf, 32, "<0.0001");
    else
        snprintf(buf, 32, "%.2g", p);
    return buf;
}

/* A signed difference with 3 decimals. */
static const char *format_diff(double d, char buf[32]) {
    if (isnan(d))
        snprintf(buf, 32, "n/a");
    else
        snprintf(buf, 32, "%+.3f", d);
    return buf;
}

/* "[low, high]" or "" without an interval. */
static const char *format_ci(const vg_comparison *r, char buf[80]) {
    buf[0] = '\0';
    if (*r->interval) snprintf(buf, 80, "[%+.3f, %+.3f]", r->diff_low, r->diff_high);
    return buf;
}

static const char *test_name(const char *test) {
    if (strcmp(test, "bootstrap") == 0) return "paired bootstrap";
    if (strcmp(test, "steiger-z1-bw") == 0) return "Steiger's Z1* (Spearman)";
    if (strcmp(test, "steiger-z1") == 0) return "Steiger's Z1*";
    if (strcmp(test, "mcnemar-exact") == 0) return "McNemar exact";
    if (strcmp(test, "pair-bootstrap") == 0) return "pair bootstrap";
    return "none";
}

/* The other test of the row, as "name p", or "" when there is none. */
static const char *second_opinion(const vg_comparison *r, char buf[64]) {
    char p[32];
    buf[0] = '\0';
    if (r->task == VG_TASK_SIMILARITY && strncmp(r->test, "steiger-z1", 10) != 0 &&
        !isnan(r->p_steiger))
        snprintf(buf, 64, "Steiger p %s", format_p(r->p_steiger, p));
    else if (r->task == VG_TASK_SIMILARITY && strcmp(r->test, "bootstrap") != 0 &&
             !isnan(r->p_bootstrap))
        snprintf(buf, 64, "bootstrap p %s", format_p(r->p_bootstrap, p));
    else if (r->task == VG_TASK_ANALOGY && strcmp(r->test, "mcnemar-exact") != 0 &&
             !isnan(r->p_mcnemar))
        snprintf(buf, 64, "McNemar p %s", format_p(r->p_mcnemar, p));
    else if (r->task == VG_TASK_ANALOGY && strcmp(r->test, "bootstrap") != 0 &&
             !isnan(r->p_bootstrap))
        snprintf(buf, 64, "bootstrap p %s", format_p(r->p_bootstrap, p));
    return buf;
}

/* Sentence on the items of suite k: how many were compared and dropped,
 * and which sets caused the drop. */
static void items_note(const vg_comparisons *c, size_t k, FILE *fp) {
    const vg_comparison *first = NULL;
    for (size_t i = 0; i < c->n_rows && !first; i++)
        if (c->rows[i].suite == k) first = &c->rows[i];
    if (!first) return;
    const char *unit = c->tasks[k] == VG_TASK_SIMILARITY ? "pairs" : "questions";
    fputs("- ", fp);
    vg_md_cell(fp, c->suite_ids[k]);
    if (c->options.items == VG_COMPARE_AS_IS) {
        fprintf(fp, ": %zu %s; each set on the %s it covers (", c->n_items[k], unit, unit);
        int sep = 0;
        for (size_t s = 0; s < c->n_sets; s++) {
            if (!vg_comparisons_score(c, k, first->metric, s)) continue;
            fprintf(fp, "%s", sep++ ? ", " : "");
            vg_md_cell(fp, c->labels[s]);
            fprintf(fp, " %zu", c->covered[k * c->n_sets + s]);
        }
        fputs(").\n", fp);
        return;
    }
    fprintf(fp, ": %zu %s, compared on the %zu every set covers", c->n_items[k], unit,
            first->n_compared);
    if (first->n_dropped == 0) {
        fputs(" (none dropped).\n", fp);
        return;
    }
    fprintf(fp, "; %zu dropped (", first->n_dropped);
    int sep = 0;
    for (size_t s = 0; s < c->n_sets; s++) {
        size_t cov = c->covered[k * c->n_sets + s];
        if (!vg_comparisons_score(c, k, first->metric, s) || cov == c->n_items[k]) continue;
        fprintf(fp, "%s", sep++ ? ", " : "");
        vg_md_cell(fp, c->labels[s]);
        fprintf(fp, " covers %zu", cov);
    }
    fputs(").\n", fp);
}

vg_status vg_report_comparison_md(const vg_comparisons *c, FILE *fp, const char *path,
                                  vg_error *err) {
    const vg_compare_options *o = &c->options;
    int as_is = o->items == VG_COMPARE_AS_IS;
    fputs("## Comparison\n\n", fp);
    fprintf(fp,
            "Is one vector set really better than another? Each row compares two sets on "
            "the same suite, item by item (difference = first set minus second). "
            "p-values are adjusted for the %zu test%s of this table with Holm's (1979) "
            "method; a difference is **significant** when its adjusted p is at most %g.\n\n",
            c->n_tests, c->n_tests == 1 ? "" : "s", o->alpha);
    if (as_is)
        fputs("**Warning (--no-common):** each set is scored on the items it covers, so a "
              "difference mixes the quality of the vectors with their coverage: a set that "
              "misses hard words can look better than it is.\n\n",
              fp);
    for (size_t k = 0; k < c->n_suites; k++) items_note(c, k, fp);
    fputc('\n', fp);

    int header = 0;
    for (size_t i = 0; i < c->n_rows; i++) {
        const vg_comparison *r = &c->rows[i];
        if (!header) {
            fprintf(fp,
                    "| suite | metric | sets (a - b) | a | b | difference [%g%% interval] | "
                    "test | p | Holm p | also | verdict |\n"
                    "|---|---|---|---:|---:|---:|---|---:|---:|---|---|\n",
                    100 * o->level);
            header = 1;
        }
        char sa[32], sb[32], d[32], ci[80], p[32], ph[32], also[64];
        fputs("| ", fp);
        vg_md_cell(fp, c->suite_ids[r->suite]);
        fprintf(fp, " | %s | ", r->metric);
        vg_md_cell(fp, c->labels[r->set_a]);
        fputs(" - ", fp);
        vg_md_cell(fp, c->labels[r->set_b]);
        fprintf(fp, " | %s | %s | %s %s | %s | %s | %s | %s | ", vg_format_fixed(r->score_a, 3, sa),
                vg_format_fixed(r->score_b, 3, sb), format_diff(r->diff, d), format_ci(r, ci),
                test_name(r->test), format_p(r->p_value, p), format_p(r->p_holm, ph),
                second_opinion(r, also));
        if (r->significant) {
            fputs("**", fp);
            vg_md_cell(fp, c->labels[r->diff > 0 ? r->set_a : r->set_b]);
            fputs(" better**", fp);
        } else if (isnan(r->p_holm)) {
            fputs("not tested", fp);
        } else {
            fputs("no significant difference", fp);
        }
        fputs(" |\n", fp);
    }
    if (header) fputc('\n', fp);

    /* The ranking across suites. */
    fputs("### Ranking\n\n"
          "Rank of each set on each suite's headline score (1 = best; ties share the "
          "average rank), averaged over the suites; wins and losses count the significant "
          "differences above.\n\n"
          "| rank | vector set | mean rank | suites | significant wins | significant losses |\n"
          "|---:|---|---:|---:|---:|---:|\n",
          fp);
    for (size_t i = 0; i < c->n_sets; i++) {
        const vg_set_rank *k = &c->ranking[i];
        char mr[32];
        fprintf(fp, "| %zu | ", i + 1);
        vg_md_cell(fp, c->labels[k->set]);
        fprintf(fp, " | %s | %zu | %zu | %zu |\n",
                isnan(k->mean_rank) ? "n/a" : vg_format_fixed(k->mean_rank, 2, mr), k->suites,
                k->wins, k->losses);
    }
    fputc('\n', fp);

    /* How the numbers were made. */
    int sim = 0, ana = 0, boot_test = 0;
    size_t disagree = 0, mcnemar_only = 0;
    for (size_t i = 0; i < c->n_rows; i++) {
        const vg_comparison *r = &c->rows[i];
        sim |= r->task == VG_TASK_SIMILARITY;
        ana |= r->task == VG_TASK_ANALOGY;
        boot_test |= strcmp(r->test, "bootstrap") == 0;
        if (r->task == VG_TASK_SIMILARITY && !isnan(r->p_steiger) && !isnan(r->p_bootstrap) &&
            (r->p_bootstrap <= o->alpha) != (r->p_steiger <= o->alpha))
            disagree++;
        /* McNemar would call significant what the pair bootstrap does not. */
        if (r->task == VG_TASK_ANALOGY && strcmp(r->test, "pair-bootstrap") == 0 &&
            !isnan(r->p_mcnemar) && !isnan(r->p_value) && r->p_mcnemar <= o->alpha &&
            r->p_value > o->alpha)
            mcnemar_only++;
    }
    fputs("### How the comparison was made\n\n", fp);
    if (o->replicates > 0)
        fprintf(fp,
                "- Paired bootstrap: %zu resamples of each suite's items, drawn jointly for "
                "every set (seed %llu; the same resamples as the per-set intervals). The "
                "difference is taken resample by resample; its %g%% interval is BCa (Efron "
                "1987, acceleration from the jackknife of the difference), percentile when "
                "BCa is undefined. Its two-sided p-value is (1 + #{|d* - d| >= |d|}) / (B + 1) "
                "with d the difference and d* its resamples (Hall and Wilson 1991: the "
                "resamples shifted to the null).\n",
                o->replicates, (unsigned long long)o->seed, 100 * o->level);
    if (sim && !as_is)
        fputs("- Similarity: the test is Steiger's (1980) Z1* for two correlations sharing "
              "the human ratings (Fisher z, pooled r; r_ab = Spearman's rho between the two "
              "sets' cosines), with the larger variance of Fisher's z of Spearman's rho, "
              "(1 + r^2 / 2) / (n - 3) (Bonett and Wright 2000); the paired bootstrap gives "
              "the interval and a second p-value, shown beside it.\n",
              fp);
    if (sim && as_is)
        fputs("- Similarity: the test is the paired bootstrap of the difference in "
              "Spearman's rho (each set on its own pairs); Steiger's Z1* on the pairs both "
              "sets cover is shown beside it.\n",
              fp);
    if (ana && o->replicates > 0)
        fputs("- Analogy: accuracy by the method named; the test is the pair bootstrap "
              "(Owen 2007, the pigeonhole bootstrap): the word pairs each section's "
              "questions are built from are resampled, pairs taken as a : b and as c : d "
              "independently, and both sets are scored under the same draws; the interval "
              "is the percentile interval of the difference, the p-value 2 Phi(-|d| / sd*) "
              "with sd* the resamples' standard deviation. McNemar's exact test (McNemar "
              "1947) is shown beside it: it treats the questions as independent trials, "
              "which questions sharing a word pair are not, so its p-values are far too "
              "small.\n",
              fp);
    else if (ana)
        fputs("- Analogy: accuracy by the method named; without resamples the test is "
              "McNemar's exact test (McNemar 1947; binomial on the questions exactly one set "
              "answered right), which treats questions sharing a word pair as independent "
              "and is far too confident: run with --bootstrap for the pair bootstrap.\n",
              fp);
    fprintf(fp, "- Multiple comparisons: Holm (1979) over all %zu test%s, at alpha = %g.\n",
            c->n_tests, c->n_tests == 1 ? "" : "s", o->alpha);
    if (boot_test && c->n_tests > 0) {
        /* The smallest bootstrap p is 1 / (B + 1); Holm compares the
         * smallest p with alpha / m. */
        double pmin = 1.0 / ((double)o->replicates + 1.0);
        if (pmin * (double)c->n_tests > o->alpha)
            fprintf(fp,
                    "- **Too few resamples to detect anything:** with %zu resamples the "
                    "smallest bootstrap p is %.2g, and Holm's method needs a p below %.2g "
                    "for the first rejection. Raise --bootstrap above %.0f.\n",
                    o->replicates, pmin, o->alpha / (double)c->n_tests,
                    ceil((double)c->n_tests / o->alpha));
    }
    if (mcnemar_only)
        fprintf(fp,
                "- On %zu analogy row%s McNemar's test finds a difference at %g that the "
                "pair bootstrap does not: it counts questions that share word pairs as "
                "independent evidence; do not read those differences as real.\n",
                mcnemar_only, mcnemar_only == 1 ? "" : "s", o->alpha);
    if (disagree)
        fprintf(fp,
                "- On %zu row%s the bootstrap and Steiger's Z1* disagree about significance "
                "at %g before adjustment: treat those differences as borderline.\n",
                disagree, disagree == 1 ? "" : "s", o->alpha);
    fputc('\n', fp);
    if (ferror(fp)) return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}

vg_status vg_report_comparison_text(const vg_comparisons *c, FILE *fp, vg_error *err) {
    size_t ws = strlen("suite"), wa = strlen("a"), wb = strlen("b");
    for (size_t i = 0; i < c->n_rows; i++) {
        ws = VG_MAX(ws, strlen(c->suite_ids[c->rows[i].suite]));
        wa = VG_MAX(wa, strlen(c->labels[c->rows[i].set_a]));
        wb = VG_MAX(wb, strlen(c->labels[c->rows[i].set_b]));
    }
    fprintf(fp, "comparison: %s; p adjusted by Holm over %zu test%s, alpha %g\n",
            c->options.items == VG_COMPARE_AS_IS ? "each set on the items it covers (--no-common)"
                                                 : "items every set covers",
            c->n_tests, c->n_tests == 1 ? "" : "s", c->options.alpha);
    fprintf(fp, "%-*s  %-8s  %-*s  %-*s  %7s  %-18s  %-9s  %-7s  %s\n", (int)ws, "suite",
            "metric", (int)wa, "a", (int)wb, "b", "a - b", "interval", "p", "Holm p",
            "verdict");
    for (size_t i = 0; i < c->n_rows; i++) {
        const vg_comparison *r = &c->rows[i];
        char d[32], ci[80], p[32], ph[32];
        const char *verdict = r->significant ? c->labels[r->diff > 0 ? r->set_a : r->set_b] : "-";
        fprintf(fp, "%-*s  %-8s  %-*s  %-*s  %7s  %-18s  %-9s  %-7s  %s%s\n", (int)ws,
                c->suite_ids[r->suite], r->metric, (int)wa, c->labels[r->set_a], (int)wb,
                c->labels[r->set_b], format_diff(r->diff, d), format_ci(r, ci),
                format_p(r->p_value, p), format_p(r->p_holm, ph), verdict,
                r->significant ? " better" : "");
    }
    fputs("ranking:", fp);
    for (size_t i = 0; i < c->n_sets; i++) {
        const vg_set_rank *k = &c->ranking[i];
        char mr[32];
        fprintf(fp, "%s %zu. %s (mean rank %s, %zu win%s)", i ? "," : "", i + 1,
                c->labels[k->set], isnan(k->mean_rank) ? "n/a" : vg_format_fixed(k->mean_rank, 2, mr),
                k->wins, k->wins == 1 ? "" : "s");
    }
    fputc('\n', fp);
    if (ferror(fp)) return vg_error_set(err, VG_EIO, NULL, 0, "write to standard output failed");
    return VG_OK;
}


void vg_md_short_provenance(FILE *fp, const vg_provenance *prov, const char *when) {
    fputs("## Provenance\n\n", fp);
    if (prov && prov->tool_version) {
        fprintf(fp, "- tool: vecgauge %s", prov->tool_version);
        if (prov->git_describe && *prov->git_describe) fprintf(fp, " (%s)", prov->git_describe);
        fputc('\n', fp);
    }
    if (prov && prov->utc_time) fprintf(fp, "- %s: %s\n", when, prov->utc_time);
    if (prov && prov->command_line) {
        fputs("- command: `", fp);
        vg_md_cell(fp, prov->command_line);
        fputs("`\n", fp);
    }
    fputc('\n', fp);
}
