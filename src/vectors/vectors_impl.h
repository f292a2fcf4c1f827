/* vectors_impl.h - the inside of vg_vectors and the row builder the
 * readers share.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Every reader (text, binary, npy) produces rows through vg_vecbuild_*:
 * the builder owns duplicate handling (first occurrence wins), the row
 * filter, NFC-keyed indexing and the norms, so the readers only parse.
 */
#ifndef VG_VECTORS_IMPL_H
#define VG_VECTORS_IMPL_H

#include <pthread.h>
#include <stddef.h>
#include <stdint.h>

#include "../common/arena.h"
#include "../common/internal.h"
#include "../common/strmap.h"
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
    size_t rows, dims, ld, cap_rows;
    float *data;            /* cap_rows x ld, 64-byte aligned */
    float *norms;           /* rows */
    const char **words;     /* rows pointers into arena, NUL-terminated */
    uint32_t *word_lens;
    vg_arena arena;         /* words and (non-NFC) index keys */
    vg_strmap index;        /* NFC(word) -> row */
    vg_folded_index *folded;/* fold(word) -> lowest row; built on first use */
    vg_vectors_info info;

    /* Builder state (unused after vg_vecbuild_finish). */
    vg_strmap keep;         /* filter keys; empty: keep everything */
    vg_arena keep_arena;
    int keep_active, keep_fold;
    size_t keep_first;
    size_t seen_rows;       /* rows offered to the builder (file order) */
};

/* Start an empty set of dims columns. rows_hint (may be 0) pre-sizes the
 * matrix; a hint larger than is sensible is clamped, never trusted for a
 * huge allocation. opt (may be NULL) supplies the row filter. */
VG_INTERNAL vg_status vg_vecbuild_begin(size_t dims, size_t rows_hint,
                                        const vg_load_options *opt, vg_vectors **out,
                                        vg_error *err);

/* Offer the next row of the file: word (len bytes) and dims values.
 * Duplicates (counted) and filtered rows are dropped. path and line are
 * for error messages. */
VG_INTERNAL vg_status vg_vecbuild_push(vg_vectors *v, const char *word, size_t len,
                                       const float *vals, const char *path, uint64_t line,
                                       vg_error *err);

/* Compute norms and zero-row counts, shrink the matrix; the set is then
 * complete and immutable. */
VG_INTERNAL vg_status vg_vecbuild_finish(vg_vectors *v, vg_error *err);

/* The text-layout reader (both with and without the header line). */
VG_INTERNAL vg_status vg_read_text(const char *path, const vg_load_options *opt,
                                   vg_vectors **out, vg_error *err);

#endif /* VG_VECTORS_IMPL_H */
