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

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size) {
    static int ready;
    if (!ready) {
        if (vg_fuzz_put("run.json", run_json, strlen(run_json)) != 0 ||
            vg_fuzz_put("scores.csv", scores_csv, strlen(scores_csv)) != 0)
            return 0;
        ready = 1;
    }
    if (vg_fuzz_put("items.csv", data, size) != 0) return 0;
    const char *dir = vg_fuzz_scratch_dir();
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
    vg_fuzz_format_error(&err);
    vg_comparisons_free(c);
    vg_paired_items_free(p);
    vg_saved_run_free(r);
    return 0;
}
