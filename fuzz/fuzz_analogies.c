/* fuzz_analogies.c - fuzz target: the analogy readers on arbitrary bytes:
 * detected, forced as one relation file, and as the split layout (the
 * input cut at its first form feed into a questions file and an answers
 * file; without one, the answers file is empty).
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "fuzz_input.h"

static void touch(const vg_suite *s) {
    volatile size_t sink = 0;
    for (size_t i = 0; i < s->n_items; i++) {
        const vg_question *q = &s->questions[i];
        sink += (size_t)q->a[0] + (size_t)q->b[0] + (size_t)q->c[0];
        for (size_t k = 0; k < q->n_answers; k++) sink += (size_t)q->answers[k][0];
        if (q->section >= s->n_sections) __builtin_trap();
    }
    (void)sink;
}

static void read_one(const char *path, const char *answers, vg_analogy_layout layout) {
    vg_suite *s = NULL;
    vg_error err;
    vg_error_clear(&err);
    if (vg_suite_read_analogies(path, answers, "fuzz", layout, &s, &err) == VG_OK)
        touch(s);
    else
        vg_fuzz_format_error(&err);
    vg_suite_free(s);
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size) {
    char path[64];
    int fd = vg_fuzz_memfile(data, size, path);
    if (fd < 0) return 0;
    read_one(path, NULL, VG_ANALOGY_AUTO);
    read_one(path, NULL, VG_ANALOGY_RELATION);
    close(fd);

    const uint8_t *ff = memchr(data, '\f', size);
    size_t qlen = ff ? (size_t)(ff - data) : size;
    if (vg_fuzz_put("q.questions", data, qlen) != 0 ||
        vg_fuzz_put("q.answers", ff ? ff + 1 : data, ff ? size - qlen - 1 : 0) != 0)
        return 0;
    char qp[128], ap[128];
    snprintf(qp, sizeof qp, "%s/q.questions", vg_fuzz_scratch_dir());
    snprintf(ap, sizeof ap, "%s/q.answers", vg_fuzz_scratch_dir());
    read_one(qp, ap, VG_ANALOGY_SPLIT);
    return 0;
}
