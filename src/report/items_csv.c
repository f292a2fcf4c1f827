/* items_csv.c - items.csv: what each vector set did on each item.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * One row per vector set x item, wide: pairs fill the cosine, questions
 * the predicted word and correctness of every method. Later comparisons
 * (compare, track) pair two runs item by item from this file alone,
 * without reloading any vectors.
 */
#include <math.h>
#include <string.h>

#include "../common/numfmt.h"
#include "report_impl.h"
#include "vecgauge/report.h"

static const char items_header[] =
    "vectors,suite,item,subset,task,word1,word2,word3,expected,rating,status,cosine,"
    "3cosadd,3cosadd_correct,3cosmul,3cosmul_correct,pairdir,pairdir_correct,only_b,"
    "only_b_correct";

const char *vg_report_items_header(void) { return items_header; }

/* Name of the section holding item i, or "". */
static const char *section_of(const vg_suite *s, size_t i) {
    for (size_t k = 0; k < s->n_sections; k++)
        if (i >= s->sections[k].first && i < s->sections[k].first + s->sections[k].count)
            return s->sections[k].name;
    return "";
}

static void write_pair(FILE *fp, const vg_results *r, size_t set, size_t k, size_t i) {
    const vg_suite *s = r->suites[k];
    const vg_similarity_scores *sc = r->blocks[set * r->n_suites + k].sim;
    const vg_pair *p = &s->pairs[i];
    vg_csv_field(fp, r->labels[set], ',');
    vg_csv_field(fp, s->id, ',');
    vg_csv_size(fp, i + 1, ',');
    vg_csv_field(fp, section_of(s, i), ',');
    vg_csv_field(fp, "similarity", ',');
    vg_csv_field(fp, p->w1, ',');
    vg_csv_field(fp, p->w2, ',');
    fputs(",,", fp);                          /* word3, expected */
    vg_csv_double(fp, p->rating, ',');
    vg_csv_field(fp, vg_item_status_name((vg_item_status)sc->status[i]), ',');
    vg_csv_double(fp, sc->cosine[i], ',');    /* NaN (not scored) is empty */
    fputs(",,,,,,,\n", fp);                   /* the eight method columns */
}

static void write_question(FILE *fp, const vg_results *r, size_t set, size_t k, size_t i) {
    const vg_suite *s = r->suites[k];
    const vg_analogy_scores *sc = r->blocks[set * r->n_suites + k].ana;
    const vg_question *q = &s->questions[i];
    vg_csv_field(fp, r->labels[set], ',');
    vg_csv_field(fp, s->id, ',');
    vg_csv_size(fp, i + 1, ',');
    vg_csv_field(fp, q->section < s->n_sections ? s->sections[q->section].name : "", ',');
    vg_csv_field(fp, "analogy", ',');
    vg_csv_field(fp, q->a, ',');
    vg_csv_field(fp, q->b, ',');
    vg_csv_field(fp, q->c, ',');
    /* Every accepted answer, '/'-separated as in multi-answer files. */
    size_t total = 1;
    for (size_t a = 0; a < q->n_answers; a++) total += strlen(q->answers[a]) + 1;
    char small[512];
    char *buf = total <= sizeof small ? small : NULL;
    if (buf) {
        buf[0] = '\0';
        for (size_t a = 0; a < q->n_answers; a++) {
            if (a) strcat(buf, "/");
            strcat(buf, q->answers[a]);
        }
        vg_csv_field(fp, buf, ',');
    } else {
        /* Rare: a long answer list is quoted piecewise by hand. */
        fputc('"', fp);
        for (size_t a = 0; a < q->n_answers; a++) {
            if (a) fputc('/', fp);
            for (const char *c = q->answers[a]; *c; c++) {
                if (*c == '"') fputc('"', fp);
                fputc(*c, fp);
            }
        }
        fputs("\",", fp);
    }
    fputc(',', fp); /* rating */
    vg_csv_field(fp, vg_item_status_name((vg_item_status)sc->status[i]), ',');
    fputc(',', fp); /* cosine */
    for (int m = 0; m < VG_METHOD_COUNT; m++) {
        char sep = m + 1 < VG_METHOD_COUNT ? ',' : '\n';
        size_t row = sc->predicted[m] ? sc->predicted[m][i] : VG_NOT_FOUND;
        if (row == VG_NOT_FOUND || !r->vectors[set]) {
            fputc(',', fp);
            if (sep == '\n') fputc('\n', fp);
            else fputc(',', fp);
            continue;
        }
        vg_csv_field(fp, vg_vectors_word(r->vectors[set], row, NULL), ',');
        vg_csv_field(fp, sc->correct[m][i] ? "1" : "0", sep);
    }
}

vg_status vg_report_items_csv(const vg_results *r, FILE *fp, const char *path, vg_error *err) {
    fprintf(fp, "%s\n", items_header);
    for (size_t set = 0; set < r->n_sets; set++) {
        for (size_t k = 0; k < r->n_suites; k++) {
            const vg_suite *s = r->suites[k];
            const vg_item_block *b = &r->blocks[set * r->n_suites + k];
            for (size_t i = 0; i < s->n_items; i++) {
                if (s->task == VG_TASK_SIMILARITY && b->sim)
                    write_pair(fp, r, set, k, i);
                else if (s->task == VG_TASK_ANALOGY && b->ana)
                    write_question(fp, r, set, k, i);
            }
        }
    }
    if (ferror(fp)) return vg_error_set(err, VG_EIO, path, 0, "write failed");
    return VG_OK;
}
