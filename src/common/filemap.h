/* filemap.h - read-only file mappings placed for huge pages.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Where the page cache holds a file in 2 MiB folios (as it does once the
 * file was read through a mapping advised for huge pages: readahead then
 * fills it in 2 MiB folios), the kernel can map each folio with a single
 * page-table entry, but only at an address that is a multiple of 2 MiB
 * where the file offset is one too. In a VM the first touch of every
 * 4 KiB page in a process costs a fault: reading 2.4 GB of a cached file
 * took 0.9 s on one core here through 4 KiB entries and 0.09 s through
 * 2 MiB ones. A file cached in small folios maps as before.
 */
#ifndef VG_FILEMAP_H
#define VG_FILEMAP_H

#include <stddef.h>

#include "internal.h"

/* The boundary a mapping starts on (the x86-64 huge page size). */
#define VG_FILEMAP_ALIGN ((size_t)2 << 20)

/* Map bytes [0, size) of fd read-only and private at a multiple of
 * VG_FILEMAP_ALIGN, followed by at least pad bytes of zeros (readers
 * that look a little past the end). *span gets the length to unmap from
 * the returned address. size may be 0. Returns NULL with errno set on
 * failure; nothing stays mapped then. */
VG_INTERNAL void *vg_filemap(int fd, size_t size, size_t pad, size_t *span);

/* Whether the page cache holds the file mapped at base (size bytes, by
 * vg_filemap) in 2 MiB folios, judged by one 2 MiB block from its middle:
 * the block is brought in through the mapping (read from disk if need
 * be: readahead through this mapping then fills 2 MiB folios), and the
 * kernel's FilePmdMapped figure for the mapping in /proc/self/smaps says
 * whether it went in through a 2 MiB entry. The middle, because `cat`
 * and other readers cache a file's first few hundred KiB in small folios
 * (readahead starts small) and the rest in large ones. Returns 1 yes,
 * 0 no, -1 when it cannot be told (a file under three blocks, no /proc,
 * a kernel without the figure). Walking a mapping of small folios costs a
 * fault per few pages, where read() into a buffer does not. */
VG_INTERNAL int vg_filemap_cached_huge(const void *base, size_t size);

#endif /* VG_FILEMAP_H */
