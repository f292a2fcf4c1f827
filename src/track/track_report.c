/* track_report.c - what tracking a run shows: the text on stdout, the
 * plots beside the history, and a report directory.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <errno.h>
#include <limits.h>
#include <stdio.h>
#include <string.h>
#include <sys/stat.h>
#include <unistd.h>

#include "../common/alloc.h"
#include "../rundir/rundir_impl.h"
#include "track_impl.h"

/* " a, b, c": the regressed suites' ids, each after sep. */
static void regressed_list(const vg_track *t, FILE *fp) {
    for (size_t k = 0, i = 0; k < t->cur->n_suites; k++)
        if (t->regressed[k]) fprintf(fp, "%s %s", i++ ? "," : "", t->cur->suites[k].id);
}

vg_status vg_track_report_text(const vg_track *t, FILE *fp, vg_error *err) {
    fprintf(fp, "track: step %llu (%s, %s) appended to %s (%zu run%s before it)\n",
            (unsigned long long)t->step, t->cur->dir, t->label, t->history, t->runs_before,
            t->runs_before == 1 ? "" : "s");
    if (t->cmp) {
        vg_status st = vg_report_comparison_text(t->cmp, fp, err);
        if (st != VG_OK) return st;
        if (vg_track_n_regressed(t)) {
            fprintf(fp, "regression: significantly worse (Holm, alpha %g) on", t->alpha);
            regressed_list(t, fp);
            fputc('\n', fp);
        } else {
            fprintf(fp, "no significant regression (Holm, alpha %g)\n", t->alpha);
        }
    } else {
        fputs("the first run in the history: nothing to compare with yet\n", fp);
    }
    if (ferror(fp)) return vg_error_set(err, VG_EIO, NULL, 0, "write failed");
    return VG_OK;
}

vg_status vg_track_summary_md(const vg_track *t, const vg_provenance *prov, FILE *fp,
                              const char *path, vg_error *err) {
    fputs("# vecgauge track\n\n", fp);
    fprintf(fp, "Step %llu (`%s`, vector set %s) added to the history `%s`, which now holds "
                "%zu line%s.\n\n",
            (unsigned long long)t->step, t->cur->dir, t->label, t->history, t->n_rows,
            t->n_rows == 1 ? "" : "s");
    if (!t->cmp) {
        fputs("The first run in the history: nothing to compare with yet.\n\n", fp);
    } else if (vg_track_n_regressed(t)) {
        fputs("**Significant regression** (after Holm's adjustment) on:", fp);
        regressed_list(t, fp);
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
    if (prov && prov->command_line)
        fprintf(fp, "## Provenance\n\n- command: `%s`\n- at: %s\n\n", prov->command_line,
                prov->utc_time);
    if (ferror(fp)) return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}

/* Suite k's curve to svg and png (paths): every history row of the suite
 * on its headline metric, this run's marked, the best earlier run's
 * marked. */
static vg_status plot_suite(const vg_track *t, size_t k, const char *svg, const char *png,
                            vg_error *err) {
    const vg_saved_suite *s = &t->cur->suites[k];
    const char *metric = vg_track_headline(s->task);
    vg_track_point *p = vg_calloc(t->n_rows + 1, sizeof *p);
    if (!p) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    size_t n = 0;
    const vg_track_ref *best = t->sel.best_of[k] >= 0 ? &t->sel.refs[t->sel.best_of[k]] : NULL;
    for (size_t i = 0; i < t->n_rows; i++) {
        const vg_track_row *r = &t->rows[i];
        if (strcmp(r->suite, s->id) != 0 || strcmp(r->metric, metric) != 0) continue;
        int cur = i >= t->n_before;
        p[n++] = (vg_track_point){r->step, r->value, r->low, r->high, cur,
                                  best && strcmp(r->run, best->run) == 0 &&
                                      strcmp(r->vectors, best->vectors) == 0,
                                  cur && t->regressed[k]};
    }
    vg_status st = vg_plot_track(s->id, metric,
                                 s->task == VG_TASK_SIMILARITY ? "Spearman's rho"
                                                               : "3CosAdd accuracy",
                                 p, n, svg, png, err);
    vg_free(p);
    return st;
}

/* The suite ids of the tracked run (a new array, vg_free). */
static const char **suite_ids(const vg_track *t) {
    const char **ids = vg_calloc(t->cur->n_suites + 1, sizeof *ids);
    for (size_t k = 0; ids && k < t->cur->n_suites; k++) ids[k] = t->cur->suites[k].id;
    return ids;
}

vg_status vg_track_write_plots(const vg_track *t, const char *dir, vg_error *err) {
    if (mkdir(dir, 0777) != 0 && errno != EEXIST)
        return vg_error_set(err, VG_EIO, dir, 0, "cannot create the plots folder");
    const char **ids = suite_ids(t);
    if (!ids) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    vg_status st = VG_OK;
    for (size_t k = 0; k < t->cur->n_suites && st == VG_OK; k++) {
        char base[300], tmp[2][PATH_MAX], fin[2][PATH_MAX], tmpname[2][400];
        vg_plot_name(ids, t->cur->n_suites, k, base, sizeof base);
        const char *ext[2] = {"svg", "png"};
        for (int e = 0; e < 2; e++) {
            snprintf(tmpname[e], sizeof tmpname[e], ".%s.%s.tmp-%ld", base, ext[e], (long)getpid());
            snprintf(tmp[e], sizeof tmp[e], "%s/%s", dir, tmpname[e]);
            snprintf(fin[e], sizeof fin[e], "%s/%s.%s", dir, base, ext[e]);
        }
        const char *names[3] = {tmpname[0], tmpname[1], NULL};
        /* A handled signal removes the temporary files (the folder stays
         * unless it is empty). */
        vg_cleanup_set(dir, names);
        st = plot_suite(t, k, tmp[0], tmp[1], err);
        for (int e = 0; e < 2 && st == VG_OK; e++)
            if (rename(tmp[e], fin[e]) != 0)
                st = vg_error_set(err, VG_EIO, fin[e], 0, "cannot rename the plot into place");
        unlink(tmp[0]);
        unlink(tmp[1]);
        vg_cleanup_set(NULL, NULL);
    }
    vg_free(ids);
    return st;
}

size_t vg_track_plots_dir(const char *history, char *buf, size_t size) {
    size_t n = strlen(history);
    if (n > 4 && strcmp(history + n - 4, ".csv") == 0) n -= 4;
    int len = snprintf(buf, size, "%.*s-plots", (int)n, history);
    return len < 0 ? 0 : (size_t)len;
}

/* ---- the report directory ----------------------------------------------- */

typedef struct report_ctx {
    const vg_track *t;
    const vg_provenance *prov;
    const char **ids;
} report_ctx;

static vg_status f_comparison(void *ctx, FILE *fp, const char *path, vg_error *err) {
    return vg_report_comparison_csv(((report_ctx *)ctx)->t->cmp, fp, path, err);
}

static vg_status f_summary(void *ctx, FILE *fp, const char *path, vg_error *err) {
    const report_ctx *c = ctx;
    return vg_track_summary_md(c->t, c->prov, fp, path, err);
}

static vg_status report_plot(void *ctx, size_t k, const char *svg, const char *png,
                             vg_error *err) {
    return plot_suite(((report_ctx *)ctx)->t, k, svg, png, err);
}

static vg_status report_plots(vg_rundir *rd, void *ctx, vg_error *err) {
    report_ctx *c = ctx;
    return vg_plots_draw(rd, c->ids, c->t->cur->n_suites, report_plot, c, err);
}

vg_status vg_track_write_report(const vg_track *t, const char *dir, const vg_provenance *prov,
                                vg_error *err) {
    report_ctx c = {t, prov, suite_ids(t)};
    char **names = c.ids ? vg_plot_paths(c.ids, t->cur->n_suites) : NULL;
    if (!names) {
        vg_free(c.ids);
        return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    }
    const vg_outdir_file files[] = {{"comparison.csv", f_comparison, &c},
                                    {"summary.md", f_summary, &c}};
    vg_status st = vg_outdir_write(dir, t->cmp ? files : files + 1, t->cmp ? 2 : 1,
                                   (const char *const *)names, report_plots, &c, err);
    vg_plot_paths_free(names);
    vg_free(c.ids);
    return st;
}
