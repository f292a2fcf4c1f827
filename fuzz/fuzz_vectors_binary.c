/* fuzz_vectors_binary.c - fuzz target: the binary-layout reader forced on
 * arbitrary bytes (through the in-memory entry point), strict and with
 * the quirk options.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "fuzz_input.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size) {
    for (int variant = 0; variant < 2; variant++) {
        vg_load_options opt;
        vg_load_options_init(&opt);
        opt.layout = VG_LAYOUT_BINARY;
        opt.threads = 1;
        opt.skip_bad_rows = variant;
        opt.allow_short = variant;
        opt.max_words = variant ? 3 : 0;
        vg_fuzz_load("fuzz.bin", data, size, &opt);
    }
    return 0;
}
