/* test_eval.c - vg_evaluate end to end in-process, and allocation failures.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "vgtest.h"

#include "common/alloc.h"

static const char *const words[] = {"alpha", "beta", "gamma", "delta"};
static const float data[] = {1, 0, 0, 0, 1, 0, 0.5f, 0.5f, 0, 0.2f, 0.1f, 1};

/* eval-1: the table has spearman and spearman_all rows with the coverage
 * of the suite; values follow from cosines computed by hand:
 * cos(alpha,beta)=0, cos(alpha,gamma)=0.7071, cos(beta,gamma)=0.7071,
 * cos(alpha,delta)=0.195; the ratings 3.5, 9, 6, 1 rank as 2, 4, 3, 1 and
 * the cosines as 1, 3.5, 3.5, 2, so rho = 3.5 / sqrt(5 * 4.5) = 0.7379
 * (Pearson's r of the ranks, by hand; scipy 1.10's spearmanr on the same
 * ratings and cosines gives 0.7378647873726218). */
static void test_evaluate(void **state) {
    (void)state;
    vg_error err;
    vg_error_clear(&err);
    vg_vectors *v = NULL;
    vg_suite *s = NULL;
    vg_results *r = NULL;
    assert_vg_ok(vg_vectors_from_matrix(words, 4, data, 3, 3, &v, &err), &err);
    assert_vg_ok(vg_suite_read_pairs(fixture("pairs/basic.tsv"), NULL, NULL, &s, &err), &err);
    vg_vector_set set = {"toy", "", v};
    const vg_suite *suites[] = {s};
    assert_vg_ok(vg_evaluate(&set, 1, suites, 1, NULL, &r, &err), &err);
    const vg_score_row *row = vg_results_find(r, 0, 0, "", VG_METRIC_SPEARMAN, 0);
    assert_non_null(row);
    assert_int_equal(row->n_items, 5);
    assert_int_equal(row->n_used, 4);
    assert_close(row->value, 3.5 / sqrt(5 * 4.5), 1e-12, 0);
    const vg_similarity_scores *sc = vg_results_block(r, 0, 0)->sim;
    assert_int_equal(sc->n_missing, 1);
    assert_int_equal(sc->n_missing_words, 1);
    assert_string_equal(sc->missing_words[0], "omega");
    assert_int_equal(sc->status[4], VG_ITEM_MISSING_WORD);
    vg_results_free(r);
    vg_suite_free(s);
    vg_vectors_free(v);
}

/* alloc-1: make each allocation of a whole load-read-evaluate cycle fail
 * in turn; every failure must come back as VG_ENOMEM with no leak (the
 * sanitizer build's leak checker watches) and no crash. */
static void test_allocation_failures(void **state) {
    (void)state;
    int completed = 0;
    for (long n = 0; n < 100000 && !completed; n++) {
        vg_error err;
        vg_error_clear(&err);
        vg_vectors *v = NULL;
        vg_suite *s = NULL;
        vg_results *r = NULL;
        vg_alloc_fail_after(n);
        vg_status st = vg_vectors_load(fixture("vectors/header.txt"), NULL, &v, &err);
        if (st == VG_OK) st = vg_suite_read_pairs(fixture("pairs/basic.tsv"), NULL, NULL, &s, &err);
        if (st == VG_OK) {
            vg_vector_set set = {"toy", "", v};
            const vg_suite *suites[] = {s};
            st = vg_evaluate(&set, 1, suites, 1, NULL, &r, &err);
        }
        vg_alloc_fail_after(-1);
        if (st == VG_OK)
            completed = 1;
        else if (st != VG_ENOMEM) {
            char b[1200];
            print_error("allocation %ld: status %d: %s\n", n, st, vg_error_format(&err, b, sizeof b));
            fail();
        }
        vg_results_free(r);
        vg_suite_free(s);
        vg_vectors_free(v);
    }
    assert_true(completed);
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_evaluate),
        cmocka_unit_test(test_allocation_failures),
    };
    return cmocka_run_group_tests_name("eval", tests, NULL, NULL);
}
