/* missing.c - the list of distinct missing words a scorer keeps.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "missing.h"

#include <string.h>

#include "../common/alloc.h"

int vg_missing_add(vg_missing_list *l, const char *w) {
    int ins = vg_strmap_put(&l->seen, w, strlen(w), 0, NULL);
    if (ins < 0) return -1;
    if (ins == 0) return 0;
    if (vg_grow((void **)&l->words, &l->cap, l->n + 1, sizeof *l->words) != 0) return -1;
    char *d = vg_strdup(w);
    if (!d) return -1;
    l->words[l->n++] = d;
    return 0;
}

void vg_missing_take(vg_missing_list *l, char ***words, size_t *n) {
    *words = l->words;
    *n = l->n;
    l->words = NULL;
    l->n = l->cap = 0;
    vg_strmap_free(&l->seen);
}

void vg_missing_words_free(char **words, size_t n) {
    for (size_t i = 0; i < n; i++) vg_free(words[i]);
    vg_free(words);
}

void vg_missing_free(vg_missing_list *l) {
    vg_missing_words_free(l->words, l->n);
    l->words = NULL;
    l->n = l->cap = 0;
    vg_strmap_free(&l->seen);
}
