/* fields.h - splitting one line of a suite file into fields.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Tab- and comma-separated lines with a field that opens with a double
 * quote go through libcsv, so quoted fields ("New York",...) and doubled
 * quotes are handled by the library rather than by hand; without one,
 * the line is cut at each delimiter and a quote inside a word (12")
 * stays literal. Blank-separated lines are split on runs of spaces/tabs.
 */
#ifndef VG_FIELDS_H
#define VG_FIELDS_H

#include <stddef.h>

#include "../common/internal.h"
#include "vecgauge/error.h"

typedef struct vg_fields {
    char **field;      /* NUL-terminated, valid until the next split */
    size_t *flen;
    size_t n, cap;
    char *buf;         /* storage for the fields */
    size_t buf_used, buf_cap;
    int oom;
    void *csv;         /* struct csv_parser, lazily created */
    char csv_delim;
} vg_fields;

#define VG_FIELDS_INIT {0}

/* Split line (len bytes) by delim: '\t' or ',' (through libcsv when a
 * field opens with a quote; spaces around fields trimmed, trailing empty
 * fields dropped), ' ' for runs of blanks (leading and trailing blanks
 * ignored). Returns VG_OK,
 * VG_ENOMEM, or VG_EFORMAT for a malformed quoted field (err names path
 * and line). */
VG_INTERNAL vg_status vg_fields_split(vg_fields *f, const char *line, size_t len, char delim,
                                      const char *path, uint64_t lineno, vg_error *err);

VG_INTERNAL void vg_fields_free(vg_fields *f);

/* Parse a whole field as a finite decimal double. 0 on success, -1
 * otherwise: also for hexadecimal ("0x10", which strtod reads as 16) and
 * for digits that are not all zero but read as 0 ("5e-99999"). */
VG_INTERNAL int vg_parse_double(const char *s, size_t n, double *out);

#endif /* VG_FIELDS_H */
