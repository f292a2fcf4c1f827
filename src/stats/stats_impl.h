/* stats_impl.h - helpers shared by the statistics files.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_STATS_IMPL_H
#define VG_STATS_IMPL_H

#include <stddef.h>

#include "../common/internal.h"

/* idx[0..n) = 0..n-1 sorted by x ascending, then (when y is not NULL) by
 * y ascending, then by index, so that the order is fully determined. */
VG_INTERNAL void vg_stats_order(const double *x, const double *y, size_t n, size_t *idx);

/* The percentile interval of the values of x[0..n) that are not NaN, at
 * confidence level: the (1 - level) / 2 and (1 + level) / 2 quantiles,
 * interpolated between order statistics exactly as
 * gsl_stats_quantile_from_sorted_data does (Hyndman and Fan 1996,
 * definition 7; numpy.percentile's default), found by selection. x is
 * reordered. Returns the number of values used; both ends NaN when none. */
VG_INTERNAL size_t vg_stats_percentile_interval(double *x, size_t n, double level, double *low,
                                                double *high);

#endif /* VG_STATS_IMPL_H */
