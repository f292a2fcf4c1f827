/* test_analogy_public.c - the public analogy suites in
 * ../shared/public-benchmarks, read, counted and scored.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Every test skips, saying why, when ../shared is absent (a fresh clone
 * has no ../shared); its files are read in place, never copied.
 */
#include "vgtest.h"

#define SHARED "../shared/public-benchmarks/"

static int present(const char *path) {
    if (access(path, R_OK) == 0) return 1;
    print_message("# %s is absent (a fresh clone has no ../shared): skipped\n", path);
    return 0;
}

/* The counts of questions per section of questions-words.txt, in file
 * order: ../shared/public-benchmarks/SOURCES.md (counted there), which
 * also matches the published total of Mikolov et al. (2013), "Efficient
 * Estimation of Word Representations in Vector Space", arXiv:1301.3781:
 * 19,544 questions in 14 sections (from memory). */
static const struct {
    const char *name;
    size_t count;
} google_sections[14] = {
    {"capital-common-countries", 506}, {"capital-world", 4524},
    {"currency", 866},                 {"city-in-state", 2467},
    {"family", 506},                   {"gram1-adjective-to-adverb", 992},
    {"gram2-opposite", 812},           {"gram3-comparative", 1332},
    {"gram4-superlative", 1122},       {"gram5-present-participle", 1056},
    {"gram6-nationality-adjective", 1599}, {"gram7-past-tense", 1560},
    {"gram8-plural", 1332},            {"gram9-plural-verbs", 870}};

/* public-1: google-analogy read and counted. */
static void test_google_counts(void **state) {
    (void)state;
    const char *p = SHARED "google-analogy/questions-words.txt";
    if (!present(p)) skip();
    vg_suite *s = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_suite_read_analogies(p, NULL, "google-analogy", VG_ANALOGY_AUTO, &s, &err),
                 &err);
    assert_int_equal(s->n_items, 19544);
    assert_int_equal(s->n_sections, 14);
    for (int k = 0; k < 14; k++) {
        assert_string_equal(s->sections[k].name, google_sections[k].name);
        assert_int_equal(s->sections[k].count, google_sections[k].count);
    }
    /* SOURCES.md: the first line is "Athens Greece Baghdad Iraq" (mixed
     * case kept as written). */
    assert_string_equal(s->questions[0].a, "Athens");
    assert_string_equal(s->questions[0].answers[0], "Iraq");
    vg_suite_free(s);
}

/* public-2: msr-analogy read and counted: 8,000 questions (SOURCES.md,
 * counted; Mikolov, Yih and Zweig (2013), "Linguistic Regularities in
 * Continuous Space Word Representations", NAACL-HLT: 8,000, from memory),
 * tab-separated with CRLF, no sections, 1,000 of them with a possessive
 * apostrophe (SOURCES.md). */
static void test_msr_counts(void **state) {
    (void)state;
    const char *p = SHARED "msr-analogy/msr.txt";
    if (!present(p)) skip();
    vg_suite *s = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_suite_read_analogies(p, NULL, "msr-analogy", VG_ANALOGY_AUTO, &s, &err), &err);
    assert_int_equal(s->n_items, 8000);
    assert_int_equal(s->n_sections, 1);
    size_t apostrophe = 0;
    for (size_t i = 0; i < s->n_items; i++) {
        const vg_question *q = &s->questions[i];
        apostrophe += strchr(q->a, '\'') || strchr(q->b, '\'') || strchr(q->c, '\'') ||
                      strchr(q->answers[0], '\'');
        assert_null(strchr(q->answers[0], '\r'));
    }
    assert_int_equal(apostrophe, 1000);
    vg_suite_free(s);
}

/* public-3: google-analogy scored with random vectors for its words, the
 * sections grouped as the trade does (names starting with "gram" are
 * syntactic, the rest semantic: common practice): the group rows hold
 * 8,869 semantic and 10,675 syntactic questions (Mikolov et al. 2013,
 * Table 1, from memory; also the sums of the SOURCES.md section counts),
 * every question is covered, and the accuracies are proportions of them. */
static void test_google_scored(void **state) {
    (void)state;
    const char *p = SHARED "google-analogy/questions-words.txt";
    if (!present(p)) skip();
    vg_suite *s = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_suite_read_analogies(p, NULL, "google-analogy", VG_ANALOGY_AUTO, &s, &err),
                 &err);
    for (size_t k = 0; k < s->n_sections; k++)
        s->sections[k].group = strncmp(s->sections[k].name, "gram", 4) == 0 ? "syntactic"
                                                                            : "semantic";
    /* Distinct words, each a random 32-dimensional row. */
    size_t cap = 4 * s->n_items, n = 0;
    const char **w = calloc(cap, sizeof *w);
    assert_non_null(w);
    for (size_t i = 0; i < s->n_items; i++) {
        const char *q[4] = {s->questions[i].a, s->questions[i].b, s->questions[i].c,
                            s->questions[i].answers[0]};
        for (int k = 0; k < 4; k++) {
            size_t j = 0;
            while (j < n && strcmp(w[j], q[k]) != 0) j++;
            if (j == n) w[n++] = q[k];
        }
    }
    assert_int_equal(n, 905); /* distinct words of the file (counted with sort -u) */
    float *data = calloc(n * 32, sizeof *data);
    assert_non_null(data);
    uint64_t z = 99;
    for (size_t i = 0; i < n * 32; i++) {
        z = z * 6364136223846793005ULL + 1442695040888963407ULL;
        data[i] = (float)((double)(z >> 11) * 0x1.0p-53 - 0.5);
    }
    vg_vectors *v = NULL;
    assert_vg_ok(vg_vectors_from_matrix(w, n, data, 32, 32, &v, &err), &err);
    vg_eval_options eo;
    vg_eval_options_init(&eo);
    eo.bootstrap = 0;
    vg_vector_set set = {"random", "", v};
    const vg_suite *suites[] = {s};
    vg_results *r = NULL;
    assert_vg_ok(vg_evaluate(&set, 1, suites, 1, &eo, &r, &err), &err);
    const vg_score_row *sem = vg_results_find(r, 0, 0, "semantic", VG_METRIC_3COSADD, 0);
    const vg_score_row *syn = vg_results_find(r, 0, 0, "syntactic", VG_METRIC_3COSADD, 0);
    const vg_score_row *all = vg_results_find(r, 0, 0, "", VG_METRIC_3COSADD, 0);
    assert_non_null(sem);
    assert_non_null(syn);
    assert_non_null(all);
    assert_int_equal(sem->n_items, 8869);
    assert_int_equal(syn->n_items, 10675);
    assert_int_equal(all->n_used, 19544);
    const vg_analogy_scores *sc = vg_results_block(r, 0, 0)->ana;
    size_t correct = 0;
    for (size_t i = 0; i < s->n_items; i++) correct += sc->correct[VG_METHOD_3COSADD][i];
    assert_close(all->value, (double)correct / 19544.0, 1e-15, 0);
    assert_close(all->value * 19544.0, sem->value * 8869.0 + syn->value * 10675.0, 1e-9, 0);
    vg_results_free(r);
    vg_vectors_free(v);
    free(data);
    free(w);
    vg_suite_free(s);
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_google_counts),
        cmocka_unit_test(test_msr_counts),
        cmocka_unit_test(test_google_scored),
    };
    return cmocka_run_group_tests_name("analogy_public", tests, NULL, NULL);
}
