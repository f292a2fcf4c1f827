/* score.h - what one vector set does on one suite, item by item.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Scoring turns (vectors, suite) into per-item records: a cosine for each
 * pair, a predicted word per method for each analogy question, and why an
 * item was not scored. Summary statistics over these records (Spearman,
 * accuracy, intervals) live in stats.h and results.h.
 */
#ifndef VG_SCORE_H
#define VG_SCORE_H

#include <stddef.h>
#include <stdint.h>

#include "error.h"
#include "suite.h"
#include "vectors.h"
#include "vg_config.h"

#ifdef __cplusplus
extern "C" {
#endif

/* Why an item was or was not scored. Stable values: they appear in items.csv
 * through vg_item_status_name. */
typedef enum vg_item_status {
    VG_ITEM_SCORED = 0,       /* every word found, a score computed */
    VG_ITEM_MISSING_WORD = 1, /* a word is not in the vector set (or, for
                                 analogies, not among the candidates) */
    VG_ITEM_ZERO_VECTOR = 2   /* a word's vector has norm zero: cosine undefined */
} vg_item_status;

/* "scored", "missing_word", "zero_vector". Never NULL. */
VG_API const char *vg_item_status_name(vg_item_status st);

/* Options shared by the scorers. Initialise with vg_score_options_init. */
typedef struct vg_score_options {
    int fold_case;            /* retry missing words case-folded */
    size_t analogy_vocab;     /* candidates: the first N rows; 0 = every row */
    int keep_question_words;  /* analogy: a, b, c stay candidates */
    unsigned threads;         /* 0: one per online CPU */
} vg_score_options;

VG_API void vg_score_options_init(vg_score_options *opt);

/* Per-pair results of one vector set on one similarity suite. */
typedef struct vg_similarity_scores {
    size_t n_items;           /* pairs in the suite */
    size_t n_used;            /* pairs scored */
    size_t n_missing;         /* pairs skipped: a word not found */
    size_t n_zero;            /* pairs skipped: a zero vector */
    size_t n_fold_recovered;  /* with fold_case: pairs scored only thanks to
                                 folding; without: pairs folding would recover */
    double *cosine;           /* n_items; NaN where not scored */
    unsigned char *status;    /* n_items vg_item_status values */
    char **missing_words;     /* distinct missing words, in suite order */
    size_t n_missing_words;
} vg_similarity_scores;

/* Score every pair of suite (task must be VG_TASK_SIMILARITY). On success
 * *out owns new scores (free with vg_similarity_scores_free). Returns
 * VG_EINVAL for an analogy suite, VG_ENOMEM on allocation failure. */
VG_API vg_status vg_score_similarity(const vg_vectors *v, const vg_suite *suite,
                                     const vg_score_options *opt,
                                     vg_similarity_scores **out, vg_error *err);

/* NULL does nothing. */
VG_API void vg_similarity_scores_free(vg_similarity_scores *s);

/* Analogy methods, in the order they are reported. */
typedef enum vg_method {
    VG_METHOD_3COSADD = 0, /* Mikolov et al. 2013 */
    VG_METHOD_3COSMUL = 1, /* Levy and Goldberg 2014 */
    VG_METHOD_PAIRDIR = 2, /* PairDirection, Levy and Goldberg 2014 */
    VG_METHOD_ONLY_B = 3,  /* nearest neighbour of b (Linzen 2016) */
    VG_METHOD_COUNT = 4
} vg_method;

/* "3cosadd", "3cosmul", "pairdir", "only_b". Never NULL. */
VG_API const char *vg_method_name(vg_method m);

/* Per-question results of one vector set on one analogy suite. */
typedef struct vg_analogy_scores {
    size_t n_items;
    size_t n_used;                         /* questions with a, b, c and an
                                              answer among the candidates */
    size_t n_candidates;                   /* candidate rows used */
    unsigned char *status;                 /* n_items vg_item_status */
    size_t *predicted[VG_METHOD_COUNT];    /* row index, VG_NOT_FOUND if unscored */
    unsigned char *correct[VG_METHOD_COUNT]; /* 1 if predicted is an accepted answer */
    char **missing_words;                  /* distinct words not among the
                                              candidates, in suite order */
    size_t n_missing_words;
} vg_analogy_scores;

/* Answer every question a : b :: c : ? of suite (task must be
 * VG_TASK_ANALOGY) by every method, over the candidates: the first
 * opt->analogy_vocab rows of v (every row when 0 or when v has fewer),
 * less the rows whose vector is zero.
 *   3CosAdd  argmax cos(x,b) - cos(x,a) + cos(x,c)       (Mikolov et al. 2013)
 *   3CosMul  argmax cos'(x,b) cos'(x,c) / (cos'(x,a) + 0.001),
 *            cos' = (cos + 1) / 2                          (Levy and Goldberg 2014)
 *   PairDir  argmax cos(x - c, b - a), unit vectors       (Levy and Goldberg 2014)
 *   only-b   argmax cos(x, b)                             (Linzen 2016)
 * a, b and c are never an answer unless opt->keep_question_words (common
 * practice); even then c is not an answer of PairDir (x - c = 0 has no
 * direction). Ties go to the lower row. A question is scored only when a,
 * b, c and at least one accepted answer are candidates (status
 * VG_ITEM_MISSING_WORD otherwise, VG_ITEM_ZERO_VECTOR when one of them has
 * a zero vector); with opt->fold_case a word not found is looked up
 * case-folded. correct[m][i] is 1 when the answer is any accepted answer.
 * The answers do not depend on opt->threads.
 *
 * Work is one sgemm per block of candidates, memory a few MiB per thread
 * (proportional to the distinct question words, not to the vocabulary).
 * While it runs, OpenBLAS is set to one thread per call
 * (openblas_set_num_threads(1), a process-wide setting restored on
 * return): do not run other OpenBLAS work in parallel threads meanwhile.
 * Ownership and errors as for vg_score_similarity; VG_ELIMIT when v has
 * more than INT32_MAX rows. */
VG_API vg_status vg_score_analogy(const vg_vectors *v, const vg_suite *suite,
                                  const vg_score_options *opt,
                                  vg_analogy_scores **out, vg_error *err);

/* NULL does nothing. */
VG_API void vg_analogy_scores_free(vg_analogy_scores *s);

#ifdef __cplusplus
}
#endif

#endif /* VG_SCORE_H */
