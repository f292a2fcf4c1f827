/* internal.h - definitions shared between libvecgauge's source files.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Nothing here is API. Functions tagged VG_INTERNAL are visible across the
 * library's own objects but hidden from the shared library's exports.
 */
#ifndef VG_INTERNAL_H
#define VG_INTERNAL_H

#include <stddef.h>
#include <stdint.h>

#include "vecgauge/error.h"

#if defined(__GNUC__) && __GNUC__ >= 4
#define VG_INTERNAL __attribute__((visibility("hidden")))
#else
#define VG_INTERNAL
#endif

/* Broken invariants (never bad input: that gets a vg_error). On in debug
 * and test builds; in release builds the condition is not evaluated. */
#ifdef VG_DEBUG
#include <stdio.h>
#include <stdlib.h>
#define VG_ASSERT(cond)                                                       \
    do {                                                                      \
        if (!(cond)) {                                                        \
            fprintf(stderr, "vecgauge: internal error: %s:%d: %s\n",          \
                    __FILE__, __LINE__, #cond);                               \
            abort();                                                          \
        }                                                                     \
    } while (0)
#else
#define VG_ASSERT(cond) ((void)0)
#endif

#define VG_MIN(a, b) ((a) < (b) ? (a) : (b))
#define VG_MAX(a, b) ((a) > (b) ? (a) : (b))
#define VG_UNUSED(x) ((void)(x))

#endif /* VG_INTERNAL_H */
