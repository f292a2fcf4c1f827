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
    const char *variant;       /* the manifest variant read (vg_suite_read_entry),
                                  "" for a file read directly */
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

/* The largest size a suite file may have once decompressed (gzip is
 * undone as it is read): a larger one is VG_ELIMIT naming the file, read
 * no further. Process-wide, for every later read of a suite file (pairs,
 * analogies, relation files, split files); 0 restores the default,
 * VG_MAX_SUITE_BYTES. Thread-safe. */
VG_API void vg_suite_set_max_bytes(uint64_t n);
VG_API uint64_t vg_suite_max_bytes(void);

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

/* Read an analogy file.
 * - VG_ANALOGY_AUTO detects the layout: a directory is read as relation
 *   files; a given answers_path means the split layout; otherwise the
 *   first lines decide (a ': name' line: sectioned; four words: four
 *   columns; 'word<TAB>answers': one relation file; three words: a
 *   questions file, whose answers file is answers_path or, for a path
 *   ending in ".questions", the ".answers" file beside it).
 * - VG_ANALOGY_RELATION: path is a file, or a directory searched (four
 *   levels deep) for *.txt files other than README/licence files, sorted
 *   by relative path, one section each, named by the file name without
 *   ".txt" and grouped by the folder holding it (NULL at the top). Each
 *   line is "word<TAB>answer1/answer2/..."; the questions are all ordered
 *   pairs (i, j) of distinct lines: a = word i, b = first answer of i,
 *   c = word j, answers = every answer of line j (line = line of j).
 *   More than 2,000,000 questions in all is VG_ELIMIT.
 * - VG_ANALOGY_SPLIT: "a b c" lines in path, the answer of each in the
 *   same position of answers_path ("d" or "label d"); a count mismatch
 *   is VG_ETRUNCATED naming the shorter file.
 * stats.duplicates counts questions equal (a, b, c, first answer) to an
 * earlier one. Ownership and errors as for vg_suite_read_pairs. */
VG_API vg_status vg_suite_read_analogies(const char *path, const char *answers_path,
                                         const char *id, vg_analogy_layout layout,
                                         vg_suite **out, vg_error *err);

/* "auto", "sectioned", "four-column", "relation", "split". Never NULL. */
VG_API const char *vg_analogy_layout_name(vg_analogy_layout layout);

/* Parse a name as vg_analogy_layout_name prints it; VG_EINVAL if unknown. */
VG_API vg_status vg_analogy_layout_parse(const char *name, vg_analogy_layout *out);

/* Set the group of every section of s from rule, a list of
 * "PATTERN=GROUP" separated by ';' where PATTERN is a shell wildcard
 * (fnmatch) over the section name; the first matching pattern wins and a
 * section that matches none keeps its group. "gram*=syntactic;*=semantic"
 * is the customary split of the Google analogy sections. An empty or NULL
 * rule does nothing. Returns VG_EINVAL (message naming the part) for a
 * part without '=', VG_ENOMEM on allocation failure. */
VG_API vg_status vg_suite_set_groups(vg_suite *s, const char *rule, vg_error *err);

/* The word pairs of each analogy question, for the pair bootstrap
 * (stats.h): stratum[i] gets question i's section (0 without sections),
 * row[i] the number of the pair (a, b) it takes, col[i] that of (c, d),
 * d its first accepted answer. Equal words in one section are one pair;
 * numbers run from 0 in order of first appearance, rows and columns
 * sharing one numbering (in Google's sections and in relation folders,
 * where a question pairs two lines of one relation file, the same pair
 * serves as a row in some questions and as a column in others). stratum
 * may be NULL. VG_EINVAL for a similarity suite, VG_ENOMEM. */
VG_API vg_status vg_suite_question_pairs(const vg_suite *s, uint32_t *stratum, uint32_t *row,
                                         uint32_t *col, vg_error *err);

/* The same from words: question i is words[4 i .. 4 i + 3] = a, b, c, d
 * in stratum[i] (NULL: all in one). VG_ELIMIT past 2^31 questions,
 * VG_ENOMEM. */
VG_API vg_status vg_pair_ids(size_t n, const char *const *words, const uint32_t *stratum,
                             uint32_t *row, uint32_t *col, vg_error *err);

/* ---- The manifest of known public suites --------------------------------
 * benchmarks-manifest/suites.csv (compiled into the library; see its
 * README.md for the columns) describes each known suite: one row per
 * known copy of its files (a "variant": the creators' distribution, a
 * widely circulated reworked copy, ...), the first row of an id carrying
 * the suite's own fields. */

/* One known copy of a suite's files and how to read it. */
typedef struct vg_suite_variant {
    const char *name;            /* "official", "reworked", ... */
    const char *const *files;    /* n_files names under <data>/<id>/; a name
                                    ending in '/' is a directory */
    const char *const *members;  /* n_files archive members ("" when the
                                    download is the file itself) */
    const char *const *sha256;   /* n_files lower-case hex digests, "" when
                                    not pinned */
    size_t n_files;
    vg_pairs_layout pairs;       /* similarity: how files[0] is read */
    vg_analogy_layout analogy;   /* analogy: the layout */
    const char *url;             /* download, "" when none is known */
    const char *download_sha256; /* digest of the download, "" if not pinned */
    const char *notes;
    uint64_t manifest_line;      /* the row's line in the manifest */
} vg_suite_variant;

/* One known suite. Strings are never NULL ("" when not given). */
typedef struct vg_suite_entry {
    const char *id;              /* also its folder in the data directory */
    vg_task task;
    const char *title;
    const char *language;        /* ISO 639-1, e.g. "en" */
    double scale_min, scale_max; /* rating scale; NaN when not given */
    size_t published_items;      /* size published with the dataset; 0 if unknown */
    const char *licence;
    const char *citation;
    const char *groups;          /* section groups, as for vg_suite_set_groups */
    const vg_suite_variant *variants;
    size_t n_variants;           /* >= 1 */
} vg_suite_entry;

typedef struct vg_manifest vg_manifest;

/* Load a manifest: path, or the built-in one when path is NULL. On
 * success *out owns a new manifest (free with vg_manifest_free). Errors
 * (VG_EIO, VG_EFORMAT for an unknown column, a missing id, a bad number
 * or layout, a repeated variant, VG_ENOMEM) name the manifest and line. */
VG_API vg_status vg_manifest_load(const char *path, vg_manifest **out, vg_error *err);

/* Parse a manifest from text[0..len); name is used in errors. As above. */
VG_API vg_status vg_manifest_parse(const char *text, size_t len, const char *name,
                                   vg_manifest **out, vg_error *err);

/* NULL does nothing. Invalidates every entry obtained from m. */
VG_API void vg_manifest_free(vg_manifest *m);

/* Number of suites and the i-th one (i < count), in manifest order. */
VG_API size_t vg_manifest_count(const vg_manifest *m);
VG_API const vg_suite_entry *vg_manifest_get(const vg_manifest *m, size_t i);

/* The suite with this id, or NULL. */
VG_API const vg_suite_entry *vg_manifest_find(const vg_manifest *m, const char *id);

/* ---- The data directory --------------------------------------------------
 * Suite files live at <data>/<suite id>/<file name as distributed>. */

/* Resolve the data directory into buf: dir when non-NULL and non-empty,
 * else $VECGAUGE_DATA, else $XDG_DATA_HOME/vecgauge, else
 * $HOME/.local/share/vecgauge. *source (if non-NULL) gets where it came
 * from ("--data", "VECGAUGE_DATA", "XDG_DATA_HOME", "HOME"). The
 * directory need not exist. VG_EINVAL when none can be found (no HOME),
 * VG_ELIMIT when the path does not fit in size bytes. */
VG_API vg_status vg_data_dir(const char *dir, char *buf, size_t size, const char **source,
                             vg_error *err);

/* Where file f of variant v of e lives: <data_dir>/<id>/<files[f]>, into
 * buf. VG_ELIMIT when it does not fit. */
VG_API vg_status vg_suite_entry_path(const vg_suite_entry *e, size_t v, size_t f,
                                     const char *data_dir, char *buf, size_t size,
                                     vg_error *err);

/* Which variant of e is present under data_dir: among the variants whose
 * every file exists, the first whose pinned digests all match, else the
 * first with nothing pinned, else the first. Returns its index, or
 * (size_t)-1 when no variant is complete. Hashes the candidate files, so
 * it reads them. */
VG_API size_t vg_suite_entry_locate(const vg_suite_entry *e, const char *data_dir);

/* Read suite e from data_dir through the variant vg_suite_entry_locate
 * picks, with that variant's layout; the suite gets e's id, title and
 * scale, its sections e's groups, and variant set. Ratings outside the
 * scale are VG_EVALUE naming file and line. VG_ENOTFOUND when no variant
 * is present (the message names the path expected for the first variant).
 * Ownership as for vg_suite_read_pairs. */
VG_API vg_status vg_suite_read_entry(const vg_suite_entry *e, const char *data_dir,
                                     vg_suite **out, vg_error *err);

/* Whether the files a suite was read from carry the digests pinned for
 * its variant. */
typedef enum vg_hash_state {
    VG_HASH_NOT_PINNED = 0, /* no file of the variant has a pinned digest */
    VG_HASH_MATCH = 1,      /* every pinned digest matches */
    VG_HASH_MISMATCH = 2    /* some file differs from its pinned digest */
} vg_hash_state;

/* "not pinned", "match", "mismatch". Never NULL. */
VG_API const char *vg_hash_state_name(vg_hash_state h);

/* Compare s (read by vg_suite_read_entry from e) with its variant's pins.
 * *bad (if non-NULL) gets the index into s->files of the first mismatch. */
VG_API vg_hash_state vg_suite_entry_verify(const vg_suite_entry *e, const vg_suite *s,
                                           size_t *bad);

#ifdef __cplusplus
}
#endif

#endif /* VG_SUITE_H */
