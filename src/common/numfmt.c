/* numfmt.c - round-trip and display formatting of doubles.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "numfmt.h"

#include <math.h>
#include <stdio.h>
#include <stdlib.h>

char *vg_format_double(double x, char buf[32]) {
    if (isnan(x)) {
        buf[0] = '\0';
        return buf;
    }
    if (isinf(x)) {
        snprintf(buf, 32, "%s", x > 0 ? "inf" : "-inf");
        return buf;
    }
    /* printf and strtod are locale-sensitive; the CLI never calls
     * setlocale for LC_NUMERIC, so '.' is the decimal point. */
    for (int prec = 15; prec <= 17; prec++) {
        snprintf(buf, 32, "%.*g", prec, x);
        if (strtod(buf, NULL) == x) break;
    }
    return buf;
}

char *vg_format_fixed(double x, int digits, char buf[32]) {
    if (isnan(x))
        snprintf(buf, 32, "n/a");
    else
        snprintf(buf, 32, "%.*f", digits, x);
    return buf;
}
