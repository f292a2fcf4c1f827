/* suite_impl.h - helpers shared by the suite readers.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_SUITE_IMPL_H
#define VG_SUITE_IMPL_H

#include <stddef.h>

#include "../common/arena.h"
#include "../common/internal.h"
#include "vecgauge/suite.h"

/* The private part of a vg_suite (vg_suite.priv_). */
typedef struct vg_suite_priv {
    vg_arena arena;      /* every string and small array of the suite */
    size_t cap_items;
    size_t cap_sections;
} vg_suite_priv;

/* A new empty suite of the given task, id copied. NULL when out of memory. */
VG_INTERNAL vg_suite *vg_suite_new(vg_task task, const char *id);

/* The suite's arena. */
VG_INTERNAL vg_arena *vg_suite_arena(vg_suite *s);

/* Copy s[0..n) NFC-normalised into the suite's arena. NULL when out of memory. */
VG_INTERNAL char *vg_suite_intern(vg_suite *s, const char *str, size_t n);

/* Append a zeroed pair or question; NULL when out of memory. */
VG_INTERNAL vg_pair *vg_suite_add_pair(vg_suite *s);
VG_INTERNAL vg_question *vg_suite_add_question(vg_suite *s);

/* Record the file (path, size, sha256) in s->files. */
VG_INTERNAL vg_status vg_suite_add_file(vg_suite *s, const char *path, vg_error *err);

/* Count duplicates, reversed duplicates and self-pairs of a pair suite. */
VG_INTERNAL vg_status vg_suite_count_pair_stats(vg_suite *s, vg_error *err);

/* The file name part of path (after the last '/'). */
VG_INTERNAL const char *vg_path_basename(const char *path);

/* The file name without directory, ".gz" and its last extension, copied
 * into buf ("data/EN-WS-353-SIM.txt.gz" -> "EN-WS-353-SIM"). */
VG_INTERNAL char *vg_path_stem(const char *path, char *buf, size_t size);

#endif /* VG_SUITE_IMPL_H */
