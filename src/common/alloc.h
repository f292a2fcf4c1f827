/* alloc.h - the one allocation funnel of libvecgauge, with a failure hook.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Every allocation in the library goes through these functions so that
 * tests can make the Nth one fail (vg_alloc_fail_after) and check that no
 * path leaks or leaves a half-written output. Sizes are checked for
 * overflow before any multiplication reaches malloc.
 */
#ifndef VG_ALLOC_H
#define VG_ALLOC_H

#include <stddef.h>

#include "internal.h"

VG_INTERNAL void *vg_malloc(size_t n);
/* calloc semantics; NULL if n * size overflows. */
VG_INTERNAL void *vg_calloc(size_t n, size_t size);
VG_INTERNAL void *vg_realloc(void *p, size_t n);
/* realloc of n elements of size bytes; NULL (p untouched) on overflow. */
VG_INTERNAL void *vg_reallocarray(void *p, size_t n, size_t size);
/* Memory aligned to align (a power of two, multiple of sizeof(void *)).
 * Freed with vg_free. */
VG_INTERNAL void *vg_aligned_alloc(size_t align, size_t n);
/* free; NULL does nothing. */
VG_INTERNAL void vg_free(void *p);
VG_INTERNAL char *vg_strdup(const char *s);
VG_INTERNAL char *vg_strndup(const char *s, size_t n);

/* *out = a * b; returns 1 on overflow (leaving *out undefined), else 0. */
static inline int vg_mul_overflow(size_t a, size_t b, size_t *out) {
    return __builtin_mul_overflow(a, b, out);
}
static inline int vg_add_overflow(size_t a, size_t b, size_t *out) {
    return __builtin_add_overflow(a, b, out);
}

/* Test hook: after n more successful allocations, every allocation fails
 * until called again. n < 0 turns failures off (the default). */
VG_INTERNAL void vg_alloc_fail_after(long n);
/* For allocators outside this file (mmap-backed buffers): counts one
 * allocation and returns 1 when the hook says it must fail. */
VG_INTERNAL int vg_alloc_hook_fails(void);
/* Allocations made since the process started (for tests). */
VG_INTERNAL unsigned long vg_alloc_count(void);

/* Growable array helper: make room for at least need elements of size
 * bytes in *arr (capacity *cap). Returns 0 on success, -1 on failure
 * (then *arr and *cap are unchanged). */
VG_INTERNAL int vg_grow(void **arr, size_t *cap, size_t need, size_t size);

#endif /* VG_ALLOC_H */
