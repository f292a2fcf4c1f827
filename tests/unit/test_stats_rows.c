/* test_stats_rows.c - the similarity rows of vg_evaluate: order, intervals,
 * determinism, the raters' agreement, and what summary.md says of them.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "vgtest.h"

/* Five words in 3 dimensions; "Gamma" is capitalised so that the suite's
 * "gamma" is found only case-folded. */
static const char *const words[] = {"alpha", "beta", "Gamma", "delta", "eps"};
static const float data[] = {1, 0, 0, 0, 1, 0, 0.5f, 0.5f, 0, 0.2f, 0.1f, 1, 0.3f, 0.9f, 0.4f};

/* Pairs with individual ratings from the fourth column on; "beta delta"
 * has two ratings, the others three; "omega" is in no vector set. */
static const char pairs_text[] =
    "alpha\tbeta\t3.0\t3\t4\t2\n"
    "alpha\tgamma\t8.0\t8\t7\t9\n"
    "beta\tgamma\t6.0\t6\t5\t7\n"
    "alpha\tdelta\t1.3\t1\t1\t2\n"
    "beta\tdelta\t2.5\t2\t3\n"
    "gamma\tdelta\t5.0\t4\t6\t5\n"
    "eps\talpha\t4.0\t5\t3\t4\n"
    "eps\tbeta\t7.5\t8\t7\t7\n"
    "eps\tdelta\t2.0\t2\t1\t3\n"
    "omega\tbeta\t1.0\t1\t2\t1\n";

typedef struct fixture_t {
    vg_vectors *v;
    vg_suite *s;
} fixture_t;

static int setup(void **state) {
    static fixture_t f;
    vg_error err;
    vg_error_clear(&err);
    const char *path = temp_path("raters.tsv");
    write_file(path, pairs_text);
    vg_pairs_layout lay;
    vg_pairs_layout_init(&lay);
    lay.col_raters = 4;
    if (vg_vectors_from_matrix(words, 5, data, 3, 3, &f.v, &err) != VG_OK) return -1;
    if (vg_suite_read_pairs(path, "toy-raters", &lay, &f.s, &err) != VG_OK) return -1;
    unlink(path);
    *state = &f;
    return 0;
}

static int teardown(void **state) {
    fixture_t *f = *state;
    vg_suite_free(f->s);
    vg_vectors_free(f->v);
    return 0;
}

static vg_results *evaluate(const fixture_t *f, const vg_eval_options *o) {
    vg_error err;
    vg_error_clear(&err);
    vg_vector_set sets[] = {{"one", "", f->v}, {"two", "", f->v}};
    const vg_suite *suites[] = {f->s};
    vg_results *r = NULL;
    assert_vg_ok(vg_evaluate(sets, 2, suites, 1, o, &r, &err), &err);
    return r;
}

/* rows-1: per vector set six rows in the documented order, the _all rows
 * on every pair; each row has bca, percentile and fisher-z intervals with
 * the replicates counted; the values are those of vg_stats_* on the
 * scored pairs (and on all pairs, unscored ones at 0: common practice). */
static void test_row_order(void **state) {
    const fixture_t *f = *state;
    vg_eval_options o;
    vg_eval_options_init(&o);
    o.bootstrap = 500;
    vg_results *r = evaluate(f, &o);
    assert_int_equal(r->n_rows, 12);
    const vg_metric order[] = {VG_METRIC_SPEARMAN, VG_METRIC_PEARSON, VG_METRIC_KENDALL};
    const vg_similarity_scores *sc = vg_results_block(r, 0, 0)->sim;
    /* gamma is missing without --fold-case (3 pairs) and omega (1 pair). */
    assert_int_equal(sc->n_used, 6);
    assert_int_equal(sc->n_fold_recovered, 3);
    double hx[10], hy[10], ax[10], ay[10], dw[20];
    size_t iw[20], m = 0;
    for (size_t i = 0; i < 10; i++) {
        ax[i] = f->s->pairs[i].rating;
        ay[i] = sc->status[i] == VG_ITEM_SCORED ? sc->cosine[i] : 0.0;
        if (sc->status[i] == VG_ITEM_SCORED) hx[m] = ax[i], hy[m++] = ay[i];
    }
    for (size_t set = 0; set < 2; set++)
        for (size_t k = 0; k < 6; k++) {
            const vg_score_row *row = &r->rows[set * 6 + k];
            assert_int_equal(row->set, set);
            assert_int_equal(row->metric, order[k / 2]);
            assert_int_equal(row->all_items, (int)(k % 2));
            assert_int_equal(row->n_items, 10);
            assert_int_equal(row->n_used, 6);
            assert_int_equal(row->n_ci, 3);
            assert_string_equal(row->ci[0].method, "bca");
            assert_string_equal(row->ci[1].method, "percentile");
            assert_string_equal(row->ci[2].method, "fisher-z");
            assert_true(row->ci[0].replicates > 0 && row->ci[0].replicates <= 500);
            assert_int_equal(row->ci[2].replicates, 0);
            const double *x = k % 2 ? ax : hx, *y = k % 2 ? ay : hy;
            size_t n = k % 2 ? 10 : m;
            double want = order[k / 2] == VG_METRIC_SPEARMAN ? vg_stats_spearman(x, y, n, dw)
                          : order[k / 2] == VG_METRIC_PEARSON ? vg_stats_pearson(x, y, n)
                                                              : vg_stats_kendall(x, y, n, iw);
            assert_close(row->value, want, 1e-15, 0);
        }
    vg_results_free(r);
}

/* rows-2: the rows of two vector sets with the same vectors are equal,
 * intervals included (replicate b draws the same pairs for every set);
 * 1 and 4 threads give the same table; no bootstrap leaves the Fisher-z
 * interval alone in ci[0]. */
static void test_rows_deterministic(void **state) {
    const fixture_t *f = *state;
    vg_eval_options o;
    vg_eval_options_init(&o);
    o.bootstrap = 300;
    o.score.threads = 1;
    vg_results *a = evaluate(f, &o);
    o.score.threads = 4;
    vg_results *b = evaluate(f, &o);
    assert_int_equal(a->n_rows, b->n_rows);
    for (size_t i = 0; i < a->n_rows; i++) {
        assert_memory_equal(&a->rows[i].value, &b->rows[i].value, sizeof(double));
        for (size_t c = 0; c < a->rows[i].n_ci; c++) {
            assert_memory_equal(&a->rows[i].ci[c].low, &b->rows[i].ci[c].low, sizeof(double));
            assert_memory_equal(&a->rows[i].ci[c].high, &b->rows[i].ci[c].high, sizeof(double));
        }
    }
    for (size_t i = 0; i < 6; i++) {
        assert_memory_equal(&a->rows[i].ci[0].low, &a->rows[6 + i].ci[0].low, sizeof(double));
        assert_memory_equal(&a->rows[i].ci[1].high, &a->rows[6 + i].ci[1].high, sizeof(double));
    }
    vg_results_free(a);
    vg_results_free(b);
    o.bootstrap = 0;
    vg_results *c = evaluate(f, &o);
    assert_int_equal(c->rows[0].n_ci, 1);
    assert_string_equal(c->rows[0].ci[0].method, "fisher-z");
    vg_results_free(c);
}

/* Read a whole file into a static buffer. */
static const char *slurp(const char *path) {
    static char buf[65536];
    FILE *fp = fopen(path, "rb");
    assert_non_null(fp);
    size_t n = fread(buf, 1, sizeof buf - 1, fp);
    buf[n] = '\0';
    fclose(fp);
    return buf;
}

/* agreement-2: vg_evaluate carries the raters' agreement of the suite
 * (equal to vg_stats_agreement_loo on its ratings: agreement-1 checks
 * that by hand), and summary.md and agreement.csv report it, with the
 * note that pairs carry 2 to 3 ratings; summary.md says how many pairs
 * case folding would recover; intervals.csv lists every interval. */
static void test_agreement_reported(void **state) {
    const fixture_t *f = *state;
    vg_eval_options o;
    vg_eval_options_init(&o);
    o.bootstrap = 200;
    vg_results *r = evaluate(f, &o);
    const vg_agreement *a = vg_results_agreement(r, 0);
    assert_non_null(a);
    const double *rows[10];
    size_t counts[10];
    for (size_t i = 0; i < 10; i++) {
        rows[i] = f->s->pairs[i].raters;
        counts[i] = f->s->pairs[i].n_raters;
    }
    vg_agreement want;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_stats_agreement_loo(rows, counts, 10, &want, &err), &err);
    assert_close(a->value, want.value, 0, 0);
    assert_false(isnan(a->value));
    assert_int_equal(a->min_ratings, 2);
    assert_int_equal(a->max_ratings, 3);

    const char *path = temp_path("summary.md");
    FILE *fp = fopen(path, "w");
    assert_vg_ok(vg_report_summary_md(r, NULL, fp, path, &err), &err);
    fclose(fp);
    const char *md = slurp(path);
    char line[200];
    snprintf(line, sizeof line, "| toy-raters | %.3f | 3 | 2-3 | 10 |", a->value);
    assert_non_null(strstr(md, "## Human agreement"));
    /* ... and beside the scores in the Spearman table. */
    snprintf(line, sizeof line, "| toy-raters | 10 | %.3f | ", a->value);
    assert_non_null(strstr(md, line));
    assert_non_null(strstr(md, "| suite | pairs | raters | one | two |"));
    assert_non_null(strstr(md, line));
    assert_non_null(strstr(md, "pairs carry 2 to 3 ratings"));
    assert_non_null(strstr(md, "case folding would recover 3 more pairs"));
    assert_non_null(strstr(md, "BCa bootstrap interval"));

    fp = fopen(path, "w");
    assert_vg_ok(vg_report_agreement_csv(r, fp, path, &err), &err);
    fclose(fp);
    const char *csv = slurp(path);
    assert_non_null(strstr(csv, vg_report_agreement_header()));
    assert_non_null(strstr(csv, "toy-raters,loo-spearman,"));

    fp = fopen(path, "w");
    assert_vg_ok(vg_report_intervals_csv(r, fp, path, &err), &err);
    fclose(fp);
    csv = slurp(path);
    size_t lines = 0;
    for (const char *p = csv; *p; p++) lines += *p == '\n';
    assert_int_equal(lines, 1 + 12 * 3); /* header, 12 rows x 3 intervals */
    assert_non_null(strstr(csv, ",kendall_all,"));
    assert_non_null(strstr(csv, ",fisher-z,0.95,"));
    unlink(path);
    vg_results_free(r);
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_row_order),
        cmocka_unit_test(test_rows_deterministic),
        cmocka_unit_test(test_agreement_reported),
    };
    return cmocka_run_group_tests_name("stats_rows", tests, setup, teardown);
}
