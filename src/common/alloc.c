/* alloc.c - the allocation funnel and its failure-injection hook.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "alloc.h"

#include <stdatomic.h>
#include <stdlib.h>
#include <string.h>

static atomic_long fail_after = -1;
static atomic_ulong alloc_count;

void vg_alloc_fail_after(long n) { atomic_store(&fail_after, n); }
unsigned long vg_alloc_count(void) { return atomic_load(&alloc_count); }

/* Returns 1 when the hook says this allocation must fail. */
static int should_fail(void) {
    atomic_fetch_add(&alloc_count, 1);
    long f = atomic_load(&fail_after);
    if (f < 0) return 0;
    if (f == 0) return 1;
    atomic_fetch_sub(&fail_after, 1);
    return 0;
}

int vg_alloc_hook_fails(void) { return should_fail(); }

void *vg_malloc(size_t n) {
    if (should_fail()) return NULL;
    return malloc(n ? n : 1);
}

void *vg_calloc(size_t n, size_t size) {
    size_t total;
    if (vg_mul_overflow(n, size, &total)) return NULL;
    if (should_fail()) return NULL;
    return calloc(total ? total : 1, 1);
}

void *vg_realloc(void *p, size_t n) {
    if (should_fail()) return NULL;
    return realloc(p, n ? n : 1);
}

void *vg_reallocarray(void *p, size_t n, size_t size) {
    size_t total;
    if (vg_mul_overflow(n, size, &total)) return NULL;
    return vg_realloc(p, total);
}

void *vg_aligned_alloc(size_t align, size_t n) {
    void *p = NULL;
    if (should_fail()) return NULL;
    if (posix_memalign(&p, align, n ? n : 1) != 0) return NULL;
    return p;
}

void vg_free(void *p) { free(p); }

char *vg_strndup(const char *s, size_t n) {
    char *d = vg_malloc(n + 1);
    if (!d) return NULL;
    memcpy(d, s, n);
    d[n] = '\0';
    return d;
}

char *vg_strdup(const char *s) { return vg_strndup(s, strlen(s)); }

int vg_grow(void **arr, size_t *cap, size_t need, size_t size) {
    if (need <= *cap) return 0;
    size_t ncap = *cap ? *cap : 16;
    while (ncap < need) {
        if (vg_mul_overflow(ncap, 2, &ncap)) return -1;
    }
    void *p = vg_reallocarray(*arr, ncap, size);
    if (!p) return -1;
    *arr = p;
    *cap = ncap;
    return 0;
}
