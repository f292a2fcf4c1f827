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
#include <sys/mman.h>
#include <unistd.h>

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

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size);

#endif /* VG_FUZZ_INPUT_H */
