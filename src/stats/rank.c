/* rank.c - average ranks with ties.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <stdlib.h>

#include "vecgauge/stats.h"

/* qsort has no context argument; sort indices through a thread-local
 * pointer to the values. */
static _Thread_local const double *sort_keys;

static int cmp_index(const void *a, const void *b) {
    double x = sort_keys[*(const size_t *)a], y = sort_keys[*(const size_t *)b];
    if (x < y) return -1;
    if (x > y) return 1;
    /* Equal values: order by index so the sort is deterministic. */
    size_t i = *(const size_t *)a, j = *(const size_t *)b;
    return (i > j) - (i < j);
}

void vg_stats_rank(const double *x, size_t n, double *ranks, size_t *work) {
    for (size_t i = 0; i < n; i++) work[i] = i;
    sort_keys = x;
    qsort(work, n, sizeof *work, cmp_index);
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
