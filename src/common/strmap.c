/* strmap.c - open addressing with linear probing, load factor <= 1/2.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "strmap.h"

#include <string.h>

#include "alloc.h"
#include "bigbuf.h"

/* Tables of a megabyte or more live in their own mapping, with huge
 * pages: a vocabulary index of millions of words is touched at random,
 * and with 4 KiB pages its first touch alone costs more than the inserts.
 * The size alone says which allocator holds a table. */
#define BIG_TABLE ((size_t)1 << 20)

static vg_strmap_slot *slots_alloc(size_t cap) {
    size_t bytes;
    if (vg_mul_overflow(cap, sizeof(vg_strmap_slot), &bytes)) return NULL;
    if (bytes >= BIG_TABLE) return vg_bigbuf_alloc(bytes);
    return vg_calloc(cap, sizeof(vg_strmap_slot));
}

static void slots_free(vg_strmap_slot *s, size_t cap) {
    size_t bytes = cap * sizeof(vg_strmap_slot);
    if (bytes >= BIG_TABLE) {
        vg_bigbuf_release(s, bytes);
    } else {
        vg_free(s);
    }
}

/* A multiply-xorshift hash over 8-byte words (the mixing constants are
 * those of splitmix64, Steele, Lea and Flood 2014). Words in vocabularies
 * are short, so the per-call cost matters more than the throughput. */
static inline uint64_t mix64(uint64_t z) {
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
    return z ^ (z >> 31);
}

uint64_t vg_hash_bytes(const void *p, size_t n) {
    const unsigned char *s = p;
    uint64_t h = 0x9e3779b97f4a7c15ULL ^ (uint64_t)n;
    while (n >= 8) {
        uint64_t w;
        memcpy(&w, s, 8);
        h = mix64(h ^ w);
        s += 8;
        n -= 8;
    }
    uint64_t w = 0;
    for (size_t i = 0; i < n; i++) w |= (uint64_t)s[i] << (8 * i);
    return mix64(h ^ w ^ 0xff51afd7ed558ccdULL);
}

static int rehash(vg_strmap *m, size_t ncap) {
    vg_strmap_slot *ns = slots_alloc(ncap);
    if (!ns) return -1;
    for (size_t i = 0; i < m->cap; i++) {
        vg_strmap_slot *o = &m->slots[i];
        if (!o->key) continue;
        /* hash32 holds the hash's low 32 bits, all the index needs below
         * 2^32 slots: no key is hashed again. */
        uint64_t h = ncap <= ((uint64_t)1 << 32) ? o->hash32 : vg_hash_bytes(o->key, o->len);
        size_t j = h & (ncap - 1);
        while (ns[j].key) j = (j + 1) & (ncap - 1);
        ns[j] = *o;
    }
    if (m->slots) slots_free(m->slots, m->cap);
    m->slots = ns;
    m->cap = ncap;
    return 0;
}

int vg_strmap_reserve(vg_strmap *m, size_t n) {
    size_t want = 16;
    while (want / 2 < n) {
        if (vg_mul_overflow(want, 2, &want)) return -1;
    }
    if (want <= m->cap) return 0;
    return rehash(m, want);
}

int vg_strmap_put(vg_strmap *m, const char *key, size_t len, size_t value, size_t *existing) {
    return vg_strmap_put_hashed(m, key, len, vg_hash_bytes(key, len), value, existing);
}

int vg_strmap_put_hashed(vg_strmap *m, const char *key, size_t len, uint64_t h, size_t value,
                         size_t *existing) {
    if (len > UINT32_MAX) return -1;
    if ((m->count + 1) * 2 > m->cap) {
        size_t ncap = m->cap ? m->cap * 2 : 16;
        if (ncap < m->cap || rehash(m, ncap) != 0) return -1;
    }
    size_t j = h & (m->cap - 1);
    for (;;) {
        vg_strmap_slot *s = &m->slots[j];
        if (!s->key) {
            s->key = key;
            s->len = (uint32_t)len;
            s->hash32 = (uint32_t)h;
            s->value = value;
            m->count++;
            return 1;
        }
        if (s->hash32 == (uint32_t)h && s->len == len && memcmp(s->key, key, len) == 0) {
            if (existing) *existing = s->value;
            return 0;
        }
        j = (j + 1) & (m->cap - 1);
    }
}

size_t vg_strmap_get(const vg_strmap *m, const char *key, size_t len) {
    if (!m->cap) return (size_t)-1;
    return vg_strmap_get_hashed(m, key, len, vg_hash_bytes(key, len));
}

size_t vg_strmap_get_hashed(const vg_strmap *m, const char *key, size_t len, uint64_t h) {
    if (!m->cap) return (size_t)-1;
    size_t j = h & (m->cap - 1);
    for (;;) {
        const vg_strmap_slot *s = &m->slots[j];
        if (!s->key) return (size_t)-1;
        if (s->hash32 == (uint32_t)h && s->len == len && memcmp(s->key, key, len) == 0)
            return s->value;
        j = (j + 1) & (m->cap - 1);
    }
}

void vg_strmap_free(vg_strmap *m) {
    if (m->slots) slots_free(m->slots, m->cap);
    m->slots = NULL;
    m->cap = m->count = 0;
}
