/* compare_similarity.c - paired comparisons of Spearman's rho on one suite.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Each set's rho is bootstrapped once with vg_stats_corr_bootstrap on the
 * suite's own resampling stream; because replicate r draws the same items
 * for every set, subtracting two sets' replicates gives the paired
 * bootstrap of the difference, and subtracting their jackknife values the
 * jackknife of the difference (for the BCa acceleration).
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "../stats/resample.h"
#include "compare_impl.h"
#include "vecgauge/paired.h"
#include "vecgauge/stats.h"

typedef struct set_boot {
    double *y;          /* n: the cosines this set is scored on, NaN elsewhere */
    double *reps;       /* 3 * B (vg_corr order); Spearman's are the first B */
    double *jack;       /* 3 * n */
    vg_corr_estimate est[VG_CORR_COUNT];
} set_boot;

/* Spearman's rho of x and y over the items where both are defined.
 * cx, cy, work: scratch of n, n and 2 n doubles. *m receives the items. */
static double rho_where_both(const double *x, const double *y, size_t n, double *cx, double *cy,
                             double *work, size_t *m) {
    size_t k = 0;
    for (size_t i = 0; i < n; i++)
        if (!isnan(x[i]) && !isnan(y[i])) {
            cx[k] = x[i];
            cy[k] = y[i];
            k++;
        }
    *m = k;
    return vg_stats_spearman(cx, cy, k, work);
}

vg_status vg_cmp_similarity(vg_cmp_build *b, const vg_paired_items *in, size_t k,
                            vg_error *err) {
    const vg_paired_suite *s = &in->suites[k];
    const vg_compare_options *o = &b->c->options;
    size_t n = s->n_items, ns = in->n_sets, B = o->replicates;
    size_t n1 = n ? n : 1;
    vg_status st = VG_OK;
    set_boot *sb = vg_calloc(ns, sizeof *sb);
    unsigned char *common = vg_calloc(n1, 1);
    double *d = vg_calloc(B ? B : 1, sizeof *d);
    double *dj = vg_calloc(n1, sizeof *dj);
    double *ca = vg_calloc(n1, sizeof *ca), *cb = vg_calloc(n1, sizeof *cb);
    double *cx = vg_calloc(n1, sizeof *cx), *cy = vg_calloc(n1, sizeof *cy);
    double *work = vg_calloc(2 * n1, sizeof *work);
    if (!sb || !common || !d || !dj || !ca || !cb || !cx || !cy || !work) goto oom;

    /* The common items: every set in a pair has a cosine. */
    size_t n_common = 0;
    for (size_t i = 0; i < n; i++) {
        int all = !isnan(s->rating[i]);
        for (size_t j = 0; j < ns && all; j++)
            if (b->in_pair[j]) all = !isnan(s->cosine[j][i]);
        common[i] = (unsigned char)all;
        n_common += all;
    }
    int as_is = o->items == VG_COMPARE_AS_IS;
    for (size_t j = 0; j < ns; j++) {
        size_t cov = 0;
        for (size_t i = 0; i < n; i++) cov += !isnan(s->rating[i]) && !isnan(s->cosine[j][i]);
        b->c->covered[k * ns + j] = cov;
    }

    vg_corr_boot_options bo;
    vg_corr_boot_options_init(&bo);
    bo.replicates = B;
    bo.seed = o->seed;
    bo.stream = vg_resample_stream(s->id, "");
    bo.level = o->level;
    bo.threads = o->threads;
    bo.kinds = 1u << VG_CORR_SPEARMAN;
    for (size_t j = 0; j < ns; j++) {
        if (!b->in_pair[j]) continue;
        set_boot *q = &sb[j];
        q->y = vg_calloc(n1, sizeof *q->y);
        q->reps = vg_calloc(3 * (B ? B : 1), sizeof *q->reps);
        q->jack = vg_calloc(3 * n1, sizeof *q->jack);
        if (!q->y || !q->reps || !q->jack) goto oom;
        for (size_t i = 0; i < n; i++)
            q->y[i] = (as_is || common[i]) ? s->cosine[j][i] : NAN;
        /* The jackknife is needed only for BCa. */
        st = vg_stats_corr_bootstrap(s->rating, q->y, n, &bo, q->est, q->reps,
                                     B ? q->jack : NULL, err);
        if (st != VG_OK) goto done;
        const vg_corr_estimate *e = &q->est[VG_CORR_SPEARMAN];
        vg_compared_score sc = {.suite = k, .set = j, .metric = "spearman", .value = e->value,
                                .n = e->n};
        vg_cmp_interval(&e->boot, &sc.low, &sc.high, &sc.interval);
        if (vg_cmp_add_score(b, &sc) != 0) goto oom;
    }

    for (size_t p = 0; p < b->n_pairs; p++) {
        if (!vg_cmp_pair_on(b, p, k)) continue;
        size_t a = b->pairs[2 * p], c2 = b->pairs[2 * p + 1];
        const set_boot *qa = &sb[a], *qb = &sb[c2];
        vg_comparison row = vg_cmp_row_init(k, a, c2, VG_TASK_SIMILARITY, "spearman", n);
        row.n_a = qa->est[VG_CORR_SPEARMAN].n;
        row.n_b = qb->est[VG_CORR_SPEARMAN].n;
        row.score_a = qa->est[VG_CORR_SPEARMAN].value;
        row.score_b = qb->est[VG_CORR_SPEARMAN].value;
        row.diff = row.score_a - row.score_b;
        if (as_is) {
            size_t either = 0;
            for (size_t i = 0; i < n; i++)
                either += !isnan(qa->y[i]) || !isnan(qb->y[i]);
            row.n_compared = either;
        } else {
            row.n_compared = n_common;
            row.n_dropped = n - n_common;
        }
        if (B > 0) {
            for (size_t r = 0; r < B; r++) d[r] = qa->reps[r] - qb->reps[r];
            for (size_t i = 0; i < n; i++) dj[i] = qa->jack[i] - qb->jack[i];
            row.p_bootstrap = vg_cmp_boot_p(d, B, row.diff);
            vg_boot_summary bs;
            vg_stats_boot_summary(d, B, row.diff, dj, n, o->level, &bs);
            row.replicates = bs.replicates;
            vg_cmp_interval(&bs, &row.diff_low, &row.diff_high, &row.interval);
        }
        /* Steiger's Z1* on one set of items for both correlations: the
         * common items, or (as-is) the items both sets cover. */
        size_t m;
        row.r_ab = rho_where_both(qa->y, qb->y, n, cx, cy, work, &m);
        double rha = row.score_a, rhb = row.score_b;
        if (as_is) {
            size_t m2;
            for (size_t i = 0; i < n; i++) {
                ca[i] = isnan(qb->y[i]) ? NAN : qa->y[i];
                cb[i] = isnan(qa->y[i]) ? NAN : qb->y[i];
            }
            rha = rho_where_both(s->rating, ca, n, cx, cy, work, &m2);
            rhb = rho_where_both(s->rating, cb, n, cx, cy, work, &m2);
        }
        vg_test_result z = vg_paired_steiger_z_spearman(rha, rhb, row.r_ab, m);
        row.steiger_z = z.statistic;
        row.p_steiger = z.p_value;
        /* The test: Steiger's Z1* with Spearman's variance of Fisher's z
         * (Bonett and Wright 2000) on the common items (an analytic p,
         * so Holm over many suites and pairs is not limited by the
         * 1 / (B + 1) floor of a bootstrap p); in as-is mode the two
         * scores stand on different items and only the bootstrap tests
         * their difference. */
        if (!as_is) {
            row.test = "steiger-z1-bw";
            row.p_value = row.p_steiger;
        } else if (B > 0) {
            row.test = "bootstrap";
            row.p_value = row.p_bootstrap;
        }
        if (vg_cmp_add_row(b, &row) != 0) goto oom;
    }
    goto done;
oom:
    st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
done:
    for (size_t j = 0; sb && j < ns; j++) {
        vg_free(sb[j].y);
        vg_free(sb[j].reps);
        vg_free(sb[j].jack);
    }
    vg_free(sb);
    vg_free(common);
    vg_free(d);
    vg_free(dj);
    vg_free(ca);
    vg_free(cb);
    vg_free(cx);
    vg_free(cy);
    vg_free(work);
    return st;
}
