/* fuzz_vectors_gzip.c - fuzz target: the gzip path of the vector loader.
 * An input that starts with the gzip magic bytes is loaded as it is
 * (damaged headers, members, trailers); any other input is first
 * gzip-compressed here, so that the streaming decompressor feeds
 * arbitrary contents to the detection and every reader behind it.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <zlib.h>

#include "fuzz_input.h"

/* data gzip-compressed into a new buffer (*out, *out_len); 0 or -1. */
static int gzip_bytes(const uint8_t *data, size_t size, uint8_t **out, size_t *out_len) {
    z_stream z;
    memset(&z, 0, sizeof z);
    /* windowBits 15 + 16: a gzip wrapper, as gzip(1) writes. */
    if (deflateInit2(&z, 6, Z_DEFLATED, 15 + 16, 8, Z_DEFAULT_STRATEGY) != Z_OK) return -1;
    size_t cap = deflateBound(&z, (uLong)size) + 32;
    uint8_t *buf = malloc(cap);
    if (!buf) {
        deflateEnd(&z);
        return -1;
    }
    z.next_in = (Bytef *)(uintptr_t)data;
    z.avail_in = (uInt)size;
    z.next_out = buf;
    z.avail_out = (uInt)cap;
    int rc = deflate(&z, Z_FINISH);
    *out_len = cap - z.avail_out;
    deflateEnd(&z);
    if (rc != Z_STREAM_END) {
        free(buf);
        return -1;
    }
    *out = buf;
    return 0;
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size) {
    uint8_t *gz = NULL;
    size_t gz_len = size;
    if (size >= 2 && data[0] == 0x1f && data[1] == 0x8b) {
        gz = malloc(size ? size : 1);
        if (!gz) return 0;
        memcpy(gz, data, size);
    } else if (gzip_bytes(data, size, &gz, &gz_len) != 0) {
        return 0;
    }
    char path[64];
    int fd = vg_fuzz_memfile(gz, gz_len, path);
    if (fd >= 0) {
        for (int variant = 0; variant < 2; variant++) {
            vg_load_options opt;
            vg_load_options_init(&opt);
            opt.threads = variant ? 2 : 1; /* the parallel text parser too */
            opt.skip_bad_rows = variant;
            opt.allow_short = variant;
            vg_fuzz_load(path, NULL, 0, &opt);
        }
        close(fd);
    }
    free(gz);
    return 0;
}
