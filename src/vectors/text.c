/* text.c - the text layouts: "word v1 ... vD" rows, with or without a
 * "count dims" first line.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <errno.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/lines.h"
#include "vectors_impl.h"

#define IS_BLANK(c) ((c) == ' ' || (c) == '\t')

/* Split line into blank-separated fields (offsets into line). Returns the
 * number of fields, or -1 when out of memory. */
static long split_fields(const char *line, size_t len, size_t **starts, size_t **ends,
                         size_t *cap) {
    long n = 0;
    size_t i = 0;
    while (i < len) {
        while (i < len && IS_BLANK(line[i])) i++;
        if (i >= len) break;
        size_t b = i;
        while (i < len && !IS_BLANK(line[i])) i++;
        if ((size_t)n + 1 > *cap) {
            size_t c1 = *cap, c2 = *cap;
            if (vg_grow((void **)starts, &c1, (size_t)n + 1, sizeof **starts) != 0 ||
                vg_grow((void **)ends, &c2, (size_t)n + 1, sizeof **ends) != 0)
                return -1;
            *cap = c1 < c2 ? c1 : c2;
        }
        (*starts)[n] = b;
        (*ends)[n] = i;
        n++;
    }
    return n;
}

/* Parse a whole field as a finite float. 0 on success, -1 if not a number,
 * -2 if NaN or infinite. */
static int parse_float(const char *s, size_t n, float *out) {
    char buf[64];
    if (n == 0 || n >= sizeof buf) return -1;
    memcpy(buf, s, n);
    buf[n] = '\0';
    char *end;
    errno = 0;
    float f = strtof(buf, &end);
    if (end != buf + n) return -1;
    if (!isfinite(f)) return -2;
    *out = f;
    return 0;
}

static int parse_size(const char *s, size_t n, size_t *out) {
    if (n == 0 || n > 19) return -1;
    size_t v = 0;
    for (size_t i = 0; i < n; i++) {
        if (s[i] < '0' || s[i] > '9') return -1;
        v = v * 10 + (size_t)(s[i] - '0');
    }
    *out = v;
    return 0;
}

typedef struct text_state {
    size_t *starts, *ends, cap;
    float *vals;
} text_state;

/* Parse one data row. Returns VG_OK and fills *wlen/vals, or an error
 * status with *err filled (the caller decides whether to skip it). */
static vg_status parse_row(text_state *ts, const char *line, size_t len, size_t dims,
                           const char *path, uint64_t lineno, size_t *wlen, int *spaced,
                           vg_error *err) {
    long nf = split_fields(line, len, &ts->starts, &ts->ends, &ts->cap);
    if (nf < 0) return vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
    if ((size_t)nf < dims + 1)
        return vg_error_set(err, VG_EFORMAT, path, lineno,
                            "expected a word and %zu values, found %ld field%s", dims, nf,
                            nf == 1 ? "" : "s");
    /* A word holding spaces: the last dims fields are the vector and
     * everything before them the word (common practice). */
    size_t first_val = (size_t)nf - dims;
    *spaced = first_val > 1;
    *wlen = ts->ends[first_val - 1] - ts->starts[0];
    for (size_t j = 0; j < dims; j++) {
        size_t f = first_val + j;
        int rc = parse_float(line + ts->starts[f], ts->ends[f] - ts->starts[f], &ts->vals[j]);
        if (rc != 0) {
            int n = (int)VG_MIN(ts->ends[f] - ts->starts[f], 40);
            vg_status st = vg_error_set(err, VG_EVALUE, path, lineno,
                                        rc == -2 ? "value %zu is not finite: '%.*s'"
                                                 : "value %zu is not a number: '%.*s'",
                                        j + 1, n, line + ts->starts[f]);
            err->column = f + 1;
            return st;
        }
    }
    return VG_OK;
}

vg_status vg_read_text(const char *path, const vg_load_options *opt, vg_vectors **out,
                       vg_error *err) {
    *out = NULL;
    vg_lines *lr = NULL;
    vg_vectors *v = NULL;
    text_state ts = {0};
    vg_status st = vg_lines_open(path, &lr, err);
    if (st != VG_OK) return st;

    char *line;
    size_t len;
    int rc = vg_lines_next(lr, &line, &len, err);
    if (rc < 0) {
        st = err->code;
        goto done;
    }
    if (rc == 0) {
        st = vg_error_set(err, VG_EFORMAT, path, 1, "empty file: expected word vectors");
        goto done;
    }

    /* A first line of exactly two integers may be the "count dims" header;
     * it is one only if the layout says so or the next row has a word and
     * exactly dims values (else "2 3" would be a 1-dim row for word "2"). */
    size_t header_count = 0, header_dims = 0;
    long nf = split_fields(line, len, &ts.starts, &ts.ends, &ts.cap);
    if (nf < 0) {
        st = vg_error_set(err, VG_ENOMEM, path, 1, "out of memory");
        goto done;
    }
    int has_header = 0;
    if (nf == 2 && parse_size(line + ts.starts[0], ts.ends[0] - ts.starts[0], &header_count) == 0 &&
        parse_size(line + ts.starts[1], ts.ends[1] - ts.starts[1], &header_dims) == 0 &&
        header_dims > 0)
        has_header = opt->layout != VG_LAYOUT_TEXT_PLAIN;
    if (opt->layout == VG_LAYOUT_TEXT_HEADER && !has_header) {
        st = vg_error_set(err, VG_EFORMAT, path, 1,
                          "expected a 'count dims' header line, found %ld field%s", nf,
                          nf == 1 ? "" : "s");
        goto done;
    }

    size_t dims = has_header ? header_dims : (nf > 1 ? (size_t)nf - 1 : 0);
    if (dims == 0) {
        st = vg_error_set(err, VG_EFORMAT, path, 1,
                          "expected a word followed by numbers, found a single field");
        goto done;
    }
    st = vg_vecbuild_begin(dims, has_header ? header_count : 0, opt, &v, err);
    if (st != VG_OK) {
        if (err->path[0] == '\0') snprintf(err->path, sizeof err->path, "%s", path);
        if (!err->line) err->line = 1;
        goto done;
    }
    ts.vals = vg_calloc(dims, sizeof(float));
    if (!ts.vals) {
        st = vg_error_set(err, VG_ENOMEM, path, 1, "out of memory");
        goto done;
    }
    v->info.layout = has_header ? VG_LAYOUT_TEXT_HEADER : VG_LAYOUT_TEXT_PLAIN;
    v->info.header_rows = header_count;
    snprintf(v->info.detected_because, sizeof v->info.detected_because,
             has_header ? "first line holds two integers (count %zu, dims %zu)"
                        : "first line is a word and %zu numbers (no header)",
             has_header ? header_count : dims, dims);

    int pending = !has_header; /* the first line is already a row */
    for (;;) {
        if (opt->max_words && v->info.rows_read + v->info.bad_rows >= opt->max_words) break;
        if (!pending) {
            rc = vg_lines_next(lr, &line, &len, err);
            if (rc < 0) {
                st = err->code;
                goto done;
            }
            if (rc == 0) break;
        }
        pending = 0;
        uint64_t lineno = vg_lines_number(lr);
        if (len == 0 || strspn(line, " \t") == len) continue; /* blank line */
        size_t wlen = 0;
        int spaced = 0;
        vg_error row_err;
        vg_error_clear(&row_err);
        st = parse_row(&ts, line, len, dims, path, lineno, &wlen, &spaced, &row_err);
        if (st == VG_EFORMAT || st == VG_EVALUE) {
            if (opt->skip_bad_rows) {
                v->info.bad_rows++;
                st = VG_OK;
                continue;
            }
            *err = row_err;
            goto done;
        }
        if (st != VG_OK) {
            *err = row_err;
            goto done;
        }
        if (spaced) v->info.words_with_spaces++;
        st = vg_vecbuild_push(v, line + ts.starts[0], wlen, ts.vals, path, lineno, err);
        if (st != VG_OK) goto done;
    }

    v->info.gzip = vg_lines_gzip(lr);
    size_t present = v->info.rows_read + v->info.bad_rows;
    if (has_header && !opt->allow_short && present != header_count &&
        !(opt->max_words && present >= opt->max_words)) {
        st = vg_error_set(err, VG_ETRUNCATED, path, vg_lines_number(lr),
                          "header promises %zu rows but the file has %zu "
                          "(truncated download? --allow-short accepts it)",
                          header_count, present);
        goto done;
    }
    st = vg_vecbuild_finish(v, err);

done:
    vg_lines_close(lr);
    vg_free(ts.starts);
    vg_free(ts.ends);
    vg_free(ts.vals);
    if (st != VG_OK) {
        vg_vectors_free(v);
        return st;
    }
    *out = v;
    return VG_OK;
}
