/* error.c - filling and formatting vg_error records.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Only fixed buffers and vsnprintf: building an error message can never
 * fail, not even when memory is exhausted.
 */
#include "vecgauge/error.h"

#include <errno.h>
#include <stdarg.h>
#include <stdio.h>
#include <string.h>

void vg_error_clear(vg_error *err) {
    if (err) memset(err, 0, sizeof *err);
}

static void copy_trunc(char *dst, size_t size, const char *src) {
    size_t n = strlen(src);
    if (n >= size) {
        /* Keep the end of a long path: the file name matters most. */
        const char *tail = src + n - (size - 4);
        snprintf(dst, size, "...%s", tail);
    } else {
        memcpy(dst, src, n + 1);
    }
}

static vg_status vset(vg_error *err, vg_status code, const char *path, uint64_t line,
                      const char *src_file, int src_line, const char *fmt, va_list ap) {
    if (!err) return code;
    int saved_errno = errno;
    err->code = code;
    err->sys_errno = code == VG_EIO ? saved_errno : 0;
    err->path[0] = '\0';
    if (path) copy_trunc(err->path, sizeof err->path, path);
    err->line = line;
    err->column = 0;
    err->src_file = src_file;
    err->src_line = src_line;
    vsnprintf(err->message, sizeof err->message, fmt, ap);
    return code;
}

vg_status vg_error_set(vg_error *err, vg_status code, const char *path, uint64_t line,
                       const char *fmt, ...) {
    va_list ap;
    va_start(ap, fmt);
    vset(err, code, path, line, NULL, 0, fmt, ap);
    va_end(ap);
    return code;
}

vg_status vg_error_set_at(vg_error *err, vg_status code, const char *path, uint64_t line,
                          const char *src_file, int src_line, const char *fmt, ...) {
    va_list ap;
    va_start(ap, fmt);
    vset(err, code, path, line, src_file, src_line, fmt, ap);
    va_end(ap);
    return code;
}

void vg_error_prefix(vg_error *err, const char *fmt, ...) {
    if (!err) return;
    char prefix[VG_ERROR_MSG_MAX];
    char old[VG_ERROR_MSG_MAX];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(prefix, sizeof prefix, fmt, ap);
    va_end(ap);
    memcpy(old, err->message, sizeof old);
    size_t pl = strlen(prefix), ol = strlen(old);
    if (pl > sizeof err->message - 1) pl = sizeof err->message - 1;
    if (ol > sizeof err->message - 1 - pl) ol = sizeof err->message - 1 - pl;
    memcpy(err->message, prefix, pl);
    memcpy(err->message + pl, old, ol);
    err->message[pl + ol] = '\0';
}

/* Length of the valid UTF-8 sequence at s (n bytes left) that is not a
 * C1 control, or 0. */
static size_t utf8_printable(const unsigned char *s, size_t n) {
    unsigned c = s[0];
    size_t len;
    unsigned cp;
    if (c >= 0xC2 && c <= 0xDF) len = 2, cp = c & 0x1F;
    else if (c >= 0xE0 && c <= 0xEF) len = 3, cp = c & 0x0F;
    else if (c >= 0xF0 && c <= 0xF4) len = 4, cp = c & 0x07;
    else return 0;
    if (n < len) return 0;
    for (size_t i = 1; i < len; i++) {
        if ((s[i] & 0xC0) != 0x80) return 0;
        cp = (cp << 6) | (s[i] & 0x3F);
    }
    /* Overlong forms, surrogates, beyond U+10FFFF, and C1 controls (a
     * terminal may take U+009B as CSI). */
    if ((len == 3 && cp < 0x800) || (len == 4 && cp < 0x10000) || (cp >= 0xD800 && cp <= 0xDFFF) ||
        cp > 0x10FFFF || cp < 0xA0)
        return 0;
    return len;
}

char *vg_escape_text(const char *s, char *buf, size_t size) {
    if (!buf || size == 0) return buf;
    size_t o = 0;
    const unsigned char *p = (const unsigned char *)(s ? s : "");
    size_t n = strlen((const char *)p);
    for (size_t i = 0; i < n;) {
        unsigned c = p[i];
        char esc[8];
        const char *piece;
        size_t len;
        if (c >= 0x20 && c < 0x7F) {
            piece = (const char *)p + i;
            len = 1;
            i++;
        } else if (c >= 0x80 && (len = utf8_printable(p + i, n - i)) > 0) {
            piece = (const char *)p + i;
            i += len;
        } else {
            if (c == '\n') memcpy(esc, "\\n", 3);
            else if (c == '\t') memcpy(esc, "\\t", 3);
            else if (c == '\r') memcpy(esc, "\\r", 3);
            else snprintf(esc, sizeof esc, "\\x%02x", c);
            piece = esc;
            len = c == '\n' || c == '\t' || c == '\r' ? 2 : 4;
            i++;
        }
        if (o + len >= size) break;
        memcpy(buf + o, piece, len);
        o += len;
    }
    buf[o] = '\0';
    return buf;
}

char *vg_error_format(const vg_error *err, char *buf, size_t size) {
    if (!buf || size == 0) return buf;
    buf[0] = '\0';
    if (!err) return buf;
    /* Escaped copies: the path and message may hold a file's bytes. */
    char path[VG_ERROR_PATH_MAX * 4], message[VG_ERROR_MSG_MAX * 4];
    vg_escape_text(err->path, path, sizeof path);
    vg_escape_text(err->message, message, sizeof message);
    size_t off = 0;
    int n;
#define APPEND(...)                                                           \
    do {                                                                      \
        if (off < size) {                                                     \
            n = snprintf(buf + off, size - off, __VA_ARGS__);                 \
            if (n > 0) off += (size_t)n;                                      \
        }                                                                     \
    } while (0)
    if (path[0]) {
        APPEND("%s", path);
        if (err->line) APPEND(":%llu", (unsigned long long)err->line);
        if (err->line && err->column) APPEND(":%llu", (unsigned long long)err->column);
        APPEND(": ");
    }
    APPEND("%s", message[0] ? message : vg_status_name(err->code));
    if (err->code == VG_EIO && err->sys_errno) APPEND(" (%s)", strerror(err->sys_errno));
#undef APPEND
    return buf;
}

const char *vg_status_name(vg_status code) {
    switch (code) {
    case VG_OK: return "ok";
    case VG_ENOMEM: return "out of memory";
    case VG_EIO: return "i/o error";
    case VG_EFORMAT: return "format error";
    case VG_EVALUE: return "bad value";
    case VG_ETRUNCATED: return "truncated";
    case VG_ELIMIT: return "limit exceeded";
    case VG_EINVAL: return "invalid argument";
    case VG_ENOTFOUND: return "not found";
    case VG_EHASH: return "hash mismatch";
    case VG_ENET: return "download failed";
    case VG_EINTERRUPTED: return "interrupted";
    case VG_EUNSUPPORTED: return "unsupported";
    case VG_EINTERNAL: return "internal error";
    }
    return "unknown status";
}
