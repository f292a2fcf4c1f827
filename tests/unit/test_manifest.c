/* test_manifest.c - the manifest of suites and the data directory.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * tests/fixtures/manifest/mini.csv describes small hand-made suites in
 * tests/fixtures/manifest/data/<id>/; its pinned digests were computed
 * with sha256sum (GNU coreutils) over those files.
 */
#include "vgtest.h"

#include <sys/stat.h>

#include "common/alloc.h"

static vg_manifest *load(const char *path) {
    vg_manifest *m = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_manifest_load(path, &m, &err), &err);
    return m;
}

static char data_dir[4096];

static const char *data(void) {
    snprintf(data_dir, sizeof data_dir, "%s", fixture("manifest/data"));
    return data_dir;
}

/* manifest-1: columns found by name in any order; a later row of an id
 * adds a variant and inherits the suite's fields; a quoted field may
 * span lines and rows keep their own first line. */
static void test_parse_mini(void **state) {
    (void)state;
    vg_manifest *m = load(fixture("manifest/mini.csv"));
    assert_int_equal(vg_manifest_count(m), 7);
    const vg_suite_entry *e = vg_manifest_find(m, "pairs-a");
    assert_non_null(e);
    assert_int_equal(e->task, VG_TASK_SIMILARITY);
    assert_string_equal(e->title, "Pairs A");
    assert_string_equal(e->licence, "CC0");
    assert_string_equal(e->language, "");
    assert_close(e->scale_max, 10, 0, 0);
    assert_int_equal(e->published_items, 3);
    assert_int_equal(e->n_variants, 2);
    assert_string_equal(e->variants[0].notes, "a note\nthat spans two lines");
    assert_int_equal(e->variants[0].pairs.delimiter, ',');
    assert_int_equal(e->variants[0].pairs.header_lines, 1);
    assert_int_equal(e->variants[0].pairs.col_raters, 4);
    assert_string_equal(e->variants[0].pairs.comment, "");
    assert_int_equal(e->variants[0].manifest_line, 2);
    assert_string_equal(e->variants[1].name, "rework");
    assert_int_equal(e->variants[1].manifest_line, 4);
    assert_int_equal(e->variants[1].pairs.delimiter, '\t');
    assert_string_equal(e->variants[1].sha256[0], "");
    const vg_suite_entry *sp = vg_manifest_find(m, "ana-split");
    assert_int_equal(sp->variants[0].n_files, 2);
    assert_string_equal(sp->variants[0].files[1], "t.answers");
    assert_int_equal(sp->variants[0].analogy, VG_ANALOGY_SPLIT);
    assert_true(isnan(sp->scale_min));
    assert_null(vg_manifest_find(m, "nope"));
    assert_null(vg_manifest_get(m, 7));
    vg_manifest_free(m);
}

/* manifest-2: reading suites through the manifest from a data directory:
 * the layout, id, title, scale and groups come from the row, and the
 * pinned digest (sha256sum of the fixture) matches. */
static void test_read_entries(void **state) {
    (void)state;
    vg_manifest *m = load(fixture("manifest/mini.csv"));
    vg_error err;
    vg_error_clear(&err);
    vg_suite *s = NULL;
    const vg_suite_entry *e = vg_manifest_find(m, "pairs-a");
    assert_int_equal(vg_suite_entry_locate(e, data()), 0);
    assert_vg_ok(vg_suite_read_entry(e, data(), &s, &err), &err);
    assert_string_equal(s->id, "pairs-a");
    assert_string_equal(s->title, "Pairs A");
    assert_string_equal(s->variant, "orig");
    assert_int_equal(s->n_items, 3);
    assert_int_equal(s->pairs[0].n_raters, 2);
    assert_close(s->scale_max, 10, 0, 0);
    assert_int_equal(vg_suite_entry_verify(e, s, NULL), VG_HASH_MATCH);
    vg_suite_free(s);

    e = vg_manifest_find(m, "ana-sec");
    assert_vg_ok(vg_suite_read_entry(e, data(), &s, &err), &err);
    assert_string_equal(s->sections[0].group, "syntactic");
    assert_string_equal(s->sections[1].group, "semantic");
    assert_int_equal(vg_suite_entry_verify(e, s, NULL), VG_HASH_MATCH);
    vg_suite_free(s);

    e = vg_manifest_find(m, "ana-rel");
    assert_vg_ok(vg_suite_read_entry(e, data(), &s, &err), &err);
    assert_int_equal(s->n_items, 2);
    assert_string_equal(s->sections[0].group, "grp");
    assert_int_equal(vg_suite_entry_verify(e, s, NULL), VG_HASH_NOT_PINNED);
    vg_suite_free(s);

    e = vg_manifest_find(m, "ana-split");
    assert_vg_ok(vg_suite_read_entry(e, data(), &s, &err), &err);
    assert_int_equal(s->n_items, 2);
    assert_string_equal(s->questions[1].answers[0], "h");
    vg_suite_free(s);

    /* manifest-2.1: a pinned digest that differs is reported. */
    e = vg_manifest_find(m, "pairs-badhash");
    assert_vg_ok(vg_suite_read_entry(e, data(), &s, &err), &err);
    size_t bad = 99;
    assert_int_equal(vg_suite_entry_verify(e, s, &bad), VG_HASH_MISMATCH);
    assert_int_equal(bad, 0);
    vg_suite_free(s);

    /* manifest-2.2: a rating outside the manifest's scale is an error at
     * its line. */
    e = vg_manifest_find(m, "pairs-scale");
    assert_int_equal(vg_suite_read_entry(e, data(), &s, &err), VG_EVALUE);
    assert_int_equal(err.line, 2);
    assert_non_null(strstr(err.path, "s.tsv"));

    /* manifest-2.3: a suite that is absent names the path expected. */
    e = vg_manifest_find(m, "absent");
    assert_int_equal(vg_suite_entry_locate(e, data()), (size_t)-1);
    assert_int_equal(vg_suite_read_entry(e, data(), &s, &err), VG_ENOTFOUND);
    assert_non_null(strstr(err.path, "absent/nothing.txt"));
    assert_non_null(strstr(err.message, "by hand"));
    vg_manifest_free(m);
}

/* manifest-3: the variant present is the one read: with only the
 * reworked copy in the data directory, it is found and read with its
 * own layout. */
static void test_variant_fallback(void **state) {
    (void)state;
    vg_manifest *m = load(fixture("manifest/mini.csv"));
    char dir[4096], sub[4200], file[4300];
    snprintf(dir, sizeof dir, "%s", temp_path("data"));
    snprintf(sub, sizeof sub, "%s/pairs-a", dir);
    snprintf(file, sizeof file, "%s/EN-A.txt", sub);
    assert_int_equal(mkdir(dir, 0777), 0);
    assert_int_equal(mkdir(sub, 0777), 0);
    write_file(file, "lamp\tlight\t7.5\nriver\tbank\t5\n");
    const vg_suite_entry *e = vg_manifest_find(m, "pairs-a");
    assert_int_equal(vg_suite_entry_locate(e, dir), 1);
    vg_suite *s = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_suite_read_entry(e, dir, &s, &err), &err);
    assert_string_equal(s->variant, "rework");
    assert_int_equal(s->n_items, 2);
    assert_int_equal(vg_suite_entry_verify(e, s, NULL), VG_HASH_NOT_PINNED);
    vg_suite_free(s);
    unlink(file);
    rmdir(sub);
    rmdir(dir);
    vg_manifest_free(m);
}

/* Parse text as a manifest and expect a format error at line. */
static void expect_bad(const char *text, uint64_t line, const char *needle) {
    vg_manifest *m = (vg_manifest *)1;
    vg_error err;
    vg_error_clear(&err);
    vg_status st = vg_manifest_parse(text, strlen(text), "test.csv", &m, &err);
    if (st != VG_EFORMAT || err.line != line || !strstr(err.message, needle)) {
        print_error("manifest:\n%s\ngot status %d line %llu message '%s'; wanted line %llu "
                    "and '%s'\n",
                    text, (int)st, (unsigned long long)err.line, err.message,
                    (unsigned long long)line, needle);
        fail();
    }
    assert_null(m);
    assert_string_equal(err.path, "test.csv");
}

#define HDR "id,variant,task,files,sha256,scale_min,scale_max,analogy_layout,members\n"

/* manifest-4: every rule of benchmarks-manifest/README.md is enforced
 * with the manifest's line in the error. */
static void test_errors(void **state) {
    (void)state;
    expect_bad("id,variant,task,files,colour\n", 1, "unknown column");
    expect_bad("id,variant,files\n", 1, "lacks the column 'task'");
    expect_bad("id,variant,task,files,id\n", 1, "twice");
    expect_bad(HDR "x,v,similarity,a.txt,,,,,\nx,w,synonyms,b.txt,,,,,\n", 3, "differs");
    expect_bad(HDR "x,v,similarity,a.txt,,,,,\ny,v,nonsense,b.txt,,,,,\n", 3, "task");
    expect_bad(HDR "x,v,similarity,a.txt,,,,,\nx,v,,b.txt,,,,,\n", 3, "own name");
    expect_bad(HDR "X Y,v,similarity,a.txt,,,,,\n", 2, "id");
    expect_bad(HDR "x,v,similarity,../a.txt,,,,,\n", 2, "relative");
    expect_bad(HDR "x,v,similarity,/etc/a.txt,,,,,\n", 2, "relative");
    expect_bad(HDR "x,v,similarity,a.txt;b.txt,,,,,\n", 2, "one file");
    expect_bad(HDR "x,v,similarity,a.txt,abc,,,,\n", 2, "hexadecimal");
    expect_bad(HDR "x,v,similarity,a.txt,,5,1,,\n", 2, "scale_min < scale_max");
    expect_bad(HDR "x,v,similarity,a.txt,,zero,1,,\n", 2, "number");
    expect_bad(HDR "x,v,similarity,a.txt,,,,sectioned,\n", 2, "only analogy");
    expect_bad(HDR "x,v,analogy,a.txt,,,,twisted,\n", 2, "sectioned");
    expect_bad(HDR "x,v,analogy,a.txt,,,,split,\n", 2, "answers file");
    expect_bad(HDR "x,v,analogy,a.txt,,0,1,,\n", 2, "no rating scale");
    expect_bad(HDR "x,v,similarity,a.txt,,,,,m1;m2\n", 2, "one archive member");
    expect_bad(HDR "x,v,similarity,a.txt,,,,,\ny,v\n", 3, "fields as in the header");
    /* A row after a quoted field spanning lines 2-3 is line 4. */
    expect_bad("id,variant,task,files,notes\nx,v,similarity,a.txt,\"two\nlines\"\nx,v,,b.txt,\n", 4,
               "own name");
    expect_bad("id,variant,task,files\nx,v,similarity,\"a.txt\n", 2, "unterminated");
    expect_bad("", 0, "empty manifest");
}

/* manifest-5: the built-in manifest (benchmarks-manifest/suites.csv)
 * parses and covers every suite id the project documents, with the
 * task each one has. */
static void test_builtin(void **state) {
    (void)state;
    vg_manifest *m = load(NULL);
    static const char *const sim[] = {"ws353", "ws353-sim", "ws353-rel", "simlex999", "men3k",
                                      "rw2034", "simverb3500", "mturk287", "mturk771", "rg65",
                                      "mc30", "yp130", "verb143", "card660"};
    static const char *const ana[] = {"google-analogy", "msr-analogy", "bats3"};
    for (size_t i = 0; i < sizeof sim / sizeof sim[0]; i++) {
        const vg_suite_entry *e = vg_manifest_find(m, sim[i]);
        if (!e) fail_msg("built-in manifest lacks %s", sim[i]);
        assert_int_equal(e->task, VG_TASK_SIMILARITY);
        assert_false(isnan(e->scale_min));
        assert_true(*e->citation != '\0');
        assert_true(*e->licence != '\0');
    }
    for (size_t i = 0; i < sizeof ana / sizeof ana[0]; i++) {
        const vg_suite_entry *e = vg_manifest_find(m, ana[i]);
        if (!e) fail_msg("built-in manifest lacks %s", ana[i]);
        assert_int_equal(e->task, VG_TASK_ANALOGY);
    }
    /* The grouping rule of the Google set (common practice). */
    assert_string_equal(vg_manifest_find(m, "google-analogy")->groups, "gram*=syntactic;*=semantic");
    assert_int_equal(vg_manifest_find(m, "bats3")->variants[0].analogy, VG_ANALOGY_RELATION);
    /* Every url is HTTPS: fetch refuses anything else. */
    for (size_t i = 0; i < vg_manifest_count(m); i++) {
        const vg_suite_entry *e = vg_manifest_get(m, i);
        for (size_t v = 0; v < e->n_variants; v++)
            if (*e->variants[v].url && strncmp(e->variants[v].url, "https://", 8) != 0)
                fail_msg("%s/%s: url is not https", e->id, e->variants[v].name);
    }
    vg_manifest_free(m);
}

/* manifest-6: the data directory: --data, then $VECGAUGE_DATA, then
 * $XDG_DATA_HOME/vecgauge (absolute only, per the XDG Base Directory
 * Specification), then $HOME/.local/share/vecgauge. */
static void test_data_dir(void **state) {
    (void)state;
    char buf[512];
    const char *src;
    vg_error err;
    vg_error_clear(&err);
    setenv("VECGAUGE_DATA", "/env/data", 1);
    setenv("XDG_DATA_HOME", "/xdg", 1);
    setenv("HOME", "/home/u", 1);
    assert_vg_ok(vg_data_dir("/given/", buf, sizeof buf, &src, &err), &err);
    assert_string_equal(buf, "/given");
    assert_string_equal(src, "--data");
    assert_vg_ok(vg_data_dir(NULL, buf, sizeof buf, &src, &err), &err);
    assert_string_equal(buf, "/env/data");
    assert_string_equal(src, "VECGAUGE_DATA");
    unsetenv("VECGAUGE_DATA");
    assert_vg_ok(vg_data_dir("", buf, sizeof buf, &src, &err), &err);
    assert_string_equal(buf, "/xdg/vecgauge");
    setenv("XDG_DATA_HOME", "relative/dir", 1);
    assert_vg_ok(vg_data_dir(NULL, buf, sizeof buf, &src, &err), &err);
    assert_string_equal(buf, "/home/u/.local/share/vecgauge");
    assert_string_equal(src, "HOME");
    unsetenv("XDG_DATA_HOME");
    unsetenv("HOME");
    assert_int_equal(vg_data_dir(NULL, buf, sizeof buf, &src, &err), VG_EINVAL);
    char tiny[8];
    assert_int_equal(vg_data_dir("/a/long/path", tiny, sizeof tiny, &src, &err), VG_ELIMIT);
}

/* manifest-7: allocation failures while parsing the built-in manifest
 * and reading a suite through it are VG_ENOMEM, never a crash or leak. */
static void test_alloc_failures(void **state) {
    (void)state;
    int parsed = 0, read = 0;
    for (long n = 0; n < 5000 && !(parsed && read); n++) {
        vg_manifest *m = NULL;
        vg_error err;
        vg_error_clear(&err);
        vg_alloc_fail_after(n);
        vg_status st = vg_manifest_load(fixture("manifest/mini.csv"), &m, &err);
        if (st == VG_OK) {
            parsed = 1;
            vg_suite *s = NULL;
            st = vg_suite_read_entry(vg_manifest_find(m, "ana-sec"), data(), &s, &err);
            if (st == VG_OK) read = 1;
            vg_suite_free(s);
        }
        vg_alloc_fail_after(-1);
        if (st != VG_OK) assert_int_equal(st, VG_ENOMEM);
        vg_manifest_free(m);
    }
    assert_true(parsed && read);
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_parse_mini),   cmocka_unit_test(test_read_entries),
        cmocka_unit_test(test_variant_fallback), cmocka_unit_test(test_errors),
        cmocka_unit_test(test_builtin),      cmocka_unit_test(test_data_dir),
        cmocka_unit_test(test_alloc_failures),
    };
    return cmocka_run_group_tests_name("manifest", tests, NULL, NULL);
}
