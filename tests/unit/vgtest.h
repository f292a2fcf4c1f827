/* vgtest.h - shared helpers for the cmocka unit tests.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VGTEST_H
#define VGTEST_H

#include <math.h>
#include <setjmp.h>
#include <stdarg.h>
#include <stddef.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include <cmocka.h>

#include "vecgauge/vecgauge.h"

/* |got - want| <= abs_tol + rel_tol * |want|, with a message naming both. */
#define assert_close(got, want, abs_tol, rel_tol)                                 \
    do {                                                                          \
        double g_ = (got), w_ = (want);                                           \
        double tol_ = (abs_tol) + (rel_tol)*fabs(w_);                             \
        if (!(fabs(g_ - w_) <= tol_)) {                                           \
            print_error("%s = %.17g, expected %.17g (tolerance %.3g)\n", #got, g_, \
                        w_, tol_);                                                \
            fail();                                                               \
        }                                                                         \
    } while (0)

/* Assert a call returned VG_OK, printing the error when it did not. */
#define assert_vg_ok(call, errp)                                                  \
    do {                                                                          \
        vg_status s_ = (call);                                                    \
        if (s_ != VG_OK) {                                                        \
            char b_[1200];                                                        \
            print_error("%s failed: %s\n", #call, vg_error_format((errp), b_, sizeof b_)); \
            fail();                                                               \
        }                                                                         \
    } while (0)

/* The fixtures directory (tests/fixtures), from VG_FIXTURES or the
 * working directory. Returns a static buffer holding dir/name. */
static inline const char *fixture(const char *name) {
    static char buf[4096];
    const char *dir = getenv("VG_FIXTURES");
    snprintf(buf, sizeof buf, "%s/%s", dir && *dir ? dir : "tests/fixtures", name);
    return buf;
}

/* A fresh temporary file path under $TMPDIR (static buffer). */
static inline const char *temp_path(const char *name) {
    static char buf[4096];
    const char *dir = getenv("TMPDIR");
    snprintf(buf, sizeof buf, "%s/vgtest-%ld-%s", dir && *dir ? dir : "/tmp", (long)getpid(), name);
    return buf;
}

/* Write text to path (overwriting). */
static inline void write_file(const char *path, const char *text) {
    FILE *fp = fopen(path, "wb");
    assert_non_null(fp);
    fwrite(text, 1, strlen(text), fp);
    fclose(fp);
}

#endif /* VGTEST_H */
