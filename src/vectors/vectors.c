/* vectors.c - the vg_vectors object: building, indexing, lookup, freeing.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "vectors_impl.h"

#include <math.h>
#include <pthread.h>
#include <stdlib.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/text.h"

/* Refuse to pre-allocate more than this many rows from a hint alone: a
 * header claiming 10^12 rows must not become a 10^12-row allocation. The
 * matrix grows geometrically past it as rows actually arrive. */
#define HINT_MAX_ROWS ((size_t)1 << 22)

void vg_load_options_init(vg_load_options *opt) {
    memset(opt, 0, sizeof *opt);
    opt->layout = VG_LAYOUT_AUTO;
    opt->compute_hash = 1;
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

static int reserve_rows(vg_vectors *v, size_t need) {
    if (need <= v->cap_rows) return 0;
    size_t ncap = v->cap_rows ? v->cap_rows : 1024;
    while (ncap < need)
        if (vg_mul_overflow(ncap, 2, &ncap)) return -1;
    size_t bytes;
    if (vg_mul_overflow(ncap, v->ld, &bytes) || vg_mul_overflow(bytes, sizeof(float), &bytes))
        return -1;
    /* posix_memalign has no realloc: allocate, copy, free. This happens
     * O(log rows) times, and readers that know the row count (binary,
     * npy, text with a trusted header) size the matrix once. */
    float *nd = vg_aligned_alloc(64, bytes);
    if (!nd) return -1;
    if (v->data) memcpy(nd, v->data, v->rows * v->ld * sizeof(float));
    vg_free(v->data);
    v->data = nd;
    const char **nw = vg_reallocarray(v->words, ncap, sizeof *nw);
    if (!nw) return -1;
    v->words = nw;
    uint32_t *nl = vg_reallocarray(v->word_lens, ncap, sizeof *nl);
    if (!nl) return -1;
    v->word_lens = nl;
    v->cap_rows = ncap;
    return 0;
}

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

vg_status vg_vecbuild_begin(size_t dims, size_t rows_hint, const vg_load_options *opt,
                            vg_vectors **out, vg_error *err) {
    *out = NULL;
    if (dims == 0 || dims > VG_MAX_DIMS)
        return vg_error_set(err, VG_ELIMIT, NULL, 0, "dimension %zu outside 1..%u", dims,
                            (unsigned)VG_MAX_DIMS);
    vg_vectors *v = vg_calloc(1, sizeof *v);
    if (!v) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    v->dims = dims;
    v->ld = dims;
    v->info.dims = dims;
    v->folded = vg_calloc(1, sizeof *v->folded);
    if (!v->folded) {
        vg_free(v);
        return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    }
    pthread_mutex_init(&v->folded->lock, NULL);
    vg_status st = VG_OK;
    if (opt && opt->keep_words) st = build_keep(v, opt, err);
    size_t hint = rows_hint < HINT_MAX_ROWS ? rows_hint : HINT_MAX_ROWS;
    if (opt && opt->max_words && hint > opt->max_words) hint = opt->max_words;
    if (st == VG_OK && reserve_rows(v, hint ? hint : 1024) != 0)
        st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory for %zu x %zu matrix", hint,
                          dims);
    if (st != VG_OK) {
        vg_vectors_free(v);
        return st;
    }
    *out = v;
    return VG_OK;
}

static int keep_row(vg_vectors *v, const char *word, size_t len) {
    if (!v->keep_active || v->seen_rows <= v->keep_first) return 1;
    for (int fold = 0; fold <= v->keep_fold; fold++) {
        size_t klen;
        char *owned;
        const char *k = make_key(word, len, fold, &klen, &owned);
        if (!k) return -1;
        size_t hit = vg_strmap_get(&v->keep, k, klen);
        vg_free(owned);
        if (hit != (size_t)-1) return 1;
    }
    return 0;
}

vg_status vg_vecbuild_push(vg_vectors *v, const char *word, size_t len, const float *vals,
                           const char *path, uint64_t line, vg_error *err) {
    v->seen_rows++;
    v->info.rows_read++;
    if (len > VG_MAX_WORD)
        return vg_error_set(err, VG_ELIMIT, path, line, "word of %zu bytes exceeds the limit of %u",
                            len, (unsigned)VG_MAX_WORD);
    if (!vg_text_valid_utf8(word, len)) v->info.invalid_utf8++;
    int keep = keep_row(v, word, len);
    if (keep < 0) return vg_error_set(err, VG_ENOMEM, path, line, "out of memory");
    if (!keep) return VG_OK;
    size_t klen;
    char *owned;
    const char *k = make_key(word, len, 0, &klen, &owned);
    if (!k) return vg_error_set(err, VG_ENOMEM, path, line, "out of memory");
    /* Probe before copying: duplicates are common in crawled files and
     * should cost no arena space. */
    if (vg_strmap_get(&v->index, k, klen) != (size_t)-1) {
        vg_free(owned);
        v->info.duplicates++;
        return VG_OK;
    }
    if (reserve_rows(v, v->rows + 1) != 0) {
        vg_free(owned);
        return vg_error_set(err, VG_ENOMEM, path, line, "out of memory at row %zu", v->rows + 1);
    }
    char *stored = vg_arena_strndup(&v->arena, word, len);
    char *key = stored;
    if (stored && owned) key = vg_arena_strndup(&v->arena, k, klen);
    vg_free(owned);
    if (!stored || !key || vg_strmap_put(&v->index, key, klen, v->rows, NULL) < 0)
        return vg_error_set(err, VG_ENOMEM, path, line, "out of memory at row %zu", v->rows + 1);
    v->words[v->rows] = stored;
    v->word_lens[v->rows] = (uint32_t)len;
    memcpy(v->data + v->rows * v->ld, vals, v->dims * sizeof(float));
    if (v->ld > v->dims)
        memset(v->data + v->rows * v->ld + v->dims, 0, (v->ld - v->dims) * sizeof(float));
    v->rows++;
    return VG_OK;
}

vg_status vg_vecbuild_finish(vg_vectors *v, vg_error *err) {
    v->norms = vg_calloc(v->rows ? v->rows : 1, sizeof(float));
    if (!v->norms) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory for norms");
    size_t zero = 0;
    for (size_t i = 0; i < v->rows; i++) {
        const float *r = v->data + i * v->ld;
        double s = 0;
        for (size_t j = 0; j < v->dims; j++) s += (double)r[j] * r[j];
        v->norms[i] = (float)sqrt(s);
        if (s == 0) zero++;
    }
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
    vg_status st = vg_vecbuild_begin(dims, rows, NULL, &v, err);
    if (st != VG_OK) return st;
    for (size_t i = 0; i < rows && st == VG_OK; i++) {
        const float *r = data + i * ld;
        for (size_t j = 0; j < dims; j++) {
            if (!isfinite(r[j])) {
                st = vg_error_set(err, VG_EVALUE, NULL, i + 1,
                                  "row %zu (%s), value %zu is not finite", i + 1, words[i], j + 1);
                break;
            }
        }
        if (st == VG_OK) st = vg_vecbuild_push(v, words[i], strlen(words[i]), r, NULL, i + 1, err);
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
    vg_free(v->data);
    vg_free(v->norms);
    vg_free(v->words);
    vg_free(v->word_lens);
    vg_arena_free(&v->arena);
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

static int cmp_double(const void *a, const void *b) {
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

vg_status vg_vectors_norm_summary(const vg_vectors *v, double *min, double *median, double *max,
                                  vg_error *err) {
    *min = *median = *max = NAN;
    if (v->rows == 0) return VG_OK;
    double *tmp = vg_calloc(v->rows, sizeof *tmp);
    if (!tmp) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory for norm summary");
    for (size_t i = 0; i < v->rows; i++) tmp[i] = v->norms[i];
    qsort(tmp, v->rows, sizeof *tmp, cmp_double);
    *min = tmp[0];
    *max = tmp[v->rows - 1];
    size_t h = v->rows / 2;
    *median = v->rows % 2 ? tmp[h] : (tmp[h - 1] + tmp[h]) / 2;
    vg_free(tmp);
    return VG_OK;
}
