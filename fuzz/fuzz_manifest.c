/* fuzz_manifest.c - fuzz target: the suite manifest parser on arbitrary
 * bytes, then every lookup a command makes on what it returns.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "fuzz_input.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size) {
    vg_manifest *m = NULL;
    vg_error err;
    vg_error_clear(&err);
    if (vg_manifest_parse((const char *)data, size, "fuzz-manifest.csv", &m, &err) == VG_OK) {
        volatile size_t sink = 0;
        for (size_t i = 0; i < vg_manifest_count(m); i++) {
            const vg_suite_entry *e = vg_manifest_get(m, i);
            sink += strlen(e->id) + strlen(e->title) + strlen(e->licence) + strlen(e->groups);
            if (e->n_variants == 0) __builtin_trap();
            for (size_t k = 0; k < e->n_variants; k++) {
                const vg_suite_variant *va = &e->variants[k];
                sink += strlen(va->name) + strlen(va->url) + strlen(va->notes);
                for (size_t f = 0; f < va->n_files; f++)
                    sink += strlen(va->files[f]) + strlen(va->members[f]) + strlen(va->sha256[f]);
            }
            /* Every id must find an entry (perhaps an earlier variant). */
            if (!vg_manifest_find(m, e->id)) __builtin_trap();
        }
        (void)sink;
    } else {
        vg_fuzz_format_error(&err);
    }
    vg_manifest_free(m);
    return 0;
}
