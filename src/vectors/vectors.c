/* vectors.c - the vg_vectors object: building, indexing, lookup, freeing.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "vectors_impl.h"

#include <math.h>
#include <pthread.h>
#include <stdlib.h>
#include <string.h>
#include <sys/mman.h>
#include <unistd.h>
#ifdef __SSE2__
#include <emmintrin.h>
#endif

#include "../common/alloc.h"
#include "../common/filemap.h"
#include "../common/text.h"
#include "../common/threads.h"

/* Refuse to pre-size the vocabulary for more than this many rows from a
 * hint alone: a header claiming 10^12 rows must not become a 10^12-entry
 * allocation. Past it, arrays grow geometrically as rows actually arrive. */
#define HINT_MAX_ROWS ((size_t)1 << 22)
/* Address space reserved for the matrix when no bound is known (gzip,
 * pipes); it grows by mremap, without copying, as rows arrive. */
#define RESERVE_DEFAULT ((size_t)256 << 20)

void vg_load_options_init(vg_load_options *opt) {
    memset(opt, 0, sizeof *opt);
    opt->layout = VG_LAYOUT_AUTO;
    opt->compute_hash = 1;
    opt->max_inflate = VG_MAX_INFLATE;
}

static const char *const layout_names[] = {"auto", "text-header", "text", "binary", "npy"};

const char *vg_layout_name(vg_layout layout) {
    if ((unsigned)layout < sizeof layout_names / sizeof layout_names[0])
        return layout_names[layout];
    return "unknown";
}

vg_status vg_layout_parse(const char *name, vg_layout *out) {
    for (unsigned i = 0; i < sizeof layout_names / sizeof layout_names[0]; i++) {
        if (strcmp(name, layout_names[i]) == 0) {
            *out = (vg_layout)i;
            return VG_OK;
        }
    }
    return VG_EINVAL;
}

/* The float at byte p, whatever p's alignment. */
static inline float float_at(const char *p) {
    float f;
    memcpy(&f, p, sizeof f);
    return f;
}

/* The L2 norm with eight partial sums, element j into sum j % 8, then
 * ((s0 + s1) + (s2 + s3)) + ((s4 + s5) + (s6 + s7)). The SSE2 code does
 * exactly these double operations in that order (two sums per register,
 * no fused multiply-add), so every build gives the same bits. The n
 * floats start at byte p, at any alignment (a binary file's values
 * follow its words). */
static double sum_squares(const char *p, size_t n) {
    double s[8] = {0, 0, 0, 0, 0, 0, 0, 0};
    size_t j = 0;
#ifdef __SSE2__
    __m128d a0 = _mm_setzero_pd(), a1 = a0, a2 = a0, a3 = a0;
    for (; j + 8 <= n; j += 8) {
        __m128 u = _mm_loadu_ps((const float *)(const void *)(p + 4 * j));
        __m128 w = _mm_loadu_ps((const float *)(const void *)(p + 4 * j + 16));
        __m128d d0 = _mm_cvtps_pd(u), d1 = _mm_cvtps_pd(_mm_movehl_ps(u, u));
        __m128d d2 = _mm_cvtps_pd(w), d3 = _mm_cvtps_pd(_mm_movehl_ps(w, w));
        a0 = _mm_add_pd(a0, _mm_mul_pd(d0, d0));
        a1 = _mm_add_pd(a1, _mm_mul_pd(d1, d1));
        a2 = _mm_add_pd(a2, _mm_mul_pd(d2, d2));
        a3 = _mm_add_pd(a3, _mm_mul_pd(d3, d3));
    }
    _mm_storeu_pd(s, a0);
    _mm_storeu_pd(s + 2, a1);
    _mm_storeu_pd(s + 4, a2);
    _mm_storeu_pd(s + 6, a3);
#else
    for (; j + 8 <= n; j += 8) {
        for (size_t k = 0; k < 8; k++) {
            double x = float_at(p + 4 * (j + k));
            s[k] += x * x;
        }
    }
#endif
    for (; j < n; j++) {
        double x = float_at(p + 4 * j);
        s[j % 8] += x * x;
    }
    return ((s[0] + s[1]) + (s[2] + s[3])) + ((s[4] + s[5]) + (s[6] + s[7]));
}

float vg_row_norm(const float *x, size_t n) {
    return (float)sqrt(sum_squares((const char *)x, n));
}

int vg_row_norm_finite(const void *p, size_t n, float *norm) {
    /* The squares of finite floats, summed in double, stay finite (each
     * is below 2^256; no row has 2^700 values), while one NaN or infinity
     * makes the sum NaN or infinite (squares are never negative, so no
     * infinity can cancel): the sum alone tells whether the row is
     * finite, and the row is read once instead of twice. */
    double q = sum_squares(p, n);
    if (!isfinite(q)) return 0;
    *norm = (float)sqrt(q);
    return 1;
}

void vg_row_copy_stream(float *dst, const void *src, size_t n) {
#ifdef __SSE2__
    const char *p = src;
    size_t j = 0;
    /* Streaming stores need 16-byte aligned targets: the first floats
     * of a row whose start is not are stored plainly. */
    while (j < n && ((uintptr_t)(dst + j) & 15) != 0) {
        dst[j] = float_at(p + 4 * j);
        j++;
    }
    for (; j + 4 <= n; j += 4)
        _mm_stream_ps(dst + j, _mm_loadu_ps((const float *)(const void *)(p + 4 * j)));
    for (; j < n; j++) dst[j] = float_at(p + 4 * j);
#else
    memcpy(dst, src, n * sizeof(float));
#endif
}

void vg_row_copy_fence(void) {
#ifdef __SSE2__
    _mm_sfence();
#endif
}

int vg_all_finite(const float *x, size_t n) {
    /* An IEEE float is NaN or infinite exactly when its exponent bits are
     * all ones. */
    size_t j = 0;
    uint32_t bad = 0;
#ifdef __SSE2__
    const __m128i e = _mm_set1_epi32(0x7f800000);
    __m128i acc = _mm_setzero_si128();
    for (; j + 8 <= n; j += 8) {
        __m128i u = _mm_loadu_si128((const __m128i *)(const void *)(x + j));
        __m128i w = _mm_loadu_si128((const __m128i *)(const void *)(x + j + 4));
        acc = _mm_or_si128(acc, _mm_cmpeq_epi32(_mm_and_si128(u, e), e));
        acc = _mm_or_si128(acc, _mm_cmpeq_epi32(_mm_and_si128(w, e), e));
    }
    bad = (uint32_t)_mm_movemask_epi8(acc);
#endif
    for (; j < n; j++) {
        uint32_t b;
        memcpy(&b, &x[j], sizeof b);
        bad |= (uint32_t)((b & 0x7f800000u) == 0x7f800000u);
    }
    return !bad;
}

/* Room for need rows in the matrix: address space only, pages cost
 * memory when written. */
static int reserve_matrix(vg_vectors *v, size_t need) {
    if (need <= v->cap_rows) return 0;
    /* A borrowed matrix cannot grow: take a copy first, which may have
     * room already. */
    if (v->borrow_map && vg_vecbuild_own(v) != 0) return -1;
    if (need <= v->cap_rows) return 0;
    size_t ncap = v->cap_rows ? v->cap_rows : 1024;
    while (ncap < need)
        if (vg_mul_overflow(ncap, 2, &ncap)) return -1;
    size_t bytes;
    if (vg_mul_overflow(ncap, v->ld, &bytes) || vg_mul_overflow(bytes, sizeof(float), &bytes))
        return -1;
    if (vg_bigbuf_reserve(&v->mat, bytes) != 0) return -1;
    v->data = v->mat.p;
    v->cap_rows = v->mat.reserved / (v->ld * sizeof(float));
    return 0;
}

int vg_vecbuild_reserve(vg_vectors *v, size_t rows) { return reserve_matrix(v, rows); }

int vg_vecbuild_borrow(vg_vectors *v, int fd, uint64_t offset, size_t rows) {
    size_t bytes, len;
    if (v->borrow_map || v->rows || fd < 0 || rows == 0 || offset % 64 != 0 ||
        vg_mul_overflow(rows, v->ld * sizeof(float), &bytes) ||
        vg_add_overflow(bytes, (size_t)offset, &len))
        return -1;
    /* The pages are the page cache's own, so nothing is zeroed or copied
     * (first touches of fresh anonymous memory are what a copy costs
     * most, in a VM above all). vg_vecbuild_populate maps them in ahead
     * of the readers, a batch at a time. */
    size_t span;
    void *m = vg_filemap(fd, len, 0, &span);
    if (!m) return -1;
    v->borrow_map = m;
    v->borrow_len = span;
    v->data = (float *)((char *)m + offset);
    v->cap_rows = rows;
    return 0;
}

int vg_vecbuild_borrowed_huge(const vg_vectors *v) {
    return v->borrow_map && vg_filemap_cached_huge(v->borrow_map, v->borrow_len) == 1;
}

void vg_vecbuild_populate(vg_vectors *v, size_t row, size_t n) {
#ifdef MADV_POPULATE_READ
    if (!v->borrow_map || row >= v->cap_rows) return;
    n = VG_MIN(n, v->cap_rows - row);
    size_t pg = (size_t)sysconf(_SC_PAGESIZE);
    uintptr_t base = (uintptr_t)v->borrow_map, end = base + v->borrow_len;
    uintptr_t b = (uintptr_t)(v->data + row * v->ld) & ~(uintptr_t)(pg - 1);
    uintptr_t e = VG_MIN((uintptr_t)(v->data + (row + n) * v->ld), end);
    /* One call maps the batch's pages (and reads any not yet cached),
     * instead of a fault per few pages in the checking threads. */
    if (e > b) madvise((void *)b, (size_t)(e - b), MADV_POPULATE_READ);
#else
    (void)v;
    (void)row;
    (void)n;
#endif
}

void vg_vecbuild_adopt_words(vg_vectors *v, vg_arena *a) {
    if (v->keep_active || v->words_adopted) return;
    v->vocab_arena = *a;
    *a = (vg_arena)VG_ARENA_INIT;
    v->words_adopted = 1;
}

int vg_vecbuild_own(vg_vectors *v) {
    if (!v->borrow_map) return 0;
    size_t bytes = v->cap_rows * v->ld * sizeof(float); /* the borrowed rows */
    if (vg_bigbuf_reserve(&v->mat, bytes) != 0) return -1;
    memcpy(v->mat.p, v->data, bytes);
    munmap(v->borrow_map, v->borrow_len);
    v->borrow_map = NULL;
    v->borrow_len = 0;
    v->data = v->mat.p;
    v->cap_rows = v->mat.reserved / (v->ld * sizeof(float));
    return 0;
}

size_t vg_vecbuild_test_reserve;

/* Room for need rows in the per-row arrays (words, lengths, norms). */
static int reserve_meta(vg_vectors *v, size_t need) {
    if (need <= v->cap_meta) return 0;
    size_t ncap = v->cap_meta ? v->cap_meta : 1024;
    while (ncap < need)
        if (vg_mul_overflow(ncap, 2, &ncap)) return -1;
    size_t wb, lb, nb;
    if (vg_mul_overflow(ncap, sizeof *v->words, &wb) || vg_mul_overflow(ncap, sizeof *v->word_lens, &lb) ||
        vg_mul_overflow(ncap, sizeof *v->norms, &nb))
        return -1;
    /* Mappings grown by mremap: no copy, no old-plus-new peak. */
    if (vg_bigbuf_reserve(&v->meta_words, wb) != 0 || vg_bigbuf_reserve(&v->meta_lens, lb) != 0 ||
        vg_bigbuf_reserve(&v->meta_norms, nb) != 0)
        return -1;
    v->words = v->meta_words.p;
    v->word_lens = v->meta_lens.p;
    v->norms = v->meta_norms.p;
    v->cap_meta = ncap;
    return 0;
}

int vg_vecbuild_reserve_meta(vg_vectors *v, size_t rows) { return reserve_meta(v, rows); }

/* Key under which word is indexed (NFC, optionally folded); *to_free is
 * what the caller must vg_free (NULL when the key is word itself). NULL
 * when out of memory. */
static const char *make_key(const char *word, size_t len, int fold, size_t *klen,
                            char **to_free) {
    if (fold) {
        *to_free = vg_text_fold(word, len, klen);
        return *to_free;
    }
    return vg_text_nfc(word, len, klen, to_free);
}

static vg_status build_keep(vg_vectors *v, const vg_load_options *opt, vg_error *err) {
    v->keep_active = 1;
    v->keep_fold = opt->fold_case;
    v->keep_first = opt->keep_first;
    if (vg_strmap_reserve(&v->keep, opt->n_keep_words * (opt->fold_case ? 2 : 1)) != 0)
        return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory building the word filter");
    for (size_t i = 0; i < opt->n_keep_words; i++) {
        const char *w = opt->keep_words[i];
        size_t len = strlen(w);
        for (int fold = 0; fold <= opt->fold_case; fold++) {
            size_t klen;
            char *owned;
            const char *k = make_key(w, len, fold, &klen, &owned);
            char *stored = k ? vg_arena_strndup(&v->keep_arena, k, klen) : NULL;
            vg_free(owned);
            if (!stored || vg_strmap_put(&v->keep, stored, klen, 0, NULL) < 0)
                return vg_error_set(err, VG_ENOMEM, NULL, 0,
                                    "out of memory building the word filter");
        }
    }
    return VG_OK;
}

vg_status vg_vecbuild_begin(size_t dims, size_t rows_hint, size_t rows_bound,
                            const vg_load_options *opt, vg_vectors **out, vg_error *err) {
    *out = NULL;
    if (dims == 0 || dims > VG_MAX_DIMS)
        return vg_error_set(err, VG_ELIMIT, NULL, 0, "dimension %zu outside 1..%u", dims,
                            (unsigned)VG_MAX_DIMS);
    vg_vectors *v = vg_calloc(1, sizeof *v);
    if (!v) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    v->dims = dims;
    v->ld = dims;
    v->info.dims = dims;
    v->threads = opt ? opt->threads : 0;
    v->folded = vg_calloc(1, sizeof *v->folded);
    if (!v->folded) {
        vg_free(v);
        return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    }
    pthread_mutex_init(&v->folded->lock, NULL);
    vg_status st = VG_OK;
    if (opt && opt->keep_words) st = build_keep(v, opt, err);
    size_t max_rows = opt && opt->max_words ? opt->max_words : (size_t)-1;
    size_t hint = VG_MIN(VG_MIN(rows_hint, HINT_MAX_ROWS), max_rows);
    if (rows_bound && hint > rows_bound) hint = rows_bound;
    /* The matrix: address space for every row the input can hold (free
     * until written), else a default that grows by mremap. A filtered
     * load keeps few rows, so it starts from the hint. */
    size_t reserve;
    if (v->keep_active) {
        reserve = VG_MAX(hint, 1024);
    } else if (rows_bound) {
        reserve = VG_MIN(rows_bound, max_rows);
    } else {
        reserve = VG_MIN(VG_MAX(hint, RESERVE_DEFAULT / (dims * sizeof(float)) + 1), max_rows);
        if (vg_vecbuild_test_reserve) reserve = vg_vecbuild_test_reserve;
    }
    if (st == VG_OK && reserve_matrix(v, VG_MAX(reserve, 1)) != 0) {
        /* A bound beyond the address space: start small and grow. */
        if (reserve_matrix(v, 1024) != 0)
            st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory for a %zu-column matrix",
                              dims);
    }
    if (st == VG_OK && reserve_meta(v, VG_MAX(hint, 1024)) != 0)
        st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    if (st == VG_OK && hint && vg_strmap_reserve(&v->index, hint) != 0)
        st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory for the vocabulary index");
    if (st != VG_OK) {
        vg_vectors_free(v);
        return st;
    }
    *out = v;
    return VG_OK;
}

/* Folded-key membership in the filter; ASCII words (nearly all) fold in a
 * stack buffer without allocating. -1 when out of memory. */
static int keep_has_folded(const vg_vectors *v, const char *word, size_t len) {
    char small[256];
    if (len < sizeof small && vg_text_is_ascii(word, len)) {
        for (size_t i = 0; i < len; i++) {
            char c = word[i];
            small[i] = c >= 'A' && c <= 'Z' ? (char)(c - 'A' + 'a') : c;
        }
        return vg_strmap_get(&v->keep, small, len) != (size_t)-1;
    }
    size_t klen;
    char *k = vg_text_fold(word, len, &klen);
    if (!k) return -1;
    int hit = vg_strmap_get(&v->keep, k, klen) != (size_t)-1;
    vg_free(k);
    return hit;
}

int vg_rowkey_make_unfiltered(const char *word, size_t len, vg_rowkey *k) {
    k->word = word;
    k->len = len;
    k->owned = NULL;
    k->key = word;
    k->klen = len;
    k->wanted = 1;
    k->invalid_utf8 = 0;
    if (!vg_text_is_ascii(word, len)) {
        k->invalid_utf8 = !vg_text_valid_utf8(word, len);
        if (!k->invalid_utf8) {
            size_t klen;
            char *owned;
            const char *key = vg_text_nfc(word, len, &klen, &owned);
            if (!key) return -1;
            k->key = key;
            k->klen = klen;
            k->owned = owned;
        }
    }
    k->hash = vg_hash_bytes(k->key, k->klen);
    return 0;
}

int vg_rowkey_make(const vg_vectors *v, const char *word, size_t len, vg_rowkey *k) {
    if (vg_rowkey_make_unfiltered(word, len, k) != 0) return -1;
    if (v->keep_active) {
        k->wanted = vg_strmap_get_hashed(&v->keep, k->key, k->klen, k->hash) != (size_t)-1;
        if (!k->wanted && v->keep_fold) {
            int hit = keep_has_folded(v, word, len);
            if (hit < 0) {
                vg_rowkey_clear(k);
                return -1;
            }
            k->wanted = (unsigned char)hit;
        }
    }
    return 0;
}

void vg_rowkey_clear(vg_rowkey *k) {
    vg_free(k->owned);
    k->owned = NULL;
}

vg_status vg_vecbuild_add(vg_vectors *v, const vg_rowkey *k, float norm, float **dst,
                          const char *path, uint64_t line, vg_error *err) {
    *dst = NULL;
    size_t idx = v->seen_rows++;
    v->info.rows_read++;
    if (k->len > VG_MAX_WORD)
        return vg_error_set(err, VG_ELIMIT, path, line, "word of %zu bytes exceeds the limit of %u",
                            k->len, (unsigned)VG_MAX_WORD);
    if (k->invalid_utf8) v->info.invalid_utf8++;
    if (v->keep_active && idx >= v->keep_first && !k->wanted) return VG_OK;
    /* Probe before copying: duplicates are common in crawled files and
     * should cost no arena space. */
    if (vg_strmap_get_hashed(&v->index, k->key, k->klen, k->hash) != (size_t)-1) {
        v->info.duplicates++;
        return VG_OK;
    }
    if (reserve_matrix(v, v->rows + 1) != 0 || reserve_meta(v, v->rows + 1) != 0)
        return vg_error_set(err, VG_ENOMEM, path, line, "out of memory at row %zu", v->rows + 1);
    const char *stored = v->words_adopted ? k->word : vg_arena_strndup(&v->arena, k->word, k->len);
    const char *key = stored;
    if (stored && k->key != k->word) key = vg_arena_strndup(&v->arena, k->key, k->klen);
    if (!stored || !key ||
        vg_strmap_put_hashed(&v->index, key, k->klen, k->hash, v->rows, NULL) < 0)
        return vg_error_set(err, VG_ENOMEM, path, line, "out of memory at row %zu", v->rows + 1);
    v->words[v->rows] = stored;
    v->word_lens[v->rows] = (uint32_t)k->len;
    v->norms[v->rows] = norm;
    if (isnan(norm)) v->norms_pending = 1;
    *dst = v->data + v->rows * v->ld;
    v->rows++;
    return VG_OK;
}

vg_status vg_vecbuild_push(vg_vectors *v, const char *word, size_t len, const float *vals,
                           const char *path, uint64_t line, vg_error *err) {
    vg_rowkey k;
    if (vg_rowkey_make(v, word, len, &k) != 0)
        return vg_error_set(err, VG_ENOMEM, path, line, "out of memory");
    float *dst;
    vg_status st = vg_vecbuild_add(v, &k, vg_row_norm(vals, v->dims), &dst, path, line, err);
    vg_rowkey_clear(&k);
    if (st == VG_OK && dst) memcpy(dst, vals, v->dims * sizeof(float));
    return st;
}

static void norms_share(void *ctx, unsigned t, unsigned n) {
    vg_vectors *v = ctx;
    size_t b = v->rows * t / n, e = v->rows * (t + 1) / n;
    for (size_t i = b; i < e; i++)
        if (isnan(v->norms[i])) v->norms[i] = vg_row_norm(v->data + i * v->ld, v->dims);
}

vg_status vg_vecbuild_finish(vg_vectors *v, vg_error *err) {
    VG_UNUSED(err); /* nothing here can fail today; the contract allows it */
    if (v->norms_pending) {
        unsigned t = vg_threads_resolve(v->threads);
        vg_parallel(v->rows < 4096 ? 1 : t, norms_share, v);
        v->norms_pending = 0;
    }
    size_t zero = 0;
    for (size_t i = 0; i < v->rows; i++) zero += v->norms[i] == 0;
    /* Give back the address space (and any touched pages) past the last
     * row; the matrix keeps its place, so pointers stay valid. */
    if (v->borrow_map) {
        /* The file's bytes are the matrix: the reserved space is unused. */
        vg_bigbuf_free(&v->mat);
        v->info.mapped = 1;
    } else {
        vg_bigbuf_shrink(&v->mat, v->rows * v->ld * sizeof(float));
        v->data = v->mat.p;
    }
    vg_bigbuf_shrink(&v->meta_words, v->rows * sizeof *v->words);
    vg_bigbuf_shrink(&v->meta_lens, v->rows * sizeof *v->word_lens);
    vg_bigbuf_shrink(&v->meta_norms, v->rows * sizeof *v->norms);
    v->words = v->meta_words.p;
    v->word_lens = v->meta_lens.p;
    v->norms = v->meta_norms.p;
    v->cap_meta = VG_MIN(VG_MIN(v->meta_words.reserved / sizeof *v->words,
                                v->meta_lens.reserved / sizeof *v->word_lens),
                         VG_MIN(v->meta_norms.reserved / sizeof *v->norms, v->cap_meta));
    v->cap_rows = v->borrow_map ? v->rows : v->mat.reserved / (v->ld * sizeof(float));
    v->info.rows = v->rows;
    v->info.zero_rows = zero;
    v->info.dims = v->dims;
    vg_strmap_free(&v->keep);
    vg_arena_free(&v->keep_arena);
    v->keep_active = 0;
    return VG_OK;
}

vg_status vg_vectors_from_matrix(const char *const *words, size_t rows, const float *data,
                                 size_t dims, size_t ld, vg_vectors **out, vg_error *err) {
    *out = NULL;
    if (dims == 0 || ld < dims || (rows && (!words || !data)))
        return vg_error_set(err, VG_EINVAL, NULL, 0,
                            "invalid matrix: rows %zu, dims %zu, ld %zu", rows, dims, ld);
    vg_vectors *v;
    vg_status st = vg_vecbuild_begin(dims, rows, rows, NULL, &v, err);
    if (st != VG_OK) return st;
    for (size_t i = 0; i < rows && st == VG_OK; i++) {
        const float *r = data + i * ld;
        if (!vg_all_finite(r, dims)) {
            size_t j = 0;
            while (isfinite(r[j])) j++;
            st = vg_error_set(err, VG_EVALUE, NULL, i + 1, "row %zu (%s), value %zu is not finite",
                              i + 1, words[i], j + 1);
            break;
        }
        st = vg_vecbuild_push(v, words[i], strlen(words[i]), r, NULL, i + 1, err);
    }
    if (st == VG_OK) st = vg_vecbuild_finish(v, err);
    if (st != VG_OK) {
        vg_vectors_free(v);
        return st;
    }
    v->info.layout = VG_LAYOUT_AUTO;
    snprintf(v->info.detected_because, sizeof v->info.detected_because, "in-memory matrix");
    *out = v;
    return VG_OK;
}

void vg_vectors_free(vg_vectors *v) {
    if (!v) return;
    vg_bigbuf_free(&v->mat);
    if (v->borrow_map) munmap(v->borrow_map, v->borrow_len);
    vg_bigbuf_free(&v->meta_words);
    vg_bigbuf_free(&v->meta_lens);
    vg_bigbuf_free(&v->meta_norms);
    vg_arena_free(&v->arena);
    vg_arena_free(&v->vocab_arena);
    vg_strmap_free(&v->index);
    if (v->folded) {
        vg_strmap_free(&v->folded->map);
        vg_arena_free(&v->folded->arena);
        pthread_mutex_destroy(&v->folded->lock);
        vg_free(v->folded);
    }
    vg_strmap_free(&v->keep);
    vg_arena_free(&v->keep_arena);
    vg_free(v);
}

size_t vg_vectors_rows(const vg_vectors *v) { return v->rows; }
size_t vg_vectors_dims(const vg_vectors *v) { return v->dims; }
size_t vg_vectors_ld(const vg_vectors *v) { return v->ld; }
const float *vg_vectors_data(const vg_vectors *v) { return v->data; }
const float *vg_vectors_row(const vg_vectors *v, size_t i) { return v->data + i * v->ld; }
const float *vg_vectors_norms(const vg_vectors *v) { return v->norms; }
const vg_vectors_info *vg_vectors_get_info(const vg_vectors *v) { return &v->info; }

const char *vg_vectors_word(const vg_vectors *v, size_t i, size_t *len) {
    if (len) *len = v->word_lens[i];
    return v->words[i];
}

size_t vg_vectors_find(const vg_vectors *v, const char *word, size_t len) {
    size_t klen;
    char *owned;
    const char *k = make_key(word, len, 0, &klen, &owned);
    if (!k) return VG_NOT_FOUND;
    size_t r = vg_strmap_get(&v->index, k, klen);
    vg_free(owned);
    return r == (size_t)-1 ? VG_NOT_FOUND : r;
}

/* Build the folded index: rows in order, so the lowest row wins. */
static int build_folded(const vg_vectors *v, vg_folded_index *fx) {
    if (vg_strmap_reserve(&fx->map, v->rows) != 0) return -1;
    for (size_t i = 0; i < v->rows; i++) {
        size_t klen;
        char *k = vg_text_fold(v->words[i], v->word_lens[i], &klen);
        char *stored = k ? vg_arena_strndup(&fx->arena, k, klen) : NULL;
        vg_free(k);
        if (!stored || vg_strmap_put(&fx->map, stored, klen, i, NULL) < 0) return -1;
    }
    fx->built = 1;
    return 0;
}

size_t vg_vectors_find_folded(const vg_vectors *v, const char *word, size_t len) {
    vg_folded_index *fx = v->folded;
    if (!fx) return VG_NOT_FOUND;
    /* The folded index is a cache built on first use; the mutex makes
     * that first use safe from any thread. */
    pthread_mutex_lock(&fx->lock);
    int ok = fx->built || build_folded(v, fx) == 0;
    if (!ok) {
        vg_strmap_free(&fx->map);
        vg_arena_free(&fx->arena);
    }
    pthread_mutex_unlock(&fx->lock);
    if (!ok) return VG_NOT_FOUND;
    size_t klen;
    char *k = vg_text_fold(word, len, &klen);
    if (!k) return VG_NOT_FOUND;
    size_t r = vg_strmap_get(&fx->map, k, klen);
    vg_free(k);
    return r == (size_t)-1 ? VG_NOT_FOUND : r;
}

/* The k-th smallest of x[0..n) (0-based), reordering x: Hoare's
 * selection ("Algorithm 65: find", CACM 1961) with a median-of-three
 * pivot; O(n) on average where sorting 2 million norms would be O(n log n). */
static double select_kth(double *x, size_t n, size_t k) {
    size_t lo = 0, hi = n - 1;
    while (lo < hi) {
        size_t mid = lo + (hi - lo) / 2;
        double a = x[lo], b = x[mid], c = x[hi];
        double pivot = a < b ? (b < c ? b : (a < c ? c : a)) : (a < c ? a : (b < c ? c : b));
        size_t i = lo, j = hi;
        while (i <= j) {
            while (x[i] < pivot) i++;
            while (x[j] > pivot) j--;
            if (i <= j) {
                double t = x[i];
                x[i] = x[j];
                x[j] = t;
                i++;
                if (j == 0) break;
                j--;
            }
        }
        if (k <= j) {
            hi = j;
        } else if (k >= i) {
            lo = i;
        } else {
            return x[k];
        }
    }
    return x[k];
}

vg_status vg_vectors_norm_summary(const vg_vectors *v, double *min, double *median, double *max,
                                  vg_error *err) {
    *min = *median = *max = NAN;
    if (v->rows == 0) return VG_OK;
    double *tmp = vg_calloc(v->rows, sizeof *tmp);
    if (!tmp) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory for norm summary");
    double lo = INFINITY, hi = -INFINITY;
    for (size_t i = 0; i < v->rows; i++) {
        tmp[i] = v->norms[i];
        lo = VG_MIN(lo, tmp[i]);
        hi = VG_MAX(hi, tmp[i]);
    }
    *min = lo;
    *max = hi;
    size_t h = v->rows / 2;
    double upper = select_kth(tmp, v->rows, h);
    if (v->rows % 2) {
        *median = upper;
    } else {
        /* After selection every element before h is <= x[h]: the lower
         * middle value is their maximum. */
        double lower = tmp[0];
        for (size_t i = 1; i < h; i++) lower = VG_MAX(lower, tmp[i]);
        *median = (lower + upper) / 2;
    }
    vg_free(tmp);
    return VG_OK;
}
