/* test_pairs.c - reading word-pair files: layouts, detection, quirks.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Each fixture in tests/fixtures/pairs/ reproduces, in a few hand-made
 * lines, one layout quirk that ../shared/public-benchmarks/SOURCES.md
 * lists for a real suite file; the comment names the file it mimics.
 * Expected values are read off the fixture itself.
 */
#include "vgtest.h"

#include "common/alloc.h"

static vg_suite *read_ok(const char *name, const vg_pairs_layout *lay) {
    vg_suite *s = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_suite_read_pairs(fixture(name), NULL, lay, &s, &err), &err);
    assert_non_null(s);
    return s;
}

static vg_status read_fail(const char *name, vg_error *err) {
    vg_suite *s = (vg_suite *)1;
    vg_error_clear(err);
    vg_status st = vg_suite_read_pairs(fixture(name), NULL, NULL, &s, err);
    assert_int_not_equal(st, VG_OK);
    assert_null(s);
    assert_non_null(strstr(err->path, name));
    return st;
}

/* pairs-1: tab-separated, no header; the id defaults to the file stem. */
static void test_basic(void **state) {
    (void)state;
    vg_suite *s = read_ok("pairs/basic.tsv", NULL);
    assert_int_equal(s->task, VG_TASK_SIMILARITY);
    assert_string_equal(s->id, "basic");
    assert_int_equal(s->n_items, 5);
    assert_string_equal(s->pairs[0].w1, "alpha");
    assert_string_equal(s->pairs[0].w2, "beta");
    assert_close(s->pairs[0].rating, 3.5, 0, 0);
    assert_int_equal(s->pairs[4].line, 5);
    assert_int_equal(s->n_files, 1);
    assert_string_equal(s->variant, "");
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
    vg_error err;
    assert_int_equal(read_fail("pairs/missing_column.txt", &err), VG_EFORMAT);
    assert_int_equal(err.line, 1);
    /* A non-numeric rating on the only line reads as a header, leaving no
     * pairs: an error too. */
    read_fail("pairs/bad_rating.txt", &err);
    /* pairs-3.1: an empty word (",," in CSV) is an error at its line and column. */
    assert_int_equal(read_fail("pairs/empty_word.csv", &err), VG_EFORMAT);
    assert_int_equal(err.line, 2);
    assert_int_equal(err.column, 2);
    /* pairs-3.2: a quoted field that is never closed. */
    assert_int_equal(read_fail("pairs/bad_quote.csv", &err), VG_EFORMAT);
    assert_int_equal(err.line, 2);
}

/* pairs-4: CRLF endings (SimLex-999.txt, EN-VERB-143.txt) leave no '\r'
 * in the last field and are noted in the detected layout. */
static void test_crlf(void **state) {
    (void)state;
    vg_suite *s = read_ok("pairs/crlf.tsv", NULL);
    assert_int_equal(s->n_items, 3);
    assert_close(s->pairs[2].rating, 6.25, 0, 0);
    assert_string_equal(s->pairs[2].w2, "pot");
    assert_non_null(strstr(s->layout_detected, "CRLF"));
    vg_suite_free(s);
}

/* pairs-5: a header with spaces and parentheses in its names, then the
 * individual raters' columns (WordSim-353 set1.csv: 'Word 1,Word 2,Human
 * (mean),1,2,...'); the header's numeric rater names must not make it
 * look like data. */
static void test_header_spaces(void **state) {
    (void)state;
    vg_pairs_layout lay;
    vg_pairs_layout_init(&lay);
    lay.col_raters = 4;
    vg_suite *s = read_ok("pairs/header_spaces.csv", &lay);
    assert_int_equal(s->stats.header_lines, 1);
    assert_int_equal(s->n_items, 3);
    assert_string_equal(s->pairs[0].w1, "lamp");
    assert_close(s->pairs[0].rating, 7.5, 0, 0);
    assert_int_equal(s->pairs[0].n_raters, 3);
    assert_close(s->pairs[0].raters[2], 7.5, 0, 0);
    assert_int_equal(s->pairs[0].line, 2);
    vg_suite_free(s);
    /* Without a raters column the extra columns are ignored. */
    s = read_ok("pairs/header_spaces.csv", NULL);
    assert_int_equal(s->n_items, 3);
    assert_null(s->pairs[1].raters);
    vg_suite_free(s);
}

/* pairs-6: a stray trailing tab in a blank-separated file (EN-MTurk-771.txt
 * line 578) is not a delimiter and makes no field, on a later line and
 * on the first line that detection looks at. */
static void test_trailing_tab(void **state) {
    (void)state;
    vg_suite *s = read_ok("pairs/trailing_tab.txt", NULL);
    assert_int_equal(s->n_items, 4);
    assert_close(s->pairs[1].rating, 2.545454545, 0, 0);
    assert_non_null(strstr(s->layout_detected, "blank"));
    vg_suite_free(s);
    s = read_ok("pairs/trailing_tab_first.txt", NULL);
    assert_int_equal(s->n_items, 3);
    assert_string_equal(s->pairs[0].w2, "west");
    vg_suite_free(s);
}

/* pairs-7: five columns with the rating fourth (after a POS column) and
 * one row missing the fifth (SimVerb-500-dev.txt 'ensure secure V 4.07'):
 * the rating column is detected and the short row still reads. */
static void test_missing_column(void **state) {
    (void)state;
    vg_suite *s = read_ok("pairs/missing_column.tsv", NULL);
    assert_int_equal(s->n_items, 4);
    assert_string_equal(s->pairs[2].w1, "ensure");
    assert_close(s->pairs[2].rating, 4.07, 0, 0);
    assert_close(s->pairs[3].rating, 6.0, 0, 0);
    assert_non_null(strstr(s->layout_detected, "column 4"));
    vg_suite_free(s);
}

/* pairs-8: duplicates, reversed pairs and self-pairs are counted, not
 * dropped (WordSim-353: money/cash twice, bank/money both ways,
 * tiger/tiger). */
static void test_duplicates(void **state) {
    (void)state;
    vg_suite *s = read_ok("pairs/duplicates.tsv", NULL);
    assert_int_equal(s->n_items, 6);
    assert_int_equal(s->stats.duplicates, 1);
    assert_int_equal(s->stats.reversed_duplicates, 1);
    assert_int_equal(s->stats.self_pairs, 1);
    assert_close(s->pairs[2].rating, 9.08, 0, 0);
    vg_suite_free(s);
}

/* pairs-9: ratings on several scales are read as written: 0-1 with four
 * decimals (EN-VERB-143), 1-5 means with nine decimals and bare integers
 * (EN-MTurk-287/771), 0-50 with six decimals (MEN). */
static void test_scales(void **state) {
    (void)state;
    vg_suite *s = read_ok("pairs/scale_unit.tsv", NULL);
    assert_close(s->pairs[0].rating, 0.19, 0, 0);
    vg_suite_free(s);
    s = read_ok("pairs/scale_likert.tsv", NULL);
    assert_close(s->pairs[0].rating, 2.888888889, 0, 0);
    assert_close(s->pairs[2].rating, 2, 0, 0);
    assert_int_equal(s->stats.reversed_duplicates, 1);
    vg_suite_free(s);
    s = read_ok("pairs/scale_fifty.txt", NULL);
    assert_close(s->pairs[0].rating, 50, 0, 0);
    vg_suite_free(s);
}

/* pairs-10: no newline after the last line (EN-MTurk-287.txt). */
static void test_no_final_newline(void **state) {
    (void)state;
    vg_suite *s = read_ok("pairs/no_final_newline.tsv", NULL);
    assert_int_equal(s->n_items, 3);
    assert_string_equal(s->pairs[2].w2, "pepper");
    assert_close(s->pairs[2].rating, 3.75, 0, 0);
    vg_suite_free(s);
}

/* pairs-11: MEN with and without its header line 'word1 word2 score'
 * (SOURCES.md: the two circulating copies differ only by that line). */
static void test_men_header(void **state) {
    (void)state;
    vg_suite *a = read_ok("pairs/men_header.txt", NULL);
    vg_suite *b = read_ok("pairs/men_noheader.txt", NULL);
    assert_int_equal(a->stats.header_lines, 1);
    assert_int_equal(b->stats.header_lines, 0);
    assert_int_equal(a->n_items, b->n_items);
    for (size_t i = 0; i < a->n_items; i++) {
        assert_string_equal(a->pairs[i].w1, b->pairs[i].w1);
        assert_close(a->pairs[i].rating, b->pairs[i].rating, 0, 0);
    }
    vg_suite_free(a);
    vg_suite_free(b);
}

/* pairs-12: mixed case is kept as written (WordSim-353 'FBI', Card-660
 * 'NetMeeting'); folding is the scorer's choice, not the reader's. */
static void test_mixed_case(void **state) {
    (void)state;
    vg_suite *s = read_ok("pairs/mixed_case.tsv", NULL);
    assert_string_equal(s->pairs[0].w1, "Paris");
    assert_string_equal(s->pairs[1].w1, "FBI");
    assert_string_equal(s->pairs[2].w1, "NetMeeting");
    vg_suite_free(s);
}

/* pairs-13: multi-word entries: underscores (Card-660 'Pocket_Monsters')
 * and spaces inside quoted CSV fields; both counted as multi-word. */
static void test_multiword(void **state) {
    (void)state;
    vg_suite *s = read_ok("pairs/underscores.tsv", NULL);
    assert_string_equal(s->pairs[0].w1, "Pocket_Monsters");
    assert_int_equal(s->stats.multiword, 2);
    vg_suite_free(s);
    s = read_ok("pairs/quoted_multiword.csv", NULL);
    assert_int_equal(s->n_items, 3);
    assert_string_equal(s->pairs[0].w1, "New York");
    assert_string_equal(s->pairs[1].w2, "frozen, sweet");
    assert_int_equal(s->stats.multiword, 2);
    vg_suite_free(s);
}

/* pairs-14: a UTF-8 byte order mark does not stick to the first word. */
static void test_bom(void **state) {
    (void)state;
    vg_suite *s = read_ok("pairs/bom.tsv", NULL);
    assert_string_equal(s->pairs[0].w1, "caf\xc3\xa9");
    assert_string_equal(s->pairs[1].w1, "na\xc3\xafve");
    assert_non_null(strstr(s->layout_detected, "BOM"));
    vg_suite_free(s);
}

/* pairs-14.1: bytes that are not UTF-8 (Windows-1252, as in WordSim-353's
 * instructions.txt) are kept as they are, not rejected or mangled. */
static void test_not_utf8(void **state) {
    (void)state;
    vg_suite *s = read_ok("pairs/cp1252.tsv", NULL);
    assert_string_equal(s->pairs[0].w1, "caf\xe9");
    assert_string_equal(s->pairs[1].w1, "na\xefve");
    vg_suite_free(s);
}

/* pairs-15: a varying number of raters' columns after the mean (RW:
 * rows of 10 to 13 fields). */
static void test_raters_variable(void **state) {
    (void)state;
    vg_pairs_layout lay;
    vg_pairs_layout_init(&lay);
    lay.col_raters = 4;
    vg_suite *s = read_ok("pairs/raters_variable.tsv", &lay);
    assert_int_equal(s->pairs[0].n_raters, 10);
    assert_int_equal(s->pairs[1].n_raters, 7);
    assert_int_equal(s->pairs[2].n_raters, 8);
    assert_close(s->pairs[0].raters[3], 1, 0, 0);
    assert_close(s->pairs[0].rating, 5.88, 0, 0);
    vg_suite_free(s);
}

/* pairs-16: the SimLex-999 layout read with nothing specified: tab, one
 * header line, the rating in column 4 after POS. */
static void test_simlex_like(void **state) {
    (void)state;
    vg_suite *s = read_ok("pairs/simlex_like.tsv", NULL);
    assert_int_equal(s->n_items, 4);
    assert_int_equal(s->stats.header_lines, 1);
    assert_close(s->pairs[1].rating, 9.2, 0, 0);
    assert_int_equal(s->stats.reversed_duplicates, 1);
    vg_suite_free(s);
    /* An explicit layout overrides detection: column 5 is conc(w1). */
    vg_pairs_layout lay;
    vg_pairs_layout_init(&lay);
    lay.col_rating = 5;
    lay.header_lines = 1;
    s = read_ok("pairs/simlex_like.tsv", &lay);
    assert_close(s->pairs[0].rating, 2.72, 0, 0);
    vg_suite_free(s);
}

/* pairs-17: a double quote inside a word that does not open the field
 * stays literal (12" = twelve inches) rather than being a CSV error. */
static void test_quote_inside(void **state) {
    (void)state;
    vg_suite *s = read_ok("pairs/quote_inside.tsv", NULL);
    assert_string_equal(s->pairs[0].w1, "12\"");
    vg_suite_free(s);
}

/* pairs-18: gzip-compressed input reads the same (zlib). */
static void test_gzip(void **state) {
    (void)state;
    const char *p = temp_path("crlf.tsv.gz");
    char cmd[16384], src[4096];
    snprintf(src, sizeof src, "%s", fixture("pairs/crlf.tsv"));
    snprintf(cmd, sizeof cmd, "gzip -c '%s' > '%s'", src, p);
    assert_int_equal(system(cmd), 0);
    vg_suite *s = NULL;
    vg_error err;
    assert_vg_ok(vg_suite_read_pairs(p, NULL, NULL, &s, &err), &err);
    /* The id is the file name without ".gz" and its extension. */
    assert_non_null(strstr(s->id, "crlf"));
    assert_null(strchr(s->id, '.'));
    assert_int_equal(s->n_items, 3);
    vg_suite_free(s);
    unlink(p);
}

/* pairs-19: every allocation failure is reported as VG_ENOMEM without a
 * leak (the sanitizer build checks the leaks). */
static void test_alloc_failures(void **state) {
    (void)state;
    for (long n = 0; n < 400; n++) {
        vg_suite *s = NULL;
        vg_error err;
        vg_error_clear(&err);
        vg_alloc_fail_after(n);
        vg_status st = vg_suite_read_pairs(fixture("pairs/simlex_like.tsv"), NULL, NULL, &s, &err);
        vg_alloc_fail_after(-1);
        if (st == VG_OK) {
            vg_suite_free(s);
            return;
        }
        assert_int_equal(st, VG_ENOMEM);
        assert_null(s);
    }
    fail_msg("reading never succeeded within 400 allocations");
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_basic),          cmocka_unit_test(test_csv_header_crlf),
        cmocka_unit_test(test_errors),         cmocka_unit_test(test_crlf),
        cmocka_unit_test(test_header_spaces),  cmocka_unit_test(test_trailing_tab),
        cmocka_unit_test(test_missing_column), cmocka_unit_test(test_duplicates),
        cmocka_unit_test(test_scales),         cmocka_unit_test(test_no_final_newline),
        cmocka_unit_test(test_men_header),     cmocka_unit_test(test_mixed_case),
        cmocka_unit_test(test_multiword),      cmocka_unit_test(test_bom),
        cmocka_unit_test(test_not_utf8),
        cmocka_unit_test(test_raters_variable), cmocka_unit_test(test_simlex_like),
        cmocka_unit_test(test_quote_inside),   cmocka_unit_test(test_gzip),
        cmocka_unit_test(test_alloc_failures),
    };
    return cmocka_run_group_tests_name("pairs", tests, NULL, NULL);
}
