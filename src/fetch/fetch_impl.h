/* fetch_impl.h - the parts of the fetch stage: download, extraction.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_FETCH_IMPL_H
#define VG_FETCH_IMPL_H

#include <stdint.h>

#include "../common/internal.h"
#include "vecgauge/fetch.h"

/* VG_OK when url may be downloaded: https://, or http:// to a loopback
 * host when allow_http is set; VG_EINVAL (message naming url) otherwise. */
VG_INTERNAL vg_status vg_fetch_check_url(const char *url, int allow_http, vg_error *err);

/* Download url into dest (created, must not exist) within opt's limits;
 * sha256 gets the digest of the bytes received, *bytes their count.
 * *last_progress (CLOCK_MONOTONIC seconds) is when bytes last arrived for
 * this suite: updated here, and the download gives up once opt->timeout
 * seconds pass without any, counted across every address tried. */
VG_INTERNAL vg_status vg_fetch_download(const char *url, const char *dest,
                                        const vg_fetch_options *opt, double *last_progress,
                                        char sha256[65], uint64_t *bytes, vg_error *err);

/* Create dir and every missing parent (mkdir -p). VG_EIO names the one
 * that could not be made. */
VG_INTERNAL vg_status vg_fetch_mkdirs(const char *dir, vg_error *err);

/* 1 if an archive member's name stays below the directory it is
 * extracted into: relative, no '..' part, not "C:..." (backslashes count
 * as separators). */
VG_INTERNAL int vg_fetch_safe_member(const char *name);

/* Extract members[i] (a file, or with a trailing '/' every file below a
 * directory) of archive_path to root/targets[i], writing at most max
 * bytes in all. url is only named in errors. Refuses the whole archive
 * when any member is unsafe (vg_fetch_safe_member), a link, or not a
 * plain file or directory; VG_ENOTFOUND when a member is missing. */
VG_INTERNAL vg_status vg_fetch_extract(const char *archive_path, const char *url,
                                       const char *const *members, const char *const *targets,
                                       size_t n, const char *root, uint64_t max, vg_error *err);

#endif /* VG_FETCH_IMPL_H */
