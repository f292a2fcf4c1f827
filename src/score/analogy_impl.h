/* analogy_impl.h - the blocked analogy scorer: its plan and its kernels.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Every method needs, for a candidate x, only cos(x, a), cos(x, b) and
 * cos(x, c) plus constants of the question, so the scorer never forms a
 * per-question product. It computes the cosines of the distinct question
 * words against one block of VG_ANA_BLOCK candidates with one sgemm
 * (S = Qhat . W_block^T, then each column scaled by 1/|x|), derives the
 * tables the methods share (1/(cos'+e) for words asked as a, 1/|x^ - c^|
 * for words asked as c), and then runs every question over the block,
 * keeping for each method the best value and the lowest row reaching it.
 * Memory is (distinct words + a words + c words) x VG_ANA_BLOCK floats per
 * thread, whatever the vocabulary size.
 *
 * The kernels below work on whole blocks (VG_ANA_BLOCK floats, 64-byte
 * aligned); the columns past the last candidate hold NaN, which no
 * comparison ever selects. Each kernel exists for AVX-512F, AVX2 (with FMA) and
 * plain C, all with the same IEEE operations in the same order (a fused
 * multiply-add only where it rounds as the separate operations do; no
 * reassociation), so every variant gives bit-identical values and the
 * choice of machine does not change an answer.
 */
#ifndef VG_ANALOGY_IMPL_H
#define VG_ANALOGY_IMPL_H

#include <stddef.h>
#include <stdint.h>

#include "../common/internal.h"
#include "vecgauge/score.h"

/* Candidates per block. 256 keeps one block's tables for a suite of about
 * 900 distinct words near the size of a 1 MiB L2 cache while sgemm still
 * runs at full speed (N = 256 is many times its register block). */
#ifndef VG_ANA_BLOCK
#define VG_ANA_BLOCK 256
#endif

/* The e of 3CosMul (Levy and Goldberg 2014). */
#define VG_ANA_EPS 0.001f

/* The three methods that combine a, b and c (only-b is kept apart). */
#define VG_ANA_COMBINED 3

/* What the scan of a block needs of a question (24 bytes, read once per
 * question and block). */
typedef struct vg_ana_qhot {
    uint32_t wa, wb, wc; /* the cosine rows of a, b, c in S */
    uint32_t sa, sc;     /* the 1/(cos'+e) row of a, the 1/|x^ - c^| row of c */
    float k;             /* c^.a^ - c^.b^ */
} vg_ana_qhot;

/* Block kernels, one set per instruction set. Rows are VG_ANA_BLOCK
 * floats. */
typedef struct vg_ana_kernels {
    const char *name; /* "avx512f", "avx2", "scalar" */
    /* s[j] *= inv[j] (cosines from dot products). */
    void (*scale)(float *s, const float *inv);
    /* out[j] = 1 / ((s[j] + 1) / 2 + e): the denominator of 3CosMul. */
    void (*mul_denominator)(const float *s, float *out);
    /* out[j] = 1 / sqrt(2 - 2 s[j]) = 1 / |x^ - c^|, NaN where 2 - 2 s[j]
     * is not positive (x points the way c does: no direction). */
    void (*inv_distance)(const float *s, float *out);
    /* The fast pass over one block for every question: writes to hits
     * (and counts) the questions i for which some combined score
     * (3CosAdd, 3CosMul, PairDirection up to a positive factor) in the
     * block exceeds best[3 i + method]. It is a filter: the scores of a
     * hit are then recomputed with block_scores to find the row. S holds
     * the cosine rows, Ia the 1/(cos'+e) rows, Rc the 1/|x^ - c^| rows.
     * NaN scores never count. */
    size_t (*scan)(const float *S, const float *Ia, const float *Rc, const vg_ana_qhot *q,
                   size_t n, const float *best, uint32_t *hits);
    /* The three scores of question q over the block, written to
     * out[m * VG_ANA_BLOCK + j]. */
    void (*block_scores)(const float *S, const float *Ia, const float *Rc,
                         const vg_ana_qhot *q, float *out);
    /* The first index of the maximum of x (NaN ignored) and, in *max, the
     * maximum; VG_NOT_FOUND (and -inf) when every value is NaN. */
    size_t (*first_max)(const float *x, float *max);
    /* Maximum of a row (NaN ignored; -inf if every value is NaN). */
    float (*row_max)(const float *x);
} vg_ana_kernels;

/* The rule that merges the threads' bests: (v, row) beats (bv, brow) when
 * v is higher, or equal with a lower row (ties to the lower row). */
static inline int vg_ana_beats(float v, size_t row, float bv, size_t brow) {
    return v > bv || (v == bv && row < brow);
}

/* The fastest kernels this CPU runs. */
VG_INTERNAL const vg_ana_kernels *vg_ana_kernels_best(void);

/* The kernels named name ("avx512f", "avx2", "scalar"), or NULL when the
 * name is unknown or this CPU cannot run them (tests compare variants). */
VG_INTERNAL const vg_ana_kernels *vg_ana_kernels_get(const char *name);

/* Flags of vg_analogy_score_with. */
enum {
    VG_ANA_PRODUCT_ONLY = 1, /* bench: run the sgemm blocks and nothing else */
    VG_ANA_NO_PRODUCT = 2    /* bench: everything but sgemm (the cosines stay
                                0, so the answers are meaningless) */
};

/* vg_score_analogy with the kernels chosen by the caller (NULL: the best)
 * and flags. With VG_ANA_PRODUCT_ONLY the answers are not computed (every
 * predicted row is VG_NOT_FOUND); with VG_ANA_NO_PRODUCT they are
 * meaningless. Both only time the phases apart. */
VG_INTERNAL vg_status vg_analogy_score_with(const vg_vectors *v, const vg_suite *suite,
                                            const vg_score_options *opt,
                                            const vg_ana_kernels *kern, unsigned flags,
                                            vg_analogy_scores **out, vg_error *err);

#endif /* VG_ANALOGY_IMPL_H */
