/* util.c - helpers shared by the commands.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <errno.h>
#include <math.h>
#include <stdarg.h>
#include <stdio.h>
#include <stdlib.h>
#include <string.h>

#include "cli.h"
#include "vg_gitdesc.h"

const char *vg_cli_git_describe = VG_GIT_DESCRIBE;

const char *vg_cli_progname = "vecgauge";
int vg_cli_argc;
char **vg_cli_argv;

void vg_cli_error(const vg_error *err) {
    char buf[4 * (VG_ERROR_PATH_MAX + VG_ERROR_MSG_MAX) + 128];
    fprintf(stderr, "%s: %s\n", vg_cli_progname, vg_error_format(err, buf, sizeof buf));
}

/* Every message goes through here: formatted, then escaped, so that a
 * word, label or path holding control characters cannot drive the
 * terminal (vg_escape_text). */
static void vsay(const char *command, const char *fmt, va_list ap) {
    char raw[4096], safe[4 * 4096];
    vsnprintf(raw, sizeof raw, fmt, ap);
    vg_escape_text(raw, safe, sizeof safe);
    if (command)
        fprintf(stderr, "%s %s: %s\n", vg_cli_progname, command, safe);
    else
        fprintf(stderr, "%s: %s\n", vg_cli_progname, safe);
}

void vg_cli_fail(const char *fmt, ...) {
    va_list ap;
    va_start(ap, fmt);
    vsay(NULL, fmt, ap);
    va_end(ap);
}

void vg_cli_note(const char *fmt, ...) {
    va_list ap;
    va_start(ap, fmt);
    vsay(NULL, fmt, ap);
    va_end(ap);
}

int vg_cli_usage_error(const char *command, const char *fmt, ...) {
    va_list ap;
    va_start(ap, fmt);
    vsay(command, fmt, ap);
    va_end(ap);
    fprintf(stderr, "Try '%s %s --help'.\n", vg_cli_progname, command);
    return VG_EXIT_USAGE;
}

int vg_cli_parse_u64(const char *s, uint64_t min, uint64_t max, uint64_t *out) {
    if (!s || !*s || *s == '-' || *s == '+') return -1;
    char *end;
    errno = 0;
    unsigned long long v = strtoull(s, &end, 10);
    if (errno || *end || v < min || v > max) return -1;
    *out = v;
    return 0;
}

int vg_cli_parse_double(const char *s, double min, double max, double *out) {
    if (!s || !*s) return -1;
    char *end;
    errno = 0;
    double v = strtod(s, &end);
    if (errno || *end || !isfinite(v) || v < min || v > max) return -1;
    *out = v;
    return 0;
}

int vg_cli_vector_spec(const char *spec, char **label, char **path) {
    *label = *path = NULL;
    const char *eq = strchr(spec, '=');
    /* LABEL=PATH only when the part before '=' holds no '/', so that a
     * path such as "runs/lr=0.1/vectors.txt" still reads as a path. */
    if (eq && eq != spec && !memchr(spec, '/', (size_t)(eq - spec))) {
        *label = strndup(spec, (size_t)(eq - spec));
        *path = strdup(eq + 1);
    } else {
        const char *base = strrchr(spec, '/');
        base = base ? base + 1 : spec;
        const char *dot = strchr(base, '.');
        size_t n = dot && dot != base ? (size_t)(dot - base) : strlen(base);
        *label = strndup(base, n);
        *path = strdup(spec);
    }
    if (!*label || !*path || !**path || !**label) {
        free(*label);
        free(*path);
        *label = *path = NULL;
        return -1;
    }
    return 0;
}

/* Quote s for a POSIX shell when it holds anything but safe characters. */
static size_t quote_arg(const char *s, char *out) {
    size_t n = 0;
    int safe = *s != '\0';
    for (const char *p = s; *p; p++)
        if (!strchr("abcdefghijklmnopqrstuvwxyzABCDEFGHIJKLMNOPQRSTUVWXYZ0123456789-_./=:,+@%", *p))
            safe = 0;
    if (safe) {
        if (out) memcpy(out, s, strlen(s));
        return strlen(s);
    }
    if (out) out[n] = '\'';
    n++;
    for (const char *p = s; *p; p++) {
        if (*p == '\'') {
            if (out) memcpy(out + n, "'\\''", 4);
            n += 4;
        } else {
            if (out) out[n] = *p;
            n++;
        }
    }
    if (out) out[n] = '\'';
    return n + 1;
}

char *vg_cli_command_line(int argc, char **argv) {
    /* argv[0] is replaced by the program name: where the binary happened
     * to live is noise, not provenance. */
    size_t total = strlen(vg_cli_progname) + 1;
    for (int i = 1; i < argc; i++) total += quote_arg(argv[i], NULL) + 1;
    char *s = malloc(total);
    if (!s) return NULL;
    size_t off = strlen(vg_cli_progname);
    memcpy(s, vg_cli_progname, off);
    for (int i = 1; i < argc; i++) {
        s[off++] = ' ';
        off += quote_arg(argv[i], s + off);
    }
    s[off] = '\0';
    return s;
}
