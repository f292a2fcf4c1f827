/* plot_track.c - a suite's score against training step, interval as a band.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "../common/alloc.h"
#include "../report/plot_impl.h"
#include "vecgauge/track.h"

#define W 860.0
#define H 470.0

typedef struct track_plot {
    const char *suite, *metric, *ylabel;
    const vg_track_point *p;   /* sorted by step */
    size_t n;
} track_plot;

static void draw(cairo_t *cr, void *ctx, double width, double height) {
    track_plot *T = ctx;
    char buf[512], fit[512];
    vg_plot_color(cr, vg_plot_ink);
    vg_plot_font(cr, 17, 1);
    snprintf(buf, sizeof buf, "%s: %s by training step", T->suite, T->ylabel);
    vg_plot_text(cr, 24, 16, vg_plot_fit(cr, buf, width - 48, fit, sizeof fit), -1, -1);
    vg_plot_font(cr, 12, 0);
    vg_plot_color(cr, (vg_rgb){0.35, 0.35, 0.40});
    snprintf(buf, sizeof buf, "%zu run%s in the history; band: each run's own interval", T->n,
             T->n == 1 ? "" : "s");
    vg_plot_text(cr, 24, 42, buf, -1, -1);

    double lo = INFINITY, hi = -INFINITY, smin = INFINITY, smax = -INFINITY;
    for (size_t i = 0; i < T->n; i++) {
        const vg_track_point *q = &T->p[i];
        const double v[3] = {q->value, q->low, q->high};
        for (int k = 0; k < 3; k++)
            if (isfinite(v[k])) lo = fmin(lo, v[k]), hi = fmax(hi, v[k]);
        smin = fmin(smin, q->step);
        smax = fmax(smax, q->step);
    }
    if (!isfinite(lo)) lo = 0, hi = 1;
    if (!isfinite(smin)) smin = 0, smax = 1;
    if (smax == smin) smin -= 1, smax += 1;
    double pad = (hi - lo) * 0.08 + 1e-3;
    lo -= pad;
    hi += pad;
    double spad = (smax - smin) * 0.04;
    double xs_lo = smin - spad, xs_hi = smax + spad;

    double yt[32], xt[64], ystep, xstep;
    size_t nyt = vg_plot_ticks(lo, hi, 6, 0, yt, 32, &ystep);
    if (nyt > 0) lo = fmin(lo, yt[0]), hi = fmax(hi, yt[nyt - 1]);
    /* Steps are whole numbers: ticks never closer than 1. */
    size_t nxt = vg_plot_ticks(smin, smax, 8, 1, xt, 64, &xstep);

    vg_plot_font(cr, 11, 0);
    double ylab_w = 0;
    char tl[32];
    for (size_t t = 0; t < nyt; t++)
        ylab_w = fmax(ylab_w, vg_plot_text_width(cr, vg_plot_tick_label(yt[t], ystep, tl)));
    double x0 = 24 + 22 + ylab_w + 10, x1 = width - 28, y0 = 70, y1 = height - 110;
#define XS(v) (x0 + ((v) - xs_lo) / (xs_hi - xs_lo) * (x1 - x0))
#define YS(v) (y1 - ((v) - lo) / (hi - lo) * (y1 - y0))

    cairo_set_line_width(cr, 1);
    for (size_t t = 0; t < nyt; t++) {
        double y = floor(YS(yt[t])) + 0.5;
        vg_plot_color(cr, vg_plot_grid);
        cairo_move_to(cr, x0, y);
        cairo_line_to(cr, x1, y);
        cairo_stroke(cr);
        vg_plot_color(cr, vg_plot_ink);
        vg_plot_text(cr, x0 - 8, y, vg_plot_tick_label(yt[t], ystep, tl), 1, 0);
    }
    for (size_t t = 0; t < nxt; t++) {
        if (xt[t] < xs_lo || xt[t] > xs_hi) continue;
        double x = floor(XS(xt[t])) + 0.5;
        vg_plot_color(cr, vg_plot_ink);
        cairo_move_to(cr, x, y1);
        cairo_line_to(cr, x, y1 + 5);
        cairo_stroke(cr);
        vg_plot_text(cr, x, y1 + 9, vg_plot_tick_label(xt[t], xstep, tl), 0, -1);
    }
    vg_plot_color(cr, vg_plot_ink);
    cairo_rectangle(cr, floor(x0) + 0.5, floor(y0) + 0.5, floor(x1 - x0), floor(y1 - y0));
    cairo_stroke(cr);
    vg_plot_font(cr, 12, 0);
    vg_plot_text(cr, (x0 + x1) / 2, y1 + 28, "training step", 0, -1);
    cairo_save(cr);
    cairo_translate(cr, 24, (y0 + y1) / 2);
    cairo_rotate(cr, -M_PI / 2);
    vg_plot_text(cr, 0, 0, T->ylabel, 0, -1);
    cairo_restore(cr);

    /* The band: runs of consecutive points that have an interval. */
    cairo_save(cr);
    cairo_rectangle(cr, x0, y0, x1 - x0, y1 - y0);
    cairo_clip(cr);
    for (size_t i = 0; i < T->n;) {
        if (!isfinite(T->p[i].low) || !isfinite(T->p[i].high)) {
            i++;
            continue;
        }
        size_t j = i;
        while (j + 1 < T->n && isfinite(T->p[j + 1].low) && isfinite(T->p[j + 1].high)) j++;
        if (j == i) {
            /* A lone interval: a bar. */
            vg_plot_color(cr, vg_plot_band);
            cairo_rectangle(cr, XS(T->p[i].step) - 4, YS(T->p[i].high), 8,
                            YS(T->p[i].low) - YS(T->p[i].high));
            cairo_fill(cr);
        } else {
            cairo_move_to(cr, XS(T->p[i].step), YS(T->p[i].high));
            for (size_t k = i + 1; k <= j; k++) cairo_line_to(cr, XS(T->p[k].step), YS(T->p[k].high));
            for (size_t k = j + 1; k-- > i;) cairo_line_to(cr, XS(T->p[k].step), YS(T->p[k].low));
            cairo_close_path(cr);
            vg_plot_color(cr, vg_plot_band);
            cairo_fill(cr);
        }
        i = j + 1;
    }
    /* The line through the scores. */
    vg_plot_color(cr, vg_plot_blue);
    cairo_set_line_width(cr, 2);
    int pen = 0;
    for (size_t i = 0; i < T->n; i++) {
        if (!isfinite(T->p[i].value)) {
            pen = 0;
            continue;
        }
        if (pen)
            cairo_line_to(cr, XS(T->p[i].step), YS(T->p[i].value));
        else
            cairo_move_to(cr, XS(T->p[i].step), YS(T->p[i].value));
        pen = 1;
    }
    cairo_stroke(cr);
    for (size_t i = 0; i < T->n; i++) {
        const vg_track_point *q = &T->p[i];
        if (!isfinite(q->value)) continue;
        double x = XS(q->step), y = YS(q->value);
        if (q->best) vg_plot_diamond(cr, x, y, 8, vg_plot_orange);
        vg_rgb col = q->regressed ? vg_plot_red : vg_plot_blue;
        if (q->current) {
            cairo_new_sub_path(cr);
            cairo_arc(cr, x, y, 9, 0, 2 * M_PI);
            vg_plot_color(cr, col);
            cairo_set_line_width(cr, 2);
            cairo_stroke(cr);
        }
        if (!q->best) vg_plot_dot(cr, x, y, q->current ? 5.5 : 4.5, col, 0);
    }
    cairo_restore(cr);

    /* Legend, two rows below the axis title. */
    double ly = height - 40, lx = x0;
    vg_plot_font(cr, 12, 0);
    vg_plot_color(cr, vg_plot_band);
    cairo_rectangle(cr, lx, ly - 6, 24, 12);
    cairo_fill(cr);
    vg_plot_color(cr, vg_plot_blue);
    cairo_set_line_width(cr, 2);
    cairo_move_to(cr, lx, ly);
    cairo_line_to(cr, lx + 24, ly);
    cairo_stroke(cr);
    vg_plot_color(cr, vg_plot_ink);
    const char *t1 = "score and its interval";
    vg_plot_text(cr, lx + 30, ly, t1, -1, 0);
    lx += 30 + vg_plot_text_width(cr, t1) + 24;
    cairo_new_sub_path(cr);
    cairo_arc(cr, lx + 9, ly, 9, 0, 2 * M_PI);
    vg_plot_color(cr, vg_plot_blue);
    cairo_stroke(cr);
    vg_plot_dot(cr, lx + 9, ly, 5.5, vg_plot_blue, 0);
    vg_plot_color(cr, vg_plot_ink);
    const char *t2 = "this run";
    vg_plot_text(cr, lx + 24, ly, t2, -1, 0);
    lx += 24 + vg_plot_text_width(cr, t2) + 24;
    vg_plot_diamond(cr, lx + 8, ly, 8, vg_plot_orange);
    vg_plot_color(cr, vg_plot_ink);
    const char *t3 = "best earlier run";
    vg_plot_text(cr, lx + 22, ly, t3, -1, 0);
    lx += 22 + vg_plot_text_width(cr, t3) + 24;
    vg_plot_dot(cr, lx + 6, ly, 5.5, vg_plot_red, 0);
    vg_plot_color(cr, vg_plot_ink);
    vg_plot_text(cr, lx + 18, ly, "significant regression (Holm)", -1, 0);
#undef XS
#undef YS
}

vg_status vg_plot_track(const char *suite, const char *metric, const char *ylabel,
                        const vg_track_point *pts, size_t n, const char *svg_path,
                        const char *png_path, vg_error *err) {
    vg_track_point *p = vg_calloc(n ? n : 1, sizeof *p);
    if (!p) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
    memcpy(p, pts, n * sizeof *p);
    /* Sort by step (stable: insertion), so the line runs left to right. */
    for (size_t i = 1; i < n; i++) {
        vg_track_point x = p[i];
        size_t j = i;
        while (j > 0 && p[j - 1].step > x.step) {
            p[j] = p[j - 1];
            j--;
        }
        p[j] = x;
    }
    track_plot T = {suite, metric, ylabel ? ylabel : metric, p, n};
    vg_status st = vg_plot_write(draw, &T, W, H, svg_path, png_path, err);
    vg_free(p);
    return st;
}
