/* fuzz_vectors_text.c - fuzz target: the vector loader on arbitrary bytes
 * (auto-detection, then whichever reader it picks), with and without the
 * quirk options.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "fuzz_input.h"

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
        vg_fuzz_load(path, NULL, 0, &opt);
    }
    close(fd);
    return 0;
}
