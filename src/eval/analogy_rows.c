/* analogy_rows.c - the score rows of one vector set on one analogy suite:
 * accuracy per method on the whole suite, per section and per group, with
 * Wilson and bootstrap intervals.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <gsl/gsl_statistics_double.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/strmap.h"
#include "../common/threads.h"
#include "../stats/resample.h"
#include "eval_impl.h"
#include "vecgauge/stats.h"

/* A subset of the suite's questions: the whole suite (""), a section or a
 * group of sections. */
typedef struct subset {
    const char *name;
    size_t *items;   /* indices into the suite */
    size_t n;
} subset;

/* Bootstrap replicates of one subset, shared by every method: replicate b
 * draws n questions with replacement from the subset (covered or not, so
 * that replicate b draws the same questions for every vector set), and
 * gives each method its accuracy on the covered drawn questions and on
 * all drawn questions. */
typedef struct boot_job {
    const subset *sub;
    const vg_analogy_scores *sc;
    uint64_t seed, stream;
    size_t reps;
    double *cov;   /* [m * reps + b]: accuracy on covered drawn questions */
    double *all;   /* [m * reps + b]: accuracy on all drawn questions */
    gsl_rng **rng; /* one per thread */
    size_t **idx;  /* one n-array per thread */
} boot_job;

static void boot_thread(void *ctx, unsigned t, unsigned nt) {
    boot_job *j = ctx;
    size_t n = j->sub->n;
    for (size_t b = t; b < j->reps; b += nt) {
        vg_resample_seed(j->rng[t], j->seed, j->stream, b);
        vg_resample_draw(j->rng[t], n, j->idx[t]);
        size_t covered = 0, correct[VG_METHOD_COUNT] = {0};
        for (size_t i = 0; i < n; i++) {
            size_t item = j->sub->items[j->idx[t][i]];
            if (j->sc->status[item] != VG_ITEM_SCORED) continue;
            covered++;
            for (int m = 0; m < VG_METHOD_COUNT; m++) correct[m] += j->sc->correct[m][item];
        }
        for (int m = 0; m < VG_METHOD_COUNT; m++) {
            j->cov[m * j->reps + b] = covered ? (double)correct[m] / (double)covered : NAN;
            j->all[m * j->reps + b] = (double)correct[m] / (double)n;
        }
    }
}

static int cmp_double(const void *a, const void *b) {
    double x = *(const double *)a, y = *(const double *)b;
    return (x > y) - (x < y);
}

/* Percentile interval of the finite values of x[0..n) (sorted in place,
 * NaN moved out first); GSL's quantile interpolates linearly between order
 * statistics (Hyndman and Fan 1996, definition 7). */
static void percentile(double *x, size_t n, double level, double *low, double *high) {
    size_t m = 0;
    for (size_t i = 0; i < n; i++)
        if (!isnan(x[i])) x[m++] = x[i];
    if (m == 0) {
        *low = *high = NAN;
        return;
    }
    qsort(x, m, sizeof *x, cmp_double);
    *low = gsl_stats_quantile_from_sorted_data(x, 1, m, (1 - level) / 2);
    *high = gsl_stats_quantile_from_sorted_data(x, 1, m, (1 + level) / 2);
}

/* The rows of one subset: per method, accuracy on the covered questions
 * and on all questions. */
static vg_status subset_rows(vg_results *r, size_t *cap, size_t set, size_t suite,
                             const subset *sub, const vg_eval_options *opt, vg_error *err) {
    const vg_analogy_scores *sc = r->blocks[set * r->n_suites + suite].ana;
    size_t used = 0, correct[VG_METHOD_COUNT] = {0};
    for (size_t i = 0; i < sub->n; i++) {
        size_t item = sub->items[i];
        if (sc->status[item] != VG_ITEM_SCORED) continue;
        used++;
        for (int m = 0; m < VG_METHOD_COUNT; m++) correct[m] += sc->correct[m][item];
    }

    boot_job job;
    memset(&job, 0, sizeof job);
    unsigned nt = 1;
    vg_status st = VG_OK;
    size_t reps = sub->n ? opt->bootstrap : 0;
    if (reps) {
        nt = vg_threads_resolve(opt->score.threads);
        if (nt > reps) nt = (unsigned)reps;
        job = (boot_job){sub, sc, opt->seed, vg_resample_stream(r->suites[suite]->id, sub->name),
                         reps, NULL, NULL, NULL, NULL};
        job.cov = vg_calloc(VG_METHOD_COUNT * reps, sizeof *job.cov);
        job.all = vg_calloc(VG_METHOD_COUNT * reps, sizeof *job.all);
        job.rng = vg_calloc(nt, sizeof *job.rng);
        job.idx = vg_calloc(nt, sizeof *job.idx);
        if (!job.cov || !job.all || !job.rng || !job.idx) goto oom;
        for (unsigned t = 0; t < nt; t++) {
            job.rng[t] = vg_resample_rng_alloc();
            job.idx[t] = vg_calloc(sub->n, sizeof **job.idx);
            if (!job.rng[t] || !job.idx[t]) goto oom;
        }
        vg_parallel(nt, boot_thread, &job);
    }

    for (int m = 0; m < VG_METHOD_COUNT; m++) {
        for (int all = 0; all <= 1; all++) {
            size_t denom = all ? sub->n : used;
            vg_score_row row = {.set = set, .suite = suite, .subset = sub->name,
                                .task = VG_TASK_ANALOGY,
                                .metric = (vg_metric)(VG_METRIC_3COSADD + m),
                                .all_items = all, .n_items = sub->n, .n_used = used};
            row.value = denom ? (double)correct[m] / (double)denom : NAN;
            double lo, hi;
            vg_stats_wilson(correct[m], denom, opt->ci, &lo, &hi);
            vg_row_add_interval(&row, lo, hi, "wilson");
            if (reps) {
                percentile((all ? job.all : job.cov) + (size_t)m * reps, reps, opt->ci, &lo, &hi);
                vg_row_add_interval(&row, lo, hi, "percentile");
            }
            if (vg_results_add_row(r, cap, &row) != 0) goto oom;
        }
    }
    goto done;
oom:
    st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
done:
    for (unsigned t = 0; job.rng && t < nt; t++) gsl_rng_free(job.rng[t]);
    for (unsigned t = 0; job.idx && t < nt; t++) vg_free(job.idx[t]);
    vg_free(job.rng);
    vg_free(job.idx);
    vg_free(job.cov);
    vg_free(job.all);
    return st;
}

vg_status vg_eval_analogy_rows(vg_results *r, size_t *cap, size_t set, size_t suite,
                               const vg_eval_options *opt, vg_error *err) {
    const vg_suite *s = r->suites[suite];
    size_t n = s->n_items;
    size_t *items = vg_calloc(n ? n : 1, sizeof *items);
    if (!items) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    for (size_t i = 0; i < n; i++) items[i] = i;
    subset whole = {"", items, n};
    vg_status st = subset_rows(r, cap, set, suite, &whole, opt, err);

    /* Sections, when there is more than one (a single section is the
     * whole suite again). Items of a section are contiguous. */
    for (size_t k = 0; st == VG_OK && s->n_sections > 1 && k < s->n_sections; k++) {
        const vg_section *sec = &s->sections[k];
        subset sub = {sec->name, items + sec->first, sec->count};
        st = subset_rows(r, cap, set, suite, &sub, opt, err);
    }

    /* Groups of sections ("semantic", "syntactic"), in order of first
     * appearance; their items in section order. One pass numbers the
     * groups through a map and counts their items, one places the items
     * (linear in sections: a file of 16,000 sections used to take
     * seconds here). */
    size_t ns = s->n_sections;
    size_t *gitems = vg_calloc(n ? n : 1, sizeof *gitems);
    size_t *gof = vg_calloc(ns ? ns : 1, sizeof *gof);   /* section -> group, or -1 */
    size_t *gstart = vg_calloc(ns + 1, sizeof *gstart);  /* group -> first slot */
    size_t *gfirst = vg_calloc(ns ? ns : 1, sizeof *gfirst); /* group -> first section */
    vg_strmap groups = VG_STRMAP_INIT;
    size_t ng = 0;
    if (st == VG_OK && (!gitems || !gof || !gstart || !gfirst))
        st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
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
        gstart[gof[k] + 1] += s->sections[k].count;
    }
    for (size_t g = 0; st == VG_OK && g < ng; g++) gstart[g + 1] += gstart[g];
    for (size_t k = 0; st == VG_OK && k < ns; k++) {
        if (gof[k] == (size_t)-1) continue;
        const vg_section *sec = &s->sections[k];
        for (size_t i = 0; i < sec->count; i++) gitems[gstart[gof[k]]++] = sec->first + i;
    }
    /* gstart[g] now ends group g; the group before it ends where g starts. */
    for (size_t g = 0; st == VG_OK && g < ng; g++) {
        size_t b = g ? gstart[g - 1] : 0;
        subset sub = {s->sections[gfirst[g]].group, gitems + b, gstart[g] - b};
        st = subset_rows(r, cap, set, suite, &sub, opt, err);
    }
    vg_strmap_free(&groups);
    vg_free(gof);
    vg_free(gstart);
    vg_free(gfirst);
    vg_free(gitems);
    vg_free(items);
    return st;
}
