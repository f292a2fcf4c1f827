/* filemap.c - read-only file mappings placed for huge pages.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "filemap.h"

#include <errno.h>
#include <stdint.h>
#include <stdio.h>
#include <string.h>
#include <sys/mman.h>
#include <unistd.h>

#include "alloc.h"

void *vg_filemap(int fd, size_t size, size_t pad, size_t *span) {
    size_t pg = (size_t)sysconf(_SC_PAGESIZE);
    size_t body, tail, total, reserve;
    if (vg_add_overflow(size, pg - 1, &body) || vg_add_overflow(pad, pg - 1, &tail)) {
        errno = EOVERFLOW;
        return NULL;
    }
    body &= ~(pg - 1);
    tail &= ~(pg - 1);
    if (vg_add_overflow(body, tail, &total) || vg_add_overflow(total, VG_FILEMAP_ALIGN, &reserve)) {
        errno = EOVERFLOW;
        return NULL;
    }
    if (total == 0) {
        total = pg;
        reserve = pg + VG_FILEMAP_ALIGN;
    }
    /* Reserve room for an aligned start, then map the file over it; the
     * reservation's anonymous zero pages are the padding after it. */
    char *r = mmap(NULL, reserve, PROT_READ, MAP_PRIVATE | MAP_ANONYMOUS | MAP_NORESERVE, -1, 0);
    if (r == MAP_FAILED) return NULL;
    char *a = (char *)(((uintptr_t)r + VG_FILEMAP_ALIGN - 1) & ~(uintptr_t)(VG_FILEMAP_ALIGN - 1));
    if (size > 0 && mmap(a, size, PROT_READ, MAP_PRIVATE | MAP_FIXED, fd, 0) == MAP_FAILED) {
        int e = errno;
        munmap(r, reserve);
        errno = e;
        return NULL;
    }
    if (a > r) munmap(r, (size_t)(a - r));
    if (r + reserve > a + total) munmap(a + total, (size_t)(r + reserve - (a + total)));
#ifdef MADV_HUGEPAGE
    /* Lets a fault read ahead in 2 MiB folios and map them whole; the
     * kernel ignores it where transparent huge pages are off. */
    if (size > 0) madvise(a, size, MADV_HUGEPAGE);
#endif
    *span = total;
    return a;
}

/* FilePmdMapped of the mapping that starts at base: 1 above zero, 0 zero,
 * -1 when not found. The records come in address order, a header line
 * "start-end perms ..." and then "Field: value kB" lines; the kernel walks
 * a mapping's pages only when its record is read, so stop at ours. */
static int pmd_mapped(const void *base) {
    FILE *f = fopen("/proc/self/smaps", "re");
    if (!f) return -1;
    char line[512];
    int in_vma = 0, rc = -1;
    while (fgets(line, sizeof line, f)) {
        uintmax_t lo, hi, kb;
        char dash;
        if (sscanf(line, "%jx%c%jx ", &lo, &dash, &hi) == 3 && dash == '-') {
            if (in_vma) break;
            in_vma = lo == (uintmax_t)(uintptr_t)base;
        } else if (in_vma && sscanf(line, "FilePmdMapped: %ju kB", &kb) == 1) {
            rc = kb > 0;
            break;
        }
    }
    fclose(f);
    return rc;
}

int vg_filemap_cached_huge(const void *base, size_t size) {
#if defined(MADV_POPULATE_READ) && defined(MADV_HUGEPAGE)
    if (!base || size < 3 * VG_FILEMAP_ALIGN) return -1;
    size_t mid = (size / 2) & ~(VG_FILEMAP_ALIGN - 1);
    if (madvise((char *)(uintptr_t)base + mid, VG_FILEMAP_ALIGN, MADV_POPULATE_READ) != 0) return -1;
    return pmd_mapped(base);
#else
    (void)base;
    (void)size;
    return -1;
#endif
}
