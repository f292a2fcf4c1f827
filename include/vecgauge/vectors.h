/* vectors.h - loading a vector set and looking words up in it.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * A vg_vectors holds one vector set: a contiguous row-major float32 matrix
 * (rows x dims, leading dimension ld >= dims, base 64-byte aligned), the
 * L2 norm of every row, and a vocabulary (one word per row, the bytes as
 * found in the file) with a hash index for lookup. It is immutable once
 * loaded, so any number of threads may read it at once.
 */
#ifndef VG_VECTORS_H
#define VG_VECTORS_H

#include <stddef.h>
#include <stdint.h>

#include "error.h"
#include "vg_config.h"

#ifdef __cplusplus
extern "C" {
#endif

/* Returned by the lookup functions when a word is not in the vocabulary. */
#define VG_NOT_FOUND ((size_t)-1)

/* File layouts. VG_LAYOUT_AUTO asks the loader to detect one. */
typedef enum vg_layout {
    VG_LAYOUT_AUTO = 0,
    VG_LAYOUT_TEXT_HEADER = 1, /* "count dims" line, then "word v1 ... vD" */
    VG_LAYOUT_TEXT_PLAIN = 2,  /* "word v1 ... vD" from the first line */
    VG_LAYOUT_BINARY = 3,      /* "count dims\n", then per row: word, ' ',
                                  dims little-endian float32, optional '\n' */
    VG_LAYOUT_NPY = 4          /* NumPy .npy matrix + one-word-per-line vocabulary */
} vg_layout;

/* A short stable name for a layout ("text-header", "text", "binary", "npy",
 * "auto"), as used by --format and in run.json. Never NULL. */
VG_API const char *vg_layout_name(vg_layout layout);

/* Parse a layout name as vg_layout_name prints it. Returns VG_EINVAL for
 * an unknown name. */
VG_API vg_status vg_layout_parse(const char *name, vg_layout *out);

/* Progress callback: called during a load, from one of its threads but
 * never from two at once, with the bytes of the file as stored (for gzip:
 * compressed bytes) done so far, increasing, and the file's size (0 when
 * unknown: a pipe). Called about every 16 MB and once at the end.
 * Returning non-zero stops the load with VG_EINTERRUPTED. */
typedef int (*vg_progress_fn)(void *ctx, uint64_t done, uint64_t total);

/* How to load. Initialise with vg_load_options_init, then change fields. */
typedef struct vg_load_options {
    vg_layout layout;        /* VG_LAYOUT_AUTO: detect (the default) */
    const char *vocab_path;  /* .npy vocabulary; NULL: look beside the file */
    size_t max_words;        /* read only the first N rows; 0: all */
    int allow_short;         /* a header count larger or smaller than the
                                rows present is accepted, not an error */
    int skip_bad_rows;       /* skip and count malformed rows, not an error */
    int compute_hash;        /* compute the file's sha256 while reading (default 1) */
    unsigned threads;        /* parser threads; 0: one per online CPU */
    /* Row filter. When keep_words is non-NULL, only rows whose word is in
     * keep_words (n_keep_words entries, compared after NFC normalisation,
     * and after case folding too when fold_case is set), or whose index is
     * below keep_first, are kept. Used so that a similarity-only run keeps
     * only the rows its suites need. */
    const char *const *keep_words;
    size_t n_keep_words;
    size_t keep_first;
    int fold_case;           /* also build the case-folded index */
    vg_progress_fn progress; /* NULL: no progress reports */
    void *progress_ctx;
    /* A gzip file may inflate to at most this many times the stored bytes
     * read so far (and always to VG_INFLATE_FLOOR); more is VG_ELIMIT
     * naming the file, read no further. Default VG_MAX_INFLATE; 0: no
     * bound. */
    unsigned max_inflate;
    /* The digest cache (with compute_hash): the sha256 of a regular file is
     * kept under $XDG_CACHE_HOME/vecgauge/digests (else ~/.cache/vecgauge),
     * keyed by its device, inode, size and modification and status-change
     * times in nanoseconds, and taken from there on a later load of the
     * unchanged file instead of being computed (an entry cached less than
     * 2 s after the file last changed is not trusted: on filesystems with
     * coarse timestamps a rewrite within the same tick would keep its key).
     * VG_DIGEST_CACHE_OFF (the default) never touches it,
     * VG_DIGEST_CACHE_USE reads and writes it, VG_DIGEST_CACHE_REFRESH
     * computes the digest and writes it (what --rehash does). */
    int digest_cache;
} vg_load_options;

enum { VG_DIGEST_CACHE_OFF = 0, VG_DIGEST_CACHE_USE = 1, VG_DIGEST_CACHE_REFRESH = 2 };

/* Fill *opt with the defaults: auto layout, all rows, hash on, no filter,
 * inflation bounded by VG_MAX_INFLATE. */
VG_API void vg_load_options_init(vg_load_options *opt);

/* What the loader saw. Counts refer to the rows read from the file. */
typedef struct vg_vectors_info {
    vg_layout layout;          /* the layout read (never AUTO) */
    int gzip;                  /* 1 if the file was gzip-compressed */
    char detected_because[256];/* why auto-detection chose this layout */
    uint64_t bytes;            /* size of the file as stored on disk */
    size_t header_rows;        /* row count claimed by a header, 0 if none */
    size_t rows_read;          /* rows parsed from the file */
    size_t rows;               /* rows kept (after duplicates and filters) */
    size_t dims;
    size_t duplicates;         /* later rows repeating an earlier word (dropped) */
    size_t zero_rows;          /* kept rows whose norm is zero */
    size_t bad_rows;           /* rows skipped under skip_bad_rows */
    size_t words_with_spaces;  /* header-less rows whose word holds spaces */
    size_t invalid_utf8;       /* words that are not valid UTF-8 (bytes kept) */
    int hashed;                /* 1 if sha256 holds the file's hash */
    char sha256[65];           /* lower-case hex, NUL-terminated */
    char vocab_path[VG_ERROR_PATH_MAX]; /* .npy only: the vocabulary file used */
    char vocab_sha256[65];     /* .npy only */
    int crlf;                  /* text: some lines end in "\r\n" */
    int bom;                   /* text: the file starts with a UTF-8 byte order mark */
    int big_endian;            /* npy: the data are big-endian */
    int fortran_order;         /* npy: the data are column-major */
    int source_float64;        /* npy: the data are float64, rounded to float32 */
    int mapped;                /* npy: the matrix is the file's own bytes, mapped
                                  read-only (native float32, row-major, aligned);
                                  the file must not change while it is in use */
    int digest_cached;         /* 1: sha256 was taken from the digest cache
                                  (vg_load_options.digest_cache), not computed
                                  in this load */
} vg_vectors_info;

typedef struct vg_vectors vg_vectors;

/* Load the vector set in path: any layout of vg_layout, gzip-compressed
 * or not (known by its magic bytes), a regular file or a pipe. The layout
 * is detected unless opt->layout forces one; info says which and why.
 * On success *out owns a new vg_vectors that the caller frees with
 * vg_vectors_free. On failure returns the status (VG_EIO cannot open or
 * read, VG_EFORMAT not the layout expected, VG_EVALUE a bad value,
 * VG_ETRUNCATED fewer or more rows than a header promises, VG_ELIMIT a
 * size over a documented limit, VG_EUNSUPPORTED e.g. an npy dtype,
 * VG_ENOTFOUND no npy vocabulary, VG_ENOMEM, VG_EINTERRUPTED), fills *err
 * (path, and line or row of the offending input) and sets *out to NULL.
 * The file is read once: its sha256 is computed from the same bytes.
 * opt may be NULL for the defaults. Thread-safe (uses opt->threads
 * threads of its own). */
VG_API vg_status vg_vectors_load(const char *path, const vg_load_options *opt,
                                 vg_vectors **out, vg_error *err);

/* As vg_vectors_load, on size bytes in memory (any layout, gzip or not;
 * the bytes are copied once). name stands for the path in error messages
 * and in the info; an .npy buffer takes its vocabulary from
 * opt->vocab_path, or from beside name. Also the entry point for fuzzing
 * the readers. */
VG_API vg_status vg_vectors_load_buffer(const void *data, size_t size, const char *name,
                                        const vg_load_options *opt, vg_vectors **out,
                                        vg_error *err);

/* Build a vector set from memory, for programs that evaluate in-process.
 * words[i] is the NUL-terminated word of row i; data is rows x dims
 * row-major with leading dimension ld (>= dims). Both are copied, so the
 * caller keeps ownership of its arrays. Duplicate words keep the first row.
 * Returns VG_EINVAL for dims == 0 or ld < dims, VG_EVALUE if a value is
 * NaN or infinite, VG_ENOMEM on allocation failure. */
VG_API vg_status vg_vectors_from_matrix(const char *const *words, size_t rows,
                                        const float *data, size_t dims, size_t ld,
                                        vg_vectors **out, vg_error *err);

/* Free a vector set. NULL does nothing. Invalidates every pointer obtained
 * from it (rows, norms, words, info). */
VG_API void vg_vectors_free(vg_vectors *v);

VG_API size_t vg_vectors_rows(const vg_vectors *v);
VG_API size_t vg_vectors_dims(const vg_vectors *v);
/* Leading dimension of the matrix, in floats. */
VG_API size_t vg_vectors_ld(const vg_vectors *v);
/* The matrix: rows x ld floats, row-major, 64-byte aligned. */
VG_API const float *vg_vectors_data(const vg_vectors *v);
/* Row i (i < rows). */
VG_API const float *vg_vectors_row(const vg_vectors *v, size_t i);
/* The L2 norm of every row, computed in double and rounded to float. */
VG_API const float *vg_vectors_norms(const vg_vectors *v);
/* The word of row i, NUL-terminated; *len (if non-NULL) gets its length. */
VG_API const char *vg_vectors_word(const vg_vectors *v, size_t i, size_t *len);
VG_API const vg_vectors_info *vg_vectors_get_info(const vg_vectors *v);

/* Row of word (len bytes, need not be NUL-terminated), or VG_NOT_FOUND.
 * The lookup is exact after NFC normalisation of both sides. */
VG_API size_t vg_vectors_find(const vg_vectors *v, const char *word, size_t len);

/* As vg_vectors_find, but comparing Unicode case-folded forms: the first
 * row (lowest index) whose folded word matches wins. Works whether or not
 * the set was loaded with fold_case (without it, the folded index is
 * built on first use, which is not thread-safe: call it once from one
 * thread before sharing the set). */
VG_API size_t vg_vectors_find_folded(const vg_vectors *v, const char *word, size_t len);

/* Summary of the row norms (zero rows included): minimum, median, maximum.
 * Returns VG_ENOMEM if the scratch copy cannot be allocated. */
VG_API vg_status vg_vectors_norm_summary(const vg_vectors *v, double *min,
                                         double *median, double *max,
                                         vg_error *err);

#ifdef __cplusplus
}
#endif

#endif /* VG_VECTORS_H */
