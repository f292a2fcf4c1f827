/* eval_impl.h - building a vg_results table.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_EVAL_IMPL_H
#define VG_EVAL_IMPL_H

#include "../common/internal.h"
#include "vecgauge/results.h"

/* Append a row (copied) to r. subset must be a string that outlives r
 * (a suite's section name or a static string). -1 when out of memory. */
VG_INTERNAL int vg_results_add_row(vg_results *r, size_t *cap, const vg_score_row *row);

/* Build vg_results_find's index once every row is in (rows must not be
 * added after). VG_ENOMEM on allocation failure. */
VG_INTERNAL vg_status vg_results_index(vg_results *r, vg_error *err);

/* Add interval iv to row (ignored beyond VG_MAX_INTERVALS). */
VG_INTERNAL void vg_row_add_interval(vg_score_row *row, double low, double high,
                                     const char *method);

/* The rows of one similarity block (set, suite) in their fixed order. */
VG_INTERNAL vg_status vg_eval_similarity_rows(vg_results *r, size_t *cap, size_t set,
                                              size_t suite, const vg_eval_options *opt,
                                              vg_error *err);

/* Allocate r->agreement and fill it for every suite (NaN where a suite
 * has no individual ratings). */
VG_INTERNAL vg_status vg_eval_agreement(vg_results *r, vg_error *err);

/* The rows of one analogy block (set, suite): per subset (the whole suite,
 * each section when there are several, each group), per method, accuracy
 * on the covered questions and on all questions (uncovered ones wrong),
 * each with its Wilson interval and, when opt->bootstrap > 0, a bootstrap
 * percentile interval. */
VG_INTERNAL vg_status vg_eval_analogy_rows(vg_results *r, size_t *cap, size_t set,
                                           size_t suite, const vg_eval_options *opt,
                                           vg_error *err);

#endif /* VG_EVAL_IMPL_H */
