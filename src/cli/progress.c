/* progress.c - the load progress line on standard error (terminals only).
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <stdio.h>
#include <time.h>
#include <unistd.h>

#include "cli.h"

static double now(void) {
    struct timespec t;
    clock_gettime(CLOCK_MONOTONIC, &t);
    return (double)t.tv_sec + (double)t.tv_nsec * 1e-9;
}

static void human_bytes(double b, char *out, size_t n) {
    if (b >= 1e9) {
        snprintf(out, n, "%.2f GB", b / 1e9);
    } else if (b >= 1e6) {
        snprintf(out, n, "%.1f MB", b / 1e6);
    } else {
        snprintf(out, n, "%.0f kB", b / 1e3);
    }
}

void vg_cli_progress_begin(vg_cli_progress *p, const char *label, int enabled) {
    vg_escape_text(label, p->label, sizeof p->label);
    p->enabled = enabled && isatty(STDERR_FILENO);
    p->t0 = now();
    p->last = 0;
    p->drawn = 0;
}

int vg_cli_progress_fn(void *ctx, uint64_t done, uint64_t total) {
    vg_cli_progress *p = ctx;
    if (!p->enabled) return 0;
    double t = now();
    /* A tenth of a second between redraws: smooth enough, and cheap. */
    if (p->drawn && t - p->last < 0.1 && (total == 0 || done < total)) return 0;
    p->last = t;
    double el = t - p->t0;
    double rate = el > 0 ? (double)done / el : 0;
    char d[32], tot[32], r[32];
    human_bytes((double)done, d, sizeof d);
    human_bytes(rate, r, sizeof r);
    if (total > 0) {
        human_bytes((double)total, tot, sizeof tot);
        double left = rate > 0 ? (double)(total - (done < total ? done : total)) / rate : 0;
        fprintf(stderr, "\r%s: %s of %s, %s/s, %.0f s left\033[K", p->label, d, tot, r, left);
    } else {
        fprintf(stderr, "\r%s: %s, %s/s\033[K", p->label, d, r);
    }
    fflush(stderr);
    p->drawn = 1;
    return 0;
}

void vg_cli_progress_end(vg_cli_progress *p) {
    if (p->enabled && p->drawn) {
        fputs("\r\033[K", stderr);
        fflush(stderr);
    }
    p->drawn = 0;
}
