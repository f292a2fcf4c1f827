/* lines.h - a line reader for text inputs, gzip-transparent.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Reads plain or gzip-compressed files and pipes (through vg_instream:
 * devices and directories refused, a FIFO without a writer an error, the
 * decompressed size bounded), strips a UTF-8 BOM from the first line and
 * the '\n' or "\r\n" ending from every line, counts lines from 1, refuses
 * lines longer than VG_MAX_LINE instead of growing without bound, and
 * hashes the stored bytes on the way, so that a suite read from a pipe
 * needs no second pass for its digest.
 */
#ifndef VG_LINES_H
#define VG_LINES_H

#include <stddef.h>
#include <stdint.h>

#include "internal.h"
#include "vecgauge/error.h"

typedef struct vg_lines vg_lines;

/* How a file is read. */
typedef struct vg_lines_opts {
    uint64_t max_bytes;     /* decompressed bytes allowed; 0: no bound */
    const char *limit_hint; /* appended to the limit's message, or NULL */
    int regular_only;       /* refuse pipes (files read more than once) */
    int bom_inside_error;   /* a byte order mark after the first line's start
                               is an error (files joined with cat) */
} vg_lines_opts;

/* Open a suite file: pipes accepted, the stored bytes hashed, the
 * decompressed size bounded by vg_suite_max_bytes() (or the calling
 * thread's vg_lines_suite_limit when set), a byte order mark inside the
 * file an error. */
VG_INTERNAL vg_status vg_lines_open(const char *path, vg_lines **out, vg_error *err);

/* Open with explicit options. */
VG_INTERNAL vg_status vg_lines_open_opts(const char *path, const vg_lines_opts *o, vg_lines **out,
                                         vg_error *err);

/* The calling thread's suite-file limit, when not 0: fetch's read check
 * bounds a staged suite by --max-bytes through it. */
VG_INTERNAL extern _Thread_local uint64_t vg_lines_suite_limit;

/* Next line: *line points into an internal buffer (valid until the next
 * call), NUL-terminated, without its line ending; *len is its length.
 * Returns 1 for a line, 0 at end of file, -1 on error (err filled). */
VG_INTERNAL int vg_lines_next(vg_lines *lr, char **line, size_t *len, vg_error *err);

/* Keep every line read from now on, so that vg_lines_rewind can go back
 * to the start (a reader that looks at the first lines before its real
 * pass: a pipe can be read only once). Call before the first line. */
VG_INTERNAL void vg_lines_keep(vg_lines *lr);

/* Read again from the first line (after vg_lines_keep); stops keeping. */
VG_INTERNAL void vg_lines_rewind(vg_lines *lr);

/* Line number of the line last returned (1-based). */
VG_INTERNAL uint64_t vg_lines_number(const vg_lines *lr);

/* 1 if the input was gzip-compressed. */
VG_INTERNAL int vg_lines_gzip(const vg_lines *lr);

/* 1 if any line so far ended in "\r\n". */
VG_INTERNAL int vg_lines_saw_crlf(const vg_lines *lr);

/* 1 if the file started with a UTF-8 byte order mark. */
VG_INTERNAL int vg_lines_saw_bom(const vg_lines *lr);

/* After the last line: the sha256 of the stored bytes (lower-case hex)
 * and in *bytes their count. */
VG_INTERNAL const char *vg_lines_sha256(vg_lines *lr, uint64_t *bytes);

VG_INTERNAL const char *vg_lines_path(const vg_lines *lr);

VG_INTERNAL void vg_lines_close(vg_lines *lr);

#endif /* VG_LINES_H */
