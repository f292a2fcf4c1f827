/* plot_compare.c - the interval plot of one suite: every set's score on the
 * compared items with its interval.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Sets are rows (best on top), scores run along the x axis, so long labels
 * have room on the left and the numbers their own column on the right:
 * nothing is drawn over anything else.
 */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "../common/alloc.h"
#include "plot_impl.h"
#include "vecgauge/compare.h"

#define W 860.0
#define ROW_H 34.0
#define TOP 74.0
#define AXIS_H 46.0
#define LEGEND_H 44.0
#define MAX_ROWS 64

typedef struct cmp_plot {
    const vg_comparisons *c;
    size_t suite;
    const char *metric;
    size_t order[MAX_ROWS];     /* sets, best first */
    size_t n;
    int mark[MAX_ROWS];         /* 0 best, 1 not significantly below it, 2 below, 3 untested */
} cmp_plot;

static const char *metric_title(const char *metric) {
    if (strcmp(metric, "spearman") == 0) return "Spearman's rho";
    if (strcmp(metric, "3cosadd") == 0) return "accuracy (3CosAdd)";
    if (strcmp(metric, "3cosmul") == 0) return "accuracy (3CosMul)";
    if (strcmp(metric, "pairdir") == 0) return "accuracy (PairDirection)";
    if (strcmp(metric, "only_b") == 0) return "accuracy (only-b)";
    return metric;
}

/* The row comparing sets a and b on the plot's suite and metric. */
static const vg_comparison *find_row(const cmp_plot *P, size_t a, size_t b) {
    for (size_t i = 0; i < P->c->n_rows; i++) {
        const vg_comparison *r = &P->c->rows[i];
        if (r->suite == P->suite && strcmp(r->metric, P->metric) == 0 &&
            ((r->set_a == a && r->set_b == b) || (r->set_a == b && r->set_b == a)))
            return r;
    }
    return NULL;
}

static void draw(cairo_t *cr, void *ctx, double width, double height) {
    cmp_plot *P = ctx;
    const vg_comparisons *c = P->c;
    char buf[512];
    const vg_compared_score *first = vg_comparisons_score(c, P->suite, P->metric, P->order[0]);

    /* Title and how the items were chosen. */
    vg_plot_color(cr, vg_plot_ink);
    vg_plot_font(cr, 17, 1);
    snprintf(buf, sizeof buf, "%s: %s", c->suite_ids[P->suite], metric_title(P->metric));
    char fit[512];
    vg_plot_text(cr, 24, 16, vg_plot_fit(cr, buf, width - 48, fit, sizeof fit), -1, -1);
    vg_plot_font(cr, 12, 0);
    const char *unit = c->tasks[P->suite] == VG_TASK_SIMILARITY ? "pairs" : "questions";
    const vg_comparison *any = find_row(P, P->order[0], P->order[P->n > 1 ? 1 : 0]);
    if (c->options.items == VG_COMPARE_AS_IS)
        snprintf(buf, sizeof buf, "each set on the %s it covers (--no-common)", unit);
    else
        snprintf(buf, sizeof buf, "on the %zu %s every set covers (%zu of %zu dropped)",
                 first ? first->n : 0, unit, any ? any->n_dropped : 0, c->n_items[P->suite]);
    size_t len = strlen(buf);
    if (first && *first->interval)
        snprintf(buf + len, sizeof buf - len, "; %g%% %s bootstrap intervals",
                 100 * c->options.level, strcmp(first->interval, "bca") == 0 ? "BCa" : "percentile");
    vg_plot_color(cr, (vg_rgb){0.35, 0.35, 0.40});
    vg_plot_text(cr, 24, 42, vg_plot_fit(cr, buf, width - 48, fit, sizeof fit), -1, -1);

    /* Geometry: labels on the left, numbers on the right. */
    /* Measured in bold, the widest the best set's label is drawn. */
    vg_plot_font(cr, 13, 1);
    double label_w = 0;
    for (size_t i = 0; i < P->n; i++)
        label_w = fmax(label_w, vg_plot_text_width(cr, c->labels[P->order[i]]));
    label_w = fmin(label_w, 230);
    double x0 = 24 + label_w + 16, x1 = width - 24 - 170;
    double y0 = TOP, y1 = TOP + ROW_H * (double)P->n;

    double lo = INFINITY, hi = -INFINITY;
    for (size_t i = 0; i < P->n; i++) {
        const vg_compared_score *s = vg_comparisons_score(c, P->suite, P->metric, P->order[i]);
        if (!s) continue;
        const double v[3] = {s->value, s->low, s->high};
        for (int q = 0; q < 3; q++)
            if (isfinite(v[q])) {
                lo = fmin(lo, v[q]);
                hi = fmax(hi, v[q]);
            }
    }
    if (!isfinite(lo)) lo = 0, hi = 1;
    double pad = (hi - lo) * 0.08 + 1e-3;
    lo -= pad;
    hi += pad;
    double ticks[32], step;
    size_t nt = vg_plot_ticks(lo, hi, 6, 0, ticks, 32, &step);
    if (nt > 0) {
        lo = fmin(lo, ticks[0]);
        hi = fmax(hi, ticks[nt - 1]);
    }
#define XS(v) (x0 + ((v) - lo) / (hi - lo) * (x1 - x0))

    /* Grid and axis. */
    cairo_set_line_width(cr, 1);
    vg_plot_font(cr, 11, 0);
    for (size_t t = 0; t < nt; t++) {
        double x = floor(XS(ticks[t])) + 0.5;
        vg_plot_color(cr, vg_plot_grid);
        cairo_move_to(cr, x, y0 - 6);
        cairo_line_to(cr, x, y1 + 4);
        cairo_stroke(cr);
        vg_plot_color(cr, vg_plot_ink);
        char tl[32];
        vg_plot_text(cr, x, y1 + 10, vg_plot_tick_label(ticks[t], step, tl), 0, -1);
    }
    vg_plot_color(cr, vg_plot_ink);
    cairo_move_to(cr, x0, floor(y1 + 4) + 0.5);
    cairo_line_to(cr, x1, floor(y1 + 4) + 0.5);
    cairo_stroke(cr);
    vg_plot_font(cr, 12, 0);
    vg_plot_text(cr, (x0 + x1) / 2, y1 + 30, metric_title(P->metric), 0, -1);

    /* One row per set. */
    for (size_t i = 0; i < P->n; i++) {
        size_t set = P->order[i];
        const vg_compared_score *s = vg_comparisons_score(c, P->suite, P->metric, set);
        double y = y0 + ROW_H * ((double)i + 0.5);
        if (i % 2 == 1) {
            cairo_set_source_rgb(cr, 0.97, 0.97, 0.98);
            cairo_rectangle(cr, x0, y - ROW_H / 2, x1 - x0, ROW_H);
            cairo_fill(cr);
        }
        vg_plot_color(cr, vg_plot_ink);
        vg_plot_font(cr, 13, P->mark[i] == 0);
        vg_plot_text(cr, x0 - 12, y, vg_plot_fit(cr, c->labels[set], label_w, fit, sizeof fit), 1, 0);
        if (!s || isnan(s->value)) continue;
        vg_rgb col = P->mark[i] == 0   ? vg_plot_blue
                     : P->mark[i] == 2 ? vg_plot_orange
                                       : vg_plot_light_blue;
        if (isfinite(s->low) && isfinite(s->high)) {
            vg_plot_color(cr, col);
            cairo_set_line_width(cr, 2.5);
            cairo_move_to(cr, XS(s->low), y);
            cairo_line_to(cr, XS(s->high), y);
            cairo_stroke(cr);
            cairo_set_line_width(cr, 1.5);
            for (int e = 0; e < 2; e++) {
                double x = XS(e ? s->high : s->low);
                cairo_move_to(cr, x, y - 6);
                cairo_line_to(cr, x, y + 6);
                cairo_stroke(cr);
            }
        }
        vg_plot_dot(cr, XS(s->value), y, 6, col, P->mark[i] == 2);
        char num[96];
        if (isfinite(s->low))
            snprintf(num, sizeof num, "%.3f  [%.3f, %.3f]", s->value, s->low, s->high);
        else
            snprintf(num, sizeof num, "%.3f", s->value);
        vg_plot_color(cr, vg_plot_ink);
        vg_plot_font(cr, 12, P->mark[i] == 0);
        vg_plot_text(cr, x1 + 14, y, num, -1, 0);
    }

    /* Legend, below the axis. */
    double ly = height - LEGEND_H / 2 - 4, lx = 24;
    vg_plot_font(cr, 12, 0);
    const struct {
        vg_rgb col;
        int hollow;
        const char *text;
    } items[] = {{vg_plot_blue, 0, "best set"},
                 {vg_plot_light_blue, 0, "not significantly below the best"},
                 {vg_plot_orange, 1, "significantly below the best (Holm)"}};
    for (size_t q = 0; q < 3; q++) {
        vg_plot_dot(cr, lx + 6, ly, 6, items[q].col, items[q].hollow);
        vg_plot_color(cr, vg_plot_ink);
        vg_plot_text(cr, lx + 18, ly, items[q].text, -1, 0);
        lx += 18 + vg_plot_text_width(cr, items[q].text) + 22;
    }
    vg_plot_color(cr, vg_plot_ink);
    cairo_set_line_width(cr, 2.5);
    cairo_move_to(cr, lx, ly);
    cairo_line_to(cr, lx + 24, ly);
    cairo_stroke(cr);
    snprintf(buf, sizeof buf, "%g%% interval", 100 * c->options.level);
    vg_plot_text(cr, lx + 30, ly, buf, -1, 0);
#undef XS
}

vg_status vg_plot_comparison(const vg_comparisons *c, size_t suite, const char *svg_path,
                             const char *png_path, vg_error *err) {
    cmp_plot P;
    memset(&P, 0, sizeof P);
    P.c = c;
    P.suite = suite;
    for (size_t i = 0; i < c->n_scores && !P.metric; i++)
        if (c->scores[i].suite == suite) P.metric = c->scores[i].metric;
    if (!P.metric) return VG_OK; /* nothing compared on this suite */
    for (size_t s = 0; s < c->n_sets && P.n < MAX_ROWS; s++)
        if (vg_comparisons_score(c, suite, P.metric, s)) P.order[P.n++] = s;
    /* Best first (undefined scores last), ties in input order. */
    for (size_t i = 1; i < P.n; i++) {
        size_t x = P.order[i], j = i;
        double vx = vg_comparisons_score(c, suite, P.metric, x)->value;
        while (j > 0) {
            double vy = vg_comparisons_score(c, suite, P.metric, P.order[j - 1])->value;
            int before = !isnan(vx) && (isnan(vy) || vx > vy);
            if (!before) break;
            P.order[j] = P.order[j - 1];
            j--;
        }
        P.order[j] = x;
    }
    for (size_t i = 1; i < P.n; i++) {
        const vg_comparison *r = find_row(&P, P.order[0], P.order[i]);
        P.mark[i] = !r || isnan(r->p_holm) ? 3 : r->significant ? 2 : 1;
    }
    double height = TOP + ROW_H * (double)P.n + AXIS_H + LEGEND_H;
    return vg_plot_write(draw, &P, W, height, svg_path, png_path, err);
}
