/* arena.h - a string arena: many small strings, freed together.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_ARENA_H
#define VG_ARENA_H

#include <stddef.h>

#include "internal.h"

typedef struct vg_arena_chunk vg_arena_chunk;

typedef struct vg_arena {
    vg_arena_chunk *head;
    size_t used, cap;   /* of the head chunk */
} vg_arena;

/* A zeroed vg_arena is empty and ready. */
#define VG_ARENA_INIT {NULL, 0, 0}

/* n bytes aligned to 8, valid until vg_arena_free; NULL when out of memory. */
VG_INTERNAL void *vg_arena_alloc(vg_arena *a, size_t n);
/* Copy s[0..n) plus a NUL into the arena. */
VG_INTERNAL char *vg_arena_strndup(vg_arena *a, const char *s, size_t n);
VG_INTERNAL char *vg_arena_strdup(vg_arena *a, const char *s);
/* Free every chunk; the arena is empty again afterwards. */
VG_INTERNAL void vg_arena_free(vg_arena *a);

#endif /* VG_ARENA_H */
