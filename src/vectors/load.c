/* load.c - vg_vectors_load: open the file, detect its layout, run the
 * reader, record what was seen.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <string.h>

#include "../common/sha256.h"
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
    /* A digest found in the cache spares the hashing (digest_cache.c). */
    vg_digest_key_t key;
    int keyed = opt->compute_hash && opt->digest_cache != VG_DIGEST_CACHE_OFF &&
                vg_digest_key(path, &key) == 0;
    char cached[65];
    int hit = keyed && opt->digest_cache == VG_DIGEST_CACHE_USE &&
              vg_digest_cache_get(&key, cached) == 0;
    vg_load_options o = *opt;
    if (hit) o.compute_hash = 0;
    vg_src *src = NULL;
    vg_status st = vg_src_open(path, o.compute_hash, o.progress, o.progress_ctx, &src, err);
    if (st != VG_OK) return st;
    st = load_from(src, &o, out, err);
    vg_src_close(src);
    if (st != VG_OK) return st;
    vg_vectors_info *info = &(*out)->info;
    if (hit) {
        memcpy(info->sha256, cached, sizeof cached);
        info->hashed = 1;
        info->digest_cached = 1;
        /* A .npy's vocabulary is hashed as it is read only when hashing
         * is on: take it from the cache too, or hash it now (it is small
         * beside the matrix). */
        vg_digest_key_t vk;
        if (info->layout == VG_LAYOUT_NPY && info->vocab_path[0] && !info->vocab_sha256[0] &&
            vg_digest_key(info->vocab_path, &vk) == 0 &&
            vg_digest_cache_get(&vk, info->vocab_sha256) != 0) {
            uint64_t bytes;
            if (vg_sha256_file(info->vocab_path, info->vocab_sha256, &bytes, err) != VG_OK) {
                vg_vectors_free(*out);
                *out = NULL;
                return err->code;
            }
            vg_digest_cache_put(&vk, info->vocab_sha256);
        }
    } else if (keyed && info->hashed) {
        /* Keyed on the identity seen before reading: if the file changed
         * while it was read, the key no longer matches it and the entry
         * is never found. */
        vg_digest_cache_put(&key, info->sha256);
        vg_digest_key_t vk;
        if (info->layout == VG_LAYOUT_NPY && info->vocab_sha256[0] &&
            vg_digest_key(info->vocab_path, &vk) == 0)
            vg_digest_cache_put(&vk, info->vocab_sha256);
    }
    return VG_OK;
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
