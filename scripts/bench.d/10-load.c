/* 10-load.c - the loading benchmark's helper: generate synthetic vector
 * files with a fixed seed, and time one load in a fresh process.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 *   10-load gen text|binary|npy ROWS DIMS SEED OUT   (npy also writes OUT's .vocab)
 *   10-load load FILE [--no-hash] [--threads N]
 *   10-load touch BYTES      (time a first write of BYTES of fresh memory)
 *
 * "load" prints one line of key=value pairs: seconds (wall clock of
 * vg_vectors_load alone), stored bytes, rows, dims, the peak resident set
 * of the process (getrusage) and the matrix size, so that the shell part
 * can compute GB/s, rows/s and the ratio of peak memory to the matrix.
 */
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <pthread.h>
#include <sys/mman.h>
#include <sys/resource.h>
#include <time.h>

#include "vecgauge/vecgauge.h"

/* splitmix64 (Steele, Lea and Flood 2014): a fixed, portable stream. */
static uint64_t rng_state;
static uint64_t rng(void) {
    uint64_t z = (rng_state += 0x9e3779b97f4a7c15ULL);
    z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9ULL;
    z = (z ^ (z >> 27)) * 0x94d049bb133111ebULL;
    return z ^ (z >> 31);
}

/* A value in micro-units, roughly normal with sd 0.2 (sum of four
 * uniforms): what trainers print with six decimals. */
static long value_micro(void) {
    double s = 0;
    for (int i = 0; i < 4; i++) s += (double)(rng() >> 11) * 0x1p-53;
    return (long)((s - 2.0) * 0.35 * 1e6);
}

/* A distinct word: 3 to 8 random letters, '_', the row number in base
 * 26 (the '_' keeps two rows from ever spelling the same word). */
static size_t make_word(char *w, uint64_t row) {
    size_t n = 3 + rng() % 6, k = 0;
    for (size_t i = 0; i < n; i++) w[k++] = (char)('a' + rng() % 26);
    w[k++] = '_';
    do {
        w[k++] = (char)('a' + row % 26);
        row /= 26;
    } while (row);
    w[k] = '\0';
    return k;
}

static char *put_micro(char *p, long m) {
    if (m < 0) {
        *p++ = '-';
        m = -m;
    }
    long ip = m / 1000000, fp = m % 1000000;
    char tmp[24];
    int n = 0;
    do {
        tmp[n++] = (char)('0' + ip % 10);
        ip /= 10;
    } while (ip);
    while (n) *p++ = tmp[--n];
    *p++ = '.';
    for (long d = 100000; d; d /= 10) *p++ = (char)('0' + (fp / d) % 10);
    return p;
}

static int gen(const char *layout, uint64_t rows, unsigned dims, uint64_t seed, const char *out) {
    rng_state = seed;
    FILE *fp = fopen(out, "wb");
    if (!fp) return perror(out), 1;
    static char buf[1 << 20];
    setvbuf(fp, NULL, _IOFBF, 1 << 22);
    char word[64];
    FILE *vocab = NULL;
    if (strcmp(layout, "npy") == 0) {
        char vp[4096];
        snprintf(vp, sizeof vp, "%.*s.vocab", (int)(strlen(out) - 4), out);
        vocab = fopen(vp, "wb");
        if (!vocab) return perror(vp), 1;
        char dict[128];
        int n = snprintf(dict, sizeof dict, "{'descr': '<f4', 'fortran_order': False, 'shape': (%llu, %u), }",
                         (unsigned long long)rows, dims);
        int total = 10 + n + 1;
        int pad = (64 - total % 64) % 64;
        fwrite("\x93NUMPY\x01\x00", 1, 8, fp);
        unsigned hl = (unsigned)(n + pad + 1);
        fputc((int)(hl & 255), fp);
        fputc((int)(hl >> 8), fp);
        fwrite(dict, 1, (size_t)n, fp);
        for (int i = 0; i < pad; i++) fputc(' ', fp);
        fputc('\n', fp);
    } else {
        fprintf(fp, "%llu %u\n", (unsigned long long)rows, dims);
    }
    float *vals = malloc(dims * sizeof(float));
    for (uint64_t r = 0; r < rows; r++) {
        size_t wl = make_word(word, r);
        char *p = buf;
        if (strcmp(layout, "text") == 0) {
            memcpy(p, word, wl);
            p += wl;
            for (unsigned j = 0; j < dims; j++) {
                *p++ = ' ';
                p = put_micro(p, value_micro());
            }
            *p++ = '\n';
            fwrite(buf, 1, (size_t)(p - buf), fp);
        } else {
            for (unsigned j = 0; j < dims; j++) vals[j] = (float)(value_micro() / 1e6);
            if (vocab) {
                fwrite(word, 1, wl, vocab);
                fputc('\n', vocab);
            } else {
                fwrite(word, 1, wl, fp);
                fputc(' ', fp);
            }
            fwrite(vals, sizeof(float), dims, fp);
            if (!vocab) fputc('\n', fp);
        }
    }
    free(vals);
    if (vocab && fclose(vocab) != 0) return perror("vocab"), 1;
    if (fclose(fp) != 0) return perror(out), 1;
    return 0;
}

static double now(void) {
    struct timespec t;
    clock_gettime(CLOCK_MONOTONIC, &t);
    return (double)t.tv_sec + (double)t.tv_nsec * 1e-9;
}

static int load(int argc, char **argv) {
    vg_init();
    vg_blas_park_workers(); /* as the vecgauge command does first */
    vg_load_options opt;
    vg_load_options_init(&opt);
    const char *path = NULL;
    for (int i = 0; i < argc; i++) {
        if (strcmp(argv[i], "--no-hash") == 0) {
            opt.compute_hash = 0;
        } else if (strcmp(argv[i], "--threads") == 0 && i + 1 < argc) {
            opt.threads = (unsigned)atoi(argv[++i]);
        } else {
            path = argv[i];
        }
    }
    if (!path) return fprintf(stderr, "load: no file\n"), 2;
    vg_vectors *v = NULL;
    vg_error err;
    vg_error_clear(&err);
    double t0 = now();
    vg_status st = vg_vectors_load(path, &opt, &v, &err);
    double t1 = now();
    if (st != VG_OK) {
        char b[1200];
        fprintf(stderr, "load: %s\n", vg_error_format(&err, b, sizeof b));
        return 1;
    }
    struct rusage ru;
    getrusage(RUSAGE_SELF, &ru);
    const vg_vectors_info *in = vg_vectors_get_info(v);
    double cpu = (double)ru.ru_utime.tv_sec + (double)ru.ru_utime.tv_usec * 1e-6 +
                 (double)ru.ru_stime.tv_sec + (double)ru.ru_stime.tv_usec * 1e-6;
    printf("seconds=%.6f cpu=%.3f bytes=%llu rows=%zu dims=%zu peak_kb=%ld matrix_bytes=%zu sha256=%s\n",
           t1 - t0, cpu, (unsigned long long)in->bytes, vg_vectors_rows(v), vg_vectors_dims(v),
           ru.ru_maxrss, vg_vectors_rows(v) * vg_vectors_dims(v) * sizeof(float),
           in->hashed ? in->sha256 : "-");
    vg_vectors_free(v);
    return 0;
}

/* The machine's floor for a copy into a new matrix: write BYTES of
 * freshly mapped memory (advised huge pages, as the library's matrix) on
 * two threads, in a fresh process. In a VM that has handed freed memory
 * back to its host this is far below memory speed. */
typedef struct touch_share {
    char *p;
    size_t n;
} touch_share;

static void *touch_run(void *arg) {
    touch_share *t = arg;
    memset(t->p, 1, t->n);
    return NULL;
}

static int touch(size_t bytes) {
    char *p = mmap(NULL, bytes, PROT_READ | PROT_WRITE, MAP_PRIVATE | MAP_ANONYMOUS, -1, 0);
    if (p == MAP_FAILED) return perror("mmap"), 1;
#ifdef MADV_HUGEPAGE
    madvise(p, bytes, MADV_HUGEPAGE);
#endif
    touch_share sh[2] = {{p, bytes / 2}, {p + bytes / 2, bytes - bytes / 2}};
    pthread_t th;
    double t0 = now();
    if (pthread_create(&th, NULL, touch_run, &sh[1]) != 0) return perror("pthread_create"), 1;
    touch_run(&sh[0]);
    pthread_join(th, NULL);
    double t1 = now();
    printf("seconds=%.6f bytes=%zu\n", t1 - t0, bytes);
    munmap(p, bytes);
    return 0;
}

int main(int argc, char **argv) {
    if (argc >= 7 && strcmp(argv[1], "gen") == 0)
        return gen(argv[2], strtoull(argv[3], NULL, 10), (unsigned)atoi(argv[4]),
                   strtoull(argv[5], NULL, 10), argv[6]);
    if (argc >= 3 && strcmp(argv[1], "load") == 0) return load(argc - 2, argv + 2);
    if (argc == 3 && strcmp(argv[1], "touch") == 0) return touch((size_t)strtoull(argv[2], NULL, 10));
    fprintf(stderr, "usage: 10-load gen LAYOUT ROWS DIMS SEED OUT | load FILE [--no-hash] [--threads N]"
                    " | touch BYTES\n");
    return 2;
}
