/* compare.c - vg_compare: every pair of sets on every suite, Holm, ranking.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "compare_impl.h"
#include "vecgauge/paired.h"
#include "vecgauge/vecgauge.h"

void vg_compare_options_init(vg_compare_options *opt) {
    memset(opt, 0, sizeof *opt);
    opt->replicates = VG_DEFAULT_BOOTSTRAP;
    opt->seed = VG_DEFAULT_SEED;
    opt->level = VG_DEFAULT_CI;
    opt->alpha = 0.05;
    opt->items = VG_COMPARE_COMMON;
}

int vg_cmp_add_row(vg_cmp_build *b, const vg_comparison *row) {
    vg_comparisons *c = b->c;
    if (vg_grow((void **)&c->rows, &b->cap_rows, c->n_rows + 1, sizeof *c->rows) != 0) return -1;
    c->rows[c->n_rows++] = *row;
    return 0;
}

int vg_cmp_add_score(vg_cmp_build *b, const vg_compared_score *s) {
    vg_comparisons *c = b->c;
    if (vg_grow((void **)&c->scores, &b->cap_scores, c->n_scores + 1, sizeof *c->scores) != 0)
        return -1;
    c->scores[c->n_scores++] = *s;
    return 0;
}

double vg_cmp_boot_p(const double *reps, size_t B, double theta) {
    if (isnan(theta)) return NAN;
    size_t defined = 0, extreme = 0;
    double t = fabs(theta);
    for (size_t r = 0; r < B; r++) {
        if (isnan(reps[r])) continue;
        defined++;
        /* Replicates centred at the estimate stand for the distribution
         * under the null (Hall and Wilson 1991, guideline 1). */
        extreme += fabs(reps[r] - theta) >= t;
    }
    if (defined == 0) return NAN;
    return (1.0 + (double)extreme) / ((double)defined + 1.0);
}

void vg_cmp_interval(const vg_boot_summary *s, double *low, double *high, const char **method) {
    if (isfinite(s->bca_low) && isfinite(s->bca_high)) {
        *low = s->bca_low;
        *high = s->bca_high;
        *method = "bca";
    } else if (isfinite(s->pct_low) && isfinite(s->pct_high)) {
        *low = s->pct_low;
        *high = s->pct_high;
        *method = "percentile";
    } else {
        *low = *high = NAN;
        *method = "";
    }
}

vg_comparison vg_cmp_row_init(size_t suite, size_t a, size_t b, vg_task task, const char *metric,
                              size_t n_items) {
    vg_comparison r;
    memset(&r, 0, sizeof r);
    r.suite = suite;
    r.set_a = a;
    r.set_b = b;
    r.task = task;
    r.metric = metric;
    r.n_items = n_items;
    r.score_a = r.score_b = r.diff = r.diff_low = r.diff_high = NAN;
    r.interval = "";
    r.p_bootstrap = r.r_ab = r.steiger_z = r.p_steiger = r.p_mcnemar = NAN;
    r.test = "";
    r.p_value = r.p_holm = NAN;
    return r;
}

void vg_comparisons_free(vg_comparisons *c) {
    if (!c) return;
    for (size_t i = 0; c->labels && i < c->n_sets; i++) vg_free(c->labels[i]);
    for (size_t k = 0; c->suite_ids && k < c->n_suites; k++) vg_free(c->suite_ids[k]);
    vg_free(c->labels);
    vg_free(c->suite_ids);
    vg_free(c->tasks);
    vg_free(c->n_items);
    vg_free(c->covered);
    vg_free(c->rows);
    vg_free(c->scores);
    vg_free(c->ranking);
    vg_free(c);
}

const vg_compared_score *vg_comparisons_score(const vg_comparisons *c, size_t suite,
                                              const char *metric, size_t set) {
    for (size_t i = 0; i < c->n_scores; i++) {
        const vg_compared_score *s = &c->scores[i];
        if (s->suite == suite && s->set == set && strcmp(s->metric, metric) == 0) return s;
    }
    return NULL;
}

/* The metric each suite is ranked on: Spearman, or the first analogy
 * method compared. NULL when the suite has no score. */
static const char *headline_metric(const vg_comparisons *c, size_t k) {
    for (size_t i = 0; i < c->n_scores; i++)
        if (c->scores[i].suite == k) return c->scores[i].metric;
    return NULL;
}

/* Ranks within each suite (1 = best, ties averaged), their mean over the
 * suites, and significant wins and losses on the headline metric. */
static int rank_sets(vg_comparisons *c, const unsigned char *in_pair) {
    size_t n = c->n_sets;
    c->ranking = vg_calloc(n, sizeof *c->ranking);
    double *sum = vg_calloc(n, sizeof *sum);
    if (!c->ranking || !sum) {
        vg_free(sum);
        return -1;
    }
    for (size_t i = 0; i < n; i++) c->ranking[i].set = i;
    for (size_t k = 0; k < c->n_suites; k++) {
        const char *m = headline_metric(c, k);
        if (!m) continue;
        for (size_t i = 0; i < n; i++) {
            const vg_compared_score *si = vg_comparisons_score(c, k, m, i);
            if (!si || !in_pair[i] || isnan(si->value)) continue;
            /* Average rank: 1 + (sets strictly better) + (ties other than
             * itself) / 2. */
            double better = 0, ties = 0;
            for (size_t j = 0; j < n; j++) {
                const vg_compared_score *sj = vg_comparisons_score(c, k, m, j);
                if (j == i || !sj || !in_pair[j] || isnan(sj->value)) continue;
                better += sj->value > si->value;
                ties += sj->value == si->value;
            }
            sum[i] += 1 + better + ties / 2;
            c->ranking[i].suites++;
        }
        for (size_t r = 0; r < c->n_rows; r++) {
            const vg_comparison *row = &c->rows[r];
            if (row->suite != k || strcmp(row->metric, m) != 0 || !row->significant) continue;
            size_t win = row->diff > 0 ? row->set_a : row->set_b;
            size_t lose = row->diff > 0 ? row->set_b : row->set_a;
            c->ranking[win].wins++;
            c->ranking[lose].losses++;
        }
    }
    for (size_t i = 0; i < n; i++)
        c->ranking[i].mean_rank = c->ranking[i].suites ? sum[i] / (double)c->ranking[i].suites : NAN;
    vg_free(sum);
    /* Insertion sort (n is small): mean rank, then wins, then input order. */
    for (size_t i = 1; i < n; i++) {
        vg_set_rank x = c->ranking[i];
        size_t j = i;
        while (j > 0) {
            const vg_set_rank *y = &c->ranking[j - 1];
            int before;
            if (isnan(x.mean_rank) != isnan(y->mean_rank))
                before = isnan(y->mean_rank);
            else if (!isnan(x.mean_rank) && x.mean_rank != y->mean_rank)
                before = x.mean_rank < y->mean_rank;
            else if (x.wins != y->wins)
                before = x.wins > y->wins;
            else
                before = x.set < y->set;
            if (!before) break;
            c->ranking[j] = c->ranking[j - 1];
            j--;
        }
        c->ranking[j] = x;
    }
    return 0;
}

/* Copy the input's names into c. -1 when out of memory. */
static int copy_names(vg_comparisons *c, const vg_paired_items *in) {
    c->n_sets = in->n_sets;
    c->n_suites = in->n_suites;
    c->labels = vg_calloc(in->n_sets, sizeof *c->labels);
    size_t ns = in->n_suites ? in->n_suites : 1;
    c->suite_ids = vg_calloc(ns, sizeof *c->suite_ids);
    c->tasks = vg_calloc(ns, sizeof *c->tasks);
    c->n_items = vg_calloc(ns, sizeof *c->n_items);
    c->covered = vg_calloc(ns * in->n_sets, sizeof *c->covered);
    if (!c->labels || !c->suite_ids || !c->tasks || !c->n_items || !c->covered) return -1;
    for (size_t i = 0; i < in->n_sets; i++)
        if (!(c->labels[i] = vg_strdup(in->labels[i]))) return -1;
    for (size_t k = 0; k < in->n_suites; k++) {
        if (!(c->suite_ids[k] = vg_strdup(in->suites[k].id))) return -1;
        c->tasks[k] = in->suites[k].task;
        c->n_items[k] = in->suites[k].n_items;
    }
    return 0;
}

static vg_status check_input(const vg_paired_items *in, const vg_compare_options *o,
                             vg_error *err) {
    if (!in || in->n_sets < 2)
        return vg_error_set(err, VG_EINVAL, NULL, 0, "a comparison needs at least two vector sets");
    if (!(o->level > 0 && o->level < 1))
        return vg_error_set(err, VG_EINVAL, NULL, 0,
                            "expected a confidence level between 0 and 1, found %g", o->level);
    if (!(o->alpha > 0 && o->alpha < 1))
        return vg_error_set(err, VG_EINVAL, NULL, 0,
                            "expected a significance level between 0 and 1, found %g", o->alpha);
    for (size_t i = 0; i < in->n_sets; i++)
        for (size_t j = 0; j < i; j++)
            if (strcmp(in->labels[i], in->labels[j]) == 0)
                return vg_error_set(err, VG_EINVAL, NULL, 0,
                                    "two vector sets are labelled '%s'", in->labels[i]);
    for (size_t p = 0; o->pairs && p < o->n_pairs; p++) {
        size_t a = o->pairs[2 * p], b = o->pairs[2 * p + 1];
        if (a >= in->n_sets || b >= in->n_sets || a == b)
            return vg_error_set(err, VG_EINVAL, NULL, 0,
                                "pair %zu (%zu, %zu) is not two different sets of %zu", p + 1,
                                a, b, in->n_sets);
    }
    for (size_t k = 0; k < in->n_suites; k++) {
        const vg_paired_suite *s = &in->suites[k];
        int ok = s->id && (s->task == VG_TASK_SIMILARITY ? s->rating && s->cosine
                           : s->task == VG_TASK_ANALOGY ? s->correct != NULL
                                                         : 0);
        for (size_t i = 0; ok && s->task == VG_TASK_SIMILARITY && i < in->n_sets; i++)
            ok = s->cosine[i] != NULL || s->n_items == 0;
        if (!ok)
            return vg_error_set(err, VG_EINVAL, NULL, 0,
                                "suite %zu (%s): the per-item arrays its task needs are missing",
                                k + 1, s->id ? s->id : "?");
    }
    return VG_OK;
}

vg_status vg_compare(const vg_paired_items *in, const vg_compare_options *opt,
                     vg_comparisons **out, vg_error *err) {
    *out = NULL;
    vg_init();
    vg_compare_options defaults;
    if (!opt) {
        vg_compare_options_init(&defaults);
        opt = &defaults;
    }
    vg_status st = check_input(in, opt, err);
    if (st != VG_OK) return st;

    vg_cmp_build b;
    memset(&b, 0, sizeof b);
    size_t *all_pairs = NULL;
    size_t *work = NULL;
    double *p = NULL, *adj = NULL;
    unsigned char *ranked = NULL;
    b.c = vg_calloc(1, sizeof *b.c);
    b.in_pair = vg_calloc(in->n_sets, 1);
    if (!b.c || !b.in_pair || copy_names(b.c, in) != 0) goto oom;
    b.c->options = *opt;
    b.c->options.pairs = NULL;
    b.c->options.n_pairs = 0;
    if (opt->pairs) {
        b.pairs = opt->pairs;
        b.n_pairs = opt->n_pairs;
    } else {
        size_t n = in->n_sets;
        all_pairs = vg_calloc(n * (n - 1), sizeof *all_pairs);
        if (!all_pairs) goto oom;
        for (size_t i = 0; i < n; i++)
            for (size_t j = i + 1; j < n; j++) {
                all_pairs[2 * b.n_pairs] = i;
                all_pairs[2 * b.n_pairs + 1] = j;
                b.n_pairs++;
            }
        b.pairs = all_pairs;
    }
    b.pair_suites = opt->pairs ? opt->pair_suites : NULL;
    b.c->options.pair_suites = NULL;
    /* Sets in some pair, for the ranking. */
    ranked = vg_calloc(in->n_sets, 1);
    if (!ranked) goto oom;
    for (size_t q = 0; q < 2 * b.n_pairs; q++) ranked[b.pairs[q]] = 1;

    for (size_t k = 0; k < in->n_suites && st == VG_OK; k++) {
        memset(b.in_pair, 0, in->n_sets);
        for (size_t q = 0; q < b.n_pairs; q++)
            if (vg_cmp_pair_on(&b, q, k)) b.in_pair[b.pairs[2 * q]] = b.in_pair[b.pairs[2 * q + 1]] = 1;
        if (in->suites[k].task == VG_TASK_SIMILARITY)
            st = vg_cmp_similarity(&b, in, k, err);
        else
            st = vg_cmp_analogy(&b, in, k, err);
        if (st != VG_OK) vg_error_prefix(err, "comparing on suite %s: ", in->suites[k].id);
    }
    if (st != VG_OK) goto fail;

    /* Holm's (1979) step-down adjustment over every test of the table. */
    vg_comparisons *c = b.c;
    size_t m = c->n_rows;
    p = vg_calloc(m ? m : 1, sizeof *p);
    adj = vg_calloc(m ? m : 1, sizeof *adj);
    work = vg_calloc(m ? m : 1, sizeof *work);
    if (!p || !adj || !work) goto oom;
    for (size_t r = 0; r < m; r++) {
        p[r] = c->rows[r].p_value;
        c->n_tests += !isnan(p[r]);
    }
    vg_paired_holm(p, m, adj, work);
    for (size_t r = 0; r < m; r++) {
        c->rows[r].p_holm = adj[r];
        /* Rejected at alpha when the adjusted p is at most alpha (Holm
         * 1979: reject H_(j) while p_(j) <= alpha / (m - j + 1)). */
        c->rows[r].significant = !isnan(adj[r]) && adj[r] <= opt->alpha;
    }
    memcpy(b.in_pair, ranked, in->n_sets);
    vg_free(ranked);
    ranked = NULL;
    if (rank_sets(c, b.in_pair) != 0) goto oom;
    vg_free(p);
    vg_free(adj);
    vg_free(work);
    vg_free(all_pairs);
    vg_free(b.in_pair);
    *out = c;
    return VG_OK;
oom:
    st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
fail:
    vg_free(ranked);
    vg_free(p);
    vg_free(adj);
    vg_free(work);
    vg_free(all_pairs);
    vg_free(b.in_pair);
    vg_comparisons_free(b.c);
    return st;
}
