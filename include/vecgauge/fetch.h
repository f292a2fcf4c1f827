/* fetch.h - downloading the public suites into the data directory.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * vg_fetch_suite downloads a suite's files from the addresses its
 * manifest entry gives (HTTPS only, TLS verification always on, a size
 * limit), checks the pinned sha256 digests, takes the needed members out
 * of a .zip or .tar.gz archive (refusing any member whose path would
 * leave the target: absolute paths, '..' parts, links), checks that the
 * suite reads, and only then moves the files into <data>/<id>/. A
 * download whose digest is not pinned is recorded as first seen in
 * <data>/<id>/vecgauge-fetch.csv.
 */
#ifndef VG_FETCH_H
#define VG_FETCH_H

#include <stddef.h>
#include <stdint.h>

#include "error.h"
#include "suite.h"
#include "vg_config.h"

#ifdef __cplusplus
extern "C" {
#endif

/* Largest download, and largest total extracted from one archive, by
 * default: far above any suite (the largest is under 2 MB), far below
 * what would fill a disk. */
#ifndef VG_FETCH_MAX_BYTES
#define VG_FETCH_MAX_BYTES (64u * 1024u * 1024u)
#endif

/* The name of the record fetch writes beside a suite's files. */
#define VG_FETCH_RECORD "vecgauge-fetch.csv"

/* Called with one line of information for the user (an address tried
 * and why it failed, a digest seen for the first time). */
typedef void (*vg_fetch_note_fn)(void *ctx, const char *message);

typedef struct vg_fetch_options {
    const char *data_dir;    /* where suites live (see vg_data_dir); required */
    uint64_t max_bytes;      /* download and extraction limit; 0: VG_FETCH_MAX_BYTES */
    int allow_http;          /* also accept http:// addresses whose host is a
                                loopback address (127.0.0.1, ::1, localhost),
                                for tests against a local server; never for
                                other hosts; redirects are then not followed */
    int force;               /* download even when the suite is present */
    long timeout;            /* seconds without data before giving up (over every
                                address tried for a suite); 0: 60 */
    vg_fetch_note_fn note;   /* NULL: notes are dropped */
    void *note_ctx;
} vg_fetch_options;

VG_API void vg_fetch_options_init(vg_fetch_options *opt);

typedef enum vg_fetch_outcome {
    VG_FETCH_INSTALLED = 1,  /* downloaded, checked and installed */
    VG_FETCH_PRESENT = 2     /* already present (pinned digests match, or
                                nothing pinned); nothing downloaded */
} vg_fetch_outcome;

typedef struct vg_fetch_result {
    vg_fetch_outcome outcome;
    size_t variant;          /* index into entry->variants installed or present */
    size_t first_seen;       /* files installed without a pinned digest */
    uint64_t bytes;          /* bytes downloaded */
} vg_fetch_result;

/* Fetch suite e. Tries, in manifest order, every variant with a url until
 * one is installed. Returns VG_OK (res filled), or the failure of the last
 * address tried, its message naming the address:
 *   VG_ENET       the download failed (offline, HTTP error, TLS, too slow)
 *   VG_EHASH      a digest differs from the pinned one (nothing installed)
 *   VG_EFORMAT    an unsafe archive member, or the files do not read as the suite
 *   VG_ENOTFOUND  a needed archive member is missing, or no url is known
 *   VG_ELIMIT     the download or the extracted members exceed max_bytes,
 *                 or a staged file inflates past it when read
 *   VG_EINVAL     an address that is not https:// (see allow_http)
 *   VG_EHASH      also when a present copy differs from its pins and
 *                 force is not set (the copy is left alone)
 *   VG_EIO        the data directory cannot be written
 * Nothing is left half-written: work happens in a temporary directory
 * inside data_dir, removed afterwards, and the suite's folder (its files
 * and vecgauge-fetch.csv) is replaced in one step, with what else it held
 * kept. opt->timeout counts the time without data across every address
 * tried for the suite, so a stalled server costs it once. */
VG_API vg_status vg_fetch_suite(const vg_suite_entry *e, const vg_fetch_options *opt,
                                vg_fetch_result *res, vg_error *err);

#ifdef __cplusplus
}
#endif

#endif /* VG_FETCH_H */
