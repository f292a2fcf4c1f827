/* inprocess_example.c - evaluate word vectors from inside a training
 * program, without writing a vector file.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * A trainer holds its vocabulary and its embedding matrix in memory; it
 * wraps them in a vg_vectors (copied), reads a suite, and asks for the
 * scores. Build against the installed library with
 *     cc example.c $(pkg-config --cflags --libs vecgauge)
 * Usage: inprocess_example PAIRS_FILE
 */
#include <math.h>
#include <stdio.h>

#include <vecgauge/vecgauge.h>

int main(int argc, char **argv) {
    if (argc != 2) {
        fprintf(stderr, "usage: %s PAIRS_FILE\n", argv[0]);
        return 2;
    }
    /* What a trainer would have: 6 words, 4 dimensions, row-major. */
    const char *vocab[] = {"apple", "pear", "bread", "bagel", "mop", "broom"};
    const float emb[6 * 4] = {
        0.9f, 0.1f, 0.0f, 0.1f, /* apple */
        0.8f, 0.2f, 0.1f, 0.0f, /* pear  */
        0.1f, 0.9f, 0.1f, 0.0f, /* bread */
        0.2f, 0.8f, 0.0f, 0.1f, /* bagel */
        0.0f, 0.1f, 0.9f, 0.3f, /* mop   */
        0.1f, 0.0f, 0.8f, 0.4f, /* broom */
    };
    vg_error err;
    vg_error_clear(&err);
    vg_vectors *v = NULL;
    vg_suite *suite = NULL;
    vg_results *res = NULL;
    int rc = 1;
    if (vg_vectors_from_matrix(vocab, 6, emb, 4, 4, &v, &err) != VG_OK) goto fail;
    if (vg_suite_read_pairs(argv[1], "pairs", NULL, &suite, &err) != VG_OK) goto fail;

    vg_vector_set set = {"in-memory", "", v};
    const vg_suite *suites[] = {suite};
    vg_eval_options opt;
    vg_eval_options_init(&opt);
    if (vg_evaluate(&set, 1, suites, 1, &opt, &res, &err) != VG_OK) goto fail;

    for (size_t i = 0; i < res->n_rows; i++) {
        const vg_score_row *row = &res->rows[i];
        printf("%s%s %.17g (%zu of %zu pairs)\n", vg_metric_name(row->metric),
               row->all_items ? "_all" : "", row->value, row->n_used, row->n_items);
    }
    rc = 0;
    goto done;
fail : {
    char buf[1200];
    fprintf(stderr, "inprocess_example: %s\n", vg_error_format(&err, buf, sizeof buf));
}
done:
    vg_results_free(res);
    vg_suite_free(suite);
    vg_vectors_free(v);
    return rc;
}
