/* vgstat.c - print libvecgauge statistics of numbers read from a file, so
 * that end-to-end tests can compare them with reference libraries.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Usage: vgstat STAT FILE
 *   FILE holds one "x y" pair of numbers per line.
 *   STAT: spearman | pearson | rank-x
 * Prints the result with %.17g (one value per line for rank-x).
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "vecgauge/vecgauge.h"

int main(int argc, char **argv) {
    if (argc != 3) {
        fprintf(stderr, "usage: vgstat STAT FILE\n");
        return 2;
    }
    FILE *fp = fopen(argv[2], "r");
    if (!fp) {
        perror(argv[2]);
        return 1;
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
    if (!x || !y) return 1;
    double *work = malloc((2 * n + 1) * sizeof *work);
    size_t *iw = malloc((n + 1) * sizeof *iw);
    if (!work || !iw) return 1;
    if (strcmp(argv[1], "spearman") == 0) {
        printf("%.17g\n", vg_stats_spearman(x, y, n, work));
    } else if (strcmp(argv[1], "pearson") == 0) {
        printf("%.17g\n", vg_stats_pearson(x, y, n));
    } else if (strcmp(argv[1], "rank-x") == 0) {
        vg_stats_rank(x, n, work, iw);
        for (size_t i = 0; i < n; i++) printf("%.17g\n", work[i]);
    } else {
        fprintf(stderr, "vgstat: unknown statistic %s\n", argv[1]);
        return 2;
    }
    free(x);
    free(y);
    free(work);
    free(iw);
    return 0;
}
