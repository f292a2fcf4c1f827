/* compare.h - is vector set A really better than B, and did this training
 * job make things worse? Comparisons item by item.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The engine (vg_compare) takes a plain table of paired items: for every
 * suite, what each vector set did on each item (a cosine, or right/wrong
 * per analogy method). It comes from an in-process vg_results
 * (vg_paired_items_from_results) or from saved run directories
 * (vg_saved_run_load + vg_saved_runs_pair), so a training program can
 * compare in-process exactly as `vecgauge compare` does on disk. Out comes
 * one table of comparisons (one row per suite, metric and pair of sets)
 * with intervals, p-values and Holm's adjustment, the scores of every set
 * on the items compared, and a ranking of the sets.
 */
#ifndef VG_COMPARE_H
#define VG_COMPARE_H

#include <stdio.h>
#include <stddef.h>
#include <stdint.h>

#include "error.h"
#include "report.h"
#include "results.h"
#include "score.h"
#include "suite.h"
#include "vg_config.h"

#ifdef __cplusplus
extern "C" {
#endif

/* ---- the input: paired items ------------------------------------------- */

/* Per-item records of every compared set on one suite. Item i of every
 * set is the same item (same words, same rating). */
typedef struct vg_paired_suite {
    const char *id;                 /* suite id: also names the resampling
                                       stream, so replicate r draws the same
                                       items as the per-set intervals */
    vg_task task;
    size_t n_items;
    const double *rating;           /* similarity: n_items human ratings */
    const double *const *cosine;    /* similarity: n_sets arrays of n_items
                                       cosines, NaN where the set did not
                                       score the item */
    const signed char *const *correct; /* analogy: [set * VG_METHOD_COUNT + m]
                                       arrays of n_items values, 1 right,
                                       0 wrong, -1 not answered; an entry is
                                       NULL when method m was not run */
    /* analogy: the word pairs of each question, for the pair bootstrap
     * (vg_suite_question_pairs); row_pair and col_pair NULL: every
     * question has pairs of its own (the bootstrap over questions). */
    const uint32_t *stratum;        /* n_items sections numbered from 0, or NULL: one */
    size_t n_strata;
    const uint32_t *row_pair, *col_pair; /* n_items each */
} vg_paired_suite;

typedef struct vg_paired_items {
    size_t n_sets;
    const char *const *labels;      /* n_sets distinct labels */
    size_t n_suites;
    const vg_paired_suite *suites;  /* n_suites */
    void *priv_;                    /* storage when built by vecgauge; not API */
} vg_paired_items;

/* The paired items of every set of r on every suite (borrowing r's
 * labels and suite ids, which must outlive the result): a pair's cosine
 * where its status is "scored", else NaN; a question's correctness per
 * method where a prediction exists, else -1 (exactly what items.csv
 * holds). *out is freed with vg_paired_items_free. VG_ENOMEM on failure. */
VG_API vg_status vg_paired_items_from_results(const vg_results *r, vg_paired_items **out,
                                              vg_error *err);

/* NULL does nothing. */
VG_API void vg_paired_items_free(vg_paired_items *p);

/* ---- options ----------------------------------------------------------- */

/* Which items a comparison uses. */
typedef enum vg_compare_items {
    VG_COMPARE_COMMON = 0,  /* only items every compared set covers (the default) */
    VG_COMPARE_AS_IS = 1    /* each set on the items it covers: its own score */
} vg_compare_items;

typedef struct vg_compare_options {
    size_t replicates;      /* B (VG_DEFAULT_BOOTSTRAP); 0: no bootstrap */
    uint64_t seed;          /* VG_DEFAULT_SEED */
    double level;           /* confidence level of the intervals (VG_DEFAULT_CI) */
    double alpha;           /* significance level after Holm's adjustment (0.05) */
    vg_compare_items items; /* VG_COMPARE_COMMON */
    unsigned methods;       /* analogy methods compared, bit 1 << vg_method;
                               0 means 3CosAdd alone */
    const size_t *pairs;    /* n_pairs (a, b) set indices, pairs[2k], pairs[2k+1]:
                               the pairs to compare; NULL: every a < b */
    size_t n_pairs;
    const unsigned char *pair_suites; /* NULL, or n_pairs * n_suites flags: pair p
                               is compared on suite k only where
                               pair_suites[p * n_suites + k] (the common
                               items of a suite are then those of the sets
                               compared on it) */
    unsigned threads;       /* 0: one per online CPU; results never depend on it */
} vg_compare_options;

VG_API void vg_compare_options_init(vg_compare_options *opt);

/* ---- the output: one table of comparisons ------------------------------ */

/* One suite, metric and pair of sets. Differences are a minus b. */
typedef struct vg_comparison {
    size_t suite;            /* index into the input's suites */
    size_t set_a, set_b;     /* indices into the input's sets */
    vg_task task;
    const char *metric;      /* "spearman", or an analogy method's name */
    size_t n_items;          /* items in the suite */
    size_t n_compared;       /* common: items every set covers; as-is:
                                items a or b covers */
    size_t n_dropped;        /* common: items left out because some compared
                                set did not cover them; as-is: 0 */
    size_t n_a, n_b;         /* items behind score_a and score_b */
    double score_a, score_b; /* rho or accuracy (0..1) on those items */
    double diff;             /* score_a - score_b */
    double diff_low, diff_high; /* interval for diff at options.level */
    const char *interval;    /* "bca", "percentile", "pair-bootstrap", or "" */
    size_t replicates;       /* bootstrap replicates with a defined difference */
    double p_bootstrap;      /* two-sided bootstrap p of diff = 0 (NaN if B = 0) */
    double r_ab;             /* similarity: Spearman between a's and b's cosines */
    double steiger_z, p_steiger; /* similarity: Steiger's Z1* and its p */
    size_t only_a, only_b;   /* analogy: questions only a / only b answered right */
    double p_mcnemar;        /* analogy: McNemar's exact p */
    const char *test;        /* the test behind p_value: "bootstrap",
                                "steiger-z1-bw" (Z1* with Spearman's
                                variance; "steiger-z1" in files written
                                before it), "pair-bootstrap", "mcnemar-exact"
                                or "" (none) */
    double p_value;          /* that test's p (NaN when none is possible) */
    double p_holm;           /* Holm-adjusted over every row's p_value */
    int significant;         /* p_holm <= alpha */
} vg_comparison;

/* The score of one set on the items of its comparisons, with its
 * bootstrap interval (percentile when BCa is undefined). */
typedef struct vg_compared_score {
    size_t suite, set;
    const char *metric;
    double value, low, high; /* NaN when undefined or B = 0 */
    const char *interval;    /* "bca", "percentile", "pair-bootstrap" or "" */
    size_t n;                /* items behind value */
} vg_compared_score;

/* A set's standing across suites: ranks on the headline metric of each
 * suite (Spearman; the first compared analogy method), 1 = best, ties
 * sharing the average rank. */
typedef struct vg_set_rank {
    size_t set;
    double mean_rank;        /* NaN when no suite ranks the set */
    size_t suites;           /* suites where it was ranked */
    size_t wins, losses;     /* significant differences (after Holm) for / against */
} vg_set_rank;

typedef struct vg_comparisons {
    vg_compare_options options; /* in effect (pairs and pair_suites set to NULL) */
    size_t n_sets;
    char **labels;
    size_t n_suites;
    char **suite_ids;
    vg_task *tasks;
    size_t *n_items;            /* per suite */
    size_t *covered;            /* [suite * n_sets + set]: items the set covers
                                   (headline metric), whatever the mode */
    vg_comparison *rows;        /* suite-major, then metric, then pair order */
    size_t n_rows;
    vg_compared_score *scores;  /* suite-major, then metric, then set */
    size_t n_scores;
    vg_set_rank *ranking;       /* n_sets, best first */
    size_t n_tests;             /* p-values in Holm's family */
} vg_comparisons;

/* Compare the sets of in on every suite.
 *
 * Items: with VG_COMPARE_COMMON every row of a suite uses the same items,
 * those every set covers (a pair with a cosine, a question answered by
 * the metric's method); with VG_COMPARE_AS_IS each set keeps the items it
 * covers, so score_a and score_b are the sets' own scores.
 *
 * Similarity: the paired bootstrap resamples the items jointly: replicate
 * r draws the items of vg_stats_corr_bootstrap's replicate r on stream
 * (seed, suite id), rho of each set is taken on the drawn items it is
 * scored on, and the difference is taken replicate by replicate. Its
 * interval is BCa (Efron 1987) from these differences with the jackknife
 * differences behind the acceleration (percentile when BCa is
 * undefined); its two-sided p-value is Hall and Wilson's (1991) test on
 * the bootstrap distribution shifted to the null,
 *   p = (1 + #{r : |d*_r - d| >= |d|}) / (B' + 1),
 * B' the replicates with a defined difference (the +1 form of Davison and
 * Hinkley 1997, section 4.4). Steiger's (1980) Z1* with the variance of
 * Fisher's z of Spearman's rho (vg_paired_steiger_z_spearman) tests the
 * same difference analytically from rho_a, rho_b and r_ab = Spearman's
 * rho between the two sets' cosines; in as-is mode it uses the items
 * both sets cover.
 * Analogy: accuracy per method (3CosAdd alone by default). The test is
 * the paired pair bootstrap: replicate r weighs every question as
 * vg_pairboot_sums does on stream (seed, suite id) (Owen's 2007
 * pigeonhole bootstrap over each section's word pairs; the draws of the
 * per-set intervals of a run), the same weights for both sets; the
 * difference of the weighted accuracies is taken replicate by replicate
 * (as (right_a - right_b) / used when both sets use the same questions).
 * Its interval is the percentile one ("pair-bootstrap"); p_value is
 * 2 Phi(-|d| / sd*), sd* the standard deviation of the replicate
 * differences, which unlike the shifted p_bootstrap (also given) is not
 * held at 1 / (B + 1). McNemar's exact test on the questions both sets
 * answered is shown beside it: it treats questions that share a word pair
 * as independent, and is far too confident; with B = 0 it is the test.
 * Similarity, in common mode: Steiger's Z1* (applied to Spearman's rho as
 * is common practice, e.g. Rastogi, Van Durme and Arora 2015, from
 * memory; with Spearman's variance, since Pearson's makes it reject too
 * often), analytic, so that Holm's adjustment over many suites and pairs
 * is not held back by the 1 / (B + 1) floor of a bootstrap p; in as-is
 * mode the bootstrap (Steiger then covers other items than the scores).
 * Holm's (1979) adjustment runs over every row's p_value.
 *
 * Deterministic: the same input and options give the same table for any
 * thread count. *out is freed with vg_comparisons_free. Returns
 * VG_EINVAL for fewer than two sets, a level or alpha outside (0, 1), a
 * pair out of range or with a = b, mismatched suites (a NULL array where
 * the task needs one); VG_ENOMEM when out of memory. */
VG_API vg_status vg_compare(const vg_paired_items *in, const vg_compare_options *opt,
                            vg_comparisons **out, vg_error *err);

/* NULL does nothing. */
VG_API void vg_comparisons_free(vg_comparisons *c);

/* The score of set on suite for metric in c, or NULL. */
VG_API const vg_compared_score *vg_comparisons_score(const vg_comparisons *c, size_t suite,
                                                     const char *metric, size_t set);

/* ---- writing comparisons ----------------------------------------------- */

/* The header line of comparison.csv, without the newline. */
VG_API const char *vg_report_comparison_header(void);

/* comparison.csv: one line per row of c, columns as in the header:
 * suite, task, metric, set_a, set_b, items, compared, dropped, used_a,
 * used_b, score_a, score_b, difference, ci_low, ci_high, ci_method,
 * replicates, test, p_value, p_holm, significant (1/0), better (the label
 * of the better set when significant, else empty), p_bootstrap,
 * steiger_z, p_steiger, r_ab, only_a, only_b, p_mcnemar. Numbers
 * round-trip (%.17g); undefined ones are empty. VG_EIO on write failure. */
VG_API vg_status vg_report_comparison_csv(const vg_comparisons *c, FILE *fp, const char *path,
                                          vg_error *err);

/* ranking.csv: rank, vectors, mean_rank, suites, wins, losses. */
VG_API vg_status vg_report_ranking_csv(const vg_comparisons *c, FILE *fp, const char *path,
                                       vg_error *err);

/* The comparison section of summary.md (a "## Comparison" heading, how
 * items were chosen, a table per suite, the ranking, the methods). */
VG_API vg_status vg_report_comparison_md(const vg_comparisons *c, FILE *fp, const char *path,
                                         vg_error *err);

/* The comparison as aligned text (stdout of compare and score). */
VG_API vg_status vg_report_comparison_text(const vg_comparisons *c, FILE *fp, vg_error *err);

/* The file name (without extension) of suite k's plot: the id with any
 * byte outside [A-Za-z0-9._-] replaced by '_', and "-2", "-3" ... added
 * when two ids map to the same name. Writes at most size bytes. */
VG_API void vg_plot_name(const char *const *ids, size_t n, size_t k, char *buf, size_t size);

/* Interval plot of suite k: each set's score on the compared items with
 * its interval, best set marked, sets significantly below the best
 * marked; written as SVG to svg_path and PNG to png_path (either may be
 * NULL). VG_EIO with the path when cairo cannot write it. */
VG_API vg_status vg_plot_comparison(const vg_comparisons *c, size_t suite,
                                    const char *svg_path, const char *png_path,
                                    vg_error *err);

/* Release the font caches that cairo and fontconfig keep for the whole
 * process once a plot has been drawn (cairo_debug_reset_static_data,
 * FcFini), so that memory checkers see no leak. Call it only at exit,
 * when nothing else in the process uses cairo or fontconfig any more. */
VG_API void vg_plot_cleanup(void);

#ifdef __cplusplus
}
#endif

#endif /* VG_COMPARE_H */
