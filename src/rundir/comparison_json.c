/* comparison_json.c - compare.json: what a comparison directory was made from.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <stdlib.h>
#include <string.h>

#include "json_impl.h"
#include "vecgauge/rundir.h"

vg_status vg_report_compare_json(const vg_comparisons *c, const vg_saved_run *const *runs,
                                 size_t n, const vg_provenance *prov, FILE *fp, const char *path,
                                 vg_error *err) {
    json_t *root = json_object();
    if (!root) return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
    vg_json_provenance(root, "vecgauge-compare 1", prov);
    const vg_compare_options *o = &c->options;
    json_t *opts = json_object();
    json_object_set_new(opts, "seed", json_integer((json_int_t)o->seed));
    json_object_set_new(opts, "bootstrap_replicates", json_integer((json_int_t)o->replicates));
    json_object_set_new(opts, "confidence_level", json_real(o->level));
    json_object_set_new(opts, "alpha", json_real(o->alpha));
    json_object_set_new(opts, "items", json_string(o->items == VG_COMPARE_AS_IS ? "as-is" : "common"));
    json_t *methods = json_array();
    unsigned ms = o->methods ? o->methods : 1u << VG_METHOD_3COSADD;
    for (int m = 0; m < VG_METHOD_COUNT; m++)
        if (ms & (1u << m)) json_array_append_new(methods, json_string(vg_method_name((vg_method)m)));
    json_object_set_new(opts, "analogy_methods", methods);
    json_object_set_new(root, "options", opts);
    json_t *jr = json_array();
    for (size_t q = 0; q < n; q++) {
        json_t *r = json_object(), *sets = json_array();
        json_object_set_new(r, "dir", vg_json_text(runs[q]->dir));
        json_object_set_new(r, "utc_time", vg_json_text(runs[q]->utc_time));
        json_object_set_new(r, "command_line", vg_json_text(runs[q]->command_line));
        for (size_t i = 0; i < runs[q]->n_sets; i++) json_array_append_new(sets, vg_json_text(runs[q]->labels[i]));
        json_object_set_new(r, "vector_sets", sets);
        json_array_append_new(jr, r);
    }
    json_object_set_new(root, "runs", jr);
    json_t *js = json_array();
    for (size_t k = 0; k < c->n_suites; k++) {
        json_t *s = json_object();
        json_object_set_new(s, "id", vg_json_text(c->suite_ids[k]));
        json_object_set_new(s, "task", json_string(vg_task_name(c->tasks[k])));
        json_object_set_new(s, "items", json_integer((json_int_t)c->n_items[k]));
        json_array_append_new(js, s);
    }
    json_object_set_new(root, "suites", js);
    int rc = json_dumpf(root, fp, JSON_INDENT(2) | JSON_SORT_KEYS | JSON_REAL_PRECISION(15));
    json_decref(root);
    if (rc != 0 || fputc('\n', fp) == EOF || ferror(fp))
        return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}
