/* vgstat.c - print libvecgauge statistics of numbers read from a file, so
 * that end-to-end tests can compare them with reference libraries.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Usage:
 *   vgstat spearman|pearson|kendall|rank-x FILE
 *   vgstat bootstrap FILE B SEED THREADS LEVEL [STREAM_NAME [KINDS]]
 *   vgstat replicates FILE B SEED [STREAM_NAME]
 *   vgstat indices N B SEED [STREAM_NAME]
 *   vgstat intervals REPS_FILE JACK_FILE THETA LEVEL
 *   vgstat fisher spearman|pearson|kendall R N LEVEL
 *   vgstat agreement PAIRS_FILE COL_RATERS
 *   vgstat pairboot DESIGN_FILE B SEED THREADS [STREAM_NAME]
 * FILE holds one "x y" pair of numbers per line; y may be "nan" (an item
 * not scored: resampled, but left out of the statistics). STREAM_NAME
 * names the resampling stream as a suite id would (default "vgstat");
 * KINDS the correlations to bootstrap, e.g. "spearman" (default: all).
 * Every number is printed with %.17g.
 *
 *   bootstrap: one line per correlation (spearman, pearson, kendall):
 *     name value n replicates se pct_low pct_high z0 accel bca_low
 *     bca_high fisher_low fisher_high
 *   replicates: B lines "spearman pearson kendall" (replicate order),
 *     then a line "jackknife", then n such lines (leave item i out)
 *   indices: B lines of N indices, the items replicate r draws
 *   intervals: vg_stats_boot_summary of the replicate values in REPS_FILE
 *     (one per line) with jackknife values JACK_FILE: "pct_low pct_high
 *     z0 accel bca_low bca_high replicates"
 *   agreement: "value columns columns_used min_ratings max_ratings n_items"
 *   pairboot: DESIGN_FILE holds one question a line, "stratum row col x1
 *     .. xk" (integers); prints "levels s R C I" per stratum, then per
 *     replicate r and stratum s "draw r s" with the row, column and
 *     isolated multiplicities separated by "|", per replicate "weights r"
 *     and the n question weights, and "sums r s" with the k totals
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "../../src/stats/resample.h"
#include "vecgauge/vecgauge.h"

static int read_column_pairs(const char *path, double **xo, double **yo, size_t *no) {
    FILE *fp = fopen(path, "r");
    if (!fp) {
        perror(path);
        return -1;
    }
    size_t n = 0, cap = 1024;
    double *x = malloc(cap * sizeof *x), *y = malloc(cap * sizeof *y);
    while (x && y && fscanf(fp, "%lf %lf", &x[n], &y[n]) == 2) {
        if (++n == cap) {
            cap *= 2;
            x = realloc(x, cap * sizeof *x);
            y = realloc(y, cap * sizeof *y);
        }
    }
    fclose(fp);
    if (!x || !y) return -1;
    *xo = x;
    *yo = y;
    *no = n;
    return 0;
}

static int read_values(const char *path, double **vo, size_t *no) {
    FILE *fp = fopen(path, "r");
    if (!fp) {
        perror(path);
        return -1;
    }
    size_t n = 0, cap = 1024;
    double *v = malloc(cap * sizeof *v);
    while (v && fscanf(fp, "%lf", &v[n]) == 1)
        if (++n == cap) v = realloc(v, (cap *= 2) * sizeof *v);
    fclose(fp);
    if (!v) return -1;
    *vo = v;
    *no = n;
    return 0;
}

static const char *const corr_names[VG_CORR_COUNT] = {"spearman", "pearson", "kendall"};

static int parse_corr(const char *s, vg_corr *out) {
    for (int k = 0; k < VG_CORR_COUNT; k++)
        if (strcmp(s, corr_names[k]) == 0) {
            *out = (vg_corr)k;
            return 0;
        }
    return -1;
}

static int usage(void) {
    fprintf(stderr, "usage: vgstat STAT ARGS... (see tests/tools/vgstat.c)\n");
    return 2;
}

static int cmd_bootstrap(int argc, char **argv, int print_reps) {
    /* bootstrap FILE B SEED THREADS LEVEL [STREAM] | replicates FILE B SEED [STREAM] */
    double *x, *y;
    size_t n;
    if (read_column_pairs(argv[2], &x, &y, &n) != 0) return 1;
    vg_corr_boot_options o;
    vg_corr_boot_options_init(&o);
    o.replicates = strtoull(argv[3], NULL, 10);
    o.seed = strtoull(argv[4], NULL, 10);
    const char *stream = "vgstat";
    if (print_reps) {
        if (argc > 5) stream = argv[5];
    } else {
        o.threads = (unsigned)strtoul(argv[5], NULL, 10);
        o.level = strtod(argv[6], NULL);
        if (argc > 7) stream = argv[7];
        for (int k = 0; argc > 8 && k < VG_CORR_COUNT; k++)
            if (strstr(argv[8], corr_names[k])) o.kinds |= 1u << k;
    }
    o.stream = vg_resample_stream(stream, "");
    vg_corr_estimate e[VG_CORR_COUNT];
    double *reps = malloc((3 * o.replicates + 1) * sizeof *reps);
    double *jack = malloc((3 * n + 1) * sizeof *jack);
    vg_error err;
    vg_error_clear(&err);
    if (!reps || !jack) return 1;
    if (vg_stats_corr_bootstrap(x, y, n, &o, e, reps, jack, &err) != VG_OK) {
        char b[1200];
        fprintf(stderr, "vgstat: %s\n", vg_error_format(&err, b, sizeof b));
        return 1;
    }
    if (print_reps) {
        size_t B = o.replicates;
        for (size_t r = 0; r < B; r++)
            printf("%.17g %.17g %.17g\n", reps[r], reps[B + r], reps[2 * B + r]);
        printf("jackknife\n");
        for (size_t i = 0; i < n; i++)
            printf("%.17g %.17g %.17g\n", jack[i], jack[n + i], jack[2 * n + i]);
    } else {
        for (int k = 0; k < VG_CORR_COUNT; k++) {
            const vg_corr_estimate *q = &e[k];
            printf("%s %.17g %zu %zu %.17g %.17g %.17g %.17g %.17g %.17g %.17g %.17g %.17g\n",
                   corr_names[k], q->value, q->n, q->boot.replicates, q->boot.se,
                   q->boot.pct_low, q->boot.pct_high, q->boot.z0, q->boot.accel,
                   q->boot.bca_low, q->boot.bca_high, q->fisher_low, q->fisher_high);
        }
    }
    free(reps);
    free(jack);
    free(x);
    free(y);
    return 0;
}

static int cmd_indices(int argc, char **argv) {
    size_t n = strtoull(argv[2], NULL, 10), B = strtoull(argv[3], NULL, 10);
    uint64_t seed = strtoull(argv[4], NULL, 10);
    uint64_t stream = vg_resample_stream(argc > 5 ? argv[5] : "vgstat", "");
    gsl_rng *rng = vg_resample_rng_alloc();
    size_t *idx = malloc((n + 1) * sizeof *idx);
    if (!rng || !idx) return 1;
    for (size_t r = 0; r < B; r++) {
        vg_resample_seed(rng, seed, stream, r);
        vg_resample_draw(rng, n, idx);
        for (size_t i = 0; i < n; i++) printf(i ? " %zu" : "%zu", idx[i]);
        putchar('\n');
    }
    gsl_rng_free(rng);
    free(idx);
    return 0;
}

static int cmd_intervals(char **argv) {
    double *reps, *jack;
    size_t B, nj;
    if (read_values(argv[2], &reps, &B) != 0 || read_values(argv[3], &jack, &nj) != 0) return 1;
    vg_boot_summary s;
    vg_stats_boot_summary(reps, B, strtod(argv[4], NULL), jack, nj, strtod(argv[5], NULL), &s);
    printf("%.17g %.17g %.17g %.17g %.17g %.17g %zu\n", s.pct_low, s.pct_high, s.z0, s.accel,
           s.bca_low, s.bca_high, s.replicates);
    free(reps);
    free(jack);
    return 0;
}

static int cmd_agreement(char **argv) {
    vg_pairs_layout lay;
    vg_pairs_layout_init(&lay);
    lay.col_raters = (unsigned)strtoul(argv[3], NULL, 10);
    vg_suite *s = NULL;
    vg_error err;
    vg_error_clear(&err);
    char b[1200];
    if (vg_suite_read_pairs(argv[2], NULL, &lay, &s, &err) != VG_OK) {
        fprintf(stderr, "vgstat: %s\n", vg_error_format(&err, b, sizeof b));
        return 1;
    }
    const double **r = calloc(s->n_items + 1, sizeof *r);
    size_t *c = calloc(s->n_items + 1, sizeof *c);
    if (!r || !c) return 1;
    for (size_t i = 0; i < s->n_items; i++) {
        r[i] = s->pairs[i].raters;
        c[i] = s->pairs[i].n_raters;
    }
    vg_agreement a;
    if (vg_stats_agreement_loo(r, c, s->n_items, &a, &err) != VG_OK) {
        fprintf(stderr, "vgstat: %s\n", vg_error_format(&err, b, sizeof b));
        return 1;
    }
    printf("%.17g %zu %zu %zu %zu %zu\n", a.value, a.columns, a.columns_used, a.min_ratings,
           a.max_ratings, a.n_items);
    free(r);
    free(c);
    vg_suite_free(s);
    return 0;
}

static int cmd_pairboot(int argc, char **argv) {
    FILE *fp = fopen(argv[2], "r");
    if (!fp) {
        perror(argv[2]);
        return 1;
    }
    size_t n = 0, cap = 0, k = 0, S = 0;
    uint32_t *st = NULL, *row = NULL, *col = NULL;
    unsigned char *xs = NULL; /* n * 16 */
    char line[4096];
    while (fgets(line, sizeof line, fp)) {
        if (n == cap) {
            cap = cap ? 2 * cap : 256;
            st = realloc(st, cap * sizeof *st);
            row = realloc(row, cap * sizeof *row);
            col = realloc(col, cap * sizeof *col);
            xs = realloc(xs, cap * 16);
            if (!st || !row || !col || !xs) return 1;
        }
        char *p = line, *e;
        unsigned long v[19];
        size_t m = 0;
        while (m < 19 && (v[m] = strtoul(p, &e, 10), e != p)) {
            p = e;
            m++;
        }
        if (m < 3) continue;
        if (k == 0) k = m - 3;
        if (m - 3 != k || k > 16) return 2;
        st[n] = (uint32_t)v[0];
        row[n] = (uint32_t)v[1];
        col[n] = (uint32_t)v[2];
        for (size_t j = 0; j < k; j++) xs[n * 16 + j] = (unsigned char)v[3 + j];
        if (st[n] + 1 > S) S = st[n] + 1;
        n++;
    }
    fclose(fp);
    vg_pairboot_options opt;
    vg_pairboot_options_init(&opt);
    opt.replicates = strtoull(argv[3], NULL, 10);
    opt.seed = strtoull(argv[4], NULL, 10);
    opt.threads = (unsigned)strtoul(argv[5], NULL, 10);
    opt.stream = vg_resample_stream(argc > 6 ? argv[6] : "vgstat", "");
    vg_error err;
    vg_pairboot_design *d;
    if (vg_pairboot_design_new(st, S, row, col, n, &d, &err) != VG_OK) {
        fprintf(stderr, "vgstat: %s\n", err.message);
        return 1;
    }
    unsigned char **x = calloc(k + 1, sizeof *x);
    double *sums = calloc(opt.replicates * S * k + 1, sizeof *sums);
    double *wq = calloc(n + 1, sizeof *wq);
    uint32_t *w = calloc(n + 1, sizeof *w), *v = calloc(n + 1, sizeof *v), *u = calloc(n + 1, sizeof *u);
    if (!x || !sums || !wq || !w || !v || !u) return 1;
    for (size_t j = 0; j < k; j++) {
        x[j] = calloc(n + 1, 1);
        if (!x[j]) return 1;
        for (size_t i = 0; i < n; i++) x[j][i] = xs[i * 16 + j];
    }
    if (vg_pairboot_sums(d, &opt, (const unsigned char *const *)x, k, sums, &err) != VG_OK) {
        fprintf(stderr, "vgstat: %s\n", err.message);
        return 1;
    }
    for (size_t s = 0; s < S; s++) {
        size_t R, C, I;
        vg_pairboot_design_levels(d, s, &R, &C, &I);
        printf("levels %zu %zu %zu %zu\n", s, R, C, I);
    }
    for (size_t r = 0; r < opt.replicates; r++) {
        for (size_t s = 0; s < S; s++) {
            size_t R, C, I;
            vg_pairboot_design_levels(d, s, &R, &C, &I);
            vg_pairboot_draws(d, opt.seed, opt.stream, r, s, w, v, u);
            printf("draw %zu %zu", r, s);
            for (size_t i = 0; i < R; i++) printf(" %u", w[i]);
            printf(" |");
            for (size_t i = 0; i < C; i++) printf(" %u", v[i]);
            printf(" |");
            for (size_t i = 0; i < I; i++) printf(" %u", u[i]);
            printf("\n");
        }
        if (vg_pairboot_weights(d, opt.seed, opt.stream, r, wq, &err) != VG_OK) return 1;
        printf("weights %zu", r);
        for (size_t i = 0; i < n; i++) printf(" %.17g", wq[i]);
        printf("\n");
        for (size_t s = 0; s < S; s++) {
            printf("sums %zu %zu", r, s);
            for (size_t j = 0; j < k; j++) printf(" %.17g", sums[(r * S + s) * k + j]);
            printf("\n");
        }
    }
    for (size_t j = 0; j < k; j++) free(x[j]);
    free(x);
    free(sums);
    free(wq);
    free(w);
    free(v);
    free(u);
    free(st);
    free(row);
    free(col);
    free(xs);
    vg_pairboot_design_free(d);
    return 0;
}

int main(int argc, char **argv) {
    if (argc < 3) return usage();
    const char *stat = argv[1];
    if (strcmp(stat, "bootstrap") == 0) return argc >= 7 ? cmd_bootstrap(argc, argv, 0) : usage();
    if (strcmp(stat, "replicates") == 0) return argc >= 5 ? cmd_bootstrap(argc, argv, 1) : usage();
    if (strcmp(stat, "indices") == 0) return argc >= 5 ? cmd_indices(argc, argv) : usage();
    if (strcmp(stat, "intervals") == 0) return argc >= 6 ? cmd_intervals(argv) : usage();
    if (strcmp(stat, "agreement") == 0) return argc >= 4 ? cmd_agreement(argv) : usage();
    if (strcmp(stat, "pairboot") == 0) return argc >= 6 ? cmd_pairboot(argc, argv) : usage();
    if (strcmp(stat, "fisher") == 0) {
        vg_corr k;
        if (argc < 6 || parse_corr(argv[2], &k) != 0) return usage();
        double lo, hi;
        vg_stats_fisher_interval(k, strtod(argv[3], NULL), strtoull(argv[4], NULL, 10),
                                 strtod(argv[5], NULL), &lo, &hi);
        printf("%.17g %.17g\n", lo, hi);
        return 0;
    }

    double *x, *y;
    size_t n;
    if (read_column_pairs(argv[2], &x, &y, &n) != 0) return 1;
    double *work = malloc((2 * n + 1) * sizeof *work);
    size_t *iw = malloc((2 * n + 1) * sizeof *iw);
    if (!work || !iw) return 1;
    if (strcmp(stat, "spearman") == 0) {
        printf("%.17g\n", vg_stats_spearman(x, y, n, work));
    } else if (strcmp(stat, "pearson") == 0) {
        printf("%.17g\n", vg_stats_pearson(x, y, n));
    } else if (strcmp(stat, "kendall") == 0) {
        printf("%.17g\n", vg_stats_kendall(x, y, n, iw));
    } else if (strcmp(stat, "rank-x") == 0) {
        vg_stats_rank(x, n, work, iw);
        for (size_t i = 0; i < n; i++) printf("%.17g\n", work[i]);
    } else {
        fprintf(stderr, "vgstat: unknown statistic %s\n", stat);
        return 2;
    }
    free(x);
    free(y);
    free(work);
    free(iw);
    return 0;
}
