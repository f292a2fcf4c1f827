/* text.h - Unicode helpers: validity, NFC normalisation, case folding.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Built on libunistring, which implements the Unicode normalisation forms
 * and full case folding from the Unicode Character Database; writing
 * those tables by hand would be both large and wrong. ASCII input (nearly
 * every word in practice) takes a fast path that never allocates.
 */
#ifndef VG_TEXT_H
#define VG_TEXT_H

#include <stddef.h>

#include "internal.h"

/* 1 if s[0..n) is valid UTF-8. */
VG_INTERNAL int vg_text_valid_utf8(const char *s, size_t n);

/* 1 if every byte is below 0x80. */
VG_INTERNAL int vg_text_is_ascii(const char *s, size_t n);

/* NFC form of s[0..n). If s is ASCII or already in NFC, returns s itself,
 * sets *outlen = n and *to_free = NULL; otherwise returns a new
 * NUL-terminated string, also stored in *to_free for the caller to
 * vg_free. Invalid UTF-8 is returned unchanged (the bytes are kept).
 * NULL only when out of memory. */
VG_INTERNAL const char *vg_text_nfc(const char *s, size_t n, size_t *outlen, char **to_free);

/* Case-folded NFC form of s[0..n) (Unicode full case folding), always a
 * new NUL-terminated string the caller frees with vg_free. Invalid UTF-8
 * is folded byte-wise for ASCII letters only. NULL when out of memory. */
VG_INTERNAL char *vg_text_fold(const char *s, size_t n, size_t *outlen);

#endif /* VG_TEXT_H */
