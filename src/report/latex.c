/* latex.c - table.tex: the headline scores as a booktabs table.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * A bare tabular, ready to \input inside the reader's own table
 * environment (caption and label are theirs to choose); it needs
 * \usepackage{booktabs}. Similarity cells show Spearman's rho, analogy
 * cells accuracy in percent, each with its headline interval; the best
 * set per row is bold.
 */
#include <math.h>
#include <string.h>

#include "report_impl.h"
#include "vecgauge/report.h"

void vg_tex_text(FILE *fp, const char *s) {
    for (; *s; s++) {
        switch (*s) {
        case '\\': fputs("\\textbackslash{}", fp); break;
        case '{': case '}': case '_': case '%': case '&': case '#': case '$':
            fputc('\\', fp);
            fputc(*s, fp);
            break;
        case '~': fputs("\\textasciitilde{}", fp); break;
        case '^': fputs("\\textasciicircum{}", fp); break;
        case '\n': case '\r': fputc(' ', fp); break;
        default: fputc(*s, fp);
        }
    }
}

/* One row: a suite (and metric), one cell per set. scale 100 prints
 * percentages. */
static void tex_row(FILE *fp, const vg_results *r, size_t k, vg_metric m, const char *what,
                    double scale, int digits) {
    const vg_suite *s = r->suites[k];
    size_t best = (size_t)-1;
    double bv = -INFINITY;
    for (size_t i = 0; i < r->n_sets; i++) {
        const vg_score_row *row = vg_results_find(r, i, k, "", m, 0);
        if (row && !isnan(row->value) && row->value > bv) {
            bv = row->value;
            best = i;
        }
    }
    vg_tex_text(fp, s->id);
    if (what) {
        fputs(" (", fp);
        fputs(what, fp);
        fputc(')', fp);
    }
    fprintf(fp, " & %zu", s->n_items);
    for (size_t i = 0; i < r->n_sets; i++) {
        const vg_score_row *row = vg_results_find(r, i, k, "", m, 0);
        fputs(" & ", fp);
        if (!row || isnan(row->value)) {
            fputs("--", fp);
            continue;
        }
        int bold = i == best || (row->value == bv);
        fprintf(fp, "%s%.*f%s", bold ? "\\textbf{" : "", digits, scale * row->value,
                bold ? "}" : "");
        if (row->n_ci > 0 && !isnan(row->ci[0].low))
            fprintf(fp, " {\\small[%.*f, %.*f]}", digits, scale * row->ci[0].low, digits,
                    scale * row->ci[0].high);
    }
    fputs(" \\\\\n", fp);
}

static int has_task(const vg_results *r, vg_task t) {
    for (size_t k = 0; k < r->n_suites; k++)
        if (r->suites[k]->task == t) return 1;
    return 0;
}

/* The interval method of the first row that has one, for the heading. */
static const char *interval_name(const vg_results *r, vg_task t) {
    for (size_t i = 0; i < r->n_rows; i++)
        if (r->rows[i].task == t && r->rows[i].n_ci > 0) return r->rows[i].ci[0].method;
    return NULL;
}

static void heading(FILE *fp, const vg_results *r, vg_task t, const char *text) {
    const char *iv = interval_name(r, t);
    fprintf(fp, "\\multicolumn{%zu}{l}{\\emph{%s", r->n_sets + 2, text);
    if (iv) {
        fprintf(fp, ", %g\\%% ", 100 * r->options.ci);
        vg_tex_text(fp, iv);
        fputs(" interval", fp);
    }
    fputs("}} \\\\\n", fp);
}

vg_status vg_report_table_tex(const vg_results *r, const vg_provenance *prov, FILE *fp,
                              const char *path, vg_error *err) {
    fputs("% Headline scores written by vecgauge", fp);
    if (prov && prov->tool_version) fprintf(fp, " %s", prov->tool_version);
    if (prov && prov->utc_time) fprintf(fp, " at %s", prov->utc_time);
    fputs(".\n% Needs \\usepackage{booktabs}; \\input it inside a table environment.\n", fp);
    fputs("\\begin{tabular}{lr", fp);
    for (size_t i = 0; i < r->n_sets; i++) fputc('r', fp);
    fputs("}\n\\toprule\nSuite & Items", fp);
    for (size_t i = 0; i < r->n_sets; i++) {
        fputs(" & ", fp);
        vg_tex_text(fp, r->labels[i]);
    }
    fputs(" \\\\\n", fp);
    if (has_task(r, VG_TASK_SIMILARITY)) {
        fputs("\\midrule\n", fp);
        heading(fp, r, VG_TASK_SIMILARITY, "Similarity: Spearman's $\\rho$");
        for (size_t k = 0; k < r->n_suites; k++)
            if (r->suites[k]->task == VG_TASK_SIMILARITY)
                tex_row(fp, r, k, VG_METRIC_SPEARMAN, NULL, 1, 3);
    }
    if (has_task(r, VG_TASK_ANALOGY)) {
        fputs("\\midrule\n", fp);
        heading(fp, r, VG_TASK_ANALOGY, "Analogy: accuracy (\\%)");
        for (size_t k = 0; k < r->n_suites; k++) {
            if (r->suites[k]->task != VG_TASK_ANALOGY) continue;
            tex_row(fp, r, k, VG_METRIC_3COSADD, "3CosAdd", 100, 1);
            tex_row(fp, r, k, VG_METRIC_3COSMUL, "3CosMul", 100, 1);
        }
    }
    fputs("\\bottomrule\n\\end{tabular}\n", fp);
    if (ferror(fp)) return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}
