/* threads.h - thread-count defaults and a tiny parallel-for over pthreads.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_THREADS_H
#define VG_THREADS_H

#include <stddef.h>

#include "internal.h"

/* threads if non-zero, else the number of online CPUs (at least 1). */
VG_INTERNAL unsigned vg_threads_resolve(unsigned threads);

/* Run fn(ctx, t, nthreads) for t = 0..nthreads-1, each on its own thread
 * (t = 0 on the calling thread), and wait for all. Work must be split by
 * t alone, never by timing, so that results do not depend on scheduling.
 * Returns 0, or -1 if a thread could not be started (then every t was
 * still run, the missing ones on the calling thread). */
VG_INTERNAL int vg_parallel(unsigned nthreads, void (*fn)(void *ctx, unsigned t, unsigned n),
                            void *ctx);

#endif /* VG_THREADS_H */
