/* load.c - vg_vectors_load: open the file, detect its layout, run the
 * reader, record what was seen.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <string.h>

#include "vectors_impl.h"

static vg_status load_from(vg_src *src, const vg_load_options *opt, vg_vectors **out,
                           vg_error *err) {
    const char *path = vg_src_path(src);
    if ((unsigned)opt->layout > (unsigned)VG_LAYOUT_NPY)
        return vg_error_set(err, VG_EINVAL, path, 0, "unknown layout %d", (int)opt->layout);
    const char *p;
    size_t n;
    int whole;
    vg_src_limit_inflate(src, opt->max_inflate);
    vg_status st = vg_src_peek(src, &p, &n, &whole, err);
    if (st != VG_OK) return st;
    vg_detect d;
    st = vg_detect_layout(p, n, whole, opt->layout, path, &d, err);
    if (st != VG_OK) return st;
    vg_vectors *v = NULL;
    switch (d.layout) {
    case VG_LAYOUT_TEXT_HEADER:
    case VG_LAYOUT_TEXT_PLAIN: st = vg_read_text(src, &d, opt, &v, err); break;
    case VG_LAYOUT_BINARY: st = vg_read_binary(src, &d, opt, &v, err); break;
    case VG_LAYOUT_NPY: st = vg_read_npy(src, opt, &v, err); break;
    default: st = vg_error_set(err, VG_EINTERNAL, path, 0, "no reader for the detected layout");
    }
    if (st == VG_OK) st = vg_src_finish(src, err);
    /* A header of "0 300" alone, or rows all skipped: a set of no vectors
     * would score as if every word were missing, with exit status 0. */
    if (st == VG_OK && v->info.rows_read == 0)
        st = vg_error_set(err, VG_EFORMAT, path, 0,
                          "no vectors in the file%s",
                          v->info.bad_rows ? " (every row was bad and skipped)" : "");
    if (st != VG_OK) {
        vg_vectors_free(v);
        return st;
    }
    vg_vectors_info *info = &v->info;
    info->layout = d.layout;
    info->gzip = vg_src_gzip(src);
    info->bom = d.bom;
    if (d.layout != VG_LAYOUT_NPY) info->header_rows = d.header_rows;
    snprintf(info->detected_because, sizeof info->detected_because, "%s%s",
             info->gzip ? "gzip data (magic bytes 1f 8b), inside: " : "", d.because);
    info->bytes = vg_src_stored_bytes(src);
    if (opt->compute_hash) {
        snprintf(info->sha256, sizeof info->sha256, "%s", vg_src_sha256(src));
        info->hashed = 1;
    }
    *out = v;
    return VG_OK;
}

vg_status vg_vectors_load(const char *path, const vg_load_options *opt, vg_vectors **out,
                          vg_error *err) {
    *out = NULL;
    vg_load_options defaults;
    if (!opt) {
        vg_load_options_init(&defaults);
        opt = &defaults;
    }
    vg_src *src = NULL;
    vg_status st = vg_src_open(path, opt->compute_hash, opt->progress, opt->progress_ctx, &src, err);
    if (st != VG_OK) return st;
    st = load_from(src, opt, out, err);
    vg_src_close(src);
    return st;
}

vg_status vg_vectors_load_buffer(const void *data, size_t size, const char *name,
                                 const vg_load_options *opt, vg_vectors **out, vg_error *err) {
    *out = NULL;
    vg_load_options defaults;
    if (!opt) {
        vg_load_options_init(&defaults);
        opt = &defaults;
    }
    if (!data && size) return vg_error_set(err, VG_EINVAL, name, 0, "no data");
    vg_src *src = NULL;
    vg_status st = vg_src_open_buffer(data ? data : "", size, name, opt->compute_hash, &src, err);
    if (st != VG_OK) return st;
    st = load_from(src, opt, out, err);
    vg_src_close(src);
    return st;
}
