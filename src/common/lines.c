/* lines.c - buffered, gzip-transparent line reading.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "lines.h"

#include <errno.h>
#include <string.h>
#include <zlib.h>

#include "alloc.h"
#include "vecgauge/vg_config.h"

struct vg_lines {
    gzFile gz;
    char *path;
    char *buf;          /* holds [start, end) unread bytes */
    size_t cap, start, end;
    uint64_t lineno;
    int eof, gzip, gzip_known, crlf, bom, first;
};

vg_status vg_lines_open(const char *path, vg_lines **out, vg_error *err) {
    *out = NULL;
    vg_lines *lr = vg_calloc(1, sizeof *lr);
    if (!lr) return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory opening file");
    lr->path = vg_strdup(path);
    lr->cap = 1 << 16;
    lr->buf = vg_malloc(lr->cap + 1);
    if (!lr->path || !lr->buf) {
        vg_lines_close(lr);
        return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory opening file");
    }
    errno = 0;
    lr->gz = gzopen(path, "rb");
    if (!lr->gz) {
        vg_lines_close(lr);
        return vg_error_set(err, VG_EIO, path, 0, "cannot open");
    }
    gzbuffer(lr->gz, 1 << 17);
    lr->first = 1;
    *out = lr;
    return VG_OK;
}

/* Read more bytes after [start, end), moving or growing the buffer. */
static int fill(vg_lines *lr, vg_error *err) {
    if (lr->start > 0) {
        memmove(lr->buf, lr->buf + lr->start, lr->end - lr->start);
        lr->end -= lr->start;
        lr->start = 0;
    }
    if (lr->end == lr->cap) {
        if (lr->cap >= VG_MAX_LINE) {
            vg_error_set(err, VG_ELIMIT, lr->path, lr->lineno + 1,
                         "line longer than %u bytes", (unsigned)VG_MAX_LINE);
            return -1;
        }
        size_t ncap = lr->cap * 2;
        char *nb = vg_realloc(lr->buf, ncap + 1);
        if (!nb) {
            vg_error_set(err, VG_ENOMEM, lr->path, lr->lineno + 1, "out of memory reading line");
            return -1;
        }
        lr->buf = nb;
        lr->cap = ncap;
    }
    int n = gzread(lr->gz, lr->buf + lr->end, (unsigned)(lr->cap - lr->end));
    if (n < 0) {
        int zerr = 0;
        const char *msg = gzerror(lr->gz, &zerr);
        vg_error_set(err, zerr == Z_ERRNO ? VG_EIO : VG_EFORMAT, lr->path, lr->lineno + 1,
                     "read failed: %s", msg ? msg : "unknown zlib error");
        return -1;
    }
    if (n == 0) {
        /* gzread returns 0 both at a clean end and on a truncated stream;
         * only gzerror tells them apart. */
        int zerr = 0;
        const char *msg = gzerror(lr->gz, &zerr);
        if (zerr != Z_OK && zerr != Z_BUF_ERROR) {
            vg_error_set(err, VG_EFORMAT, lr->path, lr->lineno + 1, "corrupt gzip stream: %s",
                         msg ? msg : "unknown zlib error");
            return -1;
        }
        if (zerr == Z_BUF_ERROR) {
            vg_error_set(err, VG_ETRUNCATED, lr->path, lr->lineno + 1,
                         "gzip stream ends early (truncated download?)");
            return -1;
        }
        lr->eof = 1;
    }
    if (!lr->gzip_known) {
        /* gzdirect is only meaningful once the first bytes were read. */
        lr->gzip = !gzdirect(lr->gz);
        lr->gzip_known = 1;
    }
    lr->end += (size_t)n;
    return 0;
}

int vg_lines_next(vg_lines *lr, char **line, size_t *len, vg_error *err) {
    for (;;) {
        char *s = lr->buf + lr->start;
        size_t avail = lr->end - lr->start;
        char *nl = avail ? memchr(s, '\n', avail) : NULL;
        if (nl || (lr->eof && avail > 0)) {
            size_t n = nl ? (size_t)(nl - s) : avail;
            lr->start += nl ? n + 1 : n;
            if (n > 0 && s[n - 1] == '\r') {
                n--;
                lr->crlf = 1;
            }
            s[n] = '\0';
            if (lr->first) {
                lr->first = 0;
                if (n >= 3 && memcmp(s, "\xEF\xBB\xBF", 3) == 0) {
                    s += 3;
                    n -= 3;
                    lr->bom = 1;
                }
            }
            lr->lineno++;
            if (n > VG_MAX_LINE) {
                vg_error_set(err, VG_ELIMIT, lr->path, lr->lineno, "line longer than %u bytes",
                             (unsigned)VG_MAX_LINE);
                return -1;
            }
            *line = s;
            *len = n;
            return 1;
        }
        if (lr->eof) return 0;
        if (fill(lr, err) != 0) return -1;
    }
}

uint64_t vg_lines_number(const vg_lines *lr) { return lr->lineno; }
int vg_lines_gzip(const vg_lines *lr) { return lr->gzip; }
int vg_lines_saw_crlf(const vg_lines *lr) { return lr->crlf; }
int vg_lines_saw_bom(const vg_lines *lr) { return lr->bom; }

void vg_lines_close(vg_lines *lr) {
    if (!lr) return;
    if (lr->gz) gzclose(lr->gz);
    vg_free(lr->buf);
    vg_free(lr->path);
    vg_free(lr);
}
