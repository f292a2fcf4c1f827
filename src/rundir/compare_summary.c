/* compare_summary.c - summary.md of a comparison directory, and the list
 * of the saved runs a directory was made from.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <string.h>

#include "../common/numfmt.h"
#include "../report/report_impl.h"
#include "saved_impl.h"

void vg_md_saved_runs(FILE *fp, const char *title, const vg_saved_run *const *runs, size_t n,
                      int settings) {
    fprintf(fp, "## %s\n\n", title);
    for (size_t q = 0; q < n; q++) {
        const vg_saved_run *r = runs[q];
        fputs("- `", fp);
        vg_md_cell(fp, r->dir);
        fprintf(fp, "` (%s", *r->utc_time ? r->utc_time : "time unknown");
        if (settings) fprintf(fp, ", seed %llu, %zu resamples", (unsigned long long)r->seed, r->bootstrap);
        fputs("): ", fp);
        for (size_t i = 0; i < r->n_sets; i++) {
            if (i) fputs(", ", fp);
            vg_md_cell(fp, r->labels[i]);
        }
        fputc('\n', fp);
    }
    fputc('\n', fp);
}

vg_status vg_report_compare_summary_md(const vg_comparisons *c, const vg_saved_run *const *runs,
                                       size_t n, const vg_provenance *prov, FILE *fp,
                                       const char *path, vg_error *err) {
    fputs("# vecgauge comparison\n\n", fp);
    fprintf(fp, "%zu vector sets from %zu run director%s on %zu suite%s. Higher is better for "
                "every score.\n\n",
            c->n_sets, n, n == 1 ? "y" : "ies", c->n_suites, c->n_suites == 1 ? "" : "s");
    fprintf(fp,
            "## Scores on the compared items\n\n"
            "Each set's headline score (Spearman's rho; analogy accuracy) on the items of the "
            "comparison below, with its %g%% bootstrap interval (items used). These can "
            "differ from the scores of the runs themselves, which use every item a set "
            "covers.\n\n",
            100 * c->options.level);
    fputs("| suite | metric |", fp);
    for (size_t s = 0; s < c->n_sets; s++) {
        fputc(' ', fp);
        vg_md_cell(fp, c->labels[s]);
        fputs(" |", fp);
    }
    fputs("\n|---|---|", fp);
    for (size_t s = 0; s < c->n_sets; s++) fputs("---:|", fp);
    fputc('\n', fp);
    for (size_t k = 0; k < c->n_suites; k++) {
        const char *metrics[VG_METHOD_COUNT + 1];
        size_t nm = 0;
        for (size_t i = 0; i < c->n_scores; i++) {
            if (c->scores[i].suite != k) continue;
            int seen = 0;
            for (size_t j = 0; j < nm; j++) seen |= strcmp(metrics[j], c->scores[i].metric) == 0;
            if (!seen && nm < VG_METHOD_COUNT + 1) metrics[nm++] = c->scores[i].metric;
        }
        for (size_t j = 0; j < nm; j++) {
            fputs("| ", fp);
            vg_md_cell(fp, c->suite_ids[k]);
            fprintf(fp, " | %s |", metrics[j]);
            for (size_t s = 0; s < c->n_sets; s++) {
                const vg_compared_score *sc = vg_comparisons_score(c, k, metrics[j], s);
                char v[32], lo[32], hi[32];
                if (!sc) {
                    fputs(" |", fp);
                    continue;
                }
                fprintf(fp, " %s", vg_format_fixed(sc->value, 3, v));
                if (*sc->interval)
                    fprintf(fp, " [%s, %s]", vg_format_fixed(sc->low, 3, lo),
                            vg_format_fixed(sc->high, 3, hi));
                fprintf(fp, " (%zu) |", sc->n);
            }
            fputc('\n', fp);
        }
    }
    fputc('\n', fp);
    vg_status st = vg_report_comparison_md(c, fp, path, err);
    if (st != VG_OK) return st;
    vg_md_saved_runs(fp, "Runs compared", runs, n, 0);
    vg_md_short_provenance(fp, prov, "compared at");
    if (ferror(fp)) return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}
