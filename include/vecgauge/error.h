/* error.h - status codes and the error record every fallible call fills.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The library never prints and never aborts on bad input: a function that
 * can fail returns a vg_status and, when it fails, fills the caller's
 * vg_error with the input path, the line (and column or field) and a
 * sentence saying what was expected and what was found. The command-line
 * front end decides how to show it.
 */
#ifndef VG_ERROR_H
#define VG_ERROR_H

#include <stddef.h>
#include <stdint.h>

#include "vg_config.h"

#ifdef __cplusplus
extern "C" {
#endif

/* Status codes. VG_OK is zero; every failure is positive. The values are
 * stable and appear in run.json, so only ever append. */
typedef enum vg_status {
    VG_OK = 0,
    VG_ENOMEM = 1,       /* an allocation failed */
    VG_EIO = 2,          /* a file could not be opened, read or written */
    VG_EFORMAT = 3,      /* input does not follow the layout expected */
    VG_EVALUE = 4,       /* a field is not a number, or NaN/Inf, or out of range */
    VG_ETRUNCATED = 5,   /* fewer (or more) rows than a header promised */
    VG_ELIMIT = 6,       /* a size exceeds a documented limit or overflows */
    VG_EINVAL = 7,       /* the caller passed an invalid argument or option */
    VG_ENOTFOUND = 8,    /* a named suite, file or word is not known */
    VG_EHASH = 9,        /* a file's sha256 does not match the pinned value */
    VG_ENET = 10,        /* a download failed */
    VG_EINTERRUPTED = 11,/* stopped by a signal or a callback */
    VG_EUNSUPPORTED = 12,/* a valid input this build cannot handle */
    VG_EINTERNAL = 13    /* a broken invariant: a bug in vecgauge */
} vg_status;

/* The error record. Plain data with fixed buffers so that filling it can
 * never fail, even when memory is exhausted. Zero-initialise it (or call
 * vg_error_clear) before use; functions only write it on failure. */
typedef struct vg_error {
    vg_status code;
    int sys_errno;                   /* errno for VG_EIO, else 0 */
    char path[VG_ERROR_PATH_MAX];    /* input or output path, "" if none */
    uint64_t line;                   /* 1-based line (or row) number, 0 if none */
    uint64_t column;                 /* 1-based column or field, 0 if none */
    char message[VG_ERROR_MSG_MAX];  /* "expected ..., found ..." */
    const char *src_file;            /* vecgauge source location (debug builds) */
    int src_line;
} vg_error;

/* Reset *err to "no error". err may be NULL. */
VG_API void vg_error_clear(vg_error *err);

/* Fill *err and return code. path may be NULL; line and column may be 0.
 * Long paths and messages are truncated, never overflow. err may be NULL,
 * in which case only code is returned. */
VG_API vg_status vg_error_set(vg_error *err, vg_status code, const char *path,
                              uint64_t line, const char *fmt, ...)
    VG_PRINTF(5, 6);

/* Prefix err->message with context, e.g. "in suite ws353: ". Keeps the
 * code, path and line. Used when a lower layer's message needs the caller's
 * view added. */
VG_API void vg_error_prefix(vg_error *err, const char *fmt, ...) VG_PRINTF(2, 3);

/* Write "path:line:column: message" (parts that are absent are left out)
 * into buf, always NUL-terminated, escaped as vg_escape_text does (a word
 * or path from a hostile file cannot drive the terminal). Returns buf. */
VG_API char *vg_error_format(const vg_error *err, char *buf, size_t size);

/* Copy s into buf (size bytes, always NUL-terminated, cut short if need
 * be) with every byte a terminal could act on written as an escape: C0
 * control characters ("\n", "\t", "\x1b"), DEL, the C1 controls
 * U+0080..U+009F and bytes that are not part of valid UTF-8 as "\xNN".
 * Printable UTF-8 is copied as it is. Returns buf. */
VG_API char *vg_escape_text(const char *s, char *buf, size_t size);

/* A short stable name for a status, e.g. "format" for VG_EFORMAT. Never NULL. */
VG_API const char *vg_status_name(vg_status code);

/* Record an error, with the vecgauge source location in debug builds, and
 * return its code: `return VG_FAIL(err, VG_EFORMAT, path, line, "...", ...);` */
#ifdef VG_DEBUG
#define VG_FAIL(err, code, path, line, ...)                                   \
    vg_error_set_at((err), (code), (path), (line), __FILE__, __LINE__,       \
                    __VA_ARGS__)
#else
#define VG_FAIL(err, code, path, line, ...)                                   \
    vg_error_set((err), (code), (path), (line), __VA_ARGS__)
#endif

/* As vg_error_set, also recording the vecgauge source file and line. */
VG_API vg_status vg_error_set_at(vg_error *err, vg_status code, const char *path,
                                 uint64_t line, const char *src_file, int src_line,
                                 const char *fmt, ...) VG_PRINTF(7, 8);

#ifdef __cplusplus
}
#endif

#endif /* VG_ERROR_H */
