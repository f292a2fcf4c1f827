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

#endif /* VG_STATS_IMPL_H */
