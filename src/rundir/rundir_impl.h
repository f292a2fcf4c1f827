/* rundir_impl.h - what the writers of output directories share.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_RUNDIR_IMPL_H
#define VG_RUNDIR_IMPL_H

#include <signal.h>

#include "../common/internal.h"
#include "vecgauge/rundir.h"

/* Register the temporary directory being written and the names it can
 * hold (a NULL-terminated array that stays unchanged while registered; a
 * name may be a subdirectory, listed after its files), so that a handled
 * signal removes them; NULL unregisters. */
VG_INTERNAL void vg_cleanup_set(const char *temp_dir, const char *const *names);

/* Hold SIGINT and SIGTERM back on this thread (the previous mask saved in
 * *old) and let them through again: around a step that creates what a
 * cleanup must then be registered for, a signal is delivered once it is. */
VG_INTERNAL void vg_cleanup_hold(sigset_t *old);
VG_INTERNAL void vg_cleanup_release(const sigset_t *old);

/* Test hook: VECGAUGE_TEST_SLOW_WRITE=1 in the environment (tests
 * interrupt or overlap writers with it). */
VG_INTERNAL int vg_test_slow_write(void);

/* The paths under an output directory of the plots of n suites (ids):
 * "plots/NAME.svg" and ".png" per suite (vg_plot_name), then "plots"
 * itself, NULL-terminated (for vg_outdir_write); free with
 * vg_plot_paths_free. NULL when out of memory. */
VG_INTERNAL char **vg_plot_paths(const char *const *ids, size_t n);
VG_INTERNAL void vg_plot_paths_free(char **names);

/* Draw suite k's plot to svg and png (paths). */
typedef vg_status (*vg_plot_draw)(void *ctx, size_t k, const char *svg, const char *png,
                                  vg_error *err);

/* Make plots/ inside rd and draw every suite's plot there, named as
 * vg_plot_paths names them. */
VG_INTERNAL vg_status vg_plots_draw(vg_rundir *rd, const char *const *ids, size_t n,
                                    vg_plot_draw draw, void *ctx, vg_error *err);

#endif /* VG_RUNDIR_IMPL_H */
