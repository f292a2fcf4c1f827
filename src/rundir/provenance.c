/* provenance.c - where a run's numbers came from: the time of the run.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <errno.h>
#include <stdint.h>
#include <stdlib.h>
#include <time.h>

#include "rundir_impl.h"

void vg_utc_now(char iso[32], char stamp[32]) {
    time_t t = time(NULL);
    /* SOURCE_DATE_EPOCH (reproducible-builds.org) pins the time, so that
     * tests and the committed demo example can compare whole files. */
    const char *sde = getenv("SOURCE_DATE_EPOCH");
    if (sde && *sde >= '0' && *sde <= '9') {
        char *end;
        errno = 0;
        unsigned long long v = strtoull(sde, &end, 10);
        if (!*end && !errno && v <= (uint64_t)1 << 40) t = (time_t)v;
    }
    struct tm tm;
    gmtime_r(&t, &tm);
    strftime(iso, 32, "%Y-%m-%dT%H:%M:%SZ", &tm);
    strftime(stamp, 32, "%Y%m%dT%H%M%SZ", &tm);
}
