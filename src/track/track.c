/* track.c - adding a run to a training history: the step, the references,
 * the comparisons and the regression verdict.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Everything is decided under the history's lock (vg_history_open), from
 * the rows read under it, so that parallel jobs tracking into one file
 * each see the others' steps. Comparisons use the saved items of the run
 * directories the history names, so they are the paired tests of
 * vg_compare, not a comparison of two intervals.
 */
#include <errno.h>
#include <limits.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "../common/alloc.h"
#include "../rundir/rundir_impl.h"
#include "track_impl.h"

void vg_track_options_init(vg_track_options *opt) {
    memset(opt, 0, sizeof *opt);
    opt->step = VG_TRACK_NEXT_STEP;
    vg_compare_options_init(&opt->compare);
    opt->seed_from_run = opt->replicates_from_run = opt->level_from_run = 1;
}

void vg_track_free(vg_track *t) {
    if (!t) return;
    vg_history_close(t->h);
    vg_comparisons_free(t->cmp);
    vg_paired_items_free(t->items);
    for (size_t i = 1; t->runs && i <= t->sel.n_refs; i++) vg_saved_run_free(t->runs[i]);
    vg_free(t->runs);
    vg_track_refs_free(&t->sel);
    vg_saved_run_free(t->cur);
    for (size_t i = 0; t->rows && i < t->n_rows; i++) {
        vg_free(t->rows[i].suite);
        vg_free(t->rows[i].metric);
        vg_free(t->rows[i].run);
        vg_free(t->rows[i].vectors);
    }
    vg_free(t->rows);
    vg_free(t->mine);
    vg_free(t->regressed);
    vg_free(t->label);
    vg_free(t->recorded);
    vg_free(t->hist_folder);
    vg_free(t->history);
    vg_free(t);
}

/* The tracked set of t->cur, by label or as its only set. */
static vg_status choose_set(vg_track *t, const char *vectors, vg_error *err) {
    const vg_saved_run *r = t->cur;
    if (vectors) {
        long s = -1;
        for (size_t j = 0; j < r->n_sets; j++)
            if (strcmp(r->labels[j], vectors) == 0) s = (long)j;
        if (s < 0)
            return vg_error_set(err, VG_EINVAL, NULL, 0, "%s holds no vector set '%s'", r->dir,
                                vectors);
        t->cur_set = (size_t)s;
    } else if (r->n_sets > 1) {
        return vg_error_set(err, VG_EINVAL, NULL, 0,
                            "%s holds %zu vector sets; name the one to track with --vectors "
                            "LABEL",
                            r->dir, r->n_sets);
    }
    return (t->label = vg_strdup(r->labels[t->cur_set]))
               ? VG_OK
               : vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
}

/* t->recorded: the run's directory relative to the history's folder. */
static vg_status record_path(vg_track *t, vg_error *err) {
    char *hist_real = NULL, *run_real = NULL;
    vg_status st = VG_OK;
    if (!(t->hist_folder = vg_track_folder_of(t->history)))
        return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    if (!(hist_real = realpath(t->hist_folder, NULL)) || !(run_real = realpath(t->cur->dir, NULL))) {
        st = vg_error_set(err, VG_ENOTFOUND, hist_real ? t->cur->dir : t->hist_folder, 0, "%s",
                          strerror(errno));
    } else if (!(t->recorded = vg_track_relative(hist_real, run_real))) {
        st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    }
    free(hist_real);
    free(run_real);
    return st;
}

/* Load every reference run and relabel all sets "step N" (the tracked
 * set) or "step N/LABEL" (others), so labels are distinct whatever the
 * runs called their sets. sets_at[q] receives run q's tracked set. */
static vg_status load_refs(vg_track *t, size_t *sets_at, vg_error *err) {
    const vg_track_refs *sel = &t->sel;
    if (!(t->runs = vg_calloc(sel->n_refs + 1, sizeof *t->runs)))
        return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    t->runs[0] = t->cur;
    sets_at[0] = t->cur_set;
    for (size_t i = 0; i < sel->n_refs; i++) {
        const vg_track_ref *ref = &sel->refs[i];
        char *path = vg_track_resolve(t->hist_folder, ref->run);
        if (!path) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
        vg_status st = vg_saved_run_load(path, &t->runs[i + 1], err);
        vg_free(path);
        if (st != VG_OK) {
            vg_error_prefix(err, "run at step %llu named by %s: ", (unsigned long long)ref->step,
                            t->history);
            return st;
        }
        const vg_saved_run *r = t->runs[i + 1];
        long s = -1;
        for (size_t j = 0; j < r->n_sets; j++)
            if (strcmp(r->labels[j], ref->vectors) == 0) s = (long)j;
        if (s < 0)
            return vg_error_set(err, VG_EFORMAT, r->dir, 0,
                                "the history names vector set '%s' at step %llu, which this run "
                                "directory does not hold",
                                ref->vectors, (unsigned long long)ref->step);
        sets_at[i + 1] = (size_t)s;
    }
    for (size_t q = 0; q <= sel->n_refs; q++) {
        uint64_t step = q == 0 ? t->step : sel->refs[q - 1].step;
        /* Two references at one step (a history that holds a step twice)
         * get "#2", "#3". */
        size_t same = 1;
        for (size_t p = 0; p + 1 < q; p++) same += sel->refs[p].step == step;
        vg_saved_run *r = t->runs[q];
        for (size_t j = 0; j < r->n_sets; j++) {
            char l[4200];
            int n = snprintf(l, sizeof l, "step %llu", (unsigned long long)step);
            if (same > 1) n += snprintf(l + n, sizeof l - (size_t)n, " #%zu", same);
            if (j != sets_at[q]) snprintf(l + n, sizeof l - (size_t)n, "/%s", r->labels[j]);
            vg_status st = vg_saved_run_relabel(r, j, l, err);
            if (st != VG_OK) return st;
        }
    }
    return VG_OK;
}

/* Compare (this run, previous) on every suite, (this run, best) on the
 * suites where that run is the best and not the previous one. */
static vg_status compare_refs(vg_track *t, const size_t *sets_at, const vg_track_options *opt,
                              vg_error *err) {
    const vg_track_refs *sel = &t->sel;
    vg_compare_options o = opt->compare;
    if (opt->seed_from_run) o.seed = t->cur->seed;
    if (opt->replicates_from_run) o.replicates = t->cur->bootstrap;
    if (opt->level_from_run) o.level = t->cur->level;
    vg_status st = vg_saved_runs_pair((const vg_saved_run *const *)t->runs, sel->n_refs + 1, 0,
                                      &t->items, err);
    /* Runs the history names that cannot be paired with this one are a
     * problem of the history's runs, not of the caller's arguments. */
    if (st == VG_EINVAL && err) err->code = st = VG_EFORMAT;
    if (st != VG_OK) return st;
    size_t ns = t->items->n_suites;
    size_t *pairs = vg_calloc(2 * sel->n_refs, sizeof *pairs);
    unsigned char *on = vg_calloc(sel->n_refs * (ns ? ns : 1), 1);
    if (!pairs || !on) {
        st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
        goto done;
    }
    /* A run's tracked set among the paired items' sets. */
    size_t base = 0, cur_index = sets_at[0];
    for (size_t i = 0; i < sel->n_refs; i++) {
        base += t->runs[i]->n_sets;
        pairs[2 * i] = cur_index;
        pairs[2 * i + 1] = base + sets_at[i + 1];
        for (size_t k = 0; k < ns; k++) {
            long ck = -1;
            for (size_t j = 0; j < t->cur->n_suites; j++)
                if (strcmp(t->cur->suites[j].id, t->items->suites[k].id) == 0) ck = (long)j;
            on[i * ns + k] = sel->refs[i].prev || (ck >= 0 && sel->best_of[ck] == (long)i);
        }
    }
    o.pairs = pairs;
    o.n_pairs = sel->n_refs;
    o.pair_suites = on;
    st = vg_compare(t->items, &o, &t->cmp, err);
done:
    vg_free(pairs);
    vg_free(on);
    return st;
}

/* This run's rows, and a copy of the history with them for the plots
 * (the history's own rows go away with its lock). */
static vg_status make_rows(vg_track *t, vg_error *err) {
    const vg_saved_run *r = t->cur;
    const vg_history *h = t->h;
    size_t n = r->n_suites;
    t->mine = vg_calloc(n + 1, sizeof *t->mine);
    t->rows = vg_calloc(h->n_rows + n + 1, sizeof *t->rows);
    if (!t->mine || !t->rows) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    for (size_t k = 0; k < n; k++) {
        const vg_saved_score *sc = &r->scores[t->cur_set * n + k];
        t->mine[k] = (vg_history_row){.step = t->step, .run = t->recorded, .vectors = t->label,
                                      .suite = r->suites[k].id, .task = r->suites[k].task,
                                      .metric = sc->metric, .value = sc->value, .low = sc->low,
                                      .high = sc->high, .interval = sc->interval,
                                      .n_items = sc->n_items, .n_used = sc->n_used,
                                      .recorded = t->utc};
    }
    t->n_before = h->n_rows;
    for (size_t i = 0; i < h->n_rows + n; i++) {
        const vg_history_row *hr = i < h->n_rows ? &h->rows[i] : &t->mine[i - h->n_rows];
        vg_track_row *s = &t->rows[t->n_rows++];
        *s = (vg_track_row){(double)hr->step, hr->value, hr->low, hr->high,
                            vg_strdup(hr->suite), vg_strdup(hr->metric), vg_strdup(hr->run),
                            vg_strdup(hr->vectors)};
        if (!s->suite || !s->metric || !s->run || !s->vectors)
            return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    }
    return VG_OK;
}

/* Everything after the run is in t->cur (owned). */
static vg_status begin(vg_track *t, const vg_track_options *opt, vg_error *err) {
    vg_status st;
    if ((st = choose_set(t, opt->vectors, err)) != VG_OK || (st = record_path(t, err)) != VG_OK)
        return st;
    vg_utc_now(t->utc, (char[32]){0});
    /* Under the lock from here: read, choose, load, compare. */
    if ((st = vg_history_open(t->history, &t->h, err)) != VG_OK) return st;
    /* Test hook: hold the lock 200 ms, so that tests can check that
     * concurrent tracks wait (and interrupt one that holds it). */
    if (vg_test_slow_write()) usleep(200000);
    const vg_history *h = t->h;
    t->step = opt->step == VG_TRACK_NEXT_STEP ? vg_track_next_step(h->rows, h->n_rows) : opt->step;
    long at = vg_track_step_row(h->rows, h->n_rows, t->step);
    if (at >= 0 && !opt->allow_existing_step)
        return vg_error_set(err, VG_EINVAL, NULL, 0,
                            "step %llu is already in %s (line %llu, run %s); track this run as "
                            "another step",
                            (unsigned long long)t->step, t->history,
                            (unsigned long long)h->rows[at].line, h->rows[at].run);
    t->runs_before = vg_track_count_runs(h->rows, h->n_rows);
    size_t n = t->cur->n_suites;
    vg_track_suite *suites = vg_calloc(n + 1, sizeof *suites);
    size_t *sets_at = NULL;
    if (!suites) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    for (size_t k = 0; k < n; k++) suites[k] = (vg_track_suite){t->cur->suites[k].id, t->cur->suites[k].task};
    st = vg_track_select(h->rows, h->n_rows, t->recorded, t->label, t->step, suites, n, &t->sel,
                         err);
    vg_free(suites);
    if (st != VG_OK) return st;
    if (!(sets_at = vg_calloc(t->sel.n_refs + 1, sizeof *sets_at)) ||
        !(t->regressed = vg_calloc(n + 1, 1))) {
        vg_free(sets_at);
        return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    }
    if ((st = load_refs(t, sets_at, err)) == VG_OK && t->sel.n_refs > 0 &&
        (st = compare_refs(t, sets_at, opt, err)) == VG_OK) {
        const char **ids = vg_calloc(n + 1, sizeof *ids);
        if (!ids) {
            st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
        } else {
            for (size_t k = 0; k < n; k++) ids[k] = t->cur->suites[k].id;
            vg_track_verdict(t->cmp, ids, n, t->regressed);
            vg_free(ids);
        }
    }
    vg_free(sets_at);
    if (st != VG_OK) return st;
    t->alpha = t->cmp ? t->cmp->options.alpha : opt->compare.alpha;
    return make_rows(t, err);
}

/* A new track for history owning cur, begun; *out NULL on failure. */
static vg_status start(const char *history, vg_saved_run *cur, const vg_track_options *opt,
                       vg_track **out, vg_error *err) {
    vg_track_options defaults;
    if (!opt) {
        vg_track_options_init(&defaults);
        opt = &defaults;
    }
    vg_track *t = vg_calloc(1, sizeof *t);
    if (!t || !(t->history = vg_strdup(history))) {
        vg_free(t);
        vg_saved_run_free(cur);
        return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    }
    t->cur = cur;
    vg_status st = begin(t, opt, err);
    if (st != VG_OK) {
        vg_track_free(t);
        return st;
    }
    *out = t;
    return VG_OK;
}

vg_status vg_track_begin(const char *history, const char *run_dir, const vg_track_options *opt,
                         vg_track **out, vg_error *err) {
    *out = NULL;
    vg_saved_run *cur = NULL;
    vg_status st = vg_saved_run_load(run_dir, &cur, err);
    return st != VG_OK ? st : start(history, cur, opt, out, err);
}

vg_status vg_track_begin_results(const char *history, const char *run_dir, const vg_results *res,
                                 const vg_track_options *opt, vg_track **out, vg_error *err) {
    *out = NULL;
    vg_saved_run *cur = NULL;
    vg_status st = vg_saved_run_from_results(res, run_dir, &cur, err);
    return st != VG_OK ? st : start(history, cur, opt, out, err);
}

vg_status vg_track_append(vg_track *t, vg_error *err) {
    if (!t->h) return vg_error_set(err, VG_EINVAL, t->history, 0, "already appended");
    vg_status st = vg_history_append(t->h, t->mine, t->cur->n_suites, err);
    vg_history_close(t->h);
    t->h = NULL;
    return st;
}

/* ---- accessors ----------------------------------------------------------- */

uint64_t vg_track_step(const vg_track *t) { return t->step; }
const char *vg_track_label(const vg_track *t) { return t->label; }
const char *vg_track_run_dir(const vg_track *t) { return t->cur->dir; }
const char *vg_track_recorded_run(const vg_track *t) { return t->recorded; }
size_t vg_track_runs_before(const vg_track *t) { return t->runs_before; }
const vg_comparisons *vg_track_comparisons(const vg_track *t) { return t->cmp; }
size_t vg_track_n_suites(const vg_track *t) { return t->cur->n_suites; }

const char *vg_track_suite_id(const vg_track *t, size_t k) {
    return k < t->cur->n_suites ? t->cur->suites[k].id : NULL;
}

int vg_track_regressed(const vg_track *t, size_t k) {
    return k < t->cur->n_suites && t->regressed[k];
}

size_t vg_track_n_regressed(const vg_track *t) {
    size_t n = 0;
    for (size_t k = 0; k < t->cur->n_suites; k++) n += t->regressed[k];
    return n;
}

size_t vg_track_n_references(const vg_track *t) { return t->sel.n_refs; }

uint64_t vg_track_reference_step(const vg_track *t, size_t i) {
    return i < t->sel.n_refs ? t->sel.refs[i].step : 0;
}

const char *vg_track_reference_run(const vg_track *t, size_t i) {
    return i < t->sel.n_refs ? t->sel.refs[i].run : NULL;
}

int vg_track_reference_is_previous(const vg_track *t, size_t i) {
    return i < t->sel.n_refs && t->sel.refs[i].prev;
}

long vg_track_best(const vg_track *t, size_t k) {
    return k < t->cur->n_suites ? t->sel.best_of[k] : -1;
}
