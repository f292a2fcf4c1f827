/* test_stats.c - ranks and correlations against published values.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "vgtest.h"

/* stats-rank-1: ties get the mean of the ranks they span (common practice;
 * the definition scipy.stats.rankdata calls "average"). */
static void test_rank_ties(void **state) {
    (void)state;
    const double x[] = {10, 20, 20, 5, 20, 7};
    double r[6];
    size_t w[6];
    vg_stats_rank(x, 6, r, w);
    const double want[] = {3, 5, 5, 1, 5, 2};
    for (int i = 0; i < 6; i++) assert_close(r[i], want[i], 0, 0);
}

/* spearman-1: the worked example in Wikipedia's article "Spearman's rank
 * correlation coefficient" (IQ against hours of television per week for
 * ten people): rho = -29/165 = -0.175757... (from memory; scipy 1.10's
 * spearmanr gives -0.17575757575757575 on the same data). */
static void test_spearman_worked_example(void **state) {
    (void)state;
    const double iq[] = {106, 86, 100, 101, 99, 103, 97, 113, 112, 110};
    const double tv[] = {7, 0, 27, 50, 28, 29, 20, 12, 6, 17};
    double work[20];
    assert_close(vg_stats_spearman(iq, tv, 10, work), -29.0 / 165.0, 1e-15, 0);
}

/* spearman-2: perfectly monotone and perfectly reversed data give +1 and
 * -1 whatever the spacing (the definition). */
static void test_spearman_monotone(void **state) {
    (void)state;
    const double x[] = {1, 2, 3, 4, 5};
    const double y[] = {1, 10, 100, 1000, 10000};
    const double z[] = {9, 7, 5, 3, 1};
    double work[10];
    assert_close(vg_stats_spearman(x, y, 5, work), 1.0, 1e-15, 0);
    assert_close(vg_stats_spearman(x, z, 5, work), -1.0, 1e-15, 0);
}

/* spearman-3: undefined cases give NaN instead of a number. */
static void test_spearman_undefined(void **state) {
    (void)state;
    const double x[] = {1, 1, 1};
    const double y[] = {1, 2, 3};
    double work[6];
    assert_true(isnan(vg_stats_spearman(x, y, 3, work)));
    assert_true(isnan(vg_stats_spearman(y, y, 1, work)));
}

/* pearson-1: Anscombe's quartet, set I (Anscombe 1973, "Graphs in
 * Statistical Analysis", The American Statistician 27(1); the data ship
 * with R as `anscombe`): R 4.2's cor(anscombe$x1, anscombe$y1) prints
 * 0.81642051634483992. */
static void test_pearson_anscombe(void **state) {
    (void)state;
    const double x[] = {10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5};
    const double y[] = {8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68};
    assert_close(vg_stats_pearson(x, y, 11), 0.81642051634483992, 1e-14, 0);
}

/* kendall-1: tau-b with ties in both variables. By hand: x = 12 2 1 12 2,
 * y = 1 4 7 1 0 give 2 concordant and 6 discordant pairs, n1 = 2 pairs
 * tied in x, n2 = 1 in y, so tau_b = -4 / sqrt(8 * 9) = -0.4714045...;
 * scipy.stats.kendalltau's documented example on the same data prints
 * -0.47140452079103173 (from memory). */
static void test_kendall_ties(void **state) {
    (void)state;
    const double x[] = {12, 2, 1, 12, 2};
    const double y[] = {1, 4, 7, 1, 0};
    size_t work[10];
    assert_close(vg_stats_kendall(x, y, 5, work), -4.0 / sqrt(72.0), 1e-15, 0);
    assert_close(vg_stats_kendall(x, y, 5, work), -0.47140452079103173, 1e-15, 0);
}

/* kendall-2: monotone and reversed data give +1 and -1; a constant input
 * or fewer than 2 items give NaN (the definition of tau-b). */
static void test_kendall_bounds(void **state) {
    (void)state;
    const double x[] = {1, 2, 3, 4, 5, 6};
    const double y[] = {-3, 0, 0.5, 7, 70, 700};
    const double z[] = {6, 5, 4, 3, 2, 1};
    const double c[] = {2, 2, 2, 2, 2, 2};
    size_t work[12];
    assert_close(vg_stats_kendall(x, y, 6, work), 1.0, 1e-15, 0);
    assert_close(vg_stats_kendall(x, z, 6, work), -1.0, 1e-15, 0);
    assert_true(isnan(vg_stats_kendall(x, c, 6, work)));
    assert_true(isnan(vg_stats_kendall(x, y, 1, work)));
}

/* kendall-3: the definition counted pair by pair in O(n^2) (Kendall
 * 1945): tau_b = sum sgn(dx) sgn(dy) / sqrt((n0 - n1)(n0 - n2)), with n1
 * and n2 the pairs with dx = 0 and dy = 0, on 300 values with many ties in
 * both variables, so that the merge-sort count is checked against the
 * plain one. */
static void test_kendall_pairs(void **state) {
    (void)state;
    enum { N = 300 };
    double x[N], y[N];
    size_t work[2 * N];
    uint64_t s = 88172645463325252ull;
    for (int i = 0; i < N; i++) {
        /* xorshift64 (Marsaglia 2003): any fixed sequence will do. */
        s ^= s << 13, s ^= s >> 7, s ^= s << 17;
        x[i] = (double)(s % 40);
        s ^= s << 13, s ^= s >> 7, s ^= s << 17;
        y[i] = i % 3 ? x[i] * 0.5 + (double)(s % 9) : (double)(s % 1000) / 7.0;
    }
    long cd = 0, n1 = 0, n2 = 0, n0 = N * (N - 1) / 2;
    for (int i = 0; i < N; i++)
        for (int j = i + 1; j < N; j++) {
            double dx = x[i] - x[j], dy = y[i] - y[j];
            cd += (dx > 0 ? 1 : dx < 0 ? -1 : 0) * (dy > 0 ? 1 : dy < 0 ? -1 : 0);
            n1 += dx == 0;
            n2 += dy == 0;
        }
    assert_true(n1 > 0 && n2 > 0);
    assert_close(vg_stats_kendall(x, y, N, work),
                 (double)cd / sqrt((double)(n0 - n1) * (double)(n0 - n2)), 1e-14, 0);
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_rank_ties),
        cmocka_unit_test(test_spearman_worked_example),
        cmocka_unit_test(test_spearman_monotone),
        cmocka_unit_test(test_spearman_undefined),
        cmocka_unit_test(test_pearson_anscombe),
        cmocka_unit_test(test_kendall_ties),
        cmocka_unit_test(test_kendall_bounds),
        cmocka_unit_test(test_kendall_pairs),
    };
    return cmocka_run_group_tests_name("stats", tests, NULL, NULL);
}
