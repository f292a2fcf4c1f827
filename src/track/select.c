/* select.c - which earlier runs a tracked run is compared with.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Plain functions of the history's rows, so that every rule has a unit
 * test (tests/unit/test_track.c): the default step, a step already
 * present, the previous run and the best earlier run of each suite.
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "track_impl.h"

const char *vg_track_headline(vg_task task) {
    return task == VG_TASK_SIMILARITY ? "spearman" : "3cosadd";
}

uint64_t vg_track_next_step(const vg_history_row *rows, size_t n) {
    uint64_t step = 0;
    for (size_t i = 0; i < n; i++)
        if (rows[i].step > step) step = rows[i].step;
    return step + 1;
}

long vg_track_step_row(const vg_history_row *rows, size_t n, uint64_t step) {
    for (size_t i = 0; i < n; i++)
        if (rows[i].step == step) return (long)i;
    return -1;
}

static int same_run(const char *a_run, const char *a_vec, const char *b_run, const char *b_vec) {
    return strcmp(a_run, b_run) == 0 && strcmp(a_vec, b_vec) == 0;
}

size_t vg_track_count_runs(const vg_history_row *rows, size_t n) {
    size_t runs = 0;
    for (size_t i = 0; i < n; i++) {
        int seen = 0;
        for (size_t j = 0; j < i && !seen; j++)
            seen = rows[j].step == rows[i].step &&
                   same_run(rows[j].run, rows[j].vectors, rows[i].run, rows[i].vectors);
        runs += !seen;
    }
    return runs;
}

void vg_track_refs_free(vg_track_refs *r) {
    for (size_t i = 0; r->refs && i < r->n_refs; i++) {
        vg_free(r->refs[i].run);
        vg_free(r->refs[i].vectors);
    }
    vg_free(r->refs);
    vg_free(r->best_of);
    memset(r, 0, sizeof *r);
}

/* The index of row r's (run, vectors) among the references, added if
 * new (a run's copies: the rows belong to the history). -1 when out of
 * memory. */
static long ref_index(vg_track_refs *s, const vg_history_row *r, int prev) {
    for (size_t i = 0; i < s->n_refs; i++)
        if (same_run(s->refs[i].run, s->refs[i].vectors, r->run, r->vectors)) {
            s->refs[i].prev |= prev;
            return (long)i;
        }
    vg_track_ref *nr = vg_realloc(s->refs, (s->n_refs + 1) * sizeof *nr);
    if (!nr) return -1;
    s->refs = nr;
    char *run = vg_strdup(r->run), *vec = vg_strdup(r->vectors);
    if (!run || !vec) {
        vg_free(run);
        vg_free(vec);
        return -1;
    }
    s->refs[s->n_refs] = (vg_track_ref){run, vec, r->step, prev};
    return (long)s->n_refs++;
}

vg_status vg_track_select(const vg_history_row *rows, size_t n_rows, const char *run,
                          const char *vectors, uint64_t step, const vg_track_suite *suites,
                          size_t n_suites, vg_track_refs *out, vg_error *err) {
    memset(out, 0, sizeof *out);
    /* Rows that may be references: strictly earlier, another run. */
#define CANDIDATE(r) ((r)->step < step && !same_run((r)->run, (r)->vectors, run, vectors))
    long prev = -1;
    for (size_t i = 0; i < n_rows; i++) {
        const vg_history_row *r = &rows[i];
        if (!CANDIDATE(r)) continue;
        /* The largest earlier step; at equal steps the later line. */
        if (prev < 0 || r->step >= rows[prev].step) prev = (long)i;
    }
    if (prev >= 0 && ref_index(out, &rows[prev], 1) < 0) goto oom;
    out->best_of = vg_calloc(n_suites ? n_suites : 1, sizeof *out->best_of);
    if (!out->best_of) goto oom;
    for (size_t k = 0; k < n_suites; k++) {
        const char *metric = vg_track_headline(suites[k].task);
        long best = -1;
        for (size_t i = 0; i < n_rows; i++) {
            const vg_history_row *r = &rows[i];
            if (!CANDIDATE(r) || strcmp(r->suite, suites[k].id) != 0 ||
                strcmp(r->metric, metric) != 0 || isnan(r->value))
                continue;
            /* Highest value; ties go to the earlier line. */
            if (best < 0 || r->value > rows[best].value) best = (long)i;
        }
        out->best_of[k] = best < 0 ? -1 : ref_index(out, &rows[best], 0);
        if (best >= 0 && out->best_of[k] < 0) goto oom;
    }
#undef CANDIDATE
    return VG_OK;
oom:
    vg_track_refs_free(out);
    return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
}

void vg_track_verdict(const vg_comparisons *c, const char *const *ids, size_t n,
                      unsigned char *regressed) {
    memset(regressed, 0, n);
    for (size_t r = 0; c && r < c->n_rows; r++) {
        const vg_comparison *row = &c->rows[r];
        if (!row->significant || !(row->diff < 0)) continue;
        for (size_t k = 0; k < n; k++)
            if (strcmp(ids[k], c->suite_ids[row->suite]) == 0) regressed[k] = 1;
    }
}
