/* cmd_compare.c - `vecgauge compare`: compare the sets of saved runs.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Also the pieces compare shares with score, track and merge: plots of a
 * comparison, directories written whole, loading and relabelling runs.
 */
#include <errno.h>
#include <getopt.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "cli.h"

static const char compare_help[] =
    "Usage: vecgauge compare [OPTION]... RUN_DIR...\n"
    "Compare the vector sets of saved run directories item by item, from their\n"
    "items.csv: is one set really better than another on each suite?\n"
    "\n"
    "The runs must be on the same suites (same items, same words, same suite\n"
    "files); every vector set of every run is compared with every other.\n"
    "\n"
    "  -o, --out DIR        comparison directory to create\n"
    "                       (default: results/<UTC time>-compare)\n"
    "      --alpha A        significance level after Holm's adjustment (default 0.05)\n"
    "      --no-common      compare each set on the items it covers, as its own score\n"
    "                       does, instead of on the items every set covers (warns: a\n"
    "                       difference then mixes quality with coverage)\n"
    "      --methods LIST   analogy methods to compare, comma-separated (3cosadd,\n"
    "                       3cosmul, pairdir, only_b; default 3cosadd)\n"
    "      --label-from dir label each set by its run directory's name (DIR, or\n"
    "                       DIR:LABEL for a run of several sets): for runs whose sets\n"
    "                       share a label\n"
    "      --seed N         random seed of the paired bootstrap\n"
    "      --bootstrap N    bootstrap replicates (0: analytic tests only)\n"
    "      --ci LEVEL       confidence level of the intervals\n"
    "                       (these three default to what the first run recorded)\n"
    "  -j, --threads N      threads (default: one per CPU; results never depend on it)\n"
    "  -h, --help           show this help and exit\n"
    "\n"
    "Writes comparison.csv (one row per suite, metric and pair of sets), ranking.csv,\n"
    "summary.md, plots/SUITE.svg and .png, and compare.json, and prints the table.\n"
    "Similarity: Steiger's Z1* on the common items is the test; a paired bootstrap\n"
    "of the difference in Spearman's rho gives the interval (BCa) and a second p\n"
    "(Hall-Wilson). Analogy: the pair bootstrap (word pairs of each section\n"
    "resampled, Owen 2007) of the accuracy difference is the test and gives the\n"
    "interval; McNemar's exact test, which treats questions as independent, is shown\n"
    "beside it. With --no-common the paired bootstrap is the test.\n";

/* ---- shared helpers ------------------------------------------------------- */

void vg_cli_free_names(char **names) {
    for (size_t i = 0; names && names[i]; i++) free(names[i]);
    free(names);
}

char **vg_cli_plot_names(const vg_comparisons *cmp) {
    size_t n = 0;
    char **names = calloc(2 * cmp->n_suites + 2, sizeof *names);
    if (!names) return NULL;
    for (size_t k = 0; k < cmp->n_suites; k++) {
        char base[300];
        vg_plot_name((const char *const *)cmp->suite_ids, cmp->n_suites, k, base, sizeof base);
        for (int e = 0; e < 2; e++) {
            size_t len = strlen(base) + 16;
            if (!(names[n] = malloc(len))) {
                vg_cli_free_names(names);
                return NULL;
            }
            snprintf(names[n++], len, "plots/%s.%s", base, e ? "png" : "svg");
        }
    }
    if (!(names[n++] = strdup("plots"))) {
        vg_cli_free_names(names);
        return NULL;
    }
    return names;
}

vg_status vg_cli_write_plots(vg_rundir *rd, const vg_comparisons *cmp, vg_error *err) {
    const char *dir = vg_rundir_file(rd, "plots");
    if (!dir || mkdir(dir, 0777) != 0)
        return vg_error_set(err, VG_EIO, dir ? dir : "plots", 0, "cannot create the plots folder");
    for (size_t k = 0; k < cmp->n_suites; k++) {
        char base[300], svg[320], png[320];
        vg_plot_name((const char *const *)cmp->suite_ids, cmp->n_suites, k, base, sizeof base);
        snprintf(svg, sizeof svg, "plots/%s.svg", base);
        snprintf(png, sizeof png, "plots/%s.png", base);
        char *svg_path = strdup(vg_rundir_file(rd, svg));
        char *png_path = strdup(vg_rundir_file(rd, png));
        vg_status st = svg_path && png_path
                           ? vg_plot_comparison(cmp, k, svg_path, png_path, err)
                           : vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
        free(svg_path);
        free(png_path);
        if (st != VG_OK) return st;
    }
    return VG_OK;
}

void vg_cli_free_runs(vg_saved_run **runs, size_t n) {
    for (size_t i = 0; runs && i < n; i++) vg_saved_run_free(runs[i]);
    free(runs);
}

vg_saved_run **vg_cli_load_runs(char **dirs, size_t n, int label_from_dir) {
    vg_saved_run **runs = calloc(n ? n : 1, sizeof *runs);
    if (!runs) {
        vg_cli_fail("out of memory");
        return NULL;
    }
    vg_error err;
    vg_error_clear(&err);
    for (size_t q = 0; q < n; q++) {
        if (vg_saved_run_load(dirs[q], &runs[q], &err) != VG_OK) {
            vg_cli_error(&err);
            vg_cli_free_runs(runs, n);
            return NULL;
        }
        if (!label_from_dir) continue;
        /* The directory's own name, without the path leading to it. */
        const char *d = runs[q]->dir, *base = strrchr(d, '/');
        base = base ? base + 1 : d;
        for (size_t i = 0; i < runs[q]->n_sets; i++) {
            size_t len = strlen(base) + strlen(runs[q]->labels[i]) + 2;
            char *l = malloc(len);
            if (!l) {
                vg_cli_fail("out of memory");
                vg_cli_free_runs(runs, n);
                return NULL;
            }
            if (runs[q]->n_sets == 1)
                snprintf(l, len, "%s", base);
            else
                snprintf(l, len, "%s:%s", base, runs[q]->labels[i]);
            vg_status st = vg_saved_run_relabel(runs[q], i, l, &err);
            free(l);
            if (st != VG_OK) {
                vg_cli_error(&err);
                vg_cli_free_runs(runs, n);
                return NULL;
            }
        }
    }
    return runs;
}

int vg_cli_parse_methods(const char *s, unsigned *out) {
    *out = 0;
    char *copy = strdup(s);
    if (!copy) return -1;
    int rc = 0;
    for (char *tok = strtok(copy, ","); tok; tok = strtok(NULL, ",")) {
        int found = 0;
        for (int m = 0; m < VG_METHOD_COUNT; m++)
            if (strcmp(tok, vg_method_name((vg_method)m)) == 0) {
                *out |= 1u << m;
                found = 1;
            }
        if (!found) rc = -1;
    }
    free(copy);
    return *out ? rc : -1;
}

/* ---- the command ------------------------------------------------------------- */

typedef struct compare_ctx {
    const vg_comparisons *cmp;
    vg_saved_run **runs;
    size_t n_runs;
    const vg_provenance *prov;
} compare_ctx;

static vg_status f_comparison(void *ctx, FILE *fp, const char *path, vg_error *err) {
    return vg_report_comparison_csv(((compare_ctx *)ctx)->cmp, fp, path, err);
}

static vg_status f_ranking(void *ctx, FILE *fp, const char *path, vg_error *err) {
    return vg_report_ranking_csv(((compare_ctx *)ctx)->cmp, fp, path, err);
}

static vg_status f_summary(void *ctx, FILE *fp, const char *path, vg_error *err) {
    compare_ctx *c = ctx;
    return vg_report_compare_summary_md(c->cmp, (const vg_saved_run *const *)c->runs, c->n_runs,
                                        c->prov, fp, path, err);
}

static vg_status f_json(void *ctx, FILE *fp, const char *path, vg_error *err) {
    compare_ctx *c = ctx;
    return vg_report_compare_json(c->cmp, (const vg_saved_run *const *)c->runs, c->n_runs,
                                  c->prov, fp, path, err);
}

static vg_status plots_cb(vg_rundir *rd, void *ctx, vg_error *err) {
    return vg_cli_write_plots(rd, ((compare_ctx *)ctx)->cmp, err);
}

enum { OPT_LABEL_FROM = 256 };

static const struct option long_opts[] = {
    {"out", required_argument, NULL, 'o'},
    VG_CLI_ALPHA_LONG_OPTION,
    VG_CLI_ITEMS_LONG_OPTIONS,
    {"label-from", required_argument, NULL, OPT_LABEL_FROM},
    VG_CLI_BOOT_LONG_OPTIONS,
    {"help", no_argument, NULL, 'h'},
    {NULL, 0, NULL, 0}};

int vg_cmd_compare(int argc, char **argv) {
    vg_cli_stats so;
    vg_cli_stats_init(&so);
    vg_compare_options o;
    const char *out = NULL;
    int label_dir = 0;
    optind = 1;
    opterr = 0;
    int c;
    while ((c = getopt_long(argc, argv, ":o:j:h", long_opts, NULL)) != -1) {
        int urc, handled = vg_cli_stats_option("compare", c, optarg, &so, &urc);
        if (handled < 0) return urc;
        if (handled) continue;
        switch (c) {
        case 'o': out = optarg; break;
        case OPT_LABEL_FROM:
            if (strcmp(optarg, "dir") != 0)
                return vg_cli_usage_error("compare", "--label-from takes 'dir', got '%s'", optarg);
            label_dir = 1;
            break;
        case 'h': fputs(compare_help, stdout); return VG_EXIT_OK;
        case ':':
            return vg_cli_usage_error("compare", "option '%s' needs an argument", argv[optind - 1]);
        default: return vg_cli_usage_error("compare", "unknown option '%s'", argv[optind - 1]);
        }
    }
    o = so.cmp;
    size_t n = (size_t)(argc - optind);
    if (n == 0) return vg_cli_usage_error("compare", "no run directory given");
    vg_saved_run **runs = vg_cli_load_runs(argv + optind, n, label_dir);
    if (!runs) return VG_EXIT_FAIL;
    int rc = VG_EXIT_FAIL;
    vg_error err;
    vg_error_clear(&err);
    vg_paired_items *items = NULL;
    vg_comparisons *cmp = NULL;
    char *cmdline = NULL;
    char **plot_names = NULL;
    size_t n_sets = 0;
    for (size_t q = 0; q < n; q++) n_sets += runs[q]->n_sets;
    if (n_sets < 2) {
        vg_cli_fail("%s holds one vector set: compare needs at least two (give more run "
                    "directories)", runs[0]->dir);
        goto done;
    }
    /* The bootstrap settings of the runs, unless given: then the
     * comparison of saved runs is the one `score` made in-process. */
    if (!so.have_seed) o.seed = runs[0]->seed;
    if (!so.have_boot) o.replicates = runs[0]->bootstrap;
    if (!so.have_ci) o.level = runs[0]->level;
    for (size_t q = 1; q < n; q++)
        if ((!so.have_seed && runs[q]->seed != o.seed) || (!so.have_boot && runs[q]->bootstrap != o.replicates) ||
            (!so.have_ci && runs[q]->level != o.level)) {
            vg_cli_note("warning: %s was run with other bootstrap settings than %s; "
                        "comparing with those of %s (seed %llu, %zu replicates, level %g)",
                        runs[q]->dir, runs[0]->dir, runs[0]->dir, (unsigned long long)o.seed,
                        o.replicates, o.level);
            break;
        }
    if (o.items == VG_COMPARE_AS_IS)
        vg_cli_note("warning: --no-common: each set is compared on the items it covers; "
                    "differences mix vector quality with coverage");
    if (vg_saved_runs_pair((const vg_saved_run *const *)runs, n, 1, &items, &err) != VG_OK ||
        vg_compare(items, &o, &cmp, &err) != VG_OK) {
        vg_cli_error(&err);
        goto done;
    }

    char iso[32], stamp[32];
    vg_utc_now(iso, stamp);
    char outbuf[4096];
    if (!out) {
        if (mkdir("results", 0777) != 0 && errno != EEXIST) {
            vg_cli_fail("cannot create results/: %s", strerror(errno));
            goto done;
        }
        snprintf(outbuf, sizeof outbuf, "results/%s-compare", stamp);
        out = outbuf;
    }
    cmdline = vg_cli_command_line(vg_cli_argc, vg_cli_argv);
    char cwd[4096];
    if (!getcwd(cwd, sizeof cwd)) cwd[0] = '\0';
    vg_provenance prov = {.tool_version = vg_version(),
                          .git_describe = vg_cli_git_describe,
                          .utc_time = iso,
                          .command_line = cmdline,
                          .argv = (const char *const *)vg_cli_argv,
                          .argc = (size_t)vg_cli_argc,
                          .cwd = cwd};
    compare_ctx ctx = {cmp, runs, n, &prov};
    const vg_outdir_file files[] = {{"comparison.csv", f_comparison, &ctx},
                                 {"ranking.csv", f_ranking, &ctx},
                                 {"summary.md", f_summary, &ctx},
                                 {"compare.json", f_json, &ctx}};
    if (!(plot_names = vg_cli_plot_names(cmp))) {
        vg_cli_fail("out of memory");
        goto done;
    }
    rc = vg_cli_write_dir(out, files, sizeof files / sizeof files[0], plot_names, plots_cb, &ctx);
    if (rc == VG_EXIT_OK) {
        if (vg_report_comparison_text(cmp, stdout, &err) != VG_OK) {
            vg_cli_error(&err);
            rc = VG_EXIT_FAIL;
        }
        vg_cli_note("comparison directory: %s", out);
    }
done:
    vg_cli_free_names(plot_names);
    free(cmdline);
    vg_comparisons_free(cmp);
    vg_paired_items_free(items);
    vg_cli_free_runs(runs, n);
    return rc;
}
