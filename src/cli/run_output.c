/* run_output.c - writing every file of a run directory, all or nothing.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <stdio.h>
#include <stdlib.h>
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

/* The files of a run directory, in the order they are written. run.json
 * goes last: its presence marks a run directory that was complete. */
static const struct {
    const char *name;
    writer_fn fn;
} run_files[] = {
    {"scores.csv", w_scores},
    {"intervals.csv", w_intervals},
    {"agreement.csv", w_agreement},
    {"items.csv", w_items},
    {"missing.csv", w_missing},
    {"summary.md", vg_report_summary_md},
    {"table.tex", vg_report_table_tex},
    {"run.json", vg_report_run_json},
};

#define N_RUN_FILES (sizeof run_files / sizeof run_files[0])

/* The names alone, for the signal handler's clean-up. */
static const char *run_names[N_RUN_FILES + 1];

int vg_cli_write_run(const char *dir, const vg_results *res, const vg_provenance *prov) {
    for (size_t i = 0; i < N_RUN_FILES; i++) run_names[i] = run_files[i].name;
    vg_error err;
    vg_error_clear(&err);
    vg_rundir *rd = NULL;
    vg_status st = vg_rundir_begin(dir, &rd, &err);
    vg_cli_set_cleanup(rd ? vg_rundir_temp_path(rd) : NULL, run_names);
    /* Test hook: VECGAUGE_TEST_SLOW_WRITE=1 pauses 200 ms before each file so
     * that tests can interrupt a run while its directory is half written. */
    const char *slow = getenv("VECGAUGE_TEST_SLOW_WRITE");
    for (size_t i = 0; st == VG_OK && i < N_RUN_FILES; i++) {
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
    if (st != VG_OK) {
        vg_cli_error(&err);
        return VG_EXIT_FAIL;
    }
    return VG_EXIT_OK;
}
