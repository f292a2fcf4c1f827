/* paired_items.c - the engine's input: paired items from in-process results.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "compare_impl.h"

/* Every block allocated for one vg_paired_items. */
typedef struct store {
    void **blocks;
    size_t n, cap;
} store;

vg_paired_items *vg_paired_new(size_t n_sets, size_t n_suites, const char ***labels,
                               vg_paired_suite **suites) {
    vg_paired_items *p = vg_calloc(1, sizeof *p);
    store *st = vg_calloc(1, sizeof *st);
    if (!p || !st) {
        vg_free(p);
        vg_free(st);
        return NULL;
    }
    p->priv_ = st;
    p->n_sets = n_sets;
    p->n_suites = n_suites;
    *labels = vg_paired_alloc(p, n_sets, sizeof **labels);
    *suites = vg_paired_alloc(p, n_suites, sizeof **suites);
    if (!*labels || !*suites) {
        vg_paired_items_free(p);
        return NULL;
    }
    p->labels = *labels;
    p->suites = *suites;
    return p;
}

void *vg_paired_alloc(vg_paired_items *p, size_t n, size_t size) {
    store *st = p->priv_;
    if (vg_grow((void **)&st->blocks, &st->cap, st->n + 1, sizeof *st->blocks) != 0) return NULL;
    void *b = vg_calloc(n ? n : 1, size);
    if (b) st->blocks[st->n++] = b;
    return b;
}

void vg_paired_items_free(vg_paired_items *p) {
    if (!p) return;
    store *st = p->priv_;
    for (size_t i = 0; st && i < st->n; i++) vg_free(st->blocks[i]);
    if (st) vg_free(st->blocks);
    vg_free(st);
    vg_free(p);
}

vg_status vg_paired_items_from_results(const vg_results *r, vg_paired_items **out,
                                       vg_error *err) {
    *out = NULL;
    const char **labels;
    vg_paired_suite *suites;
    vg_paired_items *p = vg_paired_new(r->n_sets, r->n_suites, &labels, &suites);
    if (!p) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    for (size_t i = 0; i < r->n_sets; i++) labels[i] = r->labels[i];
    size_t ns = r->n_sets;
    for (size_t k = 0; k < r->n_suites; k++) {
        const vg_suite *s = r->suites[k];
        vg_paired_suite *ps = &suites[k];
        size_t n = s->n_items;
        ps->id = s->id;
        ps->task = s->task;
        ps->n_items = n;
        if (s->task == VG_TASK_SIMILARITY) {
            double *rating = vg_paired_alloc(p, n, sizeof *rating);
            const double **cos = vg_paired_alloc(p, ns, sizeof *cos);
            if (!rating || !cos) goto oom;
            for (size_t i = 0; i < n; i++) rating[i] = s->pairs[i].rating;
            for (size_t j = 0; j < ns; j++) {
                const vg_similarity_scores *sc = r->blocks[j * r->n_suites + k].sim;
                double *c = vg_paired_alloc(p, n, sizeof *c);
                if (!c) goto oom;
                /* As items.csv and the score rows take them: a cosine only
                 * where the pair is scored. */
                for (size_t i = 0; i < n; i++)
                    c[i] = sc && sc->status[i] == VG_ITEM_SCORED ? sc->cosine[i] : NAN;
                cos[j] = c;
            }
            ps->rating = rating;
            ps->cosine = cos;
        } else {
            const signed char **cor = vg_paired_alloc(p, ns * VG_METHOD_COUNT, sizeof *cor);
            if (!cor) goto oom;
            for (size_t j = 0; j < ns; j++) {
                const vg_analogy_scores *sc = r->blocks[j * r->n_suites + k].ana;
                for (int m = 0; sc && m < VG_METHOD_COUNT; m++) {
                    if (!sc->predicted[m] || !sc->correct[m]) continue;
                    signed char *c = vg_paired_alloc(p, n, sizeof *c);
                    if (!c) goto oom;
                    /* items.csv fills a method's correctness exactly where
                     * it has a predicted word. */
                    for (size_t i = 0; i < n; i++)
                        c[i] = sc->predicted[m][i] == VG_NOT_FOUND || !r->vectors[j]
                                   ? -1
                                   : (signed char)(sc->correct[m][i] ? 1 : 0);
                    cor[j * VG_METHOD_COUNT + m] = c;
                }
            }
            ps->correct = cor;
            uint32_t *st = vg_paired_alloc(p, n, sizeof *st);
            uint32_t *row = vg_paired_alloc(p, n, sizeof *row);
            uint32_t *col = vg_paired_alloc(p, n, sizeof *col);
            if (!st || !row || !col) goto oom;
            vg_status rc = vg_suite_question_pairs(s, st, row, col, err);
            if (rc != VG_OK) {
                vg_paired_items_free(p);
                return rc;
            }
            ps->stratum = st;
            ps->n_strata = s->n_sections ? s->n_sections : 1;
            ps->row_pair = row;
            ps->col_pair = col;
        }
    }
    *out = p;
    return VG_OK;
oom:
    vg_paired_items_free(p);
    return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
}
