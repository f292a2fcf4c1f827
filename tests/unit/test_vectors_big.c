/* test_vectors_big.c - files large enough for many chunks and threads:
 * round trips (text and binary written here, read back bit for bit),
 * results independent of the thread count, errors at the right line deep
 * in a file, and gzip streams of every layout written with zlib.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The reference for every value is the matrix the test itself writes:
 * %.9g prints a float so that strtof reads back exactly that float (9 is
 * FLT_DECIMAL_DIG, C11 5.2.4.2.2), and the binary and npy layouts hold
 * the float's bytes.
 */
#include "vgtest.h"

#include <errno.h>
#include <float.h>
#include <fcntl.h>
#include <signal.h>
#include <sys/mman.h>
#include <sys/stat.h>
#include <sys/wait.h>
#include <zlib.h>

#include "common/filemap.h"
#include "common/sha256.h"
#include "vectors/vectors_impl.h"

static uint64_t rng_state = 77;
static uint64_t rng(void) {
    /* splitmix64 (Steele, Lea and Flood 2014) */
    uint64_t z = (rng_state += 0x9e3779b97f4a7c15ULL);
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
    return z ^ (z >> 31);
}

/* Rows and dims of the generated set: over 8 MB of text, so the reader
 * splits it into several chunks and uses every thread. */
#define ROWS 14000
#define DIMS 64

static float *matrix;
static char (*words)[24];

static int setup(void **state) {
    (void)state;
    matrix = malloc((size_t)ROWS * DIMS * sizeof(float));
    words = malloc((size_t)ROWS * sizeof *words);
    if (!matrix || !words) return -1;
    for (size_t i = 0; i < ROWS; i++) {
        snprintf(words[i], sizeof words[i], "w%zu_%c", i, (char)('a' + rng() % 26));
        for (size_t j = 0; j < DIMS; j++) {
            double x = ((double)(rng() >> 11) * 0x1p-53 - 0.5) * 2.0;
            /* some exact zeros, some tiny and large magnitudes */
            if (rng() % 97 == 0) x = 0;
            if (rng() % 89 == 0) x *= 1e-30;
            matrix[i * DIMS + j] = (float)x;
        }
    }
    for (size_t j = 0; j < DIMS; j++) matrix[5 * DIMS + j] = 0; /* a zero row */
    return 0;
}

static int teardown(void **state) {
    (void)state;
    free(matrix);
    free(words);
    return 0;
}

typedef enum { W_TEXT, W_TEXT_PLAIN, W_BINARY, W_NPY } wlayout;

/* Write the set in a layout through fwrite or gzwrite. extra(i, fp)
 * lets a test disturb row i. */
static void write_set(const char *path, wlayout lay, int gz, size_t rows) {
    FILE *fp = NULL;
    gzFile g = NULL;
    if (gz) {
        g = gzopen(path, "wb1");
        assert_non_null(g);
    } else {
        fp = fopen(path, "wb");
        assert_non_null(fp);
    }
#define OUT(p, n) (gz ? (void)gzwrite(g, (p), (unsigned)(n)) : (void)fwrite((p), 1, (n), fp))
    char line[64 * 32];
    if (lay == W_TEXT || lay == W_BINARY) {
        int n = snprintf(line, sizeof line, "%zu %d\n", rows, DIMS);
        OUT(line, (size_t)n);
    }
    if (lay == W_NPY) {
        char dict[128];
        int n = snprintf(dict, sizeof dict,
                         "{'descr': '<f4', 'fortran_order': False, 'shape': (%zu, %d), }", rows,
                         DIMS);
        int pad = (64 - (10 + n + 1) % 64) % 64;
        unsigned hl = (unsigned)(n + pad + 1);
        unsigned char pre[10] = {0x93, 'N', 'U', 'M', 'P', 'Y', 1, 0, (unsigned char)(hl & 255),
                                 (unsigned char)(hl >> 8)};
        OUT(pre, 10);
        OUT(dict, (size_t)n);
        memset(line, ' ', (size_t)pad);
        line[pad] = '\n';
        OUT(line, (size_t)pad + 1);
    }
    for (size_t i = 0; i < rows; i++) {
        const float *r = matrix + i * DIMS;
        if (lay == W_TEXT || lay == W_TEXT_PLAIN) {
            size_t k = (size_t)snprintf(line, sizeof line, "%s", words[i]);
            for (size_t j = 0; j < DIMS; j++)
                k += (size_t)snprintf(line + k, sizeof line - k, " %.9g", (double)r[j]);
            line[k++] = '\n';
            OUT(line, k);
        } else if (lay == W_BINARY) {
            OUT(words[i], strlen(words[i]));
            OUT(" ", 1);
            OUT(r, DIMS * sizeof(float));
            OUT("\n", 1);
        } else {
            OUT(r, DIMS * sizeof(float));
        }
    }
#undef OUT
    if (gz) {
        assert_int_equal(gzclose(g), Z_OK);
    } else {
        assert_int_equal(fclose(fp), 0);
    }
    if (lay == W_NPY) {
        char vp[4096];
        size_t n = strlen(path);
        snprintf(vp, sizeof vp, "%.*s.vocab", (int)(n - (gz ? 7 : 4)), path);
        FILE *v = fopen(vp, "wb");
        assert_non_null(v);
        for (size_t i = 0; i < rows; i++) fprintf(v, "%s\n", words[i]);
        fclose(v);
    }
}

static vg_vectors *load_threads(const char *path, unsigned threads) {
    vg_load_options opt;
    vg_load_options_init(&opt);
    opt.threads = threads;
    vg_vectors *v = NULL;
    vg_error err;
    vg_error_clear(&err);
    assert_vg_ok(vg_vectors_load(path, &opt, &v, &err), &err);
    return v;
}

/* Every value equals the written float bit for bit, every word is in
 * its row, the zero row is counted. */
static void expect_exact(const vg_vectors *v, size_t rows) {
    assert_int_equal(vg_vectors_rows(v), rows);
    assert_int_equal(vg_vectors_dims(v), DIMS);
    assert_memory_equal(vg_vectors_data(v), matrix, rows * DIMS * sizeof(float));
    for (size_t i = 0; i < rows; i += 997) {
        size_t len;
        assert_string_equal(vg_vectors_word(v, i, &len), words[i]);
        assert_int_equal(vg_vectors_find(v, words[i], len), i);
    }
    assert_int_equal(vg_vectors_get_info(v)->zero_rows, 1);
}

/* vg_filemap: the file's bytes at a 2 MiB boundary, zeros after them for
 * at least the padding asked for, and an empty file maps too. The
 * boundary is what a huge-page mapping of the page cache needs: the
 * kernel maps a 2 MiB folio with one entry only where the address and
 * the file offset agree modulo 2 MiB (from memory: Linux's transhuge
 * documentation). */
static void test_filemap(void **state) {
    (void)state;
    const char *path = temp_path("filemap.bin");
    const size_t sizes[] = {0, 1, 4095, 4096, 5000, 3u << 20};
    for (size_t c = 0; c < sizeof sizes / sizeof sizes[0]; c++) {
        size_t n = sizes[c];
        unsigned char *want = malloc(n ? n : 1);
        assert_non_null(want);
        for (size_t i = 0; i < n; i++) want[i] = (unsigned char)(i * 131u + 7u);
        FILE *fp = fopen(path, "wb");
        assert_non_null(fp);
        assert_int_equal(fwrite(want, 1, n, fp), n);
        fclose(fp);
        int fd = open(path, O_RDONLY);
        assert_true(fd >= 0);
        size_t span = 0;
        unsigned char *m = vg_filemap(fd, n, 100, &span);
        close(fd); /* the mapping outlives the descriptor */
        assert_non_null(m);
        assert_int_equal((uintptr_t)m % VG_FILEMAP_ALIGN, 0);
        assert_true(span >= n + 100);
        assert_int_equal(span % (size_t)sysconf(_SC_PAGESIZE), 0);
        assert_int_equal(n ? memcmp(m, want, n) : 0, 0);
        for (size_t i = n; i < n + 100; i++) assert_int_equal(m[i], 0);
        assert_int_equal(munmap(m, span), 0);
        free(want);
    }
    unlink(path);
    size_t span;
    errno = 0;
    assert_null(vg_filemap(-1, 10, 0, &span)); /* not a file */
    assert_int_not_equal(errno, 0);
}

/* Whether /proc/self/smaps gives the FilePmdMapped figure (Linux 4.8 on,
 * from memory: Documentation/filesystems/proc.rst). */
static int smaps_has_pmd_figure(void) {
    FILE *f = fopen("/proc/self/smaps", "r");
    if (!f) return 0;
    char line[512];
    int found = 0;
    while (!found && fgets(line, sizeof line, f)) found = strncmp(line, "FilePmdMapped:", 14) == 0;
    fclose(f);
    return found;
}

/* vg_filemap_cached_huge: no answer for a file under three 2 MiB blocks
 * or no mapping; for a larger one, where the kernel gives the figure, a
 * yes or a no (which one depends on how the page cache holds the file,
 * so only that it finds its own mapping among the others is checked). */
static void test_filemap_cached_huge(void **state) {
    (void)state;
    assert_int_equal(vg_filemap_cached_huge(NULL, 0), -1);
    const char *path = temp_path("cachedhuge.bin");
    const size_t sizes[] = {5u << 20, 9u << 20};
    const int figure = smaps_has_pmd_figure();
    for (size_t c = 0; c < 2; c++) {
        size_t n = sizes[c];
        unsigned char *buf = malloc(n);
        assert_non_null(buf);
        memset(buf, 'x', n);
        FILE *fp = fopen(path, "wb");
        assert_non_null(fp);
        assert_int_equal(fwrite(buf, 1, n, fp), n);
        fclose(fp);
        free(buf);
        int fd = open(path, O_RDONLY);
        assert_true(fd >= 0);
        size_t span = 0;
        /* Another file mapping first, so the probe must pick its own. */
        size_t span2 = 0;
        void *other = vg_filemap(fd, n, 0, &span2);
        void *m = vg_filemap(fd, n, 0, &span);
        close(fd);
        assert_non_null(other);
        assert_non_null(m);
        int rc = vg_filemap_cached_huge(m, n);
        if (n < 3 * VG_FILEMAP_ALIGN) {
            assert_int_equal(rc, -1);
        } else if (figure) {
            assert_true(rc == 0 || rc == 1);
            /* An address that starts no mapping: no answer. */
            assert_int_equal(vg_filemap_cached_huge((char *)m + 4096, n - 4096), -1);
        }
        munmap(m, span);
        munmap(other, span2);
    }
    unlink(path);
}

/* roundtrip-1: text (with and without header), binary and npy written
 * here, plain and gzip, read back identical, on 1, 2 and 4 threads, text
 * through the mapping and through read(). */
static void test_round_trips(void **state) {
    (void)state;
    static const struct {
        wlayout lay;
        int gz;
        const char *name;
        vg_layout want;
    } cases[] = {
        {W_TEXT, 0, "rt.txt", VG_LAYOUT_TEXT_HEADER},   {W_TEXT_PLAIN, 0, "rt-plain.txt", VG_LAYOUT_TEXT_PLAIN},
        {W_BINARY, 0, "rt.bin", VG_LAYOUT_BINARY},      {W_NPY, 0, "rt.npy", VG_LAYOUT_NPY},
        {W_TEXT, 1, "rt.txt.gz", VG_LAYOUT_TEXT_HEADER}, {W_BINARY, 1, "rt.bin.gz", VG_LAYOUT_BINARY},
        {W_NPY, 1, "rt.npy.gz", VG_LAYOUT_NPY},
    };
    for (size_t c = 0; c < sizeof cases / sizeof cases[0]; c++) {
        char path[4096];
        snprintf(path, sizeof path, "%s", temp_path(cases[c].name));
        write_set(path, cases[c].lay, cases[c].gz, ROWS);
        /* hash-2: the digest of the bytes as read equals OpenSSL's over a
         * plain read of the file, with the hashing thread (forced on for
         * these small files) and without it. */
        char want[65];
        vg_error herr;
        assert_vg_ok(vg_sha256_file(path, want, NULL, &herr), &herr);
        unsigned threads[] = {1, 2, 4};
        /* Text from a file both ways: walking the mapping and read()
         * into buffers (which one the page cache favours is chosen at run
         * time; both must give the same vectors and digest). */
        for (size_t t = 0; t < 6; t++) {
            vg_src_hash_thread_min = t % 3 == 1 ? (size_t)-1 : 1;
            vg_src_text_mode = t < 3 ? VG_SRC_TEXT_MAP : VG_SRC_TEXT_READ;
            vg_vectors *v = load_threads(path, threads[t % 3]);
            vg_src_hash_thread_min = (size_t)16 << 20;
            vg_src_text_mode = VG_SRC_TEXT_AUTO;
            assert_int_equal(vg_vectors_get_info(v)->layout, cases[c].want);
            assert_int_equal(vg_vectors_get_info(v)->gzip, cases[c].gz);
            assert_string_equal(vg_vectors_get_info(v)->sha256, want);
            expect_exact(v, ROWS);
            vg_vectors_free(v);
        }
        unlink(path);
        if (cases[c].lay == W_NPY) {
            char vp[4096];
            snprintf(vp, sizeof vp, "%.*s.vocab", (int)(strlen(path) - (cases[c].gz ? 7 : 4)), path);
            unlink(vp);
        }
    }
}

/* Write the text set with row `bad` (0-based) spoiled by what, and a
 * duplicate of row 0's word at row dup (0: none). */
static void write_text_with(const char *path, size_t bad, const char *what, size_t dup) {
    FILE *fp = fopen(path, "wb");
    assert_non_null(fp);
    fprintf(fp, "%d %d\n", ROWS, DIMS);
    for (size_t i = 0; i < ROWS; i++) {
        fputs(dup && i == dup ? words[0] : words[i], fp);
        for (size_t j = 0; j < DIMS; j++) {
            if (i == bad && j == 7)
                fprintf(fp, " %s", what);
            else
                fprintf(fp, " %.9g", (double)matrix[i * DIMS + j]);
        }
        fputc('\n', fp);
    }
    fclose(fp);
}

/* threads-1: a bad row deep in the file is reported at its line (row + 2:
 * the header is line 1) whatever the threads; with skip_bad_rows the
 * result is the same set on every thread count. Duplicates keep the
 * first row. */
static void test_errors_deep(void **state) {
    (void)state;
    char path[4096];
    snprintf(path, sizeof path, "%s", temp_path("deep.txt"));
    write_text_with(path, 12011, "0.5x", 9000);
    unsigned threads[] = {1, 2, 4};
    vg_vectors *first = NULL;
    for (size_t t = 0; t < 3; t++) {
        vg_load_options opt;
        vg_load_options_init(&opt);
        opt.threads = threads[t];
        vg_vectors *v = (vg_vectors *)1;
        vg_error err;
        assert_int_equal(vg_vectors_load(path, &opt, &v, &err), VG_EVALUE);
        assert_null(v);
        assert_int_equal(err.line, 12011 + 2);
        assert_int_equal(err.column, 9); /* the word, then value 8 */
        opt.skip_bad_rows = 1;
        assert_vg_ok(vg_vectors_load(path, &opt, &v, &err), &err);
        const vg_vectors_info *in = vg_vectors_get_info(v);
        assert_int_equal(in->bad_rows, 1);
        assert_int_equal(in->duplicates, 1);
        assert_int_equal(vg_vectors_rows(v), ROWS - 2);
        /* row 0's word keeps row 0's values */
        assert_memory_equal(vg_vectors_row(v, vg_vectors_find(v, words[0], strlen(words[0]))),
                            matrix, DIMS * sizeof(float));
        /* rows after the dropped ones moved down intact */
        size_t r = vg_vectors_find(v, words[ROWS - 1], strlen(words[ROWS - 1]));
        assert_int_equal(r, ROWS - 3);
        assert_memory_equal(vg_vectors_row(v, r), matrix + (size_t)(ROWS - 1) * DIMS,
                            DIMS * sizeof(float));
        if (!first) {
            first = v;
        } else {
            assert_memory_equal(vg_vectors_data(v), vg_vectors_data(first),
                                vg_vectors_rows(v) * DIMS * sizeof(float));
            assert_memory_equal(vg_vectors_norms(v), vg_vectors_norms(first),
                                vg_vectors_rows(v) * sizeof(float));
            vg_vectors_free(v);
        }
    }
    vg_vectors_free(first);
    unlink(path);
}

/* filter-2: keep_words keeps the rows asked for, in file order, on any
 * number of threads; max_words stops after N rows. */
static void test_filter_and_max(void **state) {
    (void)state;
    char path[4096];
    snprintf(path, sizeof path, "%s", temp_path("filter.txt"));
    write_set(path, W_TEXT, 0, ROWS);
    const char *keep[] = {words[13999], words[3], words[12345], "absent"};
    for (unsigned t = 1; t <= 4; t *= 2) {
        vg_load_options opt;
        vg_load_options_init(&opt);
        opt.threads = t;
        opt.keep_words = keep;
        opt.n_keep_words = 4;
        vg_vectors *v = NULL;
        vg_error err;
        assert_vg_ok(vg_vectors_load(path, &opt, &v, &err), &err);
        assert_int_equal(vg_vectors_rows(v), 3);
        assert_int_equal(vg_vectors_get_info(v)->rows_read, ROWS);
        assert_int_equal(vg_vectors_find(v, words[3], strlen(words[3])), 0);
        assert_memory_equal(vg_vectors_row(v, 2), matrix + (size_t)13999 * DIMS, DIMS * sizeof(float));
        vg_vectors_free(v);
        vg_load_options_init(&opt);
        opt.threads = t;
        opt.max_words = 9000;
        vg_src_hash_thread_min = 1;
        assert_vg_ok(vg_vectors_load(path, &opt, &v, &err), &err);
        vg_src_hash_thread_min = (size_t)16 << 20;
        expect_exact(v, 9000);
        char want[65];
        assert_vg_ok(vg_sha256_file(path, want, NULL, &err), &err);
        assert_string_equal(vg_vectors_get_info(v)->sha256, want);
        vg_vectors_free(v);
    }
    unlink(path);
}

/* hash-3: the binary and npy readers under max_words (rows read by
 * pread, the rest of the file hashed after): still the file's digest. */
static void test_partial_hash(void **state) {
    (void)state;
    const wlayout lays[] = {W_BINARY, W_NPY};
    const char *names[] = {"part.bin", "part.npy"};
    for (size_t c = 0; c < 2; c++) {
        char path[4096];
        snprintf(path, sizeof path, "%s", temp_path(names[c]));
        write_set(path, lays[c], 0, ROWS);
        char want[65];
        vg_error err;
        assert_vg_ok(vg_sha256_file(path, want, NULL, &err), &err);
        vg_load_options opt;
        vg_load_options_init(&opt);
        opt.max_words = 5000;
        opt.threads = 2;
        vg_src_hash_thread_min = 1;
        vg_vectors *v = NULL;
        assert_vg_ok(vg_vectors_load(path, &opt, &v, &err), &err);
        vg_src_hash_thread_min = (size_t)16 << 20;
        expect_exact(v, 5000);
        assert_string_equal(vg_vectors_get_info(v)->sha256, want);
        vg_vectors_free(v);
        unlink(path);
        if (lays[c] == W_NPY) {
            char vp[4096];
            snprintf(vp, sizeof vp, "%.*s.vocab", (int)(strlen(path) - 4), path);
            unlink(vp);
        }
    }
}

/* norms-1: norms equal sqrt of the sum of squares in double (the
 * definition), and are the same in every layout. */
static void test_norms(void **state) {
    (void)state;
    char path[4096];
    snprintf(path, sizeof path, "%s", temp_path("norms.bin"));
    write_set(path, W_BINARY, 0, 1000);
    vg_vectors *v = load_threads(path, 2);
    for (size_t i = 0; i < 1000; i++) {
        double s = 0;
        for (size_t j = 0; j < DIMS; j++) s += (double)matrix[i * DIMS + j] * matrix[i * DIMS + j];
        assert_close(vg_vectors_norms(v)[i], sqrt(s), 0, 1e-7);
    }
    double mn, md, mx;
    vg_error err;
    assert_vg_ok(vg_vectors_norm_summary(v, &mn, &md, &mx, &err), &err);
    assert_true(mn == 0);
    assert_true(md > mn && mx > md);
    vg_vectors_free(v);
    unlink(path);
}

/* norm-3: rows as a binary file stores them, at any byte alignment:
 * vg_row_norm_finite gives the aligned copy's vg_row_norm bit for bit,
 * and vg_row_copy_stream (streaming stores after a plain head up to a
 * 16-byte boundary) writes exactly memcpy's bytes and nothing around
 * them, for every source offset 0-15, target offset 0-3 floats and
 * length 0-40 and 300. */
static void test_stored_rows(void **state) {
    (void)state;
    static float want[300];
    static _Alignas(64) unsigned char stored[300 * 4 + 16];
    static _Alignas(64) float out[300 + 8];
    for (size_t j = 0; j < 300; j++) want[j] = (float)(((double)(rng() >> 11) * 0x1p-53 - 0.5) * 8);
    for (size_t n = 0; n <= 300; n = n < 40 ? n + 1 : 300) {
        float ref = vg_row_norm(want, n);
        for (size_t so = 0; so < 16; so++) {
            memcpy(stored + so, want, n * sizeof(float));
            float norm = -1;
            assert_int_equal(vg_row_norm_finite(stored + so, n, &norm), 1);
            assert_memory_equal(&norm, &ref, sizeof norm);
            for (size_t d0 = 0; d0 < 4; d0++) {
                memset(out, 0xa5, sizeof out);
                vg_row_copy_stream(out + d0, stored + so, n);
                vg_row_copy_fence();
                assert_memory_equal(out + d0, want, n * sizeof(float));
                const unsigned char *o = (const unsigned char *)out;
                for (size_t k = 0; k < d0 * sizeof(float); k++) assert_int_equal(o[k], 0xa5);
                for (size_t k = (d0 + n) * sizeof(float); k < sizeof out; k++)
                    assert_int_equal(o[k], 0xa5);
            }
        }
        if (n == 300) break;
    }
}

/* finite-1: the one-pass check and norm. The reference for "finite" is
 * C's isfinite (an IEEE 754 float is NaN or infinite exactly when its
 * exponent bits are all ones); the norm must have vg_row_norm's bits.
 * Every length 0..40 and 300 (the SIMD loop and its tail), extremes
 * (+-FLT_MAX, the smallest subnormal, -0) among the values, and a NaN
 * (quiet, signalling, negative, with a payload) or an infinity of either
 * sign at every position. */
static void test_norm_finite(void **state) {
    (void)state;
    static const uint32_t bad_bits[] = {0x7fc00000u, 0x7f800001u, 0xffc00001u,
                                        0xffffffffu, 0x7f800000u, 0xff800000u};
    float x[300];
    size_t lens[42];
    for (size_t i = 0; i <= 40; i++) lens[i] = i;
    lens[41] = 300;
    for (size_t li = 0; li < 42; li++) {
        size_t n = lens[li];
        for (size_t j = 0; j < n; j++) {
            uint64_t r = rng();
            if (r % 7 == 0) {
                x[j] = r & 8 ? FLT_MAX : -FLT_MAX;
            } else if (r % 7 == 1) {
                x[j] = 0x1p-149f;
            } else if (r % 7 == 2) {
                x[j] = -0.0f;
            } else {
                x[j] = (float)(((double)(r >> 11) * 0x1p-53 - 0.5) * 4.0);
            }
        }
        float norm = -1;
        assert_int_equal(vg_row_norm_finite(x, n, &norm), 1);
        float ref = vg_row_norm(x, n);
        assert_memory_equal(&norm, &ref, sizeof norm);
        assert_int_equal(vg_all_finite(x, n), 1);
        for (size_t pos = 0; pos < n; pos++) {
            for (size_t b = 0; b < sizeof bad_bits / sizeof bad_bits[0]; b++) {
                float keep = x[pos];
                memcpy(&x[pos], &bad_bits[b], sizeof x[pos]);
                assert_false(isfinite(x[pos]));
                norm = -1;
                assert_int_equal(vg_row_norm_finite(x, n, &norm), 0);
                assert_true(norm == -1); /* untouched */
                assert_int_equal(vg_all_finite(x, n), 0);
                x[pos] = keep;
            }
        }
    }
}

/* finite-2: a NaN or an infinity in a binary or npy row, plain (rows
 * checked in place on all threads, in one batch and in batches of 7
 * rows) or gzip (row by row), at the first, a middle and the last value:
 * an error naming the row, its word and the value; skip_bad_rows drops
 * exactly that row and the next moves down intact. */
static void test_nonfinite_files(void **state) {
    (void)state;
    static const char *names[2][2] = {{"nf.bin", "nf.bin.gz"}, {"nf.npy", "nf.npy.gz"}};
    static const size_t cols[] = {0, 37, DIMS - 1};
    const size_t row = 1234, rows = 3000;
    for (size_t l = 0; l < 2; l++) {
        for (int gz = 0; gz < 2; gz++) {
            for (size_t c = 0; c < 3; c++) {
                char path[4096];
                snprintf(path, sizeof path, "%s", temp_path(names[l][gz]));
                float keep = matrix[row * DIMS + cols[c]];
                matrix[row * DIMS + cols[c]] = c == 1 ? -INFINITY : NAN;
                write_set(path, l ? W_NPY : W_BINARY, gz, rows);
                matrix[row * DIMS + cols[c]] = keep;
                vg_load_options opt;
                vg_load_options_init(&opt);
                opt.threads = 2;
                vg_vectors *v = (vg_vectors *)1;
                vg_error err;
                vg_batch_test_cap = c == 2 ? 7 : 0;
                assert_int_equal(vg_vectors_load(path, &opt, &v, &err), VG_EVALUE);
                assert_null(v);
                char want[64];
                snprintf(want, sizeof want, "row %zu ", row + 1);
                assert_non_null(strstr(err.message, want));
                snprintf(want, sizeof want, "value %zu is not finite", cols[c] + 1);
                assert_non_null(strstr(err.message, want));
                snprintf(want, sizeof want, "word '%s'", words[row]);
                assert_non_null(strstr(err.message, want));
                opt.skip_bad_rows = 1;
                assert_vg_ok(vg_vectors_load(path, &opt, &v, &err), &err);
                assert_int_equal(vg_vectors_get_info(v)->bad_rows, 1);
                assert_int_equal(vg_vectors_rows(v), rows - 1);
                assert_int_equal(vg_vectors_find(v, words[row], strlen(words[row])),
                                 VG_NOT_FOUND);
                size_t r = vg_vectors_find(v, words[row + 1], strlen(words[row + 1]));
                assert_int_equal(r, row);
                assert_memory_equal(vg_vectors_row(v, r), matrix + (row + 1) * DIMS,
                                    DIMS * sizeof(float));
                vg_batch_test_cap = 0;
                vg_vectors_free(v);
                unlink(path);
                if (l == 1) {
                    char vp[4200];
                    snprintf(vp, sizeof vp, "%.*s.vocab", (int)(strlen(path) - (gz ? 7 : 4)),
                             path);
                    unlink(vp);
                }
            }
        }
    }
}

/* vocab-1: a vocabulary long enough to grow its word lists many times
 * (a gzip vocabulary has no size to reserve from), and the same plain
 * (reserved once from the file's size), give the same set, every word on
 * its row; max_words stops both at the same row. */
static void test_vocab_lists(void **state) {
    (void)state;
    char path[4096], vp[4200], gzp[4300];
    snprintf(path, sizeof path, "%s", temp_path("vl.npy"));
    write_set(path, W_NPY, 0, ROWS);
    snprintf(vp, sizeof vp, "%.*s.vocab", (int)(strlen(path) - 4), path);
    vg_vectors *plain = load_threads(path, 2);
    expect_exact(plain, ROWS);
    snprintf(gzp, sizeof gzp, "%s.gz", vp);
    FILE *in = fopen(vp, "rb");
    gzFile g = gzopen(gzp, "wb1");
    assert_non_null(in);
    assert_non_null(g);
    char buf[65536];
    size_t n;
    while ((n = fread(buf, 1, sizeof buf, in)) > 0)
        assert_int_equal(gzwrite(g, buf, (unsigned)n), n);
    fclose(in);
    assert_int_equal(gzclose(g), Z_OK);
    unlink(vp);
    vg_vectors *zipped = load_threads(path, 2);
    expect_exact(zipped, ROWS);
    for (size_t i = 0; i < ROWS; i++) {
        size_t la, lb;
        assert_string_equal(vg_vectors_word(zipped, i, &la), vg_vectors_word(plain, i, &lb));
    }
    vg_vectors_free(zipped);
    vg_vectors_free(plain);
    vg_load_options opt;
    vg_load_options_init(&opt);
    opt.max_words = 9001;
    vg_vectors *v = NULL;
    vg_error err;
    assert_vg_ok(vg_vectors_load(path, &opt, &v, &err), &err);
    assert_int_equal(vg_vectors_rows(v), 9001);
    size_t len;
    assert_string_equal(vg_vectors_word(v, 9000, &len), words[9000]);
    vg_vectors_free(v);
    unlink(gzp);
    unlink(path);
}

/* batch-1: rows of binary and npy files are converted a batch ahead of
 * being added (binary's next window read meanwhile). With batches of 1,
 * 7 and 100 rows (many batches, so binary's three windows turn many
 * times) and the default, on 1, 2 and 4 threads, plain and hashed: a NaN
 * row and a duplicate word in different batches are dropped (the
 * duplicate after the borrowed npy matrix had to be copied mid-file),
 * every later row moves down intact with its own norm, and every run
 * gives the same matrix, norms, counts and hash, the file's digest. The
 * expected rows are the written ones with the two dropped (the rule:
 * first occurrence wins, bad rows are skipped; common practice). */
static void test_batch_pipeline(void **state) {
    (void)state;
    const size_t rows = 3000, bad = 1234, dup = 2000, dup_of = 10;
    char keepw[24];
    memcpy(keepw, words[dup], sizeof keepw);
    memcpy(words[dup], words[dup_of], sizeof keepw);
    float keepv = matrix[bad * DIMS + 5];
    matrix[bad * DIMS + 5] = NAN;
    char paths[2][4096];
    snprintf(paths[0], sizeof paths[0], "%s", temp_path("bp.bin"));
    snprintf(paths[1], sizeof paths[1], "%s", temp_path("bp.npy"));
    write_set(paths[0], W_BINARY, 0, rows);
    write_set(paths[1], W_NPY, 0, rows);
    matrix[bad * DIMS + 5] = keepv;
    static const size_t caps[] = {0, 1, 7, 100};
    static const unsigned threads[] = {1, 2, 4};
    for (size_t l = 0; l < 2; l++) {
        for (int hash = 0; hash < 2; hash++) {
            vg_vectors *first = NULL;
            for (size_t c = 0; c < 4; c++) {
                for (size_t t = 0; t < 3; t++) {
                    vg_batch_test_cap = caps[c];
                    vg_load_options opt;
                    vg_load_options_init(&opt);
                    opt.threads = threads[t];
                    opt.skip_bad_rows = 1;
                    opt.compute_hash = hash;
                    vg_vectors *v = NULL;
                    vg_error err;
                    /* On 2 threads the hashing thread is forced on: it
                     * reads each window while the next ones are read
                     * into the others in turn. */
                    if (t == 1) vg_src_hash_thread_min = 1;
                    /* An unhashed npy's borrowed rows are checked
                     * through the mapping and from copies in turn. */
                    vg_borrow_check_mode =
                        (c + t) % 2 ? VG_BORROW_CHECK_COPIED : VG_BORROW_CHECK_MAPPED;
                    assert_vg_ok(vg_vectors_load(paths[l], &opt, &v, &err), &err);
                    vg_borrow_check_mode = VG_BORROW_CHECK_AUTO;
                    vg_src_hash_thread_min = (size_t)16 << 20;
                    vg_batch_test_cap = 0;
                    const vg_vectors_info *in = vg_vectors_get_info(v);
                    assert_int_equal(vg_vectors_rows(v), rows - 2);
                    assert_int_equal(in->bad_rows, 1);
                    assert_int_equal(in->duplicates, 1);
                    for (size_t i = 0, r = 0; i < rows; i++) {
                        if (i == bad || i == dup) continue;
                        size_t len;
                        assert_string_equal(vg_vectors_word(v, r, &len), words[i]);
                        assert_memory_equal(vg_vectors_row(v, r), matrix + i * DIMS,
                                            DIMS * sizeof(float));
                        float want = vg_row_norm(matrix + i * DIMS, DIMS);
                        assert_memory_equal(&vg_vectors_norms(v)[r], &want, sizeof want);
                        r++;
                    }
                    assert_int_equal(vg_vectors_find(v, words[dup_of], strlen(words[dup_of])),
                                     dup_of);
                    if (!first) {
                        first = v;
                        continue;
                    }
                    assert_string_equal(in->sha256, vg_vectors_get_info(first)->sha256);
                    vg_vectors_free(v);
                }
            }
            if (hash) {
                /* The digest of the bytes as read is OpenSSL's over a
                 * plain read of the file (vg_sha256_file). */
                char want[65];
                vg_error herr;
                assert_vg_ok(vg_sha256_file(paths[l], want, NULL, &herr), &herr);
                assert_string_equal(vg_vectors_get_info(first)->sha256, want);
            }
            vg_vectors_free(first);
        }
    }
    memcpy(words[dup], keepw, sizeof keepw);
    unlink(paths[0]);
    unlink(paths[1]);
    char vp[4200];
    snprintf(vp, sizeof vp, "%.*s.vocab", (int)(strlen(paths[1]) - 4), paths[1]);
    unlink(vp);
}

/* read-err-1: a disk error part way through a binary or npy file (every
 * read from the byte of row 1500 fails with EIO): the load fails with
 * VG_EIO, naming the file and a byte before the failing one, whichever
 * way the rows are read (batches of 7 rows or the default, 1 and 2
 * threads, hashed or not, a borrowed npy's rows checked through the
 * mapping or from copies), and frees all it made (the sanitizer builds
 * find leaks). */
static void test_read_errors(void **state) {
    (void)state;
    const size_t rows = 3000, at = 1500;
    char paths[2][4096];
    snprintf(paths[0], sizeof paths[0], "%s", temp_path("re.bin"));
    snprintf(paths[1], sizeof paths[1], "%s", temp_path("re.npy"));
    write_set(paths[0], W_BINARY, 0, rows);
    write_set(paths[1], W_NPY, 0, rows);
    for (size_t l = 0; l < 2; l++) {
        /* The byte of row `at`: binary rows are "word " and the values,
         * then '\n'; npy rows follow its header. */
        vg_vectors *ok = load_threads(paths[l], 1);
        uint64_t fail_from = 0;
        if (l == 0) {
            FILE *fp = fopen(paths[0], "rb");
            assert_non_null(fp);
            char line[64];
            assert_non_null(fgets(line, sizeof line, fp));
            fail_from = (uint64_t)strlen(line);
            fclose(fp);
            for (size_t i = 0; i < at; i++) fail_from += strlen(words[i]) + 1 + DIMS * 4 + 1;
        } else {
            fail_from = vg_vectors_get_info(ok)->bytes - (uint64_t)(rows - at) * DIMS * 4;
        }
        vg_vectors_free(ok);
        for (int mode = 0; mode < 4; mode++) {
            for (size_t t = 1; t <= 2; t++) {
                vg_load_options opt;
                vg_load_options_init(&opt);
                opt.threads = (unsigned)t;
                opt.compute_hash = mode == 3;
                vg_batch_test_cap = mode == 0 ? 7 : 0;
                vg_borrow_check_mode = mode == 1 ? VG_BORROW_CHECK_MAPPED : VG_BORROW_CHECK_COPIED;
                vg_src_test_pread_fail_from = fail_from;
                vg_vectors *v = NULL;
                vg_error err;
                vg_status st = vg_vectors_load(paths[l], &opt, &v, &err);
                vg_src_test_pread_fail_from = UINT64_MAX;
                vg_borrow_check_mode = VG_BORROW_CHECK_AUTO;
                vg_batch_test_cap = 0;
                if (l == 1 && mode == 1) {
                    /* Borrowed and read through the mapping: no read. */
                    assert_vg_ok(st, &err);
                    assert_int_equal(vg_vectors_rows(v), rows);
                    vg_vectors_free(v);
                    continue;
                }
                assert_int_equal(st, VG_EIO);
                assert_null(v);
                assert_non_null(strstr(err.path, l ? "re.npy" : "re.bin"));
                unsigned long long byte = 0;
                const char *m = strstr(err.message, "read failed at byte ");
                assert_non_null(m);
                assert_int_equal(sscanf(m, "read failed at byte %llu", &byte), 1);
                assert_true(byte <= fail_from);
            }
        }
    }
    unlink(paths[0]);
    unlink(paths[1]);
    char vp[4200];
    snprintf(vp, sizeof vp, "%.*s.vocab", (int)(strlen(paths[1]) - 4), paths[1]);
    unlink(vp);
}

/* pipe-1: a FIFO (size unknown: the matrix grows as rows arrive, while
 * the threads parse in place), plain text and gzip binary, equal to the
 * written matrix; the reservation is made tiny to force many growths. */
static void test_pipes(void **state) {
    (void)state;
    struct {
        wlayout lay;
        int gz;
        const char *name;
    } cases[] = {{W_TEXT_PLAIN, 0, "pipe.txt"}, {W_BINARY, 1, "pipe.bin.gz"}, {W_TEXT, 1, "pipe.txt.gz"}};
    signal(SIGPIPE, SIG_IGN);
    vg_vecbuild_test_reserve = 100;
    for (size_t c = 0; c < 3; c++) {
        char file[4096], fifo[4200];
        snprintf(file, sizeof file, "%s", temp_path(cases[c].name));
        write_set(file, cases[c].lay, cases[c].gz, ROWS);
        snprintf(fifo, sizeof fifo, "%s.fifo", file);
        unlink(fifo);
        assert_int_equal(mkfifo(fifo, 0600), 0);
        pid_t pid = fork();
        assert_true(pid >= 0);
        if (pid == 0) {
            FILE *in = fopen(file, "rb"), *out = fopen(fifo, "wb");
            char buf[65536];
            size_t n;
            while (in && out && (n = fread(buf, 1, sizeof buf, in)) > 0) fwrite(buf, 1, n, out);
            if (out) fclose(out);
            _exit(0);
        }
        vg_vectors *v = load_threads(fifo, 2);
        int status;
        waitpid(pid, &status, 0);
        expect_exact(v, ROWS);
        vg_vectors *f = load_threads(file, 2);
        assert_string_equal(vg_vectors_get_info(v)->sha256, vg_vectors_get_info(f)->sha256);
        assert_int_equal(vg_vectors_get_info(v)->bytes, vg_vectors_get_info(f)->bytes);
        vg_vectors_free(f);
        vg_vectors_free(v);
        unlink(fifo);
        unlink(file);
    }
    vg_vecbuild_test_reserve = 0;
}

int main(void) {
    const struct CMUnitTest tests[] = {
        cmocka_unit_test(test_filemap),
        cmocka_unit_test(test_filemap_cached_huge),
        cmocka_unit_test(test_round_trips),
        cmocka_unit_test(test_errors_deep),
        cmocka_unit_test(test_filter_and_max),
        cmocka_unit_test(test_norms),
        cmocka_unit_test(test_norm_finite),
        cmocka_unit_test(test_stored_rows),
        cmocka_unit_test(test_nonfinite_files),
        cmocka_unit_test(test_vocab_lists),
        cmocka_unit_test(test_batch_pipeline),
        cmocka_unit_test(test_read_errors),
        cmocka_unit_test(test_pipes),
        cmocka_unit_test(test_partial_hash),
    };
    return cmocka_run_group_tests_name("vectors_big", tests, setup, teardown);
}
