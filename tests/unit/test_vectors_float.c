/* test_vectors_float.c - the fast decimal-to-float conversion against the
 * C library's strtof, on millions of random and edge-case strings.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Reference: glibc's strtof, which rounds correctly to nearest (it works
 * in exact multi-precision arithmetic). Every check asks for the same
 * float bit for bit and the same verdict on what is a number; the issue
 * allows 1 ulp, the fast path is built to never need it.
 */
#include "vgtest.h"

#include <errno.h>
#include <float.h>

#include "vectors/fastfloat.h"

static uint64_t rng_state = 20260901u;
static uint64_t rng(void) {
    /* splitmix64 (Steele, Lea and Flood 2014) */
    uint64_t z = (rng_state += 0x9e3779b97f4a7c15ULL);
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
    return z ^ (z >> 31);
}

typedef struct tally {
    uint64_t n, agree, ulp1, fast_before;
} tally;

/* The reference verdict: 0 and the value, or a VG_FLOAT_* error. */
static int reference(const char *s, size_t len, float *out) {
    char buf[512];
    if (len == 0 || len >= sizeof buf) return VG_FLOAT_NOT_NUMBER;
    memcpy(buf, s, len);
    buf[len] = '\0';
    char *end;
    errno = 0;
    float f = strtof(buf, &end);
    if (end != buf + len) return VG_FLOAT_NOT_NUMBER;
    /* The two refusals fastfloat.h documents on top of strtof (issue 29):
     * hexadecimal, and digits that are not all zero read as 0. */
    if (strchr(buf, 'x') || strchr(buf, 'X')) return VG_FLOAT_NOT_NUMBER;
    if (!isfinite(f)) return VG_FLOAT_NOT_FINITE;
    if (f == 0.0f && strcspn(buf, "123456789") < strcspn(buf, "eE")) return VG_FLOAT_UNDERFLOW;
    *out = f;
    return VG_FLOAT_OK;
}

static int32_t ulp_distance(float a, float b) {
    int32_t x, y;
    memcpy(&x, &a, 4);
    memcpy(&y, &b, 4);
    if (x < 0) x = INT32_MIN - x;
    if (y < 0) y = INT32_MIN - y;
    return x > y ? x - y : y - x;
}

/* Check one string through both entry points (the scanning one and the
 * inline token one the text reader uses, with the padding it relies on). */
static void check(tally *t, const char *s) {
    size_t len = strlen(s);
    float want = 0, got1 = 0, got2 = 0;
    int rs = reference(s, len, &want);
    char pad[600];
    VG_ASSERT(len + 40 < sizeof pad);
    memcpy(pad, s, len);
    pad[len] = ' ';
    memset(pad + len + 1, 0, 32);
    const char *end;
    int r1 = vg_scan_float(pad, pad + len, &end, &got1);
    if (r1 == VG_FLOAT_OK && end != pad + len) r1 = VG_FLOAT_NOT_NUMBER;
    int r2 = len ? vg_parse_token(pad, len, &got2) : VG_FLOAT_NOT_NUMBER;
    t->n++;
    int same = r1 == rs && r2 == rs &&
               (rs != VG_FLOAT_OK || (memcmp(&got1, &want, 4) == 0 && memcmp(&got2, &want, 4) == 0));
    if (same) {
        t->agree++;
        return;
    }
    if (r1 == rs && r2 == rs && ulp_distance(got1, want) <= 1 && ulp_distance(got2, want) <= 1) {
        t->ulp1++;
        return;
    }
    print_error("'%s': strtof %d %.9g, scan %d %.9g, token %d %.9g\n", s, rs, (double)want, r1,
                (double)got1, r2, (double)got2);
}

static double scale(void) {
    const char *san = getenv("VG_SANITIZED");
    return san && *san == '1' ? 0.1 : 1.0;
}

static void report(const char *what, const tally *t, uint64_t fallbacks) {
    printf("# fastfloat %s: %llu strings, %llu bit-identical to strtof, %llu within 1 ulp, "
           "%.4f%% on the fast path\n",
           what, (unsigned long long)t->n, (unsigned long long)t->agree,
           (unsigned long long)t->ulp1,
           t->n ? 100.0 * (double)(2 * t->n - fallbacks) / (double)(2 * t->n) : 0.0);
}

#define RUN(what, count, ...)                                           \
    do {                                                                   \
        tally t_ = {0, 0, 0, 0};                                           \
        uint64_t fb0_ = vg_float_fallbacks();                              \
        uint64_t n_ = (uint64_t)((double)(count)*scale());                 \
        char s[512];                                                       \
        for (uint64_t i_ = 0; i_ < n_; i_++) {                             \
            __VA_ARGS__;                                                     \
            check(&t_, s);                                                 \
        }                                                                  \
        report(what, &t_, vg_float_fallbacks() - fb0_);                    \
        assert_int_equal(t_.agree, t_.n);                                  \
    } while (0)

/* float-1: the way trainers print vectors: fixed six or four decimals of
 * values around zero, and %g with 5 to 9 significant digits. */
static void test_vector_style(void **state) {
    (void)state;
    RUN("fixed decimals", 1500000, {
        double x = ((double)(rng() >> 11) * 0x1p-53 - 0.5) * (i_ % 3 == 0 ? 8.0 : 1.0);
        snprintf(s, sizeof s, i_ % 2 ? "%.6f" : "%.4f", x);
    });
    RUN("%g 5-9 digits", 1000000, {
        double x = ((double)(rng() >> 11) * 0x1p-53 - 0.5) * pow(10, (double)(rng() % 9) - 6);
        snprintf(s, sizeof s, "%.*g", 5 + (int)(rng() % 5), x);
    });
}

/* float-1b: w / 10^k for w below 2^24 and k up to 7, the shape the float
 * division path takes, with the integers at and just past 2^24, where it
 * must give way (Clinger's exactness condition in single precision). */
static void test_short_decimals(void **state) {
    (void)state;
    RUN("w / 10^k, w near or below 2^24", 1000000, {
        uint32_t w = (uint32_t)(rng() & 0xFFFFFFu);
        if (i_ % 64 == 0) w = 16777215u + (uint32_t)(rng() % 3);
        int k = (int)(rng() % 8);
        char digits[16];
        int nd = snprintf(digits, sizeof digits, "%0*u", k + 1, (unsigned)w);
        size_t m = 0;
        if (rng() & 1) s[m++] = '-';
        memcpy(s + m, digits, (size_t)(nd - k));
        m += (size_t)(nd - k);
        if (k) {
            s[m++] = '.';
            memcpy(s + m, digits + nd - k, (size_t)k);
            m += (size_t)k;
        }
        s[m] = '\0';
    });
}

/* float-2: every finite float (uniform over bit patterns), printed with
 * 9 significant digits (enough to round-trip, FLT_DECIMAL_DIG) and with
 * fewer, in both %e and %g forms: subnormals and the extremes included. */
static void test_all_floats(void **state) {
    (void)state;
    RUN("random float bits", 1000000, {
        uint32_t b;
        float f;
        do {
            b = (uint32_t)rng();
            memcpy(&f, &b, 4);
        } while (!isfinite(f));
        int digits = 1 + (int)(rng() % 9);
        snprintf(s, sizeof s, rng() % 2 ? "%.*e" : "%.*g", digits, (double)f);
    });
}

/* float-3: random decimal strings: 0 to 30 digits before and after the
 * point, optional sign and exponent; these reach the 19-digit cut, long
 * tokens and values beyond float's range. */
static void test_random_decimals(void **state) {
    (void)state;
    RUN("random decimal strings", 1000000, {
        size_t k = 0;
        uint64_t r = rng();
        if (r & 1) s[k++] = (r & 2) ? '-' : '+';
        int a = (int)(rng() % 12), b = (int)(rng() % 31);
        if (rng() % 8 == 0) a = (int)(rng() % 31);
        for (int j = 0; j < a; j++) s[k++] = (char)('0' + rng() % 10);
        if (b || rng() % 2) s[k++] = '.';
        for (int j = 0; j < b; j++) s[k++] = (char)('0' + rng() % 10);
        if (rng() % 3 == 0) {
            s[k++] = rng() % 2 ? 'e' : 'E';
            if (rng() % 2) s[k++] = rng() % 2 ? '-' : '+';
            k += (size_t)snprintf(s + k, sizeof s - k, "%d", (int)(rng() % 60));
        }
        s[k] = '\0';
    });
}

/* float-4: the hardest inputs: exact decimal expansions of the midpoints
 * between adjacent floats (they must round to even), and of the doubles
 * just above and below each midpoint (they must round away from it). A
 * midpoint has 25 significant bits, so a double holds it exactly and
 * glibc's %.120g prints it exactly. */
static void test_midpoints(void **state) {
    (void)state;
    RUN("float midpoints and neighbours", 900000, {
        uint32_t b;
        float f;
        do {
            b = (uint32_t)rng() & 0x7fffffffu;
            memcpy(&f, &b, 4);
        } while (!isfinite(f) || f >= FLT_MAX || f < FLT_MIN);
        double m = ((double)f + (double)nextafterf(f, INFINITY)) / 2;
        int which = (int)(i_ % 3);
        double x = which == 0 ? m : which == 1 ? nextafter(m, 0) : nextafter(m, INFINITY);
        snprintf(s, sizeof s, "%.120g", x);
    });
}

/* float-5: hand-picked edges (common practice, and the C standard's
 * grammar for strtof: sign, digits, point, exponent, hex, inf, nan). */
static void test_edges(void **state) {
    (void)state;
    static const char *const cases[] = {
        "0", "-0", "+0", "0.0", "-0.0", "00000", "1", "-1", "+1", "1.", ".5", "-.5", "1.e3",
        "1e0", "1E-3", "1e+05", "0.000001", "123456789", "1234567890123456789",
        "12345678901234567890123", "0.1", "0.2", "0.3", "3.4028235e38", "3.4028236e38",
        "3.40282357e38", "3.4028234663852886e38", "3.402823669e38", "1e39", "-1e39", "1e-38",
        "1.17549435e-38", "1.1754942e-38", "1e-45", "1.4e-45", "7e-46", "7.1e-46", "1e-46",
        "1e-50", "2.5e-45", "0.00000000000000000000000000000000000001", "16777216", "16777217",
        "16777218", "16777219", "33554433", "0.50000000000000000000000000000000000000001",
        "", "-", "+", ".", "-.", "e5", "1e", "1e+", "1e-", "1.2.3", "1..2", "--1", "+-1", "1-",
        "1e5.5", "0x10", "0x1p-3", "-0X1.8P1", "inf", "-inf", "Infinity", "nan", "NAN", "nan(1)",
        "1x", "x1", "1,5", "١", "0.1234567", "0.12345678", "-0.00001234", "99999999", "9999999",
        "0.99999999999999999999", "1e-7", "4294967296", "18446744073709551616",
        /* Whole tokens of at most 8 bytes after the sign, with a point:
         * the one-step conversion and the bytes it must refuse. */
        "1.234567", "-1.234567", "123456.7", ".1234567", "-.1234567", "1234567.", "9.999999",
        "-9.999999", "0.000000", "-0.000000", "1.000000", "00.00001", "1.2x4567", "12.4-678",
        "0.1234e6", "1.23456.", "1.", "1e-99999", "-5e-99999", "0e-99999", "0x0",
    };
    tally t = {0, 0, 0, 0};
    uint64_t fb0 = vg_float_fallbacks();
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) check(&t, cases[i]);
    /* Long tokens: 300 digits, and a long run of zeros before one digit. */
    char s[512];
    memset(s, '7', 300);
    s[300] = '\0';
    check(&t, s);
    s[0] = '0';
    s[1] = '.';
    memset(s + 2, '0', 200);
    s[202] = '3';
    s[203] = '\0';
    check(&t, s);
    report("edge cases", &t, vg_float_fallbacks() - fb0);
    assert_int_equal(t.agree, t.n);
}

/* float-6 (issue 29): what strtof accepts but a vector file never holds
 * is refused with its own verdict: hexadecimal is not a number, and
 * digits that are not all zero but read as 0 underflow; a subnormal
 * (common practice: fastText prints them) and a written zero stay. */
static void test_refusals(void **state) {
    (void)state;
    static const struct {
        const char *s;
        int want;
    } cases[] = {
        {"0x10", VG_FLOAT_NOT_NUMBER},   {"0x1p3", VG_FLOAT_NOT_NUMBER},
        {"-0X1.8P1", VG_FLOAT_NOT_NUMBER}, {"1e-99999", VG_FLOAT_UNDERFLOW},
        {"7e-46", VG_FLOAT_UNDERFLOW},   {"-2e-60", VG_FLOAT_UNDERFLOW},
        {"1e-45", VG_FLOAT_OK},          {"0e-99999", VG_FLOAT_OK},
        {"0.0000", VG_FLOAT_OK},         {"inf", VG_FLOAT_NOT_FINITE},
    };
    for (size_t i = 0; i < sizeof cases / sizeof cases[0]; i++) {
        char pad[64] = {0};
        size_t len = strlen(cases[i].s);
        memcpy(pad, cases[i].s, len);
        float f;
        const char *end;
        int r1 = vg_scan_float(pad, pad + len, &end, &f);
        int r2 = vg_parse_token(pad, len, &f);
        if (r1 != cases[i].want || r2 != cases[i].want)
            fail_msg("'%s': scan %d, token %d, want %d", cases[i].s, r1, r2, cases[i].want);
    }
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_refusals),
        cmocka_unit_test(test_vector_style),    cmocka_unit_test(test_short_decimals),
        cmocka_unit_test(test_all_floats),
        cmocka_unit_test(test_random_decimals), cmocka_unit_test(test_midpoints),
        cmocka_unit_test(test_edges),
    };
    return cmocka_run_group_tests_name("vectors_float", tests, NULL, NULL);
}
