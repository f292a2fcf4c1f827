/* test_api.c - the library's version and its error helpers.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "vgtest.h"

/* api-1: vg_version() matches the header's version macros (the check
 * zlib's deflateInit_ makes between header and library). */
static void test_version(void **state) {
    (void)state;
    assert_string_equal(vg_version(), VG_VERSION_STRING);
    char buf[32];
    snprintf(buf, sizeof buf, "%d.%d.%d", VG_VERSION_MAJOR, VG_VERSION_MINOR, VG_VERSION_PATCH);
    assert_string_equal(buf, VG_VERSION_STRING);
    assert_int_equal(VG_VERSION_NUMBER,
                     VG_VERSION_MAJOR * 10000 + VG_VERSION_MINOR * 100 + VG_VERSION_PATCH);
}

/* api-2: error formatting: path:line:column: message; long paths keep
 * their end; every status has a name. */
static void test_error_format(void **state) {
    (void)state;
    vg_error err;
    vg_error_clear(&err);
    char buf[1200];
    vg_error_set(&err, VG_EVALUE, "dir/file.txt", 12, "expected %s, found '%s'", "a number", "x");
    err.column = 3;
    assert_string_equal(vg_error_format(&err, buf, sizeof buf),
                        "dir/file.txt:12:3: expected a number, found 'x'");
    char longpath[2000];
    memset(longpath, 'a', sizeof longpath);
    memcpy(longpath + sizeof longpath - 9, "/end.txt", 9);
    vg_error_set(&err, VG_EIO, longpath, 0, "cannot open");
    assert_true(strlen(err.path) < VG_ERROR_PATH_MAX);
    assert_non_null(strstr(err.path, "/end.txt"));
    vg_error_prefix(&err, "suite %s: ", "x");
    assert_string_equal(err.message, "suite x: cannot open");
    for (int c = VG_OK; c <= VG_EINTERNAL; c++) assert_true(strlen(vg_status_name((vg_status)c)) > 0);
    assert_int_equal(vg_error_set(NULL, VG_ENOMEM, NULL, 0, "x"), VG_ENOMEM);
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_version),
        cmocka_unit_test(test_error_format),
    };
    return cmocka_run_group_tests_name("api", tests, NULL, NULL);
}
