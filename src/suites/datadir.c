/* datadir.c - the data directory: where suite files live, which known
 * copy of a suite is present, reading it through its manifest entry.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include "../common/alloc.h"
#include "../common/sha256.h"
#include "suite_impl.h"

vg_status vg_data_dir(const char *dir, char *buf, size_t size, const char **source,
                      vg_error *err) {
    const char *src = "--data", *base = dir, *suffix = "";
    if (!base || !*base) {
        src = "VECGAUGE_DATA";
        base = getenv("VECGAUGE_DATA");
    }
    if (!base || !*base) {
        /* XDG Base Directory Specification: $XDG_DATA_HOME, which must be
         * an absolute path (a relative one is ignored), else
         * $HOME/.local/share. */
        src = "XDG_DATA_HOME";
        base = getenv("XDG_DATA_HOME");
        suffix = "/vecgauge";
        if (base && *base != '/') base = NULL;
    }
    if (!base || !*base) {
        src = "HOME";
        base = getenv("HOME");
        suffix = "/.local/share/vecgauge";
    }
    if (!base || !*base)
        return vg_error_set(err, VG_EINVAL, NULL, 0,
                            "no data directory: give --data DIR or set VECGAUGE_DATA (HOME is "
                            "not set)");
    size_t n = strlen(base);
    /* "dir/" and "dir" name the same directory; keep paths tidy. */
    while (n > 1 && base[n - 1] == '/') n--;
    if ((size_t)snprintf(buf, size, "%.*s%s", (int)n, base, suffix) >= size)
        return vg_error_set(err, VG_ELIMIT, base, 0, "data directory path too long");
    if (source) *source = src;
    return VG_OK;
}

vg_status vg_suite_entry_path(const vg_suite_entry *e, size_t v, size_t f, const char *data_dir,
                              char *buf, size_t size, vg_error *err) {
    VG_ASSERT(v < e->n_variants && f < e->variants[v].n_files);
    const char *name = e->variants[v].files[f];
    size_t n = strlen(name);
    if (n > 1 && name[n - 1] == '/') n--;
    if ((size_t)snprintf(buf, size, "%s/%s/%.*s", data_dir, e->id, (int)n, name) >= size)
        return vg_error_set(err, VG_ELIMIT, data_dir, 0, "path too long");
    return VG_OK;
}

static int is_dir_name(const char *name) { return name[strlen(name) - 1] == '/'; }

/* 1 when every file of variant v exists (as a file or, for names ending
 * in '/', a directory). */
static int variant_present(const vg_suite_entry *e, size_t v, const char *data_dir) {
    const vg_suite_variant *var = &e->variants[v];
    for (size_t f = 0; f < var->n_files; f++) {
        char path[4096];
        struct stat sb;
        if (vg_suite_entry_path(e, v, f, data_dir, path, sizeof path, NULL) != VG_OK ||
            stat(path, &sb) != 0)
            return 0;
        if (is_dir_name(var->files[f]) ? !S_ISDIR(sb.st_mode) : !S_ISREG(sb.st_mode)) return 0;
    }
    return 1;
}

/* 1 if variant v pins any digest; then *match says whether all match. */
static int variant_pins(const vg_suite_entry *e, size_t v, const char *data_dir, int *match) {
    const vg_suite_variant *var = &e->variants[v];
    int pinned = 0;
    *match = 1;
    for (size_t f = 0; f < var->n_files; f++) {
        if (!*var->sha256[f]) continue;
        pinned = 1;
        char path[4096], hex[65];
        uint64_t bytes;
        if (vg_suite_entry_path(e, v, f, data_dir, path, sizeof path, NULL) != VG_OK ||
            vg_sha256_file(path, hex, &bytes, NULL) != VG_OK || strcmp(hex, var->sha256[f]) != 0)
            *match = 0;
    }
    return pinned;
}

size_t vg_suite_entry_locate(const vg_suite_entry *e, const char *data_dir) {
    size_t first = (size_t)-1, unpinned = (size_t)-1;
    for (size_t v = 0; v < e->n_variants; v++) {
        if (!variant_present(e, v, data_dir)) continue;
        if (first == (size_t)-1) first = v;
        int match;
        if (!variant_pins(e, v, data_dir, &match)) {
            if (unpinned == (size_t)-1) unpinned = v;
        } else if (match) {
            return v;
        }
    }
    return unpinned != (size_t)-1 ? unpinned : first;
}

/* Ratings outside the manifest's scale mean the wrong column or the
 * wrong file: an error at the first such line. */
static vg_status check_scale(const vg_suite_entry *e, const vg_suite *s, vg_error *err) {
    if (isnan(e->scale_min)) return VG_OK;
    const char *path = s->n_files ? s->files[0].path : e->id;
    for (size_t i = 0; i < s->n_items; i++) {
        const vg_pair *p = &s->pairs[i];
        for (size_t r = 0; r <= p->n_raters; r++) {
            double x = r == 0 ? p->rating : p->raters[r - 1];
            if (x < e->scale_min || x > e->scale_max)
                return vg_error_set(err, VG_EVALUE, path, p->line,
                                    "%s %g is outside the scale %g..%g the manifest gives for "
                                    "suite %s",
                                    r == 0 ? "rating" : "rater's score", x, e->scale_min,
                                    e->scale_max, e->id);
        }
    }
    return VG_OK;
}

/* VG_ENOTFOUND for a suite with no known copy present, saying where the
 * first known copy belongs and how to get it. */
static vg_status not_present(const vg_suite_entry *e, const char *data_dir, vg_error *err) {
    char p0[4096];
    vg_status st = vg_suite_entry_path(e, 0, 0, data_dir, p0, sizeof p0, err);
    if (st != VG_OK) return st;
    int fetchable = 0;
    for (size_t k = 0; k < e->n_variants; k++) fetchable |= *e->variants[k].url != '\0';
    char how[256];
    if (fetchable)
        snprintf(how, sizeof how, "'vecgauge fetch %s' downloads it", e->id);
    else
        snprintf(how, sizeof how, "no download is known: put it there by hand");
    return vg_error_set(err, VG_ENOTFOUND, p0, 0,
                        "suite %s is not in the data directory %s (expected this %s%s; %s; "
                        "'vecgauge suites %s' lists every known file name)",
                        e->id, data_dir, is_dir_name(e->variants[0].files[0]) ? "directory" : "file",
                        e->n_variants > 1 ? " or another known copy" : "", how, e->id);
}

vg_status vg_suite_read_entry(const vg_suite_entry *e, const char *data_dir, vg_suite **out,
                              vg_error *err) {
    *out = NULL;
    size_t v = vg_suite_entry_locate(e, data_dir);
    if (v == (size_t)-1) return not_present(e, data_dir, err);
    char p0[4096], p1[4096];
    const vg_suite_variant *var = &e->variants[v];
    vg_status st = vg_suite_entry_path(e, v, 0, data_dir, p0, sizeof p0, err);
    if (st == VG_OK && var->n_files > 1)
        st = vg_suite_entry_path(e, v, 1, data_dir, p1, sizeof p1, err);
    if (st != VG_OK) return st;
    vg_suite *s = NULL;
    if (e->task == VG_TASK_SIMILARITY)
        st = vg_suite_read_pairs(p0, e->id, &var->pairs, &s, err);
    else
        st = vg_suite_read_analogies(p0, var->n_files > 1 ? p1 : NULL, e->id, var->analogy, &s,
                                     err);
    if (st != VG_OK) return st;
    char *title = vg_strdup(e->title);
    if (!title) {
        vg_suite_free(s);
        return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    }
    vg_free(s->title);
    s->title = title;
    s->scale_min = e->scale_min;
    s->scale_max = e->scale_max;
    s->variant = vg_suite_intern(s, var->name, strlen(var->name));
    if (!s->variant) st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    if (st == VG_OK && e->task == VG_TASK_SIMILARITY) st = check_scale(e, s, err);
    if (st == VG_OK && e->task == VG_TASK_ANALOGY) st = vg_suite_set_groups(s, e->groups, err);
    if (st != VG_OK) {
        vg_suite_free(s);
        return st;
    }
    *out = s;
    return VG_OK;
}

const char *vg_hash_state_name(vg_hash_state h) {
    switch (h) {
    case VG_HASH_NOT_PINNED: return "not pinned";
    case VG_HASH_MATCH: return "match";
    case VG_HASH_MISMATCH: return "mismatch";
    }
    return "unknown";
}

vg_hash_state vg_suite_entry_verify(const vg_suite_entry *e, const vg_suite *s, size_t *bad) {
    const vg_suite_variant *var = NULL;
    for (size_t v = 0; s->variant && v < e->n_variants; v++)
        if (strcmp(e->variants[v].name, s->variant) == 0) var = &e->variants[v];
    if (!var) return VG_HASH_NOT_PINNED;
    /* A directory variant's files are not pinned one by one (only its
     * download is), so s->files maps onto var->files only without one. */
    for (size_t f = 0; f < var->n_files; f++)
        if (is_dir_name(var->files[f])) return VG_HASH_NOT_PINNED;
    int pinned = 0;
    for (size_t f = 0; f < var->n_files && f < s->n_files; f++) {
        if (!*var->sha256[f]) continue;
        pinned = 1;
        if (strcmp(var->sha256[f], s->files[f].sha256) != 0) {
            if (bad) *bad = f;
            return VG_HASH_MISMATCH;
        }
    }
    return pinned ? VG_HASH_MATCH : VG_HASH_NOT_PINNED;
}
