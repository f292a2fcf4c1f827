/* batch.c - fixed-layout rows (binary, npy) from a mapped file, converted
 * in place by all threads, then offered to the builder in order.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Without a row filter every row of the file gets the matrix row of its
 * position in the file, so the threads convert the stored values straight
 * into their final place (and share the first touch of the matrix's
 * pages), check them and compute the norms; then, in file order, the
 * rows are added to the builder, a bad row is skipped or reported, and a
 * row moves down only when an earlier one was dropped. The builder's
 * index lookups, the one part that must be sequential, are prefetched a
 * few rows ahead.
 */
#include <math.h>
#include <string.h>

#include "../common/threads.h"
#include "vectors_impl.h"

/* Rows ahead whose index slot is prefetched. */
#define PREFETCH_AHEAD 8

static void convert_share(void *ctx, unsigned t, unsigned nt) {
    vg_batch *b = ctx;
    vg_vectors *v = b->v;
    size_t lo = b->n * t / nt, hi = b->n * (t + 1) / nt;
    b->fill_st[t] = VG_OK;
    if (b->fill && hi > lo) {
        const vg_batch_row *r = &b->rows[lo];
        b->fill_st[t] = b->fill(b->fill_ctx, r->file_row, hi - lo, v->data + r->file_row * v->ld,
                                &b->fill_err[t]);
        if (b->fill_st[t] != VG_OK) {
            for (size_t i = lo; i < hi; i++) b->rows[i].keyfail = 2;
            return;
        }
    }
    /* Each thread maps in its own share of a borrowed matrix's pages. */
    if (b->in_matrix && hi > lo) vg_vecbuild_populate(v, b->rows[lo].file_row, hi - lo);
    for (size_t i = lo; i < hi; i++) {
        vg_batch_row *r = &b->rows[i];
        float *dst = v->data + r->file_row * v->ld;
        if (b->conv && !b->fill) b->conv(dst, r->src, v->dims, b->conv_ctx);
        r->norm = 0;
        r->bad = !vg_row_norm_finite(dst, v->dims, &r->norm);
        r->keyfail = vg_rowkey_make(v, r->word, r->wlen, &r->key) != 0;
    }
}

vg_status vg_batch_run(vg_batch *b, vg_error *err) {
    vg_vectors *v = b->v;
    vg_status st = VG_OK;
    if (b->n == 0) return VG_OK;
    /* Rows go to their file position: make room (nothing else runs). */
    size_t need = (size_t)b->rows[b->n - 1].file_row + 1;
    /* Growing may move the matrix, whose rows may still be queued for
     * hashing. */
    if (need > v->cap_rows && b->hash_src) vg_src_hash_wait_upto(b->hash_src, vg_src_hash_submitted(b->hash_src));
    if (vg_vecbuild_reserve(v, need) != 0) {
        b->n = 0;
        return vg_error_set(err, VG_ENOMEM, b->path, 0, "out of memory for the matrix");
    }
    unsigned nt = b->n < 64 ? 1 : VG_MIN(b->threads, (unsigned)VG_BATCH_SHARES);
    vg_parallel(nt, convert_share, b);
    for (unsigned t = 0; t < nt; t++) {
        if (b->fill_st[t] != VG_OK) {
            /* Nothing was added yet: fail before the first row. */
            *err = b->fill_err[t];
            st = b->fill_st[t];
            for (size_t i = 0; i < b->n; i++)
                if (b->rows[i].keyfail == 0) vg_rowkey_clear(&b->rows[i].key);
            b->n = 0;
            return st;
        }
    }
    /* The rows as read are the stored bytes: hash them before any row
     * moves. */
    if (b->hash_src && b->fill)
        vg_src_hash_submit(b->hash_src, v->data + b->rows[0].file_row * v->ld,
                           b->n * v->dims * sizeof(float));
    int waited = 0;
    for (size_t i = 0; i < b->n && st == VG_OK; i++) {
        if (i + PREFETCH_AHEAD < b->n && !b->rows[i + PREFETCH_AHEAD].keyfail)
            vg_strmap_prefetch(&v->index, b->rows[i + PREFETCH_AHEAD].key.hash);
        vg_batch_row *r = &b->rows[i];
        if (r->keyfail) {
            st = vg_error_set(err, VG_ENOMEM, b->path, 0, "out of memory");
            break;
        }
        if (r->bad) {
            if (b->opt->skip_bad_rows) {
                v->info.bad_rows++;
                continue;
            }
            const float *x = v->data + r->file_row * v->ld;
            size_t j = 0;
            while (j < v->dims && isfinite(x[j])) j++;
            st = vg_error_set(err, VG_EVALUE, b->path, 0,
                              "row %llu (%sword '%.*s'): value %zu is not finite%s",
                              (unsigned long long)r->file_row + 1, b->where ? b->where : "",
                              (int)VG_MIN(r->wlen, (size_t)40), r->word, j + 1,
                              b->conv_note ? b->conv_note : "");
            break;
        }
        float *dst;
        st = vg_vecbuild_add(v, &r->key, r->norm, &dst, b->path, 0, err);
        if (st == VG_OK && dst) {
            const float *src = v->data + r->file_row * v->ld;
            if (dst != src && v->borrow_map) {
                /* A dropped row before this one: rows must move, which
                 * the file's read-only bytes cannot; take a copy. */
                size_t at = (size_t)(dst - v->data);
                if (vg_vecbuild_own(v) != 0) {
                    st = vg_error_set(err, VG_ENOMEM, b->path, 0, "out of memory for the matrix");
                    break;
                }
                dst = v->data + at;
                src = v->data + r->file_row * v->ld;
            }
            if (dst != src) {
                if (b->hash_src && !waited) {
                    vg_src_hash_wait_upto(b->hash_src, vg_src_hash_submitted(b->hash_src));
                    waited = 1;
                }
                memcpy(dst, src, v->dims * sizeof(float));
            }
        }
    }
    for (size_t i = 0; i < b->n; i++)
        if (!b->rows[i].keyfail) vg_rowkey_clear(&b->rows[i].key);
    b->n = 0;
    return st;
}
