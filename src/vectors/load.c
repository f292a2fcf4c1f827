/* load.c - vg_vectors_load: choose the reader for a file's layout.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <string.h>
#include <sys/stat.h>

#include "../common/sha256.h"
#include "vectors_impl.h"

vg_status vg_vectors_load(const char *path, const vg_load_options *opt, vg_vectors **out,
                          vg_error *err) {
    *out = NULL;
    vg_load_options defaults;
    if (!opt) {
        vg_load_options_init(&defaults);
        opt = &defaults;
    }
    struct stat sb;
    if (stat(path, &sb) != 0) return vg_error_set(err, VG_EIO, path, 0, "cannot open vector file");
    if (S_ISDIR(sb.st_mode))
        return vg_error_set(err, VG_EINVAL, path, 0, "is a directory, expected a vector file");

    vg_status st;
    switch (opt->layout) {
    case VG_LAYOUT_AUTO:
    case VG_LAYOUT_TEXT_HEADER:
    case VG_LAYOUT_TEXT_PLAIN:
        st = vg_read_text(path, opt, out, err);
        break;
    default:
        return vg_error_set(err, VG_EUNSUPPORTED, path, 0, "layout '%s' is not supported yet",
                            vg_layout_name(opt->layout));
    }
    if (st != VG_OK) return st;
    vg_vectors_info *info = &(*out)->info;
    info->bytes = (uint64_t)sb.st_size;
    if (opt->compute_hash) {
        st = vg_sha256_file(path, info->sha256, NULL, err);
        if (st != VG_OK) {
            vg_vectors_free(*out);
            *out = NULL;
            return st;
        }
        info->hashed = 1;
    }
    return VG_OK;
}
