/* corrboot.c - bootstrap and jackknife of Spearman, Pearson and Kendall.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * A bootstrap resample only reweights the original items: item i drawn
 * c_i times. With the items sorted once by x and by y, the average ranks
 * of a resample follow from the multiplicities in O(n): a group of tied
 * values with total weight W that starts after `cum` drawn copies holds
 * ranks cum+1 .. cum+W, so each of its copies gets cum + (W + 1) / 2.
 * Spearman's rho of the resample is then the weighted Pearson correlation
 * of these ranks, and Kendall's tau-b counts weighted discordant pairs
 * with a Fenwick tree (O(n log n)). The jackknife is the same computation
 * with weights 1 and one 0 (Kendall's by removing one item's pairs).
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/threads.h"
#include "resample.h"
#include "stats_impl.h"
#include "vecgauge/stats.h"
#include "vecgauge/vecgauge.h"

/* The data sorted once: the items with a defined y ("used"), grouped by
 * tied x, by tied y and by tied (x, y). */
typedef struct prep {
    size_t n, m;          /* items, used items */
    const double *x, *y;
    double x0, y0;        /* means of the used items (Pearson's shift) */
    size_t *used;         /* m original indices, ascending */
    size_t *ox;           /* m used items sorted by (x, y) */
    size_t *gx, ngx;      /* x groups: ox[gx[g] .. gx[g+1]) */
    size_t *gj, ngj;      /* (x, y) groups, as ranges of ox */
    size_t *oy;           /* m used items sorted by (y, x) */
    size_t *gy, ngy;      /* y groups: oy[gy[g] .. gy[g+1]) */
    uint32_t *gid_x;      /* n: x group of a used item */
    uint32_t *gid_y;      /* n: y group of a used item */
    /* Kendall walks one variable's groups and keeps a Fenwick tree over
     * the other's: the tree goes over the variable with fewer distinct
     * values (human ratings often have few), so its paths are shorter. */
    const size_t *k_order, *k_starts;
    size_t k_ngroups;
    const uint32_t *k_tree_id;
    size_t k_tree_size;
    unsigned k_levels;    /* L: tree ids are below 2^L */
} prep;

/* One thread's scratch. */
typedef struct tws {
    uint32_t *c;          /* n multiplicities */
    double *rx, *ry;      /* rank of each x / y group */
    uint32_t *wx, *wy;    /* weight of each x / y group */
    uint32_t *tree;       /* Kendall's counting tree, 2^(L+1) counts */
    gsl_rng *rng;
} tws;

/* Which correlations to compute: bit k for vg_corr k. */
enum { WANT_SPEARMAN = 1 << VG_CORR_SPEARMAN, WANT_PEARSON = 1 << VG_CORR_PEARSON,
       WANT_KENDALL = 1 << VG_CORR_KENDALL, WANT_ALL = (1 << VG_CORR_COUNT) - 1 };

static uint64_t pairs_of(uint64_t t) { return t * (t - 1) / 2; }

/* Group boundaries of order[0..m) under equality of key (and of key2
 * when not NULL): starts[0..ngroups] with starts[ngroups] = m. */
static size_t group(const size_t *order, size_t m, const double *key, const double *key2,
                    size_t *starts) {
    size_t g = 0;
    for (size_t k = 0; k < m; k++) {
        if (k == 0 || key[order[k]] != key[order[k - 1]] ||
            (key2 && key2[order[k]] != key2[order[k - 1]]))
            starts[g++] = k;
    }
    starts[g] = m;
    return g;
}

static void prep_free(prep *p) {
    vg_free(p->used);
    vg_free(p->ox);
    vg_free(p->gx);
    vg_free(p->gj);
    vg_free(p->oy);
    vg_free(p->gy);
    vg_free(p->gid_x);
    vg_free(p->gid_y);
}

static int prep_init(prep *p, const double *x, const double *y, size_t n) {
    memset(p, 0, sizeof *p);
    p->n = n;
    p->x = x;
    p->y = y;
    size_t m = 0;
    for (size_t i = 0; i < n; i++) m += !isnan(y[i]);
    p->m = m;
    size_t m1 = m + 1;
    p->used = vg_calloc(m1, sizeof *p->used);
    p->ox = vg_calloc(m1, sizeof *p->ox);
    p->gx = vg_calloc(m1, sizeof *p->gx);
    p->gj = vg_calloc(m1, sizeof *p->gj);
    p->oy = vg_calloc(m1, sizeof *p->oy);
    p->gy = vg_calloc(m1, sizeof *p->gy);
    p->gid_x = vg_calloc(n ? n : 1, sizeof *p->gid_x);
    p->gid_y = vg_calloc(n ? n : 1, sizeof *p->gid_y);
    double *cx = vg_calloc(m1, sizeof *cx), *cy = vg_calloc(m1, sizeof *cy);
    if (!p->used || !p->ox || !p->gx || !p->gj || !p->oy || !p->gy || !p->gid_x || !p->gid_y ||
        !cx || !cy) {
        vg_free(cx);
        vg_free(cy);
        prep_free(p);
        return -1;
    }
    m = 0;
    for (size_t i = 0; i < n; i++)
        if (!isnan(y[i])) p->used[m++] = i;
    /* Sort positions 0..m-1 of compact copies, then map back. */
    for (size_t k = 0; k < m; k++) {
        cx[k] = x[p->used[k]];
        cy[k] = y[p->used[k]];
        p->x0 += cx[k];
        p->y0 += cy[k];
    }
    if (m) {
        p->x0 /= (double)m;
        p->y0 /= (double)m;
    }
    vg_stats_order(cx, cy, m, p->ox);
    vg_stats_order(cy, cx, m, p->oy);
    vg_free(cx);
    vg_free(cy);
    for (size_t k = 0; k < m; k++) {
        p->ox[k] = p->used[p->ox[k]];
        p->oy[k] = p->used[p->oy[k]];
    }
    p->ngx = group(p->ox, m, x, NULL, p->gx);
    p->ngj = group(p->ox, m, x, y, p->gj);
    p->ngy = group(p->oy, m, y, NULL, p->gy);
    for (size_t g = 0; g < p->ngx; g++)
        for (size_t k = p->gx[g]; k < p->gx[g + 1]; k++) p->gid_x[p->ox[k]] = (uint32_t)g;
    for (size_t g = 0; g < p->ngy; g++)
        for (size_t k = p->gy[g]; k < p->gy[g + 1]; k++) p->gid_y[p->oy[k]] = (uint32_t)g;
    if (p->ngy <= p->ngx) {
        p->k_order = p->ox, p->k_starts = p->gx, p->k_ngroups = p->ngx;
        p->k_tree_id = p->gid_y, p->k_tree_size = p->ngy;
    } else {
        p->k_order = p->oy, p->k_starts = p->gy, p->k_ngroups = p->ngy;
        p->k_tree_id = p->gid_x, p->k_tree_size = p->ngx;
    }
    while (((size_t)1 << p->k_levels) < p->k_tree_size) p->k_levels++;
    return 0;
}

static void tws_free(tws *w) {
    vg_free(w->c);
    vg_free(w->rx);
    vg_free(w->ry);
    vg_free(w->wx);
    vg_free(w->wy);
    vg_free(w->tree);
    if (w->rng) gsl_rng_free(w->rng);
    memset(w, 0, sizeof *w);
}

static int tws_init(tws *w, const prep *p) {
    memset(w, 0, sizeof *w);
    w->c = vg_calloc(p->n ? p->n : 1, sizeof *w->c);
    w->rx = vg_calloc(p->ngx + 1, sizeof *w->rx);
    w->ry = vg_calloc(p->ngy + 1, sizeof *w->ry);
    w->wx = vg_calloc(p->ngx + 1, sizeof *w->wx);
    w->wy = vg_calloc(p->ngy + 1, sizeof *w->wy);
    w->tree = vg_calloc((size_t)2 << p->k_levels, sizeof *w->tree);
    w->rng = vg_resample_rng_alloc();
    if (!w->c || !w->rx || !w->ry || !w->wx || !w->wy || !w->tree || !w->rng) {
        tws_free(w);
        return -1;
    }
    return 0;
}

/* Ranks of the groups of order[] (starts[0..ng]) under weights c: rank[g]
 * = cum + (W + 1) / 2. Returns the total weight; *nonempty counts groups
 * with weight, *ties the pairs tied within groups. */
static uint64_t group_ranks(const size_t *order, const size_t *starts, size_t ng,
                            const uint32_t *c, double *rank, uint32_t *wt, size_t *nonempty,
                            uint64_t *ties) {
    uint64_t cum = 0, t = 0;
    size_t ne = 0;
    for (size_t g = 0; g < ng; g++) {
        uint64_t w = 0;
        for (size_t k = starts[g]; k < starts[g + 1]; k++) w += c[order[k]];
        wt[g] = (uint32_t)w;
        rank[g] = (double)cum + (double)(w + 1) * 0.5;
        cum += w;
        ne += w > 0;
        t += pairs_of(w);
    }
    *nonempty = ne;
    *ties = t;
    return cum;
}

/* Centred sum of squares of group ranks around mu. */
static double rank_ss(const double *rank, const uint32_t *wt, size_t ng, double mu) {
    double s = 0;
    for (size_t g = 0; g < ng; g++) {
        double d = rank[g] - mu;
        s += (double)wt[g] * d * d;
    }
    return s;
}

/* Concordant minus discordant pairs of the used items weighted by w->c
 * (N copies in all; n1, n2 the pairs tied in x and in y):
 * S = n0 - n1 - n2 + n3 - 2 D, as in Knight (1966). */
static int64_t kendall_s(const prep *p, tws *w, uint64_t N, uint64_t n1, uint64_t n2) {
    const uint32_t *c = w->c;
    /* Pairs tied in both x and y: weight within each (x, y) group. */
    uint64_t n3 = 0;
    for (size_t g = 0; g < p->ngj; g++) {
        uint64_t wj = 0;
        for (size_t k = p->gj[g]; k < p->gj[g + 1]; k++) wj += c[p->ox[k]];
        n3 += pairs_of(wj);
    }
    /* Discordant pairs: walking one variable's groups upwards, an item is
     * discordant with every copy already inserted (smaller value) that is
     * larger in the other variable. Query a whole group before inserting
     * it, so that pairs tied in the walked variable are not counted.
     * The copies with a larger id come from a complete binary tree in
     * heap order (node 1 the root, id v the leaf 2^L + v, the ancestors
     * of node h are h >> l): they are the copies under every right
     * sibling h | 1 of an ancestor h that is a left child. Fixed-depth
     * loops without branches: a zero weight costs wasted adds, not a
     * mispredicted jump. */
    uint32_t *tree = w->tree;
    unsigned L = p->k_levels;
    const size_t *order = p->k_order, *starts = p->k_starts;
    const uint32_t *id = p->k_tree_id;
    const uint32_t leaf0 = (uint32_t)1 << L;
    memset(tree, 0, ((size_t)2 << L) * sizeof *tree);
    uint64_t d = 0;
    for (size_t g = 0; g < p->k_ngroups; g++) {
        size_t lo = starts[g], hi = starts[g + 1];
        if (hi - lo == 1) {
            /* A group of one (the common case when walking a continuous
             * variable): query and insert along the same path at once. */
            size_t i = order[lo];
            uint32_t h = leaf0 + id[i], ci = c[i], above = 0;
            for (unsigned l = 0; l < L; l++, h >>= 1) {
                above += tree[h | 1] & ((h & 1) - 1u);
                tree[h] += ci;
            }
            d += (uint64_t)ci * above;
            continue;
        }
        for (size_t k = lo; k < hi; k++) {
            size_t i = order[k];
            uint32_t h = leaf0 + id[i], above = 0;
            for (unsigned l = 0; l < L; l++, h >>= 1) above += tree[h | 1] & ((h & 1) - 1u);
            d += (uint64_t)c[i] * above;
        }
        for (size_t k = lo; k < hi; k++) {
            size_t i = order[k];
            uint32_t h = leaf0 + id[i], ci = c[i];
            for (unsigned l = 0; l < L; l++, h >>= 1) tree[h] += ci;
        }
    }
    return (int64_t)(pairs_of(N) - n1 - n2 + n3) - 2 * (int64_t)d;
}

static double clamp1(double r) { return r > 1 ? 1 : r < -1 ? -1 : r; }

/* Spearman, Pearson and/or Kendall of the used items weighted by w->c.
 * out[k] is NaN where undefined (fewer than 2 copies, or a variable
 * constant over the drawn items). */
static void weighted(const prep *p, tws *w, int want, double out[VG_CORR_COUNT]) {
    const uint32_t *c = w->c;
    size_t nex, ney;
    uint64_t n1, n2;
    uint64_t N = group_ranks(p->ox, p->gx, p->ngx, c, w->rx, w->wx, &nex, &n1);
    group_ranks(p->oy, p->gy, p->ngy, c, w->ry, w->wy, &ney, &n2);
    out[0] = out[1] = out[2] = NAN;
    if (N < 2 || nex < 2 || ney < 2) return;
    if (want & (WANT_SPEARMAN | WANT_PEARSON)) {
        /* The weighted mean of the average ranks 1..N is (N + 1) / 2
         * exactly; ranks and their products are multiples of 1/4, so the
         * rank sums below are exact. Pearson's sums are shifted by the
         * means of all used items, close to any resample's means. */
        double mu = ((double)N + 1) * 0.5;
        double srr = 0, sx = 0, sy = 0, sxx = 0, syy = 0, sxy = 0;
        for (size_t k = 0; k < p->m; k++) {
            /* No test for a zero weight: a mispredicted branch costs more
             * than the multiplications. */
            size_t i = p->used[k];
            double ci = (double)c[i];
            srr += ci * (w->rx[p->gid_x[i]] - mu) * (w->ry[p->gid_y[i]] - mu);
            double dx = p->x[i] - p->x0, dy = p->y[i] - p->y0;
            sx += ci * dx;
            sy += ci * dy;
            sxx += ci * dx * dx;
            syy += ci * dy * dy;
            sxy += ci * dx * dy;
        }
        if (want & WANT_SPEARMAN) {
            double rxx = rank_ss(w->rx, w->wx, p->ngx, mu), ryy = rank_ss(w->ry, w->wy, p->ngy, mu);
            out[VG_CORR_SPEARMAN] = clamp1(srr / sqrt(rxx * ryy));
        }
        if (want & WANT_PEARSON) {
            double dn = (double)N;
            double cxx = sxx - sx * sx / dn, cyy = syy - sy * sy / dn, cxy = sxy - sx * sy / dn;
            out[VG_CORR_PEARSON] = cxx > 0 && cyy > 0 ? clamp1(cxy / sqrt(cxx * cyy)) : NAN;
        }
    }
    if (want & WANT_KENDALL) {
        int64_t s = kendall_s(p, w, N, n1, n2);
        uint64_t n0 = pairs_of(N);
        out[VG_CORR_KENDALL] = clamp1((double)s / sqrt((double)(n0 - n1)) / sqrt((double)(n0 - n2)));
    }
}

/* The work shared by the threads. */
typedef struct job {
    const prep *p;
    tws *ws;
    size_t B;
    int want;            /* WANT_* bits */
    uint64_t seed, stream;
    double *reps;        /* 3 * B, reps[k * B + r] */
    double *jack;        /* 3 * n, the used items' entries are filled */
    int64_t full_s;      /* Kendall's S on every used item */
    uint64_t full_n1, full_n2;
} job;

/* Kendall without used item i: S - s_i, where s_i = sum over the other
 * used j of sgn(x_i - x_j) sgn(y_i - y_j), and each tie count loses the
 * pairs of i with its group. */
static double kendall_without(const job *J, size_t i) {
    const prep *p = J->p;
    double xi = p->x[i], yi = p->y[i];
    int64_t s = 0;
    for (size_t k = 0; k < p->m; k++) {
        size_t j = p->used[k];
        double dx = xi - p->x[j], dy = yi - p->y[j];
        s += ((dx > 0) - (dx < 0)) * ((dy > 0) - (dy < 0));
    }
    uint64_t tx = p->gx[p->gid_x[i] + 1] - p->gx[p->gid_x[i]];
    uint64_t ty = p->gy[p->gid_y[i] + 1] - p->gy[p->gid_y[i]];
    uint64_t n0 = pairs_of(p->m - 1), n1 = J->full_n1 - (tx - 1), n2 = J->full_n2 - (ty - 1);
    if (n0 == n1 || n0 == n2) return NAN;
    return clamp1((double)(J->full_s - s) / sqrt((double)(n0 - n1)) / sqrt((double)(n0 - n2)));
}

/* Thread t: replicates [B t / T, B (t+1) / T), then used items
 * [m t / T, m (t+1) / T) of the jackknife. Shares are fixed by index, so
 * no value depends on which thread computed it. */
static void worker(void *ctx, unsigned t, unsigned T) {
    job *J = ctx;
    const prep *p = J->p;
    tws *w = &J->ws[t];
    size_t B = J->B, n = p->n;
    double v[VG_CORR_COUNT];
    for (size_t r = B * t / T; r < B * (t + 1) / T; r++) {
        memset(w->c, 0, n * sizeof *w->c);
        vg_resample_seed(w->rng, J->seed, J->stream, r);
        vg_resample_counts(w->rng, n, w->c);
        weighted(p, w, J->want, v);
        for (int k = 0; k < VG_CORR_COUNT; k++) J->reps[(size_t)k * B + r] = v[k];
    }
    memset(w->c, 0, n * sizeof *w->c);
    for (size_t k = 0; k < p->m; k++) w->c[p->used[k]] = 1;
    for (size_t k = p->m * t / T; k < p->m * (t + 1) / T; k++) {
        size_t i = p->used[k];
        w->c[i] = 0;
        v[VG_CORR_SPEARMAN] = v[VG_CORR_PEARSON] = NAN;
        if (J->want & (WANT_SPEARMAN | WANT_PEARSON))
            weighted(p, w, J->want & (WANT_SPEARMAN | WANT_PEARSON), v);
        w->c[i] = 1;
        J->jack[(size_t)VG_CORR_SPEARMAN * n + i] = v[VG_CORR_SPEARMAN];
        J->jack[(size_t)VG_CORR_PEARSON * n + i] = v[VG_CORR_PEARSON];
        J->jack[(size_t)VG_CORR_KENDALL * n + i] =
            J->want & WANT_KENDALL ? kendall_without(J, i) : NAN;
    }
}

void vg_corr_boot_options_init(vg_corr_boot_options *opt) {
    memset(opt, 0, sizeof *opt);
    opt->replicates = VG_DEFAULT_BOOTSTRAP;
    opt->seed = VG_DEFAULT_SEED;
    opt->level = VG_DEFAULT_CI;
}

/* The three estimates on the used items: GSL's Spearman and Pearson,
 * Knight's Kendall. -1 when out of memory. */
static int estimates(const prep *p, double theta[VG_CORR_COUNT]) {
    size_t m = p->m;
    double *cx = vg_calloc(m + 1, sizeof *cx), *cy = vg_calloc(m + 1, sizeof *cy);
    double *dw = vg_calloc(2 * m + 1, sizeof *dw);
    size_t *iw = vg_calloc(2 * m + 1, sizeof *iw);
    int rc = -1;
    if (cx && cy && dw && iw) {
        for (size_t k = 0; k < m; k++) {
            cx[k] = p->x[p->used[k]];
            cy[k] = p->y[p->used[k]];
        }
        theta[VG_CORR_SPEARMAN] = vg_stats_spearman(cx, cy, m, dw);
        theta[VG_CORR_PEARSON] = vg_stats_pearson(cx, cy, m);
        theta[VG_CORR_KENDALL] = vg_stats_kendall(cx, cy, m, iw);
        rc = 0;
    }
    vg_free(cx);
    vg_free(cy);
    vg_free(dw);
    vg_free(iw);
    return rc;
}

vg_status vg_stats_corr_bootstrap(const double *x, const double *y, size_t n,
                                  const vg_corr_boot_options *opt,
                                  vg_corr_estimate out[VG_CORR_COUNT], double *replicates,
                                  double *jackknife, vg_error *err) {
    vg_init();
    vg_corr_boot_options defaults;
    if (!opt) {
        vg_corr_boot_options_init(&defaults);
        opt = &defaults;
    }
    if (!(opt->level > 0 && opt->level < 1))
        return vg_error_set(err, VG_EINVAL, NULL, 0,
                            "expected a confidence level between 0 and 1, found %g", opt->level);
    if (n > UINT32_MAX)
        return vg_error_set(err, VG_ELIMIT, NULL, 0, "%zu items: at most %u can be resampled", n,
                            (unsigned)UINT32_MAX);
    for (size_t i = 0; i < n; i++)
        if (isnan(x[i]))
            return vg_error_set(err, VG_EINVAL, NULL, 0, "item %zu: x is NaN", i + 1);

    size_t B = opt->replicates, nb;
    if (vg_mul_overflow(B, (size_t)VG_CORR_COUNT, &nb))
        return vg_error_set(err, VG_ELIMIT, NULL, 0, "%zu replicates are too many", B);
    prep p;
    if (prep_init(&p, x, y, n) != 0) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    /* With fewer than 2 used items nothing is defined: skip the work. The
     * jackknife is needed for BCa, or when the caller asks for it. */
    int work = (B > 0 || jackknife) && p.m >= 2;
    unsigned T = work ? vg_threads_resolve(opt->threads) : 1;
    if (T > p.m + B) T = (unsigned)(p.m + B);
    int want = opt->kinds ? (int)(opt->kinds & WANT_ALL) : WANT_ALL;
    job J = {.p = &p, .B = B, .want = want, .seed = opt->seed, .stream = opt->stream};
    J.reps = vg_calloc(nb ? nb : 1, sizeof *J.reps);
    J.jack = vg_calloc((size_t)VG_CORR_COUNT * (n ? n : 1), sizeof *J.jack);
    J.ws = vg_calloc(T, sizeof *J.ws);
    vg_status st = VG_OK;
    unsigned made = 0;
    double theta[VG_CORR_COUNT];
    if (!J.reps || !J.jack || !J.ws || estimates(&p, theta) != 0) goto oom;
    for (; work && made < T; made++)
        if (tws_init(&J.ws[made], &p) != 0) goto oom;

    for (size_t k = 0; k < nb; k++) J.reps[k] = NAN;
    /* Leaving out an item without y changes nothing. */
    for (size_t i = 0; i < n; i++)
        for (int k = 0; k < VG_CORR_COUNT; k++) J.jack[(size_t)k * n + i] = theta[k];
    if (work) {
        /* Kendall's counts on every used item, for its jackknife. */
        tws *w = &J.ws[0];
        memset(w->c, 0, n * sizeof *w->c);
        for (size_t k = 0; k < p.m; k++) w->c[p.used[k]] = 1;
        size_t ne;
        uint64_t N = group_ranks(p.ox, p.gx, p.ngx, w->c, w->rx, w->wx, &ne, &J.full_n1);
        group_ranks(p.oy, p.gy, p.ngy, w->c, w->ry, w->wy, &ne, &J.full_n2);
        if (want & WANT_KENDALL) J.full_s = kendall_s(&p, w, N, J.full_n1, J.full_n2);
        vg_parallel(T, worker, &J);
    }

    if (replicates) memcpy(replicates, J.reps, nb * sizeof *J.reps);
    if (jackknife) memcpy(jackknife, J.jack, (size_t)VG_CORR_COUNT * n * sizeof *J.jack);
    for (int k = 0; k < VG_CORR_COUNT; k++) {
        vg_corr_estimate *e = &out[k];
        e->value = theta[k];
        e->n = p.m;
        vg_stats_boot_summary(J.reps + (size_t)k * B, B, theta[k], J.jack + (size_t)k * n, n,
                              opt->level, &e->boot);
        vg_stats_fisher_interval((vg_corr)k, theta[k], p.m, opt->level, &e->fisher_low,
                                 &e->fisher_high);
    }
    goto done;
oom:
    st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory for the bootstrap");
done:
    for (unsigned t = 0; t < made; t++) tws_free(&J.ws[t]);
    vg_free(J.ws);
    vg_free(J.reps);
    vg_free(J.jack);
    prep_free(&p);
    return st;
}
