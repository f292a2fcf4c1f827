/* source_priv.h - the inside of vg_src, shared by source.c (mappings,
 * hashing, sequential reading) and gzip.c (the producer thread).
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_SOURCE_PRIV_H
#define VG_SOURCE_PRIV_H

#include <pthread.h>
#include <zlib.h>

#include "../common/bigbuf.h"
#include "../common/sha256.h"
#include "source.h"

/* Default chunk: large enough that per-chunk costs vanish, small enough
 * that every thread's chunk and its parsed rows stay in cache. */
#define VG_SRC_CHUNK ((size_t)4 << 20)

enum { SRC_MAP = 1, SRC_STREAM = 2 };

typedef struct vg_sbuf {
    vg_bigbuf mem;
    char *p;            /* == mem.p: cap + VG_SRC_PAD bytes */
    size_t cap, len;
    uint64_t raw_end;
} vg_sbuf;

struct vg_src {
    char *path;
    int kind;           /* SRC_MAP or SRC_STREAM */
    int gzip;
    int fd;             /* a pipe being read; -1 when not needed */
    int map_fd;         /* the mapped regular file, for vg_src_pread; or -1 */

    /* The mapped bytes: the whole file (SRC_MAP), or the compressed file
     * (SRC_STREAM from a regular gzip file); NULL when reading a pipe. */
    const char *map;
    size_t map_size;
    void *map_base;     /* munmap(map_base, map_span) */
    size_t map_span;
    vg_bigbuf copy;     /* vg_src_open_buffer's padded copy */
    uint64_t stored;    /* the regular file's size */
    int size_known;     /* a regular file (or buffer): stored is its size */
    uint64_t raw_read;  /* bytes read so far by the producer (read() input) */
    unsigned max_inflate; /* gzip: inflated / stored bound (0: none) */
    uint64_t inflated;  /* gzip: bytes inflated so far */

    /* SHA-256 of the stored bytes: in order, in vg_src_release for
     * mappings, in the producer for pipes. */
    int hash;
    vg_sha256 *sha;
    char hex[65];
    uint64_t hashed;    /* stored bytes hashed (mappings) */
    uint64_t dropped;   /* mapped bytes whose pages were given back */
    /* A mapped file of some size is hashed by its own thread, running
     * beside the readers over the same mapped bytes, a bounded distance
     * from them (under lock; cv_hash signals progress either way). */
    pthread_t hasher;
    int hasher_running, hasher_stop;
    uint64_t advanced;  /* the readers are done up to here */
    pthread_cond_t cv_hash;
    /* Submit mode (vg_src_hash_by_submit): the hasher hashes the regions
     * a reader hands it, the very bytes the reader read, in file order. */
    int hash_submit, hash_finishing;
    const char *hq_p[8];
    size_t hq_n[8];
    int hq_head, hq_count;
    uint64_t hash_off;  /* stored bytes submitted so far */

    vg_progress_fn progress;
    void *progress_ctx;
    uint64_t progress_last;

    int peeked, started, finished, lines;
    size_t chunk;
    pthread_mutex_t lock;
    uint64_t next_index;

    /* SRC_MAP chunking. */
    uint64_t next_off;

    /* SRC_STREAM: producer thread and its buffers. */
    pthread_t producer;
    int producer_running;
    pthread_cond_t cv_free, cv_full;
    vg_sbuf *bufs;
    int nbufs;
    int *queue, qhead, qcount;  /* filled buffers, in stream order */
    int *freel, nfree;
    int stop, done;
    int perr_set;
    vg_error perr;
    int peek_buf;       /* buffer holding the peeked bytes, or -1 */
    char *carry;        /* lines mode: the unfinished last line */
    size_t carry_len, carry_cap;
    uint64_t out_off;   /* stream bytes emitted */

    /* Input of the producer. */
    z_stream z;
    int z_init, member_done, in_eof;
    const unsigned char *in_next; /* mapped input not yet given to zlib */
    size_t in_left;
    unsigned char *inbuf; /* pipe input */
    size_t inbuf_cap;
};

/* gzip.c: set up, fill the first buffer (the peek) and run the producer. */
VG_INTERNAL vg_status vg_stream_init(vg_src *s, vg_error *err);
VG_INTERNAL vg_status vg_stream_peek(vg_src *s, vg_error *err);
VG_INTERNAL vg_status vg_stream_start(vg_src *s, vg_error *err);
VG_INTERNAL int vg_stream_next(vg_src *s, vg_chunk *c, vg_error *err);
VG_INTERNAL void vg_stream_release(vg_src *s, const vg_chunk *c);
/* Stop and join the producer; free its buffers. */
VG_INTERNAL void vg_stream_stop(vg_src *s);
/* Pipes: read and hash the rest of the input after the producer stopped. */
VG_INTERNAL vg_status vg_stream_drain(vg_src *s, vg_error *err);

/* source.c: hash stored bytes (pipes: called by the producer). */
VG_INTERNAL void vg_src_hash_bytes(vg_src *s, const void *p, size_t n);

#endif /* VG_SOURCE_PRIV_H */
