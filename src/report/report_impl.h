/* report_impl.h - helpers shared by the report writers.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_REPORT_IMPL_H
#define VG_REPORT_IMPL_H

#include <stdio.h>

#include "../common/internal.h"

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

#endif /* VG_REPORT_IMPL_H */
