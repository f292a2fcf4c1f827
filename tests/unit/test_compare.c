/* test_compare.c - the comparison engine on hand-built paired items, saved
 * run fixtures, the history file and plot names.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "vgtest.h"

#include <sys/stat.h>

#include "common/alloc.h"
#include "compare/compare_impl.h"
#include "stats/resample.h"

/* 3CosAdd answers of two sets on 10 questions: 1 right, 0 wrong, -1 not
 * answered. Questions 7 and 8 (index 6, 7) are answered by one set only. */
static const signed char ans_a[10] = {1, 1, 1, 0, 0, 1, -1, 1, 0, 1};
static const signed char ans_b[10] = {1, 0, 0, 0, 1, 1, 1, -1, 0, 0};

static vg_paired_items analogy_items(const signed char **cor, vg_paired_suite *ps) {
    static const char *const labels[] = {"a", "b"};
    memset(cor, 0, 2 * VG_METHOD_COUNT * sizeof *cor);
    cor[0 * VG_METHOD_COUNT + VG_METHOD_3COSADD] = ans_a;
    cor[1 * VG_METHOD_COUNT + VG_METHOD_3COSADD] = ans_b;
    *ps = (vg_paired_suite){.id = "toy-ana", .task = VG_TASK_ANALOGY, .n_items = 10,
                            .correct = cor};
    return (vg_paired_items){.n_sets = 2, .labels = labels, .n_suites = 1, .suites = ps};
}

/* compare-1: common questions and McNemar by hand. Both sets answered
 * questions 1-6, 9, 10 (8 questions, 2 dropped); on them A is right on
 * 5 (accuracy 5/8) and B on 3 (3/8); only A right on questions 2, 3 and
 * 10, only B on question 5, so McNemar's exact p is 2 P(X <= 1) for
 * X ~ Binomial(4, 1/2) = 2 * 5/16 = 0.625 (by hand; scipy 1.10
 * binomtest(1, 4, 0.5).pvalue gives 0.625). */
static void test_analogy_common(void **state) {
    (void)state;
    const signed char *cor[2 * VG_METHOD_COUNT];
    vg_paired_suite ps;
    vg_paired_items in = analogy_items(cor, &ps);
    vg_compare_options o;
    vg_compare_options_init(&o);
    o.replicates = 0;
    vg_comparisons *c = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_compare(&in, &o, &c, &err), &err);
    assert_int_equal(c->n_rows, 1);
    const vg_comparison *r = &c->rows[0];
    assert_string_equal(r->metric, "3cosadd");
    assert_int_equal(r->n_compared, 8);
    assert_int_equal(r->n_dropped, 2);
    assert_close(r->score_a, 5.0 / 8, 1e-15, 0);
    assert_close(r->score_b, 3.0 / 8, 1e-15, 0);
    assert_close(r->diff, 0.25, 1e-15, 0);
    assert_int_equal(r->only_a, 3);
    assert_int_equal(r->only_b, 1);
    assert_close(r->p_mcnemar, 0.625, 1e-15, 0);
    assert_string_equal(r->test, "mcnemar-exact");
    assert_close(r->p_value, 0.625, 1e-15, 0);
    /* One test: Holm leaves it as it is (Holm 1979, m = 1). */
    assert_close(r->p_holm, 0.625, 1e-15, 0);
    assert_int_equal(r->significant, 0);
    assert_string_equal(r->interval, "");
    assert_int_equal(c->covered[0], 9);
    assert_int_equal(c->covered[1], 9);
    vg_comparisons_free(c);
}

/* compare-2: --no-common: each set on its own answered questions, A 6/9
 * and B 4/9 (by hand); McNemar still on the 8 both answered; without a
 * bootstrap no test applies to the as-is difference. */
static void test_analogy_as_is(void **state) {
    (void)state;
    const signed char *cor[2 * VG_METHOD_COUNT];
    vg_paired_suite ps;
    vg_paired_items in = analogy_items(cor, &ps);
    vg_compare_options o;
    vg_compare_options_init(&o);
    o.replicates = 0;
    o.items = VG_COMPARE_AS_IS;
    vg_comparisons *c = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_compare(&in, &o, &c, &err), &err);
    const vg_comparison *r = &c->rows[0];
    assert_close(r->score_a, 6.0 / 9, 1e-15, 0);
    assert_close(r->score_b, 4.0 / 9, 1e-15, 0);
    assert_int_equal(r->n_compared, 10);
    assert_int_equal(r->n_dropped, 0);
    assert_int_equal(r->only_a, 3);
    assert_int_equal(r->only_b, 1);
    assert_string_equal(r->test, "");
    assert_true(isnan(r->p_value));
    vg_comparisons_free(c);
    /* With a bootstrap the as-is test is the pair bootstrap's. */
    o.replicates = 200;
    assert_vg_ok(vg_compare(&in, &o, &c, &err), &err);
    assert_string_equal(c->rows[0].test, "pair-bootstrap");
    assert_true(c->rows[0].p_value > 0 && c->rows[0].p_value <= 1);
    vg_comparisons_free(c);
}

/* compare-3: three sets on 10 rated pairs, no bootstrap: Steiger's Z1* is
 * the test. rho of the ratings with the sets' cosines and between the
 * sets: scipy 1.10 spearmanr gives 0.9636363636363635, 0.8997002046464955,
 * -0.09118583155200968, r_ab(a, b) = 0.7598819296000807,
 * r_ab(a, c) = -0.18237166310401937, r_ab(b, c) = 0.05487804878048781. */
static void test_similarity_steiger(void **state) {
    (void)state;
    static const double h[10] = {1, 2, 3, 4, 5, 6, 7, 8, 9, 10};
    static const double a[10] = {0.1, 0.3, 0.2, 0.5, 0.4, 0.6, 0.8, 0.7, 0.9, 1.0};
    static const double b[10] = {0.2, 0.1, 0.4, 0.3, 0.6, 0.5, 0.5, 0.9, 0.7, 0.8};
    static const double cc[10] = {0.9, 0.1, 0.5, 0.2, 0.3, 0.8, 0.4, 0.6, 0.7, 0.1};
    const double *cos[3] = {a, b, cc};
    static const char *const labels[] = {"a", "b", "c"};
    vg_paired_suite ps = {.id = "toy", .task = VG_TASK_SIMILARITY, .n_items = 10, .rating = h,
                          .cosine = cos};
    vg_paired_items in = {.n_sets = 3, .labels = labels, .n_suites = 1, .suites = &ps};
    vg_compare_options o;
    vg_compare_options_init(&o);
    o.replicates = 0;
    vg_comparisons *c = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_compare(&in, &o, &c, &err), &err);
    assert_int_equal(c->n_rows, 3);
    const double rho[3] = {0.9636363636363635, 0.8997002046464955, -0.09118583155200968};
    const double rab[3] = {0.7598819296000807, -0.18237166310401937, 0.05487804878048781};
    const size_t pa[3] = {0, 0, 1}, pb[3] = {1, 2, 2};
    for (int i = 0; i < 3; i++) {
        const vg_comparison *r = &c->rows[i];
        assert_int_equal(r->set_a, pa[i]);
        assert_int_equal(r->set_b, pb[i]);
        assert_close(r->score_a, rho[pa[i]], 1e-14, 0);
        assert_close(r->score_b, rho[pb[i]], 1e-14, 0);
        assert_close(r->r_ab, rab[i], 1e-14, 0);
        vg_test_result z = vg_paired_steiger_z_spearman(rho[pa[i]], rho[pb[i]], rab[i], 10);
        assert_close(r->steiger_z, z.statistic, 1e-12, 0);
        assert_string_equal(r->test, "steiger-z1-bw");
        /* Holm: adjusted p at least the raw p; significant iff <= alpha. */
        assert_true(r->p_holm >= r->p_value);
        assert_int_equal(r->significant, r->p_holm <= 0.05);
    }
    assert_int_equal(c->n_tests, 3);
    /* Ranking: a (rho 0.96) > b > c; a and b each beat c only if
     * significant, and a ranks first whatever the tests say. */
    assert_int_equal(c->ranking[0].set, 0);
    assert_int_equal(c->ranking[1].set, 1);
    assert_int_equal(c->ranking[2].set, 2);
    assert_close(c->ranking[0].mean_rank, 1, 0, 0);
    vg_comparisons_free(c);

    /* compare-4: chosen pairs on chosen suites: (c, a) only. The common
     * items are those of the sets compared, and the row keeps the
     * order given. */
    const size_t pairs[2] = {2, 0};
    const unsigned char on[1] = {1};
    o.pairs = pairs;
    o.n_pairs = 1;
    o.pair_suites = on;
    assert_vg_ok(vg_compare(&in, &o, &c, &err), &err);
    assert_int_equal(c->n_rows, 1);
    assert_int_equal(c->rows[0].set_a, 2);
    assert_int_equal(c->rows[0].set_b, 0);
    assert_null(vg_comparisons_score(c, 0, "spearman", 1));
    assert_true(c->options.pairs == NULL);
    vg_comparisons_free(c);
    const unsigned char off[1] = {0};
    o.pair_suites = off;
    assert_vg_ok(vg_compare(&in, &o, &c, &err), &err);
    assert_int_equal(c->n_rows, 0);
    vg_comparisons_free(c);
    /* A pair out of range is the caller's error. */
    const size_t bad[2] = {0, 3};
    o.pairs = bad;
    o.pair_suites = NULL;
    assert_int_equal(vg_compare(&in, &o, &c, &err), VG_EINVAL);
    assert_null(c);
}

/* compare-5: the bootstrap p-value (Hall and Wilson 1991, with the +1 of
 * Davison and Hinkley 1997; from memory): replicates 0.1, -0.2, 0.3, NaN,
 * 0.05 of an estimate 0.1: |r - 0.1| >= 0.1 for -0.2 and 0.3, so
 * p = (1 + 2) / (4 + 1) = 0.6 (by hand). */
static void test_boot_p(void **state) {
    (void)state;
    const double reps[5] = {0.1, -0.2, 0.3, NAN, 0.05};
    assert_close(vg_cmp_boot_p(reps, 5, 0.1), 0.6, 1e-15, 0);
    assert_true(isnan(vg_cmp_boot_p(reps, 5, NAN)));
    const double none[2] = {NAN, NAN};
    assert_true(isnan(vg_cmp_boot_p(none, 2, 0.1)));
    /* A zero difference: every replicate is as extreme, p = 1. */
    assert_close(vg_cmp_boot_p(reps, 5, 0.0), 1.0, 1e-15, 0);
}

/* compare-ties-1 (issue 30): replicate differences of analogy accuracy
 * are formed as (right_a - right_b) / used, so that one mathematically
 * equal to the observed difference compares equal to it. 49 questions
 * sharing no pair (the question bootstrap: every replicate weighs 49 in
 * all); A is right on questions 0..20, B on 1..20, so d = 1/49 and a
 * replicate's d* = c0/49, c0 the multiplicity of question 0: |d* - d| >=
 * |d| exactly when c0 != 1, and the shifted p (Hall and Wilson 1991) is
 * (1 + #{c0 != 1}) / (B + 1). The old form right_a/49 - right_b/49 gets
 * some of those ties wrong by a rounding (checked here first, so that
 * the test reproduces the problem it guards against). */
static void test_analogy_ties(void **state) {
    (void)state;
    enum { N = 49, B = 400 };
    static signed char a[N], b[N];
    for (int i = 0; i < N; i++) {
        a[i] = i <= 20;
        b[i] = i >= 1 && i <= 20;
    }
    const signed char *cor[2 * VG_METHOD_COUNT] = {0};
    cor[0 * VG_METHOD_COUNT + VG_METHOD_3COSADD] = a;
    cor[1 * VG_METHOD_COUNT + VG_METHOD_3COSADD] = b;
    static const char *const labels[] = {"a", "b"};
    vg_paired_suite ps = {.id = "ties", .task = VG_TASK_ANALOGY, .n_items = N, .correct = cor};
    vg_paired_items in = {.n_sets = 2, .labels = labels, .n_suites = 1, .suites = &ps};
    uint32_t z[N], id[N];
    for (uint32_t i = 0; i < N; i++) {
        z[i] = 0;
        id[i] = i;
    }
    vg_error err;
    vg_pairboot_design *d;
    assert_vg_ok(vg_pairboot_design_new(z, 1, id, id, N, &d, &err), &err);
    double w[N];
    size_t extreme = 0, naive_wrong = 0;
    const double dd = (21.0 - 20.0) / N;
    for (size_t r = 0; r < B; r++) {
        assert_vg_ok(vg_pairboot_weights(d, VG_DEFAULT_SEED, vg_resample_stream("ties", ""), r, w,
                                         &err),
                     &err);
        double ra = 0, rb = 0, tot = 0;
        for (int i = 0; i < N; i++) {
            ra += w[i] * (a[i] == 1);
            rb += w[i] * (b[i] == 1);
            tot += w[i];
        }
        assert_close(tot, N, 0, 0);
        extreme += w[0] != 1;
        double naive = ra / tot - rb / tot;
        naive_wrong += (fabs(naive - dd) >= fabs(dd)) != (w[0] != 1);
    }
    vg_pairboot_design_free(d);
    assert_true(naive_wrong > 0);
    vg_compare_options o;
    vg_compare_options_init(&o);
    o.replicates = B;
    o.threads = 2;
    vg_comparisons *c = NULL;
    assert_vg_ok(vg_compare(&in, &o, &c, &err), &err);
    assert_close(c->rows[0].diff, dd, 0, 0);
    assert_close(c->rows[0].p_bootstrap, (1.0 + (double)extreme) / (B + 1.0), 0, 0);
    vg_comparisons_free(c);
}

/* compare-6: in-process results to paired items: a question's
 * correctness counts where the method predicted a word (as items.csv
 * writes it), -1 where it predicted none; a method not run stays NULL. */
static void test_from_results(void **state) {
    (void)state;
    static const char *const w[] = {"a", "b", "c", "d"};
    static const float m[] = {1, 0, 0, 1, 1, 0, 0, 1};
    vg_vectors *v = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_vectors_from_matrix(w, 4, m, 2, 2, &v, &err), &err);
    vg_question q[3];
    memset(q, 0, sizeof q);
    vg_suite s;
    memset(&s, 0, sizeof s);
    s.id = (char *)(uintptr_t)"hand-ana";
    s.task = VG_TASK_ANALOGY;
    s.n_items = 3;
    s.questions = q;
    const vg_suite *suites[1] = {&s};
    size_t pred0[3] = {1, VG_NOT_FOUND, 2}, pred1[3] = {0, 3, 2};
    unsigned char cor0[3] = {1, 0, 0}, cor1[3] = {0, 1, 1};
    unsigned char st[3] = {VG_ITEM_SCORED, VG_ITEM_MISSING_WORD, VG_ITEM_SCORED};
    vg_analogy_scores sa, sb;
    memset(&sa, 0, sizeof sa);
    memset(&sb, 0, sizeof sb);
    sa.n_items = sb.n_items = 3;
    sa.status = sb.status = st;
    sa.predicted[VG_METHOD_3COSADD] = pred0;
    sa.correct[VG_METHOD_3COSADD] = cor0;
    sb.predicted[VG_METHOD_3COSADD] = pred1;
    sb.correct[VG_METHOD_3COSADD] = cor1;
    vg_item_block blocks[2] = {{NULL, &sa}, {NULL, &sb}};
    char *labels[2] = {(char *)(uintptr_t)"x", (char *)(uintptr_t)"y"};
    const vg_vectors *vecs[2] = {v, v};
    vg_results r;
    memset(&r, 0, sizeof r);
    r.n_sets = 2;
    r.labels = labels;
    r.vectors = vecs;
    r.n_suites = 1;
    r.suites = suites;
    r.blocks = blocks;
    vg_paired_items *p = NULL;
    assert_vg_ok(vg_paired_items_from_results(&r, &p, &err), &err);
    const signed char *ca = p->suites[0].correct[0 * VG_METHOD_COUNT + VG_METHOD_3COSADD];
    const signed char *cb = p->suites[0].correct[1 * VG_METHOD_COUNT + VG_METHOD_3COSADD];
    assert_int_equal(ca[0], 1);
    assert_int_equal(ca[1], -1);
    assert_int_equal(ca[2], 0);
    assert_int_equal(cb[0], 0);
    assert_int_equal(cb[1], 1);
    assert_int_equal(cb[2], 1);
    assert_null(p->suites[0].correct[VG_METHOD_3COSMUL]);
    /* Questions 1 and 3 are common: A 1/2, B 1/2, one discordant each way. */
    vg_compare_options o;
    vg_compare_options_init(&o);
    o.replicates = 0;
    vg_comparisons *c = NULL;
    assert_vg_ok(vg_compare(p, &o, &c, &err), &err);
    assert_int_equal(c->rows[0].n_compared, 2);
    assert_int_equal(c->rows[0].only_a, 1);
    assert_int_equal(c->rows[0].only_b, 1);
    /* 3CosMul asked for but not run: not compared. */
    o.methods = (1u << VG_METHOD_3COSADD) | (1u << VG_METHOD_3COSMUL);
    vg_comparisons_free(c);
    assert_vg_ok(vg_compare(p, &o, &c, &err), &err);
    assert_int_equal(c->n_rows, 1);
    vg_comparisons_free(c);
    vg_paired_items_free(p);
    vg_vectors_free(v);
}

/* compare-7: saved analogy runs (hand-written fixtures) pair and compare:
 * 3CosAdd A = 1,1,0,1,-,0 and B = 1,0,0,1,1,-: common questions 1-4,
 * A 3/4, B 2/4, only A right on question 2, McNemar p = min(1, 2 * 1/2)
 * = 1 (by hand). 3CosMul A = 1,0,0,1,-,1, B = 1,1,0,0,1,-: 2/4 each,
 * one discordant each way. */
static void test_saved_runs(void **state) {
    (void)state;
    vg_error err;
    vg_error_clear(&err);
    vg_saved_run *a = NULL, *b = NULL;
    assert_vg_ok(vg_saved_run_load(fixture("runs/ana-a"), &a, &err), &err);
    assert_vg_ok(vg_saved_run_load(fixture("runs/ana-b/"), &b, &err), &err);
    assert_string_equal(a->labels[0], "set-a");
    assert_int_equal(a->n_suites, 1);
    assert_int_equal(a->suites[0].n_items, 6);
    assert_string_equal(a->suites[0].words[4 * 2 + 3], "smaller");
    /* No 3cosadd row in scores.csv: the accuracy over answered questions
     * from items.csv (3 of 5). */
    assert_close(a->scores[0].value, 3.0 / 5, 1e-15, 0);
    assert_int_equal(a->scores[0].n_used, 5);
    const vg_saved_run *runs[2] = {a, b};
    vg_paired_items *p = NULL;
    assert_vg_ok(vg_saved_runs_pair(runs, 2, 1, &p, &err), &err);
    vg_compare_options o;
    vg_compare_options_init(&o);
    o.replicates = 0;
    o.methods = (1u << VG_METHOD_3COSADD) | (1u << VG_METHOD_3COSMUL);
    vg_comparisons *c = NULL;
    assert_vg_ok(vg_compare(p, &o, &c, &err), &err);
    assert_int_equal(c->n_rows, 2);
    assert_string_equal(c->rows[0].metric, "3cosadd");
    assert_close(c->rows[0].score_a, 0.75, 1e-15, 0);
    assert_close(c->rows[0].score_b, 0.5, 1e-15, 0);
    assert_int_equal(c->rows[0].only_a, 1);
    assert_int_equal(c->rows[0].only_b, 0);
    assert_close(c->rows[0].p_mcnemar, 1.0, 1e-15, 0);
    assert_int_equal(c->rows[0].n_dropped, 2);
    assert_string_equal(c->rows[1].metric, "3cosmul");
    assert_int_equal(c->rows[1].only_a, 1);
    assert_int_equal(c->rows[1].only_b, 1);
    assert_int_equal(c->n_tests, 2);
    vg_comparisons_free(c);
    vg_paired_items_free(p);

    /* compare-8: refusals. Other words for an item, other suite files,
     * the same label twice. */
    vg_saved_run *w = NULL, *h = NULL;
    assert_vg_ok(vg_saved_run_load(fixture("runs/ana-words"), &w, &err), &err);
    assert_vg_ok(vg_saved_run_load(fixture("runs/ana-sha"), &h, &err), &err);
    const vg_saved_run *rw[2] = {a, w}, *rh[2] = {a, h}, *twice[2] = {a, a};
    assert_int_equal(vg_saved_runs_pair(rw, 2, 1, &p, &err), VG_EINVAL);
    assert_non_null(strstr(err.message, "item 3"));
    assert_null(p);
    assert_int_equal(vg_saved_runs_pair(rh, 2, 1, &p, &err), VG_EINVAL);
    assert_non_null(strstr(err.message, "sha256"));
    assert_int_equal(vg_saved_runs_pair(twice, 2, 1, &p, &err), VG_EINVAL);
    assert_non_null(strstr(err.message, "label 'set-a'"));
    /* Relabelled, the same run pairs with itself. */
    vg_saved_run *a2 = NULL;
    assert_vg_ok(vg_saved_run_load(fixture("runs/ana-a"), &a2, &err), &err);
    assert_vg_ok(vg_saved_run_relabel(a2, 0, "again", &err), &err);
    const vg_saved_run *same[2] = {a, a2};
    assert_vg_ok(vg_saved_runs_pair(same, 2, 1, &p, &err), &err);
    assert_string_equal(p->labels[1], "again");
    vg_paired_items_free(p);
    vg_saved_run_free(a2);
    vg_saved_run_free(w);
    vg_saved_run_free(h);
    vg_saved_run_free(a);
    vg_saved_run_free(b);

    /* compare-9: bad saved runs: a value that is not 1, 0 or empty (with
     * its line); an items.csv missing an item; not a run directory. */
    vg_saved_run *bad = NULL;
    assert_int_equal(vg_saved_run_load(fixture("runs/ana-badval"), &bad, &err), VG_EVALUE);
    assert_int_equal(err.line, 4);
    assert_null(bad);
    assert_int_equal(vg_saved_run_load(fixture("runs/ana-incomplete"), &bad, &err), VG_EFORMAT);
    assert_non_null(strstr(err.message, "item 7"));
    assert_int_equal(vg_saved_run_load(fixture("runs"), &bad, &err), VG_EIO);
    assert_non_null(strstr(err.message, "run.json"));
}

/* compare-10: every allocation of load, pair and compare fails in turn:
 * VG_ENOMEM each time, no leak (the sanitizer build checks), no crash. */
static void test_allocation_failures(void **state) {
    (void)state;
    int completed = 0;
    for (long n = 0; n < 100000 && !completed; n++) {
        vg_error err;
        vg_error_clear(&err);
        vg_saved_run *a = NULL, *b = NULL;
        vg_paired_items *p = NULL;
        vg_comparisons *c = NULL;
        vg_alloc_fail_after(n);
        vg_status st = vg_saved_run_load(fixture("runs/ana-a"), &a, &err);
        if (st == VG_OK) st = vg_saved_run_load(fixture("runs/ana-b"), &b, &err);
        if (st == VG_OK) {
            const vg_saved_run *runs[2] = {a, b};
            st = vg_saved_runs_pair(runs, 2, 1, &p, &err);
        }
        if (st == VG_OK) {
            vg_compare_options o;
            vg_compare_options_init(&o);
            o.replicates = 50;
            o.threads = 2;
            st = vg_compare(p, &o, &c, &err);
        }
        vg_alloc_fail_after(-1);
        if (st == VG_OK)
            completed = 1;
        else
            assert_int_equal(st, VG_ENOMEM);
        vg_comparisons_free(c);
        vg_paired_items_free(p);
        vg_saved_run_free(a);
        vg_saved_run_free(b);
    }
    assert_true(completed);
}

/* compare-11: the history file: created with its header on the first
 * append, read back exactly (numbers round-trip), a line cut short or a
 * foreign header refused with the line, and never rewritten. */
static void test_history(void **state) {
    (void)state;
    const char *path = temp_path("history.csv");
    unlink(path);
    vg_error err;
    vg_error_clear(&err);
    vg_history *h = NULL;
    assert_vg_ok(vg_history_open(path, &h, &err), &err);
    assert_int_equal(h->n_rows, 0);
    vg_history_row rows[2] = {
        {.step = 3, .run = "runs/a,b", .vectors = "v \"1\"", .suite = "s1",
         .task = VG_TASK_SIMILARITY, .metric = "spearman", .value = 0.1 + 0.2, .low = NAN,
         .high = NAN, .interval = "", .n_items = 10, .n_used = 9, .recorded = "t"},
        {.step = 4, .run = "r", .vectors = "v", .suite = "s2", .task = VG_TASK_ANALOGY,
         .metric = "3cosadd", .value = 2.0 / 3, .low = 0.5, .high = 0.75, .interval = "bca",
         .n_items = 3, .n_used = 3, .recorded = "t"}};
    assert_vg_ok(vg_history_append(h, rows, 2, &err), &err);
    vg_history_close(h);
    assert_vg_ok(vg_history_open(path, &h, &err), &err);
    assert_int_equal(h->n_rows, 2);
    assert_string_equal(h->rows[0].run, "runs/a,b");
    assert_string_equal(h->rows[0].vectors, "v \"1\"");
    assert_true(h->rows[0].value == 0.1 + 0.2);
    assert_true(isnan(h->rows[0].low));
    assert_true(h->rows[1].value == 2.0 / 3);
    assert_int_equal(h->rows[1].task, VG_TASK_ANALOGY);
    assert_int_equal(h->rows[1].step, 4);
    assert_int_equal(h->rows[1].line, 3);
    /* Appending again adds lines, no second header. */
    assert_vg_ok(vg_history_append(h, rows + 1, 1, &err), &err);
    vg_history_close(h);
    assert_vg_ok(vg_history_open(path, &h, &err), &err);
    assert_int_equal(h->n_rows, 3);
    vg_history_close(h);
    /* A last line without its newline: refused, the file untouched. */
    FILE *fp = fopen(path, "ab");
    assert_non_null(fp);
    fputs("5,r,v,s1,similarity,spearman,0.5", fp);
    fclose(fp);
    struct stat sb1, sb2;
    assert_int_equal(stat(path, &sb1), 0);
    assert_int_equal(vg_history_open(path, &h, &err), VG_EFORMAT);
    assert_null(h);
    assert_int_equal(stat(path, &sb2), 0);
    assert_int_equal(sb1.st_size, sb2.st_size);
    /* A damaged field, and another program's CSV. */
    write_file(path, "step,run,vectors,suite,task,metric,value,ci_low,ci_high,ci_method,n_items,"
                     "n_used,recorded_utc\n1,r,v,s,similarity,spearman,x,,,,3,3,t\n");
    assert_int_equal(vg_history_open(path, &h, &err), VG_EFORMAT);
    assert_int_equal(err.line, 2);
    write_file(path, "a,b\n1,2\n");
    assert_int_equal(vg_history_open(path, &h, &err), VG_EFORMAT);
    assert_int_equal(err.line, 1);
    unlink(path);
}

/* compare-12: plot file names: unsafe bytes become '_', a leading dot
 * too, and ids that map to one name get -2, -3 (common practice for
 * file names from labels). */
static void test_plot_names(void **state) {
    (void)state;
    const char *ids[] = {"ws353/rel", "ws353_rel", "", ".hidden", "ok-1.2", "ws353 rel"};
    char b[64];
    vg_plot_name(ids, 6, 0, b, sizeof b);
    assert_string_equal(b, "ws353_rel");
    vg_plot_name(ids, 6, 1, b, sizeof b);
    assert_string_equal(b, "ws353_rel-2");
    vg_plot_name(ids, 6, 2, b, sizeof b);
    assert_string_equal(b, "_");
    vg_plot_name(ids, 6, 3, b, sizeof b);
    assert_string_equal(b, "_hidden");
    vg_plot_name(ids, 6, 4, b, sizeof b);
    assert_string_equal(b, "ok-1.2");
    vg_plot_name(ids, 6, 5, b, sizeof b);
    assert_string_equal(b, "ws353_rel-3");
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_analogy_common),  cmocka_unit_test(test_analogy_as_is),
        cmocka_unit_test(test_similarity_steiger), cmocka_unit_test(test_boot_p),
        cmocka_unit_test(test_analogy_ties),
        cmocka_unit_test(test_from_results),    cmocka_unit_test(test_saved_runs),
        cmocka_unit_test(test_allocation_failures), cmocka_unit_test(test_history),
        cmocka_unit_test(test_plot_names),
    };
    return cmocka_run_group_tests(tests, NULL, NULL);
}
