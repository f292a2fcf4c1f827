/* main.c - the vecgauge command: dispatch to a command.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <errno.h>
#include <stdio.h>
#include <string.h>

#include "cli.h"

typedef struct command {
    const char *name;
    int (*run)(int argc, char **argv);
    const char *summary;
} command;

static int cmd_help(int argc, char **argv);

static const command commands[] = {
    {"score", vg_cmd_score, "score vector sets on suites and write a run directory"},
    {"inspect", vg_cmd_inspect, "read vector files and report their layout, size and quirks"},
    {"suites", vg_cmd_suites, "list the known suites and which are in the data directory"},
    {"fetch", vg_cmd_fetch, "download public suites into the data directory"},
    {"rerun", vg_cmd_rerun, "re-run a saved run directory after checking its inputs"},
    {"compare", vg_cmd_compare, "compare the vector sets of saved runs item by item"},
    {"track", vg_cmd_track, "add a run to a training history and check for regressions"},
    {"merge", vg_cmd_merge, "combine many run directories into one"},
    {"help", cmd_help, "show help for vecgauge or for one command"},
};
#define N_COMMANDS (sizeof commands / sizeof commands[0])

static void main_help(FILE *fp) {
    fprintf(fp,
            "Usage: vecgauge COMMAND [OPTION]... [ARG]...\n"
            "Measure how good word vectors are on human-rated word-pair and analogy\n"
            "suites, with coverage, intervals and significance tests.\n"
            "\n"
            "Commands:\n");
    for (size_t i = 0; i < N_COMMANDS; i++)
        fprintf(fp, "  %-10s %s\n", commands[i].name, commands[i].summary);
    fprintf(fp,
            "\n"
            "  vecgauge COMMAND --help   help for one command\n"
            "  vecgauge --version        print the version\n"
            "\n"
            "Exit status: 0 success; 1 bad input or a failed check; 2 usage error;\n"
            "3 a significant regression (track --fail-on-regression).\n");
}

/* Standard output is checked once, here, after every command and after
 * --help and --version: a write that failed (a full disk, /dev/full) is an
 * error with a message, never exit status 0. */
static int check_stdout(int rc) {
    errno = 0;
    int bad = fflush(stdout) != 0;
    int e = errno;
    if (!bad && !ferror(stdout)) return rc;
    if (bad && e)
        vg_cli_fail("cannot write to standard output: %s", strerror(e));
    else
        vg_cli_fail("cannot write to standard output");
    return rc == VG_EXIT_OK ? VG_EXIT_FAIL : rc;
}

static const command *find(const char *name) {
    for (size_t i = 0; i < N_COMMANDS; i++)
        if (strcmp(commands[i].name, name) == 0) return &commands[i];
    return NULL;
}

static int cmd_help(int argc, char **argv) {
    if (argc < 2) {
        main_help(stdout);
        return VG_EXIT_OK;
    }
    const command *c = find(argv[1]);
    /* `vecgauge help --help` (or -h) is help about help: the main help. */
    if (!c && (strcmp(argv[1], "--help") == 0 || strcmp(argv[1], "-h") == 0)) {
        main_help(stdout);
        return VG_EXIT_OK;
    }
    if (!c || c->run == cmd_help) {
        if (!c) return vg_cli_usage_error("help", "unknown command '%s'", argv[1]);
        main_help(stdout);
        return VG_EXIT_OK;
    }
    char help[] = "--help";
    char *sub[] = {argv[1], help, NULL};
    return c->run(2, sub);
}

int main(int argc, char **argv) {
    vg_init();
    /* Before any thread of ours starts: OpenBLAS's polling workers would
     * take a core from loading (vecgauge.h). */
    vg_blas_park_workers();
    vg_cli_argc = argc;
    vg_cli_argv = argv;
    vg_rundir_handle_signals();
    if (argc < 2) {
        main_help(stderr);
        return VG_EXIT_USAGE;
    }
    if (strcmp(argv[1], "--version") == 0 || strcmp(argv[1], "-V") == 0) {
        printf("vecgauge %s\n", vg_version());
        return check_stdout(VG_EXIT_OK);
    }
    if (strcmp(argv[1], "--help") == 0 || strcmp(argv[1], "-h") == 0) {
        main_help(stdout);
        return check_stdout(VG_EXIT_OK);
    }
    const command *c = find(argv[1]);
    if (!c) {
        vg_cli_note("unknown command '%s'", argv[1]);
        fprintf(stderr, "Try '%s help'.\n", vg_cli_progname);
        return VG_EXIT_USAGE;
    }
    int rc = check_stdout(c->run(argc - 1, argv + 1));
    /* The process ends here: let go of cairo's and fontconfig's caches. */
    vg_plot_cleanup();
    return rc;
}
