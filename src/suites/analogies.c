/* analogies.c - reading analogy question files.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "suite_impl.h"

vg_status vg_suite_read_analogies(const char *path, const char *answers_path, const char *id,
                                  vg_analogy_layout layout, vg_suite **out, vg_error *err) {
    (void)answers_path;
    (void)id;
    (void)layout;
    *out = NULL;
    return vg_error_set(err, VG_EUNSUPPORTED, path, 0, "analogy files are not read yet");
}
