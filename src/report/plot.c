/* plot.c - SVG and PNG surfaces, text and axes for the plots (cairo).
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <cairo-svg.h>
#include <fontconfig/fontconfig.h>
#include <math.h>
#include <stdio.h>
#include <string.h>

#include "plot_impl.h"
#include "vecgauge/compare.h"

const vg_rgb vg_plot_ink = {0.15, 0.15, 0.18};
const vg_rgb vg_plot_grid = {0.88, 0.88, 0.90};
const vg_rgb vg_plot_blue = {0.12, 0.33, 0.62};
const vg_rgb vg_plot_light_blue = {0.47, 0.66, 0.86};
const vg_rgb vg_plot_orange = {0.89, 0.45, 0.10};
const vg_rgb vg_plot_red = {0.80, 0.12, 0.15};
const vg_rgb vg_plot_band = {0.78, 0.85, 0.94};

void vg_plot_font(cairo_t *cr, double size, int bold) {
    cairo_select_font_face(cr, "DejaVu Sans", CAIRO_FONT_SLANT_NORMAL,
                           bold ? CAIRO_FONT_WEIGHT_BOLD : CAIRO_FONT_WEIGHT_NORMAL);
    cairo_set_font_size(cr, size);
}

void vg_plot_color(cairo_t *cr, vg_rgb c) { cairo_set_source_rgb(cr, c.r, c.g, c.b); }

double vg_plot_text_width(cairo_t *cr, const char *text) {
    cairo_text_extents_t e;
    cairo_text_extents(cr, text, &e);
    return e.x_advance;
}

void vg_plot_text(cairo_t *cr, double x, double y, const char *text, int halign, int valign) {
    cairo_text_extents_t e;
    cairo_font_extents_t fe;
    cairo_text_extents(cr, text, &e);
    cairo_font_extents(cr, &fe);
    double w = e.x_advance;
    double dx = halign < 0 ? 0 : halign == 0 ? -w / 2 : -w;
    /* Vertical placement from the font's ascent, so that labels of one
     * row line up whatever letters they hold. */
    double dy = valign > 0 ? 0 : valign == 0 ? (fe.ascent - fe.descent) / 2 : fe.ascent;
    cairo_move_to(cr, x + dx, y + dy);
    cairo_show_text(cr, text);
}

const char *vg_plot_fit(cairo_t *cr, const char *text, double max_width, char *buf, size_t size) {
    snprintf(buf, size, "%s", text);
    if (vg_plot_text_width(cr, buf) <= max_width) return buf;
    size_t n = strlen(buf);
    while (n > 0) {
        /* Step back over a whole UTF-8 character. */
        do n--;
        while (n > 0 && ((unsigned char)buf[n] & 0xC0) == 0x80);
        if (n + 4 > size) continue;
        memcpy(buf + n, "...", 4);
        if (vg_plot_text_width(cr, buf) <= max_width) break;
    }
    return buf;
}

size_t vg_plot_ticks(double lo, double hi, int target, double min_step, double *ticks,
                     size_t max, double *step) {
    if (!(hi > lo)) hi = lo + 1;
    double raw = (hi - lo) / (target > 0 ? target : 5);
    double mag = pow(10, floor(log10(raw)));
    double s = mag;
    const double mult[] = {1, 2, 5, 10};
    for (int i = 0; i < 4; i++) {
        s = mult[i] * mag;
        if (s >= raw) break;
    }
    if (s < min_step) s = min_step;
    *step = s;
    size_t n = 0;
    for (double v = ceil(lo / s - 1e-9) * s; v <= hi + s * 1e-9 && n < max; v += s) {
        /* Exact multiples, so that labels print without rounding noise. */
        ticks[n++] = round(v / s) * s;
    }
    return n;
}

const char *vg_plot_tick_label(double v, double step, char buf[32]) {
    int dec = step >= 1 ? 0 : (int)ceil(-log10(step) - 1e-9);
    if (dec > 6) dec = 6;
    if (fabs(v) < step * 1e-6) v = 0;
    snprintf(buf, 32, "%.*f", dec, v);
    return buf;
}

void vg_plot_dot(cairo_t *cr, double x, double y, double r, vg_rgb fill, int hollow) {
    cairo_new_sub_path(cr);
    cairo_arc(cr, x, y, r, 0, 2 * M_PI);
    if (hollow) {
        cairo_set_source_rgb(cr, 1, 1, 1);
        cairo_fill_preserve(cr);
        vg_plot_color(cr, fill);
        cairo_set_line_width(cr, 2);
        cairo_stroke(cr);
    } else {
        vg_plot_color(cr, fill);
        cairo_fill_preserve(cr);
        cairo_set_source_rgb(cr, 1, 1, 1);
        cairo_set_line_width(cr, 1);
        cairo_stroke(cr);
    }
}

void vg_plot_diamond(cairo_t *cr, double x, double y, double r, vg_rgb fill) {
    cairo_move_to(cr, x, y - r);
    cairo_line_to(cr, x + r, y);
    cairo_line_to(cr, x, y + r);
    cairo_line_to(cr, x - r, y);
    cairo_close_path(cr);
    vg_plot_color(cr, fill);
    cairo_fill_preserve(cr);
    cairo_set_source_rgb(cr, 1, 1, 1);
    cairo_set_line_width(cr, 1);
    cairo_stroke(cr);
}

static void draw_on(cairo_surface_t *sf, double scale, vg_plot_fn fn, void *ctx, double w,
                    double h) {
    cairo_t *cr = cairo_create(sf);
    cairo_scale(cr, scale, scale);
    cairo_set_source_rgb(cr, 1, 1, 1);
    cairo_paint(cr);
    fn(cr, ctx, w, h);
    cairo_destroy(cr);
}

vg_status vg_plot_write(vg_plot_fn fn, void *ctx, double width, double height,
                        const char *svg_path, const char *png_path, vg_error *err) {
    if (svg_path) {
        cairo_surface_t *sf = cairo_svg_surface_create(svg_path, width, height);
        /* Plain points, no unit suffix guessing by viewers. */
        cairo_svg_surface_restrict_to_version(sf, CAIRO_SVG_VERSION_1_1);
        draw_on(sf, 1, fn, ctx, width, height);
        cairo_surface_finish(sf);
        cairo_status_t cs = cairo_surface_status(sf);
        cairo_surface_destroy(sf);
        if (cs != CAIRO_STATUS_SUCCESS)
            return vg_error_set(err, VG_EIO, svg_path, 0, "cannot write the SVG plot: %s",
                                cairo_status_to_string(cs));
    }
    if (png_path) {
        const double scale = 2;
        cairo_surface_t *sf = cairo_image_surface_create(CAIRO_FORMAT_RGB24,
                                                         (int)ceil(width * scale),
                                                         (int)ceil(height * scale));
        draw_on(sf, scale, fn, ctx, width, height);
        cairo_status_t cs = cairo_surface_status(sf);
        if (cs == CAIRO_STATUS_SUCCESS) cs = cairo_surface_write_to_png(sf, png_path);
        cairo_surface_destroy(sf);
        if (cs != CAIRO_STATUS_SUCCESS)
            return vg_error_set(err, VG_EIO, png_path, 0, "cannot write the PNG plot: %s",
                                cairo_status_to_string(cs));
    }
    return VG_OK;
}

/* id with every byte outside [A-Za-z0-9._-] as '_', never empty and
 * never starting with '.' (no hidden or relative names). */
static void sanitise(const char *id, char *out, size_t size) {
    size_t m = 0;
    for (; id[m] && m + 1 < size; m++) {
        unsigned char ch = (unsigned char)id[m];
        int keep = (ch >= 'a' && ch <= 'z') || (ch >= 'A' && ch <= 'Z') ||
                   (ch >= '0' && ch <= '9') || ch == '.' || ch == '_' || ch == '-';
        out[m] = keep ? (char)ch : '_';
    }
    out[m] = '\0';
    if (m == 0 && size > 1) out[0] = '_', out[1] = '\0';
    if (out[0] == '.') out[0] = '_';
}

void vg_plot_name(const char *const *ids, size_t n, size_t k, char *buf, size_t size) {
    if (size == 0 || k >= n) return;
    /* The N-th id (in order) that maps to the same name gets "-N". */
    char mine[256], other[256];
    sanitise(ids[k], mine, sizeof mine);
    size_t dup = 1;
    for (size_t j = 0; j < k; j++) {
        sanitise(ids[j], other, sizeof other);
        dup += strcmp(other, mine) == 0;
    }
    if (dup > 1)
        snprintf(buf, size, "%s-%zu", mine, dup);
    else
        snprintf(buf, size, "%s", mine);
}

void vg_plot_cleanup(void) {
    cairo_debug_reset_static_data();
    FcFini();
}
