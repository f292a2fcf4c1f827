/* test_stats_boot.c - bootstrap intervals, the correlation bootstrap and
 * the raters' agreement.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "vgtest.h"

#include "common/alloc.h"
#include "stats/resample.h"

/* A fixed pseudo-random sequence for test data (xorshift64, Marsaglia
 * 2003); any fixed sequence will do. */
static uint64_t next(uint64_t *s) {
    *s ^= *s << 13;
    *s ^= *s >> 7;
    *s ^= *s << 17;
    return *s;
}

/* Test data: x with many ties (0..9), y = x plus noise rounded to one
 * decimal (some ties), every 11th y NaN (an item not scored). */
static void make_data(double *x, double *y, size_t n, uint64_t seed) {
    uint64_t s = seed;
    for (size_t i = 0; i < n; i++) {
        x[i] = (double)(next(&s) % 10);
        y[i] = round(10 * (x[i] + (double)(next(&s) % 1000) / 150.0)) / 10;
        if (i % 11 == 5) y[i] = NAN;
    }
}

/* boot-1: percentile interval of the replicates 1..100 at level 0.9 is
 * [5.95, 95.05]: linear interpolation at h = 99 * 0.05 and 99 * 0.95
 * (Hyndman and Fan 1996, type 7; numpy.percentile(range(1, 101), [5, 95])
 * gives the same, from memory). With theta = 50.5, half the replicates
 * lie below it, so z0 = 0; symmetric jackknife values give a = 0; then
 * BCa equals the percentile interval (Efron and Tibshirani 1993, 14.3). */
static void test_percentile_and_bca_reduce(void **state) {
    (void)state;
    double reps[100];
    for (int i = 0; i < 100; i++) reps[i] = (double)((i * 37) % 100 + 1); /* 1..100 shuffled */
    const double jack[] = {-2, -1, 0, 1, 2};
    vg_boot_summary s;
    vg_stats_boot_summary(reps, 100, 50.5, jack, 5, 0.9, &s);
    assert_int_equal(s.replicates, 100);
    assert_close(s.pct_low, 5.95, 1e-12, 0);
    assert_close(s.pct_high, 95.05, 1e-12, 0);
    assert_close(s.z0, 0, 1e-15, 0);
    assert_close(s.accel, 0, 1e-15, 0);
    assert_close(s.bca_low, 5.95, 1e-12, 0);
    assert_close(s.bca_high, 95.05, 1e-12, 0);
    /* The replicates come back sorted. */
    for (int i = 1; i < 100; i++) assert_true(reps[i - 1] <= reps[i]);
}

/* boot-2: the acceleration a = sum u^3 / (6 (sum u^2)^1.5), u = mean -
 * jack_i (Efron and Tibshirani 1993, eq. 14.15). By hand for 1, 2, 3, 10:
 * mean 4, u = 3, 2, 1, -6, sum u^2 = 50, sum u^3 = -180, a = -180 / (6 *
 * 50^1.5) = -0.0848528137... Equal values give 0; NaN gives NaN. */
static void test_acceleration(void **state) {
    (void)state;
    const double j1[] = {1, 2, 3, 10};
    assert_close(vg_stats_bca_acceleration(j1, 4), -180.0 / (6.0 * pow(50.0, 1.5)), 1e-15, 0);
    assert_close(vg_stats_bca_acceleration(j1, 4), -0.084852813742385702, 1e-15, 0);
    const double j2[] = {0.5, 0.5, 0.5};
    assert_close(vg_stats_bca_acceleration(j2, 3), 0, 0, 0);
    const double j3[] = {0.5, NAN, 0.5};
    assert_true(isnan(vg_stats_bca_acceleration(j3, 3)));
}

/* boot-3: BCa by its formula on a case worked by hand: replicates
 * 1..1000, theta = 400.5 gives z0 = Phi^-1(0.4); with a = -0.0848528
 * (boot-2's jackknife) and level 0.8 (z = -+1.2815516), alpha1 =
 * Phi(z0 + (z0 + z) / (1 - a (z0 + z))). The endpoints are the type-7
 * quantiles at alpha1, alpha2. Phi and its inverse are GSL's here, so this
 * checks the assembly of the formula (Efron 1987, eq. 2.3); the e2e tests
 * check it against scipy. Undefined cases: every replicate above theta
 * (z0 infinite) and NaN replicates left out. */
static void test_bca_formula(void **state) {
    (void)state;
    enum { B = 1000 };
    double reps[B];
    for (int i = 0; i < B; i++) reps[i] = (double)(B - i);
    const double jack[] = {1, 2, 3, 10};
    vg_boot_summary s;
    vg_stats_boot_summary(reps, B, 400.5, jack, 4, 0.8, &s);
    double z0 = -0.25334710313579978; /* Phi^-1(0.4), from memory; checked below */
    assert_close(0.5 * erfc(-z0 / sqrt(2.0)), 0.4, 1e-15, 0);
    assert_close(s.z0, z0, 1e-12, 0);
    double a = -180.0 / (6.0 * pow(50.0, 1.5)), z = 1.2815515655446004; /* Phi^-1(0.9) */
    double p1 = 0.5 * erfc(-(z0 + (z0 - z) / (1 - a * (z0 - z))) / sqrt(2.0));
    double p2 = 0.5 * erfc(-(z0 + (z0 + z) / (1 - a * (z0 + z))) / sqrt(2.0));
    /* type-7 quantile of 1..B at p: 1 + (B - 1) p */
    assert_close(s.bca_low, 1 + (B - 1) * p1, 1e-9, 0);
    assert_close(s.bca_high, 1 + (B - 1) * p2, 1e-9, 0);

    for (int i = 0; i < B; i++) reps[i] = i % 4 == 0 ? NAN : 100.0 + i;
    vg_stats_boot_summary(reps, B, 50, jack, 4, 0.95, &s);
    assert_int_equal(s.replicates, B - B / 4);
    assert_false(isnan(s.pct_low));
    assert_true(isinf(s.z0));
    assert_true(isnan(s.bca_low) && isnan(s.bca_high));
    vg_stats_boot_summary(reps, 0, 50, jack, 4, 0.95, &s);
    assert_int_equal(s.replicates, 0);
    assert_true(isnan(s.pct_low) && isnan(s.bca_high));
}

/* fisher-1: Fisher-z intervals are symmetric around atanh(r) on the z
 * scale with half-width Phi^-1(0.975) sqrt(c / (n - k)): c = 1.06, k = 3
 * for Spearman and c = 0.437, k = 4 for Kendall (Fieller, Hartley and
 * Pearson 1957), c = 1, k = 3 for Pearson (Fisher 1921);
 * Phi^-1(0.975) = 1.959963984540054 (from memory). Too few items: NaN. */
static void test_fisher(void **state) {
    (void)state;
    const double q = 1.959963984540054;
    const struct { vg_corr k; double c, d; } cases[] = {
        {VG_CORR_SPEARMAN, 1.06, 3}, {VG_CORR_PEARSON, 1.0, 3}, {VG_CORR_KENDALL, 0.437, 4}};
    for (size_t i = 0; i < 3; i++) {
        double lo, hi;
        vg_stats_fisher_interval(cases[i].k, 0.5, 103, 0.95, &lo, &hi);
        assert_close((atanh(lo) + atanh(hi)) / 2, atanh(0.5), 1e-12, 0);
        assert_close((atanh(hi) - atanh(lo)) / 2, q * sqrt(cases[i].c / (103 - cases[i].d)), 1e-12,
                     0);
    }
    double lo, hi;
    vg_stats_fisher_interval(VG_CORR_KENDALL, 0.5, 4, 0.95, &lo, &hi);
    assert_true(isnan(lo) && isnan(hi));
    vg_stats_fisher_interval(VG_CORR_SPEARMAN, NAN, 100, 0.95, &lo, &hi);
    assert_true(isnan(lo) && isnan(hi));
}

/* resample-1: vg_resample_counts makes exactly the draws of
 * vg_resample_draw (GSL's gsl_rng_uniform_int), for sizes that divide the
 * generator's range unevenly and for tiny ones. */
static void test_counts_match_draws(void **state) {
    (void)state;
    const size_t sizes[] = {1, 2, 7, 240, 3000, 65537, 100003};
    gsl_rng *rng = vg_resample_rng_alloc();
    assert_non_null(rng);
    for (size_t t = 0; t < sizeof sizes / sizeof *sizes; t++) {
        size_t n = sizes[t];
        size_t *idx = malloc(n * sizeof *idx);
        uint32_t *a = calloc(n, sizeof *a), *b = calloc(n, sizeof *b);
        assert_true(idx && a && b);
        for (uint64_t r = 0; r < 5; r++) {
            memset(a, 0, n * sizeof *a);
            memset(b, 0, n * sizeof *b);
            vg_resample_seed(rng, 99, 1234, r);
            vg_resample_draw(rng, n, idx);
            for (size_t i = 0; i < n; i++) a[idx[i]]++;
            vg_resample_seed(rng, 99, 1234, r);
            vg_resample_counts(rng, n, b);
            assert_memory_equal(a, b, n * sizeof *a);
        }
        free(idx);
        free(a);
        free(b);
    }
    gsl_rng_free(rng);
}

/* corrboot-1: every replicate equals the statistics computed directly
 * (GSL's Spearman and Pearson, Knight's Kendall) on the resample spelled
 * out from vg_resample_draw's indices, keeping the drawn items with a
 * defined y; every jackknife value equals them on the data without item
 * i. Ties in both variables and unscored items included. This is the
 * O(n) re-ranking checked against plain re-ranking. */
static void check_replicates(const double *x, const double *y, size_t N);

/* Equal to 1e-12, or both NaN (an undefined statistic). */
#define assert_same(got, want)                                              \
    do {                                                                    \
        double g2_ = (got), w2_ = (want);                                   \
        if (!(isnan(g2_) && isnan(w2_))) assert_close(g2_, w2_, 1e-12, 0);  \
    } while (0)

static void test_replicates_equal_direct(void **state) {
    (void)state;
    double x[120], y[120], xs[120], ys[120];
    make_data(x, y, 120, 7);
    check_replicates(x, y, 120);
    /* Roles swapped: x now has more distinct values than y, so Kendall's
     * tree goes over the other variable. */
    make_data(xs, ys, 120, 8);
    for (size_t i = 0; i < 120; i++) {
        x[i] = isnan(ys[i]) ? ys[(i + 1) % 120] : ys[i];
        y[i] = i % 13 == 2 ? NAN : xs[i];
    }
    check_replicates(x, y, 120);
}

/* corrboot-4: as corrboot-1 on tiny suites (2 to 14 items) with three x
 * values and two y values, some unscored: many resamples are constant in
 * a variable or have fewer than 2 scored items, and those must come out
 * NaN exactly where the direct computation is undefined. */
static void test_replicates_tiny(void **state) {
    (void)state;
    uint64_t s = 4242;
    for (size_t n = 2; n <= 14; n++) {
        double x[14], y[14];
        for (size_t i = 0; i < n; i++) {
            x[i] = (double)(next(&s) % 3);
            uint64_t v = next(&s) % 5;
            y[i] = v == 4 ? NAN : (double)(v % 2);
        }
        check_replicates(x, y, n);
    }
}

static void check_replicates(const double *x, const double *y, size_t N) {
    enum { B = 300, NMAX = 120 };
    vg_corr_boot_options o;
    vg_corr_boot_options_init(&o);
    o.replicates = B;
    o.seed = 5;
    o.stream = vg_resample_stream("suite", "");
    o.threads = 2;
    vg_corr_estimate e[VG_CORR_COUNT];
    double *reps = malloc(3 * B * sizeof *reps), *jack = malloc(3 * N * sizeof *jack);
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_stats_corr_bootstrap(x, y, N, &o, e, reps, jack, &err), &err);
    gsl_rng *rng = vg_resample_rng_alloc();
    size_t idx[NMAX], iw[2 * NMAX];
    double rx[NMAX], ry[NMAX], dw[2 * NMAX];
    for (size_t r = 0; r < B; r++) {
        vg_resample_seed(rng, o.seed, o.stream, r);
        vg_resample_draw(rng, N, idx);
        size_t m = 0;
        for (size_t k = 0; k < N; k++)
            if (!isnan(y[idx[k]])) rx[m] = x[idx[k]], ry[m++] = y[idx[k]];
        assert_same(reps[r], vg_stats_spearman(rx, ry, m, dw));
        assert_same(reps[B + r], vg_stats_pearson(rx, ry, m));
        assert_same(reps[2 * B + r], vg_stats_kendall(rx, ry, m, iw));
    }
    for (size_t i = 0; i < N; i++) {
        size_t m = 0;
        for (size_t k = 0; k < N; k++)
            if (k != i && !isnan(y[k])) rx[m] = x[k], ry[m++] = y[k];
        assert_same(jack[i], vg_stats_spearman(rx, ry, m, dw));
        assert_same(jack[N + i], vg_stats_pearson(rx, ry, m));
        assert_same(jack[2 * N + i], vg_stats_kendall(rx, ry, m, iw));
    }
    gsl_rng_free(rng);
    free(reps);
    free(jack);
}

/* corrboot-2: the replicates and intervals are bit-identical for 1, 2, 3,
 * 4 and 7 threads (each replicate's stream comes from seed, stream and
 * its index alone), and for Spearman alone; they change with the seed. */
static void test_threads_deterministic(void **state) {
    (void)state;
    enum { N = 200, B = 257 };
    double x[N], y[N];
    make_data(x, y, N, 11);
    vg_corr_boot_options o;
    vg_corr_boot_options_init(&o);
    o.replicates = B;
    o.stream = 42;
    vg_error err;
    vg_error_clear(&err);
    double *ref = malloc(3 * B * sizeof *ref), *got = malloc(3 * B * sizeof *got);
    vg_corr_estimate e0[VG_CORR_COUNT], e1[VG_CORR_COUNT];
    o.threads = 1;
    assert_vg_ok(vg_stats_corr_bootstrap(x, y, N, &o, e0, ref, NULL, &err), &err);
    const unsigned threads[] = {2, 3, 4, 7};
    for (size_t t = 0; t < 4; t++) {
        o.threads = threads[t];
        assert_vg_ok(vg_stats_corr_bootstrap(x, y, N, &o, e1, got, NULL, &err), &err);
        assert_memory_equal(ref, got, 3 * B * sizeof *ref);
        assert_memory_equal(e0, e1, sizeof e0);
    }
    /* Spearman alone: the same Spearman replicates, the others NaN. */
    o.kinds = 1u << VG_CORR_SPEARMAN;
    assert_vg_ok(vg_stats_corr_bootstrap(x, y, N, &o, e1, got, NULL, &err), &err);
    assert_memory_equal(ref, got, B * sizeof *ref);
    assert_memory_equal(&e0[0], &e1[0], sizeof e0[0]);
    assert_true(isnan(got[B]) && isnan(got[2 * B]) && isnan(e1[2].boot.bca_low));
    assert_close(e1[2].value, e0[2].value, 0, 0);
    o.kinds = 0;
    o.seed += 1;
    assert_vg_ok(vg_stats_corr_bootstrap(x, y, N, &o, e1, got, NULL, &err), &err);
    assert_true(memcmp(ref, got, 3 * B * sizeof *ref) != 0);
    free(ref);
    free(got);
}

/* corrboot-3: no bootstrap (B = 0) gives the estimates and Fisher-z
 * intervals only (and the jackknife if asked for); fewer than 2 scored items give NaN everywhere; a bad
 * level or a NaN x is refused with VG_EINVAL. */
static void test_corrboot_edges(void **state) {
    (void)state;
    double x[6] = {1, 2, 3, 4, 5, 6}, y[6] = {1, 3, 2, 5, 4, 6};
    vg_corr_boot_options o;
    vg_corr_boot_options_init(&o);
    o.replicates = 0;
    vg_corr_estimate e[VG_CORR_COUNT];
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_stats_corr_bootstrap(x, y, 6, &o, e, NULL, NULL, &err), &err);
    /* Spearman of these ranks: 1 - 6 * 4 / (6 * 35) (common practice for
     * untied ranks). */
    assert_close(e[VG_CORR_SPEARMAN].value, 1 - 24.0 / 210.0, 1e-15, 0);
    assert_int_equal(e[VG_CORR_SPEARMAN].boot.replicates, 0);
    assert_true(isnan(e[VG_CORR_SPEARMAN].boot.bca_low));
    assert_false(isnan(e[VG_CORR_SPEARMAN].fisher_low));
    /* The jackknife is still computed when asked for: without item 0,
     * x = 2..6 against y = 3 2 5 4 6 (Spearman by hand: d = 1 1 1 1 0,
     * rho = 1 - 6 * 4 / (5 * 24) = 0.8). */
    double jack[3 * 6];
    assert_vg_ok(vg_stats_corr_bootstrap(x, y, 6, &o, e, NULL, jack, &err), &err);
    assert_close(jack[0], 0.8, 1e-15, 0);
    double y1[6] = {1, NAN, NAN, NAN, NAN, NAN};
    o.replicates = 50;
    assert_vg_ok(vg_stats_corr_bootstrap(x, y1, 6, &o, e, NULL, NULL, &err), &err);
    for (int k = 0; k < VG_CORR_COUNT; k++) {
        assert_true(isnan(e[k].value));
        assert_int_equal(e[k].n, 1);
        assert_int_equal(e[k].boot.replicates, 0);
    }
    o.level = 1.0;
    assert_int_equal(vg_stats_corr_bootstrap(x, y, 6, &o, e, NULL, NULL, &err), VG_EINVAL);
    o.level = 0.95;
    x[2] = NAN;
    assert_int_equal(vg_stats_corr_bootstrap(x, y, 6, &o, e, NULL, NULL, &err), VG_EINVAL);
}

/* alloc-boot-1: each allocation of the bootstrap failing in turn gives
 * VG_ENOMEM and no leak (the sanitizer build checks), then it succeeds. */
static void test_corrboot_alloc_failures(void **state) {
    (void)state;
    enum { N = 40 };
    double x[N], y[N];
    make_data(x, y, N, 3);
    vg_corr_boot_options o;
    vg_corr_boot_options_init(&o);
    o.replicates = 20;
    o.threads = 3;
    vg_corr_estimate e[VG_CORR_COUNT];
    int completed = 0;
    for (long k = 0; k < 1000 && !completed; k++) {
        vg_error err;
        vg_error_clear(&err);
        vg_alloc_fail_after(k);
        vg_status st = vg_stats_corr_bootstrap(x, y, N, &o, e, NULL, NULL, &err);
        vg_alloc_fail_after(-1);
        if (st == VG_OK)
            completed = 1;
        else
            assert_int_equal(st, VG_ENOMEM);
    }
    assert_true(completed);
}

/* agreement-1: by hand. Ratings (1 2 1), (2 1 3), (3 3 2), (4 4 4):
 * column 1 against the others' means 1.5, 2, 2.5, 4 ranks identically:
 * rho = 1; column 2 (2 1 3 4) against 1, 2.5, 2.5, 4: rho = 3 / sqrt(5 *
 * 4.5); column 3 (1 3 2 4) against 1.5, 1.5, 3, 4: also 3 / sqrt(22.5).
 * The mean is (1 + 2 * 0.6324555) / 3. An item with one rating and one
 * with none are left out; min/max ratings are over rated items. */
static void test_agreement_by_hand(void **state) {
    (void)state;
    const double r1[] = {1, 2, 1}, r2[] = {2, 1, 3}, r3[] = {3, 3, 2}, r4[] = {4, 4, 4};
    const double r5[] = {7};
    const double *rows[] = {r1, r2, r3, r4, r5, NULL};
    const size_t counts[] = {3, 3, 3, 3, 1, 0};
    vg_agreement a;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_stats_agreement_loo(rows, counts, 6, &a, &err), &err);
    assert_close(a.value, (1 + 2 * 3 / sqrt(22.5)) / 3, 1e-15, 0);
    assert_string_equal(a.method, "loo-spearman");
    assert_int_equal(a.columns, 3);
    assert_int_equal(a.columns_used, 3);
    assert_int_equal(a.min_ratings, 1);
    assert_int_equal(a.max_ratings, 3);
    assert_int_equal(a.n_items, 4);
    /* No individual ratings: undefined, not an error. */
    const size_t none[] = {0, 0, 0, 0, 0, 0};
    assert_vg_ok(vg_stats_agreement_loo(rows, none, 6, &a, &err), &err);
    assert_true(isnan(a.value));
    assert_int_equal(a.columns, 0);
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_percentile_and_bca_reduce),
        cmocka_unit_test(test_acceleration),
        cmocka_unit_test(test_bca_formula),
        cmocka_unit_test(test_fisher),
        cmocka_unit_test(test_counts_match_draws),
        cmocka_unit_test(test_replicates_equal_direct),
        cmocka_unit_test(test_replicates_tiny),
        cmocka_unit_test(test_threads_deterministic),
        cmocka_unit_test(test_corrboot_edges),
        cmocka_unit_test(test_corrboot_alloc_failures),
        cmocka_unit_test(test_agreement_by_hand),
    };
    return cmocka_run_group_tests_name("stats_boot", tests, NULL, NULL);
}
