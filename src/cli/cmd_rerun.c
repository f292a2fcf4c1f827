/* cmd_rerun.c - `vecgauge rerun`: regenerate a run from its run.json.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * The saved command line is replayed from the saved working directory,
 * after checking that every input file still has the sha256 recorded, so
 * that the new scores.csv is byte-identical to the old one.
 */
#include <getopt.h>
#include <limits.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>
#include <unistd.h>

#include <errno.h>
#include <sys/stat.h>

#include "cli.h"

static const char rerun_help[] =
    "Usage: vecgauge rerun [OPTION]... RUN_DIR\n"
    "Re-run the scoring saved in RUN_DIR/run.json into a new run directory.\n"
    "\n"
    "Every input file recorded in run.json (vector sets, suites) must still have\n"
    "the sha256 recorded there; the saved command is then replayed from the saved\n"
    "working directory with the same options and seed.\n"
    "\n"
    "  -o, --out DIR     the new run directory (default: results/<UTC time>-rerun)\n"
    "  -h, --help        show this help and exit\n";

static const struct option long_opts[] = {
    {"out", required_argument, NULL, 'o'}, {"help", no_argument, NULL, 'h'}, {NULL, 0, NULL, 0}};

/* 1 if argv[i] is the output option (and how many words it takes). */
static int out_option(const char *arg, int *words) {
    if (strcmp(arg, "--out") == 0 || strcmp(arg, "-o") == 0) {
        *words = 2;
        return 1;
    }
    if (strncmp(arg, "--out=", 6) == 0 || (strncmp(arg, "-o", 2) == 0 && arg[2])) {
        *words = 1;
        return 1;
    }
    return 0;
}

/* Check every recorded file's hash, relative to the recorded directory. */
static int verify_inputs(const vg_run_record *rec) {
    int bad = 0;
    for (size_t i = 0; i < rec->n_files; i++) {
        char full[2 * PATH_MAX];
        const char *p = rec->files[i];
        if (p[0] != '/') {
            snprintf(full, sizeof full, "%s/%s", rec->cwd, p);
            p = full;
        }
        if (!rec->sha256[i][0]) {
            vg_cli_fail("%s: no sha256 was recorded (the run used --no-hash); cannot verify it",
                        rec->files[i]);
            bad = 1;
            continue;
        }
        char hex[65];
        vg_error err;
        vg_error_clear(&err);
        if (vg_file_sha256(p, hex, NULL, &err) != VG_OK) {
            vg_cli_error(&err);
            bad = 1;
        } else if (strcmp(hex, rec->sha256[i]) != 0) {
            vg_cli_fail("%s: changed since the run (sha256 recorded %s, now %s)", p, rec->sha256[i],
                        hex);
            bad = 1;
        }
    }
    return bad;
}

static int mkdir_results(const char *here) {
    char dir[PATH_MAX + 16];
    snprintf(dir, sizeof dir, "%s/results", here);
    if (mkdir(dir, 0777) != 0 && errno != EEXIST) {
        vg_cli_fail("cannot create %s: %s", dir, strerror(errno));
        return -1;
    }
    return 0;
}

int vg_cmd_rerun(int argc, char **argv) {
    const char *out = NULL;
    optind = 1;
    opterr = 0;
    int c;
    while ((c = getopt_long(argc, argv, ":o:h", long_opts, NULL)) != -1) {
        switch (c) {
        case 'o': out = optarg; break;
        case 'h': fputs(rerun_help, stdout); return VG_EXIT_OK;
        case ':': return vg_cli_usage_error("rerun", "option '%s' needs an argument", argv[optind - 1]);
        default: return vg_cli_usage_error("rerun", "unknown option '%s'", argv[optind - 1]);
        }
    }
    if (argc - optind != 1) return vg_cli_usage_error("rerun", "expected one RUN_DIR");
    char json[PATH_MAX];
    snprintf(json, sizeof json, "%s/run.json", argv[optind]);
    vg_error err;
    vg_error_clear(&err);
    vg_run_record *rec = NULL;
    if (vg_run_record_read(json, &rec, &err) != VG_OK) {
        vg_cli_error(&err);
        return VG_EXIT_FAIL;
    }
    int rc = VG_EXIT_FAIL;
    char **nargv = NULL;
    if (rec->argc < 2 || strcmp(rec->argv[1], "score") != 0) {
        vg_cli_fail("%s: the saved command is not 'vecgauge score'", json);
        goto done;
    }
    if (verify_inputs(rec)) goto done;

    /* The new run directory, made absolute before changing directory. */
    char here[PATH_MAX], outbuf[2 * PATH_MAX], iso[32], stamp[32];
    if (!getcwd(here, sizeof here)) {
        vg_cli_fail("cannot read the current directory");
        goto done;
    }
    if (!out) {
        vg_utc_now(iso, stamp);
        snprintf(outbuf, sizeof outbuf, "%s/results/%s-rerun", here, stamp);
    } else if (out[0] != '/') {
        snprintf(outbuf, sizeof outbuf, "%s/%s", here, out);
    } else {
        snprintf(outbuf, sizeof outbuf, "%s", out);
    }
    nargv = calloc(rec->argc + 5, sizeof *nargv);
    if (!nargv) {
        vg_cli_fail("out of memory");
        goto done;
    }
    int n = 0;
    nargv[n++] = rec->argv[0];
    for (size_t i = 1; i < rec->argc; i++) {
        int words;
        if (out_option(rec->argv[i], &words)) {
            i += (size_t)words - 1;
            continue;
        }
        nargv[n++] = rec->argv[i];
    }
    /* --out goes right after the command name, before the first operand,
     * so that a recorded "--" cannot turn it into a vector set. */
    memmove(nargv + 4, nargv + 2, (size_t)(n - 2) * sizeof *nargv);
    static char out_flag[] = "--out";
    nargv[2] = out_flag;
    nargv[3] = outbuf;
    n += 2;
    nargv[n] = NULL;
    if (!out && mkdir_results(here) != 0) goto done;
    if (chdir(rec->cwd) != 0) {
        vg_cli_fail("cannot enter the run's working directory %s", rec->cwd);
        goto done;
    }
    vg_cli_argc = n;
    vg_cli_argv = nargv;
    rc = vg_cmd_score(n - 1, nargv + 1);
    if (chdir(here) != 0) vg_cli_fail("cannot return to %s", here);
done:
    free(nargv);
    vg_run_record_free(rec);
    return rc;
}
