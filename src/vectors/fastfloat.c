/* fastfloat.c - decimal text to float32 with a proven fast path.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The fast path reads up to 19 significant digits into an integer w and a
 * decimal exponent e, then computes q = w * 10^e in double: one
 * multiplication or division by a tabulated power of ten. For w <= 2^53
 * and |e| <= 22 both operands are exact and q is the correctly rounded
 * double (Clinger, "How to read floating point numbers accurately", PLDI
 * 1990); otherwise q is within 3 double ulps of the true value (three
 * roundings of relative error 2^-53 each, plus digits dropped past the
 * 19th, which add less than 1e-18).
 *
 * The commonest case is the simplest: with w < 2^24 and e = -k, k <= 7,
 * w and 10^k are exact floats and one float division is the correctly
 * rounded result (Clinger's argument in single precision). Both entry
 * points take it (vg_float_round) for the plain [-]digits[.digits] shape
 * with up to 7 significant digits, as vector files print numbers.
 *
 * Rounding q to float (24-bit significand) then gives the correctly
 * rounded float unless q lies within that error of a float rounding
 * boundary, the midpoint between two adjacent floats, whose low 29
 * significand bits in the double are exactly 1 followed by 28 zeros.
 * Rounding is monotonic, so a q on the same side of every boundary as the
 * true value rounds the same way. We require a margin of 8 double ulps
 * from the midpoint, more than the error bound, and hand anything closer
 * (about 3 values in 10^8 of random data), anything outside float's
 * normal range, and anything that is not a plain decimal to strtof.
 */
#include "fastfloat.h"

#include <errno.h>
#include <float.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "../common/alloc.h"

/* 10^0 .. 10^60; exact up to 10^22, correctly rounded beyond. */
static const double pow10_tab[] = {
    1e0,  1e1,  1e2,  1e3,  1e4,  1e5,  1e6,  1e7,  1e8,  1e9,  1e10, 1e11, 1e12,
    1e13, 1e14, 1e15, 1e16, 1e17, 1e18, 1e19, 1e20, 1e21, 1e22, 1e23, 1e24, 1e25,
    1e26, 1e27, 1e28, 1e29, 1e30, 1e31, 1e32, 1e33, 1e34, 1e35, 1e36, 1e37, 1e38,
    1e39, 1e40, 1e41, 1e42, 1e43, 1e44, 1e45, 1e46, 1e47, 1e48, 1e49, 1e50, 1e51,
    1e52, 1e53, 1e54, 1e55, 1e56, 1e57, 1e58, 1e59, 1e60,
};
#define POW10_MAX 60


static _Thread_local uint64_t fallbacks;

uint64_t vg_float_fallbacks(void) { return fallbacks; }

/* strtof on the token [p, t): the reference for everything the fast path
 * declines. */
static int slow_path(const char *p, const char *t, float *out) {
    fallbacks++;
    size_t n = (size_t)(t - p);
    char small[128];
    char *buf = small;
    if (n == 0) return VG_FLOAT_NOT_NUMBER;
    if (n >= sizeof small) {
        buf = vg_malloc(n + 1);
        /* Out of memory on a token longer than 127 bytes: report it as
         * not a number rather than guess. */
        if (!buf) return VG_FLOAT_NOT_NUMBER;
    }
    memcpy(buf, p, n);
    buf[n] = '\0';
    char *end;
    int saved = errno;
    float f = strtof(buf, &end);
    errno = saved;
    int whole = end == buf + n;
    /* Hexadecimal ("0x1p3"), which strtof reads but no trainer writes;
     * and digits that are not all zero before the exponent, yet a zero
     * result: an exponent beyond any float, not a value. */
    int hex = memchr(buf, 'x', n) || memchr(buf, 'X', n);
    int nonzero = 0;
    for (size_t i = 0; i < n && (buf[i] | 0x20) != 'e'; i++) nonzero |= buf[i] >= '1' && buf[i] <= '9';
    if (buf != small) vg_free(buf);
    if (!whole || hex) return VG_FLOAT_NOT_NUMBER;
    if (!isfinite(f)) return VG_FLOAT_NOT_FINITE;
    if (f == 0.0f && nonzero) return VG_FLOAT_UNDERFLOW;
    *out = f;
    return VG_FLOAT_OK;
}

static const char *token_end(const char *s, const char *end) {
    while (s < end && !VG_IS_DELIM(*s)) s++;
    return s;
}

/* Round w * 10^e10 to float if the margin test proves it exact; 0 if
 * not (the caller then asks strtof). */
static inline int finish(uint64_t w, int e10, int neg, float *out) {
    if (e10 < -POW10_MAX || e10 > POW10_MAX) return 0;
    double q = e10 >= 0 ? (double)w * pow10_tab[e10] : (double)w / pow10_tab[-e10];
    if (!(q >= 0x1p-126 && q <= (double)FLT_MAX)) return 0;
    uint64_t bits;
    memcpy(&bits, &q, sizeof bits);
    uint32_t low = (uint32_t)(bits & 0x1FFFFFFFu);
    if (low - ((1u << 28) - VG_MIDPOINT_MARGIN) <= 2 * VG_MIDPOINT_MARGIN) return 0;
    *out = vg_with_sign((float)q, neg);
    return 1;
}

const double vg_inv10_tab[8] = {1e0, 1e-1, 1e-2, 1e-3, 1e-4, 1e-5, 1e-6, 1e-7};
const uint32_t vg_pow10_u32[9] = {1, 10, 100, 1000, 10000, 100000, 1000000, 10000000, 100000000};
/* Every power up to 10^10 is exact in float (5^10 < 2^24). */
const float vg_pow10_f32[8] = {1e0f, 1e1f, 1e2f, 1e3f, 1e4f, 1e5f, 1e6f, 1e7f};

int vg_parse_token_slow(const char *a, size_t len, float *out) {
    const char *t;
    int rc = vg_scan_float(a, a + len, &t, out);
    if (rc == VG_FLOAT_OK && t != a + len) return VG_FLOAT_NOT_NUMBER;
    return rc;
}

int vg_scan_float(const char *p, const char *end, const char **tok_end, float *out) {
    /* The common shape, [-]digits[.digits] with fewer than 8 digits on
     * each side of the point, when 18 bytes can be read: two 8-byte loads
     * and no per-character branches. */
    if (end - p >= 18) {
        const char *s = p;
        int neg = *s == '-';
        s += neg;
        unsigned k1, k2 = 0;
        uint64_t x = vg_digits8(s, &k1);
        if (k1 < 8) {
            uint64_t w = k1 ? vg_value8(x, k1) : 0;
            s += k1;
            if (*s == '.') {
                s++;
                x = vg_digits8(s, &k2);
                if (k2 < 8) {
                    if (k2) w = w * vg_pow10_u32[k2] + vg_value8(x, k2);
                    s += k2;
                } else {
                    goto general;
                }
            }
            if (k1 + k2 > 0 && VG_IS_DELIM(*s)) {
                *tok_end = s;
                if (w == 0) {
                    *out = vg_with_sign(0.0f, neg);
                    return VG_FLOAT_OK;
                }
                if (vg_float_round(w, k2, neg, out)) return VG_FLOAT_OK;
                return slow_path(p, s, out);
            }
        }
    }
general:;
    const char *s = p;
    int neg = 0;
    if (s < end && (*s == '-' || *s == '+')) {
        neg = *s == '-';
        s++;
    }
    uint64_t w = 0;
    int nd = 0;          /* significant digits held in w (at most 19) */
    int e10 = 0;         /* decimal exponent of w's last digit */
    int any = 0;         /* at least one mantissa digit */
    unsigned d;
    while (s < end && *s == '0') {
        s++;
        any = 1;
    }
    while (s < end && (d = (unsigned)(unsigned char)*s - '0') < 10) {
        if (nd < 19) {
            w = w * 10 + d;
            nd++;
        } else {
            e10++;
        }
        s++;
        any = 1;
    }
    if (s < end && *s == '.') {
        s++;
        if (nd == 0) {
            while (s < end && *s == '0') {
                s++;
                e10--;
                any = 1;
            }
        }
        while (s < end && (d = (unsigned)(unsigned char)*s - '0') < 10) {
            if (nd < 19) {
                w = w * 10 + d;
                nd++;
                e10--;
            }
            s++;
            any = 1;
        }
    }
    if (!any) goto slow;
    if (s < end && (*s | 0x20) == 'e') {
        s++;
        int eneg = 0;
        if (s < end && (*s == '-' || *s == '+')) {
            eneg = *s == '-';
            s++;
        }
        if (!(s < end && (unsigned)(unsigned char)*s - '0' < 10)) goto slow;
        int ex = 0;
        while (s < end && (d = (unsigned)(unsigned char)*s - '0') < 10) {
            if (ex < 100000) ex = ex * 10 + (int)d;
            s++;
        }
        e10 += eneg ? -ex : ex;
    }
    if (s < end && !VG_IS_DELIM(*s)) goto slow;
    *tok_end = s;
    if (w == 0) {
        *out = vg_with_sign(0.0f, neg);
        return VG_FLOAT_OK;
    }
    if (finish(w, e10, neg, out)) return VG_FLOAT_OK;

slow:
    *tok_end = token_end(s, end);
    return slow_path(p, *tok_end, out);
}
