/* text.c - Unicode helpers over libunistring.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "text.h"

#include <stdint.h>
#include <stdlib.h>
#include <string.h>
#include <unicase.h>
#include <uninorm.h>
#include <unistr.h>

#include "alloc.h"

int vg_text_is_ascii(const char *s, size_t n) {
    for (size_t i = 0; i < n; i++)
        if ((unsigned char)s[i] >= 0x80) return 0;
    return 1;
}

int vg_text_valid_utf8(const char *s, size_t n) {
    if (vg_text_is_ascii(s, n)) return 1;
    return u8_check((const uint8_t *)s, n) == NULL;
}

/* libunistring allocates with malloc; copy into our funnel so that every
 * returned string is freed the same way. */
static char *adopt(uint8_t *r, size_t rlen, size_t *outlen) {
    char *d = vg_strndup((const char *)r, rlen);
    free(r);
    if (d && outlen) *outlen = rlen;
    return d;
}

const char *vg_text_nfc(const char *s, size_t n, size_t *outlen, char **to_free) {
    *outlen = n;
    *to_free = NULL;
    if (vg_text_is_ascii(s, n)) return s;
    if (u8_check((const uint8_t *)s, n) != NULL) return s;
    size_t rlen = 0;
    uint8_t *r = u8_normalize(UNINORM_NFC, (const uint8_t *)s, n, NULL, &rlen);
    if (!r) return NULL;
    if (rlen == n && memcmp(r, s, n) == 0) {
        free(r);
        return s;
    }
    *to_free = adopt(r, rlen, outlen);
    return *to_free;
}

char *vg_text_fold(const char *s, size_t n, size_t *outlen) {
    if (vg_text_is_ascii(s, n) || u8_check((const uint8_t *)s, n) != NULL) {
        char *d = vg_strndup(s, n);
        if (!d) return NULL;
        for (size_t i = 0; i < n; i++)
            if (d[i] >= 'A' && d[i] <= 'Z') d[i] = (char)(d[i] - 'A' + 'a');
        *outlen = n;
        return d;
    }
    size_t rlen = 0;
    uint8_t *r = u8_casefold((const uint8_t *)s, n, NULL, UNINORM_NFC, NULL, &rlen);
    if (!r) return NULL;
    return adopt(r, rlen, outlen);
}
