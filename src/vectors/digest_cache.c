/* digest_cache.c - the sha256 of a vector file kept between runs, keyed by
 * the file's identity, so that loading the same unchanged file again does
 * not hash it again.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * SHA-256 runs on one core at 1.6-1.8 GB/s here and bounds every hashed
 * load; a 2.4 GB file loads twice as fast unhashed. An entry is one small
 * file under $XDG_CACHE_HOME/vecgauge/digests (else ~/.cache/...), named
 * by the file's device, inode, size, and modification and status-change
 * times in nanoseconds, written to a temporary name and renamed, so that
 * concurrent runs never see half an entry. A rewritten file changes its
 * times (its status-change time cannot be set back), so it misses.
 *
 * Racy entries: on a filesystem whose timestamps are coarse (a second, or
 * FAT's two), a file rewritten within the same tick as it was hashed keeps
 * the times the entry was keyed on. As version-control tools do for their
 * index, an entry is trusted only when both file times are at least
 * VG_DIGEST_RACY_NS older than the moment the entry was written; a file
 * cached too soon after a change is hashed again (and cached again, now
 * trusted once it is old enough). The cache is best effort: any failure to
 * read or write it only means the digest is computed.
 */
#include <errno.h>
#include <fcntl.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>
#include <unistd.h>

#include "vectors_impl.h"

/* 2 s: FAT's timestamp granularity, the coarsest in common use. */
#define VG_DIGEST_RACY_NS 2000000000LL

static long long ns_of(struct timespec t) { return (long long)t.tv_sec * 1000000000LL + t.tv_nsec; }

/* $XDG_CACHE_HOME/vecgauge/digests, else $HOME/.cache/vecgauge/digests,
 * created; 0, or -1 when there is none. */
static int cache_dir(char *buf, size_t size, int create) {
    const char *x = getenv("XDG_CACHE_HOME"), *h = getenv("HOME");
    char base[4096];
    /* The XDG Base Directory Specification: a relative path is ignored. */
    if (x && x[0] == '/')
        snprintf(base, sizeof base, "%s", x);
    else if (h && h[0])
        snprintf(base, sizeof base, "%s/.cache", h);
    else
        return -1;
    int n = snprintf(buf, size, "%s/vecgauge/digests", base);
    if (n < 0 || (size_t)n >= size) return -1;
    if (!create) return 0;
    char part[4200];
    snprintf(part, sizeof part, "%s/vecgauge", base);
    mkdir(base, 0700);
    mkdir(part, 0777);
    if (mkdir(buf, 0777) != 0 && errno != EEXIST) return -1;
    return 0;
}

int vg_digest_key(const char *path, vg_digest_key_t *key) {
    struct stat sb;
    if (stat(path, &sb) != 0 || !S_ISREG(sb.st_mode)) return -1;
    key->dev = (unsigned long long)sb.st_dev;
    key->ino = (unsigned long long)sb.st_ino;
    key->size = (unsigned long long)sb.st_size;
    key->mtime_ns = ns_of(sb.st_mtim);
    key->ctime_ns = ns_of(sb.st_ctim);
    return 0;
}

static int entry_path(const vg_digest_key_t *k, char *buf, size_t size, int create) {
    char dir[4096];
    if (cache_dir(dir, sizeof dir, create) != 0) return -1;
    int n = snprintf(buf, size, "%s/%llx-%llx-%llx-%llx-%llx", dir, k->dev, k->ino, k->size,
                     (unsigned long long)k->mtime_ns, (unsigned long long)k->ctime_ns);
    return n < 0 || (size_t)n >= size ? -1 : 0;
}

int vg_digest_cache_get(const vg_digest_key_t *key, char hex[65]) {
    char p[4200];
    if (entry_path(key, p, sizeof p, 0) != 0) return -1;
    FILE *fp = fopen(p, "r");
    if (!fp) return -1;
    char h[80];
    long long cached = 0;
    int ok = fscanf(fp, "vecgauge-digest 1 %70s %lld", h, &cached) == 2;
    fclose(fp);
    if (!ok || strlen(h) != 64 || strspn(h, "0123456789abcdef") != 64) return -1;
    long long newest = key->mtime_ns > key->ctime_ns ? key->mtime_ns : key->ctime_ns;
    if (cached - newest < VG_DIGEST_RACY_NS) return -1; /* racy: see the file's comment */
    memcpy(hex, h, 65);
    return 0;
}

void vg_digest_cache_put(const vg_digest_key_t *key, const char *hex) {
    char p[4200], tmp[4300];
    if (strlen(hex) != 64 || entry_path(key, p, sizeof p, 1) != 0) return;
    snprintf(tmp, sizeof tmp, "%s.XXXXXX", p);
    int fd = mkstemp(tmp);
    if (fd < 0) return;
    struct timespec now;
    clock_gettime(CLOCK_REALTIME, &now);
    char line[160];
    int n = snprintf(line, sizeof line, "vecgauge-digest 1 %s %lld\n", hex, ns_of(now));
    int ok = n > 0 && write(fd, line, (size_t)n) == n;
    ok = close(fd) == 0 && ok;
    if (!ok || rename(tmp, p) != 0) unlink(tmp);
}
