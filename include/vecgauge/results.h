/* results.h - evaluating vector sets on suites: the table of scores.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * vg_evaluate runs every vector set on every suite and returns a
 * vg_results: one vg_score_row per vector set x suite x subset x metric
 * (the rows of scores.csv, in their fixed order) plus the per-item records
 * each row was computed from (the rows of items.csv). This is the call a
 * training program makes to evaluate in-process.
 */
#ifndef VG_RESULTS_H
#define VG_RESULTS_H

#include <stddef.h>
#include <stdint.h>

#include "error.h"
#include "score.h"
#include "stats.h"
#include "suite.h"
#include "vectors.h"
#include "vg_config.h"

#ifdef __cplusplus
extern "C" {
#endif

/* Reported metrics, in the order rows are written. */
typedef enum vg_metric {
    VG_METRIC_SPEARMAN = 0,
    VG_METRIC_PEARSON = 1,
    VG_METRIC_KENDALL = 2,
    VG_METRIC_3COSADD = 3,
    VG_METRIC_3COSMUL = 4,
    VG_METRIC_PAIRDIR = 5,
    VG_METRIC_ONLY_B = 6,
    VG_METRIC_COUNT = 7
} vg_metric;

/* "spearman", "pearson", "kendall", "3cosadd", "3cosmul", "pairdir",
 * "only_b". Never NULL. */
VG_API const char *vg_metric_name(vg_metric m);

/* Parse a metric name (without the _all suffix). VG_EINVAL if unknown. */
VG_API vg_status vg_metric_parse(const char *name, vg_metric *out);

/* A confidence interval and the method that produced it ("bca",
 * "percentile", "fisher-z", "wilson"), at the level of the run
 * (vg_eval_options.ci). low and high are NaN when the method cannot give
 * an interval (e.g. BCa when every replicate lies on one side). */
typedef struct vg_interval {
    double low, high;
    const char *method;   /* static string */
    size_t replicates;    /* bootstrap replicates behind it (those with a
                             defined value); 0 for an analytic interval */
} vg_interval;

#define VG_MAX_INTERVALS 4

/* One row of scores.csv. A similarity suite gives, per vector set, the
 * rows spearman, spearman_all, pearson, pearson_all, kendall, kendall_all
 * in that order (always all six: the _all rows equal the others when
 * coverage is complete). Their intervals are ci[0] "bca" (the headline),
 * ci[1] "percentile" and ci[2] "fisher-z" when bootstrapping, else ci[0]
 * "fisher-z" alone. */
typedef struct vg_score_row {
    size_t set;            /* index into vg_results.sets */
    size_t suite;          /* index into vg_results.suites */
    const char *subset;    /* "" for the whole suite, else a section or group */
    vg_task task;
    vg_metric metric;
    int all_items;         /* 1: uncovered items counted (name gets "_all") */
    double value;          /* NaN when undefined (e.g. fewer than 2 pairs) */
    vg_interval ci[VG_MAX_INTERVALS]; /* ci[0] is the headline interval */
    size_t n_ci;
    size_t n_items;        /* items in the suite (or subset) */
    size_t n_used;         /* items scored */
} vg_score_row;

/* A vector set to evaluate: a label for the tables, the path it came from
 * (or "" for an in-process set) and the loaded vectors (borrowed). */
typedef struct vg_vector_set {
    const char *label;
    const char *path;
    const vg_vectors *vectors;
} vg_vector_set;

/* Per-item records of one vector set on one suite. Exactly one of sim and
 * ana is non-NULL, according to the suite's task. */
typedef struct vg_item_block {
    vg_similarity_scores *sim;
    vg_analogy_scores *ana;
} vg_item_block;

/* Evaluation options. Initialise with vg_eval_options_init. */
typedef struct vg_eval_options {
    vg_score_options score;   /* fold_case, analogy_vocab, ... , threads */
    uint64_t seed;            /* bootstrap seed (VG_DEFAULT_SEED) */
    size_t bootstrap;         /* replicates; 0: no bootstrap intervals */
    double ci;                /* confidence level (VG_DEFAULT_CI) */
} vg_eval_options;

VG_API void vg_eval_options_init(vg_eval_options *opt);

/* The table of scores. The suites and vector sets are borrowed from the
 * caller of vg_evaluate and must outlive the results (writers look up
 * predicted words in them); labels and paths are copied. */
typedef struct vg_results {
    size_t n_sets;
    char **labels;             /* n_sets labels */
    char **paths;              /* n_sets paths ("" for in-process sets) */
    vg_vectors_info *infos;    /* n_sets copies of the loader's info */
    const vg_vectors **vectors;/* n_sets, borrowed */
    size_t n_suites;
    const vg_suite **suites;   /* n_suites, borrowed */
    vg_score_row *rows;        /* in the fixed order of scores.csv */
    size_t n_rows;
    vg_item_block *blocks;     /* n_sets * n_suites, index set * n_suites + suite */
    vg_eval_options options;   /* the options in effect */
    vg_agreement *agreement;   /* n_suites: agreement of each suite's raters
                                  (value NaN, columns 0 when its file
                                  carries no individual ratings) */
    void *lookup_;             /* private: vg_results_find's index */
} vg_results;

/* Evaluate every set on every suite. On success *out owns new results
 * (free with vg_results_free). Returns VG_EINVAL for no sets or a NULL
 * suite, VG_ENOMEM on allocation failure; *out is NULL on failure. */
VG_API vg_status vg_evaluate(const vg_vector_set *sets, size_t n_sets,
                             const vg_suite *const *suites, size_t n_suites,
                             const vg_eval_options *opt, vg_results **out,
                             vg_error *err);

/* NULL does nothing. */
VG_API void vg_results_free(vg_results *r);

/* The block of set s on suite k. */
VG_API const vg_item_block *vg_results_block(const vg_results *r, size_t set,
                                             size_t suite);

/* The raters' agreement on suite k, or NULL if k is out of range. */
VG_API const vg_agreement *vg_results_agreement(const vg_results *r, size_t suite);

/* The first row matching (set, suite, subset, metric, all_items), or NULL.
 * One hash lookup (a run of 16,000 analogy sections asks once per section
 * and set). */
VG_API const vg_score_row *vg_results_find(const vg_results *r, size_t set,
                                           size_t suite, const char *subset,
                                           vg_metric metric, int all_items);

#ifdef __cplusplus
}
#endif

#endif /* VG_RESULTS_H */
