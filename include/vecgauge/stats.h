/* stats.h - correlation and interval statistics on caller-owned arrays.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Every function takes plain arrays with explicit lengths and, where it
 * needs scratch memory, a workspace the caller provides, so nothing here
 * allocates behind the caller's back; the few that allocate say so in
 * their contract. NaN is returned where a statistic is undefined (n < 2,
 * or a constant input).
 */
#ifndef VG_STATS_H
#define VG_STATS_H

#include <stddef.h>
#include <stdint.h>

#include "error.h"
#include "vg_config.h"

#ifdef __cplusplus
extern "C" {
#endif

/* ---- correlations ------------------------------------------------------ */

/* Ranks of x[0..n) into ranks[0..n), 1-based, ties given the average of
 * the ranks they span. work must hold n size_t. */
VG_API void vg_stats_rank(const double *x, size_t n, double *ranks, size_t *work);

/* Spearman's rho of x and y (ties as average ranks), through GSL's
 * gsl_stats_spearman. work must hold 2 * n doubles. NaN if n < 2 or
 * either input is constant. */
VG_API double vg_stats_spearman(const double *x, const double *y, size_t n,
                                double *work);

/* Pearson's r of x and y. NaN if n < 2 or either input is constant. */
VG_API double vg_stats_pearson(const double *x, const double *y, size_t n);

/* Kendall's tau-b of x and y (Kendall 1945: ties corrected in both
 * variables), in O(n log n) by Knight's (1966) merge-sort count:
 * tau_b = (n0 - n1 - n2 + n3 - 2 D) / sqrt((n0 - n1) (n0 - n2)), with
 * n0 = n(n-1)/2, n1 and n2 the pairs tied in x and in y, n3 the pairs
 * tied in both and D the discordant pairs. work must hold 2 * n size_t.
 * NaN if n < 2 or either input is constant. */
VG_API double vg_stats_kendall(const double *x, const double *y, size_t n,
                               size_t *work);

/* ---- intervals from bootstrap replicates ------------------------------- */

/* What a bootstrap says about one statistic. */
typedef struct vg_boot_summary {
    size_t replicates;      /* replicates with a defined value (NaN ones are left out) */
    double se;              /* standard deviation of those replicates */
    double pct_low, pct_high; /* percentile interval */
    double z0;              /* BCa bias correction */
    double accel;           /* BCa acceleration (from the jackknife) */
    double bca_low, bca_high; /* BCa interval */
} vg_boot_summary;

/* Percentile and BCa intervals (Efron 1987; Efron and Tibshirani 1993,
 * ch. 13 and 14) at confidence level (0 < level < 1) from the bootstrap
 * replicates reps[0..B) of a statistic whose estimate is theta and whose
 * leave-one-out (jackknife) values are jack[0..n_jack).
 *   alpha = (1 - level) / 2; quantiles are linear interpolations between
 *   order statistics (GSL gsl_stats_quantile_from_sorted_data, the same
 *   rule as numpy.percentile's default);
 *   percentile: [q(alpha), q(1 - alpha)];
 *   z0 = Phi^-1((#{reps < theta} + #{reps <= theta}) / (2 B)) (ties at
 *   theta count half, as scipy.stats.bootstrap does);
 *   a = sum u^3 / (6 (sum u^2)^1.5), u_i = mean(jack) - jack_i;
 *   BCa: [q(alpha1), q(alpha2)], alpha1,2 = Phi(z0 + (z0 + z) / (1 - a (z0 + z)))
 *   for z = Phi^-1(alpha) and Phi^-1(1 - alpha).
 * reps is reordered: NaN values are moved out and the rest sorted
 * ascending into reps[0..out->replicates). Fields that cannot be computed
 * are NaN: every interval when no replicate is defined or level is not in
 * (0, 1); the BCa ones when
 * theta is NaN, a jackknife value is NaN, n_jack < 2, or every replicate
 * lies on one side of theta (z0 infinite). When all jackknife values are
 * equal the acceleration is taken as 0 (BCa reduces to BC). */
VG_API void vg_stats_boot_summary(double *reps, size_t B, double theta,
                                  const double *jack, size_t n_jack, double level,
                                  vg_boot_summary *out);

/* The BCa acceleration of jackknife values jack[0..n) (the formula
 * above). NaN if n < 2 or any value is NaN; 0 if all values are equal. */
VG_API double vg_stats_bca_acceleration(const double *jack, size_t n);

/* ---- correlation bootstrap --------------------------------------------- */

/* The correlations vg_stats_corr_bootstrap computes, in the order of
 * vg_metric (results.h). */
typedef enum vg_corr {
    VG_CORR_SPEARMAN = 0,
    VG_CORR_PEARSON = 1,
    VG_CORR_KENDALL = 2,
    VG_CORR_COUNT = 3
} vg_corr;

/* Analytic interval on Fisher's z = atanh(r) at confidence level:
 * tanh(z -+ Phi^-1(1 - alpha) sqrt(c / (n - k))), alpha = (1 - level) / 2,
 * with c / (n - k) the variance of z:
 *   Pearson 1 / (n - 3) (Fisher 1921);
 *   Spearman 1.06 / (n - 3), Kendall 0.437 / (n - 4) (Fieller, Hartley
 *   and Pearson 1957).
 * *low and *high are NaN when r is NaN or n - k < 1. */
VG_API void vg_stats_fisher_interval(vg_corr kind, double r, size_t n, double level,
                                     double *low, double *high);

/* Options of vg_stats_corr_bootstrap. Initialise with
 * vg_corr_boot_options_init. */
typedef struct vg_corr_boot_options {
    size_t replicates;   /* B; 0: no bootstrap (Fisher intervals only) */
    uint64_t seed;       /* the user's seed (VG_DEFAULT_SEED) */
    uint64_t stream;     /* what is resampled: inside vecgauge the stream of
                            the suite id and subset, so that replicate r
                            draws the same items for every vector set */
    double level;        /* confidence level (VG_DEFAULT_CI) */
    unsigned threads;    /* 0: one per online CPU; results never depend on it */
    unsigned kinds;      /* bit 1 << k: bootstrap vg_corr k; 0: all three.
                            Left-out ones get NaN replicates and intervals
                            (their estimates are still computed) */
} vg_corr_boot_options;

VG_API void vg_corr_boot_options_init(vg_corr_boot_options *opt);

/* One correlation with its uncertainty. */
typedef struct vg_corr_estimate {
    double value;            /* on the items with a defined y */
    size_t n;                /* those items */
    vg_boot_summary boot;    /* all NaN (and 0 replicates) when B = 0 */
    double fisher_low, fisher_high; /* vg_stats_fisher_interval */
} vg_corr_estimate;

/* Spearman's rho, Pearson's r and Kendall's tau-b of x and y over the
 * items i < n whose y[i] is not NaN, each with a bootstrap over the items
 * and its Fisher-z interval.
 *
 * Replicate r seeds a GSL taus2 generator from (seed, stream, r) alone
 * and draws n items with replacement out of all n (src/stats/resample.h),
 * so its draws do not depend on y, on threads or on other replicates; the
 * statistics of the replicate are those of the drawn items with a defined
 * y (items drawn k times count k times; ties as average ranks). The
 * jackknife behind the BCa acceleration leaves out each of the n items in
 * turn (leaving out an item without y changes nothing). Each replicate
 * re-ranks its items in O(n) from the sort of the data done once:
 * Spearman is the weighted Pearson correlation of the ranks the
 * multiplicities give; Kendall counts discordant pairs with a counting
 * tree in O(n log n). The jackknife costs O(n) per item (O(n^2) in all: a
 * few tens of milliseconds for 3,000 items). Replicates and jackknife
 * items are split over threads by index.
 *
 * out[VG_CORR_COUNT] receives the three estimates. replicates, if not
 * NULL, receives B values per correlation, replicates[k * B + r] (NaN
 * where undefined), in replicate order; jackknife, if not NULL, receives
 * n values per correlation, jackknife[k * n + i] (computed even when
 * B = 0). Allocates its workspaces (freed before it returns). Returns
 * VG_EINVAL for a level outside (0, 1) or a NaN x, VG_ELIMIT for more
 * than 2^32 - 1 items, VG_ENOMEM when out of memory; out is then
 * undefined. */
VG_API vg_status vg_stats_corr_bootstrap(const double *x, const double *y, size_t n,
                                         const vg_corr_boot_options *opt,
                                         vg_corr_estimate out[VG_CORR_COUNT],
                                         double *replicates, double *jackknife,
                                         vg_error *err);

/* ---- the pair bootstrap (analogy questions that share word pairs) ------- */

/* Analogy questions are built from a few word pairs: in a section, every
 * question a : b :: c : d takes one pair as (a, b), its row, and another
 * as (c, d), its column, so questions that share a pair succeed or fail
 * together. The pair bootstrap resamples the pairs, not the questions:
 * Owen's (2007) pigeonhole bootstrap for crossed designs ("The pigeonhole
 * bootstrap", Annals of Applied Statistics 1(2)), within each stratum
 * (section): row levels and column levels are drawn independently with
 * replacement, and every question counts with the product of its row's
 * and its column's multiplicities. A question whose row and column no
 * other question of its stratum uses is isolated: it is drawn from a pool
 * of its own with the stratum's other isolated questions, so that a
 * design where nothing is shared is the ordinary bootstrap over
 * questions (stratified by stratum). Owen shows the pigeonhole variance
 * mildly conservative (biased upwards) for a mean in crossed random
 * effects models, however unbalanced. */
typedef struct vg_pairboot_design vg_pairboot_design;

/* The design of n questions: question i is in stratum[i] (< n_strata),
 * takes row label row[i] and column label col[i] (any numbers; the same
 * label in two strata is two levels). On success *out owns a new design
 * (free with vg_pairboot_design_free). VG_EINVAL for a stratum out of
 * range, VG_ELIMIT for 2^32 - 1 questions or more, VG_ENOMEM. */
VG_API vg_status vg_pairboot_design_new(const uint32_t *stratum, size_t n_strata,
                                        const uint32_t *row, const uint32_t *col, size_t n,
                                        vg_pairboot_design **out, vg_error *err);

/* NULL does nothing. */
VG_API void vg_pairboot_design_free(vg_pairboot_design *d);

VG_API size_t vg_pairboot_design_strata(const vg_pairboot_design *d);

/* Row levels, column levels and isolated questions of stratum s (any
 * pointer may be NULL). */
VG_API void vg_pairboot_design_levels(const vg_pairboot_design *d, size_t s, size_t *rows,
                                      size_t *cols, size_t *isolated);

typedef struct vg_pairboot_options {
    size_t replicates;   /* B */
    uint64_t seed;       /* the user's seed */
    uint64_t stream;     /* what is resampled (inside vecgauge: the suite id) */
    unsigned threads;    /* 0: one per online CPU; results never depend on it */
} vg_pairboot_options;

/* B = VG_DEFAULT_BOOTSTRAP, seed VG_DEFAULT_SEED, stream 0, threads 0. */
VG_API void vg_pairboot_options_init(vg_pairboot_options *opt);

/* The weight of every question in replicate r, into weights[0..n): stratum
 * s draws from a generator seeded by (seed, stream + s * 0x9e3779b97f4a7c15,
 * r) alone (src/stats/resample.h), first its R row multiplicities, then
 * its C column ones, then its I isolated ones (n draws out of n each,
 * vg_resample_counts); a question weighs w[row] v[col], an isolated one
 * u[its index]. Levels are numbered in order of first appearance, isolated
 * questions in question order. VG_ENOMEM. */
VG_API vg_status vg_pairboot_weights(const vg_pairboot_design *d, uint64_t seed,
                                     uint64_t stream, size_t replicate, double *weights,
                                     vg_error *err);

/* The multiplicities behind those weights, for stratum s of replicate r:
 * w[0..R) over the row levels, v[0..C) over the column levels, u[0..I)
 * over the isolated questions (vg_pairboot_design_levels gives R, C, I). */
VG_API void vg_pairboot_draws(const vg_pairboot_design *d, uint64_t seed, uint64_t stream,
                              size_t replicate, size_t s, uint32_t *w, uint32_t *v, uint32_t *u);

/* For each replicate r < B, stratum s and value column j < k, the
 * weighted total sums[(r * n_strata + s) * k + j] = sum over the questions
 * q of s of weight_r(q) x[j][q] (x[j] holds n small integers: 1 for a
 * right answer, 1 for a question used, ...). A ratio of two columns over
 * any union of strata is then that subset's replicate statistic, e.g.
 * accuracy = right / used. Computed as w' T v per stratum (T the row x
 * column table of totals; dgemm over blocks of replicates): the sums are
 * exact integers, so they do not depend on threads. Allocates its
 * workspace. VG_ENOMEM. */
VG_API vg_status vg_pairboot_sums(const vg_pairboot_design *d, const vg_pairboot_options *opt,
                                  const unsigned char *const *x, size_t k, double *sums,
                                  vg_error *err);

/* ---- agreement between raters ------------------------------------------ */

/* How well human raters agree with each other on a suite. */
typedef struct vg_agreement {
    double value;          /* mean leave-one-out Spearman; NaN if undefined */
    const char *method;    /* "loo-spearman" (static) */
    size_t columns;        /* rating columns: the most ratings an item has */
    size_t columns_used;   /* columns whose correlation is defined */
    size_t min_ratings, max_ratings; /* ratings per item, over rated items */
    size_t n_items;        /* items with at least two ratings */
} vg_agreement;

/* Mean leave-one-out Spearman agreement: for each rating column j, rho
 * between the j-th rating of each item and the mean of that item's other
 * ratings, over the items that have a j-th rating and at least one other;
 * then the mean over the columns whose rho is defined. A column stands
 * for one rater, which holds when every item was rated by the same people
 * in the same column order; when items carry different numbers of
 * ratings the figure is an approximation (see min_ratings/max_ratings).
 * ratings[i] points at counts[i] ratings of item i (counts[i] may be 0).
 * Allocates its workspace. Returns VG_ENOMEM when out of memory; *out is
 * always filled (value NaN when no column has at least 3 items). */
VG_API vg_status vg_stats_agreement_loo(const double *const *ratings,
                                        const size_t *counts, size_t n,
                                        vg_agreement *out, vg_error *err);

/* The Wilson score interval (Wilson 1927) for k successes in n trials at
 * confidence level (e.g. 0.95) into [*low, *high]. The bounds are exact 0
 * when k == 0 and exact 1 when k == n (the formula gives them up to
 * rounding). Both are NaN when n == 0, k > n or level is not in (0, 1). */
VG_API void vg_stats_wilson(size_t k, size_t n, double level, double *low, double *high);

#ifdef __cplusplus
}
#endif

#endif /* VG_STATS_H */
