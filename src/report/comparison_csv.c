/* comparison_csv.c - comparison.csv and ranking.csv.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>

#include "report_impl.h"
#include "vecgauge/compare.h"

static const char comparison_header[] =
    "suite,task,metric,set_a,set_b,items,compared,dropped,used_a,used_b,score_a,score_b,"
    "difference,ci_low,ci_high,ci_method,replicates,test,p_value,p_holm,significant,better,"
    "p_bootstrap,steiger_z,p_steiger,r_ab,only_a,only_b,p_mcnemar";

const char *vg_report_comparison_header(void) { return comparison_header; }

vg_status vg_report_comparison_csv(const vg_comparisons *c, FILE *fp, const char *path,
                                   vg_error *err) {
    fprintf(fp, "%s\n", comparison_header);
    for (size_t i = 0; i < c->n_rows; i++) {
        const vg_comparison *r = &c->rows[i];
        vg_csv_field(fp, c->suite_ids[r->suite], ',');
        vg_csv_field(fp, vg_task_name(r->task), ',');
        vg_csv_field(fp, r->metric, ',');
        vg_csv_field(fp, c->labels[r->set_a], ',');
        vg_csv_field(fp, c->labels[r->set_b], ',');
        vg_csv_size(fp, r->n_items, ',');
        vg_csv_size(fp, r->n_compared, ',');
        vg_csv_size(fp, r->n_dropped, ',');
        vg_csv_size(fp, r->n_a, ',');
        vg_csv_size(fp, r->n_b, ',');
        vg_csv_double(fp, r->score_a, ',');
        vg_csv_double(fp, r->score_b, ',');
        vg_csv_double(fp, r->diff, ',');
        vg_csv_double(fp, r->diff_low, ',');
        vg_csv_double(fp, r->diff_high, ',');
        vg_csv_field(fp, r->interval, ',');
        vg_csv_size(fp, r->replicates, ',');
        vg_csv_field(fp, r->test, ',');
        vg_csv_double(fp, r->p_value, ',');
        vg_csv_double(fp, r->p_holm, ',');
        vg_csv_field(fp, isnan(r->p_holm) ? "" : r->significant ? "1" : "0", ',');
        vg_csv_field(fp, r->significant ? c->labels[r->diff > 0 ? r->set_a : r->set_b] : "", ',');
        vg_csv_double(fp, r->p_bootstrap, ',');
        vg_csv_double(fp, r->steiger_z, ',');
        vg_csv_double(fp, r->p_steiger, ',');
        vg_csv_double(fp, r->r_ab, ',');
        if (r->task == VG_TASK_ANALOGY) {
            vg_csv_size(fp, r->only_a, ',');
            vg_csv_size(fp, r->only_b, ',');
        } else {
            fputs(",,", fp);
        }
        vg_csv_double(fp, r->p_mcnemar, '\n');
    }
    if (ferror(fp)) return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}

vg_status vg_report_ranking_csv(const vg_comparisons *c, FILE *fp, const char *path,
                                vg_error *err) {
    fputs("rank,vectors,mean_rank,suites,wins,losses\n", fp);
    for (size_t i = 0; i < c->n_sets; i++) {
        const vg_set_rank *k = &c->ranking[i];
        vg_csv_size(fp, i + 1, ',');
        vg_csv_field(fp, c->labels[k->set], ',');
        vg_csv_double(fp, k->mean_rank, ',');
        vg_csv_size(fp, k->suites, ',');
        vg_csv_size(fp, k->wins, ',');
        vg_csv_size(fp, k->losses, '\n');
    }
    if (ferror(fp)) return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}
