/* test_track.c - tracking a run into a history: every rule that chooses
 * the step and the runs compared, the verdict, the recorded paths, and
 * the library's entry points on saved-run fixtures.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The rules are the project's own (DEVELOPERS.md, track.h); the expected
 * references are worked out by hand from the rows of each test.
 */
#include "vgtest.h"

#include <limits.h>
#include <sys/stat.h>

#include "common/alloc.h"
#include "track/track_impl.h"

/* A history row of run "r<step>", set "v", on suite s (spearman). */
static vg_history_row row(uint64_t step, const char *run, const char *suite, double value) {
    return (vg_history_row){.step = step, .run = run, .vectors = "v", .suite = suite,
                            .task = VG_TASK_SIMILARITY, .metric = "spearman", .value = value,
                            .low = NAN, .high = NAN, .interval = "", .recorded = ""};
}

static const vg_track_suite one_suite[1] = {{"ws", VG_TASK_SIMILARITY}};

/* Select for run (run, "v") at step over rows; the caller frees *out. */
static void select_refs(const vg_history_row *rows, size_t n, const char *run, uint64_t step,
                        const vg_track_suite *suites, size_t n_suites, vg_track_refs *out) {
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_track_select(rows, n, run, "v", step, suites, n_suites, out, &err), &err);
}

/* track-1: the default step is the largest in the history + 1, whatever
 * the order of its lines; 1 for an empty history. */
static void test_next_step(void **state) {
    (void)state;
    assert_int_equal(vg_track_next_step(NULL, 0), 1);
    vg_history_row rows[3] = {row(3, "a", "ws", 0.1), row(7, "b", "ws", 0.2),
                              row(1, "c", "ws", 0.3)};
    assert_int_equal(vg_track_next_step(rows, 3), 8);
    /* track-2: a step already present is found (its first line). */
    assert_int_equal(vg_track_step_row(rows, 3, 7), 1);
    assert_int_equal(vg_track_step_row(rows, 3, 5), -1);
}

/* track-3: the previous run is the largest step strictly below the run's,
 * and of two lines at that step the later one. */
static void test_previous(void **state) {
    (void)state;
    vg_history_row rows[5] = {row(1, "r1", "ws", 0.5), row(3, "r3", "ws", 0.4),
                              row(3, "r3b", "ws", 0.3), row(5, "r5", "ws", 0.2),
                              row(2, "r2", "ws", 0.1)};
    vg_track_refs s;
    select_refs(rows, 5, "new", 4, one_suite, 1, &s);
    assert_true(s.n_refs >= 1);
    assert_string_equal(s.refs[0].run, "r3b");
    assert_int_equal(s.refs[0].step, 3);
    assert_true(s.refs[0].prev);
    vg_track_refs_free(&s);
    /* Nothing earlier than step 1: no reference at all. */
    select_refs(rows, 5, "new", 1, one_suite, 1, &s);
    assert_int_equal(s.n_refs, 0);
    assert_int_equal(s.best_of[0], -1);
    vg_track_refs_free(&s);
}

/* track-4 (the bug of issue 25): with steps 1 to 6 in a history and the
 * highest score at step 4, a run tracked as step 2 is compared with
 * step 1 alone: the "best earlier run" is never a later step. */
static void test_best_is_earlier(void **state) {
    (void)state;
    vg_history_row rows[6] = {row(1, "r1", "ws", 0.50), row(2, "r2", "ws", 0.55),
                              row(3, "r3", "ws", 0.60), row(4, "r4", "ws", 0.70),
                              row(5, "r5", "ws", 0.65), row(6, "r6", "ws", 0.62)};
    vg_track_refs s;
    select_refs(rows, 6, "again", 2, one_suite, 1, &s);
    assert_int_equal(s.n_refs, 1);
    assert_string_equal(s.refs[0].run, "r1");
    assert_int_equal(s.best_of[0], 0);
    for (size_t i = 0; i < s.n_refs; i++) assert_true(s.refs[i].step < 2);
    vg_track_refs_free(&s);
    /* At step 7, the best earlier run is step 4, beside the previous (6). */
    select_refs(rows, 6, "r7", 7, one_suite, 1, &s);
    assert_int_equal(s.n_refs, 2);
    assert_string_equal(s.refs[0].run, "r6");
    assert_true(s.refs[0].prev);
    assert_string_equal(s.refs[1].run, "r4");
    assert_false(s.refs[1].prev);
    assert_int_equal(s.best_of[0], 1);
    vg_track_refs_free(&s);
    /* At step 5 (inserted before 5 and 6): step 4 is both the previous
     * and the best, one reference. */
    select_refs(rows, 6, "r4b", 5, one_suite, 1, &s);
    assert_int_equal(s.n_refs, 1);
    assert_string_equal(s.refs[0].run, "r4");
    assert_true(s.refs[0].prev);
    assert_int_equal(s.best_of[0], 0);
    vg_track_refs_free(&s);
}

/* track-5: the best earlier run of each suite: the highest value on the
 * suite's headline metric; ties to the earlier line; an undefined value
 * (NaN) or another metric never counts. */
static void test_best_per_suite(void **state) {
    (void)state;
    vg_history_row rows[8] = {
        row(1, "r1", "ws", 0.60), row(1, "r1", "men", 0.40),
        row(2, "r2", "ws", 0.60), row(2, "r2", "men", NAN),
        row(3, "r3", "ws", 0.10), row(3, "r3", "men", 0.30),
        row(2, "r2", "goog", 0.90), row(1, "r1", "goog", 0.20),
    };
    rows[6].task = rows[7].task = VG_TASK_ANALOGY;
    rows[6].metric = "3cosmul"; /* not the headline of an analogy suite */
    rows[7].metric = "3cosadd";
    const vg_track_suite suites[3] = {{"ws", VG_TASK_SIMILARITY},
                                      {"men", VG_TASK_SIMILARITY},
                                      {"goog", VG_TASK_ANALOGY}};
    vg_track_refs s;
    select_refs(rows, 8, "r4", 4, suites, 3, &s);
    /* Previous: step 3. ws: 0.60 at steps 1 and 2, the earlier line
     * (step 1). men: 0.40 (step 1; step 2's is undefined). goog: the
     * 3cosadd line of step 1, not step 2's 3cosmul. */
    assert_int_equal(s.n_refs, 2);
    assert_string_equal(s.refs[0].run, "r3");
    assert_string_equal(s.refs[1].run, "r1");
    assert_int_equal(s.best_of[0], 1);
    assert_int_equal(s.best_of[1], 1);
    assert_int_equal(s.best_of[2], 1);
    vg_track_refs_free(&s);
    /* A suite no earlier row has: no best. */
    const vg_track_suite other[1] = {{"rw", VG_TASK_SIMILARITY}};
    select_refs(rows, 8, "r4", 4, other, 1, &s);
    assert_int_equal(s.n_refs, 1);
    assert_int_equal(s.best_of[0], -1);
    vg_track_refs_free(&s);
}

/* track-6: rows of the run itself (same directory and set) are never a
 * reference, even at an earlier step; the same directory with another
 * set is. */
static void test_not_itself(void **state) {
    (void)state;
    vg_history_row rows[3] = {row(1, "r1", "ws", 0.2), row(2, "same", "ws", 0.9),
                              row(3, "same", "ws", 0.8)};
    rows[2].vectors = "w";
    vg_track_refs s;
    select_refs(rows, 3, "same", 4, one_suite, 1, &s);
    /* Previous: step 3 (set w of the same directory); best: step 3 too
     * (0.8), since step 2 is this run and set. */
    assert_int_equal(s.n_refs, 1);
    assert_int_equal(s.refs[0].step, 3);
    assert_string_equal(s.refs[0].vectors, "w");
    assert_int_equal(s.best_of[0], 0);
    vg_track_refs_free(&s);
}

/* track-7: distinct runs of a history, for "N runs before it": a run
 * counts once however many suites it has lines for. */
static void test_count_runs(void **state) {
    (void)state;
    vg_history_row rows[5] = {row(1, "r1", "ws", 0.1), row(1, "r1", "men", 0.1),
                              row(2, "r2", "ws", 0.1), row(2, "r1", "ws", 0.1),
                              row(2, "r2", "men", 0.1)};
    assert_int_equal(vg_track_count_runs(rows, 5), 3);
    assert_int_equal(vg_track_count_runs(rows, 0), 0);
}

/* track-8: the verdict: a suite regressed when one of its rows is
 * significant with the tracked set (set a) worse; significant and better,
 * or worse but not significant, is no regression. */
static void test_verdict(void **state) {
    (void)state;
    char *ids[3] = {(char *)(uintptr_t)"ws", (char *)(uintptr_t)"men",
                    (char *)(uintptr_t)"goog"};
    vg_comparison rows[4];
    memset(rows, 0, sizeof rows);
    rows[0] = (vg_comparison){.suite = 0, .diff = -0.1, .significant = 0};
    rows[1] = (vg_comparison){.suite = 0, .diff = 0.2, .significant = 1};
    rows[2] = (vg_comparison){.suite = 1, .diff = -0.05, .significant = 1};
    rows[3] = (vg_comparison){.suite = 2, .diff = NAN, .significant = 1};
    vg_comparisons c;
    memset(&c, 0, sizeof c);
    c.n_suites = 3;
    c.suite_ids = ids;
    c.rows = rows;
    c.n_rows = 4;
    /* The tracked run's suites in another order than the comparison's. */
    const char *const mine[3] = {"goog", "men", "ws"};
    unsigned char reg[3] = {9, 9, 9};
    vg_track_verdict(&c, mine, 3, reg);
    assert_int_equal(reg[0], 0);
    assert_int_equal(reg[1], 1);
    assert_int_equal(reg[2], 0);
    vg_track_verdict(NULL, mine, 3, reg);
    assert_int_equal(reg[1], 0);
}

/* track-9: how the history records a run: relative to its folder, "."
 * for the folder itself, absolute when they share only the root; and how
 * a recorded path is found again. */
static void test_paths(void **state) {
    (void)state;
    struct {
        const char *from, *target, *want;
    } cases[] = {
        {"/w/h", "/w/h/run1", "run1"},   {"/w/h", "/w/runs/r", "../runs/r"},
        {"/w/h/deep", "/w/r", "../../r"}, {"/w/h", "/w/h", "."},
        {"/a", "/b/c", "/b/c"},           {"/w/ab", "/w/a/r", "../a/r"},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        char *got = vg_track_relative(cases[i].from, cases[i].target);
        assert_string_equal(got, cases[i].want);
        vg_free(got);
    }
    char *f = vg_track_folder_of("h.csv"), *g = vg_track_folder_of("/h.csv"),
         *h = vg_track_folder_of("x/y/h.csv"), *r1 = vg_track_resolve("x/y", "../r"),
         *r2 = vg_track_resolve("x/y", "/abs/r");
    assert_string_equal(f, ".");
    assert_string_equal(g, "/");
    assert_string_equal(h, "x/y");
    assert_string_equal(r1, "x/y/../r");
    assert_string_equal(r2, "/abs/r");
    vg_free(f);
    vg_free(g);
    vg_free(h);
    vg_free(r1);
    vg_free(r2);
    char buf[64];
    vg_track_plots_dir("runs/history.csv", buf, sizeof buf);
    assert_string_equal(buf, "runs/history-plots");
    vg_track_plots_dir("h.txt", buf, sizeof buf);
    assert_string_equal(buf, "h.txt-plots");
}

/* The absolute path of a fixture (a static buffer). */
static const char *abs_fixture(const char *name) {
    static char buf[PATH_MAX];
    char *p = realpath(fixture(name), NULL);
    assert_non_null(p);
    snprintf(buf, sizeof buf, "%s", p);
    free(p);
    return buf;
}

/* Copy the three files of fixture run src into the folder dst. */
static void copy_run(const char *src, const char *dst) {
    mkdir(dst, 0777);
    const char *files[3] = {"run.json", "scores.csv", "items.csv"};
    for (int i = 0; i < 3; i++) {
        char in[3 * PATH_MAX], out[3 * PATH_MAX], buf[8192];
        snprintf(in, sizeof in, "%s/%s", src, files[i]);
        snprintf(out, sizeof out, "%s/%s", dst, files[i]);
        FILE *fi = fopen(in, "rb"), *fo = fopen(out, "wb");
        assert_non_null(fi);
        assert_non_null(fo);
        size_t n;
        while ((n = fread(buf, 1, sizeof buf, fi)) > 0) fwrite(buf, 1, n, fo);
        fclose(fi);
        fclose(fo);
    }
}

/* A history in a fresh folder beside copies c1 ... c6 of the fixture runs
 * ana-a (set-a, odd steps) and ana-b (set-b, even steps), each at its
 * step, 3CosAdd accuracy 0.1 * step except step 4, the best (0.9). */
static const char *make_history(const char *name) {
    static char path[2 * PATH_MAX];
    const char *dir = temp_path(name);
    char folder[PATH_MAX];
    snprintf(folder, sizeof folder, "%s", dir);
    mkdir(folder, 0777);
    snprintf(path, sizeof path, "%s/history.csv", folder);
    unlink(path);
    char a[PATH_MAX], b[PATH_MAX];
    snprintf(a, sizeof a, "%s", abs_fixture("runs/ana-a"));
    snprintf(b, sizeof b, "%s", abs_fixture("runs/ana-b"));
    vg_error err;
    vg_error_clear(&err);
    vg_history *h = NULL;
    assert_vg_ok(vg_history_open(path, &h, &err), &err);
    vg_history_row rows[6];
    static const char *const runs[6] = {"c1", "c2", "c3", "c4", "c5", "c6"};
    for (int i = 0; i < 6; i++) {
        int odd = (i + 1) % 2;
        char dst[2 * PATH_MAX];
        snprintf(dst, sizeof dst, "%s/%s", folder, runs[i]);
        copy_run(odd ? a : b, dst);
        rows[i] = (vg_history_row){.step = (uint64_t)i + 1, .run = runs[i],
                                   .vectors = odd ? "set-a" : "set-b", .suite = "mini-ana",
                                   .task = VG_TASK_ANALOGY, .metric = "3cosadd",
                                   .value = i == 3 ? 0.9 : 0.1 * (i + 1), .low = NAN,
                                   .high = NAN, .interval = "", .n_items = 6, .n_used = 5,
                                   .recorded = "2026-12-01T00:00:00Z"};
    }
    assert_vg_ok(vg_history_append(h, rows, 6, &err), &err);
    vg_history_close(h);
    return path;
}

static long file_size(const char *path) {
    struct stat sb;
    return stat(path, &sb) == 0 ? (long)sb.st_size : -1;
}

/* track-10: the library on saved runs. A step already in the history is
 * refused (VG_EINVAL, nothing appended) unless allow_existing_step; the
 * run tracked as step 2 of 6 is compared with step 1 alone; the default
 * step is 7, compared with step 6 (previous) and step 4 (best); the
 * references are labelled "step N"; appending adds one line. */
static void test_track_saved(void **state) {
    (void)state;
    const char *hist = make_history("track10");
    long before = file_size(hist);
    vg_error err;
    vg_error_clear(&err);
    vg_track_options o;
    vg_track_options_init(&o);
    o.step = 4;
    vg_track *t = NULL;
    assert_int_equal(vg_track_begin(hist, fixture("runs/ana-b"), &o, &t, &err), VG_EINVAL);
    assert_null(t);
    assert_non_null(strstr(err.message, "step 4 is already in"));
    assert_int_equal(file_size(hist), before);

    o.step = 2;
    o.allow_existing_step = 1;
    assert_vg_ok(vg_track_begin(hist, fixture("runs/ana-b"), &o, &t, &err), &err);
    assert_int_equal(vg_track_step(t), 2);
    assert_int_equal(vg_track_n_references(t), 1);
    assert_int_equal(vg_track_reference_step(t, 0), 1);
    assert_true(vg_track_reference_is_previous(t, 0));
    assert_int_equal(vg_track_best(t, 0), 0);
    const vg_comparisons *c = vg_track_comparisons(t);
    assert_non_null(c);
    assert_string_equal(c->labels[c->rows[0].set_a], "step 2");
    assert_string_equal(c->labels[c->rows[0].set_b], "step 1");
    vg_track_free(t); /* never appended: the history is as it was */
    assert_int_equal(file_size(hist), before);

    vg_track_options_init(&o);
    assert_vg_ok(vg_track_begin(hist, fixture("runs/ana-b"), &o, &t, &err), &err);
    assert_int_equal(vg_track_step(t), 7);
    assert_int_equal(vg_track_runs_before(t), 6);
    assert_int_equal(vg_track_n_references(t), 2);
    assert_int_equal(vg_track_reference_step(t, 0), 6);
    assert_int_equal(vg_track_reference_step(t, 1), 4);
    assert_int_equal(vg_track_best(t, 0), 1);
    assert_string_equal(vg_track_label(t), "set-b");
    assert_string_equal(vg_track_suite_id(t, 0), "mini-ana");
    /* Both references hold the same answers as ana-b or ana-a: with no
     * bootstrap in the fixtures, McNemar decides; nothing is significant
     * on six questions. */
    assert_int_equal(vg_track_n_regressed(t), 0);
    assert_vg_ok(vg_track_append(t, &err), &err);
    assert_int_equal(vg_track_append(t, &err), VG_EINVAL);
    vg_track_free(t);
    vg_history *h = NULL;
    assert_vg_ok(vg_history_open(hist, &h, &err), &err);
    assert_int_equal(h->n_rows, 7);
    assert_int_equal(h->rows[6].step, 7);
    assert_string_equal(h->rows[6].vectors, "set-b");
    assert_close(h->rows[6].value, 0.6, 1e-15, 0);
    vg_history_close(h);

    /* track-11: the set to track: a label the run lacks is refused. */
    o.vectors = "nope";
    assert_int_equal(vg_track_begin(hist, fixture("runs/ana-b"), &o, &t, &err), VG_EINVAL);
    assert_non_null(strstr(err.message, "no vector set 'nope'"));
    assert_null(t);
    /* track-12: a reference run that has gone: its step and the history
     * named, nothing appended. */
    char gone[2 * PATH_MAX], moved[3 * PATH_MAX];
    snprintf(gone, sizeof gone, "%s", hist);
    snprintf(strrchr(gone, '/'), sizeof gone - (size_t)(strrchr(gone, '/') - gone), "/c4");
    snprintf(moved, sizeof moved, "%s.moved", gone);
    assert_int_equal(rename(gone, moved), 0);
    before = file_size(hist);
    vg_track_options_init(&o);
    assert_int_equal(vg_track_begin(hist, fixture("runs/ana-b"), &o, &t, &err), VG_EIO);
    assert_non_null(strstr(err.message, "run at step 4 named by"));
    assert_int_equal(file_size(hist), before);
    assert_int_equal(rename(moved, gone), 0);
    char cmd[3 * PATH_MAX];
    snprintf(cmd, sizeof cmd, "rm -rf '%s'", temp_path("track10"));
    assert_int_equal(system(cmd), 0);
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_next_step),      cmocka_unit_test(test_previous),
        cmocka_unit_test(test_best_is_earlier), cmocka_unit_test(test_best_per_suite),
        cmocka_unit_test(test_not_itself),     cmocka_unit_test(test_count_runs),
        cmocka_unit_test(test_verdict),        cmocka_unit_test(test_paths),
        cmocka_unit_test(test_track_saved),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
