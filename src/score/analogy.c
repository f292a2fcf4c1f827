/* analogy.c - answering analogy questions.
 * Part of vecgauge; MIT licence, see LICENSE.
 */
#include "../common/alloc.h"
#include "vecgauge/score.h"

const char *vg_method_name(vg_method m) {
    switch (m) {
    case VG_METHOD_3COSADD: return "3cosadd";
    case VG_METHOD_3COSMUL: return "3cosmul";
    case VG_METHOD_PAIRDIR: return "pairdir";
    case VG_METHOD_ONLY_B: return "only_b";
    case VG_METHOD_COUNT: break;
    }
    return "unknown";
}

vg_status vg_score_analogy(const vg_vectors *v, const vg_suite *suite,
                           const vg_score_options *opt, vg_analogy_scores **out, vg_error *err) {
    (void)v;
    (void)opt;
    *out = NULL;
    return vg_error_set(err, VG_EUNSUPPORTED, NULL, 0, "analogy scoring (suite %s) is not built yet",
                        suite->id);
}

void vg_analogy_scores_free(vg_analogy_scores *s) {
    if (!s) return;
    vg_free(s->status);
    for (int m = 0; m < VG_METHOD_COUNT; m++) {
        vg_free(s->predicted[m]);
        vg_free(s->correct[m]);
    }
    vg_free(s);
}
