/* test_api.c - the library's version and its error helpers.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "vgtest.h"

#include <cblas.h>
#include <dirent.h>

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

/* Threads of this process, from /proc/self/task (0 where there is none). */
static int count_threads(void) {
    DIR *d = opendir("/proc/self/task");
    if (!d) return 0;
    int n = 0;
    struct dirent *e;
    while ((e = readdir(d)) != NULL)
        if (e->d_name[0] != '.') n++;
    closedir(d);
    return n;
}

/* api-3: vg_blas_park_workers puts OpenBLAS's idle pool away (where the
 * process had more threads than its own one, it has fewer after), and the
 * next threaded product starts the pool again and is right: a 512 x 512
 * sgemm of small integers equals the plain triple loop exactly (integer
 * products and sums below 2^24 are exact in float: common practice). */
static void test_blas_pool(void **state) {
    (void)state;
    enum { N = 512 };
    float *a = malloc(sizeof(float) * N * N), *b = malloc(sizeof(float) * N * N);
    float *c = malloc(sizeof(float) * N * N);
    assert_non_null(a);
    assert_non_null(b);
    assert_non_null(c);
    for (int i = 0; i < N * N; i++) {
        a[i] = (float)(i % 7) - 3;
        b[i] = (float)(i % 5) - 2;
    }
    int before = count_threads();
    for (int round = 0; round < 2; round++) {
        vg_blas_park_workers();
        int parked = count_threads();
        if (before > 1) assert_true(parked < before);
        cblas_sgemm(CblasRowMajor, CblasNoTrans, CblasNoTrans, N, N, N, 1.0f, a, N, b, N, 0.0f,
                    c, N);
        assert_int_equal(count_threads(), before);
        for (int i = 0; i < N; i += 37) {
            for (int j = 0; j < N; j += 41) {
                float want = 0;
                for (int k = 0; k < N; k++) want += a[i * N + k] * b[k * N + j];
                assert_true(c[i * N + j] == want);
            }
        }
    }
    free(a);
    free(b);
    free(c);
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_version),
        cmocka_unit_test(test_error_format),
        cmocka_unit_test(test_blas_pool),
    };
    return cmocka_run_group_tests_name("api", tests, NULL, NULL);
}
