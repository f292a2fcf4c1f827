/* saved_run.c - reading a run directory back: run.json, items.csv, scores.csv.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * A saved run is compared from its per-item records alone (items.csv),
 * without the vector files: the cosines and right/wrong answers there
 * round-trip exactly (%.17g), so a comparison of saved runs equals the
 * in-process one.
 */
#include <errno.h>
#include <jansson.h>
#include <math.h>
#include <stdlib.h>
#include <string.h>
#include <sys/stat.h>

#include "../common/alloc.h"
#include "../common/csvread.h"
#include "../compare/compare_impl.h"
#include "saved_impl.h"

/* Largest items.csv or scores.csv read (a sanity bound, not a promise). */
#define MAX_TABLE_BYTES ((size_t)4 << 30)

json_t *vg_saved_json(const vg_saved_run *r) { return ((saved_priv *)r->priv_)->json; }

long vg_saved_original_set(const vg_saved_run *r, const char *label) {
    const saved_priv *p = r->priv_;
    for (size_t i = 0; i < r->n_sets; i++)
        if (strcmp(p->original[i], label) == 0) return (long)i;
    return -1;
}

vg_csv_table *vg_saved_table(const vg_saved_run *r, const char *name) {
    saved_priv *p = r->priv_;
    if (strcmp(name, "items.csv") == 0) return p->items;
    if (strcmp(name, "scores.csv") == 0) return p->scores;
    if (strcmp(name, "intervals.csv") == 0) return p->intervals;
    if (strcmp(name, "agreement.csv") == 0) return p->agreement;
    if (strcmp(name, "missing.csv") == 0) return p->missing;
    return NULL;
}

void vg_saved_run_free(vg_saved_run *r) {
    if (!r) return;
    saved_priv *p = r->priv_;
    size_t blocks = r->n_sets * r->n_suites;
    for (size_t b = 0; r->cosine && b < blocks; b++) vg_free(r->cosine[b]);
    for (size_t b = 0; r->correct && b < blocks * VG_METHOD_COUNT; b++) vg_free(r->correct[b]);
    for (size_t b = 0; r->scores && b < blocks; b++) vg_free(r->scores[b].interval);
    vg_free(r->cosine);
    vg_free(r->correct);
    vg_free(r->scores);
    for (size_t k = 0; r->suites && k < r->n_suites; k++) {
        vg_saved_suite *s = &r->suites[k];
        vg_free(s->id);
        vg_free(s->words);
        vg_free(s->sections);
        vg_free(s->rating);
        for (size_t f = 0; s->sha256 && f < s->n_files; f++) vg_free(s->sha256[f]);
        vg_free(s->sha256);
    }
    vg_free(r->suites);
    for (size_t i = 0; r->labels && i < r->n_sets; i++) vg_free(r->labels[i]);
    vg_free(r->labels);
    vg_free(r->dir);
    vg_free(r->utc_time);
    vg_free(r->command_line);
    if (p) {
        vg_csv_free(p->items);
        vg_csv_free(p->scores);
        vg_csv_free(p->intervals);
        vg_csv_free(p->agreement);
        vg_csv_free(p->missing);
        if (p->json) json_decref(p->json);
        for (size_t i = 0; p->original && i < r->n_sets; i++) vg_free(p->original[i]);
        vg_free(p->original);
        for (size_t k = 0; p->words && k < r->n_suites; k++) vg_free(p->words[k]);
        vg_free(p->words);
        vg_free(p);
    }
    vg_free(r);
}

vg_status vg_saved_run_relabel(vg_saved_run *r, size_t s, const char *label, vg_error *err) {
    if (s >= r->n_sets) return vg_error_set(err, VG_EINVAL, r->dir, 0, "no vector set %zu", s + 1);
    char *c = vg_strdup(label);
    if (!c) return vg_error_set(err, VG_ENOMEM, r->dir, 0, "out of memory");
    vg_free(r->labels[s]);
    r->labels[s] = c;
    return VG_OK;
}

/* dir/name in a new string, or NULL. */
char *vg_saved_path(const char *dir, const char *name) {
    size_t n = strlen(dir) + 1 + strlen(name) + 1;
    char *p = vg_malloc(n);
    if (p) snprintf(p, n, "%s/%s", dir, name);
    return p;
}

static vg_status load_table(const char *dir, const char *name, int required, vg_csv_table **out,
                            vg_error *err) {
    *out = NULL;
    char *path = vg_saved_path(dir, name);
    if (!path) return vg_error_set(err, VG_ENOMEM, dir, 0, "out of memory");
    struct stat sb;
    vg_status st = VG_OK;
    if (stat(path, &sb) != 0) {
        if (required)
            st = vg_error_set(err, VG_EIO, path, 0, "missing: a run directory holds %s", name);
    } else {
        st = vg_csv_load(path, MAX_TABLE_BYTES, out, err);
        if (st == VG_OK && (*out)->n_rec == 0) {
            st = vg_error_set(err, VG_EFORMAT, path, 1, "empty: expected a header line");
            vg_csv_free(*out);
            *out = NULL;
        }
    }
    vg_free(path);
    return st;
}

/* The number in field s, or VG_EVALUE. Empty gives NaN when allow_empty. */
static vg_status parse_real(const vg_csv_table *t, const vg_csv_record *rec, long col,
                            int allow_empty, double *out, vg_error *err) {
    const char *s = rec->field[col];
    if (!*s && allow_empty) {
        *out = NAN;
        return VG_OK;
    }
    char *end;
    errno = 0;
    double v = strtod(s, &end);
    if (!*s || *end || isnan(v))
        return vg_error_set(err, VG_EVALUE, t->path, rec->line,
                            "column %s: expected a number, found '%s'", t->rec[0].field[col], s);
    *out = v;
    return VG_OK;
}

static vg_status parse_count(const vg_csv_table *t, const vg_csv_record *rec, long col,
                             size_t *out, vg_error *err) {
    const char *s = rec->field[col];
    char *end;
    errno = 0;
    unsigned long long v = strtoull(s, &end, 10);
    if (!*s || *end || *s == '-' || errno)
        return vg_error_set(err, VG_EVALUE, t->path, rec->line,
                            "column %s: expected a whole number, found '%s'",
                            t->rec[0].field[col], s);
    *out = (size_t)v;
    return VG_OK;
}

static long find_label(const vg_saved_run *r, const char *label) {
    for (size_t i = 0; i < r->n_sets; i++)
        if (strcmp(r->labels[i], label) == 0) return (long)i;
    return -1;
}

static long find_suite(const vg_saved_run *r, const char *id) {
    for (size_t k = 0; k < r->n_suites; k++)
        if (strcmp(r->suites[k].id, id) == 0) return (long)k;
    return -1;
}

/* run.json: settings, vector set labels, suites with their files' digests. */
static vg_status read_json(vg_saved_run *r, const char *path, vg_error *err) {
    saved_priv *p = r->priv_;
    json_error_t je;
    struct stat sb;
    if (stat(path, &sb) != 0)
        return vg_error_set(err, VG_EIO, path, 0,
                            "missing: not a run directory (vecgauge score writes run.json last)");
    p->json = json_load_file(path, JSON_REJECT_DUPLICATES, &je);
    if (!p->json)
        return vg_error_set(err, je.line > 0 ? VG_EFORMAT : VG_EIO, path,
                            je.line > 0 ? (uint64_t)je.line : 0, "not a readable run.json: %s",
                            je.text);
    json_t *root = p->json;
    json_t *fmt = json_object_get(root, "format");
    if (!json_is_string(fmt) || strncmp(json_string_value(fmt), "vecgauge-run ", 13) != 0)
        return vg_error_set(err, VG_EFORMAT, path, 0,
                            "expected \"format\": \"vecgauge-run 1\"; not a vecgauge run.json");
    json_t *t = json_object_get(root, "utc_time"), *cl = json_object_get(root, "command_line");
    r->utc_time = vg_strdup(json_is_string(t) ? json_string_value(t) : "");
    r->command_line = vg_strdup(json_is_string(cl) ? json_string_value(cl) : "");
    if (!r->utc_time || !r->command_line) return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
    json_t *seed = json_object_get(root, "seed"), *boot = json_object_get(root, "bootstrap_replicates");
    json_t *lv = json_object_get(root, "confidence_level");
    if (!json_is_integer(seed) || !json_is_integer(boot) || !json_is_number(lv) ||
        json_integer_value(boot) < 0)
        return vg_error_set(err, VG_EFORMAT, path, 0,
                            "expected \"seed\", \"bootstrap_replicates\" and \"confidence_level\"");
    r->seed = (uint64_t)json_integer_value(seed);
    r->bootstrap = (size_t)json_integer_value(boot);
    r->level = json_number_value(lv);
    json_t *sets = json_object_get(root, "vector_sets"), *suites = json_object_get(root, "suites");
    if (!json_is_array(sets) || !json_is_array(suites) || json_array_size(sets) == 0)
        return vg_error_set(err, VG_EFORMAT, path, 0,
                            "expected \"vector_sets\" (at least one) and \"suites\" arrays");
    r->n_sets = json_array_size(sets);
    r->labels = vg_calloc(r->n_sets, sizeof *r->labels);
    r->n_suites = json_array_size(suites);
    r->suites = vg_calloc(r->n_suites ? r->n_suites : 1, sizeof *r->suites);
    if (!r->labels || !r->suites) return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
    for (size_t i = 0; i < r->n_sets; i++) {
        json_t *l = json_object_get(json_array_get(sets, i), "label");
        if (!json_is_string(l))
            return vg_error_set(err, VG_EFORMAT, path, 0, "vector_sets[%zu] has no \"label\"", i);
        if (!(r->labels[i] = vg_strdup(json_string_value(l))))
            return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
        if (find_label(r, r->labels[i]) != (long)i)
            return vg_error_set(err, VG_EFORMAT, path, 0, "two vector sets are labelled '%s'",
                                r->labels[i]);
    }
    for (size_t k = 0; k < r->n_suites; k++) {
        json_t *o = json_array_get(suites, k);
        json_t *id = json_object_get(o, "id"), *task = json_object_get(o, "task");
        json_t *items = json_object_get(o, "items"), *files = json_object_get(o, "files");
        if (!json_is_string(id) || !json_is_string(task) || !json_is_integer(items) ||
            json_integer_value(items) < 0 || !json_is_array(files))
            return vg_error_set(err, VG_EFORMAT, path, 0,
                                "suites[%zu] needs \"id\", \"task\", \"items\" and \"files\"", k);
        vg_saved_suite *s = &r->suites[k];
        const char *tk = json_string_value(task);
        s->task = strcmp(tk, "similarity") == 0 ? VG_TASK_SIMILARITY
                  : strcmp(tk, "analogy") == 0  ? VG_TASK_ANALOGY
                                                : (vg_task)0;
        if (!s->task)
            return vg_error_set(err, VG_EFORMAT, path, 0, "suites[%zu]: unknown task '%s'", k, tk);
        if (!(s->id = vg_strdup(json_string_value(id))))
            return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
        if (find_suite(r, s->id) != (long)k)
            return vg_error_set(err, VG_EFORMAT, path, 0, "suite '%s' appears twice", s->id);
        s->n_items = (size_t)json_integer_value(items);
        s->n_files = json_array_size(files);
        s->sha256 = vg_calloc(s->n_files ? s->n_files : 1, sizeof *s->sha256);
        if (!s->sha256) return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
        for (size_t f = 0; f < s->n_files; f++) {
            json_t *h = json_object_get(json_array_get(files, f), "sha256");
            if (!json_is_string(h))
                return vg_error_set(err, VG_EFORMAT, path, 0,
                                    "suites[%zu].files[%zu] has no \"sha256\"", k, f);
            if (!(s->sha256[f] = vg_strdup(json_string_value(h))))
                return vg_error_set(err, VG_ENOMEM, path, 0, "out of memory");
        }
    }
    return VG_OK;
}

static const char *const method_cols[VG_METHOD_COUNT] = {"3cosadd_correct", "3cosmul_correct",
                                                         "pairdir_correct", "only_b_correct"};

/* items.csv: every set's record of every item, checked for agreement. */
static vg_status read_items(vg_saved_run *r, vg_error *err) {
    saved_priv *p = r->priv_;
    const vg_csv_table *t = p->items;
    static const char *const names[] = {"vectors", "suite", "item", "task", "word1", "word2",
                                        "word3", "expected", "rating", "status", "cosine", NULL};
    enum { C_SET, C_SUITE, C_ITEM, C_TASK, C_W1, C_W2, C_W3, C_EXP, C_RATING, C_STATUS, C_COS };
    long col[11];
    vg_status st = vg_csv_require(t, names, col, err);
    if (st != VG_OK) return st;
    long mcol[VG_METHOD_COUNT];
    for (int m = 0; m < VG_METHOD_COUNT; m++) mcol[m] = vg_csv_column(t, method_cols[m]);
    long scol = vg_csv_column(t, "subset");
    size_t blocks = r->n_sets * r->n_suites;
    r->cosine = vg_calloc(blocks ? blocks : 1, sizeof *r->cosine);
    r->correct = vg_calloc(blocks ? blocks * VG_METHOD_COUNT : 1, sizeof *r->correct);
    unsigned char **seen = vg_calloc(blocks ? blocks : 1, sizeof *seen);
    if (!r->cosine || !r->correct || !seen) goto oom;
    for (size_t k = 0; k < r->n_suites; k++) {
        vg_saved_suite *s = &r->suites[k];
        size_t n = s->n_items ? s->n_items : 1;
        s->words = vg_calloc(4 * n, sizeof *s->words);
        if (s->task == VG_TASK_SIMILARITY) s->rating = vg_calloc(n, sizeof *s->rating);
        if (!s->words || (s->task == VG_TASK_SIMILARITY && !s->rating)) goto oom;
        if (scol >= 0 && !(s->sections = vg_calloc(n, sizeof *s->sections))) goto oom;
        for (size_t i = 0; i < r->n_sets; i++) {
            size_t b = i * r->n_suites + k;
            if (!(seen[b] = vg_calloc(n, 1))) goto oom;
            if (s->task == VG_TASK_SIMILARITY) {
                if (!(r->cosine[b] = vg_calloc(n, sizeof **r->cosine))) goto oom;
            } else {
                for (int m = 0; m < VG_METHOD_COUNT; m++) {
                    if (mcol[m] < 0) continue;
                    signed char *c = vg_calloc(n, 1);
                    if (!c) goto oom;
                    memset(c, -1, n);
                    r->correct[b * VG_METHOD_COUNT + m] = c;
                }
            }
        }
    }
    for (size_t q = 1; q < t->n_rec; q++) {
        const vg_csv_record *rec = &t->rec[q];
        if (rec->n != t->rec[0].n) {
            st = vg_error_set(err, VG_EFORMAT, t->path, rec->line,
                              "expected %zu fields as in the header, found %zu", t->rec[0].n, rec->n);
            goto done;
        }
        long set = find_label(r, rec->field[col[C_SET]]);
        long k = find_suite(r, rec->field[col[C_SUITE]]);
        if (set < 0 || k < 0) {
            st = vg_error_set(err, VG_EFORMAT, t->path, rec->line,
                              "%s '%s' is not in run.json", set < 0 ? "vector set" : "suite",
                              set < 0 ? rec->field[col[C_SET]] : rec->field[col[C_SUITE]]);
            goto done;
        }
        vg_saved_suite *s = &r->suites[k];
        size_t item;
        if ((st = parse_count(t, rec, col[C_ITEM], &item, err)) != VG_OK) goto done;
        if (item < 1 || item > s->n_items) {
            st = vg_error_set(err, VG_EFORMAT, t->path, rec->line,
                              "item %zu of suite %s: run.json says it has %zu items", item, s->id,
                              s->n_items);
            goto done;
        }
        size_t i = item - 1, b = (size_t)set * r->n_suites + (size_t)k;
        if (strcmp(rec->field[col[C_TASK]], vg_task_name(s->task)) != 0) {
            st = vg_error_set(err, VG_EFORMAT, t->path, rec->line,
                              "task '%s', but suite %s is a %s suite in run.json",
                              rec->field[col[C_TASK]], s->id, vg_task_name(s->task));
            goto done;
        }
        if (seen[b][i]) {
            st = vg_error_set(err, VG_EFORMAT, t->path, rec->line,
                              "item %zu of suite %s appears twice for vector set %s", item, s->id,
                              r->labels[set]);
            goto done;
        }
        seen[b][i] = 1;
        /* The words of an item are the same for every set of the run. */
        const long wc[4] = {col[C_W1], col[C_W2], col[C_W3], col[C_EXP]};
        int first = s->words[4 * i] == NULL;
        if (first && s->sections) s->sections[i] = rec->field[scol];
        for (int w = 0; w < 4; w++) {
            char *f = rec->field[wc[w]];
            if (first) {
                s->words[4 * i + w] = f;
            } else if (strcmp(s->words[4 * i + w], f) != 0) {
                st = vg_error_set(err, VG_EFORMAT, t->path, rec->line,
                                  "item %zu of suite %s has other words than in an earlier row",
                                  item, s->id);
                goto done;
            }
        }
        if (s->task == VG_TASK_SIMILARITY) {
            double rating, cos;
            if ((st = parse_real(t, rec, col[C_RATING], 0, &rating, err)) != VG_OK ||
                (st = parse_real(t, rec, col[C_COS], 1, &cos, err)) != VG_OK)
                goto done;
            if (first) {
                s->rating[i] = rating;
            } else if (s->rating[i] != rating) {
                st = vg_error_set(err, VG_EFORMAT, t->path, rec->line,
                                  "item %zu of suite %s has another rating than in an earlier row",
                                  item, s->id);
                goto done;
            }
            /* Only a scored pair has a cosine (as in the score rows). */
            r->cosine[b][i] = strcmp(rec->field[col[C_STATUS]], "scored") == 0 ? cos : NAN;
        } else {
            for (int m = 0; m < VG_METHOD_COUNT; m++) {
                if (mcol[m] < 0) continue;
                const char *v = rec->field[mcol[m]];
                signed char c = !*v ? -1 : strcmp(v, "1") == 0 ? 1 : strcmp(v, "0") == 0 ? 0 : -2;
                if (c == -2) {
                    st = vg_error_set(err, VG_EVALUE, t->path, rec->line,
                                      "column %s: expected 1, 0 or empty, found '%s'",
                                      method_cols[m], v);
                    goto done;
                }
                r->correct[b * VG_METHOD_COUNT + m][i] = c;
            }
        }
    }
    for (size_t set = 0; set < r->n_sets; set++)
        for (size_t k = 0; k < r->n_suites; k++)
            for (size_t i = 0; i < r->suites[k].n_items; i++)
                if (!seen[set * r->n_suites + k][i]) {
                    st = vg_error_set(err, VG_EFORMAT, t->path, 0,
                                      "no row for item %zu of suite %s, vector set %s: items.csv "
                                      "is incomplete",
                                      i + 1, r->suites[k].id, r->labels[set]);
                    goto done;
                }
    goto done;
oom:
    st = vg_error_set(err, VG_ENOMEM, t->path, 0, "out of memory");
done:
    for (size_t b = 0; seen && b < blocks; b++) vg_free(seen[b]);
    vg_free(seen);
    return st;
}

void vg_saved_answered_accuracy(vg_saved_run *r, size_t b) {
    const vg_saved_suite *s = &r->suites[b % r->n_suites];
    vg_saved_score *sc = &r->scores[b];
    const signed char *c = r->correct[b * VG_METHOD_COUNT + VG_METHOD_3COSADD];
    size_t right = 0, used = 0;
    for (size_t i = 0; c && i < s->n_items; i++)
        if (c[i] >= 0) {
            used++;
            right += c[i] == 1;
        }
    sc->value = used ? (double)right / (double)used : NAN;
    sc->n_used = used;
}

/* scores.csv: the headline score of each set on each suite. */
static vg_status read_scores(vg_saved_run *r, vg_error *err) {
    saved_priv *p = r->priv_;
    const vg_csv_table *t = p->scores;
    static const char *const names[] = {"vectors", "suite", "subset", "metric", "value", "ci_low",
                                        "ci_high", "ci_method", "n_items", "n_used", NULL};
    long col[10];
    vg_status st = vg_csv_require(t, names, col, err);
    if (st != VG_OK) return st;
    size_t blocks = r->n_sets * r->n_suites;
    r->scores = vg_calloc(blocks ? blocks : 1, sizeof *r->scores);
    if (!r->scores) return vg_error_set(err, VG_ENOMEM, t->path, 0, "out of memory");
    for (size_t b = 0; b < blocks; b++) {
        vg_saved_score *sc = &r->scores[b];
        sc->metric = r->suites[b % r->n_suites].task == VG_TASK_SIMILARITY ? "spearman" : "3cosadd";
        sc->value = sc->low = sc->high = NAN;
        sc->n_items = r->suites[b % r->n_suites].n_items;
    }
    unsigned char *found = vg_calloc(blocks ? blocks : 1, 1);
    if (!found) return vg_error_set(err, VG_ENOMEM, t->path, 0, "out of memory");
    for (size_t q = 1; q < t->n_rec && st == VG_OK; q++) {
        const vg_csv_record *rec = &t->rec[q];
        if (rec->n != t->rec[0].n) {
            st = vg_error_set(err, VG_EFORMAT, t->path, rec->line,
                              "expected %zu fields as in the header, found %zu", t->rec[0].n, rec->n);
            break;
        }
        long set = find_label(r, rec->field[col[0]]), k = find_suite(r, rec->field[col[1]]);
        if (set < 0 || k < 0 || rec->field[col[2]][0]) continue;
        size_t b = (size_t)set * r->n_suites + (size_t)k;
        vg_saved_score *sc = &r->scores[b];
        if (strcmp(rec->field[col[3]], sc->metric) != 0 || found[b]) continue;
        found[b] = 1;
        if ((st = parse_real(t, rec, col[4], 1, &sc->value, err)) != VG_OK ||
            (st = parse_real(t, rec, col[5], 1, &sc->low, err)) != VG_OK ||
            (st = parse_real(t, rec, col[6], 1, &sc->high, err)) != VG_OK ||
            (st = parse_count(t, rec, col[8], &sc->n_items, err)) != VG_OK ||
            (st = parse_count(t, rec, col[9], &sc->n_used, err)) != VG_OK)
            break;
        if (!(sc->interval = vg_strdup(rec->field[col[7]])))
            st = vg_error_set(err, VG_ENOMEM, t->path, 0, "out of memory");
    }
    for (size_t b = 0; st == VG_OK && b < blocks; b++) {
        vg_saved_score *sc = &r->scores[b];
        if (!sc->interval && !(sc->interval = vg_strdup("")))
            st = vg_error_set(err, VG_ENOMEM, t->path, 0, "out of memory");
        if (found[b] || st != VG_OK) continue;
        const vg_saved_suite *s = &r->suites[b % r->n_suites];
        if (s->task == VG_TASK_SIMILARITY) {
            st = vg_error_set(err, VG_EFORMAT, t->path, 0,
                              "no spearman row for vector set %s on suite %s",
                              r->labels[b / r->n_suites], s->id);
            break;
        }
        /* No 3cosadd row (a run written before analogy rows existed). */
        vg_saved_answered_accuracy(r, b);
    }
    vg_free(found);
    return st;
}

vg_status vg_saved_run_load(const char *dir, vg_saved_run **out, vg_error *err) {
    *out = NULL;
    vg_saved_run *r = vg_calloc(1, sizeof *r);
    saved_priv *p = vg_calloc(1, sizeof *p);
    char *json = NULL;
    vg_status st = VG_OK;
    if (!r || !p) {
        vg_free(r);
        vg_free(p);
        return vg_error_set(err, VG_ENOMEM, dir, 0, "out of memory");
    }
    r->priv_ = p;
    size_t len = strlen(dir);
    while (len > 1 && dir[len - 1] == '/') len--;
    if (!(r->dir = vg_strndup(dir, len)) || !(json = vg_saved_path(r->dir, "run.json"))) {
        st = vg_error_set(err, VG_ENOMEM, dir, 0, "out of memory");
        goto done;
    }
    struct stat sb;
    if (stat(r->dir, &sb) != 0 || !S_ISDIR(sb.st_mode)) {
        st = vg_error_set(err, VG_EIO, r->dir, 0, "not a directory (expected a run directory)");
        goto done;
    }
    if ((st = read_json(r, json, err)) != VG_OK) goto done;
    if (!(p->original = vg_calloc(r->n_sets, sizeof *p->original))) {
        st = vg_error_set(err, VG_ENOMEM, dir, 0, "out of memory");
        goto done;
    }
    for (size_t i = 0; i < r->n_sets; i++)
        if (!(p->original[i] = vg_strdup(r->labels[i]))) {
            st = vg_error_set(err, VG_ENOMEM, dir, 0, "out of memory");
            goto done;
        }
    if ((st = load_table(r->dir, "items.csv", 1, &p->items, err)) != VG_OK ||
        (st = load_table(r->dir, "scores.csv", 1, &p->scores, err)) != VG_OK ||
        (st = load_table(r->dir, "intervals.csv", 0, &p->intervals, err)) != VG_OK ||
        (st = load_table(r->dir, "agreement.csv", 0, &p->agreement, err)) != VG_OK ||
        (st = load_table(r->dir, "missing.csv", 0, &p->missing, err)) != VG_OK)
        goto done;
    if ((st = read_items(r, err)) != VG_OK) goto done;
    st = read_scores(r, err);
done:
    vg_free(json);
    if (st != VG_OK) {
        vg_saved_run_free(r);
        return st;
    }
    *out = r;
    return VG_OK;
}
