/* vganalogy.c - the analogy scorer from the command line, for the
 * reference tests (per-question answers) and the benchmark (timings).
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Usage:
 *   vganalogy answer VECTORS SUITE [-k] [-n VOCAB] [-j THREADS] [-K KERNELS]
 *       One line per question: status, then the answer of 3cosadd,
 *       3cosmul, pairdir and only_b ("-" when none), tab-separated.
 *       -k keeps the question words as candidates; -K forces a kernel
 *       variant (scalar, avx2, avx512f).
 *   vganalogy wilson K N LEVEL
 *       The Wilson interval of K successes in N trials ("low high").
 *   vganalogy bench MATRIX ROWS DIMS SUITE REPS [-j THREADS] [-o FILE]
 *       MATRIX is ROWS x DIMS raw float32 (row i is the word "w<i>").
 *       Times REPS runs of the whole scorer, of its sgemm phase alone and
 *       of everything but sgemm (the combine phase, on zero cosines),
 *       and OpenBLAS's sgemm on a 4096-cube, and prints "key value" lines;
 *       -o FILE writes the predicted rows (4 per question, -1 for none).
 */
#include <cblas.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "score/analogy_impl.h"
#include "vecgauge/vecgauge.h"

static void die(const vg_error *err) {
    char buf[1200];
    fprintf(stderr, "vganalogy: %s\n", vg_error_format(err, buf, sizeof buf));
    exit(1);
}

static double clock_s(clockid_t id) {
    struct timespec t;
    clock_gettime(id, &t);
    return (double)t.tv_sec + 1e-9 * (double)t.tv_nsec;
}

static double now(void) { return clock_s(CLOCK_MONOTONIC); }

/* CPU time of the whole process (all threads): less sensitive than wall
 * time to other work on a shared machine. */
static double cpu(void) { return clock_s(CLOCK_PROCESS_CPUTIME_ID); }

static int cmp_double(const void *a, const void *b) {
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

static void summary(const char *key, double *t, int n) {
    qsort(t, (size_t)n, sizeof *t, cmp_double);
    printf("%s_median %.4f\n%s_min %.4f\n%s_max %.4f\n", key, t[n / 2], key, t[0], key, t[n - 1]);
}

static const char *dump_path; /* bench -o FILE */

static void options(int argc, char **argv, int first, vg_score_options *so,
                    const vg_ana_kernels **kern) {
    for (int i = first; i < argc; i++) {
        if (strcmp(argv[i], "-o") == 0 && i + 1 < argc) {
            dump_path = argv[++i];
        } else if (strcmp(argv[i], "-k") == 0) {
            so->keep_question_words = 1;
        } else if (strcmp(argv[i], "-n") == 0 && i + 1 < argc) {
            so->analogy_vocab = strtoull(argv[++i], NULL, 10);
        } else if (strcmp(argv[i], "-j") == 0 && i + 1 < argc) {
            so->threads = (unsigned)strtoul(argv[++i], NULL, 10);
        } else if (strcmp(argv[i], "-K") == 0 && i + 1 < argc) {
            *kern = vg_ana_kernels_get(argv[++i]);
            if (!*kern) {
                fprintf(stderr, "vganalogy: kernels %s not available here\n", argv[i]);
                exit(3);
            }
        } else {
            fprintf(stderr, "vganalogy: unknown option %s\n", argv[i]);
            exit(2);
        }
    }
}

static int cmd_answer(int argc, char **argv) {
    vg_error err;
    vg_error_clear(&err);
    vg_score_options so;
    vg_score_options_init(&so);
    const vg_ana_kernels *kern = NULL;
    options(argc, argv, 4, &so, &kern);
    vg_vectors *v = NULL;
    vg_suite *s = NULL;
    vg_analogy_scores *sc = NULL;
    if (vg_vectors_load(argv[2], NULL, &v, &err) != VG_OK) die(&err);
    if (vg_suite_read_analogies(argv[3], NULL, NULL, VG_ANALOGY_AUTO, &s, &err) != VG_OK) die(&err);
    if (vg_analogy_score_with(v, s, &so, kern, 0, &sc, &err) != VG_OK) die(&err);
    for (size_t i = 0; i < sc->n_items; i++) {
        fputs(vg_item_status_name((vg_item_status)sc->status[i]), stdout);
        for (int m = 0; m < VG_METHOD_COUNT; m++) {
            size_t r = sc->predicted[m][i];
            printf("\t%s", r == VG_NOT_FOUND ? "-" : vg_vectors_word(v, r, NULL));
        }
        putchar('\n');
    }
    vg_analogy_scores_free(sc);
    vg_suite_free(s);
    vg_vectors_free(v);
    return 0;
}

static int cmd_bench(int argc, char **argv) {
    if (argc < 7) {
        fprintf(stderr, "usage: vganalogy bench MATRIX ROWS DIMS SUITE REPS [-j THREADS]\n");
        return 2;
    }
    size_t rows = strtoull(argv[3], NULL, 10), dims = strtoull(argv[4], NULL, 10);
    int reps = atoi(argv[6]);
    if (reps < 1) reps = 1;
    vg_score_options so;
    vg_score_options_init(&so);
    const vg_ana_kernels *kern = NULL;
    options(argc, argv, 7, &so, &kern);
    so.analogy_vocab = rows;
    vg_error err;
    vg_error_clear(&err);

    float *m = malloc(rows * dims * sizeof *m);
    char **words = malloc(rows * sizeof *words);
    FILE *fp = fopen(argv[2], "rb");
    if (!m || !words || !fp || fread(m, sizeof *m, rows * dims, fp) != rows * dims) {
        fprintf(stderr, "vganalogy: cannot read %s\n", argv[2]);
        return 1;
    }
    fclose(fp);
    for (size_t i = 0; i < rows; i++) {
        char w[32];
        snprintf(w, sizeof w, "w%zu", i);
        words[i] = strdup(w);
    }
    vg_vectors *v = NULL;
    vg_suite *s = NULL;
    if (vg_vectors_from_matrix((const char *const *)words, rows, m, dims, dims, &v, &err) != VG_OK)
        die(&err);
    free(m);
    for (size_t i = 0; i < rows; i++) free(words[i]);
    free(words);
    if (vg_suite_read_analogies(argv[5], NULL, NULL, VG_ANALOGY_AUTO, &s, &err) != VG_OK) die(&err);

    double *tf = calloc((size_t)reps, sizeof *tf), *tp = calloc((size_t)reps, sizeof *tp);
    double *cf = calloc((size_t)reps, sizeof *cf), *cp = calloc((size_t)reps, sizeof *cp);
    vg_analogy_scores *sc = NULL;
    /* One warm-up run first: freshly allocated memory is slow to touch. */
    for (int r = -1; r < reps; r++) {
        vg_analogy_scores_free(sc);
        double t0 = now(), c0 = cpu();
        if (vg_analogy_score_with(v, s, &so, kern, 0, &sc, &err) != VG_OK) die(&err);
        if (r >= 0) tf[r] = now() - t0, cf[r] = cpu() - c0;
    }
    for (int r = -1; r < reps; r++) {
        vg_analogy_scores *pp = NULL;
        double t0 = now(), c0 = cpu();
        if (vg_analogy_score_with(v, s, &so, kern, VG_ANA_PRODUCT_ONLY, &pp, &err) != VG_OK)
            die(&err);
        if (r >= 0) tp[r] = now() - t0, cp[r] = cpu() - c0;
        vg_analogy_scores_free(pp);
    }
    double *tc = calloc((size_t)reps, sizeof *tc);
    for (int r = -1; r < reps; r++) {
        vg_analogy_scores *pp = NULL;
        double t0 = now();
        if (vg_analogy_score_with(v, s, &so, kern, VG_ANA_NO_PRODUCT, &pp, &err) != VG_OK)
            die(&err);
        if (r >= 0) tc[r] = now() - t0;
        vg_analogy_scores_free(pp);
    }
    /* Distinct question words, to count the product's flops. */
    size_t n_used = sc->n_used;
    char **seen = calloc(3 * s->n_items + 1, sizeof *seen);
    size_t n_words = 0;
    for (size_t i = 0; i < s->n_items; i++) {
        if (sc->status[i] != VG_ITEM_SCORED) continue;
        const char *q[3] = {s->questions[i].a, s->questions[i].b, s->questions[i].c};
        for (int k = 0; k < 3; k++) {
            size_t j = 0;
            while (j < n_words && strcmp(seen[j], q[k]) != 0) j++;
            if (j == n_words) seen[n_words++] = (char *)(uintptr_t)q[k];
        }
    }
    free(seen);
    unsigned threads = so.threads ? so.threads : (unsigned)openblas_get_num_procs();
    printf("kernels %s\n", (kern ? kern : vg_ana_kernels_best())->name);
    printf("openblas_core %s\n", openblas_get_corename());
    printf("openblas_config %s\n", openblas_get_config());
    printf("threads %u\n", threads);
    printf("questions %zu\nscored %zu\nwords %zu\ncandidates %zu\ndims %zu\n", s->n_items, n_used,
           n_words, rows, dims);
    for (int mth = 0; mth < VG_METHOD_COUNT; mth++) {
        size_t c = 0;
        for (size_t i = 0; i < sc->n_items; i++) c += sc->correct[mth][i];
        printf("correct_%s %zu\n", vg_method_name((vg_method)mth), c);
    }
    if (dump_path) {
        /* The predicted rows, one question a line, for the bench to compare
         * with its numpy run. */
        FILE *out = fopen(dump_path, "w");
        if (!out) {
            perror(dump_path);
            return 1;
        }
        for (size_t i = 0; i < sc->n_items; i++)
            for (int mth = 0; mth < VG_METHOD_COUNT; mth++)
                fprintf(out, "%lld%c", sc->predicted[mth][i] == VG_NOT_FOUND ? -1LL
                                       : (long long)sc->predicted[mth][i],
                        mth + 1 < VG_METHOD_COUNT ? ' ' : '\n');
        fclose(out);
    }
    double flops = 2.0 * (double)n_words * (double)rows * (double)dims;
    summary("full", tf, reps);
    summary("product", tp, reps);
    summary("combine", tc, reps);
    summary("full_cpu", cf, reps);
    summary("product_cpu", cp, reps);
    printf("product_gflops %.1f\n", flops / tp[reps / 2] / 1e9);

    /* The machine's sgemm rate: a 4096-cube, with as many OpenBLAS threads
     * as the scorer has threads, best of three after a warm-up. */
    int nq = 4096;
    float *A = malloc((size_t)nq * nq * sizeof *A), *B = malloc((size_t)nq * nq * sizeof *B),
          *C = malloc((size_t)nq * nq * sizeof *C);
    for (size_t i = 0; i < (size_t)nq * nq; i++) {
        A[i] = (float)(i % 17) * 0.01f;
        B[i] = (float)(i % 13) * 0.02f;
    }
    int prev = openblas_get_num_threads();
    openblas_set_num_threads((int)threads);
    double best = 1e30;
    for (int r = 0; r < 4; r++) {
        double t0 = now();
        cblas_sgemm(CblasRowMajor, CblasNoTrans, CblasTrans, nq, nq, nq, 1.0f, A, nq, B, nq, 0.0f,
                    C, nq);
        double t = now() - t0;
        if (r > 0 && t < best) best = t;
    }
    openblas_set_num_threads(prev);
    printf("sgemm_gflops %.1f\n", 2.0 * nq * (double)nq * nq / best / 1e9);
    free(A);
    free(B);
    free(C);
    free(tf);
    free(tp);
    free(cf);
    free(cp);
    free(tc);
    vg_analogy_scores_free(sc);
    vg_suite_free(s);
    vg_vectors_free(v);
    return 0;
}

int main(int argc, char **argv) {
    if (argc == 5 && strcmp(argv[1], "wilson") == 0) {
        double lo, hi;
        vg_stats_wilson(strtoull(argv[2], NULL, 10), strtoull(argv[3], NULL, 10),
                        strtod(argv[4], NULL), &lo, &hi);
        printf("%.17g %.17g\n", lo, hi);
        return 0;
    }
    if (argc >= 4 && strcmp(argv[1], "answer") == 0) return cmd_answer(argc, argv);
    if (argc >= 2 && strcmp(argv[1], "bench") == 0) return cmd_bench(argc, argv);
    fprintf(stderr, "usage: vganalogy answer VECTORS SUITE [-k] [-n N] [-j T] [-K KERNELS]\n"
                    "       vganalogy wilson K N LEVEL\n"
                    "       vganalogy bench MATRIX ROWS DIMS SUITE REPS [-j THREADS]\n");
    return 2;
}
