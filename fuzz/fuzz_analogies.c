/* fuzz_analogies.c - fuzz target: the analogy reader on arbitrary bytes.
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
    if (vg_suite_read_analogies(path, NULL, "fuzz", VG_ANALOGY_AUTO, &s, &err) == VG_OK) {
        volatile size_t sink = 0;
        for (size_t i = 0; i < s->n_items; i++) {
            const vg_question *q = &s->questions[i];
            sink += (size_t)q->a[0] + (size_t)q->b[0] + (size_t)q->c[0];
            for (size_t k = 0; k < q->n_answers; k++) sink += (size_t)q->answers[k][0];
            if (q->section >= s->n_sections) __builtin_trap();
        }
        (void)sink;
    } else {
        char buf[1200];
        vg_error_format(&err, buf, sizeof buf);
    }
    vg_suite_free(s);
    close(fd);
    return 0;
}
