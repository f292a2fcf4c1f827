/* paired.h - tests for "is vector set A really better than B?".
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Both sets are scored on the same items, so their scores are dependent:
 * these tests use that pairing instead of treating the two scores as
 * independent samples. Multiple comparisons (several suites, several
 * pairs of sets) are adjusted with Holm's step-down method.
 */
#ifndef VG_PAIRED_H
#define VG_PAIRED_H

#include <stddef.h>

#include "error.h"
#include "vg_config.h"

#ifdef __cplusplus
extern "C" {
#endif

/* A test statistic and its two-sided p-value. */
typedef struct vg_test_result {
    double statistic;  /* z, t, or the smaller discordant count (McNemar) */
    double df;         /* degrees of freedom for t statistics, else NaN */
    double p_value;    /* two-sided */
} vg_test_result;

/* Steiger's (1980) Z for two dependent correlations that share one
 * variable: r_ha = corr(human, A), r_hb = corr(human, B), r_ab =
 * corr(A, B), all on the same n items. Z = (z_ha - z_hb) sqrt(n - 3) /
 * sqrt(2 - 2 c) with Fisher's z and c = psi / ((1 - r1^2)(1 - r2^2)),
 * psi = r_ab (1 - r1^2 - r2^2) - r1 r2 (1 - r1^2 - r2^2 - r_ab^2) / 2
 * (Steiger 1980, Psychological Bulletin 87(2), equations 11 and 14).
 * pooled = 1 (Steiger's recommended Z1*, the one vecgauge reports) uses
 * r1 = r2 = (r_ha + r_hb) / 2, the estimate under the null hypothesis;
 * pooled = 0 uses r1 = r_ha, r2 = r_hb. Applied to Spearman's rho the
 * test is an approximation (common practice). Returns NaN statistic and
 * p-value when n < 4 or an |r| is 1. */
VG_API vg_test_result vg_paired_steiger_z(double r_ha, double r_hb, double r_ab, size_t n,
                                          int pooled);

/* Steiger's pooled Z1* for Spearman's rho: the same Z divided by
 * sqrt(1 + rbar^2 / 2), rbar = (r_ha + r_hb) / 2. Fisher's z of
 * Spearman's rho has a larger variance than Pearson's, about
 * (1 + rho^2 / 2) / (n - 3) (Bonett and Wright 2000, Psychometrika 65(1),
 * from memory; Fieller, Hartley and Pearson 1957 give 1.06 / (n - 3) for
 * small rho), and Z1* with Pearson's variance rejects too often on
 * Spearman's rho: 5.1-8% at nominal 5% for rho 0.3-0.75, growing with rho
 * and not with n. The factor scales the covariance of the two z values
 * with their variances; vecgauge's own simulation (tests/unit/
 * test_steiger_level.c, trivariate normal, fixed seed) finds the corrected
 * test at or slightly under its level (3.8-5% at 5%). r_ha, r_hb and
 * r_ab are Spearman's rhos on the same n items; undefined as for
 * vg_paired_steiger_z. */
VG_API vg_test_result vg_paired_steiger_z_spearman(double r_ha, double r_hb, double r_ab,
                                                   size_t n);

/* Williams' (1959) t for the same question, as recommended by Steiger
 * (1980, equation 7): t has n - 3 degrees of freedom. */
VG_API vg_test_result vg_paired_williams_t(double r_ha, double r_hb, double r_ab, size_t n);

/* McNemar's exact test on paired right/wrong outcomes: only_a questions
 * that A answered right and B wrong, only_b the reverse. Under the null
 * the discordant questions split as Binomial(only_a + only_b, 1/2); the
 * two-sided p-value is min(1, 2 P(X <= min(only_a, only_b))) (McNemar
 * 1947, exact form). p = 1 when there are no discordant questions. */
VG_API vg_test_result vg_paired_mcnemar_exact(size_t only_a, size_t only_b);

/* Holm's (1979) step-down adjustment of m p-values: with p sorted
 * ascending, adjusted p_(i) = max over j <= i of min(1, (m - j + 1) p_(j)).
 * adjusted[k] corresponds to p[k]; NaN p-values are left NaN and do not
 * count towards m. work must hold m size_t. */
VG_API void vg_paired_holm(const double *p, size_t m, double *adjusted, size_t *work);

#ifdef __cplusplus
}
#endif

#endif /* VG_PAIRED_H */
