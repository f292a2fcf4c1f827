/* sha256.h - SHA-256 of byte streams and files, through OpenSSL's libcrypto.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_SHA256_H
#define VG_SHA256_H

#include <stddef.h>
#include <stdint.h>

#include "internal.h"
#include "vecgauge/error.h"

typedef struct vg_sha256 vg_sha256;

/* A new hashing context, or NULL when out of memory. */
VG_INTERNAL vg_sha256 *vg_sha256_new(void);
VG_INTERNAL void vg_sha256_update(vg_sha256 *h, const void *data, size_t n);
/* Write the lower-case hex digest (64 chars + NUL) into hex and free h. */
VG_INTERNAL void vg_sha256_final(vg_sha256 *h, char hex[65]);
/* Free without a digest. NULL does nothing. */
VG_INTERNAL void vg_sha256_free(vg_sha256 *h);

/* Hash a whole file as stored (no decompression); *bytes gets its size.
 * VG_EIO names path on failure. */
VG_INTERNAL vg_status vg_sha256_file(const char *path, char hex[65], uint64_t *bytes,
                                     vg_error *err);

/* Hash a buffer in one call. */
VG_INTERNAL void vg_sha256_buffer(const void *data, size_t n, char hex[65]);

#endif /* VG_SHA256_H */
