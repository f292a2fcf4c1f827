/* fastfloat.h - decimal text to float32, as strtof rounds it, but faster.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Vector files hold hundreds of millions of decimal numbers; strtof is
 * general (locales, hex, arbitrary length) and costs several times what
 * a vector row's parse should. The fast path here handles the decimal
 * numbers trainers print and proves each result equal to the correctly
 * rounded one; anything it cannot prove goes to strtof, so the result is
 * always strtof's (tests/unit/test_vectors_float.c checks millions).
 */
#ifndef VG_FASTFLOAT_H
#define VG_FASTFLOAT_H

#include <float.h>
#include <stddef.h>
#include <stdint.h>
#include <string.h>

#include "../common/internal.h"

/* The bytes that end a number token in a vector file. */
#define VG_IS_DELIM(c) ((c) == ' ' || (c) == '\t' || (c) == '\n' || (c) == '\r')

/* Result of vg_scan_float. */
enum {
    VG_FLOAT_OK = 0,        /* *out holds the value */
    VG_FLOAT_NOT_NUMBER = -1, /* the token is not a whole number */
    VG_FLOAT_NOT_FINITE = -2, /* NaN, infinity, or beyond float's range */
    VG_FLOAT_UNDERFLOW = -3   /* not zero, but rounds to 0 in float (1e-99999) */
};

/* Parse the token starting at p (it ends at the first delimiter or at
 * end) as strtof would read it in the C locale, rounding to nearest.
 * Stores the token's end in *tok_end and returns VG_FLOAT_OK with *out
 * set, VG_FLOAT_NOT_NUMBER when strtof would not consume the whole token
 * or it is hexadecimal (strtof reads "0x1p3"; no trainer writes it), or
 * VG_FLOAT_NOT_FINITE for NaN, infinities and overflow. A value that
 * underflows to a subnormal keeps strtof's result; one whose digits are
 * not all zero but which rounds to 0 (an absurd exponent) is
 * VG_FLOAT_UNDERFLOW. Thread-safe. */
VG_INTERNAL int vg_scan_float(const char *p, const char *end, const char **tok_end, float *out);

/* ---- the inline fast path, for parsers that know a token's length ---- */

/* Distance, in double ulps, that a result must keep from a float rounding
 * boundary for the fast path to keep it (see fastfloat.c). */
#define VG_MIDPOINT_MARGIN 8u

extern const double vg_inv10_tab[8];     /* 10^-k, correctly rounded */
extern const uint32_t vg_pow10_u32[9];   /* 10^k */
extern const float vg_pow10_f32[8];      /* 10^k, exact */

/* How many of the eight bytes of x (bytes of text, each xor '0'), from
 * the first, are digits (0..8). A byte is a digit when (c ^ '0') < 10;
 * adding 0x76 sets the top bit of every byte at or above 10 without
 * carrying out of a byte below 0x80, and or-ing x itself flags the bytes
 * at or above 0x80. A carry from a flagged byte can only disturb the
 * bytes after it, which the count never reaches. */
static inline unsigned vg_digit_run8(uint64_t x) {
    uint64_t nondigit = ((x + 0x7676767676767676ull) | x) & 0x8080808080808080ull;
    return nondigit ? (unsigned)__builtin_ctzll(nondigit) >> 3 : 8u;
}

/* Eight bytes of s as digit values (byte i = s[i] - '0', the first in the
 * low byte), and in *k how many of them, from the first, are digits. */
static inline uint64_t vg_digits8(const char *s, unsigned *k) {
    uint64_t v;
    memcpy(&v, s, 8);
#if defined(__BYTE_ORDER__) && __BYTE_ORDER__ == __ORDER_BIG_ENDIAN__
    v = __builtin_bswap64(v);
#endif
    uint64_t x = v ^ 0x3030303030303030ull;
    *k = vg_digit_run8(x);
    return x;
}

/* The value of the first k (1..8) digit bytes of x, the first byte most
 * significant: shift them to the top (leading zero digits below), then
 * combine pairs, quads and octets by multiplication (the SWAR method in
 * Lemire, "Number parsing at a gigabyte per second", Software: Practice
 * and Experience 51(8), 2021). */
static inline uint32_t vg_value8(uint64_t x, unsigned k) {
    x <<= 8 * (8 - k);
    x = (x * 10 + (x >> 8)) & 0x00FF00FF00FF00FFull;
    x = (x * 100 + (x >> 16)) & 0x0000FFFF0000FFFFull;
    return (uint32_t)((x * 10000 + (x >> 32)) & 0xFFFFFFFFull);
}

/* f (not negative) with the sign bit set when neg, as -f is. By bits,
 * not by a branch: the signs of a vector's values are a coin toss, and a
 * branch on them was mispredicted about every other value, each time
 * discarding the division in flight (400k x 300 text, medians of 8
 * paired runs, 2026-12-03: unhashed 0.71 s to 0.54 s, hashed 1.23 s to
 * 1.01 s). */
static inline float vg_with_sign(float f, int neg) {
    uint32_t b;
    memcpy(&b, &f, sizeof b);
    b |= (uint32_t)(neg != 0) << 31;
    memcpy(&f, &b, sizeof f);
    return f;
}

/* w * 10^-k (w < 10^15, k < 8) rounded to float. Below 2^24 by one
 * exact division; above, when the margin test proves the result equal to
 * the correctly rounded one: w is exact in double and 10^-k within half
 * an ulp, so the product is within 1.5 ulps.
 * Returns 0 when it cannot prove it (the caller asks strtof). */
static inline int vg_float_round(uint64_t w, unsigned k, int neg, float *out) {
#if FLT_EVAL_METHOD == 0 /* float arithmetic in float (SSE, not x87): a single rounding */
    if (w < ((uint64_t)1 << 24)) {
        /* w and 10^k are both exact floats, so one IEEE division, which
         * rounds correctly, gives exactly strtof's float (Clinger's fast
         * path, in single precision; see fastfloat.c). */
        *out = vg_with_sign((float)w / vg_pow10_f32[k], neg);
        return 1;
    }
#endif
    double q = (double)w * vg_inv10_tab[k];
    uint64_t bits;
    memcpy(&bits, &q, sizeof bits);
    uint32_t low = (uint32_t)(bits & 0x1FFFFFFFu);
    if (!(q >= 0x1p-126) || low - ((1u << 28) - VG_MIDPOINT_MARGIN) <= 2 * VG_MIDPOINT_MARGIN) {
        if (w != 0) return 0;
        *out = vg_with_sign(0.0f, neg);
        return 1;
    }
    *out = vg_with_sign((float)q, neg);
    return 1;
}

/* The whole token a[0..len) (len >= 1) as a float, exactly as strtof.
 * Returns a VG_FLOAT_* code. */
VG_INTERNAL int vg_parse_token_slow(const char *a, size_t len, float *out);

/* As vg_parse_token_slow, with the common shapes ([-]d+[.d+], under 8
 * digits each side) inline. The 8-byte loads may read up to 16 bytes past
 * the token: callers guarantee that padding. */
static inline int vg_parse_token(const char *a, size_t len, float *out) {
    int neg = a[0] == '-';
    const char *s = a + neg;
    size_t n = len - (size_t)neg;
    unsigned k1, k2 = 0;
    uint64_t x = vg_digits8(s, &k1);
    uint64_t w;
    if (k1 == n && n - 1 < 7) { /* 1 to 7 digits (n - 1 wraps for n == 0) */
        w = k1 ? vg_value8(x, k1) : 0;
    } else if (n <= 8 && k1 + 2 <= n && s[k1] == '.') {
        /* The whole number is in the eight bytes read (as "0.077555", the
         * commonest shape in vector files): drop the point's byte and
         * convert every digit in one step. k1 <= 6, so no shift reaches
         * 64. */
        k2 = (unsigned)(n - k1 - 1);
        uint64_t c = (x & ((1ull << (8 * k1)) - 1)) | ((x >> (8 * (k1 + 1))) << (8 * k1));
        if (vg_digit_run8(c) < k1 + k2) return vg_parse_token_slow(a, len, out);
        w = vg_value8(c, k1 + k2);
    } else if (k1 < 8 && s[k1] == '.' && n - k1 - 1 < 8) {
        k2 = (unsigned)(n - k1 - 1);
        unsigned kk;
        uint64_t y = vg_digits8(s + k1 + 1, &kk);
        if (kk < k2 || k1 + k2 == 0) return vg_parse_token_slow(a, len, out);
        w = (k1 ? vg_value8(x, k1) : 0) * (uint64_t)vg_pow10_u32[k2] + (k2 ? vg_value8(y, k2) : 0);
    } else {
        return vg_parse_token_slow(a, len, out);
    }
    if (vg_float_round(w, k2, neg, out)) return 0;
    return vg_parse_token_slow(a, len, out);
}

/* How many calls on this thread so far went to strtof (for the tests
 * and the benchmark: the fast path's share is what they report). */
VG_INTERNAL uint64_t vg_float_fallbacks(void);

#endif /* VG_FASTFLOAT_H */
