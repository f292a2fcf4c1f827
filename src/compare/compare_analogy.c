/* compare_analogy.c - paired comparisons of analogy accuracy on one suite.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The test is the pair bootstrap (vg_pairboot_sums; Owen 2007, the
 * pigeonhole bootstrap over each section's word pairs) run on both sets
 * at once: replicate r gives every question one weight, the same for
 * every set, drawn on the suite's stream exactly as the per-set
 * intervals of a run are (vg_eval_analogy_rows), so the difference is
 * taken under the same pair draws. Questions that share a pair are not
 * independent trials, so McNemar's exact test, which counts them as such,
 * is only shown beside it.
 */
#include <gsl/gsl_cdf.h>
#include <gsl/gsl_statistics_double.h>
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "../stats/resample.h"
#include "../stats/stats_impl.h"
#include "compare_impl.h"
#include "vecgauge/paired.h"
#include "vecgauge/stats.h"

/* Percentile interval (vg_stats_percentile_interval) and standard
 * deviation of the finite values of x[0..n), which is reordered. Returns
 * the number of finite values. */
static size_t summarise(double *x, size_t n, double level, double *low, double *high, double *sd) {
    size_t m = vg_stats_percentile_interval(x, n, level, low, high);
    *sd = m > 1 ? gsl_stats_sd(x, 1, m) : NAN;
    return m;
}

/* The design of suite s's questions. Without pair identities every
 * question has pairs of its own: the bootstrap over questions. */
static vg_status analogy_design(const vg_paired_suite *s, vg_pairboot_design **out,
                                vg_error *err) {
    size_t n = s->n_items, n1 = n ? n : 1;
    int pairs = s->row_pair && s->col_pair;
    uint32_t *z = vg_calloc(n1, sizeof *z), *r = NULL, *c = NULL;
    if (!pairs) {
        r = vg_calloc(n1, sizeof *r);
        c = vg_calloc(n1, sizeof *c);
    }
    vg_status st;
    if (!z || (!pairs && (!r || !c))) {
        st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    } else {
        for (size_t i = 0; !pairs && i < n; i++) r[i] = c[i] = (uint32_t)i;
        int strata = pairs && s->stratum;
        st = vg_pairboot_design_new(strata ? s->stratum : z, strata ? s->n_strata : 1,
                                    pairs ? s->row_pair : r, pairs ? s->col_pair : c, n, out,
                                    err);
    }
    vg_free(z);
    vg_free(r);
    vg_free(c);
    return st;
}

/* One method on one suite. */
static vg_status compare_method(vg_cmp_build *b, const vg_paired_items *in, size_t k,
                                vg_method m, const vg_pairboot_design *d, vg_error *err) {
    const vg_paired_suite *s = &in->suites[k];
    const vg_compare_options *o = &b->c->options;
    size_t n = s->n_items, ns = in->n_sets, B = o->replicates, n1 = n ? n : 1;
    int as_is = o->items == VG_COMPARE_AS_IS;
    /* A method some compared set lacks is not compared on this suite. */
    for (size_t j = 0; j < ns; j++)
        if (b->in_pair[j] && !s->correct[j * VG_METHOD_COUNT + m]) return VG_OK;

    vg_status st = VG_OK;
    const signed char **x = vg_calloc(ns, sizeof *x);
    unsigned char **u = vg_calloc(ns, sizeof *u);
    unsigned char **cols = vg_calloc(2 * ns, sizeof *cols); /* right, used per set */
    size_t *col_of = vg_calloc(ns, sizeof *col_of);
    unsigned char *common = vg_calloc(n1, 1);
    size_t *used = vg_calloc(ns, sizeof *used), *right = vg_calloc(ns, sizeof *right);
    double *acc = vg_calloc(ns, sizeof *acc);
    size_t S = vg_pairboot_design_strata(d);
    double *sums = NULL, *tot = NULL, *tmp = vg_calloc(B ? B : 1, sizeof *tmp);
    double *d_r = vg_calloc(B ? B : 1, sizeof *d_r);
    if (!x || !u || !cols || !col_of || !common || !used || !right || !acc || !tmp || !d_r)
        goto oom;

    size_t n_common = 0;
    for (size_t i = 0; i < n; i++) {
        int all = 1;
        for (size_t j = 0; j < ns && all; j++)
            if (b->in_pair[j]) all = s->correct[j * VG_METHOD_COUNT + m][i] >= 0;
        common[i] = (unsigned char)all;
        n_common += all;
    }
    size_t kc = 0;
    for (size_t j = 0; j < ns; j++) {
        const signed char *cj = s->correct[j * VG_METHOD_COUNT + m];
        size_t cov = 0;
        for (size_t i = 0; cj && i < n; i++) cov += cj[i] >= 0;
        /* Coverage is reported for the headline (first compared) method. */
        if (b->c->n_scores == 0 || b->c->scores[b->c->n_scores - 1].suite != k)
            b->c->covered[k * ns + j] = cov;
        if (!b->in_pair[j]) continue;
        x[j] = cj;
        col_of[j] = kc;
        if (!(u[j] = vg_calloc(n1, 1)) || !(cols[kc] = vg_calloc(n1, 1)) ||
            !(cols[kc + 1] = vg_calloc(n1, 1)))
            goto oom;
        for (size_t i = 0; i < n; i++) {
            u[j][i] = (unsigned char)(cj[i] >= 0 && (as_is || common[i]));
            used[j] += u[j][i];
            right[j] += u[j][i] && cj[i] == 1;
            cols[kc][i] = (unsigned char)(u[j][i] && cj[i] == 1);
            cols[kc + 1][i] = u[j][i];
        }
        acc[j] = used[j] ? (double)right[j] / (double)used[j] : NAN;
        kc += 2;
    }
    if (B > 0 && kc > 0) {
        sums = vg_calloc(B * S * kc, sizeof *sums);
        tot = vg_calloc(B * kc, sizeof *tot);
        if (!sums || !tot) goto oom;
        vg_pairboot_options po = {.replicates = B, .seed = o->seed,
                                  .stream = vg_resample_stream(s->id, ""), .threads = o->threads};
        if ((st = vg_pairboot_sums(d, &po, (const unsigned char *const *)cols, kc, sums, err)) !=
            VG_OK)
            goto done;
        /* The whole suite's totals per replicate: the sum over its
         * sections. */
        for (size_t r = 0; r < B; r++)
            for (size_t t = 0; t < S; t++)
                for (size_t j = 0; j < kc; j++) tot[r * kc + j] += sums[(r * S + t) * kc + j];
    }
    const char *metric = vg_method_name(m);
    for (size_t j = 0; j < ns; j++) {
        if (!b->in_pair[j]) continue;
        vg_compared_score sc = {.suite = k, .set = j, .metric = metric, .value = acc[j],
                                .n = used[j]};
        sc.low = sc.high = NAN;
        sc.interval = "";
        if (tot) {
            size_t c0 = col_of[j];
            for (size_t r = 0; r < B; r++) {
                double ur = tot[r * kc + c0 + 1];
                tmp[r] = ur > 0 ? tot[r * kc + c0] / ur : NAN;
            }
            double sd;
            if (summarise(tmp, B, o->level, &sc.low, &sc.high, &sd) > 0)
                sc.interval = "pair-bootstrap";
        }
        if (vg_cmp_add_score(b, &sc) != 0) goto oom;
    }

    for (size_t p = 0; p < b->n_pairs; p++) {
        if (!vg_cmp_pair_on(b, p, k)) continue;
        size_t a = b->pairs[2 * p], c2 = b->pairs[2 * p + 1];
        vg_comparison row = vg_cmp_row_init(k, a, c2, VG_TASK_ANALOGY, metric, n);
        row.n_a = used[a];
        row.n_b = used[c2];
        row.score_a = acc[a];
        row.score_b = acc[c2];
        /* On the same questions the difference is (right_a - right_b) /
         * used, formed so, here and in every replicate: two
         * quotients subtracted differ in the last bit from the same
         * difference taken once, and would decide ties by rounding
         * (issue 30). */
        if (used[a] == used[c2])
            row.diff = used[a] ? ((double)right[a] - (double)right[c2]) / (double)used[a] : NAN;
        else
            row.diff = acc[a] - acc[c2];
        size_t either = 0;
        /* McNemar on the questions both sets answered (in common mode,
         * the common questions). */
        for (size_t i = 0; i < n; i++) {
            either += u[a][i] || u[c2][i];
            if (!u[a][i] || !u[c2][i]) continue;
            row.only_a += x[a][i] == 1 && x[c2][i] != 1;
            row.only_b += x[c2][i] == 1 && x[a][i] != 1;
        }
        row.n_compared = as_is ? either : n_common;
        row.n_dropped = as_is ? 0 : n - n_common;
        row.p_mcnemar = vg_paired_mcnemar_exact(row.only_a, row.only_b).p_value;
        if (tot) {
            size_t ca = col_of[a], cb = col_of[c2];
            for (size_t r = 0; r < B; r++) {
                const double *t = tot + r * kc;
                double ra = t[ca], ua = t[ca + 1], rb = t[cb], ub = t[cb + 1];
                if (!(ua > 0) || !(ub > 0))
                    d_r[r] = NAN;
                else if (ua == ub)
                    d_r[r] = (ra - rb) / ua;
                else
                    d_r[r] = ra / ua - rb / ub;
            }
            row.p_bootstrap = vg_cmp_boot_p(d_r, B, row.diff);
            double sd;
            row.replicates = summarise(d_r, B, o->level, &row.diff_low, &row.diff_high, &sd);
            row.interval = row.replicates ? "pair-bootstrap" : "";
            /* The test: the difference over the pair bootstrap's standard
             * error, against the normal (a Wald test whose variance is
             * the bootstrap's, Efron and Tibshirani 1993, ch. 16; from
             * memory). Its p is not held at 1 / (B + 1), so Holm's
             * adjustment over many suites can still reject. */
            row.test = "pair-bootstrap";
            if (isnan(row.diff) || isnan(sd))
                row.p_value = NAN;
            else if (sd > 0)
                row.p_value = 2 * gsl_cdf_ugaussian_Q(fabs(row.diff) / sd);
            else
                row.p_value = row.diff == 0 ? 1.0 : NAN;
        } else {
            /* Without resamples only McNemar's test is left, and it covers
             * the questions both sets answered: in as-is mode other
             * questions than the scores, so no test. */
            row.test = as_is ? "" : "mcnemar-exact";
            row.p_value = as_is ? NAN : row.p_mcnemar;
        }
        if (isnan(row.diff)) {
            /* No question to compare on: no test. */
            row.test = "";
            row.p_value = NAN;
        }
        if (vg_cmp_add_row(b, &row) != 0) goto oom;
    }
    goto done;
oom:
    st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
done:
    for (size_t j = 0; u && j < ns; j++) vg_free(u[j]);
    for (size_t j = 0; cols && j < 2 * ns; j++) vg_free(cols[j]);
    vg_free(x);
    vg_free(u);
    vg_free(cols);
    vg_free(col_of);
    vg_free(common);
    vg_free(used);
    vg_free(right);
    vg_free(acc);
    vg_free(sums);
    vg_free(tot);
    vg_free(tmp);
    vg_free(d_r);
    return st;
}

vg_status vg_cmp_analogy(vg_cmp_build *b, const vg_paired_items *in, size_t k, vg_error *err) {
    unsigned methods = b->c->options.methods ? b->c->options.methods : 1u << VG_METHOD_3COSADD;
    vg_pairboot_design *d = NULL;
    vg_status st = analogy_design(&in->suites[k], &d, err);
    for (int m = 0; st == VG_OK && m < VG_METHOD_COUNT; m++) {
        if (!(methods & (1u << m))) continue;
        st = compare_method(b, in, k, (vg_method)m, d, err);
    }
    vg_pairboot_design_free(d);
    return st;
}
