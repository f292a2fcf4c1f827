/* vgbench.c - in-process timings for scripts/bench (never for tests).
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Usage: vgbench bootstrap N B THREADS KINDS REPEATS TIES
 *   Times vg_stats_corr_bootstrap on N synthetic pairs with B replicates.
 *   KINDS: "spearman" or "all"; TIES: "men" (ratings on 51 values, as
 *   MEN's 0-50 scale) or "distinct". Prints the median, min and max wall
 *   time in seconds over REPEATS runs, after one warm-up run.
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <time.h>

#include "vecgauge/vecgauge.h"

static double now(void) {
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec + 1e-9 * (double)ts.tv_nsec;
}

static int cmp_double(const void *a, const void *b) {
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

/* Deterministic data: human ratings and a noisy model score. */
static void make_data(size_t n, int men, double *x, double *y) {
    uint64_t s = 12345;
    for (size_t i = 0; i < n; i++) {
        s = s * 6364136223846793005ULL + 1442695040888963407ULL;
        double u = (double)(s >> 11) * 0x1.0p-53;
        s = s * 6364136223846793005ULL + 1442695040888963407ULL;
        double v = (double)(s >> 11) * 0x1.0p-53;
        x[i] = men ? (double)(int)(u * 51) : u * 50;
        y[i] = 0.6 * x[i] / 50 + 0.4 * v;
    }
}

static int bench_bootstrap(char **argv) {
    size_t n = (size_t)strtoull(argv[2], NULL, 10), B = (size_t)strtoull(argv[3], NULL, 10);
    unsigned threads = (unsigned)strtoul(argv[4], NULL, 10);
    int all = strcmp(argv[5], "all") == 0;
    int repeats = atoi(argv[6]);
    int men = strcmp(argv[7], "men") == 0;
    double *x = malloc(n * sizeof *x), *y = malloc(n * sizeof *y);
    double *t = malloc((size_t)(repeats > 0 ? repeats : 1) * sizeof *t);
    if (!x || !y || !t || repeats < 1) return 1;
    make_data(n, men, x, y);
    vg_corr_boot_options opt;
    vg_corr_boot_options_init(&opt);
    opt.replicates = B;
    opt.threads = threads;
    opt.kinds = all ? 0 : 1u << VG_CORR_SPEARMAN;
    vg_corr_estimate est[VG_CORR_COUNT];
    vg_error err;
    for (int r = -1; r < repeats; r++) {
        double t0 = now();
        if (vg_stats_corr_bootstrap(x, y, n, &opt, est, NULL, NULL, &err) != VG_OK) return 1;
        if (r >= 0) t[r] = now() - t0;
    }
    qsort(t, (size_t)repeats, sizeof *t, cmp_double);
    printf("%.3f %.3f %.3f\n", t[repeats / 2], t[0], t[repeats - 1]);
    free(x);
    free(y);
    free(t);
    return 0;
}

int main(int argc, char **argv) {
    if (argc == 8 && strcmp(argv[1], "bootstrap") == 0) return bench_bootstrap(argv);
    fprintf(stderr, "usage: vgbench bootstrap N B THREADS spearman|all REPEATS men|distinct\n");
    return 2;
}
