/* saved_impl.h - what the readers of saved runs share (merge, pairing).
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_SAVED_IMPL_H
#define VG_SAVED_IMPL_H

#include <jansson.h>

#include "../common/csvread.h"
#include "../common/internal.h"
#include "vecgauge/rundir.h"

/* What a vg_saved_run keeps behind its public fields (r->priv_). */
typedef struct saved_priv {
    vg_csv_table *items;
    vg_csv_table *scores;
    vg_csv_table *intervals;
    vg_csv_table *agreement;
    vg_csv_table *missing;
    json_t *json;
    char **original;     /* the labels as in the run's files */
    char **words;        /* a run made from results: per suite, the block
                            its words point into (the tables' fields
                            otherwise) */
} saved_priv;

/* run.json as read (owned by r). */
VG_INTERNAL json_t *vg_saved_json(const vg_saved_run *r);

/* A CSV table of the run ("items.csv", "scores.csv", "intervals.csv",
 * "agreement.csv", "missing.csv"), or NULL when the run has none. */
VG_INTERNAL vg_csv_table *vg_saved_table(const vg_saved_run *r, const char *name);

/* The set whose label in the run's own files is label (before any
 * relabelling), or -1. */
VG_INTERNAL long vg_saved_original_set(const vg_saved_run *r, const char *label);

/* The headline score of block b (set * n_suites + suite) of an analogy
 * suite without a 3cosadd row: 3CosAdd's accuracy over the questions
 * answered, from the items, without interval. */
VG_INTERNAL void vg_saved_answered_accuracy(vg_saved_run *r, size_t b);

/* "## title", then one line per saved run: its directory, time (and with
 * settings, its seed and resamples) and vector sets (compare_summary.c). */
VG_INTERNAL void vg_md_saved_runs(FILE *fp, const char *title, const vg_saved_run *const *runs,
                                  size_t n, int settings);

/* dir/name in a new string (vg_free), or NULL. */
VG_INTERNAL char *vg_saved_path(const char *dir, const char *name);

#endif /* VG_SAVED_IMPL_H */
