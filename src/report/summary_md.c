/* summary_md.c - summary.md: the tables a reader looks at first.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <string.h>

#include "../common/numfmt.h"
#include "report_impl.h"
#include "vecgauge/compare.h"
#include "vecgauge/report.h"

void vg_md_cell(FILE *fp, const char *s) {
    for (; *s; s++) {
        if (*s == '|')
            fputs("\\|", fp);
        else if (*s == '\n' || *s == '\r')
            fputc(' ', fp);
        else
            fputc(*s, fp);
    }
}

/* Index of the set with the highest headline value on suite k, or
 * (size_t)-1 when no set has a value. Ties keep the first set. */
static size_t best_set(const vg_results *r, size_t k, vg_metric m) {
    size_t best = (size_t)-1;
    double bv = -INFINITY;
    for (size_t i = 0; i < r->n_sets; i++) {
        const vg_score_row *row = vg_results_find(r, i, k, "", m, 0);
        if (row && !isnan(row->value) && row->value > bv) {
            bv = row->value;
            best = i;
        }
    }
    return best;
}

/* " [low, high]" of the headline interval of row, or "" without one (or
 * without a value). */
static const char *interval_text(const vg_score_row *row, char buf[80]) {
    char lo[32], hi[32];
    buf[0] = '\0';
    if (row && row->n_ci > 0 && !isnan(row->value))
        snprintf(buf, 80, " [%s, %s]", vg_format_fixed(row->ci[0].low, 3, lo),
                 vg_format_fixed(row->ci[0].high, 3, hi));
    return buf;
}

/* How the headline intervals were made, for the sentences above tables:
 * the method of the first row's first interval. */
static const char *headline_method(const vg_results *r) {
    for (size_t i = 0; i < r->n_rows; i++)
        if (r->rows[i].task == VG_TASK_SIMILARITY && r->rows[i].n_ci > 0) {
            const char *m = r->rows[i].ci[0].method;
            if (strcmp(m, "bca") == 0) return "BCa bootstrap";
            if (strcmp(m, "fisher-z") == 0) return "Fisher-z";
            return m;
        }
    return "no";
}

static void similarity_table(const vg_results *r, FILE *fp) {
    int any = 0;
    for (size_t k = 0; k < r->n_suites; k++) any |= r->suites[k]->task == VG_TASK_SIMILARITY;
    if (!any) return;
    fputs("## Similarity: Spearman's rho\n\n", fp);
    fprintf(fp,
            "Cells: rho on the covered pairs with its %g%% %s interval "
            "(pairs used / pairs, coverage). **Bold**: the best set on that suite.\n\n",
            100 * r->options.ci, headline_method(r));
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
        size_t best = best_set(r, k, VG_METRIC_SPEARMAN);
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
                    i == best ? "**" : "", interval_text(row, iv), row->n_used, row->n_items, cov);
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
            100 * r->options.ci, headline_method(r));
    fputs("| suite | metric |", fp);
    for (size_t i = 0; i < r->n_sets; i++) {
        fputc(' ', fp);
        vg_md_cell(fp, r->labels[i]);
        fputs(" |", fp);
    }
    fputs("\n|---|---|", fp);
    for (size_t i = 0; i < r->n_sets; i++) fputs("---:|", fp);
    fputc('\n', fp);
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
                        interval_text(row, iv));
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

/* Pairs that case folding recovers (with --fold-case) or would recover;
 * without --fold-case this is said even when it is none. */
static void fold_case_notes(const vg_results *r, FILE *fp) {
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
static void intervals_section(const vg_results *r, FILE *fp) {
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
    if (!any) return;
    fputs("## Intervals\n\n", fp);
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

static void coverage_warnings(const vg_results *r, FILE *fp) {
    int header = 0;
    for (size_t i = 0; i < r->n_sets; i++) {
        for (size_t k = 0; k < r->n_suites; k++) {
            const vg_score_row *row = vg_results_find(r, i, k, "", VG_METRIC_SPEARMAN, 0);
            if (!row || !row->n_items) continue;
            double cov = (double)row->n_used / (double)row->n_items;
            if (cov >= VG_COVERAGE_WARN) continue;
            if (!header) {
                fprintf(fp, "## Coverage warnings\n\n");
                header = 1;
            }
            const vg_score_row *all = vg_results_find(r, i, k, "", VG_METRIC_SPEARMAN, 1);
            char v[32];
            fputs("- ", fp);
            vg_md_cell(fp, r->labels[i]);
            fputs(" on ", fp);
            vg_md_cell(fp, r->suites[k]->id);
            char iv[80];
            fprintf(fp, ": %.1f%% of pairs covered (under %.0f%%); on all pairs, uncovered ones "
                        "scored 0, rho = %s%s.\n",
                    100.0 * cov, 100.0 * VG_COVERAGE_WARN,
                    vg_format_fixed(all ? all->value : NAN, 3, v), interval_text(all, iv));
        }
    }
    if (header) fputc('\n', fp);
}

static void options_section(const vg_results *r, FILE *fp) {
    const vg_eval_options *o = &r->options;
    fputs("## Options in effect\n\n", fp);
    fprintf(fp, "- seed: %llu\n", (unsigned long long)o->seed);
    fprintf(fp, "- bootstrap replicates: %zu\n", o->bootstrap);
    fprintf(fp, "- confidence level: %g\n", o->ci);
    fprintf(fp, "- case folding: %s\n", o->score.fold_case ? "on" : "off");
    fputc('\n', fp);
}

static void provenance_section(const vg_results *r, const vg_provenance *prov, FILE *fp) {
    fputs("## Provenance\n\n", fp);
    if (prov && prov->tool_version) {
        fprintf(fp, "- tool: vecgauge %s", prov->tool_version);
        if (prov->git_describe && *prov->git_describe) fprintf(fp, " (%s)", prov->git_describe);
        fputc('\n', fp);
    }
    if (prov && prov->utc_time) fprintf(fp, "- run at: %s\n", prov->utc_time);
    if (prov && prov->command_line) {
        fputs("- command: `", fp);
        vg_md_cell(fp, prov->command_line);
        fputs("`\n", fp);
    }
    for (size_t i = 0; i < r->n_sets; i++) {
        const vg_vectors_info *in = &r->infos[i];
        fputs("- vector set ", fp);
        vg_md_cell(fp, r->labels[i]);
        fputs(": `", fp);
        vg_md_cell(fp, r->paths[i]);
        fprintf(fp, "`, %s%s, %zu rows x %zu dims", vg_layout_name(in->layout),
                in->gzip ? " (gzip)" : "", in->rows_read, in->dims);
        if (in->rows != in->rows_read)
            fprintf(fp, " (%zu rows kept: the words these suites need)", in->rows);
        fprintf(fp, ", sha256 %s\n", in->hashed ? in->sha256 : "not computed");
    }
    for (size_t k = 0; k < r->n_suites; k++) {
        const vg_suite *s = r->suites[k];
        for (size_t f = 0; f < s->n_files; f++) {
            fputs("- suite ", fp);
            vg_md_cell(fp, s->id);
            fputs(": `", fp);
            vg_md_cell(fp, s->files[f].path);
            fprintf(fp, "`, %zu items, sha256 %s\n", s->n_items, s->files[f].sha256);
        }
    }
    fputc('\n', fp);
}

vg_status vg_report_summary_md(const vg_results *r, const vg_provenance *prov, FILE *fp,
                               const char *path, vg_error *err) {
    return vg_report_summary_md_compared(r, NULL, prov, fp, path, err);
}

vg_status vg_report_summary_md_compared(const vg_results *r, const struct vg_comparisons *cmp,
                                        const vg_provenance *prov, FILE *fp, const char *path,
                                        vg_error *err) {
    fprintf(fp, "# vecgauge summary\n\n");
    fprintf(fp, "%zu vector set%s on %zu suite%s. Higher is better for every score.\n\n",
            r->n_sets, r->n_sets == 1 ? "" : "s", r->n_suites, r->n_suites == 1 ? "" : "s");
    similarity_table(r, fp);
    other_correlations(r, fp);
    /* The comparison section lives in comparison_md.c. */
    vg_status cs = cmp ? vg_report_comparison_md(cmp, fp, path, err) : VG_OK;
    if (cs != VG_OK) return cs;
    agreement_section(r, fp);
    coverage_warnings(r, fp);
    fold_case_notes(r, fp);
    intervals_section(r, fp);
    options_section(r, fp);
    provenance_section(r, prov, fp);
    if (ferror(fp)) return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}

vg_status vg_report_text_table(const vg_results *r, FILE *fp, vg_error *err) {
    size_t w0 = strlen("suite");
    for (size_t k = 0; k < r->n_suites; k++) w0 = VG_MAX(w0, strlen(r->suites[k]->id));
    /* Cells: the value and its headline interval, "0.848 [0.806, 0.881]". */
    size_t wc = 20;
    for (size_t i = 0; i < r->n_sets; i++) wc = VG_MAX(wc, strlen(r->labels[i]));
    fprintf(fp, "%-*s  %-10s", (int)w0, "suite", "metric");
    for (size_t i = 0; i < r->n_sets; i++) fprintf(fp, "  %*s", (int)wc, r->labels[i]);
    fputc('\n', fp);
    const vg_metric ms[] = {VG_METRIC_SPEARMAN, VG_METRIC_PEARSON, VG_METRIC_KENDALL};
    for (size_t k = 0; k < r->n_suites; k++) {
        if (r->suites[k]->task != VG_TASK_SIMILARITY) continue;
        for (size_t j = 0; j < 3; j++) {
            fprintf(fp, "%-*s  %-10s", (int)w0, r->suites[k]->id, vg_metric_name(ms[j]));
            for (size_t i = 0; i < r->n_sets; i++) {
                const vg_score_row *row = vg_results_find(r, i, k, "", ms[j], 0);
                char v[32], iv[80], cell[120];
                snprintf(cell, sizeof cell, "%s%s", vg_format_fixed(row ? row->value : NAN, 3, v),
                         interval_text(row, iv));
                fprintf(fp, "  %*s", (int)wc, cell);
            }
            fputc('\n', fp);
        }
    }
    int notes = 0;
    for (size_t k = 0; k < r->n_suites; k++) {
        const vg_agreement *a = vg_results_agreement(r, k);
        if (!a || a->columns == 0) continue;
        char v[32];
        if (!notes++) fputc('\n', fp);
        fprintf(fp, "%s: the raters agree at %s (leave-one-out Spearman, %zu raters)\n",
                r->suites[k]->id, vg_format_fixed(a->value, 3, v), a->columns);
    }
    for (size_t i = 0; i < r->n_sets && !r->options.score.fold_case; i++)
        for (size_t k = 0; k < r->n_suites; k++) {
            const vg_similarity_scores *sc = r->blocks[i * r->n_suites + k].sim;
            if (!sc || sc->n_fold_recovered == 0) continue;
            if (!notes++) fputc('\n', fp);
            fprintf(fp, "%s on %s: case folding would recover %zu more pair%s (--fold-case)\n",
                    r->labels[i], r->suites[k]->id, sc->n_fold_recovered,
                    sc->n_fold_recovered == 1 ? "" : "s");
        }
    const char *method = headline_method(r);
    if (strcmp(method, "no") != 0)
        fprintf(fp, "%sintervals: %g%% %s\n", notes ? "" : "\n", 100 * r->options.ci, method);
    if (ferror(fp)) return vg_error_set(err, VG_EIO, NULL, 0, "write to standard output failed");
    return VG_OK;
}
