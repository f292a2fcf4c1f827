/* correlation.c - Spearman and Pearson correlation.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <gsl/gsl_statistics_double.h>
#include <math.h>

#include "vecgauge/stats.h"
#include "vecgauge/vecgauge.h"

static int constant(const double *x, size_t n) {
    for (size_t i = 1; i < n; i++)
        if (x[i] != x[0]) return 0;
    return 1;
}

double vg_stats_spearman(const double *x, const double *y, size_t n, double *work) {
    if (n < 2 || constant(x, n) || constant(y, n)) return NAN;
    vg_init();
    /* gsl_stats_spearman ranks both inputs (ties as average ranks) and
     * returns Pearson's r of the ranks. */
    return gsl_stats_spearman(x, 1, y, 1, n, work);
}

double vg_stats_pearson(const double *x, const double *y, size_t n) {
    if (n < 2 || constant(x, n) || constant(y, n)) return NAN;
    vg_init();
    return gsl_stats_correlation(x, 1, y, 1, n);
}
