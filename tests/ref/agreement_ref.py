#!/usr/bin/python3
"""agreement_ref.py - mean leave-one-out Spearman agreement of a suite's
raters, computed with scipy.stats.spearmanr, for
tests/e2e/stats_agreement.sh.

Usage: agreement_ref.py FILE SEP HEADER_LINES FIRST_RATER_COLUMN
For each rating column j: Spearman's rho between the j-th rating of each
pair and the mean of that pair's other ratings, over the pairs with a j-th
rating and at least one more; the mean over the columns where rho is
defined. Prints "value columns columns_used min_ratings max_ratings
n_items" as vgstat agreement does.
"""
import sys

import numpy as np
from scipy.stats import spearmanr

path, sep, skip, first = sys.argv[1], sys.argv[2], int(sys.argv[3]), int(sys.argv[4])
sep = "\t" if sep == "tab" else sep
rows = []
with open(path, encoding="utf-8", newline="") as f:
    for i, line in enumerate(f):
        if i < skip:
            continue
        fields = line.rstrip("\r\n").split(sep)
        rows.append(np.array([float(v) for v in fields[first - 1:] if v != ""]))
counts = [len(r) for r in rows if len(r) > 0]
cols = max(counts)
rhos = []
for j in range(cols):
    a, b = [], []
    for r in rows:
        if len(r) < 2 or len(r) <= j:
            continue
        a.append(r[j])
        b.append(np.mean(np.delete(r, j)))
    if len(a) < 3 or len(set(a)) < 2 or len(set(b)) < 2:
        continue
    rhos.append(spearmanr(a, b).correlation)
print("%.17g %d %d %d %d %d" % (np.mean(rhos), cols, len(rhos), min(counts), max(counts),
                                sum(1 for r in rows if len(r) >= 2)))
