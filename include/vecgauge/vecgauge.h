/* vecgauge.h - the whole public API of libvecgauge.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Include this one header. Anything not declared in include/vecgauge/ is
 * not API and may change without notice.
 *
 * The data flows through the stages in this order, one header each:
 *   vectors.h  load a vector set (or wrap an in-memory matrix)
 *   suite.h    read a benchmark suite (word pairs or analogy questions)
 *   fetch.h    download the public suites into the data directory
 *   score.h    per-item scores of one vector set on one suite
 *   stats.h    correlations and intervals on plain arrays
 *   results.h  evaluate sets on suites: the table of scores
 *   compare.h  paired comparisons of sets (in-process, or saved runs)
 *   report.h   the files of a run directory (CSV, Markdown, ...)
 *   rundir.h   output directories written whole; signals; provenance time
 *   track.h    a training history: references, the regression verdict
 * error.h holds the status codes and the error record they all use.
 *
 * Threading: loaded vector sets, suites and results are immutable and may
 * be read from any number of threads. Nothing in the library keeps global
 * state except vg_init's one-time set-up.
 */
#ifndef VECGAUGE_H
#define VECGAUGE_H

#include "vg_config.h"
#include "error.h"
#include "vectors.h"
#include "suite.h"
#include "fetch.h"
#include "score.h"
#include "stats.h"
#include "results.h"
#include "report.h"
#include "paired.h"
#include "compare.h"
#include "rundir.h"
#include "track.h"

#ifdef __cplusplus
extern "C" {
#endif

/* The library's version string, e.g. "0.1.0"; equals VG_VERSION_STRING
 * of the header it was built with. */
VG_API const char *vg_version(void);

/* SHA-256 of a file as stored (no decompression), lower-case hex, and
 * its size in *bytes (may be NULL). VG_EIO names the path on failure. */
VG_API vg_status vg_file_sha256(const char *path, char hex[65], uint64_t *bytes, vg_error *err);

/* One-time set-up: turns GSL's abort-on-error handler off so that GSL
 * reports errors as return codes. Safe to call more than once; every
 * entry point that uses GSL calls it. */
VG_API void vg_init(void);

/* For a program's main, while no other thread uses BLAS: puts OpenBLAS's
 * idle worker threads away (they poll a core for about 0.1 s after start
 * and after each threaded call; the next threaded call starts them
 * again). Does nothing with a BLAS that has no such pool. The vecgauge
 * command calls it first thing; the library never does, since it cannot
 * know what else in the process uses BLAS. */
VG_API void vg_blas_park_workers(void);

#ifdef __cplusplus
}
#endif

#endif /* VECGAUGE_H */
