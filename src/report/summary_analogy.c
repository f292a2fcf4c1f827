/* summary_analogy.c - the analogy sections of summary.md: accuracy per
 * suite, method and set, and per section and group.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <string.h>

#include "../common/numfmt.h"
#include "report_impl.h"
#include "vecgauge/report.h"

static const char *const method_titles[VG_METHOD_COUNT] = {"3CosAdd", "3CosMul",
                                                           "PairDirection", "only-b"};

/* One cell: accuracy with its headline interval (used/items, coverage),
 * bold when best. */
static void accuracy_cell(FILE *fp, const vg_score_row *row, int best) {
    char v[32], iv[80];
    if (!row) {
        fputs(" |", fp);
        return;
    }
    vg_format_fixed(row->value, 3, v);
    double cov = row->n_items ? 100.0 * (double)row->n_used / (double)row->n_items : 0;
    fprintf(fp, " %s%s%s%s (%zu/%zu, %.1f%%) |", best ? "**" : "", v, best ? "**" : "",
            vg_md_interval(row, iv), row->n_used, row->n_items, cov);
}

void vg_md_analogy(const vg_results *r, FILE *fp) {
    if (!vg_results_has_task(r, VG_TASK_ANALOGY)) return;
    const vg_score_options *so = &r->options.score;
    fputs("## Analogies: accuracy\n\n", fp);
    fprintf(fp,
            "Cells: accuracy on the covered questions with its %g%% %s interval (questions "
            "used / questions, coverage). **Bold**: the best set on that suite and method. ",
            100 * r->options.ci, vg_md_headline_method(r, VG_TASK_ANALOGY));
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
    vg_md_set_header(r, fp, "| suite | method | questions |", "|---|---|---:|");
    for (size_t k = 0; k < r->n_suites; k++) {
        const vg_suite *s = r->suites[k];
        if (s->task != VG_TASK_ANALOGY) continue;
        for (int m = 0; m < VG_METHOD_COUNT; m++) {
            vg_metric metric = (vg_metric)(VG_METRIC_3COSADD + m);
            size_t best = vg_md_best_set(r, k, "", metric);
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
        vg_md_set_header(r, fp, groups ? "| section or group | questions |" : "| section | questions |",
                         "|---|---:|");
        for (size_t e = 0; e < r->n_rows; e++) {
            const vg_score_row *row = &r->rows[e];
            if (row->suite != k || row->set != 0 || !*row->subset ||
                row->metric != VG_METRIC_3COSADD || row->all_items)
                continue;
            size_t best = vg_md_best_set(r, k, row->subset, VG_METRIC_3COSADD);
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
