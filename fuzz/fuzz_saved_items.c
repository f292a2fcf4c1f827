/* fuzz_saved_items.c - fuzz target: a saved run's items.csv on arbitrary
 * bytes (with a fixed run.json naming two sets, an analogy suite of 6
 * questions and a similarity suite of 3 pairs), then pairing and a
 * comparison when it reads.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include <stdlib.h>
#include <string.h>

#include "fuzz_input.h"
#include "vecgauge/vecgauge.h"

static const char run_json[] =
    "{\"format\": \"vecgauge-run 1\", \"seed\": 1, \"bootstrap_replicates\": 20,"
    " \"confidence_level\": 0.9, \"vector_sets\": [{\"label\": \"set-a\"}, {\"label\": \"set-b\"}],"
    " \"suites\": [{\"id\": \"mini-ana\", \"task\": \"analogy\", \"items\": 6,"
    " \"files\": [{\"sha256\": \"ab\"}]}, {\"id\": \"sim\", \"task\": \"similarity\", \"items\": 3,"
    " \"files\": [{\"sha256\": \"cd\"}]}]}\n";
static const char scores_csv[] =
    "vectors,suite,subset,task,metric,value,ci_low,ci_high,ci_method,n_items,n_used,coverage\n"
    "set-a,sim,,similarity,spearman,0.5,,,,3,3,1\nset-b,sim,,similarity,spearman,0.5,,,,3,3,1\n";

static void put(const char *dir, const char *name, const void *data, size_t n) {
    char p[4200];
    snprintf(p, sizeof p, "%s/%s", dir, name);
    FILE *fp = fopen(p, "wb");
    if (!fp) return;
    fwrite(data, 1, n, fp);
    fclose(fp);
}

/* One scratch run directory for the whole process, removed at exit. */
static char dir[64];

static void remove_dir(void) {
    const char *names[] = {"run.json", "scores.csv", "items.csv"};
    char p[4200];
    for (int i = 0; i < 3; i++) {
        snprintf(p, sizeof p, "%s/%s", dir, names[i]);
        unlink(p);
    }
    rmdir(dir);
}

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size) {
    if (!dir[0]) {
        const char *tmp = getenv("TMPDIR");
        snprintf(dir, sizeof dir, "%s/vgfuzz-run-XXXXXX", tmp && *tmp && strlen(tmp) < 40 ? tmp : "/tmp");
        if (!mkdtemp(dir)) return 0;
        atexit(remove_dir);
        put(dir, "run.json", run_json, strlen(run_json));
        put(dir, "scores.csv", scores_csv, strlen(scores_csv));
    }
    put(dir, "items.csv", data, size);
    vg_saved_run *r = NULL;
    vg_paired_items *p = NULL;
    vg_comparisons *c = NULL;
    vg_error err;
    vg_error_clear(&err);
    if (vg_saved_run_load(dir, &r, &err) == VG_OK) {
        const vg_saved_run *runs[1] = {r};
        if (vg_saved_runs_pair(runs, 1, 1, &p, &err) == VG_OK) {
            vg_compare_options o;
            vg_compare_options_init(&o);
            o.replicates = 20;
            o.threads = 1;
            o.methods = (1u << VG_METHOD_COUNT) - 1;
            vg_compare(p, &o, &c, &err);
        }
    }
    char buf[1200];
    vg_error_format(&err, buf, sizeof buf);
    vg_comparisons_free(c);
    vg_paired_items_free(p);
    vg_saved_run_free(r);
    return 0;
}
