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

/* One line of missing.csv. */
static void missing_line(FILE *fp, const char *set, const char *suite, const char *word,
                         const char *reason) {
    vg_csv_field(fp, set, ',');
    vg_csv_field(fp, suite, ',');
    vg_csv_field(fp, word, ',');
    vg_csv_field(fp, reason, '\n');
}

const char *vg_report_missing_header(void) { return "vectors,suite,word,reason"; }

vg_status vg_report_missing_words(const vg_results *r, FILE *fp, const char *path,
                                  vg_error *err) {
    fprintf(fp, "%s\n", vg_report_missing_header());
    for (size_t i = 0; i < r->n_sets; i++) {
        for (size_t k = 0; k < r->n_suites; k++) {
            const vg_item_block *b = &r->blocks[i * r->n_suites + k];
            if (b->sim)
                for (size_t w = 0; w < b->sim->n_missing_words; w++)
                    missing_line(fp, r->labels[i], r->suites[k]->id, b->sim->missing_words[w],
                                 "not in the vector set");
            if (b->ana)
                for (size_t w = 0; w < b->ana->n_missing_words; w++) {
                    /* A word can be in the set but past the candidate rows
                     * (--analogy-vocab): say which, it changes the remedy. */
                    const char *word = b->ana->missing_words[w];
                    int present = r->vectors && r->vectors[i] &&
                                  vg_vectors_find(r->vectors[i], word, strlen(word)) != VG_NOT_FOUND;
                    missing_line(fp, r->labels[i], r->suites[k]->id, word,
                                 present ? "not among the candidate rows" : "not in the vector set");
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
