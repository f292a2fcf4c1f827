/* cmd_inspect.c - `vecgauge inspect`: what a vector file holds and how it
 * was read.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <getopt.h>
#include <jansson.h>
#include <math.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"

static const char inspect_help[] =
    "Usage: vecgauge inspect [OPTION]... FILE...\n"
    "Read each vector file in full and report the layout found (and why), its\n"
    "rows, dimensions and size, and the quirks met on the way: duplicate words,\n"
    "all-zero rows, bad rows skipped, words holding spaces, words that are not\n"
    "valid UTF-8, and the spread of row norms.\n"
    "\n"
    "Output:\n"
    "      --json             one JSON object per file, one per line\n"
    "  -j, --threads N        threads (default: one per CPU)\n"
    "\n"
    "%s"
    "\n"
    "  -h, --help             show this help and exit\n";

enum { OPT_JSON = 256 };

static const struct option long_opts[] = {
    {"json", no_argument, NULL, OPT_JSON},
    {"threads", required_argument, NULL, 'j'},
    {"help", no_argument, NULL, 'h'},
    VG_CLI_LOAD_LONG_OPTIONS,
    {NULL, 0, NULL, 0}};

static const char *layout_label(const vg_vectors_info *in, char *buf, size_t n) {
    snprintf(buf, n, "%s%s", vg_layout_name(in->layout), in->gzip ? " (gzip)" : "");
    return buf;
}

/* A JSON string of s; a path that is not UTF-8 (jansson refuses those)
 * gets '?' for every non-ASCII byte rather than losing its key. */
static json_t *jstr(const char *s) {
    json_t *j = json_string(s);
    if (j) return j;
    char *c = strdup(s);
    if (!c) return json_null();
    for (char *p = c; *p; p++)
        if ((unsigned char)*p >= 0x80) *p = '?';
    j = json_string(c);
    free(c);
    return j ? j : json_null();
}

static json_t *num_or_null(double x) { return isfinite(x) ? json_real(x) : json_null(); }

static int print_json(const char *path, const vg_vectors_info *in, double nmin, double nmed,
                      double nmax) {
    json_t *o = json_object();
    if (!o) return -1;
    json_object_set_new(o, "path", jstr(path));
    json_object_set_new(o, "layout", json_string(vg_layout_name(in->layout)));
    json_object_set_new(o, "gzip", json_boolean(in->gzip));
    json_object_set_new(o, "detected_because", jstr(in->detected_because));
    json_object_set_new(o, "rows", json_integer((json_int_t)in->rows));
    json_object_set_new(o, "rows_read", json_integer((json_int_t)in->rows_read));
    json_object_set_new(o, "header_rows", json_integer((json_int_t)in->header_rows));
    json_object_set_new(o, "dims", json_integer((json_int_t)in->dims));
    json_object_set_new(o, "bytes", json_integer((json_int_t)in->bytes));
    json_object_set_new(o, "duplicates", json_integer((json_int_t)in->duplicates));
    json_object_set_new(o, "zero_rows", json_integer((json_int_t)in->zero_rows));
    json_object_set_new(o, "bad_rows", json_integer((json_int_t)in->bad_rows));
    json_object_set_new(o, "words_with_spaces", json_integer((json_int_t)in->words_with_spaces));
    json_object_set_new(o, "invalid_utf8", json_integer((json_int_t)in->invalid_utf8));
    json_object_set_new(o, "norm_min", num_or_null(nmin));
    json_object_set_new(o, "norm_median", num_or_null(nmed));
    json_object_set_new(o, "norm_max", num_or_null(nmax));
    json_object_set_new(o, "crlf", json_boolean(in->crlf));
    json_object_set_new(o, "bom", json_boolean(in->bom));
    json_object_set_new(o, "sha256", in->hashed ? json_string(in->sha256) : json_null());
    if (in->layout == VG_LAYOUT_NPY) {
        json_object_set_new(o, "vocab_path", jstr(in->vocab_path));
        json_object_set_new(o, "vocab_sha256",
                            in->vocab_sha256[0] ? json_string(in->vocab_sha256) : json_null());
        json_object_set_new(o, "npy_float64", json_boolean(in->source_float64));
        json_object_set_new(o, "npy_big_endian", json_boolean(in->big_endian));
        json_object_set_new(o, "npy_fortran_order", json_boolean(in->fortran_order));
    }
    char *s = json_dumps(o, JSON_COMPACT | JSON_REAL_PRECISION(9));
    json_decref(o);
    if (!s) return -1;
    puts(s);
    free(s);
    return 0;
}

static void print_text(const char *path, const vg_vectors_info *in, double nmin, double nmed,
                       double nmax) {
    char lay[64], safe[4096];
    printf("%s\n", vg_escape_text(path, safe, sizeof safe));
    printf("  layout:              %s\n", layout_label(in, lay, sizeof lay));
    printf("  detected:            %s\n", in->detected_because);
    if (in->layout == VG_LAYOUT_NPY) {
        printf("  matrix:              %s, %s, %s order\n", in->source_float64 ? "float64" : "float32",
               in->big_endian ? "big-endian" : "little-endian", in->fortran_order ? "Fortran" : "C");
        printf("  vocabulary:          %s\n", vg_escape_text(in->vocab_path, safe, sizeof safe));
    }
    printf("  rows:                %zu", in->rows);
    if (in->rows_read != in->rows) printf(" kept of %zu read", in->rows_read);
    if (in->header_rows) printf(" (header: %zu)", in->header_rows);
    putchar('\n');
    printf("  dims:                %zu\n", in->dims);
    printf("  bytes:               %llu\n", (unsigned long long)in->bytes);
    printf("  duplicate words:     %zu (later rows dropped)\n", in->duplicates);
    printf("  all-zero rows:       %zu\n", in->zero_rows);
    printf("  bad rows skipped:    %zu\n", in->bad_rows);
    printf("  words with spaces:   %zu\n", in->words_with_spaces);
    printf("  invalid UTF-8 words: %zu\n", in->invalid_utf8);
    if (in->crlf || in->bom)
        printf("  text quirks:        %s%s\n", in->crlf ? " CRLF line ends" : "",
               in->bom ? " byte order mark" : "");
    if (isfinite(nmin))
        printf("  row norms:           min %.6g, median %.6g, max %.6g\n", nmin, nmed, nmax);
    else
        printf("  row norms:           (no rows)\n");
    printf("  sha256:              %s\n", in->hashed ? in->sha256 : "(not computed)");
    if (in->layout == VG_LAYOUT_NPY && in->vocab_sha256[0])
        printf("  vocabulary sha256:   %s\n", in->vocab_sha256);
}

int vg_cmd_inspect(int argc, char **argv) {
    vg_load_options lo;
    vg_load_options_init(&lo);
    lo.digest_cache = VG_DIGEST_CACHE_USE;
    int json = 0, progress = 1, rc = VG_EXIT_FAIL;
    optind = 1;
    opterr = 0;
    int c;
    uint64_t u;
    while ((c = getopt_long(argc, argv, ":j:h", long_opts, NULL)) != -1) {
        int handled = vg_cli_load_option("inspect", c, optarg, &lo, &progress, &rc);
        if (handled < 0) return rc;
        if (handled) continue;
        switch (c) {
        case OPT_JSON: json = 1; break;
        case 'j':
            if (vg_cli_parse_u64(optarg, 1, 1024, &u) != 0)
                return vg_cli_usage_error("inspect", "--threads needs an integer 1..1024, got '%s'",
                                          optarg);
            lo.threads = (unsigned)u;
            break;
        case 'h': printf(inspect_help, vg_cli_load_help); return VG_EXIT_OK;
        case ':': return vg_cli_usage_error("inspect", "option '%s' needs an argument", argv[optind - 1]);
        default: return vg_cli_usage_error("inspect", "unknown option '%s'", argv[optind - 1]);
        }
    }
    if (optind >= argc) return vg_cli_usage_error("inspect", "no vector file given");
    rc = VG_EXIT_OK;
    for (int i = optind; i < argc; i++) {
        vg_cli_progress pr;
        vg_cli_progress_begin(&pr, argv[i], progress);
        lo.progress = vg_cli_progress_fn;
        lo.progress_ctx = &pr;
        vg_vectors *v = NULL;
        vg_error err;
        vg_error_clear(&err);
        vg_status st = vg_vectors_load(argv[i], &lo, &v, &err);
        vg_cli_progress_end(&pr);
        if (st != VG_OK) {
            vg_cli_error(&err);
            rc = VG_EXIT_FAIL;
            continue;
        }
        double nmin, nmed, nmax;
        if (vg_vectors_norm_summary(v, &nmin, &nmed, &nmax, &err) != VG_OK) {
            vg_cli_error(&err);
            vg_vectors_free(v);
            rc = VG_EXIT_FAIL;
            continue;
        }
        const vg_vectors_info *in = vg_vectors_get_info(v);
        if (json) {
            if (print_json(argv[i], in, nmin, nmed, nmax) != 0) {
                vg_cli_fail("out of memory writing JSON");
                rc = VG_EXIT_FAIL;
            }
        } else {
            if (i > optind) putchar('\n');
            print_text(argv[i], in, nmin, nmed, nmax);
        }
        vg_vectors_free(v);
    }
    return rc; /* main checks standard output */
}
