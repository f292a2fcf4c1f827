/* compare_analogy.c - paired comparisons of analogy accuracy on one suite.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Replicate r draws the items of the suite's resampling stream exactly
 * as the correlation bootstrap does (vg_resample_seed, vg_resample_counts
 * on (seed, suite id, r)), so the similarity and analogy comparisons of a
 * run, and every set, share their resamples. Each replicate's accuracy is
 * a weighted mean of 0/1 values, computed for every set from one draw.
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/threads.h"
#include "../stats/resample.h"
#include "compare_impl.h"
#include "vecgauge/paired.h"
#include "vecgauge/stats.h"

typedef struct ana_job {
    size_t n, B, ns;
    uint64_t seed, stream;
    const signed char *const *x;   /* ns: correctness, NULL for sets not compared */
    const unsigned char *const *u; /* ns: item used for that set */
    double *reps;                  /* ns * B */
    uint32_t **counts;             /* per thread, n */
    gsl_rng **rng;                 /* per thread */
} ana_job;

/* Thread t: replicates [B t / T, B (t + 1) / T). */
static void ana_worker(void *ctx, unsigned t, unsigned T) {
    ana_job *J = ctx;
    uint32_t *c = J->counts[t];
    for (size_t r = J->B * t / T; r < J->B * (t + 1) / T; r++) {
        memset(c, 0, J->n * sizeof *c);
        vg_resample_seed(J->rng[t], J->seed, J->stream, r);
        vg_resample_counts(J->rng[t], J->n, c);
        for (size_t s = 0; s < J->ns; s++) {
            if (!J->x[s]) continue;
            uint64_t right = 0, total = 0;
            for (size_t i = 0; i < J->n; i++)
                if (J->u[s][i]) {
                    total += c[i];
                    right += J->x[s][i] == 1 ? c[i] : 0;
                }
            J->reps[s * J->B + r] = total ? (double)right / (double)total : NAN;
        }
    }
}

/* The bootstrap replicates of every compared set's accuracy. -1 when out
 * of memory. */
static int ana_bootstrap(ana_job *J, unsigned threads) {
    unsigned T = vg_threads_resolve(threads);
    if (T > J->B) T = (unsigned)J->B;
    J->counts = vg_calloc(T, sizeof *J->counts);
    J->rng = vg_calloc(T, sizeof *J->rng);
    int rc = J->counts && J->rng ? 0 : -1;
    for (unsigned t = 0; rc == 0 && t < T; t++) {
        J->counts[t] = vg_calloc(J->n ? J->n : 1, sizeof **J->counts);
        J->rng[t] = vg_resample_rng_alloc();
        if (!J->counts[t] || !J->rng[t]) rc = -1;
    }
    if (rc == 0) vg_parallel(T, ana_worker, J);
    for (unsigned t = 0; J->counts && J->rng && t < T; t++) {
        vg_free(J->counts[t]);
        if (J->rng[t]) gsl_rng_free(J->rng[t]);
    }
    vg_free(J->counts);
    vg_free(J->rng);
    J->counts = NULL;
    J->rng = NULL;
    return rc;
}

/* One method on one suite. */
static vg_status compare_method(vg_cmp_build *b, const vg_paired_items *in, size_t k,
                                vg_method m, vg_error *err) {
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
    unsigned char *common = vg_calloc(n1, 1);
    double *acc = vg_calloc(ns, sizeof *acc);
    double *reps = vg_calloc(ns * (B ? B : 1), sizeof *reps);
    double *jack = vg_calloc(ns * n1, sizeof *jack);
    size_t *used = vg_calloc(ns, sizeof *used);
    double *d = vg_calloc(B ? B : 1, sizeof *d), *dj = vg_calloc(n1, sizeof *dj);
    double *tmp = vg_calloc(B ? B : 1, sizeof *tmp);
    if (!x || !u || !common || !acc || !reps || !jack || !used || !d || !dj || !tmp) goto oom;

    size_t n_common = 0;
    for (size_t i = 0; i < n; i++) {
        int all = 1;
        for (size_t j = 0; j < ns && all; j++)
            if (b->in_pair[j]) all = s->correct[j * VG_METHOD_COUNT + m][i] >= 0;
        common[i] = (unsigned char)all;
        n_common += all;
    }
    for (size_t j = 0; j < ns; j++) {
        const signed char *cj = s->correct[j * VG_METHOD_COUNT + m];
        size_t cov = 0;
        for (size_t i = 0; cj && i < n; i++) cov += cj[i] >= 0;
        /* Coverage is reported for the headline (first compared) method. */
        if (b->c->n_scores == 0 || b->c->scores[b->c->n_scores - 1].suite != k)
            b->c->covered[k * ns + j] = cov;
        if (!b->in_pair[j]) continue;
        x[j] = s->correct[j * VG_METHOD_COUNT + m];
        if (!(u[j] = vg_calloc(n1, 1))) goto oom;
        size_t right = 0;
        for (size_t i = 0; i < n; i++) {
            u[j][i] = (unsigned char)(x[j][i] >= 0 && (as_is || common[i]));
            used[j] += u[j][i];
            right += u[j][i] && x[j][i] == 1;
        }
        acc[j] = used[j] ? (double)right / (double)used[j] : NAN;
        /* Jackknife: leaving out a used item removes its 0/1 from the
         * mean; leaving out an unused one changes nothing. */
        for (size_t i = 0; i < n; i++) {
            double v = acc[j];
            if (u[j][i])
                v = used[j] > 1 ? ((double)right - (x[j][i] == 1)) / (double)(used[j] - 1) : NAN;
            jack[j * n + i] = v;
        }
    }
    if (B > 0) {
        ana_job J = {.n = n, .B = B, .ns = ns, .seed = o->seed,
                     .stream = vg_resample_stream(s->id, ""),
                     .x = x, .u = (const unsigned char *const *)u, .reps = reps};
        if (ana_bootstrap(&J, o->threads) != 0) goto oom;
    }
    const char *metric = vg_method_name(m);
    for (size_t j = 0; j < ns; j++) {
        if (!b->in_pair[j]) continue;
        vg_compared_score sc = {.suite = k, .set = j, .metric = metric, .value = acc[j],
                                .n = used[j]};
        sc.low = sc.high = NAN;
        sc.interval = "";
        if (B > 0) {
            memcpy(tmp, reps + j * B, B * sizeof *tmp);
            vg_boot_summary bs;
            vg_stats_boot_summary(tmp, B, acc[j], jack + j * n, n, o->level, &bs);
            vg_cmp_interval(&bs, &sc.low, &sc.high, &sc.interval);
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
        if (B > 0) {
            for (size_t r = 0; r < B; r++) d[r] = reps[a * B + r] - reps[c2 * B + r];
            for (size_t i = 0; i < n; i++) dj[i] = jack[a * n + i] - jack[c2 * n + i];
            row.p_bootstrap = vg_cmp_boot_p(d, B, row.diff);
            vg_boot_summary bs;
            vg_stats_boot_summary(d, B, row.diff, dj, n, o->level, &bs);
            row.replicates = bs.replicates;
            vg_cmp_interval(&bs, &row.diff_low, &row.diff_high, &row.interval);
        }
        if (!as_is) {
            row.test = "mcnemar-exact";
            row.p_value = row.p_mcnemar;
        } else if (B > 0) {
            row.test = "bootstrap";
            row.p_value = row.p_bootstrap;
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
    vg_free(x);
    vg_free(u);
    vg_free(common);
    vg_free(acc);
    vg_free(reps);
    vg_free(jack);
    vg_free(used);
    vg_free(d);
    vg_free(dj);
    vg_free(tmp);
    return st;
}

vg_status vg_cmp_analogy(vg_cmp_build *b, const vg_paired_items *in, size_t k, vg_error *err) {
    unsigned methods = b->c->options.methods ? b->c->options.methods : 1u << VG_METHOD_3COSADD;
    for (int m = 0; m < VG_METHOD_COUNT; m++) {
        if (!(methods & (1u << m))) continue;
        vg_status st = compare_method(b, in, k, (vg_method)m, err);
        if (st != VG_OK) return st;
    }
    return VG_OK;
}
