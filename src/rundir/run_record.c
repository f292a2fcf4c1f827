/* run_record.c - reading back the parts of run.json a rerun needs.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <jansson.h>
#include <string.h>

#include "../common/alloc.h"
#include "vecgauge/rundir.h"

void vg_run_record_free(vg_run_record *rec) {
    if (!rec) return;
    for (size_t i = 0; i < rec->argc; i++) vg_free(rec->argv[i]);
    for (size_t i = 0; i < rec->n_files; i++) {
        vg_free(rec->files[i]);
        vg_free(rec->sha256[i]);
    }
    vg_free(rec->argv);
    vg_free(rec->files);
    vg_free(rec->sha256);
    vg_free(rec->tool_version);
    vg_free(rec->cwd);
    vg_free(rec->data_dir);
    vg_free(rec);
}

/* Append (path, sha) to the record's file list. */
static int add_file(vg_run_record *rec, size_t *cap, const char *path, const char *sha) {
    size_t c1 = *cap, c2 = *cap;
    if (vg_grow((void **)&rec->files, &c1, rec->n_files + 1, sizeof *rec->files) != 0 ||
        vg_grow((void **)&rec->sha256, &c2, rec->n_files + 1, sizeof *rec->sha256) != 0)
        return -1;
    *cap = c1 < c2 ? c1 : c2;
    rec->files[rec->n_files] = vg_strdup(path);
    rec->sha256[rec->n_files] = vg_strdup(sha ? sha : "");
    if (!rec->files[rec->n_files] || !rec->sha256[rec->n_files]) {
        vg_free(rec->files[rec->n_files]);
        vg_free(rec->sha256[rec->n_files]);
        return -1;
    }
    rec->n_files++;
    return 0;
}

vg_status vg_run_record_read(const char *path, vg_run_record **out, vg_error *err) {
    *out = NULL;
    json_error_t je;
    json_t *root = json_load_file(path, JSON_REJECT_DUPLICATES, &je);
    if (!root) {
        vg_status st = vg_error_set(err, je.line > 0 ? VG_EFORMAT : VG_EIO, path,
                                    je.line > 0 ? (uint64_t)je.line : 0,
                                    "not a readable run.json: %s", je.text);
        if (err && je.column > 0) err->column = (uint64_t)je.column;
        return st;
    }
    vg_status st = VG_OK;
    vg_run_record *rec = vg_calloc(1, sizeof *rec);
    size_t cap = 0;
    if (!rec) {
        st = vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
        goto done;
    }
    json_t *fmt = json_object_get(root, "format");
    if (!json_is_string(fmt) || strncmp(json_string_value(fmt), "vecgauge-run ", 13) != 0) {
        st = vg_error_set(err, VG_EFORMAT, path, 0,
                          "expected \"format\": \"vecgauge-run 1\"; this is not a vecgauge run.json");
        goto done;
    }
    json_t *argv = json_object_get(root, "argv");
    json_t *cwd = json_object_get(root, "cwd");
    json_t *tool = json_object_get(root, "tool");
    json_t *ver = tool ? json_object_get(tool, "version") : NULL;
    if (!json_is_array(argv) || json_array_size(argv) < 2 || !json_is_string(cwd)) {
        st = vg_error_set(err, VG_EFORMAT, path, 0,
                          "expected \"argv\" (an array of at least 2 strings) and \"cwd\"");
        goto done;
    }
    rec->cwd = vg_strdup(json_string_value(cwd));
    rec->tool_version = vg_strdup(json_is_string(ver) ? json_string_value(ver) : "");
    rec->argv = vg_calloc(json_array_size(argv), sizeof *rec->argv);
    if (!rec->cwd || !rec->tool_version || !rec->argv) {
        st = vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
        goto done;
    }
    for (size_t i = 0; i < json_array_size(argv); i++) {
        json_t *a = json_array_get(argv, i);
        if (!json_is_string(a)) {
            st = vg_error_set(err, VG_EFORMAT, path, 0, "argv[%zu] is not a string", i);
            goto done;
        }
        rec->argv[i] = vg_strdup(json_string_value(a));
        if (!rec->argv[i]) {
            st = vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
            goto done;
        }
        rec->argc++;
    }
    json_t *opts = json_object_get(root, "options");
    json_t *data = json_is_object(opts) ? json_object_get(opts, "data") : NULL;
    if (json_is_string(data) && !(rec->data_dir = vg_strdup(json_string_value(data)))) {
        st = vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
        goto done;
    }
    json_t *sets = json_object_get(root, "vector_sets");
    json_t *suites = json_object_get(root, "suites");
    if (!json_is_array(sets) || !json_is_array(suites)) {
        st = vg_error_set(err, VG_EFORMAT, path, 0, "expected \"vector_sets\" and \"suites\" arrays");
        goto done;
    }
    for (size_t i = 0; i < json_array_size(sets); i++) {
        json_t *o = json_array_get(sets, i);
        json_t *p = json_object_get(o, "path"), *h = json_object_get(o, "sha256");
        if (!json_is_string(p)) {
            st = vg_error_set(err, VG_EFORMAT, path, 0, "vector_sets[%zu] has no \"path\"", i);
            goto done;
        }
        if (add_file(rec, &cap, json_string_value(p), json_is_string(h) ? json_string_value(h) : "") != 0) {
            st = vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
            goto done;
        }
        json_t *vp = json_object_get(o, "vocab_path"), *vh = json_object_get(o, "vocab_sha256");
        if (json_is_string(vp) &&
            add_file(rec, &cap, json_string_value(vp), json_is_string(vh) ? json_string_value(vh) : "") != 0) {
            st = vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
            goto done;
        }
    }
    for (size_t k = 0; k < json_array_size(suites); k++) {
        json_t *files = json_object_get(json_array_get(suites, k), "files");
        if (!json_is_array(files)) {
            st = vg_error_set(err, VG_EFORMAT, path, 0, "suites[%zu] has no \"files\" array", k);
            goto done;
        }
        for (size_t f = 0; f < json_array_size(files); f++) {
            json_t *o = json_array_get(files, f);
            json_t *p = json_object_get(o, "path"), *h = json_object_get(o, "sha256");
            if (!json_is_string(p) || !json_is_string(h)) {
                st = vg_error_set(err, VG_EFORMAT, path, 0,
                                  "suites[%zu].files[%zu] needs \"path\" and \"sha256\"", k, f);
                goto done;
            }
            if (add_file(rec, &cap, json_string_value(p), json_string_value(h)) != 0) {
                st = vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
                goto done;
            }
        }
    }
done:
    json_decref(root);
    if (st != VG_OK) {
        vg_run_record_free(rec);
        return st;
    }
    *out = rec;
    return VG_OK;
}
