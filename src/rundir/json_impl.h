/* json_impl.h - helpers of the JSON writers (jansson).
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_JSON_IMPL_H
#define VG_JSON_IMPL_H

#include <jansson.h>

#include "../common/internal.h"
#include "vecgauge/rundir.h"

/* A new JSON string of s ("" for NULL), with '?' for bytes that are not
 * UTF-8; NULL only when out of memory (jansson then drops the key, and
 * the writer's final check reports the failure). */
VG_INTERNAL json_t *vg_json_text(const char *s);

/* Set root's "format" (format), "tool" (name, version, git_describe),
 * "utc_time", "command_line", "cwd" and "argv" from prov (may be NULL). */
VG_INTERNAL void vg_json_provenance(json_t *root, const char *format, const vg_provenance *prov);

#endif /* VG_JSON_IMPL_H */
