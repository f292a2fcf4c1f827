/* agreement.c - how well the human raters of a suite agree.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "vecgauge/stats.h"

vg_status vg_stats_agreement_loo(const double *const *ratings, const size_t *counts, size_t n,
                                 vg_agreement *out, vg_error *err) {
    memset(out, 0, sizeof *out);
    out->value = NAN;
    out->method = "loo-spearman";
    size_t cols = 0, lo = (size_t)-1, hi = 0, rated = 0;
    for (size_t i = 0; i < n; i++) {
        if (counts[i] == 0) continue;
        cols = VG_MAX(cols, counts[i]);
        lo = VG_MIN(lo, counts[i]);
        hi = VG_MAX(hi, counts[i]);
        rated += counts[i] >= 2;
    }
    out->columns = cols;
    out->min_ratings = hi ? lo : 0;
    out->max_ratings = hi;
    out->n_items = rated;
    if (cols < 2 || rated < 3) return VG_OK;

    double *a = vg_calloc(rated, sizeof *a), *b = vg_calloc(rated, sizeof *b);
    double *work = vg_calloc(2 * rated, sizeof *work);
    if (!a || !b || !work) {
        vg_free(a);
        vg_free(b);
        vg_free(work);
        return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    }
    double sum = 0;
    size_t used = 0;
    for (size_t j = 0; j < cols; j++) {
        /* Column j against the mean of the other ratings of each item that
         * has a j-th rating and at least one more. */
        size_t m = 0;
        for (size_t i = 0; i < n; i++) {
            if (counts[i] < 2 || counts[i] <= j) continue;
            double total = 0;
            for (size_t k = 0; k < counts[i]; k++) total += ratings[i][k];
            a[m] = ratings[i][j];
            b[m] = (total - ratings[i][j]) / (double)(counts[i] - 1);
            m++;
        }
        double rho = m >= 3 ? vg_stats_spearman(a, b, m, work) : NAN;
        if (isnan(rho)) continue;
        sum += rho;
        used++;
    }
    out->columns_used = used;
    if (used) out->value = sum / (double)used;
    vg_free(a);
    vg_free(b);
    vg_free(work);
    return VG_OK;
}
