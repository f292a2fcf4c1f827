/* fuzz_history.c - fuzz target: the history-file reader on arbitrary bytes.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "fuzz_input.h"
#include "vecgauge/vecgauge.h"

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size) {
    char path[64];
    int fd = vg_fuzz_memfile(data, size, path);
    if (fd < 0) return 0;
    vg_history *h = NULL;
    vg_error err;
    vg_error_clear(&err);
    if (vg_history_open(path, &h, &err) == VG_OK) {
        volatile size_t sink = 0;
        for (size_t i = 0; i < h->n_rows; i++)
            sink += h->rows[i].step + (size_t)h->rows[i].run[0] + (size_t)h->rows[i].suite[0];
        (void)sink;
    } else {
        char buf[1200];
        vg_error_format(&err, buf, sizeof buf);
    }
    vg_history_close(h);
    close(fd);
    return 0;
}
