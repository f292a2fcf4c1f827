/* bigbuf.h - large buffers that grow without copying (mmap and mremap).
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * A vector matrix is the one allocation that is as large as the machine.
 * Growing it by allocate-copy-free needs old + new at once, so a 10 GB
 * matrix would peak at 30 GB. A bigbuf reserves address space that the
 * kernel backs with memory only when a page is first written, and grows by
 * mremap, which moves page table entries instead of bytes. Reserving far
 * more than is used therefore costs nothing: readers size the reservation
 * from an upper bound (e.g. the file size) and shrink it when done.
 */
#ifndef VG_BIGBUF_H
#define VG_BIGBUF_H

#include <stddef.h>

#include "internal.h"

typedef struct vg_bigbuf {
    void *p;          /* page-aligned (so 64-byte aligned); NULL when empty */
    size_t reserved;  /* bytes of address space held */
} vg_bigbuf;

#define VG_BIGBUF_INIT {NULL, 0}

/* Make at least bytes addressable at b->p (zero-filled where never
 * written). May move b->p; contents are kept. Returns 0, or -1 when the
 * address space cannot be had or the allocation hook says fail (then *b is
 * unchanged). */
VG_INTERNAL int vg_bigbuf_reserve(vg_bigbuf *b, size_t bytes);

/* Give back everything past the first bytes (at least one page is kept
 * while bytes > 0). Never fails; may move b->p. */
VG_INTERNAL void vg_bigbuf_shrink(vg_bigbuf *b, size_t bytes);

/* Unmap; *b is empty again. An empty buffer does nothing. */
VG_INTERNAL void vg_bigbuf_free(vg_bigbuf *b);

/* One fixed block of n bytes (zero-filled, page-aligned, huge pages
 * advised when large), for tables that are reallocated whole; freed
 * with vg_bigbuf_release(p, n), the same n. NULL when out of memory or
 * the allocation hook says fail. */
VG_INTERNAL void *vg_bigbuf_alloc(size_t n);
VG_INTERNAL void vg_bigbuf_release(void *p, size_t n);

#endif /* VG_BIGBUF_H */
