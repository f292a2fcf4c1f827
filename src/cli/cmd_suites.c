/* cmd_suites.c - `vecgauge suites`: the known suites and which are present.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <csv.h>
#include <getopt.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include "cli.h"

static const char suites_help[] =
    "Usage: vecgauge suites [OPTION]... [ID]...\n"
    "List the known public suites: whether each is in the data directory, how\n"
    "many items it holds, whether its files carry the pinned sha256, its licence.\n"
    "With IDs, describe those suites in full: every known copy of their files,\n"
    "where each file belongs and where it can be downloaded.\n"
    "\n"
    "  -d, --data DIR       the data directory (default: $VECGAUGE_DATA, else\n"
    "                       $XDG_DATA_HOME/vecgauge, else ~/.local/share/vecgauge)\n"
    "  -m, --manifest FILE  read this manifest instead of the built-in one\n"
    "      --csv            one CSV row per suite instead of the table\n"
    "  -h, --help           show this help and exit\n"
    "\n"
    "Files live at DATA/<id>/<file name as distributed>; 'vecgauge fetch' puts\n"
    "them there. Exit status 1 when a present suite cannot be read or differs\n"
    "from its pinned sha256.\n";

enum { OPT_CSV = 256 };

static const struct option long_opts[] = {
    {"data", required_argument, NULL, 'd'},   {"manifest", required_argument, NULL, 'm'},
    {"csv", no_argument, NULL, OPT_CSV},      {"help", no_argument, NULL, 'h'},
    {NULL, 0, NULL, 0}};

/* What the data directory holds of one suite. */
typedef struct status {
    int present;
    vg_suite *suite;         /* NULL when absent or unreadable */
    vg_error err;            /* why it could not be read */
    vg_hash_state hash;
} status;

static void probe(const vg_suite_entry *e, const char *data, status *st) {
    memset(st, 0, sizeof *st);
    st->present = vg_suite_entry_locate(e, data) != (size_t)-1;
    if (!st->present) return;
    if (vg_suite_read_entry(e, data, &st->suite, &st->err) == VG_OK)
        st->hash = vg_suite_entry_verify(e, st->suite, NULL);
}

static int failed(const status *st) {
    return st->present && (!st->suite || st->hash == VG_HASH_MISMATCH);
}

/* "1 repeated pair, 1 reversed pair, 1 self-pair" or "" (buf). */
static const char *noticed(const vg_suite *s, char *buf, size_t size) {
    buf[0] = '\0';
    size_t n = 0;
    const char *unit = s->task == VG_TASK_SIMILARITY ? "pair" : "question";
    if (s->stats.duplicates)
        n += (size_t)snprintf(buf + n, size - n, "%s%zu repeated %s%s", n ? ", " : "",
                              s->stats.duplicates, unit, s->stats.duplicates == 1 ? "" : "s");
    if (s->stats.reversed_duplicates && n < size)
        n += (size_t)snprintf(buf + n, size - n, "%s%zu reversed pair%s", n ? ", " : "",
                              s->stats.reversed_duplicates,
                              s->stats.reversed_duplicates == 1 ? "" : "s");
    if (s->stats.self_pairs && n < size)
        snprintf(buf + n, size - n, "%s%zu self-pair%s", n ? ", " : "", s->stats.self_pairs,
                 s->stats.self_pairs == 1 ? "" : "s");
    return buf;
}

/* One CSV field: quoted by libcsv when it needs quoting, else as is. */
static void csv_out(const char *s, int last) {
    if (strpbrk(s, ",\"\r\n") || (*s && (s[0] == ' ' || s[strlen(s) - 1] == ' ')))
        csv_fwrite(stdout, s, strlen(s));
    else
        fputs(s, stdout);
    fputc(last ? '\n' : ',', stdout);
}

static void list_csv(const vg_manifest *m, const char *data, const status *sts) {
    fputs("id,task,title,status,variant,items,published_items,sha256,licence,duplicates,"
          "reversed_duplicates,self_pairs,path\n",
          stdout);
    for (size_t i = 0; i < vg_manifest_count(m); i++) {
        const vg_suite_entry *e = vg_manifest_get(m, i);
        const status *st = &sts[i];
        const vg_suite *s = st->suite;
        char items[32] = "", pub[32] = "", d[32] = "", r[32] = "", sp[32] = "", path[4096];
        if (s) {
            snprintf(items, sizeof items, "%zu", s->n_items);
            snprintf(d, sizeof d, "%zu", s->stats.duplicates);
            snprintf(r, sizeof r, "%zu", s->stats.reversed_duplicates);
            snprintf(sp, sizeof sp, "%zu", s->stats.self_pairs);
        }
        if (e->published_items) snprintf(pub, sizeof pub, "%zu", e->published_items);
        size_t v = vg_suite_entry_locate(e, data);
        vg_suite_entry_path(e, v == (size_t)-1 ? 0 : v, 0, data, path, sizeof path, NULL);
        csv_out(e->id, 0);
        csv_out(vg_task_name(e->task), 0);
        csv_out(e->title, 0);
        csv_out(!st->present ? "absent" : s ? "present" : "unreadable", 0);
        csv_out(s ? s->variant : "", 0);
        csv_out(items, 0);
        csv_out(pub, 0);
        csv_out(s ? vg_hash_state_name(st->hash) : "", 0);
        csv_out(e->licence, 0);
        csv_out(d, 0);
        csv_out(r, 0);
        csv_out(sp, 0);
        csv_out(path, 1);
    }
}

static void list_table(const vg_manifest *m, const char *data, const char *src,
                       const status *sts) {
    printf("data directory: %s (from %s)\n\n", data, src);
    printf("%-16s %-10s %-26s %7s  %-10s  %s\n", "suite", "task", "status", "items", "sha256",
           "licence");
    for (size_t i = 0; i < vg_manifest_count(m); i++) {
        const vg_suite_entry *e = vg_manifest_get(m, i);
        const status *st = &sts[i];
        char state[64], items[32];
        if (!st->present)
            snprintf(state, sizeof state, "absent");
        else if (!st->suite)
            snprintf(state, sizeof state, "unreadable");
        else
            snprintf(state, sizeof state, "present (%s)", st->suite->variant);
        if (st->suite)
            snprintf(items, sizeof items, "%zu", st->suite->n_items);
        else
            snprintf(items, sizeof items, "-");
        printf("%-16s %-10s %-26s %7s  %-10s  %s\n", e->id, vg_task_name(e->task), state, items,
               st->suite ? vg_hash_state_name(st->hash) : "-", e->licence);
    }
    /* What the table cannot show: counts that differ from the published
     * size, items noticed but kept, read errors, where absent ones go. */
    int header = 0;
    for (size_t i = 0; i < vg_manifest_count(m); i++) {
        const vg_suite_entry *e = vg_manifest_get(m, i);
        const status *st = &sts[i];
        char buf[256], line[1400] = "";
        if (st->suite) {
            if (e->published_items && st->suite->n_items != e->published_items)
                snprintf(line, sizeof line, "%zu items read, %zu published", st->suite->n_items,
                         e->published_items);
            noticed(st->suite, buf, sizeof buf);
            if (*buf)
                snprintf(line + strlen(line), sizeof line - strlen(line), "%s%s (kept)",
                         *line ? "; " : "", buf);
        } else if (st->present) {
            char ebuf[VG_ERROR_PATH_MAX + VG_ERROR_MSG_MAX + 64];
            snprintf(line, sizeof line, "%s", vg_error_format(&st->err, ebuf, sizeof ebuf));
        }
        if (!*line) continue;
        if (!header) printf("\n");
        header = 1;
        printf("%s: %s\n", e->id, line);
    }
    printf("\nAbsent suites: 'vecgauge fetch ID' downloads them; 'vecgauge suites ID' shows\n"
           "every known file name and where it belongs.\n");
}

static void wrap(const char *label, const char *text) {
    /* Long manifest notes, folded at word boundaries for a terminal. */
    const int width = 76;
    int indent = (int)strlen(label) + 4;
    printf("    %s", label);
    int col = indent;
    const char *p = text;
    while (*p) {
        size_t w = strcspn(p, " \n");
        if (col + (int)w + 1 > width && col > indent) {
            printf("\n%*s", indent, "");
            col = indent;
        } else if (col > indent) {
            putchar(' ');
            col++;
        }
        printf("%.*s", (int)w, p);
        col += (int)w;
        p += w;
        while (*p == ' ' || *p == '\n') p++;
    }
    putchar('\n');
}

static void describe(const vg_suite_entry *e, const char *data, const status *st) {
    printf("%s: %s\n", e->id, *e->title ? e->title : "(no title)");
    printf("  task: %s   language: %s", vg_task_name(e->task), *e->language ? e->language : "?");
    if (!isnan(e->scale_min)) printf("   scale: %g..%g", e->scale_min, e->scale_max);
    if (e->published_items) printf("   published items: %zu", e->published_items);
    printf("\n  licence: %s\n  citation: %s\n", *e->licence ? e->licence : "?",
           *e->citation ? e->citation : "?");
    if (*e->groups) printf("  section groups: %s\n", e->groups);
    if (!st->present) {
        printf("  status: absent\n");
    } else if (!st->suite) {
        char ebuf[VG_ERROR_PATH_MAX + VG_ERROR_MSG_MAX + 64];
        printf("  status: present but unreadable: %s\n", vg_error_format(&st->err, ebuf, sizeof ebuf));
    } else {
        char buf[256];
        printf("  status: present (%s), %zu items, sha256 %s\n", st->suite->variant,
               st->suite->n_items, vg_hash_state_name(st->hash));
        printf("  layout read: %s\n", st->suite->layout_detected);
        if (*noticed(st->suite, buf, sizeof buf)) printf("  noticed (kept): %s\n", buf);
    }
    printf("  known copies (read: the first present one whose pinned sha256 matches,\n  else the first present one):\n");
    for (size_t v = 0; v < e->n_variants; v++) {
        const vg_suite_variant *var = &e->variants[v];
        printf("    %s:\n", var->name);
        for (size_t f = 0; f < var->n_files; f++) {
            char path[4096];
            struct stat sb;
            vg_suite_entry_path(e, v, f, data, path, sizeof path, NULL);
            printf("      %s (%s)\n", path, stat(path, &sb) == 0 ? "present" : "absent");
            if (*var->members[f]) printf("        archive member: %s\n", var->members[f]);
            printf("        sha256: %s\n", *var->sha256[f] ? var->sha256[f] : "not pinned");
        }
        printf("      download: %s\n", *var->url ? var->url : "none known");
        if (*var->notes) wrap("  notes: ", var->notes);
    }
}

int vg_cmd_suites(int argc, char **argv) {
    const char *data_opt = NULL, *manifest = NULL;
    int csv = 0, c;
    optind = 1;
    opterr = 0;
    while ((c = getopt_long(argc, argv, ":d:m:h", long_opts, NULL)) != -1) {
        switch (c) {
        case 'd': data_opt = optarg; break;
        case 'm': manifest = optarg; break;
        case OPT_CSV: csv = 1; break;
        case 'h': fputs(suites_help, stdout); return VG_EXIT_OK;
        case ':': return vg_cli_usage_error("suites", "option '%s' needs an argument", argv[optind - 1]);
        default: return vg_cli_usage_error("suites", "unknown option '%s'", argv[optind - 1]);
        }
    }
    vg_error err;
    vg_error_clear(&err);
    vg_manifest *m = NULL;
    char data[VG_ERROR_PATH_MAX];
    const char *src;
    if (vg_manifest_load(manifest, &m, &err) != VG_OK ||
        vg_data_dir(data_opt, data, sizeof data, &src, &err) != VG_OK) {
        vg_cli_error(&err);
        vg_manifest_free(m);
        return VG_EXIT_FAIL;
    }
    for (int i = optind; i < argc; i++)
        if (!vg_manifest_find(m, argv[i])) {
            vg_manifest_free(m);
            return vg_cli_usage_error("suites", "unknown suite '%s'", argv[i]);
        }
    size_t n = vg_manifest_count(m);
    status *sts = calloc(n ? n : 1, sizeof *sts);
    if (!sts) {
        vg_manifest_free(m);
        vg_cli_fail("out of memory");
        return VG_EXIT_FAIL;
    }
    int rc = VG_EXIT_OK;
    for (size_t i = 0; i < n; i++) {
        const vg_suite_entry *e = vg_manifest_get(m, i);
        int wanted = optind >= argc;
        for (int k = optind; k < argc; k++) wanted |= strcmp(argv[k], e->id) == 0;
        if (!wanted) continue;
        probe(e, data, &sts[i]);
        if (failed(&sts[i])) rc = VG_EXIT_FAIL;
    }
    if (optind < argc) {
        for (int k = optind; k < argc; k++) {
            for (size_t i = 0; i < n; i++)
                if (strcmp(argv[k], vg_manifest_get(m, i)->id) == 0) {
                    if (k > optind) putchar('\n');
                    describe(vg_manifest_get(m, i), data, &sts[i]);
                }
        }
    } else if (csv) {
        list_csv(m, data, sts);
    } else {
        list_table(m, data, src, sts);
    }
    for (size_t i = 0; i < n; i++) vg_suite_free(sts[i].suite);
    free(sts);
    vg_manifest_free(m);
    return rc;
}
