/* csvread.c - whole-file CSV reading through libcsv.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "csvread.h"

#include <csv.h>
#include <string.h>

#include "alloc.h"
#include "lines.h"

typedef struct build {
    vg_csv_table *t;
    char **fields;      /* the record being assembled */
    size_t n, cap;
    uint64_t line;      /* line being fed */
    uint64_t start;     /* line the current record started on */
    int oom;
} build;

static void on_field(void *s, size_t len, void *data) {
    build *b = data;
    if (b->oom) return;
    if (b->n == 0 && b->start == 0) b->start = b->line;
    if (vg_grow((void **)&b->fields, &b->cap, b->n + 1, sizeof *b->fields) != 0) {
        b->oom = 1;
        return;
    }
    char *f = vg_arena_strndup(&b->t->arena, s ? s : "", s ? len : 0);
    if (!f) {
        b->oom = 1;
        return;
    }
    b->fields[b->n++] = f;
}

static void on_record(int c, void *data) {
    (void)c;
    build *b = data;
    if (b->oom) return;
    vg_csv_table *t = b->t;
    if (vg_grow((void **)&t->rec, &t->cap_rec, t->n_rec + 1, sizeof *t->rec) != 0) {
        b->oom = 1;
        return;
    }
    char **copy = vg_arena_alloc(&t->arena, (b->n ? b->n : 1) * sizeof *copy);
    if (!copy) {
        b->oom = 1;
        return;
    }
    memcpy(copy, b->fields, b->n * sizeof *copy);
    t->rec[t->n_rec++] = (vg_csv_record){copy, b->n, b->start ? b->start : b->line};
    b->n = 0;
    b->start = 0;
}

void vg_csv_free(vg_csv_table *t) {
    if (!t) return;
    vg_arena_free(&t->arena);
    vg_free(t->rec);
    vg_free(t->path);
    vg_free(t);
}

vg_status vg_csv_load(const char *path, size_t max_bytes, vg_csv_table **out, vg_error *err) {
    *out = NULL;
    vg_csv_table *t = vg_calloc(1, sizeof *t);
    build b = {0};
    struct csv_parser p;
    int parser_ok = 0;
    vg_lines *lr = NULL;
    vg_status st = VG_OK;
    if (!t || !(t->path = vg_strdup(path))) {
        st = vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
        goto done;
    }
    b.t = t;
    if (csv_init(&p, CSV_STRICT | CSV_APPEND_NULL) != 0) {
        st = vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
        goto done;
    }
    parser_ok = 1;
    /* A regular file only: these are files vecgauge wrote, and a FIFO or
     * a device in their place would hang or never end. */
    vg_lines_opts o = {max_bytes, NULL, 1, 0};
    st = vg_lines_open_opts(path, &o, &lr, err);
    if (st != VG_OK) goto done;
    /* Feed one physical line at a time so that each record knows the line
     * it started on; libcsv carries quoted newlines across feeds. */
    char *line;
    size_t len;
    int rc;
    while ((rc = vg_lines_next(lr, &line, &len, err)) > 0) {
        b.line = vg_lines_number(lr);
        if (csv_parse(&p, line, len, on_field, on_record, &b) != len ||
            csv_parse(&p, "\n", 1, on_field, on_record, &b) != 1) {
            st = vg_error_set(err, VG_EFORMAT, path, b.start ? b.start : b.line,
                              "malformed CSV: %s", csv_strerror(csv_error(&p)));
            goto done;
        }
        if (b.oom) break;
    }
    if (rc < 0) {
        st = err->code;
        goto done;
    }
    if (csv_fini(&p, on_field, on_record, &b) != 0) {
        st = vg_error_set(err, VG_EFORMAT, path, b.start ? b.start : b.line,
                          "malformed CSV at the end of the file: %s", csv_strerror(csv_error(&p)));
        goto done;
    }
    if (b.oom) st = vg_error_set(err, VG_ENOMEM, path, b.line, "out of memory");
done:
    if (parser_ok) csv_free(&p);
    vg_lines_close(lr);
    vg_free(b.fields);
    if (st != VG_OK) {
        vg_csv_free(t);
        return st;
    }
    *out = t;
    return VG_OK;
}

long vg_csv_column(const vg_csv_table *t, const char *name) {
    if (t->n_rec == 0) return -1;
    for (size_t i = 0; i < t->rec[0].n; i++)
        if (strcmp(t->rec[0].field[i], name) == 0) return (long)i;
    return -1;
}

vg_status vg_csv_require(const vg_csv_table *t, const char *const *names, long *idx, vg_error *err) {
    for (size_t i = 0; names[i]; i++) {
        idx[i] = vg_csv_column(t, names[i]);
        if (idx[i] < 0)
            return vg_error_set(err, VG_EFORMAT, t->path, 1, "expected a column named '%s' in the header",
                                names[i]);
    }
    return VG_OK;
}
