/* similarity.c - cosine similarity of every pair of a similarity suite.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/strmap.h"
#include "missing.h"
#include "vecgauge/score.h"

void vg_score_options_init(vg_score_options *opt) {
    memset(opt, 0, sizeof *opt);
    opt->analogy_vocab = VG_DEFAULT_ANALOGY_VOCAB;
}

const char *vg_item_status_name(vg_item_status st) {
    switch (st) {
    case VG_ITEM_SCORED: return "scored";
    case VG_ITEM_MISSING_WORD: return "missing_word";
    case VG_ITEM_ZERO_VECTOR: return "zero_vector";
    }
    return "unknown";
}

/* Cosine of rows i and j, accumulated in double: float accumulation over
 * 300 terms loses digits that Spearman's ranks can notice on near-ties. */
static double cosine_rows(const vg_vectors *v, size_t i, size_t j) {
    const float *a = vg_vectors_row(v, i), *b = vg_vectors_row(v, j);
    size_t d = vg_vectors_dims(v);
    double dot = 0, na = 0, nb = 0;
    for (size_t k = 0; k < d; k++) {
        dot += (double)a[k] * b[k];
        na += (double)a[k] * a[k];
        nb += (double)b[k] * b[k];
    }
    return dot / (sqrt(na) * sqrt(nb));
}

/* Look word up exactly, then (with fold) case-folded. *folded_used tells
 * whether only the folded lookup found it. */
static size_t lookup(const vg_vectors *v, const char *w, int fold, int *folded_used) {
    size_t len = strlen(w);
    size_t r = vg_vectors_find(v, w, len);
    *folded_used = 0;
    if (r == VG_NOT_FOUND && fold) {
        r = vg_vectors_find_folded(v, w, len);
        *folded_used = r != VG_NOT_FOUND;
    }
    return r;
}

vg_status vg_score_similarity(const vg_vectors *v, const vg_suite *suite,
                              const vg_score_options *opt, vg_similarity_scores **out,
                              vg_error *err) {
    *out = NULL;
    if (suite->task != VG_TASK_SIMILARITY)
        return vg_error_set(err, VG_EINVAL, NULL, 0, "suite %s is not a similarity suite",
                            suite->id);
    vg_score_options defaults;
    if (!opt) {
        vg_score_options_init(&defaults);
        opt = &defaults;
    }
    size_t n = suite->n_items;
    vg_similarity_scores *s = vg_calloc(1, sizeof *s);
    vg_missing_list missing = {0};
    if (!s) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    s->n_items = n;
    s->cosine = vg_calloc(n, sizeof *s->cosine);
    s->status = vg_calloc(n, 1);
    if (!s->cosine || !s->status) goto oom;
    const float *norms = vg_vectors_norms(v);
    for (size_t i = 0; i < n; i++) {
        const vg_pair *p = &suite->pairs[i];
        int f1, f2;
        size_t r1 = lookup(v, p->w1, opt->fold_case, &f1);
        size_t r2 = lookup(v, p->w2, opt->fold_case, &f2);
        s->cosine[i] = NAN;
        if (r1 == VG_NOT_FOUND || r2 == VG_NOT_FOUND) {
            s->status[i] = VG_ITEM_MISSING_WORD;
            s->n_missing++;
            if ((r1 == VG_NOT_FOUND && vg_missing_add(&missing, p->w1) != 0) ||
                (r2 == VG_NOT_FOUND && vg_missing_add(&missing, p->w2) != 0))
                goto oom;
            if (!opt->fold_case) {
                /* Would folding have found both words? Tell the user how
                 * much --fold-case would recover. */
                int d1, d2;
                size_t q1 = lookup(v, p->w1, 1, &d1), q2 = lookup(v, p->w2, 1, &d2);
                if (q1 != VG_NOT_FOUND && q2 != VG_NOT_FOUND) s->n_fold_recovered++;
            }
            continue;
        }
        if (norms[r1] == 0 || norms[r2] == 0) {
            s->status[i] = VG_ITEM_ZERO_VECTOR;
            s->n_zero++;
            continue;
        }
        if (opt->fold_case && (f1 || f2)) s->n_fold_recovered++;
        s->status[i] = VG_ITEM_SCORED;
        s->cosine[i] = cosine_rows(v, r1, r2);
        s->n_used++;
    }
    vg_missing_take(&missing, &s->missing_words, &s->n_missing_words);
    *out = s;
    return VG_OK;
oom:
    vg_missing_free(&missing);
    vg_similarity_scores_free(s);
    return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory scoring suite %s", suite->id);
}

void vg_similarity_scores_free(vg_similarity_scores *s) {
    if (!s) return;
    vg_missing_words_free(s->missing_words, s->n_missing_words);
    vg_free(s->cosine);
    vg_free(s->status);
    vg_free(s);
}
