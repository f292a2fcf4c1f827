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

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_rank_ties),
        cmocka_unit_test(test_spearman_worked_example),
        cmocka_unit_test(test_spearman_monotone),
        cmocka_unit_test(test_spearman_undefined),
        cmocka_unit_test(test_pearson_anscombe),
    };
    return cmocka_run_group_tests_name("stats", tests, NULL, NULL);
}
