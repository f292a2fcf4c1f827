/* paired_counts.c - McNemar's exact test and Holm's adjustment.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <gsl/gsl_cdf.h>
#include <math.h>
#include <stdlib.h>

#include "vecgauge/paired.h"
#include "vecgauge/vecgauge.h"

vg_test_result vg_paired_mcnemar_exact(size_t only_a, size_t only_b) {
    size_t n = only_a + only_b;
    size_t k = only_a < only_b ? only_a : only_b;
    if (n == 0) return (vg_test_result){0, NAN, 1.0};
    vg_init();
    /* Binomial(n, 1/2) is symmetric, so the two-sided p-value is twice
     * the smaller tail (capped at 1 when both tails overlap at k = n/2). */
    double p = 2 * gsl_cdf_binomial_P((unsigned)k, 0.5, (unsigned)n);
    return (vg_test_result){(double)k, NAN, p > 1 ? 1 : p};
}

/* qsort has no context argument: sort indices through a thread-local. */
static _Thread_local const double *holm_keys;

static int cmp_p(const void *a, const void *b) {
    size_t i = *(const size_t *)a, j = *(const size_t *)b;
    double x = holm_keys[i], y = holm_keys[j];
    if (x < y) return -1;
    if (x > y) return 1;
    return (i > j) - (i < j);
}

void vg_paired_holm(const double *p, size_t m, double *adjusted, size_t *work) {
    size_t k = 0;
    for (size_t i = 0; i < m; i++) {
        adjusted[i] = NAN;
        if (!isnan(p[i])) work[k++] = i;
    }
    holm_keys = p;
    qsort(work, k, sizeof *work, cmp_p);
    double running = 0;
    for (size_t j = 0; j < k; j++) {
        double a = (double)(k - j) * p[work[j]];
        if (a > 1) a = 1;
        if (a > running) running = a;
        adjusted[work[j]] = running;
    }
}
