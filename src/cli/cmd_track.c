/* cmd_track.c - `vecgauge track`: add a run to a training history, compare it
 * with the previous and the best earlier runs, gate on regressions.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The history is a CSV file of headline scores, one line per suite and
 * run, appended under a file lock (vg_history_open) so that parallel jobs
 * can track into one file. Comparisons use the saved items of the run
 * directories the history names, so they are the paired tests of
 * `vecgauge compare`, not a comparison of two intervals.
 */
#include <errno.h>
#include <getopt.h>
#include <limits.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

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
    "                            in the history + 1)\n"
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

/* ---- paths ------------------------------------------------------------- */

/* The folder holding path (a new string). */
static char *folder_of(const char *path) {
    const char *slash = strrchr(path, '/');
    if (!slash) return strdup(".");
    if (slash == path) return strdup("/");
    return strndup(path, (size_t)(slash - path));
}

/* target relative to the folder from (both absolute and canonical), or
 * target itself when they share nothing but the root. A new string. */
static char *relative_to(const char *from, const char *target) {
    size_t common = 0, i = 0;
    /* The longest common prefix ending on a component boundary. */
    for (;; i++) {
        char a = from[i], b = target[i];
        if ((a == '/' || a == '\0') && (b == '/' || b == '\0')) common = i;
        if (a != b || a == '\0') break;
    }
    if (common == 0) return strdup(target);
    size_t ups = 0;
    for (const char *p = from + common; *p; p++)
        if (*p == '/') ups++;
    const char *rest = target + common;
    if (*rest == '/') rest++;
    size_t len = 3 * ups + strlen(rest) + 2;
    char *out = malloc(len);
    if (!out) return NULL;
    out[0] = '\0';
    for (size_t k = 0; k < ups; k++) strcat(out, "../");
    strcat(out, *rest ? rest : ".");
    size_t n = strlen(out);
    if (n > 1 && out[n - 1] == '/') out[n - 1] = '\0';
    return out;
}

/* A recorded run path as a path from the working directory. */
static char *resolve(const char *hist_folder, const char *recorded) {
    if (recorded[0] == '/') return strdup(recorded);
    size_t len = strlen(hist_folder) + strlen(recorded) + 2;
    char *p = malloc(len);
    if (p) snprintf(p, len, "%s/%s", hist_folder, recorded);
    return p;
}

/* ---- the runs compared ------------------------------------------------ */

/* A run of the history: (run, vectors) at a step. */
typedef struct ref {
    char *run;             /* as recorded */
    char *vectors;
    uint64_t step;
    int prev;              /* the previous run */
} ref;

typedef struct snap_row {  /* a copy of a history row, for the plots */
    double step, value, low, high;
    char *suite, *metric, *run, *vectors;
} snap_row;

typedef struct track {
    const char *history;
    vg_saved_run *cur;
    size_t cur_set;
    uint64_t step;
    char *recorded;         /* cur's path as the history records it */
    vg_history *h;
    ref *refs;              /* [0] the previous run, if any; then the bests */
    size_t n_refs;
    long *best_of;          /* cur suite k -> index into refs, -1 none */
    snap_row *rows;         /* the history with this run's rows */
    size_t n_rows;
    size_t n_before;        /* rows before this run's */
    char *label;            /* the tracked set's own label */
    vg_saved_run **runs;    /* [0] = cur (borrowed), then one per ref */
    vg_comparisons *cmp;
    unsigned char *regressed; /* cur suite k */
    const vg_provenance *prov;
} track;

static int same_run(const char *a_run, const char *a_vec, const char *b_run, const char *b_vec) {
    return strcmp(a_run, b_run) == 0 && strcmp(a_vec, b_vec) == 0;
}

/* The index of (run, vectors) in t->refs, adding it if new. -1 on OOM. */
static long ref_index(track *t, const vg_history_row *r, int prev) {
    for (size_t i = 0; i < t->n_refs; i++)
        if (same_run(t->refs[i].run, t->refs[i].vectors, r->run, r->vectors)) {
            t->refs[i].prev |= prev;
            return (long)i;
        }
    ref *nr = realloc(t->refs, (t->n_refs + 1) * sizeof *nr);
    if (!nr) return -1;
    t->refs = nr;
    /* Copies: the history's rows go away with its lock. */
    char *run = strdup(r->run), *vec = strdup(r->vectors);
    if (!run || !vec) {
        free(run);
        free(vec);
        return -1;
    }
    t->refs[t->n_refs] = (ref){run, vec, r->step, prev};
    return (long)t->n_refs++;
}

static const char *headline_metric(vg_task task) {
    return task == VG_TASK_SIMILARITY ? "spearman" : "3cosadd";
}

/* Previous run and the best earlier run of each suite, from the locked
 * history. 0, or -1 when out of memory. */
static int pick_refs(track *t) {
    const vg_history *h = t->h;
    const char *label = t->cur->labels[t->cur_set];
    long prev = -1;
    for (size_t i = 0; i < h->n_rows; i++) {
        const vg_history_row *r = &h->rows[i];
        if (same_run(r->run, r->vectors, t->recorded, label) || r->step >= t->step) continue;
        /* The largest earlier step; at equal steps the later line. */
        if (prev < 0 || r->step >= h->rows[prev].step) prev = (long)i;
    }
    if (prev >= 0 && ref_index(t, &h->rows[prev], 1) < 0) return -1;
    t->best_of = malloc((t->cur->n_suites ? t->cur->n_suites : 1) * sizeof *t->best_of);
    if (!t->best_of) return -1;
    for (size_t k = 0; k < t->cur->n_suites; k++) {
        const vg_saved_suite *s = &t->cur->suites[k];
        long best = -1;
        for (size_t i = 0; i < h->n_rows; i++) {
            const vg_history_row *r = &h->rows[i];
            if (strcmp(r->suite, s->id) != 0 || strcmp(r->metric, headline_metric(s->task)) != 0 ||
                isnan(r->value) || same_run(r->run, r->vectors, t->recorded, label))
                continue;
            /* Highest value; ties go to the earlier line. */
            if (best < 0 || r->value > h->rows[best].value) best = (long)i;
        }
        t->best_of[k] = best < 0 ? -1 : ref_index(t, &h->rows[best], 0);
        if (best >= 0 && t->best_of[k] < 0) return -1;
    }
    return 0;
}

/* Load every reference run; relabel all sets "step N" (the tracked set)
 * or "step N/LABEL" (others), so labels are distinct whatever the runs
 * called their sets. Prints the error and returns -1 on failure. */
static int load_refs(track *t, const char *hist_folder, size_t *sets_at) {
    vg_error err;
    vg_error_clear(&err);
    t->runs = calloc(t->n_refs + 1, sizeof *t->runs);
    if (!t->runs) {
        vg_cli_fail("out of memory");
        return -1;
    }
    t->runs[0] = t->cur;
    sets_at[0] = t->cur_set;
    for (size_t i = 0; i < t->n_refs; i++) {
        char *path = resolve(hist_folder, t->refs[i].run);
        if (!path) {
            vg_cli_fail("out of memory");
            return -1;
        }
        vg_status st = vg_saved_run_load(path, &t->runs[i + 1], &err);
        free(path);
        if (st != VG_OK) {
            vg_error_prefix(&err, "run at step %llu named by %s: ",
                            (unsigned long long)t->refs[i].step, t->history);
            vg_cli_error(&err);
            return -1;
        }
        long s = -1;
        for (size_t j = 0; j < t->runs[i + 1]->n_sets; j++)
            if (strcmp(t->runs[i + 1]->labels[j], t->refs[i].vectors) == 0) s = (long)j;
        if (s < 0) {
            vg_cli_fail("%s: the history names vector set '%s' at step %llu, which this run "
                        "directory does not hold", t->runs[i + 1]->dir, t->refs[i].vectors,
                        (unsigned long long)t->refs[i].step);
            return -1;
        }
        sets_at[i + 1] = (size_t)s;
    }
    for (size_t q = 0; q <= t->n_refs; q++) {
        uint64_t step = q == 0 ? t->step : t->refs[q - 1].step;
        /* Two references at one step (tracked twice) get "#2", "#3". */
        size_t same = 1;
        for (size_t p = 0; p + 1 < q; p++) same += t->refs[p].step == step;
        if (q > 0 && step == t->step) same++;
        vg_saved_run *r = t->runs[q];
        for (size_t j = 0; j < r->n_sets; j++) {
            char l[4200];
            int n = snprintf(l, sizeof l, "step %llu", (unsigned long long)step);
            if (same > 1) n += snprintf(l + n, sizeof l - (size_t)n, " #%zu", same);
            if (j != sets_at[q]) snprintf(l + n, sizeof l - (size_t)n, "/%s", r->labels[j]);
            if (vg_saved_run_relabel(r, j, l, &err) != VG_OK) {
                vg_cli_error(&err);
                return -1;
            }
        }
    }
    return 0;
}

/* Set index of run q's tracked set among the paired items' sets. */
static size_t set_index(const track *t, const size_t *sets_at, size_t q) {
    size_t base = 0;
    for (size_t p = 0; p < q; p++) base += t->runs[p]->n_sets;
    return base + sets_at[q];
}

/* The history rows, copied, with this run's appended ones. */
static int snapshot(track *t, const vg_history_row *mine, size_t n_mine) {
    const vg_history *h = t->h;
    t->rows = calloc(h->n_rows + n_mine + 1, sizeof *t->rows);
    if (!t->rows) return -1;
    t->n_before = h->n_rows;
    for (size_t i = 0; i < h->n_rows + n_mine; i++) {
        const vg_history_row *r = i < h->n_rows ? &h->rows[i] : &mine[i - h->n_rows];
        snap_row *s = &t->rows[t->n_rows++];
        *s = (snap_row){(double)r->step, r->value, r->low, r->high,
                        strdup(r->suite), strdup(r->metric), strdup(r->run), strdup(r->vectors)};
        if (!s->suite || !s->metric || !s->run || !s->vectors) return -1;
    }
    return 0;
}

/* ---- outputs ------------------------------------------------------------ */

/* Draw suite k's curve to svg and png (paths). */
static vg_status plot_suite(const track *t, size_t k, const char *svg, const char *png,
                            vg_error *err) {
    const vg_saved_suite *s = &t->cur->suites[k];
    const char *metric = headline_metric(s->task);
    vg_track_point *p = calloc(t->n_rows + 1, sizeof *p);
    if (!p) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    size_t n = 0;
    const ref *best = t->best_of[k] >= 0 ? &t->refs[t->best_of[k]] : NULL;
    for (size_t i = 0; i < t->n_rows; i++) {
        const snap_row *r = &t->rows[i];
        if (strcmp(r->suite, s->id) != 0 || strcmp(r->metric, metric) != 0) continue;
        int cur = i >= t->n_before;
        p[n++] = (vg_track_point){r->step, r->value, r->low, r->high, cur,
                                  best && same_run(r->run, r->vectors, best->run, best->vectors),
                                  cur && t->regressed && t->regressed[k]};
    }
    vg_status st = vg_plot_track(s->id, metric,
                                 s->task == VG_TASK_SIMILARITY ? "Spearman's rho"
                                                               : "3CosAdd accuracy",
                                 p, n, svg, png, err);
    free(p);
    return st;
}

/* The plots beside the history: each file drawn under a temporary name
 * and renamed over the old one, so a reader never sees half a plot. */
static int write_history_plots(const track *t, const char *dir) {
    if (mkdir(dir, 0777) != 0 && errno != EEXIST) {
        vg_cli_fail("%s: cannot create the plots folder: %s", dir, strerror(errno));
        return -1;
    }
    vg_error err;
    vg_error_clear(&err);
    const char **ids = calloc(t->cur->n_suites + 1, sizeof *ids);
    if (!ids) return -1;
    for (size_t k = 0; k < t->cur->n_suites; k++) ids[k] = t->cur->suites[k].id;
    int rc = 0;
    for (size_t k = 0; k < t->cur->n_suites && rc == 0; k++) {
        char base[300], tmp[2][PATH_MAX], fin[2][PATH_MAX], tmpname[2][400];
        vg_plot_name(ids, t->cur->n_suites, k, base, sizeof base);
        const char *ext[2] = {"svg", "png"};
        for (int e = 0; e < 2; e++) {
            snprintf(tmpname[e], sizeof tmpname[e], ".%s.%s.tmp-%ld", base, ext[e], (long)getpid());
            snprintf(tmp[e], sizeof tmp[e], "%s/%s", dir, tmpname[e]);
            snprintf(fin[e], sizeof fin[e], "%s/%s.%s", dir, base, ext[e]);
        }
        const char *names[3] = {tmpname[0], tmpname[1], NULL};
        /* An interrupt removes the temporary files (the folder stays
         * unless it is empty). */
        vg_cli_set_cleanup(dir, names);
        if (plot_suite(t, k, tmp[0], tmp[1], &err) != VG_OK) {
            vg_cli_error(&err);
            rc = -1;
        } else {
            for (int e = 0; e < 2 && rc == 0; e++)
                if (rename(tmp[e], fin[e]) != 0) {
                    vg_cli_fail("%s: cannot rename the plot into place: %s", fin[e], strerror(errno));
                    rc = -1;
                }
        }
        unlink(tmp[0]);
        unlink(tmp[1]);
        vg_cli_set_cleanup(NULL, NULL);
    }
    free(ids);
    return rc;
}

static vg_status f_comparison(void *ctx, FILE *fp, const char *path, vg_error *err) {
    return vg_report_comparison_csv(((track *)ctx)->cmp, fp, path, err);
}

static vg_status f_summary(void *ctx, FILE *fp, const char *path, vg_error *err) {
    const track *t = ctx;
    fputs("# vecgauge track\n\n", fp);
    fprintf(fp, "Step %llu (`%s`, vector set %s) added to the history `%s`, which now holds "
                "%zu line%s.\n\n",
            (unsigned long long)t->step, t->cur->dir, t->label, t->history,
            t->n_rows, t->n_rows == 1 ? "" : "s");
    size_t n_reg = 0;
    for (size_t k = 0; t->regressed && k < t->cur->n_suites; k++) n_reg += t->regressed[k];
    if (!t->cmp) {
        fputs("The first run in the history: nothing to compare with yet.\n\n", fp);
    } else if (n_reg) {
        fputs("**Significant regression** (after Holm's adjustment) on:", fp);
        for (size_t k = 0, i = 0; k < t->cur->n_suites; k++)
            if (t->regressed[k]) fprintf(fp, "%s %s", i++ ? "," : "", t->cur->suites[k].id);
        fputs(".\n\n", fp);
    } else {
        fputs("No suite is significantly worse than the previous run or than the best "
              "earlier run.\n\n",
              fp);
    }
    if (t->cmp) {
        vg_status st = vg_report_comparison_md(t->cmp, fp, path, err);
        if (st != VG_OK) return st;
    }
    if (t->prov && t->prov->command_line) fprintf(fp, "## Provenance\n\n- command: `%s`\n- at: %s\n\n",
                                                  t->prov->command_line, t->prov->utc_time);
    if (ferror(fp)) return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}

static vg_status report_plots(vg_rundir *rd, void *ctx, vg_error *err) {
    const track *t = ctx;
    const char *dir = vg_rundir_file(rd, "plots");
    if (!dir || mkdir(dir, 0777) != 0)
        return vg_error_set(err, VG_EIO, dir ? dir : "plots", 0, "cannot create the plots folder");
    const char **ids = calloc(t->cur->n_suites + 1, sizeof *ids);
    if (!ids) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    for (size_t k = 0; k < t->cur->n_suites; k++) ids[k] = t->cur->suites[k].id;
    vg_status st = VG_OK;
    for (size_t k = 0; k < t->cur->n_suites && st == VG_OK; k++) {
        char base[300], name[320];
        vg_plot_name(ids, t->cur->n_suites, k, base, sizeof base);
        snprintf(name, sizeof name, "plots/%s.svg", base);
        char *svg = strdup(vg_rundir_file(rd, name));
        snprintf(name, sizeof name, "plots/%s.png", base);
        char *png = strdup(vg_rundir_file(rd, name));
        st = svg && png ? plot_suite(t, k, svg, png, err)
                        : vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
        free(svg);
        free(png);
    }
    free(ids);
    return st;
}

/* ---- the command -------------------------------------------------------- */

int vg_cmd_track(int argc, char **argv) {
    vg_cli_stats so;
    vg_cli_stats_init(&so);
    vg_compare_options o;
    const char *history = NULL, *vectors = NULL, *plots = NULL, *out = NULL;
    int fail_on_reg = 0, no_plots = 0, have_step = 0;
    uint64_t step = 0;
    optind = 1;
    opterr = 0;
    int c;
    while ((c = getopt_long(argc, argv, ":o:j:h", long_opts, NULL)) != -1) {
        int urc, handled = vg_cli_stats_option("track", c, optarg, &so, &urc);
        if (handled < 0) return urc;
        if (handled) continue;
        switch (c) {
        case OPT_HISTORY: history = optarg; break;
        case OPT_STEP:
            if (vg_cli_parse_u64(optarg, 0, UINT64_MAX / 2, &step) != 0)
                return vg_cli_usage_error("track", "--step needs a whole number, got '%s'", optarg);
            have_step = 1;
            break;
        case OPT_VECTORS: vectors = optarg; break;
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
    o = so.cmp;
    if (!history) return vg_cli_usage_error("track", "--history FILE is required");
    if (argc - optind != 1)
        return vg_cli_usage_error("track", "expected one run directory, got %d", argc - optind);

    track t;
    memset(&t, 0, sizeof t);
    t.history = history;
    int rc = VG_EXIT_FAIL;
    vg_error err;
    vg_error_clear(&err);
    char *hist_folder = NULL, *hist_real = NULL, *run_real = NULL, *plot_dir = NULL;
    char *cmdline = NULL;
    vg_history_row *mine = NULL;
    size_t *sets_at = NULL, *pairs = NULL;
    unsigned char *pair_suites = NULL;
    vg_paired_items *items = NULL;
    char iso[32], stamp[32];
    vg_cli_utc_now(iso, stamp);

    if (vg_saved_run_load(argv[optind], &t.cur, &err) != VG_OK) {
        vg_cli_error(&err);
        goto done;
    }
    if (vectors) {
        long s = -1;
        for (size_t j = 0; j < t.cur->n_sets; j++)
            if (strcmp(t.cur->labels[j], vectors) == 0) s = (long)j;
        if (s < 0) {
            rc = vg_cli_usage_error("track", "%s holds no vector set '%s'", t.cur->dir, vectors);
            goto done;
        }
        t.cur_set = (size_t)s;
    } else if (t.cur->n_sets > 1) {
        rc = vg_cli_usage_error("track", "%s holds %zu vector sets; name the one to track with "
                                "--vectors LABEL", t.cur->dir, t.cur->n_sets);
        goto done;
    }
    /* The run as the history records it: relative to the history's folder. */
    hist_folder = folder_of(history);
    if (!hist_folder || !(hist_real = realpath(hist_folder, NULL)) ||
        !(run_real = realpath(t.cur->dir, NULL))) {
        vg_cli_fail("%s: %s", hist_real ? t.cur->dir : hist_folder ? hist_folder : history,
                    strerror(errno));
        goto done;
    }
    if (!(t.recorded = relative_to(hist_real, run_real))) {
        vg_cli_fail("out of memory");
        goto done;
    }

    /* Under the lock: read, pick the references, load them, append. */
    if (vg_history_open(history, &t.h, &err) != VG_OK) {
        vg_cli_error(&err);
        goto done;
    }
    /* Test hook (as in run_output.c): VECGAUGE_TEST_SLOW_WRITE=1 holds the
     * lock 200 ms, so that tests can check that concurrent tracks wait. */
    const char *slow = getenv("VECGAUGE_TEST_SLOW_WRITE");
    if (slow && *slow == '1') usleep(200000);
    if (!have_step) {
        step = 0;
        for (size_t i = 0; i < t.h->n_rows; i++)
            if (t.h->rows[i].step > step) step = t.h->rows[i].step;
        step += 1;
    }
    t.step = step;
    sets_at = calloc(t.cur->n_suites + 2, sizeof *sets_at);
    mine = calloc(t.cur->n_suites + 1, sizeof *mine);
    if (!sets_at || !mine || pick_refs(&t) != 0) {
        vg_cli_fail("out of memory");
        goto done;
    }
    if (!(t.label = strdup(t.cur->labels[t.cur_set]))) {
        vg_cli_fail("out of memory");
        goto done;
    }
    size_t *ns_at = realloc(sets_at, (t.n_refs + 1) * sizeof *sets_at);
    if (!ns_at) {
        vg_cli_fail("out of memory");
        goto done;
    }
    sets_at = ns_at;
    /* Distinct runs before this one, for the report. */
    size_t runs_before = 0;
    for (size_t i = 0; i < t.h->n_rows; i++) {
        int seen = 0;
        for (size_t j = 0; j < i && !seen; j++)
            seen = t.h->rows[j].step == t.h->rows[i].step &&
                   same_run(t.h->rows[j].run, t.h->rows[j].vectors, t.h->rows[i].run,
                            t.h->rows[i].vectors);
        runs_before += !seen;
    }
    if (load_refs(&t, hist_folder, sets_at) != 0) goto done;
    for (size_t k = 0; k < t.cur->n_suites; k++) {
        const vg_saved_score *sc = &t.cur->scores[t.cur_set * t.cur->n_suites + k];
        mine[k] = (vg_history_row){.step = step, .run = t.recorded,
                                   .vectors = t.label,
                                   .suite = t.cur->suites[k].id, .task = t.cur->suites[k].task,
                                   .metric = sc->metric, .value = sc->value, .low = sc->low,
                                   .high = sc->high, .interval = sc->interval,
                                   .n_items = sc->n_items, .n_used = sc->n_used, .recorded = iso};
    }
    if (vg_history_append(t.h, mine, t.cur->n_suites, &err) != VG_OK ||
        snapshot(&t, mine, t.cur->n_suites) != 0) {
        if (err.code)
            vg_cli_error(&err);
        else
            vg_cli_fail("out of memory");
        goto done;
    }
    vg_history_close(t.h);
    t.h = NULL;

    /* Compare: (this run, previous) on every suite, (this run, best) on
     * the suites where that run is the best and not the previous one. */
    if (t.n_refs > 0) {
        if (!so.have_seed) o.seed = t.cur->seed;
        if (!so.have_boot) o.replicates = t.cur->bootstrap;
        if (!so.have_ci) o.level = t.cur->level;
        if (vg_saved_runs_pair((const vg_saved_run *const *)t.runs, t.n_refs + 1, 0, &items, &err) !=
            VG_OK) {
            vg_cli_error(&err);
            goto done;
        }
        size_t ns = items->n_suites;
        pairs = calloc(2 * t.n_refs, sizeof *pairs);
        pair_suites = calloc(t.n_refs * (ns ? ns : 1), 1);
        if (!pairs || !pair_suites) {
            vg_cli_fail("out of memory");
            goto done;
        }
        for (size_t i = 0; i < t.n_refs; i++) {
            pairs[2 * i] = set_index(&t, sets_at, 0);
            pairs[2 * i + 1] = set_index(&t, sets_at, i + 1);
            for (size_t k = 0; k < ns; k++) {
                long ck = -1;
                for (size_t j = 0; j < t.cur->n_suites; j++)
                    if (strcmp(t.cur->suites[j].id, items->suites[k].id) == 0) ck = (long)j;
                pair_suites[i * ns + k] = t.refs[i].prev || (ck >= 0 && t.best_of[ck] == (long)i);
            }
        }
        o.pairs = pairs;
        o.n_pairs = t.n_refs;
        o.pair_suites = pair_suites;
        if (vg_compare(items, &o, &t.cmp, &err) != VG_OK) {
            vg_cli_error(&err);
            goto done;
        }
        t.regressed = calloc(t.cur->n_suites + 1, 1);
        if (!t.regressed) {
            vg_cli_fail("out of memory");
            goto done;
        }
        for (size_t r = 0; r < t.cmp->n_rows; r++) {
            const vg_comparison *row = &t.cmp->rows[r];
            if (!row->significant || !(row->diff < 0)) continue;
            for (size_t j = 0; j < t.cur->n_suites; j++)
                if (strcmp(t.cur->suites[j].id, t.cmp->suite_ids[row->suite]) == 0) t.regressed[j] = 1;
        }
    }

    /* Report. */
    printf("track: step %llu (%s, %s) appended to %s (%zu run%s before it)\n",
           (unsigned long long)step, t.cur->dir, t.label, history, runs_before,
           runs_before == 1 ? "" : "s");
    size_t n_reg = 0;
    if (t.cmp) {
        if (vg_report_comparison_text(t.cmp, stdout, &err) != VG_OK) {
            vg_cli_error(&err);
            goto done;
        }
        for (size_t k = 0; k < t.cur->n_suites; k++) n_reg += t.regressed[k];
        if (n_reg) {
            printf("regression: significantly worse (Holm, alpha %g) on", o.alpha);
            for (size_t k = 0, i = 0; k < t.cur->n_suites; k++)
                if (t.regressed[k]) printf("%s %s", i++ ? "," : "", t.cur->suites[k].id);
            putchar('\n');
        } else {
            printf("no significant regression (Holm, alpha %g)\n", o.alpha);
        }
    } else {
        printf("the first run in the history: nothing to compare with yet\n");
    }
    fflush(stdout);

    if (!no_plots) {
        if (!plots) {
            size_t n = strlen(history);
            if (n > 4 && strcmp(history + n - 4, ".csv") == 0) n -= 4;
            plot_dir = malloc(n + 8);
            if (!plot_dir) goto done;
            snprintf(plot_dir, n + 8, "%.*s-plots", (int)n, history);
            plots = plot_dir;
        }
        if (write_history_plots(&t, plots) != 0) goto done;
    }
    if (out) {
        cmdline = vg_cli_command_line(vg_cli_argc, vg_cli_argv);
        vg_provenance prov = {.tool_version = vg_version(), .git_describe = vg_cli_git_describe,
                              .utc_time = iso, .command_line = cmdline};
        t.prov = &prov;
        const vg_cli_file files[] = {{"comparison.csv", f_comparison, &t},
                                     {"summary.md", f_summary, &t}};
        size_t nf = t.cmp ? 2 : 1;
        const vg_cli_file *fl = t.cmp ? files : files + 1;
        /* The plot names for the signal handler. */
        char **names = calloc(2 * t.cur->n_suites + 2, sizeof *names);
        const char **ids = calloc(t.cur->n_suites + 1, sizeof *ids);
        if (!names || !ids) {
            free(names);
            free(ids);
            vg_cli_fail("out of memory");
            goto done;
        }
        for (size_t k = 0; k < t.cur->n_suites; k++) ids[k] = t.cur->suites[k].id;
        size_t nn = 0;
        for (size_t k = 0; k < t.cur->n_suites; k++) {
            char base[300], nm[320];
            vg_plot_name(ids, t.cur->n_suites, k, base, sizeof base);
            snprintf(nm, sizeof nm, "plots/%s.svg", base);
            names[nn++] = strdup(nm);
            snprintf(nm, sizeof nm, "plots/%s.png", base);
            names[nn++] = strdup(nm);
        }
        names[nn++] = strdup("plots");
        free(ids);
        int bad = 0;
        for (size_t i = 0; i < nn; i++) bad |= names[i] == NULL;
        int wrc = bad ? VG_EXIT_FAIL
                      : vg_cli_write_dir(out, fl, nf, names, report_plots, &t);
        for (size_t i = 0; i < nn; i++) free(names[i]);
        free(names);
        if (wrc != VG_EXIT_OK) goto done;
        fprintf(stderr, "%s: track report: %s\n", vg_cli_progname, out);
    }
    rc = n_reg && fail_on_reg ? VG_EXIT_REGRESSION : VG_EXIT_OK;
done:
    vg_history_close(t.h);
    vg_comparisons_free(t.cmp);
    vg_paired_items_free(items);
    for (size_t i = 1; t.runs && i <= t.n_refs; i++) vg_saved_run_free(t.runs[i]);
    free(t.runs);
    vg_saved_run_free(t.cur);
    for (size_t i = 0; i < t.n_rows; i++) {
        free(t.rows[i].suite);
        free(t.rows[i].metric);
        free(t.rows[i].run);
        free(t.rows[i].vectors);
    }
    free(t.rows);
    for (size_t i = 0; i < t.n_refs; i++) {
        free(t.refs[i].run);
        free(t.refs[i].vectors);
    }
    free(t.refs);
    free(t.label);
    free(t.best_of);
    free(t.regressed);
    free(t.recorded);
    free(mine);
    free(sets_at);
    free(pairs);
    free(pair_suites);
    free(hist_folder);
    free(hist_real);
    free(run_real);
    free(plot_dir);
    free(cmdline);
    return rc;
}
