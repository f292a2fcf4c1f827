/* analogies.c - reading analogy question files: layout detection, the
 * sectioned layout (": section" lines, then "a b c d") and plain
 * four-column files; the relation and split layouts are in relation.c
 * and split.c.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <string.h>
#include <sys/stat.h>

#include "../common/alloc.h"
#include "../common/lines.h"
#include "fields.h"
#include "suite_impl.h"

const char *vg_analogy_layout_name(vg_analogy_layout layout) {
    switch (layout) {
    case VG_ANALOGY_AUTO: return "auto";
    case VG_ANALOGY_SECTIONED: return "sectioned";
    case VG_ANALOGY_PLAIN4: return "four-column";
    case VG_ANALOGY_RELATION: return "relation";
    case VG_ANALOGY_SPLIT: return "split";
    }
    return "unknown";
}

vg_status vg_analogy_layout_parse(const char *name, vg_analogy_layout *out) {
    static const vg_analogy_layout all[] = {VG_ANALOGY_AUTO, VG_ANALOGY_SECTIONED,
                                            VG_ANALOGY_PLAIN4, VG_ANALOGY_RELATION,
                                            VG_ANALOGY_SPLIT};
    for (size_t i = 0; i < sizeof all / sizeof all[0]; i++)
        if (strcmp(name, vg_analogy_layout_name(all[i])) == 0) {
            *out = all[i];
            return VG_OK;
        }
    return VG_EINVAL;
}

vg_status vg_suite_open_section(vg_suite *s, const char *name, size_t n, const char *path,
                                uint64_t lineno, vg_error *err) {
    vg_suite_priv *p = s->priv_;
    if (vg_grow((void **)&s->sections, &p->cap_sections, s->n_sections + 1,
                sizeof *s->sections) != 0)
        return vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
    vg_section *sec = &s->sections[s->n_sections];
    memset(sec, 0, sizeof *sec);
    sec->name = vg_suite_intern(s, name, n);
    if (!sec->name) return vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
    sec->first = s->n_items;
    s->n_sections++;
    return VG_OK;
}

vg_status vg_suite_add_abc(vg_suite *s, const char *const w[3], const size_t wlen[3],
                           const char *const *answers, size_t n_answers, uint64_t lineno,
                           const char *path, vg_error *err) {
    VG_ASSERT(s->n_sections > 0 && n_answers > 0);
    vg_question *q = vg_suite_add_question(s);
    if (!q) return vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
    q->a = vg_suite_intern(s, w[0], wlen[0]);
    q->b = vg_suite_intern(s, w[1], wlen[1]);
    q->c = vg_suite_intern(s, w[2], wlen[2]);
    if (!q->a || !q->b || !q->c) return vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
    q->answers = answers;
    q->n_answers = n_answers;
    q->line = lineno;
    q->section = s->n_sections - 1;
    s->sections[q->section].count++;
    return VG_OK;
}

/* One answer, interned, as a one-element array in the suite's arena. */
static const char *const *one_answer(vg_suite *s, const char *w, size_t n) {
    const char **answers = vg_arena_alloc(vg_suite_arena(s), sizeof *answers);
    if (!answers) return NULL;
    answers[0] = vg_suite_intern(s, w, n);
    return answers[0] ? answers : NULL;
}

static vg_status read_sectioned(vg_lines *lr, vg_suite *s, vg_analogy_layout layout,
                                vg_error *err) {
    const char *path = vg_lines_path(lr);
    vg_fields f = VG_FIELDS_INIT;
    int saw_section = 0;
    vg_status st = VG_OK;
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
            st = vg_suite_open_section(s, name, n, path, lineno, err);
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
            st = vg_suite_open_section(s, "", 0, path, lineno, err);
            if (st != VG_OK) goto done;
        }
        const char *const *ans = one_answer(s, f.field[3], f.flen[3]);
        if (!ans) {
            st = vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
            goto done;
        }
        st = vg_suite_add_abc(s, (const char *const *)f.field, f.flen, ans, 1, lineno, path, err);
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
    st = vg_suite_add_file(s, lr, err);
done:
    vg_fields_free(&f);
    return st;
}

/* Decide the layout of a file from its first lines: a ':' line means
 * sectioned; otherwise the number of fields of the first question line
 * (4: four columns, 2: a relation file "word<TAB>answers", 3: a
 * questions file whose answers are in another file). */
static vg_status detect(vg_lines *lr, vg_analogy_layout *out, vg_error *err) {
    const char *path = vg_lines_path(lr);
    vg_fields f = VG_FIELDS_INIT;
    vg_status st = VG_OK;
    /* The reader then starts again from the kept lines: a pipe is read
     * once. */
    vg_lines_keep(lr);
    char *line;
    size_t len;
    int rc;
    *out = VG_ANALOGY_AUTO;
    while ((rc = vg_lines_next(lr, &line, &len, err)) > 0) {
        size_t lead = strspn(line, " \t");
        if (lead == len || line[lead] == '#') continue;
        if (line[lead] == ':') {
            *out = VG_ANALOGY_SECTIONED;
            break;
        }
        char delim = memchr(line, '\t', len) ? '\t' : ' ';
        st = vg_fields_split(&f, line, len, delim, path, vg_lines_number(lr), err);
        if (st != VG_OK) break;
        if (delim == '\t' && (f.n < 2 || f.n > 4)) {
            /* Tabs that are not the delimiter (a stray one): try blanks. */
            st = vg_fields_split(&f, line, len, ' ', path, vg_lines_number(lr), err);
            if (st != VG_OK) break;
        }
        if (f.n == 4) {
            *out = VG_ANALOGY_PLAIN4;
        } else if (f.n == 2) {
            *out = VG_ANALOGY_RELATION;
        } else if (f.n == 3) {
            *out = VG_ANALOGY_SPLIT;
        } else {
            st = vg_error_set(err, VG_EFORMAT, path, vg_lines_number(lr),
                              "cannot tell the analogy layout: expected ': section', four "
                              "words 'a b c d', 'word<TAB>answer/answer' or three question "
                              "words, found %zu field%s",
                              f.n, f.n == 1 ? "" : "s");
        }
        break;
    }
    if (st == VG_OK && rc < 0) st = err->code;
    if (st == VG_OK && *out == VG_ANALOGY_AUTO)
        st = vg_error_set(err, VG_EFORMAT, path, 0, "no analogy questions found");
    vg_lines_rewind(lr);
    vg_fields_free(&f);
    return st;
}

/* "x.questions" -> "x.answers" beside it, the naming of the MSR
 * distribution (from memory); NULL when path does not end so. */
static char *sibling_answers(const char *path) {
    size_t n = strlen(path);
    static const char q[] = ".questions";
    if (n <= sizeof q - 1 || strcmp(path + n - (sizeof q - 1), q) != 0) return NULL;
    char *a = vg_malloc(n + 1);
    if (!a) return NULL;
    memcpy(a, path, n - (sizeof q - 1));
    strcpy(a + n - (sizeof q - 1), ".answers");
    return a;
}

vg_status vg_suite_read_analogies(const char *path, const char *answers_path, const char *id,
                                  vg_analogy_layout layout, vg_suite **out, vg_error *err) {
    *out = NULL;
    struct stat sb;
    int is_dir = stat(path, &sb) == 0 && S_ISDIR(sb.st_mode);
    vg_status st = VG_OK;
    char *sibling = NULL;
    vg_lines *lr = NULL;
    if (is_dir && layout != VG_ANALOGY_AUTO && layout != VG_ANALOGY_RELATION)
        return vg_error_set(err, VG_EFORMAT, path, 0,
                            "a directory holds one file per relation; the %s layout needs a file",
                            vg_analogy_layout_name(layout));
    if (is_dir) {
        layout = VG_ANALOGY_RELATION;
    } else {
        /* One reader for detection and the reading itself. */
        if ((st = vg_lines_open(path, &lr, err)) != VG_OK) return st;
        if (layout == VG_ANALOGY_AUTO) {
            if (answers_path)
                layout = VG_ANALOGY_SPLIT;
            else if ((st = detect(lr, &layout, err)) != VG_OK)
                goto done;
        }
    }
    if (layout == VG_ANALOGY_SPLIT && !answers_path) {
        sibling = sibling_answers(path);
        if (!sibling) {
            st = vg_error_set(err, VG_EFORMAT, path, 0,
                              "three words per line: a questions file needs its answers file "
                              "(name it NAME.answers beside NAME.questions)");
            goto done;
        }
        answers_path = sibling;
    }
    char stem[256];
    vg_suite *s = vg_suite_new(VG_TASK_ANALOGY, id && *id ? id : vg_path_stem(path, stem, sizeof stem));
    if (!s) {
        st = vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
        goto done;
    }
    switch (layout) {
    case VG_ANALOGY_RELATION: st = vg_suite_read_relation(path, lr, s, err); break;
    case VG_ANALOGY_SPLIT: st = vg_suite_read_split(lr, answers_path, s, err); break;
    default: st = read_sectioned(lr, s, layout, err); break;
    }
    if (st == VG_OK) st = vg_suite_count_question_stats(s, err);
    if (st != VG_OK) {
        vg_suite_free(s);
        goto done;
    }
    *out = s;
done:
    vg_lines_close(lr);
    vg_free(sibling);
    return st;
}
