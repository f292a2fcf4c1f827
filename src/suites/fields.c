/* fields.c - field splitting for suite files.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "fields.h"

#include <csv.h>
#include <errno.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "../common/alloc.h"

static void add_field(vg_fields *f, const char *s, size_t n) {
    if (f->oom) return;
    size_t need;
    if (vg_add_overflow(f->buf_used, n + 1, &need) ||
        vg_grow((void **)&f->buf, &f->buf_cap, need, 1) != 0) {
        f->oom = 1;
        return;
    }
    size_t c1 = f->cap, c2 = f->cap;
    if (vg_grow((void **)&f->field, &c1, f->n + 1, sizeof *f->field) != 0 ||
        vg_grow((void **)&f->flen, &c2, f->n + 1, sizeof *f->flen) != 0) {
        f->oom = 1;
        return;
    }
    f->cap = c1 < c2 ? c1 : c2;
    memcpy(f->buf + f->buf_used, s, n);
    f->buf[f->buf_used + n] = '\0';
    /* Store offsets now; buf may move on a later grow. */
    f->field[f->n] = (char *)(uintptr_t)f->buf_used;
    f->flen[f->n] = n;
    f->buf_used += n + 1;
    f->n++;
}

static void csv_field_cb(void *s, size_t n, void *data) {
    add_field(data, s ? s : "", s ? n : 0);
}

static void csv_row_cb(int c, void *data) {
    (void)c;
    (void)data;
}

/* libcsv treats spaces and tabs around fields as padding by default; a
 * tab-separated file must keep tabs as delimiters, so only spaces pad. */
static int is_space_only(unsigned char c) { return c == ' '; }

/* 1 if some field of line starts (after padding spaces) with '"'. */
static int opens_quote(const char *line, size_t len, char delim) {
    int at_start = 1;
    for (size_t i = 0; i < len; i++) {
        char c = line[i];
        if (c == delim) {
            at_start = 1;
        } else if (c == '"' && at_start) {
            return 1;
        } else if (c != ' ') {
            at_start = 0;
        }
    }
    return 0;
}

vg_status vg_fields_split(vg_fields *f, const char *line, size_t len, char delim,
                          const char *path, uint64_t lineno, vg_error *err) {
    f->n = 0;
    f->buf_used = 0;
    f->oom = 0;
    if (delim == ' ') {
        size_t i = 0;
        while (i < len) {
            while (i < len && (line[i] == ' ' || line[i] == '\t')) i++;
            if (i >= len) break;
            size_t b = i;
            while (i < len && line[i] != ' ' && line[i] != '\t') i++;
            add_field(f, line + b, i - b);
        }
    } else if (!opens_quote(line, len, delim)) {
        /* No field starts with a double quote: nothing for libcsv to
         * unquote, and a quote inside a word (12" or a stray one) stays
         * literal instead of being a parse error. */
        size_t b = 0;
        for (size_t i = 0; i <= len; i++) {
            if (i == len || line[i] == delim) {
                size_t e = i;
                while (b < e && line[b] == ' ') b++;
                while (e > b && line[e - 1] == ' ') e--;
                add_field(f, line + b, e - b);
                b = i + 1;
            }
        }
        while (f->n > 0 && f->flen[f->n - 1] == 0) f->n--;
    } else {
        if (!f->csv) {
            f->csv = vg_malloc(sizeof(struct csv_parser));
            if (!f->csv || csv_init(f->csv, CSV_STRICT | CSV_STRICT_FINI) != 0) {
                vg_free(f->csv);
                f->csv = NULL;
                return vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
            }
            csv_set_space_func(f->csv, is_space_only);
        }
        struct csv_parser *p = f->csv;
        csv_set_delim(p, (unsigned char)delim);
        if (csv_parse(p, line, len, csv_field_cb, csv_row_cb, f) != len ||
            csv_fini(p, csv_field_cb, csv_row_cb, f) != 0) {
            int code = csv_error(p);
            const char *why = code == CSV_EPARSE ? "a quote inside a field, or a quoted field not closed"
                                                 : csv_strerror(code);
            /* Reset the parser for the next line after a failure. */
            csv_free(p);
            vg_free(f->csv);
            f->csv = NULL;
            return vg_error_set(err, VG_EFORMAT, path, lineno, "malformed quoted field: %s",
                                why ? why : "unknown");
        }
        /* A trailing delimiter (a stray tab at the end of a line) makes an
         * empty last field; it is not data. */
        while (f->n > 0 && f->flen[f->n - 1] == 0) f->n--;
    }
    if (f->oom) return vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
    for (size_t i = 0; i < f->n; i++) f->field[i] = f->buf + (uintptr_t)f->field[i];
    return VG_OK;
}

void vg_fields_free(vg_fields *f) {
    if (f->csv) {
        csv_free(f->csv);
        vg_free(f->csv);
    }
    vg_free(f->field);
    vg_free(f->flen);
    vg_free(f->buf);
    memset(f, 0, sizeof *f);
}

int vg_parse_double(const char *s, size_t n, double *out) {
    char buf[64];
    while (n > 0 && (*s == ' ' || *s == '\t')) s++, n--;
    while (n > 0 && (s[n - 1] == ' ' || s[n - 1] == '\t')) n--;
    if (n == 0 || n >= sizeof buf) return -1;
    memcpy(buf, s, n);
    buf[n] = '\0';
    /* strtod also reads hexadecimal ("0x10", "0x1p3"): no rating is
     * written so, and 0x10 is not ten. */
    if (memchr(buf, 'x', n) || memchr(buf, 'X', n)) return -1;
    char *end;
    errno = 0;
    double d = strtod(buf, &end);
    if (end != buf + n || !isfinite(d)) return -1;
    /* Digits that are not all zero, read as 0: an exponent beyond any
     * double ("5e-99999"), not a rating. */
    if (d == 0.0) {
        for (size_t i = 0; i < n && (buf[i] | 0x20) != 'e'; i++)
            if (buf[i] >= '1' && buf[i] <= '9') return -1;
    }
    *out = d;
    return 0;
}
