/* cmd_merge.c - `vecgauge merge`: many run directories as one.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * For a grid of jobs (a Slurm job array, GNU parallel), each writing its
 * own run directory: the merged directory is itself a run directory that
 * `vecgauge compare` reads, written whole or not at all.
 */
#include <getopt.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include "cli.h"

static const char merge_help[] =
    "Usage: vecgauge merge --out DIR [OPTION]... RUN_DIR...\n"
    "Combine run directories on the same suites into one run directory: every\n"
    "vector set of every run, in the order given, in one scores.csv, items.csv,\n"
    "intervals.csv and missing.csv, with a summary.md and a run.json naming where\n"
    "each set came from.\n"
    "\n"
    "  -o, --out DIR          the merged directory to create (required; never\n"
    "                         overwritten)\n"
    "      --label-from dir   label each set by its run directory's name (DIR, or\n"
    "                         DIR:LABEL for a run of several sets); without it, two\n"
    "                         sets with the same label are an error\n"
    "  -h, --help             show this help and exit\n"
    "\n"
    "The runs must be on the same suites (same items, words and suite files).\n";

enum { OPT_LABEL_FROM = 256 };

static const struct option long_opts[] = {{"out", required_argument, NULL, 'o'},
                                          {"label-from", required_argument, NULL, OPT_LABEL_FROM},
                                          {"help", no_argument, NULL, 'h'},
                                          {NULL, 0, NULL, 0}};

typedef struct merge_ctx {
    vg_saved_run **runs;
    size_t n;
    const vg_provenance *prov;
} merge_ctx;

#define RUNS(c) ((const vg_saved_run *const *)(c)->runs)

static vg_status f_table(merge_ctx *c, const char *name, FILE *fp, const char *path, vg_error *err) {
    return vg_merge_csv(RUNS(c), c->n, name, fp, path, err);
}
static vg_status f_scores(void *c, FILE *fp, const char *p, vg_error *e) { return f_table(c, "scores.csv", fp, p, e); }
static vg_status f_intervals(void *c, FILE *fp, const char *p, vg_error *e) { return f_table(c, "intervals.csv", fp, p, e); }
static vg_status f_agreement(void *c, FILE *fp, const char *p, vg_error *e) { return f_table(c, "agreement.csv", fp, p, e); }
static vg_status f_items(void *c, FILE *fp, const char *p, vg_error *e) { return f_table(c, "items.csv", fp, p, e); }
static vg_status f_missing(void *c, FILE *fp, const char *p, vg_error *e) { return f_table(c, "missing.csv", fp, p, e); }

static vg_status f_summary(void *ctx, FILE *fp, const char *path, vg_error *err) {
    merge_ctx *c = ctx;
    return vg_merge_summary_md(RUNS(c), c->n, c->prov, fp, path, err);
}

static vg_status f_json(void *ctx, FILE *fp, const char *path, vg_error *err) {
    merge_ctx *c = ctx;
    return vg_merge_run_json(RUNS(c), c->n, c->prov, fp, path, err);
}

int vg_cmd_merge(int argc, char **argv) {
    const char *out = NULL;
    int label_dir = 0;
    optind = 1;
    opterr = 0;
    int c;
    while ((c = getopt_long(argc, argv, ":o:h", long_opts, NULL)) != -1) {
        switch (c) {
        case 'o': out = optarg; break;
        case OPT_LABEL_FROM:
            if (strcmp(optarg, "dir") != 0)
                return vg_cli_usage_error("merge", "--label-from takes 'dir', got '%s'", optarg);
            label_dir = 1;
            break;
        case 'h': fputs(merge_help, stdout); return VG_EXIT_OK;
        case ':': return vg_cli_usage_error("merge", "option '%s' needs an argument", argv[optind - 1]);
        default: return vg_cli_usage_error("merge", "unknown option '%s'", argv[optind - 1]);
        }
    }
    if (!out) return vg_cli_usage_error("merge", "--out DIR is required");
    size_t n = (size_t)(argc - optind);
    if (n == 0) return vg_cli_usage_error("merge", "no run directory given");
    vg_saved_run **runs = vg_cli_load_runs(argv + optind, n, label_dir);
    if (!runs) return VG_EXIT_FAIL;
    int rc = VG_EXIT_FAIL;
    vg_error err;
    vg_error_clear(&err);
    vg_paired_items *items = NULL;
    char *cmdline = NULL;
    /* The same checks as compare: one set of suites, distinct labels. */
    if (vg_saved_runs_pair((const vg_saved_run *const *)runs, n, 1, &items, &err) != VG_OK) {
        vg_cli_error(&err);
        if (!label_dir && strstr(err.message, "label"))
            vg_cli_note("hint: --label-from dir labels each set by its run directory");
        goto done;
    }
    char iso[32], stamp[32];
    vg_utc_now(iso, stamp);
    cmdline = vg_cli_command_line(vg_cli_argc, vg_cli_argv);
    char cwd[4096];
    if (!getcwd(cwd, sizeof cwd)) cwd[0] = '\0';
    vg_setting settings[1] = {{"label-from", label_dir ? "dir" : "", VG_SETTING_STRING}};
    vg_provenance prov = {.tool_version = vg_version(),
                          .git_describe = vg_cli_git_describe,
                          .utc_time = iso,
                          .command_line = cmdline,
                          .argv = (const char *const *)vg_cli_argv,
                          .argc = (size_t)vg_cli_argc,
                          .cwd = cwd,
                          .settings = settings,
                          .n_settings = 1};
    merge_ctx ctx = {runs, n, &prov};
    const vg_outdir_file files[] = {{"scores.csv", f_scores, &ctx},   {"intervals.csv", f_intervals, &ctx},
                                 {"agreement.csv", f_agreement, &ctx}, {"items.csv", f_items, &ctx},
                                 {"missing.csv", f_missing, &ctx}, {"summary.md", f_summary, &ctx},
                                 {"run.json", f_json, &ctx}};
    rc = vg_cli_write_dir(out, files, sizeof files / sizeof files[0], NULL, NULL, NULL);
    if (rc == VG_EXIT_OK) {
        size_t sets = 0;
        for (size_t q = 0; q < n; q++) sets += runs[q]->n_sets;
        printf("merged %zu vector set%s from %zu run director%s into %s\n", sets,
               sets == 1 ? "" : "s", n, n == 1 ? "y" : "ies", out);
    }
done:
    free(cmdline);
    vg_paired_items_free(items);
    vg_cli_free_runs(runs, n);
    return rc;
}
