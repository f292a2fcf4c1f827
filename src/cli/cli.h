/* cli.h - shared parts of the vecgauge command-line front end.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The front end uses only the public API in include/vecgauge/ (plus these
 * helpers), the way any other program would.
 */
#ifndef VG_CLI_H
#define VG_CLI_H

#include <stddef.h>
#include <stdint.h>

#include <stdio.h>

#include "vecgauge/vecgauge.h"

/* Exit statuses, documented in the README and the man page. */
enum {
    VG_EXIT_OK = 0,      /* success */
    VG_EXIT_FAIL = 1,    /* bad input, failed check, I/O error */
    VG_EXIT_USAGE = 2,   /* bad command line */
    VG_EXIT_REGRESSION = 3 /* track --fail-on-regression: a suite regressed
                              significantly (after Holm's adjustment) */
};

extern const char *vg_cli_progname;

/* The whole command line, for provenance (set by main). */
/* `git describe` of the checkout the tool was built from, or "". */
extern const char *vg_cli_git_describe;
extern int vg_cli_argc;
extern char **vg_cli_argv;

/* "vecgauge: <formatted error>" on stderr. */
void vg_cli_error(const vg_error *err);

/* "vecgauge: <message>" on stderr, escaped (vg_escape_text): an error. */
void vg_cli_fail(const char *fmt, ...) VG_PRINTF(1, 2);
/* The same for a note or warning (write "warning: ..." in fmt). Every
 * message of the tool goes through these or vg_cli_error. */
void vg_cli_note(const char *fmt, ...) VG_PRINTF(1, 2);

/* Print "vecgauge COMMAND: message" and a pointer to --help; returns
 * VG_EXIT_USAGE. */
int vg_cli_usage_error(const char *command, const char *fmt, ...) VG_PRINTF(2, 3);

/* Parse a whole decimal number into *out within [min, max]. 0 on success. */
int vg_cli_parse_u64(const char *s, uint64_t min, uint64_t max, uint64_t *out);
int vg_cli_parse_double(const char *s, double min, double max, double *out);

/* Split "LABEL=PATH" (or just PATH, labelled by its file name without
 * extensions). The returned strings are new; the caller frees both. */
int vg_cli_vector_spec(const char *spec, char **label, char **path);

/* The command line re-quoted for a shell, in one new string. */
char *vg_cli_command_line(int argc, char **argv);

/* Progress of a load on standard error, drawn only when it is a terminal
 * (and enabled): pass vg_cli_progress_fn and the record as the load
 * options' progress callback and context. */
typedef struct vg_cli_progress {
    char label[1024];   /* escaped (vg_escape_text) */
    int enabled, drawn;
    double t0, last;
} vg_cli_progress;
void vg_cli_progress_begin(vg_cli_progress *p, const char *label, int enabled);
int vg_cli_progress_fn(void *ctx, uint64_t done, uint64_t total);
/* Erase the progress line. */
void vg_cli_progress_end(vg_cli_progress *p);

/* Options of the commands that read vector files (getopt_long ids; a
 * command's own options use ids below 512). */
enum {
    VG_OPT_FORMAT = 512,
    VG_OPT_VOCAB,
    VG_OPT_MAX_WORDS,
    VG_OPT_ALLOW_SHORT,
    VG_OPT_SKIP_BAD,
    VG_OPT_NO_HASH,
    VG_OPT_NO_PROGRESS,
    VG_OPT_MAX_INFLATE,
    VG_OPT_REHASH
};
#define VG_CLI_LOAD_LONG_OPTIONS                                   \
    {"format", required_argument, NULL, VG_OPT_FORMAT},            \
    {"vocab", required_argument, NULL, VG_OPT_VOCAB},              \
    {"max-words", required_argument, NULL, VG_OPT_MAX_WORDS},      \
    {"allow-short", no_argument, NULL, VG_OPT_ALLOW_SHORT},        \
    {"skip-bad-rows", no_argument, NULL, VG_OPT_SKIP_BAD},         \
    {"no-hash", no_argument, NULL, VG_OPT_NO_HASH},                \
    {"no-progress", no_argument, NULL, VG_OPT_NO_PROGRESS},        \
    {"max-inflate", required_argument, NULL, VG_OPT_MAX_INFLATE},  \
    {"rehash", no_argument, NULL, VG_OPT_REHASH}
/* Their help, one "Vector files:" section. */
extern const char vg_cli_load_help[];
/* Apply option c (argument arg) to *lo (or *progress). Returns 1 when c
 * is one of them, 0 when it is not, -1 after a usage error (*rc set). */
int vg_cli_load_option(const char *command, int c, const char *arg, vg_load_options *lo,
                       int *progress, int *rc);

/* The statistics options of score, compare and track (getopt_long ids;
 * --threads is 'j'). A command lists the groups it takes in its option
 * table; vg_cli_stats_option parses any of them. */
enum {
    VG_OPT_SEED = 600,
    VG_OPT_BOOT,
    VG_OPT_CI,
    VG_OPT_ALPHA,
    VG_OPT_NO_COMMON,
    VG_OPT_METHODS
};
#define VG_CLI_BOOT_LONG_OPTIONS                                   \
    {"seed", required_argument, NULL, VG_OPT_SEED},                \
    {"bootstrap", required_argument, NULL, VG_OPT_BOOT},           \
    {"ci", required_argument, NULL, VG_OPT_CI},                    \
    {"threads", required_argument, NULL, 'j'}
#define VG_CLI_ALPHA_LONG_OPTION {"alpha", required_argument, NULL, VG_OPT_ALPHA}
#define VG_CLI_ITEMS_LONG_OPTIONS                                  \
    {"no-common", no_argument, NULL, VG_OPT_NO_COMMON},            \
    {"methods", required_argument, NULL, VG_OPT_METHODS}
/* Their values, starting from vg_compare_options_init's defaults; the
 * have_ flags say which bootstrap settings were given (compare and track
 * otherwise take them from the saved runs). */
typedef struct vg_cli_stats {
    vg_compare_options cmp;
    int have_seed, have_boot, have_ci;
} vg_cli_stats;
void vg_cli_stats_init(vg_cli_stats *s);
/* Apply option c (argument arg) to *s. Returns 1 when c is one of them,
 * 0 when it is not, -1 after a usage error (*rc set). */
int vg_cli_stats_option(const char *command, int c, const char *arg, vg_cli_stats *s, int *rc);

/* Write every file of a run directory into dir (temporary, then renamed);
 * prints the error and returns VG_EXIT_FAIL on failure. */
int vg_cli_write_run(const char *dir, const vg_results *res, const vg_provenance *prov);

/* As vg_cli_write_run, adding comparison.csv, ranking.csv, the comparison
 * section of summary.md and plots/ when cmp is not NULL. */
int vg_cli_write_run_compared(const char *dir, const vg_results *res, const vg_comparisons *cmp,
                              const vg_provenance *prov);

/* Comparison plots (cmd_compare.c): the names "plots/<suite>.svg" and
 * ".png" of every suite of cmp with scores, then "plots" itself, into a
 * new NULL-terminated array (free with vg_cli_free_names); NULL when out
 * of memory. vg_cli_write_plots makes plots/ inside rd and draws them. */
char **vg_cli_plot_names(const vg_comparisons *cmp);
void vg_cli_free_names(char **names);
vg_status vg_cli_write_plots(vg_rundir *rd, const vg_comparisons *cmp, vg_error *err);

/* A directory of output files written whole or not at all
 * (vg_outdir_write); prints the error and returns VG_EXIT_FAIL on
 * failure. */
int vg_cli_write_dir(const char *dir, const vg_outdir_file *files, size_t n, char **plot_names,
                     vg_outdir_plots plots, void *plot_ctx);

/* Load the run directories named by argv[0..n) (printing the error and
 * returning NULL on failure); free with vg_cli_free_runs. With
 * label_from_dir, each set is relabelled by its directory's name (and
 * its own label, "DIR:LABEL", when the run holds several sets). */
vg_saved_run **vg_cli_load_runs(char **dirs, size_t n, int label_from_dir);
void vg_cli_free_runs(vg_saved_run **runs, size_t n);

/* Parse --methods: comma-separated analogy method names into a bit set.
 * 0 on success. */
int vg_cli_parse_methods(const char *s, unsigned *out);

/* The commands. Each gets argv starting at the command name. */
int vg_cmd_score(int argc, char **argv);
int vg_cmd_rerun(int argc, char **argv);
int vg_cmd_suites(int argc, char **argv);
int vg_cmd_fetch(int argc, char **argv);
int vg_cmd_inspect(int argc, char **argv);
int vg_cmd_compare(int argc, char **argv);
int vg_cmd_track(int argc, char **argv);
int vg_cmd_merge(int argc, char **argv);

#endif /* VG_CLI_H */
