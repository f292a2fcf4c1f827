/* relation.c - the one-file-per-relation analogy layout: each line is
 * "word<TAB>answer1/answer2/...", and the questions of a file are all
 * ordered pairs of its distinct lines (BATS, Gladkova et al. 2016).
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <dirent.h>
#include <stdlib.h>
#include <string.h>
#include <strings.h>
#include <sys/stat.h>

#include "../common/alloc.h"
#include "../common/lines.h"
#include "fields.h"
#include "suite_impl.h"

/* A relation file of n lines makes n * (n - 1) questions; this bounds
 * the total so that a wrong file cannot exhaust memory (2 million
 * questions hold about 130 MB). BATS 3.0 has 40
 * files of 50 lines, 98,000 questions (50 * 49 * 40). */
#define MAX_QUESTIONS 2000000u
/* How deep a directory of relation files is searched. */
#define MAX_DEPTH 4

/* One line of a relation file, interned into the suite. */
typedef struct rel_line {
    const char *word;
    const char **answers;
    size_t n_answers;
    uint64_t line;
} rel_line;

/* Split "ans1/ans2/..." into interned answers; empty pieces are skipped. */
static vg_status split_answers(vg_suite *s, rel_line *r, const char *field, size_t n,
                               const char *path, vg_error *err) {
    size_t count = 1;
    for (size_t i = 0; i < n; i++) count += field[i] == '/';
    r->answers = vg_arena_alloc(vg_suite_arena(s), count * sizeof *r->answers);
    if (!r->answers) return vg_error_set(err, VG_ENOMEM, path, r->line, "out of memory");
    r->n_answers = 0;
    size_t b = 0;
    for (size_t i = 0; i <= n; i++) {
        if (i < n && field[i] != '/') continue;
        size_t lo = b, hi = i;
        while (lo < hi && (field[lo] == ' ' || field[lo] == '\t')) lo++;
        while (hi > lo && (field[hi - 1] == ' ' || field[hi - 1] == '\t')) hi--;
        if (hi > lo) {
            const char *a = vg_suite_intern(s, field + lo, hi - lo);
            if (!a) return vg_error_set(err, VG_ENOMEM, path, r->line, "out of memory");
            r->answers[r->n_answers++] = a;
        }
        b = i + 1;
    }
    if (r->n_answers == 0)
        return vg_error_set(err, VG_EFORMAT, path, r->line,
                            "expected at least one answer after the word, found none");
    return VG_OK;
}

/* Read one relation file (open in lr) as one section named name, in
 * group (or NULL). */
static vg_status read_file(vg_suite *s, vg_lines *lr, const char *name, const char *group,
                           vg_error *err) {
    const char *path = vg_lines_path(lr);
    vg_fields f = VG_FIELDS_INIT;
    rel_line *lines = NULL;
    size_t n = 0, cap = 0;
    vg_status st = VG_OK;
    char *line;
    size_t len;
    int rc;
    while ((rc = vg_lines_next(lr, &line, &len, err)) > 0) {
        uint64_t lineno = vg_lines_number(lr);
        size_t lead = strspn(line, " \t");
        if (lead == len || line[lead] == '#') {
            s->stats.comment_lines++;
            continue;
        }
        char delim = memchr(line, '\t', len) ? '\t' : ' ';
        st = vg_fields_split(&f, line, len, delim, path, lineno, err);
        if (st != VG_OK) goto done;
        if (f.n != 2) {
            st = vg_error_set(err, VG_EFORMAT, path, lineno,
                              "expected 'word<TAB>answer1/answer2/...' (two fields), found %zu "
                              "field%s",
                              f.n, f.n == 1 ? "" : "s");
            goto done;
        }
        if (vg_grow((void **)&lines, &cap, n + 1, sizeof *lines) != 0) {
            st = vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
            goto done;
        }
        rel_line *r = &lines[n];
        memset(r, 0, sizeof *r);
        r->line = lineno;
        r->word = vg_suite_intern(s, f.field[0], f.flen[0]);
        if (!r->word) {
            st = vg_error_set(err, VG_ENOMEM, path, lineno, "out of memory");
            goto done;
        }
        st = split_answers(s, r, f.field[1], f.flen[1], path, err);
        if (st != VG_OK) goto done;
        n++;
    }
    if (rc < 0) {
        st = err->code;
        goto done;
    }
    if (n < 2) {
        st = vg_error_set(err, VG_EFORMAT, path, 0,
                          "a relation file needs at least two lines to make a question, found %zu",
                          n);
        goto done;
    }
    size_t total;
    if (vg_mul_overflow(n, n - 1, &total) || vg_add_overflow(total, s->n_items, &total) ||
        total > MAX_QUESTIONS) {
        st = vg_error_set(err, VG_ELIMIT, path, 0,
                          "%zu lines make more than %u questions in all", n,
                          (unsigned)MAX_QUESTIONS);
        goto done;
    }
    st = vg_suite_open_section(s, name, strlen(name), path, 0, err);
    if (st != VG_OK) goto done;
    if (group) {
        s->sections[s->n_sections - 1].group = vg_suite_intern(s, group, strlen(group));
        if (!s->sections[s->n_sections - 1].group) {
            st = vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
            goto done;
        }
    }
    /* a : b :: c : d for every ordered pair of lines (i, j), i != j: the
     * pair of line i is the example (its first answer as b), line j the
     * question, any answer of line j counting as correct. */
    for (size_t i = 0; i < n; i++)
        for (size_t j = 0; j < n; j++) {
            if (i == j) continue;
            vg_question *q = vg_suite_add_question(s);
            if (!q) {
                st = vg_error_set(err, VG_ENOMEM, path, lines[j].line, "out of memory");
                goto done;
            }
            q->a = lines[i].word;
            q->b = lines[i].answers[0];
            q->c = lines[j].word;
            q->answers = lines[j].answers;
            q->n_answers = lines[j].n_answers;
            q->line = lines[j].line;
            q->section = s->n_sections - 1;
            s->sections[q->section].count++;
        }
    st = vg_suite_add_file(s, lr, err);
done:
    vg_free(lines);
    vg_fields_free(&f);
    return st;
}

/* Relation files under a directory: relative paths, collected depth-first,
 * with the device and inode of each (to find one reached twice). */
typedef struct rel_file {
    char *rel;
    dev_t dev;
    ino_t ino;
} rel_file;

typedef struct file_list {
    rel_file *f;
    size_t n, cap;
    const char *root;
    char *real_root;    /* the folder, links resolved */
} file_list;

static int is_relation_name(const char *name) {
    size_t n = strlen(name);
    if (name[0] == '.' || n < 5 || strcasecmp(name + n - 4, ".txt") != 0) return 0;
    /* Documentation beside the data is not a relation. */
    return strncasecmp(name, "readme", 6) != 0 && strncasecmp(name, "licen", 5) != 0;
}

/* 1 when the directory link full leads inside the folder. */
static int link_inside(const file_list *fl, const char *full) {
    char *real = realpath(full, NULL);
    if (!real) return 0;
    size_t n = strlen(fl->real_root);
    int inside = strncmp(real, fl->real_root, n) == 0 && (real[n] == '/' || real[n] == '\0' ||
                                                          (n == 1 && fl->real_root[0] == '/'));
    free(real);
    return inside;
}

static vg_status collect(file_list *fl, const char *rel, int depth, vg_error *err) {
    const char *root = fl->root;
    char dir[4096];
    if ((size_t)snprintf(dir, sizeof dir, "%s%s%s", root, *rel ? "/" : "", rel) >= sizeof dir)
        return vg_error_set(err, VG_ELIMIT, root, 0, "path too long");
    DIR *d = opendir(dir);
    if (!d) return vg_error_set(err, VG_EIO, dir, 0, "cannot open directory");
    vg_status st = VG_OK;
    struct dirent *de;
    while (st == VG_OK && (de = readdir(d)) != NULL) {
        if (de->d_name[0] == '.') continue;
        char sub[4096], full[4096];
        if ((size_t)snprintf(sub, sizeof sub, "%s%s%s", rel, *rel ? "/" : "", de->d_name) >=
                sizeof sub ||
            (size_t)snprintf(full, sizeof full, "%s/%s", root, sub) >= sizeof full) {
            st = vg_error_set(err, VG_ELIMIT, dir, 0, "path too long");
            break;
        }
        struct stat lsb, sb;
        if (lstat(full, &lsb) != 0 || stat(full, &sb) != 0) continue;
        if (S_ISDIR(sb.st_mode)) {
            /* A link to a folder is followed only when it stays inside:
             * a relation folder never reads files from elsewhere. A link
             * back up (to "." or a parent) is found below, as files
             * reached twice. */
            if (S_ISLNK(lsb.st_mode) && !link_inside(fl, full)) {
                st = vg_error_set(err, VG_EFORMAT, full, 0,
                                  "a link to a folder outside %s; not followed (copy the "
                                  "files in instead)",
                                  root);
                break;
            }
            if (depth < MAX_DEPTH) st = collect(fl, sub, depth + 1, err);
        } else if (S_ISREG(sb.st_mode) && is_relation_name(de->d_name)) {
            if (vg_grow((void **)&fl->f, &fl->cap, fl->n + 1, sizeof *fl->f) != 0 ||
                !(fl->f[fl->n].rel = vg_strdup(sub))) {
                st = vg_error_set(err, VG_ENOMEM, dir, 0, "out of memory");
                break;
            }
            fl->f[fl->n].dev = sb.st_dev;
            fl->f[fl->n].ino = sb.st_ino;
            fl->n++;
        }
    }
    closedir(d);
    return st;
}

static int cmp_rel(const void *a, const void *b) {
    return strcmp(((const rel_file *)a)->rel, ((const rel_file *)b)->rel);
}

static int cmp_inode(const void *a, const void *b) {
    const rel_file *x = a, *y = b;
    if (x->dev != y->dev) return x->dev < y->dev ? -1 : 1;
    if (x->ino != y->ino) return x->ino < y->ino ? -1 : 1;
    return strcmp(x->rel, y->rel);
}

/* A file reached twice (through a link to a folder above it, or two
 * links to one folder) would repeat its questions: an error naming both
 * paths. Sorts fl by inode; the caller sorts it back by path. */
static vg_status check_once(file_list *fl, vg_error *err) {
    if (fl->n < 2) return VG_OK;
    qsort(fl->f, fl->n, sizeof *fl->f, cmp_inode);
    for (size_t i = 1; i < fl->n; i++)
        if (fl->f[i].dev == fl->f[i - 1].dev && fl->f[i].ino == fl->f[i - 1].ino)
            return vg_error_set(err, VG_EFORMAT, fl->root, 0,
                                "%.200s and %.200s are the same file, reached twice through a "
                                "link (a link loop, or two links to one folder)",
                                fl->f[i - 1].rel, fl->f[i].rel);
    return VG_OK;
}

vg_status vg_suite_read_relation(const char *path, vg_lines *lr, vg_suite *s, vg_error *err) {
    char stem[256];
    if (lr) {
        vg_status st = read_file(s, lr, vg_path_stem(path, stem, sizeof stem), NULL, err);
        if (st == VG_OK)
            snprintf(s->layout_detected, sizeof s->layout_detected,
                     "one relation file, %zu questions", s->n_items);
        return st;
    }
    file_list fl = {NULL, 0, 0, path, realpath(path, NULL)};
    vg_status st = fl.real_root ? VG_OK : vg_error_set(err, VG_EIO, path, 0, "cannot resolve the folder");
    if (st == VG_OK) st = collect(&fl, "", 0, err);
    if (st == VG_OK) st = check_once(&fl, err);
    /* Sorted by relative path, so the sections come in a fixed order
     * whatever order the file system lists them in. (qsort is not given
     * an empty list: its array may then be NULL.) */
    if (st == VG_OK && fl.n > 1) qsort(fl.f, fl.n, sizeof *fl.f, cmp_rel);
    if (st == VG_OK && fl.n == 0)
        st = vg_error_set(err, VG_EFORMAT, path, 0, "no relation files (*.txt) in the directory");
    for (size_t i = 0; st == VG_OK && i < fl.n; i++) {
        char full[4096], group[1024];
        snprintf(full, sizeof full, "%s/%s", path, fl.f[i].rel);
        /* The folder a relation file sits in groups it (BATS has one
         * folder per kind of relation); files at the top have no group. */
        const char *slash = strrchr(fl.f[i].rel, '/');
        if (slash) snprintf(group, sizeof group, "%.*s", (int)(slash - fl.f[i].rel), fl.f[i].rel);
        vg_lines *fr = NULL;
        st = vg_lines_open(full, &fr, err);
        if (st == VG_OK)
            st = read_file(s, fr, vg_path_stem(full, stem, sizeof stem), slash ? group : NULL, err);
        vg_lines_close(fr);
    }
    if (st == VG_OK)
        snprintf(s->layout_detected, sizeof s->layout_detected,
                 "one file per relation, %zu files", fl.n);
    for (size_t i = 0; i < fl.n; i++) vg_free(fl.f[i].rel);
    vg_free(fl.f);
    free(fl.real_root);
    return st;
}
