/* analogy_rows.c - the score rows of one vector set on one analogy suite:
 * accuracy per method on the whole suite, per section and per group, with
 * the pair bootstrap's interval and Wilson's.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The questions of a section are built from a few word pairs, and those
 * sharing a pair succeed or fail together, so the headline interval is the
 * pair bootstrap (vg_pairboot_sums: Owen's 2007 pigeonhole bootstrap over
 * each section's pairs), run once per set and suite: every subset's
 * replicate is the ratio of its sections' weighted totals, so the whole
 * suite, its sections and its groups share one set of draws. The interval
 * is the percentile one. BCa is not offered: its acceleration comes from
 * a jackknife over independent units, and a crossed design has none (a
 * pair left out removes a row and a column of questions at once), nor is
 * second-order accuracy known for this bootstrap (Owen shows only that its
 * variance is mildly conservative). Wilson's interval stays beside it,
 * named for what it assumes: independent questions.
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/strmap.h"
#include "../stats/resample.h"
#include "../stats/stats_impl.h"
#include "eval_impl.h"
#include "vecgauge/stats.h"

/* Value columns of the pair bootstrap: right per method, then scored,
 * then every question. */
#define COL_USED VG_METHOD_COUNT
#define COL_ALL (VG_METHOD_COUNT + 1)
#define NCOL (VG_METHOD_COUNT + 2)

/* What one set's block of a suite gives every subset. */
typedef struct block {
    size_t n_strata;
    double *tot;       /* n_strata * NCOL: exact totals per stratum */
    double *sums;      /* B * n_strata * NCOL replicate totals, or NULL */
    size_t B;
    double *cov, *all; /* scratch: B each */
} block;

/* The rows of one subset, the strata sub[0..ns): per method, accuracy on
 * the covered questions and on all questions. */
static vg_status subset_rows(vg_results *r, size_t *cap, size_t set, size_t suite,
                             const char *name, const size_t *sub, size_t ns, block *bk,
                             const vg_eval_options *opt, vg_error *err) {
    size_t S = bk->n_strata, B = bk->B;
    double t[NCOL] = {0};
    for (size_t q = 0; q < ns; q++)
        for (size_t j = 0; j < NCOL; j++) t[j] += bk->tot[sub[q] * NCOL + j];
    size_t n = (size_t)t[COL_ALL], used = (size_t)t[COL_USED];
    if (n == 0) return VG_OK;
    for (int m = 0; m < VG_METHOD_COUNT; m++) {
        size_t right = (size_t)t[m];
        if (bk->sums)
            for (size_t b = 0; b < B; b++) {
                double num = 0, u = 0, a = 0;
                for (size_t q = 0; q < ns; q++) {
                    const double *x = bk->sums + (b * S + sub[q]) * NCOL;
                    num += x[m];
                    u += x[COL_USED];
                    a += x[COL_ALL];
                }
                bk->cov[b] = u > 0 ? num / u : NAN;
                bk->all[b] = a > 0 ? num / a : NAN;
            }
        for (int all = 0; all <= 1; all++) {
            size_t denom = all ? n : used;
            vg_score_row row = {.set = set, .suite = suite, .subset = name,
                                .task = VG_TASK_ANALOGY,
                                .metric = (vg_metric)(VG_METRIC_3COSADD + m),
                                .all_items = all, .n_items = n, .n_used = used};
            row.value = denom ? (double)right / (double)denom : NAN;
            double lo, hi;
            if (bk->sums) {
                size_t defined =
                    vg_stats_percentile_interval(all ? bk->all : bk->cov, B, opt->ci, &lo, &hi);
                vg_row_add_interval(&row, lo, hi, "pair-bootstrap");
                row.ci[row.n_ci - 1].replicates = defined;
            }
            vg_stats_wilson(right, denom, opt->ci, &lo, &hi);
            vg_row_add_interval(&row, lo, hi, "wilson-independent");
            if (vg_results_add_row(r, cap, &row) != 0)
                return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
        }
    }
    return VG_OK;
}

/* The per-stratum totals and, when bootstrapping, the pair bootstrap's
 * replicate totals of one set on one suite. */
static vg_status block_fill(const vg_suite *s, const vg_analogy_scores *sc,
                            const vg_eval_options *opt, block *bk, vg_error *err) {
    size_t n = s->n_items, n1 = n ? n : 1, S = s->n_sections ? s->n_sections : 1;
    unsigned char *x[NCOL] = {0};
    uint32_t *st = vg_calloc(n1, sizeof *st), *row = vg_calloc(n1, sizeof *row);
    uint32_t *col = vg_calloc(n1, sizeof *col);
    vg_pairboot_design *d = NULL;
    vg_status rc = VG_OK;
    bk->n_strata = S;
    bk->B = n ? opt->bootstrap : 0;
    bk->tot = vg_calloc(S * NCOL, sizeof *bk->tot);
    if (!st || !row || !col || !bk->tot) goto oom;
    for (int j = 0; j < NCOL; j++)
        if (!(x[j] = vg_calloc(n1, 1))) goto oom;
    if ((rc = vg_suite_question_pairs(s, st, row, col, err)) != VG_OK) goto done;
    for (size_t i = 0; i < n; i++) {
        int scored = sc->status[i] == VG_ITEM_SCORED;
        for (int m = 0; m < VG_METHOD_COUNT; m++)
            x[m][i] = (unsigned char)(scored && sc->correct[m] && sc->correct[m][i]);
        x[COL_USED][i] = (unsigned char)scored;
        x[COL_ALL][i] = 1;
        for (int j = 0; j < NCOL; j++) bk->tot[st[i] * NCOL + j] += x[j][i];
    }
    if (bk->B) {
        bk->sums = vg_calloc(bk->B * S * NCOL, sizeof *bk->sums);
        bk->cov = vg_calloc(bk->B, sizeof *bk->cov);
        bk->all = vg_calloc(bk->B, sizeof *bk->all);
        if (!bk->sums || !bk->cov || !bk->all) goto oom;
        if ((rc = vg_pairboot_design_new(st, S, row, col, n, &d, err)) != VG_OK) goto done;
        vg_pairboot_options po = {.replicates = bk->B, .seed = opt->seed,
                                  .stream = vg_resample_stream(s->id, ""),
                                  .threads = opt->score.threads};
        rc = vg_pairboot_sums(d, &po, (const unsigned char *const *)x, NCOL, bk->sums, err);
    }
    goto done;
oom:
    rc = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
done:
    vg_pairboot_design_free(d);
    for (int j = 0; j < NCOL; j++) vg_free(x[j]);
    vg_free(st);
    vg_free(row);
    vg_free(col);
    return rc;
}

vg_status vg_eval_analogy_rows(vg_results *r, size_t *cap, size_t set, size_t suite,
                               const vg_eval_options *opt, vg_error *err) {
    const vg_suite *s = r->suites[suite];
    const vg_analogy_scores *sc = r->blocks[set * r->n_suites + suite].ana;
    block bk = {0};
    vg_status st = block_fill(s, sc, opt, &bk, err);
    size_t S = bk.n_strata, ns = s->n_sections;
    /* Strata listed by subset: all of them, then each group's. */
    size_t *all = vg_calloc(S, sizeof *all);
    size_t *gitems = vg_calloc(ns ? ns : 1, sizeof *gitems);
    size_t *gof = vg_calloc(ns ? ns : 1, sizeof *gof);   /* section -> group, or -1 */
    size_t *gstart = vg_calloc(ns + 1, sizeof *gstart);  /* group -> first slot */
    size_t *gfirst = vg_calloc(ns ? ns : 1, sizeof *gfirst); /* group -> first section */
    vg_strmap groups = VG_STRMAP_INIT;
    size_t ng = 0;
    if (st == VG_OK && (!all || !gitems || !gof || !gstart || !gfirst))
        st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    for (size_t k = 0; st == VG_OK && k < S; k++) all[k] = k;
    if (st == VG_OK) st = subset_rows(r, cap, set, suite, "", all, S, &bk, opt, err);
    /* Sections, when there is more than one (a single section is the
     * whole suite again). */
    for (size_t k = 0; st == VG_OK && ns > 1 && k < ns; k++)
        st = subset_rows(r, cap, set, suite, s->sections[k].name, all + k, 1, &bk, opt, err);
    /* Groups of sections ("semantic", "syntactic"), in order of first
     * appearance, their sections in order: one pass numbers the groups
     * through a map and counts their sections, one places them (linear in
     * sections: a file of 16,000 sections used to take seconds here). */
    for (size_t k = 0; st == VG_OK && k < ns; k++) {
        const char *g = s->sections[k].group;
        gof[k] = (size_t)-1;
        if (!g) continue;
        size_t have;
        int ins = vg_strmap_put(&groups, g, strlen(g), ng, &have);
        if (ins < 0) {
            st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
            break;
        }
        if (ins) gfirst[ng] = k;
        gof[k] = ins ? ng++ : have;
        gstart[gof[k] + 1]++;
    }
    for (size_t g = 0; st == VG_OK && g < ng; g++) gstart[g + 1] += gstart[g];
    for (size_t k = 0; st == VG_OK && k < ns; k++)
        if (gof[k] != (size_t)-1) gitems[gstart[gof[k]]++] = k;
    /* gstart[g] now ends group g; the group before it ends where g starts. */
    for (size_t g = 0; st == VG_OK && g < ng; g++) {
        size_t b = g ? gstart[g - 1] : 0;
        st = subset_rows(r, cap, set, suite, s->sections[gfirst[g]].group, gitems + b,
                         gstart[g] - b, &bk, opt, err);
    }
    vg_strmap_free(&groups);
    vg_free(gof);
    vg_free(gstart);
    vg_free(gfirst);
    vg_free(gitems);
    vg_free(all);
    vg_free(bk.tot);
    vg_free(bk.sums);
    vg_free(bk.cov);
    vg_free(bk.all);
    return st;
}
