/* track_impl.h - the parts of tracking shared between its files.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_TRACK_IMPL_H
#define VG_TRACK_IMPL_H

#include <stddef.h>
#include <stdint.h>

#include "../common/internal.h"
#include "vecgauge/rundir.h"
#include "vecgauge/track.h"

/* A run of the history the tracked run is compared with: (run, vectors)
 * as recorded, at a step. */
typedef struct vg_track_ref {
    char *run;
    char *vectors;
    uint64_t step;
    int prev;               /* it is the previous run */
} vg_track_ref;

/* What vg_track_select chooses. */
typedef struct vg_track_refs {
    vg_track_ref *refs;     /* [0] the previous run when there is one */
    size_t n_refs;
    long *best_of;          /* n_suites: index into refs, -1 for none */
} vg_track_refs;

/* A suite of the tracked run, as selection sees it. */
typedef struct vg_track_suite {
    const char *id;
    vg_task task;
} vg_track_suite;

/* The headline metric of a task as the history and saved runs name it
 * ("spearman", "3cosadd"). */
VG_INTERNAL const char *vg_track_headline(vg_task task);

/* The largest step of the rows + 1 (1 for none). */
VG_INTERNAL uint64_t vg_track_next_step(const vg_history_row *rows, size_t n);

/* The first row at step, or -1. */
VG_INTERNAL long vg_track_step_row(const vg_history_row *rows, size_t n, uint64_t step);

/* Distinct (step, run, vectors) among the rows. */
VG_INTERNAL size_t vg_track_count_runs(const vg_history_row *rows, size_t n);

/* The references of the run (run, vectors) at step among the history's
 * rows, as vg_track_begin describes them: every reference strictly
 * earlier than step and never the run itself. *out owns copies of the
 * strings (vg_track_refs_free). VG_ENOMEM. */
VG_INTERNAL vg_status vg_track_select(const vg_history_row *rows, size_t n_rows,
                                      const char *run, const char *vectors, uint64_t step,
                                      const vg_track_suite *suites, size_t n_suites,
                                      vg_track_refs *out, vg_error *err);
VG_INTERNAL void vg_track_refs_free(vg_track_refs *r);

/* The suites regressed in c: regressed[k] = 1 for suite k of ids (n)
 * when a row of c on that suite is significant with a difference below
 * zero (the tracked set is set_a of every row). */
VG_INTERNAL void vg_track_verdict(const vg_comparisons *c, const char *const *ids, size_t n,
                                  unsigned char *regressed);

/* Paths: the folder holding path; target relative to the folder from
 * (both absolute and canonical), or target itself when they share nothing
 * but the root; a recorded run path as a path from the working directory.
 * New strings (vg_free), NULL when out of memory. */
VG_INTERNAL char *vg_track_folder_of(const char *path);
VG_INTERNAL char *vg_track_relative(const char *from, const char *target);
VG_INTERNAL char *vg_track_resolve(const char *folder, const char *recorded);

/* A copy of a history row, for the plots. */
typedef struct vg_track_row {
    double step, value, low, high;
    char *suite, *metric, *run, *vectors;
} vg_track_row;

struct vg_track {
    char *history;          /* as given */
    char *hist_folder;      /* its folder, as given */
    vg_saved_run *cur;      /* the tracked run (owned) */
    size_t cur_set;
    char *label;            /* the tracked set's own label */
    char *recorded;         /* cur's directory as the history records it */
    uint64_t step;
    vg_history *h;          /* locked until the append */
    vg_history_row *mine;   /* the rows appended (n = cur->n_suites) */
    char utc[32];           /* their recorded_utc */
    vg_track_refs sel;
    vg_saved_run **runs;    /* [0] = cur (borrowed), then one per reference */
    vg_paired_items *items;
    vg_comparisons *cmp;
    unsigned char *regressed; /* cur suite k */
    size_t runs_before;
    vg_track_row *rows;     /* the history with this run's rows */
    size_t n_rows;
    size_t n_before;        /* rows before this run's */
    double alpha;
};

#endif /* VG_TRACK_IMPL_H */
