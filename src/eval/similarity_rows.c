/* similarity_rows.c - the score rows of one vector set on one similarity
 * suite.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>

#include "../common/alloc.h"
#include "eval_impl.h"
#include "vecgauge/stats.h"

vg_status vg_eval_similarity_rows(vg_results *r, size_t *cap, size_t set, size_t suite,
                                  const vg_eval_options *opt, vg_error *err) {
    (void)opt;
    const vg_suite *s = r->suites[suite];
    const vg_similarity_scores *sc = r->blocks[set * r->n_suites + suite].sim;
    size_t n = s->n_items;
    double *human = vg_calloc(n, sizeof *human);
    double *model = vg_calloc(n, sizeof *model);
    double *work = vg_calloc(2 * n, sizeof *work);
    vg_status st = VG_OK;
    if (!human || !model || !work) {
        st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
        goto done;
    }
    /* Covered pairs only: the headline. */
    size_t m = 0;
    for (size_t i = 0; i < n; i++) {
        if (sc->status[i] != VG_ITEM_SCORED) continue;
        human[m] = s->pairs[i].rating;
        model[m] = sc->cosine[i];
        m++;
    }
    vg_score_row row = {.set = set, .suite = suite, .subset = "", .task = VG_TASK_SIMILARITY,
                        .metric = VG_METRIC_SPEARMAN, .n_items = n, .n_used = m};
    row.value = vg_stats_spearman(human, model, m, work);
    if (vg_results_add_row(r, cap, &row) != 0) goto oom;

    /* Every pair, the uncovered ones given similarity 0 (common practice),
     * so that a set cannot gain by knowing fewer words. */
    for (size_t i = 0; i < n; i++) {
        human[i] = s->pairs[i].rating;
        model[i] = sc->status[i] == VG_ITEM_SCORED ? sc->cosine[i] : 0.0;
    }
    row.all_items = 1;
    row.n_used = m;
    row.value = vg_stats_spearman(human, model, n, work);
    if (vg_results_add_row(r, cap, &row) != 0) goto oom;
    goto done;
oom:
    st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
done:
    vg_free(human);
    vg_free(model);
    vg_free(work);
    return st;
}
