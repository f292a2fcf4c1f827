/* history.c - the training history file: locked reads, one-write appends.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Many jobs of one training run (a Slurm job array, GNU parallel) may
 * track into the same history at once. Each takes an exclusive flock(2)
 * on the file for the time it reads the rows and appends its own, and
 * appends with a single write(2) on an O_APPEND descriptor: rows are
 * never interleaved, never lost, and the file is never rewritten in place.
 * flock on NFS is emulated with POSIX locks by Linux (since 2.6.12), which
 * serialises writers across hosts too.
 */
#include <csv.h>
#include <errno.h>
#include <fcntl.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <sys/file.h>
#include <sys/stat.h>
#include <unistd.h>

#include "../common/alloc.h"
#include "../common/csvread.h"
#include "../common/numfmt.h"
#include "vecgauge/track.h"

static const char history_header[] =
    "step,run,vectors,suite,task,metric,value,ci_low,ci_high,ci_method,n_items,n_used,"
    "recorded_utc";
enum { H_STEP, H_RUN, H_SET, H_SUITE, H_TASK, H_METRIC, H_VALUE, H_LOW, H_HIGH, H_METHOD,
       H_NITEMS, H_NUSED, H_TIME, H_COLUMNS };

const char *vg_history_header(void) { return history_header; }

typedef struct hist_priv {
    int fd;
    vg_csv_table *table;
} hist_priv;

void vg_history_close(vg_history *h) {
    if (!h) return;
    hist_priv *p = h->priv_;
    if (p) {
        if (p->fd >= 0) {
            flock(p->fd, LOCK_UN);
            close(p->fd);
        }
        vg_csv_free(p->table);
        vg_free(p);
    }
    vg_free(h->rows);
    vg_free(h->path);
    vg_free(h);
}

static int parse_u64(const char *s, uint64_t *out) {
    char *end;
    errno = 0;
    if (!*s || *s == '-' || *s == '+') return -1;
    unsigned long long v = strtoull(s, &end, 10);
    if (*end || errno) return -1;
    *out = v;
    return 0;
}

static int parse_real(const char *s, double *out) {
    if (!*s) {
        *out = NAN;
        return 0;
    }
    char *end;
    double v = strtod(s, &end);
    if (*end || isnan(v)) return -1;
    *out = v;
    return 0;
}

static vg_status read_rows(vg_history *h, vg_error *err) {
    hist_priv *p = h->priv_;
    vg_csv_table *t = p->table;
    if (t->n_rec == 0) return VG_OK;
    const vg_csv_record *hd = &t->rec[0];
    /* The header names the columns in order: anything else is not a
     * history file written by vecgauge. */
    char *want = vg_strdup(history_header);
    if (!want) return vg_error_set(err, VG_ENOMEM, h->path, 0, "out of memory");
    size_t c = 0;
    int ok = 1;
    for (char *tok = strtok(want, ","); tok; tok = strtok(NULL, ","), c++)
        ok = ok && c < hd->n && strcmp(hd->field[c], tok) == 0;
    vg_free(want);
    if (!ok || hd->n != H_COLUMNS)
        return vg_error_set(err, VG_EFORMAT, h->path, 1,
                            "expected the history header '%s'; this is not a vecgauge history "
                            "file",
                            history_header);
    h->rows = vg_calloc(t->n_rec, sizeof *h->rows);
    if (!h->rows) return vg_error_set(err, VG_ENOMEM, h->path, 0, "out of memory");
    for (size_t q = 1; q < t->n_rec; q++) {
        const vg_csv_record *rec = &t->rec[q];
        if (rec->n != H_COLUMNS)
            return vg_error_set(err, VG_EFORMAT, h->path, rec->line,
                                "expected %d fields, found %zu (a damaged line?)", H_COLUMNS,
                                rec->n);
        vg_history_row *r = &h->rows[h->n_rows];
        char **f = rec->field;
        uint64_t ni, nu;
        const char *tk = f[H_TASK];
        r->task = strcmp(tk, "similarity") == 0 ? VG_TASK_SIMILARITY
                  : strcmp(tk, "analogy") == 0  ? VG_TASK_ANALOGY
                                                : (vg_task)0;
        if (parse_u64(f[H_STEP], &r->step) != 0 || parse_u64(f[H_NITEMS], &ni) != 0 ||
            parse_u64(f[H_NUSED], &nu) != 0 || parse_real(f[H_VALUE], &r->value) != 0 ||
            parse_real(f[H_LOW], &r->low) != 0 || parse_real(f[H_HIGH], &r->high) != 0 ||
            !r->task || !*f[H_RUN] || !*f[H_SUITE])
            return vg_error_set(err, VG_EFORMAT, h->path, rec->line,
                                "expected a whole step and counts, numbers for value, ci_low "
                                "and ci_high, a task, a run and a suite");
        r->run = f[H_RUN];
        r->vectors = f[H_SET];
        r->suite = f[H_SUITE];
        r->metric = f[H_METRIC];
        r->interval = f[H_METHOD];
        r->n_items = (size_t)ni;
        r->n_used = (size_t)nu;
        r->recorded = f[H_TIME];
        r->line = rec->line;
        h->n_rows++;
    }
    return VG_OK;
}

vg_status vg_history_open(const char *path, vg_history **out, vg_error *err) {
    *out = NULL;
    vg_history *h = vg_calloc(1, sizeof *h);
    hist_priv *p = vg_calloc(1, sizeof *p);
    if (!h || !p || !(h->path = vg_strdup(path))) {
        if (h) vg_free(h->path);
        vg_free(h);
        vg_free(p);
        return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
    }
    h->priv_ = p;
    p->fd = open(path, O_RDWR | O_CREAT | O_APPEND | O_CLOEXEC, 0666);
    vg_status st = VG_OK;
    if (p->fd < 0) {
        st = vg_error_set(err, VG_EIO, path, 0, "cannot open or create the history file");
        goto fail;
    }
    int rc;
    while ((rc = flock(p->fd, LOCK_EX)) != 0 && errno == EINTR) {
    }
    if (rc != 0) {
        st = vg_error_set(err, VG_EIO, path, 0, "cannot lock the history file");
        goto fail;
    }
    struct stat sb;
    if (fstat(p->fd, &sb) != 0 || !S_ISREG(sb.st_mode)) {
        st = vg_error_set(err, VG_EIO, path, 0, "not a regular file");
        goto fail;
    }
    if (sb.st_size > 0) {
        /* Every append ends with a newline: a file that does not was cut
         * short by something else, and is not touched. */
        char last;
        if (pread(p->fd, &last, 1, sb.st_size - 1) != 1 || last != '\n') {
            st = vg_error_set(err, VG_EFORMAT, path, 0,
                              "does not end with a newline (damaged or written by another "
                              "program); it is left as it is");
            goto fail;
        }
    }
    if ((st = vg_csv_load(path, (size_t)1 << 32, &p->table, err)) != VG_OK) goto fail;
    if ((st = read_rows(h, err)) != VG_OK) goto fail;
    *out = h;
    return VG_OK;
fail:
    vg_history_close(h);
    return st;
}

/* A growing byte buffer. */
typedef struct buf {
    char *p;
    size_t n, cap;
    int oom;
} buf;

static void put(buf *b, const char *s, size_t n) {
    if (b->oom) return;
    if (vg_grow((void **)&b->p, &b->cap, b->n + n + 1, 1) != 0) {
        b->oom = 1;
        return;
    }
    memcpy(b->p + b->n, s, n);
    b->n += n;
}

/* One CSV field through libcsv's quoting (csv_write), then sep. */
static void field(buf *b, const char *s, char sep) {
    size_t n = strlen(s);
    int quote = n > 0 && (s[0] == ' ' || s[n - 1] == ' ');
    if (!quote && strpbrk(s, ",\"\r\n")) quote = 1;
    if (!quote) {
        put(b, s, n);
    } else if (!b->oom) {
        size_t need = csv_write(NULL, 0, s, n);
        if (vg_grow((void **)&b->p, &b->cap, b->n + need + 1, 1) != 0) {
            b->oom = 1;
            return;
        }
        b->n += csv_write(b->p + b->n, need, s, n);
    }
    put(b, &sep, 1);
}

static void number(buf *b, double x, char sep) {
    char t[32];
    field(b, vg_format_double(x, t), sep);
}

static void count(buf *b, uint64_t x, char sep) {
    char t[32];
    snprintf(t, sizeof t, "%llu", (unsigned long long)x);
    field(b, t, sep);
}

vg_status vg_history_append(vg_history *h, const vg_history_row *rows, size_t n, vg_error *err) {
    hist_priv *p = h->priv_;
    struct stat sb;
    if (fstat(p->fd, &sb) != 0) return vg_error_set(err, VG_EIO, h->path, 0, "cannot stat");
    buf b = {0};
    if (sb.st_size == 0) {
        put(&b, history_header, strlen(history_header));
        put(&b, "\n", 1);
    }
    for (size_t i = 0; i < n; i++) {
        const vg_history_row *r = &rows[i];
        count(&b, r->step, ',');
        field(&b, r->run, ',');
        field(&b, r->vectors, ',');
        field(&b, r->suite, ',');
        field(&b, vg_task_name(r->task), ',');
        field(&b, r->metric, ',');
        number(&b, r->value, ',');
        number(&b, r->low, ',');
        number(&b, r->high, ',');
        field(&b, r->interval ? r->interval : "", ',');
        count(&b, r->n_items, ',');
        count(&b, r->n_used, ',');
        field(&b, r->recorded ? r->recorded : "", '\n');
    }
    if (b.oom) {
        vg_free(b.p);
        return vg_error_set(err, VG_ENOMEM, h->path, 0, "out of memory");
    }
    /* One write: with O_APPEND the kernel places it at the end as a whole;
     * the lock keeps other vecgauge processes out meanwhile. */
    ssize_t w = b.n ? write(p->fd, b.p, b.n) : 0;
    int e = errno;
    vg_free(b.p);
    if (w < 0 || (size_t)w != b.n) {
        errno = w < 0 ? e : ENOSPC;
        return vg_error_set(err, VG_EIO, h->path, 0, "append failed%s",
                            w > 0 ? " part-way (disk full?); the last line is incomplete" : "");
    }
    if (fsync(p->fd) != 0) return vg_error_set(err, VG_EIO, h->path, 0, "fsync failed");
    return VG_OK;
}
