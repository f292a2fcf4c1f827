/* agreement.c - the raters' own agreement on each similarity suite.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "eval_impl.h"
#include "vecgauge/stats.h"

vg_status vg_eval_agreement(vg_results *r, vg_error *err) {
    r->agreement = vg_calloc(r->n_suites ? r->n_suites : 1, sizeof *r->agreement);
    if (!r->agreement) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    for (size_t k = 0; k < r->n_suites; k++) {
        vg_agreement *a = &r->agreement[k];
        a->value = NAN;
        a->method = "loo-spearman";
        const vg_suite *s = r->suites[k];
        if (s->task != VG_TASK_SIMILARITY || s->n_items == 0) continue;
        int any = 0;
        for (size_t i = 0; i < s->n_items && !any; i++) any = s->pairs[i].n_raters > 0;
        if (!any) continue;
        const double **rows = vg_calloc(s->n_items, sizeof *rows);
        size_t *counts = vg_calloc(s->n_items, sizeof *counts);
        vg_status st = VG_OK;
        if (!rows || !counts) {
            st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
        } else {
            for (size_t i = 0; i < s->n_items; i++) {
                rows[i] = s->pairs[i].raters;
                counts[i] = s->pairs[i].n_raters;
            }
            st = vg_stats_agreement_loo(rows, counts, s->n_items, a, err);
        }
        vg_free(rows);
        vg_free(counts);
        if (st != VG_OK) {
            vg_error_prefix(err, "suite %s: ", s->id);
            return st;
        }
    }
    return VG_OK;
}
