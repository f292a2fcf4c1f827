/* gzip.c - the producer thread of streamed sources: inflate gzip (or copy
 * a pipe) into a ring of buffers while the readers parse earlier ones.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Decompression is sequential, so overlapping it with parsing is the only
 * way a gzip file loads at the speed of decompression alone: one thread
 * inflates, the others parse. zlib checks each member's CRC-32 and length;
 * concatenated members (what `cat a.gz b.gz` and pigz produce) are read
 * one after another, as gzip(1) does; zero bytes after the last member
 * (padding some tools add) are ignored, anything else there is an error.
 */
#include <errno.h>
#include <stdio.h>
#include <string.h>
#include <unistd.h>

#include "../common/alloc.h"
#include "source_priv.h"
#include "vecgauge/vg_config.h"

/* Buffers in the ring: enough for every parser thread to hold one while
 * the producer fills the next. */
#define NBUFS 8
/* Largest buffer a line may force (a longer line is an error). */
#define LINE_LIMIT ((size_t)VG_MAX_LINE + VG_SRC_CHUNK)
#define PIPE_IN ((size_t)1 << 20)

static vg_status set_perr(vg_src *s, vg_status code, const char *fmt, const char *arg) {
    return vg_error_set(&s->perr, code, s->path, 0, fmt, arg);
}

/* More input for a pipe: 1 if some arrived, 0 at its end, -1 on error. */
static int refill(vg_src *s) {
    if (s->map || s->fd < 0) return 0;
    for (;;) {
        ssize_t n = read(s->fd, s->inbuf, s->inbuf_cap);
        if (n < 0 && errno == EINTR) continue;
        if (n < 0) {
            set_perr(s, VG_EIO, "read failed: %s", strerror(errno));
            return -1;
        }
        vg_src_hash_bytes(s, s->inbuf, (size_t)n);
        s->raw_read += (uint64_t)n;
        s->in_next = s->inbuf;
        s->in_left = (size_t)n;
        return n > 0;
    }
}

/* Stored bytes consumed so far (for hashing and progress). */
static uint64_t raw_pos(const vg_src *s) {
    if (s->map) return (uint64_t)((const char *)s->in_next - s->map) - s->z.avail_in;
    return s->raw_read;
}

vg_status vg_stream_init(vg_src *s, vg_error *err) {
    s->bufs = vg_calloc(NBUFS, sizeof *s->bufs);
    s->queue = vg_calloc(NBUFS, sizeof *s->queue);
    s->freel = vg_calloc(NBUFS, sizeof *s->freel);
    if (!s->bufs || !s->queue || !s->freel)
        return vg_error_set(err, VG_ENOMEM, s->path, 0, "out of memory for read buffers");
    s->nbufs = NBUFS;
    for (int i = 0; i < NBUFS; i++) {
        /* Huge pages: the parsers walk every byte of every buffer. */
        if (vg_bigbuf_reserve(&s->bufs[i].mem, s->chunk + VG_SRC_PAD) != 0)
            return vg_error_set(err, VG_ENOMEM, s->path, 0, "out of memory for read buffers");
        s->bufs[i].cap = s->chunk;
        s->bufs[i].p = s->bufs[i].mem.p;
    }
    if (s->map) {
        s->in_next = (const unsigned char *)s->map;
        s->in_left = s->map_size;
    } else {
        s->inbuf_cap = PIPE_IN;
        s->inbuf = vg_malloc(PIPE_IN);
        if (!s->inbuf)
            return vg_error_set(err, VG_ENOMEM, s->path, 0, "out of memory for read buffers");
        /* The magic bytes decide; a pipe may deliver them one at a time. */
        size_t have = 0;
        while (have < 2) {
            ssize_t n = read(s->fd, s->inbuf + have, s->inbuf_cap - have);
            if (n < 0 && errno == EINTR) continue;
            if (n < 0) return vg_error_set(err, VG_EIO, s->path, 0, "read failed: %s", strerror(errno));
            if (n == 0) break;
            vg_src_hash_bytes(s, s->inbuf + have, (size_t)n);
            have += (size_t)n;
            s->raw_read += (uint64_t)n;
        }
        s->in_next = s->inbuf;
        s->in_left = have;
        s->gzip = have >= 2 && s->inbuf[0] == 0x1f && s->inbuf[1] == 0x8b;
    }
    if (s->gzip) {
        memset(&s->z, 0, sizeof s->z);
        /* 15 + 16: a gzip wrapper only (RFC 1952), with its CRC checked. */
        if (inflateInit2(&s->z, 15 + 16) != Z_OK)
            return vg_error_set(err, VG_ENOMEM, s->path, 0, "cannot start zlib");
        s->z_init = 1;
    }
    return VG_OK;
}

/* After a member's end: another member, zero padding, or an error.
 * Returns 0 to go on, 1 at the clean end of the input, -1 on error. */
static int next_member(vg_src *s) {
    for (;;) {
        while (s->in_left && *s->in_next == 0) {
            s->in_next++;
            s->in_left--;
        }
        if (s->in_left == 0) {
            int rc = refill(s);
            if (rc < 0) return -1;
            if (rc == 0) return 1;
            continue;
        }
        if (*s->in_next == 0x1f) {
            inflateReset(&s->z);
            s->member_done = 0;
            return 0;
        }
        char where[32];
        snprintf(where, sizeof where, "%llu", (unsigned long long)raw_pos(s));
        set_perr(s, VG_EFORMAT, "unexpected bytes after the gzip data at offset %s", where);
        return -1;
    }
}

/* Fill b from b->len up to its capacity or the end of the input.
 * Returns 0, or -1 with s->perr set. */
static int fill(vg_src *s, vg_sbuf *b) {
    while (b->len < b->cap && !s->in_eof) {
        if (!s->gzip) {
            if (s->in_left) {
                size_t take = VG_MIN(s->in_left, b->cap - b->len);
                memcpy(b->p + b->len, s->in_next, take);
                s->in_next += take;
                s->in_left -= take;
                b->len += take;
                continue;
            }
            ssize_t n = read(s->fd, b->p + b->len, b->cap - b->len);
            if (n < 0 && errno == EINTR) continue;
            if (n < 0) {
                set_perr(s, VG_EIO, "read failed: %s", strerror(errno));
                return -1;
            }
            if (n == 0) {
                s->in_eof = 1;
                break;
            }
            vg_src_hash_bytes(s, b->p + b->len, (size_t)n);
            s->raw_read += (uint64_t)n;
            b->len += (size_t)n;
            continue;
        }
        if (s->member_done) {
            int rc = next_member(s);
            if (rc < 0) return -1;
            if (rc > 0) {
                s->in_eof = 1;
                break;
            }
        }
        if (s->z.avail_in == 0) {
            if (s->in_left == 0) {
                int rc = refill(s);
                if (rc < 0) return -1;
                if (rc == 0) {
                    set_perr(s, VG_ETRUNCATED, "%s", "gzip data ends early (truncated download?)");
                    return -1;
                }
            }
            size_t give = VG_MIN(s->in_left, (size_t)1 << 30);
            s->z.next_in = (unsigned char *)(uintptr_t)s->in_next;
            s->z.avail_in = (uInt)give;
            s->in_next += give;
            s->in_left -= give;
        }
        size_t room = VG_MIN(b->cap - b->len, (size_t)1 << 30);
        s->z.next_out = (unsigned char *)b->p + b->len;
        s->z.avail_out = (uInt)room;
        int rc = inflate(&s->z, Z_NO_FLUSH);
        b->len += room - s->z.avail_out;
        s->inflated += room - s->z.avail_out;
        if (s->max_inflate && s->inflated > VG_INFLATE_FLOOR &&
            s->inflated / s->max_inflate > raw_pos(s)) {
            /* A bomb: stop before its bytes reach memory. */
            char why[160];
            snprintf(why, sizeof why,
                     "%llu stored bytes inflate to more than %llu, over %u times their size",
                     (unsigned long long)raw_pos(s), (unsigned long long)s->inflated,
                     s->max_inflate);
            set_perr(s, VG_ELIMIT,
                     "gzip data: %s; real vector files inflate 3 to 5 times (--max-inflate "
                     "raises the bound)",
                     why);
            return -1;
        }
        if (rc == Z_STREAM_END) {
            /* Hand back what zlib did not use: the next member's bytes. */
            s->in_next -= s->z.avail_in;
            s->in_left += s->z.avail_in;
            s->z.avail_in = 0;
            s->member_done = 1;
        } else if (rc == Z_MEM_ERROR) {
            set_perr(s, VG_ENOMEM, "%s", "out of memory in zlib");
            return -1;
        } else if (rc != Z_OK && rc != Z_BUF_ERROR) {
            set_perr(s, VG_EFORMAT, "corrupt gzip data: %s", s->z.msg ? s->z.msg : "unknown error");
            return -1;
        }
    }
    b->raw_end = raw_pos(s);
    return 0;
}

vg_status vg_stream_peek(vg_src *s, vg_error *err) {
    vg_sbuf *b = &s->bufs[0];
    b->len = 0;
    if (fill(s, b) != 0) {
        *err = s->perr;
        return err->code;
    }
    s->peek_buf = 0;
    s->nfree = 0;
    for (int i = 1; i < s->nbufs; i++) s->freel[s->nfree++] = i;
    return VG_OK;
}

/* Lines mode: cut b after its last '\n' and keep the rest for the next
 * buffer, growing b while a line does not fit. 0, or -1 on error. */
static int cut_lines(vg_src *s, vg_sbuf *b) {
    size_t scanned = 0;
    for (;;) {
        if (s->in_eof) {
            s->carry_len = 0;
            return 0;
        }
        const char *nl = b->len > scanned ? memrchr(b->p + scanned, '\n', b->len - scanned) : NULL;
        if (nl) {
            size_t keep = (size_t)(nl - b->p) + 1;
            size_t rest = b->len - keep;
            if (rest > s->carry_cap) {
                char *nc = vg_realloc(s->carry, rest);
                if (!nc) {
                    set_perr(s, VG_ENOMEM, "%s", "out of memory reading lines");
                    return -1;
                }
                s->carry = nc;
                s->carry_cap = rest;
            }
            memcpy(s->carry, b->p + keep, rest);
            s->carry_len = rest;
            b->len = keep;
            return 0;
        }
        if (b->cap >= LINE_LIMIT) {
            char lim[32];
            snprintf(lim, sizeof lim, "%u", (unsigned)VG_MAX_LINE);
            set_perr(s, VG_ELIMIT, "a line is longer than %s bytes", lim);
            return -1;
        }
        scanned = b->len;
        size_t ncap = VG_MIN(b->cap * 2, LINE_LIMIT);
        if (vg_bigbuf_reserve(&b->mem, ncap + VG_SRC_PAD) != 0) {
            set_perr(s, VG_ENOMEM, "%s", "out of memory for a long line");
            return -1;
        }
        b->p = b->mem.p;
        b->cap = ncap;
        if (fill(s, b) != 0) return -1;
    }
}

static void *producer(void *arg) {
    vg_src *s = arg;
    for (;;) {
        pthread_mutex_lock(&s->lock);
        while (!s->stop && s->peek_buf < 0 && s->nfree == 0) pthread_cond_wait(&s->cv_free, &s->lock);
        if (s->stop) {
            pthread_mutex_unlock(&s->lock);
            break;
        }
        int id;
        int fresh = s->peek_buf < 0;
        if (!fresh) {
            id = s->peek_buf;
            s->peek_buf = -1;
        } else {
            id = s->freel[--s->nfree];
        }
        pthread_mutex_unlock(&s->lock);

        vg_sbuf *b = &s->bufs[id];
        int bad = 0;
        if (fresh) {
            b->len = 0;
            if (s->carry_len > b->cap) {
                /* A grown buffer's carry: grow this one too. */
                if (vg_bigbuf_reserve(&b->mem, s->carry_len + VG_SRC_PAD) != 0) {
                    set_perr(s, VG_ENOMEM, "%s", "out of memory for a long line");
                    bad = 1;
                } else {
                    b->p = b->mem.p;
                    b->cap = s->carry_len;
                }
            }
            if (!bad) {
                memcpy(b->p, s->carry, s->carry_len);
                b->len = s->carry_len;
                s->carry_len = 0;
                bad = fill(s, b) != 0;
            }
        }
        if (!bad && s->lines) bad = cut_lines(s, b) != 0;
        memset(b->p + b->len, 0, VG_SRC_PAD);

        pthread_mutex_lock(&s->lock);
        int end = bad || (s->in_eof && s->carry_len == 0);
        if (bad) {
            s->perr_set = 1;
            s->freel[s->nfree++] = id;
        } else if (b->len > 0) {
            s->queue[(s->qhead + s->qcount) % s->nbufs] = id;
            s->qcount++;
        } else {
            s->freel[s->nfree++] = id;
        }
        if (end) s->done = 1;
        pthread_cond_broadcast(&s->cv_full);
        pthread_mutex_unlock(&s->lock);
        if (end) break;
    }
    return NULL;
}

vg_status vg_stream_start(vg_src *s, vg_error *err) {
    if (!s->peeked) {
        vg_status st = vg_stream_peek(s, err);
        if (st != VG_OK) return st;
        s->peeked = 1;
    }
    if (pthread_create(&s->producer, NULL, producer, s) != 0)
        return vg_error_set(err, VG_EINTERNAL, s->path, 0, "cannot start the reading thread");
    s->producer_running = 1;
    return VG_OK;
}

int vg_stream_next(vg_src *s, vg_chunk *c, vg_error *err) {
    pthread_mutex_lock(&s->lock);
    while (s->qcount == 0 && !s->done && !s->stop) pthread_cond_wait(&s->cv_full, &s->lock);
    if (s->qcount > 0) {
        int id = s->queue[s->qhead];
        s->qhead = (s->qhead + 1) % s->nbufs;
        s->qcount--;
        const vg_sbuf *b = &s->bufs[id];
        c->data = b->p;
        c->len = b->len;
        c->offset = s->out_off;
        c->index = s->next_index++;
        c->raw_end = b->raw_end;
        c->buf = id;
        s->out_off += b->len;
        c->last = s->done && s->qcount == 0;
        pthread_mutex_unlock(&s->lock);
        return 1;
    }
    int rc = 0;
    if (s->perr_set) {
        *err = s->perr;
        rc = -1;
    }
    pthread_mutex_unlock(&s->lock);
    return rc;
}

void vg_stream_release(vg_src *s, const vg_chunk *c) {
    pthread_mutex_lock(&s->lock);
    s->freel[s->nfree++] = c->buf;
    pthread_cond_signal(&s->cv_free);
    pthread_mutex_unlock(&s->lock);
}

void vg_stream_stop(vg_src *s) {
    if (s->producer_running) {
        pthread_mutex_lock(&s->lock);
        s->stop = 1;
        pthread_cond_broadcast(&s->cv_free);
        pthread_cond_broadcast(&s->cv_full);
        pthread_mutex_unlock(&s->lock);
        pthread_join(s->producer, NULL);
        s->producer_running = 0;
    }
    if (s->z_init) {
        inflateEnd(&s->z);
        s->z_init = 0;
    }
    for (int i = 0; s->bufs && i < s->nbufs; i++) vg_bigbuf_free(&s->bufs[i].mem);
    vg_free(s->bufs);
    vg_free(s->queue);
    vg_free(s->freel);
    vg_free(s->carry);
    vg_free(s->inbuf);
    s->bufs = NULL;
    s->queue = s->freel = NULL;
    s->carry = NULL;
    s->inbuf = NULL;
    s->nbufs = 0;
}

vg_status vg_stream_drain(vg_src *s, vg_error *err) {
    if (s->fd < 0) return VG_OK;
    char buf[1 << 16];
    for (;;) {
        ssize_t n = read(s->fd, buf, sizeof buf);
        if (n < 0 && errno == EINTR) continue;
        if (n < 0) return vg_error_set(err, VG_EIO, s->path, 0, "read failed: %s", strerror(errno));
        if (n == 0) return VG_OK;
        vg_src_hash_bytes(s, buf, (size_t)n);
        s->raw_read += (uint64_t)n;
    }
}
