/* threads.c - thread-count defaults and vg_parallel.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "threads.h"

#include <pthread.h>
#include <unistd.h>

#include "alloc.h"

unsigned vg_threads_resolve(unsigned threads) {
    if (threads) return threads;
    long n = sysconf(_SC_NPROCESSORS_ONLN);
    return n > 0 ? (unsigned)n : 1u;
}

typedef struct job {
    void (*fn)(void *, unsigned, unsigned);
    void *ctx;
    unsigned t, n;
} job;

static void *trampoline(void *arg) {
    job *j = arg;
    j->fn(j->ctx, j->t, j->n);
    return NULL;
}

int vg_parallel(unsigned nthreads, void (*fn)(void *, unsigned, unsigned), void *ctx) {
    if (nthreads <= 1) {
        fn(ctx, 0, 1);
        return 0;
    }
    pthread_t *tids = vg_calloc(nthreads, sizeof *tids);
    job *jobs = vg_calloc(nthreads, sizeof *jobs);
    unsigned char *started = vg_calloc(nthreads, 1);
    int rc = 0;
    if (!tids || !jobs || !started) {
        /* No memory for thread bookkeeping: run every share here. */
        for (unsigned t = 0; t < nthreads; t++) fn(ctx, t, nthreads);
        rc = -1;
        goto done;
    }
    for (unsigned t = 1; t < nthreads; t++) {
        jobs[t] = (job){fn, ctx, t, nthreads};
        started[t] = pthread_create(&tids[t], NULL, trampoline, &jobs[t]) == 0;
    }
    fn(ctx, 0, nthreads);
    for (unsigned t = 1; t < nthreads; t++) {
        if (started[t]) {
            pthread_join(tids[t], NULL);
        } else {
            fn(ctx, t, nthreads);
            rc = -1;
        }
    }
done:
    vg_free(tids);
    vg_free(jobs);
    vg_free(started);
    return rc;
}
