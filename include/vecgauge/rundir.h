/* rundir.h - output directories that appear whole or not at all.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Every directory vecgauge writes (a run, a comparison, a merge, a track
 * report) is built in a temporary directory beside its final path and
 * renamed into place only when every file is complete, so a reader or a
 * crash never sees half of one, and an existing directory is never
 * overwritten. A program that wants SIGINT and SIGTERM to remove the
 * temporary of a directory being written installs the handlers with
 * vg_rundir_handle_signals; the library never installs them itself.
 */
#ifndef VG_RUNDIR_H
#define VG_RUNDIR_H

#include <stddef.h>
#include <stdio.h>

#include "error.h"
#include "vg_config.h"

#ifdef __cplusplus
extern "C" {
#endif

/* A run directory being built. */
typedef struct vg_rundir vg_rundir;

/* Start building the run directory final_path: creates a fresh temporary
 * directory beside it. Fails with VG_EIO if final_path already exists (a
 * run directory is never overwritten) or the temporary cannot be made.
 * On success *out owns the handle: finish with vg_rundir_commit or
 * vg_rundir_abort. */
VG_API vg_status vg_rundir_begin(const char *final_path, vg_rundir **out,
                                 vg_error *err);

/* The path of a file name inside the temporary directory (valid until the
 * next call on rd). */
VG_API const char *vg_rundir_file(vg_rundir *rd, const char *name);

/* The temporary directory (for signal handlers that must remove it). */
VG_API const char *vg_rundir_temp_path(const vg_rundir *rd);

/* Rename the temporary directory to its final path and free rd. On
 * failure the temporary directory is removed, rd is freed, and VG_EIO is
 * returned. */
VG_API vg_status vg_rundir_commit(vg_rundir *rd, vg_error *err);

/* Remove the temporary directory and everything in it, and free rd. NULL
 * does nothing. */
VG_API void vg_rundir_abort(vg_rundir *rd);

/* Open name inside rd for writing; *fp receives the stream. */
VG_API vg_status vg_rundir_open(vg_rundir *rd, const char *name, FILE **fp,
                                vg_error *err);

/* ---- a directory of files, written whole ---------------------------------- */

/* Fill the file at path (opened as fp) from ctx. Returns VG_OK or the
 * error, with path. */
typedef vg_status (*vg_file_writer)(void *ctx, FILE *fp, const char *path, vg_error *err);

/* One file of an output directory: its name inside the directory and the
 * writer that fills it. */
typedef struct vg_outdir_file {
    const char *name;
    vg_file_writer write;
    void *ctx;
} vg_outdir_file;

/* Draw the plots of an output directory into rd (vg_rundir_file names
 * their paths; the writer makes any subdirectory it needs). */
typedef vg_status (*vg_outdir_plots)(vg_rundir *rd, void *ctx, vg_error *err);

/* Write the directory dir: the n files in order, plots(rd, plots_ctx)
 * just before the last one (when plots is not NULL), then rename the
 * whole into place. plot_names lists every path the plots step creates
 * ("plots/x.svg", ..., then "plots" itself), NULL-terminated, so that a
 * signal handler (vg_rundir_handle_signals) can remove them; NULL when
 * there are no plots. On any failure, or when a handled signal arrived
 * meanwhile (VG_EINTERRUPTED), nothing is left at dir and the error is
 * returned. VG_EIO when dir exists. */
VG_API vg_status vg_outdir_write(const char *dir, const vg_outdir_file *files, size_t n,
                                 const char *const *plot_names, vg_outdir_plots plots,
                                 void *plots_ctx, vg_error *err);

/* ---- signals ---------------------------------------------------------------- */

/* Install SIGINT and SIGTERM handlers for the whole process: a signal
 * that arrives while an output directory is written removes its
 * temporary files and exits with status 128 + the signal number (as a
 * shell reports a killed process); at any other time it sets the flag
 * vg_interrupted reads and takes the default action. For programs that
 * own their signals (the vecgauge command); a library user with handlers
 * of its own leaves this alone. */
VG_API void vg_rundir_handle_signals(void);

/* 1 once a signal handled by vg_rundir_handle_signals has arrived, else 0. */
VG_API int vg_interrupted(void);

/* ---- provenance ------------------------------------------------------------- */

/* The current UTC time as ISO 8601 ("2026-12-02T10:00:00Z") and as a
 * stamp for directory names ("20261202T100000Z"). SOURCE_DATE_EPOCH
 * (reproducible-builds.org), when set to a whole number of seconds, pins
 * the time, so that tests and examples can compare whole files. */
VG_API void vg_utc_now(char iso[32], char stamp[32]);

#ifdef __cplusplus
}
#endif

#endif /* VG_RUNDIR_H */
