/* run_output.c - writing every file of a run directory, all or nothing.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"

typedef vg_status (*writer_fn)(const vg_results *r, const vg_provenance *prov, FILE *fp,
                               const char *path, vg_error *err);

static vg_status w_scores(const vg_results *r, const vg_provenance *prov, FILE *fp,
                          const char *path, vg_error *err) {
    (void)prov;
    return vg_report_scores_csv(r, fp, path, err);
}

static vg_status w_items(const vg_results *r, const vg_provenance *prov, FILE *fp,
                         const char *path, vg_error *err) {
    (void)prov;
    return vg_report_items_csv(r, fp, path, err);
}

static vg_status w_intervals(const vg_results *r, const vg_provenance *prov, FILE *fp,
                             const char *path, vg_error *err) {
    (void)prov;
    return vg_report_intervals_csv(r, fp, path, err);
}

static vg_status w_agreement(const vg_results *r, const vg_provenance *prov, FILE *fp,
                             const char *path, vg_error *err) {
    (void)prov;
    return vg_report_agreement_csv(r, fp, path, err);
}

static vg_status w_missing(const vg_results *r, const vg_provenance *prov, FILE *fp,
                           const char *path, vg_error *err) {
    (void)prov;
    return vg_report_missing_words(r, fp, path, err);
}

/* The comparison of a run with several sets, for the writers below
 * (set by vg_cli_write_run_compared while it writes). */
static const vg_comparisons *run_cmp;

static vg_status w_comparison(const vg_results *r, const vg_provenance *prov, FILE *fp,
                              const char *path, vg_error *err) {
    (void)r;
    (void)prov;
    return vg_report_comparison_csv(run_cmp, fp, path, err);
}

static vg_status w_ranking(const vg_results *r, const vg_provenance *prov, FILE *fp,
                           const char *path, vg_error *err) {
    (void)r;
    (void)prov;
    return vg_report_ranking_csv(run_cmp, fp, path, err);
}

static vg_status w_summary(const vg_results *r, const vg_provenance *prov, FILE *fp,
                           const char *path, vg_error *err) {
    return vg_report_summary_md_compared(r, run_cmp, prov, fp, path, err);
}

/* The files of a run directory, in the order they are written; the
 * comparison files only when several sets are compared, then plots/.
 * run.json goes last: its presence marks a run directory that was
 * complete. */
static const struct {
    const char *name;
    writer_fn fn;
    int compared;   /* written only with a comparison */
} run_files[] = {
    {"scores.csv", w_scores, 0},
    {"intervals.csv", w_intervals, 0},
    {"agreement.csv", w_agreement, 0},
    {"items.csv", w_items, 0},
    {"missing.csv", w_missing, 0},
    {"comparison.csv", w_comparison, 1},
    {"ranking.csv", w_ranking, 1},
    {"summary.md", w_summary, 0},
    {"table.tex", vg_report_table_tex, 0},
    {"run.json", vg_report_run_json, 0},
};

#define N_RUN_FILES (sizeof run_files / sizeof run_files[0])

/* One run file as a vg_outdir_file: its writer and what it writes from. */
typedef struct run_file_ctx {
    writer_fn fn;
    const vg_results *res;
    const vg_provenance *prov;
} run_file_ctx;

static vg_status call_writer(void *ctx, FILE *fp, const char *path, vg_error *err) {
    const run_file_ctx *c = ctx;
    return c->fn(c->res, c->prov, fp, path, err);
}

static vg_status plots_cb(vg_rundir *rd, void *ctx, vg_error *err) {
    (void)ctx;
    return vg_cli_write_plots(rd, run_cmp, err);
}

int vg_cli_write_run(const char *dir, const vg_results *res, const vg_provenance *prov) {
    return vg_cli_write_run_compared(dir, res, NULL, prov);
}

int vg_cli_write_run_compared(const char *dir, const vg_results *res, const vg_comparisons *cmp,
                              const vg_provenance *prov) {
    char **plots = cmp ? vg_cli_plot_names(cmp) : NULL;
    if (cmp && !plots) {
        vg_cli_fail("out of memory");
        return VG_EXIT_FAIL;
    }
    run_file_ctx ctx[N_RUN_FILES];
    vg_outdir_file files[N_RUN_FILES];
    size_t n = 0;
    for (size_t i = 0; i < N_RUN_FILES; i++) {
        if (run_files[i].compared && !cmp) continue;
        ctx[n] = (run_file_ctx){run_files[i].fn, res, prov};
        files[n] = (vg_outdir_file){run_files[i].name, call_writer, &ctx[n]};
        n++;
    }
    run_cmp = cmp;
    int rc = vg_cli_write_dir(dir, files, n, plots, cmp ? plots_cb : NULL, NULL);
    run_cmp = NULL;
    vg_cli_free_names(plots);
    return rc;
}

/* ---- any directory of output files -------------------------------------- */

int vg_cli_write_dir(const char *dir, const vg_outdir_file *files, size_t n, char **plot_names,
                     vg_outdir_plots plots, void *plot_ctx) {
    vg_error err;
    vg_error_clear(&err);
    if (vg_outdir_write(dir, files, n, (const char *const *)plot_names, plots, plot_ctx, &err) !=
        VG_OK) {
        vg_cli_error(&err);
        return VG_EXIT_FAIL;
    }
    return VG_EXIT_OK;
}
