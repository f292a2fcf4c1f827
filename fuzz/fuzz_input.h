/* fuzz_input.h - hand a fuzzer's bytes to a reader that takes a path.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The readers take file paths (they mmap, stat and hash files), so each
 * input is written to an anonymous memory file (memfd_create) and passed
 * as /proc/self/fd/N: no disk traffic, nothing left behind.
 */
#ifndef VG_FUZZ_INPUT_H
#define VG_FUZZ_INPUT_H

#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/mman.h>
#include <unistd.h>

#include "vecgauge/vecgauge.h"

/* Write data to a fresh memory file; path receives its name. Returns the
 * descriptor (close it after use) or -1. */
static inline int vg_fuzz_memfile(const uint8_t *data, size_t size, char path[64]) {
    int fd = memfd_create("vgfuzz", 0);
    if (fd < 0) return -1;
    size_t off = 0;
    while (off < size) {
        ssize_t w = write(fd, data + off, size - off);
        if (w <= 0) {
            close(fd);
            return -1;
        }
        off += (size_t)w;
    }
    lseek(fd, 0, SEEK_SET);
    snprintf(path, 64, "/proc/self/fd/%d", fd);
    return fd;
}

/* Touch what a scorer touches in a loaded set: every row, norm and word,
 * and check that each word finds its own row (a broken index traps). */
static inline void vg_fuzz_touch_vectors(const vg_vectors *v) {
    size_t rows = vg_vectors_rows(v), dims = vg_vectors_dims(v);
    volatile float sink = 0;
    for (size_t i = 0; i < rows; i++) {
        size_t len;
        const char *w = vg_vectors_word(v, i, &len);
        sink += vg_vectors_norms(v)[i] + vg_vectors_row(v, i)[dims - 1];
        if (vg_vectors_find(v, w, len) == VG_NOT_FOUND) __builtin_trap();
        (void)vg_vectors_find_folded(v, w, len);
    }
    (void)sink;
}

/* Format an error as the command line would (exercises the formatter on
 * whatever a reader put in it). */
static inline void vg_fuzz_format_error(const vg_error *err) {
    char buf[1200];
    vg_error_format(err, buf, sizeof buf);
}

/* Load a vector set (from path, or from data[0..size) when data is not
 * NULL, named name), touch it or format the error, free it. */
static inline void vg_fuzz_load(const char *path, const uint8_t *data, size_t size,
                                const vg_load_options *opt) {
    vg_vectors *v = NULL;
    vg_error err;
    vg_error_clear(&err);
    vg_status st = data ? vg_vectors_load_buffer(data, size, path, opt, &v, &err)
                        : vg_vectors_load(path, opt, &v, &err);
    if (st == VG_OK)
        vg_fuzz_touch_vectors(v);
    else
        vg_fuzz_format_error(&err);
    vg_vectors_free(v);
}

/* A scratch directory for the whole process (under $TMPDIR or /tmp),
 * for readers that take a directory; removed with its files at exit. */
static char vg_fuzz_dir[64];
static char vg_fuzz_names[8][32];
static int vg_fuzz_n_names;

static inline void vg_fuzz_remove_dir(void) {
    char p[sizeof vg_fuzz_dir + sizeof vg_fuzz_names[0] + 2];
    for (int i = 0; i < vg_fuzz_n_names; i++) {
        if (snprintf(p, sizeof p, "%s/%s", vg_fuzz_dir, vg_fuzz_names[i]) < (int)sizeof p) unlink(p);
    }
    rmdir(vg_fuzz_dir);
}

/* The scratch directory's path, "" when it cannot be made. */
static inline const char *vg_fuzz_scratch_dir(void) {
    if (!vg_fuzz_dir[0]) {
        const char *tmp = getenv("TMPDIR");
        snprintf(vg_fuzz_dir, sizeof vg_fuzz_dir, "%s/vgfuzz-XXXXXX",
                 tmp && *tmp && strlen(tmp) < 40 ? tmp : "/tmp");
        if (!mkdtemp(vg_fuzz_dir)) {
            vg_fuzz_dir[0] = '\0';
            return "";
        }
        atexit(vg_fuzz_remove_dir);
    }
    return vg_fuzz_dir;
}

/* Write data as the file name (at most 8 distinct names, each under 32
 * bytes) in the scratch directory. Returns 0, or -1. */
static inline int vg_fuzz_put(const char *name, const void *data, size_t n) {
    const char *dir = vg_fuzz_scratch_dir();
    if (!*dir) return -1;
    int known = 0;
    for (int i = 0; i < vg_fuzz_n_names; i++) known |= strcmp(vg_fuzz_names[i], name) == 0;
    if (!known) {
        if (vg_fuzz_n_names == 8 || strlen(name) >= 32) return -1;
        strcpy(vg_fuzz_names[vg_fuzz_n_names++], name);
    }
    char p[sizeof vg_fuzz_dir + sizeof vg_fuzz_names[0] + 2];
    snprintf(p, sizeof p, "%s/%s", dir, name);
    FILE *fp = fopen(p, "wb");
    if (!fp) return -1;
    size_t w = fwrite(data, 1, n, fp);
    return fclose(fp) == 0 && w == n ? 0 : -1;
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

#endif /* VG_FUZZ_INPUT_H */
