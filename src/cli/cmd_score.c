/* cmd_score.c - `vecgauge score`: evaluate vector sets, write a run directory.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <errno.h>
#include <getopt.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "cli.h"

static const char score_help[] =
    "Usage: vecgauge score [OPTION]... VECTORS...\n"
    "Score one or more vector sets on word-pair and analogy suites and write a run\n"
    "directory.\n"
    "\n"
    "A vector set is given as PATH or LABEL=PATH; without a label, the file name\n"
    "up to its first '.' is used.\n"
    "\n"
    "Suites (in the order given; with none of these, every known suite present\n"
    "in the data directory):\n"
    "  -s, --suite IDS        known suites by id, comma-separated ('vecgauge suites'\n"
    "                         lists them); repeatable\n"
    "  -p, --pairs FILE       a word-pair file (word, word, rating); repeatable\n"
    "  -a, --analogies FILE   an analogy file or folder of relation files, layout\n"
    "                         detected; repeatable\n"
    "      --data DIR         the data directory (default: $VECGAUGE_DATA, else\n"
    "                         $XDG_DATA_HOME/vecgauge, else ~/.local/share/vecgauge)\n"
    "      --manifest FILE    read this manifest instead of the built-in one\n"
    "      --max-suite-bytes N  largest suite file once decompressed (default\n"
    "                         67108864)\n"
    "\n"
    "Output:\n"
    "  -o, --out DIR          run directory to create (default: results/<UTC time>-<label>)\n"
    "\n"
    "Scoring:\n"
    "      --fold-case        retry missing words Unicode case-folded\n"
    "      --seed N           random seed for resampling (default %u)\n"
    "      --bootstrap N      bootstrap replicates over the items (default %u; 0: none)\n"
    "      --ci LEVEL         confidence level of every interval, 0 < LEVEL < 1\n"
    "                         (default %g)\n"
    "      --analogy-vocab N  analogy candidates: the first N rows of each set\n"
    "                         (default %u; 0: every row)\n"
    "      --keep-question-words  let a, b and c of a question be its answer\n"
    "  -j, --threads N        threads (default: one per CPU)\n"
    "\n"
    "Comparing (with two or more vector sets):\n"
    "      --alpha A          significance level after Holm's adjustment (default 0.05)\n"
    "      --no-common        compare each set on the items it covers instead of on the\n"
    "                         items every set covers (warns)\n"
    "      --methods LIST     analogy methods to compare (default 3cosadd)\n"
    "\n"
    "%s"
    "\n"
    "  -h, --help             show this help and exit\n"
    "\n"
    "Writes scores.csv, intervals.csv, agreement.csv, items.csv, missing.csv,\n"
    "summary.md, table.tex and run.json into the run directory and prints the\n"
    "headline table on standard output; with several sets also comparison.csv,\n"
    "ranking.csv and plots/ (see 'vecgauge compare --help'). Intervals are BCa\n"
    "bootstrap intervals for similarity and pair-bootstrap ones for analogy\n"
    "accuracy (each section's word pairs resampled; percentile, Fisher-z and\n"
    "Wilson intervals in intervals.csv); the same seed gives the same numbers for\n"
    "any --threads.\n";

/* One suite as asked for on the command line. */
typedef enum { SPEC_SUITE, SPEC_PAIRS, SPEC_ANALOGIES } spec_kind;
typedef struct suite_spec {
    spec_kind kind;
    const char *arg;   /* an id (pointing into ids_buf) or a path */
} suite_spec;

typedef struct score_args {
    suite_spec *specs;
    size_t n_specs;
    char **id_lists;   /* copies of --suite values, split in place */
    size_t n_id_lists;
    const char *data;
    const char *manifest;
    const char *out;
    vg_eval_options eval;
    char data_used[VG_ERROR_PATH_MAX]; /* the data directory read, "" if none */
    vg_load_options load;
    int progress;
    vg_cli_stats stats;       /* bootstrap settings; alpha, items, methods for several sets */
} score_args;

enum { OPT_FOLD = 256, OPT_DATA, OPT_MANIFEST, OPT_ANALOGY_VOCAB, OPT_KEEP_QWORDS, OPT_MAX_SUITE };

static const struct option long_opts[] = {
    {"suite", required_argument, NULL, 's'},
    {"pairs", required_argument, NULL, 'p'},
    {"analogies", required_argument, NULL, 'a'},
    {"data", required_argument, NULL, OPT_DATA},
    {"manifest", required_argument, NULL, OPT_MANIFEST},
    {"max-suite-bytes", required_argument, NULL, OPT_MAX_SUITE},
    {"out", required_argument, NULL, 'o'},
    {"fold-case", no_argument, NULL, OPT_FOLD},
    VG_CLI_BOOT_LONG_OPTIONS,
    {"analogy-vocab", required_argument, NULL, OPT_ANALOGY_VOCAB},
    {"keep-question-words", no_argument, NULL, OPT_KEEP_QWORDS},
    VG_CLI_ALPHA_LONG_OPTION,
    VG_CLI_ITEMS_LONG_OPTIONS,
    {"help", no_argument, NULL, 'h'},
    VG_CLI_LOAD_LONG_OPTIONS,
    {NULL, 0, NULL, 0}};

/* Every word of the suites (pairs' words; questions' a, b, c and every
 * answer): with the first analogy candidates, the only rows a run needs
 * to keep. Borrowed pointers into the suites. */
/* Every distinct word of the similarity suites: the rows the loader must
 * keep beyond the analogy candidates. Analogy words need no entry: a
 * question counts only when its words are among the first analogy_vocab
 * rows, which are kept whole. Borrowed pointers into the suites. */
static const char **suite_words(vg_suite *const *suites, size_t n, size_t *count) {
    size_t total = 0;
    for (size_t k = 0; k < n; k++)
        if (suites[k]->task == VG_TASK_SIMILARITY) total += 2 * suites[k]->n_items;
    const char **w = calloc(total ? total : 1, sizeof *w);
    if (!w) return NULL;
    size_t m = 0;
    for (size_t k = 0; k < n; k++)
        for (size_t i = 0; suites[k]->task == VG_TASK_SIMILARITY && i < suites[k]->n_items; i++) {
            w[m++] = suites[k]->pairs[i].w1;
            w[m++] = suites[k]->pairs[i].w2;
        }
    *count = m;
    return w;
}

/* Every option of the run with its effective value, for run.json. The
 * buffers live in *a so the settings stay valid while the run is written. */
static size_t score_settings(score_args *a, int compared, vg_setting *st, char bufs[][32]) {
    size_t n = 0;
    snprintf(bufs[n], 32, "%llu", (unsigned long long)a->eval.seed);
    st[n] = (vg_setting){"seed", bufs[n], VG_SETTING_INTEGER};
    n++;
    snprintf(bufs[n], 32, "%zu", a->eval.bootstrap);
    st[n] = (vg_setting){"bootstrap", bufs[n], VG_SETTING_INTEGER};
    n++;
    snprintf(bufs[n], 32, "%.17g", a->eval.ci);
    st[n] = (vg_setting){"ci", bufs[n], VG_SETTING_REAL};
    n++;
    snprintf(bufs[n], 32, "%u", a->eval.score.threads);
    st[n] = (vg_setting){"threads", bufs[n], VG_SETTING_INTEGER};
    n++;
    st[n] = (vg_setting){"fold-case", a->eval.score.fold_case ? "1" : "0", VG_SETTING_BOOL};
    n++;
    snprintf(bufs[n], 32, "%zu", a->eval.score.analogy_vocab);
    st[n] = (vg_setting){"analogy-vocab", bufs[n], VG_SETTING_INTEGER};
    n++;
    st[n] = (vg_setting){"keep-question-words", a->eval.score.keep_question_words ? "1" : "0",
                         VG_SETTING_BOOL};
    n++;
    /* The data directory actually read (from --data, $VECGAUGE_DATA or the
     * XDG default), so that a rerun elsewhere reads the same one. */
    if (a->data_used[0]) st[n++] = (vg_setting){"data", a->data_used, VG_SETTING_STRING};
    if (a->manifest) st[n++] = (vg_setting){"manifest", a->manifest, VG_SETTING_STRING};
    if (compared) {
        /* The comparison's own options, when several sets were compared. */
        snprintf(bufs[n], 32, "%.17g", a->stats.cmp.alpha);
        st[n] = (vg_setting){"alpha", bufs[n], VG_SETTING_REAL};
        n++;
        st[n++] = (vg_setting){"no-common", a->stats.cmp.items == VG_COMPARE_AS_IS ? "1" : "0",
                               VG_SETTING_BOOL};
        bufs[n][0] = '\0';
        unsigned ms = a->stats.cmp.methods ? a->stats.cmp.methods : 1u << VG_METHOD_3COSADD;
        for (int m = 0; m < VG_METHOD_COUNT; m++)
            if (ms & (1u << m))
                snprintf(bufs[n] + strlen(bufs[n]), 32 - strlen(bufs[n]), "%s%s",
                         bufs[n][0] ? "," : "", vg_method_name((vg_method)m));
        st[n] = (vg_setting){"methods", bufs[n], VG_SETTING_STRING};
        n++;
    }
    return n;
}

static int add_spec(score_args *a, spec_kind kind, const char *arg) {
    suite_spec *ns = realloc(a->specs, (a->n_specs + 1) * sizeof *ns);
    if (!ns) return -1;
    a->specs = ns;
    a->specs[a->n_specs++] = (suite_spec){kind, arg};
    return 0;
}

/* --suite a,b,c: one spec per id (empty parts are ignored). */
static int add_suite_ids(score_args *a, const char *list) {
    char **nl = realloc(a->id_lists, (a->n_id_lists + 1) * sizeof *nl);
    if (!nl) return -1;
    a->id_lists = nl;
    char *copy = strdup(list);
    if (!copy) return -1;
    a->id_lists[a->n_id_lists++] = copy;
    for (char *tok = strtok(copy, ","); tok; tok = strtok(NULL, ","))
        if (add_spec(a, SPEC_SUITE, tok) != 0) return -1;
    return 0;
}

/* Read every suite asked for (or, with none asked for, every known suite
 * present in the data directory) into *out. Returns an exit status. */
static int read_suites(score_args *a, vg_suite ***out, size_t *n_out) {
    *out = NULL;
    *n_out = 0;
    vg_error err;
    vg_error_clear(&err);
    vg_manifest *m = NULL;
    char data[VG_ERROR_PATH_MAX];
    const char *src = "";
    int need_manifest = a->n_specs == 0;
    for (size_t i = 0; i < a->n_specs; i++) need_manifest |= a->specs[i].kind == SPEC_SUITE;
    int rc = VG_EXIT_FAIL;
    vg_suite **suites = NULL;
    size_t n = 0;
    if (need_manifest) {
        if (vg_manifest_load(a->manifest, &m, &err) != VG_OK ||
            vg_data_dir(a->data, data, sizeof data, &src, &err) != VG_OK) {
            vg_cli_error(&err);
            goto done;
        }
        snprintf(a->data_used, sizeof a->data_used, "%s", data);
    }
    size_t cap = a->n_specs ? a->n_specs : vg_manifest_count(m);
    suites = calloc(cap ? cap : 1, sizeof *suites);
    if (!suites) {
        vg_cli_fail("out of memory");
        goto done;
    }
    if (a->n_specs == 0) {
        for (size_t i = 0; i < vg_manifest_count(m); i++) {
            const vg_suite_entry *e = vg_manifest_get(m, i);
            if (vg_suite_entry_locate(e, data) == (size_t)-1) continue;
            if (vg_suite_read_entry(e, data, &suites[n], &err) != VG_OK) {
                vg_cli_error(&err);
                goto done;
            }
            n++;
        }
        if (n == 0) {
            vg_cli_fail("no suite given, and no known suite is in the data directory %s (from %s); "
                        "download them with 'vecgauge fetch all', or give --pairs FILE or "
                        "--analogies FILE",
                        data, src);
            goto done;
        }
    }
    for (size_t i = 0; i < a->n_specs; i++) {
        const suite_spec *sp = &a->specs[i];
        vg_status st;
        if (sp->kind == SPEC_SUITE) {
            const vg_suite_entry *e = vg_manifest_find(m, sp->arg);
            if (!e) {
                rc = vg_cli_usage_error("score", "unknown suite '%s' ('vecgauge suites' lists the "
                                        "known ones)", sp->arg);
                goto done;
            }
            st = vg_suite_read_entry(e, data, &suites[n], &err);
        } else if (sp->kind == SPEC_PAIRS) {
            st = vg_suite_read_pairs(sp->arg, NULL, NULL, &suites[n], &err);
        } else {
            st = vg_suite_read_analogies(sp->arg, NULL, NULL, VG_ANALOGY_AUTO, &suites[n], &err);
        }
        if (st != VG_OK) {
            vg_cli_error(&err);
            goto done;
        }
        n++;
    }
    /* A copy that differs from the pinned digest is scored, but its
     * numbers may not compare with published ones: say so. */
    for (size_t k = 0; m && k < n; k++) {
        const vg_suite_entry *e = vg_manifest_find(m, suites[k]->id);
        size_t bad = 0;
        if (e && *suites[k]->variant && vg_suite_entry_verify(e, suites[k], &bad) == VG_HASH_MISMATCH)
            vg_cli_note("warning: %s differs from the sha256 pinned for suite %s; its "
                        "scores may not compare with published ones",
                        suites[k]->files[bad].path, suites[k]->id);
    }
    for (size_t k = 0; k < n; k++)
        for (size_t j = 0; j < k; j++)
            if (strcmp(suites[k]->id, suites[j]->id) == 0) {
                rc = vg_cli_usage_error("score", "the suite '%s' is given twice", suites[k]->id);
                goto done;
            }
    rc = VG_EXIT_OK;
done:
    vg_manifest_free(m);
    if (rc != VG_EXIT_OK) {
        for (size_t k = 0; k < n; k++) vg_suite_free(suites[k]);
        free(suites);
        return rc;
    }
    *out = suites;
    *n_out = n;
    return rc;
}

int vg_cmd_score(int argc, char **argv) {
    score_args a;
    memset(&a, 0, sizeof a);
    vg_eval_options_init(&a.eval);
    vg_load_options_init(&a.load);
    /* The command keeps vector digests between runs (--rehash: not read). */
    a.load.digest_cache = VG_DIGEST_CACHE_USE;
    a.progress = 1;
    vg_cli_stats_init(&a.stats);
    int rc = VG_EXIT_FAIL;
    optind = 1;
    opterr = 0;
    int c;
    uint64_t u;
    while ((c = getopt_long(argc, argv, ":s:p:a:o:j:h", long_opts, NULL)) != -1) {
        int handled = vg_cli_load_option("score", c, optarg, &a.load, &a.progress, &rc);
        if (handled == 0) handled = vg_cli_stats_option("score", c, optarg, &a.stats, &rc);
        if (handled < 0) goto done;
        if (handled) continue;
        switch (c) {
        case 's':
        case 'p':
        case 'a':
            if ((c == 's' ? add_suite_ids(&a, optarg)
                          : add_spec(&a, c == 'p' ? SPEC_PAIRS : SPEC_ANALOGIES, optarg)) != 0) {
                vg_cli_fail("out of memory");
                goto done;
            }
            break;
        case OPT_DATA: a.data = optarg; break;
        case OPT_MANIFEST: a.manifest = optarg; break;
        case OPT_MAX_SUITE:
            if (vg_cli_parse_u64(optarg, 1, UINT64_MAX, &u) != 0)
                return vg_cli_usage_error("score", "--max-suite-bytes needs a positive integer, "
                                                   "got '%s'",
                                          optarg);
            vg_suite_set_max_bytes(u);
            break;
        case OPT_KEEP_QWORDS: a.eval.score.keep_question_words = 1; break;
        case OPT_ANALOGY_VOCAB:
            if (vg_cli_parse_u64(optarg, 0, SIZE_MAX, &u) != 0) {
                rc = vg_cli_usage_error("score",
                                        "--analogy-vocab needs a non-negative integer, got '%s'",
                                        optarg);
                goto done;
            }
            a.eval.score.analogy_vocab = (size_t)u;
            break;
        case 'o': a.out = optarg; break;
        case OPT_FOLD: a.eval.score.fold_case = 1; break;
        case 'h':
            printf(score_help, (unsigned)VG_DEFAULT_SEED, (unsigned)VG_DEFAULT_BOOTSTRAP,
                   VG_DEFAULT_CI, (unsigned)VG_DEFAULT_ANALOGY_VOCAB,
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
    /* The bootstrap settings score with, and compare with (several sets). */
    a.eval.seed = a.stats.cmp.seed;
    a.eval.bootstrap = a.stats.cmp.replicates;
    a.eval.ci = a.stats.cmp.level;
    a.eval.score.threads = a.stats.cmp.threads;
    int n_sets = argc - optind;
    if (n_sets <= 0) {
        rc = vg_cli_usage_error("score", "no vector set given");
        goto done;
    }

    vg_error err;
    vg_error_clear(&err);
    vg_suite **suites = NULL;
    size_t n_suites = 0;
    rc = read_suites(&a, &suites, &n_suites);
    if (rc != VG_EXIT_OK) goto done;
    rc = VG_EXIT_FAIL;
    vg_vector_set *sets = calloc((size_t)n_sets, sizeof *sets);
    char **labels = calloc((size_t)n_sets, sizeof *labels);
    char **paths = calloc((size_t)n_sets, sizeof *paths);
    vg_vectors **vecs = calloc((size_t)n_sets, sizeof *vecs);
    const char **words = NULL;
    vg_results *res = NULL;
    vg_paired_items *paired = NULL;
    vg_comparisons *cmp = NULL;
    char *cmdline = NULL;
    if (!sets || !labels || !paths || !vecs) {
        vg_cli_fail("out of memory");
        goto cleanup;
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
    words = suite_words(suites, n_suites, &n_words);
    if (!words) {
        vg_cli_fail("out of memory");
        goto cleanup;
    }
    int has_analogy = 0;
    for (size_t k = 0; k < n_suites; k++) has_analogy |= suites[k]->task == VG_TASK_ANALOGY;
    for (int i = 0; i < n_sets; i++) {
        vg_load_options lo = a.load;
        lo.threads = a.eval.score.threads;
        lo.fold_case = a.eval.score.fold_case;
        lo.keep_words = words;
        lo.n_keep_words = n_words;
        /* Analogy answers are searched among the first analogy_vocab rows
         * of a set, so those rows are kept whole; with analogy_vocab 0
         * (every row is a candidate) nothing may be filtered out. */
        if (has_analogy) {
            lo.keep_first = a.eval.score.analogy_vocab;
            if (lo.keep_first == 0) lo.keep_words = NULL;
        }
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
    if (vg_evaluate(sets, (size_t)n_sets, (const vg_suite *const *)suites, n_suites, &a.eval, &res,
                    &err) != VG_OK) {
        vg_cli_error(&err);
        goto cleanup;
    }
    if (n_sets >= 2) {
        /* Several sets: compare them item by item, on the same resamples
         * as their intervals. */
        if (a.stats.cmp.items == VG_COMPARE_AS_IS)
            vg_cli_note("warning: --no-common: each set is compared on the items it "
                        "covers; differences mix vector quality with coverage");
        if (vg_paired_items_from_results(res, &paired, &err) != VG_OK ||
            vg_compare(paired, &a.stats.cmp, &cmp, &err) != VG_OK) {
            vg_cli_error(&err);
            goto cleanup;
        }
    }

    char iso[32], stamp[32];
    vg_utc_now(iso, stamp);
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
    char cwd[4096];
    if (!getcwd(cwd, sizeof cwd)) cwd[0] = '\0';
    vg_setting settings[32];
    char setting_bufs[32][32];
    vg_provenance prov = {.tool_version = vg_version(),
                          .git_describe = vg_cli_git_describe,
                          .utc_time = iso,
                          .command_line = cmdline,
                          .argv = (const char *const *)vg_cli_argv,
                          .argc = (size_t)vg_cli_argc,
                          .cwd = cwd,
                          .settings = settings,
                          .n_settings = score_settings(&a, cmp != NULL, settings, setting_bufs)};
    rc = vg_cli_write_run_compared(out, res, cmp, &prov);
    if (rc == VG_EXIT_OK) {
        if (vg_report_text_table(res, stdout, &err) != VG_OK ||
            (cmp && (fputc('\n', stdout), vg_report_comparison_text(cmp, stdout, &err)) != VG_OK)) {
            vg_cli_error(&err);
            rc = VG_EXIT_FAIL;
        }
        vg_cli_note("run directory: %s", out);
    }

cleanup:
    vg_comparisons_free(cmp);
    vg_paired_items_free(paired);
    free(cmdline);
    vg_results_free(res);
    free(words);
    for (int i = 0; vecs && i < n_sets; i++) vg_vectors_free(vecs[i]);
    for (size_t k = 0; suites && k < n_suites; k++) vg_suite_free(suites[k]);
    for (int i = 0; labels && i < n_sets; i++) free(labels[i]);
    for (int i = 0; paths && i < n_sets; i++) free(paths[i]);
    free(vecs);
    free(labels);
    free(paths);
    free(sets);
    free(suites);
done:
    free(a.specs);
    for (size_t i = 0; i < a.n_id_lists; i++) free(a.id_lists[i]);
    free(a.id_lists);
    return rc;
}
