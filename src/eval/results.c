/* results.c - the vg_results table: rows, lookup, freeing.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/arena.h"
#include "../common/strmap.h"
#include "eval_impl.h"

static const char *const metric_names[VG_METRIC_COUNT] = {
    "spearman", "pearson", "kendall", "3cosadd", "3cosmul", "pairdir", "only_b"};

const char *vg_metric_name(vg_metric m) {
    return (unsigned)m < VG_METRIC_COUNT ? metric_names[m] : "unknown";
}

vg_status vg_metric_parse(const char *name, vg_metric *out) {
    for (int i = 0; i < VG_METRIC_COUNT; i++) {
        if (strcmp(name, metric_names[i]) == 0) {
            *out = (vg_metric)i;
            return VG_OK;
        }
    }
    return VG_EINVAL;
}

void vg_eval_options_init(vg_eval_options *opt) {
    memset(opt, 0, sizeof *opt);
    vg_score_options_init(&opt->score);
    opt->seed = VG_DEFAULT_SEED;
    opt->bootstrap = VG_DEFAULT_BOOTSTRAP;
    opt->ci = VG_DEFAULT_CI;
}

int vg_results_add_row(vg_results *r, size_t *cap, const vg_score_row *row) {
    if (vg_grow((void **)&r->rows, cap, r->n_rows + 1, sizeof *r->rows) != 0) return -1;
    r->rows[r->n_rows++] = *row;
    return 0;
}

void vg_row_add_interval(vg_score_row *row, double low, double high, const char *method) {
    if (row->n_ci >= VG_MAX_INTERVALS) return;
    row->ci[row->n_ci++] = (vg_interval){.low = low, .high = high, .method = method};
}

const vg_item_block *vg_results_block(const vg_results *r, size_t set, size_t suite) {
    if (set >= r->n_sets || suite >= r->n_suites) return NULL;
    return &r->blocks[set * r->n_suites + suite];
}

const vg_agreement *vg_results_agreement(const vg_results *r, size_t suite) {
    if (!r->agreement || suite >= r->n_suites) return NULL;
    return &r->agreement[suite];
}

/* The index behind vg_results_find: key "set suite metric all subset"
 * (fixed-width numbers, then the subset's bytes) -> first row. */
typedef struct row_index {
    vg_strmap map;
    vg_arena keys;
} row_index;

static char *row_key(vg_arena *a, size_t set, size_t suite, vg_metric m, int all,
                     const char *subset, char *buf, size_t cap, size_t *len) {
    size_t sl = strlen(subset);
    size_t n = 3 * sizeof(uint64_t) + 1 + sl;
    char *k = a ? vg_arena_alloc(a, n) : (n <= cap ? buf : NULL);
    if (!k) return NULL;
    uint64_t head[3] = {set, suite, (uint64_t)m};
    memcpy(k, head, sizeof head);
    k[sizeof head] = (char)(all != 0);
    memcpy(k + sizeof head + 1, subset, sl);
    *len = n;
    return k;
}

vg_status vg_results_index(vg_results *r, vg_error *err) {
    row_index *ix = vg_calloc(1, sizeof *ix);
    if (!ix || vg_strmap_reserve(&ix->map, r->n_rows) != 0) {
        vg_free(ix);
        return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory indexing the scores");
    }
    for (size_t i = 0; i < r->n_rows; i++) {
        const vg_score_row *row = &r->rows[i];
        size_t len;
        char *k = row_key(&ix->keys, row->set, row->suite, row->metric, row->all_items,
                          row->subset, NULL, 0, &len);
        if (!k || vg_strmap_put(&ix->map, k, len, i, NULL) < 0) {
            vg_strmap_free(&ix->map);
            vg_arena_free(&ix->keys);
            vg_free(ix);
            return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory indexing the scores");
        }
    }
    r->lookup_ = ix;
    return VG_OK;
}

const vg_score_row *vg_results_find(const vg_results *r, size_t set, size_t suite,
                                    const char *subset, vg_metric metric, int all_items) {
    if (!subset) subset = "";
    const row_index *ix = r->lookup_;
    char buf[512];
    size_t len;
    const char *k;
    if (ix && (k = row_key(NULL, set, suite, metric, all_items, subset, buf, sizeof buf, &len))) {
        size_t at = vg_strmap_get(&ix->map, k, len);
        return at == (size_t)-1 ? NULL : &r->rows[at];
    }
    for (size_t i = 0; i < r->n_rows; i++) {
        const vg_score_row *row = &r->rows[i];
        if (row->set == set && row->suite == suite && row->metric == metric &&
            row->all_items == all_items && strcmp(row->subset, subset) == 0)
            return row;
    }
    return NULL;
}

void vg_results_free(vg_results *r) {
    if (!r) return;
    for (size_t i = 0; i < r->n_sets; i++) {
        if (r->labels) vg_free(r->labels[i]);
        if (r->paths) vg_free(r->paths[i]);
    }
    vg_free(r->labels);
    vg_free(r->paths);
    vg_free(r->infos);
    vg_free(r->vectors);
    if (r->blocks) {
        for (size_t i = 0; i < r->n_sets * r->n_suites; i++) {
            vg_similarity_scores_free(r->blocks[i].sim);
            vg_analogy_scores_free(r->blocks[i].ana);
        }
    }
    vg_free(r->blocks);
    vg_free(r->suites);
    vg_free(r->rows);
    row_index *ix = r->lookup_;
    if (ix) {
        vg_strmap_free(&ix->map);
        vg_arena_free(&ix->keys);
        vg_free(ix);
    }
    vg_free(r->agreement);
    vg_free(r);
}
