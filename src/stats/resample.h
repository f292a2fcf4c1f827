/* resample.h - random streams for resampling that do not depend on
 * threads or on the order work is done in.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Every bootstrap replicate gets its own GSL generator state, derived from
 * (seed, stream, replicate) alone. The stream names what is resampled: it
 * is derived from the suite id and the subset, not from the vector set, so
 * replicate r draws the same items for every vector set on that suite.
 * That makes per-set intervals and paired differences use one and the
 * same resamples, and makes any split of replicates over threads give
 * byte-identical results.
 */
#ifndef VG_RESAMPLE_H
#define VG_RESAMPLE_H

#include <gsl/gsl_rng.h>
#include <stddef.h>
#include <stdint.h>

#include "../common/internal.h"

/* The stream id of what is resampled (e.g. suite id and subset name). */
VG_INTERNAL uint64_t vg_resample_stream(const char *suite_id, const char *subset);

/* A new generator (gsl_rng_taus2) or NULL when out of memory; free with
 * gsl_rng_free. */
VG_INTERNAL gsl_rng *vg_resample_rng_alloc(void);

/* Seed rng for replicate r of stream on the user's seed. The GSL seed is
 * splitmix64 (Steele, Lea and Flood 2014) of the three values combined,
 * so neighbouring replicates get unrelated states. */
VG_INTERNAL void vg_resample_seed(gsl_rng *rng, uint64_t seed, uint64_t stream,
                                  uint64_t replicate);

/* Fill idx[0..n) with n indices drawn uniformly with replacement from
 * 0..n-1 (gsl_rng_uniform_int). */
VG_INTERNAL void vg_resample_draw(gsl_rng *rng, size_t n, size_t *idx);

/* The same n draws as vg_resample_draw from the same generator state, kept
 * as multiplicities: counts[i] += the number of times item i is drawn
 * (the caller zeroes counts first). A bootstrap statistic that only
 * reweights the original items needs no index list. */
VG_INTERNAL void vg_resample_counts(gsl_rng *rng, size_t n, uint32_t *counts);

#endif /* VG_RESAMPLE_H */
