/* stats.h - correlation and interval statistics on caller-owned arrays.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Every function takes plain arrays with explicit lengths and, where it
 * needs scratch memory, a workspace the caller provides, so nothing here
 * allocates behind the caller's back. NaN is returned where a statistic is
 * undefined (n < 2, or a constant input).
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

/* The Wilson score interval (Wilson 1927) for k successes in n trials at
 * confidence level (e.g. 0.95) into [*low, *high]. The bounds are exact 0
 * when k == 0 and exact 1 when k == n (the formula gives them up to
 * rounding). Both are NaN when n == 0, k > n or level is not in (0, 1). */
VG_API void vg_stats_wilson(size_t k, size_t n, double level, double *low, double *high);

#ifdef __cplusplus
}
#endif

#endif /* VG_STATS_H */
