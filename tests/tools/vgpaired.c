/* vgpaired.c - print libvecgauge's paired tests for given inputs, so that
 * end-to-end tests can compare them with R and scipy.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Usage: vgpaired steiger N R_HA R_HB R_AB    -> "z p" (pooled, Z1*)
 *        vgpaired steiger-unpooled N R_HA R_HB R_AB -> "z p"
 *        vgpaired williams N R_HA R_HB R_AB   -> "t df p"
 *        vgpaired mcnemar ONLY_A ONLY_B       -> "k p"
 *        vgpaired holm P1 P2 ...              -> adjusted p-values, one per line
 */
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "vecgauge/vecgauge.h"

int main(int argc, char **argv) {
    if (argc < 2) return 2;
    if ((strncmp(argv[1], "steiger", 7) == 0 || strcmp(argv[1], "williams") == 0) && argc == 6) {
        size_t n = (size_t)strtoull(argv[2], NULL, 10);
        double a = strtod(argv[3], NULL), b = strtod(argv[4], NULL), c = strtod(argv[5], NULL);
        if (argv[1][0] == 's') {
            vg_test_result r = vg_paired_steiger_z(a, b, c, n, strcmp(argv[1], "steiger") == 0);
            printf("%.17g %.17g\n", r.statistic, r.p_value);
        } else {
            vg_test_result r = vg_paired_williams_t(a, b, c, n);
            printf("%.17g %.17g %.17g\n", r.statistic, r.df, r.p_value);
        }
        return 0;
    }
    if (strcmp(argv[1], "mcnemar") == 0 && argc == 4) {
        vg_test_result r = vg_paired_mcnemar_exact((size_t)strtoull(argv[2], NULL, 10),
                                                   (size_t)strtoull(argv[3], NULL, 10));
        printf("%.17g %.17g\n", r.statistic, r.p_value);
        return 0;
    }
    if (strcmp(argv[1], "holm") == 0 && argc >= 3) {
        size_t m = (size_t)argc - 2;
        double *p = malloc(m * sizeof *p), *adj = malloc(m * sizeof *adj);
        size_t *w = malloc(m * sizeof *w);
        if (!p || !adj || !w) return 1;
        for (size_t i = 0; i < m; i++) p[i] = strtod(argv[i + 2], NULL);
        vg_paired_holm(p, m, adj, w);
        for (size_t i = 0; i < m; i++) printf("%.17g\n", adj[i]);
        free(p);
        free(adj);
        free(w);
        return 0;
    }
    fprintf(stderr, "vgpaired: bad arguments\n");
    return 2;
}
