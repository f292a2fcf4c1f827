/* intervals.c - intervals.csv (every interval of every row) and
 * agreement.csv (the raters' agreement on each suite).
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <string.h>

#include "../common/numfmt.h"
#include "report_impl.h"
#include "vecgauge/report.h"

static const char intervals_header[] =
    "vectors,suite,subset,task,metric,value,method,level,ci_low,ci_high,replicates";

const char *vg_report_intervals_header(void) { return intervals_header; }

vg_status vg_report_intervals_csv(const vg_results *r, FILE *fp, const char *path,
                                  vg_error *err) {
    fprintf(fp, "%s\n", intervals_header);
    for (size_t i = 0; i < r->n_rows; i++) {
        const vg_score_row *row = &r->rows[i];
        char metric[40];
        snprintf(metric, sizeof metric, "%s%s", vg_metric_name(row->metric),
                 row->all_items ? "_all" : "");
        for (size_t c = 0; c < row->n_ci; c++) {
            const vg_interval *iv = &row->ci[c];
            vg_csv_field(fp, r->labels[row->set], ',');
            vg_csv_field(fp, r->suites[row->suite]->id, ',');
            vg_csv_field(fp, row->subset, ',');
            vg_csv_field(fp, vg_task_name(row->task), ',');
            vg_csv_field(fp, metric, ',');
            vg_csv_double(fp, row->value, ',');
            vg_csv_field(fp, iv->method, ',');
            vg_csv_double(fp, r->options.ci, ',');
            vg_csv_double(fp, iv->low, ',');
            vg_csv_double(fp, iv->high, ',');
            if (iv->replicates)
                vg_csv_size(fp, iv->replicates, '\n');
            else
                fputc('\n', fp);
        }
    }
    if (ferror(fp)) return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}

static const char agreement_header[] =
    "suite,method,value,columns,columns_used,min_ratings,max_ratings,n_items";

const char *vg_report_agreement_header(void) { return agreement_header; }

vg_status vg_report_agreement_csv(const vg_results *r, FILE *fp, const char *path,
                                  vg_error *err) {
    fprintf(fp, "%s\n", agreement_header);
    for (size_t k = 0; k < r->n_suites; k++) {
        const vg_agreement *a = vg_results_agreement(r, k);
        if (!a || a->columns == 0) continue;
        vg_csv_field(fp, r->suites[k]->id, ',');
        vg_csv_field(fp, a->method, ',');
        vg_csv_double(fp, a->value, ',');
        vg_csv_size(fp, a->columns, ',');
        vg_csv_size(fp, a->columns_used, ',');
        vg_csv_size(fp, a->min_ratings, ',');
        vg_csv_size(fp, a->max_ratings, ',');
        vg_csv_size(fp, a->n_items, '\n');
    }
    if (ferror(fp)) return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}
