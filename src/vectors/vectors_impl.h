/* vectors_impl.h - the inside of vg_vectors and the row builder the
 * readers share.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Every reader (text, binary, npy) produces rows through vg_vecbuild_*:
 * the builder owns duplicate handling (first occurrence wins), the row
 * filter, NFC-keyed indexing and the counts, so the readers only parse.
 * A reader offers a row in two steps so that it can write the values
 * straight into the matrix: vg_rowkey_make (thread-safe: normalise and
 * hash the word, test it against the filter) and vg_vecbuild_add (in file
 * order: decide and return where the row's values go).
 */
#ifndef VG_VECTORS_IMPL_H
#define VG_VECTORS_IMPL_H

#include <pthread.h>
#include <stddef.h>
#include <stdint.h>

#include "../common/arena.h"
#include "../common/bigbuf.h"
#include "../common/internal.h"
#include "../common/strmap.h"
#include "source.h"
#include "vecgauge/vectors.h"

/* The case-folded index, a cache filled on first use (under lock) even
 * through a const vg_vectors: hence a separate, mutable object. */
typedef struct vg_folded_index {
    pthread_mutex_t lock;
    int built;
    vg_strmap map;
    vg_arena arena;
} vg_folded_index;

struct vg_vectors {
    size_t rows, dims, ld;
    float *data;            /* == mat.p (or into borrow_map): rows x ld, 64-byte aligned */
    vg_bigbuf mat;          /* the matrix's address space, grown by mremap */
    size_t cap_rows;        /* rows that fit in mat (or, while borrowed, the rows
                               borrow_map holds) */
    void *borrow_map;       /* a read-only mapping of the file used as the matrix, or NULL */
    size_t borrow_len;      /* its length in bytes */
    float *norms;           /* rows (NAN: computed by vg_vecbuild_finish) */
    const char **words;     /* rows pointers into arena, NUL-terminated */
    uint32_t *word_lens;
    size_t cap_meta;        /* capacity of norms, words, word_lens */
    vg_bigbuf meta_words, meta_lens, meta_norms; /* their storage (huge pages, mremap) */
    vg_arena arena;         /* words and (non-NFC) index keys */
    vg_arena vocab_arena;   /* words adopted from a vocabulary file, or empty */
    vg_strmap index;        /* NFC(word) -> row */
    vg_folded_index *folded;/* fold(word) -> lowest row; built on first use */
    vg_vectors_info info;

    /* Builder state (unused after vg_vecbuild_finish). */
    vg_strmap keep;         /* filter keys; empty: keep everything */
    vg_arena keep_arena;
    int keep_active, keep_fold;
    size_t keep_first;
    size_t seen_rows;       /* rows offered to the builder (file order) */
    int norms_pending;      /* some norms are NAN, to compute at finish */
    int words_adopted;      /* words offered live in vocab_arena: not copied */
    unsigned threads;       /* for the work at finish */
};

/* A row's word, ready for vg_vecbuild_add. */
typedef struct vg_rowkey {
    const char *word;       /* the bytes as in the file (borrowed) */
    size_t len;
    const char *key;        /* NFC(word): word itself or owned */
    size_t klen;
    uint64_t hash;          /* vg_hash_bytes(key, klen) */
    char *owned;            /* freed by vg_rowkey_clear */
    unsigned char invalid_utf8;
    unsigned char wanted;   /* 1: in the filter (or no filter is set) */
} vg_rowkey;

/* Start an empty set of dims columns. rows_hint (may be 0) pre-sizes the
 * vocabulary index; it is clamped, never trusted for a large allocation.
 * rows_bound (0: unknown) is an upper bound on the rows the input can
 * hold (from its size): the matrix's address space is reserved for it,
 * which costs no memory until rows are written. opt (may be NULL)
 * supplies the row filter and thread count. */
VG_INTERNAL vg_status vg_vecbuild_begin(size_t dims, size_t rows_hint, size_t rows_bound,
                                        const vg_load_options *opt, vg_vectors **out,
                                        vg_error *err);

/* Fill *k for word (len bytes): NFC key, hash, UTF-8 validity and filter
 * membership. Reads v only, so any number of threads may call it while
 * nothing calls vg_vecbuild_add. Returns 0, or -1 when out of memory.
 * Free with vg_rowkey_clear. */
VG_INTERNAL int vg_rowkey_make(const vg_vectors *v, const char *word, size_t len, vg_rowkey *k);
/* The same for a set with no row filter: reads nothing of the set, so it
 * may run while vg_vecbuild_add does (batch.c overlaps the two). */
VG_INTERNAL int vg_rowkey_make_unfiltered(const char *word, size_t len, vg_rowkey *k);
VG_INTERNAL void vg_rowkey_clear(vg_rowkey *k);

/* Offer the next row of the file, in file order. On VG_OK *dst is where
 * the caller must write the row's dims values (valid until the next add:
 * the matrix may move), or NULL when the row is dropped (duplicate or
 * filtered; counted). norm is the row's vg_row_norm, or NAN to have finish
 * compute it. path and line are for error messages. */
VG_INTERNAL vg_status vg_vecbuild_add(vg_vectors *v, const vg_rowkey *k, float norm, float **dst,
                                      const char *path, uint64_t line, vg_error *err);

/* Make the matrix hold at least rows rows (address space; may move it:
 * no other thread may be writing rows). For readers that write values
 * in place before offering the rows. 0, or -1 when out of memory. */
VG_INTERNAL int vg_vecbuild_reserve(vg_vectors *v, size_t rows);

/* Use the stored bytes of a file as the matrix, with no copy: maps
 * [0, offset + rows x dims x 4) of fd read-only and points the matrix at
 * offset, which must be a multiple of 64 (the matrix's alignment). Only
 * for native float32 rows read in place, with no filter and no hash (the
 * hasher would read bytes that vg_vecbuild_own unmaps). Returns 0, or
 * -1 when the rows cannot be mapped (the caller then reads them). While
 * borrowed, the rows must not move: vg_vecbuild_own copies them first. */
VG_INTERNAL int vg_vecbuild_borrow(vg_vectors *v, int fd, uint64_t offset, size_t rows);
/* 1 when the page cache holds the borrowed rows in 2 MiB folios (each
 * mapped with one entry, read at memory speed), else 0: then 4 KiB
 * entries make every first read through the mapping a page walk. Reads
 * the middle 2 MiB in if they are not cached (vg_filemap_cached_huge). */
VG_INTERNAL int vg_vecbuild_borrowed_huge(const vg_vectors *v);
/* Map in (from the page cache, reading any not cached) the borrowed rows
 * [row, row + n) ahead of use; a no-op when nothing is borrowed. */
VG_INTERNAL void vg_vecbuild_populate(vg_vectors *v, size_t row, size_t n);
/* Copy a borrowed matrix into memory of its own and unmap the file, so
 * that rows can move. Returns 0, or -1 when out of memory (the matrix
 * stays borrowed). A no-op when nothing is borrowed. */
VG_INTERNAL int vg_vecbuild_own(vg_vectors *v);

/* Take over the arena that holds every word the caller will offer (a
 * vocabulary file's words, NUL-terminated): vg_vecbuild_add then keeps
 * pointers into it instead of copying each word, and the vectors free it.
 * *a is left empty. Not with a row filter, which would keep every word's
 * bytes alive for the few rows kept: then nothing is taken. */
VG_INTERNAL void vg_vecbuild_adopt_words(vg_vectors *v, vg_arena *a);
/* Tests only: when non-zero, the rows reserved for an input of unknown
 * size (a pipe), so that the growth paths run on small inputs. */
VG_INTERNAL extern size_t vg_vecbuild_test_reserve;

/* The same for the per-row arrays (words, lengths, norms). */
VG_INTERNAL int vg_vecbuild_reserve_meta(vg_vectors *v, size_t rows);

/* vg_rowkey_make + vg_vecbuild_add + copy, for one row of values. */
VG_INTERNAL vg_status vg_vecbuild_push(vg_vectors *v, const char *word, size_t len,
                                       const float *vals, const char *path, uint64_t line,
                                       vg_error *err);

/* Compute missing norms and the zero-row count, give back unused address
 * space; the set is then complete and immutable. */
VG_INTERNAL vg_status vg_vecbuild_finish(vg_vectors *v, vg_error *err);

/* The L2 norm of x[0..n): squares summed in double in a fixed order
 * (eight interleaved partial sums), so that every reader, thread count and
 * build gives identical norms for identical values. */
VG_INTERNAL float vg_row_norm(const float *x, size_t n);

/* vg_row_norm and vg_all_finite in one pass over the n native floats
 * stored from byte p, at any alignment (binary rows are checked where
 * the file stores them): 1 with *norm set when every value is finite,
 * else 0 (*norm untouched). */
VG_INTERNAL int vg_row_norm_finite(const void *p, size_t n, float *norm);

/* Copy n native floats stored from byte src (any alignment) to dst with
 * streaming stores, which write memory without reading the target's
 * lines first (fresh matrix memory is not in cache); before another
 * thread reads dst, the writer calls vg_row_copy_fence. */
VG_INTERNAL void vg_row_copy_stream(float *dst, const void *src, size_t n);
VG_INTERNAL void vg_row_copy_fence(void);

/* 1 if every x[i] is finite. */
VG_INTERNAL int vg_all_finite(const float *x, size_t n);

/* ---- layout detection (detect.c) ------------------------------------- */

typedef struct vg_detect {
    vg_layout layout;       /* never AUTO on success */
    size_t dims;
    size_t header_rows;     /* from a "count dims" line; 0 if none */
    size_t header_bytes;    /* bytes of the header line (text-header, binary) */
    int has_header;
    int bom;                /* a UTF-8 byte order mark precedes everything */
    char because[200];      /* fits vg_vectors_info.detected_because with a gzip prefix */
} vg_detect;

/* Decide the layout of a stream from its first n bytes (whole: the stream
 * ends there). forced is the caller's --format (AUTO to detect). Fills *d
 * or returns VG_EFORMAT naming what was expected. */
VG_INTERNAL vg_status vg_detect_layout(const char *p, size_t n, int whole, vg_layout forced,
                                       const char *path, vg_detect *d, vg_error *err);

/* Parse a "count dims" line at p (n bytes available). Returns the bytes
 * of the line including its '\n' (and a '\r' before it), 0 if p does not
 * start with such a line. */
VG_INTERNAL size_t vg_detect_count_dims(const char *p, size_t n, size_t *count, size_t *dims);

/* ---- rows of fixed layouts from a mapping (batch.c) -------------------- */

/* Stored values of one row to dims floats. */
typedef void (*vg_convert_fn)(float *dst, const char *src, size_t dims, const void *ctx);

typedef struct vg_batch_row {
    const char *word;       /* borrowed (the mapping, or a vocabulary) */
    size_t wlen;
    const char *src;        /* the stored values */
    uint64_t file_row;      /* 0-based: also its provisional matrix row */
    vg_rowkey key;
    float norm;
    unsigned char bad, keyfail;
} vg_batch_row;

/* n bytes of src from offset off into dst; src NULL: none. */
typedef struct vg_read_ahead {
    vg_src *src;
    char *dst;
    size_t n;
    uint64_t off;
} vg_read_ahead;

typedef struct vg_batch {
    vg_vectors *v;          /* no row filter */
    const char *path;
    const vg_load_options *opt;
    vg_convert_fn conv;     /* NULL: the values are in place already */
    /* Or: put rows [first, first + n) of the file in place (any thread,
     * any run of rows, before checking them); 0 or an error code. */
    vg_status (*fill)(void *ctx, uint64_t first, size_t n, float *dst, vg_error *err);
    void *fill_ctx;
    vg_src *hash_src;       /* fill mode: submit the rows read for hashing */
    int in_matrix;          /* the stored rows are in the matrix already (a
                               borrowed file mapping, never hashed): no
                               conv, and fill copies rows to check into
                               scratch instead of into the matrix */
    const void *conv_ctx;
    int stored_f32;         /* the stored values are native float32 (conv
                               would copy them unchanged): copied with
                               streaming stores, checked where stored */
    const char *where;      /* text before "word" in messages, or NULL */
    const char *conv_note;  /* text after "not finite", or NULL */
    unsigned threads;
    /* Optional, for one run: a read done meanwhile, in pieces taken by
     * whichever thread has no row left to convert (the next window of a
     * layout read by pread). The run clears it; a read error is the
     * run's, after any error of its rows. */
    vg_read_ahead ahead;
    vg_batch_row *rows;     /* the batch being gathered: rows[0..n) */
    size_t n, cap;
    vg_batch_row *prev;     /* the batch converted last, not yet added */
    size_t prev_n;
    float *scratch;         /* in_matrix with fill: threads x scratch_rows rows */
    size_t scratch_rows;
} vg_batch;

/* How an unhashed .npy's borrowed rows are checked. VG_BORROW_CHECK_AUTO
 * (the default): through the mapping where the page cache holds them in
 * 2 MiB folios (vg_vecbuild_borrowed_huge), from copies otherwise. Tests
 * force either way. */
enum { VG_BORROW_CHECK_AUTO, VG_BORROW_CHECK_MAPPED, VG_BORROW_CHECK_COPIED };
VG_INTERNAL extern int vg_borrow_check_mode;

/* Room for batches of cap rows (the two arrays rows and prev, and with
 * in_matrix and fill each thread's scratch: v, threads, in_matrix and
 * fill are set first); the other fields are the caller's. -1 when out of
 * memory. */
VG_INTERNAL int vg_batch_alloc(vg_batch *b, size_t cap);
/* Tests set this to make batches of at most that many rows. */
VG_INTERNAL extern size_t vg_batch_test_cap;

/* Convert, check and key rows[0..n) on all threads, straight into matrix
 * row file_row, while the calling thread adds the previous batch's rows
 * in order (a bad row skipped and counted, or reported). This batch's
 * rows are added by the next run or by vg_batch_flush: until then their
 * words and stored bytes must stay where they are. Empties rows. */
VG_INTERNAL vg_status vg_batch_run(vg_batch *b, vg_error *err);

/* Add the rows the last run converted; every row is then added. */
VG_INTERNAL vg_status vg_batch_flush(vg_batch *b, vg_error *err);

/* Free the arrays (and the keys of rows never added). */
VG_INTERNAL void vg_batch_free(vg_batch *b);

/* ---- the readers ------------------------------------------------------ */

/* Each reads the already-detected stream of src into a new vector set.
 * On success *out is complete (vg_vecbuild_finish done). */
VG_INTERNAL vg_status vg_read_text(vg_src *src, const vg_detect *d, const vg_load_options *opt,
                                   vg_vectors **out, vg_error *err);
VG_INTERNAL vg_status vg_read_binary(vg_src *src, const vg_detect *d,
                                     const vg_load_options *opt, vg_vectors **out,
                                     vg_error *err);
VG_INTERNAL vg_status vg_read_npy(vg_src *src, const vg_load_options *opt, vg_vectors **out,
                                  vg_error *err);

/* ---- NumPy header (npy.c) --------------------------------------------- */

typedef struct vg_npy_header {
    int major, minor;
    size_t data_offset;     /* bytes before the array data */
    size_t rows, dims;
    size_t item;            /* 4 (float32) or 8 (float64) */
    int big_endian, fortran;
} vg_npy_header;

/* Parse the NumPy header at p (n bytes available) as the NumPy format
 * description (numpy.lib.format, versions 1.0 to 3.0) defines it. Returns
 * VG_EFORMAT for anything else, VG_EUNSUPPORTED for valid arrays this
 * reader does not take (not float32/float64, not two-dimensional). */
VG_INTERNAL vg_status vg_npy_parse_header(const char *p, size_t n, const char *path,
                                          vg_npy_header *h, vg_error *err);

/* ---- vocabulary files (vocab.c) --------------------------------------- */

typedef struct vg_vocab {
    const char **words;        /* words[i], lens[i]: line i's word */
    uint32_t *lens;
    size_t n;
    vg_bigbuf words_buf, lens_buf; /* behind words and lens */
    vg_arena arena;
    char sha256[65];
    int hashed;
    char path[VG_ERROR_PATH_MAX];
} vg_vocab;

/* Read a vocabulary file (one word per line, gzip or not): explicit is
 * the caller's --vocab, or NULL to look beside vectors_path (same stem,
 * ".vocab" or ".txt"). max_words (0: all) stops early. */
VG_INTERNAL vg_status vg_vocab_read(const char *explicit_path, const char *vectors_path,
                                    size_t max_words, int hash, vg_vocab *vc, vg_error *err);
VG_INTERNAL void vg_vocab_free(vg_vocab *vc);

/* ---- the digest cache (digest_cache.c) ---- */

/* A regular file's identity: the key of its cached digest. */
typedef struct vg_digest_key_t {
    unsigned long long dev, ino, size;
    long long mtime_ns, ctime_ns;
} vg_digest_key_t;

/* The identity of path; -1 when it is not a regular file (a pipe, a
 * device: never cached) or cannot be stat'ed. */
VG_INTERNAL int vg_digest_key(const char *path, vg_digest_key_t *key);

/* The cached sha256 of a file with this identity into hex; -1 when there
 * is no entry, or it is unreadable, or racy (file times too close to the
 * moment it was cached to be trusted). */
VG_INTERNAL int vg_digest_cache_get(const vg_digest_key_t *key, char hex[65]);

/* Record hex for this identity (best effort, atomic by rename). */
VG_INTERNAL void vg_digest_cache_put(const vg_digest_key_t *key, const char *hex);

#endif /* VG_VECTORS_IMPL_H */
