/* lines.h - a line reader for text inputs, gzip-transparent.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Reads plain or gzip-compressed files (zlib detects the magic bytes),
 * strips a UTF-8 BOM from the first line and the '\n' or "\r\n" ending
 * from every line, counts lines from 1, and refuses lines longer than
 * VG_MAX_LINE instead of growing without bound.
 */
#ifndef VG_LINES_H
#define VG_LINES_H

#include <stddef.h>
#include <stdint.h>

#include "internal.h"
#include "vecgauge/error.h"

typedef struct vg_lines vg_lines;

VG_INTERNAL vg_status vg_lines_open(const char *path, vg_lines **out, vg_error *err);

/* Next line: *line points into an internal buffer (valid until the next
 * call), NUL-terminated, without its line ending; *len is its length.
 * Returns 1 for a line, 0 at end of file, -1 on error (err filled). */
VG_INTERNAL int vg_lines_next(vg_lines *lr, char **line, size_t *len, vg_error *err);

/* Line number of the line last returned (1-based). */
VG_INTERNAL uint64_t vg_lines_number(const vg_lines *lr);

/* 1 if the input was gzip-compressed. */
VG_INTERNAL int vg_lines_gzip(const vg_lines *lr);

/* 1 if any line so far ended in "\r\n". */
VG_INTERNAL int vg_lines_saw_crlf(const vg_lines *lr);

/* 1 if the file started with a UTF-8 byte order mark. */
VG_INTERNAL int vg_lines_saw_bom(const vg_lines *lr);

VG_INTERNAL void vg_lines_close(vg_lines *lr);

#endif /* VG_LINES_H */
