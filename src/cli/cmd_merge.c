/* cmd_merge.c - placeholder.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "cli.h"
int vg_cmd_merge(int argc, char **argv) { (void)argc; (void)argv; return VG_EXIT_FAIL; }
