/* csvread.h - reading a whole CSV file into memory through libcsv.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * For the project's own CSV files read back (scores.csv, items.csv, a
 * history file): RFC 4180 quoting, CRLF or LF, a header row naming the
 * columns. Every record keeps the line it started on, for messages.
 */
#ifndef VG_CSVREAD_H
#define VG_CSVREAD_H

#include <stddef.h>
#include <stdint.h>

#include "arena.h"
#include "internal.h"
#include "vecgauge/error.h"

typedef struct vg_csv_record {
    char **field;      /* NUL-terminated, in the table's arena */
    size_t n;
    uint64_t line;     /* 1-based line the record starts on */
} vg_csv_record;

typedef struct vg_csv_table {
    char *path;
    vg_csv_record *rec;   /* rec[0] is the header row */
    size_t n_rec, cap_rec;
    vg_arena arena;
} vg_csv_table;

/* Read path (plain or gzip; a regular file: anything else is VG_EINVAL
 * saying what it is). Files larger than max_bytes once decompressed are
 * refused with VG_ELIMIT. A malformed quoted field is VG_EFORMAT with the line.
 * An empty file gives a table with no records. */
VG_INTERNAL vg_status vg_csv_load(const char *path, size_t max_bytes, vg_csv_table **out,
                                  vg_error *err);

VG_INTERNAL void vg_csv_free(vg_csv_table *t);

/* Index of the header column named name, or -1. */
VG_INTERNAL long vg_csv_column(const vg_csv_table *t, const char *name);

/* Check that the header holds every name in names (NULL-terminated) and
 * fill idx with their columns. VG_EFORMAT naming the first missing
 * column otherwise. */
VG_INTERNAL vg_status vg_csv_require(const vg_csv_table *t, const char *const *names, long *idx,
                                     vg_error *err);

#endif /* VG_CSVREAD_H */
