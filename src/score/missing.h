/* missing.h - the list of distinct missing words a scorer keeps.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#ifndef VG_MISSING_H
#define VG_MISSING_H

#include <stddef.h>

#include "../common/internal.h"
#include "../common/strmap.h"

/* A growing list of distinct words, in the order first seen. The words
 * are copied; seen indexes the suite's own strings (borrowed). */
typedef struct vg_missing_list {
    char **words;
    size_t n, cap;
    vg_strmap seen;
} vg_missing_list;

/* Add w unless already listed. -1 when out of memory. */
VG_INTERNAL int vg_missing_add(vg_missing_list *l, const char *w);

/* Hand the words over (*words, *n) and free the rest of the list. */
VG_INTERNAL void vg_missing_take(vg_missing_list *l, char ***words, size_t *n);

/* Free the words and the index (when not taken). */
VG_INTERNAL void vg_missing_free(vg_missing_list *l);

/* Free a word list handed over by vg_missing_take. */
VG_INTERNAL void vg_missing_words_free(char **words, size_t n);

#endif /* VG_MISSING_H */
