/* merge.c - many run directories (a grid of jobs) as one run directory.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The merged directory holds the same files as a run directory, so
 * `vecgauge compare` and `track` read it like any other: every run's
 * rows in order, each vector set under its (possibly new) label, and a
 * run.json recording where each set came from.
 */
#include <jansson.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/numfmt.h"
#include "json_impl.h"
#include "../report/report_impl.h"
#include "saved_impl.h"
#include "vecgauge/compare.h"
#include "vecgauge/report.h"

/* The header vecgauge writes for a table of a run directory, or NULL. */
static const char *header_of(const char *name) {
    if (strcmp(name, "scores.csv") == 0) return vg_report_scores_header();
    if (strcmp(name, "intervals.csv") == 0) return vg_report_intervals_header();
    if (strcmp(name, "agreement.csv") == 0) return vg_report_agreement_header();
    if (strcmp(name, "items.csv") == 0) return vg_report_items_header();
    if (strcmp(name, "missing.csv") == 0) return vg_report_missing_header();
    return NULL;
}

/* 1 if the record's fields joined by ',' equal header (no field of a
 * header needs quoting). */
static int is_header(const vg_csv_record *rec, const char *header) {
    const char *h = header;
    for (size_t i = 0; i < rec->n; i++) {
        size_t n = strlen(rec->field[i]);
        if (strncmp(h, rec->field[i], n) != 0) return 0;
        h += n;
        if (i + 1 < rec->n) {
            if (*h != ',') return 0;
            h++;
        }
    }
    return *h == '\0';
}

vg_status vg_merge_csv(const vg_saved_run *const *runs, size_t n, const char *name, FILE *fp,
                       const char *path, vg_error *err) {
    const char *header = header_of(name);
    if (!header) return vg_error_set(err, VG_EINVAL, path, 0, "no table named %s", name);
    /* agreement.csv depends on the suites alone, which the runs share. */
    int first_only = strcmp(name, "agreement.csv") == 0;
    fprintf(fp, "%s\n", header);
    for (size_t q = 0; q < n; q++) {
        const vg_csv_table *t = vg_saved_table(runs[q], name);
        if (!t) continue;
        if (!is_header(&t->rec[0], header))
            return vg_error_set(err, VG_EFORMAT, t->path, 1,
                                "expected the header '%s' (written by another version of "
                                "vecgauge?)",
                                header);
        if (first_only && q > 0) continue;
        for (size_t i = 1; i < t->n_rec; i++) {
            const vg_csv_record *rec = &t->rec[i];
            for (size_t f = 0; f < rec->n; f++) {
                const char *v = rec->field[f];
                if (f == 0 && !first_only) {
                    long s = vg_saved_original_set(runs[q], v);
                    if (s < 0)
                        return vg_error_set(err, VG_EFORMAT, t->path, rec->line,
                                            "vector set '%s' is not in run.json", v);
                    v = runs[q]->labels[s];
                }
                vg_csv_field(fp, v, f + 1 < rec->n ? ',' : '\n');
            }
        }
    }
    if (ferror(fp)) return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}

vg_status vg_merge_run_json(const vg_saved_run *const *runs, size_t n, const vg_provenance *prov,
                            FILE *fp, const char *path, vg_error *err) {
    if (n == 0) return vg_error_set(err, VG_EINVAL, path, 0, "no run to merge");
    json_t *root = json_deep_copy(vg_saved_json(runs[0]));
    json_t *sets = json_array(), *from = json_array(), *opts = json_object();
    if (!root || !sets || !from || !opts) {
        json_decref(root);
        json_decref(sets);
        json_decref(from);
        json_decref(opts);
        return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
    }
    for (size_t q = 0; q < n; q++) {
        json_t *rs = json_object_get(vg_saved_json(runs[q]), "vector_sets");
        json_t *labels = json_array();
        for (size_t i = 0; i < runs[q]->n_sets; i++) {
            json_t *o = json_deep_copy(json_array_get(rs, i));
            if (o) json_object_set_new(o, "label", vg_json_text(runs[q]->labels[i]));
            json_array_append_new(sets, o);
            json_array_append_new(labels, vg_json_text(runs[q]->labels[i]));
        }
        json_t *src = json_object();
        json_object_set_new(src, "dir", vg_json_text(runs[q]->dir));
        json_object_set_new(src, "utc_time", vg_json_text(runs[q]->utc_time));
        json_object_set_new(src, "command_line", vg_json_text(runs[q]->command_line));
        json_object_set_new(src, "seed", json_integer((json_int_t)runs[q]->seed));
        json_object_set_new(src, "bootstrap_replicates", json_integer((json_int_t)runs[q]->bootstrap));
        json_object_set_new(src, "confidence_level", json_real(runs[q]->level));
        json_object_set_new(src, "vector_sets", labels);
        json_array_append_new(from, src);
    }
    for (size_t i = 0; prov && i < prov->n_settings; i++)
        json_object_set_new(opts, prov->settings[i].name, vg_json_text(prov->settings[i].value));
    vg_json_provenance(root, "vecgauge-run 1", prov);
    json_object_set_new(root, "options", opts);
    json_object_set_new(root, "vector_sets", sets);
    json_object_set_new(root, "merged_from", from);
    int rc = json_dumpf(root, fp, JSON_INDENT(2) | JSON_SORT_KEYS | JSON_REAL_PRECISION(15));
    json_decref(root);
    if (rc != 0 || fputc('\n', fp) == EOF || ferror(fp))
        return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}

vg_status vg_merge_summary_md(const vg_saved_run *const *runs, size_t n,
                              const vg_provenance *prov, FILE *fp, const char *path,
                              vg_error *err) {
    if (n == 0) return vg_error_set(err, VG_EINVAL, path, 0, "no run to merge");
    const vg_saved_run *r0 = runs[0];
    size_t n_sets = 0;
    for (size_t q = 0; q < n; q++) n_sets += runs[q]->n_sets;
    fputs("# vecgauge merged runs\n\n", fp);
    fprintf(fp, "%zu vector set%s from %zu run director%s on %zu suite%s. Higher is better "
                "for every score. Compare them with `vecgauge compare` on this directory.\n\n",
            n_sets, n_sets == 1 ? "" : "s", n, n == 1 ? "y" : "ies", r0->n_suites,
            r0->n_suites == 1 ? "" : "s");
    fputs("Cells: the headline score (Spearman's rho; 3CosAdd accuracy) on the items each "
          "set covers, with the interval each run computed (items used / items).\n\n",
          fp);
    fputs("| vector set | run |", fp);
    for (size_t k = 0; k < r0->n_suites; k++) {
        fputc(' ', fp);
        vg_md_cell(fp, r0->suites[k].id);
        fputs(" |", fp);
    }
    fputs("\n|---|---|", fp);
    for (size_t k = 0; k < r0->n_suites; k++) fputs("---:|", fp);
    fputc('\n', fp);
    for (size_t q = 0; q < n; q++) {
        const vg_saved_run *r = runs[q];
        for (size_t i = 0; i < r->n_sets; i++) {
            fputs("| ", fp);
            vg_md_cell(fp, r->labels[i]);
            fputs(" | `", fp);
            vg_md_cell(fp, r->dir);
            fputs("` |", fp);
            for (size_t k = 0; k < r0->n_suites; k++) {
                long t = -1;
                for (size_t j = 0; j < r->n_suites; j++)
                    if (strcmp(r->suites[j].id, r0->suites[k].id) == 0) t = (long)j;
                if (t < 0) {
                    fputs(" |", fp);
                    continue;
                }
                const vg_saved_score *s = &r->scores[i * r->n_suites + (size_t)t];
                char v[32], lo[32], hi[32];
                fprintf(fp, " %s", vg_format_fixed(s->value, 3, v));
                if (isfinite(s->low) && isfinite(s->high))
                    fprintf(fp, " [%s, %s]", vg_format_fixed(s->low, 3, lo),
                            vg_format_fixed(s->high, 3, hi));
                fprintf(fp, " (%zu/%zu) |", s->n_used, s->n_items);
            }
            fputc('\n', fp);
        }
    }
    fputc('\n', fp);
    vg_md_saved_runs(fp, "Merged runs", runs, n, 1);
    vg_md_short_provenance(fp, prov, "merged at");
    if (ferror(fp)) return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}
