/* split.c - analogy questions and their answers in two files: a
 * questions file of "a b c" lines and an answers file whose lines, in the
 * same order, hold the answer d (or "label d").
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <string.h>

#include "../common/alloc.h"
#include "../common/lines.h"
#include "fields.h"
#include "suite_impl.h"

/* Next line that is not blank; 1, 0 at the end, -1 on error. */
static int next_nonblank(vg_lines *lr, char **line, size_t *len, vg_error *err) {
    int rc;
    while ((rc = vg_lines_next(lr, line, len, err)) > 0)
        if (strspn(*line, " \t") < *len) return 1;
    return rc;
}

vg_status vg_suite_read_split(vg_lines *lq, const char *apath, vg_suite *s, vg_error *err) {
    vg_lines *la = NULL;
    vg_fields fq = VG_FIELDS_INIT, fa = VG_FIELDS_INIT;
    const char *qpath = vg_lines_path(lq);
    vg_status st = vg_lines_open(apath, &la, err);
    if (st == VG_OK) st = vg_suite_open_section(s, "", 0, qpath, 0, err);
    while (st == VG_OK) {
        char *ql, *al;
        size_t qn, an;
        int rq = next_nonblank(lq, &ql, &qn, err);
        if (rq < 0) {
            st = err->code;
            break;
        }
        if (rq > 0) {
            st = vg_fields_split(&fq, ql, qn, ' ', qpath, vg_lines_number(lq), err);
            if (st != VG_OK) break;
        }
        int ra = next_nonblank(la, &al, &an, err);
        if (ra < 0) {
            st = err->code;
            break;
        }
        if (rq == 0 && ra == 0) break;
        if (rq == 0 || ra == 0) {
            st = vg_error_set(err, VG_ETRUNCATED, rq == 0 ? qpath : apath,
                              rq == 0 ? vg_lines_number(lq) + 1 : vg_lines_number(la) + 1,
                              "the file ends after %zu %s, but %s has more lines",
                              s->n_items, rq == 0 ? "questions" : "answers",
                              rq == 0 ? apath : qpath);
            break;
        }
        uint64_t qline = vg_lines_number(lq), aline = vg_lines_number(la);
        if (fq.n != 3) {
            st = vg_error_set(err, VG_EFORMAT, qpath, qline,
                              "expected three question words 'a b c', found %zu field%s", fq.n,
                              fq.n == 1 ? "" : "s");
            break;
        }
        st = vg_fields_split(&fa, al, an, ' ', apath, aline, err);
        if (st != VG_OK) break;
        if (fa.n != 1 && fa.n != 2) {
            st = vg_error_set(err, VG_EFORMAT, apath, aline,
                              "expected an answer word (optionally after a label), found %zu "
                              "fields",
                              fa.n);
            break;
        }
        const char **answers = vg_arena_alloc(vg_suite_arena(s), sizeof *answers);
        if (!answers || !(answers[0] = vg_suite_intern(s, fa.field[fa.n - 1], fa.flen[fa.n - 1]))) {
            st = vg_error_set(err, VG_ENOMEM, apath, aline, "out of memory");
            break;
        }
        st = vg_suite_add_abc(s, (const char *const *)fq.field, fq.flen, answers, 1, qline, qpath,
                              err);
    }
    if (st == VG_OK && s->n_items == 0)
        st = vg_error_set(err, VG_EFORMAT, qpath, 0, "no analogy questions found");
    if (st == VG_OK) {
        snprintf(s->layout_detected, sizeof s->layout_detected,
                 "questions and answers in two files%s", vg_lines_saw_crlf(lq) ? ", CRLF" : "");
        st = vg_suite_add_file(s, lq, err);
    }
    if (st == VG_OK) st = vg_suite_add_file(s, la, err);
    vg_lines_close(la);
    vg_fields_free(&fq);
    vg_fields_free(&fa);
    return st;
}
