/* numfmt.h - printing doubles so that they read back exactly.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_NUMFMT_H
#define VG_NUMFMT_H

#include "internal.h"

/* Shortest of %.15g, %.16g, %.17g that strtod reads back to exactly x
 * (%.17g always does, for IEEE doubles). NaN gives "" (an empty CSV
 * field); infinities give "inf" / "-inf". Returns buf. */
VG_INTERNAL char *vg_format_double(double x, char buf[32]);

/* x rounded for people: %.*f with digits decimals; NaN gives "n/a". */
VG_INTERNAL char *vg_format_fixed(double x, int digits, char buf[32]);

#endif /* VG_NUMFMT_H */
