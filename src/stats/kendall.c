/* kendall.c - Kendall's tau-b by Knight's merge-sort count.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <stdint.h>

#include "stats_impl.h"
#include "vecgauge/stats.h"

/* Pairs among t tied values. */
static uint64_t pairs_of(uint64_t t) { return t * (t - 1) / 2; }

/* Sort idx[0..n) by y (stable, bottom-up merge sort through tmp) and
 * return the number of inversions: positions k < l with y[idx[k]] >
 * y[idx[l]] strictly (Knight 1966). Equal y values are not inversions. */
static uint64_t merge_count(const double *y, size_t *idx, size_t *tmp, size_t n) {
    uint64_t swaps = 0;
    size_t *src = idx, *dst = tmp;
    for (size_t w = 1; w < n; w *= 2) {
        for (size_t lo = 0; lo < n; lo += 2 * w) {
            size_t mid = lo + w < n ? lo + w : n, hi = lo + 2 * w < n ? lo + 2 * w : n;
            size_t i = lo, j = mid, k = lo;
            while (i < mid && j < hi) {
                if (y[src[j]] < y[src[i]]) {
                    /* src[j] jumps over every remaining left element. */
                    swaps += mid - i;
                    dst[k++] = src[j++];
                } else {
                    dst[k++] = src[i++];
                }
            }
            while (i < mid) dst[k++] = src[i++];
            while (j < hi) dst[k++] = src[j++];
        }
        size_t *t = src;
        src = dst;
        dst = t;
    }
    if (src != idx)
        for (size_t k = 0; k < n; k++) idx[k] = src[k];
    return swaps;
}

double vg_stats_kendall(const double *x, const double *y, size_t n, size_t *work) {
    if (n < 2) return NAN;
    size_t *idx = work, *tmp = work + n;
    vg_stats_order(x, y, n, idx);
    /* Ties in x (n1) and in x and y together (n3), on the (x, y) order. */
    uint64_t n1 = 0, n3 = 0;
    for (size_t i = 0; i < n;) {
        size_t j = i + 1;
        while (j < n && x[idx[j]] == x[idx[i]]) j++;
        n1 += pairs_of(j - i);
        for (size_t a = i; a < j;) {
            size_t b = a + 1;
            while (b < j && y[idx[b]] == y[idx[a]]) b++;
            n3 += pairs_of(b - a);
            a = b;
        }
        i = j;
    }
    /* Within an x group y is ascending, so every inversion of the y
     * sequence is a pair strictly ordered in x and reversed in y. */
    uint64_t d = merge_count(y, idx, tmp, n);
    uint64_t n2 = 0;
    for (size_t i = 0; i < n;) {
        size_t j = i + 1;
        while (j < n && y[idx[j]] == y[idx[i]]) j++;
        n2 += pairs_of(j - i);
        i = j;
    }
    uint64_t n0 = pairs_of(n);
    if (n1 == n0 || n2 == n0) return NAN;
    /* Signed: concordant minus discordant pairs. */
    int64_t s = (int64_t)(n0 - n1 - n2 + n3) - 2 * (int64_t)d;
    double tau = (double)s / sqrt((double)(n0 - n1)) / sqrt((double)(n0 - n2));
    return tau > 1 ? 1 : tau < -1 ? -1 : tau;
}
