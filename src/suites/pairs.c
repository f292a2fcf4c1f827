/* pairs.c - reading word-pair similarity files, with layout detection.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/arena.h"
#include "../common/lines.h"
#include "fields.h"
#include "suite_impl.h"

/* Lines looked at before the real pass to decide the delimiter, the
 * rating column and the header lines. Enough to outvote one odd line
 * (a stray trailing tab), few enough to cost nothing. */
#define SAMPLE_LINES 64
/* Only the first data line may be a header: a second line without a
 * rating is a broken row, reported as such, never dropped unseen. */
#define MAX_HEADER_LINES 1

void vg_pairs_layout_init(vg_pairs_layout *layout) {
    memset(layout, 0, sizeof *layout);
    layout->header_lines = -1;
    layout->comment[0] = '#';
}

static int is_comment(const char *line, size_t len, const char *prefix) {
    size_t pl = strnlen(prefix, sizeof ((vg_pairs_layout *)0)->comment);
    return pl && len >= pl && memcmp(line, prefix, pl) == 0;
}

static int is_blank(const char *line, size_t len) { return strspn(line, " \t") >= len; }

/* The first lines that hold data (or a header), copied. */
typedef struct sample {
    char *line[SAMPLE_LINES];
    size_t len[SAMPLE_LINES];
    size_t n;
    vg_arena arena;
} sample;

static vg_status read_sample(vg_lines *lr, const vg_pairs_layout *lay, sample *sm,
                             vg_error *err) {
    int raw_skip = lay->header_lines > 0 ? lay->header_lines : 0;
    char *line;
    size_t len;
    int rc = 0;
    while (sm->n < SAMPLE_LINES && (rc = vg_lines_next(lr, &line, &len, err)) > 0) {
        if (raw_skip > 0) {
            raw_skip--;
            continue;
        }
        if (is_blank(line, len) || is_comment(line, len, lay->comment)) continue;
        /* Trailing blanks (a stray tab) say nothing about the layout. */
        while (len > 0 && (line[len - 1] == ' ' || line[len - 1] == '\t')) len--;
        sm->line[sm->n] = vg_arena_strndup(&sm->arena, line, len);
        if (!sm->line[sm->n]) return vg_error_set(err, VG_ENOMEM, vg_lines_path(lr), 0, "out of memory");
        sm->len[sm->n++] = len;
    }
    if (sm->n < SAMPLE_LINES && rc < 0) return err->code;
    return VG_OK;
}

/* 1 when a field begins as a number does ("0x10", "5e-99999", "-.5x"):
 * where a rating goes, that is a rating written wrong, not a column
 * name, so its line is a row (whose error the real pass reports), never
 * a header dropped unseen. */
static int starts_numeric(const char *s) {
    if (*s == '+' || *s == '-') s++;
    if (*s == '.') s++;
    return *s >= '0' && *s <= '9';
}

/* Column (1-based) of the first field after the words that reads as a
 * number, or 0 when there is none. */
static unsigned first_number_col(const vg_fields *f, unsigned after) {
    for (size_t i = after; i < f->n; i++) {
        double d;
        if (vg_parse_double(f->field[i], f->flen[i], &d) == 0) return (unsigned)i + 1;
    }
    return 0;
}

/* Fill the layout's undecided parts (delimiter 0, rating column 0, header
 * lines -1) from a sample of the file. *skip_data gets the number of
 * leading data lines that are a header. The rules, in order:
 *  - delimiter: of tab, comma and blanks, the one that splits the most
 *    sample lines into enough fields (a stray tab on one line does not
 *    outvote blanks on the others);
 *  - rating column: the first numeric column after the two words, the
 *    most common such column over the sample (SimLex-999 and SimVerb-3500
 *    have a part-of-speech column before the rating);
 *  - header: leading lines whose rating column is not a number. */
static vg_status detect(vg_lines *lr, vg_pairs_layout *lay, unsigned c1, unsigned c2,
                        int *skip_data, vg_error *err) {
    *skip_data = 0;
    if (lay->delimiter && lay->col_rating && lay->header_lines >= 0) return VG_OK;
    const char *path = vg_lines_path(lr);
    sample sm;
    memset(&sm, 0, sizeof sm);
    vg_fields f = VG_FIELDS_INIT;
    /* The sample is read from the same reader as the real pass, which
     * then starts again from the kept lines: a pipe is read once. */
    vg_lines_keep(lr);
    vg_status st = read_sample(lr, lay, &sm, err);
    vg_lines_rewind(lr);
    if (st != VG_OK || sm.n == 0) goto done;
    unsigned words = VG_MAX(c1, c2);
    unsigned need = lay->col_rating ? VG_MAX(words, lay->col_rating) : words + 1;
    size_t from = sm.n > 1 ? 1 : 0;
    if (!lay->delimiter) {
        static const char cands[] = {'\t', ',', ' '};
        size_t best = 0;
        lay->delimiter = ' ';
        for (size_t k = 0; k < sizeof cands; k++) {
            size_t good = 0;
            for (size_t i = 0; i < sm.n; i++) {
                if (cands[k] != ' ' && !memchr(sm.line[i], cands[k], sm.len[i])) continue;
                /* A line libcsv rejects counts as not fitting. */
                vg_error ignored;
                if (vg_fields_split(&f, sm.line[i], sm.len[i], cands[k], path, 0, &ignored) ==
                        VG_OK &&
                    f.n >= need)
                    good++;
            }
            /* Strictly more lines than an earlier candidate: on a tie the
             * order tab, comma, blank wins (a tab file with spaces inside
             * entries also splits on blanks). */
            if (good > best) {
                best = good;
                lay->delimiter = cands[k];
            }
        }
    }
    if (!lay->col_rating) {
        size_t votes[64] = {0};
        for (size_t i = from; i < sm.n; i++) {
            vg_error ignored;
            if (vg_fields_split(&f, sm.line[i], sm.len[i], lay->delimiter, path, 0, &ignored) !=
                VG_OK)
                continue;
            unsigned c = first_number_col(&f, words);
            if (c > 0 && c < 64) votes[c]++;
        }
        unsigned best = 0;
        for (unsigned c = 1; c < 64; c++)
            if (votes[c] > (best ? votes[best] : 0)) best = c;
        lay->col_rating = best ? best : words + 1;
    }
    if (lay->header_lines < 0) {
        unsigned cr = lay->col_rating;
        size_t k = 0;
        while (k < sm.n) {
            vg_error ignored;
            double d;
            /* A header has the columns of a row but no number where the
             * rating goes; a line short of columns is a broken row. */
            if (vg_fields_split(&f, sm.line[k], sm.len[k], lay->delimiter, path, 0, &ignored) !=
                    VG_OK ||
                f.n < VG_MAX(cr, words) ||
                vg_parse_double(f.field[cr - 1], f.flen[cr - 1], &d) == 0 ||
                starts_numeric(f.field[cr - 1]))
                break;
            k++;
        }
        /* When no sample line has a rating, only the first is a header:
         * the real pass then reports the second as the bad line. */
        if (k == sm.n && k > 1) k = 1;
        *skip_data = (int)VG_MIN(k, (size_t)MAX_HEADER_LINES);
    }
done:
    vg_arena_free(&sm.arena);
    vg_fields_free(&f);
    return st;
}

static vg_status add_raters(vg_suite *s, vg_pair *p, const vg_fields *f, unsigned col_raters,
                            const char *path, uint64_t lineno, vg_error *err) {
    if (!col_raters || f->n < col_raters) return VG_OK;
    size_t nr = f->n - (col_raters - 1);
    double *r = vg_arena_alloc(vg_suite_arena(s), nr * sizeof *r);
    if (!r) return vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
    for (size_t j = 0; j < nr; j++) {
        size_t col = col_raters - 1 + j;
        if (vg_parse_double(f->field[col], f->flen[col], &r[j]) != 0) {
            vg_error_set(err, VG_EVALUE, path, lineno,
                         "expected a rater's score in column %zu, found '%.40s'", col + 1,
                         f->field[col]);
            err->column = col + 1;
            return VG_EVALUE;
        }
    }
    p->raters = r;
    p->n_raters = nr;
    return VG_OK;
}

vg_status vg_suite_read_pairs(const char *path, const char *id, const vg_pairs_layout *layout,
                              vg_suite **out, vg_error *err) {
    *out = NULL;
    vg_pairs_layout lay;
    if (layout)
        lay = *layout;
    else
        vg_pairs_layout_init(&lay);
    unsigned c1 = lay.col_w1 ? lay.col_w1 : 1, c2 = lay.col_w2 ? lay.col_w2 : 2;

    char stem[256];
    vg_suite *s = vg_suite_new(VG_TASK_SIMILARITY,
                               id && *id ? id : vg_path_stem(path, stem, sizeof stem));
    if (!s) return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
    vg_lines *lr = NULL;
    vg_fields f = VG_FIELDS_INIT;
    int skip_data = 0;
    vg_status st = vg_lines_open(path, &lr, err);
    if (st != VG_OK) goto done;
    st = detect(lr, &lay, c1, c2, &skip_data, err);
    if (st != VG_OK) goto done;

    unsigned cr = lay.col_rating;
    unsigned need = VG_MAX(c1, VG_MAX(c2, cr));
    char delim = lay.delimiter;
    int raw_skip = lay.header_lines > 0 ? lay.header_lines : 0;
    char *line;
    size_t len;
    int rc;
    while ((rc = vg_lines_next(lr, &line, &len, err)) > 0) {
        uint64_t lineno = vg_lines_number(lr);
        if (raw_skip > 0) {
            raw_skip--;
            s->stats.header_lines++;
            continue;
        }
        if (is_blank(line, len) || is_comment(line, len, lay.comment)) {
            s->stats.comment_lines++;
            continue;
        }
        if (skip_data > 0) {
            skip_data--;
            s->stats.header_lines++;
            continue;
        }
        st = vg_fields_split(&f, line, len, delim, path, lineno, err);
        if (st != VG_OK) goto done;
        if (f.n < need) {
            st = vg_error_set(err, VG_EFORMAT, path, lineno,
                              "expected word 1, word 2 and a rating in %u columns "
                              "(%s-separated), found %zu field%s",
                              need, delim == '\t' ? "tab" : delim == ',' ? "comma" : "blank", f.n,
                              f.n == 1 ? "" : "s");
            goto done;
        }
        double rating;
        if (vg_parse_double(f.field[cr - 1], f.flen[cr - 1], &rating) != 0) {
            st = vg_error_set(err, VG_EVALUE, path, lineno,
                              "expected a rating in column %u, found '%.40s'", cr,
                              f.field[cr - 1]);
            err->column = cr;
            goto done;
        }
        unsigned wc[2] = {c1, c2};
        for (int k = 0; k < 2; k++)
            if (f.flen[wc[k] - 1] == 0) {
                st = vg_error_set(err, VG_EFORMAT, path, lineno,
                                  "expected word %d in column %u, found an empty field", k + 1,
                                  wc[k]);
                err->column = wc[k];
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
        st = add_raters(s, p, &f, lay.col_raters, path, lineno, err);
        if (st != VG_OK) goto done;
    }
    if (rc < 0) {
        st = err->code;
        goto done;
    }
    if (s->n_items == 0) {
        st = vg_error_set(err, VG_EFORMAT, path, 0, "no word pairs found");
        goto done;
    }
    snprintf(s->layout_detected, sizeof s->layout_detected,
             "%s-separated, rating in column %u, %zu header line%s%s%s",
             delim == '\t' ? "tab" : delim == ',' ? "comma" : "blank", cr, s->stats.header_lines,
             s->stats.header_lines == 1 ? "" : "s", vg_lines_saw_crlf(lr) ? ", CRLF" : "",
             vg_lines_saw_bom(lr) ? ", BOM" : "");
    st = vg_suite_count_pair_stats(s, err);
    if (st == VG_OK) st = vg_suite_add_file(s, lr, err);

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
