/* pairs.c - reading word-pair similarity files.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/lines.h"
#include "fields.h"
#include "suite_impl.h"

void vg_pairs_layout_init(vg_pairs_layout *layout) {
    memset(layout, 0, sizeof *layout);
    layout->header_lines = -1;
    layout->comment[0] = '#';
}

static int is_comment(const char *line, size_t len, const char *prefix) {
    size_t pl = strlen(prefix);
    return pl && len >= pl && memcmp(line, prefix, pl) == 0;
}

vg_status vg_suite_read_pairs(const char *path, const char *id, const vg_pairs_layout *layout,
                              vg_suite **out, vg_error *err) {
    *out = NULL;
    vg_pairs_layout lay;
    if (layout)
        lay = *layout;
    else
        vg_pairs_layout_init(&lay);
    unsigned c1 = lay.col_w1 ? lay.col_w1 : 1, c2 = lay.col_w2 ? lay.col_w2 : 2,
             cr = lay.col_rating ? lay.col_rating : 3;
    unsigned need = VG_MAX(c1, VG_MAX(c2, cr));

    char stem[256];
    vg_suite *s = vg_suite_new(VG_TASK_SIMILARITY,
                               id && *id ? id : vg_path_stem(path, stem, sizeof stem));
    if (!s) return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
    vg_lines *lr = NULL;
    vg_fields f = VG_FIELDS_INIT;
    vg_status st = vg_lines_open(path, &lr, err);
    if (st != VG_OK) goto done;

    char delim = lay.delimiter;
    int header_left = lay.header_lines; /* -1: detect on the first data line */
    char *line;
    size_t len;
    int rc;
    while ((rc = vg_lines_next(lr, &line, &len, err)) > 0) {
        uint64_t lineno = vg_lines_number(lr);
        if (header_left > 0) {
            header_left--;
            s->stats.header_lines++;
            continue;
        }
        if (len == 0 || strspn(line, " \t") == len || is_comment(line, len, lay.comment)) {
            s->stats.comment_lines++;
            continue;
        }
        if (!delim) delim = vg_fields_guess_delim(line, len);
        st = vg_fields_split(&f, line, len, delim, path, lineno, err);
        if (st != VG_OK) goto done;
        double rating;
        int rating_ok = f.n >= need && vg_parse_double(f.field[cr - 1], f.flen[cr - 1], &rating) == 0;
        if (header_left < 0) {
            /* The first data line decides: a rating that is not a number
             * means a header line ("Word 1,Word 2,Human (mean)"). */
            header_left = 0;
            if (!rating_ok && f.n >= need && s->n_items == 0) {
                s->stats.header_lines++;
                continue;
            }
        }
        if (f.n < need) {
            st = vg_error_set(err, VG_EFORMAT, path, lineno,
                              "expected word 1, word 2 and a rating in %u columns, found %zu "
                              "field%s",
                              need, f.n, f.n == 1 ? "" : "s");
            goto done;
        }
        if (!rating_ok) {
            st = vg_error_set(err, VG_EVALUE, path, lineno,
                              "expected a rating in column %u, found '%.40s'", cr,
                              f.field[cr - 1]);
            err->column = cr;
            goto done;
        }
        vg_pair *p = vg_suite_add_pair(s);
        if (!p) {
            st = vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
            goto done;
        }
        p->w1 = vg_suite_intern(s, f.field[c1 - 1], f.flen[c1 - 1]);
        p->w2 = vg_suite_intern(s, f.field[c2 - 1], f.flen[c2 - 1]);
        p->rating = rating;
        p->line = lineno;
        if (!p->w1 || !p->w2) {
            st = vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
            goto done;
        }
        if (lay.col_raters && f.n >= lay.col_raters) {
            size_t nr = f.n - (lay.col_raters - 1);
            double *r = vg_arena_alloc(vg_suite_arena(s), nr * sizeof *r);
            if (!r) {
                st = vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
                goto done;
            }
            for (size_t j = 0; j < nr; j++) {
                size_t col = lay.col_raters - 1 + j;
                if (vg_parse_double(f.field[col], f.flen[col], &r[j]) != 0) {
                    st = vg_error_set(err, VG_EVALUE, path, lineno,
                                      "expected a rater's score in column %zu, found '%.40s'",
                                      col + 1, f.field[col]);
                    err->column = col + 1;
                    goto done;
                }
            }
            p->raters = r;
            p->n_raters = nr;
        }
    }
    if (rc < 0) {
        st = err->code;
        goto done;
    }
    if (s->n_items == 0) {
        st = vg_error_set(err, VG_EFORMAT, path, 0, "no word pairs found");
        goto done;
    }
    snprintf(s->layout_detected, sizeof s->layout_detected, "%s-separated, %zu header line%s%s",
             delim == '\t' ? "tab" : delim == ',' ? "comma" : "blank", s->stats.header_lines,
             s->stats.header_lines == 1 ? "" : "s", vg_lines_saw_crlf(lr) ? ", CRLF" : "");
    st = vg_suite_count_pair_stats(s, err);
    if (st == VG_OK) st = vg_suite_add_file(s, path, err);

done:
    vg_lines_close(lr);
    vg_fields_free(&f);
    if (st != VG_OK) {
        vg_suite_free(s);
        return st;
    }
    *out = s;
    return VG_OK;
}
