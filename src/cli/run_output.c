/* run_output.c - writing every file of a run directory, all or nothing.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

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

int vg_cli_write_run(const char *dir, const vg_results *res, const vg_provenance *prov) {
    return vg_cli_write_run_compared(dir, res, NULL, prov);
}

int vg_cli_write_run_compared(const char *dir, const vg_results *res, const vg_comparisons *cmp,
                              const vg_provenance *prov) {
    vg_error err;
    vg_error_clear(&err);
    /* The names the signal handler removes: the files, the plots, plots/. */
    char **plots = cmp ? vg_cli_plot_names(cmp) : NULL;
    size_t n_plots = 0;
    while (plots && plots[n_plots]) n_plots++;
    const char **names = calloc(N_RUN_FILES + n_plots + 1, sizeof *names);
    if (!names || (cmp && !plots)) {
        free(names);
        vg_cli_free_names(plots);
        vg_cli_fail("out of memory");
        return VG_EXIT_FAIL;
    }
    size_t nn = 0;
    for (size_t i = 0; i < N_RUN_FILES; i++) names[nn++] = run_files[i].name;
    for (size_t i = 0; i < n_plots; i++) names[nn++] = plots[i];
    run_cmp = cmp;
    vg_rundir *rd = NULL;
    vg_status st = vg_rundir_begin(dir, &rd, &err);
    vg_cli_set_cleanup(rd ? vg_rundir_temp_path(rd) : NULL, names);
    /* Test hook: VECGAUGE_TEST_SLOW_WRITE=1 pauses 200 ms before each file so
     * that tests can interrupt a run while its directory is half written. */
    const char *slow = getenv("VECGAUGE_TEST_SLOW_WRITE");
    for (size_t i = 0; st == VG_OK && i < N_RUN_FILES; i++) {
        if (run_files[i].compared && !cmp) continue;
        if (cmp && strcmp(run_files[i].name, "run.json") == 0) {
            if (slow && *slow == '1') usleep(200000);
            st = vg_cli_write_plots(rd, cmp, &err);
            if (st != VG_OK) break;
        }
        FILE *fp = NULL;
        if (slow && *slow == '1') usleep(200000);
        st = vg_rundir_open(rd, run_files[i].name, &fp, &err);
        if (st != VG_OK) break;
        const char *path = vg_rundir_file(rd, run_files[i].name);
        st = run_files[i].fn(res, prov, fp, path, &err);
        vg_status c = vg_report_close(fp, path, &err);
        if (st == VG_OK) st = c;
    }
    if (st == VG_OK && vg_cli_interrupted())
        st = vg_error_set(&err, VG_EINTERRUPTED, dir, 0, "interrupted; nothing was written");
    if (st == VG_OK)
        st = vg_rundir_commit(rd, &err);
    else
        vg_rundir_abort(rd);
    vg_cli_set_cleanup(NULL, NULL);
    run_cmp = NULL;
    free(names);
    vg_cli_free_names(plots);
    if (st != VG_OK) {
        vg_cli_error(&err);
        return VG_EXIT_FAIL;
    }
    return VG_EXIT_OK;
}
