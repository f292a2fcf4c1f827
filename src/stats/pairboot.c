/* pairboot.c - the pair bootstrap: questions that share word pairs,
 * resampled as a crossed design (Owen 2007, the pigeonhole bootstrap).
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Each stratum (an analogy section) holds row levels (the pairs questions
 * take as a : b), column levels (the pairs they take as c : d) and
 * isolated questions (whose row and column pair no other question of the
 * stratum uses). Replicate r of stratum s draws, from a generator seeded
 * by (seed, stream + s * golden, r) alone, R multiplicities over the R row
 * levels, then C over the C column levels, then NI over the NI isolated
 * questions (vg_resample_counts each); question q then weighs
 * w[row] * v[col], or u[q] when isolated. A design where no pair is
 * shared is therefore the ordinary bootstrap over questions, stratified
 * by section (one stratum: the very draws of the question bootstrap);
 * without the isolated pool each such question would weigh the product
 * of two independent counts, whose variance is 3 rather than 1.
 *
 * The sums a replicate needs are w' T v per stratum, T the R x C table of
 * per-cell totals of each value column: one matrix product over a block
 * of replicates (W, block x R, times T, R x C k), then C k products per
 * replicate. Every term is an integer (counts times small integers), so
 * the sums are exact whatever order BLAS adds them in, and results never
 * depend on threads or on the BLAS build: the product is sgemm when no
 * total can reach 2^24 (R C max T < 2^24, since the w sum to R and the v
 * to C; true of every public suite), else dgemm (2^53). sgemm halves the
 * cost, which on BATS is most of the bootstrap's. Strata too sparse for a dense table (R C much larger than their
 * occupied cells) add their cells one by one instead.
 */
#include <cblas.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/strmap.h"
#include "../common/threads.h"
#include "resample.h"
#include "stats_impl.h"
#include "vecgauge/stats.h"

/* OpenBLAS's run-time thread controls (cblas.h of the pthread build). */
int openblas_get_num_threads(void);
int openblas_get_parallel(void);
void openblas_set_num_threads(int);

/* Replicates handled per dgemm. */
#define BLOCK 64

/* Dense when R C <= DENSE_RATIO * cells + DENSE_SLACK. */
#define DENSE_RATIO 4
#define DENSE_SLACK 256

typedef struct strat {
    size_t rows, cols, iso;  /* levels and isolated questions */
    size_t cells;            /* occupied (row, col) cells */
    int dense;
} strat;

struct vg_pairboot_design {
    size_t n, n_strata;
    uint32_t *stratum;   /* n */
    uint32_t *row, *col; /* n: levels within the stratum; iso index in row
                            and UINT32_MAX in col for an isolated question */
    strat *st;         /* n_strata */
    size_t max_rows, max_cols, max_iso, max_cells;
};

static const uint64_t GOLDEN = 0x9e3779b97f4a7c15ULL;

/* The hash key of question i's cell: stratum, row level, column level. */
static void cell_key(const vg_pairboot_design *d, size_t i, uint32_t key[3]) {
    key[0] = d->stratum[i];
    key[1] = d->row[i];
    key[2] = d->col[i];
}

/* Levels of (stratum, label) in order of first appearance within the
 * stratum. out[i] gets the level; counts per stratum in nlev. */
static int levels(const uint32_t *stratum, const uint32_t *label, size_t n, uint32_t *out,
                  size_t *nlev) {
    uint64_t *keys = vg_calloc(n ? n : 1, sizeof *keys);
    vg_strmap m = VG_STRMAP_INIT;
    int rc = keys && vg_strmap_reserve(&m, n) == 0 ? 0 : -1;
    for (size_t i = 0; rc == 0 && i < n; i++) {
        keys[i] = (uint64_t)stratum[i] << 32 | label[i];
        size_t lev = nlev[stratum[i]], have;
        int put = vg_strmap_put(&m, (const char *)&keys[i], sizeof keys[i], lev, &have);
        if (put < 0) rc = -1;
        else if (put == 1) out[i] = (uint32_t)nlev[stratum[i]]++;
        else out[i] = (uint32_t)have;
    }
    vg_strmap_free(&m);
    vg_free(keys);
    return rc;
}

void vg_pairboot_design_free(vg_pairboot_design *d) {
    if (!d) return;
    vg_free(d->stratum);
    vg_free(d->row);
    vg_free(d->col);
    vg_free(d->st);
    vg_free(d);
}

vg_status vg_pairboot_design_new(const uint32_t *stratum, size_t n_strata, const uint32_t *row,
                                 const uint32_t *col, size_t n, vg_pairboot_design **out,
                                 vg_error *err) {
    *out = NULL;
    if (n > UINT32_MAX - 1 || n_strata > UINT32_MAX)
        return vg_error_set(err, VG_ELIMIT, NULL, 0, "more than 2^32 - 2 questions");
    for (size_t i = 0; i < n; i++)
        if (stratum[i] >= n_strata)
            return vg_error_set(err, VG_EINVAL, NULL, 0,
                                "question %zu is in stratum %u of %zu", i, stratum[i], n_strata);
    size_t n1 = n ? n : 1, s1 = n_strata ? n_strata : 1;
    vg_pairboot_design *d = vg_calloc(1, sizeof *d);
    size_t *nr = vg_calloc(s1, sizeof *nr), *nc = vg_calloc(s1, sizeof *nc);
    uint32_t *rl = vg_calloc(n1, sizeof *rl), *cl = vg_calloc(n1, sizeof *cl);
    uint32_t *uses_r = NULL, *uses_c = NULL, *remap_r = NULL, *remap_c = NULL;
    if (!d || !nr || !nc || !rl || !cl) goto oom;
    d->n = n;
    d->n_strata = n_strata;
    d->stratum = vg_calloc(n1, sizeof *d->stratum);
    d->row = vg_calloc(n1, sizeof *d->row);
    d->col = vg_calloc(n1, sizeof *d->col);
    d->st = vg_calloc(s1, sizeof *d->st);
    if (!d->stratum || !d->row || !d->col || !d->st) goto oom;
    if (n) memcpy(d->stratum, stratum, n * sizeof *stratum);
    if (levels(stratum, row, n, rl, nr) != 0 ||
        levels(stratum, col, n, cl, nc) != 0)
        goto oom;

    /* Level offsets per stratum, so that one array counts every level. */
    size_t tot_r = 0, tot_c = 0;
    size_t *off_r = nr, *off_c = nc; /* reused: nr[s] becomes an offset */
    for (size_t s = 0; s < n_strata; s++) {
        size_t a = nr[s], b = nc[s];
        off_r[s] = tot_r;
        off_c[s] = tot_c;
        tot_r += a;
        tot_c += b;
    }
    uses_r = vg_calloc(tot_r + 1, sizeof *uses_r);
    uses_c = vg_calloc(tot_c + 1, sizeof *uses_c);
    remap_r = vg_calloc(tot_r + 1, sizeof *remap_r);
    remap_c = vg_calloc(tot_c + 1, sizeof *remap_c);
    if (!uses_r || !uses_c || !remap_r || !remap_c) goto oom;
    for (size_t i = 0; i < n; i++) {
        uses_r[off_r[stratum[i]] + rl[i]]++;
        uses_c[off_c[stratum[i]] + cl[i]]++;
    }
    /* Levels of isolated questions leave the row and column pools; the
     * others are numbered again in order of first appearance. */
    for (size_t i = 0; i < tot_r; i++) remap_r[i] = UINT32_MAX;
    for (size_t i = 0; i < tot_c; i++) remap_c[i] = UINT32_MAX;
    for (size_t i = 0; i < n; i++) {
        uint32_t s = stratum[i];
        size_t gr = off_r[s] + rl[i], gc = off_c[s] + cl[i];
        strat *S = &d->st[s];
        if (uses_r[gr] == 1 && uses_c[gc] == 1) {
            d->row[i] = (uint32_t)S->iso++;
            d->col[i] = UINT32_MAX;
            continue;
        }
        if (remap_r[gr] == UINT32_MAX) remap_r[gr] = (uint32_t)S->rows++;
        if (remap_c[gc] == UINT32_MAX) remap_c[gc] = (uint32_t)S->cols++;
        d->row[i] = remap_r[gr];
        d->col[i] = remap_c[gc];
    }
    /* Occupied cells. */
    {
        uint32_t *key = vg_calloc(3 * n1, sizeof *key);
        vg_strmap cells = VG_STRMAP_INIT;
        int rc = key && vg_strmap_reserve(&cells, n) == 0 ? 0 : -1;
        for (size_t i = 0; rc == 0 && i < n; i++) {
            if (d->col[i] == UINT32_MAX) continue;
            cell_key(d, i, key + 3 * i);
            int put = vg_strmap_put(&cells, (const char *)(key + 3 * i), 3 * sizeof *key, 0, NULL);
            if (put < 0) rc = -1;
            else if (put == 1) d->st[d->stratum[i]].cells++;
        }
        vg_strmap_free(&cells);
        vg_free(key);
        if (rc != 0) goto oom;
    }
    for (size_t s = 0; s < n_strata; s++) {
        strat *S = &d->st[s];
        S->dense = S->rows * S->cols <= DENSE_RATIO * S->cells + DENSE_SLACK;
        d->max_rows = VG_MAX(d->max_rows, S->rows);
        d->max_cols = VG_MAX(d->max_cols, S->cols);
        d->max_iso = VG_MAX(d->max_iso, S->iso);
        d->max_cells = VG_MAX(d->max_cells, S->cells);
    }
    *out = d;
    d = NULL;
oom:
    vg_free(nr);
    vg_free(nc);
    vg_free(rl);
    vg_free(cl);
    vg_free(uses_r);
    vg_free(uses_c);
    vg_free(remap_r);
    vg_free(remap_c);
    if (*out) return VG_OK;
    vg_pairboot_design_free(d);
    return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
}

size_t vg_pairboot_design_strata(const vg_pairboot_design *d) { return d->n_strata; }

void vg_pairboot_design_levels(const vg_pairboot_design *d, size_t s, size_t *rows,
                               size_t *cols, size_t *isolated) {
    const strat *S = &d->st[s];
    if (rows) *rows = S->rows;
    if (cols) *cols = S->cols;
    if (isolated) *isolated = S->iso;
}

/* The multiplicities of replicate r in stratum s: w (rows), v (cols), u
 * (isolated), as counts. */
static void draw(const vg_pairboot_design *d, gsl_rng *rng, uint64_t seed, uint64_t stream,
                 size_t s, size_t r, uint32_t *w, uint32_t *v, uint32_t *u) {
    const strat *S = &d->st[s];
    memset(w, 0, S->rows * sizeof *w);
    memset(v, 0, S->cols * sizeof *v);
    memset(u, 0, S->iso * sizeof *u);
    vg_resample_seed(rng, seed, stream + (uint64_t)s * GOLDEN, r);
    vg_resample_counts(rng, S->rows, w);
    vg_resample_counts(rng, S->cols, v);
    vg_resample_counts(rng, S->iso, u);
}

void vg_pairboot_draws(const vg_pairboot_design *d, uint64_t seed, uint64_t stream,
                       size_t replicate, size_t s, uint32_t *w, uint32_t *v, uint32_t *u) {
    gsl_rng *rng = vg_resample_rng_alloc();
    if (!rng) return;
    draw(d, rng, seed, stream, s, replicate, w, v, u);
    gsl_rng_free(rng);
}

vg_status vg_pairboot_weights(const vg_pairboot_design *d, uint64_t seed, uint64_t stream,
                              size_t replicate, double *weights, vg_error *err) {
    size_t R = d->max_rows ? d->max_rows : 1, C = d->max_cols ? d->max_cols : 1;
    size_t NI = d->max_iso ? d->max_iso : 1;
    uint32_t *w = vg_calloc(d->n_strata * R, sizeof *w);
    uint32_t *v = vg_calloc(d->n_strata * C, sizeof *v);
    uint32_t *u = vg_calloc(d->n_strata * NI, sizeof *u);
    gsl_rng *rng = vg_resample_rng_alloc();
    vg_status st = VG_OK;
    if (!w || !v || !u || !rng) {
        st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
        goto done;
    }
    for (size_t s = 0; s < d->n_strata; s++)
        draw(d, rng, seed, stream, s, replicate, w + s * R, v + s * C, u + s * NI);
    for (size_t i = 0; i < d->n; i++) {
        size_t s = d->stratum[i];
        weights[i] = d->col[i] == UINT32_MAX
                         ? (double)u[s * NI + d->row[i]]
                         : (double)w[s * R + d->row[i]] * (double)v[s * C + d->col[i]];
    }
done:
    if (rng) gsl_rng_free(rng);
    vg_free(w);
    vg_free(v);
    vg_free(u);
    return st;
}

/* ---- the sums ----------------------------------------------------------- */

/* Per stratum, what the replicates multiply: the dense table, or the
 * occupied cells, and the isolated questions' values. */
typedef struct table {
    double *dense;      /* rows x (cols k), cell (r, c) value j at r * cols k + c k + j */
    float *dense_f;     /* the same in float when every total is exact in float */
    uint32_t *cell_rc;  /* sparse: 2 per cell */
    double *cell_x;     /* sparse: k per cell */
    size_t n_cells;
    double *iso_x;      /* iso x k */
} table;

typedef struct job {
    const vg_pairboot_design *d;
    const table *tab;
    size_t k, B;
    uint64_t seed, stream;
    double *sums;
    int failed;
} job;

static void worker(void *ctx, unsigned t, unsigned T) {
    job *J = ctx;
    const vg_pairboot_design *d = J->d;
    size_t k = J->k, S = d->n_strata;
    size_t R = d->max_rows ? d->max_rows : 1, C = d->max_cols ? d->max_cols : 1;
    size_t NI = d->max_iso ? d->max_iso : 1;
    uint32_t *w = vg_calloc(BLOCK * R, sizeof *w), *v = vg_calloc(BLOCK * C, sizeof *v);
    uint32_t *u = vg_calloc(NI, sizeof *u);
    double *W = vg_calloc(BLOCK * R, sizeof *W);
    double *P = vg_calloc(BLOCK * C * k, sizeof *P);
    float *Wf = vg_calloc(BLOCK * R, sizeof *Wf);
    float *Pf = vg_calloc(BLOCK * C * k, sizeof *Pf);
    gsl_rng *rng = vg_resample_rng_alloc();
    if (!w || !v || !u || !W || !P || !Wf || !Pf || !rng) {
        J->failed = 1;
        goto done;
    }
    size_t lo = J->B * t / T, hi = J->B * (t + 1) / T;
    for (size_t r0 = lo; r0 < hi; r0 += BLOCK) {
        size_t nb = VG_MIN(BLOCK, hi - r0);
        for (size_t s = 0; s < S; s++) {
            const strat *st = &d->st[s];
            const table *tb = &J->tab[s];
            for (size_t b = 0; b < nb; b++) {
                double *out = J->sums + ((r0 + b) * S + s) * k;
                draw(d, rng, J->seed, J->stream, s, r0 + b, w + b * R, v + b * C, u);
                for (size_t j = 0; j < k; j++) out[j] = 0;
                for (size_t i = 0; i < st->iso; i++)
                    if (u[i])
                        for (size_t j = 0; j < k; j++) out[j] += (double)u[i] * tb->iso_x[i * k + j];
                if (!st->dense)
                    for (size_t c = 0; c < tb->n_cells; c++) {
                        double wv = (double)w[b * R + tb->cell_rc[2 * c]] *
                                    (double)v[b * C + tb->cell_rc[2 * c + 1]];
                        if (wv != 0)
                            for (size_t j = 0; j < k; j++) out[j] += wv * tb->cell_x[c * k + j];
                    }
            }
            if (!st->dense || st->rows == 0 || st->cols == 0) continue;
            size_t ck = st->cols * k;
            if (tb->dense_f) {
                for (size_t b = 0; b < nb; b++)
                    for (size_t i = 0; i < st->rows; i++) Wf[b * st->rows + i] = (float)w[b * R + i];
                cblas_sgemm(CblasRowMajor, CblasNoTrans, CblasNoTrans, (int)nb, (int)ck,
                            (int)st->rows, 1.0f, Wf, (int)st->rows, tb->dense_f, (int)ck, 0.0f,
                            Pf, (int)ck);
                for (size_t i = 0; i < nb * ck; i++) P[i] = Pf[i];
            } else {
                for (size_t b = 0; b < nb; b++)
                    for (size_t i = 0; i < st->rows; i++) W[b * st->rows + i] = (double)w[b * R + i];
                cblas_dgemm(CblasRowMajor, CblasNoTrans, CblasNoTrans, (int)nb, (int)ck,
                            (int)st->rows, 1.0, W, (int)st->rows, tb->dense, (int)ck, 0.0, P,
                            (int)ck);
            }
            for (size_t b = 0; b < nb; b++) {
                double *out = J->sums + ((r0 + b) * S + s) * k;
                const double *p = P + b * ck;
                for (size_t c = 0; c < st->cols; c++) {
                    double vc = (double)v[b * C + c];
                    if (vc != 0)
                        for (size_t j = 0; j < k; j++) out[j] += vc * p[c * k + j];
                }
            }
        }
    }
done:
    if (rng) gsl_rng_free(rng);
    vg_free(w);
    vg_free(v);
    vg_free(u);
    vg_free(W);
    vg_free(P);
    vg_free(Wf);
    vg_free(Pf);
}

static void tables_free(table *tab, size_t S) {
    for (size_t s = 0; tab && s < S; s++) {
        vg_free(tab[s].dense);
        vg_free(tab[s].dense_f);
        vg_free(tab[s].cell_rc);
        vg_free(tab[s].cell_x);
        vg_free(tab[s].iso_x);
    }
    vg_free(tab);
}

/* The tables of every stratum. NULL when out of memory. */
static table *tables_build(const vg_pairboot_design *d, const unsigned char *const *x, size_t k) {
    size_t S = d->n_strata;
    table *tab = vg_calloc(S ? S : 1, sizeof *tab);
    vg_strmap m = VG_STRMAP_INIT;
    uint32_t *keys = NULL;
    if (!tab) return NULL;
    for (size_t s = 0; s < S; s++) {
        const strat *st = &d->st[s];
        table *tb = &tab[s];
        tb->iso_x = vg_calloc(st->iso ? st->iso * k : 1, sizeof *tb->iso_x);
        if (st->dense)
            tb->dense = vg_calloc(st->rows * st->cols * k + 1, sizeof *tb->dense);
        else {
            tb->cell_rc = vg_calloc(2 * st->cells + 1, sizeof *tb->cell_rc);
            tb->cell_x = vg_calloc(st->cells * k + 1, sizeof *tb->cell_x);
        }
        if (!tb->iso_x || (st->dense ? !tb->dense : !tb->cell_rc || !tb->cell_x)) goto oom;
    }
    keys = vg_calloc(3 * (d->n ? d->n : 1), sizeof *keys);
    if (!keys || vg_strmap_reserve(&m, d->n) != 0) goto oom;
    for (size_t i = 0; i < d->n; i++) {
        size_t s = d->stratum[i];
        const strat *st = &d->st[s];
        table *tb = &tab[s];
        double *dst;
        if (d->col[i] == UINT32_MAX) {
            dst = tb->iso_x + (size_t)d->row[i] * k;
        } else if (st->dense) {
            dst = tb->dense + ((size_t)d->row[i] * st->cols + d->col[i]) * k;
        } else {
            cell_key(d, i, keys + 3 * i);
            size_t have;
            int put = vg_strmap_put(&m, (const char *)(keys + 3 * i), 3 * sizeof *keys,
                                    tb->n_cells, &have);
            if (put < 0) goto oom;
            if (put == 1) {
                have = tb->n_cells++;
                tb->cell_rc[2 * have] = d->row[i];
                tb->cell_rc[2 * have + 1] = d->col[i];
            }
            dst = tb->cell_x + have * k;
        }
        for (size_t j = 0; j < k; j++) dst[j] += x[j][i];
    }
    /* Float when no total can reach 2^24 (see the file's comment). */
    for (size_t s = 0; s < S; s++) {
        const strat *st = &d->st[s];
        table *tb = &tab[s];
        if (!st->dense || st->rows == 0 || st->cols == 0) continue;
        size_t nt = st->rows * st->cols * k;
        double mx = 0;
        for (size_t i = 0; i < nt; i++)
            if (tb->dense[i] > mx) mx = tb->dense[i];
        if ((double)st->rows * (double)st->cols * mx >= 16777216.0) continue;
        if (!(tb->dense_f = vg_calloc(nt, sizeof *tb->dense_f))) goto oom;
        for (size_t i = 0; i < nt; i++) tb->dense_f[i] = (float)tb->dense[i];
    }
    vg_strmap_free(&m);
    vg_free(keys);
    return tab;
oom:
    vg_strmap_free(&m);
    vg_free(keys);
    tables_free(tab, S);
    return NULL;
}

vg_status vg_pairboot_sums(const vg_pairboot_design *d, const vg_pairboot_options *opt,
                           const unsigned char *const *x, size_t k, double *sums,
                           vg_error *err) {
    if (opt->replicates == 0 || k == 0) return VG_OK;
    table *tab = tables_build(d, x, k);
    if (!tab) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    unsigned T = vg_threads_resolve(opt->threads);
    size_t per = (opt->replicates + BLOCK - 1) / BLOCK;
    if (T > per) T = (unsigned)per;
    job J = {d, tab, k, opt->replicates, opt->seed, opt->stream, sums, 0};
    /* Our threads split the replicates; OpenBLAS runs one thread per call
     * meanwhile (as the analogy scorer does, for the same reason). */
    int blas_threads = openblas_get_num_threads();
    int adjust = T > 1 && openblas_get_parallel() != 0 && blas_threads != 1;
    if (adjust) openblas_set_num_threads(1);
    vg_parallel(T, worker, &J);
    if (adjust) openblas_set_num_threads(blas_threads);
    tables_free(tab, d->n_strata);
    if (J.failed) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    return VG_OK;
}

void vg_pairboot_options_init(vg_pairboot_options *opt) {
    memset(opt, 0, sizeof *opt);
    opt->replicates = VG_DEFAULT_BOOTSTRAP;
    opt->seed = VG_DEFAULT_SEED;
}
