/* cleanup.c - SIGINT and SIGTERM leave no partial output directory.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * While an output directory (or a plot beside a history) is being
 * written, its temporary path is registered here. With the handlers
 * installed (vg_rundir_handle_signals), a first signal removes that
 * temporary directory's files (with async-signal-safe calls only: the
 * directory holds only the regular files and subdirectories we name) and
 * exits with 128 + the signal number, as a shell would report it. Outside
 * that window the signal just sets a flag that long-running work polls,
 * and the default action follows.
 */
#include <fcntl.h>
#include <signal.h>
#include <string.h>
#include <unistd.h>

#include "rundir_impl.h"

static volatile sig_atomic_t got_signal;
static char cleanup_dir[4096];
static volatile sig_atomic_t cleanup_set;
/* The file names the directory being written can hold (NULL-terminated,
 * owned by the writer and unchanged while registered). */
static const char *const *run_names;

static void remove_run_temp(void) {
    if (!cleanup_set || !run_names) return;
    char path[4096 + 64];
    size_t n = strlen(cleanup_dir);
    for (int i = 0; run_names[i]; i++) {
        size_t m = strlen(run_names[i]);
        if (n + 1 + m + 1 > sizeof path) continue;
        memcpy(path, cleanup_dir, n);
        path[n] = '/';
        memcpy(path + n + 1, run_names[i], m + 1);
        /* A name is a file, or a subdirectory emptied by the names
         * before it (both calls are async-signal-safe). */
        if (unlink(path) != 0) rmdir(path);
    }
    rmdir(cleanup_dir);
}

static void on_signal(int sig) {
    got_signal = sig;
    if (cleanup_set) {
        remove_run_temp();
        _exit(128 + sig);
    }
    /* Nothing half-written to remove: restore the default action and
     * re-raise so the exit status says which signal it was. */
    signal(sig, SIG_DFL);
    raise(sig);
}

void vg_rundir_handle_signals(void) {
    struct sigaction sa;
    memset(&sa, 0, sizeof sa);
    sa.sa_handler = on_signal;
    sigemptyset(&sa.sa_mask);
    sigaction(SIGINT, &sa, NULL);
    sigaction(SIGTERM, &sa, NULL);
}

void vg_cleanup_hold(sigset_t *old) {
    sigset_t block;
    sigemptyset(&block);
    sigaddset(&block, SIGINT);
    sigaddset(&block, SIGTERM);
    pthread_sigmask(SIG_BLOCK, &block, old);
}

void vg_cleanup_release(const sigset_t *old) { pthread_sigmask(SIG_SETMASK, old, NULL); }

void vg_cleanup_set(const char *temp_dir, const char *const *names) {
    /* Block the signals while the path changes so that the handler never
     * sees a half-copied path. */
    sigset_t old;
    vg_cleanup_hold(&old);
    if (temp_dir && strlen(temp_dir) < sizeof cleanup_dir) {
        memcpy(cleanup_dir, temp_dir, strlen(temp_dir) + 1);
        run_names = names;
        cleanup_set = 1;
    } else {
        cleanup_set = 0;
    }
    vg_cleanup_release(&old);
}

int vg_interrupted(void) { return got_signal != 0; }
