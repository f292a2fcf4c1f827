/* analogy_kernel.c - the per-block kernels of the analogy scorer, for
 * AVX-512F, AVX2 with FMA, and plain C.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The scan of every question over a block is where the time goes after
 * sgemm, so it runs on the widest vectors the CPU has. Every variant
 * performs the same IEEE single-precision operations in the same order,
 * multiply and add never fused (ISO C mode turns contraction off in GCC;
 * the pragma below does it for clang) except in (X + 1) / 2, computed as
 * fma(X, 0.5, 0.5): the product by 0.5 is exact, so the fused and the
 * separate forms round identically, and both equal (X + 1) / 2 since
 * scaling by 0.5 commutes with rounding. max(s, m) keeps m when s is NaN,
 * as `s > m ? s : m` does. So the variants agree to the bit, which a unit
 * test checks.
 *
 * The scores, for candidate x with cosines A, B, C to a, b, c:
 *   3CosAdd        B - A + C                          (Mikolov et al. 2013)
 *   3CosMul        B' C' / (A' + e), X' = (X + 1) / 2  (Levy and Goldberg 2014)
 *   PairDirection  (B - A + k) / |x^ - c^|, k = c^.a^ - c^.b^, which is
 *                  cos(x^ - c^, b^ - a^) times |b^ - a^| > 0, a constant
 *                  of the question (Levy and Goldberg 2014):
 *                  (x^ - c^).(b^ - a^) = B - A - c^.b^ + c^.a^ and
 *                  |x^ - c^| = sqrt(2 - 2C) for unit x^, c^.
 */
#include <math.h>
#include <string.h>

#include "analogy_impl.h"

#ifdef __clang__
#pragma STDC FP_CONTRACT OFF
#endif

#define NB VG_ANA_BLOCK
#define MAXF(s, m) ((s) > (m) ? (s) : (m))

/* ---- plain C --------------------------------------------------------- */

static void scale_c(float *s, const float *inv) {
    for (size_t j = 0; j < NB; j++) s[j] = s[j] * inv[j];
}

static void mul_denominator_c(const float *s, float *out) {
    for (size_t j = 0; j < NB; j++) out[j] = 1.0f / ((s[j] * 0.5f + 0.5f) + VG_ANA_EPS);
}

static void inv_distance_c(const float *s, float *out) {
    for (size_t j = 0; j < NB; j++) {
        float d = 2.0f - s[j] * 2.0f;
        out[j] = d > 0.0f ? 1.0f / sqrtf(d) : NAN;
    }
}

static size_t scan_c(const float *S, const float *Ia, const float *Rc, const vg_ana_qhot *q,
                     size_t n, const float *best, uint32_t *hits) {
    size_t h = 0;
    for (size_t i = 0; i < n; i++) {
        const float *ca = S + (size_t)q[i].wa * NB, *cb = S + (size_t)q[i].wb * NB;
        const float *cc = S + (size_t)q[i].wc * NB;
        const float *ia = Ia + (size_t)q[i].sa * NB, *rc = Rc + (size_t)q[i].sc * NB;
        float k = q[i].k, m0 = -INFINITY, m1 = -INFINITY, m2 = -INFINITY;
        for (size_t j = 0; j < NB; j++) {
            float t = cb[j] - ca[j];
            float pb = cb[j] * 0.5f + 0.5f, pc = cc[j] * 0.5f + 0.5f;
            m0 = MAXF(t + cc[j], m0);
            m1 = MAXF((pb * pc) * ia[j], m1);
            m2 = MAXF((t + k) * rc[j], m2);
        }
        if (m0 > best[3 * i] || m1 > best[3 * i + 1] || m2 > best[3 * i + 2])
            hits[h++] = (uint32_t)i;
    }
    return h;
}

static void block_scores_c(const float *S, const float *Ia, const float *Rc,
                           const vg_ana_qhot *q, float *out) {
    const float *ca = S + (size_t)q->wa * NB, *cb = S + (size_t)q->wb * NB;
    const float *cc = S + (size_t)q->wc * NB;
    const float *ia = Ia + (size_t)q->sa * NB, *rc = Rc + (size_t)q->sc * NB;
    for (size_t j = 0; j < NB; j++) {
        float t = cb[j] - ca[j];
        float pb = cb[j] * 0.5f + 0.5f, pc = cc[j] * 0.5f + 0.5f;
        out[j] = t + cc[j];
        out[NB + j] = (pb * pc) * ia[j];
        out[2 * NB + j] = (t + q->k) * rc[j];
    }
}

static size_t first_max_c(const float *x, float *max) {
    float m = -INFINITY;
    size_t at = VG_NOT_FOUND;
    for (size_t j = 0; j < NB; j++) {
        if (x[j] > m) {
            m = x[j];
            at = j;
        }
    }
    *max = m;
    return at;
}

static float row_max_c(const float *x) {
    float m = -INFINITY;
    for (size_t j = 0; j < NB; j++) m = MAXF(x[j], m);
    return m;
}

static const vg_ana_kernels kernels_c = {"scalar",       scale_c,        mul_denominator_c,
                                         inv_distance_c, scan_c,         block_scores_c,
                                         first_max_c,    row_max_c};

#if defined(__x86_64__) && defined(__GNUC__)
#include <immintrin.h>
#define HAVE_X86 1

/* ---- AVX2 with FMA (8 lanes) ----------------------------------------- */

#define AVX2 __attribute__((target("avx2,fma")))

AVX2 static void scale_avx2(float *s, const float *inv) {
    for (size_t j = 0; j < NB; j += 8)
        _mm256_store_ps(s + j, _mm256_mul_ps(_mm256_load_ps(s + j), _mm256_load_ps(inv + j)));
}

AVX2 static void mul_denominator_avx2(const float *s, float *out) {
    const __m256 half = _mm256_set1_ps(0.5f), eps = _mm256_set1_ps(VG_ANA_EPS),
                 one = _mm256_set1_ps(1.0f);
    for (size_t j = 0; j < NB; j += 8) {
        __m256 p = _mm256_fmadd_ps(_mm256_load_ps(s + j), half, half);
        _mm256_store_ps(out + j, _mm256_div_ps(one, _mm256_add_ps(p, eps)));
    }
}

AVX2 static void inv_distance_avx2(const float *s, float *out) {
    const __m256 two = _mm256_set1_ps(2.0f), one = _mm256_set1_ps(1.0f),
                 zero = _mm256_setzero_ps(), nan = _mm256_set1_ps(NAN);
    for (size_t j = 0; j < NB; j += 8) {
        __m256 d = _mm256_sub_ps(two, _mm256_mul_ps(_mm256_load_ps(s + j), two));
        __m256 r = _mm256_div_ps(one, _mm256_sqrt_ps(d));
        __m256 pos = _mm256_cmp_ps(d, zero, _CMP_GT_OQ);
        _mm256_store_ps(out + j, _mm256_blendv_ps(nan, r, pos));
    }
}

AVX2 static size_t scan_avx2(const float *S, const float *Ia, const float *Rc,
                             const vg_ana_qhot *q, size_t n, const float *best, uint32_t *hits) {
    const __m256 half = _mm256_set1_ps(0.5f);
    size_t h = 0;
    for (size_t i = 0; i < n; i++) {
        const float *ca = S + (size_t)q[i].wa * NB, *cb = S + (size_t)q[i].wb * NB;
        const float *cc = S + (size_t)q[i].wc * NB;
        const float *ia = Ia + (size_t)q[i].sa * NB, *rc = Rc + (size_t)q[i].sc * NB;
        const __m256 kv = _mm256_set1_ps(q[i].k);
        /* Two sets of running maxima, so that the max chains overlap;
         * max is exact, so splitting them changes no value. */
        __m256 m0 = _mm256_set1_ps(-INFINITY), m1 = m0, m2 = m0, n0 = m0, n1 = m0, n2 = m0;
        for (size_t j = 0; j < NB; j += 16) {
            __m256 b = _mm256_load_ps(cb + j), c = _mm256_load_ps(cc + j);
            __m256 t = _mm256_sub_ps(b, _mm256_load_ps(ca + j));
            m0 = _mm256_max_ps(_mm256_add_ps(t, c), m0);
            __m256 pb = _mm256_fmadd_ps(b, half, half), pc = _mm256_fmadd_ps(c, half, half);
            m1 = _mm256_max_ps(_mm256_mul_ps(_mm256_mul_ps(pb, pc), _mm256_load_ps(ia + j)), m1);
            m2 = _mm256_max_ps(_mm256_mul_ps(_mm256_add_ps(t, kv), _mm256_load_ps(rc + j)), m2);
            b = _mm256_load_ps(cb + j + 8), c = _mm256_load_ps(cc + j + 8);
            t = _mm256_sub_ps(b, _mm256_load_ps(ca + j + 8));
            n0 = _mm256_max_ps(_mm256_add_ps(t, c), n0);
            pb = _mm256_fmadd_ps(b, half, half), pc = _mm256_fmadd_ps(c, half, half);
            n1 = _mm256_max_ps(_mm256_mul_ps(_mm256_mul_ps(pb, pc), _mm256_load_ps(ia + j + 8)), n1);
            n2 = _mm256_max_ps(_mm256_mul_ps(_mm256_add_ps(t, kv), _mm256_load_ps(rc + j + 8)), n2);
        }
        m0 = _mm256_max_ps(m0, n0);
        m1 = _mm256_max_ps(m1, n1);
        m2 = _mm256_max_ps(m2, n2);
        /* Any lane above the best so far: no horizontal maximum needed. */
        __m256 g = _mm256_or_ps(_mm256_cmp_ps(m0, _mm256_set1_ps(best[3 * i]), _CMP_GT_OQ),
                                _mm256_cmp_ps(m1, _mm256_set1_ps(best[3 * i + 1]), _CMP_GT_OQ));
        g = _mm256_or_ps(g, _mm256_cmp_ps(m2, _mm256_set1_ps(best[3 * i + 2]), _CMP_GT_OQ));
        if (_mm256_movemask_ps(g)) hits[h++] = (uint32_t)i;
    }
    return h;
}

AVX2 static void block_scores_avx2(const float *S, const float *Ia, const float *Rc,
                                   const vg_ana_qhot *q, float *out) {
    const float *ca = S + (size_t)q->wa * NB, *cb = S + (size_t)q->wb * NB;
    const float *cc = S + (size_t)q->wc * NB;
    const float *ia = Ia + (size_t)q->sa * NB, *rc = Rc + (size_t)q->sc * NB;
    const __m256 half = _mm256_set1_ps(0.5f), kv = _mm256_set1_ps(q->k);
    for (size_t j = 0; j < NB; j += 8) {
        __m256 b = _mm256_load_ps(cb + j), c = _mm256_load_ps(cc + j);
        __m256 t = _mm256_sub_ps(b, _mm256_load_ps(ca + j));
        _mm256_store_ps(out + j, _mm256_add_ps(t, c));
        __m256 pb = _mm256_fmadd_ps(b, half, half), pc = _mm256_fmadd_ps(c, half, half);
        _mm256_store_ps(out + NB + j,
                        _mm256_mul_ps(_mm256_mul_ps(pb, pc), _mm256_load_ps(ia + j)));
        _mm256_store_ps(out + 2 * NB + j,
                        _mm256_mul_ps(_mm256_add_ps(t, kv), _mm256_load_ps(rc + j)));
    }
}

AVX2 static float hmax_avx2(__m256 m) {
    float l[8];
    _mm256_storeu_ps(l, m);
    float r = l[0];
    for (int i = 1; i < 8; i++) r = MAXF(l[i], r);
    return r;
}

AVX2 static float row_max_avx2(const float *x) {
    __m256 m = _mm256_set1_ps(-INFINITY);
    for (size_t j = 0; j < NB; j += 8) m = _mm256_max_ps(_mm256_load_ps(x + j), m);
    return hmax_avx2(m);
}

AVX2 static size_t first_max_avx2(const float *x, float *max) {
    float m = row_max_avx2(x);
    *max = m;
    if (m == -INFINITY) return first_max_c(x, max);
    const __m256 mv = _mm256_set1_ps(m);
    for (size_t j = 0; j < NB; j += 8) {
        int eq = _mm256_movemask_ps(_mm256_cmp_ps(_mm256_load_ps(x + j), mv, _CMP_EQ_OQ));
        if (eq) return j + (size_t)__builtin_ctz((unsigned)eq);
    }
    return VG_NOT_FOUND; /* not reached: m is one of the values */
}

static const vg_ana_kernels kernels_avx2 = {"avx2",          scale_avx2,     mul_denominator_avx2,
                                            inv_distance_avx2, scan_avx2,    block_scores_avx2,
                                            first_max_avx2,  row_max_avx2};

/* ---- AVX-512F (16 lanes) --------------------------------------------- */

#define AVX512 __attribute__((target("avx512f")))

AVX512 static void scale_avx512(float *s, const float *inv) {
    for (size_t j = 0; j < NB; j += 16)
        _mm512_store_ps(s + j, _mm512_mul_ps(_mm512_load_ps(s + j), _mm512_load_ps(inv + j)));
}

AVX512 static void mul_denominator_avx512(const float *s, float *out) {
    const __m512 half = _mm512_set1_ps(0.5f), eps = _mm512_set1_ps(VG_ANA_EPS),
                 one = _mm512_set1_ps(1.0f);
    for (size_t j = 0; j < NB; j += 16) {
        __m512 p = _mm512_fmadd_ps(_mm512_load_ps(s + j), half, half);
        _mm512_store_ps(out + j, _mm512_div_ps(one, _mm512_add_ps(p, eps)));
    }
}

AVX512 static void inv_distance_avx512(const float *s, float *out) {
    const __m512 two = _mm512_set1_ps(2.0f), one = _mm512_set1_ps(1.0f),
                 zero = _mm512_setzero_ps(), nan = _mm512_set1_ps(NAN);
    for (size_t j = 0; j < NB; j += 16) {
        __m512 d = _mm512_sub_ps(two, _mm512_mul_ps(_mm512_load_ps(s + j), two));
        __m512 r = _mm512_div_ps(one, _mm512_sqrt_ps(d));
        __mmask16 pos = _mm512_cmp_ps_mask(d, zero, _CMP_GT_OQ);
        _mm512_store_ps(out + j, _mm512_mask_blend_ps(pos, nan, r));
    }
}

AVX512 static size_t scan_avx512(const float *S, const float *Ia, const float *Rc,
                                 const vg_ana_qhot *q, size_t n, const float *best,
                                 uint32_t *hits) {
    const __m512 half = _mm512_set1_ps(0.5f);
    size_t h = 0;
    for (size_t i = 0; i < n; i++) {
        const float *ca = S + (size_t)q[i].wa * NB, *cb = S + (size_t)q[i].wb * NB;
        const float *cc = S + (size_t)q[i].wc * NB;
        const float *ia = Ia + (size_t)q[i].sa * NB, *rc = Rc + (size_t)q[i].sc * NB;
        const __m512 kv = _mm512_set1_ps(q[i].k);
        /* Two sets of running maxima, so that the max chains overlap;
         * max is exact, so splitting them changes no value. */
        __m512 m0 = _mm512_set1_ps(-INFINITY), m1 = m0, m2 = m0, n0 = m0, n1 = m0, n2 = m0;
        for (size_t j = 0; j < NB; j += 32) {
            __m512 b = _mm512_load_ps(cb + j), c = _mm512_load_ps(cc + j);
            __m512 t = _mm512_sub_ps(b, _mm512_load_ps(ca + j));
            m0 = _mm512_max_ps(_mm512_add_ps(t, c), m0);
            __m512 pb = _mm512_fmadd_ps(b, half, half), pc = _mm512_fmadd_ps(c, half, half);
            m1 = _mm512_max_ps(_mm512_mul_ps(_mm512_mul_ps(pb, pc), _mm512_load_ps(ia + j)), m1);
            m2 = _mm512_max_ps(_mm512_mul_ps(_mm512_add_ps(t, kv), _mm512_load_ps(rc + j)), m2);
            b = _mm512_load_ps(cb + j + 16), c = _mm512_load_ps(cc + j + 16);
            t = _mm512_sub_ps(b, _mm512_load_ps(ca + j + 16));
            n0 = _mm512_max_ps(_mm512_add_ps(t, c), n0);
            pb = _mm512_fmadd_ps(b, half, half), pc = _mm512_fmadd_ps(c, half, half);
            n1 = _mm512_max_ps(_mm512_mul_ps(_mm512_mul_ps(pb, pc), _mm512_load_ps(ia + j + 16)), n1);
            n2 = _mm512_max_ps(_mm512_mul_ps(_mm512_add_ps(t, kv), _mm512_load_ps(rc + j + 16)), n2);
        }
        m0 = _mm512_max_ps(m0, n0);
        m1 = _mm512_max_ps(m1, n1);
        m2 = _mm512_max_ps(m2, n2);
        __mmask16 g = _mm512_cmp_ps_mask(m0, _mm512_set1_ps(best[3 * i]), _CMP_GT_OQ) |
                      _mm512_cmp_ps_mask(m1, _mm512_set1_ps(best[3 * i + 1]), _CMP_GT_OQ) |
                      _mm512_cmp_ps_mask(m2, _mm512_set1_ps(best[3 * i + 2]), _CMP_GT_OQ);
        if (g) hits[h++] = (uint32_t)i;
    }
    return h;
}

AVX512 static void block_scores_avx512(const float *S, const float *Ia, const float *Rc,
                                       const vg_ana_qhot *q, float *out) {
    const float *ca = S + (size_t)q->wa * NB, *cb = S + (size_t)q->wb * NB;
    const float *cc = S + (size_t)q->wc * NB;
    const float *ia = Ia + (size_t)q->sa * NB, *rc = Rc + (size_t)q->sc * NB;
    const __m512 half = _mm512_set1_ps(0.5f), kv = _mm512_set1_ps(q->k);
    for (size_t j = 0; j < NB; j += 16) {
        __m512 b = _mm512_load_ps(cb + j), c = _mm512_load_ps(cc + j);
        __m512 t = _mm512_sub_ps(b, _mm512_load_ps(ca + j));
        _mm512_store_ps(out + j, _mm512_add_ps(t, c));
        __m512 pb = _mm512_fmadd_ps(b, half, half), pc = _mm512_fmadd_ps(c, half, half);
        _mm512_store_ps(out + NB + j,
                        _mm512_mul_ps(_mm512_mul_ps(pb, pc), _mm512_load_ps(ia + j)));
        _mm512_store_ps(out + 2 * NB + j,
                        _mm512_mul_ps(_mm512_add_ps(t, kv), _mm512_load_ps(rc + j)));
    }
}

AVX512 static float row_max_avx512(const float *x) {
    __m512 m = _mm512_set1_ps(-INFINITY);
    for (size_t j = 0; j < NB; j += 16) m = _mm512_max_ps(_mm512_load_ps(x + j), m);
    float l[16];
    _mm512_storeu_ps(l, m);
    float r = l[0];
    for (int i = 1; i < 16; i++) r = MAXF(l[i], r);
    return r;
}

AVX512 static size_t first_max_avx512(const float *x, float *max) {
    float m = row_max_avx512(x);
    *max = m;
    if (m == -INFINITY) return first_max_c(x, max);
    const __m512 mv = _mm512_set1_ps(m);
    for (size_t j = 0; j < NB; j += 16) {
        __mmask16 eq = _mm512_cmp_ps_mask(_mm512_load_ps(x + j), mv, _CMP_EQ_OQ);
        if (eq) return j + (size_t)__builtin_ctz((unsigned)eq);
    }
    return VG_NOT_FOUND; /* not reached: m is one of the values */
}

static const vg_ana_kernels kernels_avx512 = {
    "avx512f",   scale_avx512,        mul_denominator_avx512, inv_distance_avx512,
    scan_avx512, block_scores_avx512, first_max_avx512,       row_max_avx512};
#endif

_Static_assert(VG_ANA_BLOCK % 32 == 0, "a block is a whole number of pairs of 16-float vectors");

const vg_ana_kernels *vg_ana_kernels_get(const char *name) {
    if (strcmp(name, "scalar") == 0) return &kernels_c;
#ifdef HAVE_X86
    if (strcmp(name, "avx2") == 0 && __builtin_cpu_supports("avx2") &&
        __builtin_cpu_supports("fma"))
        return &kernels_avx2;
    if (strcmp(name, "avx512f") == 0 && __builtin_cpu_supports("avx512f")) return &kernels_avx512;
#endif
    return NULL;
}

const vg_ana_kernels *vg_ana_kernels_best(void) {
    const vg_ana_kernels *k = vg_ana_kernels_get("avx512f");
    if (!k) k = vg_ana_kernels_get("avx2");
    return k ? k : &kernels_c;
}
