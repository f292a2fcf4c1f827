/* groups.c - naming groups of analogy sections by wildcard rules.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <fnmatch.h>
#include <string.h>

#include "../common/alloc.h"
#include "suite_impl.h"

vg_status vg_suite_set_groups(vg_suite *s, const char *rule, vg_error *err) {
    if (!rule || !*rule) return VG_OK;
    /* Check the whole rule first, so that a bad part changes nothing. */
    for (const char *b = rule; *b;) {
        size_t n = strcspn(b, ";");
        const char *eq = memchr(b, '=', n);
        if (!eq || eq == b || eq == b + n - 1)
            return vg_error_set(err, VG_EINVAL, NULL, 0,
                                "section groups: expected PATTERN=GROUP, found '%.*s'", (int)n, b);
        b += n;
        if (*b == ';') b++;
    }
    char pat[256];
    for (size_t i = 0; i < s->n_sections; i++) {
        vg_section *sec = &s->sections[i];
        for (const char *b = rule; *b;) {
            size_t n = strcspn(b, ";");
            const char *eq = memchr(b, '=', n);
            size_t pl = (size_t)(eq - b);
            if (pl >= sizeof pat)
                return vg_error_set(err, VG_EINVAL, NULL, 0, "section groups: pattern too long");
            memcpy(pat, b, pl);
            pat[pl] = '\0';
            if (fnmatch(pat, sec->name, 0) == 0) {
                sec->group = vg_suite_intern(s, eq + 1, n - pl - 1);
                if (!sec->group) return vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
                break;
            }
            b += n;
            if (*b == ';') b++;
        }
    }
    return VG_OK;
}
