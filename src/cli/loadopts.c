/* loadopts.c - the options of every command that reads vector files.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <getopt.h>
#include <string.h>

#include "cli.h"

const char vg_cli_load_help[] =
    "Vector files (layout, gzip and the .npy vocabulary are found by themselves):\n"
    "      --format LAYOUT    read as LAYOUT: text-header, text, binary or npy\n"
    "      --vocab FILE       the vocabulary of a .npy matrix (default: beside it,\n"
    "                         same name with .vocab or .txt)\n"
    "      --max-words N      read only the first N rows of each file\n"
    "      --allow-short      accept fewer (or more) rows than a header promises\n"
    "      --skip-bad-rows    skip and count malformed rows instead of stopping\n"
    "      --no-hash          do not compute the files' sha256\n"
    "      --max-inflate N    a gzip file may inflate to N times its size, past 256 MiB\n"
    "                         (default 64; 0: no bound)\n"
    "      --rehash           compute the sha256 even when the digest cache holds it\n"
    "      --no-progress      no progress line, even on a terminal\n";

int vg_cli_load_option(const char *command, int c, const char *arg, vg_load_options *lo,
                       int *progress, int *rc) {
    uint64_t u;
    switch (c) {
    case VG_OPT_FORMAT:
        if (vg_layout_parse(arg, &lo->layout) != VG_OK || lo->layout == VG_LAYOUT_AUTO) {
            *rc = vg_cli_usage_error(command,
                                     "--format needs text-header, text, binary or npy, got '%s'", arg);
            return -1;
        }
        return 1;
    case VG_OPT_VOCAB: lo->vocab_path = arg; return 1;
    case VG_OPT_MAX_WORDS:
        if (vg_cli_parse_u64(arg, 1, SIZE_MAX, &u) != 0) {
            *rc = vg_cli_usage_error(command, "--max-words needs a positive integer, got '%s'", arg);
            return -1;
        }
        lo->max_words = (size_t)u;
        return 1;
    case VG_OPT_ALLOW_SHORT: lo->allow_short = 1; return 1;
    case VG_OPT_SKIP_BAD: lo->skip_bad_rows = 1; return 1;
    case VG_OPT_NO_HASH: lo->compute_hash = 0; return 1;
    case VG_OPT_REHASH: lo->digest_cache = VG_DIGEST_CACHE_REFRESH; return 1;
    case VG_OPT_NO_PROGRESS: *progress = 0; return 1;
    case VG_OPT_MAX_INFLATE:
        if (vg_cli_parse_u64(arg, 0, 1032, &u) != 0) {
            *rc = vg_cli_usage_error(command, "--max-inflate needs an integer 0..1032, got '%s'", arg);
            return -1;
        }
        lo->max_inflate = (unsigned)u;
        return 1;
    default: return 0;
    }
}
