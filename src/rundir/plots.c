/* plots.c - the plots/ folder of an output directory: names and drawing.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <stdio.h>
#include <string.h>
#include <sys/stat.h>

#include "../common/alloc.h"
#include "rundir_impl.h"
#include "vecgauge/compare.h"

void vg_plot_paths_free(char **names) {
    for (size_t i = 0; names && names[i]; i++) vg_free(names[i]);
    vg_free(names);
}

char **vg_plot_paths(const char *const *ids, size_t n) {
    size_t m = 0;
    char **names = vg_calloc(2 * n + 2, sizeof *names);
    if (!names) return NULL;
    for (size_t k = 0; k < n; k++) {
        char base[300];
        vg_plot_name(ids, n, k, base, sizeof base);
        for (int e = 0; e < 2; e++) {
            size_t len = strlen(base) + 16;
            if (!(names[m] = vg_malloc(len))) {
                vg_plot_paths_free(names);
                return NULL;
            }
            snprintf(names[m++], len, "plots/%s.%s", base, e ? "png" : "svg");
        }
    }
    if (!(names[m] = vg_strdup("plots"))) {
        vg_plot_paths_free(names);
        return NULL;
    }
    return names;
}

vg_status vg_plots_draw(vg_rundir *rd, const char *const *ids, size_t n, vg_plot_draw draw,
                        void *ctx, vg_error *err) {
    const char *dir = vg_rundir_file(rd, "plots");
    if (!dir || mkdir(dir, 0777) != 0)
        return vg_error_set(err, VG_EIO, dir ? dir : "plots", 0, "cannot create the plots folder");
    vg_status st = VG_OK;
    for (size_t k = 0; k < n && st == VG_OK; k++) {
        char base[300], name[320];
        vg_plot_name(ids, n, k, base, sizeof base);
        snprintf(name, sizeof name, "plots/%s.svg", base);
        char *svg = vg_strdup(vg_rundir_file(rd, name));
        snprintf(name, sizeof name, "plots/%s.png", base);
        char *png = vg_strdup(vg_rundir_file(rd, name));
        st = svg && png ? draw(ctx, k, svg, png, err)
                        : vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
        vg_free(svg);
        vg_free(png);
    }
    return st;
}
