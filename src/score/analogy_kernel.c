/* analogy_kernel.c - the per-block kernels of the analogy scorer, for
 * AVX-512F, AVX and plain C.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The combine-and-argmax of every question over a block is where the time
 * goes after sgemm, so it runs on the widest vectors the CPU has. Every
 * variant performs the same IEEE single-precision operations in the same
 * order: multiply and add are never fused (ISO C mode turns contraction
 * off in GCC; the pragma below does it for clang) and max(s, m) keeps m
 * when s is NaN, exactly as `s > m ? s : m`. So the variants agree to the
 * bit, which a unit test checks.
 *
 * The scores, for candidate x with cosines A, B, C to a, b, c:
 *   3CosAdd        B - A + C                          (Mikolov et al. 2013)
 *   3CosMul        B' C' / (A' + e), X' = (X + 1) / 2  (Levy and Goldberg 2014)
 *   PairDirection  (B - A + k) / |x^ - c^|, k = c^.a^ - c^.b^, which is
 *                  cos(x^ - c^, b^ - a^) times |b^ - a^| > 0, a constant
 *                  of the question (Levy and Goldberg 2014):
 *                  (x^ - c^).(b^ - a^) = B - A - c^.b^ + c^.a^ and
 *                  |x^ - c^| = sqrt(2 - 2C) for unit x^, c^.
 * (X + 1) / 2 is computed as X * 0.5 + 0.5, which rounds to the same float:
 * the scaling by 0.5 is exact and commutes with rounding.
 */
#include <math.h>
#include <string.h>

#include "analogy_impl.h"

#ifdef __clang__
#pragma STDC FP_CONTRACT OFF
#endif

#define NB VG_ANA_BLOCK

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

#define MAXF(s, m) ((s) > (m) ? (s) : (m))

static void block_max_c(const float *ca, const float *cb, const float *cc, const float *ia,
                        const float *rc, float k, float out[VG_ANA_COMBINED]) {
    float m0 = -INFINITY, m1 = -INFINITY, m2 = -INFINITY;
    for (size_t j = 0; j < NB; j++) {
        float t = cb[j] - ca[j];
        float s0 = t + cc[j];
        float pb = cb[j] * 0.5f + 0.5f, pc = cc[j] * 0.5f + 0.5f;
        float s1 = (pb * pc) * ia[j];
        float s2 = (t + k) * rc[j];
        m0 = MAXF(s0, m0);
        m1 = MAXF(s1, m1);
        m2 = MAXF(s2, m2);
    }
    out[0] = m0;
    out[1] = m1;
    out[2] = m2;
}

static void block_scores_c(const float *ca, const float *cb, const float *cc, const float *ia,
                           const float *rc, float k, float *out) {
    for (size_t j = 0; j < NB; j++) {
        float t = cb[j] - ca[j];
        float pb = cb[j] * 0.5f + 0.5f, pc = cc[j] * 0.5f + 0.5f;
        out[j] = t + cc[j];
        out[NB + j] = (pb * pc) * ia[j];
        out[2 * NB + j] = (t + k) * rc[j];
    }
}

static float row_max_c(const float *x) {
    float m = -INFINITY;
    for (size_t j = 0; j < NB; j++) m = MAXF(x[j], m);
    return m;
}

static const vg_ana_kernels kernels_c = {"scalar",      scale_c,        mul_denominator_c,
                                         inv_distance_c, block_max_c,   block_scores_c,
                                         row_max_c};

#if defined(__x86_64__) && defined(__GNUC__)
#include <immintrin.h>
#define HAVE_X86 1

/* ---- AVX (8 lanes) --------------------------------------------------- */

#define AVX __attribute__((target("avx")))

AVX static void scale_avx(float *s, const float *inv) {
    for (size_t j = 0; j < NB; j += 8)
        _mm256_store_ps(s + j, _mm256_mul_ps(_mm256_load_ps(s + j), _mm256_load_ps(inv + j)));
}

AVX static void mul_denominator_avx(const float *s, float *out) {
    const __m256 half = _mm256_set1_ps(0.5f), eps = _mm256_set1_ps(VG_ANA_EPS),
                 one = _mm256_set1_ps(1.0f);
    for (size_t j = 0; j < NB; j += 8) {
        __m256 p = _mm256_add_ps(_mm256_mul_ps(_mm256_load_ps(s + j), half), half);
        _mm256_store_ps(out + j, _mm256_div_ps(one, _mm256_add_ps(p, eps)));
    }
}

AVX static void inv_distance_avx(const float *s, float *out) {
    const __m256 two = _mm256_set1_ps(2.0f), one = _mm256_set1_ps(1.0f),
                 zero = _mm256_setzero_ps(), nan = _mm256_set1_ps(NAN);
    for (size_t j = 0; j < NB; j += 8) {
        __m256 d = _mm256_sub_ps(two, _mm256_mul_ps(_mm256_load_ps(s + j), two));
        __m256 r = _mm256_div_ps(one, _mm256_sqrt_ps(d));
        __m256 pos = _mm256_cmp_ps(d, zero, _CMP_GT_OQ);
        _mm256_store_ps(out + j, _mm256_blendv_ps(nan, r, pos));
    }
}

AVX static float hmax_avx(__m256 m) {
    float l[8];
    _mm256_storeu_ps(l, m);
    float r = l[0];
    for (int i = 1; i < 8; i++) r = MAXF(l[i], r);
    return r;
}

AVX static void block_max_avx(const float *ca, const float *cb, const float *cc, const float *ia,
                              const float *rc, float k, float out[VG_ANA_COMBINED]) {
    const __m256 half = _mm256_set1_ps(0.5f), kv = _mm256_set1_ps(k);
    __m256 m0 = _mm256_set1_ps(-INFINITY), m1 = m0, m2 = m0;
    for (size_t j = 0; j < NB; j += 8) {
        __m256 b = _mm256_load_ps(cb + j), c = _mm256_load_ps(cc + j);
        __m256 t = _mm256_sub_ps(b, _mm256_load_ps(ca + j));
        m0 = _mm256_max_ps(_mm256_add_ps(t, c), m0);
        __m256 pb = _mm256_add_ps(_mm256_mul_ps(b, half), half);
        __m256 pc = _mm256_add_ps(_mm256_mul_ps(c, half), half);
        m1 = _mm256_max_ps(_mm256_mul_ps(_mm256_mul_ps(pb, pc), _mm256_load_ps(ia + j)), m1);
        m2 = _mm256_max_ps(_mm256_mul_ps(_mm256_add_ps(t, kv), _mm256_load_ps(rc + j)), m2);
    }
    out[0] = hmax_avx(m0);
    out[1] = hmax_avx(m1);
    out[2] = hmax_avx(m2);
}

AVX static void block_scores_avx(const float *ca, const float *cb, const float *cc,
                                 const float *ia, const float *rc, float k, float *out) {
    const __m256 half = _mm256_set1_ps(0.5f), kv = _mm256_set1_ps(k);
    for (size_t j = 0; j < NB; j += 8) {
        __m256 b = _mm256_load_ps(cb + j), c = _mm256_load_ps(cc + j);
        __m256 t = _mm256_sub_ps(b, _mm256_load_ps(ca + j));
        _mm256_store_ps(out + j, _mm256_add_ps(t, c));
        __m256 pb = _mm256_add_ps(_mm256_mul_ps(b, half), half);
        __m256 pc = _mm256_add_ps(_mm256_mul_ps(c, half), half);
        _mm256_store_ps(out + NB + j,
                        _mm256_mul_ps(_mm256_mul_ps(pb, pc), _mm256_load_ps(ia + j)));
        _mm256_store_ps(out + 2 * NB + j,
                        _mm256_mul_ps(_mm256_add_ps(t, kv), _mm256_load_ps(rc + j)));
    }
}

AVX static float row_max_avx(const float *x) {
    __m256 m = _mm256_set1_ps(-INFINITY);
    for (size_t j = 0; j < NB; j += 8) m = _mm256_max_ps(_mm256_load_ps(x + j), m);
    return hmax_avx(m);
}

static const vg_ana_kernels kernels_avx = {"avx",           scale_avx,     mul_denominator_avx,
                                           inv_distance_avx, block_max_avx, block_scores_avx,
                                           row_max_avx};

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
        __m512 p = _mm512_add_ps(_mm512_mul_ps(_mm512_load_ps(s + j), half), half);
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

AVX512 static float hmax_avx512(__m512 m) {
    float l[16];
    _mm512_storeu_ps(l, m);
    float r = l[0];
    for (int i = 1; i < 16; i++) r = MAXF(l[i], r);
    return r;
}

AVX512 static void block_max_avx512(const float *ca, const float *cb, const float *cc,
                                    const float *ia, const float *rc, float k,
                                    float out[VG_ANA_COMBINED]) {
    const __m512 half = _mm512_set1_ps(0.5f), kv = _mm512_set1_ps(k);
    __m512 m0 = _mm512_set1_ps(-INFINITY), m1 = m0, m2 = m0;
    for (size_t j = 0; j < NB; j += 16) {
        __m512 b = _mm512_load_ps(cb + j), c = _mm512_load_ps(cc + j);
        __m512 t = _mm512_sub_ps(b, _mm512_load_ps(ca + j));
        m0 = _mm512_max_ps(_mm512_add_ps(t, c), m0);
        __m512 pb = _mm512_add_ps(_mm512_mul_ps(b, half), half);
        __m512 pc = _mm512_add_ps(_mm512_mul_ps(c, half), half);
        m1 = _mm512_max_ps(_mm512_mul_ps(_mm512_mul_ps(pb, pc), _mm512_load_ps(ia + j)), m1);
        m2 = _mm512_max_ps(_mm512_mul_ps(_mm512_add_ps(t, kv), _mm512_load_ps(rc + j)), m2);
    }
    out[0] = hmax_avx512(m0);
    out[1] = hmax_avx512(m1);
    out[2] = hmax_avx512(m2);
}

AVX512 static void block_scores_avx512(const float *ca, const float *cb, const float *cc,
                                       const float *ia, const float *rc, float k, float *out) {
    const __m512 half = _mm512_set1_ps(0.5f), kv = _mm512_set1_ps(k);
    for (size_t j = 0; j < NB; j += 16) {
        __m512 b = _mm512_load_ps(cb + j), c = _mm512_load_ps(cc + j);
        __m512 t = _mm512_sub_ps(b, _mm512_load_ps(ca + j));
        _mm512_store_ps(out + j, _mm512_add_ps(t, c));
        __m512 pb = _mm512_add_ps(_mm512_mul_ps(b, half), half);
        __m512 pc = _mm512_add_ps(_mm512_mul_ps(c, half), half);
        _mm512_store_ps(out + NB + j,
                        _mm512_mul_ps(_mm512_mul_ps(pb, pc), _mm512_load_ps(ia + j)));
        _mm512_store_ps(out + 2 * NB + j,
                        _mm512_mul_ps(_mm512_add_ps(t, kv), _mm512_load_ps(rc + j)));
    }
}

AVX512 static float row_max_avx512(const float *x) {
    __m512 m = _mm512_set1_ps(-INFINITY);
    for (size_t j = 0; j < NB; j += 16) m = _mm512_max_ps(_mm512_load_ps(x + j), m);
    return hmax_avx512(m);
}

static const vg_ana_kernels kernels_avx512 = {
    "avx512f",        scale_avx512,     mul_denominator_avx512, inv_distance_avx512,
    block_max_avx512, block_scores_avx512, row_max_avx512};
#endif

_Static_assert(VG_ANA_BLOCK % 16 == 0, "a block is a whole number of 16-float vectors");

const vg_ana_kernels *vg_ana_kernels_get(const char *name) {
    if (strcmp(name, "scalar") == 0) return &kernels_c;
#ifdef HAVE_X86
    if (strcmp(name, "avx") == 0 && __builtin_cpu_supports("avx")) return &kernels_avx;
    if (strcmp(name, "avx512f") == 0 && __builtin_cpu_supports("avx512f")) return &kernels_avx512;
#endif
    return NULL;
}

const vg_ana_kernels *vg_ana_kernels_best(void) {
    const vg_ana_kernels *k = vg_ana_kernels_get("avx512f");
    if (!k) k = vg_ana_kernels_get("avx");
    return k ? k : &kernels_c;
}
