/* statopts.c - the statistics options shared by score, compare and track:
 * the bootstrap settings, the significance level, the items compared and
 * the analogy methods compared.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <stdint.h>

#include "cli.h"

void vg_cli_stats_init(vg_cli_stats *s) {
    vg_compare_options_init(&s->cmp);
    s->have_seed = s->have_boot = s->have_ci = 0;
}

int vg_cli_stats_option(const char *command, int c, const char *arg, vg_cli_stats *s, int *rc) {
    uint64_t u;
    double d;
    switch (c) {
    case VG_OPT_SEED:
        if (vg_cli_parse_u64(arg, 0, UINT64_MAX, &u) != 0) {
            *rc = vg_cli_usage_error(command, "--seed needs a non-negative integer, got '%s'", arg);
            return -1;
        }
        s->cmp.seed = u;
        s->have_seed = 1;
        return 1;
    case VG_OPT_BOOT:
        if (vg_cli_parse_u64(arg, 0, 10000000, &u) != 0) {
            *rc = vg_cli_usage_error(command, "--bootstrap needs an integer 0..10000000, got '%s'",
                                     arg);
            return -1;
        }
        s->cmp.replicates = (size_t)u;
        s->have_boot = 1;
        return 1;
    case VG_OPT_CI:
        if (vg_cli_parse_double(arg, 0, 1, &d) != 0 || d <= 0 || d >= 1) {
            *rc = vg_cli_usage_error(command, "--ci needs a level between 0 and 1 (e.g. 0.95), got '%s'",
                                     arg);
            return -1;
        }
        s->cmp.level = d;
        s->have_ci = 1;
        return 1;
    case 'j':
        if (vg_cli_parse_u64(arg, 1, 1024, &u) != 0) {
            *rc = vg_cli_usage_error(command, "--threads needs an integer 1..1024, got '%s'", arg);
            return -1;
        }
        s->cmp.threads = (unsigned)u;
        return 1;
    case VG_OPT_ALPHA:
        if (vg_cli_parse_double(arg, 0, 1, &d) != 0 || d <= 0 || d >= 1) {
            *rc = vg_cli_usage_error(command, "--alpha needs a level between 0 and 1 (e.g. 0.05), "
                                     "got '%s'", arg);
            return -1;
        }
        s->cmp.alpha = d;
        return 1;
    case VG_OPT_NO_COMMON: s->cmp.items = VG_COMPARE_AS_IS; return 1;
    case VG_OPT_METHODS:
        if (vg_cli_parse_methods(arg, &s->cmp.methods) != 0) {
            *rc = vg_cli_usage_error(command, "--methods takes 3cosadd, 3cosmul, pairdir or "
                                     "only_b, comma-separated; got '%s'", arg);
            return -1;
        }
        return 1;
    default: return 0;
    }
}
