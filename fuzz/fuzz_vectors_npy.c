/* fuzz_vectors_npy.c - fuzz target: the .npy reader and its vocabulary.
 * The input is the .npy bytes, then optionally the marker "\n#VOCAB#\n"
 * and the vocabulary file's bytes; without the marker the vocabulary is
 * four fixed words. Both go through files in a scratch directory, as a
 * user's would.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "fuzz_input.h"

static const char marker[] = "\n#VOCAB#\n";

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size) {
    size_t mlen = sizeof marker - 1, npy_len = size;
    const uint8_t *vocab = (const uint8_t *)"alpha\nbeta\ngamma\ndelta\n";
    size_t vocab_len = 23;
    const uint8_t *m = size >= mlen ? memmem(data, size, marker, mlen) : NULL;
    if (m) {
        npy_len = (size_t)(m - data);
        vocab = m + mlen;
        vocab_len = size - npy_len - mlen;
    }
    if (vg_fuzz_put("set.npy", data, npy_len) != 0 || vg_fuzz_put("set.vocab", vocab, vocab_len) != 0)
        return 0;
    char path[128];
    snprintf(path, sizeof path, "%s/set.npy", vg_fuzz_scratch_dir());
    for (int variant = 0; variant < 2; variant++) {
        vg_load_options opt;
        vg_load_options_init(&opt);
        opt.threads = 1;
        /* Variant 0 detects the layout (and finds set.vocab beside it);
         * variant 1 forces npy with the quirk options. */
        if (variant) {
            opt.layout = VG_LAYOUT_NPY;
            opt.skip_bad_rows = 1;
            opt.allow_short = 1;
            opt.max_words = 2;
        }
        vg_fuzz_load(path, NULL, 0, &opt);
    }
    return 0;
}
