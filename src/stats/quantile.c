/* quantile.c - percentile intervals without a full sort.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * An analogy run takes two percentile intervals per method, subset and
 * coverage rule, each from 2000 replicates: sorting them all cost more
 * than drawing the replicates. Two order statistics per quantile are
 * enough, found by selection.
 */
#include <math.h>

#include "stats_impl.h"

static void swap(double *a, double *b) {
    double t = *a;
    *a = *b;
    *b = t;
}

/* The k-th smallest of x[0..n) (k < n), leaving x[0..k) <= x[k] <= x[k+1..n)
 * (Hoare's selection, median-of-three pivots). */
static double select_kth(double *x, size_t n, size_t k) {
    size_t lo = 0, hi = n - 1;
    while (hi > lo) {
        size_t mid = lo + (hi - lo) / 2;
        if (x[mid] < x[lo]) swap(&x[mid], &x[lo]);
        if (x[hi] < x[lo]) swap(&x[hi], &x[lo]);
        if (x[hi] < x[mid]) swap(&x[hi], &x[mid]);
        double pivot = x[mid];
        size_t i = lo, j = hi;
        while (i <= j) {
            while (x[i] < pivot) i++;
            while (x[j] > pivot) j--;
            if (i <= j) {
                swap(&x[i], &x[j]);
                i++;
                if (j == 0) break;
                j--;
            }
        }
        if (k <= j)
            hi = j;
        else if (k >= i)
            lo = i;
        else
            return x[k];
    }
    return x[k];
}

/* GSL's gsl_stats_quantile_from_sorted_data on the sorted order of x:
 * (1 - delta) x_(lhs) + delta x_(lhs + 1), lhs = floor(f (n - 1)). */
static double quantile(double *x, size_t n, double f) {
    double index = f * (double)(n - 1);
    size_t lhs = (size_t)index;
    double delta = index - (double)lhs;
    double a = select_kth(x, n, lhs);
    if (lhs == n - 1) return a;
    /* After selection everything above lhs is >= a: the next order
     * statistic is their minimum. */
    double b = x[lhs + 1];
    for (size_t i = lhs + 2; i < n; i++)
        if (x[i] < b) b = x[i];
    return (1 - delta) * a + delta * b;
}

size_t vg_stats_percentile_interval(double *x, size_t n, double level, double *low,
                                    double *high) {
    size_t m = 0;
    for (size_t i = 0; i < n; i++)
        if (!isnan(x[i])) x[m++] = x[i];
    if (m == 0) {
        *low = *high = NAN;
        return 0;
    }
    *low = quantile(x, m, (1 - level) / 2);
    *high = quantile(x, m, (1 + level) / 2);
    return m;
}
