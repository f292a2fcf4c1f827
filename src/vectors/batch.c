/* batch.c - fixed-layout rows (binary, npy) from a mapped file, converted
 * in place by all threads, then offered to the builder in order.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Without a row filter every row of the file gets the matrix row of its
 * position in the file, so the threads convert the stored values straight
 * into their final place (and share the first touch of the matrix's
 * pages), check them and compute the norms; then, in file order, the
 * rows are added to the builder, a bad row is skipped or reported, and a
 * row moves down only when an earlier one was dropped.
 *
 * Adding rows is the one part that must be sequential (the word index
 * decides duplicates in file order), and on a 2M-row file it took as long
 * as converting them on two threads. So the two overlap: while the
 * calling thread adds the previous batch, the other threads convert this
 * one, in chunks claimed from a counter, and the calling thread joins
 * them when it is done. Which thread converts a row never changes what is
 * stored, and rows are still added strictly in file order, so results do
 * not depend on the thread count or on timing. The index lookups are
 * prefetched a few rows ahead. A caller reading its input with pread()
 * can hand a run its next read (vg_batch's ahead), done in pieces by
 * whichever thread finds no chunk left to convert. Rows that are in the
 * matrix already (a borrowed .npy mapping) are only checked, from copies
 * in each thread's scratch where reading the mapping would be slow.
 */
#include <math.h>
#include <sched.h>
#include <stdatomic.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/threads.h"
#include "vectors_impl.h"

/* Bytes of a read-ahead piece: enough to amortise a pread(), and a
 * window in a handful of pieces so that both threads share the read. */
#define AHEAD_PIECE ((size_t)1 << 20)
/* Bytes of a piece of borrowed rows copied to check them: twice over
 * in L2 (1 MiB a core here), and as fast as 1 MiB pieces. */
#define SCRATCH_BYTES ((size_t)256 << 10)
/* Rows ahead whose index slot is prefetched. */
#define PREFETCH_AHEAD 8
/* A batch is converted in at most this many chunks (of at least
 * CHUNK_MIN_ROWS rows): enough for the threads to even out, few enough
 * that claiming one costs nothing beside converting it. */
#define MAX_CHUNKS 64
#define CHUNK_MIN_ROWS 32

/* The first failure, in file order, of a kind of work shared out in
 * numbered parts. */
typedef struct failure {
    size_t at; /* the part; SIZE_MAX: none */
    vg_status st;
    vg_error err;
} failure;

/* One vg_batch_run: this batch's conversion, shared out by chunks, and
 * the previous batch's rows, added by thread 0. */
typedef struct stage {
    vg_batch *b;
    vg_batch_row *rows; /* this batch */
    size_t n, chunk, nchunks;
    /* The run's read ahead (vg_batch's), in npieces claimed after the
     * chunks. */
    vg_read_ahead ahead;
    size_t npieces;
    atomic_size_t next; /* chunks (then pieces) claimed */
    atomic_size_t done; /* chunks converted */
    /* The lowest chunk whose fill failed and the lowest read-ahead
     * piece that failed (the first in the file of each), under lock. */
    pthread_mutex_t lock;
    failure fill_fail, ahead_fail;
    /* Thread 0's adding of the previous batch. */
    vg_status add_st;
    vg_error *add_err;
} stage;

/* Part k failed: keep it if it is the first in the file so far. */
static void keep_failure(stage *s, failure *f, size_t k, vg_status st, const vg_error *e) {
    pthread_mutex_lock(&s->lock);
    if (k < f->at) {
        f->at = k;
        f->st = st;
        f->err = *e;
    }
    pthread_mutex_unlock(&s->lock);
}

/* Norm, finiteness and key of row r, whose values are the native floats
 * stored from byte x. */
static void check_row(vg_batch_row *r, const void *x, size_t dims) {
    r->norm = 0;
    r->bad = !vg_row_norm_finite(x, dims, &r->norm);
    r->keyfail = vg_rowkey_make_unfiltered(r->word, r->wlen, &r->key) != 0;
}

/* The fill failed for chunk c, rows[lo..hi), of which rows[lo..keyed)
 * are keyed already: no row of the chunk may be added. */
static void fill_failed(stage *s, size_t c, size_t lo, size_t keyed, size_t hi, vg_status st,
                        const vg_error *e) {
    vg_batch_row *rows = s->rows;
    for (size_t i = lo; i < keyed; i++)
        if (rows[i].keyfail == 0) vg_rowkey_clear(&rows[i].key);
    for (size_t i = lo; i < hi; i++) rows[i].keyfail = 2;
    keep_failure(s, &s->fill_fail, c, st, e);
}

/* Rows borrowed in the matrix, rows[lo..hi) of chunk c, checked from a
 * copy read into thread t's scratch a piece at a time: the kernel copies
 * from the page cache through its own large pages, while the mapping of
 * a file cached in small folios costs a page walk every 4 KiB (one thread
 * over 2.4 GB on the 2-core VM: 0.67 s through the mapping, 0.16 s for
 * pread() into 256 KiB and the same sums, 2026-12-03). */
static void check_copied(stage *s, size_t c, size_t lo, size_t hi, unsigned t) {
    const vg_batch *b = s->b;
    size_t dims = b->v->dims;
    float *buf = b->scratch + (size_t)t * b->scratch_rows * dims;
    vg_batch_row *rows = s->rows;
    for (size_t i = lo; i < hi;) {
        size_t n = VG_MIN(b->scratch_rows, hi - i);
        vg_error e;
        vg_status st = b->fill(b->fill_ctx, rows[i].file_row, n, buf, &e);
        if (st != VG_OK) {
            fill_failed(s, c, lo, i, hi, st, &e);
            return;
        }
        for (size_t k = 0; k < n; k++) check_row(&rows[i + k], buf + k * dims, dims);
        i += n;
    }
}

static void convert_chunk(stage *s, size_t c, unsigned t) {
    const vg_batch *b = s->b;
    vg_vectors *v = b->v;
    /* What of the set a chunk needs, read once: the adding thread writes
     * the set's counters beside these fields for every row, and reading
     * them per row would pull that cache line back and forth between
     * the threads (measured: twice the CPU time of both loops). They do
     * not change while chunks are converted. */
    float *data = v->data;
    size_t ld = v->ld, dims = v->dims;
    size_t lo = c * s->chunk, hi = VG_MIN(lo + s->chunk, s->n);
    vg_batch_row *rows = s->rows;
    if (b->in_matrix) {
        /* Each chunk maps in its own part of the borrowed pages, for
         * whoever reads the matrix next. */
        vg_vecbuild_populate(v, rows[lo].file_row, hi - lo);
        if (b->fill) {
            check_copied(s, c, lo, hi, t);
            return;
        }
    } else if (b->fill) {
        vg_error e;
        vg_status st = b->fill(b->fill_ctx, rows[lo].file_row, hi - lo,
                               data + rows[lo].file_row * ld, &e);
        if (st != VG_OK) {
            fill_failed(s, c, lo, lo, hi, st, &e);
            return;
        }
    } else if (b->stored_f32) {
        /* Streaming stores, and the check from the stored bytes, which
         * the window read has just put in cache (2M x 300 binary,
         * unhashed: medians 0.54 s against 1.05 s, spread 0.52-0.55 s
         * against 0.64-2.59 s, in 10 paired runs; 400k x 300: 0.122 s
         * against 0.142 s in 12, 2026-12-03). */
        for (size_t i = lo; i < hi; i++) {
            vg_batch_row *r = &rows[i];
            vg_row_copy_stream(data + r->file_row * ld, r->src, dims);
            check_row(r, r->src, dims);
        }
        vg_row_copy_fence();
        return;
    }
    /* The rows are in the matrix now (borrowed or filled), or are
     * converted into it here. */
    vg_convert_fn conv = b->in_matrix || b->fill ? NULL : b->conv;
    for (size_t i = lo; i < hi; i++) {
        vg_batch_row *r = &rows[i];
        float *dst = data + r->file_row * ld;
        if (conv) conv(dst, r->src, dims, b->conv_ctx);
        check_row(r, dst, dims);
    }
}

static void read_piece(stage *s, size_t k) {
    const vg_read_ahead *a = &s->ahead;
    size_t lo = k * AHEAD_PIECE, n = VG_MIN(AHEAD_PIECE, a->n - lo);
    vg_error e;
    vg_status st = vg_src_pread(a->src, a->dst + lo, n, a->off + lo, &e);
    if (st != VG_OK) keep_failure(s, &s->ahead_fail, k, st, &e);
}

/* Claim and convert chunks until none is left, then read pieces of the
 * read ahead (converting first: the matrix may wait on it in settle). */
static void convert_some(stage *s, unsigned t) {
    for (;;) {
        size_t c = atomic_fetch_add(&s->next, 1);
        if (c >= s->nchunks + s->npieces) return;
        if (c >= s->nchunks) {
            read_piece(s, c - s->nchunks);
            continue;
        }
        convert_chunk(s, c, t);
        atomic_fetch_add(&s->done, 1);
    }
}

/* Every chunk converted: this thread takes what is unclaimed, then waits
 * for the chunks other threads are still on (they are running, since
 * only a running thread claims). Needed before the matrix moves. */
static void settle(stage *s) {
    if (!s) return;
    convert_some(s, 0); /* thread 0's: only thread 0 adds rows */
    while (atomic_load(&s->done) < s->nchunks) sched_yield();
}

static void clear_keys(vg_batch_row *rows, size_t n) {
    for (size_t i = 0; i < n; i++)
        if (rows[i].keyfail == 0) vg_rowkey_clear(&rows[i].key);
}

/* Add rows[0..n), converted, to the builder in file order. s is the
 * conversion running meanwhile (or NULL): it is finished first when the
 * matrix must move. */
static vg_status add_rows(vg_batch *b, vg_batch_row *rows, size_t n, stage *s, vg_error *err) {
    vg_vectors *v = b->v;
    vg_status st = VG_OK;
    int waited = 0;
    for (size_t i = 0; i < n && st == VG_OK; i++) {
        if (i + PREFETCH_AHEAD < n && !rows[i + PREFETCH_AHEAD].keyfail)
            vg_strmap_prefetch(&v->index, rows[i + PREFETCH_AHEAD].key.hash);
        vg_batch_row *r = &rows[i];
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
                 * the file's read-only bytes cannot; take a copy, once
                 * no thread reads the borrowed rows any more. */
                size_t at = (size_t)(dst - v->data);
                settle(s);
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
    clear_keys(rows, n);
    return st;
}

static void stage_run(void *ctx, unsigned t, unsigned nt) {
    (void)nt;
    stage *s = ctx;
    vg_batch *b = s->b;
    if (t == 0 && b->prev_n) {
        s->add_st = add_rows(b, b->prev, b->prev_n, s, s->add_err);
        b->prev_n = 0;
    }
    convert_some(s, t);
}

size_t vg_batch_test_cap;

int vg_batch_alloc(vg_batch *b, size_t cap) {
    if (vg_batch_test_cap && cap > vg_batch_test_cap) cap = vg_batch_test_cap;
    b->cap = cap;
    b->n = b->prev_n = 0;
    b->rows = vg_calloc(cap, sizeof *b->rows);
    b->prev = vg_calloc(cap, sizeof *b->prev);
    b->scratch = NULL;
    b->scratch_rows = 0;
    int ok = b->rows && b->prev;
    if (ok && b->in_matrix && b->fill) {
        size_t rb = b->v->dims * sizeof(float), bytes;
        b->scratch_rows = VG_MAX((size_t)1, SCRATCH_BYTES / rb);
        ok = !vg_mul_overflow(b->scratch_rows * rb, VG_MAX(b->threads, 1u), &bytes) &&
             (b->scratch = vg_aligned_alloc(64, bytes)) != NULL;
    }
    if (ok) return 0;
    vg_batch_free(b);
    return -1;
}

void vg_batch_free(vg_batch *b) {
    if (b->prev) clear_keys(b->prev, b->prev_n);
    vg_free(b->rows);
    vg_free(b->prev);
    vg_free(b->scratch);
    b->rows = b->prev = NULL;
    b->scratch = NULL;
    b->n = b->prev_n = 0;
}

vg_status vg_batch_flush(vg_batch *b, vg_error *err) {
    if (!b->prev_n) return VG_OK;
    vg_status st = add_rows(b, b->prev, b->prev_n, NULL, err);
    b->prev_n = 0;
    return st;
}

vg_status vg_batch_run(vg_batch *b, vg_error *err) {
    vg_vectors *v = b->v;
    if (b->n == 0) {
        /* Nothing to convert: the read ahead is done here. */
        vg_status st = vg_batch_flush(b, err);
        if (st == VG_OK && b->ahead.src)
            st = vg_src_pread(b->ahead.src, b->ahead.dst, b->ahead.n, b->ahead.off, err);
        b->ahead.src = NULL;
        return st;
    }
    /* Rows go to their file position: make room while nothing else
     * runs. Growing may move the matrix, whose rows may still be queued
     * for hashing; the previous batch's rows move with it. */
    size_t need = (size_t)b->rows[b->n - 1].file_row + 1;
    if (need > v->cap_rows && b->hash_src)
        vg_src_hash_wait_upto(b->hash_src, vg_src_hash_submitted(b->hash_src));
    if (need > v->cap_rows && vg_vecbuild_reserve(v, need) != 0) {
        b->n = 0;
        b->ahead.src = NULL;
        return vg_error_set(err, VG_ENOMEM, b->path, 0, "out of memory for the matrix");
    }
    stage s;
    memset(&s, 0, sizeof s);
    s.b = b;
    s.rows = b->rows;
    s.n = b->n;
    s.chunk = VG_MAX((size_t)CHUNK_MIN_ROWS, (s.n + MAX_CHUNKS - 1) / MAX_CHUNKS);
    s.nchunks = (s.n + s.chunk - 1) / s.chunk;
    atomic_init(&s.next, 0);
    atomic_init(&s.done, 0);
    pthread_mutex_init(&s.lock, NULL);
    s.fill_fail.at = SIZE_MAX;
    s.ahead_fail.at = SIZE_MAX;
    s.ahead = b->ahead;
    s.npieces = s.ahead.src ? (s.ahead.n + AHEAD_PIECE - 1) / AHEAD_PIECE : 0;
    s.add_st = VG_OK;
    s.add_err = err;
    b->ahead.src = NULL;
    unsigned nt = VG_MIN(b->threads, (unsigned)(s.nchunks + s.npieces + (b->prev_n ? 1 : 0)));
    vg_parallel(nt ? nt : 1, stage_run, &s);
    pthread_mutex_destroy(&s.lock);
    /* Errors in file order: the previous batch's rows, then this
     * batch's, then the next window's bytes. */
    vg_status st = s.add_st;
    const failure *later[2] = {&s.fill_fail, &s.ahead_fail};
    for (int i = 0; i < 2 && st == VG_OK; i++) {
        if (later[i]->at == SIZE_MAX) continue;
        *err = later[i]->err;
        st = later[i]->st;
    }
    if (st != VG_OK) {
        clear_keys(b->rows, b->n);
        b->n = 0;
        return st;
    }
    /* The rows as read are the stored bytes: hash them before any row
     * moves (which is only when they are added, in the next run). */
    if (b->hash_src && b->fill)
        vg_src_hash_submit(b->hash_src, v->data + b->rows[0].file_row * v->ld,
                           b->n * v->dims * sizeof(float));
    vg_batch_row *t = b->prev;
    b->prev = b->rows;
    b->prev_n = b->n;
    b->rows = t;
    b->n = 0;
    return VG_OK;
}
