/* fuzz_pairs.c - fuzz target: the word-pair reader on arbitrary bytes.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "fuzz_input.h"
#include "vecgauge/vecgauge.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size) {
    char path[64];
    int fd = vg_fuzz_memfile(data, size, path);
    if (fd < 0) return 0;
    vg_suite *s = NULL;
    vg_error err;
    vg_error_clear(&err);
    if (vg_suite_read_pairs(path, "fuzz", NULL, &s, &err) == VG_OK) {
        volatile size_t sink = 0;
        for (size_t i = 0; i < s->n_items; i++)
            sink += (size_t)s->pairs[i].w1[0] + (size_t)s->pairs[i].w2[0] + s->pairs[i].n_raters;
        (void)sink;
    } else {
        char buf[1200];
        vg_error_format(&err, buf, sizeof buf);
    }
    vg_suite_free(s);
    close(fd);
    return 0;
}
