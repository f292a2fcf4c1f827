/* fuzz_vectors_text.c - fuzz target: the vector loader on arbitrary bytes
 * (auto-detection, then whichever reader it picks), with and without the
 * quirk options.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "fuzz_input.h"
#include "vecgauge/vecgauge.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size) {
    char path[64];
    int fd = vg_fuzz_memfile(data, size, path);
    if (fd < 0) return 0;
    for (int variant = 0; variant < 2; variant++) {
        vg_load_options opt;
        vg_load_options_init(&opt);
        opt.threads = 1;
        opt.skip_bad_rows = variant;
        opt.allow_short = variant;
        opt.fold_case = variant;
        vg_vectors *v = NULL;
        vg_error err;
        vg_error_clear(&err);
        if (vg_vectors_load(path, &opt, &v, &err) == VG_OK) {
            /* Touch what a scorer touches: every row, norm and word. */
            size_t rows = vg_vectors_rows(v);
            volatile float sink = 0;
            for (size_t i = 0; i < rows; i++) {
                size_t len;
                const char *w = vg_vectors_word(v, i, &len);
                sink += vg_vectors_norms(v)[i] + vg_vectors_row(v, i)[0];
                if (vg_vectors_find(v, w, len) == VG_NOT_FOUND) __builtin_trap();
                (void)vg_vectors_find_folded(v, w, len);
            }
            (void)sink;
        } else {
            char buf[1200];
            vg_error_format(&err, buf, sizeof buf);
        }
        vg_vectors_free(v);
    }
    close(fd);
    return 0;
}
