/* test_digest_cache.c - the digest cache of vector files: hits, misses,
 * racy entries, refresh, and loads that take their digest from it.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "vgtest.h"

#include <stdlib.h>
#include <sys/stat.h>
#include <time.h>
#include <unistd.h>

#include "vectors/vectors_impl.h"

static char dir[256], file[300];

static int setup(void **state) {
    (void)state;
    snprintf(dir, sizeof dir, "/tmp/vg-digest-XXXXXX");
    if (!mkdtemp(dir)) return -1;
    setenv("XDG_CACHE_HOME", dir, 1);
    snprintf(file, sizeof file, "%s/v.txt", dir);
    FILE *fp = fopen(file, "w");
    if (!fp) return -1;
    fputs("2 2\na 1 0\nb 0 1\n", fp);
    fclose(fp);
    return 0;
}

static int teardown(void **state) {
    (void)state;
    char cmd[600];
    snprintf(cmd, sizeof cmd, "rm -rf '%s'", dir);
    return system(cmd) == 0 ? 0 : -1;
}

static long long now_ns(void) {
    struct timespec t;
    clock_gettime(CLOCK_REALTIME, &t);
    return (long long)t.tv_sec * 1000000000LL + t.tv_nsec;
}

/* digest-1: an entry keyed on times older than the 2 s margin is found;
 * one whose file times are as new as the moment it was cached is racy and
 * refused (a rewrite within the same tick of a coarse clock would keep its
 * key: the rule of version-control indexes, common practice); another
 * identity misses. */
static void test_racy_rule(void **state) {
    (void)state;
    static const char h1[] = "0123456789abcdef0123456789abcdef0123456789abcdef0123456789abcdef";
    vg_digest_key_t k;
    assert_int_equal(vg_digest_key(file, &k), 0);
    char got[65];
    /* Just written: the file's status-change time is now. */
    vg_digest_cache_put(&k, h1);
    assert_int_equal(vg_digest_cache_get(&k, got), -1);
    /* The same identity with times 10 s old: trusted. */
    vg_digest_key_t old = k;
    old.mtime_ns = old.ctime_ns = now_ns() - 10000000000LL;
    vg_digest_cache_put(&old, h1);
    assert_int_equal(vg_digest_cache_get(&old, got), 0);
    assert_string_equal(got, h1);
    /* Any field changed: a miss. */
    vg_digest_key_t other = old;
    other.size++;
    assert_int_equal(vg_digest_cache_get(&other, got), -1);
    other = old;
    other.ctime_ns++;
    assert_int_equal(vg_digest_cache_get(&other, got), -1);
    /* Times 1 s before the entry: still racy. */
    vg_digest_key_t recent = k;
    recent.mtime_ns = recent.ctime_ns = now_ns() - 1000000000LL;
    vg_digest_cache_put(&recent, h1);
    assert_int_equal(vg_digest_cache_get(&recent, got), -1);
    /* A pipe or a directory has no identity to cache. */
    assert_int_equal(vg_digest_key(dir, &k), -1);
}

/* digest-2: loads. The first load computes the digest (Python's
 * hashlib.sha256 of the file's 17 bytes gives the value checked) and
 * caches it; once the file is older than
 * the margin, a load takes it from the cache; VG_DIGEST_CACHE_REFRESH
 * computes it again; VG_DIGEST_CACHE_OFF never reads it. */
static void test_loads(void **state) {
    (void)state;
    vg_load_options o;
    vg_load_options_init(&o);
    assert_int_equal(o.digest_cache, VG_DIGEST_CACHE_OFF);
    o.digest_cache = VG_DIGEST_CACHE_USE;
    vg_vectors *v;
    vg_error err;
    assert_vg_ok(vg_vectors_load(file, &o, &v, &err), &err);
    const char *want = "a3597c22022859d5d6b1883801242a4f10776cd7e68888d1c3b7da318ed7535e";
    assert_string_equal(vg_vectors_get_info(v)->sha256, want);
    assert_int_equal(vg_vectors_get_info(v)->digest_cached, 0);
    vg_vectors_free(v);
    /* Racy: cached within 2 s of the file's creation, so computed again. */
    assert_vg_ok(vg_vectors_load(file, &o, &v, &err), &err);
    assert_int_equal(vg_vectors_get_info(v)->digest_cached, 0);
    vg_vectors_free(v);
    sleep(3);
    assert_vg_ok(vg_vectors_load(file, &o, &v, &err), &err); /* caches a trusted entry */
    vg_vectors_free(v);
    assert_vg_ok(vg_vectors_load(file, &o, &v, &err), &err);
    assert_int_equal(vg_vectors_get_info(v)->digest_cached, 1);
    assert_int_equal(vg_vectors_get_info(v)->hashed, 1);
    assert_string_equal(vg_vectors_get_info(v)->sha256, want);
    vg_vectors_free(v);
    o.digest_cache = VG_DIGEST_CACHE_REFRESH;
    assert_vg_ok(vg_vectors_load(file, &o, &v, &err), &err);
    assert_int_equal(vg_vectors_get_info(v)->digest_cached, 0);
    assert_string_equal(vg_vectors_get_info(v)->sha256, want);
    vg_vectors_free(v);
    o.digest_cache = VG_DIGEST_CACHE_OFF;
    assert_vg_ok(vg_vectors_load(file, &o, &v, &err), &err);
    assert_int_equal(vg_vectors_get_info(v)->digest_cached, 0);
    vg_vectors_free(v);
}

int main(void) {
    const struct CMUnitTest tests[] = {cmocka_unit_test(test_racy_rule),
                                       cmocka_unit_test(test_loads)};
    return cmocka_run_group_tests_name("digest_cache", tests, setup, teardown);
}
