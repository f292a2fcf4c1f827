/* report.h - writing a run directory: scores.csv, summary.md and friends.
 * Part of vecgauge; MIT licence, see LICENSE.
 *
 * Writers take a vg_results and a FILE opened by the caller; the run
 * directory functions make the set of files appear all at once: they are
 * written into a temporary directory beside the final one and renamed into
 * place only when every file is complete.
 */
#ifndef VG_REPORT_H
#define VG_REPORT_H

#include <stdio.h>
#include <stddef.h>
#include <stdint.h>

#include "error.h"
#include "results.h"
#include "vg_config.h"

#ifdef __cplusplus
extern "C" {
#endif

/* One option of the run with its effective value (defaults included), as
 * text. kind tells run.json how to type it. */
typedef enum vg_setting_kind {
    VG_SETTING_STRING = 0,
    VG_SETTING_INTEGER = 1,
    VG_SETTING_REAL = 2,
    VG_SETTING_BOOL = 3   /* value "0" or "1" */
} vg_setting_kind;

typedef struct vg_setting {
    const char *name;      /* the long option name, without "--" */
    const char *value;
    vg_setting_kind kind;
} vg_setting;

/* Where the numbers came from, for summary.md and run.json. Every field is
 * borrowed and may be NULL (left out of the output). */
typedef struct vg_provenance {
    const char *tool_version;  /* vg_version() */
    const char *git_describe;  /* when built from a checkout */
    const char *utc_time;      /* ISO 8601, e.g. 2026-12-02T10:00:00Z */
    const char *command_line;  /* the exact command line, shell-quoted */
    const char *const *argv;   /* the command line as given (argv[0] first) */
    size_t argc;
    const char *cwd;           /* working directory the paths are relative to */
    const vg_setting *settings;/* every option with its effective value */
    size_t n_settings;
} vg_provenance;

/* The header line of scores.csv, without the newline. */
VG_API const char *vg_report_scores_header(void);

/* Write scores.csv (through libcsv): the header, then one line per row of
 * r in order. Numbers are printed so that they read back to the same
 * double (%.17g). Returns VG_EIO with path if writing fails. */
VG_API vg_status vg_report_scores_csv(const vg_results *r, FILE *fp,
                                      const char *path, vg_error *err);

/* The header line of intervals.csv, without the newline. */
VG_API const char *vg_report_intervals_header(void);

/* Write intervals.csv: one line per interval of every row of r (a row
 * has up to VG_MAX_INTERVALS: for similarity rows bca, percentile and
 * fisher-z), with the row's identity and value, the method, the
 * confidence level and, for bootstrap intervals, the replicates with a
 * defined value (empty for analytic intervals). Rows and intervals keep
 * the order of scores.csv. Returns VG_EIO with path if writing fails. */
VG_API vg_status vg_report_intervals_csv(const vg_results *r, FILE *fp,
                                         const char *path, vg_error *err);

/* The header line of agreement.csv, without the newline. */
VG_API const char *vg_report_agreement_header(void);

/* Write agreement.csv: for each suite whose file carries individual
 * ratings, the raters' agreement (vg_agreement) as one line: suite,
 * method, value, columns, columns_used, min_ratings, max_ratings,
 * n_items. Only the header when no suite has individual ratings. */
VG_API vg_status vg_report_agreement_csv(const vg_results *r, FILE *fp,
                                         const char *path, vg_error *err);

/* Write summary.md: a table per task, coverage warnings, the options in
 * effect and the provenance. prov may be NULL. */
VG_API vg_status vg_report_summary_md(const vg_results *r, const vg_provenance *prov,
                                      FILE *fp, const char *path, vg_error *err);

struct vg_comparisons; /* compare.h */

/* As vg_report_summary_md, with the comparison section of cmp
 * (vg_report_comparison_md, compare.h) after the score tables; cmp NULL
 * gives exactly vg_report_summary_md's file. */
VG_API vg_status vg_report_summary_md_compared(const vg_results *r,
                                               const struct vg_comparisons *cmp,
                                               const vg_provenance *prov, FILE *fp,
                                               const char *path, vg_error *err);

/* Print the headline scores as an aligned plain-text table (stdout of
 * `vecgauge score`). */
VG_API vg_status vg_report_text_table(const vg_results *r, FILE *fp, vg_error *err);

/* Write the distinct missing words of every set on every suite as CSV
 * with the columns vectors,suite,word,reason (missing.csv in a run
 * directory); reason is "not in the vector set" or, for analogy words
 * present past the candidate rows, "not among the candidate rows". */
VG_API vg_status vg_report_missing_words(const vg_results *r, FILE *fp,
                                         const char *path, vg_error *err);

/* The header line of missing.csv, without the newline. */
VG_API const char *vg_report_missing_header(void);

/* The header line of items.csv, without the newline. */
VG_API const char *vg_report_items_header(void);

/* Write items.csv: one row per vector set x item with the columns of
 * vg_report_items_header(): for pairs the human rating and the cosine
 * (empty when not scored, with the reason in status); for questions the
 * accepted answers ('/'-separated), and per method the predicted word and
 * 1/0 for correct (both empty when not scored). */
VG_API vg_status vg_report_items_csv(const vg_results *r, FILE *fp, const char *path,
                                     vg_error *err);

/* Write table.tex: a booktabs tabular of the headline scores (Spearman's
 * rho; analogy accuracy in percent by 3CosAdd and 3CosMul) with their
 * headline intervals, the best set per row in bold. prov may be NULL. */
VG_API vg_status vg_report_table_tex(const vg_results *r, const vg_provenance *prov,
                                     FILE *fp, const char *path, vg_error *err);

/* Flush and close fp, reporting a write error (disk full, ...) against
 * path. Always closes. */
VG_API vg_status vg_report_close(FILE *fp, const char *path, vg_error *err);

#ifdef __cplusplus
}
#endif

#endif /* VG_REPORT_H */
