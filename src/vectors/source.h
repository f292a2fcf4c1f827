/* source.h - the bytes of one input file, in chunks, hashed on the way.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * A source delivers the (decompressed) bytes of a file as a sequence of
 * chunks that readers may parse on several threads at once:
 *  - a regular uncompressed file is memory-mapped (for detection, and for
 *    readers that find rows by position); raw chunks are slices of the
 *    mapping, and vg_src_pread copies stored bytes out of the page cache;
 *  - in lines mode (text) a regular file is instead read() by a producer
 *    thread into a ring of huge-page buffers: in a VM, walking a mapping's
 *    4 KiB pages costs more than the kernel's copy;
 *  - a gzip file (known by its magic bytes, never by its name) is inflated
 *    by the producer thread while the readers parse the previous buffers;
 *    pipes are read the same way.
 * In lines mode every chunk but the last ends just after a '\n', so rows
 * never straddle chunks. Readers release chunks in order; releasing one
 * feeds the stored bytes it completes to SHA-256 (one pass over the bytes:
 * the file is never read a second time for its hash), drops the mapped
 * pages behind it (so a file being read never sits in the process's
 * memory whole) and reports progress.
 *
 * Every chunk may be read VG_SRC_PAD bytes past its end (zeros or later
 * bytes of the stream), so parsers can load 8 or 64 bytes at a time
 * without bounds checks on each load.
 */
#ifndef VG_SOURCE_H
#define VG_SOURCE_H

#include <stddef.h>
#include <stdint.h>

#include "../common/internal.h"
#include "vecgauge/vectors.h"

#define VG_SRC_PAD 128

typedef struct vg_src vg_src;

typedef struct vg_chunk {
    const char *data;   /* len bytes, then VG_SRC_PAD readable bytes */
    size_t len;
    uint64_t offset;    /* of data[0] in the stream */
    uint64_t index;     /* 0, 1, 2, ... in stream order */
    int last;           /* no chunk follows */
    uint64_t raw_end;   /* stored bytes consumed once this chunk is done */
    int buf;            /* internal: producer buffer, -1 for a mapping */
} vg_chunk;

/* Open path for reading. hash: compute the SHA-256 of the stored bytes.
 * progress (may be NULL) is called from vg_src_release with stored bytes
 * done and the stored size (0 when unknown, for pipes). */
VG_INTERNAL vg_status vg_src_open(const char *path, int hash, vg_progress_fn progress,
                                  void *progress_ctx, vg_src **out, vg_error *err);

/* A source over n bytes of memory (copied once, so the caller's buffer
 * need not be padded). name is used in error messages. */
VG_INTERNAL vg_status vg_src_open_buffer(const void *data, size_t n, const char *name, int hash,
                                         vg_src **out, vg_error *err);

/* Bound a gzip source's inflation: more than ratio times the stored bytes
 * consumed (past VG_INFLATE_FLOOR) is VG_ELIMIT. 0: no bound. Call
 * before vg_src_peek. */
VG_INTERNAL void vg_src_limit_inflate(vg_src *s, unsigned ratio);

VG_INTERNAL const char *vg_src_path(const vg_src *s);
VG_INTERNAL int vg_src_gzip(const vg_src *s);
/* The size of the file as stored (compressed size for gzip); for a pipe,
 * the bytes read so far. */
VG_INTERNAL uint64_t vg_src_stored_bytes(const vg_src *s);
/* An upper bound on the stream's length: the file size, times 1032 for
 * gzip (the deflate format's largest expansion); 0 when unknown (a pipe). */
VG_INTERNAL uint64_t vg_src_stream_bound(const vg_src *s);

/* The first bytes of the stream (up to one chunk) for layout detection:
 * *whole is 1 when they are the entire stream. Valid until vg_src_close;
 * VG_SRC_PAD readable bytes follow them. Call before vg_src_start. */
VG_INTERNAL vg_status vg_src_peek(vg_src *s, const char **p, size_t *n, int *whole,
                                  vg_error *err);

/* Begin delivering chunks of about chunk_bytes (0: the default), from the
 * start of the stream. lines: chunks end after a '\n' (a line longer than
 * VG_MAX_LINE is an error). */
VG_INTERNAL vg_status vg_src_start(vg_src *s, int lines, size_t chunk_bytes, vg_error *err);

/* The next chunk. Thread-safe. Returns 1 with *c filled, 0 at the end of
 * the stream, -1 on a read or decompression error (*err filled; the
 * chunks before the error were all delivered first). */
VG_INTERNAL int vg_src_next(vg_src *s, vg_chunk *c, vg_error *err);

/* Done with c; chunks must be released in index order, from one thread at
 * a time. Returns VG_EINTERRUPTED when the progress callback asks to stop. */
VG_INTERNAL vg_status vg_src_release(vg_src *s, const vg_chunk *c, vg_error *err);

/* Make every later vg_src_next return 0 at once (a reader that stops
 * early wakes its threads). Thread-safe. */
VG_INTERNAL void vg_src_cancel(vg_src *s);

/* After the last chunk the reader needs (possibly before the end, e.g.
 * under max_words): stop the producer and hash the rest of the stored
 * bytes. Then vg_src_sha256 holds the digest ("" when not hashing). */
VG_INTERNAL vg_status vg_src_finish(vg_src *s, vg_error *err);
VG_INTERNAL const char *vg_src_sha256(const vg_src *s);

/* Stop any producer thread, unmap, free. NULL does nothing. */
VG_INTERNAL void vg_src_close(vg_src *s);

/* Files from this size are hashed by a thread of their own (default
 * 16 MiB; tests set it low to run that path on small files). */
VG_INTERNAL extern size_t vg_src_hash_thread_min;

/* Tests set this to make every vg_src_pread() that reaches this byte
 * fail as a disk error would (EIO); UINT64_MAX (the default): never. */
VG_INTERNAL extern uint64_t vg_src_test_pread_fail_from;

/* How the lines of a regular text file are read. VG_SRC_TEXT_AUTO (the
 * default): the parsers walk the file's mapping where the page cache
 * holds the file in 2 MiB folios (vg_filemap_cached_huge), and a producer
 * thread read()s it into buffers otherwise. Tests force either way. */
enum { VG_SRC_TEXT_AUTO, VG_SRC_TEXT_MAP, VG_SRC_TEXT_READ };
VG_INTERNAL extern int vg_src_text_mode;

/* ---- sequential reading across chunks (binary, npy, vocabularies) ---- */

typedef struct vg_seq {
    vg_src *src;
    vg_chunk cur;
    int have;           /* cur is held */
    int eof;
    size_t pos;         /* in cur */
    char *scratch;      /* bytes taken out of chunks to join a straddler */
    size_t scap, sbeg, send;
    uint64_t consumed;  /* stream offset of the next byte */
} vg_seq;

/* Start reading src sequentially (raw chunks); call after vg_src_peek. */
VG_INTERNAL vg_status vg_seq_begin(vg_seq *q, vg_src *src, vg_error *err);

/* Make the next min(n, bytes left) bytes contiguous and return them (with
 * VG_SRC_PAD readable bytes after); *got says how many. Does not consume.
 * NULL with *err filled on a read error. */
VG_INTERNAL const char *vg_seq_peek(vg_seq *q, size_t n, size_t *got, vg_error *err);

/* Consume n bytes (n <= what the last peek returned). */
VG_INTERNAL vg_status vg_seq_skip(vg_seq *q, size_t n, vg_error *err);

/* Consume up to n bytes without looking at them (seeks in a mapping);
 * *skipped gets how many were there. */
VG_INTERNAL vg_status vg_seq_discard(vg_seq *q, uint64_t n, uint64_t *skipped, vg_error *err);

/* Release what is held; the source can then be finished. */
VG_INTERNAL void vg_seq_end(vg_seq *q);

/* For a mapped source (not gzip, not a pipe): the whole stream as one
 * padded array, or NULL. Readers that can index it directly (npy in
 * Fortran order) use it and report progress with vg_src_advance. */
VG_INTERNAL const char *vg_src_mapping(const vg_src *s, size_t *n);
/* The descriptor of a mapped regular file (not gzip), or -1: what
 * vg_vecbuild_borrow maps again to use the file's bytes as the matrix. */
VG_INTERNAL int vg_src_file_fd(const vg_src *s);
/* Map the page tables of [offset, offset + n) of the mapping in one go
 * (a reader about to walk it): one call instead of a page fault every few
 * pages, and the cache prefetcher can then run ahead. A hint only. */
VG_INTERNAL void vg_src_willneed(vg_src *s, uint64_t offset, size_t n);

/* Copy n stored bytes at offset of a mapped source into dst with pread
 * (the kernel copies from the page cache through its own large pages,
 * several times faster than touching a 4 KiB-page mapping in a VM).
 * Thread-safe. Does not hash or report progress: vg_src_advance does. */
VG_INTERNAL vg_status vg_src_pread(vg_src *s, void *dst, size_t n, uint64_t offset,
                                   vg_error *err);

/* For a reader of a mapped file that reads the stored bytes itself (by
 * pread): call before vg_src_start; the file is then hashed from the
 * bytes the reader hands over with vg_src_hash_submit, in file order, by
 * the hashing thread beside it (one pass over the bytes). */
VG_INTERNAL void vg_src_hash_by_submit(vg_src *s);
/* The next n stored bytes (those from the end of the last submission),
 * as read into p; p must stay untouched until vg_src_hash_wait_upto
 * passes its end. Waits while the hashing thread's queue is full. */
VG_INTERNAL void vg_src_hash_submit(vg_src *s, const void *p, size_t n);
/* Wait until the stored bytes before offset are hashed. */
VG_INTERNAL void vg_src_hash_wait_upto(vg_src *s, uint64_t offset);
/* The stored bytes submitted so far. */
VG_INTERNAL uint64_t vg_src_hash_submitted(const vg_src *s);

/* Mark the mapped stream done up to offset: hash, drop pages, progress. */
VG_INTERNAL vg_status vg_src_advance(vg_src *s, uint64_t offset, vg_error *err);

#endif /* VG_SOURCE_H */
