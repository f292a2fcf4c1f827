/* fuzz_run_json.c - fuzz target: run.json on arbitrary bytes, through both
 * of its readers: the record `rerun` reads, and a saved run as `compare`
 * and `track` load it (beside fixed, consistent scores.csv and items.csv).
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "fuzz_input.h"

static const char scores_csv[] =
    "vectors,suite,subset,task,metric,value,ci_low,ci_high,ci_method,n_items,n_used,coverage\n"
    "set-a,sim,,similarity,spearman,0.5,,,,3,3,1\nset-b,sim,,similarity,spearman,0.5,,,,3,3,1\n";

int LLVMFuzzerTestOneInput(const uint8_t *data, size_t size) {
    static int ready;
    if (!ready) {
        /* items.csv as a real run writes it for the scores above. */
        char items[2048];
        size_t n = (size_t)snprintf(items, sizeof items, "%s\n", vg_report_items_header());
        if (n >= sizeof items || vg_fuzz_put("scores.csv", scores_csv, strlen(scores_csv)) != 0 ||
            vg_fuzz_put("items.csv", items, n) != 0)
            return 0;
        ready = 1;
    }
    if (vg_fuzz_put("run.json", data, size) != 0) return 0;
    const char *dir = vg_fuzz_scratch_dir();
    char path[128];
    snprintf(path, sizeof path, "%s/run.json", dir);

    vg_error err;
    vg_error_clear(&err);
    vg_run_record *rec = NULL;
    if (vg_run_record_read(path, &rec, &err) == VG_OK) {
        volatile size_t sink = 0;
        for (size_t i = 0; i < rec->argc; i++) sink += strlen(rec->argv[i]);
        for (size_t i = 0; i < rec->n_files; i++) sink += strlen(rec->files[i]) + strlen(rec->sha256[i]);
        (void)sink;
    } else {
        vg_fuzz_format_error(&err);
    }
    vg_run_record_free(rec);

    vg_error_clear(&err);
    vg_saved_run *r = NULL;
    if (vg_saved_run_load(dir, &r, &err) != VG_OK) vg_fuzz_format_error(&err);
    vg_saved_run_free(r);
    return 0;
}
