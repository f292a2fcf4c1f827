/* interval.c - percentile, BCa and Fisher-z confidence intervals.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * These work on any statistic's replicate and jackknife values, so the
 * similarity and the analogy bootstraps share them.
 */
#include <gsl/gsl_cdf.h>
#include <gsl/gsl_sort.h>
#include <gsl/gsl_statistics_double.h>
#include <math.h>

#include "vecgauge/stats.h"
#include "vecgauge/vecgauge.h"

/* Quantile p of sorted[0..n): linear interpolation between order
 * statistics at h = (n - 1) p (Hyndman and Fan 1996, type 7; numpy's
 * default), through GSL. */
static double quantile(const double *sorted, size_t n, double p) {
    if (!(p >= 0 && p <= 1)) return NAN;
    return gsl_stats_quantile_from_sorted_data(sorted, 1, n, p);
}

double vg_stats_bca_acceleration(const double *jack, size_t n) {
    if (n < 2) return NAN;
    double mean = 0;
    for (size_t i = 0; i < n; i++) {
        if (isnan(jack[i])) return NAN;
        mean += jack[i];
    }
    mean /= (double)n;
    /* Efron and Tibshirani 1993, eq. 14.15. */
    double s2 = 0, s3 = 0;
    for (size_t i = 0; i < n; i++) {
        double u = mean - jack[i];
        s2 += u * u;
        s3 += u * u * u;
    }
    if (s2 == 0) return 0;
    return s3 / (6.0 * pow(s2, 1.5));
}

void vg_stats_boot_summary(double *reps, size_t B, double theta, const double *jack,
                           size_t n_jack, double level, vg_boot_summary *out) {
    vg_init();
    *out = (vg_boot_summary){0, NAN, NAN, NAN, NAN, NAN, NAN, NAN};
    /* Undefined replicates (a resample with a constant variable) are left
     * out: they have no value to order. */
    size_t m = 0;
    for (size_t b = 0; b < B; b++)
        if (!isnan(reps[b])) reps[m++] = reps[b];
    for (size_t b = m; b < B; b++) reps[b] = NAN;
    out->replicates = m;
    if (m == 0 || !(level > 0 && level < 1)) return;
    gsl_sort(reps, 1, m);
    double alpha = (1 - level) / 2;
    out->se = m > 1 ? gsl_stats_sd(reps, 1, m) : NAN;
    out->pct_low = quantile(reps, m, alpha);
    out->pct_high = quantile(reps, m, 1 - alpha);
    if (isnan(theta)) return;

    /* Bias correction: where theta falls among the replicates, ties
     * counted half (Efron and Tibshirani 1993, eq. 14.14; the tie rule of
     * scipy.stats.bootstrap). */
    size_t below = 0, at_or_below = 0;
    for (size_t b = 0; b < m; b++) {
        below += reps[b] < theta;
        at_or_below += reps[b] <= theta;
    }
    double z0 = gsl_cdf_ugaussian_Pinv((double)(below + at_or_below) / (2.0 * (double)m));
    double a = vg_stats_bca_acceleration(jack, n_jack);
    out->z0 = z0;
    out->accel = a;
    if (!isfinite(z0) || isnan(a)) return;
    /* Efron 1987, eq. 2.3; Efron and Tibshirani 1993, eq. 14.10. */
    double zl = gsl_cdf_ugaussian_Pinv(alpha), zh = -zl;
    double a1 = gsl_cdf_ugaussian_P(z0 + (z0 + zl) / (1 - a * (z0 + zl)));
    double a2 = gsl_cdf_ugaussian_P(z0 + (z0 + zh) / (1 - a * (z0 + zh)));
    out->bca_low = quantile(reps, m, a1);
    out->bca_high = quantile(reps, m, a2);
}

void vg_stats_fisher_interval(vg_corr kind, double r, size_t n, double level, double *low,
                              double *high) {
    *low = *high = NAN;
    double c = 1, k = 3;
    switch (kind) {
    case VG_CORR_PEARSON: c = 1.0, k = 3; break;   /* Fisher 1921 */
    case VG_CORR_SPEARMAN: c = 1.06, k = 3; break; /* Fieller, Hartley and Pearson 1957 */
    case VG_CORR_KENDALL: c = 0.437, k = 4; break; /* Fieller, Hartley and Pearson 1957 */
    default: return;
    }
    if (isnan(r) || (double)n - k < 1 || !(level > 0 && level < 1)) return;
    vg_init();
    double z = atanh(r), se = sqrt(c / ((double)n - k));
    double q = gsl_cdf_ugaussian_Pinv(1 - (1 - level) / 2);
    *low = tanh(z - q * se);
    *high = tanh(z + q * se);
}
