/* cmd_track.c - `vecgauge track`: add a run to a training history, compare it
 * with the previous and the best earlier runs, gate on regressions.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The work is the library's (track.h); this is its options, its messages
 * and its exit status.
 */
#include <getopt.h>
#include <stdint.h>
#include <stdio.h>
#include <stdlib.h>

#include "cli.h"

static const char track_help[] =
    "Usage: vecgauge track --history FILE [OPTION]... RUN_DIR\n"
    "Append the scores of a run directory to a training history, compare the run\n"
    "with the previous run and with the best earlier run of each suite (paired\n"
    "tests on the saved items, Holm-adjusted), and plot each suite's score\n"
    "against the training step.\n"
    "\n"
    "      --history FILE        the history CSV (created if absent; safe to share\n"
    "                            between jobs running at the same time)\n"
    "      --step N              this run's training step (default: the largest step\n"
    "                            in the history + 1; a step already there is refused)\n"
    "      --vectors LABEL       the vector set to track, when the run holds several\n"
    "      --fail-on-regression  exit with status 3 when a suite is significantly\n"
    "                            worse than the previous or the best earlier run\n"
    "      --alpha A             significance level after Holm's adjustment (0.05)\n"
    "      --plots DIR           where the plots go (default: the history's name\n"
    "                            without .csv, plus -plots); each file is replaced whole\n"
    "      --no-plots            do not draw plots\n"
    "  -o, --out DIR             also write a report directory (comparison.csv,\n"
    "                            summary.md, plots/)\n"
    "      --seed N, --bootstrap N, --ci LEVEL\n"
    "                            bootstrap settings (default: as the run recorded)\n"
    "  -j, --threads N           threads\n"
    "  -h, --help                show this help and exit\n"
    "\n"
    "The history records each run directory relative to the history file's folder\n"
    "(absolute when they share no folder), so the two can move together. Exit\n"
    "status: 0 no significant regression, 3 a significant regression with\n"
    "--fail-on-regression (the suites are named), 1 an error (nothing appended).\n";

enum { OPT_HISTORY = 256, OPT_STEP, OPT_VECTORS, OPT_FAIL, OPT_PLOTS, OPT_NO_PLOTS };

static const struct option long_opts[] = {
    {"history", required_argument, NULL, OPT_HISTORY},
    {"step", required_argument, NULL, OPT_STEP},
    {"vectors", required_argument, NULL, OPT_VECTORS},
    {"fail-on-regression", no_argument, NULL, OPT_FAIL},
    VG_CLI_ALPHA_LONG_OPTION,
    {"plots", required_argument, NULL, OPT_PLOTS},
    {"no-plots", no_argument, NULL, OPT_NO_PLOTS},
    {"out", required_argument, NULL, 'o'},
    VG_CLI_BOOT_LONG_OPTIONS,
    {"help", no_argument, NULL, 'h'},
    {NULL, 0, NULL, 0}};

/* ---- the command -------------------------------------------------------- */

int vg_cmd_track(int argc, char **argv) {
    vg_cli_stats so;
    vg_cli_stats_init(&so);
    vg_track_options to;
    vg_track_options_init(&to);
    const char *history = NULL, *plots = NULL, *out = NULL;
    int fail_on_reg = 0, no_plots = 0;
    optind = 1;
    opterr = 0;
    int c;
    while ((c = getopt_long(argc, argv, ":o:j:h", long_opts, NULL)) != -1) {
        int urc, handled = vg_cli_stats_option("track", c, optarg, &so, &urc);
        if (handled < 0) return urc;
        if (handled) continue;
        uint64_t step;
        switch (c) {
        case OPT_HISTORY: history = optarg; break;
        case OPT_STEP:
            if (vg_cli_parse_u64(optarg, 0, UINT64_MAX / 2, &step) != 0)
                return vg_cli_usage_error("track", "--step needs a whole number, got '%s'", optarg);
            to.step = step;
            break;
        case OPT_VECTORS: to.vectors = optarg; break;
        case OPT_FAIL: fail_on_reg = 1; break;
        case OPT_PLOTS: plots = optarg; break;
        case OPT_NO_PLOTS: no_plots = 1; break;
        case 'o': out = optarg; break;
        case 'h': fputs(track_help, stdout); return VG_EXIT_OK;
        case ':':
            return vg_cli_usage_error("track", "option '%s' needs an argument", argv[optind - 1]);
        default: return vg_cli_usage_error("track", "unknown option '%s'", argv[optind - 1]);
        }
    }
    if (!history) return vg_cli_usage_error("track", "--history FILE is required");
    if (argc - optind != 1)
        return vg_cli_usage_error("track", "expected one run directory, got %d", argc - optind);
    /* The bootstrap settings given; the others as the run recorded. */
    to.compare = so.cmp;
    to.seed_from_run = !so.have_seed;
    to.replicates_from_run = !so.have_boot;
    to.level_from_run = !so.have_ci;

    vg_error err;
    vg_error_clear(&err);
    vg_track *t = NULL;
    char *cmdline = NULL;
    int rc = VG_EXIT_FAIL;
    vg_status st = vg_track_begin(history, argv[optind], &to, &t, &err);
    if (st == VG_EINVAL) return vg_cli_usage_error("track", "%s", err.message);
    if (st != VG_OK || vg_track_append(t, &err) != VG_OK ||
        vg_track_report_text(t, stdout, &err) != VG_OK) {
        vg_cli_error(&err);
        goto done;
    }
    fflush(stdout);
    if (!no_plots) {
        char dir[4200];
        if (!plots) {
            vg_track_plots_dir(history, dir, sizeof dir);
            plots = dir;
        }
        if (vg_track_write_plots(t, plots, &err) != VG_OK) {
            vg_cli_error(&err);
            goto done;
        }
    }
    if (out) {
        char iso[32], stamp[32];
        vg_utc_now(iso, stamp);
        cmdline = vg_cli_command_line(vg_cli_argc, vg_cli_argv);
        vg_provenance prov = {.tool_version = vg_version(), .git_describe = vg_cli_git_describe,
                              .utc_time = iso, .command_line = cmdline};
        if (vg_track_write_report(t, out, &prov, &err) != VG_OK) {
            vg_cli_error(&err);
            goto done;
        }
        vg_cli_note("track report: %s", out);
    }
    rc = vg_track_n_regressed(t) && fail_on_reg ? VG_EXIT_REGRESSION : VG_EXIT_OK;
done:
    vg_track_free(t);
    free(cmdline);
    return rc;
}
