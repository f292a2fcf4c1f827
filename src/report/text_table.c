/* text_table.c - the headline table `vecgauge score` prints on standard
 * output: plain text, aligned, one row per suite and metric.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/numfmt.h"
#include "report_impl.h"
#include "vecgauge/report.h"

vg_status vg_report_text_table(const vg_results *r, FILE *fp, vg_error *err) {
    /* Ids and labels escaped: a file or set name may hold control
     * characters, and this goes to a terminal (vg_escape_text). */
    char (*ids)[256] = vg_calloc(r->n_suites ? r->n_suites : 1, sizeof *ids);
    char (*labels)[256] = vg_calloc(r->n_sets ? r->n_sets : 1, sizeof *labels);
    if (!ids || !labels) {
        vg_free(ids);
        vg_free(labels);
        return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    }
    for (size_t k = 0; k < r->n_suites; k++) vg_escape_text(r->suites[k]->id, ids[k], sizeof ids[k]);
    for (size_t i = 0; i < r->n_sets; i++) vg_escape_text(r->labels[i], labels[i], sizeof labels[i]);
    size_t w0 = strlen("suite");
    for (size_t k = 0; k < r->n_suites; k++) w0 = VG_MAX(w0, strlen(ids[k]));
    /* Cells: the value and its headline interval, "0.848 [0.806, 0.881]". */
    size_t wc = 20;
    for (size_t i = 0; i < r->n_sets; i++) wc = VG_MAX(wc, strlen(labels[i]));
    fprintf(fp, "%-*s  %-10s", (int)w0, "suite", "metric");
    for (size_t i = 0; i < r->n_sets; i++) fprintf(fp, "  %*s", (int)wc, labels[i]);
    fputc('\n', fp);
    const vg_metric ms[] = {VG_METRIC_SPEARMAN, VG_METRIC_PEARSON, VG_METRIC_KENDALL};
    for (size_t k = 0; k < r->n_suites; k++) {
        if (r->suites[k]->task != VG_TASK_SIMILARITY) continue;
        for (size_t j = 0; j < 3; j++) {
            fprintf(fp, "%-*s  %-10s", (int)w0, ids[k], vg_metric_name(ms[j]));
            for (size_t i = 0; i < r->n_sets; i++) {
                const vg_score_row *row = vg_results_find(r, i, k, "", ms[j], 0);
                char v[32], iv[80], cell[120];
                snprintf(cell, sizeof cell, "%s%s", vg_format_fixed(row ? row->value : NAN, 3, v),
                         vg_md_interval(row, iv));
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
                ids[k], vg_format_fixed(a->value, 3, v), a->columns);
    }
    for (size_t i = 0; i < r->n_sets && !r->options.score.fold_case; i++)
        for (size_t k = 0; k < r->n_suites; k++) {
            const vg_similarity_scores *sc = r->blocks[i * r->n_suites + k].sim;
            if (!sc || sc->n_fold_recovered == 0) continue;
            if (!notes++) fputc('\n', fp);
            fprintf(fp, "%s on %s: case folding would recover %zu more pair%s (--fold-case)\n",
                    labels[i], ids[k], sc->n_fold_recovered,
                    sc->n_fold_recovered == 1 ? "" : "s");
        }
    for (size_t k = 0; k < r->n_suites; k++) {
        if (r->suites[k]->task != VG_TASK_ANALOGY) continue;
        for (int m = 0; m < VG_METHOD_COUNT; m++) {
            vg_metric metric = (vg_metric)(VG_METRIC_3COSADD + m);
            fprintf(fp, "%-*s  %-10s", (int)w0, ids[k], vg_metric_name(metric));
            for (size_t i = 0; i < r->n_sets; i++) {
                const vg_score_row *row = vg_results_find(r, i, k, "", metric, 0);
                char v[32], iv[80], cell[120];
                snprintf(cell, sizeof cell, "%s%s", vg_format_fixed(row ? row->value : NAN, 3, v),
                         vg_md_interval(row, iv));
                fprintf(fp, "  %*s", (int)wc, cell);
            }
            fputc('\n', fp);
        }
    }
    if (r->options.score.keep_question_words && vg_results_has_task(r, VG_TASK_ANALOGY))
        fputs("(analogies: question words kept as candidates)\n", fp);
    const char *sm = vg_md_headline_method(r, VG_TASK_SIMILARITY);
    const char *am = vg_md_headline_method(r, VG_TASK_ANALOGY);
    if (strcmp(sm, "no") != 0 || strcmp(am, "no") != 0) {
        fprintf(fp, "%sintervals: %g%%", notes ? "" : "\n", 100 * r->options.ci);
        if (strcmp(sm, "no") != 0) fprintf(fp, " %s (similarity)", sm);
        if (strcmp(am, "no") != 0) fprintf(fp, "%s %s (analogy)", strcmp(sm, "no") ? "," : "", am);
        fputc('\n', fp);
    }
    vg_free(ids);
    vg_free(labels);
    if (ferror(fp)) return vg_error_set(err, VG_EIO, NULL, 0, "write to standard output failed");
    return VG_OK;
}
