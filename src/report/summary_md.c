/* summary_md.c - summary.md: the tables a reader looks at first.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <string.h>

#include "../common/numfmt.h"
#include "report_impl.h"
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

static void similarity_table(const vg_results *r, FILE *fp) {
    int any = 0;
    for (size_t k = 0; k < r->n_suites; k++) any |= r->suites[k]->task == VG_TASK_SIMILARITY;
    if (!any) return;
    fputs("## Similarity: Spearman's rho\n\n", fp);
    fputs("Cells: rho on the covered pairs (pairs used / pairs, coverage). "
          "**Bold**: the best set on that suite.\n\n",
          fp);
    fputs("| suite | pairs |", fp);
    for (size_t i = 0; i < r->n_sets; i++) {
        fputc(' ', fp);
        vg_md_cell(fp, r->labels[i]);
        fputs(" |", fp);
    }
    fputs("\n|---|---:|", fp);
    for (size_t i = 0; i < r->n_sets; i++) fputs("---:|", fp);
    fputc('\n', fp);
    for (size_t k = 0; k < r->n_suites; k++) {
        const vg_suite *s = r->suites[k];
        if (s->task != VG_TASK_SIMILARITY) continue;
        size_t best = best_set(r, k, VG_METRIC_SPEARMAN);
        fputs("| ", fp);
        vg_md_cell(fp, s->id);
        fprintf(fp, " | %zu |", s->n_items);
        for (size_t i = 0; i < r->n_sets; i++) {
            const vg_score_row *row = vg_results_find(r, i, k, "", VG_METRIC_SPEARMAN, 0);
            char v[32];
            if (!row) {
                fputs(" |", fp);
                continue;
            }
            vg_format_fixed(row->value, 3, v);
            double cov = row->n_items ? 100.0 * (double)row->n_used / (double)row->n_items : 0;
            fprintf(fp, " %s%s%s (%zu/%zu, %.1f%%) |", i == best ? "**" : "", v,
                    i == best ? "**" : "", row->n_used, row->n_items, cov);
        }
        fputc('\n', fp);
    }
    fputc('\n', fp);
}

/* ---- analogies ------------------------------------------------------ */

static const char *const method_titles[VG_METHOD_COUNT] = {"3CosAdd", "3CosMul",
                                                           "PairDirection", "only-b"};

static int any_analogy(const vg_results *r) {
    for (size_t k = 0; k < r->n_suites; k++)
        if (r->suites[k]->task == VG_TASK_ANALOGY) return 1;
    return 0;
}

/* Index of the set with the highest accuracy on (suite k, subset, metric
 * m), or (size_t)-1. Ties keep the first set. */
static size_t best_subset(const vg_results *r, size_t k, const char *subset, vg_metric m) {
    size_t best = (size_t)-1;
    double bv = -INFINITY;
    for (size_t i = 0; i < r->n_sets; i++) {
        const vg_score_row *row = vg_results_find(r, i, k, subset, m, 0);
        if (row && !isnan(row->value) && row->value > bv) {
            bv = row->value;
            best = i;
        }
    }
    return best;
}

/* One cell: accuracy (used/items, coverage), bold when best. */
static void accuracy_cell(FILE *fp, const vg_score_row *row, int best) {
    char v[32];
    if (!row) {
        fputs(" |", fp);
        return;
    }
    vg_format_fixed(row->value, 3, v);
    double cov = row->n_items ? 100.0 * (double)row->n_used / (double)row->n_items : 0;
    fprintf(fp, " %s%s%s (%zu/%zu, %.1f%%) |", best ? "**" : "", v, best ? "**" : "",
            row->n_used, row->n_items, cov);
}

static void set_columns(const vg_results *r, FILE *fp, const char *first, const char *align) {
    fputs(first, fp);
    for (size_t i = 0; i < r->n_sets; i++) {
        fputc(' ', fp);
        vg_md_cell(fp, r->labels[i]);
        fputs(" |", fp);
    }
    fprintf(fp, "\n%s", align);
    for (size_t i = 0; i < r->n_sets; i++) fputs("---:|", fp);
    fputc('\n', fp);
}

static void analogy_table(const vg_results *r, FILE *fp) {
    if (!any_analogy(r)) return;
    const vg_score_options *so = &r->options.score;
    fputs("## Analogies: accuracy\n\n", fp);
    fputs("Cells: accuracy on the covered questions (questions used / questions, coverage). "
          "**Bold**: the best set on that suite and method. ",
          fp);
    if (so->analogy_vocab)
        fprintf(fp, "Candidates: the first %zu rows of each vector set. ", so->analogy_vocab);
    else
        fputs("Candidates: every row of each vector set. ", fp);
    if (so->keep_question_words)
        fputs("**Question words kept** (--keep-question-words): a, b and c may be given as the "
              "answer, so these accuracies are not comparable with published ones.\n\n",
              fp);
    else
        fputs("a, b and c of a question are never its answer (common practice).\n\n", fp);
    set_columns(r, fp, "| suite | method | questions |", "|---|---|---:|");
    for (size_t k = 0; k < r->n_suites; k++) {
        const vg_suite *s = r->suites[k];
        if (s->task != VG_TASK_ANALOGY) continue;
        for (int m = 0; m < VG_METHOD_COUNT; m++) {
            vg_metric metric = (vg_metric)(VG_METRIC_3COSADD + m);
            size_t best = best_subset(r, k, "", metric);
            fputs("| ", fp);
            vg_md_cell(fp, s->id);
            fprintf(fp, " | %s | %zu |", method_titles[m], s->n_items);
            for (size_t i = 0; i < r->n_sets; i++)
                accuracy_cell(fp, vg_results_find(r, i, k, "", metric, 0), i == best);
            fputc('\n', fp);
        }
    }
    fputc('\n', fp);

    /* Per section and group, 3CosAdd (the other methods are in scores.csv). */
    for (size_t k = 0; k < r->n_suites; k++) {
        const vg_suite *s = r->suites[k];
        if (s->task != VG_TASK_ANALOGY) continue;
        int parts = 0;
        for (size_t e = 0; e < r->n_rows; e++)
            parts |= r->rows[e].suite == k && r->rows[e].set == 0 && *r->rows[e].subset;
        if (!parts) continue;
        int groups = 0;
        for (size_t e = 0; e < s->n_sections; e++) groups |= s->sections[e].group != NULL;
        fputs("### ", fp);
        vg_md_cell(fp, s->id);
        fputs(groups ? " by section and group: 3CosAdd\n\n" : " by section: 3CosAdd\n\n", fp);
        set_columns(r, fp, groups ? "| section or group | questions |" : "| section | questions |",
                    "|---|---:|");
        for (size_t e = 0; e < r->n_rows; e++) {
            const vg_score_row *row = &r->rows[e];
            if (row->suite != k || row->set != 0 || !*row->subset ||
                row->metric != VG_METRIC_3COSADD || row->all_items)
                continue;
            size_t best = best_subset(r, k, row->subset, VG_METRIC_3COSADD);
            fputs("| ", fp);
            vg_md_cell(fp, row->subset);
            fprintf(fp, " | %zu |", row->n_items);
            for (size_t i = 0; i < r->n_sets; i++)
                accuracy_cell(fp, vg_results_find(r, i, k, row->subset, VG_METRIC_3COSADD, 0),
                              i == best);
            fputc('\n', fp);
        }
        fputc('\n', fp);
    }
}

static void coverage_warnings(const vg_results *r, FILE *fp) {
    int header = 0;
    for (size_t i = 0; i < r->n_sets; i++) {
        for (size_t k = 0; k < r->n_suites; k++) {
            int ana = r->suites[k]->task == VG_TASK_ANALOGY;
            vg_metric metric = ana ? VG_METRIC_3COSADD : VG_METRIC_SPEARMAN;
            const vg_score_row *row = vg_results_find(r, i, k, "", metric, 0);
            if (!row || !row->n_items) continue;
            double cov = (double)row->n_used / (double)row->n_items;
            if (cov >= VG_COVERAGE_WARN) continue;
            if (!header) {
                fprintf(fp, "## Coverage warnings\n\n");
                header = 1;
            }
            const vg_score_row *all = vg_results_find(r, i, k, "", metric, 1);
            char v[32];
            fputs("- ", fp);
            vg_md_cell(fp, r->labels[i]);
            fputs(" on ", fp);
            vg_md_cell(fp, r->suites[k]->id);
            if (ana)
                fprintf(fp, ": %.1f%% of questions covered (under %.0f%%); on all questions, "
                            "uncovered ones counted wrong, 3CosAdd accuracy = %s.\n",
                        100.0 * cov, 100.0 * VG_COVERAGE_WARN,
                        vg_format_fixed(all ? all->value : NAN, 3, v));
            else
                fprintf(fp, ": %.1f%% of pairs covered (under %.0f%%); on all pairs, uncovered "
                            "ones scored 0, rho = %s.\n",
                        100.0 * cov, 100.0 * VG_COVERAGE_WARN,
                        vg_format_fixed(all ? all->value : NAN, 3, v));
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
    if (any_analogy(r)) {
        if (o->score.analogy_vocab)
            fprintf(fp, "- analogy candidates: the first %zu rows of each vector set",
                    o->score.analogy_vocab);
        else
            fputs("- analogy candidates: every row of each vector set", fp);
        /* The rows actually used, from any analogy block of each set. */
        for (size_t i = 0; i < r->n_sets; i++)
            for (size_t k = 0; k < r->n_suites; k++) {
                const vg_analogy_scores *a = r->blocks[i * r->n_suites + k].ana;
                if (!a) continue;
                fprintf(fp, "%s", i == 0 ? " (rows used: " : ", ");
                vg_md_cell(fp, r->labels[i]);
                fprintf(fp, " %zu", a->n_candidates);
                break;
            }
        fputs(r->n_sets ? ")\n" : "\n", fp);
        fprintf(fp, "- question words (a, b, c) as answers: %s\n",
                o->score.keep_question_words ? "kept (--keep-question-words)"
                                             : "excluded (common practice)");
    }
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
            fprintf(fp, " (%zu rows kept: %s)", in->rows,
                    any_analogy(r) ? "the analogy candidates and the words these suites need"
                                   : "the words these suites need");
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
    fprintf(fp, "# vecgauge summary\n\n");
    fprintf(fp, "%zu vector set%s on %zu suite%s. Higher is better for every score.\n\n",
            r->n_sets, r->n_sets == 1 ? "" : "s", r->n_suites, r->n_suites == 1 ? "" : "s");
    similarity_table(r, fp);
    analogy_table(r, fp);
    coverage_warnings(r, fp);
    options_section(r, fp);
    provenance_section(r, prov, fp);
    if (ferror(fp)) return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}

vg_status vg_report_text_table(const vg_results *r, FILE *fp, vg_error *err) {
    size_t w0 = strlen("suite");
    for (size_t k = 0; k < r->n_suites; k++) w0 = VG_MAX(w0, strlen(r->suites[k]->id));
    size_t wc = 8;
    for (size_t i = 0; i < r->n_sets; i++) wc = VG_MAX(wc, strlen(r->labels[i]));
    fprintf(fp, "%-*s  %-10s", (int)w0, "suite", "metric");
    for (size_t i = 0; i < r->n_sets; i++) fprintf(fp, "  %*s", (int)wc, r->labels[i]);
    fputc('\n', fp);
    for (size_t k = 0; k < r->n_suites; k++) {
        if (r->suites[k]->task != VG_TASK_SIMILARITY) continue;
        fprintf(fp, "%-*s  %-10s", (int)w0, r->suites[k]->id, "spearman");
        for (size_t i = 0; i < r->n_sets; i++) {
            const vg_score_row *row = vg_results_find(r, i, k, "", VG_METRIC_SPEARMAN, 0);
            char v[32];
            fprintf(fp, "  %*s", (int)wc, vg_format_fixed(row ? row->value : NAN, 3, v));
        }
        fputc('\n', fp);
    }
    for (size_t k = 0; k < r->n_suites; k++) {
        if (r->suites[k]->task != VG_TASK_ANALOGY) continue;
        for (int m = 0; m < VG_METHOD_COUNT; m++) {
            vg_metric metric = (vg_metric)(VG_METRIC_3COSADD + m);
            fprintf(fp, "%-*s  %-10s", (int)w0, r->suites[k]->id, vg_metric_name(metric));
            for (size_t i = 0; i < r->n_sets; i++) {
                const vg_score_row *row = vg_results_find(r, i, k, "", metric, 0);
                char v[32];
                fprintf(fp, "  %*s", (int)wc, vg_format_fixed(row ? row->value : NAN, 3, v));
            }
            fputc('\n', fp);
        }
    }
    if (r->options.score.keep_question_words && any_analogy(r))
        fputs("(analogies: question words kept as candidates)\n", fp);
    if (ferror(fp)) return vg_error_set(err, VG_EIO, NULL, 0, "write to standard output failed");
    return VG_OK;
}
