/* blas_pool.c - putting OpenBLAS's idle worker threads away.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The pthread build of OpenBLAS starts its worker threads when the
 * program starts, and after each threaded call they poll for more work
 * with sched_yield() for 2^28 cycles (about 0.1 s here) before they
 * sleep. On two cores one polling worker takes a core from whatever the
 * program does first, which for vecgauge is loading a vector set: a
 * 400k x 300 .npy loaded in 0.08-0.09 s with the pool put away against
 * 0.09-0.16 s without (6 paired runs, 2026-12-03). OpenBLAS's own fork
 * handler shuts the pool down the same way, and its next threaded call
 * starts it again (checked: a 3000 x 3000 sgemm afterwards still runs on
 * both cores). The function is exported but not in cblas.h, hence the
 * weak reference: with a BLAS that has no such pool it is NULL.
 */
#include "vecgauge/vecgauge.h"

extern int blas_thread_shutdown_(void) __attribute__((weak));

void vg_blas_park_workers(void) {
    if (blas_thread_shutdown_) (void)blas_thread_shutdown_();
}
