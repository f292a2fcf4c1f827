/* similarity_rows.c - the score rows of one vector set on one similarity
 * suite: Spearman, Pearson and Kendall with their intervals.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>

#include "../common/alloc.h"
#include "../stats/resample.h"
#include "eval_impl.h"
#include "vecgauge/stats.h"

_Static_assert((int)VG_CORR_SPEARMAN == (int)VG_METRIC_SPEARMAN &&
                   (int)VG_CORR_PEARSON == (int)VG_METRIC_PEARSON &&
                   (int)VG_CORR_KENDALL == (int)VG_METRIC_KENDALL,
               "vg_corr follows vg_metric");

/* Fill the value and intervals of row from estimate e. */
static void set_row(vg_score_row *row, const vg_corr_estimate *e, size_t replicates) {
    row->value = e->value;
    row->n_ci = 0;
    if (replicates > 0) {
        vg_row_add_interval(row, e->boot.bca_low, e->boot.bca_high, "bca");
        row->ci[row->n_ci - 1].replicates = e->boot.replicates;
        vg_row_add_interval(row, e->boot.pct_low, e->boot.pct_high, "percentile");
        row->ci[row->n_ci - 1].replicates = e->boot.replicates;
    }
    vg_row_add_interval(row, e->fisher_low, e->fisher_high, "fisher-z");
}

vg_status vg_eval_similarity_rows(vg_results *r, size_t *cap, size_t set, size_t suite,
                                  const vg_eval_options *opt, vg_error *err) {
    const vg_suite *s = r->suites[suite];
    const vg_similarity_scores *sc = r->blocks[set * r->n_suites + suite].sim;
    size_t n = s->n_items;
    double *human = vg_calloc(n ? n : 1, sizeof *human);
    double *model = vg_calloc(n ? n : 1, sizeof *model);
    vg_status st = VG_OK;
    if (!human || !model) {
        st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
        goto done;
    }
    /* Pairs not scored are NaN: resampled with the others (so replicate b
     * draws the same pairs for every vector set) but left out of the
     * headline statistics. */
    for (size_t i = 0; i < n; i++) {
        human[i] = s->pairs[i].rating;
        model[i] = sc->status[i] == VG_ITEM_SCORED ? sc->cosine[i] : NAN;
    }
    vg_corr_boot_options bo;
    vg_corr_boot_options_init(&bo);
    bo.replicates = opt->bootstrap;
    bo.seed = opt->seed;
    bo.stream = vg_resample_stream(s->id, "");
    bo.level = opt->ci;
    bo.threads = opt->score.threads;
    vg_corr_estimate covered[VG_CORR_COUNT], all[VG_CORR_COUNT];
    st = vg_stats_corr_bootstrap(human, model, n, &bo, covered, NULL, NULL, err);
    if (st != VG_OK) goto done;
    if (sc->n_used < n) {
        /* Every pair, the uncovered ones given similarity 0 (common
         * practice), so that a set cannot gain by knowing fewer words. */
        for (size_t i = 0; i < n; i++)
            if (isnan(model[i])) model[i] = 0.0;
        st = vg_stats_corr_bootstrap(human, model, n, &bo, all, NULL, NULL, err);
        if (st != VG_OK) goto done;
    } else {
        for (int k = 0; k < VG_CORR_COUNT; k++) all[k] = covered[k];
    }

    for (int k = 0; k < VG_CORR_COUNT; k++) {
        vg_score_row row = {.set = set, .suite = suite, .subset = "",
                            .task = VG_TASK_SIMILARITY, .metric = (vg_metric)k,
                            .n_items = n, .n_used = sc->n_used};
        set_row(&row, &covered[k], opt->bootstrap);
        if (vg_results_add_row(r, cap, &row) != 0) goto oom;
        row.all_items = 1;
        set_row(&row, &all[k], opt->bootstrap);
        if (vg_results_add_row(r, cap, &row) != 0) goto oom;
    }
    goto done;
oom:
    st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
done:
    vg_free(human);
    vg_free(model);
    return st;
}
