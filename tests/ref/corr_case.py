#!/usr/bin/python3
"""corr_case.py - correlation references with scipy for
tests/e2e/stats_reference.sh.

Usage:
  corr_case.py columns FILE
      FILE holds "x y" lines; prints "spearman V", "pearson V",
      "kendall V" (scipy.stats.spearmanr, pearsonr, kendalltau tau-b).
  corr_case.py build OUTDIR SEED PAIRS_FILE
      PAIRS_FILE is word1<TAB>word2<TAB>rating (a real suite split by the
      caller). Writes OUTDIR/vectors.txt (random 16-dim vectors, 10% of the
      words left out) and OUTDIR/expected: one line "metric value n" per
      row of scores.csv (covered pairs, and all pairs with uncovered ones
      at 0: common practice), and "fisher metric low high" lines: the
      Fisher-z interval at 0.95 evaluated here with math.atanh/tanh and
      scipy.stats.norm.ppf (Spearman 1.06/(n-3), Kendall 0.437/(n-4),
      Fieller, Hartley and Pearson 1957; Pearson 1/(n-3), Fisher 1921).
  corr_case.py compare RUNDIR EXPECTED
      Compares RUNDIR/scores.csv and RUNDIR/intervals.csv with EXPECTED
      to 1e-12; exit status 1 on a difference.
"""
import csv
import math
import sys

import numpy as np
from scipy import stats


def corr3(x, y):
    return {"spearman": stats.spearmanr(x, y).correlation,
            "pearson": stats.pearsonr(x, y)[0],
            "kendall": stats.kendalltau(x, y).correlation}


def fisher(metric, r, n, level=0.95):
    c, k = {"spearman": (1.06, 3), "pearson": (1.0, 3), "kendall": (0.437, 4)}[metric]
    q = stats.norm.ppf(1 - (1 - level) / 2)
    z, se = math.atanh(r), math.sqrt(c / (n - k))
    return math.tanh(z - q * se), math.tanh(z + q * se)


def columns(path):
    d = np.loadtxt(path, ndmin=2)
    for k, v in corr3(d[:, 0], d[:, 1]).items():
        print("%s %.17g" % (k, v))


def build(out, seed, pairs_file):
    rng = np.random.default_rng(seed)
    pairs = []
    with open(pairs_file, encoding="utf-8") as f:
        for line in f:
            w1, w2, r = line.rstrip("\n").split("\t")[:3]
            pairs.append((w1, w2, float(r)))
    words = sorted({w for p in pairs for w in p[:2]})
    missing = set(rng.choice(words, max(1, len(words) // 10), replace=False))
    vecs = {}
    with open(out + "/vectors.txt", "w", encoding="utf-8") as f:
        kept = [w for w in words if w not in missing]
        f.write("%d 16\n" % len(kept))
        for w in kept:
            text = ["%.6f" % v for v in rng.standard_normal(16)]
            # Read back as the file says, in float32, as vecgauge does.
            vecs[w] = np.array([np.float32(t) for t in text], dtype=np.float64)
            f.write(w + " " + " ".join(text) + "\n")

    def cos(a, b):
        return float(a @ b / (np.linalg.norm(a) * np.linalg.norm(b)))

    hx, hy, ax, ay = [], [], [], []
    for w1, w2, r in pairs:
        covered = w1 in vecs and w2 in vecs
        c = cos(vecs[w1], vecs[w2]) if covered else 0.0
        if covered:
            hx.append(r)
            hy.append(c)
        ax.append(r)
        ay.append(c)
    with open(out + "/expected", "w") as f:
        for suffix, x, y in (("", hx, hy), ("_all", ax, ay)):
            for k, v in corr3(x, y).items():
                f.write("%s%s %.17g %d\n" % (k, suffix, v, len(x)))
                lo, hi = fisher(k, v, len(x))
                f.write("fisher %s%s %.17g %.17g\n" % (k, suffix, lo, hi))


def compare(run, expected):
    rows = {r["metric"]: r for r in csv.DictReader(open(run + "/scores.csv"))}
    ivs = {(r["metric"], r["method"]): r for r in csv.DictReader(open(run + "/intervals.csv"))}
    bad = []
    for line in open(expected):
        f = line.split()
        if f[0] == "fisher":
            iv = ivs[(f[1], "fisher-z")]
            for got, want in ((iv["ci_low"], f[2]), (iv["ci_high"], f[3])):
                if abs(float(got) - float(want)) > 1e-12:
                    bad.append("fisher-z %s: got %s want %s" % (f[1], got, want))
            continue
        metric, want, n = f[0], float(f[1]), int(f[2])
        got = float(rows[metric]["value"])
        if abs(got - want) > 1e-12:
            bad.append("%s: got %.17g want %.17g" % (metric, got, want))
        used = int(rows[metric]["n_used"]) if not metric.endswith("_all") else \
            int(rows[metric]["n_items"])
        if used != n:
            bad.append("%s: %d pairs, expected %d" % (metric, used, n))
    print("\n".join(bad) if bad else "all rows and Fisher-z intervals match")
    sys.exit(1 if bad else 0)


if __name__ == "__main__":
    if sys.argv[1] == "columns":
        columns(sys.argv[2])
    elif sys.argv[1] == "build":
        build(sys.argv[2], int(sys.argv[3]), sys.argv[4])
    elif sys.argv[1] == "compare":
        compare(sys.argv[2], sys.argv[3])
    else:
        sys.exit("corr_case.py: unknown mode " + sys.argv[1])
