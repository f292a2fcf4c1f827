/* rundir.c - output directories that appear complete or not at all.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Files are written into ".<name>.tmp-XXXXXX" beside the final path, which
 * is on the same file system, so the final rename(2) is atomic: a reader
 * (or a crash) never sees a half-written run directory.
 */
#include <dirent.h>
#include <errno.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "../common/alloc.h"
#include "vecgauge/rundir.h"

struct vg_rundir {
    char *final_path;
    char *temp_path;
    char *file_buf;
    size_t file_cap;
};

/* mkdir each folder of path[0..len) that does not exist; errors are left
 * to the mkdtemp that follows, which reports them. */
static void make_parents(char *path, size_t len) {
    for (size_t i = 1; i <= len; i++) {
        if (i < len && path[i] != '/') continue;
        char keep = path[i];
        path[i] = '\0';
        if (mkdir(path, 0777) != 0 && errno != EEXIST) {
            path[i] = keep;
            return;
        }
        path[i] = keep;
    }
}

vg_status vg_rundir_begin(const char *final_path, vg_rundir **out, vg_error *err) {
    *out = NULL;
    struct stat sb;
    if (lstat(final_path, &sb) == 0)
        return vg_error_set(err, VG_EIO, final_path, 0,
                            "already exists; a run directory is never overwritten "
                            "(choose another --out)");
    size_t n = strlen(final_path);
    while (n > 1 && final_path[n - 1] == '/') n--;
    const char *slash = NULL;
    for (size_t i = 0; i < n; i++)
        if (final_path[i] == '/') slash = final_path + i;
    size_t dirlen = slash ? (size_t)(slash - final_path) + 1 : 0;
    const char *base = final_path + dirlen;
    size_t baselen = n - dirlen;
    vg_rundir *rd = vg_calloc(1, sizeof *rd);
    if (!rd) return vg_error_set(err, VG_ENOMEM, final_path, 0, "out of memory");
    rd->final_path = vg_strndup(final_path, n);
    size_t tlen = dirlen + 1 + baselen + 12 + 1;
    rd->temp_path = vg_malloc(tlen);
    if (!rd->final_path || !rd->temp_path) {
        vg_rundir_abort(rd);
        return vg_error_set(err, VG_ENOMEM, final_path, 0, "out of memory");
    }
    snprintf(rd->temp_path, tlen, "%.*s.%.*s.tmp-XXXXXX", (int)dirlen, final_path, (int)baselen,
             base);
    /* Missing parent folders are made (as mkdir -p would): --out
     * results/sweep-3/lr-0.1 should not need a separate mkdir. */
    if (dirlen > 1) make_parents(rd->temp_path, dirlen - 1);
    if (!mkdtemp(rd->temp_path)) {
        vg_status st = vg_error_set(err, VG_EIO, rd->temp_path, 0,
                                    "cannot create a temporary run directory");
        vg_free(rd->temp_path);
        rd->temp_path = NULL;
        vg_rundir_abort(rd);
        return st;
    }
    *out = rd;
    return VG_OK;
}

const char *vg_rundir_file(vg_rundir *rd, const char *name) {
    size_t need = strlen(rd->temp_path) + 1 + strlen(name) + 1;
    if (need > rd->file_cap) {
        char *nb = vg_realloc(rd->file_buf, need);
        if (!nb) return NULL;
        rd->file_buf = nb;
        rd->file_cap = need;
    }
    snprintf(rd->file_buf, rd->file_cap, "%s/%s", rd->temp_path, name);
    return rd->file_buf;
}

const char *vg_rundir_temp_path(const vg_rundir *rd) { return rd->temp_path; }

vg_status vg_rundir_open(vg_rundir *rd, const char *name, FILE **fp, vg_error *err) {
    const char *p = vg_rundir_file(rd, name);
    if (!p) return vg_error_set(err, VG_ENOMEM, name, 0, "out of memory");
    *fp = fopen(p, "wb");
    if (!*fp) return vg_error_set(err, VG_EIO, p, 0, "cannot create");
    return VG_OK;
}

/* Remove the temporary directory: it holds only regular files we wrote. */
static void remove_tree(const char *path) {
    DIR *d = opendir(path);
    if (d) {
        struct dirent *e;
        char buf[4096];
        while ((e = readdir(d)) != NULL) {
            if (strcmp(e->d_name, ".") == 0 || strcmp(e->d_name, "..") == 0) continue;
            snprintf(buf, sizeof buf, "%s/%s", path, e->d_name);
            struct stat sb;
            if (lstat(buf, &sb) == 0 && S_ISDIR(sb.st_mode))
                remove_tree(buf);
            else
                unlink(buf);
        }
        closedir(d);
    }
    rmdir(path);
}

vg_status vg_rundir_commit(vg_rundir *rd, vg_error *err) {
    vg_status st = VG_OK;
    /* rename(2) onto an existing empty directory would succeed silently:
     * check again so that a run directory is never replaced. */
    struct stat sb;
    if (lstat(rd->final_path, &sb) == 0) {
        st = vg_error_set(err, VG_EIO, rd->final_path, 0, "appeared while the run was written");
    } else if (chmod(rd->temp_path, 0755) != 0 || rename(rd->temp_path, rd->final_path) != 0) {
        st = vg_error_set(err, VG_EIO, rd->final_path, 0, "cannot rename the run directory into place");
    } else {
        vg_free(rd->temp_path);
        rd->temp_path = NULL;
    }
    vg_rundir_abort(rd);
    return st;
}

void vg_rundir_abort(vg_rundir *rd) {
    if (!rd) return;
    if (rd->temp_path) remove_tree(rd->temp_path);
    vg_free(rd->temp_path);
    vg_free(rd->final_path);
    vg_free(rd->file_buf);
    vg_free(rd);
}
