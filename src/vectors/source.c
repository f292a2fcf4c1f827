/* source.c - input files as chunks: mappings, hashing, page dropping,
 * progress, and the sequential reader over chunks.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "source_priv.h"

#include <errno.h>
#include <fcntl.h>
#include <string.h>
#include <sys/mman.h>
#include <sys/stat.h>
#include <unistd.h>

#include "../common/alloc.h"
#include "../common/infile.h"
#include "../common/filemap.h"
#include "vecgauge/vg_config.h"

/* Report progress at most every this many stored bytes. */
#define PROGRESS_STEP ((uint64_t)16 << 20)
/* The hashing thread: files from vg_src_hash_thread_min bytes get one
 * (tests lower it); it hashes pieces of
 * HASH_PIECE bytes, runs at most HASH_LEAD ahead of the readers, and the
 * readers wait when they get HASH_LAG ahead of it (the pages between the
 * two stay resident, so the lag bounds the memory they cost). */
size_t vg_src_hash_thread_min = (size_t)16 << 20;
#define HASH_PIECE ((size_t)4 << 20)
#define HASH_LEAD ((uint64_t)32 << 20)
#define HASH_LAG ((uint64_t)64 << 20)

/* What a mapped empty file (or the tail of a chunk) may read: zeros. */
static const char zero_pad[VG_SRC_PAD + 8];

static size_t page_size(void) { return (size_t)sysconf(_SC_PAGESIZE); }

static vg_src *src_new(const char *path, int hash, vg_error *err) {
    vg_src *s = vg_calloc(1, sizeof *s);
    if (!s) {
        vg_error_set(err, VG_ENOMEM, path, 0, "out of memory opening the file");
        return NULL;
    }
    s->fd = -1;
    s->map_fd = -1;
    s->peek_buf = -1;
    s->path = vg_strdup(path);
    s->hash = hash;
    if (hash) s->sha = vg_sha256_new();
    if (!s->path || (hash && !s->sha)) {
        vg_sha256_free(s->sha);
        vg_free(s->path);
        vg_free(s);
        vg_error_set(err, VG_ENOMEM, path, 0, "out of memory opening the file");
        return NULL;
    }
    pthread_mutex_init(&s->lock, NULL);
    pthread_cond_init(&s->cv_free, NULL);
    pthread_cond_init(&s->cv_full, NULL);
    pthread_cond_init(&s->cv_hash, NULL);
    s->chunk = VG_SRC_CHUNK;
    return s;
}

static int is_gzip_magic(const char *p, size_t n) {
    return n >= 2 && (unsigned char)p[0] == 0x1f && (unsigned char)p[1] == 0x8b;
}

/* Map a regular file with at least one page of zeros after it, so that
 * parsers may read VG_SRC_PAD bytes past the last one. */
static vg_status map_file(vg_src *s, int fd, size_t size, vg_error *err) {
    size_t span;
    void *base = vg_filemap(fd, size, page_size(), &span);
    if (!base && errno == EOVERFLOW)
        return vg_error_set(err, VG_ELIMIT, s->path, 0, "file too large to map");
    if (!base)
        return vg_error_set(err, errno == ENOMEM ? VG_ENOMEM : VG_EIO, s->path, 0,
                            "cannot map the file (%zu bytes): %s", size, strerror(errno));
    s->map_base = base;
    s->map_span = span;
    s->map = base;
    s->map_size = size;
    return VG_OK;
}

vg_status vg_src_open(const char *path, int hash, vg_progress_fn progress, void *progress_ctx,
                      vg_src **out, vg_error *err) {
    *out = NULL;
    vg_src *s = src_new(path, hash, err);
    if (!s) return VG_ENOMEM;
    s->progress = progress;
    s->progress_ctx = progress_ctx;
    /* A device or a directory is refused, a FIFO nobody writes to is an
     * error after a wait, never a hang (vg_infile_open). */
    int fd = -1, regular = 0;
    vg_status st = vg_infile_open(path, VG_IN_PIPE, &fd, &regular, err);
    struct stat sb;
    if (st != VG_OK) {
        fd = -1;
    } else if (fstat(fd, &sb) != 0) {
        st = vg_error_set(err, VG_EIO, path, 0, "cannot stat: %s", strerror(errno));
    } else if (regular) {
        s->stored = (uint64_t)sb.st_size;
        s->size_known = 1;
        if (sb.st_size > 0) {
            st = map_file(s, fd, (size_t)sb.st_size, err);
        } else {
            s->map = zero_pad;
        }
        s->map_fd = fd;
        fd = -1;
        if (st == VG_OK) {
            s->gzip = is_gzip_magic(s->map, s->map_size);
            s->kind = s->gzip ? SRC_STREAM : SRC_MAP;
        }
    } else {
        s->kind = SRC_STREAM; /* a pipe: read as it comes */
        s->fd = fd;
        fd = -1;
    }
    if (fd >= 0) close(fd);
    if (st == VG_OK && s->kind == SRC_STREAM) st = vg_stream_init(s, err);
    if (st != VG_OK) {
        vg_src_close(s);
        return st;
    }
    *out = s;
    return VG_OK;
}

vg_status vg_src_open_buffer(const void *data, size_t n, const char *name, int hash,
                             vg_src **out, vg_error *err) {
    *out = NULL;
    vg_src *s = src_new(name ? name : "<memory>", hash, err);
    if (!s) return VG_ENOMEM;
    size_t need;
    if (vg_add_overflow(n, VG_SRC_PAD, &need) || vg_bigbuf_reserve(&s->copy, need) != 0) {
        vg_src_close(s);
        return vg_error_set(err, VG_ENOMEM, name, 0, "out of memory copying %zu bytes", n);
    }
    if (n) memcpy(s->copy.p, data, n);
    s->map = s->copy.p;
    s->map_size = n;
    s->stored = n;
    s->size_known = 1;
    s->gzip = is_gzip_magic(s->map, n);
    s->kind = s->gzip ? SRC_STREAM : SRC_MAP;
    vg_status st = s->kind == SRC_STREAM ? vg_stream_init(s, err) : VG_OK;
    if (st != VG_OK) {
        vg_src_close(s);
        return st;
    }
    *out = s;
    return VG_OK;
}

void vg_src_limit_inflate(vg_src *s, unsigned ratio) { s->max_inflate = ratio; }

const char *vg_src_path(const vg_src *s) { return s->path; }
int vg_src_gzip(const vg_src *s) { return s->gzip; }
uint64_t vg_src_stored_bytes(const vg_src *s) { return s->size_known ? s->stored : s->raw_read; }

uint64_t vg_src_stream_bound(const vg_src *s) {
    if (!s->size_known) return 0;
    if (!s->gzip) return s->stored;
    return s->stored > UINT64_MAX / 1032 ? UINT64_MAX : s->stored * 1032;
}

const char *vg_src_mapping(const vg_src *s, size_t *n) {
    if (s->kind != SRC_MAP) return NULL;
    *n = s->map_size;
    return s->map;
}

int vg_src_file_fd(const vg_src *s) { return s->kind == SRC_MAP ? s->map_fd : -1; }

vg_status vg_src_peek(vg_src *s, const char **p, size_t *n, int *whole, vg_error *err) {
    if (s->kind == SRC_MAP) {
        *n = VG_MIN(s->map_size, s->chunk);
        *p = s->map;
        *whole = *n == s->map_size;
        s->peeked = 1;
        return VG_OK;
    }
    if (!s->peeked) {
        vg_status st = vg_stream_peek(s, err);
        if (st != VG_OK) return st;
        s->peeked = 1;
    }
    const vg_sbuf *b = &s->bufs[s->peek_buf];
    *p = b->p;
    *n = b->len;
    *whole = s->in_eof;
    return VG_OK;
}

/* Give back the mapped pages below both the readers and the hasher. The
 * page cache keeps the file, but the process's resident set then holds
 * only the bytes in flight, not a second copy of the file beside the
 * matrix. Anonymous copies (vg_src_open_buffer) must not be dropped: that
 * would zero them. Call under s->lock when the hasher runs. */
static void drop_behind(vg_src *s) {
    if (!s->map_base) return;
    uint64_t upto = s->sha ? VG_MIN(s->hashed, s->advanced) : s->advanced;
    /* Whole 2 MiB steps: a huge-page mapping is not split to drop part
     * of one. */
    uint64_t pg = upto & ~(uint64_t)(VG_FILEMAP_ALIGN - 1);
    if (pg > s->dropped) {
        madvise((char *)s->map_base + s->dropped, (size_t)(pg - s->dropped), MADV_DONTNEED);
        s->dropped = pg;
    }
}

static void *hasher(void *arg) {
    vg_src *s = arg;
    pthread_mutex_lock(&s->lock);
    if (s->hash_submit) {
        for (;;) {
            while (!s->hasher_stop && !s->hash_finishing && s->hq_count == 0)
                pthread_cond_wait(&s->cv_hash, &s->lock);
            if (s->hasher_stop || s->hq_count == 0) break;
            const char *p = s->hq_p[s->hq_head];
            size_t n = s->hq_n[s->hq_head];
            pthread_mutex_unlock(&s->lock);
            vg_sha256_update(s->sha, p, n);
            pthread_mutex_lock(&s->lock);
            s->hashed += n;
            s->hq_head = (s->hq_head + 1) % 8;
            s->hq_count--;
            drop_behind(s);
            pthread_cond_broadcast(&s->cv_hash);
        }
        pthread_mutex_unlock(&s->lock);
        return NULL;
    }
    /* Mapping mode: hash the mapped file (the bytes the readers walk, or
     * the compressed bytes the producer inflates) a bounded distance
     * ahead of the readers. */
    while (s->hashed < s->map_size) {
        while (!s->hasher_stop && s->hashed >= s->advanced + HASH_LEAD)
            pthread_cond_wait(&s->cv_hash, &s->lock);
        if (s->hasher_stop) break;
        uint64_t at = s->hashed;
        size_t n = (size_t)VG_MIN((uint64_t)HASH_PIECE, s->map_size - at);
        pthread_mutex_unlock(&s->lock);
        vg_sha256_update(s->sha, s->map + at, n);
        pthread_mutex_lock(&s->lock);
        s->hashed = at + n;
        drop_behind(s);
        pthread_cond_broadcast(&s->cv_hash);
    }
    pthread_mutex_unlock(&s->lock);
    return NULL;
}

void vg_src_hash_by_submit(vg_src *s) {
    VG_ASSERT(!s->started);
    if (s->sha && s->kind == SRC_MAP) s->hash_submit = 1;
}

void vg_src_hash_submit(vg_src *s, const void *p, size_t n) {
    if (!s->sha || !s->hash_submit || n == 0) return;
    if (!s->hasher_running) {
        vg_sha256_update(s->sha, p, n);
        s->hashed += n;
        s->hash_off += n;
        return;
    }
    pthread_mutex_lock(&s->lock);
    while (s->hq_count == 8) pthread_cond_wait(&s->cv_hash, &s->lock);
    int slot = (s->hq_head + s->hq_count) % 8;
    s->hq_p[slot] = p;
    s->hq_n[slot] = n;
    s->hq_count++;
    s->hash_off += n;
    pthread_cond_broadcast(&s->cv_hash);
    pthread_mutex_unlock(&s->lock);
}

void vg_src_hash_wait_upto(vg_src *s, uint64_t offset) {
    if (!s->hasher_running || !s->hash_submit) return;
    pthread_mutex_lock(&s->lock);
    while (s->hashed < offset && s->hashed < s->hash_off) pthread_cond_wait(&s->cv_hash, &s->lock);
    pthread_mutex_unlock(&s->lock);
}

uint64_t vg_src_hash_submitted(const vg_src *s) { return s->hash_off; }

static void hasher_join(vg_src *s, int to_the_end) {
    if (!s->hasher_running) return;
    pthread_mutex_lock(&s->lock);
    if (to_the_end) {
        s->advanced = s->map_size;
        s->hash_finishing = 1;
    } else {
        s->hasher_stop = 1;
    }
    pthread_cond_broadcast(&s->cv_hash);
    pthread_mutex_unlock(&s->lock);
    pthread_join(s->hasher, NULL);
    s->hasher_running = 0;
}

int vg_src_text_mode = VG_SRC_TEXT_AUTO;

/* Whether text from a regular file goes through read() rather than the
 * mapping. Where the page cache holds the file in 2 MiB folios (a file
 * read before, by cat or by an earlier load, rather than just written),
 * the mapping costs a fault per 2 MiB and the parsers read it in place:
 * no copy, and the hashing thread does nothing but hash, the one stage
 * that cannot be split. 400k x 300 text cached so, medians of 8 paired
 * runs: hashed 1.21 s by read(), 1.13 s through the mapping; unhashed
 * 0.73 s and 0.72 s. In small folios the mapping is the slower (hashed
 * 1.20 s against 1.41 s), so it is only taken where the probe says so. */
static int text_by_read(vg_src *s) {
    if (vg_src_text_mode != VG_SRC_TEXT_AUTO) return vg_src_text_mode == VG_SRC_TEXT_READ;
    return vg_filemap_cached_huge(s->map_base, s->map_size) != 1;
}

vg_status vg_src_start(vg_src *s, int lines, size_t chunk_bytes, vg_error *err) {
    VG_ASSERT(!s->started);
    s->started = 1;
    s->lines = lines;
    if (chunk_bytes) s->chunk = chunk_bytes;
    if (s->kind == SRC_MAP && lines && s->map_fd >= 0 && text_by_read(s)) {
        /* Text in small folios: read() the file into the producer's
         * huge-page buffers rather than walk the mapping, whose 4 KiB
         * entries cost a fault every few pages; the producer hashes what
         * it reads, as for a pipe. The mapping was only for detection. */
        if (lseek(s->map_fd, 0, SEEK_SET) == 0) {
            munmap(s->map_base, s->map_span);
            s->map_base = NULL;
            s->map = NULL;
            s->map_size = 0;
            s->fd = s->map_fd;
            s->map_fd = -1;
            s->kind = SRC_STREAM;
            s->peeked = 0;
            vg_status st = vg_stream_init(s, err);
            if (st == VG_OK) st = vg_stream_start(s, err);
            return st;
        }
    }
    if (s->sha && s->map && s->map_size >= vg_src_hash_thread_min &&
        pthread_create(&s->hasher, NULL, hasher, s) == 0)
        s->hasher_running = 1; /* else the readers hash as they go */
    if (s->kind == SRC_MAP) {
        s->next_off = 0;
        return VG_OK;
    }
    return vg_stream_start(s, err);
}

int vg_src_next(vg_src *s, vg_chunk *c, vg_error *err) {
    if (s->kind == SRC_STREAM) return vg_stream_next(s, c, err);
    pthread_mutex_lock(&s->lock);
    if (s->next_off >= s->map_size) {
        pthread_mutex_unlock(&s->lock);
        return 0;
    }
    size_t b = (size_t)s->next_off;
    size_t e = s->map_size - b > s->chunk ? b + s->chunk : s->map_size;
    if (s->lines && e < s->map_size) {
        const char *nl = memchr(s->map + e - 1, '\n', s->map_size - (e - 1));
        e = nl ? (size_t)(nl - s->map) + 1 : s->map_size;
    }
    c->data = s->map + b;
    c->len = e - b;
    c->offset = b;
    c->index = s->next_index++;
    c->last = e == s->map_size;
    c->raw_end = e;
    c->buf = -1;
    s->next_off = e;
    pthread_mutex_unlock(&s->lock);
    return 1;
}

void vg_src_cancel(vg_src *s) {
    pthread_mutex_lock(&s->lock);
    s->stop = 1;
    s->next_off = s->map_size;
    pthread_cond_broadcast(&s->cv_free);
    pthread_cond_broadcast(&s->cv_full);
    pthread_mutex_unlock(&s->lock);
}

void vg_src_hash_bytes(vg_src *s, const void *p, size_t n) {
    if (s->sha) vg_sha256_update(s->sha, p, n);
}

static vg_status report(vg_src *s, uint64_t done, int force, vg_error *err) {
    if (!s->progress) return VG_OK;
    if (!force && done - s->progress_last < PROGRESS_STEP) return VG_OK;
    s->progress_last = done;
    uint64_t total = s->size_known ? s->stored : 0;
    if (s->progress(s->progress_ctx, done, total) != 0)
        return vg_error_set(err, VG_EINTERRUPTED, s->path, 0, "stopped while reading");
    return VG_OK;
}

uint64_t vg_src_test_pread_fail_from = UINT64_MAX;

vg_status vg_src_pread(vg_src *s, void *dst, size_t n, uint64_t offset, vg_error *err) {
    if (offset > s->map_size || n > s->map_size - offset)
        return vg_error_set(err, VG_EINTERNAL, s->path, 0, "read past the end of the file");
    if (n > 0 && offset + n > vg_src_test_pread_fail_from)
        return vg_error_set(err, VG_EIO, s->path, 0, "read failed at byte %llu: %s",
                            (unsigned long long)offset, strerror(EIO));
    if (s->map_fd < 0) {
        memcpy(dst, s->map + offset, n);
        return VG_OK;
    }
    char *d = dst;
    while (n > 0) {
        ssize_t r = pread(s->map_fd, d, VG_MIN(n, (size_t)1 << 30), (off_t)offset);
        if (r < 0 && errno == EINTR) continue;
        if (r <= 0)
            return vg_error_set(err, r < 0 ? VG_EIO : VG_ETRUNCATED, s->path, 0,
                                "read failed at byte %llu: %s", (unsigned long long)offset,
                                r < 0 ? strerror(errno) : "the file shrank while being read");
        d += r;
        n -= (size_t)r;
        offset += (uint64_t)r;
    }
    return VG_OK;
}

void vg_src_willneed(vg_src *s, uint64_t offset, size_t n) {
#ifdef MADV_POPULATE_READ
    if (!s->map_base || offset >= s->map_size) return;
    n = (size_t)VG_MIN((uint64_t)n, s->map_size - offset);
    uint64_t pg = page_size();
    uint64_t b = offset & ~(pg - 1), e = (offset + n + pg - 1) & ~(pg - 1);
    madvise((char *)s->map_base + b, (size_t)(e - b), MADV_POPULATE_READ);
#else
    (void)s;
    (void)offset;
    (void)n;
#endif
}

vg_status vg_src_advance(vg_src *s, uint64_t offset, vg_error *err) {
    if (!s->map) return report(s, offset, 0, err);
    if (offset > s->map_size) offset = s->map_size;
    if (s->hasher_running) {
        pthread_mutex_lock(&s->lock);
        if (offset > s->advanced) s->advanced = offset;
        pthread_cond_broadcast(&s->cv_hash);
        while (!s->hash_submit && s->advanced > s->hashed + HASH_LAG)
            pthread_cond_wait(&s->cv_hash, &s->lock);
        drop_behind(s);
        pthread_mutex_unlock(&s->lock);
        return report(s, offset, 0, err);
    }
    if (offset > s->hashed && s->sha && !s->hash_submit) {
        vg_src_hash_bytes(s, s->map + s->hashed, (size_t)(offset - s->hashed));
        s->hashed = offset;
    }
    if (offset > s->advanced) s->advanced = offset;
    drop_behind(s);
    return report(s, offset, 0, err);
}

vg_status vg_src_release(vg_src *s, const vg_chunk *c, vg_error *err) {
    vg_status st;
    if (s->map) {
        st = vg_src_advance(s, c->raw_end, err);
    } else {
        st = report(s, c->raw_end, 0, err);
    }
    if (s->kind == SRC_STREAM) vg_stream_release(s, c);
    return st;
}

vg_status vg_src_finish(vg_src *s, vg_error *err) {
    if (s->finished) return VG_OK;
    s->finished = 1;
    vg_status st = VG_OK;
    if (s->kind == SRC_STREAM) vg_stream_stop(s);
    hasher_join(s, 1);
    if (s->hash_submit && s->sha && s->map) {
        /* What no reader handed over (a header, trailing bytes, rows
         * after --max-words): straight from the mapping, in order. */
        VG_ASSERT(s->hashed == s->hash_off);
        if (s->map_size > s->hashed)
            vg_sha256_update(s->sha, s->map + s->hashed, (size_t)(s->map_size - s->hashed));
        s->hashed = s->hash_off = s->map_size;
    }
    if (s->map) {
        st = vg_src_advance(s, s->map_size, err);
    } else if (s->fd >= 0) {
        st = vg_stream_drain(s, err);
    }
    if (st == VG_OK) st = report(s, vg_src_stored_bytes(s), 1, err);
    if (st == VG_OK && s->sha) {
        vg_sha256_final(s->sha, s->hex);
        s->sha = NULL;
    }
    return st;
}

const char *vg_src_sha256(const vg_src *s) { return s->hex; }

void vg_src_close(vg_src *s) {
    if (!s) return;
    if (s->kind == SRC_STREAM) vg_stream_stop(s);
    hasher_join(s, 0);
    if (s->map_base) munmap(s->map_base, s->map_span);
    vg_bigbuf_free(&s->copy);
    if (s->fd >= 0) close(s->fd);
    if (s->map_fd >= 0) close(s->map_fd);
    vg_sha256_free(s->sha);
    pthread_mutex_destroy(&s->lock);
    pthread_cond_destroy(&s->cv_free);
    pthread_cond_destroy(&s->cv_full);
    pthread_cond_destroy(&s->cv_hash);
    vg_free(s->path);
    vg_free(s);
}

/* ---- sequential reading ----------------------------------------------- */

vg_status vg_seq_begin(vg_seq *q, vg_src *src, vg_error *err) {
    memset(q, 0, sizeof *q);
    q->src = src;
    return vg_src_start(src, 0, 0, err);
}

/* Make cur hold unread bytes: 1, 0 at the end of the stream, -1 on error. */
static int fetch(vg_seq *q, vg_error *err) {
    while (!q->have || q->pos == q->cur.len) {
        if (q->have) {
            q->have = 0;
            if (vg_src_release(q->src, &q->cur, err) != VG_OK) return -1;
        }
        if (q->eof) return 0;
        int rc = vg_src_next(q->src, &q->cur, err);
        if (rc < 0) return -1;
        if (rc == 0) {
            q->eof = 1;
            return 0;
        }
        q->have = 1;
        q->pos = 0;
    }
    return 1;
}

const char *vg_seq_peek(vg_seq *q, size_t n, size_t *got, vg_error *err) {
    if (q->send == q->sbeg) {
        int rc = fetch(q, err);
        if (rc < 0) return NULL;
        if (rc == 0) {
            *got = 0;
            return zero_pad;
        }
        if (q->cur.len - q->pos >= n) {
            *got = n;
            return q->cur.data + q->pos;
        }
    }
    /* The bytes straddle chunks: gather them in scratch. */
    size_t need;
    if (vg_add_overflow(n, VG_SRC_PAD, &need)) need = (size_t)-1;
    if (q->sbeg > 0) {
        memmove(q->scratch, q->scratch + q->sbeg, q->send - q->sbeg);
        q->send -= q->sbeg;
        q->sbeg = 0;
    }
    if (need > q->scap) {
        char *ns = vg_realloc(q->scratch, need);
        if (!ns) {
            vg_error_set(err, VG_ENOMEM, vg_src_path(q->src), 0, "out of memory reading");
            return NULL;
        }
        q->scratch = ns;
        q->scap = need;
    }
    while (q->send < n) {
        int rc = fetch(q, err);
        if (rc < 0) return NULL;
        if (rc == 0) break;
        size_t take = VG_MIN(n - q->send, q->cur.len - q->pos);
        memcpy(q->scratch + q->send, q->cur.data + q->pos, take);
        q->send += take;
        q->pos += take;
    }
    memset(q->scratch + q->send, 0, VG_SRC_PAD);
    *got = VG_MIN(n, q->send);
    return q->scratch;
}

vg_status vg_seq_skip(vg_seq *q, size_t n, vg_error *err) {
    (void)err;
    q->consumed += n;
    size_t k = VG_MIN(n, q->send - q->sbeg);
    q->sbeg += k;
    n -= k;
    if (q->sbeg == q->send) q->sbeg = q->send = 0;
    if (n) {
        VG_ASSERT(q->have && q->cur.len - q->pos >= n);
        q->pos += n;
    }
    return VG_OK;
}

vg_status vg_seq_discard(vg_seq *q, uint64_t n, uint64_t *skipped, vg_error *err) {
    uint64_t done = 0;
    size_t k = (size_t)VG_MIN((uint64_t)(q->send - q->sbeg), n);
    q->sbeg += k;
    done += k;
    if (q->sbeg == q->send) q->sbeg = q->send = 0;
    while (done < n) {
        int rc = fetch(q, err);
        if (rc < 0) return err->code;
        if (rc == 0) break;
        size_t take = (size_t)VG_MIN((uint64_t)(q->cur.len - q->pos), n - done);
        q->pos += take;
        done += take;
    }
    q->consumed += done;
    if (skipped) *skipped = done;
    return VG_OK;
}

void vg_seq_end(vg_seq *q) {
    if (q->have) {
        vg_error ignored;
        vg_src_release(q->src, &q->cur, &ignored);
        q->have = 0;
    }
    vg_free(q->scratch);
    q->scratch = NULL;
    q->scap = q->sbeg = q->send = 0;
}
