/* summary_similarity.c - the similarity sections of summary.md: rho per
 * suite and set, Pearson and Kendall, the raters' agreement, case folding
 * and how the intervals were made.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <string.h>

#include "../common/numfmt.h"
#include "report_impl.h"
#include "vecgauge/report.h"

static void similarity_table(const vg_results *r, FILE *fp) {
    if (!vg_results_has_task(r, VG_TASK_SIMILARITY)) return;
    fputs("## Similarity: Spearman's rho\n\n", fp);
    fprintf(fp,
            "Cells: rho on the covered pairs with its %g%% %s interval "
            "(pairs used / pairs, coverage). **Bold**: the best set on that suite.\n\n",
            100 * r->options.ci, vg_md_headline_method(r, VG_TASK_SIMILARITY));
    /* The raters' agreement goes beside the scores as the suite's
     * ceiling, when some suite has individual ratings. */
    int raters = 0;
    for (size_t k = 0; k < r->n_suites; k++) {
        const vg_agreement *a = vg_results_agreement(r, k);
        raters |= a && a->columns > 0;
    }
    if (raters)
        fputs("Raters: the human agreement on that suite (see Human agreement), a rough "
              "ceiling.\n\n",
              fp);
    fputs(raters ? "| suite | pairs | raters |" : "| suite | pairs |", fp);
    for (size_t i = 0; i < r->n_sets; i++) {
        fputc(' ', fp);
        vg_md_cell(fp, r->labels[i]);
        fputs(" |", fp);
    }
    fputs(raters ? "\n|---|---:|---:|" : "\n|---|---:|", fp);
    for (size_t i = 0; i < r->n_sets; i++) fputs("---:|", fp);
    fputc('\n', fp);
    for (size_t k = 0; k < r->n_suites; k++) {
        const vg_suite *s = r->suites[k];
        if (s->task != VG_TASK_SIMILARITY) continue;
        size_t best = vg_md_best_set(r, k, "", VG_METRIC_SPEARMAN);
        fputs("| ", fp);
        vg_md_cell(fp, s->id);
        fprintf(fp, " | %zu |", s->n_items);
        if (raters) {
            const vg_agreement *a = vg_results_agreement(r, k);
            char v[32];
            fprintf(fp, " %s |", a && a->columns > 0 ? vg_format_fixed(a->value, 3, v) : "");
        }
        for (size_t i = 0; i < r->n_sets; i++) {
            const vg_score_row *row = vg_results_find(r, i, k, "", VG_METRIC_SPEARMAN, 0);
            char v[32];
            if (!row) {
                fputs(" |", fp);
                continue;
            }
            vg_format_fixed(row->value, 3, v);
            double cov = row->n_items ? 100.0 * (double)row->n_used / (double)row->n_items : 0;
            char iv[80];
            fprintf(fp, " %s%s%s%s (%zu/%zu, %.1f%%) |", i == best ? "**" : "", v,
                    i == best ? "**" : "", vg_md_interval(row, iv), row->n_used, row->n_items, cov);
        }
        fputc('\n', fp);
    }
    fputc('\n', fp);
}

/* Pearson's r and Kendall's tau-b beside the headline. */
static void other_correlations(const vg_results *r, FILE *fp) {
    int any = 0;
    for (size_t i = 0; i < r->n_rows && !any; i++)
        any = r->rows[i].metric == VG_METRIC_PEARSON || r->rows[i].metric == VG_METRIC_KENDALL;
    if (!any) return;
    fprintf(fp, "### Pearson's r and Kendall's tau-b\n\nOn the covered pairs, with %g%% %s "
                "intervals.\n\n",
            100 * r->options.ci, vg_md_headline_method(r, VG_TASK_SIMILARITY));
    vg_md_set_header(r, fp, "| suite | metric |", "|---|---|");
    const vg_metric ms[] = {VG_METRIC_PEARSON, VG_METRIC_KENDALL};
    for (size_t k = 0; k < r->n_suites; k++) {
        if (r->suites[k]->task != VG_TASK_SIMILARITY) continue;
        for (size_t j = 0; j < 2; j++) {
            fputs("| ", fp);
            vg_md_cell(fp, r->suites[k]->id);
            fprintf(fp, " | %s |", vg_metric_name(ms[j]));
            for (size_t i = 0; i < r->n_sets; i++) {
                const vg_score_row *row = vg_results_find(r, i, k, "", ms[j], 0);
                char v[32], iv[80];
                fprintf(fp, " %s%s |", vg_format_fixed(row ? row->value : NAN, 3, v),
                        vg_md_interval(row, iv));
            }
            fputc('\n', fp);
        }
    }
    fputc('\n', fp);
}

/* The raters' own agreement: what a vector set's rho can be held to. */
static void agreement_section(const vg_results *r, FILE *fp) {
    int header = 0;
    for (size_t k = 0; k < r->n_suites; k++) {
        const vg_agreement *a = vg_results_agreement(r, k);
        if (!a || a->columns == 0) continue;
        if (!header) {
            fputs("## Human agreement\n\n"
                  "How well each suite's own raters agree: Spearman's rho of each rating "
                  "column with the mean of the other ratings of the same pairs (leave one "
                  "rater out), averaged over the columns. A rough ceiling for a vector "
                  "set's rho on that suite.\n\n"
                  "| suite | agreement | raters | ratings per pair | pairs |\n"
                  "|---|---:|---:|---:|---:|\n",
                  fp);
            header = 1;
        }
        char v[32], per[48];
        if (a->min_ratings == a->max_ratings)
            snprintf(per, sizeof per, "%zu", a->max_ratings);
        else
            snprintf(per, sizeof per, "%zu-%zu", a->min_ratings, a->max_ratings);
        fputs("| ", fp);
        vg_md_cell(fp, r->suites[k]->id);
        fprintf(fp, " | %s | %zu | %s | %zu |\n", vg_format_fixed(a->value, 3, v), a->columns,
                per, a->n_items);
    }
    if (!header) return;
    fputc('\n', fp);
    for (size_t k = 0; k < r->n_suites; k++) {
        const vg_agreement *a = vg_results_agreement(r, k);
        if (!a || a->columns == 0 || a->min_ratings == a->max_ratings) continue;
        fputs("- ", fp);
        vg_md_cell(fp, r->suites[k]->id);
        fprintf(fp, ": pairs carry %zu to %zu ratings. Each column is taken as one rater, "
                    "which holds only if every pair's columns come from the same people in "
                    "the same order; a pair without a column is left out of that column's "
                    "correlation, so the figure is an approximation.\n",
                a->min_ratings, a->max_ratings);
    }
    fputc('\n', fp);
}

void vg_md_similarity(const vg_results *r, FILE *fp) {
    similarity_table(r, fp);
    other_correlations(r, fp);
    agreement_section(r, fp);
}

/* Pairs that case folding recovers (with --fold-case) or would recover;
 * without --fold-case this is said even when it is none. */
void vg_md_fold_case(const vg_results *r, FILE *fp) {
    int header = 0, any_similarity = 0;
    for (size_t i = 0; i < r->n_sets; i++) {
        for (size_t k = 0; k < r->n_suites; k++) {
            const vg_similarity_scores *sc = r->blocks[i * r->n_suites + k].sim;
            any_similarity |= sc != NULL;
            if (!sc || sc->n_fold_recovered == 0) continue;
            if (!header) {
                fputs("## Case folding\n\n", fp);
                header = 1;
            }
            fputs("- ", fp);
            vg_md_cell(fp, r->labels[i]);
            fputs(" on ", fp);
            vg_md_cell(fp, r->suites[k]->id);
            if (r->options.score.fold_case)
                fprintf(fp, ": %zu pair%s scored only thanks to case folding.\n",
                        sc->n_fold_recovered, sc->n_fold_recovered == 1 ? "" : "s");
            else
                fprintf(fp, ": case folding would recover %zu more pair%s (run with "
                            "--fold-case).\n",
                        sc->n_fold_recovered, sc->n_fold_recovered == 1 ? "" : "s");
        }
    }
    if (!header && any_similarity && !r->options.score.fold_case) {
        fputs("## Case folding\n\n- case folding (--fold-case) would recover no pair: no "
              "missing word is in a vector set under another case.\n",
              fp);
        header = 1;
    }
    if (header) fputc('\n', fp);
}

/* How the intervals were made. */
void vg_md_intervals(const vg_results *r, FILE *fp) {
    const vg_eval_options *o = &r->options;
    int any = 0;
    size_t short_rows = 0;
    for (size_t i = 0; i < r->n_rows; i++) {
        const vg_score_row *row = &r->rows[i];
        if (row->task != VG_TASK_SIMILARITY) continue;
        any = 1;
        for (size_t c = 0; c < row->n_ci; c++)
            if (row->ci[c].replicates && row->ci[c].replicates < o->bootstrap) {
                short_rows++;
                break;
            }
    }
    int ana = vg_results_has_task(r, VG_TASK_ANALOGY);
    if (!any && !ana) return;
    fputs("## Intervals\n\n", fp);
    if (ana && o->bootstrap > 0)
        fprintf(fp,
                "- Analogy accuracies: %g%% pair-bootstrap percentile intervals (Owen 2007, "
                "the pigeonhole bootstrap): %zu resamples of the word pairs each section's "
                "questions are built from, pairs taken as a : b and as c : d drawn "
                "independently, the same resamples for every vector set (seed %llu). "
                "Questions that share a pair succeed or fail together, so they are not "
                "independent trials; intervals.csv keeps the Wilson interval "
                "(wilson-independent), which assumes they are and is far too narrow "
                "(see docs/reading-the-numbers.md).\n",
                100 * o->ci, o->bootstrap, (unsigned long long)o->seed);
    else if (ana)
        fprintf(fp,
                "- Analogy accuracies: %g%% Wilson score intervals (Wilson 1927), which "
                "assume independent questions: questions that share a word pair are "
                "not, so these are too narrow (a bootstrap run gives the pair "
                "bootstrap's interval).\n",
                100 * o->ci);
    if (!any) {
        fputc('\n', fp);
        return;
    }
    if (o->bootstrap > 0) {
        fprintf(fp,
                "- %g%% BCa bootstrap intervals (Efron 1987; acceleration from the "
                "jackknife): %zu resamples of each suite's pairs, the same resamples for "
                "every vector set (seed %llu).\n",
                100 * o->ci, o->bootstrap, (unsigned long long)o->seed);
        fputs("- intervals.csv also holds the percentile interval and the analytic "
              "Fisher-z interval of every row (variance of z: Spearman 1.06/(n-3) and "
              "Kendall 0.437/(n-4), Fieller, Hartley and Pearson 1957; Pearson "
              "1/(n-3)).\n",
              fp);
        if (short_rows)
            fprintf(fp, "- %zu row%s had resamples on which the statistic is undefined (a "
                        "constant variable); those resamples are left out (see replicates "
                        "in intervals.csv).\n",
                    short_rows, short_rows == 1 ? "" : "s");
    } else {
        fprintf(fp, "- No bootstrap (--bootstrap 0): %g%% Fisher-z intervals only "
                    "(Spearman: variance 1.06/(n-3), Fieller, Hartley and Pearson 1957).\n",
                100 * o->ci);
    }
    fputc('\n', fp);
}
