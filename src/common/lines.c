/* lines.c - buffered, gzip-transparent line reading.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "lines.h"

#include <stdatomic.h>
#include <string.h>

#include "alloc.h"
#include "infile.h"
#include "vecgauge/suite.h"
#include "vecgauge/vg_config.h"

struct vg_lines {
    vg_instream *in;
    char *buf;          /* holds [start, end) unread bytes */
    size_t cap, start, end;
    char *copy;         /* while keeping: the line handed out */
    size_t copy_cap;
    uint64_t lineno;
    int eof, crlf, bom, first, keep, bom_inside_error;
};

_Thread_local uint64_t vg_lines_suite_limit;
static _Atomic uint64_t suite_default = VG_MAX_SUITE_BYTES;

void vg_suite_set_max_bytes(uint64_t n) { atomic_store(&suite_default, n ? n : VG_MAX_SUITE_BYTES); }
uint64_t vg_suite_max_bytes(void) { return atomic_load(&suite_default); }

vg_status vg_lines_open_opts(const char *path, const vg_lines_opts *o, vg_lines **out,
                             vg_error *err) {
    *out = NULL;
    vg_lines *lr = vg_calloc(1, sizeof *lr);
    if (!lr) return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory opening file");
    lr->cap = 1 << 16;
    lr->buf = vg_malloc(lr->cap + 1);
    if (!lr->buf) {
        vg_lines_close(lr);
        return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory opening file");
    }
    vg_status st = vg_instream_open(path, (o->regular_only ? 0 : VG_IN_PIPE) | VG_IN_HASH,
                                    o->max_bytes, o->limit_hint, &lr->in, err);
    if (st != VG_OK) {
        vg_lines_close(lr);
        return st;
    }
    lr->first = 1;
    lr->bom_inside_error = o->bom_inside_error;
    *out = lr;
    return VG_OK;
}

vg_status vg_lines_open(const char *path, vg_lines **out, vg_error *err) {
    vg_lines_opts o = {vg_lines_suite_limit ? vg_lines_suite_limit : vg_suite_max_bytes(),
                       vg_lines_suite_limit ? "the limit given for this download"
                                            : "far more than any suite file holds",
                       0, 1};
    return vg_lines_open_opts(path, &o, out, err);
}

/* Read more bytes after [start, end), moving (unless keeping) or growing
 * the buffer. */
static int fill(vg_lines *lr, vg_error *err) {
    if (lr->start > 0 && !lr->keep) {
        memmove(lr->buf, lr->buf + lr->start, lr->end - lr->start);
        lr->end -= lr->start;
        lr->start = 0;
    }
    if (lr->end == lr->cap) {
        /* The line being read fills what is unread: too long? */
        if (lr->end - lr->start > VG_MAX_LINE) {
            vg_error_set(err, VG_ELIMIT, vg_instream_path(lr->in), lr->lineno + 1,
                         "line longer than %u bytes", (unsigned)VG_MAX_LINE);
            return -1;
        }
        size_t ncap = lr->cap * 2;
        char *nb = vg_realloc(lr->buf, ncap + 1);
        if (!nb) {
            vg_error_set(err, VG_ENOMEM, vg_instream_path(lr->in), lr->lineno + 1,
                         "out of memory reading line");
            return -1;
        }
        lr->buf = nb;
        lr->cap = ncap;
    }
    long n = vg_instream_read(lr->in, lr->buf + lr->end, lr->cap - lr->end, err);
    if (n < 0) {
        if (err->line == 0) err->line = lr->lineno + 1;
        return -1;
    }
    if (n == 0) lr->eof = 1;
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
            const char *path = vg_instream_path(lr->in);
            if (n > VG_MAX_LINE) {
                vg_error_set(err, VG_ELIMIT, path, lr->lineno + 1, "line longer than %u bytes",
                             (unsigned)VG_MAX_LINE);
                return -1;
            }
            lr->start += nl ? n + 1 : n;
            lr->lineno++;
            if (n > 0 && s[n - 1] == '\r') {
                n--;
                lr->crlf = 1;
            }
            if (lr->keep) {
                /* The kept bytes stay as read, for the rewind: hand out
                 * a copy. */
                if (vg_grow((void **)&lr->copy, &lr->copy_cap, n + 1, 1) != 0) {
                    vg_error_set(err, VG_ENOMEM, path, lr->lineno, "out of memory reading line");
                    return -1;
                }
                memcpy(lr->copy, s, n);
                s = lr->copy;
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
            if (lr->bom_inside_error) {
                const char *b = memmem(s, n, "\xEF\xBB\xBF", 3);
                if (b) {
                    vg_error_set(err, VG_EFORMAT, path, lr->lineno,
                                 "a byte order mark (U+FEFF) inside the file, at byte %zu of the "
                                 "line (files joined with cat?); only a file's first bytes may "
                                 "hold one",
                                 (size_t)(b - s) + 1);
                    err->column = (uint64_t)(b - s) + 1;
                    return -1;
                }
            }
            *line = s;
            *len = n;
            return 1;
        }
        if (lr->eof) return 0;
        if (fill(lr, err) != 0) return -1;
    }
}

void vg_lines_keep(vg_lines *lr) { lr->keep = 1; }

void vg_lines_rewind(vg_lines *lr) {
    lr->keep = 0;
    lr->start = 0;
    lr->lineno = 0;
    lr->first = 1;
    lr->crlf = lr->bom = 0;
}

uint64_t vg_lines_number(const vg_lines *lr) { return lr->lineno; }
int vg_lines_gzip(const vg_lines *lr) { return vg_instream_gzip(lr->in); }
int vg_lines_saw_crlf(const vg_lines *lr) { return lr->crlf; }
int vg_lines_saw_bom(const vg_lines *lr) { return lr->bom; }
const char *vg_lines_path(const vg_lines *lr) { return vg_instream_path(lr->in); }

const char *vg_lines_sha256(vg_lines *lr, uint64_t *bytes) {
    return vg_instream_sha256(lr->in, bytes);
}

void vg_lines_close(vg_lines *lr) {
    if (!lr) return;
    vg_instream_close(lr->in);
    vg_free(lr->buf);
    vg_free(lr->copy);
    vg_free(lr);
}
