/* bigbuf.c - reserve, grow and shrink anonymous mappings.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "bigbuf.h"

#include <sys/mman.h>
#include <unistd.h>

#include "alloc.h"

static size_t page_round(size_t n) {
    size_t pg = (size_t)sysconf(_SC_PAGESIZE);
    if (n > (size_t)-1 - pg) return 0;
    return (n + pg - 1) & ~(pg - 1);
}

static void advise(void *p, size_t n) {
#ifdef MADV_HUGEPAGE
    /* Huge pages cut the first-touch page faults of a multi-gigabyte
     * matrix 512-fold; the kernel ignores the advice where disabled. */
    if (n >= ((size_t)2 << 20)) madvise(p, n, MADV_HUGEPAGE);
#else
    (void)p;
    (void)n;
#endif
}

int vg_bigbuf_reserve(vg_bigbuf *b, size_t bytes) {
    if (bytes <= b->reserved) return 0;
    size_t want = page_round(bytes);
    if (want == 0 || vg_alloc_hook_fails()) return -1;
    void *p;
    if (!b->p) {
        p = mmap(NULL, want, PROT_READ | PROT_WRITE, MAP_PRIVATE | MAP_ANONYMOUS | MAP_NORESERVE,
                 -1, 0);
    } else {
        p = mremap(b->p, b->reserved, want, MREMAP_MAYMOVE);
    }
    if (p == MAP_FAILED) return -1;
    advise(p, want);
    b->p = p;
    b->reserved = want;
    return 0;
}

void vg_bigbuf_shrink(vg_bigbuf *b, size_t bytes) {
    if (!b->p) return;
    size_t keep = page_round(bytes ? bytes : 1);
    if (keep == 0 || keep >= b->reserved) return;
    void *p = mremap(b->p, b->reserved, keep, 0);
    if (p == MAP_FAILED) return; /* keeping the larger mapping is harmless */
    b->p = p;
    b->reserved = keep;
}

void vg_bigbuf_free(vg_bigbuf *b) {
    if (b->p) munmap(b->p, b->reserved);
    b->p = NULL;
    b->reserved = 0;
}

void *vg_bigbuf_alloc(size_t n) {
    vg_bigbuf b = VG_BIGBUF_INIT;
    if (vg_bigbuf_reserve(&b, n ? n : 1) != 0) return NULL;
    return b.p;
}

void vg_bigbuf_release(void *p, size_t n) {
    if (p) munmap(p, page_round(n ? n : 1));
}
