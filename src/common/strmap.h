/* strmap.h - an open-addressing hash map from byte strings to size_t.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Keys are borrowed: the map stores a pointer and a length, so the bytes
 * must outlive the map (they usually sit in an arena next to it). Used
 * for vocabularies (millions of words), duplicate detection in suites and
 * sets of distinct words.
 */
#ifndef VG_STRMAP_H
#define VG_STRMAP_H

#include <stddef.h>
#include <stdint.h>

#include "internal.h"

typedef struct vg_strmap_slot {
    const char *key;   /* NULL: empty slot */
    uint32_t len;
    uint32_t hash32;   /* low bits of the hash, to skip most compares */
    size_t value;
} vg_strmap_slot;

typedef struct vg_strmap {
    vg_strmap_slot *slots;
    size_t cap;        /* power of two, or 0 */
    size_t count;
} vg_strmap;

#define VG_STRMAP_INIT {NULL, 0, 0}

/* 64-bit hash of n bytes (fast, not cryptographic). */
VG_INTERNAL uint64_t vg_hash_bytes(const void *p, size_t n);

/* Make room for n keys without rehashing. -1 when out of memory. */
VG_INTERNAL int vg_strmap_reserve(vg_strmap *m, size_t n);

/* Insert key -> value unless the key is present. Returns 1 if inserted,
 * 0 if already present (then *existing, if non-NULL, gets its value), -1
 * when out of memory or the key is longer than 4 GiB. */
VG_INTERNAL int vg_strmap_put(vg_strmap *m, const char *key, size_t len, size_t value,
                              size_t *existing);

/* Value of key, or (size_t)-1 if absent. */
VG_INTERNAL size_t vg_strmap_get(const vg_strmap *m, const char *key, size_t len);

/* As vg_strmap_put and vg_strmap_get with the key's vg_hash_bytes
 * already computed (so that it can be computed on another thread). */
VG_INTERNAL int vg_strmap_put_hashed(vg_strmap *m, const char *key, size_t len, uint64_t hash,
                                     size_t value, size_t *existing);
VG_INTERNAL size_t vg_strmap_get_hashed(const vg_strmap *m, const char *key, size_t len,
                                        uint64_t hash);

VG_INTERNAL void vg_strmap_free(vg_strmap *m);

/* Hint that a lookup of a key with this hash comes soon: callers that
 * know the next keys ahead (a batch of rows) hide the cache miss. */
static inline void vg_strmap_prefetch(const vg_strmap *m, uint64_t hash) {
    if (m->cap) __builtin_prefetch(&m->slots[hash & (m->cap - 1)]);
}

#endif /* VG_STRMAP_H */
