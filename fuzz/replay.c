/* replay.c - run saved fuzz inputs through a target without libFuzzer,
 * so that ordinary test builds (plain and ASan+UBSan) replay the corpora
 * and every regression input on each `make check`.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Usage: fuzz_replay_TARGET FILE_OR_DIR...  (prints TAP, one line per file)
 */
#include <dirent.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include "fuzz_input.h"

static int n_run;

static int run_file(const char *path) {
    FILE *fp = fopen(path, "rb");
    if (!fp) {
        printf("not ok %d - cannot open %s\n", ++n_run, path);
        return 1;
    }
    size_t cap = 1 << 16, n = 0;
    unsigned char *buf = malloc(cap);
    size_t r;
    while (buf && (r = fread(buf + n, 1, cap - n, fp)) > 0) {
        n += r;
        if (n == cap) {
            cap *= 2;
            unsigned char *nb = realloc(buf, cap);
            if (!nb) {
                free(buf);
                buf = NULL;
            }
            buf = nb;
        }
    }
    fclose(fp);
    if (!buf) {
        printf("not ok %d - out of memory reading %s\n", ++n_run, path);
        return 1;
    }
    LLVMFuzzerTestOneInput(buf, n);
    free(buf);
    /* Reaching here means no crash and no sanitizer report (those abort). */
    printf("ok %d - %s\n", ++n_run, path);
    return 0;
}

static int cmp_str(const void *a, const void *b) {
    return strcmp(*(char *const *)a, *(char *const *)b);
}

static int run_path(const char *path) {
    struct stat sb;
    if (stat(path, &sb) != 0) return 0; /* an absent corpus is no failure */
    if (!S_ISDIR(sb.st_mode)) return run_file(path);
    DIR *d = opendir(path);
    if (!d) return 1;
    char **names = NULL;
    size_t n = 0;
    struct dirent *e;
    while ((e = readdir(d)) != NULL) {
        if (e->d_name[0] == '.') continue;
        char **nn = realloc(names, (n + 1) * sizeof *names);
        if (!nn) break;
        names = nn;
        size_t len = strlen(path) + strlen(e->d_name) + 2;
        names[n] = malloc(len);
        if (!names[n]) break;
        snprintf(names[n], len, "%s/%s", path, e->d_name);
        n++;
    }
    closedir(d);
    qsort(names, n, sizeof *names, cmp_str);
    int bad = 0;
    for (size_t i = 0; i < n; i++) {
        bad |= run_path(names[i]);
        free(names[i]);
    }
    free(names);
    return bad;
}

int main(int argc, char **argv) {
    int bad = 0;
    for (int i = 1; i < argc; i++) bad |= run_path(argv[i]);
    printf("1..%d\n", n_run);
    return bad;
}
