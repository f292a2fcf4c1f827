/* cmd_track.c - `vecgauge track`: placeholder while it is written.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "cli.h"
int vg_cmd_track(int argc, char **argv) { (void)argc; (void)argv; return VG_EXIT_FAIL; }
