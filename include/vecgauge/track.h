/* track.h - a training history: every run's headline scores by step, the
 * runs each new one is compared with, and the regression verdict.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * A history is a CSV file of headline scores (one line per suite and
 * run) that many jobs may append to at once. Tracking a run compares it,
 * item by item, with the previous run of the history and with the best
 * earlier run of each suite (paired tests of vg_compare on the saved
 * items, Holm-adjusted), and calls a suite regressed when the run is
 * significantly worse than either. The run comes from a run directory
 * (vg_track_begin) or from in-process results already written to one
 * (vg_track_begin_results); the earlier runs always come from the run
 * directories the history names.
 */
#ifndef VG_TRACK_H
#define VG_TRACK_H

#include <stddef.h>
#include <stdint.h>
#include <stdio.h>

#include "compare.h"
#include "error.h"
#include "report.h"
#include "results.h"
#include "vg_config.h"

#ifdef __cplusplus
extern "C" {
#endif

/* ---- the history file ------------------------------------------------------ */

/* One line of a history file: a set's headline score on a suite at a
 * step of training. */
typedef struct vg_history_row {
    uint64_t step;
    const char *run;         /* the run directory, as recorded */
    const char *vectors;
    const char *suite;
    vg_task task;
    const char *metric;
    double value, low, high;
    const char *interval;
    size_t n_items, n_used;
    const char *recorded;    /* UTC time of the append */
    uint64_t line;           /* line in the file (0 for a new row) */
} vg_history_row;

/* The header line of a history file, without the newline. */
VG_API const char *vg_history_header(void);

/* An open history, locked. */
typedef struct vg_history {
    char *path;
    vg_history_row *rows;
    size_t n_rows;
    void *priv_;
} vg_history;

/* Open path for appending (created, with mode 0666 & ~umask, if absent),
 * take an exclusive flock(2) on it, waiting for other holders, and read
 * every row. Rows are checked: the header must be vg_history_header(),
 * every line complete, steps and counts whole numbers; VG_EFORMAT with
 * the line otherwise (the file is never repaired or rewritten). The lock
 * is held until vg_history_close. */
VG_API vg_status vg_history_open(const char *path, vg_history **out, vg_error *err);

/* Append rows (the header first when the file is empty) with one
 * write(2) on the O_APPEND descriptor, so a crash leaves either all of
 * them or none. VG_EIO when the write fails or is short. */
VG_API vg_status vg_history_append(vg_history *h, const vg_history_row *rows, size_t n,
                                   vg_error *err);

/* Release the lock, close and free. NULL does nothing. */
VG_API void vg_history_close(vg_history *h);

/* One point of a suite's curve in a track plot. */
typedef struct vg_track_point {
    double step;
    double value, low, high; /* low/high NaN: no band at that point */
    int current;             /* the run just tracked */
    int best;                /* the best earlier run (the reference) */
    int regressed;           /* significantly below a reference */
} vg_track_point;

/* Plot a suite's score against step with the interval as a band, the
 * current run and the best earlier run marked; SVG and PNG as for
 * vg_plot_comparison. */
VG_API vg_status vg_plot_track(const char *suite, const char *metric, const char *ylabel,
                               const vg_track_point *pts, size_t n, const char *svg_path,
                               const char *png_path, vg_error *err);

/* ---- tracking a run ------------------------------------------------------ */

/* vg_track_options.step: the largest step in the history + 1 (1 for an
 * empty history). */
#define VG_TRACK_NEXT_STEP UINT64_MAX

typedef struct vg_track_options {
    uint64_t step;              /* this run's training step, at most
                                   UINT64_MAX / 2; VG_TRACK_NEXT_STEP */
    int allow_existing_step;    /* 0 (default): a step the history already
                                   holds is refused with VG_EINVAL; 1: the
                                   run is added beside it */
    const char *vectors;        /* label of the set tracked; NULL: the run's
                                   only set */
    vg_compare_options compare; /* alpha and threads; seed, replicates and
                                   level too where the flags below are 0
                                   (items, methods, pairs are set by track) */
    int seed_from_run;          /* 1 (default): the seed the run recorded */
    int replicates_from_run;    /* 1 (default): its bootstrap replicates */
    int level_from_run;         /* 1 (default): its confidence level */
} vg_track_options;

VG_API void vg_track_options_init(vg_track_options *opt);

/* A run being tracked into a history: the history is locked from
 * vg_track_begin until vg_track_append (or vg_track_free). */
typedef struct vg_track vg_track;

/* Start tracking the run directory run_dir into the history file at
 * history (created if absent): read the run, lock and read the history
 * (vg_history_open), choose the step, choose the references and compare
 * the run with them. Nothing is written.
 *
 * References, both strictly earlier than the step: the previous run
 * (the largest earlier step; of two lines at that step, the later) and,
 * for each suite, the best earlier run on its headline metric (the
 * highest value; ties to the earlier line; undefined values never). Rows
 * of the same run directory and set as this one are never references.
 * Each reference is compared on every suite where it is the previous
 * run or that suite's best, labelled "step N" ("step N/LABEL" for its
 * other sets, "step N #2" for a second run at one step). A suite is
 * regressed when a comparison there is significant after Holm's
 * adjustment (opt->compare.alpha) and the run is the worse one.
 *
 * The history records run_dir relative to the history file's folder
 * (absolute when they share nothing but the root), so the two can move
 * together; the reference runs are read from there.
 *
 * VG_EINVAL for a caller's mistake: a step already in the history
 * (unless opt->allow_existing_step), no set with label opt->vectors, a
 * run of several sets without opt->vectors. Else the error of reading
 * the run, the history (VG_EFORMAT) or a reference run (its message
 * prefixed with its step and the history), VG_EFORMAT when a reference
 * run cannot be paired with this one, VG_ENOMEM. On success *out owns the
 * track (vg_track_free); opt may be NULL for the defaults. */
VG_API vg_status vg_track_begin(const char *history, const char *run_dir,
                                const vg_track_options *opt, vg_track **out, vg_error *err);

/* As vg_track_begin for in-process results res (vg_evaluate) already
 * written to the run directory run_dir (which the history records and
 * later tracks read). The run is taken from res, exactly as run_dir's
 * files hold it; res must outlive the track. */
VG_API vg_status vg_track_begin_results(const char *history, const char *run_dir,
                                        const vg_results *res, const vg_track_options *opt,
                                        vg_track **out, vg_error *err);

/* Append the run's rows to the history (vg_history_append: one write) and
 * release the lock. VG_EINVAL when already appended; else the write's
 * error (the lock is released either way). */
VG_API vg_status vg_track_append(vg_track *t, vg_error *err);

/* Release the lock if still held, and free. NULL does nothing. */
VG_API void vg_track_free(vg_track *t);

/* The step of the run. */
VG_API uint64_t vg_track_step(const vg_track *t);

/* The tracked set's label, and the run directory as given. */
VG_API const char *vg_track_label(const vg_track *t);
VG_API const char *vg_track_run_dir(const vg_track *t);

/* The run directory as the history records it. */
VG_API const char *vg_track_recorded_run(const vg_track *t);

/* Distinct runs (step, run, set) in the history before this one. */
VG_API size_t vg_track_runs_before(const vg_track *t);

/* The comparisons with the references (labels "step N", the run first in
 * every pair), or NULL for the first run of a history. Owned by t. */
VG_API const vg_comparisons *vg_track_comparisons(const vg_track *t);

/* The run's suites, in its order. */
VG_API size_t vg_track_n_suites(const vg_track *t);
VG_API const char *vg_track_suite_id(const vg_track *t, size_t k);

/* 1 when suite k regressed, else 0; vg_track_n_regressed counts them. */
VG_API int vg_track_regressed(const vg_track *t, size_t k);
VG_API size_t vg_track_n_regressed(const vg_track *t);

/* The references: their number; the step and recorded run directory of
 * reference i; whether it is the previous run; the reference that is
 * suite k's best earlier run (-1: none). */
VG_API size_t vg_track_n_references(const vg_track *t);
VG_API uint64_t vg_track_reference_step(const vg_track *t, size_t i);
VG_API const char *vg_track_reference_run(const vg_track *t, size_t i);
VG_API int vg_track_reference_is_previous(const vg_track *t, size_t i);
VG_API long vg_track_best(const vg_track *t, size_t k);

/* The report of the track as text (stdout of `vecgauge track`): the step
 * added, the comparisons and the verdict. VG_EIO when writing fails. */
VG_API vg_status vg_track_report_text(const vg_track *t, FILE *fp, vg_error *err);

/* summary.md of a track report: the step, the verdict, the comparison
 * section (vg_report_comparison_md) and the provenance (may be NULL). */
VG_API vg_status vg_track_summary_md(const vg_track *t, const vg_provenance *prov, FILE *fp,
                                     const char *path, vg_error *err);

/* The plot of every suite's headline score by step (vg_plot_track) into
 * dir (made if absent) as SUITE.svg and SUITE.png, the history with this
 * run included; each file is drawn under a temporary name and renamed
 * over the old one, so a reader never sees half a plot. VG_EIO. */
VG_API vg_status vg_track_write_plots(const vg_track *t, const char *dir, vg_error *err);

/* The default folder of the plots beside a history: its path without
 * ".csv", plus "-plots", in buf (at most size bytes, NUL-terminated).
 * Returns the length it needs (as snprintf). */
VG_API size_t vg_track_plots_dir(const char *history, char *buf, size_t size);

/* A track report directory at dir, written whole (vg_outdir_write):
 * comparison.csv (when there are references), summary.md, and
 * plots/SUITE.svg and .png. VG_EIO when dir exists. */
VG_API vg_status vg_track_write_report(const vg_track *t, const char *dir,
                                       const vg_provenance *prov, vg_error *err);

#ifdef __cplusplus
}
#endif

#endif /* VG_TRACK_H */
