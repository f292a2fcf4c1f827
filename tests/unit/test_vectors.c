/* test_vectors.c - loading vector sets: layouts, quirks and errors.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "vgtest.h"

static vg_vectors *load_ok(const char *name, const vg_load_options *opt) {
    vg_vectors *v = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_vectors_load(fixture(name), opt, &v, &err), &err);
    return v;
}

static vg_status load_fail(const char *name, const vg_load_options *opt, vg_error *err) {
    vg_vectors *v = (vg_vectors *)1;
    vg_error_clear(err);
    vg_status st = vg_vectors_load(fixture(name), opt, &v, err);
    assert_null(v);
    return st;
}

/* vectors-text-1: "count dims" header detected; rows, dims, zero rows. */
static void test_text_header(void **state) {
    (void)state;
    vg_vectors *v = load_ok("vectors/header.txt", NULL);
    const vg_vectors_info *in = vg_vectors_get_info(v);
    assert_int_equal(in->layout, VG_LAYOUT_TEXT_HEADER);
    assert_int_equal(vg_vectors_rows(v), 4);
    assert_int_equal(vg_vectors_dims(v), 3);
    assert_int_equal(in->zero_rows, 1);
    size_t r = vg_vectors_find(v, "gamma", 5);
    assert_int_equal(r, 2);
    assert_close(vg_vectors_row(v, r)[1], 0.5, 0, 0);
    assert_close(vg_vectors_norms(v)[r], sqrt(0.5), 1e-7, 0);
    assert_int_equal(vg_vectors_find(v, "omega", 5), VG_NOT_FOUND);
    assert_true(in->hashed);
    assert_int_equal(strlen(in->sha256), 64);
    vg_vectors_free(v);
}

/* vectors-text-2: no header line: dims from the first row. */
static void test_text_plain(void **state) {
    (void)state;
    vg_vectors *v = load_ok("vectors/noheader.txt", NULL);
    assert_int_equal(vg_vectors_get_info(v)->layout, VG_LAYOUT_TEXT_PLAIN);
    assert_int_equal(vg_vectors_rows(v), 3);
    assert_int_equal(vg_vectors_dims(v), 3);
    vg_vectors_free(v);
}

/* vectors-text-3: a header promising more rows than present is an error
 * naming both numbers, unless allow_short. */
static void test_text_short(void **state) {
    (void)state;
    vg_error err;
    assert_int_equal(load_fail("vectors/short.txt", NULL, &err), VG_ETRUNCATED);
    assert_non_null(strstr(err.message, "5"));
    assert_non_null(strstr(err.message, "2"));
    vg_load_options opt;
    vg_load_options_init(&opt);
    opt.allow_short = 1;
    vg_vectors *v = load_ok("vectors/short.txt", &opt);
    assert_int_equal(vg_vectors_rows(v), 2);
    vg_vectors_free(v);
}

/* vectors-text-4: a row with too few values, a non-number, NaN: errors
 * with the line; skip_bad_rows counts them instead. */
static void test_text_bad_rows(void **state) {
    (void)state;
    vg_error err;
    assert_int_equal(load_fail("vectors/badcount.txt", NULL, &err), VG_EFORMAT);
    assert_int_equal(err.line, 3);
    assert_non_null(strstr(err.path, "badcount.txt"));
    assert_int_equal(load_fail("vectors/notnumber.txt", NULL, &err), VG_EVALUE);
    assert_int_equal(err.line, 3);
    assert_int_equal(load_fail("vectors/nan.txt", NULL, &err), VG_EVALUE);
    vg_load_options opt;
    vg_load_options_init(&opt);
    opt.skip_bad_rows = 1;
    vg_vectors *v = load_ok("vectors/notnumber.txt", &opt);
    assert_int_equal(vg_vectors_get_info(v)->bad_rows, 1);
    assert_int_equal(vg_vectors_rows(v), 1);
    vg_vectors_free(v);
}

/* vectors-text-5: duplicates keep the first row (common practice). */
static void test_text_duplicates(void **state) {
    (void)state;
    vg_vectors *v = load_ok("vectors/duplicate.txt", NULL);
    assert_int_equal(vg_vectors_get_info(v)->duplicates, 1);
    assert_int_equal(vg_vectors_rows(v), 2);
    assert_close(vg_vectors_row(v, vg_vectors_find(v, "alpha", 5))[0], 1.0, 0, 0);
    vg_vectors_free(v);
}

/* vectors-mem-1: the in-process constructor copies, indexes, folds case. */
static void test_from_matrix(void **state) {
    (void)state;
    const char *words[] = {"Paris", "paris", "London"};
    const float data[] = {1, 0, 9, 0, 1, 9, 1, 1, 9}; /* ld 3, dims 2 */
    vg_vectors *v = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_vectors_from_matrix(words, 3, data, 2, 3, &v, &err), &err);
    assert_int_equal(vg_vectors_rows(v), 3);
    assert_int_equal(vg_vectors_dims(v), 2);
    assert_close(vg_vectors_row(v, 1)[1], 1.0, 0, 0);
    /* Folding: the first row whose folded form matches wins. */
    assert_int_equal(vg_vectors_find_folded(v, "PARIS", 5), 0);
    assert_int_equal(vg_vectors_find(v, "PARIS", 5), VG_NOT_FOUND);
    vg_vectors_free(v);
    const float bad[] = {1, NAN};
    const char *one[] = {"x"};
    assert_int_equal(vg_vectors_from_matrix(one, 1, bad, 2, 2, &v, &err), VG_EVALUE);
    assert_null(v);
}

/* vectors-unicode-1: lookup is exact after NFC: "é" precomposed (U+00E9)
 * finds a word stored decomposed (e + U+0301). */
static void test_nfc_lookup(void **state) {
    (void)state;
    const char *words[] = {"caf\x65\xcc\x81"};
    const float data[] = {1, 2};
    vg_vectors *v = NULL;
    vg_error err;
    assert_vg_ok(vg_vectors_from_matrix(words, 1, data, 2, 2, &v, &err), &err);
    assert_int_equal(vg_vectors_find(v, "caf\xc3\xa9", 5), 0);
    vg_vectors_free(v);
}

/* vectors-filter-1: keep_words keeps only the rows a suite needs. */
static void test_keep_filter(void **state) {
    (void)state;
    vg_load_options opt;
    vg_load_options_init(&opt);
    const char *keep[] = {"beta", "omega"};
    opt.keep_words = keep;
    opt.n_keep_words = 2;
    vg_vectors *v = load_ok("vectors/header.txt", &opt);
    assert_int_equal(vg_vectors_rows(v), 1);
    assert_int_equal(vg_vectors_find(v, "beta", 4), 0);
    assert_int_equal(vg_vectors_get_info(v)->rows_read, 4);
    vg_vectors_free(v);
}

/* vectors-error-1: a missing file is an I/O error naming the path. */
static void test_missing_file(void **state) {
    (void)state;
    vg_error err;
    assert_int_equal(load_fail("vectors/does-not-exist.txt", NULL, &err), VG_EIO);
    assert_non_null(strstr(err.path, "does-not-exist.txt"));
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_text_header),   cmocka_unit_test(test_text_plain),
        cmocka_unit_test(test_text_short),    cmocka_unit_test(test_text_bad_rows),
        cmocka_unit_test(test_text_duplicates), cmocka_unit_test(test_from_matrix),
        cmocka_unit_test(test_nfc_lookup),    cmocka_unit_test(test_keep_filter),
        cmocka_unit_test(test_missing_file),
    };
    return cmocka_run_group_tests_name("vectors", tests, NULL, NULL);
}
