/* paths.c - how a history names its runs: relative to its own folder.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * A history and the run directories beside it can then move together
 * (copied to another machine, or a project folder renamed).
 */
#include <stdio.h>
#include <string.h>

#include "../common/alloc.h"
#include "track_impl.h"

char *vg_track_folder_of(const char *path) {
    const char *slash = strrchr(path, '/');
    if (!slash) return vg_strdup(".");
    if (slash == path) return vg_strdup("/");
    return vg_strndup(path, (size_t)(slash - path));
}

char *vg_track_relative(const char *from, const char *target) {
    size_t common = 0, i = 0;
    /* The longest common prefix ending on a component boundary. */
    for (;; i++) {
        char a = from[i], b = target[i];
        if ((a == '/' || a == '\0') && (b == '/' || b == '\0')) common = i;
        if (a != b || a == '\0') break;
    }
    if (common == 0) return vg_strdup(target);
    size_t ups = 0;
    for (const char *p = from + common; *p; p++)
        if (*p == '/') ups++;
    const char *rest = target + common;
    if (*rest == '/') rest++;
    size_t len = 3 * ups + strlen(rest) + 2;
    char *out = vg_malloc(len);
    if (!out) return NULL;
    out[0] = '\0';
    for (size_t k = 0; k < ups; k++) strcat(out, "../");
    strcat(out, *rest ? rest : ".");
    size_t n = strlen(out);
    if (n > 1 && out[n - 1] == '/') out[n - 1] = '\0';
    return out;
}

char *vg_track_resolve(const char *folder, const char *recorded) {
    if (recorded[0] == '/') return vg_strdup(recorded);
    size_t len = strlen(folder) + strlen(recorded) + 2;
    char *p = vg_malloc(len);
    if (p) snprintf(p, len, "%s/%s", folder, recorded);
    return p;
}
