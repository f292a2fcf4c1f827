/* saved_results.c - in-process results as the run they are written as.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * A training program that evaluates in-process and tracks the result
 * should get exactly what tracking the run directory would give: the
 * same items, cosines, answers and headline scores that items.csv and
 * scores.csv hold (they round-trip every number), taken from the results
 * without reading the files back.
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "../compare/compare_impl.h"
#include "saved_impl.h"

/* Suite k's words as items.csv writes them (word1, word2, word3,
 * expected; a question's answers '/'-separated), copied into one block
 * owned by p. */
static int copy_words(const vg_suite *s, vg_saved_suite *out, saved_priv *p, size_t k) {
    size_t n = s->n_items, total = 0;
    for (size_t i = 0; i < n; i++) {
        if (s->task == VG_TASK_SIMILARITY) {
            total += strlen(s->pairs[i].w1) + strlen(s->pairs[i].w2) + 4;
        } else {
            const vg_question *q = &s->questions[i];
            total += strlen(q->a) + strlen(q->b) + strlen(q->c) + 4;
            for (size_t a = 0; a < q->n_answers; a++) total += strlen(q->answers[a]) + 1;
        }
    }
    char *block = vg_malloc(total ? total : 1);
    out->words = vg_calloc(4 * (n ? n : 1), sizeof *out->words);
    if (!block || !out->words) {
        vg_free(block);
        return -1;
    }
    p->words[k] = block;
    char *w = block;
#define PUT(idx, str)                                                         \
    do {                                                                      \
        out->words[idx] = w;                                                  \
        size_t len_ = strlen(str);                                            \
        memcpy(w, str, len_ + 1);                                             \
        w += len_ + 1;                                                        \
    } while (0)
    for (size_t i = 0; i < n; i++) {
        if (s->task == VG_TASK_SIMILARITY) {
            PUT(4 * i, s->pairs[i].w1);
            PUT(4 * i + 1, s->pairs[i].w2);
            PUT(4 * i + 2, "");
            PUT(4 * i + 3, "");
        } else {
            const vg_question *q = &s->questions[i];
            PUT(4 * i, q->a);
            PUT(4 * i + 1, q->b);
            PUT(4 * i + 2, q->c);
            out->words[4 * i + 3] = w;
            for (size_t a = 0; a < q->n_answers; a++) {
                if (a) *w++ = '/';
                size_t len = strlen(q->answers[a]);
                memcpy(w, q->answers[a], len);
                w += len;
            }
            *w++ = '\0';
        }
    }
#undef PUT
    return 0;
}

/* Block b's cosines or answers, as items.csv holds them: a cosine where
 * the pair is scored, else NaN; per method 1/0 where a word was
 * predicted, else -1 (every method has an array, as a saved run's). */
static int copy_items(const vg_results *res, vg_saved_run *r, size_t set, size_t k) {
    const vg_saved_suite *s = &r->suites[k];
    const vg_item_block *blk = vg_results_block(res, set, k);
    size_t n = s->n_items, b = set * r->n_suites + k;
    if (s->task == VG_TASK_SIMILARITY) {
        double *c = vg_calloc(n ? n : 1, sizeof *c);
        if (!c) return -1;
        r->cosine[b] = c;
        for (size_t i = 0; i < n; i++)
            c[i] = blk->sim && blk->sim->status[i] == VG_ITEM_SCORED ? blk->sim->cosine[i] : NAN;
        return 0;
    }
    for (int m = 0; m < VG_METHOD_COUNT; m++) {
        signed char *c = vg_malloc(n ? n : 1);
        if (!c) return -1;
        r->correct[b * VG_METHOD_COUNT + m] = c;
        const vg_analogy_scores *sc = blk->ana;
        for (size_t i = 0; i < n; i++)
            c[i] = !sc || !sc->predicted[m] || sc->predicted[m][i] == VG_NOT_FOUND ||
                           !res->vectors[set]
                       ? -1
                       : (signed char)(sc->correct[m][i] ? 1 : 0);
    }
    return 0;
}

/* Block b's headline score, as read back from scores.csv. */
static int copy_score(const vg_results *res, vg_saved_run *r, size_t set, size_t k) {
    size_t b = set * r->n_suites + k;
    vg_saved_score *sc = &r->scores[b];
    vg_task task = r->suites[k].task;
    sc->metric = task == VG_TASK_SIMILARITY ? "spearman" : "3cosadd";
    sc->value = sc->low = sc->high = NAN;
    sc->n_items = r->suites[k].n_items;
    const vg_score_row *row = vg_results_find(
        res, set, k, "", task == VG_TASK_SIMILARITY ? VG_METRIC_SPEARMAN : VG_METRIC_3COSADD, 0);
    const char *method = "";
    if (row) {
        sc->value = row->value;
        if (row->n_ci > 0) {
            sc->low = row->ci[0].low;
            sc->high = row->ci[0].high;
            method = row->ci[0].method;
        }
        sc->n_items = row->n_items;
        sc->n_used = row->n_used;
    } else if (task != VG_TASK_SIMILARITY) {
        vg_saved_answered_accuracy(r, b);
    }
    return (sc->interval = vg_strdup(method)) ? 0 : -1;
}

vg_status vg_saved_run_from_results(const vg_results *res, const char *dir, vg_saved_run **out,
                                    vg_error *err) {
    *out = NULL;
    vg_saved_run *r = vg_calloc(1, sizeof *r);
    saved_priv *p = vg_calloc(1, sizeof *p);
    if (!r || !p) {
        vg_free(r);
        vg_free(p);
        return vg_error_set(err, VG_ENOMEM, dir, 0, "out of memory");
    }
    r->priv_ = p;
    size_t len = strlen(dir);
    while (len > 1 && dir[len - 1] == '/') len--;
    r->dir = vg_strndup(dir, len);
    r->utc_time = vg_strdup("");
    r->command_line = vg_strdup("");
    r->seed = res->options.seed;
    r->bootstrap = res->options.bootstrap;
    r->level = res->options.ci;
    r->n_sets = res->n_sets;
    r->n_suites = res->n_suites;
    size_t blocks = r->n_sets * r->n_suites;
    r->labels = vg_calloc(r->n_sets ? r->n_sets : 1, sizeof *r->labels);
    p->original = vg_calloc(r->n_sets ? r->n_sets : 1, sizeof *p->original);
    r->suites = vg_calloc(r->n_suites ? r->n_suites : 1, sizeof *r->suites);
    p->words = vg_calloc(r->n_suites ? r->n_suites : 1, sizeof *p->words);
    r->cosine = vg_calloc(blocks ? blocks : 1, sizeof *r->cosine);
    r->correct = vg_calloc(blocks ? blocks * VG_METHOD_COUNT : 1, sizeof *r->correct);
    r->scores = vg_calloc(blocks ? blocks : 1, sizeof *r->scores);
    if (!r->dir || !r->utc_time || !r->command_line || !r->labels || !p->original ||
        !r->suites || !p->words || !r->cosine || !r->correct || !r->scores)
        goto oom;
    for (size_t i = 0; i < r->n_sets; i++)
        if (!(r->labels[i] = vg_strdup(res->labels[i])) ||
            !(p->original[i] = vg_strdup(res->labels[i])))
            goto oom;
    for (size_t k = 0; k < r->n_suites; k++) {
        const vg_suite *s = res->suites[k];
        vg_saved_suite *ss = &r->suites[k];
        ss->task = s->task;
        ss->n_items = s->n_items;
        ss->n_files = s->n_files;
        if (!(ss->id = vg_strdup(s->id)) ||
            !(ss->sha256 = vg_calloc(s->n_files ? s->n_files : 1, sizeof *ss->sha256)))
            goto oom;
        for (size_t f = 0; f < s->n_files; f++)
            if (!(ss->sha256[f] = vg_strdup(s->files[f].sha256))) goto oom;
        if (copy_words(s, ss, p, k) != 0) goto oom;
        if (s->task == VG_TASK_SIMILARITY) {
            if (!(ss->rating = vg_calloc(s->n_items ? s->n_items : 1, sizeof *ss->rating)))
                goto oom;
            for (size_t i = 0; i < s->n_items; i++) ss->rating[i] = s->pairs[i].rating;
        }
    }
    for (size_t set = 0; set < r->n_sets; set++)
        for (size_t k = 0; k < r->n_suites; k++)
            if (copy_items(res, r, set, k) != 0 || copy_score(res, r, set, k) != 0) goto oom;
    *out = r;
    return VG_OK;
oom:
    vg_saved_run_free(r);
    return vg_error_set(err, VG_ENOMEM, dir, 0, "out of memory");
}
