/* npy.c - NumPy .npy matrices (float32 or float64, either byte order, C
 * or Fortran order, format versions 1.0 to 3.0) with a vocabulary file.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The format, as the NumPy format description (numpy.lib.format, NEP 1)
 * defines it: the magic "\x93NUMPY", a major and a minor version byte, the
 * header's length (2 bytes little-endian in version 1, 4 bytes in 2 and
 * 3), then the header, an ASCII (UTF-8 in version 3) Python dict literal
 * with the keys 'descr', 'fortran_order' and 'shape', padded with spaces
 * and a final '\n'; the data follow, C (row-major) or Fortran
 * (column-major) order.
 *
 * Row-major data are read row by row (straight from the mapping, or from
 * the gzip stream) and only the rows kept are converted. Column-major
 * data need every column before any row is whole: from a mapped file they
 * are transposed in cache-sized blocks; from gzip they are inflated into
 * a temporary buffer first (twice the matrix in memory, for this rare
 * combination only).
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/bigbuf.h"
#include "../common/threads.h"
#include "vectors_impl.h"

/* ---- the header ------------------------------------------------------ */

typedef struct hp {
    const char *p, *e;
} hp;

static void skip_ws(hp *h) {
    while (h->p < h->e && (*h->p == ' ' || *h->p == '\t' || *h->p == '\n' || *h->p == '\r'))
        h->p++;
}

/* A quoted string ('...' or "..."), no escapes (NumPy's keys and dtype
 * strings have none). */
static int parse_str(hp *h, const char **s, size_t *n) {
    skip_ws(h);
    if (h->p >= h->e || (*h->p != '\'' && *h->p != '"')) return -1;
    char q = *h->p++;
    const char *b = h->p;
    while (h->p < h->e && *h->p != q) {
        if (*h->p == '\\') return -1;
        h->p++;
    }
    if (h->p >= h->e) return -1;
    *s = b;
    *n = (size_t)(h->p - b);
    h->p++;
    return 0;
}

static int lit(hp *h, const char *word) {
    skip_ws(h);
    size_t n = strlen(word);
    if ((size_t)(h->e - h->p) < n || memcmp(h->p, word, n) != 0) return -1;
    h->p += n;
    return 0;
}

/* A tuple of non-negative integers, as Python prints it: "(3, 2)",
 * "(5,)", "()"; Python 2 wrote longs as "3L". */
static int parse_shape(hp *h, size_t *dims, size_t *nd, size_t max) {
    if (lit(h, "(") != 0) return -1;
    *nd = 0;
    for (;;) {
        skip_ws(h);
        if (h->p < h->e && *h->p == ')') {
            h->p++;
            return 0;
        }
        if (h->p >= h->e || *h->p < '0' || *h->p > '9') return -1;
        size_t v = 0;
        while (h->p < h->e && *h->p >= '0' && *h->p <= '9') {
            if (vg_mul_overflow(v, 10, &v) || vg_add_overflow(v, (size_t)(*h->p - '0'), &v)) return -1;
            h->p++;
        }
        if (h->p < h->e && *h->p == 'L') h->p++;
        if (*nd < max) dims[*nd] = v;
        (*nd)++;
        skip_ws(h);
        if (h->p < h->e && *h->p == ',') {
            h->p++;
            continue;
        }
        if (h->p < h->e && *h->p == ')') {
            h->p++;
            return 0;
        }
        return -1;
    }
}

vg_status vg_npy_parse_header(const char *p, size_t n, const char *path, vg_npy_header *h,
                              vg_error *err) {
    memset(h, 0, sizeof *h);
    if (n < 10 || memcmp(p, "\x93NUMPY", 6) != 0)
        return vg_error_set(err, VG_EFORMAT, path, 0, "not a NumPy file: no \\x93NUMPY magic");
    h->major = (unsigned char)p[6];
    h->minor = (unsigned char)p[7];
    size_t hlen, start;
    if (h->major == 1) {
        hlen = (size_t)(unsigned char)p[8] | (size_t)(unsigned char)p[9] << 8;
        start = 10;
    } else if (h->major == 2 || h->major == 3) {
        if (n < 12) return vg_error_set(err, VG_EFORMAT, path, 0, "NumPy header cut short");
        hlen = (size_t)(unsigned char)p[8] | (size_t)(unsigned char)p[9] << 8 |
               (size_t)(unsigned char)p[10] << 16 | (size_t)(unsigned char)p[11] << 24;
        start = 12;
    } else {
        return vg_error_set(err, VG_EUNSUPPORTED, path, 0,
                            "NumPy format version %d.%d; versions 1.0 to 3.0 are read", h->major,
                            h->minor);
    }
    if (hlen > n - start)
        return vg_error_set(err, VG_EFORMAT, path, 0,
                            "NumPy header of %zu bytes but the file holds %zu after the magic",
                            hlen, n - start);
    h->data_offset = start + hlen;
    hp x = {p + start, p + start + hlen};
    const char *descr = NULL;
    size_t descr_n = 0;
    int have_fortran = 0, have_shape = 0;
    size_t shape[3], nd = 0;
    if (lit(&x, "{") != 0) goto bad;
    for (;;) {
        skip_ws(&x);
        if (x.p < x.e && *x.p == '}') {
            x.p++;
            break;
        }
        const char *key;
        size_t kn;
        if (parse_str(&x, &key, &kn) != 0 || lit(&x, ":") != 0) goto bad;
        if (kn == 5 && memcmp(key, "descr", 5) == 0) {
            if (parse_str(&x, &descr, &descr_n) != 0) {
                return vg_error_set(err, VG_EUNSUPPORTED, path, 0,
                                    "NumPy array of a structured dtype; float32 or float64 "
                                    "matrices are read");
            }
        } else if (kn == 13 && memcmp(key, "fortran_order", 13) == 0) {
            if (lit(&x, "True") == 0) {
                h->fortran = 1;
            } else if (lit(&x, "False") == 0) {
                h->fortran = 0;
            } else {
                goto bad;
            }
            have_fortran = 1;
        } else if (kn == 5 && memcmp(key, "shape", 5) == 0) {
            if (parse_shape(&x, shape, &nd, 3) != 0) goto bad;
            have_shape = 1;
        } else {
            goto bad;
        }
        skip_ws(&x);
        if (x.p < x.e && *x.p == ',') x.p++;
    }
    skip_ws(&x);
    if (x.p != x.e || !descr || !have_fortran || !have_shape) goto bad;
    /* '<' little-endian, '>' big-endian, '=' native (taken as the
     * little-endian writers that produce it), '|' not applicable. */
    if (descr_n == 3 && (descr[0] == '<' || descr[0] == '>' || descr[0] == '=' || descr[0] == '|') &&
        descr[1] == 'f' && (descr[2] == '4' || descr[2] == '8')) {
        h->big_endian = descr[0] == '>';
        h->item = descr[2] == '4' ? 4 : 8;
    } else {
        return vg_error_set(err, VG_EUNSUPPORTED, path, 0,
                            "NumPy dtype '%.*s'; float32 ('<f4', '>f4') or float64 ('<f8', '>f8') "
                            "is read",
                            (int)VG_MIN(descr_n, (size_t)20), descr);
    }
    if (nd != 2)
        return vg_error_set(err, VG_EUNSUPPORTED, path, 0,
                            "NumPy array of %zu dimension%s; a two-dimensional matrix (rows, dims) "
                            "is read",
                            nd, nd == 1 ? "" : "s");
    h->rows = shape[0];
    h->dims = shape[1];
    size_t bytes;
    if (vg_mul_overflow(h->rows, h->dims, &bytes) || vg_mul_overflow(bytes, h->item, &bytes))
        return vg_error_set(err, VG_ELIMIT, path, 0, "NumPy shape (%zu, %zu) overflows", h->rows,
                            h->dims);
    return VG_OK;
bad:
    return vg_error_set(err, VG_EFORMAT, path, 0,
                        "malformed NumPy header near byte %zu: expected {'descr': ..., "
                        "'fortran_order': ..., 'shape': (...)}",
                        (size_t)(x.p - p));
}

/* ---- conversion ------------------------------------------------------ */

/* n values of the stored type at src into floats. float64 rounds to
 * nearest, as NumPy's astype(float32) does. */
static void convert(float *dst, const char *src, size_t n, const vg_npy_header *h) {
#if defined(__BYTE_ORDER__) && __BYTE_ORDER__ == __ORDER_BIG_ENDIAN__
    int swap = !h->big_endian;
#else
    int swap = h->big_endian;
#endif
    if (h->item == 4) {
        if (!swap) {
            memcpy(dst, src, n * 4);
            return;
        }
        for (size_t j = 0; j < n; j++) {
            uint32_t b;
            memcpy(&b, src + 4 * j, 4);
            b = __builtin_bswap32(b);
            memcpy(&dst[j], &b, 4);
        }
        return;
    }
    for (size_t j = 0; j < n; j++) {
        uint64_t b;
        memcpy(&b, src + 8 * j, 8);
        if (swap) b = __builtin_bswap64(b);
        double x;
        memcpy(&x, &b, 8);
        dst[j] = (float)x;
    }
}

static void conv_npy(float *dst, const char *src, size_t n, const void *ctx) {
    convert(dst, src, n, ctx);
}

typedef struct fill_ctx {
    vg_src *src;
    uint64_t data_offset;
    size_t rb;
} fill_ctx;

/* pread a run of native float32 rows straight into the matrix. */
static vg_status fill_rows(void *ctx, uint64_t first, size_t n, float *dst, vg_error *err) {
    const fill_ctx *f = ctx;
    return vg_src_pread(f->src, dst, n * f->rb, f->data_offset + first * f->rb, err);
}

/* ---- reading --------------------------------------------------------- */

int vg_borrow_check_mode = VG_BORROW_CHECK_AUTO;

/* Row-major data from a mapped file, no filter: batches converted in
 * place by all threads (batch.c). Native float32 rows at a 64-byte
 * aligned offset become the matrix itself (vg_vecbuild_borrow); other
 * native rows are read straight into the matrix with pread (fill)
 * instead of through the mapping. */
static vg_status read_c_mapped(vg_src *src, const char *data, const vg_npy_header *h,
                               const vg_vocab *vc, size_t rows, const vg_load_options *opt,
                               vg_vectors *v, const char *path, int in_place, vg_error *err) {
    size_t rb = h->dims * h->item;
    vg_batch b;
    memset(&b, 0, sizeof b);
    b.v = v;
    b.path = path;
    b.opt = opt;
    b.conv = conv_npy;
    b.conv_ctx = h;
    fill_ctx fc = {src, h->data_offset, rb};
    /* Unhashed, the file's bytes become the matrix: no copy and no fresh
     * memory to touch (2.4 GB in 1.58 s against 3.16 s read into fresh
     * memory on the 2-core VM of make bench, 2026-12-02). Hashed, the
     * single-stream hash is the bottleneck and reads the rows; it went
     * faster from the freshly read copy (1.80 s) than through the
     * mapping (2.09 s), so the rows are read into place. */
    int borrowed = in_place && !opt->compute_hash &&
                   vg_vecbuild_borrow(v, vg_src_file_fd(src), h->data_offset, rows) == 0;
    if (borrowed) {
        /* The rows are in place already; the batches check them. In
         * small folios they check copies (batch.c's check_copied): 2M x
         * 300, just written, medians 0.49 and 0.43 s against 0.85 and
         * 0.77 s in 8 and 10 paired runs; in 2 MiB folios reading the
         * mapping stays faster (0.33 s against 0.39 s), 2026-12-03. A
         * file not cached yet is read in through the mapping advised for
         * huge pages, so it lands in 2 MiB folios and is read that way. */
        b.conv = NULL;
        b.in_matrix = 1;
        int copied = vg_borrow_check_mode == VG_BORROW_CHECK_AUTO
                         ? !vg_vecbuild_borrowed_huge(v)
                         : vg_borrow_check_mode == VG_BORROW_CHECK_COPIED;
        if (copied) {
            b.fill = fill_rows;
            b.fill_ctx = &fc;
        }
    } else if (in_place) {
        b.fill = fill_rows;
        b.fill_ctx = &fc;
        b.hash_src = src;
        vg_src_hash_by_submit(src);
    }
    b.conv_note = " (or beyond float32's range)";
    b.threads = vg_threads_resolve(opt->threads);
    /* 8 MB of rows a batch, and never more rows than the file has. */
    if (vg_batch_alloc(&b, VG_MIN(((size_t)8 << 20) / rb, rows) + 1) != 0)
        return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
    vg_status st = vg_src_start(src, 0, 0, err);
    if (in_place) vg_src_hash_submit(src, data - h->data_offset, h->data_offset); /* the header */
    for (size_t i = 0; i < rows && st == VG_OK; i++) {
        if (b.n == 0 && !in_place) vg_src_willneed(src, h->data_offset + (uint64_t)i * rb, b.cap * rb);
        vg_batch_row *r = &b.rows[b.n++];
        r->word = vc->words[i];
        r->wlen = vc->lens[i];
        r->src = data + i * rb;
        r->file_row = i;
        if (b.n == b.cap || i + 1 == rows) {
            st = vg_batch_run(&b, err);
            if (st == VG_OK) st = vg_src_advance(src, h->data_offset + (uint64_t)(i + 1) * rb, err);
        }
    }
    if (st == VG_OK) st = vg_batch_flush(&b, err);
    if (in_place) vg_src_hash_wait_upto(src, vg_src_hash_submitted(src));
    vg_batch_free(&b);
    return st;
}

static vg_status bad_row(const char *path, size_t row, const char *word, const float *x,
                         size_t dims, vg_error *err) {
    size_t j = 0;
    while (j < dims && isfinite(x[j])) j++;
    return vg_error_set(err, VG_EVALUE, path, 0,
                        "row %zu (word '%.40s'): value %zu is not finite (or beyond float32's "
                        "range)",
                        row + 1, word, j + 1);
}

/* Row-major: rows in order from the stream. */
static vg_status read_c_order(vg_seq *q, const vg_npy_header *h, const vg_vocab *vc, size_t rows,
                              const vg_load_options *opt, vg_vectors *v, const char *path,
                              size_t *cut_at, vg_error *err) {
    size_t dims = h->dims, rb = dims * h->item;
    float *tmp = vg_aligned_alloc(64, dims * sizeof(float));
    if (!tmp) return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
    vg_status st = VG_OK;
    *cut_at = rows;
    for (size_t i = 0; i < rows; i++) {
        vg_rowkey k;
        if (vg_rowkey_make(v, vc->words[i], vc->lens[i], &k) != 0) {
            st = vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
            break;
        }
        int needed = !v->keep_active || v->seen_rows < v->keep_first || k.wanted;
        if (!needed) {
            /* Filtered out: skip its bytes unread, count it as read. */
            uint64_t skipped;
            st = vg_seq_discard(q, rb, &skipped, err);
            if (st == VG_OK && skipped < rb) *cut_at = i;
            float *dst;
            if (st == VG_OK && skipped == rb)
                st = vg_vecbuild_add(v, &k, NAN, &dst, path, 0, err);
            vg_rowkey_clear(&k);
            if (st != VG_OK || *cut_at < rows) break;
            continue;
        }
        size_t got;
        const char *p = vg_seq_peek(q, rb, &got, err);
        if (!p) {
            vg_rowkey_clear(&k);
            st = err->code;
            break;
        }
        if (got < rb) {
            vg_rowkey_clear(&k);
            *cut_at = i;
            break;
        }
        convert(tmp, p, dims, h);
        vg_seq_skip(q, rb, err);
        float norm;
        if (!vg_row_norm_finite(tmp, dims, &norm)) {
            vg_rowkey_clear(&k);
            if (opt->skip_bad_rows) {
                v->info.bad_rows++;
                continue;
            }
            st = bad_row(path, i, vc->words[i], tmp, dims, err);
            break;
        }
        float *dst;
        st = vg_vecbuild_add(v, &k, norm, &dst, path, 0, err);
        vg_rowkey_clear(&k);
        if (st != VG_OK) break;
        if (dst) memcpy(dst, tmp, dims * sizeof(float));
    }
    vg_free(tmp);
    return st;
}

/* Column-major data at base (every column whole): find bad rows column by
 * column, add the rows in order, then transpose in blocks of rows so that
 * the rows being written stay in cache. */
static vg_status read_f_order(const char *base, const vg_npy_header *h, const vg_vocab *vc,
                              size_t rows, const vg_load_options *opt, vg_vectors *v,
                              const char *path, vg_error *err) {
    size_t dims = h->dims, item = h->item, nrows = h->rows;
    unsigned char *bad = vg_calloc(rows ? rows : 1, 1);
    size_t *dest = vg_calloc(rows ? rows : 1, sizeof *dest);
    float *col = vg_malloc(256 * sizeof(float));
    vg_status st = VG_OK;
    if (!bad || !dest || !col) {
        st = vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
        goto done;
    }
    for (size_t j = 0; j < dims; j++) {
        const char *c = base + j * nrows * item;
        for (size_t i0 = 0; i0 < rows; i0 += 256) {
            size_t m = VG_MIN((size_t)256, rows - i0);
            convert(col, c + i0 * item, m, h);
            for (size_t i = 0; i < m; i++) bad[i0 + i] |= !isfinite(col[i]);
        }
    }
    for (size_t i = 0; i < rows; i++) {
        dest[i] = (size_t)-1;
        if (bad[i]) {
            if (opt->skip_bad_rows) {
                v->info.bad_rows++;
                continue;
            }
            float x[1] = {NAN};
            st = bad_row(path, i, vc->words[i], x, 1, err);
            goto done;
        }
        vg_rowkey k;
        if (vg_rowkey_make(v, vc->words[i], vc->lens[i], &k) != 0) {
            st = vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
            goto done;
        }
        float *dst;
        size_t before = v->rows;
        st = vg_vecbuild_add(v, &k, NAN, &dst, path, 0, err);
        vg_rowkey_clear(&k);
        if (st != VG_OK) goto done;
        if (dst) dest[i] = before;
    }
    /* Every row is placed: the matrix no longer moves. */
    for (size_t i0 = 0; i0 < rows; i0 += 64) {
        size_t m = VG_MIN((size_t)64, rows - i0);
        for (size_t j = 0; j < dims; j++) {
            convert(col, base + (j * nrows + i0) * item, m, h);
            for (size_t i = 0; i < m; i++)
                if (dest[i0 + i] != (size_t)-1) v->data[dest[i0 + i] * v->ld + j] = col[i];
        }
    }
done:
    vg_free(bad);
    vg_free(dest);
    vg_free(col);
    return st;
}

vg_status vg_read_npy(vg_src *src, const vg_load_options *opt, vg_vectors **out, vg_error *err) {
    *out = NULL;
    const char *path = vg_src_path(src);
    const char *peek;
    size_t pn;
    int whole;
    vg_status st = vg_src_peek(src, &peek, &pn, &whole, err);
    if (st != VG_OK) return st;
    vg_npy_header h;
    st = vg_npy_parse_header(peek, pn, path, &h, err);
    if (st != VG_OK) return st;
    if (h.dims == 0 || h.dims > VG_MAX_DIMS)
        return vg_error_set(err, VG_ELIMIT, path, 0, "NumPy matrix of %zu columns; 1..%u are read",
                            h.dims, (unsigned)VG_MAX_DIMS);
    size_t rb = h.dims * h.item;
    /* What the file can hold: exact for a mapped file; a gzip stream is
     * checked as it arrives. */
    size_t rows = h.rows, avail_rows = h.rows;
    size_t mapped_n = 0;
    const char *mapped = vg_src_mapping(src, &mapped_n);
    if (mapped) {
        size_t data = mapped_n - VG_MIN(mapped_n, h.data_offset);
        size_t want = h.rows * rb;
        if (data > want)
            return vg_error_set(err, VG_EFORMAT, path, 0,
                                "NumPy header promises %zu x %zu values (%zu bytes) but the file "
                                "holds %zu bytes of data",
                                h.rows, h.dims, want, data);
        if (data < want && (!opt->allow_short || h.fortran))
            return vg_error_set(err, VG_ETRUNCATED, path, 0,
                                "NumPy header promises %zu x %zu values (%zu bytes) but the file "
                                "holds %zu bytes of data (truncated download?%s)",
                                h.rows, h.dims, want, data,
                                h.fortran ? " column-major data cannot be read in part"
                                          : " --allow-short accepts it");
        avail_rows = data / rb;
        rows = VG_MIN(rows, avail_rows);
    }
    if (opt->max_words && rows > opt->max_words) rows = opt->max_words;

    vg_vocab vc;
    memset(&vc, 0, sizeof vc);
    st = vg_vocab_read(opt->vocab_path, path, opt->max_words, opt->compute_hash, &vc, err);
    if (st != VG_OK) return st;
    /* One word per row. A shorter list (or, with a truncated matrix, a
     * longer one) is accepted under --allow-short only. */
    int too_few = vc.n < rows;
    int too_many = vc.n > rows && !(opt->max_words && rows == opt->max_words);
    if ((too_few || too_many) && !(opt->allow_short && (too_few || avail_rows < h.rows))) {
        st = vg_error_set(err, VG_EFORMAT, vc.path, 0,
                          "vocabulary has %zu words but the matrix %s has %zu rows%s", vc.n, path,
                          rows, too_few ? " (--allow-short uses the shorter)" : "");
        vg_vocab_free(&vc);
        return st;
    }
    if (vc.n < rows) rows = vc.n;

    vg_vectors *v = NULL;
    st = vg_vecbuild_begin(h.dims, rows, mapped ? rows : h.rows, opt, &v, err);
    if (st != VG_OK) {
        vg_vocab_free(&vc);
        if (err->path[0] == '\0') snprintf(err->path, sizeof err->path, "%s", path);
        return st;
    }
    /* The words stay where the vocabulary read put them. */
    vg_vecbuild_adopt_words(v, &vc.arena);
    v->info.header_rows = h.rows;
    v->info.big_endian = h.big_endian;
    v->info.fortran_order = h.fortran;
    v->info.source_float64 = h.item == 8;
    snprintf(v->info.vocab_path, sizeof v->info.vocab_path, "%s", vc.path);
    if (vc.hashed) snprintf(v->info.vocab_sha256, sizeof v->info.vocab_sha256, "%s", vc.sha256);

    size_t cut_at = rows;
    vg_bigbuf tmpbuf = VG_BIGBUF_INIT;
    int native = h.item == 4 && h.big_endian ==
#if defined(__BYTE_ORDER__) && __BYTE_ORDER__ == __ORDER_BIG_ENDIAN__
                                  1;
#else
                                  0;
#endif
    if (!h.fortran && mapped && !v->keep_active && native && rows > 0) {
        /* The stored rows are the matrix's bytes: read them into place. */
        st = read_c_mapped(src, mapped + h.data_offset, &h, &vc, rows, opt, v, path, 1, err);
    } else if (!h.fortran && mapped && !v->keep_active) {
        st = read_c_mapped(src, mapped + h.data_offset, &h, &vc, rows, opt, v, path, 0, err);
    } else if (!h.fortran || rows == 0) {
        vg_seq q;
        st = vg_seq_begin(&q, src, err);
        uint64_t skipped;
        if (st == VG_OK) st = vg_seq_discard(&q, h.data_offset, &skipped, err);
        if (st == VG_OK) st = read_c_order(&q, &h, &vc, rows, opt, v, path, &cut_at, err);
        vg_seq_end(&q);
    } else if (mapped) {
        st = vg_src_start(src, 0, 0, err);
        if (st == VG_OK) st = read_f_order(mapped + h.data_offset, &h, &vc, rows, opt, v, path, err);
        if (st == VG_OK) st = vg_src_advance(src, mapped_n, err);
    } else {
        /* gzip, column-major: inflate all the data first. The header's
         * size is checked against what arrives, never trusted alone. */
        size_t total = h.rows * rb, have = 0;
        vg_seq q;
        st = vg_seq_begin(&q, src, err);
        uint64_t skipped;
        if (st == VG_OK) st = vg_seq_discard(&q, h.data_offset, &skipped, err);
        while (st == VG_OK && have < total) {
            size_t want = VG_MIN(total - have, (size_t)4 << 20), got;
            const char *p = vg_seq_peek(&q, want, &got, err);
            if (!p) {
                st = err->code;
                break;
            }
            if (got == 0) break;
            if (vg_bigbuf_reserve(&tmpbuf, have + got) != 0) {
                st = vg_error_set(err, VG_ENOMEM, path, 0, "out of memory for %zu bytes", have + got);
                break;
            }
            memcpy((char *)tmpbuf.p + have, p, got);
            have += got;
            vg_seq_skip(&q, got, err);
        }
        vg_seq_end(&q);
        if (st == VG_OK && have < total)
            st = vg_error_set(err, VG_ETRUNCATED, path, 0,
                              "NumPy header promises %zu bytes of data but the stream ends after "
                              "%zu (truncated download?)",
                              total, have);
        if (st == VG_OK) st = read_f_order(tmpbuf.p, &h, &vc, rows, opt, v, path, err);
        vg_bigbuf_free(&tmpbuf);
    }
    if (st == VG_OK && cut_at < rows && !opt->allow_short)
        st = vg_error_set(err, VG_ETRUNCATED, path, 0,
                          "NumPy header promises %zu rows but the data end inside row %zu "
                          "(truncated download? --allow-short accepts it)",
                          h.rows, cut_at + 1);
    vg_vocab_free(&vc);
    if (st == VG_OK) st = vg_vecbuild_finish(v, err);
    if (st != VG_OK) {
        vg_vectors_free(v);
        return st;
    }
    *out = v;
    return VG_OK;
}
