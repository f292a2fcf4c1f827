/* saved_pair.c - pairing saved runs item by item, refusing mismatched suites.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Two runs can be compared on a suite only when it is the same suite:
 * same id and task, same number of items, the same words (and rating) for
 * every item index, and the same bytes in its files (run.json's sha256).
 */
#include <string.h>

#include "../common/alloc.h"
#include "../compare/compare_impl.h"
#include "vecgauge/rundir.h"

static long suite_in(const vg_saved_run *r, const char *id) {
    for (size_t k = 0; k < r->n_suites; k++)
        if (strcmp(r->suites[k].id, id) == 0) return (long)k;
    return -1;
}

/* VG_OK when suite s of run a and t of run b are the same suite. */
static vg_status same_suite(const vg_saved_run *ra, const vg_saved_suite *s,
                            const vg_saved_run *rb, const vg_saved_suite *t, vg_error *err) {
    const char *id = s->id;
    if (s->task != t->task)
        return vg_error_set(err, VG_EINVAL, rb->dir, 0,
                            "suite %s is a %s suite in %s but a %s suite here; runs on different "
                            "suites cannot be compared",
                            id, vg_task_name(s->task), ra->dir, vg_task_name(t->task));
    if (s->n_items != t->n_items)
        return vg_error_set(err, VG_EINVAL, rb->dir, 0,
                            "suite %s has %zu items in %s but %zu here; runs on different suites "
                            "cannot be compared",
                            id, s->n_items, ra->dir, t->n_items);
    int same_files = s->n_files == t->n_files;
    for (size_t f = 0; same_files && f < s->n_files; f++)
        same_files = strcmp(s->sha256[f], t->sha256[f]) == 0;
    if (!same_files)
        return vg_error_set(err, VG_EINVAL, rb->dir, 0,
                            "suite %s was read from other files than in %s (the sha256 in "
                            "run.json differ); runs on different suites cannot be compared",
                            id, ra->dir);
    for (size_t i = 0; i < s->n_items; i++) {
        for (int w = 0; w < 4; w++)
            if (strcmp(s->words[4 * i + w], t->words[4 * i + w]) != 0)
                return vg_error_set(err, VG_EINVAL, rb->dir, 0,
                                    "suite %s, item %zu: '%s' here but '%s' in %s; the items "
                                    "differ, so the runs cannot be compared",
                                    id, i + 1, t->words[4 * i + w], s->words[4 * i + w], ra->dir);
        if (s->task == VG_TASK_SIMILARITY && s->rating[i] != t->rating[i])
            return vg_error_set(err, VG_EINVAL, rb->dir, 0,
                                "suite %s, item %zu: rating %g here but %g in %s; the items "
                                "differ, so the runs cannot be compared",
                                id, i + 1, t->rating[i], s->rating[i], ra->dir);
    }
    return VG_OK;
}

/* The word pairs of each question of s, from the words and sections
 * items.csv holds (the expected column lists every accepted answer,
 * '/'-separated: the first is d), as vg_suite_question_pairs numbers them
 * in-process; sections numbered in order of first appearance. */
static vg_status pair_ids(vg_paired_items *p, const vg_saved_suite *s, vg_paired_suite *ps,
                          vg_error *err) {
    size_t n = s->n_items;
    uint32_t *st = vg_paired_alloc(p, n, sizeof *st), *row = vg_paired_alloc(p, n, sizeof *row);
    uint32_t *col = vg_paired_alloc(p, n, sizeof *col);
    const char **w = vg_calloc(4 * n + 1, sizeof *w);
    char **first = vg_calloc(n + 1, sizeof *first);
    vg_status rc = VG_OK;
    if (!st || !row || !col || !w || !first) goto oom;
    size_t n_strata = 0;
    for (size_t i = 0; i < n; i++) {
        const char *sec = s->sections ? s->sections[i] : "";
        size_t j = 0;
        /* Sections are contiguous: an earlier item with the same name is
         * most often the one before. */
        if (i > 0 && strcmp(sec, s->sections ? s->sections[i - 1] : "") == 0) {
            st[i] = st[i - 1];
        } else {
            for (j = 0; j < i; j++)
                if (strcmp(sec, s->sections[j]) == 0) break;
            st[i] = j < i ? st[j] : (uint32_t)n_strata++;
        }
        const char *e = s->words[4 * i + 3];
        const char *slash = strchr(e, '/');
        if (!(first[i] = vg_strndup(e, slash ? (size_t)(slash - e) : strlen(e)))) goto oom;
        w[4 * i] = s->words[4 * i];
        w[4 * i + 1] = s->words[4 * i + 1];
        w[4 * i + 2] = s->words[4 * i + 2];
        w[4 * i + 3] = first[i];
    }
    if ((rc = vg_pair_ids(n, w, st, row, col, err)) != VG_OK) goto done;
    ps->stratum = st;
    ps->n_strata = n_strata ? n_strata : 1;
    ps->row_pair = row;
    ps->col_pair = col;
    goto done;
oom:
    rc = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
done:
    for (size_t i = 0; first && i < n; i++) vg_free(first[i]);
    vg_free(first);
    vg_free(w);
    return rc;
}

vg_status vg_saved_runs_pair(const vg_saved_run *const *runs, size_t n, int strict,
                             vg_paired_items **out, vg_error *err) {
    *out = NULL;
    if (n == 0) return vg_error_set(err, VG_EINVAL, NULL, 0, "no run directory to pair");
    const vg_saved_run *r0 = runs[0];
    size_t n_sets = 0;
    for (size_t q = 0; q < n; q++) n_sets += runs[q]->n_sets;
    /* Sets: labels must be distinct across the runs. */
    for (size_t q = 0; q < n; q++)
        for (size_t i = 0; i < runs[q]->n_sets; i++)
            for (size_t p = 0; p <= q; p++)
                for (size_t j = 0; j < (p == q ? i : runs[p]->n_sets); j++)
                    if (strcmp(runs[q]->labels[i], runs[p]->labels[j]) == 0)
                        return vg_error_set(err, VG_EINVAL, runs[q]->dir, 0,
                                            "vector set label '%s' is also in %s; labels must "
                                            "be distinct (relabel, e.g. by run directory)",
                                            runs[q]->labels[i], runs[p]->dir);
    /* Suites: the first run's, kept when every run has them. */
    size_t kept = 0;
    for (size_t k = 0; k < r0->n_suites; k++) {
        int everywhere = 1;
        for (size_t q = 1; q < n; q++) {
            long t = suite_in(runs[q], r0->suites[k].id);
            if (t < 0) {
                if (strict)
                    return vg_error_set(err, VG_EINVAL, runs[q]->dir, 0,
                                        "has no suite %s, which %s has; runs on different "
                                        "suites cannot be compared",
                                        r0->suites[k].id, r0->dir);
                everywhere = 0;
                continue;
            }
            vg_status st = same_suite(r0, &r0->suites[k], runs[q], &runs[q]->suites[t], err);
            if (st != VG_OK) return st;
        }
        kept += everywhere;
    }
    for (size_t q = 1; strict && q < n; q++)
        for (size_t k = 0; k < runs[q]->n_suites; k++)
            if (suite_in(r0, runs[q]->suites[k].id) < 0)
                return vg_error_set(err, VG_EINVAL, runs[q]->dir, 0,
                                    "has a suite %s that %s lacks; runs on different suites "
                                    "cannot be compared",
                                    runs[q]->suites[k].id, r0->dir);

    const char **labels;
    vg_paired_suite *suites;
    vg_paired_items *p = vg_paired_new(n_sets, kept, &labels, &suites);
    if (!p) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    size_t j = 0;
    for (size_t q = 0; q < n; q++)
        for (size_t i = 0; i < runs[q]->n_sets; i++) labels[j++] = runs[q]->labels[i];
    size_t out_k = 0;
    for (size_t k = 0; k < r0->n_suites; k++) {
        const vg_saved_suite *s = &r0->suites[k];
        long *at = vg_paired_alloc(p, n, sizeof *at);
        if (!at) goto oom;
        int everywhere = 1;
        for (size_t q = 0; q < n && everywhere; q++) everywhere = (at[q] = suite_in(runs[q], s->id)) >= 0;
        if (!everywhere) continue;
        vg_paired_suite *ps = &suites[out_k++];
        ps->id = s->id;
        ps->task = s->task;
        ps->n_items = s->n_items;
        if (s->task == VG_TASK_SIMILARITY) {
            const double **cos = vg_paired_alloc(p, n_sets, sizeof *cos);
            if (!cos) goto oom;
            j = 0;
            for (size_t q = 0; q < n; q++)
                for (size_t i = 0; i < runs[q]->n_sets; i++)
                    cos[j++] = runs[q]->cosine[i * runs[q]->n_suites + (size_t)at[q]];
            ps->rating = s->rating;
            ps->cosine = cos;
        } else {
            const signed char **cor = vg_paired_alloc(p, n_sets * VG_METHOD_COUNT, sizeof *cor);
            if (!cor) goto oom;
            j = 0;
            for (size_t q = 0; q < n; q++)
                for (size_t i = 0; i < runs[q]->n_sets; i++, j++)
                    for (int m = 0; m < VG_METHOD_COUNT; m++)
                        cor[j * VG_METHOD_COUNT + m] =
                            runs[q]->correct[(i * runs[q]->n_suites + (size_t)at[q]) *
                                                 VG_METHOD_COUNT + m];
            ps->correct = cor;
            if (pair_ids(p, s, ps, err) != VG_OK) {
                vg_paired_items_free(p);
                return err->code;
            }
        }
    }
    *out = p;
    return VG_OK;
oom:
    vg_paired_items_free(p);
    return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
}
