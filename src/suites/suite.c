/* suite.c - the vg_suite object: construction, interning, statistics.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <math.h>
#include <string.h>

#include "../common/alloc.h"
#include "../common/lines.h"
#include "../common/strmap.h"
#include "../common/text.h"
#include "suite_impl.h"

const char *vg_task_name(vg_task task) {
    switch (task) {
    case VG_TASK_SIMILARITY: return "similarity";
    case VG_TASK_ANALOGY: return "analogy";
    }
    return "unknown";
}

const char *vg_path_basename(const char *path) {
    const char *slash = strrchr(path, '/');
    return slash ? slash + 1 : path;
}

char *vg_path_stem(const char *path, char *buf, size_t size) {
    const char *base = vg_path_basename(path);
    size_t n = strlen(base);
    if (n > 3 && strcmp(base + n - 3, ".gz") == 0) n -= 3;
    for (size_t i = n; i > 1; i--)
        if (base[i - 1] == '.') {
            n = i - 1;
            break;
        }
    snprintf(buf, size, "%.*s", (int)n, base);
    return buf;
}

vg_suite *vg_suite_new(vg_task task, const char *id) {
    vg_suite *s = vg_calloc(1, sizeof *s);
    vg_suite_priv *p = vg_calloc(1, sizeof *p);
    if (!s || !p) {
        vg_free(s);
        vg_free(p);
        return NULL;
    }
    s->priv_ = p;
    s->task = task;
    s->scale_min = s->scale_max = NAN;
    s->id = vg_strdup(id ? id : "");
    s->title = vg_strdup("");
    s->variant = "";
    if (!s->id || !s->title) {
        vg_suite_free(s);
        return NULL;
    }
    return s;
}

void vg_suite_free(vg_suite *s) {
    if (!s) return;
    vg_suite_priv *p = s->priv_;
    if (p) {
        vg_arena_free(&p->arena);
        vg_free(p);
    }
    vg_free(s->id);
    vg_free(s->title);
    vg_free(s->pairs);
    vg_free(s->questions);
    vg_free(s->sections);
    vg_free(s->files);
    vg_free(s);
}

vg_arena *vg_suite_arena(vg_suite *s) { return &((vg_suite_priv *)s->priv_)->arena; }

char *vg_suite_intern(vg_suite *s, const char *str, size_t n) {
    size_t nlen;
    char *owned;
    const char *k = vg_text_nfc(str, n, &nlen, &owned);
    if (!k) return NULL;
    char *d = vg_arena_strndup(vg_suite_arena(s), k, nlen);
    vg_free(owned);
    return d;
}

vg_pair *vg_suite_add_pair(vg_suite *s) {
    vg_suite_priv *p = s->priv_;
    if (vg_grow((void **)&s->pairs, &p->cap_items, s->n_items + 1, sizeof *s->pairs) != 0)
        return NULL;
    vg_pair *pr = &s->pairs[s->n_items++];
    memset(pr, 0, sizeof *pr);
    return pr;
}

vg_question *vg_suite_add_question(vg_suite *s) {
    vg_suite_priv *p = s->priv_;
    if (vg_grow((void **)&s->questions, &p->cap_items, s->n_items + 1, sizeof *s->questions) != 0)
        return NULL;
    vg_question *q = &s->questions[s->n_items++];
    memset(q, 0, sizeof *q);
    return q;
}

vg_status vg_suite_add_file(vg_suite *s, vg_lines *lr, vg_error *err) {
    const char *path = vg_lines_path(lr);
    vg_file_info *nf = vg_reallocarray(s->files, s->n_files + 1, sizeof *nf);
    if (!nf) return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
    s->files = nf;
    vg_file_info *f = &s->files[s->n_files];
    memset(f, 0, sizeof *f);
    f->path = vg_arena_strdup(vg_suite_arena(s), path);
    if (!f->path) return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
    /* The digest of the bytes just read: no second read, which a pipe
     * could not give. */
    snprintf(f->sha256, sizeof f->sha256, "%s", vg_lines_sha256(lr, &f->bytes));
    s->n_files++;
    return VG_OK;
}

vg_status vg_suite_count_pair_stats(vg_suite *s, vg_error *err) {
    vg_strmap seen = VG_STRMAP_INIT;
    vg_arena keys = VG_ARENA_INIT;
    vg_status st = VG_OK;
    if (vg_strmap_reserve(&seen, s->n_items) != 0) {
        st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
        goto done;
    }
    for (size_t i = 0; i < s->n_items; i++) {
        const vg_pair *p = &s->pairs[i];
        size_t l1 = strlen(p->w1), l2 = strlen(p->w2);
        if (l1 == l2 && memcmp(p->w1, p->w2, l1) == 0) s->stats.self_pairs++;
        if (strpbrk(p->w1, " _") || strpbrk(p->w2, " _")) s->stats.multiword++;
        /* Key "w1\0w2": the NUL cannot occur inside a word. */
        char *k = vg_arena_alloc(&keys, l1 + l2 + 1);
        char *r = vg_arena_alloc(&keys, l1 + l2 + 1);
        if (!k || !r) {
            st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
            goto done;
        }
        memcpy(k, p->w1, l1);
        k[l1] = '\0';
        memcpy(k + l1 + 1, p->w2, l2);
        memcpy(r, p->w2, l2);
        r[l2] = '\0';
        memcpy(r + l2 + 1, p->w1, l1);
        int ins = vg_strmap_put(&seen, k, l1 + l2 + 1, i, NULL);
        if (ins < 0) {
            st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
            goto done;
        }
        if (ins == 0) {
            s->stats.duplicates++;
        } else if (!(l1 == l2 && memcmp(p->w1, p->w2, l1) == 0) &&
                   vg_strmap_get(&seen, r, l1 + l2 + 1) != (size_t)-1) {
            s->stats.reversed_duplicates++;
        }
    }
done:
    vg_strmap_free(&seen);
    vg_arena_free(&keys);
    return st;
}

vg_status vg_suite_count_question_stats(vg_suite *s, vg_error *err) {
    vg_strmap seen = VG_STRMAP_INIT;
    vg_arena keys = VG_ARENA_INIT;
    vg_status st = VG_OK;
    if (vg_strmap_reserve(&seen, s->n_items) != 0) {
        st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
        goto done;
    }
    for (size_t i = 0; i < s->n_items; i++) {
        const vg_question *q = &s->questions[i];
        const char *w[4] = {q->a, q->b, q->c, q->answers[0]};
        size_t l[4], total = 0;
        int multi = 0;
        for (int k = 0; k < 4; k++) {
            l[k] = strlen(w[k]);
            total += l[k] + 1;
            multi |= strpbrk(w[k], " _") != NULL;
        }
        s->stats.multiword += multi;
        /* Key "a\0b\0c\0d": the NUL cannot occur inside a word. */
        char *k = vg_arena_alloc(&keys, total);
        if (!k) {
            st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
            goto done;
        }
        size_t off = 0;
        for (int j = 0; j < 4; j++) {
            memcpy(k + off, w[j], l[j] + 1);
            off += l[j] + 1;
        }
        int ins = vg_strmap_put(&seen, k, total, i, NULL);
        if (ins < 0) {
            st = vg_error_set(err, VG_ENOMEM, NULL, 0, "out of memory");
            goto done;
        }
        if (ins == 0) s->stats.duplicates++;
    }
done:
    vg_strmap_free(&seen);
    vg_arena_free(&keys);
    return st;
}
