/* infile.c - opening inputs without hanging; their bytes, gzip undone,
 * under a size limit and hashed on the way.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "infile.h"

#include <errno.h>
#include <fcntl.h>
#include <poll.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>
#include <unistd.h>
#include <zlib.h>

#include "alloc.h"
#include "sha256.h"

static int fifo_wait_ms(void) {
    const char *e = getenv("VECGAUGE_TEST_FIFO_WAIT_MS");
    if (e && *e) {
        long v = strtol(e, NULL, 10);
        if (v >= 0 && v <= 600000) return (int)v;
    }
    return VG_FIFO_WAIT_MS;
}

static double now_ms(void) {
    struct timespec ts;
    clock_gettime(CLOCK_MONOTONIC, &ts);
    return (double)ts.tv_sec * 1e3 + (double)ts.tv_nsec / 1e6;
}

/* A FIFO opened without blocking: wait until a writer sends bytes or
 * closes (POLLIN or POLLHUP). Linux reports nothing while no writer has
 * ever opened it, so the wait ends at the deadline. 0 once ready. */
static int wait_for_writer(int fd) {
    int total = fifo_wait_ms();
    double end = now_ms() + total;
    for (;;) {
        double left = end - now_ms();
        if (left < 0) left = 0;
        struct pollfd p = {fd, POLLIN, 0};
        int r = poll(&p, 1, (int)left);
        if (r > 0) return 0;
        if (r < 0 && errno != EINTR) return -1;
        if (r == 0 && left <= 0) return -1;
        if (r == 0) continue;
    }
}

static const char *kind_of(mode_t m) {
    if (S_ISDIR(m)) return "a directory";
    if (S_ISCHR(m)) return "a character device (such as /dev/zero or a terminal)";
    if (S_ISBLK(m)) return "a block device";
    if (S_ISSOCK(m)) return "a socket";
    if (S_ISFIFO(m)) return "a pipe";
    return "not a regular file";
}

vg_status vg_infile_open(const char *path, unsigned flags, int *fd, int *is_regular,
                         vg_error *err) {
    /* O_NONBLOCK: opening a FIFO for reading otherwise waits, forever,
     * for a writer; O_NOCTTY: a terminal never becomes ours. */
    int f = open(path, O_RDONLY | O_NONBLOCK | O_NOCTTY | O_CLOEXEC);
    if (f < 0) return vg_error_set(err, VG_EIO, path, 0, "cannot open");
    struct stat sb;
    if (fstat(f, &sb) != 0) {
        vg_error_set(err, VG_EIO, path, 0, "cannot stat");
        close(f);
        return VG_EIO;
    }
    int pipe_ok = (flags & VG_IN_PIPE) && S_ISFIFO(sb.st_mode);
    if (!S_ISREG(sb.st_mode) && !pipe_ok) {
        close(f);
        return vg_error_set(err, VG_EINVAL, path, 0, "is %s, expected %s", kind_of(sb.st_mode),
                            flags & VG_IN_PIPE ? "a file or a pipe" : "a regular file");
    }
    if (pipe_ok && wait_for_writer(f) != 0) {
        close(f);
        errno = 0;
        return vg_error_set(err, VG_EIO, path, 0,
                            "is a named pipe and nothing wrote to it within %d s",
                            (fifo_wait_ms() + 999) / 1000);
    }
    int fl = fcntl(f, F_GETFL);
    if (fl < 0 || fcntl(f, F_SETFL, fl & ~O_NONBLOCK) != 0) {
        vg_error_set(err, VG_EIO, path, 0, "cannot set blocking reads");
        close(f);
        return VG_EIO;
    }
    *fd = f;
    if (is_regular) *is_regular = S_ISREG(sb.st_mode);
    return VG_OK;
}

#define IN_CAP ((size_t)1 << 16)

struct vg_instream {
    char *path;
    const char *hint;
    int fd;
    uint64_t max_bytes, out_bytes, stored;
    vg_sha256 *sha;
    char hex[65];
    int hashed;
    unsigned char *in;      /* stored bytes read, [in_pos, in_len) unused */
    size_t in_pos, in_len;
    int in_eof, started, gzip, z_init, member_done, done;
    z_stream z;
};

vg_status vg_instream_open(const char *path, unsigned flags, uint64_t max_bytes,
                           const char *limit_hint, vg_instream **out, vg_error *err) {
    *out = NULL;
    int fd;
    vg_status st = vg_infile_open(path, flags, &fd, NULL, err);
    if (st != VG_OK) return st;
    vg_instream *in = vg_calloc(1, sizeof *in);
    if (!in || !(in->path = vg_strdup(path)) || !(in->in = vg_malloc(IN_CAP)) ||
        ((flags & VG_IN_HASH) && !(in->sha = vg_sha256_new()))) {
        if (in) {
            in->fd = -1;
            vg_instream_close(in);
        }
        close(fd);
        return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory opening the file");
    }
    in->fd = fd;
    in->max_bytes = max_bytes;
    in->hint = limit_hint;
    *out = in;
    return VG_OK;
}

/* More stored bytes into in->in (what was used is dropped). 1 if some
 * arrived, 0 at the end, -1 on error. */
static int refill(vg_instream *in, vg_error *err) {
    if (in->in_pos < in->in_len) {
        memmove(in->in, in->in + in->in_pos, in->in_len - in->in_pos);
        in->in_len -= in->in_pos;
    } else {
        in->in_len = 0;
    }
    in->in_pos = 0;
    if (in->in_eof) return 0;
    for (;;) {
        ssize_t n = read(in->fd, in->in + in->in_len, IN_CAP - in->in_len);
        if (n < 0 && errno == EINTR) continue;
        if (n < 0) {
            vg_error_set(err, VG_EIO, in->path, 0, "read failed");
            return -1;
        }
        if (n == 0) {
            in->in_eof = 1;
            return 0;
        }
        if (in->sha) vg_sha256_update(in->sha, in->in + in->in_len, (size_t)n);
        in->stored += (uint64_t)n;
        in->in_len += (size_t)n;
        return 1;
    }
}

static long over_limit(vg_instream *in, vg_error *err) {
    vg_error_set(err, VG_ELIMIT, in->path, 0, "holds more than %llu bytes%s%s%s",
                 (unsigned long long)in->max_bytes, in->gzip ? " once decompressed" : "",
                 in->hint ? "; " : "", in->hint ? in->hint : "");
    return -1;
}

/* After a gzip member's end: another member (0), the clean end (1), or
 * bytes that are neither (-1). */
static int next_member(vg_instream *in, vg_error *err) {
    for (;;) {
        while (in->in_pos < in->in_len && in->in[in->in_pos] == 0) in->in_pos++;
        if (in->in_pos == in->in_len) {
            int rc = refill(in, err);
            if (rc < 0) return -1;
            if (rc == 0) return 1;
            continue;
        }
        if (in->in[in->in_pos] == 0x1f) {
            inflateReset(&in->z);
            in->member_done = 0;
            return 0;
        }
        vg_error_set(err, VG_EFORMAT, in->path, 0,
                     "bytes after the end of the gzip data that are not another gzip member");
        return -1;
    }
}

static long read_gzip(vg_instream *in, char *buf, size_t n, vg_error *err) {
    for (;;) {
        if (in->member_done) {
            int rc = next_member(in, err);
            if (rc < 0) return -1;
            if (rc > 0) return 0;
        }
        if (in->in_pos == in->in_len && !in->in_eof && refill(in, err) < 0) return -1;
        in->z.next_in = in->in + in->in_pos;
        in->z.avail_in = (uInt)(in->in_len - in->in_pos);
        in->z.next_out = (Bytef *)buf;
        in->z.avail_out = (uInt)VG_MIN(n, (size_t)UINT32_MAX);
        int zr = inflate(&in->z, Z_NO_FLUSH);
        size_t used = (in->in_len - in->in_pos) - in->z.avail_in;
        in->in_pos += used;
        size_t made = VG_MIN(n, (size_t)UINT32_MAX) - in->z.avail_out;
        if (zr == Z_STREAM_END) {
            in->member_done = 1;
        } else if (zr == Z_MEM_ERROR) {
            vg_error_set(err, VG_ENOMEM, in->path, 0, "out of memory decompressing");
            return -1;
        } else if (zr != Z_OK && zr != Z_BUF_ERROR) {
            vg_error_set(err, VG_EFORMAT, in->path, 0, "corrupt gzip stream: %s",
                         in->z.msg ? in->z.msg : "bad data");
            return -1;
        }
        if (made > 0) return (long)made;
        if (!in->member_done && used == 0 && in->in_pos == in->in_len && in->in_eof) {
            vg_error_set(err, VG_ETRUNCATED, in->path, 0,
                         "gzip stream ends early (truncated download?)");
            return -1;
        }
    }
}

long vg_instream_read(vg_instream *in, char *buf, size_t n, vg_error *err) {
    if (in->done || n == 0) return 0;
    if (!in->started) {
        /* The magic bytes decide; a pipe may deliver them one at a time. */
        while (in->in_len < 2) {
            int rc = refill(in, err);
            if (rc < 0) return -1;
            if (rc == 0) break;
        }
        in->gzip = in->in_len >= 2 && in->in[0] == 0x1f && in->in[1] == 0x8b;
        if (in->gzip) {
            /* 15 + 16: a gzip wrapper only (RFC 1952), its CRC checked. */
            if (inflateInit2(&in->z, 15 + 16) != Z_OK) {
                vg_error_set(err, VG_ENOMEM, in->path, 0, "cannot start zlib");
                return -1;
            }
            in->z_init = 1;
        }
        in->started = 1;
    }
    /* Never hand out more than one byte past the limit: that byte is
     * enough to know it was passed. */
    if (in->max_bytes && n > in->max_bytes - in->out_bytes + 1)
        n = (size_t)(in->max_bytes - in->out_bytes + 1);
    long got;
    if (in->gzip) {
        got = read_gzip(in, buf, n, err);
    } else if (in->in_pos < in->in_len) {
        got = (long)VG_MIN(n, in->in_len - in->in_pos);
        memcpy(buf, in->in + in->in_pos, (size_t)got);
        in->in_pos += (size_t)got;
    } else {
        int rc = refill(in, err);
        if (rc < 0) return -1;
        got = rc == 0 ? 0 : (long)VG_MIN(n, in->in_len);
        if (got > 0) {
            memcpy(buf, in->in, (size_t)got);
            in->in_pos = (size_t)got;
        }
    }
    if (got < 0) return -1;
    if (got == 0) {
        in->done = 1;
        return 0;
    }
    in->out_bytes += (uint64_t)got;
    if (in->max_bytes && in->out_bytes > in->max_bytes) return over_limit(in, err);
    return got;
}

int vg_instream_gzip(const vg_instream *in) { return in->gzip; }
const char *vg_instream_path(const vg_instream *in) { return in->path; }

const char *vg_instream_sha256(vg_instream *in, uint64_t *stored) {
    if (in->sha && !in->hashed) {
        vg_sha256_final(in->sha, in->hex); /* frees the context */
        in->sha = NULL;
        in->hashed = 1;
    }
    if (stored) *stored = in->stored;
    return in->hex;
}

void vg_instream_close(vg_instream *in) {
    if (!in) return;
    if (in->z_init) inflateEnd(&in->z);
    if (in->fd >= 0) close(in->fd);
    vg_sha256_free(in->sha);
    vg_free(in->in);
    vg_free(in->path);
    vg_free(in);
}
