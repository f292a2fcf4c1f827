/* text.c - the text layouts: "word v1 ... vD" rows, with or without a
 * "count dims" first line, parsed by all threads at once.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The source hands out newline-aligned chunks. Each thread takes the next
 * chunk, parses it into its own slot (words normalised and hashed, values
 * converted, norms computed), and the thread that finds the next chunk in
 * file order ready commits it to the builder. Commits happen strictly in
 * file order, so duplicates, row filters, --max-words and the first error
 * reported are the same whatever the number of threads.
 *
 * Without a row filter, each chunk's lines are counted first (a quick
 * pass) and numbered in file order, so that the thread parsing a chunk
 * writes the values straight into the matrix at its lines' places: no
 * copy, and the first touch of the matrix's fresh pages is shared by all
 * threads. The commit only moves a row down when an earlier one was
 * dropped (blank line, bad row, duplicate). With a filter, rows are parsed
 * into the slot and only the kept ones are copied.
 *
 * A row takes the fast path when it is "word v1 v2 ... vD" with single
 * spaces and an optional "\r" or trailing blanks: token ends come from a
 * 64-byte bitmap of delimiters and values from vg_parse_token. Anything
 * else (tabs, runs of blanks, a word holding spaces, a bad value) goes to
 * the careful path, which splits fields one by one and says exactly what
 * is wrong.
 */
#include <pthread.h>
#include <stdlib.h>
#include <string.h>

#ifdef __SSE2__
#include <emmintrin.h>
#endif

#include "../common/alloc.h"
#include "../common/threads.h"
#include "fastfloat.h"
#include "vectors_impl.h"

#define IS_BLANK(c) ((c) == ' ' || (c) == '\t')

enum { SLOT_FREE, SLOT_BUSY, SLOT_READY };
enum { ROW_OK, ROW_BLANK, ROW_BAD };

typedef struct trow {
    vg_rowkey key;
    float norm;
    uint64_t line;          /* within the chunk, 1-based */
    unsigned char bad, spaced;
} trow;

typedef struct tslot {
    int state;
    vg_chunk chunk;
    trow *rows;
    size_t n, cap;
    float *vals;            /* n x dims */
    size_t vcap;            /* rows that fit in vals */
    uint64_t lines;         /* lines in the chunk */
    int has_bad, saw_cr;
    vg_error bad_err;       /* the chunk's first bad row (line within chunk) */
    vg_status fatal;        /* out of memory while parsing */
    size_t *fs, *fe, fcap;  /* field offsets for the careful path */
    uint64_t base;          /* direct: matrix row of the chunk's first row line */
    uint64_t skip;          /* lines before it: the header, in the first chunk */
} tslot;

typedef struct tpipe {
    vg_src *src;
    vg_vectors *v;
    const vg_load_options *opt;
    const vg_detect *d;
    const char *path;
    size_t dims;
    pthread_mutex_t lock;
    pthread_cond_t cv;
    tslot *slots;
    unsigned nslots;
    uint64_t next_commit;
    uint64_t base_line;     /* lines of the committed chunks */
    int committing, stop, full;
    vg_status st;
    vg_error err;
    int src_failed, saw_cr;
    vg_error src_err;
    /* Direct mode: values parsed in place. Chunks get their first row in
     * index order (based, next_base); the matrix only grows while no
     * thread writes into it (writers == 0). */
    int direct;
    uint64_t based, next_base;
    int writers;
} tpipe;

/* ---- finding delimiters ---------------------------------------------- */

/* Bit i set when p[i] <= 0x20 (space, tab, '\r', '\n', NUL): every byte
 * that can end a number token. Non-delimiters among them send the row to
 * the careful path. */
static inline uint64_t delim_mask64(const char *p) {
#ifdef __SSE2__
    const __m128i t = _mm_set1_epi8(0x20);
    uint64_t m = 0;
    for (int k = 0; k < 4; k++) {
        __m128i x = _mm_loadu_si128((const __m128i *)(const void *)(p + 16 * k));
        __m128i le = _mm_cmpeq_epi8(_mm_max_epu8(x, t), t);
        m |= (uint64_t)(uint16_t)_mm_movemask_epi8(le) << (16 * k);
    }
    return m;
#else
    uint64_t m = 0;
    for (int i = 0; i < 64; i++) m |= (uint64_t)((unsigned char)p[i] <= 0x20) << i;
    return m;
#endif
}

/* The fast path: "word v1 ... vD" with single spaces. Returns 1 with the
 * word's length, the values and the start of the next line, 0 when the
 * row needs the careful path. Reads up to 64 bytes past end (padding). */
static int row_fast(const char *p, const char *end, size_t dims, float *vals, size_t *wlen,
                    const char **next, int *saw_cr) {
    const char *blk = p;
    uint64_t m = delim_mask64(blk);
    while (!m) {
        blk += 64;
        if (blk >= end) return 0;
        m = delim_mask64(blk);
    }
    const char *b = blk + __builtin_ctzll(m);
    m &= m - 1;
    if (b == p || b >= end || *b != ' ') return 0;
    *wlen = (size_t)(b - p);
    const char *a = b + 1;
    for (size_t j = 0; j < dims; j++) {
        while (!m) {
            blk += 64;
            if (blk > end) return 0;
            m = delim_mask64(blk);
        }
        b = blk + __builtin_ctzll(m);
        m &= m - 1;
        if (b > end || b == a) return 0;
        if (vg_parse_token(a, (size_t)(b - a), &vals[j]) != VG_FLOAT_OK) return 0;
        if (j + 1 < dims && *b != ' ') return 0;
        a = b + 1;
    }
    if (b == end) {
        *next = end;
        return 1;
    }
    if (*b == '\n') {
        *next = b + 1;
        return 1;
    }
    const char *q = b;
    while (q < end && (*q == ' ' || *q == '\t' || *q == '\r')) {
        if (*q == '\r') *saw_cr = 1;
        q++;
    }
    if (q == end) {
        *next = end;
        return 1;
    }
    if (*q == '\n') {
        *next = q + 1;
        return 1;
    }
    return 0;
}

/* ---- the careful path --------------------------------------------------- */

/* Split [line, line + len) into blank-separated fields. Returns the count,
 * or -1 when out of memory. */
static long split_fields(tslot *s, const char *line, size_t len) {
    long n = 0;
    size_t i = 0;
    while (i < len) {
        while (i < len && IS_BLANK(line[i])) i++;
        if (i >= len) break;
        size_t b = i;
        while (i < len && !IS_BLANK(line[i])) i++;
        if ((size_t)n + 1 > s->fcap) {
            size_t c1 = s->fcap, c2 = s->fcap;
            if (vg_grow((void **)&s->fs, &c1, (size_t)n + 1, sizeof *s->fs) != 0 ||
                vg_grow((void **)&s->fe, &c2, (size_t)n + 1, sizeof *s->fe) != 0)
                return -1;
            s->fcap = VG_MIN(c1, c2);
        }
        s->fs[n] = b;
        s->fe[n] = i;
        n++;
    }
    return n;
}

/* Parse one line the careful way. Returns ROW_OK (word, values filled),
 * ROW_BLANK, or ROW_BAD with *e saying why (line left 0). -1: no memory. */
static int row_slow(tslot *s, const char *line, size_t len, size_t dims, const char *path,
                    float *vals, const char **word, size_t *wlen, int *spaced, vg_error *e) {
    if (len > 0 && line[len - 1] == '\r') {
        len--;
        s->saw_cr = 1;
    }
    if (len > VG_MAX_LINE) {
        vg_error_set(e, VG_ELIMIT, path, 0, "line of %zu bytes is longer than the limit of %u", len,
                     (unsigned)VG_MAX_LINE);
        return ROW_BAD;
    }
    long nf = split_fields(s, line, len);
    if (nf < 0) return -1;
    if (nf == 0) return ROW_BLANK;
    if ((size_t)nf < dims + 1) {
        vg_error_set(e, VG_EFORMAT, path, 0, "expected a word and %zu values, found %ld field%s",
                     dims, nf, nf == 1 ? "" : "s");
        return ROW_BAD;
    }
    /* A word holding spaces: the last dims fields are the vector and
     * everything before them the word (common practice). But when the
     * field just before the values is itself a number, the row holds
     * more values than the others ("sun 1 0 0" among rows of two): rows
     * that disagree in width are an error, never a word "sun 1". */
    size_t first_val = (size_t)nf - dims;
    if (first_val > 1) {
        size_t f = first_val - 1;
        float ignored;
        int rc = vg_parse_token_slow(line + s->fs[f], s->fe[f] - s->fs[f], &ignored);
        if (rc == VG_FLOAT_OK || rc == VG_FLOAT_NOT_FINITE || rc == VG_FLOAT_UNDERFLOW) {
            size_t nums = 1;
            while (nums < f && vg_parse_token_slow(line + s->fs[f - nums],
                                                   s->fe[f - nums] - s->fs[f - nums],
                                                   &ignored) != VG_FLOAT_NOT_NUMBER)
                nums++;
            vg_error_set(e, VG_EFORMAT, path, 0,
                         "expected a word and %zu value%s, found %zu values after the word: "
                         "rows disagree in width (a word holding spaces cannot end in a number)",
                         dims, dims == 1 ? "" : "s", dims + nums);
            e->column = f + 1;
            return ROW_BAD;
        }
    }
    *word = line + s->fs[0];
    *wlen = s->fe[first_val - 1] - s->fs[0];
    *spaced = first_val > 1;
    for (size_t j = 0; j < dims; j++) {
        size_t f = first_val + j;
        const char *tok = line + s->fs[f];
        size_t tl = s->fe[f] - s->fs[f];
        int rc = vg_parse_token_slow(tok, tl, &vals[j]);
        if (rc != VG_FLOAT_OK) {
            int show = (int)VG_MIN(tl, (size_t)40);
            vg_error_set(e, VG_EVALUE, path, 0,
                         rc == VG_FLOAT_NOT_FINITE ? "value %zu is not finite: '%.*s'"
                         : rc == VG_FLOAT_UNDERFLOW
                             ? "value %zu is not zero but underflows to 0 in float32: '%.*s'"
                             : "value %zu is not a number: '%.*s'",
                         j + 1, show, tok);
            e->column = f + 1;
            return ROW_BAD;
        }
    }
    return ROW_OK;
}

/* ---- one chunk ------------------------------------------------------- */

/* Lines in a chunk: its '\n's, plus a last line without one. */
static uint64_t count_lines(const char *p, size_t n) {
    uint64_t c = 0;
    size_t i = 0;
#ifdef __SSE2__
    /* Byte counters (a match is -1, subtracted) summed by _mm_sad_epu8
     * before they can wrap, every 255 blocks. */
    const __m128i nl = _mm_set1_epi8('\n'), zero = _mm_setzero_si128();
    while (i + 16 <= n) {
        __m128i acc = zero;
        size_t stop = i + 16 * VG_MIN((size_t)255, (n - i) / 16);
        for (; i < stop; i += 16) {
            __m128i x = _mm_loadu_si128((const __m128i *)(const void *)(p + i));
            acc = _mm_sub_epi8(acc, _mm_cmpeq_epi8(x, nl));
        }
        __m128i sums = _mm_sad_epu8(acc, zero);
        c += (uint64_t)_mm_cvtsi128_si64(sums) + (uint64_t)_mm_cvtsi128_si64(_mm_unpackhi_epi64(sums, sums));
    }
#endif
    for (; i < n; i++) c += p[i] == '\n';
    if (n > 0 && p[n - 1] != '\n') c++;
    return c;
}

static void slot_clear_keys(tslot *s) {
    for (size_t i = 0; i < s->n; i++) vg_rowkey_clear(&s->rows[i].key);
    s->n = 0;
}

static int slot_room(tslot *s, size_t dims) {
    if (s->n == s->cap && vg_grow((void **)&s->rows, &s->cap, s->n + 1, sizeof *s->rows) != 0)
        return -1;
    if (dims && s->n == s->vcap) {
        size_t ncap = s->vcap ? s->vcap * 2 : 256;
        size_t bytes;
        if (vg_mul_overflow(ncap, dims * sizeof(float), &bytes)) return -1;
        float *nv = vg_realloc(s->vals, bytes);
        if (!nv) return -1;
        s->vals = nv;
        s->vcap = ncap;
    }
    return 0;
}

/* Direct mode: the matrix row of the chunk's line (1-based). In a file
 * without blank lines, bad rows or duplicates it is the row's final one,
 * so the commit copies nothing. */
static float *direct_place(const tpipe *tp, const tslot *s, uint64_t line) {
    return tp->v->data + (s->base + line - 1 - s->skip) * tp->v->ld;
}

/* Where the values of the chunk's line go. */
static float *row_place(tpipe *tp, tslot *s, uint64_t line) {
    if (tp->direct) return direct_place(tp, s, line);
    return s->vals + s->n * tp->dims;
}

static void parse_chunk(tpipe *tp, tslot *s) {
    slot_clear_keys(s);
    s->has_bad = 0;
    s->saw_cr = 0;
    s->fatal = VG_OK;
    const char *p = s->chunk.data, *end = p + s->chunk.len;
    uint64_t lines = 0;
    size_t dims = tp->dims;
    if (s->chunk.offset == 0) {
        p += tp->d->header_bytes;
        if (tp->d->has_header) lines = 1;
    }
    while (p < end) {
        lines++;
        if (*p == '\n') {
            p++;
            continue;
        }
        if (slot_room(s, tp->direct ? 0 : dims) != 0) {
            s->fatal = VG_ENOMEM;
            break;
        }
        trow *r = &s->rows[s->n];
        memset(r, 0, sizeof *r);
        float *vals = row_place(tp, s, lines);
        const char *word = p, *next;
        size_t wlen = 0;
        int spaced = 0;
        if (!row_fast(p, end, dims, vals, &wlen, &next, &s->saw_cr)) {
            const char *nl = memchr(p, '\n', (size_t)(end - p));
            const char *le = nl ? nl : end;
            next = nl ? nl + 1 : end;
            vg_error e;
            int rc = row_slow(s, p, (size_t)(le - p), dims, tp->path, vals, &word, &wlen, &spaced, &e);
            if (rc < 0) {
                s->fatal = VG_ENOMEM;
                break;
            }
            if (rc == ROW_BLANK) {
                p = next;
                continue;
            }
            if (rc == ROW_BAD) {
                r->bad = 1;
                r->line = lines;
                if (!s->has_bad) {
                    s->bad_err = e;
                    s->has_bad = 1;
                }
                s->n++;
                p = next;
                continue;
            }
        }
        if (wlen > VG_MAX_WORD) {
            r->bad = 1;
            r->line = lines;
            if (!s->has_bad) {
                vg_error_set(&s->bad_err, VG_ELIMIT, tp->path, 0,
                             "word of %zu bytes exceeds the limit of %u", wlen,
                             (unsigned)VG_MAX_WORD);
                s->has_bad = 1;
            }
            s->n++;
            p = next;
            continue;
        }
        if (vg_rowkey_make(tp->v, word, wlen, &r->key) != 0) {
            s->fatal = VG_ENOMEM;
            break;
        }
        r->norm = vg_row_norm(vals, dims);
        r->line = lines;
        r->spaced = (unsigned char)spaced;
        s->n++;
        p = next;
    }
    s->lines = lines;
}

/* Offer a parsed chunk's rows to the builder, in order. Returns VG_OK,
 * an error, or VG_OK with tp->full set when --max-words is reached. */
static vg_status commit(tpipe *tp, tslot *s, vg_error *err) {
    vg_vectors *v = tp->v;
    const vg_load_options *opt = tp->opt;
    size_t dims = tp->dims;
    for (size_t i = 0; i < s->n; i++) {
        const trow *r = &s->rows[i];
        /* The index lookup is the commit's cache miss: ask early. */
        if (i + 8 < s->n && !s->rows[i + 8].bad) vg_strmap_prefetch(&v->index, s->rows[i + 8].key.hash);
        if (opt->max_words && v->info.rows_read + v->info.bad_rows >= opt->max_words) {
            tp->full = 1;
            return VG_OK;
        }
        uint64_t line = tp->base_line + r->line;
        if (r->bad) {
            if (opt->skip_bad_rows) {
                v->info.bad_rows++;
                continue;
            }
            /* The first bad row reached is the chunk's first. */
            *err = s->bad_err;
            err->line = line;
            return err->code;
        }
        if (r->spaced) v->info.words_with_spaces++;
        float *dst;
        vg_status st = vg_vecbuild_add(v, &r->key, r->norm, &dst, tp->path, line, err);
        if (st != VG_OK) return st;
        if (!dst) continue;
        if (!tp->direct) {
            memcpy(dst, s->vals + i * dims, dims * sizeof(float));
        } else {
            /* In place already, unless an earlier row was dropped; the
             * row's own place is always later, so the two never overlap. */
            const float *src = direct_place(tp, s, r->line);
            if (dst != src) memcpy(dst, src, dims * sizeof(float));
        }
    }
    if (s->fatal != VG_OK)
        return vg_error_set(err, s->fatal, tp->path, tp->base_line + s->lines,
                            "out of memory parsing rows");
    if (s->saw_cr) tp->saw_cr = 1;
    tp->base_line += s->lines;
    return vg_src_release(tp->src, &s->chunk, err);
}

static tslot *find_slot(tpipe *tp, int state, uint64_t index, int by_index) {
    for (unsigned i = 0; i < tp->nslots; i++) {
        tslot *s = &tp->slots[i];
        if (s->state == state && (!by_index || s->chunk.index == index)) return s;
    }
    return NULL;
}

static void worker(void *ctx, unsigned t, unsigned nt) {
    (void)t;
    (void)nt;
    tpipe *tp = ctx;
    for (;;) {
        pthread_mutex_lock(&tp->lock);
        tslot *s = NULL;
        while (!tp->stop && !(s = find_slot(tp, SLOT_FREE, 0, 0))) pthread_cond_wait(&tp->cv, &tp->lock);
        if (tp->stop) {
            pthread_mutex_unlock(&tp->lock);
            return;
        }
        s->state = SLOT_BUSY;
        pthread_mutex_unlock(&tp->lock);

        vg_error e;
        int rc = vg_src_next(tp->src, &s->chunk, &e);
        if (rc <= 0) {
            pthread_mutex_lock(&tp->lock);
            s->state = SLOT_FREE;
            if (rc < 0 && !tp->src_failed) {
                tp->src_failed = 1;
                tp->src_err = e;
            }
            pthread_cond_broadcast(&tp->cv);
            pthread_mutex_unlock(&tp->lock);
            return;
        }
        if (tp->direct) {
            uint64_t lines = count_lines(s->chunk.data, s->chunk.len);
            s->skip = s->chunk.offset == 0 && tp->d->has_header && lines > 0;
            lines -= s->skip;
            pthread_mutex_lock(&tp->lock);
            while (!tp->stop && tp->based != s->chunk.index) pthread_cond_wait(&tp->cv, &tp->lock);
            if (!tp->stop) {
                s->base = tp->next_base;
                tp->next_base += lines;
                tp->based++;
                pthread_cond_broadcast(&tp->cv);
            }
            size_t need = (size_t)(s->base + lines);
            while (!tp->stop && need > tp->v->cap_rows) {
                if (tp->writers == 0) {
                    if (vg_vecbuild_reserve(tp->v, need) != 0) {
                        tp->st = vg_error_set(&tp->err, VG_ENOMEM, tp->path, 0,
                                              "out of memory for a matrix of %zu rows", need);
                        tp->stop = 1;
                        vg_src_cancel(tp->src);
                        pthread_cond_broadcast(&tp->cv);
                    }
                } else {
                    pthread_cond_wait(&tp->cv, &tp->lock);
                }
            }
            if (tp->stop) {
                s->state = SLOT_FREE;
                pthread_mutex_unlock(&tp->lock);
                return;
            }
            tp->writers++;
            pthread_mutex_unlock(&tp->lock);
        }
        parse_chunk(tp, s);

        pthread_mutex_lock(&tp->lock);
        s->state = SLOT_READY;
        if (tp->direct) {
            tp->writers--;
            pthread_cond_broadcast(&tp->cv);
        }
        if (!tp->committing) {
            /* Commit every chunk that is next in file order and ready;
             * the check and the hand-back of the role happen under the
             * lock, so a chunk made ready meanwhile is never left over. */
            tp->committing = 1;
            tslot *c;
            while (!tp->stop && (c = find_slot(tp, SLOT_READY, tp->next_commit, 1))) {
                tp->writers++; /* commits move rows within the matrix */
                pthread_mutex_unlock(&tp->lock);
                vg_error ce;
                vg_status st = commit(tp, c, &ce);
                pthread_mutex_lock(&tp->lock);
                tp->writers--;
                c->state = SLOT_FREE;
                tp->next_commit++;
                if (st != VG_OK || tp->full) {
                    if (st != VG_OK) {
                        tp->st = st;
                        tp->err = ce;
                    }
                    tp->stop = 1;
                    vg_src_cancel(tp->src);
                }
                pthread_cond_broadcast(&tp->cv);
            }
            tp->committing = 0;
        }
        pthread_mutex_unlock(&tp->lock);
    }
}

vg_status vg_read_text(vg_src *src, const vg_detect *d, const vg_load_options *opt,
                       vg_vectors **out, vg_error *err) {
    *out = NULL;
    const char *path = vg_src_path(src);
    size_t dims = d->dims;
    /* Rows the input can hold: every row takes at least a word, and a
     * delimiter and a digit per value (no bound for a pipe). */
    uint64_t stream_max = vg_src_stream_bound(src);
    size_t bound = stream_max ? (size_t)VG_MIN(stream_max / (2 * (uint64_t)dims + 1) + 1, (uint64_t)SIZE_MAX / 2) : 0;
    vg_vectors *v = NULL;
    vg_status st = vg_vecbuild_begin(dims, d->has_header ? d->header_rows : 0, bound, opt, &v, err);
    if (st != VG_OK) {
        if (err->path[0] == '\0') snprintf(err->path, sizeof err->path, "%s", path);
        return st;
    }
    /* A small file is one or two chunks: threads would only wait. */
    unsigned nt = vg_threads_resolve(opt->threads);
    if (!vg_src_gzip(src) && stream_max && stream_max < ((uint64_t)8 << 20)) nt = 1;
    st = vg_src_start(src, 1, 0, err);
    if (st != VG_OK) {
        vg_vectors_free(v);
        return st;
    }

    tpipe tp;
    memset(&tp, 0, sizeof tp);
    tp.src = src;
    tp.v = v;
    tp.opt = opt;
    tp.d = d;
    tp.path = path;
    tp.dims = dims;
    tp.nslots = 2 * nt + 1;
    tp.direct = !v->keep_active;
    tp.slots = vg_calloc(tp.nslots, sizeof *tp.slots);
    if (!tp.slots) {
        vg_vectors_free(v);
        return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
    }
    pthread_mutex_init(&tp.lock, NULL);
    pthread_cond_init(&tp.cv, NULL);
    vg_parallel(nt, worker, &tp);

    st = tp.st;
    if (st != VG_OK) {
        *err = tp.err;
    } else if (tp.src_failed) {
        st = tp.src_err.code;
        *err = tp.src_err;
    }
    for (unsigned i = 0; i < tp.nslots; i++) {
        slot_clear_keys(&tp.slots[i]);
        vg_free(tp.slots[i].rows);
        vg_free(tp.slots[i].vals);
        vg_free(tp.slots[i].fs);
        vg_free(tp.slots[i].fe);
    }
    vg_free(tp.slots);
    pthread_mutex_destroy(&tp.lock);
    pthread_cond_destroy(&tp.cv);

    if (st == VG_OK) {
        v->info.crlf = tp.saw_cr;
        size_t present = v->info.rows_read + v->info.bad_rows;
        if (d->has_header && !opt->allow_short && present != d->header_rows &&
            !(opt->max_words && present >= opt->max_words)) {
            st = vg_error_set(err, VG_ETRUNCATED, path, tp.base_line,
                              "header promises %zu rows but the file has %zu "
                              "(truncated download? --allow-short accepts it)",
                              d->header_rows, present);
        }
    }
    if (st == VG_OK) st = vg_vecbuild_finish(v, err);
    if (st != VG_OK) {
        vg_vectors_free(v);
        return st;
    }
    *out = v;
    return VG_OK;
}
