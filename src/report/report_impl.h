/* report_impl.h - helpers shared by the report writers.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_REPORT_IMPL_H
#define VG_REPORT_IMPL_H

#include <stdio.h>

#include "../common/internal.h"
#include "vecgauge/report.h"
#include "vecgauge/results.h"

/* Write one CSV field: as is when it needs no quoting, else quoted by
 * libcsv (doubling inner quotes). Then sep (',' or '\n') if non-zero. */
VG_INTERNAL void vg_csv_field(FILE *fp, const char *s, char sep);

/* A double as a CSV field (round-trip formatting; NaN is empty). */
VG_INTERNAL void vg_csv_double(FILE *fp, double x, char sep);

/* An unsigned count as a CSV field. */
VG_INTERNAL void vg_csv_size(FILE *fp, size_t x, char sep);

/* Write s with LaTeX's special characters escaped. */
VG_INTERNAL void vg_tex_text(FILE *fp, const char *s);

/* Escape s for a Markdown table cell ('|' and newlines). */
VG_INTERNAL void vg_md_cell(FILE *fp, const char *s);

/* ---- summary.md helpers (summary_md.c) --------------------------------- */

/* 1 if any suite of r has task t. */
VG_INTERNAL int vg_results_has_task(const vg_results *r, vg_task t);

/* The set with the highest value of (suite k, subset, metric m) on the
 * covered items, or (size_t)-1 when none has a value; ties keep the first. */
VG_INTERNAL size_t vg_md_best_set(const vg_results *r, size_t k, const char *subset,
                                  vg_metric m);

/* " [low, high]" of row's headline interval, or "" without one. */
VG_INTERNAL const char *vg_md_interval(const vg_score_row *row, char buf[80]);

/* How the headline intervals of task t were made ("BCa bootstrap",
 * "Wilson", ...), or "no". */
VG_INTERNAL const char *vg_md_headline_method(const vg_results *r, vg_task t);

/* A table header: first, then one column per vector set; the alignment
 * row starts with align. */
VG_INTERNAL void vg_md_set_header(const vg_results *r, FILE *fp, const char *first,
                                  const char *align);

/* The sections (summary_similarity.c, summary_analogy.c). */
VG_INTERNAL void vg_md_similarity(const vg_results *r, FILE *fp);
VG_INTERNAL void vg_md_fold_case(const vg_results *r, FILE *fp);
VG_INTERNAL void vg_md_intervals(const vg_results *r, FILE *fp);
VG_INTERNAL void vg_md_analogy(const vg_results *r, FILE *fp);

/* ---- comparison and merge summaries (comparison_md.c) ------------------ */
/* "## Provenance" of a directory made from saved runs: tool, when (the
 * line's label, e.g. "compared at"), command. */
VG_INTERNAL void vg_md_short_provenance(FILE *fp, const vg_provenance *prov, const char *when);

#endif /* VG_REPORT_IMPL_H */
