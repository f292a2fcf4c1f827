/* paired_correlation.c - Steiger's Z and Williams' t for two dependent
 * correlations sharing one variable.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <gsl/gsl_cdf.h>
#include <math.h>

#include "vecgauge/paired.h"
#include "vecgauge/vecgauge.h"

static int usable(double r) { return isfinite(r) && fabs(r) < 1.0; }

static vg_test_result undefined(void) { return (vg_test_result){NAN, NAN, NAN}; }

vg_test_result vg_paired_steiger_z(double r_ha, double r_hb, double r_ab, size_t n,
                                   int pooled) {
    if (n < 4 || !usable(r_ha) || !usable(r_hb) || !isfinite(r_ab) || fabs(r_ab) > 1)
        return undefined();
    vg_init();
    double r1 = r_ha, r2 = r_hb;
    if (pooled) r1 = r2 = (r_ha + r_hb) / 2;
    /* Steiger (1980), eq. 11: the covariance of the two Fisher z values
     * (times n), here with the estimates r1, r2 of the two correlations. */
    double psi = r_ab * (1 - r1 * r1 - r2 * r2) -
                 0.5 * r1 * r2 * (1 - r1 * r1 - r2 * r2 - r_ab * r_ab);
    double c = psi / ((1 - r1 * r1) * (1 - r2 * r2));
    double denom = 2 - 2 * c;
    if (!(denom > 0)) return undefined();
    double z = (atanh(r_ha) - atanh(r_hb)) * sqrt((double)n - 3) / sqrt(denom);
    double p = 2 * gsl_cdf_ugaussian_Q(fabs(z));
    return (vg_test_result){z, NAN, p > 1 ? 1 : p};
}

vg_test_result vg_paired_steiger_z_spearman(double r_ha, double r_hb, double r_ab, size_t n) {
    vg_test_result t = vg_paired_steiger_z(r_ha, r_hb, r_ab, n, 1);
    if (isnan(t.statistic)) return t;
    /* Bonett and Wright's (2000) variance of Fisher's z of Spearman's rho,
     * (1 + rho^2 / 2) / (n - 3), at the pooled estimate under the null:
     * Z1*'s variance of the difference scaled by the same factor. */
    double rbar = (r_ha + r_hb) / 2;
    double z = t.statistic / sqrt(1 + rbar * rbar / 2);
    double p = 2 * gsl_cdf_ugaussian_Q(fabs(z));
    return (vg_test_result){z, NAN, p > 1 ? 1 : p};
}

vg_test_result vg_paired_williams_t(double r_ha, double r_hb, double r_ab, size_t n) {
    if (n < 4 || !usable(r_ha) || !usable(r_hb) || !usable(r_ab)) return undefined();
    vg_init();
    double nn = (double)n;
    /* |R|, the determinant of the 3x3 correlation matrix. */
    double det = 1 - r_ha * r_ha - r_hb * r_hb - r_ab * r_ab + 2 * r_ha * r_hb * r_ab;
    double rbar = (r_ha + r_hb) / 2;
    double cube = (1 - r_ab) * (1 - r_ab) * (1 - r_ab);
    double denom = 2 * (nn - 1) / (nn - 3) * det + rbar * rbar * cube;
    if (!(denom > 0)) return undefined();
    double t = (r_ha - r_hb) * sqrt((nn - 1) * (1 + r_ab) / denom);
    double p = 2 * gsl_cdf_tdist_Q(fabs(t), nn - 3);
    return (vg_test_result){t, nn - 3, p > 1 ? 1 : p};
}
