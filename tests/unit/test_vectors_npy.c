/* test_vectors_npy.c - the .npy reader against files NumPy writes at test
 * time: float32 and float64, both byte orders, C and Fortran order,
 * format versions 1.0, 2.0 and 3.0, plain and gzip.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Reference: Debian's python3-numpy (/usr/bin/python3). For each file it
 * also writes the matrix as NumPy itself converts it to little-endian
 * float32 (astype('<f4'): round to nearest), which the loaded matrix must
 * equal bit for bit. Skips when NumPy is not there.
 */
#include "vgtest.h"

static char dir[4096];

static int have_numpy(void) {
    return system("/usr/bin/python3 -c 'import numpy' >/dev/null 2>&1") == 0;
}

/* The generator: 301 x 7 values, normal with a few extremes (a float64
 * value below float32's normal range, exact zeros, a zero row). */
static const char script[] =
    "import numpy as np, gzip, sys, os\n"
    "d = sys.argv[1]\n"
    "rng = np.random.default_rng(5)\n"
    "m = rng.standard_normal((301, 7))\n"
    "m[3, :] = 0; m[10, 2] = 1e-40; m[11, 4] = -3.3e38; m[12, 1] = 0.1\n"
    "words = ['w%d' % i for i in range(301)]\n"
    "words[7] = 'new york'; words[8] = 'caf\\u00e9'\n"
    "for dt in ['<f4', '>f4', '<f8', '>f8']:\n"
    "  for order in ['C', 'F']:\n"
    "    for ver in [(1, 0), (2, 0), (3, 0)]:\n"
    "      a = np.array(m, dtype=dt, order=order)\n"
    "      name = 'm_%s%s_%s_v%d' % ('le' if dt[0] == '<' else 'be', dt[2], order, ver[0])\n"
    "      with open(os.path.join(d, name + '.npy'), 'wb') as f:\n"
    "        np.lib.format.write_array(f, a, version=ver)\n"
    "      open(os.path.join(d, name + '.vocab'), 'w', encoding='utf-8').write('\\n'.join(words) + '\\n')\n"
    "      a.astype('<f4').tofile(os.path.join(d, name + '.ref'))\n"
    "for order in ['C', 'F']:\n"
    "  a = np.array(m, dtype='<f4', order=order)\n"
    "  import io\n"
    "  b = io.BytesIO(); np.lib.format.write_array(b, a)\n"
    "  name = 'gz_%s' % order\n"
    "  open(os.path.join(d, name + '.npy.gz'), 'wb').write(gzip.compress(b.getvalue()))\n"
    "  open(os.path.join(d, name + '.vocab'), 'w', encoding='utf-8').write('\\n'.join(words) + '\\n')\n"
    "  a.astype('<f4').tofile(os.path.join(d, name + '.ref'))\n"
    "a = np.array(m, dtype='<f4')\n"
    "h = \"{'descr': '<f4', 'fortran_order': False, 'shape': (301, 7), }\"\n"
    "h = h + ' ' * (80 - 10 - 1 - len(h)) + '\\n'\n"
    "open(os.path.join(d, 'off80.npy'), 'wb').write(b'\\x93NUMPY\\x01\\x00' + len(h).to_bytes(2, 'little') + h.encode() + a.tobytes())\n"
    "open(os.path.join(d, 'off80.vocab'), 'w', encoding='utf-8').write('\\n'.join(words) + '\\n')\n"
    "a.tofile(os.path.join(d, 'off80.ref'))\n"
    "bad = np.array(m, dtype='<f4'); bad[200, 5] = np.nan\n"
    "np.save(os.path.join(d, 'nan.npy'), bad)\n"
    "open(os.path.join(d, 'nan.vocab'), 'w').write('\\n'.join(words) + '\\n')\n"
    "np.save(os.path.join(d, 'oned.npy'), np.zeros(5, '<f4'))\n"
    "np.save(os.path.join(d, 'ints.npy'), np.zeros((2, 2), '<i4'))\n"
    "np.save(os.path.join(d, 'three.npy'), np.zeros((2, 2, 2), '<f4'))\n"
    "for n in ['oned', 'ints', 'three']: open(os.path.join(d, n + '.vocab'), 'w').write('a\\nb\\n')\n";

static int setup(void **state) {
    (void)state;
    if (!have_numpy()) return 0;
    snprintf(dir, sizeof dir, "%s", temp_path("npy"));
    char cmd[16384];
    snprintf(cmd, sizeof cmd, "mkdir -p '%s' && /usr/bin/python3 - '%s' <<'PY'\n%sPY\n", dir, dir,
             script);
    return system(cmd) == 0 ? 0 : -1;
}

static int teardown(void **state) {
    (void)state;
    if (dir[0]) {
        char cmd[4200];
        snprintf(cmd, sizeof cmd, "rm -rf '%s'", dir);
        if (system(cmd) != 0) return -1;
    }
    return 0;
}

static float *read_ref(const char *name, size_t n) {
    char p[4200];
    snprintf(p, sizeof p, "%s/%s.ref", dir, name);
    FILE *fp = fopen(p, "rb");
    assert_non_null(fp);
    float *x = malloc(n * sizeof *x);
    assert_non_null(x);
    assert_int_equal(fread(x, sizeof *x, n, fp), n);
    fclose(fp);
    return x;
}

static vg_status load_name(const char *name, const vg_load_options *opt, vg_vectors **v,
                           vg_error *err) {
    char p[4200];
    snprintf(p, sizeof p, "%s/%s", dir, name);
    vg_error_clear(err);
    return vg_vectors_load(p, opt, v, err);
}

static void check_file_mapped(const char *name, const char *ext, int big, int f64, int fortran,
                              int mapped) {
    char file[100];
    snprintf(file, sizeof file, "%s%s", name, ext);
    /* Hashed (the default), then not: only unhashed loads may map. */
    for (int hash = 1; hash >= 0; hash--) {
        vg_load_options opt;
        vg_load_options_init(&opt);
        opt.compute_hash = hash;
        vg_vectors *v = NULL;
        vg_error err;
        assert_vg_ok(load_name(file, &opt, &v, &err), &err);
        const vg_vectors_info *in = vg_vectors_get_info(v);
        assert_int_equal(in->layout, VG_LAYOUT_NPY);
        assert_int_equal(vg_vectors_rows(v), 301);
        assert_int_equal(vg_vectors_dims(v), 7);
        assert_int_equal(in->big_endian, big);
        assert_int_equal(in->source_float64, f64);
        assert_int_equal(in->fortran_order, fortran);
        assert_int_equal(in->zero_rows, 1);
        assert_int_equal(in->mapped, mapped && !hash);
        float *ref = read_ref(name, 301 * 7);
        assert_memory_equal(vg_vectors_data(v), ref, 301 * 7 * sizeof(float));
        free(ref);
        assert_int_equal(vg_vectors_find(v, "new york", 8), 7);
        assert_int_equal(vg_vectors_find(v, "caf\xc3\xa9", 5), 8);
        vg_vectors_free(v);
    }
}

/* The matrix is the file's own bytes (mapped, no copy) exactly when the
 * file is not hashed and its data are native float32, row-major, not
 * compressed and at a 64-byte aligned offset, which NumPy's writer gives (it pads the header to a multiple of
 * 64: the NumPy format description). */
static void check_file(const char *name, const char *ext, int big, int f64, int fortran) {
    int native = !big && !f64 && !fortran && strcmp(ext, ".npy") == 0;
    check_file_mapped(name, ext, big, f64, fortran, native);
}

/* npy-1: 24 files (dtype x byte order x memory order x version), each
 * equal bit for bit to NumPy's own float32 conversion. */
static void test_numpy_files(void **state) {
    (void)state;
    if (!dir[0]) skip();
    const char *bo[] = {"le", "be"}, *ord[] = {"C", "F"};
    for (int b = 0; b < 2; b++)
        for (int s = 4; s <= 8; s += 4)
            for (int o = 0; o < 2; o++)
                for (int ver = 1; ver <= 3; ver++) {
                    char name[64];
                    snprintf(name, sizeof name, "m_%s%d_%s_v%d", bo[b], s, ord[o], ver);
                    check_file(name, ".npy", b, s == 8, o);
                }
}

/* npy-1b: native float32 data at offset 80 (a header padded to a multiple
 * of 16 only, as older NumPy wrote them: from memory) cannot be the
 * 64-byte aligned matrix: they are read into memory of its own, and are
 * still NumPy's values bit for bit. */
static void test_numpy_unaligned(void **state) {
    (void)state;
    if (!dir[0]) skip();
    check_file_mapped("off80", ".npy", 0, 0, 0, 0);
}

/* npy-2: gzip-compressed .npy, row-major and column-major. */
static void test_numpy_gzip(void **state) {
    (void)state;
    if (!dir[0]) skip();
    check_file("gz_C", ".npy.gz", 0, 0, 0);
    check_file("gz_F", ".npy.gz", 0, 0, 1);
}

/* npy-3: NaN is a bad row (or skipped), and arrays that are not float
 * matrices are refused by name. */
static void test_numpy_errors(void **state) {
    (void)state;
    if (!dir[0]) skip();
    vg_vectors *v = NULL;
    vg_error err;
    assert_int_equal(load_name("nan.npy", NULL, &v, &err), VG_EVALUE);
    assert_non_null(strstr(err.message, "row 201"));
    vg_load_options opt;
    vg_load_options_init(&opt);
    opt.skip_bad_rows = 1;
    opt.compute_hash = 0; /* so that the load starts mapped */
    assert_vg_ok(load_name("nan.npy", &opt, &v, &err), &err);
    assert_int_equal(vg_vectors_get_info(v)->bad_rows, 1);
    assert_int_equal(vg_vectors_rows(v), 300);
    /* The skipped row closes its gap: rows move, so the mapped file
     * bytes were given up for a copy; the rows after it are NumPy's. */
    assert_int_equal(vg_vectors_get_info(v)->mapped, 0);
    {
        float *ref = read_ref("m_le4_C_v1", 301 * 7);
        assert_memory_equal(vg_vectors_row(v, 199), ref + 199 * 7, 7 * sizeof(float));
        assert_memory_equal(vg_vectors_row(v, 200), ref + 201 * 7, 7 * sizeof(float));
        assert_memory_equal(vg_vectors_row(v, 299), ref + 300 * 7, 7 * sizeof(float));
        free(ref);
    }
    vg_vectors_free(v);
    assert_int_equal(load_name("oned.npy", NULL, &v, &err), VG_EUNSUPPORTED);
    assert_non_null(strstr(err.message, "of 1 dimension;"));
    assert_int_equal(load_name("three.npy", NULL, &v, &err), VG_EUNSUPPORTED);
    assert_int_equal(load_name("ints.npy", NULL, &v, &err), VG_EUNSUPPORTED);
    assert_non_null(strstr(err.message, "<i4"));
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_numpy_files),
        cmocka_unit_test(test_numpy_unaligned),
        cmocka_unit_test(test_numpy_gzip),
        cmocka_unit_test(test_numpy_errors),
    };
    return cmocka_run_group_tests_name("vectors_npy", tests, setup, teardown);
}
