/* detect.c - tell the vector layouts apart from a file's first bytes.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The rules, in order (each decision is recorded in words for inspect):
 *  - "\x93NUMPY" at the start is a NumPy array (the format's magic);
 *  - a first line of exactly two integers "count dims" is a header only
 *    if what follows it agrees: text rows of dims values (at least half
 *    of the sampled lines), or else binary rows (word, space, dims
 *    little-endian float32 values whose bytes are not all printable; a
 *    NaN among them is the reader's error to report, not a reason to
 *    guess another layout); when the lines after it hold one
 *    value each, the first line is itself a one-dimensional row;
 *  - anything else is text without a header, its dims the most common
 *    field count (less the word) of the first lines, so that a first row
 *    whose word holds spaces does not decide it.
 * gzip has already been undone by the source when this runs.
 */
#include <string.h>

#include "fastfloat.h"
#include "vectors_impl.h"

/* Lines looked at to decide; enough for a majority, few enough to be
 * instant on 100k-dim rows. */
#define SAMPLE_LINES 16
#define SAMPLE_BINARY_ROWS 4

#define IS_BLANK(c) ((c) == ' ' || (c) == '\t')

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

size_t vg_detect_count_dims(const char *p, size_t n, size_t *count, size_t *dims) {
    size_t i = 0;
    while (i < n && IS_BLANK(p[i])) i++;
    size_t a = i;
    while (i < n && p[i] >= '0' && p[i] <= '9') i++;
    size_t a_end = i;
    if (i == a || i >= n || !IS_BLANK(p[i])) return 0;
    while (i < n && IS_BLANK(p[i])) i++;
    size_t b = i;
    while (i < n && p[i] >= '0' && p[i] <= '9') i++;
    size_t b_end = i;
    if (i == b) return 0;
    while (i < n && (IS_BLANK(p[i]) || p[i] == '\r')) i++;
    if (i < n && p[i] != '\n') return 0;
    if (parse_size(p + a, a_end - a, count) != 0 || parse_size(p + b, b_end - b, dims) != 0)
        return 0;
    return i < n ? i + 1 : i;
}

/* 1 when the first line is two integers, at least one with a '-' ("3
 * -5"): a header written wrong, which would otherwise read as a row of
 * one value and decide the dimension of what follows. */
static int negative_header(const char *p, size_t n) {
    size_t i = 0;
    int neg = 0;
    for (int k = 0; k < 2; k++) {
        while (i < n && IS_BLANK(p[i])) i++;
        if (i < n && (p[i] == '-' || p[i] == '+')) neg |= p[i++] == '-';
        size_t d = i;
        while (i < n && p[i] >= '0' && p[i] <= '9') i++;
        if (i == d) return 0;
        if (k == 0 && !(i < n && IS_BLANK(p[i]))) return 0;
    }
    while (i < n && (IS_BLANK(p[i]) || p[i] == '\r')) i++;
    return neg && (i == n || p[i] == '\n');
}

/* Blank-separated fields of the line [p, e) ('\r' before the end ignored),
 * and in *numeric how many of the last fields, counted back from the end,
 * parse as finite numbers (at most cap). */
static size_t line_fields(const char *p, const char *e, size_t cap, size_t *numeric) {
    if (e > p && e[-1] == '\r') e--;
    size_t nf = 0;
    for (const char *s = p; s < e;) {
        while (s < e && IS_BLANK(*s)) s++;
        if (s >= e) break;
        while (s < e && !IS_BLANK(*s)) s++;
        nf++;
    }
    /* Count the numeric tail from the end. */
    size_t num = 0;
    const char *s = e;
    while (num < cap && s > p) {
        while (s > p && IS_BLANK(s[-1])) s--;
        const char *t = s;
        while (s > p && !IS_BLANK(s[-1])) s--;
        if (s == t) break;
        const char *end;
        float f;
        if (vg_scan_float(s, t, &end, &f) != VG_FLOAT_OK || end != t) break;
        num++;
    }
    *numeric = num;
    return nf;
}

/* Sample up to SAMPLE_LINES complete non-blank lines from [p, p + n);
 * counts[i] = fields of line i. Returns how many were sampled. */
static size_t sample_lines(const char *p, size_t n, int whole, size_t *counts, size_t *numeric,
                           size_t cap) {
    size_t k = 0;
    const char *e = p + n;
    while (p < e && k < SAMPLE_LINES) {
        const char *nl = memchr(p, '\n', (size_t)(e - p));
        if (!nl && !whole) break; /* cut off by the peek: not a sample */
        const char *le = nl ? nl : e;
        size_t num;
        size_t nf = line_fields(p, le, cap, &num);
        if (nf > 0) {
            counts[k] = nf;
            numeric[k] = num;
            k++;
        }
        p = nl ? nl + 1 : e;
    }
    return k;
}

/* Do the bytes at p look like rows of the binary layout (word without
 * line breaks, a space, 4 * dims bytes that are not all text)? Checks up to
 * SAMPLE_BINARY_ROWS rows (fewer when the peek ends); at least one row
 * must be complete. */
static int binary_rows_ok(const char *p, size_t n, size_t dims, size_t rows) {
    size_t want = VG_MIN(rows, (size_t)SAMPLE_BINARY_ROWS);
    size_t seen = 0, i = 0;
    while (seen < want) {
        if (seen > 0 && i < n && p[i] == '\n') i++;
        size_t w = i;
        while (i < n && p[i] != ' ' && i - w <= VG_MAX_WORD) {
            if (p[i] == '\n' || p[i] == '\0') return 0;
            i++;
        }
        if (i >= n) return seen > 0;
        if (i == w || p[i] != ' ') return 0;
        i++;
        if (n - i < dims * 4) return seen > 0;
        /* Text cut off by the peek also "parses" here, its digits read as
         * finite floats; real float bytes are never all printable. */
        size_t printable = 0;
        for (size_t j = 0; j < dims * 4; j++) {
            unsigned char c = (unsigned char)p[i + j];
            printable += (c >= 0x20 && c < 0x7f) || c == '\t' || c == '\r' || c == '\n';
        }
        if (printable == dims * 4) return 0;
        i += dims * 4;
        seen++;
    }
    return 1;
}

/* The most common value of counts[0..k) (the smallest among ties). */
static size_t mode_of(const size_t *counts, size_t k, size_t *freq) {
    size_t best = 0, best_n = 0;
    for (size_t i = 0; i < k; i++) {
        size_t c = 0;
        for (size_t j = 0; j < k; j++) c += counts[j] == counts[i];
        if (c > best_n || (c == best_n && counts[i] < best)) {
            best = counts[i];
            best_n = c;
        }
    }
    *freq = best_n;
    return best;
}

static vg_status plain_text(const char *p, size_t n, int whole, size_t skip, const char *path,
                            vg_detect *d, vg_error *err) {
    d->bom = skip > 0;
    size_t counts[SAMPLE_LINES], numeric[SAMPLE_LINES];
    size_t k = sample_lines(p + skip, n - skip, whole, counts, numeric, VG_MAX_DIMS + 1);
    if (k == 0) {
        /* No complete line in the peek (a huge first row): use the first
         * line's fields as far as they go. */
        const char *nl = memchr(p + skip, '\n', n - skip);
        size_t num;
        counts[0] = line_fields(p + skip, nl ? nl : p + n, VG_MAX_DIMS + 1, &num);
        numeric[0] = num;
        k = counts[0] ? 1 : 0;
        /* One field and no blank in all the bytes looked at: a first word
         * far past the word limit, not a row of one field. */
        if (counts[0] == 1 && !whole && !nl)
            return vg_error_set(err, VG_ELIMIT, path, 1,
                                "line 1 starts with a word of more than %zu bytes (no blank or "
                                "line break in them); the limit is %u",
                                n - skip, (unsigned)VG_MAX_WORD);
    }
    if (k == 0) return vg_error_set(err, VG_EFORMAT, path, 1, "empty file: expected word vectors");
    /* A row's dims: all its fields but the word; for rows whose word holds
     * spaces, fewer than that. The mode over the sample settles it. */
    size_t dimsv[SAMPLE_LINES];
    for (size_t i = 0; i < k; i++) dimsv[i] = counts[i] > 0 ? counts[i] - 1 : 0;
    size_t freq;
    size_t dims = mode_of(dimsv, k, &freq);
    if (dims == 0)
        return vg_error_set(err, VG_EFORMAT, path, 1,
                            "expected a word followed by numbers, found a single field");
    d->layout = VG_LAYOUT_TEXT_PLAIN;
    d->dims = dims;
    d->has_header = 0;
    d->header_rows = 0;
    d->header_bytes = skip;
    snprintf(d->because, sizeof d->because,
             "no 'count dims' first line; %zu of the first %zu rows are a word and %zu numbers", freq,
             k, dims);
    return VG_OK;
}

vg_status vg_detect_layout(const char *p, size_t n, int whole, vg_layout forced, const char *path,
                           vg_detect *d, vg_error *err) {
    memset(d, 0, sizeof *d);
    int npy_magic = n >= 6 && memcmp(p, "\x93NUMPY", 6) == 0;
    if (npy_magic && (forced == VG_LAYOUT_AUTO || forced == VG_LAYOUT_NPY)) {
        d->layout = VG_LAYOUT_NPY;
        snprintf(d->because, sizeof d->because, "starts with the NumPy magic bytes \\x93NUMPY");
        return VG_OK;
    }
    if (forced == VG_LAYOUT_NPY)
        return vg_error_set(err, VG_EFORMAT, path, 0,
                            "expected a NumPy .npy file (starting \\x93NUMPY), found other bytes");
    size_t bom = n >= 3 && memcmp(p, "\xEF\xBB\xBF", 3) == 0 ? 3 : 0;
    if (n == bom) return vg_error_set(err, VG_EFORMAT, path, 1, "empty file: expected word vectors");
    d->bom = bom > 0;
    /* A NUL byte early on: binary data, which only the binary layout
     * (behind its "count dims" line) may hold. */
    size_t count = 0, hdims = 0;
    size_t hb = vg_detect_count_dims(p + bom, n - bom, &count, &hdims);
    if (hb && hdims == 0)
        return vg_error_set(err, VG_EFORMAT, path, 1,
                            "line 1 '%zu 0' reads as a 'count dims' header of 0 dimensions: no "
                            "vectors",
                            count);
    if (!hb && negative_header(p + bom, n - bom))
        return vg_error_set(err, VG_EFORMAT, path, 1,
                            "line 1 holds two integers, one negative: a 'count dims' header "
                            "cannot be negative, and a row of one value whose word is a "
                            "number is not a vector file");
    if (!hb) {
        if (forced == VG_LAYOUT_BINARY || forced == VG_LAYOUT_TEXT_HEADER)
            return vg_error_set(err, VG_EFORMAT, path, 1,
                                "expected a 'count dims' first line (two integers), as layout %s "
                                "requires",
                                vg_layout_name(forced));
        if (memchr(p, '\0', VG_MIN(n, (size_t)4096)))
            return vg_error_set(err, VG_EFORMAT, path, 1,
                                "binary data without a 'count dims' first line: not a vector "
                                "layout vecgauge reads");
        return plain_text(p, n, whole, bom, path, d, err);
    }
    if (hdims > VG_MAX_DIMS)
        return vg_error_set(err, VG_ELIMIT, path, 1, "header claims %zu dimensions; the limit is %u",
                            hdims, (unsigned)VG_MAX_DIMS);
    const char *rest = p + bom + hb;
    size_t rn = n - bom - hb;
    d->dims = hdims;
    d->header_rows = count;
    d->header_bytes = bom + hb;
    d->has_header = 1;
    if (forced == VG_LAYOUT_TEXT_PLAIN) return plain_text(p, n, whole, bom, path, d, err);
    if (forced == VG_LAYOUT_BINARY) {
        d->layout = VG_LAYOUT_BINARY;
        snprintf(d->because, sizeof d->because, "layout given (--format binary)");
        return VG_OK;
    }
    size_t counts[SAMPLE_LINES], numeric[SAMPLE_LINES];
    size_t k = sample_lines(rest, rn, whole, counts, numeric, hdims);
    size_t text_match = 0, one_value = 0;
    for (size_t i = 0; i < k; i++) {
        /* A word and dims numbers (or more fields before them: a word
         * holding spaces). */
        if (counts[i] >= hdims + 1 && numeric[i] == hdims) text_match++;
        if (counts[i] == 2) one_value++;
    }
    if (forced == VG_LAYOUT_TEXT_HEADER || (k == 0 && (whole || rn == 0)) ||
        (text_match > 0 && text_match * 2 >= k)) {
        d->layout = VG_LAYOUT_TEXT_HEADER;
        if (forced == VG_LAYOUT_TEXT_HEADER)
            snprintf(d->because, sizeof d->because, "layout given (--format text-header)");
        else if (k == 0)
            snprintf(d->because, sizeof d->because,
                     "first line is 'count dims' (%zu %zu) and no rows follow", count, hdims);
        else
            snprintf(d->because, sizeof d->because,
                     "first line is 'count dims' (%zu %zu) and %zu of the next %zu lines hold a "
                     "word and %zu numbers",
                     count, hdims, text_match, k, hdims);
        return VG_OK;
    }
    if (binary_rows_ok(rest, rn, hdims, count ? count : 1)) {
        d->layout = VG_LAYOUT_BINARY;
        snprintf(d->because, sizeof d->because,
                 "first line is 'count dims' (%zu %zu) and the bytes after it are binary rows: "
                 "word, space, %zu float32 values",
                 count, hdims, hdims);
        return VG_OK;
    }
    if (k > 0 && one_value * 2 > k) {
        /* "2 3" followed by one-value rows: the first line is a row too. */
        vg_status st = plain_text(p, n, whole, bom, path, d, err);
        if (st == VG_OK)
            snprintf(d->because, sizeof d->because,
                     "first line holds two integers but the rows after it hold one value each, "
                     "so it is a row itself (no header)");
        return st;
    }
    return vg_error_set(err, VG_EFORMAT, path, 2,
                        "line 1 looks like a 'count dims' header (%zu %zu), but what follows is "
                        "neither text rows of %zu values (line 2 has %zu fields) nor binary rows",
                        count, hdims, hdims, k > 0 ? counts[0] : 0);
}
