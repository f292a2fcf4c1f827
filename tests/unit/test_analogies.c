/* test_analogies.c - reading analogy question files.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "vgtest.h"

/* analogies-1: the sectioned layout of questions-words.txt (Mikolov et
 * al. 2013): ": name" lines open sections, questions are "a b c d". */
static void test_sectioned(void **state) {
    (void)state;
    const char *p = temp_path("sectioned.txt");
    write_file(p, ": capital-common-countries\nAthens Greece Baghdad Iraq\nAthens Greece Bangkok Thailand\n"
                  ": gram1-adjective-to-adverb\namazing amazingly apparent apparently\n");
    vg_suite *s = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_suite_read_analogies(p, NULL, "g", VG_ANALOGY_AUTO, &s, &err), &err);
    assert_int_equal(s->task, VG_TASK_ANALOGY);
    assert_int_equal(s->n_items, 3);
    assert_int_equal(s->n_sections, 2);
    assert_string_equal(s->sections[0].name, "capital-common-countries");
    assert_int_equal(s->sections[0].first, 0);
    assert_int_equal(s->sections[0].count, 2);
    assert_int_equal(s->sections[1].first, 2);
    assert_string_equal(s->questions[1].c, "Bangkok");
    assert_string_equal(s->questions[2].answers[0], "apparently");
    assert_int_equal(s->questions[2].section, 1);
    assert_int_equal(s->questions[2].line, 5);
    vg_suite_free(s);
    unlink(p);
}

/* analogies-2: tab-separated four columns with CRLF and no sections, as
 * the merged MSR file (msr-analogy in ../shared/public-benchmarks). */
static void test_plain4(void **state) {
    (void)state;
    const char *p = temp_path("plain4.txt");
    write_file(p, "city\tcity's\tbank\tbank's\r\ngood\tbetter\tbad\tworse\r\n");
    vg_suite *s = NULL;
    vg_error err;
    assert_vg_ok(vg_suite_read_analogies(p, NULL, NULL, VG_ANALOGY_AUTO, &s, &err), &err);
    assert_int_equal(s->n_items, 2);
    assert_int_equal(s->n_sections, 1);
    assert_string_equal(s->questions[0].b, "city's");
    assert_string_equal(s->questions[1].answers[0], "worse");
    vg_suite_free(s);
    unlink(p);
}

/* analogies-3: a line of three words is an error naming file and line. */
static void test_bad_line(void **state) {
    (void)state;
    const char *p = temp_path("bad.txt");
    write_file(p, ": s\na b c d\na b c\n");
    vg_suite *s = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_int_equal(vg_suite_read_analogies(p, NULL, NULL, VG_ANALOGY_AUTO, &s, &err), VG_EFORMAT);
    assert_null(s);
    assert_int_equal(err.line, 3);
    unlink(p);
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_sectioned),
        cmocka_unit_test(test_plain4),
        cmocka_unit_test(test_bad_line),
    };
    return cmocka_run_group_tests_name("analogies", tests, NULL, NULL);
}
