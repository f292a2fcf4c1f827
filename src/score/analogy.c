/* analogy.c - answering analogy questions a : b :: c : ? by 3CosAdd,
 * 3CosMul, PairDirection and the only-b baseline, over sgemm blocks.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The plan (see analogy_impl.h): look every question's words up among the
 * candidates (the first N rows), gather the distinct question words into
 * one unit-length matrix Qhat, and then, block of candidates by block,
 * S = Qhat . W_block^T (sgemm), tables derived from S, and every question
 * over the block. Threads take blocks from a shared counter; each keeps
 * its own best (value, row) per question and method, and the per-thread
 * bests are merged at the end by value, ties to the lower row. Both the
 * value of a candidate (computed from its own column only) and the merge
 * are independent of which thread did what, so the answers are the same
 * whatever the thread count.
 *
 * OpenBLAS: every sgemm call runs on one OpenBLAS thread while this
 * scorer's own threads split the blocks. The pthread build of OpenBLAS
 * would otherwise start its own threads inside each call from each of
 * ours (oversubscribing the cores), and its idle threads spin between
 * calls, stealing time from the combine step that follows each product.
 * So the scorer sets openblas_set_num_threads(1) while it runs and
 * restores the previous count afterwards (a process-wide setting: see
 * the contract in score.h).
 */
#include <cblas.h>
#include <math.h>
#include <stdatomic.h>
#include <stdlib.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/threads.h"
#include "analogy_impl.h"
#include "missing.h"

#define NB VG_ANA_BLOCK
/* only-b keeps the best rows of b: a, b and c may take three of them. */
#define TOPB 4

const char *vg_method_name(vg_method m) {
    switch (m) {
    case VG_METHOD_3COSADD: return "3cosadd";
    case VG_METHOD_3COSMUL: return "3cosmul";
    case VG_METHOD_PAIRDIR: return "pairdir";
    case VG_METHOD_ONLY_B: return "only_b";
    case VG_METHOD_COUNT: break;
    }
    return "unknown";
}

/* A question all of whose words are candidates (what the scan reads of it
 * is apart, in vg_ana_qhot). */
typedef struct question {
    size_t item;             /* index in the suite */
    size_t ra, rb, rc;       /* candidate rows of a, b, c */
    uint32_t sb;             /* b's slot among the b words (only-b) */
    int pairdir_ok;          /* b^ - a^ is not the zero vector */
} question;

/* One thread's buffers and results. */
typedef struct worker {
    float *S;                /* n_words x NB cosines */
    float *Ia;               /* n_a x NB: 1 / (cos' + e) of the a words */
    float *Rc;               /* n_c x NB: 1 / |x^ - c^| of the c words */
    float *tmp;              /* 3 x NB scores of one question */
    float *inv;              /* NB: 1 / |x| of the block (NaN past the end) */
    uint32_t *hits;          /* questions the scan of a block flagged */
    float *best_v;           /* 3 per question */
    size_t *best_i;
    float *top_v;            /* TOPB per b word */
    size_t *top_i;
} worker;

typedef struct plan {
    const float *data;
    size_t ld, dims, n_cand, n_blocks;
    float *inv_norm;         /* n_cand; NaN for a zero row */
    size_t n_words;
    size_t *word_row;        /* n_words candidate rows, ascending */
    float *qhat;             /* n_words x dims, unit rows */
    size_t n_a, n_b, n_c;
    uint32_t *a_word, *b_word, *c_word; /* slot -> row of S */
    size_t n_q;
    question *q;
    vg_ana_qhot *hot;        /* n_q, what the scan reads */
    int keep;
    unsigned flags;
    const vg_ana_kernels *kern;
    unsigned n_threads;
    worker *w;
    atomic_size_t next_block;
} plan;

/* ---- looking words up ------------------------------------------------ */

enum { WORD_OK = 0, WORD_MISSING = 1, WORD_ZERO = 2 };

/* The candidate row of word w: exact first, then (with fold) case-folded.
 * A row past the candidates counts as missing. */
static int find_candidate(const vg_vectors *v, const char *w, size_t n_cand, int fold,
                          size_t *row) {
    size_t len = strlen(w);
    size_t r = vg_vectors_find(v, w, len);
    if ((r == VG_NOT_FOUND || r >= n_cand) && fold) {
        size_t f = vg_vectors_find_folded(v, w, len);
        if (f != VG_NOT_FOUND && f < n_cand) r = f;
    }
    *row = r;
    if (r == VG_NOT_FOUND || r >= n_cand) return WORD_MISSING;
    return vg_vectors_norms(v)[r] > 0 ? WORD_OK : WORD_ZERO;
}

static int cmp_size(const void *x, const void *y) {
    size_t a = *(const size_t *)x, b = *(const size_t *)y;
    return (a > b) - (a < b);
}

/* Sort and deduplicate a[0..n); returns the new length. */
static size_t sort_unique(size_t *a, size_t n) {
    if (n == 0) return 0;
    qsort(a, n, sizeof *a, cmp_size);
    size_t m = 1;
    for (size_t i = 1; i < n; i++)
        if (a[i] != a[m - 1]) a[m++] = a[i];
    return m;
}

static uint32_t index_of(const size_t *sorted, size_t n, size_t key) {
    const size_t *p = bsearch(&key, sorted, n, sizeof *sorted, cmp_size);
    VG_ASSERT(p != NULL);
    return (uint32_t)(p - sorted);
}

/* ---- the per-block work ---------------------------------------------- */

/* Insert (x, row) into a list sorted by value descending, rows ascending
 * among equal values (rows arrive in increasing order). */
static void top_insert(float *tv, size_t *ti, float x, size_t row) {
    int pos = TOPB - 1;
    while (pos > 0 && x > tv[pos - 1]) {
        tv[pos] = tv[pos - 1];
        ti[pos] = ti[pos - 1];
        pos--;
    }
    tv[pos] = x;
    ti[pos] = row;
}

static int in_block(size_t r, size_t j0, size_t width) { return r - j0 < width; }

static void run_block(plan *p, worker *w, size_t blk) {
    const vg_ana_kernels *K = p->kern;
    size_t j0 = blk * NB, width = VG_MIN((size_t)NB, p->n_cand - j0);
    /* S[u][j] = qhat_u . x_(j0+j): row-major, M = words, N = candidates,
     * K = dims; W_block is read in place (ld) and transposed by sgemm. */
    if (!(p->flags & VG_ANA_NO_PRODUCT))
        cblas_sgemm(CblasRowMajor, CblasNoTrans, CblasTrans, (int)p->n_words, (int)width,
                    (int)p->dims, 1.0f, p->qhat, (int)p->dims, p->data + j0 * p->ld,
                    (int)p->ld, 0.0f, w->S, NB);
    if (p->flags & VG_ANA_PRODUCT_ONLY) return;

    memcpy(w->inv, p->inv_norm + j0, width * sizeof *w->inv);
    for (size_t j = width; j < NB; j++) w->inv[j] = NAN;
    for (size_t u = 0; u < p->n_words; u++) K->scale(w->S + u * NB, w->inv);
    for (size_t s = 0; s < p->n_a; s++)
        K->mul_denominator(w->S + (size_t)p->a_word[s] * NB, w->Ia + s * NB);
    for (size_t s = 0; s < p->n_c; s++)
        K->inv_distance(w->S + (size_t)p->c_word[s] * NB, w->Rc + s * NB);

    /* The fast pass flags the questions this block may improve; only
     * those get their scores written out and searched for the row. */
    size_t n_hits = K->scan(w->S, w->Ia, w->Rc, p->hot, p->n_q, w->best_v, w->hits);
    for (size_t h = 0; h < n_hits; h++) {
        size_t i = w->hits[h];
        const question *q = &p->q[i];
        float *bv = w->best_v + VG_ANA_COMBINED * i;
        size_t *bi = w->best_i + VG_ANA_COMBINED * i;
        K->block_scores(w->S, w->Ia, w->Rc, &p->hot[i], w->tmp);
        /* Excluded candidates: a, b, c for every method by default; with
         * the question words kept, still c for PairDirection, where x - c
         * is the zero vector. */
        const size_t rows[3] = {q->ra, q->rb, q->rc};
        for (int e = 0; e < 3; e++) {
            if (!in_block(rows[e], j0, width)) continue;
            for (int m = 0; m < VG_ANA_COMBINED; m++)
                if (!p->keep || (e == 2 && m == 2)) w->tmp[m * NB + (rows[e] - j0)] = NAN;
        }
        for (int m = 0; m < VG_ANA_COMBINED; m++) {
            float best;
            size_t at = K->first_max(w->tmp + m * NB, &best);
            if (at != VG_NOT_FOUND && best > bv[m]) {
                bv[m] = best;
                bi[m] = j0 + at;
            }
        }
    }

    for (size_t s = 0; s < p->n_b; s++) {
        const float *row = w->S + (size_t)p->b_word[s] * NB;
        float *tv = w->top_v + s * TOPB;
        size_t *ti = w->top_i + s * TOPB;
        if (!(K->row_max(row) > tv[TOPB - 1])) continue;
        for (size_t j = 0; j < width; j++)
            if (row[j] > tv[TOPB - 1]) top_insert(tv, ti, row[j], j0 + j);
    }
}

static void run_thread(void *ctx, unsigned t, unsigned n) {
    VG_UNUSED(n);
    plan *p = ctx;
    worker *w = &p->w[t];
    size_t blk;
    /* Blocks come in increasing order to each thread, so strict '>'
     * within a thread keeps the lowest row among equal values. */
    while ((blk = atomic_fetch_add(&p->next_block, 1)) < p->n_blocks) run_block(p, w, blk);
}

/* ---- setting up and tearing down ------------------------------------- */

static void plan_free(plan *p) {
    if (p->w) {
        for (unsigned t = 0; t < p->n_threads; t++) {
            worker *w = &p->w[t];
            vg_free(w->S);
            vg_free(w->Ia);
            vg_free(w->Rc);
            vg_free(w->tmp);
            vg_free(w->inv);
            vg_free(w->hits);
            vg_free(w->best_v);
            vg_free(w->best_i);
            vg_free(w->top_v);
            vg_free(w->top_i);
        }
    }
    vg_free(p->w);
    vg_free(p->inv_norm);
    vg_free(p->word_row);
    vg_free(p->qhat);
    vg_free(p->a_word);
    vg_free(p->b_word);
    vg_free(p->c_word);
    vg_free(p->q);
    vg_free(p->hot);
}

/* A zeroed, 64-byte aligned array of n floats (at least one). */
static float *alloc_floats(size_t n) {
    size_t bytes;
    if (vg_mul_overflow(n ? n : 1, sizeof(float), &bytes)) return NULL;
    float *x = vg_aligned_alloc(64, bytes);
    if (x) memset(x, 0, bytes);
    return x;
}

static int workers_alloc(plan *p) {
    p->w = vg_calloc(p->n_threads, sizeof *p->w);
    if (!p->w) return -1;
    for (unsigned t = 0; t < p->n_threads; t++) {
        worker *w = &p->w[t];
        size_t nS, nA, nC;
        if (vg_mul_overflow(p->n_words, NB, &nS) || vg_mul_overflow(p->n_a, NB, &nA) ||
            vg_mul_overflow(p->n_c, NB, &nC))
            return -1;
        w->S = alloc_floats(nS);
        w->Ia = alloc_floats(nA);
        w->Rc = alloc_floats(nC);
        w->tmp = alloc_floats(VG_ANA_COMBINED * NB);
        w->inv = alloc_floats(NB);
        w->best_v = vg_calloc(p->n_q ? VG_ANA_COMBINED * p->n_q : 1, sizeof *w->best_v);
        w->best_i = vg_calloc(p->n_q ? VG_ANA_COMBINED * p->n_q : 1, sizeof *w->best_i);
        w->top_v = vg_calloc(p->n_b ? TOPB * p->n_b : 1, sizeof *w->top_v);
        w->top_i = vg_calloc(p->n_b ? TOPB * p->n_b : 1, sizeof *w->top_i);
        w->hits = vg_calloc(p->n_q ? p->n_q : 1, sizeof *w->hits);
        if (!w->S || !w->Ia || !w->Rc || !w->tmp || !w->inv || !w->best_v || !w->best_i ||
            !w->top_v || !w->top_i || !w->hits)
            return -1;
        for (size_t i = 0; i < VG_ANA_COMBINED * p->n_q; i++) {
            w->best_v[i] = -INFINITY;
            w->best_i[i] = VG_NOT_FOUND;
        }
        /* PairDirection is undefined when b^ = a^: a best nothing exceeds. */
        for (size_t i = 0; i < p->n_q; i++)
            if (!p->q[i].pairdir_ok) w->best_v[VG_ANA_COMBINED * i + 2] = INFINITY;
        for (size_t i = 0; i < TOPB * p->n_b; i++) {
            w->top_v[i] = -INFINITY;
            w->top_i[i] = VG_NOT_FOUND;
        }
    }
    return 0;
}

/* The distinct words of the scored questions, their unit vectors, the
 * a/b/c slots and the per-question constants. -1 when out of memory. */
static int plan_words(plan *p, const vg_vectors *v) {
    size_t n3 = 3 * p->n_q;
    size_t *all = vg_calloc(n3 ? n3 : 1, sizeof *all);
    size_t *ra = vg_calloc(p->n_q ? p->n_q : 1, sizeof *ra);
    size_t *rb = vg_calloc(p->n_q ? p->n_q : 1, sizeof *rb);
    size_t *rc = vg_calloc(p->n_q ? p->n_q : 1, sizeof *rc);
    int rcode = -1;
    if (!all || !ra || !rb || !rc) goto done;
    for (size_t i = 0; i < p->n_q; i++) {
        all[3 * i] = ra[i] = p->q[i].ra;
        all[3 * i + 1] = rb[i] = p->q[i].rb;
        all[3 * i + 2] = rc[i] = p->q[i].rc;
    }
    p->n_words = sort_unique(all, n3);
    p->n_a = sort_unique(ra, p->n_q);
    p->n_b = sort_unique(rb, p->n_q);
    p->n_c = sort_unique(rc, p->n_q);
    p->word_row = vg_calloc(p->n_words ? p->n_words : 1, sizeof *p->word_row);
    p->a_word = vg_calloc(p->n_a ? p->n_a : 1, sizeof *p->a_word);
    p->b_word = vg_calloc(p->n_b ? p->n_b : 1, sizeof *p->b_word);
    p->c_word = vg_calloc(p->n_c ? p->n_c : 1, sizeof *p->c_word);
    size_t nq;
    if (vg_mul_overflow(p->n_words, p->dims, &nq)) goto done;
    p->qhat = alloc_floats(nq);
    p->hot = vg_calloc(p->n_q ? p->n_q : 1, sizeof *p->hot);
    if (!p->word_row || !p->a_word || !p->b_word || !p->c_word || !p->qhat || !p->hot) goto done;
    memcpy(p->word_row, all, p->n_words * sizeof *all);
    for (size_t s = 0; s < p->n_a; s++) p->a_word[s] = index_of(all, p->n_words, ra[s]);
    for (size_t s = 0; s < p->n_b; s++) p->b_word[s] = index_of(all, p->n_words, rb[s]);
    for (size_t s = 0; s < p->n_c; s++) p->c_word[s] = index_of(all, p->n_words, rc[s]);

    /* Unit vectors, x / |x| with the norm the loader computed in double:
     * the same normalisation a direct implementation applies. */
    const float *norms = vg_vectors_norms(v);
    for (size_t u = 0; u < p->n_words; u++) {
        const float *x = vg_vectors_row(v, p->word_row[u]);
        double n = norms[p->word_row[u]];
        float *y = p->qhat + u * p->dims;
        for (size_t d = 0; d < p->dims; d++) y[d] = (float)((double)x[d] / n);
    }
    for (size_t i = 0; i < p->n_q; i++) {
        question *q = &p->q[i];
        vg_ana_qhot *h = &p->hot[i];
        h->wa = index_of(all, p->n_words, q->ra);
        h->wb = index_of(all, p->n_words, q->rb);
        h->wc = index_of(all, p->n_words, q->rc);
        h->sa = index_of(ra, p->n_a, q->ra);
        h->sc = index_of(rc, p->n_c, q->rc);
        q->sb = index_of(rb, p->n_b, q->rb);
        const float *a = p->qhat + (size_t)h->wa * p->dims, *b = p->qhat + (size_t)h->wb * p->dims;
        const float *c = p->qhat + (size_t)h->wc * p->dims;
        double ca = 0, cb = 0, ba = 0;
        for (size_t d = 0; d < p->dims; d++) {
            ca += (double)c[d] * a[d];
            cb += (double)c[d] * b[d];
            double e = (double)b[d] - a[d];
            ba += e * e;
        }
        h->k = (float)(ca - cb);
        q->pairdir_ok = ba > 0;
    }
    rcode = 0;
done:
    vg_free(all);
    vg_free(ra);
    vg_free(rb);
    vg_free(rc);
    return rcode;
}

/* ---- the public entry points ----------------------------------------- */

static vg_analogy_scores *scores_new(size_t n) {
    vg_analogy_scores *s = vg_calloc(1, sizeof *s);
    if (!s) return NULL;
    s->n_items = n;
    s->status = vg_calloc(n ? n : 1, 1);
    int ok = s->status != NULL;
    for (int m = 0; m < VG_METHOD_COUNT; m++) {
        s->predicted[m] = vg_calloc(n ? n : 1, sizeof *s->predicted[m]);
        s->correct[m] = vg_calloc(n ? n : 1, 1);
        ok = ok && s->predicted[m] && s->correct[m];
    }
    if (!ok) {
        vg_analogy_scores_free(s);
        return NULL;
    }
    for (int m = 0; m < VG_METHOD_COUNT; m++)
        for (size_t i = 0; i < n; i++) s->predicted[m][i] = VG_NOT_FOUND;
    return s;
}

/* Is row one of the accepted answers of question qq (among candidates)? */
static int is_answer(const vg_vectors *v, const vg_question *qq, size_t n_cand, int fold,
                     size_t row) {
    if (row == VG_NOT_FOUND) return 0;
    for (size_t a = 0; a < qq->n_answers; a++) {
        size_t r;
        if (find_candidate(v, qq->answers[a], n_cand, fold, &r) == WORD_OK && r == row) return 1;
    }
    return 0;
}

/* Merge the threads' results into the per-question answers. */
static void merge(const plan *p, const vg_vectors *v, const vg_suite *suite, int fold,
                  vg_analogy_scores *s) {
    for (size_t i = 0; i < p->n_q; i++) {
        const question *q = &p->q[i];
        for (int m = 0; m < VG_ANA_COMBINED; m++) {
            float bv = -INFINITY;
            size_t bi = VG_NOT_FOUND;
            for (unsigned t = 0; t < p->n_threads; t++) {
                float x = p->w[t].best_v[VG_ANA_COMBINED * i + m];
                size_t r = p->w[t].best_i[VG_ANA_COMBINED * i + m];
                if (r == VG_NOT_FOUND) continue;
                if (vg_ana_beats(x, r, bv, bi)) {
                    bv = x;
                    bi = r;
                }
            }
            s->predicted[m][q->item] = bi;
        }
        /* only-b: the best row of b over every thread's list, skipping the
         * question words unless they are kept. */
        size_t pick = VG_NOT_FOUND;
        float pv = -INFINITY;
        for (unsigned t = 0; t < p->n_threads; t++) {
            const float *tv = p->w[t].top_v + (size_t)q->sb * TOPB;
            const size_t *ti = p->w[t].top_i + (size_t)q->sb * TOPB;
            for (int e = 0; e < TOPB; e++) {
                size_t r = ti[e];
                if (r == VG_NOT_FOUND) break;
                if (!p->keep && (r == q->ra || r == q->rb || r == q->rc)) continue;
                if (vg_ana_beats(tv[e], r, pv, pick)) {
                    pv = tv[e];
                    pick = r;
                }
                break; /* the list is sorted: the first eligible entry is its best */
            }
        }
        s->predicted[VG_METHOD_ONLY_B][q->item] = pick;
        const vg_question *qq = &suite->questions[q->item];
        for (int m = 0; m < VG_METHOD_COUNT; m++)
            s->correct[m][q->item] =
                (unsigned char)is_answer(v, qq, p->n_cand, fold, s->predicted[m][q->item]);
    }
}

vg_status vg_analogy_score_with(const vg_vectors *v, const vg_suite *suite,
                                const vg_score_options *opt, const vg_ana_kernels *kern,
                                unsigned flags, vg_analogy_scores **out, vg_error *err) {
    *out = NULL;
    if (suite->task != VG_TASK_ANALOGY)
        return vg_error_set(err, VG_EINVAL, NULL, 0, "suite %s is not an analogy suite",
                            suite->id);
    vg_score_options defaults;
    if (!opt) {
        vg_score_options_init(&defaults);
        opt = &defaults;
    }
    size_t rows = vg_vectors_rows(v);
    if (rows > (size_t)INT32_MAX || vg_vectors_ld(v) > (size_t)INT32_MAX)
        return vg_error_set(err, VG_ELIMIT, NULL, 0,
                            "%zu rows: more than the %d candidates sgemm can index", rows,
                            INT32_MAX);
    /* Questions and their words are indexed with 32 bits in the scan. */
    if (suite->n_items > (size_t)INT32_MAX)
        return vg_error_set(err, VG_ELIMIT, NULL, 0, "suite %s: more than %d questions",
                            suite->id, INT32_MAX);
    plan p;
    memset(&p, 0, sizeof p);
    vg_missing_list missing = {0};
    p.data = vg_vectors_data(v);
    p.ld = vg_vectors_ld(v);
    p.dims = vg_vectors_dims(v);
    p.n_cand = opt->analogy_vocab && opt->analogy_vocab < rows ? opt->analogy_vocab : rows;
    p.keep = opt->keep_question_words;
    p.flags = flags;
    p.kern = kern ? kern : vg_ana_kernels_best();
    atomic_init(&p.next_block, 0);

    size_t n = suite->n_items;
    vg_analogy_scores *s = scores_new(n);
    p.q = vg_calloc(n ? n : 1, sizeof *p.q);
    p.inv_norm = alloc_floats(p.n_cand);
    if (!s || !p.q || !p.inv_norm) goto oom;
    s->n_candidates = p.n_cand;

    /* Which questions count: a, b, c and at least one accepted answer
     * among the candidates, none of a, b, c a zero vector. */
    for (size_t i = 0; i < n; i++) {
        const vg_question *qq = &suite->questions[i];
        size_t ra, rb, rc, rd;
        int fa = find_candidate(v, qq->a, p.n_cand, opt->fold_case, &ra);
        int fb = find_candidate(v, qq->b, p.n_cand, opt->fold_case, &rb);
        int fc = find_candidate(v, qq->c, p.n_cand, opt->fold_case, &rc);
        /* Any accepted answer will do: the set is found when one of them
         * is a candidate, a zero vector when the best one found is. */
        int fd = WORD_MISSING;
        for (size_t a = 0; a < qq->n_answers && fd != WORD_OK; a++) {
            int f = find_candidate(v, qq->answers[a], p.n_cand, opt->fold_case, &rd);
            if (f != WORD_MISSING) fd = f;
        }
        if (fa == WORD_MISSING || fb == WORD_MISSING || fc == WORD_MISSING || fd == WORD_MISSING) {
            s->status[i] = VG_ITEM_MISSING_WORD;
            /* The words at fault, for missing.csv: a, b, c, and the
             * accepted answers when none of them is a candidate. */
            int bad = (fa == WORD_MISSING && vg_missing_add(&missing, qq->a) != 0) ||
                      (fb == WORD_MISSING && vg_missing_add(&missing, qq->b) != 0) ||
                      (fc == WORD_MISSING && vg_missing_add(&missing, qq->c) != 0);
            for (size_t a = 0; !bad && fd == WORD_MISSING && a < qq->n_answers; a++)
                bad = vg_missing_add(&missing, qq->answers[a]) != 0;
            if (bad) goto oom;
            continue;
        }
        if (fa == WORD_ZERO || fb == WORD_ZERO || fc == WORD_ZERO || fd == WORD_ZERO) {
            s->status[i] = VG_ITEM_ZERO_VECTOR;
            continue;
        }
        s->status[i] = VG_ITEM_SCORED;
        s->n_used++;
        question *q = &p.q[p.n_q++];
        q->item = i;
        q->ra = ra;
        q->rb = rb;
        q->rc = rc;
    }
    if (p.n_q == 0) goto finish;

    const float *norms = vg_vectors_norms(v);
    for (size_t j = 0; j < p.n_cand; j++)
        p.inv_norm[j] = norms[j] > 0 ? (float)(1.0 / norms[j]) : NAN;
    if (plan_words(&p, v) != 0) goto oom;
    p.n_blocks = (p.n_cand + NB - 1) / NB;
    p.n_threads = vg_threads_resolve(opt->threads);
    if (p.n_threads > p.n_blocks) p.n_threads = (unsigned)p.n_blocks;
    if (workers_alloc(&p) != 0) goto oom;

    /* One OpenBLAS thread per call, for the reasons at the top. */
    int blas_threads = openblas_get_num_threads();
    int adjust = openblas_get_parallel() != 0 && blas_threads != 1;
    if (adjust) openblas_set_num_threads(1);
    vg_parallel(p.n_threads, run_thread, &p);
    if (adjust) openblas_set_num_threads(blas_threads);

    if (!(flags & VG_ANA_PRODUCT_ONLY)) merge(&p, v, suite, opt->fold_case, s);
finish:
    plan_free(&p);
    vg_missing_take(&missing, &s->missing_words, &s->n_missing_words);
    *out = s;
    return VG_OK;
oom:
    vg_missing_free(&missing);
    plan_free(&p);
    vg_analogy_scores_free(s);
    return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory scoring suite %s", suite->id);
}

vg_status vg_score_analogy(const vg_vectors *v, const vg_suite *suite,
                           const vg_score_options *opt, vg_analogy_scores **out, vg_error *err) {
    return vg_analogy_score_with(v, suite, opt, NULL, 0, out, err);
}

void vg_analogy_scores_free(vg_analogy_scores *s) {
    if (!s) return;
    vg_free(s->status);
    for (int m = 0; m < VG_METHOD_COUNT; m++) {
        vg_free(s->predicted[m]);
        vg_free(s->correct[m]);
    }
    vg_missing_words_free(s->missing_words, s->n_missing_words);
    vg_free(s);
}
