/* suite_impl.h - helpers shared by the suite readers.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_SUITE_IMPL_H
#define VG_SUITE_IMPL_H

#include <stddef.h>

#include "../common/arena.h"
#include "../common/internal.h"
#include "../common/lines.h"
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

/* Record the file lr has read to its end (path, size, sha256 of the
 * stored bytes) in s->files. */
VG_INTERNAL vg_status vg_suite_add_file(vg_suite *s, vg_lines *lr, vg_error *err);

/* Count duplicates, reversed duplicates and self-pairs of a pair suite. */
VG_INTERNAL vg_status vg_suite_count_pair_stats(vg_suite *s, vg_error *err);

/* Count duplicate questions (the same a, b, c and first answer as an
 * earlier one, in any section) and multi-word entries of an analogy suite. */
VG_INTERNAL vg_status vg_suite_count_question_stats(vg_suite *s, vg_error *err);

/* Start a new section named name[0..n) at the current item. */
VG_INTERNAL vg_status vg_suite_open_section(vg_suite *s, const char *name, size_t n,
                                            const char *path, uint64_t lineno, vg_error *err);

/* Append the question w[0] : w[1] :: w[2] : ? (words copied, interned)
 * with answers (already in the suite's arena, n_answers >= 1) to the
 * last section. */
VG_INTERNAL vg_status vg_suite_add_abc(vg_suite *s, const char *const w[3], const size_t wlen[3],
                                       const char *const *answers, size_t n_answers,
                                       uint64_t lineno, const char *path, vg_error *err);

/* The relation layout (relation.c): lr is one relation file already open
 * (path its name), or NULL for path a directory searched for *.txt
 * relation files, one section each. */
VG_INTERNAL vg_status vg_suite_read_relation(const char *path, vg_lines *lr, vg_suite *s,
                                             vg_error *err);

/* The split layout (split.c): questions "a b c" from lq (open), answers
 * in apath. */
VG_INTERNAL vg_status vg_suite_read_split(vg_lines *lq, const char *apath, vg_suite *s,
                                          vg_error *err);

/* The built-in manifest: benchmarks-manifest/suites.csv, compiled in by
 * the Makefile (build/gen/manifest_csv.c) so that the tool needs no file
 * at run time. Not NUL-terminated. */
VG_INTERNAL extern const char vg_manifest_builtin[];
VG_INTERNAL extern const size_t vg_manifest_builtin_len;

/* The file name part of path (after the last '/'). */
VG_INTERNAL const char *vg_path_basename(const char *path);

/* The file name without directory, ".gz" and its last extension, copied
 * into buf ("data/EN-WS-353-SIM.txt.gz" -> "EN-WS-353-SIM"). */
VG_INTERNAL char *vg_path_stem(const char *path, char *buf, size_t size);

#endif /* VG_SUITE_IMPL_H */
