/* cmd_score.c - `vecgauge score`: evaluate vector sets, write a run directory.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <errno.h>
#include <getopt.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include "cli.h"

static const char score_help[] =
    "Usage: vecgauge score [OPTION]... VECTORS...\n"
    "Score one or more vector sets on word-pair suites and write a run directory.\n"
    "\n"
    "A vector set is given as PATH or LABEL=PATH; without a label, the file name\n"
    "up to its first '.' is used.\n"
    "\n"
    "Suites:\n"
    "  -p, --pairs FILE       a word-pair file (word, word, rating); repeatable\n"
    "\n"
    "Output:\n"
    "  -o, --out DIR          run directory to create (default: results/<UTC time>-<label>)\n"
    "\n"
    "Scoring:\n"
    "      --fold-case        retry missing words Unicode case-folded\n"
    "      --seed N           random seed for resampling (default %u)\n"
    "      --bootstrap N      bootstrap replicates (default %u)\n"
    "  -j, --threads N        threads (default: one per CPU)\n"
    "\n"
    "%s"
    "\n"
    "  -h, --help             show this help and exit\n"
    "\n"
    "Writes scores.csv, summary.md and missing.csv into the run directory and\n"
    "prints the headline table on standard output.\n";

typedef struct score_args {
    const char **pairs;
    size_t n_pairs;
    const char *out;
    vg_eval_options eval;
    vg_load_options load;
    int progress;
} score_args;

enum { OPT_FOLD = 256, OPT_SEED, OPT_BOOT };

static const struct option long_opts[] = {
    {"pairs", required_argument, NULL, 'p'},
    {"out", required_argument, NULL, 'o'},
    {"fold-case", no_argument, NULL, OPT_FOLD},
    {"seed", required_argument, NULL, OPT_SEED},
    {"bootstrap", required_argument, NULL, OPT_BOOT},
    {"threads", required_argument, NULL, 'j'},
    {"help", no_argument, NULL, 'h'},
    VG_CLI_LOAD_LONG_OPTIONS,
    {NULL, 0, NULL, 0}};

/* Every distinct word of the similarity suites: the only rows a
 * similarity-only run needs to keep. Borrowed pointers into the suites. */
static const char **suite_words(vg_suite *const *suites, size_t n, size_t *count) {
    size_t total = 0;
    for (size_t k = 0; k < n; k++) total += 2 * suites[k]->n_items;
    const char **w = calloc(total ? total : 1, sizeof *w);
    if (!w) return NULL;
    size_t m = 0;
    for (size_t k = 0; k < n; k++)
        for (size_t i = 0; i < suites[k]->n_items; i++) {
            w[m++] = suites[k]->pairs[i].w1;
            w[m++] = suites[k]->pairs[i].w2;
        }
    *count = m;
    return w;
}

static int write_run(const char *dir, const vg_results *res, const vg_provenance *prov) {
    vg_error err;
    vg_error_clear(&err);
    vg_rundir *rd = NULL;
    FILE *fp = NULL;
    vg_status st = vg_rundir_begin(dir, &rd, &err);
    if (st == VG_OK && (st = vg_rundir_open(rd, "scores.csv", &fp, &err)) == VG_OK) {
        st = vg_report_scores_csv(res, fp, vg_rundir_file(rd, "scores.csv"), &err);
        vg_status c = vg_report_close(fp, vg_rundir_file(rd, "scores.csv"), &err);
        if (st == VG_OK) st = c;
    }
    if (st == VG_OK && (st = vg_rundir_open(rd, "summary.md", &fp, &err)) == VG_OK) {
        st = vg_report_summary_md(res, prov, fp, vg_rundir_file(rd, "summary.md"), &err);
        vg_status c = vg_report_close(fp, vg_rundir_file(rd, "summary.md"), &err);
        if (st == VG_OK) st = c;
    }
    if (st == VG_OK && (st = vg_rundir_open(rd, "missing.csv", &fp, &err)) == VG_OK) {
        st = vg_report_missing_words(res, fp, vg_rundir_file(rd, "missing.csv"), &err);
        vg_status c = vg_report_close(fp, vg_rundir_file(rd, "missing.csv"), &err);
        if (st == VG_OK) st = c;
    }
    if (st == VG_OK) {
        st = vg_rundir_commit(rd, &err);
    } else {
        vg_rundir_abort(rd);
    }
    if (st != VG_OK) {
        vg_cli_error(&err);
        return VG_EXIT_FAIL;
    }
    return VG_EXIT_OK;
}

int vg_cmd_score(int argc, char **argv) {
    score_args a;
    memset(&a, 0, sizeof a);
    vg_eval_options_init(&a.eval);
    vg_load_options_init(&a.load);
    a.progress = 1;
    int rc = VG_EXIT_FAIL;
    a.pairs = calloc((size_t)argc, sizeof *a.pairs);
    if (!a.pairs) {
        vg_cli_fail("out of memory");
        return VG_EXIT_FAIL;
    }
    optind = 1;
    opterr = 0;
    int c;
    uint64_t u;
    while ((c = getopt_long(argc, argv, ":p:o:j:h", long_opts, NULL)) != -1) {
        int handled = vg_cli_load_option("score", c, optarg, &a.load, &a.progress, &rc);
        if (handled < 0) goto done;
        if (handled) continue;
        switch (c) {
        case 'p': a.pairs[a.n_pairs++] = optarg; break;
        case 'o': a.out = optarg; break;
        case OPT_FOLD: a.eval.score.fold_case = 1; break;
        case OPT_SEED:
            if (vg_cli_parse_u64(optarg, 0, UINT64_MAX, &u) != 0) {
                rc = vg_cli_usage_error("score", "--seed needs a non-negative integer, got '%s'", optarg);
                goto done;
            }
            a.eval.seed = u;
            break;
        case OPT_BOOT:
            if (vg_cli_parse_u64(optarg, 0, 10000000, &u) != 0) {
                rc = vg_cli_usage_error("score", "--bootstrap needs an integer 0..10000000, got '%s'",
                                        optarg);
                goto done;
            }
            a.eval.bootstrap = (size_t)u;
            break;
        case 'j':
            if (vg_cli_parse_u64(optarg, 1, 1024, &u) != 0) {
                rc = vg_cli_usage_error("score", "--threads needs an integer 1..1024, got '%s'", optarg);
                goto done;
            }
            a.eval.score.threads = (unsigned)u;
            break;
        case 'h':
            printf(score_help, (unsigned)VG_DEFAULT_SEED, (unsigned)VG_DEFAULT_BOOTSTRAP,
                   vg_cli_load_help);
            rc = VG_EXIT_OK;
            goto done;
        case ':':
            rc = vg_cli_usage_error("score", "option '%s' needs an argument", argv[optind - 1]);
            goto done;
        default:
            rc = vg_cli_usage_error("score", "unknown option '%s'", argv[optind - 1]);
            goto done;
        }
    }
    int n_sets = argc - optind;
    if (n_sets <= 0) {
        rc = vg_cli_usage_error("score", "no vector set given");
        goto done;
    }
    if (a.n_pairs == 0) {
        rc = vg_cli_usage_error("score", "no suite given (use --pairs FILE)");
        goto done;
    }

    vg_error err;
    vg_error_clear(&err);
    vg_suite **suites = calloc(a.n_pairs, sizeof *suites);
    vg_vector_set *sets = calloc((size_t)n_sets, sizeof *sets);
    char **labels = calloc((size_t)n_sets, sizeof *labels);
    char **paths = calloc((size_t)n_sets, sizeof *paths);
    vg_vectors **vecs = calloc((size_t)n_sets, sizeof *vecs);
    const char **words = NULL;
    vg_results *res = NULL;
    char *cmdline = NULL;
    if (!suites || !sets || !labels || !paths || !vecs) {
        vg_cli_fail("out of memory");
        goto cleanup;
    }
    for (size_t k = 0; k < a.n_pairs; k++) {
        if (vg_suite_read_pairs(a.pairs[k], NULL, NULL, &suites[k], &err) != VG_OK) {
            vg_cli_error(&err);
            goto cleanup;
        }
    }
    for (int i = 0; i < n_sets; i++) {
        if (vg_cli_vector_spec(argv[optind + i], &labels[i], &paths[i]) != 0) {
            rc = vg_cli_usage_error("score", "bad vector set '%s' (expected PATH or LABEL=PATH)",
                                    argv[optind + i]);
            goto cleanup;
        }
        for (int j = 0; j < i; j++)
            if (strcmp(labels[i], labels[j]) == 0) {
                rc = vg_cli_usage_error("score",
                                        "two vector sets are labelled '%s'; name them with LABEL=PATH",
                                        labels[i]);
                goto cleanup;
            }
    }
    size_t n_words = 0;
    words = suite_words(suites, a.n_pairs, &n_words);
    if (!words) {
        vg_cli_fail("out of memory");
        goto cleanup;
    }
    for (int i = 0; i < n_sets; i++) {
        vg_load_options lo = a.load;
        lo.threads = a.eval.score.threads;
        lo.fold_case = a.eval.score.fold_case;
        lo.keep_words = words;
        lo.n_keep_words = n_words;
        vg_cli_progress pr;
        vg_cli_progress_begin(&pr, labels[i], a.progress);
        lo.progress = vg_cli_progress_fn;
        lo.progress_ctx = &pr;
        vg_status lst = vg_vectors_load(paths[i], &lo, &vecs[i], &err);
        vg_cli_progress_end(&pr);
        if (lst != VG_OK) {
            vg_cli_error(&err);
            goto cleanup;
        }
        sets[i] = (vg_vector_set){labels[i], paths[i], vecs[i]};
    }
    if (vg_evaluate(sets, (size_t)n_sets, (const vg_suite *const *)suites, a.n_pairs, &a.eval, &res,
                    &err) != VG_OK) {
        vg_cli_error(&err);
        goto cleanup;
    }

    char iso[32], stamp[32];
    vg_cli_utc_now(iso, stamp);
    char outbuf[4096];
    const char *out = a.out;
    if (!out) {
        if (mkdir("results", 0777) != 0 && errno != EEXIST) {
            vg_cli_fail("cannot create results/: %s", strerror(errno));
            goto cleanup;
        }
        snprintf(outbuf, sizeof outbuf, "results/%s-%s", stamp, labels[0]);
        out = outbuf;
    }
    cmdline = vg_cli_command_line(vg_cli_argc, vg_cli_argv);
    vg_provenance prov = {vg_version(), vg_cli_git_describe, iso, cmdline};
    rc = write_run(out, res, &prov);
    if (rc == VG_EXIT_OK) {
        if (vg_report_text_table(res, stdout, &err) != VG_OK) {
            vg_cli_error(&err);
            rc = VG_EXIT_FAIL;
        }
        fprintf(stderr, "%s: run directory: %s\n", vg_cli_progname, out);
    }

cleanup:
    free(cmdline);
    vg_results_free(res);
    free(words);
    for (int i = 0; vecs && i < n_sets; i++) vg_vectors_free(vecs[i]);
    for (size_t k = 0; suites && k < a.n_pairs; k++) vg_suite_free(suites[k]);
    for (int i = 0; labels && i < n_sets; i++) free(labels[i]);
    for (int i = 0; paths && i < n_sets; i++) free(paths[i]);
    free(vecs);
    free(labels);
    free(paths);
    free(sets);
    free(suites);
done:
    free(a.pairs);
    return rc;
}
