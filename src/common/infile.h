/* infile.h - opening an input file without hanging, and reading its bytes
 * (gzip undone) under a size limit, hashed on the way.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Every reader of a named input opens it here, so that the same rules
 * hold everywhere:
 *  - a directory, a device (/dev/zero, a terminal) or a socket is refused
 *    with a message saying what the path is, never read (a device may
 *    never end, and a directory read through zlib says "corrupt gzip");
 *  - a pipe (`<(cat file)`, a named FIFO) is read as a stream where the
 *    caller accepts one; a named FIFO is opened without blocking and
 *    waited on for a writer at most VG_FIFO_WAIT_MS, so a FIFO nobody
 *    writes to is an error, not a hang;
 *  - callers that read their file twice (run directories, the history)
 *    take regular files only.
 * The stream undoes gzip (known by its magic bytes: concatenated members
 * are read in turn, zero padding after the last is ignored, anything else
 * there is an error), stops with VG_ELIMIT naming the file once the
 * decompressed bytes pass the caller's limit (so a small file that
 * inflates to gigabytes never reaches memory), and hashes the stored
 * bytes as they are read, so a pipe's digest needs no second pass.
 */
#ifndef VG_INFILE_H
#define VG_INFILE_H

#include <stddef.h>
#include <stdint.h>
#include <sys/types.h>

#include "internal.h"
#include "vecgauge/error.h"

/* How long a named FIFO is waited on for its writer, by default (the
 * environment variable VECGAUGE_TEST_FIFO_WAIT_MS overrides it, for
 * tests). */
#ifndef VG_FIFO_WAIT_MS
#define VG_FIFO_WAIT_MS 10000
#endif

enum {
    VG_IN_PIPE = 1,  /* a pipe or FIFO is accepted (read as a stream) */
    VG_IN_HASH = 2   /* compute the sha256 of the stored bytes */
};

/* Open path read-only for an input: a regular file, or (with VG_IN_PIPE
 * in flags) a pipe, waited on for a writer. *fd gets a blocking
 * descriptor and *is_regular whether it is a regular file (both on
 * success only). Refusals are VG_EINVAL ("is a directory", "is a
 * character device, not a file ..."), a FIFO without a writer VG_EIO,
 * other failures VG_EIO with errno's text. */
VG_INTERNAL vg_status vg_infile_open(const char *path, unsigned flags, int *fd, int *is_regular,
                                     vg_error *err);

/* A file's decompressed bytes, read in order. */
typedef struct vg_instream vg_instream;

/* Open path (see vg_infile_open; flags as there). max_bytes bounds the
 * decompressed bytes (0: no bound); passing it is VG_ELIMIT naming the
 * file, with limit_hint (may be NULL) appended to the message, e.g. how
 * to raise the limit. */
VG_INTERNAL vg_status vg_instream_open(const char *path, unsigned flags, uint64_t max_bytes,
                                       const char *limit_hint, vg_instream **out, vg_error *err);

/* Read up to n decompressed bytes into buf. Returns the count (> 0), 0 at
 * the end of the input, -1 on error (*err filled: VG_EIO, VG_EFORMAT for
 * corrupt gzip, VG_ETRUNCATED for a gzip stream cut short, VG_ELIMIT). */
VG_INTERNAL long vg_instream_read(vg_instream *in, char *buf, size_t n, vg_error *err);

/* 1 when the input is gzip-compressed (known after the first read). */
VG_INTERNAL int vg_instream_gzip(const vg_instream *in);

/* After the end was reached: the stored bytes' sha256 (lower-case hex; ""
 * without VG_IN_HASH) and, in *stored, how many there were. */
VG_INTERNAL const char *vg_instream_sha256(vg_instream *in, uint64_t *stored);

VG_INTERNAL const char *vg_instream_path(const vg_instream *in);

/* Close; NULL does nothing. */
VG_INTERNAL void vg_instream_close(vg_instream *in);

#endif /* VG_INFILE_H */
