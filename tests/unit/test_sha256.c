/* test_sha256.c - SHA-256 against the FIPS 180-4 examples.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "vgtest.h"

#include "common/sha256.h"

/* sha256-1..3: the one-block, two-block and empty messages of the NIST
 * examples for FIPS 180-4 (SHA256.pdf, "abc" and the 448-bit message;
 * the empty-string digest is the widely quoted e3b0c442...; from memory,
 * and coreutils sha256sum agrees: tests/e2e/reports.sh). */
static void test_nist_vectors(void **state) {
    (void)state;
    char hex[65];
    vg_sha256_buffer("abc", 3, hex);
    assert_string_equal(hex, "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad");
    const char *two = "abcdbcdecdefdefgefghfghighijhijkijkljklmklmnlmnomnopnopq";
    vg_sha256_buffer(two, strlen(two), hex);
    assert_string_equal(hex, "248d6a61d20638b8e5c026930c3e6039a33ce45964ff2167f6ecedd419db06c1");
    vg_sha256_buffer("", 0, hex);
    assert_string_equal(hex, "e3b0c44298fc1c149afbf4c8996fb92427ae41e4649b934ca495991b7852b855");
}

/* sha256-4: streaming in uneven pieces equals hashing at once: one million
 * 'a' (the third NIST example: cdc76e5c 9914fb92 81a1c7e2 84d73e67 f1809a48
 * a497200e 046d39cc c7112cd0; from memory). */
static void test_streaming_million_a(void **state) {
    (void)state;
    static char buf[1000000];
    memset(buf, 'a', sizeof buf);
    vg_sha256 *h = vg_sha256_new();
    assert_non_null(h);
    size_t off = 0, step = 1;
    while (off < sizeof buf) {
        size_t n = step < sizeof buf - off ? step : sizeof buf - off;
        vg_sha256_update(h, buf + off, n);
        off += n;
        step = step * 3 + 1;
    }
    char hex[65];
    vg_sha256_final(h, hex);
    assert_string_equal(hex, "cdc76e5c9914fb9281a1c7e284d73e67f1809a48a497200e046d39ccc7112cd0");
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_nist_vectors),
        cmocka_unit_test(test_streaming_million_a),
    };
    return cmocka_run_group_tests_name("sha256", tests, NULL, NULL);
}
