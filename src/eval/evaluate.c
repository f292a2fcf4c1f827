/* evaluate.c - vg_evaluate: every vector set on every suite.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <string.h>

#include "../common/alloc.h"
#include "eval_impl.h"
#include "vecgauge/vecgauge.h"

static vg_results *results_new(const vg_vector_set *sets, size_t n_sets,
                               const vg_suite *const *suites, size_t n_suites,
                               const vg_eval_options *opt) {
    vg_results *r = vg_calloc(1, sizeof *r);
    if (!r) return NULL;
    r->n_sets = n_sets;
    r->n_suites = n_suites;
    r->options = *opt;
    r->labels = vg_calloc(n_sets, sizeof *r->labels);
    r->paths = vg_calloc(n_sets, sizeof *r->paths);
    r->infos = vg_calloc(n_sets, sizeof *r->infos);
    r->vectors = vg_calloc(n_sets, sizeof *r->vectors);
    r->suites = vg_calloc(n_suites ? n_suites : 1, sizeof *r->suites);
    r->blocks = vg_calloc(n_sets * n_suites > 0 ? n_sets * n_suites : 1, sizeof *r->blocks);
    if (!r->labels || !r->paths || !r->infos || !r->vectors || !r->suites || !r->blocks) {
        vg_results_free(r);
        return NULL;
    }
    for (size_t i = 0; i < n_sets; i++) {
        r->labels[i] = vg_strdup(sets[i].label ? sets[i].label : "");
        r->paths[i] = vg_strdup(sets[i].path ? sets[i].path : "");
        if (!r->labels[i] || !r->paths[i]) {
            vg_results_free(r);
            return NULL;
        }
        r->infos[i] = *vg_vectors_get_info(sets[i].vectors);
        r->vectors[i] = sets[i].vectors;
    }
    for (size_t k = 0; k < n_suites; k++) r->suites[k] = suites[k];
    return r;
}

vg_status vg_evaluate(const vg_vector_set *sets, size_t n_sets, const vg_suite *const *suites,
                      size_t n_suites, const vg_eval_options *opt, vg_results **out,
                      vg_error *err) {
    *out = NULL;
    vg_init();
    vg_eval_options defaults;
    if (!opt) {
        vg_eval_options_init(&defaults);
        opt = &defaults;
    }
    if (n_sets == 0 || !sets)
        return vg_error_set(err, VG_EINVAL, NULL, 0, "no vector set to evaluate");
    for (size_t i = 0; i < n_sets; i++)
        if (!sets[i].vectors)
            return vg_error_set(err, VG_EINVAL, NULL, 0, "vector set %zu is NULL", i + 1);
    for (size_t k = 0; k < n_suites; k++)
        if (!suites[k]) return vg_error_set(err, VG_EINVAL, NULL, 0, "suite %zu is NULL", k + 1);

    vg_results *r = results_new(sets, n_sets, suites, n_suites, opt);
    if (!r) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    size_t cap = 0;
    vg_status st = vg_eval_agreement(r, err);
    for (size_t i = 0; i < n_sets && st == VG_OK; i++) {
        for (size_t k = 0; k < n_suites && st == VG_OK; k++) {
            vg_item_block *b = &r->blocks[i * n_suites + k];
            if (suites[k]->task == VG_TASK_SIMILARITY) {
                st = vg_score_similarity(sets[i].vectors, suites[k], &opt->score, &b->sim, err);
                if (st == VG_OK) st = vg_eval_similarity_rows(r, &cap, i, k, opt, err);
            } else {
                st = vg_score_analogy(sets[i].vectors, suites[k], &opt->score, &b->ana, err);
                if (st == VG_OK) st = vg_eval_analogy_rows(r, &cap, i, k, opt, err);
            }
            if (st != VG_OK)
                vg_error_prefix(err, "vector set %s, suite %s: ", r->labels[i], suites[k]->id);
        }
    }
    if (st == VG_OK) st = vg_results_index(r, err);
    if (st != VG_OK) {
        vg_results_free(r);
        return st;
    }
    *out = r;
    return VG_OK;
}
