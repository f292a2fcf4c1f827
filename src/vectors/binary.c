/* binary.c - the common binary layout: an ASCII "count dims" line, then
 * per row the word's bytes, one space, dims little-endian float32 values
 * and optionally a '\n'.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Rows have no fixed size (the words differ), so their places are found
 * in order by one thread. From a mapped file without a row filter, rows
 * are gathered in batches whose values all threads then copy straight
 * into the matrix (batch.c); otherwise (gzip, pipes, filters) each row is
 * copied into a buffer, checked, and offered alone. Errors name the row
 * (and its byte offset), the binary layout having no lines.
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/bigbuf.h"
#include "../common/threads.h"
#include "vectors_impl.h"

/* Little-endian float32 bytes to host floats. */
static void load_le32(float *dst, const char *src, size_t n) {
#if defined(__BYTE_ORDER__) && __BYTE_ORDER__ == __ORDER_BIG_ENDIAN__
    for (size_t j = 0; j < n; j++) {
        uint32_t b;
        memcpy(&b, src + 4 * j, 4);
        b = __builtin_bswap32(b);
        memcpy(&dst[j], &b, 4);
    }
#else
    memcpy(dst, src, n * sizeof(float));
#endif
}

/* 1 if the bytes [p, p + n) are all blank or line ends. */
static int all_space(const char *p, size_t n) {
    for (size_t i = 0; i < n; i++)
        if (p[i] != '\n' && p[i] != '\r' && p[i] != ' ' && p[i] != '\t') return 0;
    return 1;
}

static void conv_le32(float *dst, const char *src, size_t n, const void *ctx) {
    (void)ctx;
    load_le32(dst, src, n);
}

/* Bytes of stored rows per batch: enough to amortise starting threads,
 * few enough that a batch's rows are still in cache when added. */
#define BATCH_BYTES ((size_t)8 << 20)

/* A regular file, no filter: the file is read in windows of a batch of
 * rows with pread (the kernel's copy from the page cache; walking a
 * 4 KiB-page mapping costs a TLB miss per page, dear in a VM), each
 * window during the run of the batch before it, and all threads convert
 * the batch's rows straight into the matrix. Sets *cut when the file
 * ends inside a row, *row to the rows seen. */
static vg_status read_mapped(vg_src *src, size_t size, const vg_detect *d,
                             const vg_load_options *opt, vg_vectors *v, int *cut, uint64_t *row,
                             vg_error *err) {
    const char *path = vg_src_path(src);
    size_t dims = d->dims, rb = dims * sizeof(float);
    /* A row starting in the first BATCH_BYTES of a window ends inside it. */
    size_t wcap = BATCH_BYTES + rb + VG_MAX_WORD + 2;
    vg_batch b;
    memset(&b, 0, sizeof b);
    b.v = v;
    b.path = path;
    b.opt = opt;
    b.conv = conv_le32;
#if !(defined(__BYTE_ORDER__) && __BYTE_ORDER__ == __ORDER_BIG_ENDIAN__)
    b.stored_f32 = 1; /* load_le32 is a plain copy here */
#endif
    b.threads = vg_threads_resolve(opt->threads);
    /* A row takes at least rb + 2 bytes (a word, a space, the values), so
     * a batch holds no more rows than that divides into its bytes or into
     * the whole file (a small file must not cost a batch-sized table). */
    int rows_ok = vg_batch_alloc(&b, VG_MIN(BATCH_BYTES, size) / (rb + 2) + 1) == 0;
    /* Three windows in turn: while a batch's rows are converted from
     * one, the previous batch's rows are added (a bad row's message
     * quotes its word, in that batch's window), and the threads with no
     * row left to convert read the next window into the third. The copy
     * out of the page cache is then shared by the threads instead of run
     * alone between batches: 2M x 300 unhashed, cached, medians 0.58 and
     * 0.59 s against 0.64 and 0.67 s in two sets of 10 paired runs
     * (2026-12-03); hashed, no change. The hashing thread may still be on
     * a window until it is reused. */
    char *wins[3];
    for (int i = 0; i < 3; i++) wins[i] = vg_bigbuf_alloc(wcap + VG_SRC_PAD);
    uint64_t wend[3] = {0, 0, 0};
    int wx = 0;
    char *win = wins[0];
    if (!rows_ok || !wins[0] || !wins[1] || !wins[2]) {
        vg_batch_free(&b);
        for (int i = 0; i < 3; i++) vg_bigbuf_release(wins[i], wcap + VG_SRC_PAD);
        return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
    }
    vg_src_hash_by_submit(src);
    vg_status st = vg_src_start(src, 0, 0, err);
    size_t map_n;
    vg_src_hash_submit(src, vg_src_mapping(src, &map_n), d->header_bytes); /* the header line */
    size_t pos = d->header_bytes, wpos = pos, wlen = size > pos ? VG_MIN(size - pos, wcap) : 0;
    if (st == VG_OK && wlen) st = vg_src_pread(src, win, wlen, wpos, err);
    memset(win + wlen, 0, VG_SRC_PAD);
    uint64_t n = 0;
    vg_error late;      /* a structural error, reported after the rows before it */
    vg_status late_st = VG_OK;
    while (st == VG_OK) {
        if (opt->max_words && n >= opt->max_words) break;
        if (pos >= size) break;
        const char *p = win + (pos - wpos);
        size_t left = size - pos;
        size_t look = VG_MIN(left, (size_t)VG_MAX_WORD + 1);
        const char *sp = memchr(p, ' ', look);
        if (!sp) {
            if (left <= VG_MAX_WORD && all_space(p, left)) break; /* trailing newlines */
            if (left <= VG_MAX_WORD) {
                *cut = 1;
                n++;
                break;
            }
            late_st = vg_error_set(&late, VG_EFORMAT, path, 0,
                                   "row %llu (byte %zu): no space after the word within %u bytes",
                                   (unsigned long long)n + 1, pos, (unsigned)VG_MAX_WORD);
            break;
        }
        size_t wl = (size_t)(sp - p);
        if (wl == 0) {
            late_st = vg_error_set(&late, VG_EFORMAT, path, 0, "row %llu (byte %zu): empty word",
                                   (unsigned long long)n + 1, pos);
            break;
        }
        if (left - wl - 1 < rb) {
            *cut = 1;
            n++;
            break;
        }
        vg_batch_row *r = &b.rows[b.n++];
        r->word = p;
        r->wlen = wl;
        r->src = sp + 1;
        r->file_row = n++;
        pos += wl + 1 + rb;
        if (pos < size && win[pos - wpos] == '\n') pos++;
        /* A row starting in the first BATCH_BYTES of a window ends in it:
         * the batch ends once past them, and the next window starts at
         * its next row. */
        if (b.n == b.cap || pos - wpos >= BATCH_BYTES) {
            vg_src_hash_submit(src, win, pos - wpos);
            wend[wx] = pos;
            int nx = (wx + 1) % 3;
            vg_src_hash_wait_upto(src, wend[nx]);
            size_t nlen = VG_MIN(size - pos, wcap);
            int more = nlen > 0 && !(opt->max_words && n >= opt->max_words);
            if (more) b.ahead = (vg_read_ahead){src, wins[nx], nlen, pos};
            st = vg_batch_run(&b, err);
            if (st == VG_OK) st = vg_src_advance(src, pos, err);
            wx = nx;
            win = wins[wx];
            wpos = pos;
            wlen = more ? nlen : 0;
            memset(win + wlen, 0, VG_SRC_PAD);
        }
    }
    if (st == VG_OK && b.n) {
        vg_src_hash_submit(src, win, pos - wpos);
        st = vg_batch_run(&b, err);
    }
    if (st == VG_OK) st = vg_batch_flush(&b, err);
    /* The windows go: the hash must be done with them. */
    vg_src_hash_wait_upto(src, vg_src_hash_submitted(src));
    if (st == VG_OK && late_st != VG_OK) {
        *err = late;
        st = late_st;
    }
    vg_batch_free(&b);
    for (int i = 0; i < 3; i++) vg_bigbuf_release(wins[i], wcap + VG_SRC_PAD);
    *row = n;
    return st;
}

vg_status vg_read_binary(vg_src *src, const vg_detect *d, const vg_load_options *opt,
                         vg_vectors **out, vg_error *err) {
    *out = NULL;
    const char *path = vg_src_path(src);
    size_t dims = d->dims;
    size_t row_bytes = dims * sizeof(float);
    uint64_t stream_max = vg_src_stream_bound(src);
    size_t bound = stream_max ? (size_t)VG_MIN(stream_max / (row_bytes + 2) + 1, (uint64_t)SIZE_MAX / 2) : 0;
    vg_vectors *v = NULL;
    vg_status st = vg_vecbuild_begin(dims, d->header_rows, bound, opt, &v, err);
    if (st != VG_OK) {
        if (err->path[0] == '\0') snprintf(err->path, sizeof err->path, "%s", path);
        return st;
    }
    float *tmp = NULL;
    char *word = NULL;
    vg_seq q;
    int seq_open = 0;
    uint64_t row = 0; /* rows seen, 1-based in messages */
    int cut = 0;      /* the file ends inside a row */
    size_t map_n = 0;
    const char *map = vg_src_mapping(src, &map_n);
#if !(defined(__BYTE_ORDER__) && __BYTE_ORDER__ == __ORDER_BIG_ENDIAN__)
    if (map && !v->keep_active) {
        st = read_mapped(src, map_n, d, opt, v, &cut, &row, err);
        if (st != VG_OK) goto done;
        goto counts;
    }
#endif
    tmp = vg_aligned_alloc(64, row_bytes);
    word = vg_malloc(VG_MAX_WORD + 1);
    if (!tmp || !word) {
        st = vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
        goto done;
    }
    st = vg_seq_begin(&q, src, err);
    if (st != VG_OK) goto done;
    seq_open = 1;
    size_t got;
    if (!vg_seq_peek(&q, d->header_bytes, &got, err)) {
        st = err->code;
        goto done;
    }
    vg_seq_skip(&q, d->header_bytes, err);

    for (;;) {
        if (opt->max_words && v->info.rows_read + v->info.bad_rows >= opt->max_words) break;
        uint64_t at = q.consumed;
        const char *p = vg_seq_peek(&q, VG_MAX_WORD + 1, &got, err);
        if (!p) {
            st = err->code;
            goto done;
        }
        if (got == 0) break;
        row++;
        const char *sp = memchr(p, ' ', got);
        if (!sp) {
            if (all_space(p, got) && got < VG_MAX_WORD + 1) break; /* trailing newlines */
            if (got < VG_MAX_WORD + 1) {
                cut = 1;
                break;
            }
            st = vg_error_set(err, VG_EFORMAT, path, 0,
                              "row %llu (byte %llu): no space after the word within %u bytes",
                              (unsigned long long)row, (unsigned long long)at,
                              (unsigned)VG_MAX_WORD);
            goto done;
        }
        size_t wlen = (size_t)(sp - p);
        if (wlen == 0) {
            st = vg_error_set(err, VG_EFORMAT, path, 0, "row %llu (byte %llu): empty word",
                              (unsigned long long)row, (unsigned long long)at);
            goto done;
        }
        memcpy(word, p, wlen);
        word[wlen] = '\0';
        vg_seq_skip(&q, wlen + 1, err);
        const char *vals = vg_seq_peek(&q, row_bytes, &got, err);
        if (!vals) {
            st = err->code;
            goto done;
        }
        if (got < row_bytes) {
            cut = 1;
            vg_seq_skip(&q, got, err);
            break;
        }
        load_le32(tmp, vals, dims);
        vg_seq_skip(&q, row_bytes, err);
        const char *nl = vg_seq_peek(&q, 1, &got, err);
        if (!nl) {
            st = err->code;
            goto done;
        }
        if (got == 1 && *nl == '\n') vg_seq_skip(&q, 1, err);
        float norm;
        if (!vg_row_norm_finite(tmp, dims, &norm)) {
            if (opt->skip_bad_rows) {
                v->info.bad_rows++;
                continue;
            }
            size_t j = 0;
            while (j < dims && isfinite(tmp[j])) j++;
            st = vg_error_set(err, VG_EVALUE, path, 0,
                              "row %llu (byte %llu, word '%.*s'): value %zu is not finite",
                              (unsigned long long)row, (unsigned long long)at, (int)VG_MIN(wlen, 40),
                              word, j + 1);
            goto done;
        }
        vg_rowkey k;
        if (vg_rowkey_make(v, word, wlen, &k) != 0) {
            st = vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
            goto done;
        }
        float *dst;
        st = vg_vecbuild_add(v, &k, norm, &dst, path, 0, err);
        vg_rowkey_clear(&k);
        if (st != VG_OK) goto done;
        if (dst) memcpy(dst, tmp, row_bytes);
    }
counts:;
    size_t present = v->info.rows_read + v->info.bad_rows;
    int stopped = opt->max_words && present >= opt->max_words;
    if (cut && !opt->allow_short) {
        st = vg_error_set(err, VG_ETRUNCATED, path, 0,
                          "the file ends inside row %llu, after %zu complete rows of the %zu the "
                          "header promises (truncated download? --allow-short accepts it)",
                          (unsigned long long)row, present, d->header_rows);
        goto done;
    }
    if (!stopped && !opt->allow_short && present != d->header_rows) {
        st = vg_error_set(err, VG_ETRUNCATED, path, 0,
                          "header promises %zu rows but the file has %zu "
                          "(truncated download? --allow-short accepts it)",
                          d->header_rows, present);
        goto done;
    }
    if (seq_open) vg_seq_end(&q);
    seq_open = 0;
    st = vg_vecbuild_finish(v, err);

done:
    if (seq_open) vg_seq_end(&q);
    vg_free(tmp);
    vg_free(word);
    if (st != VG_OK) {
        vg_vectors_free(v);
        return st;
    }
    *out = v;
    return VG_OK;
}
