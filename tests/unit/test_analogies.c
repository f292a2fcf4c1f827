/* test_analogies.c - reading analogy question files in every layout.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Fixtures in tests/fixtures/analogies/ are hand-made, a few lines each,
 * in the layouts of questions-words.txt (Mikolov et al. 2013), the merged
 * MSR file, BATS (Gladkova et al. 2016) and the creators' two-file MSR
 * layout (from memory); expected values are read off the fixtures.
 */
#include "vgtest.h"

#include "common/alloc.h"

static vg_suite *read_ok(const char *path, const char *answers, vg_analogy_layout layout) {
    vg_suite *s = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_suite_read_analogies(path, answers, NULL, layout, &s, &err), &err);
    assert_int_equal(s->task, VG_TASK_ANALOGY);
    return s;
}

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

/* analogies-4: section groups by wildcard rule: gram* sections are
 * syntactic, the rest semantic (common practice for questions-words.txt). */
static void test_groups(void **state) {
    (void)state;
    vg_suite *s = read_ok(fixture("analogies/sectioned.txt"), NULL, VG_ANALOGY_AUTO);
    assert_int_equal(s->n_sections, 4);
    assert_null(s->sections[0].group);
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_suite_set_groups(s, "gram*=syntactic;*=semantic", &err), &err);
    assert_string_equal(s->sections[0].group, "semantic");
    assert_string_equal(s->sections[1].group, "semantic");
    assert_string_equal(s->sections[2].group, "syntactic");
    assert_string_equal(s->sections[3].group, "syntactic");
    /* A part without '=' is refused and changes nothing. */
    assert_int_equal(vg_suite_set_groups(s, "gram*=x;oops", &err), VG_EINVAL);
    assert_string_equal(s->sections[2].group, "syntactic");
    vg_suite_free(s);
}

/* analogies-5: possessive apostrophes (1000 of the merged MSR file's
 * questions) and CRLF in the four-column layout, detected. */
static void test_possessive(void **state) {
    (void)state;
    vg_suite *s = read_ok(fixture("analogies/possessive.tsv"), NULL, VG_ANALOGY_AUTO);
    assert_int_equal(s->n_items, 3);
    assert_string_equal(s->questions[0].b, "city's");
    assert_string_equal(s->questions[0].answers[0], "bank's");
    assert_string_equal(s->questions[2].answers[0], "walks");
    assert_non_null(strstr(s->layout_detected, "CRLF"));
    vg_suite_free(s);
}

/* analogies-6: a directory of relation files in folders (the BATS 3.0
 * tree): files sorted by path, one section per file named by its file
 * name, grouped by folder; README.txt is skipped; every ordered pair of
 * distinct lines is a question and every listed answer counts. */
static void test_relation_dir(void **state) {
    (void)state;
    vg_suite *s = read_ok(fixture("analogies/relation"), NULL, VG_ANALOGY_AUTO);
    assert_int_equal(s->n_sections, 3);
    assert_int_equal(s->n_files, 3);
    assert_string_equal(s->sections[0].name, "I01 [noun - plural]");
    assert_string_equal(s->sections[0].group, "1_Inflectional");
    assert_string_equal(s->sections[1].name, "I02 [verb - past]");
    assert_string_equal(s->sections[2].name, "L01 [hypernyms]");
    assert_string_equal(s->sections[2].group, "2_Lexicographic");
    /* 3 lines make 3 * 2 questions, 2 lines make 2, 2 lines make 2. */
    assert_int_equal(s->sections[0].count, 6);
    assert_int_equal(s->sections[1].count, 2);
    assert_int_equal(s->sections[2].count, 2);
    assert_int_equal(s->n_items, 10);
    /* Order: (i, j) with i the example line: (cat, dog), (cat, ox), (dog, cat), ... */
    const vg_question *q = &s->questions[1];
    assert_string_equal(q->a, "cat");
    assert_string_equal(q->b, "cats");
    assert_string_equal(q->c, "ox");
    assert_int_equal(q->n_answers, 2);
    assert_string_equal(q->answers[0], "oxen");
    assert_string_equal(q->answers[1], "oxes");
    assert_int_equal(q->line, 3);
    /* The example's b is its line's first answer. */
    q = &s->questions[4];
    assert_string_equal(q->a, "ox");
    assert_string_equal(q->b, "oxen");
    assert_string_equal(q->c, "cat");
    /* CRLF and a trailing tab (L01's second line) leave no stray field. */
    assert_string_equal(s->questions[6].b, "went");
    assert_string_equal(s->questions[8].c, "oak");
    assert_int_equal(s->questions[8].n_answers, 2);
    vg_suite_free(s);
}

/* analogies-7: one relation file, blank-separated, detected from its
 * two-field lines. */
static void test_relation_file(void **state) {
    (void)state;
    vg_suite *s = read_ok(fixture("analogies/relation_single.txt"), NULL, VG_ANALOGY_AUTO);
    assert_int_equal(s->n_sections, 1);
    assert_string_equal(s->sections[0].name, "relation_single");
    assert_int_equal(s->n_items, 6);
    assert_string_equal(s->questions[0].c, "big");
    assert_int_equal(s->questions[0].n_answers, 2);
    assert_string_equal(s->questions[0].answers[1], "little");
    vg_suite_free(s);
    vg_error err;
    vg_error_clear(&err);
    assert_int_equal(vg_suite_read_analogies(fixture("analogies/relation_bad.txt"), NULL, NULL,
                                             VG_ANALOGY_RELATION, &s, &err),
                     VG_EFORMAT);
    assert_int_equal(err.line, 2);
}

/* analogies-8: questions and answers in two files; the answers file
 * found beside "x.questions" as "x.answers"; an answer may follow a
 * label; blank lines are skipped in both. */
static void test_split(void **state) {
    (void)state;
    vg_suite *s = read_ok(fixture("analogies/mini.questions"), NULL, VG_ANALOGY_AUTO);
    assert_int_equal(s->n_items, 3);
    assert_int_equal(s->n_files, 2);
    assert_string_equal(s->questions[1].c, "small");
    assert_string_equal(s->questions[1].answers[0], "smallest");
    assert_string_equal(s->questions[2].answers[0], "slower");
    assert_int_equal(s->questions[2].line, 4);
    vg_suite_free(s);
    /* The same with the answers file named explicitly. */
    char ans[4096];
    snprintf(ans, sizeof ans, "%s", fixture("analogies/mini.answers"));
    s = read_ok(fixture("analogies/mini.questions"), ans, VG_ANALOGY_AUTO);
    assert_int_equal(s->n_items, 3);
    vg_suite_free(s);
    /* More questions than answers: VG_ETRUNCATED naming the answers file. */
    vg_error err;
    vg_error_clear(&err);
    assert_int_equal(vg_suite_read_analogies(fixture("analogies/short.questions"), NULL, NULL,
                                             VG_ANALOGY_AUTO, &s, &err),
                     VG_ETRUNCATED);
    assert_non_null(strstr(err.path, "short.answers"));
    assert_int_equal(err.line, 3);
}

/* analogies-9: a three-word file without an answers file is an error
 * that says what is missing. */
static void test_split_no_answers(void **state) {
    (void)state;
    const char *p = temp_path("three.txt");
    write_file(p, "good better bad\n");
    vg_suite *s = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_int_equal(vg_suite_read_analogies(p, NULL, NULL, VG_ANALOGY_AUTO, &s, &err), VG_EFORMAT);
    assert_non_null(strstr(err.message, "answers"));
    unlink(p);
}

/* analogies-10: duplicate questions across sections are counted (171
 * lines of questions-words.txt are in two sections, SOURCES.md). */
static void test_duplicates(void **state) {
    (void)state;
    const char *p = temp_path("dups.txt");
    write_file(p, ": a\nx y z w\np q r s\n: b\nx y z w\n");
    vg_suite *s = read_ok(p, NULL, VG_ANALOGY_AUTO);
    assert_int_equal(s->n_items, 3);
    assert_int_equal(s->stats.duplicates, 1);
    vg_suite_free(s);
    unlink(p);
}

/* analogies-11: layout names round-trip. */
static void test_layout_names(void **state) {
    (void)state;
    vg_analogy_layout l;
    for (int i = 0; i <= VG_ANALOGY_SPLIT; i++) {
        assert_int_equal(vg_analogy_layout_parse(vg_analogy_layout_name((vg_analogy_layout)i), &l),
                         VG_OK);
        assert_int_equal((int)l, i);
    }
    assert_int_equal(vg_analogy_layout_parse("nonsense", &l), VG_EINVAL);
}

/* analogies-12: allocation failures in the relation reader are
 * VG_ENOMEM without leaks. */
static void test_alloc_failures(void **state) {
    (void)state;
    for (long n = 0; n < 600; n++) {
        vg_suite *s = NULL;
        vg_error err;
        vg_error_clear(&err);
        vg_alloc_fail_after(n);
        vg_status st = vg_suite_read_analogies(fixture("analogies/relation"), NULL, NULL,
                                               VG_ANALOGY_AUTO, &s, &err);
        vg_alloc_fail_after(-1);
        if (st == VG_OK) {
            vg_suite_free(s);
            return;
        }
        assert_int_equal(st, VG_ENOMEM);
        assert_null(s);
    }
    fail_msg("reading never succeeded within 600 allocations");
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_sectioned),      cmocka_unit_test(test_plain4),
        cmocka_unit_test(test_bad_line),       cmocka_unit_test(test_groups),
        cmocka_unit_test(test_possessive),     cmocka_unit_test(test_relation_dir),
        cmocka_unit_test(test_relation_file),  cmocka_unit_test(test_split),
        cmocka_unit_test(test_split_no_answers), cmocka_unit_test(test_duplicates),
        cmocka_unit_test(test_layout_names),   cmocka_unit_test(test_alloc_failures),
    };
    return cmocka_run_group_tests_name("analogies", tests, NULL, NULL);
}
