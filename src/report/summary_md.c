/* summary_md.c - summary.md: the tables a reader looks at first, and the
 * helpers every section of it shares.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The task sections live in their own files (summary_similarity.c,
 * summary_analogy.c); this file puts them in order and writes the parts
 * about the whole run: coverage warnings, options, provenance.
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

int vg_results_has_task(const vg_results *r, vg_task t) {
    for (size_t k = 0; k < r->n_suites; k++)
        if (r->suites[k]->task == t) return 1;
    return 0;
}

size_t vg_md_best_set(const vg_results *r, size_t k, const char *subset, vg_metric m) {
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

const char *vg_md_interval(const vg_score_row *row, char buf[80]) {
    char lo[32], hi[32];
    buf[0] = '\0';
    if (row && row->n_ci > 0 && !isnan(row->value))
        snprintf(buf, 80, " [%s, %s]", vg_format_fixed(row->ci[0].low, 3, lo),
                 vg_format_fixed(row->ci[0].high, 3, hi));
    return buf;
}

const char *vg_md_headline_method(const vg_results *r, vg_task t) {
    for (size_t i = 0; i < r->n_rows; i++)
        if (r->rows[i].task == t && r->rows[i].n_ci > 0) {
            const char *m = r->rows[i].ci[0].method;
            if (strcmp(m, "bca") == 0) return "BCa bootstrap";
            if (strcmp(m, "fisher-z") == 0) return "Fisher-z";
            if (strcmp(m, "wilson") == 0) return "Wilson";
            if (strcmp(m, "wilson-independent") == 0)
                return "Wilson (assuming independent questions)";
            if (strcmp(m, "pair-bootstrap") == 0) return "pair bootstrap";
            return m;
        }
    return "no";
}

void vg_md_set_header(const vg_results *r, FILE *fp, const char *first, const char *align) {
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
            char iv[80];
            if (ana)
                fprintf(fp, ": %.1f%% of questions covered (under %.0f%%); on all questions, "
                            "uncovered ones counted wrong, 3CosAdd accuracy = %s%s.\n",
                        100.0 * cov, 100.0 * VG_COVERAGE_WARN,
                        vg_format_fixed(all ? all->value : NAN, 3, v), vg_md_interval(all, iv));
            else
                fprintf(fp, ": %.1f%% of pairs covered (under %.0f%%); on all pairs, uncovered "
                            "ones scored 0, rho = %s%s.\n",
                        100.0 * cov, 100.0 * VG_COVERAGE_WARN,
                        vg_format_fixed(all ? all->value : NAN, 3, v), vg_md_interval(all, iv));
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
    if (vg_results_has_task(r, VG_TASK_ANALOGY)) {
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
                    vg_results_has_task(r, VG_TASK_ANALOGY)
                        ? "the analogy candidates and the words these suites need"
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
    return vg_report_summary_md_compared(r, NULL, prov, fp, path, err);
}

vg_status vg_report_summary_md_compared(const vg_results *r, const struct vg_comparisons *cmp,
                                        const vg_provenance *prov, FILE *fp, const char *path,
                                        vg_error *err) {
    fprintf(fp, "# vecgauge summary\n\n");
    fprintf(fp, "%zu vector set%s on %zu suite%s. Higher is better for every score.\n\n",
            r->n_sets, r->n_sets == 1 ? "" : "s", r->n_suites, r->n_suites == 1 ? "" : "s");
    vg_md_similarity(r, fp);
    vg_md_analogy(r, fp);
    /* The comparison section lives in comparison_md.c. */
    vg_status cs = cmp ? vg_report_comparison_md(cmp, fp, path, err) : VG_OK;
    if (cs != VG_OK) return cs;
    coverage_warnings(r, fp);
    vg_md_fold_case(r, fp);
    vg_md_intervals(r, fp);
    options_section(r, fp);
    provenance_section(r, prov, fp);
    if (ferror(fp)) return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}
