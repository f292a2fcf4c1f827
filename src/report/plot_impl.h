/* plot_impl.h - what the cairo plots share: surfaces, fonts, axes, legends.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * A plot is one drawing function called twice, on an SVG surface and on a
 * PNG image surface, so both files show the same picture. Sizes are in
 * SVG points; the PNG is drawn at twice that resolution.
 */
#ifndef VG_PLOT_IMPL_H
#define VG_PLOT_IMPL_H

#include <cairo.h>
#include <stddef.h>

#include "../common/internal.h"
#include "vecgauge/error.h"

/* Colours (RGB 0..1). */
typedef struct vg_rgb {
    double r, g, b;
} vg_rgb;

VG_INTERNAL extern const vg_rgb vg_plot_ink, vg_plot_grid, vg_plot_blue, vg_plot_light_blue,
    vg_plot_orange, vg_plot_red, vg_plot_band;

typedef void (*vg_plot_fn)(cairo_t *cr, void *ctx, double width, double height);

/* Draw fn on a width x height SVG at svg_path and a PNG at png_path
 * (either may be NULL). VG_EIO naming the path when cairo fails. */
VG_INTERNAL vg_status vg_plot_write(vg_plot_fn fn, void *ctx, double width, double height,
                                    const char *svg_path, const char *png_path, vg_error *err);

/* The font (DejaVu Sans through fontconfig) at size, bold or not. */
VG_INTERNAL void vg_plot_font(cairo_t *cr, double size, int bold);

VG_INTERNAL void vg_plot_color(cairo_t *cr, vg_rgb c);

/* Width of text in the current font. */
VG_INTERNAL double vg_plot_text_width(cairo_t *cr, const char *text);

/* Draw text with its anchor at (x, y): halign -1 left, 0 centre, 1
 * right; valign -1 top, 0 middle, 1 baseline. */
VG_INTERNAL void vg_plot_text(cairo_t *cr, double x, double y, const char *text, int halign,
                              int valign);

/* text shortened with "..." to fit max_width (into buf of size bytes,
 * on whole UTF-8 characters). Returns buf. */
VG_INTERNAL const char *vg_plot_fit(cairo_t *cr, const char *text, double max_width, char *buf,
                                    size_t size);

/* Tick positions for [lo, hi]: steps of 1, 2 or 5 times a power of ten,
 * about target ticks, at least min_step apart. Returns the count (at most
 * max) written to ticks; *step receives the step. */
VG_INTERNAL size_t vg_plot_ticks(double lo, double hi, int target, double min_step,
                                 double *ticks, size_t max, double *step);

/* A tick label with as many decimals as step needs. */
VG_INTERNAL const char *vg_plot_tick_label(double v, double step, char buf[32]);

/* Markers centred at (x, y): a circle of radius r, filled or ringed. */
VG_INTERNAL void vg_plot_dot(cairo_t *cr, double x, double y, double r, vg_rgb fill, int hollow);
VG_INTERNAL void vg_plot_diamond(cairo_t *cr, double x, double y, double r, vg_rgb fill);

#endif /* VG_PLOT_IMPL_H */
