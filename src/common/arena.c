/* arena.c - chunked string arena.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "arena.h"

#include <string.h>

#include "alloc.h"

struct vg_arena_chunk {
    vg_arena_chunk *next;
    size_t cap;
    /* data follows, 8-aligned because the header is two words */
};

#define CHUNK_MIN ((size_t)64 * 1024)

void *vg_arena_alloc(vg_arena *a, size_t n) {
    size_t need = (n + 7) & ~(size_t)7;
    if (need < n) return NULL;
    if (!a->head || a->cap - a->used < need) {
        size_t cap = need > CHUNK_MIN ? need : CHUNK_MIN;
        size_t total;
        if (vg_add_overflow(cap, sizeof(vg_arena_chunk), &total)) return NULL;
        vg_arena_chunk *c = vg_malloc(total);
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
        vg_free(c);
        c = next;
    }
    a->head = NULL;
    a->used = a->cap = 0;
}
