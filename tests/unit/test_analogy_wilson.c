/* test_analogy_wilson.c - the Wilson score interval used for analogy
 * accuracies.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "vgtest.h"

/* wilson-1: the worked examples of Newcombe (1998), "Two-sided confidence
 * intervals for the single proportion: comparison of seven methods",
 * Statistics in Medicine 17:857-872, Table I, method 3 (score interval
 * without continuity correction), quoted to 4 decimals (from memory;
 * statsmodels 0.13.5 proportion_confint(method="wilson") gives the same
 * four-decimal values). */
static void test_newcombe(void **state) {
    (void)state;
    static const struct {
        size_t k, n;
        double low, high;
    } ex[] = {{81, 263, 0.2553, 0.3662},
              {15, 148, 0.0624, 0.1605},
              {0, 20, 0.0000, 0.1611},
              {1, 29, 0.0061, 0.1718}};
    for (size_t i = 0; i < sizeof ex / sizeof ex[0]; i++) {
        double lo, hi;
        vg_stats_wilson(ex[i].k, ex[i].n, 0.95, &lo, &hi);
        assert_close(lo, ex[i].low, 5e-5, 0);
        assert_close(hi, ex[i].high, 5e-5, 0);
    }
}

/* wilson-2: the formula of Wilson (1927) written out here from its other
 * form, the roots p of (phat - p)^2 = z^2 p (1 - p) / n, i.e. of
 * (1 + z^2/n) p^2 - (2 phat + z^2/n) p + phat^2 = 0, with z the normal
 * quantile (z = 1.959963984540054 at 95%, 1.6448536269514722 at 90%,
 * 2.5758293035489004 at 99%: common practice). */
static void test_formula(void **state) {
    (void)state;
    static const double level[3] = {0.95, 0.90, 0.99};
    static const double z[3] = {1.959963984540054, 1.6448536269514722, 2.5758293035489004};
    static const size_t cases[][2] = {{3, 8}, {50, 100}, {7, 1000}, {999, 1000}, {19544, 19544}};
    for (int l = 0; l < 3; l++) {
        for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
            double n = (double)cases[i][1], p = (double)cases[i][0] / n, z2 = z[l] * z[l];
            double qa = 1 + z2 / n, qb = -(2 * p + z2 / n), qc = p * p;
            double disc = sqrt(qb * qb - 4 * qa * qc);
            double lo, hi;
            vg_stats_wilson(cases[i][0], cases[i][1], level[l], &lo, &hi);
            assert_close(lo, (-qb - disc) / (2 * qa), 1e-9, 0);
            assert_close(hi, (-qb + disc) / (2 * qa), 1e-9, 0);
        }
    }
}

/* wilson-3: the interval of k/n mirrors that of (n-k)/n (the score
 * interval is symmetric under swapping successes and failures); all
 * correct gives an upper bound of exactly 1, none a lower bound of 0. */
static void test_symmetry(void **state) {
    (void)state;
    for (size_t n = 1; n < 60; n += 7) {
        for (size_t k = 0; k <= n; k++) {
            double l1, h1, l2, h2;
            vg_stats_wilson(k, n, 0.95, &l1, &h1);
            vg_stats_wilson(n - k, n, 0.95, &l2, &h2);
            assert_close(l1, 1 - h2, 1e-12, 0);
            assert_close(h1, 1 - l2, 1e-12, 0);
            assert_true(l1 <= (double)k / (double)n && (double)k / (double)n <= h1);
        }
    }
    double lo, hi;
    vg_stats_wilson(29, 29, 0.95, &lo, &hi);
    assert_true(hi == 1.0);
    vg_stats_wilson(0, 29, 0.95, &lo, &hi);
    assert_true(lo == 0.0);
}

/* wilson-4: undefined cases give NaN rather than a made-up interval. */
static void test_undefined(void **state) {
    (void)state;
    double lo, hi;
    vg_stats_wilson(0, 0, 0.95, &lo, &hi);
    assert_true(isnan(lo) && isnan(hi));
    vg_stats_wilson(5, 4, 0.95, &lo, &hi);
    assert_true(isnan(lo) && isnan(hi));
    vg_stats_wilson(1, 4, 1.0, &lo, &hi);
    assert_true(isnan(lo) && isnan(hi));
    vg_stats_wilson(1, 4, 0.0, &lo, &hi);
    assert_true(isnan(lo) && isnan(hi));
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_newcombe),
        cmocka_unit_test(test_formula),
        cmocka_unit_test(test_symmetry),
        cmocka_unit_test(test_undefined),
    };
    return cmocka_run_group_tests_name("analogy_wilson", tests, NULL, NULL);
}
