/* test_pairs.c - reading word-pair files.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "vgtest.h"

/* pairs-1: tab-separated, no header; the id defaults to the file stem. */
static void test_basic(void **state) {
    (void)state;
    vg_suite *s = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_suite_read_pairs(fixture("pairs/basic.tsv"), NULL, NULL, &s, &err), &err);
    assert_int_equal(s->task, VG_TASK_SIMILARITY);
    assert_string_equal(s->id, "basic");
    assert_int_equal(s->n_items, 5);
    assert_string_equal(s->pairs[0].w1, "alpha");
    assert_string_equal(s->pairs[0].w2, "beta");
    assert_close(s->pairs[0].rating, 3.5, 0, 0);
    assert_int_equal(s->pairs[4].line, 5);
    assert_int_equal(s->n_files, 1);
    vg_suite_free(s);
}

/* pairs-2: comma-separated with a header line, CRLF endings and quoted
 * fields (one holding a comma), as in WordSim-353's combined.csv. */
static void test_csv_header_crlf(void **state) {
    (void)state;
    vg_suite *s = NULL;
    vg_error err;
    assert_vg_ok(vg_suite_read_pairs(fixture("pairs/csv_header_crlf.csv"), "x", NULL, &s, &err),
                 &err);
    assert_int_equal(s->n_items, 3);
    assert_int_equal(s->stats.header_lines, 1);
    assert_string_equal(s->pairs[0].w1, "alpha");
    assert_string_equal(s->pairs[2].w1, "be,ta");
    assert_close(s->pairs[1].rating, 9, 0, 0);
    vg_suite_free(s);
}

/* pairs-3: errors name the file and line. */
static void test_errors(void **state) {
    (void)state;
    vg_suite *s = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_int_equal(vg_suite_read_pairs(fixture("pairs/missing_column.txt"), NULL, NULL, &s, &err),
                     VG_EFORMAT);
    assert_null(s);
    assert_int_equal(err.line, 1);
    assert_non_null(strstr(err.path, "missing_column.txt"));
    /* A non-numeric rating on the only line reads as a header, leaving no
     * pairs: an error too. */
    assert_int_not_equal(vg_suite_read_pairs(fixture("pairs/bad_rating.txt"), NULL, NULL, &s, &err),
                         VG_OK);
    assert_null(s);
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_basic),
        cmocka_unit_test(test_csv_header_crlf),
        cmocka_unit_test(test_errors),
    };
    return cmocka_run_group_tests_name("pairs", tests, NULL, NULL);
}
