/* json_text.c - strings for the JSON files (run.json, compare.json).
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <string.h>

#include "../common/alloc.h"
#include "json_impl.h"

json_t *vg_json_text(const char *s) {
    if (!s) s = "";
    json_t *j = json_string(s);
    if (j) return j;
    /* jansson refuses bytes that are not UTF-8 (words and paths can hold
     * them): a lossy copy with '?' for every byte outside ASCII. */
    size_t n = strlen(s);
    char *c = vg_malloc(n + 1);
    if (!c) return NULL;
    for (size_t i = 0; i <= n; i++) c[i] = (unsigned char)s[i] < 0x80 ? s[i] : '?';
    j = json_string(c);
    vg_free(c);
    return j;
}

void vg_json_provenance(json_t *root, const char *format, const vg_provenance *prov) {
    json_object_set_new(root, "format", json_string(format));
    json_t *tool = json_object();
    json_object_set_new(tool, "name", json_string("vecgauge"));
    json_object_set_new(tool, "version", vg_json_text(prov ? prov->tool_version : NULL));
    json_object_set_new(tool, "git_describe", vg_json_text(prov ? prov->git_describe : NULL));
    json_object_set_new(root, "tool", tool);
    json_object_set_new(root, "utc_time", vg_json_text(prov ? prov->utc_time : NULL));
    json_object_set_new(root, "command_line", vg_json_text(prov ? prov->command_line : NULL));
    json_object_set_new(root, "cwd", vg_json_text(prov ? prov->cwd : NULL));
    json_t *argv = json_array();
    for (size_t i = 0; prov && i < prov->argc; i++)
        json_array_append_new(argv, vg_json_text(prov->argv[i]));
    json_object_set_new(root, "argv", argv);
}
