/* outdir.c - writing every file of an output directory, all or nothing.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <stdlib.h>
#include <unistd.h>

#include "../common/alloc.h"
#include "rundir_impl.h"
#include "vecgauge/report.h"

int vg_test_slow_write(void) {
    const char *slow = getenv("VECGAUGE_TEST_SLOW_WRITE");
    return slow && *slow == '1';
}

vg_status vg_outdir_write(const char *dir, const vg_outdir_file *files, size_t n,
                          const char *const *plot_names, vg_outdir_plots plots, void *plots_ctx,
                          vg_error *err) {
    size_t n_plots = 0;
    while (plot_names && plot_names[n_plots]) n_plots++;
    const char **names = vg_calloc(n + n_plots + 1, sizeof *names);
    if (!names) return vg_error_set(err, VG_ENOMEM, dir, 0, "out of memory");
    for (size_t i = 0; i < n; i++) names[i] = files[i].name;
    for (size_t i = 0; i < n_plots; i++) names[n + i] = plot_names[i];
    vg_rundir *rd = NULL;
    /* The temporary directory exists from vg_rundir_begin on: a signal
     * before its cleanup is registered would leave it behind (seen once
     * in the SIGTERM test under a loaded CI run), so signals wait until
     * then. The test hook pauses between the steps, first inside that
     * window, so that the tests' interrupts land there as well as later. */
    int pause = vg_test_slow_write();
    sigset_t old;
    vg_cleanup_hold(&old);
    vg_status st = vg_rundir_begin(dir, &rd, err);
    if (pause && st == VG_OK) usleep(200000);
    vg_cleanup_set(rd ? vg_rundir_temp_path(rd) : NULL, names);
    vg_cleanup_release(&old);
    for (size_t i = 0; st == VG_OK && i < n; i++) {
        if (plots && i + 1 == n) {
            if (pause) usleep(200000);
            if ((st = plots(rd, plots_ctx, err)) != VG_OK) break;
        }
        if (pause) usleep(200000);
        FILE *fp = NULL;
        if ((st = vg_rundir_open(rd, files[i].name, &fp, err)) != VG_OK) break;
        const char *path = vg_rundir_file(rd, files[i].name);
        st = files[i].write(files[i].ctx, fp, path, err);
        vg_status c = vg_report_close(fp, path, err);
        if (st == VG_OK) st = c;
    }
    if (st == VG_OK && vg_interrupted())
        st = vg_error_set(err, VG_EINTERRUPTED, dir, 0, "interrupted; nothing was written");
    if (st == VG_OK)
        st = vg_rundir_commit(rd, err);
    else
        vg_rundir_abort(rd);
    vg_cleanup_set(NULL, NULL);
    vg_free(names);
    return st;
}
