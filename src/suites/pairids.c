/* pairids.c - which word pairs an analogy question is built from.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The pair bootstrap (stats.h) resamples the pairs of each section, so
 * every question needs the identity of the pair it takes as (a, b) and of
 * the one it takes as (c, d). Two pairs are the same when their words
 * are, within one stratum: Google's capital sections repeat pairs across
 * sections, and each is its own design.
 */
#include <string.h>

#include "../common/alloc.h"
#include "../common/strmap.h"
#include "suite_impl.h"

/* The number of the pair (x, y) of stratum s in m, added if new. Keys are
 * "s x \0 y" in buf, which must outlive m. -1 when out of memory. */
static long pair_id(vg_strmap *m, char **buf, uint32_t s, const char *x, const char *y) {
    size_t lx = strlen(x), ly = strlen(y), len = sizeof s + lx + 1 + ly;
    char *k = vg_malloc(len);
    if (!k) return -1;
    memcpy(k, &s, sizeof s);
    memcpy(k + sizeof s, x, lx + 1);
    memcpy(k + sizeof s + lx + 1, y, ly);
    size_t have;
    int put = vg_strmap_put(m, k, len, m->count, &have);
    if (put < 0) {
        vg_free(k);
        return -1;
    }
    if (put == 0) {
        vg_free(k);
        return (long)have;
    }
    *buf = k;
    return (long)(m->count - 1);
}

vg_status vg_pair_ids(size_t n, const char *const *words, const uint32_t *stratum, uint32_t *row,
                      uint32_t *col, vg_error *err) {
    if (n > UINT32_MAX / 2)
        return vg_error_set(err, VG_ELIMIT, NULL, 0, "more than 2^31 questions");
    vg_strmap m = VG_STRMAP_INIT;
    char **keys = vg_calloc(2 * n + 1, sizeof *keys);
    vg_status st = VG_OK;
    if (!keys || vg_strmap_reserve(&m, 2 * n) != 0) goto oom;
    for (size_t i = 0; i < n; i++) {
        const char *const *w = words + 4 * i;
        uint32_t s = stratum ? stratum[i] : 0;
        long r = pair_id(&m, &keys[2 * i], s, w[0] ? w[0] : "", w[1] ? w[1] : "");
        long c = r < 0 ? -1 : pair_id(&m, &keys[2 * i + 1], s, w[2] ? w[2] : "", w[3] ? w[3] : "");
        if (c < 0) goto oom;
        row[i] = (uint32_t)r;
        col[i] = (uint32_t)c;
    }
    goto done;
oom:
    st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
done:
    vg_strmap_free(&m);
    for (size_t i = 0; keys && i < 2 * n; i++) vg_free(keys[i]);
    vg_free(keys);
    return st;
}

vg_status vg_suite_question_pairs(const vg_suite *s, uint32_t *stratum, uint32_t *row,
                                  uint32_t *col, vg_error *err) {
    if (s->task != VG_TASK_ANALOGY)
        return vg_error_set(err, VG_EINVAL, NULL, 0, "suite %s is not an analogy suite", s->id);
    size_t n = s->n_items;
    const char **w = vg_calloc(4 * n + 1, sizeof *w);
    uint32_t *sec = vg_calloc(n + 1, sizeof *sec);
    if (!w || !sec) {
        vg_free(w);
        vg_free(sec);
        return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    }
    for (size_t i = 0; i < n; i++) {
        const vg_question *q = &s->questions[i];
        w[4 * i] = q->a;
        w[4 * i + 1] = q->b;
        w[4 * i + 2] = q->c;
        w[4 * i + 3] = q->n_answers && q->answers ? q->answers[0] : "";
        sec[i] = (uint32_t)(s->n_sections ? q->section : 0);
    }
    vg_status st = vg_pair_ids(n, w, sec, row, col, err);
    if (st == VG_OK && stratum) memcpy(stratum, sec, n * sizeof *sec);
    vg_free(w);
    vg_free(sec);
    return st;
}
