/* manifest.c - reading the manifest of known suites (a CSV, through libcsv).
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The columns are found by their header names, so their order is free
 * and a manifest may leave optional ones out. benchmarks-manifest/README.md
 * documents every column; the checks here are the same rules.
 */
#include <csv.h>
#include <ctype.h>
#include <errno.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/arena.h"
#include "../common/infile.h"
#include "../common/strmap.h"
#include "suite_impl.h"

enum col {
    C_ID, C_VARIANT, C_TASK, C_TITLE, C_LANGUAGE, C_FILES, C_DELIMITER, C_HEADER_LINES,
    C_COMMENT, C_WORD1_COL, C_WORD2_COL, C_RATING_COL, C_RATERS_COL, C_ANALOGY_LAYOUT,
    C_SCALE_MIN, C_SCALE_MAX, C_PUBLISHED_ITEMS, C_URL, C_MEMBERS, C_SHA256,
    C_DOWNLOAD_SHA256, C_LICENCE, C_CITATION, C_SECTION_GROUPS, C_NOTES, C_COUNT
};

static const char *const col_names[C_COUNT] = {
    "id", "variant", "task", "title", "language", "files", "delimiter", "header_lines",
    "comment", "word1_col", "word2_col", "rating_col", "raters_col", "analogy_layout",
    "scale_min", "scale_max", "published_items", "url", "members", "sha256",
    "download_sha256", "licence", "citation", "section_groups", "notes"};

/* Suite-level columns: given on the first row of an id; a later row of
 * the same id leaves them empty or repeats the same value. */
static const enum col suite_cols[] = {C_TASK, C_TITLE, C_LANGUAGE, C_SCALE_MIN, C_SCALE_MAX,
                                      C_PUBLISHED_ITEMS, C_LICENCE, C_CITATION,
                                      C_SECTION_GROUPS};

/* An entry while it is built: its variants grow here. */
typedef struct building {
    vg_suite_entry e;
    vg_suite_variant *variants;
    size_t n_variants, cap_variants;
    const char *raw[C_COUNT]; /* the first row's suite-level fields */
    uint64_t line;
} building;

struct vg_manifest {
    vg_arena arena;
    building *entries;
    size_t n, cap;
    vg_strmap by_id;     /* id -> index into entries: one lookup per row */
    vg_strmap by_variant;/* "id\0variant" of every row, for repeats */
};

/* The parse state passed through libcsv's callbacks. */
typedef struct parse {
    vg_manifest *m;
    const char *name;
    vg_error *err;
    vg_status st;
    int col_of[C_COUNT];     /* field index of each column, -1 if absent */
    size_t n_header;
    int have_header;
    char **field;            /* the current row */
    size_t n_field, cap_field;
    uint64_t line;           /* line where the current row started */
    uint64_t next_line;      /* line of the next byte fed to libcsv */
    int row_done;            /* a row ended in the bytes just fed */
} parse;

static char *dup_field(parse *p, const char *s, size_t n) {
    char *d = vg_arena_strndup(&p->m->arena, s, n);
    if (!d && p->st == VG_OK) p->st = vg_error_set(p->err, VG_ENOMEM, p->name, p->line, "out of memory");
    return d;
}

static void field_cb(void *s, size_t n, void *data) {
    parse *p = data;
    if (p->st != VG_OK) return;
    if (vg_grow((void **)&p->field, &p->cap_field, p->n_field + 1, sizeof *p->field) != 0) {
        p->st = vg_error_set(p->err, VG_ENOMEM, p->name, p->line, "out of memory");
        return;
    }
    /* Trim blanks around a value: a hand-edited manifest may align them. */
    const char *t = s ? s : "";
    n = s ? n : 0;
    while (n && (*t == ' ' || *t == '\t')) t++, n--;
    while (n && (t[n - 1] == ' ' || t[n - 1] == '\t')) n--;
    p->field[p->n_field] = dup_field(p, t, n);
    if (p->field[p->n_field]) p->n_field++;
}

static vg_status bad(parse *p, enum col c, const char *fmt, const char *value) {
    vg_error_set(p->err, VG_EFORMAT, p->name, p->line, "column %s: %s, found '%.60s'", col_names[c],
                 fmt, value);
    return VG_EFORMAT;
}

static const char *get(parse *p, enum col c) {
    int i = p->col_of[c];
    return i >= 0 && (size_t)i < p->n_field ? p->field[i] : "";
}

static int parse_uint(const char *s, unsigned long max, unsigned long *out) {
    if (!*s || !isdigit((unsigned char)*s)) return -1;
    char *end;
    errno = 0;
    unsigned long v = strtoul(s, &end, 10);
    if (errno || *end || v > max) return -1;
    *out = v;
    return 0;
}

/* Split a ';'-separated list into its items (trimmed), in the arena.
 * An empty string is a list of no items. */
static vg_status split_list(parse *p, const char *s, const char ***items, size_t *n) {
    *items = NULL;
    *n = 0;
    if (!*s) return VG_OK;
    size_t count = 1;
    for (const char *q = s; *q; q++) count += *q == ';';
    const char **v = vg_arena_alloc(&p->m->arena, count * sizeof *v);
    if (!v) return p->st = vg_error_set(p->err, VG_ENOMEM, p->name, p->line, "out of memory");
    const char *b = s;
    for (size_t i = 0; i < count; i++) {
        const char *e = strchr(b, ';');
        if (!e) e = b + strlen(b);
        const char *lo = b, *hi = e;
        while (lo < hi && *lo == ' ') lo++;
        while (hi > lo && hi[-1] == ' ') hi--;
        v[i] = dup_field(p, lo, (size_t)(hi - lo));
        if (!v[i]) return p->st;
        b = *e ? e + 1 : e;
    }
    *items = v;
    *n = count;
    return VG_OK;
}

static int is_hex64(const char *s) {
    if (strlen(s) != 64) return 0;
    for (const char *q = s; *q; q++)
        if (!isxdigit((unsigned char)*q)) return 0;
    return 1;
}

/* A file name under <data>/<id>/: relative and staying below it. */
static int safe_rel_path(const char *s) {
    if (!*s || *s == '/' || strchr(s, '\\')) return 0;
    const char *c = s;
    while (*c) {
        const char *e = strchr(c, '/');
        size_t n = e ? (size_t)(e - c) : strlen(c);
        if ((n == 2 && c[0] == '.' && c[1] == '.') || (n == 1 && c[0] == '.')) return 0;
        if (n == 0 && e && e[1] != '\0') return 0; /* "a//b" */
        c += n;
        if (*c == '/') c++;
    }
    return 1;
}

static int valid_id(const char *s) {
    if (!*s || !(islower((unsigned char)*s) || isdigit((unsigned char)*s))) return 0;
    for (const char *q = s; *q; q++)
        if (!(islower((unsigned char)*q) || isdigit((unsigned char)*q) || *q == '-' || *q == '_' ||
              *q == '.'))
            return 0;
    return 1;
}

static vg_status parse_groups_syntax(parse *p, const char *g) {
    const char *b = g;
    while (*b) {
        const char *e = strchr(b, ';');
        size_t n = e ? (size_t)(e - b) : strlen(b);
        const char *eq = memchr(b, '=', n);
        if (!eq || eq == b || eq == b + n - 1)
            return bad(p, C_SECTION_GROUPS, "expected PATTERN=GROUP parts separated by ';'", g);
        b += n;
        if (*b == ';') b++;
    }
    return VG_OK;
}

/* Fill the variant's fields from the current row. */
static vg_status fill_variant(parse *p, building *b, vg_suite_variant *v) {
    memset(v, 0, sizeof *v);
    v->manifest_line = p->line;
    v->name = get(p, C_VARIANT);
    if (!*v->name) return bad(p, C_VARIANT, "expected a variant name", v->name);
    /* Key "id\0variant" in one map for the manifest: a check per row,
     * not a scan of the suite's variants so far. */
    size_t il = strlen(b->e.id), vl = strlen(v->name);
    char *key = vg_arena_alloc(&p->m->arena, il + 1 + vl);
    if (!key) return vg_error_set(p->err, VG_ENOMEM, p->name, p->line, "out of memory");
    memcpy(key, b->e.id, il + 1);
    memcpy(key + il + 1, v->name, vl);
    int ins = vg_strmap_put(&p->m->by_variant, key, il + 1 + vl, 0, NULL);
    if (ins < 0) return vg_error_set(p->err, VG_ENOMEM, p->name, p->line, "out of memory");
    if (ins == 0) return bad(p, C_VARIANT, "each variant of a suite needs its own name", v->name);
    const char **files, **members, **sha;
    size_t nf, nm, ns;
    if (split_list(p, get(p, C_FILES), &files, &nf) != VG_OK ||
        split_list(p, get(p, C_MEMBERS), &members, &nm) != VG_OK ||
        split_list(p, get(p, C_SHA256), &sha, &ns) != VG_OK)
        return p->st;
    if (nf == 0) return bad(p, C_FILES, "expected at least one file name", "");
    for (size_t i = 0; i < nf; i++)
        if (!safe_rel_path(files[i]))
            return bad(p, C_FILES, "expected relative file names without '.' or '..' parts",
                       files[i]);
    if (nm != 0 && nm != nf)
        return bad(p, C_MEMBERS, "expected one archive member per file (';'-separated)",
                   get(p, C_MEMBERS));
    if (ns != 0 && ns != nf)
        return bad(p, C_SHA256, "expected one digest (or nothing) per file, ';'-separated",
                   get(p, C_SHA256));
    /* Missing lists become lists of empty strings, one per file. */
    if (nm == 0 || ns == 0) {
        const char **empty = vg_arena_alloc(&p->m->arena, nf * sizeof *empty);
        if (!empty) return p->st = vg_error_set(p->err, VG_ENOMEM, p->name, p->line, "out of memory");
        for (size_t i = 0; i < nf; i++) empty[i] = "";
        if (nm == 0) members = empty;
        if (ns == 0) sha = empty;
    }
    for (size_t i = 0; i < nf; i++) {
        if (*sha[i] && !is_hex64(sha[i]))
            return bad(p, C_SHA256, "expected 64 hexadecimal digits", sha[i]);
        if (*sha[i] && files[i][strlen(files[i]) - 1] == '/')
            return bad(p, C_SHA256, "a directory has no digest; pin download_sha256 instead",
                       sha[i]);
        for (char *q = (char *)(uintptr_t)sha[i]; *q; q++) *q = (char)tolower((unsigned char)*q);
        if (*members[i] && !safe_rel_path(members[i]))
            return bad(p, C_MEMBERS, "expected a relative member path without '..'", members[i]);
    }
    v->files = files;
    v->members = members;
    v->sha256 = sha;
    v->n_files = nf;
    v->url = get(p, C_URL);
    v->download_sha256 = get(p, C_DOWNLOAD_SHA256);
    if (*v->download_sha256 && !is_hex64(v->download_sha256))
        return bad(p, C_DOWNLOAD_SHA256, "expected 64 hexadecimal digits", v->download_sha256);
    for (char *q = (char *)(uintptr_t)v->download_sha256; *q; q++)
        *q = (char)tolower((unsigned char)*q);
    if (nm && !*v->url) {
        for (size_t i = 0; i < nf; i++)
            if (*members[i]) return bad(p, C_MEMBERS, "archive members need a url", members[i]);
    }
    v->notes = get(p, C_NOTES);

    vg_pairs_layout_init(&v->pairs);
    v->pairs.comment[0] = '\0';
    const char *d = get(p, C_DELIMITER), *h = get(p, C_HEADER_LINES), *cm = get(p, C_COMMENT);
    const char *al = get(p, C_ANALOGY_LAYOUT);
    int sim = b->e.task == VG_TASK_SIMILARITY;
    if (sim) {
        if (nf != 1) return bad(p, C_FILES, "a similarity suite is read from one file", get(p, C_FILES));
        if (*al) return bad(p, C_ANALOGY_LAYOUT, "only analogy suites have an analogy layout", al);
        if (!*d || strcmp(d, "auto") == 0) v->pairs.delimiter = 0;
        else if (strcmp(d, "tab") == 0) v->pairs.delimiter = '\t';
        else if (strcmp(d, "comma") == 0) v->pairs.delimiter = ',';
        else if (strcmp(d, "blank") == 0) v->pairs.delimiter = ' ';
        else return bad(p, C_DELIMITER, "expected tab, comma, blank or auto", d);
        unsigned long u;
        if (!*h || strcmp(h, "auto") == 0) v->pairs.header_lines = -1;
        else if (parse_uint(h, 1000, &u) == 0) v->pairs.header_lines = (int)u;
        else return bad(p, C_HEADER_LINES, "expected a line count 0..1000 or auto", h);
        if (strlen(cm) >= sizeof v->pairs.comment)
            return bad(p, C_COMMENT, "expected a prefix of at most 7 bytes", cm);
        strcpy(v->pairs.comment, cm);
        static const enum col cc[] = {C_WORD1_COL, C_WORD2_COL, C_RATING_COL, C_RATERS_COL};
        unsigned *dst[] = {&v->pairs.col_w1, &v->pairs.col_w2, &v->pairs.col_rating,
                           &v->pairs.col_raters};
        for (int k = 0; k < 4; k++) {
            const char *t = get(p, cc[k]);
            if (!*t) continue;
            if (parse_uint(t, 1000, &u) != 0 || u == 0)
                return bad(p, cc[k], "expected a column number 1..1000", t);
            *dst[k] = (unsigned)u;
        }
    } else {
        static const enum col pc[] = {C_DELIMITER, C_HEADER_LINES, C_COMMENT, C_WORD1_COL,
                                      C_WORD2_COL, C_RATING_COL, C_RATERS_COL};
        for (size_t k = 0; k < sizeof pc / sizeof pc[0]; k++)
            if (*get(p, pc[k]))
                return bad(p, pc[k], "only similarity suites have this column", get(p, pc[k]));
        if (vg_analogy_layout_parse(*al ? al : "auto", &v->analogy) != VG_OK)
            return bad(p, C_ANALOGY_LAYOUT,
                       "expected sectioned, four-column, relation, split or auto", al);
        size_t want = v->analogy == VG_ANALOGY_SPLIT ? 2 : 1;
        if (nf != want)
            return bad(p, C_FILES,
                       want == 2 ? "the split layout needs a questions file and an answers file"
                                 : "this analogy layout is read from one file or directory",
                       get(p, C_FILES));
    }
    return VG_OK;
}

static vg_status parse_scale(parse *p, enum col c, double *out) {
    const char *s = get(p, c);
    *out = NAN;
    if (!*s) return VG_OK;
    char *end;
    double d = strtod(s, &end);
    if (*end || !isfinite(d)) return bad(p, c, "expected a number", s);
    *out = d;
    return VG_OK;
}

/* Set the suite-level fields of a new entry from its first row. */
static vg_status fill_entry(parse *p, building *b) {
    vg_suite_entry *e = &b->e;
    const char *task = get(p, C_TASK);
    if (strcmp(task, "similarity") == 0) e->task = VG_TASK_SIMILARITY;
    else if (strcmp(task, "analogy") == 0) e->task = VG_TASK_ANALOGY;
    else return bad(p, C_TASK, "expected similarity or analogy on the first row of a suite", task);
    e->title = get(p, C_TITLE);
    e->language = get(p, C_LANGUAGE);
    e->licence = get(p, C_LICENCE);
    e->citation = get(p, C_CITATION);
    e->groups = get(p, C_SECTION_GROUPS);
    if (parse_groups_syntax(p, e->groups) != VG_OK) return VG_EFORMAT;
    if (parse_scale(p, C_SCALE_MIN, &e->scale_min) != VG_OK ||
        parse_scale(p, C_SCALE_MAX, &e->scale_max) != VG_OK)
        return VG_EFORMAT;
    if (isnan(e->scale_min) != isnan(e->scale_max) ||
        (!isnan(e->scale_min) && !(e->scale_min < e->scale_max)))
        return bad(p, C_SCALE_MAX, "expected scale_min < scale_max, both or neither given",
                   get(p, C_SCALE_MAX));
    if (e->task == VG_TASK_ANALOGY && !isnan(e->scale_min))
        return bad(p, C_SCALE_MIN, "analogy suites have no rating scale", get(p, C_SCALE_MIN));
    unsigned long u = 0;
    const char *pi = get(p, C_PUBLISHED_ITEMS);
    if (*pi && parse_uint(pi, 1000000000ul, &u) != 0)
        return bad(p, C_PUBLISHED_ITEMS, "expected a count", pi);
    e->published_items = u;
    for (size_t k = 0; k < sizeof suite_cols / sizeof suite_cols[0]; k++)
        b->raw[suite_cols[k]] = get(p, suite_cols[k]);
    b->line = p->line;
    return VG_OK;
}

static vg_status handle_row(parse *p) {
    if (!p->have_header) {
        for (int c = 0; c < C_COUNT; c++) p->col_of[c] = -1;
        for (size_t i = 0; i < p->n_field; i++) {
            int found = -1;
            for (int c = 0; c < C_COUNT; c++)
                if (strcmp(p->field[i], col_names[c]) == 0) found = c;
            if (found < 0) {
                vg_error_set(p->err, VG_EFORMAT, p->name, p->line,
                             "unknown column '%.60s' in the header (see benchmarks-manifest/README.md)",
                             p->field[i]);
                return VG_EFORMAT;
            }
            if (p->col_of[found] >= 0) {
                vg_error_set(p->err, VG_EFORMAT, p->name, p->line, "column '%s' appears twice",
                             col_names[found]);
                return VG_EFORMAT;
            }
            p->col_of[found] = (int)i;
        }
        static const enum col required[] = {C_ID, C_VARIANT, C_TASK, C_FILES};
        for (size_t k = 0; k < sizeof required / sizeof required[0]; k++)
            if (p->col_of[required[k]] < 0) {
                vg_error_set(p->err, VG_EFORMAT, p->name, p->line,
                             "the header lacks the column '%s'", col_names[required[k]]);
                return VG_EFORMAT;
            }
        p->n_header = p->n_field;
        p->have_header = 1;
        return VG_OK;
    }
    if (p->n_field != p->n_header) {
        vg_error_set(p->err, VG_EFORMAT, p->name, p->line,
                     "expected %zu fields as in the header, found %zu", p->n_header, p->n_field);
        return VG_EFORMAT;
    }
    const char *id = get(p, C_ID);
    if (!valid_id(id))
        return bad(p, C_ID, "expected an id of lower-case letters, digits, '-', '_' or '.'", id);
    vg_manifest *m = p->m;
    building *b = NULL;
    size_t at = vg_strmap_get(&m->by_id, id, strlen(id));
    if (at != (size_t)-1) b = &m->entries[at];
    if (!b) {
        if (vg_grow((void **)&m->entries, &m->cap, m->n + 1, sizeof *m->entries) != 0 ||
            vg_strmap_put(&m->by_id, id, strlen(id), m->n, NULL) < 0)
            return vg_error_set(p->err, VG_ENOMEM, p->name, p->line, "out of memory");
        b = &m->entries[m->n++];
        memset(b, 0, sizeof *b);
        b->e.id = id;
        vg_status st = fill_entry(p, b);
        if (st != VG_OK) return st;
    } else {
        for (size_t k = 0; k < sizeof suite_cols / sizeof suite_cols[0]; k++) {
            const char *v = get(p, suite_cols[k]);
            if (*v && strcmp(v, b->raw[suite_cols[k]]) != 0) {
                vg_error_set(p->err, VG_EFORMAT, p->name, p->line,
                             "column %s: '%.60s' differs from the first row of suite %s (line "
                             "%llu); leave it empty on later rows",
                             col_names[suite_cols[k]], v, id, (unsigned long long)b->line);
                return VG_EFORMAT;
            }
        }
    }
    if (vg_grow((void **)&b->variants, &b->cap_variants, b->n_variants + 1, sizeof *b->variants) !=
        0)
        return vg_error_set(p->err, VG_ENOMEM, p->name, p->line, "out of memory");
    vg_status st = fill_variant(p, b, &b->variants[b->n_variants]);
    if (st != VG_OK) return st;
    b->n_variants++;
    return VG_OK;
}

static void row_cb(int c, void *data) {
    (void)c;
    parse *p = data;
    if (p->st == VG_OK) p->st = handle_row(p);
    p->n_field = 0;
    p->row_done = 1;
}

void vg_manifest_free(vg_manifest *m) {
    if (!m) return;
    for (size_t i = 0; i < m->n; i++) vg_free(m->entries[i].variants);
    vg_free(m->entries);
    vg_strmap_free(&m->by_id);
    vg_strmap_free(&m->by_variant);
    vg_arena_free(&m->arena);
    vg_free(m);
}

vg_status vg_manifest_parse(const char *text, size_t len, const char *name, vg_manifest **out,
                            vg_error *err) {
    *out = NULL;
    vg_error local;
    if (!err) err = &local;
    vg_error_clear(err);
    vg_manifest *m = vg_calloc(1, sizeof *m);
    if (!m) return vg_error_set(err, VG_ENOMEM, name, 0, "out of memory");
    parse p;
    memset(&p, 0, sizeof p);
    p.m = m;
    p.name = name;
    p.err = err;
    p.line = p.next_line = 1;
    struct csv_parser cp;
    if (csv_init(&cp, CSV_STRICT | CSV_STRICT_FINI) != 0) {
        vg_free(m);
        return vg_error_set(err, VG_ENOMEM, name, 0, "out of memory");
    }
    /* Feed line by line so that errors know their line: a quoted field
     * may span lines, and a row's number is where it started. */
    size_t off = 0;
    while (off < len && p.st == VG_OK) {
        const char *nl = memchr(text + off, '\n', len - off);
        size_t n = nl ? (size_t)(nl - (text + off)) + 1 : len - off;
        if (csv_parse(&cp, text + off, n, field_cb, row_cb, &p) != n && p.st == VG_OK)
            p.st = vg_error_set(err, VG_EFORMAT, name, p.next_line,
                                "malformed CSV: %s", csv_strerror(csv_error(&cp)));
        off += n;
        if (nl) p.next_line++;
        /* The next row starts after the line that ended this one; a row
         * whose quoted field spans lines keeps its first line. */
        if (p.row_done) p.line = p.next_line;
        p.row_done = 0;
    }
    if (p.st == VG_OK && csv_fini(&cp, field_cb, row_cb, &p) != 0)
        p.st = vg_error_set(err, VG_EFORMAT, name, p.line,
                            "malformed CSV: a quoted field of the row starting here is unterminated");
    csv_free(&cp);
    vg_free(p.field);
    if (p.st == VG_OK && !p.have_header)
        p.st = vg_error_set(err, VG_EFORMAT, name, 0, "empty manifest: expected a header row");
    if (p.st != VG_OK) {
        vg_manifest_free(m);
        return p.st;
    }
    for (size_t i = 0; i < m->n; i++) {
        m->entries[i].e.variants = m->entries[i].variants;
        m->entries[i].e.n_variants = m->entries[i].n_variants;
    }
    *out = m;
    return VG_OK;
}

vg_status vg_manifest_load(const char *path, vg_manifest **out, vg_error *err) {
    *out = NULL;
    if (!path) return vg_manifest_parse(vg_manifest_builtin, vg_manifest_builtin_len,
                                        "(built-in manifest)", out, err);
    /* Through vg_instream: a pipe is read, a device or a FIFO without a
     * writer refused, gzip undone, and 64 MiB is the most ever held. */
    vg_instream *in = NULL;
    vg_status st = vg_instream_open(path, VG_IN_PIPE, (uint64_t)64 << 20,
                                    "far more than a manifest of suites holds", &in, err);
    if (st != VG_OK) return st;
    char *buf = NULL;
    size_t n = 0, cap = 0;
    for (;;) {
        if (vg_grow((void **)&buf, &cap, n + 65536, 1) != 0) {
            vg_instream_close(in);
            vg_free(buf);
            return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
        }
        long got = vg_instream_read(in, buf + n, cap - n, err);
        if (got < 0) {
            vg_instream_close(in);
            vg_free(buf);
            return err->code;
        }
        if (got == 0) break;
        n += (size_t)got;
    }
    vg_instream_close(in);
    /* A UTF-8 byte order mark from an editor is not part of the header. */
    size_t skip = n >= 3 && memcmp(buf, "\xEF\xBB\xBF", 3) == 0 ? 3 : 0;
    st = vg_manifest_parse(buf + skip, n - skip, path, out, err);
    vg_free(buf);
    return st;
}

size_t vg_manifest_count(const vg_manifest *m) { return m ? m->n : 0; }

const vg_suite_entry *vg_manifest_get(const vg_manifest *m, size_t i) {
    return m && i < m->n ? &m->entries[i].e : NULL;
}

const vg_suite_entry *vg_manifest_find(const vg_manifest *m, const char *id) {
    if (!m || !id) return NULL;
    size_t at = vg_strmap_get(&m->by_id, id, strlen(id));
    return at == (size_t)-1 ? NULL : &m->entries[at].e;
}
