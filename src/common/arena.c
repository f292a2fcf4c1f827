/* arena.c - chunked string arena.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "arena.h"

#include <string.h>

#include "alloc.h"
#include "bigbuf.h"

struct vg_arena_chunk {
    vg_arena_chunk *next;
    size_t cap;
    /* data follows, 8-aligned because the header is two words */
};

/* Chunks double from CHUNK_MIN to CHUNK_MAX: a vocabulary of millions of
 * words then takes a few dozen chunks, not hundreds. Chunks from
 * CHUNK_BIG bytes are mappings advised for huge pages (bigbuf.c): in a VM
 * the first touch of every 4 KiB page of malloc's memory is a fault, a
 * cost as large as the copying itself. Untouched pages of a chunk cost
 * nothing, so the doubling wastes address space only. A chunk's size
 * alone says which allocator holds it. */
#define CHUNK_MIN ((size_t)64 * 1024)
#define CHUNK_MAX ((size_t)32 << 20)
#define CHUNK_BIG ((size_t)2 << 20)

static vg_arena_chunk *chunk_alloc(size_t total) {
    return total >= CHUNK_BIG ? vg_bigbuf_alloc(total) : vg_malloc(total);
}

static void chunk_free(vg_arena_chunk *c) {
    size_t total = c->cap + sizeof *c;
    if (total >= CHUNK_BIG) {
        vg_bigbuf_release(c, total);
    } else {
        vg_free(c);
    }
}

void *vg_arena_alloc(vg_arena *a, size_t n) {
    size_t need = (n + 7) & ~(size_t)7;
    if (need < n) return NULL;
    if (!a->head || a->cap - a->used < need) {
        size_t cap = a->head ? VG_MIN(2 * a->cap, CHUNK_MAX) : CHUNK_MIN;
        if (cap < need) cap = need;
        size_t total;
        if (vg_add_overflow(cap, sizeof(vg_arena_chunk), &total)) return NULL;
        vg_arena_chunk *c = chunk_alloc(total);
        if (!c) return NULL;
        c->next = a->head;
        c->cap = cap;
        a->head = c;
        a->used = 0;
        a->cap = cap;
    }
    char *p = (char *)(a->head + 1) + a->used;
    a->used += need;
    return p;
}

char *vg_arena_strndup(vg_arena *a, const char *s, size_t n) {
    if (n == (size_t)-1) return NULL;
    char *d = vg_arena_alloc(a, n + 1);
    if (!d) return NULL;
    memcpy(d, s, n);
    d[n] = '\0';
    return d;
}

char *vg_arena_strdup(vg_arena *a, const char *s) { return vg_arena_strndup(a, s, strlen(s)); }

void vg_arena_free(vg_arena *a) {
    vg_arena_chunk *c = a->head;
    while (c) {
        vg_arena_chunk *next = c->next;
        chunk_free(c);
        c = next;
    }
    a->head = NULL;
    a->used = a->cap = 0;
}
