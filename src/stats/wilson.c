/* wilson.c - the Wilson score interval for a proportion.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <gsl/gsl_cdf.h>
#include <math.h>

#include "vecgauge/stats.h"
#include "vecgauge/vecgauge.h"

void vg_stats_wilson(size_t k, size_t n, double level, double *low, double *high) {
    if (n == 0 || k > n || !(level > 0 && level < 1)) {
        *low = *high = NAN;
        return;
    }
    vg_init();
    /* Wilson (1927): the p for which |phat - p| = z sqrt(p (1 - p) / n),
     *   centre    (phat + z^2 / 2n) / (1 + z^2 / n)
     *   half-width z / (1 + z^2 / n) sqrt(phat (1 - phat) / n + z^2 / 4n^2),
     * with z the (1 + level) / 2 quantile of the standard normal. */
    double z = gsl_cdf_ugaussian_Pinv(0.5 + level / 2);
    double nn = (double)n, p = (double)k / nn, z2 = z * z;
    double denom = 1 + z2 / nn;
    double centre = (p + z2 / (2 * nn)) / denom;
    double half = z / denom * sqrt(p * (1 - p) / nn + z2 / (4 * nn * nn));
    *low = k == 0 ? 0.0 : centre - half;
    *high = k == n ? 1.0 : centre + half;
}
