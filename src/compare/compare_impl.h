/* compare_impl.h - parts of the comparison engine shared between its files.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_COMPARE_IMPL_H
#define VG_COMPARE_IMPL_H

#include <stddef.h>

#include "../common/internal.h"
#include "vecgauge/compare.h"

/* The comparisons being built, with the capacities of its arrays. */
typedef struct vg_cmp_build {
    vg_comparisons *c;
    size_t cap_rows, cap_scores;
    const size_t *pairs;      /* 2 * n_pairs set indices */
    size_t n_pairs;
    const unsigned char *pair_suites; /* n_pairs * n_suites, or NULL: all */
    unsigned char *in_pair;   /* n_sets: 1 if the set is in some pair compared
                                 on the suite at hand */
} vg_cmp_build;

/* 1 if pair p is compared on suite k. */
static inline int vg_cmp_pair_on(const vg_cmp_build *b, size_t p, size_t k) {
    return !b->pair_suites || b->pair_suites[p * b->c->n_suites + k];
}

/* Append a row / a score (copied). -1 when out of memory. */
VG_INTERNAL int vg_cmp_add_row(vg_cmp_build *b, const vg_comparison *row);
VG_INTERNAL int vg_cmp_add_score(vg_cmp_build *b, const vg_compared_score *s);

/* The rows and scores of similarity suite k. */
VG_INTERNAL vg_status vg_cmp_similarity(vg_cmp_build *b, const vg_paired_items *in, size_t k,
                                        vg_error *err);

/* The rows and scores of analogy suite k, for every compared method. */
VG_INTERNAL vg_status vg_cmp_analogy(vg_cmp_build *b, const vg_paired_items *in, size_t k,
                                     vg_error *err);

/* Hall and Wilson's (1991) two-sided bootstrap p-value of theta = 0 from
 * the replicates reps[0..B) (NaN ones left out):
 *   p = (1 + #{|reps_r - theta| >= |theta|}) / (B' + 1).
 * NaN when theta is NaN or no replicate is defined. */
VG_INTERNAL double vg_cmp_boot_p(const double *reps, size_t B, double theta);

/* Fill row's interval from a bootstrap summary: BCa when defined, else
 * the percentile interval, else none. */
VG_INTERNAL void vg_cmp_interval(const vg_boot_summary *s, double *low, double *high,
                                 const char **method);

/* A comparison row with every number undefined. */
VG_INTERNAL vg_comparison vg_cmp_row_init(size_t suite, size_t a, size_t b, vg_task task,
                                          const char *metric, size_t n_items);

/* A new vg_paired_items with room for n_sets labels and n_suites suites
 * (zeroed; *labels and *suites receive them writable), or NULL. Memory for its arrays comes from vg_paired_alloc and
 * is freed with it. */
VG_INTERNAL vg_paired_items *vg_paired_new(size_t n_sets, size_t n_suites, const char ***labels,
                                           vg_paired_suite **suites);

/* n zeroed elements of size bytes owned by p, or NULL. */
VG_INTERNAL void *vg_paired_alloc(vg_paired_items *p, size_t n, size_t size);

#endif /* VG_COMPARE_IMPL_H */
