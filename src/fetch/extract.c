/* extract.c - taking the needed members out of a .zip or .tar.gz archive
 * with libarchive, refusing members whose path would leave the target.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Nothing is written through libarchive's disk writer: each needed member
 * is read as data and written by name under the staging directory, with
 * O_EXCL|O_NOFOLLOW, after its path was checked part by part. Links are
 * never created; an archive holding one, or any member with an absolute
 * path or a '..' part, is refused whole, since it was not made for
 * unpacking in place and cannot be trusted.
 */
#include <archive.h>
#include <archive_entry.h>
#include <errno.h>
#include <fcntl.h>
#include <stdio.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "../common/alloc.h"
#include "fetch_impl.h"

int vg_fetch_safe_member(const char *name) {
    if (!name || !*name || name[0] == '/' || name[0] == '\\') return 0;
    /* "C:..." is absolute on Windows, where many zip files are made. */
    if (((name[0] | 0x20) >= 'a' && (name[0] | 0x20) <= 'z') && name[1] == ':') return 0;
    const char *c = name;
    while (*c) {
        size_t n = strcspn(c, "/\\");
        if (n == 2 && c[0] == '.' && c[1] == '.') return 0;
        c += n;
        if (*c) c++;
    }
    return 1;
}

/* Create the directories above root/rel (rel is a checked relative path). */
static vg_status make_parents(const char *root, const char *rel, vg_error *err) {
    char path[4096];
    if ((size_t)snprintf(path, sizeof path, "%s/%s", root, rel) >= sizeof path)
        return vg_error_set(err, VG_ELIMIT, rel, 0, "archive member path too long");
    char *slash = strrchr(path, '/');
    *slash = '\0';
    return vg_fetch_mkdirs(path, err);
}

static vg_status write_member(struct archive *a, const char *root, const char *rel,
                              uint64_t *total, uint64_t max, const char *member, vg_error *err) {
    vg_status st = make_parents(root, rel, err);
    if (st != VG_OK) return st;
    char path[4096];
    snprintf(path, sizeof path, "%s/%s", root, rel);
    int fd = open(path, O_WRONLY | O_CREAT | O_EXCL | O_NOFOLLOW | O_CLOEXEC, 0644);
    if (fd < 0) return vg_error_set(err, VG_EIO, path, 0, "cannot create");
    char buf[65536];
    la_ssize_t n;
    while ((n = archive_read_data(a, buf, sizeof buf)) > 0) {
        /* A small archive can expand without bound (a "zip bomb"): the
         * limit counts bytes written, not bytes downloaded. */
        if (*total + (uint64_t)n > max) {
            st = vg_error_set(err, VG_ELIMIT, NULL, 0,
                              "archive member %.200s expands beyond the limit of %llu bytes",
                              member, (unsigned long long)max);
            break;
        }
        if (write(fd, buf, (size_t)n) != n) {
            st = vg_error_set(err, VG_EIO, path, 0, "cannot write");
            break;
        }
        *total += (uint64_t)n;
    }
    if (st == VG_OK && n < 0)
        st = vg_error_set(err, VG_EFORMAT, NULL, 0, "archive member %.200s is corrupt: %s", member,
                          archive_error_string(a) ? archive_error_string(a) : "read failed");
    if (close(fd) != 0 && st == VG_OK) st = vg_error_set(err, VG_EIO, path, 0, "cannot write");
    return st;
}

vg_status vg_fetch_extract(const char *archive_path, const char *url, const char *const *members,
                           const char *const *targets, size_t n, const char *root, uint64_t max,
                           vg_error *err) {
    struct archive *a = archive_read_new();
    if (!a) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    archive_read_support_filter_all(a);
    archive_read_support_format_zip(a);
    archive_read_support_format_tar(a);
    archive_read_support_format_gnutar(a);
    unsigned char *found = vg_calloc(n ? n : 1, 1);
    vg_status st = VG_OK;
    if (!found) {
        archive_read_free(a);
        return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    }
    if (archive_read_open_filename(a, archive_path, 65536) != ARCHIVE_OK) {
        st = vg_error_set(err, VG_EFORMAT, NULL, 0, "%.200s is not a readable .zip or .tar archive: %s",
                          url, archive_error_string(a) ? archive_error_string(a) : "unknown");
        goto done;
    }
    uint64_t total = 0;
    struct archive_entry *ent;
    int rc;
    while ((rc = archive_read_next_header(a, &ent)) == ARCHIVE_OK ||
           rc == ARCHIVE_WARN) {
        const char *name = archive_entry_pathname(ent);
        if (!vg_fetch_safe_member(name)) {
            st = vg_error_set(err, VG_EFORMAT, NULL, 0,
                              "%.200s holds the member '%.100s', whose path leaves the target "
                              "directory (absolute or with '..'); refusing the archive",
                              url, name ? name : "");
            goto done;
        }
        mode_t type = archive_entry_filetype(ent);
        if (type == AE_IFLNK || archive_entry_hardlink(ent) != NULL) {
            st = vg_error_set(err, VG_EFORMAT, NULL, 0,
                              "%.200s holds the link '%.100s'; links are refused, so is the archive",
                              url, name);
            goto done;
        }
        if (type != AE_IFREG && type != AE_IFDIR) {
            st = vg_error_set(err, VG_EFORMAT, NULL, 0,
                              "%.200s holds '%.100s', neither a file nor a directory; refusing "
                              "the archive",
                              url, name);
            goto done;
        }
        for (size_t i = 0; i < n && type == AE_IFREG; i++) {
            size_t ml = strlen(members[i]);
            int dir = ml > 0 && members[i][ml - 1] == '/';
            char rel[4096];
            if (!dir && strcmp(name, members[i]) == 0) {
                snprintf(rel, sizeof rel, "%s", targets[i]);
            } else if (dir && strncmp(name, members[i], ml) == 0 && name[ml]) {
                /* A file inside a needed directory keeps its place in it. */
                size_t tl = strlen(targets[i]);
                snprintf(rel, sizeof rel, "%.*s/%s", (int)(tl && targets[i][tl - 1] == '/' ? tl - 1 : tl),
                         targets[i], name + ml);
            } else {
                continue;
            }
            st = write_member(a, root, rel, &total, max, name, err);
            if (st != VG_OK) goto done;
            found[i] = 1;
            break;
        }
    }
    if (rc != ARCHIVE_EOF) {
        st = vg_error_set(err, VG_EFORMAT, NULL, 0, "%.200s: the archive is corrupt: %s", url,
                          archive_error_string(a) ? archive_error_string(a) : "unknown");
        goto done;
    }
    for (size_t i = 0; i < n; i++)
        if (!found[i]) {
            st = vg_error_set(err, VG_ENOTFOUND, NULL, 0, "%.200s has no member '%.100s'", url,
                              members[i]);
            goto done;
        }
done:
    vg_free(found);
    archive_read_free(a);
    return st;
}
