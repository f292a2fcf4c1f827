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
 *
 * Run directories are also read back here: run.json for a rerun
 * (vg_run_record_read), and whole runs (vg_saved_run_load) to compare,
 * merge or track them without the vector files.
 */
#ifndef VG_RUNDIR_H
#define VG_RUNDIR_H

#include <stddef.h>
#include <stdio.h>

#include "compare.h"
#include "error.h"
#include "report.h"
#include "results.h"
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

/* ---- run.json ------------------------------------------------------------------ */

/* Write run.json (through jansson): tool version and git describe, UTC
 * time, the command line (text and argv) and working directory, every
 * option with its effective value, seed and bootstrap replicates, and for
 * every vector file and suite file its path, size, sha256 and what the
 * reader found (layout, rows, dims, duplicates, zero rows, ...). */
VG_API vg_status vg_report_run_json(const vg_results *r, const vg_provenance *prov,
                                    FILE *fp, const char *path, vg_error *err);

/* What `vecgauge rerun` needs from a saved run.json. */
typedef struct vg_run_record {
    char *tool_version;
    char *cwd;
    char **argv;           /* argc entries; argv[0] is the program name */
    char *data_dir;        /* options.data: the data directory read, or NULL */
    size_t argc;
    char **files;          /* every input file recorded (vectors and suites) */
    char **sha256;         /* its recorded hash ("" when not hashed) */
    size_t n_files;
} vg_run_record;

/* Read the parts of run.json that a rerun needs. VG_EFORMAT (with the
 * line and column jansson reports) for a file that is not JSON or lacks a
 * required key. On success *out owns a record to free with
 * vg_run_record_free. */
VG_API vg_status vg_run_record_read(const char *path, vg_run_record **out, vg_error *err);

/* NULL does nothing. */
VG_API void vg_run_record_free(vg_run_record *rec);

/* ---- saved run directories --------------------------------------------- */

/* One suite as saved in a run directory. */
typedef struct vg_saved_suite {
    char *id;
    vg_task task;
    size_t n_items;
    char **words;            /* n_items * 4: word1, word2, word3, expected */
    double *rating;          /* similarity: n_items */
    char **sha256;           /* from run.json: the suite files' digests */
    size_t n_files;
    char **sections;         /* n_items: each item's subset in items.csv ("" for
                                none); NULL when items.csv has no such column */
} vg_saved_suite;

/* A set's headline score on a suite, from scores.csv (or, for an analogy
 * suite without a 3cosadd row, the accuracy over answered questions from
 * items.csv, without interval). */
typedef struct vg_saved_score {
    const char *metric;      /* "spearman" or "3cosadd" (static) */
    double value, low, high; /* NaN where absent */
    char *interval;          /* ci_method ("" if none) */
    size_t n_items, n_used;
} vg_saved_score;

/* A run directory read back: run.json, scores.csv and items.csv. */
typedef struct vg_saved_run {
    char *dir;
    char *utc_time;          /* from run.json ("" if absent) */
    char *command_line;
    uint64_t seed;
    size_t bootstrap;
    double level;
    size_t n_sets;
    char **labels;           /* n_sets, from run.json's vector_sets */
    size_t n_suites;
    vg_saved_suite *suites;  /* in run.json's order */
    double **cosine;         /* [set * n_suites + k]: similarity cosines, NaN unscored */
    signed char **correct;   /* [(set * n_suites + k) * VG_METHOD_COUNT + m] */
    vg_saved_score *scores;  /* [set * n_suites + k] */
    void *priv_;             /* the tables read; not API */
} vg_saved_run;

/* Read the run directory dir. Every item of every set on every suite must
 * be in items.csv exactly once, its words and rating the same for every
 * set. VG_EIO when a file is missing, VG_EFORMAT (file and line) when a
 * file does not hold what vecgauge writes. *out is freed with
 * vg_saved_run_free. */
VG_API vg_status vg_saved_run_load(const char *dir, vg_saved_run **out, vg_error *err);

/* The run that reading back a run directory written from res would give
 * (its items, cosines, answers and headline scores, which the files
 * round-trip exactly), made in memory without reading any file; dir
 * becomes its dir (where res was or will be written). utc_time and
 * command_line are "". *out copies what it needs from res and is freed
 * with vg_saved_run_free. VG_ENOMEM. */
VG_API vg_status vg_saved_run_from_results(const vg_results *res, const char *dir,
                                           vg_saved_run **out, vg_error *err);

/* NULL does nothing. */
VG_API void vg_saved_run_free(vg_saved_run *r);

/* Replace the label of set s (a copy of label is made). VG_ENOMEM. */
VG_API vg_status vg_saved_run_relabel(vg_saved_run *r, size_t s, const char *label,
                                      vg_error *err);

/* Pair the sets of n runs item by item, runs in order, sets in each run's
 * order. strict = 1: every run must hold the same suites (same ids in any
 * order, taken in the first run's order); strict = 0: only the suites
 * every run holds are paired (in the first run's order). A suite paired
 * must agree in every run: task, item count, the words and rating of each
 * item, and the sha256 of its files; else VG_EINVAL naming the suite, the
 * runs and the first difference. Two sets with the same label are
 * VG_EINVAL. *out borrows from the runs (which must outlive it) and is
 * freed with vg_paired_items_free. */
VG_API vg_status vg_saved_runs_pair(const vg_saved_run *const *runs, size_t n, int strict,
                                    vg_paired_items **out, vg_error *err);

/* ---- merging run directories ------------------------------------------- */

/* The files of a merged run directory, each written to fp, labels as in
 * the runs (relabel them first). The runs must pair strictly
 * (vg_saved_runs_pair). scores.csv, intervals.csv, items.csv and
 * missing.csv are the runs' rows in order; agreement.csv is the first
 * run's (it depends on the suites alone). */
VG_API vg_status vg_merge_csv(const vg_saved_run *const *runs, size_t n, const char *name,
                              FILE *fp, const char *path, vg_error *err);

/* run.json of the merged directory: the first run's suites and settings,
 * every run's vector sets (with their labels now), and "merged_from":
 * each run's directory, time and command line. prov is this command's
 * provenance. */
VG_API vg_status vg_merge_run_json(const vg_saved_run *const *runs, size_t n,
                                   const vg_provenance *prov, FILE *fp, const char *path,
                                   vg_error *err);

/* summary.md of the merged directory: the headline score of every set on
 * every suite with its interval, and where each set came from. */
VG_API vg_status vg_merge_summary_md(const vg_saved_run *const *runs, size_t n,
                                     const vg_provenance *prov, FILE *fp, const char *path,
                                     vg_error *err);

/* ---- a comparison directory (vecgauge compare) ------------------------- */

/* summary.md of a comparison of saved runs: the scores of every set on
 * the compared items, the comparison section (vg_report_comparison_md),
 * the runs compared and the provenance. prov may be NULL. */
VG_API vg_status vg_report_compare_summary_md(const vg_comparisons *c,
                                              const vg_saved_run *const *runs, size_t n,
                                              const vg_provenance *prov, FILE *fp,
                                              const char *path, vg_error *err);

/* compare.json (through jansson): tool, time, command line, the options
 * in effect, and each run compared (directory, time, command, sets). */
VG_API vg_status vg_report_compare_json(const vg_comparisons *c, const vg_saved_run *const *runs,
                                        size_t n, const vg_provenance *prov, FILE *fp,
                                        const char *path, vg_error *err);

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
