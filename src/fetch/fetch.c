/* fetch.c - fetching a suite: download, check, extract, install.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Everything happens in a staging directory inside the data directory
 * (so that the final renames stay on one file system and are atomic),
 * laid out as <stage>/<id>/<files>, which is also a data directory: the
 * staged suite is read through its manifest entry before anything is
 * moved into place, so an HTML error page or a wrong member is never
 * installed.
 */
#include <csv.h>
#include <dirent.h>
#include <fcntl.h>
#include <errno.h>
#include <ftw.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <time.h>
#include <unistd.h>

#include "../common/alloc.h"
#include "../common/lines.h"
#include "../common/sha256.h"
#include "fetch_impl.h"

void vg_fetch_options_init(vg_fetch_options *opt) { memset(opt, 0, sizeof *opt); }

static void note(const vg_fetch_options *opt, const char *fmt, ...) VG_PRINTF(2, 3);
static void note(const vg_fetch_options *opt, const char *fmt, ...) {
    if (!opt->note) return;
    char buf[1024];
    va_list ap;
    va_start(ap, fmt);
    vsnprintf(buf, sizeof buf, fmt, ap);
    va_end(ap);
    opt->note(opt->note_ctx, buf);
}

static int is_dir_name(const char *name) { return name[strlen(name) - 1] == '/'; }

static int rm_one(const char *path, const struct stat *sb, int flag, struct FTW *ftw) {
    (void)sb;
    (void)flag;
    (void)ftw;
    return remove(path);
}

/* Remove a staging directory and everything in it (links not followed). */
static void remove_tree(const char *path) { nftw(path, rm_one, 16, FTW_DEPTH | FTW_PHYS); }

vg_status vg_fetch_mkdirs(const char *dir, vg_error *err) {
    char p[4096];
    if (snprintf(p, sizeof p, "%s", dir) >= (int)sizeof p)
        return vg_error_set(err, VG_ELIMIT, dir, 0, "path too long");
    for (char *q = p + 1; *q; q++) {
        if (*q != '/') continue;
        *q = '\0';
        if (mkdir(p, 0777) != 0 && errno != EEXIST) return vg_error_set(err, VG_EIO, p, 0, "cannot create directory");
        *q = '/';
    }
    if (mkdir(p, 0777) != 0 && errno != EEXIST) return vg_error_set(err, VG_EIO, p, 0, "cannot create directory");
    return VG_OK;
}

/* path = a/b with the trailing '/' of b dropped. */
static vg_status join(char *buf, size_t size, const char *a, const char *b, vg_error *err) {
    size_t n = strlen(b);
    if (n > 1 && b[n - 1] == '/') n--;
    if ((size_t)snprintf(buf, size, "%s/%.*s", a, (int)n, b) >= size)
        return vg_error_set(err, VG_ELIMIT, a, 0, "path too long");
    return VG_OK;
}

/* One CSV field: quoted by libcsv when it needs quoting, else as is. */
static void csv_field(FILE *fp, const char *s, int last) {
    if (strpbrk(s, ",\"\r\n") || (*s && (s[0] == ' ' || s[strlen(s) - 1] == ' ')))
        csv_fwrite(fp, s, strlen(s));
    else
        fputs(s, fp);
    fputc(last ? '\n' : ',', fp);
}

/* Write <data>/<id>/vecgauge-fetch.csv (temporary name, then rename):
 * the download and every file installed, with the digest seen and
 * whether it was pinned, so that a later change can be noticed. */
static vg_status write_record(const char *dir, const vg_suite_variant *var, const char *dl_sha,
                              uint64_t dl_bytes, char (*sha)[65], const uint64_t *bytes,
                              vg_error *err) {
    char path[4096], tmp[4200];
    vg_status st = join(path, sizeof path, dir, VG_FETCH_RECORD, err);
    if (st != VG_OK) return st;
    snprintf(tmp, sizeof tmp, "%s.tmp", path);
    FILE *fp = fopen(tmp, "wb");
    if (!fp) return vg_error_set(err, VG_EIO, tmp, 0, "cannot create");
    char when[32], num[32];
    time_t t = time(NULL);
    struct tm tm;
    gmtime_r(&t, &tm);
    strftime(when, sizeof when, "%Y-%m-%dT%H:%M:%SZ", &tm);
    fputs("file,sha256,bytes,pinned,url,member,fetched_at\n", fp);
    snprintf(num, sizeof num, "%llu", (unsigned long long)dl_bytes);
    csv_field(fp, "", 0);
    csv_field(fp, dl_sha, 0);
    csv_field(fp, num, 0);
    csv_field(fp, *var->download_sha256 ? "yes" : "no", 0);
    csv_field(fp, var->url, 0);
    csv_field(fp, "", 0);
    csv_field(fp, when, 1);
    for (size_t f = 0; f < var->n_files; f++) {
        if (is_dir_name(var->files[f])) continue;
        snprintf(num, sizeof num, "%llu", (unsigned long long)bytes[f]);
        csv_field(fp, var->files[f], 0);
        csv_field(fp, sha[f], 0);
        csv_field(fp, num, 0);
        csv_field(fp, *var->sha256[f] ? "yes" : "no", 0);
        csv_field(fp, var->url, 0);
        csv_field(fp, var->members[f], 0);
        csv_field(fp, when, 1);
    }
    if (ferror(fp) | (fclose(fp) != 0)) {
        unlink(tmp);
        return vg_error_set(err, VG_EIO, tmp, 0, "cannot write");
    }
    if (rename(tmp, path) != 0) {
        unlink(tmp);
        return vg_error_set(err, VG_EIO, path, 0, "cannot rename into place");
    }
    return VG_OK;
}

/* 1 when rel (a path inside the suite's folder) is what the variant
 * installs: one of its files or folders, or the fetch record. */
static int replaced(const vg_suite_variant *var, const char *rel) {
    if (strcmp(rel, VG_FETCH_RECORD) == 0) return 1;
    for (size_t f = 0; f < var->n_files; f++) {
        size_t n = strlen(var->files[f]);
        if (n > 1 && var->files[f][n - 1] == '/') n--;
        if (strlen(rel) == n && strncmp(rel, var->files[f], n) == 0) return 1;
    }
    return 0;
}

/* Keep in the staged folder what the old one holds beside the variant's
 * files (another variant's files, the user's own): hard links, so the old
 * bytes stay where they are, walked below old/rel into new/rel. */
static vg_status keep_others(const vg_suite_variant *var, const char *old_dir,
                             const char *new_dir, const char *rel, vg_error *err) {
    char od[4096], nd[4096];
    if ((size_t)snprintf(od, sizeof od, "%s%s%s", old_dir, *rel ? "/" : "", rel) >= sizeof od ||
        (size_t)snprintf(nd, sizeof nd, "%s%s%s", new_dir, *rel ? "/" : "", rel) >= sizeof nd)
        return vg_error_set(err, VG_ELIMIT, old_dir, 0, "path too long");
    DIR *d = opendir(od);
    if (!d) return vg_error_set(err, VG_EIO, od, 0, "cannot read the installed copy");
    vg_status st = VG_OK;
    struct dirent *de;
    while (st == VG_OK && (de = readdir(d)) != NULL) {
        if (strcmp(de->d_name, ".") == 0 || strcmp(de->d_name, "..") == 0) continue;
        char sub[4096], from[4096], to[4096];
        if ((size_t)snprintf(sub, sizeof sub, "%s%s%s", rel, *rel ? "/" : "", de->d_name) >= sizeof sub ||
            (size_t)snprintf(from, sizeof from, "%s/%s", od, de->d_name) >= sizeof from ||
            (size_t)snprintf(to, sizeof to, "%s/%s", nd, de->d_name) >= sizeof to) {
            st = vg_error_set(err, VG_ELIMIT, od, 0, "path too long");
            break;
        }
        if (replaced(var, sub)) continue;
        struct stat osb, nsb;
        if (lstat(from, &osb) != 0) continue;
        int have = lstat(to, &nsb) == 0;
        if (S_ISDIR(osb.st_mode)) {
            if (have && !S_ISDIR(nsb.st_mode)) continue;
            if (!have && mkdir(to, osb.st_mode & 07777) != 0) {
                st = vg_error_set(err, VG_EIO, to, 0, "cannot create directory");
                break;
            }
            st = keep_others(var, old_dir, new_dir, sub, err);
        } else if (!have && link(from, to) != 0) {
            st = vg_error_set(err, VG_EIO, from, 0,
                              "cannot keep this file of the installed copy (a hard link failed)");
        }
    }
    closedir(d);
    return st;
}

/* Install the staged folder <stage>/<id> (the variant's files and the
 * fetch record) as <data>/<id> in one step: what the old folder holds
 * beside them is linked in first, then the two folders are exchanged by
 * one renameat2(RENAME_EXCHANGE), atomic, so that a failure at any point
 * leaves the old copy whole and its record with it, never a mix. Where
 * the file system cannot exchange, the old folder is moved aside and the
 * new one renamed in (moved back if that fails). The old folder ends in
 * the stage, removed with it. */
static vg_status install(const vg_suite_entry *e, const vg_suite_variant *var, const char *stage,
                         const char *data_dir, vg_error *err) {
    char dest[4096], staged[4096], aside[4200];
    vg_status st = join(dest, sizeof dest, data_dir, e->id, err);
    if (st == VG_OK) st = join(staged, sizeof staged, stage, e->id, err);
    if (st != VG_OK) return st;
    snprintf(aside, sizeof aside, "%s/.old", stage);
    struct stat sb;
    if (lstat(dest, &sb) != 0) {
        if (rename(staged, dest) != 0) return vg_error_set(err, VG_EIO, dest, 0, "cannot rename into place");
        return VG_OK;
    }
    if (!S_ISDIR(sb.st_mode))
        return vg_error_set(err, VG_EIO, dest, 0, "is not a directory; the suite's folder cannot go there");
    st = keep_others(var, dest, staged, "", err);
    if (st != VG_OK) return st;
    const char *fail = getenv("VECGAUGE_TEST_FAIL_INSTALL");
    if (fail && *fail == '1')
        return vg_error_set(err, VG_EIO, dest, 0, "cannot rename into place (test hook)");
    if (renameat2(AT_FDCWD, staged, AT_FDCWD, dest, RENAME_EXCHANGE) == 0) return VG_OK;
    if (errno != EINVAL && errno != ENOSYS && errno != ENOTSUP)
        return vg_error_set(err, VG_EIO, dest, 0, "cannot exchange the old copy for the new");
    if (rename(dest, aside) != 0) return vg_error_set(err, VG_EIO, dest, 0, "cannot move the old copy aside");
    if (rename(staged, dest) != 0) {
        st = vg_error_set(err, VG_EIO, dest, 0, "cannot rename into place");
        if (rename(aside, dest) != 0)
            vg_error_prefix(err, "and the old copy stays at %.200s: ", aside);
        return st;
    }
    return VG_OK;
}

static vg_status try_variant(const vg_suite_entry *e, size_t v, const vg_fetch_options *opt,
                             double *last_progress, vg_fetch_result *res, vg_error *err) {
    const vg_suite_variant *var = &e->variants[v];
    uint64_t max = opt->max_bytes ? opt->max_bytes : VG_FETCH_MAX_BYTES;
    int archive = 0;
    for (size_t f = 0; f < var->n_files; f++) archive |= *var->members[f] != '\0';
    if (!archive && (var->n_files != 1 || is_dir_name(var->files[0])))
        return vg_error_set(err, VG_EINVAL, NULL, var->manifest_line,
                            "manifest: suite %s variant %s downloads several files or a folder "
                            "from one address but names no archive members",
                            e->id, var->name);
    for (size_t f = 0; archive && f < var->n_files; f++)
        if (!*var->members[f])
            return vg_error_set(err, VG_EINVAL, NULL, var->manifest_line,
                                "manifest: suite %s variant %s: file %s has no archive member",
                                e->id, var->name, var->files[f]);

    char stage[4096], root[4096], dl[4200];
    vg_status st = vg_fetch_mkdirs(opt->data_dir, err);
    if (st != VG_OK) return st;
    if ((size_t)snprintf(stage, sizeof stage, "%s/.fetch-%s-XXXXXX", opt->data_dir, e->id) >= sizeof stage)
        return vg_error_set(err, VG_ELIMIT, opt->data_dir, 0, "path too long");
    if (!mkdtemp(stage)) return vg_error_set(err, VG_EIO, stage, 0, "cannot create a staging directory");
    char dl_sha[65] = "";
    uint64_t dl_bytes = 0;
    char (*sha)[65] = vg_calloc(var->n_files, sizeof *sha);
    uint64_t *bytes = vg_calloc(var->n_files, sizeof *bytes);
    vg_suite *s = NULL;
    if (!sha || !bytes) {
        st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
        goto done;
    }
    st = join(root, sizeof root, stage, e->id, err);
    if (st != VG_OK) goto done;
    if (mkdir(root, 0777) != 0) {
        st = vg_error_set(err, VG_EIO, root, 0, "cannot create directory");
        goto done;
    }
    snprintf(dl, sizeof dl, "%s/.download", stage);
    st = vg_fetch_download(var->url, dl, opt, last_progress, dl_sha, &dl_bytes, err);
    if (st != VG_OK) goto done;
    res->bytes = dl_bytes;
    if (*var->download_sha256 && strcmp(dl_sha, var->download_sha256) != 0) {
        st = vg_error_set(err, VG_EHASH, NULL, 0,
                          "%.200s has sha256 %s, but the manifest pins %s; refusing it", var->url,
                          dl_sha, var->download_sha256);
        goto done;
    }
    if (archive) {
        st = vg_fetch_extract(dl, var->url, var->members, var->files, var->n_files, root, max, err);
    } else {
        char to[4096];
        st = join(to, sizeof to, root, var->files[0], err);
        if (st == VG_OK && rename(dl, to) != 0) st = vg_error_set(err, VG_EIO, to, 0, "cannot rename");
    }
    if (st != VG_OK) goto done;
    size_t first_seen = 0;
    for (size_t f = 0; f < var->n_files; f++) {
        if (is_dir_name(var->files[f])) continue;
        char p[4096];
        st = join(p, sizeof p, root, var->files[f], err);
        if (st == VG_OK) st = vg_sha256_file(p, sha[f], &bytes[f], err);
        if (st != VG_OK) goto done;
        if (!*var->sha256[f]) {
            first_seen++;
            continue;
        }
        if (strcmp(sha[f], var->sha256[f]) != 0) {
            st = vg_error_set(err, VG_EHASH, NULL, 0,
                              "%s from %.200s has sha256 %s, but the manifest pins %s; refusing it",
                              var->files[f], var->url, sha[f], var->sha256[f]);
            goto done;
        }
    }
    /* The staged copy must read as the suite before it is installed, and
     * within the size limit: a small file may inflate far past it. */
    uint64_t saved_limit = vg_lines_suite_limit;
    vg_lines_suite_limit = max;
    st = vg_suite_read_entry(e, stage, &s, err);
    vg_lines_suite_limit = saved_limit;
    if (st != VG_OK) {
        vg_error_prefix(err, "the files from %.200s do not read as suite %s: ", var->url, e->id);
        goto done;
    }
    /* The record goes in with the files, in the same step. */
    st = write_record(root, var, dl_sha, dl_bytes, sha, bytes, err);
    if (st == VG_OK) st = install(e, var, stage, opt->data_dir, err);
    if (st != VG_OK) goto done;
    if (!*var->download_sha256 && first_seen)
        note(opt, "%s: download sha256 %s (first seen, not pinned in the manifest)", e->id, dl_sha);
    for (size_t f = 0; f < var->n_files; f++)
        if (!is_dir_name(var->files[f]) && !*var->sha256[f])
            note(opt, "%s: %s sha256 %s (first seen, not pinned; recorded in %s)", e->id,
                 var->files[f], sha[f], VG_FETCH_RECORD);
    res->outcome = VG_FETCH_INSTALLED;
    res->variant = v;
    res->first_seen = first_seen;
done:
    vg_suite_free(s);
    vg_free(sha);
    vg_free(bytes);
    remove_tree(stage);
    return st;
}

vg_status vg_fetch_suite(const vg_suite_entry *e, const vg_fetch_options *opt, vg_fetch_result *res,
                         vg_error *err) {
    memset(res, 0, sizeof *res);
    if (!opt || !opt->data_dir || !*opt->data_dir)
        return vg_error_set(err, VG_EINVAL, NULL, 0, "fetch needs a data directory");
    if (!opt->force) {
        size_t v = vg_suite_entry_locate(e, opt->data_dir);
        if (v != (size_t)-1) {
            vg_suite *s = NULL;
            vg_status st = vg_suite_read_entry(e, opt->data_dir, &s, err);
            if (st != VG_OK) return st;
            vg_hash_state h = vg_suite_entry_verify(e, s, NULL);
            vg_suite_free(s);
            if (h == VG_HASH_MISMATCH) {
                char p[4096];
                vg_suite_entry_path(e, v, 0, opt->data_dir, p, sizeof p, NULL);
                return vg_error_set(err, VG_EHASH, p, 0,
                                    "suite %s is present but differs from the digest pinned in "
                                    "the manifest; left alone (--force replaces it)",
                                    e->id);
            }
            res->outcome = VG_FETCH_PRESENT;
            res->variant = v;
            return VG_OK;
        }
    }
    vg_status st = VG_ENOTFOUND;
    int tried = 0;
    struct timespec t0;
    clock_gettime(CLOCK_MONOTONIC, &t0);
    double last_progress = (double)t0.tv_sec + (double)t0.tv_nsec * 1e-9;
    for (size_t v = 0; v < e->n_variants; v++) {
        if (!*e->variants[v].url) continue;
        tried = 1;
        st = try_variant(e, v, opt, &last_progress, res, err);
        if (st == VG_OK) return VG_OK;
        /* The last failure is the caller's error; earlier ones are notes. */
        size_t next = v + 1;
        while (next < e->n_variants && !*e->variants[next].url) next++;
        if (next < e->n_variants) {
            char buf[VG_ERROR_MSG_MAX + VG_ERROR_PATH_MAX + 64];
            note(opt, "%s: %s; trying the next known address", e->id,
                 vg_error_format(err, buf, sizeof buf));
        }
    }
    if (!tried)
        return vg_error_set(err, VG_ENOTFOUND, NULL, 0,
                            "no download address is known for suite %s", e->id);
    return st;
}
