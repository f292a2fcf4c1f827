/* analogies.c - reading analogy question files: the sectioned layout
 * (": section" lines, then "a b c d") and plain four-column files.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <string.h>

#include "../common/alloc.h"
#include "../common/lines.h"
#include "fields.h"
#include "suite_impl.h"

/* Start a new section named name[0..n) at the current item. */
static vg_status open_section(vg_suite *s, size_t *cap, const char *name, size_t n,
                              const char *path, uint64_t lineno, vg_error *err) {
    if (vg_grow((void **)&s->sections, cap, s->n_sections + 1, sizeof *s->sections) != 0)
        return vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
    vg_section *sec = &s->sections[s->n_sections];
    memset(sec, 0, sizeof *sec);
    sec->name = vg_suite_intern(s, name, n);
    if (!sec->name) return vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
    sec->first = s->n_items;
    s->n_sections++;
    return VG_OK;
}

static vg_status add_question(vg_suite *s, const vg_fields *f, const char *path,
                              uint64_t lineno, vg_error *err) {
    vg_question *q = vg_suite_add_question(s);
    const char **answers = vg_arena_alloc(vg_suite_arena(s), sizeof *answers);
    if (!q || !answers) return vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
    q->a = vg_suite_intern(s, f->field[0], f->flen[0]);
    q->b = vg_suite_intern(s, f->field[1], f->flen[1]);
    q->c = vg_suite_intern(s, f->field[2], f->flen[2]);
    answers[0] = vg_suite_intern(s, f->field[3], f->flen[3]);
    if (!q->a || !q->b || !q->c || !answers[0])
        return vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
    q->answers = answers;
    q->n_answers = 1;
    q->line = lineno;
    q->section = s->n_sections - 1;
    s->sections[q->section].count++;
    return VG_OK;
}

static vg_status read_sectioned(const char *path, vg_suite *s, vg_analogy_layout layout,
                                vg_error *err) {
    vg_lines *lr = NULL;
    vg_fields f = VG_FIELDS_INIT;
    size_t cap_sections = 0;
    int saw_section = 0;
    vg_status st = vg_lines_open(path, &lr, err);
    if (st != VG_OK) return st;
    char *line;
    size_t len;
    int rc;
    while ((rc = vg_lines_next(lr, &line, &len, err)) > 0) {
        uint64_t lineno = vg_lines_number(lr);
        size_t lead = strspn(line, " \t");
        if (lead == len) {
            s->stats.comment_lines++;
            continue;
        }
        if (line[lead] == ':') {
            if (layout == VG_ANALOGY_PLAIN4) {
                st = vg_error_set(err, VG_EFORMAT, path, lineno,
                                  "expected four words, found a section line");
                goto done;
            }
            const char *name = line + lead + 1;
            size_t n = len - lead - 1;
            while (n && (*name == ' ' || *name == '\t')) name++, n--;
            while (n && (name[n - 1] == ' ' || name[n - 1] == '\t')) n--;
            if (n == 0) {
                st = vg_error_set(err, VG_EFORMAT, path, lineno,
                                  "expected a section name after ':'");
                goto done;
            }
            st = open_section(s, &cap_sections, name, n, path, lineno, err);
            if (st != VG_OK) goto done;
            saw_section = 1;
            continue;
        }
        if (line[lead] == '#') {
            s->stats.comment_lines++;
            continue;
        }
        st = vg_fields_split(&f, line, len, ' ', path, lineno, err);
        if (st != VG_OK) goto done;
        if (f.n != 4) {
            st = vg_error_set(err, VG_EFORMAT, path, lineno,
                              "expected four words 'a b c d' (a : b :: c : d), found %zu field%s",
                              f.n, f.n == 1 ? "" : "s");
            goto done;
        }
        if (s->n_sections == 0) {
            /* Questions before any section line: one unnamed section. */
            st = open_section(s, &cap_sections, "", 0, path, lineno, err);
            if (st != VG_OK) goto done;
        }
        st = add_question(s, &f, path, lineno, err);
        if (st != VG_OK) goto done;
    }
    if (rc < 0) {
        st = err->code;
        goto done;
    }
    if (s->n_items == 0) {
        st = vg_error_set(err, VG_EFORMAT, path, 0, "no analogy questions found");
        goto done;
    }
    snprintf(s->layout_detected, sizeof s->layout_detected, "%s, %zu section%s%s",
             saw_section ? "sectioned" : "four columns", s->n_sections,
             s->n_sections == 1 ? "" : "s", vg_lines_saw_crlf(lr) ? ", CRLF" : "");
done:
    vg_lines_close(lr);
    vg_fields_free(&f);
    return st;
}

vg_status vg_suite_read_analogies(const char *path, const char *answers_path, const char *id,
                                  vg_analogy_layout layout, vg_suite **out, vg_error *err) {
    *out = NULL;
    if (layout == VG_ANALOGY_RELATION || layout == VG_ANALOGY_SPLIT || answers_path)
        return vg_error_set(err, VG_EUNSUPPORTED, path, 0,
                            "this analogy layout is not read yet");
    char stem[256];
    vg_suite *s = vg_suite_new(VG_TASK_ANALOGY, id && *id ? id : vg_path_stem(path, stem, sizeof stem));
    if (!s) return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
    vg_status st = read_sectioned(path, s, layout, err);
    if (st == VG_OK) st = vg_suite_add_file(s, path, err);
    if (st != VG_OK) {
        vg_suite_free(s);
        return st;
    }
    *out = s;
    return VG_OK;
}
