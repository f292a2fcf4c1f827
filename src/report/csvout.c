/* csvout.c - CSV fields through libcsv, and scores.csv.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <csv.h>
#include <math.h>
#include <string.h>

#include "../common/numfmt.h"
#include "report_impl.h"
#include "vecgauge/report.h"

void vg_csv_field(FILE *fp, const char *s, char sep) {
    size_t n = strlen(s);
    int quote = n > 0 && (s[0] == ' ' || s[n - 1] == ' ');
    if (!quote && strpbrk(s, ",\"\r\n")) quote = 1;
    if (quote)
        csv_fwrite(fp, s, n);
    else
        fwrite(s, 1, n, fp);
    if (sep) fputc(sep, fp);
}

void vg_csv_double(FILE *fp, double x, char sep) {
    char buf[32];
    vg_csv_field(fp, vg_format_double(x, buf), sep);
}

void vg_csv_size(FILE *fp, size_t x, char sep) {
    fprintf(fp, "%zu", x);
    if (sep) fputc(sep, fp);
}

static const char scores_header[] =
    "vectors,suite,subset,task,metric,value,ci_low,ci_high,ci_method,n_items,n_used,coverage";

const char *vg_report_scores_header(void) { return scores_header; }

vg_status vg_report_scores_csv(const vg_results *r, FILE *fp, const char *path, vg_error *err) {
    fprintf(fp, "%s\n", scores_header);
    for (size_t i = 0; i < r->n_rows; i++) {
        const vg_score_row *row = &r->rows[i];
        char metric[40];
        snprintf(metric, sizeof metric, "%s%s", vg_metric_name(row->metric),
                 row->all_items ? "_all" : "");
        vg_csv_field(fp, r->labels[row->set], ',');
        vg_csv_field(fp, r->suites[row->suite]->id, ',');
        vg_csv_field(fp, row->subset, ',');
        vg_csv_field(fp, vg_task_name(row->task), ',');
        vg_csv_field(fp, metric, ',');
        vg_csv_double(fp, row->value, ',');
        if (row->n_ci > 0) {
            vg_csv_double(fp, row->ci[0].low, ',');
            vg_csv_double(fp, row->ci[0].high, ',');
            vg_csv_field(fp, row->ci[0].method, ',');
        } else {
            fputs(",,,", fp);
        }
        vg_csv_size(fp, row->n_items, ',');
        vg_csv_size(fp, row->n_used, ',');
        vg_csv_double(fp, row->n_items ? (double)row->n_used / (double)row->n_items : NAN, '\n');
    }
    if (ferror(fp)) return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}

vg_status vg_report_missing_words(const vg_results *r, FILE *fp, const char *path,
                                  vg_error *err) {
    fputs("vectors,suite,word\n", fp);
    for (size_t i = 0; i < r->n_sets; i++) {
        for (size_t k = 0; k < r->n_suites; k++) {
            const vg_similarity_scores *sc = r->blocks[i * r->n_suites + k].sim;
            if (!sc) continue;
            for (size_t w = 0; w < sc->n_missing_words; w++)
            {
                vg_csv_field(fp, r->labels[i], ',');
                vg_csv_field(fp, r->suites[k]->id, ',');
                vg_csv_field(fp, sc->missing_words[w], '\n');
            }
        }
    }
    if (ferror(fp)) return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}

vg_status vg_report_close(FILE *fp, const char *path, vg_error *err) {
    int bad = ferror(fp);
    if (fclose(fp) != 0) bad = 1;
    if (bad) return vg_error_set(err, VG_EIO, path, 0, "write failed (disk full?)");
    return VG_OK;
}
