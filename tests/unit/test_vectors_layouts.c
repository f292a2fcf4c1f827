/* test_vectors_layouts.c - every vector layout, the real-file quirks and
 * the error paths, each on a small fixture in tests/fixtures/vectors/.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Expected values are the fixtures' own numbers (written by hand, or by a
 * few lines of Python's struct and gzip modules for the binary ones); the
 * quirks and how each is handled are common practice, as the issue lists.
 */
#include "vgtest.h"

#include "common/alloc.h"

static vg_vectors *load_opt(const char *name, const vg_load_options *opt) {
    vg_vectors *v = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_vectors_load(fixture(name), opt, &v, &err), &err);
    return v;
}

static vg_vectors *load(const char *name) { return load_opt(name, NULL); }

static vg_status must_fail_opt(const char *name, const vg_load_options *opt, vg_error *err) {
    vg_vectors *v = (vg_vectors *)1;
    vg_error_clear(err);
    vg_status st = vg_vectors_load(fixture(name), opt, &v, err);
    assert_null(v);
    assert_int_not_equal(st, VG_OK);
    return st;
}

static vg_status must_fail(const char *name, vg_error *err) { return must_fail_opt(name, NULL, err); }

static const vg_vectors_info *info(const vg_vectors *v) { return vg_vectors_get_info(v); }

/* The three rows of basic.bin / basic.npy / header.txt.gz. */
static void expect_basic3(vg_vectors *v) {
    assert_int_equal(vg_vectors_rows(v), 3);
    assert_int_equal(vg_vectors_dims(v), 3);
    size_t b = vg_vectors_find(v, "beta", 4);
    assert_int_equal(b, 1);
    const float *r = vg_vectors_row(v, b);
    assert_true(r[0] == 0.0f && r[1] == -1.25f && r[2] == 2.0f);
    assert_int_equal(info(v)->zero_rows, 1); /* gamma */
    /* norm of (0, -1.25, 2): sqrt(1.5625 + 4), by hand */
    assert_close(vg_vectors_norms(v)[b], sqrt(5.5625), 1e-6, 0);
}

static int pointer_aligned(const void *p, size_t a) { return ((uintptr_t)p % a) == 0; }

/* layout-1: text with a header; matrix 64-byte aligned, contiguous. */
static void test_text_header(void **state) {
    (void)state;
    vg_vectors *v = load("vectors/header.txt");
    assert_int_equal(info(v)->layout, VG_LAYOUT_TEXT_HEADER);
    assert_int_equal(info(v)->header_rows, 4);
    assert_true(pointer_aligned(vg_vectors_data(v), 64));
    assert_int_equal(vg_vectors_ld(v), 3);
    assert_ptr_equal(vg_vectors_row(v, 1), vg_vectors_data(v) + 3);
    assert_non_null(strstr(info(v)->detected_because, "count dims"));
    vg_vectors_free(v);
}

/* layout-2: the binary layout, with and without '\n' after each row. */
static void test_binary(void **state) {
    (void)state;
    vg_vectors *v = load("vectors/basic.bin");
    assert_int_equal(info(v)->layout, VG_LAYOUT_BINARY);
    assert_non_null(strstr(info(v)->detected_because, "binary rows"));
    expect_basic3(v);
    vg_vectors_free(v);
    v = load("vectors/nonl.bin");
    assert_int_equal(info(v)->layout, VG_LAYOUT_BINARY);
    expect_basic3(v);
    vg_vectors_free(v);
}

/* layout-3: .npy with its vocabulary found beside it (same stem .vocab). */
static void test_npy(void **state) {
    (void)state;
    vg_vectors *v = load("vectors/basic.npy");
    assert_int_equal(info(v)->layout, VG_LAYOUT_NPY);
    assert_non_null(strstr(info(v)->vocab_path, "basic.vocab"));
    assert_int_equal(strlen(info(v)->vocab_sha256), 64);
    assert_int_equal(info(v)->mapped, 0); /* hashed: read into place */
    expect_basic3(v);
    vg_vectors_free(v);
    /* Unhashed native float32 at offset 128: the file's bytes are the
     * matrix. */
    vg_load_options opt;
    vg_load_options_init(&opt);
    opt.compute_hash = 0;
    v = load_opt("vectors/basic.npy", &opt);
    assert_int_equal(info(v)->mapped, 1);
    assert_true(pointer_aligned(vg_vectors_data(v), 64));
    /* The file is mapped from a 2 MiB boundary (see test_filemap); its
     * data start 128 bytes in. */
    assert_true(pointer_aligned((const char *)vg_vectors_data(v) - 128, (size_t)2 << 20));
    expect_basic3(v);
    vg_vectors_free(v);
    /* --vocab FILE overrides the lookup. */
    vg_load_options_init(&opt);
    char vocab[4096];
    snprintf(vocab, sizeof vocab, "%s", fixture("vectors/basic.vocab"));
    opt.vocab_path = vocab;
    v = load_opt("vectors/novocab.npy", &opt);
    expect_basic3(v);
    vg_vectors_free(v);
}

/* layout-3b: a float32 little-endian .npy is mapped as the matrix; a
 * duplicate word closes its gap by moving the later rows down, which
 * needs a copy of its own (mapped is then 0); the file is only read. */
static void test_npy_in_place(void **state) {
    (void)state;
    FILE *fp = fopen(fixture("vectors/dupvocab.npy"), "rb");
    assert_non_null(fp);
    char before[512], after[512];
    size_t n = fread(before, 1, sizeof before, fp);
    fclose(fp);
    for (int hash = 1; hash >= 0; hash--) { /* read into place, then mapped */
        vg_load_options opt;
        vg_load_options_init(&opt);
        opt.compute_hash = hash;
        vg_vectors *v = load_opt("vectors/dupvocab.npy", &opt);
        assert_int_equal(vg_vectors_rows(v), 2);
        assert_int_equal(info(v)->duplicates, 1);
        assert_int_equal(info(v)->mapped, 0);
        assert_true(pointer_aligned(vg_vectors_data(v), 64));
        const float *g = vg_vectors_row(v, vg_vectors_find(v, "gamma", 5));
        assert_true(g[0] == 0 && g[1] == 0 && g[2] == 0);
        const float *a = vg_vectors_row(v, 0);
        assert_true(a[0] == 1.0f && a[1] == 0.0f && a[2] == 0.5f);
        vg_vectors_free(v);
    }
    fp = fopen(fixture("vectors/dupvocab.npy"), "rb");
    assert_non_null(fp);
    assert_int_equal(fread(after, 1, sizeof after, fp), n);
    fclose(fp);
    assert_memory_equal(before, after, n);
}

/* layout-4: gzip of each layout, known by the magic bytes: the npy one
 * is named .npy.gz and still finds gzbasic.vocab. */
static void test_gzip_each_layout(void **state) {
    (void)state;
    vg_vectors *v = load("vectors/header.txt.gz");
    assert_true(info(v)->gzip);
    assert_int_equal(info(v)->layout, VG_LAYOUT_TEXT_HEADER);
    assert_int_equal(vg_vectors_rows(v), 4);
    assert_non_null(strstr(info(v)->detected_because, "gzip"));
    vg_vectors_free(v);
    v = load("vectors/basic.bin.gz");
    assert_true(info(v)->gzip);
    assert_int_equal(info(v)->layout, VG_LAYOUT_BINARY);
    expect_basic3(v);
    vg_vectors_free(v);
    v = load("vectors/gzbasic.npy.gz");
    assert_true(info(v)->gzip);
    assert_int_equal(info(v)->layout, VG_LAYOUT_NPY);
    expect_basic3(v);
    vg_vectors_free(v);
    /* Concatenated members read as one stream; zero padding after the
     * last member is ignored (as gzip(1) does). */
    v = load("vectors/members.txt.gz");
    assert_int_equal(vg_vectors_rows(v), 4);
    vg_vectors_free(v);
    v = load("vectors/zeropad.txt.gz");
    assert_int_equal(vg_vectors_rows(v), 4);
    vg_vectors_free(v);
}

/* gzip-err-1: truncated, corrupt, and trailing junk: errors naming the file. */
static void test_gzip_errors(void **state) {
    (void)state;
    vg_error err;
    assert_int_equal(must_fail("vectors/truncated.txt.gz", &err), VG_ETRUNCATED);
    assert_non_null(strstr(err.path, "truncated.txt.gz"));
    assert_int_equal(must_fail("vectors/corrupt.txt.gz", &err), VG_EFORMAT);
    assert_int_equal(must_fail("vectors/garbage.txt.gz", &err), VG_EFORMAT);
    assert_non_null(strstr(err.message, "after the gzip data"));
}

/* detect-1: "2 3" followed by one-value rows is itself a row (dims 1);
 * followed by rows of the wrong width it is an error saying both. */
static void test_detect_two_ints(void **state) {
    (void)state;
    vg_vectors *v = load("vectors/two_ints.txt");
    assert_int_equal(info(v)->layout, VG_LAYOUT_TEXT_PLAIN);
    assert_int_equal(vg_vectors_dims(v), 1);
    assert_int_equal(vg_vectors_rows(v), 3);
    assert_close(vg_vectors_row(v, vg_vectors_find(v, "2", 1))[0], 3.0, 0, 0);
    vg_vectors_free(v);
    vg_error err;
    assert_int_equal(must_fail("vectors/ambiguous.txt", &err), VG_EFORMAT);
    assert_non_null(strstr(err.message, "count dims"));
}

/* detect-2: --format forces a layout; a forced layout that does not fit
 * is an error, not a guess. */
static void test_forced_format(void **state) {
    (void)state;
    vg_load_options opt;
    vg_load_options_init(&opt);
    vg_error err;
    opt.layout = VG_LAYOUT_TEXT_HEADER;
    assert_int_equal(must_fail_opt("vectors/noheader.txt", &opt, &err), VG_EFORMAT);
    opt.layout = VG_LAYOUT_NPY;
    assert_int_equal(must_fail_opt("vectors/header.txt", &opt, &err), VG_EFORMAT);
    opt.layout = VG_LAYOUT_BINARY;
    assert_int_not_equal(must_fail_opt("vectors/header.txt", &opt, &err), VG_OK);
    /* text (no header) on a file with one: the header line is a bad row. */
    opt.layout = VG_LAYOUT_TEXT_PLAIN;
    assert_int_equal(must_fail_opt("vectors/header.txt", &opt, &err), VG_EFORMAT);
    assert_int_equal(err.line, 1);
    opt.layout = VG_LAYOUT_TEXT_HEADER;
    vg_vectors *v = load_opt("vectors/header.txt", &opt);
    assert_int_equal(vg_vectors_rows(v), 4);
    vg_vectors_free(v);
}

/* quirk-1: header-less rows whose word holds spaces: the last dims
 * fields are the vector, the rest the word; counted and kept. */
static void test_words_with_spaces(void **state) {
    (void)state;
    vg_vectors *v = load("vectors/spaces.txt");
    assert_int_equal(vg_vectors_dims(v), 3);
    assert_int_equal(vg_vectors_rows(v), 4);
    assert_int_equal(info(v)->words_with_spaces, 2);
    size_t r = vg_vectors_find(v, "los angeles ca", 14);
    assert_int_equal(r, 2);
    assert_close(vg_vectors_row(v, r)[2], 1.0, 0, 0);
    assert_int_equal(vg_vectors_find(v, "new york", 8), 1);
    vg_vectors_free(v);
}

/* quirk-2: header count smaller or larger than the rows: an error naming
 * both numbers, unless allow_short. */
static void test_header_mismatch(void **state) {
    (void)state;
    vg_error err;
    assert_int_equal(must_fail("vectors/long.txt", &err), VG_ETRUNCATED);
    assert_non_null(strstr(err.message, "promises 2 rows"));
    assert_non_null(strstr(err.message, "has 3"));
    assert_int_equal(must_fail("vectors/short.txt", &err), VG_ETRUNCATED);
    vg_load_options opt;
    vg_load_options_init(&opt);
    opt.allow_short = 1;
    vg_vectors *v = load_opt("vectors/long.txt", &opt);
    assert_int_equal(vg_vectors_rows(v), 3);
    vg_vectors_free(v);
    /* binary: fewer rows than promised, and a row cut in the middle */
    assert_int_equal(must_fail("vectors/shortcount.bin", &err), VG_ETRUNCATED);
    assert_non_null(strstr(err.message, "promises 5"));
    assert_int_equal(must_fail("vectors/truncated.bin", &err), VG_ETRUNCATED);
    assert_non_null(strstr(err.message, "inside row 3"));
    v = load_opt("vectors/truncated.bin", &opt);
    assert_int_equal(vg_vectors_rows(v), 2);
    vg_vectors_free(v);
    /* npy: data shorter than the shape */
    assert_int_equal(must_fail("vectors/truncated.npy", &err), VG_ETRUNCATED);
    v = load_opt("vectors/truncated.npy", &opt);
    assert_int_equal(vg_vectors_rows(v), 2);
    vg_vectors_free(v);
}

/* quirk-3: a header claiming 10^12 rows: no such allocation, a prompt
 * error naming both counts (plain and gzip are both bounded by size). */
static void test_huge_header_count(void **state) {
    (void)state;
    vg_error err;
    assert_int_equal(must_fail("vectors/hugecount.txt", &err), VG_ETRUNCATED);
    assert_non_null(strstr(err.message, "1000000000000"));
}

/* quirk-4: bad rows (too few values, not a number, NaN, Inf): an error
 * with file and line; skip_bad_rows counts them instead. */
static void test_bad_rows(void **state) {
    (void)state;
    vg_error err;
    assert_int_equal(must_fail("vectors/inf.txt", &err), VG_EVALUE);
    assert_int_equal(err.line, 3);
    assert_non_null(strstr(err.message, "not finite"));
    assert_int_equal(must_fail("vectors/nan.bin", &err), VG_EVALUE);
    assert_non_null(strstr(err.message, "row 2"));
    vg_load_options opt;
    vg_load_options_init(&opt);
    opt.skip_bad_rows = 1;
    const char *files[] = {"vectors/inf.txt", "vectors/nan.txt", "vectors/badcount.txt",
                           "vectors/nan.bin"};
    for (size_t i = 0; i < 4; i++) {
        vg_vectors *v = load_opt(files[i], &opt);
        assert_int_equal(info(v)->bad_rows, 1);
        assert_int_equal(vg_vectors_rows(v), 1);
        vg_vectors_free(v);
    }
    /* a word over VG_MAX_WORD bytes is a bad row too */
    assert_int_equal(must_fail("vectors/longword.txt", &err), VG_ELIMIT);
    assert_int_equal(err.line, 1);
    vg_vectors *v = load_opt("vectors/longword.txt", &opt);
    assert_int_equal(vg_vectors_rows(v), 1);
    vg_vectors_free(v);
}

/* quirk-5: CRLF, a BOM, trailing blanks, a tab, a blank line, no final
 * newline: all read; the BOM and CRLF are reported. */
static void test_crlf_bom(void **state) {
    (void)state;
    vg_vectors *v = load("vectors/crlf_bom.txt");
    assert_int_equal(info(v)->layout, VG_LAYOUT_TEXT_HEADER);
    assert_int_equal(vg_vectors_rows(v), 3);
    assert_true(info(v)->bom);
    assert_true(info(v)->crlf);
    assert_close(vg_vectors_row(v, vg_vectors_find(v, "alpha", 5))[1], 0.5, 0, 0);
    assert_close(vg_vectors_row(v, vg_vectors_find(v, "beta", 4))[0], -2.0, 0, 0);
    assert_close(vg_vectors_row(v, vg_vectors_find(v, "gamma", 5))[1], 3.0, 0, 0);
    vg_vectors_free(v);
    v = load("vectors/blank.txt");
    assert_int_equal(vg_vectors_rows(v), 3);
    vg_vectors_free(v);
}

/* quirk-6: words that are not valid UTF-8 keep their bytes, are counted,
 * and can be looked up by those bytes. */
static void test_invalid_utf8(void **state) {
    (void)state;
    vg_vectors *v = load("vectors/invalid_utf8.txt");
    assert_int_equal(vg_vectors_rows(v), 3);
    assert_int_equal(info(v)->invalid_utf8, 2);
    assert_int_equal(vg_vectors_find(v, "caf\xe9", 4), 0);
    size_t len;
    assert_memory_equal(vg_vectors_word(v, 2, &len), "\xff\xfe", 2);
    assert_int_equal(len, 2);
    vg_vectors_free(v);
}

/* quirk-7: NFC: a word stored decomposed (e + U+0301) is found by its
 * precomposed form (U+00E9) and kept as stored (Unicode UAX #15). */
static void test_nfc_file(void **state) {
    (void)state;
    vg_vectors *v = load("vectors/nfd.txt");
    assert_int_equal(vg_vectors_find(v, "caf\xc3\xa9", 5), 0);
    assert_int_equal(vg_vectors_find(v, "na\xc3\xafve", 6), 1);
    size_t len;
    vg_vectors_word(v, 0, &len);
    assert_int_equal(len, 6); /* "cafe" + the 2-byte combining accent */
    vg_vectors_free(v);
}

/* quirk-8: fold_case: full Unicode case folding, first occurrence wins
 * ("Paris" before "paris"; "STRASSE" folds to "strasse" as "Straße"
 * does, Unicode CaseFolding.txt). The filter folds too. */
static void test_fold_case(void **state) {
    (void)state;
    vg_vectors *v = load("vectors/case.txt");
    assert_int_equal(vg_vectors_find_folded(v, "PARIS", 5), 0);
    assert_int_equal(vg_vectors_find(v, "paris", 5), 1);
    assert_int_equal(vg_vectors_find_folded(v, "london", 6), 2);
    assert_int_equal(vg_vectors_find_folded(v, "STRASSE", 7), 3);
    vg_vectors_free(v);
    vg_load_options opt;
    vg_load_options_init(&opt);
    const char *keep[] = {"london", "strasse"};
    opt.keep_words = keep;
    opt.n_keep_words = 2;
    opt.fold_case = 1;
    v = load_opt("vectors/case.txt", &opt);
    assert_int_equal(vg_vectors_rows(v), 2);
    assert_int_equal(vg_vectors_find_folded(v, "London", 6), 0);
    vg_vectors_free(v);
}

/* quirk-9: max_words reads only the first N rows (no header mismatch). */
static void test_max_words(void **state) {
    (void)state;
    vg_load_options opt;
    vg_load_options_init(&opt);
    opt.max_words = 2;
    const char *files[] = {"vectors/header.txt", "vectors/basic.bin", "vectors/basic.npy",
                           "vectors/header.txt.gz", "vectors/spaces.txt"};
    for (size_t i = 0; i < 5; i++) {
        vg_vectors *v = load_opt(files[i], &opt);
        assert_int_equal(vg_vectors_rows(v), 2);
        assert_int_equal(vg_vectors_find(v, "alpha", 5), 0);
        /* the hash is still of the whole file */
        vg_vectors *all = load(files[i]);
        assert_string_equal(info(v)->sha256, info(all)->sha256);
        vg_vectors_free(all);
        vg_vectors_free(v);
    }
}

/* error-1: empty file, single-field rows, binary junk, a directory,
 * npy without vocabulary, vocabulary count and blank-line errors. */
static void test_errors(void **state) {
    (void)state;
    vg_error err;
    assert_int_equal(must_fail("vectors/empty.txt", &err), VG_EFORMAT);
    assert_non_null(strstr(err.message, "empty"));
    assert_int_equal(must_fail("vectors/one_field.txt", &err), VG_EFORMAT);
    assert_int_equal(must_fail("vectors/nul.txt", &err), VG_EFORMAT);
    assert_int_equal(must_fail("vectors", &err), VG_EINVAL);
    assert_int_equal(must_fail("vectors/novocab.npy", &err), VG_ENOTFOUND);
    assert_non_null(strstr(err.message, "novocab.vocab"));
    assert_non_null(strstr(err.message, "--vocab"));
    assert_int_equal(must_fail("vectors/shortvocab.npy", &err), VG_EFORMAT);
    assert_non_null(strstr(err.message, "2 words"));
    assert_non_null(strstr(err.message, "3 rows"));
    assert_int_equal(must_fail("vectors/blankvocab.npy", &err), VG_EFORMAT);
    assert_int_equal(err.line, 2);
    vg_load_options opt;
    vg_load_options_init(&opt);
    opt.allow_short = 1;
    vg_vectors *v = load_opt("vectors/shortvocab.npy", &opt);
    assert_int_equal(vg_vectors_rows(v), 2);
    vg_vectors_free(v);
}

/* hash-1: the sha256 of the stored bytes, gzip included, equals the one
 * computed apart by OpenSSL over the whole file; compute_hash 0 skips it. */
static void test_hash(void **state) {
    (void)state;
    /* Reference digests: coreutils sha256sum on the fixtures (the e2e
     * test vectors_cli.sh checks the same against sha256sum live). */
    vg_vectors *v = load("vectors/header.txt");
    assert_string_equal(info(v)->sha256,
                        "ba1b47fda9f1aaffd36cd5db18386c9687e30d63c60cb003634bb53b3dfdfadf");
    vg_vectors_free(v);
    vg_load_options opt;
    vg_load_options_init(&opt);
    opt.compute_hash = 0;
    v = load_opt("vectors/header.txt", &opt);
    assert_false(info(v)->hashed);
    assert_int_equal(info(v)->sha256[0], '\0');
    vg_vectors_free(v);
}

/* buffer-1: the in-memory entry point reads every layout alike. */
static void test_load_buffer(void **state) {
    (void)state;
    const char *names[] = {"vectors/basic.bin", "vectors/header.txt.gz", "vectors/spaces.txt"};
    for (size_t i = 0; i < 3; i++) {
        FILE *fp = fopen(fixture(names[i]), "rb");
        assert_non_null(fp);
        char buf[4096];
        size_t n = fread(buf, 1, sizeof buf, fp);
        fclose(fp);
        vg_vectors *a = NULL, *b = load(names[i]);
        vg_error err;
        assert_vg_ok(vg_vectors_load_buffer(buf, n, names[i], NULL, &a, &err), &err);
        assert_int_equal(vg_vectors_rows(a), vg_vectors_rows(b));
        assert_memory_equal(vg_vectors_data(a), vg_vectors_data(b),
                            vg_vectors_rows(b) * vg_vectors_dims(b) * sizeof(float));
        assert_string_equal(info(a)->sha256, info(b)->sha256);
        vg_vectors_free(a);
        vg_vectors_free(b);
    }
    vg_vectors *v = NULL;
    vg_error err;
    assert_int_equal(vg_vectors_load_buffer("", 0, "empty", NULL, &v, &err), VG_EFORMAT);
    assert_null(v);
}

/* alloc-1: with the Nth allocation failing, for every N up to a clean
 * load's count: either success or VG_ENOMEM, never a crash or a leak
 * (the sanitizer build checks leaks). */
static void test_alloc_failures(void **state) {
    (void)state;
    const char *names[] = {"vectors/header.txt", "vectors/basic.bin.gz", "vectors/basic.npy",
                           "vectors/spaces.txt"};
    for (size_t f = 0; f < 4; f++) {
        unsigned long before = vg_alloc_count();
        vg_vectors_free(load(names[f]));
        long total = (long)(vg_alloc_count() - before);
        for (long n = 0; n < total; n++) {
            vg_vectors *v = NULL;
            vg_error err;
            vg_alloc_fail_after(n);
            vg_status st = vg_vectors_load(fixture(names[f]), NULL, &v, &err);
            vg_alloc_fail_after(-1);
            if (st == VG_OK) {
                assert_non_null(v);
                vg_vectors_free(v);
            } else {
                assert_null(v);
                assert_int_equal(st, VG_ENOMEM);
            }
        }
    }
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_text_header),      cmocka_unit_test(test_binary),
        cmocka_unit_test(test_npy),              cmocka_unit_test(test_npy_in_place),
        cmocka_unit_test(test_gzip_each_layout),
        cmocka_unit_test(test_gzip_errors),      cmocka_unit_test(test_detect_two_ints),
        cmocka_unit_test(test_forced_format),    cmocka_unit_test(test_words_with_spaces),
        cmocka_unit_test(test_header_mismatch),  cmocka_unit_test(test_huge_header_count),
        cmocka_unit_test(test_bad_rows),         cmocka_unit_test(test_crlf_bom),
        cmocka_unit_test(test_invalid_utf8),     cmocka_unit_test(test_nfc_file),
        cmocka_unit_test(test_fold_case),        cmocka_unit_test(test_max_words),
        cmocka_unit_test(test_errors),           cmocka_unit_test(test_hash),
        cmocka_unit_test(test_load_buffer),      cmocka_unit_test(test_alloc_failures),
    };
    return cmocka_run_group_tests_name("vectors_layouts", tests, NULL, NULL);
}
