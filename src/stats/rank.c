/* rank.c - sorting indices by value, and average ranks with ties.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <stdlib.h>

#include "stats_impl.h"
#include "vecgauge/stats.h"

/* qsort has no context argument; sort indices through thread-local
 * pointers to the values. */
static _Thread_local const double *sort_x, *sort_y;

static int cmp_index(const void *a, const void *b) {
    size_t i = *(const size_t *)a, j = *(const size_t *)b;
    double x = sort_x[i], y = sort_x[j];
    if (x < y) return -1;
    if (x > y) return 1;
    if (sort_y) {
        x = sort_y[i];
        y = sort_y[j];
        if (x < y) return -1;
        if (x > y) return 1;
    }
    /* Equal keys: order by index so the sort is deterministic. */
    return (i > j) - (i < j);
}

void vg_stats_order(const double *x, const double *y, size_t n, size_t *idx) {
    for (size_t i = 0; i < n; i++) idx[i] = i;
    sort_x = x;
    sort_y = y;
    qsort(idx, n, sizeof *idx, cmp_index);
}

void vg_stats_rank(const double *x, size_t n, double *ranks, size_t *work) {
    vg_stats_order(x, NULL, n, work);
    /* Ties get the mean of the 1-based ranks they span: i+1 .. j. */
    size_t i = 0;
    while (i < n) {
        size_t j = i + 1;
        while (j < n && x[work[j]] == x[work[i]]) j++;
        double r = (double)(i + 1 + j) / 2.0;
        for (size_t k = i; k < j; k++) ranks[work[k]] = r;
        i = j;
    }
}
