/* suite.h - benchmark suites: word-pair similarity sets and analogy sets.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * A vg_suite is one benchmark read into memory: its items (pairs or
 * questions) with every string in one arena owned by the suite, plus what
 * the reader noticed (duplicates, self-pairs, ...) and the files it read
 * (path, size, sha256) for provenance. Suites are immutable once read.
 */
#ifndef VG_SUITE_H
#define VG_SUITE_H

#include <stddef.h>
#include <stdint.h>

#include "error.h"
#include "vg_config.h"

#ifdef __cplusplus
extern "C" {
#endif

typedef enum vg_task {
    VG_TASK_SIMILARITY = 1, /* human-rated word pairs */
    VG_TASK_ANALOGY = 2     /* a : b :: c : d questions */
} vg_task;

/* "similarity" or "analogy". Never NULL. */
VG_API const char *vg_task_name(vg_task task);

/* One rated word pair. Strings live in the suite's arena. */
typedef struct vg_pair {
    const char *w1, *w2;   /* NUL-terminated, NFC-normalised */
    double rating;         /* on the suite's own scale */
    uint64_t line;         /* line in the file it came from */
    const double *raters;  /* individual raters' scores, NULL if none */
    size_t n_raters;
} vg_pair;

/* One analogy question a : b :: c : ?, with one or more accepted answers. */
typedef struct vg_question {
    const char *a, *b, *c;
    const char *const *answers; /* n_answers >= 1; answers[0] is the canonical one */
    size_t n_answers;
    size_t section;             /* index into vg_suite.sections */
    uint64_t line;
} vg_question;

/* A named part of a suite (an analogy section or relation file). Items of
 * a section are contiguous: [first, first + count). group names a set of
 * sections reported together ("semantic", "syntactic"), or is NULL. */
typedef struct vg_section {
    const char *name;
    const char *group;
    size_t first, count;
} vg_section;

/* A file the suite was read from. */
typedef struct vg_file_info {
    const char *path;
    uint64_t bytes;
    char sha256[65];   /* lower-case hex */
} vg_file_info;

/* What the reader noticed; none of these items is dropped. */
typedef struct vg_suite_stats {
    size_t duplicates;          /* a pair repeating an earlier (w1, w2) */
    size_t reversed_duplicates; /* (w2, w1) after an earlier (w1, w2) */
    size_t self_pairs;          /* w1 == w2 */
    size_t multiword;           /* entries holding a space or underscore */
    size_t header_lines;        /* lines skipped as a header */
    size_t comment_lines;       /* lines skipped as comments or blank */
} vg_suite_stats;

typedef struct vg_suite {
    char *id;             /* manifest id, or the file name for ad-hoc files */
    char *title;          /* human-readable name ("" if unknown) */
    vg_task task;
    double scale_min, scale_max; /* rating scale; NaN when unknown */
    size_t n_items;
    vg_pair *pairs;           /* n_items entries when task == SIMILARITY */
    vg_question *questions;   /* n_items entries when task == ANALOGY */
    vg_section *sections;
    size_t n_sections;
    vg_file_info *files;
    size_t n_files;
    vg_suite_stats stats;
    char layout_detected[128]; /* e.g. "tab, 3+ columns, no header" */
    void *priv_;               /* the arena; not API */
} vg_suite;

/* Free a suite and every string it holds. NULL does nothing. */
VG_API void vg_suite_free(vg_suite *s);

/* How to read a word-pair file. Zero (after vg_pairs_layout_init) means
 * "detect". Columns are 1-based. */
typedef struct vg_pairs_layout {
    char delimiter;          /* '\t', ',', ' ' (runs of blanks), or 0: detect */
    int header_lines;        /* lines to skip; -1: detect (the default) */
    char comment[8];         /* lines starting with this are skipped (default "#"); "" none */
    unsigned col_w1, col_w2, col_rating; /* 0: 1, 2, 3 */
    unsigned col_raters;     /* first column of individual ratings; 0: none */
} vg_pairs_layout;

VG_API void vg_pairs_layout_init(vg_pairs_layout *layout);

/* Read a word-pair file (path may be gzip-compressed). layout may be NULL
 * to detect everything. id names the suite ("" or NULL: the file name).
 * On success *out owns a new suite (free with vg_suite_free). On failure
 * returns the status with file and line in *err and sets *out to NULL. */
VG_API vg_status vg_suite_read_pairs(const char *path, const char *id,
                                     const vg_pairs_layout *layout,
                                     vg_suite **out, vg_error *err);

/* Analogy file layouts. */
typedef enum vg_analogy_layout {
    VG_ANALOGY_AUTO = 0,
    VG_ANALOGY_SECTIONED = 1,  /* ": section" lines, then "a b c d" */
    VG_ANALOGY_PLAIN4 = 2,     /* "a b c d" (tab or blanks), no sections */
    VG_ANALOGY_RELATION = 3,   /* one file per relation: "word<TAB>ans1/ans2"
                                  lines, questions = ordered pairs of lines */
    VG_ANALOGY_SPLIT = 4       /* a questions file "a b c" + an answers file */
} vg_analogy_layout;

/* Read an analogy file. For VG_ANALOGY_RELATION, path may be a directory
 * (every *.txt in it, sorted by name, one section each) or a file. For
 * VG_ANALOGY_SPLIT, answers_path names the answers file. Ownership and
 * errors as for vg_suite_read_pairs. */
VG_API vg_status vg_suite_read_analogies(const char *path, const char *answers_path,
                                         const char *id, vg_analogy_layout layout,
                                         vg_suite **out, vg_error *err);

#ifdef __cplusplus
}
#endif

#endif /* VG_SUITE_H */
