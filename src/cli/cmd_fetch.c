/* cmd_fetch.c - `vecgauge fetch`: download public suites into the data directory.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <getopt.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"

static const char fetch_help[] =
    "Usage: vecgauge fetch [OPTION]... ID... | all\n"
    "Download public suites into the data directory, check them and install them.\n"
    "'all' fetches every suite with a known download address.\n"
    "\n"
    "Downloads use HTTPS with certificate checks; a file whose sha256 is pinned in\n"
    "the manifest must match it, and a digest seen for the first time is recorded\n"
    "in DATA/<id>/" VG_FETCH_RECORD ". Archive members whose path would leave the\n"
    "data directory, and links, are refused. Files are installed only once the\n"
    "suite reads.\n"
    "\n"
    "  -d, --data DIR        the data directory (default: $VECGAUGE_DATA, else\n"
    "                        $XDG_DATA_HOME/vecgauge, else ~/.local/share/vecgauge)\n"
    "  -m, --manifest FILE   read this manifest instead of the built-in one\n"
    "  -f, --force           download even when the suite is already present\n"
    "      --max-bytes N     largest download or extracted size (default %u)\n"
    "      --timeout SECONDS give up after this long without data, over every address\n"
    "                        tried for a suite (default 60)\n"
    "      --allow-http      also accept http:// addresses of this machine\n"
    "                        (127.0.0.0/8, ::1, localhost), for testing\n"
    "  -h, --help            show this help and exit\n"
    "\n"
    "When a download fails, the message names the address and the exact path to\n"
    "put the file at by hand. Exit status 1 when any suite was not installed.\n";

enum { OPT_MAX = 256, OPT_HTTP, OPT_TIMEOUT };

static const struct option long_opts[] = {
    {"data", required_argument, NULL, 'd'},  {"manifest", required_argument, NULL, 'm'},
    {"force", no_argument, NULL, 'f'},       {"max-bytes", required_argument, NULL, OPT_MAX},
    {"timeout", required_argument, NULL, OPT_TIMEOUT},
    {"allow-http", no_argument, NULL, OPT_HTTP}, {"help", no_argument, NULL, 'h'},
    {NULL, 0, NULL, 0}};

static void print_note(void *ctx, const char *msg) {
    (void)ctx;
    vg_cli_note("note: %s", msg);
}

static int any_url(const vg_suite_entry *e) {
    for (size_t v = 0; v < e->n_variants; v++)
        if (*e->variants[v].url) return 1;
    return 0;
}

/* Say where each file of a suite goes when it is put in place by hand:
 * the first copy with a download address (or the first copy). */
static void by_hand(const vg_suite_entry *e, const char *data) {
    size_t v = 0;
    while (v < e->n_variants && !*e->variants[v].url) v++;
    if (v == e->n_variants) v = 0;
    const vg_suite_variant *var = &e->variants[v];
    for (size_t f = 0; f < var->n_files; f++) {
        char path[4096];
        vg_suite_entry_path(e, v, f, data, path, sizeof path, NULL);
        if (*var->url && *var->members[f])
            vg_cli_note("by hand: download %s, take %s out of it and put it at %s", var->url,
                        var->members[f], path);
        else if (*var->url)
            vg_cli_note("by hand: download %s and put it at %s", var->url, path);
        else
            vg_cli_note("by hand: put %s at %s", var->files[f], path);
    }
    if (e->n_variants > 1)
        vg_cli_note("('vecgauge suites %s' lists the other known copies)", e->id);
}

static int fetch_one(const vg_suite_entry *e, const vg_fetch_options *opt) {
    vg_fetch_result res;
    vg_error err;
    vg_error_clear(&err);
    if (vg_fetch_suite(e, opt, &res, &err) != VG_OK) {
        char buf[4 * (VG_ERROR_PATH_MAX + VG_ERROR_MSG_MAX) + 64];
        vg_cli_note("fetch %s: %s", e->id, vg_error_format(&err, buf, sizeof buf));
        if (err.code != VG_EHASH || !opt->force) by_hand(e, opt->data_dir);
        return VG_EXIT_FAIL;
    }
    const vg_suite_variant *var = &e->variants[res.variant];
    char path[4096];
    vg_suite_entry_path(e, res.variant, 0, opt->data_dir, path, sizeof path, NULL);
    if (res.outcome == VG_FETCH_PRESENT)
        printf("%s: already present (%s) at %s\n", e->id, var->name, path);
    else
        printf("%s: installed %s (%s, %llu bytes downloaded, %s)\n", e->id, path, var->name,
               (unsigned long long)res.bytes,
               res.first_seen ? "sha256 first seen, recorded" : "sha256 matches the manifest");
    return VG_EXIT_OK;
}

int vg_cmd_fetch(int argc, char **argv) {
    const char *data_opt = NULL, *manifest = NULL;
    vg_fetch_options opt;
    vg_fetch_options_init(&opt);
    opt.note = print_note;
    int c;
    uint64_t u;
    optind = 1;
    opterr = 0;
    while ((c = getopt_long(argc, argv, ":d:m:fh", long_opts, NULL)) != -1) {
        switch (c) {
        case 'd': data_opt = optarg; break;
        case 'm': manifest = optarg; break;
        case 'f': opt.force = 1; break;
        case OPT_HTTP: opt.allow_http = 1; break;
        case OPT_MAX:
            if (vg_cli_parse_u64(optarg, 1, UINT64_MAX, &u) != 0)
                return vg_cli_usage_error("fetch", "--max-bytes needs a positive integer, got '%s'",
                                          optarg);
            opt.max_bytes = u;
            break;
        case OPT_TIMEOUT:
            if (vg_cli_parse_u64(optarg, 1, 86400, &u) != 0)
                return vg_cli_usage_error("fetch", "--timeout needs 1..86400 seconds, got '%s'",
                                          optarg);
            opt.timeout = (long)u;
            break;
        case 'h': printf(fetch_help, (unsigned)VG_FETCH_MAX_BYTES); return VG_EXIT_OK;
        case ':': return vg_cli_usage_error("fetch", "option '%s' needs an argument", argv[optind - 1]);
        default: return vg_cli_usage_error("fetch", "unknown option '%s'", argv[optind - 1]);
        }
    }
    if (optind >= argc) return vg_cli_usage_error("fetch", "no suite given (an id, or all)");
    vg_error err;
    vg_error_clear(&err);
    vg_manifest *m = NULL;
    char data[VG_ERROR_PATH_MAX];
    if (vg_manifest_load(manifest, &m, &err) != VG_OK ||
        vg_data_dir(data_opt, data, sizeof data, NULL, &err) != VG_OK) {
        vg_cli_error(&err);
        vg_manifest_free(m);
        return VG_EXIT_FAIL;
    }
    opt.data_dir = data;
    int all = 0;
    for (int i = optind; i < argc; i++) {
        if (strcmp(argv[i], "all") == 0) {
            all = 1;
        } else if (!vg_manifest_find(m, argv[i])) {
            vg_manifest_free(m);
            return vg_cli_usage_error("fetch", "unknown suite '%s' ('vecgauge suites' lists them)",
                                      argv[i]);
        }
    }
    int rc = VG_EXIT_OK;
    for (size_t i = 0; i < vg_manifest_count(m); i++) {
        const vg_suite_entry *e = vg_manifest_get(m, i);
        int named = 0;
        for (int k = optind; k < argc; k++) named |= strcmp(argv[k], e->id) == 0;
        if (!named && !all) continue;
        if (!named && !any_url(e)) {
            /* 'all' covers what can be downloaded; say what cannot. */
            vg_cli_note("note: %s has no known download address; skipped", e->id);
            continue;
        }
        if (fetch_one(e, &opt) != VG_EXIT_OK) rc = VG_EXIT_FAIL;
    }
    vg_manifest_free(m);
    return rc;
}
