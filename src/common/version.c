/* version.c - run-time version and one-time library set-up.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "vecgauge/vecgauge.h"

#include <gsl/gsl_errno.h>
#include <pthread.h>

const char *vg_version(void) { return VG_VERSION_STRING; }

static pthread_once_t init_once = PTHREAD_ONCE_INIT;

/* GSL's default handler calls abort() on any error; a library that reads
 * untrusted input must get return codes instead. */
static void init_impl(void) { gsl_set_error_handler_off(); }

void vg_init(void) { pthread_once(&init_once, init_impl); }
