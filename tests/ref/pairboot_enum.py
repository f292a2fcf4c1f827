#!/usr/bin/python3
"""pairboot_enum.py - the paired pair bootstrap of `vecgauge compare`
against its exact distribution, found by brute force, for
tests/e2e/stats_pairboot.sh.

Usage:
  pairboot_enum.py write DIR
      Write two run directories DIR/run-a and DIR/run-b (run.json,
      scores.csv, items.csv) holding one analogy suite of two sections,
      each built as Google's are: every ordered pair of distinct word pairs
      of the section (4 pairs: 12 questions), with the two sets' right and
      wrong answers.
  pairboot_enum.py check DIR COMPARISON_CSV B
      Enumerate every equally likely resample of the design: in each
      section, each of the 4^4 ordered draws of row pairs with each of the
      4^4 ordered draws of column pairs (65,536 per section, their product
      over the two sections), a question weighing the product of its
      pairs' multiplicities. That gives the exact bootstrap distribution
      of the accuracy difference d*, hence the exact standard deviation,
      the exact p = 2 Phi(-|d| / sd) (scipy.stats.norm) and the exact
      shifted p = P(|d* - d| >= |d|). vecgauge's Monte Carlo values from B
      replicates must lie within 4 Monte Carlo standard errors: for the
      shifted p sqrt(p (1 - p) / B); for 2 Phi(-|d| / sd), through the SE of
      a sample SD (about sd / sqrt(2 B)) and the derivative of the p in sd.
Prints one line per check; exit status 1 if any fails.
"""
import csv
import itertools
import json
import os
import sys

import numpy as np
from scipy import stats

K = 4  # pairs per section
# Right (1) or wrong (0) per question (i, j), i != j, for sections 0 and 1.
RIGHT_A = [[1, 1, 0, 1, 1, 1, 0, 1, 1, 1, 1, 0], [1, 0, 1, 1, 1, 1, 1, 0, 1, 1, 0, 1]]
RIGHT_B = [[1, 0, 0, 1, 0, 1, 0, 0, 1, 1, 0, 0], [0, 0, 1, 1, 1, 0, 1, 0, 0, 1, 0, 1]]
H = ("vectors,suite,item,subset,task,word1,word2,word3,expected,rating,status,cosine,3cosadd,"
     "3cosadd_correct,3cosmul,3cosmul_correct,pairdir,pairdir_correct,only_b,only_b_correct")


def questions():
    out = []
    for s in range(2):
        q = 0
        for i in range(K):
            for j in range(K):
                if i != j:
                    out.append((s, i, j, q))
                    q += 1
    return out


def cmd_write(d):
    for label, right in (("a", RIGHT_A), ("b", RIGHT_B)):
        run = os.path.join(d, "run-" + label)
        os.makedirs(run, exist_ok=True)
        qs = questions()
        json.dump({"format": "vecgauge-run 1", "utc_time": "", "command_line": "", "seed": 1,
                   "bootstrap_replicates": 0, "confidence_level": 0.95,
                   "vector_sets": [{"label": label}],
                   "suites": [{"id": "enum-ana", "task": "analogy", "items": len(qs),
                               "files": [{"path": "q.txt", "sha256": "cd" * 32}]}]},
                  open(os.path.join(run, "run.json"), "w"))
        open(os.path.join(run, "scores.csv"), "w").write(
            "vectors,suite,subset,task,metric,value,ci_low,ci_high,ci_method,n_items,n_used,"
            "coverage\n")
        lines = [H]
        for n, (s, i, j, q) in enumerate(qs):
            a, b = "x%d_%d" % (s, i), "y%d_%d" % (s, i)
            c, e = "x%d_%d" % (s, j), "y%d_%d" % (s, j)
            ok = right[s][q]
            lines.append("%s,enum-ana,%d,sec%d,analogy,%s,%s,%s,%s,,scored,,%s,%d,,,,,," %
                         (label, n + 1, s, a, b, c, e, e if ok else "z", ok))
        open(os.path.join(run, "items.csv"), "w").write("\n".join(lines) + "\n")


def section_table(s):
    """Per (row draw, column draw): the weighted totals right_a - right_b
    and used, over every ordered draw."""
    seqs = np.array(list(itertools.product(range(K), repeat=K)))
    counts = np.stack([np.bincount(x, minlength=K) for x in seqs])  # 256 x K
    diff = np.zeros((K, K))
    used = np.zeros((K, K))
    q = 0
    for i in range(K):
        for j in range(K):
            if i != j:
                diff[i, j] = RIGHT_A[s][q] - RIGHT_B[s][q]
                used[i, j] = 1
                q += 1
    # sum_ij w_i v_j T_ij for every (w, v): W T V'.
    return (counts @ diff @ counts.T).ravel(), (counts @ used @ counts.T).ravel()


def cmd_check(d, cmp_path, B):
    # The sections are drawn independently: combine the distinct
    # (difference, used) totals of each, weighted by how many draws give
    # them (65,536 draws per section, 2^32 in all).
    parts = []
    for s in range(2):
        dn, un = section_table(s)
        vals, cnt = np.unique(np.stack([dn, un], axis=1), axis=0, return_counts=True)
        parts.append((vals, cnt.astype(float)))
    (v0, c0), (v1, c1) = parts
    num = (v0[:, 0][:, None] + v1[:, 0][None, :]).ravel()
    den = (v0[:, 1][:, None] + v1[:, 1][None, :]).ravel()
    prob = (c0[:, None] * c1[None, :]).ravel()
    ok_den = den > 0
    dstar, prob = num[ok_den] / den[ok_den], prob[ok_den] / prob[ok_den].sum()
    total = sum(sum(r) for r in RIGHT_A) - sum(sum(r) for r in RIGHT_B)
    dd = total / 24.0
    mean = float(prob @ dstar)
    sd = float(np.sqrt(prob @ (dstar - mean) ** 2))
    p_wald = 2 * stats.norm.sf(abs(dd) / sd)
    # Ties |d* - d| = |d| are decided exactly by comparing the totals.
    p_shift = float(prob[np.abs(num[ok_den] - dd * den[ok_den]) >= abs(dd) * den[ok_den] - 1e-9]
                    .sum())
    row = next(csv.DictReader(open(cmp_path, newline="")))
    ok = True

    def close(name, got, want, tol):
        nonlocal ok
        good = abs(got - want) <= tol
        ok &= good
        print("%s %s: vecgauge %.6g, exact %.6g (tol %.3g)" %
              ("ok" if good else "FAIL", name, got, want, tol))

    close("difference", float(row["difference"]), dd, 1e-15)
    z = abs(dd) / sd
    tol_wald = 4 * 2 * stats.norm.pdf(z) * z / np.sqrt(2 * B)
    close("pair-bootstrap p", float(row["p_value"]), p_wald, tol_wald)
    close("shifted bootstrap p", float(row["p_bootstrap"]), p_shift,
          4 * np.sqrt(p_shift * (1 - p_shift) / B))
    if row["test"] != "pair-bootstrap":
        print("FAIL test is %r" % row["test"])
        ok = False
    return ok


def main():
    if sys.argv[1] == "write":
        cmd_write(sys.argv[2])
        return 0
    return 0 if cmd_check(sys.argv[2], sys.argv[3], int(sys.argv[4])) else 1


if __name__ == "__main__":
    sys.exit(main())
