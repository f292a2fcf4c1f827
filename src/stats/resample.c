/* resample.c - per-replicate random streams.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "resample.h"

#include <string.h>

#include "../common/strmap.h"

static uint64_t splitmix64(uint64_t z) {
    z += 0x9e3779b97f4a7c15ULL;
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
    return z ^ (z >> 31);
}

uint64_t vg_resample_stream(const char *suite_id, const char *subset) {
    uint64_t a = vg_hash_bytes(suite_id, strlen(suite_id));
    uint64_t b = vg_hash_bytes(subset ? subset : "", subset ? strlen(subset) : 0);
    return splitmix64(a ^ splitmix64(b));
}

/* taus2 (L'Ecuyer 1996, maximally equidistributed combined Tausworthe,
 * as GSL implements it): every replicate reseeds its generator, and
 * taus2's seeding is a few steps where mt19937's fills 624 words; its
 * draws are also about twice as fast. Both pass the usual tests at the
 * few thousand draws a replicate takes. */
gsl_rng *vg_resample_rng_alloc(void) { return gsl_rng_alloc(gsl_rng_taus2); }

void vg_resample_seed(gsl_rng *rng, uint64_t seed, uint64_t stream, uint64_t replicate) {
    uint64_t s = splitmix64(splitmix64(seed) ^ stream);
    s = splitmix64(s ^ splitmix64(replicate));
    /* gsl_rng_set takes an unsigned long; taus2 uses 32 bits of it, and
     * treats 0 as its default seed, which would collide: map 0 away. */
    unsigned long v = (unsigned long)(s ^ (s >> 32)) & 0xffffffffUL;
    gsl_rng_set(rng, v ? v : 0x5eedUL);
}

void vg_resample_draw(gsl_rng *rng, size_t n, size_t *idx) {
    for (size_t i = 0; i < n; i++) idx[i] = (size_t)gsl_rng_uniform_int(rng, (unsigned long)n);
}

void vg_resample_counts(gsl_rng *rng, size_t n, uint32_t *counts) {
    /* gsl_rng_uniform_int's algorithm (GSL 2.7, gsl_rng.h), unrolled so
     * that its division by the same scale is done once, as a multiply by
     * the reciprocal corrected to the exact quotient: k = (get - min) /
     * scale, rejected while k >= n. The draws are therefore exactly those
     * of vg_resample_draw. */
    const gsl_rng_type *t = rng->type;
    unsigned long offset = t->min, range = t->max - offset;
    if (n == 0 || n > range) return;
    unsigned long scale = range / n;
    double inv = 1.0 / (double)scale;
    for (size_t i = 0; i < n; i++) {
        unsigned long k;
        do {
            unsigned long v = t->get(rng->state) - offset;
            k = (unsigned long)((double)v * inv);
            /* The product is within one of v / scale: correct it. */
            if (k * scale > v)
                k--;
            else if (v - k * scale >= scale)
                k++;
        } while (k >= n);
        counts[k]++;
    }
}
