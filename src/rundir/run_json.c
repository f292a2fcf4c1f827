/* run_json.c - run.json: everything needed to regenerate and cite a run.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Written with jansson so that escaping and number formatting are a JSON
 * library's job. Keys are sorted (JSON_SORT_KEYS) so the file is stable
 * across runs with the same inputs.
 */
#include <jansson.h>
#include <stdlib.h>
#include <string.h>

#include "json_impl.h"
#include "vecgauge/rundir.h"

static json_t *setting_value(const vg_setting *st) {
    char *end;
    switch (st->kind) {
    case VG_SETTING_INTEGER: {
        long long v = strtoll(st->value, &end, 10);
        if (*st->value && !*end) return json_integer(v);
        break;
    }
    case VG_SETTING_REAL: {
        double v = strtod(st->value, &end);
        if (*st->value && !*end) return json_real(v);
        break;
    }
    case VG_SETTING_BOOL: return json_boolean(strcmp(st->value, "0") != 0);
    case VG_SETTING_STRING: break;
    }
    return vg_json_text(st->value);
}

static json_t *vector_set_json(const vg_results *r, size_t i) {
    const vg_vectors_info *in = &r->infos[i];
    json_t *o = json_object();
    json_object_set_new(o, "label", vg_json_text(r->labels[i]));
    json_object_set_new(o, "path", vg_json_text(r->paths[i]));
    json_object_set_new(o, "bytes", json_integer((json_int_t)in->bytes));
    json_object_set_new(o, "sha256", in->hashed ? vg_json_text(in->sha256) : json_null());
    /* Where the digest came from: this run, or the digest cache. */
    json_object_set_new(o, "sha256_source",
                        in->hashed ? json_string(in->digest_cached ? "cache" : "computed")
                                   : json_null());
    json_object_set_new(o, "layout", vg_json_text(vg_layout_name(in->layout)));
    json_object_set_new(o, "gzip", json_boolean(in->gzip));
    json_object_set_new(o, "detected_because", vg_json_text(in->detected_because));
    json_object_set_new(o, "header_rows", json_integer((json_int_t)in->header_rows));
    json_object_set_new(o, "rows_read", json_integer((json_int_t)in->rows_read));
    json_object_set_new(o, "rows_kept", json_integer((json_int_t)in->rows));
    json_object_set_new(o, "dims", json_integer((json_int_t)in->dims));
    json_object_set_new(o, "duplicates", json_integer((json_int_t)in->duplicates));
    json_object_set_new(o, "zero_rows", json_integer((json_int_t)in->zero_rows));
    json_object_set_new(o, "bad_rows", json_integer((json_int_t)in->bad_rows));
    json_object_set_new(o, "words_with_spaces", json_integer((json_int_t)in->words_with_spaces));
    json_object_set_new(o, "invalid_utf8", json_integer((json_int_t)in->invalid_utf8));
    if (in->vocab_path[0]) {
        json_object_set_new(o, "vocab_path", vg_json_text(in->vocab_path));
        json_object_set_new(o, "vocab_sha256", vg_json_text(in->vocab_sha256));
    }
    return o;
}

static json_t *suite_json(const vg_suite *s) {
    json_t *o = json_object();
    json_object_set_new(o, "id", vg_json_text(s->id));
    json_object_set_new(o, "title", vg_json_text(s->title));
    json_object_set_new(o, "task", vg_json_text(vg_task_name(s->task)));
    json_object_set_new(o, "items", json_integer((json_int_t)s->n_items));
    json_object_set_new(o, "layout_detected", vg_json_text(s->layout_detected));
    json_object_set_new(o, "sections", json_integer((json_int_t)s->n_sections));
    json_object_set_new(o, "duplicates", json_integer((json_int_t)s->stats.duplicates));
    json_object_set_new(o, "reversed_duplicates",
                        json_integer((json_int_t)s->stats.reversed_duplicates));
    json_object_set_new(o, "self_pairs", json_integer((json_int_t)s->stats.self_pairs));
    json_t *files = json_array();
    for (size_t f = 0; f < s->n_files; f++) {
        json_t *fo = json_object();
        json_object_set_new(fo, "path", vg_json_text(s->files[f].path));
        json_object_set_new(fo, "bytes", json_integer((json_int_t)s->files[f].bytes));
        json_object_set_new(fo, "sha256", vg_json_text(s->files[f].sha256));
        json_array_append_new(files, fo);
    }
    json_object_set_new(o, "files", files);
    return o;
}

vg_status vg_report_run_json(const vg_results *r, const vg_provenance *prov, FILE *fp,
                             const char *path, vg_error *err) {
    json_t *root = json_object();
    if (!root) return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
    vg_json_provenance(root, "vecgauge-run 1", prov);
    json_t *opts = json_object();
    for (size_t i = 0; prov && i < prov->n_settings; i++)
        json_object_set_new(opts, prov->settings[i].name, setting_value(&prov->settings[i]));
    json_object_set_new(root, "options", opts);
    json_object_set_new(root, "seed", json_integer((json_int_t)r->options.seed));
    json_object_set_new(root, "bootstrap_replicates", json_integer((json_int_t)r->options.bootstrap));
    json_object_set_new(root, "confidence_level", json_real(r->options.ci));
    json_t *sets = json_array();
    for (size_t i = 0; i < r->n_sets; i++) json_array_append_new(sets, vector_set_json(r, i));
    json_object_set_new(root, "vector_sets", sets);
    json_t *suites = json_array();
    for (size_t k = 0; k < r->n_suites; k++) json_array_append_new(suites, suite_json(r->suites[k]));
    json_object_set_new(root, "suites", suites);

    int rc = json_dumpf(root, fp, JSON_INDENT(2) | JSON_SORT_KEYS | JSON_REAL_PRECISION(15));
    json_decref(root);
    if (rc != 0 || fputc('\n', fp) == EOF || ferror(fp))
        return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}
