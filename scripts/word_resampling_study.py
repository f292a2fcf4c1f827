#!/usr/bin/python3
"""word_resampling_study.py - would an interval that also resamples words
differ materially from the pair bootstrap on the public similarity suites?

Usage: scripts/word_resampling_study.py VECGAUGE DATA_DIR WORK_DIR [REPS]

Reads every known similarity suite present in DATA_DIR through VECGAUGE
(the words and ratings of items.csv), then, per suite, plants model scores
s = z(rating) + a_u + a_v + e (z the standardised rating, a a word's own
error shared by every pair it appears in, e a pair's own) in two settings:
  words:   a ~ N(0, 0.35^2), e ~ N(0, 0.6^2)   (words carry errors)
  pairs:   a = 0,            e ~ N(0, 0.7^2)   (no word effect at all)
and compares the 95% percentile widths of Spearman's rho under
  pair:  the bootstrap over pairs (what vecgauge does);
  word:  the words resampled with replacement, a pair counted with the
         product of its two words' multiplicities (the pair bootstrap of
         analogies applied to one pool of words).
Invented scores on the suites' real designs: what it shows is how much the
sharing of words by pairs can matter, not any vector set's interval.
Needs numpy and scipy (Debian's python3-numpy, python3-scipy).
"""
import csv
import os
import subprocess
import sys

import numpy as np
from scipy import stats


def suites(vg, data, work):
    out = os.path.join(work, "run")
    vec = os.path.join(work, "one.txt")
    open(vec, "w").write("the 1 0\n")
    listing = subprocess.run([vg, "suites", "--csv", "--data", data], check=True,
                             capture_output=True, text=True).stdout
    ids = [r["id"] for r in csv.DictReader(listing.splitlines())
           if r["task"] == "similarity" and r["status"] == "present"]
    subprocess.run([vg, "score", "--no-progress", "--bootstrap", "0", "--data", data,
                    "--suite", ",".join(ids), "--out", out, "one=" + vec], check=True,
                   stdout=subprocess.DEVNULL, stderr=subprocess.DEVNULL)
    items = {}
    for r in csv.DictReader(open(os.path.join(out, "items.csv"), newline="")):
        items.setdefault(r["suite"], []).append((r["word1"].lower(), r["word2"].lower(),
                                                 float(r["rating"])))
    return items


def width(x, level=0.95):
    x = x[np.isfinite(x)]
    return np.percentile(x, 100 * (1 + level) / 2) - np.percentile(x, 100 * (1 - level) / 2)


def study(pairs, rng, reps, sd_a, sd_e):
    words = sorted({w for p in pairs for w in p[:2]})
    idx = {w: k for k, w in enumerate(words)}
    u = np.array([idx[p[0]] for p in pairs])
    v = np.array([idx[p[1]] for p in pairs])
    r = np.array([p[2] for p in pairs])
    z = (r - r.mean()) / r.std()
    a = rng.normal(0, sd_a, len(words)) if sd_a > 0 else np.zeros(len(words))
    s = z + a[u] + a[v] + rng.normal(0, sd_e, len(pairs))
    n, m = len(pairs), len(words)
    pair_b, word_b = np.empty(reps), np.empty(reps)
    for b in range(reps):
        k = rng.integers(0, n, n)
        pair_b[b] = stats.spearmanr(r[k], s[k])[0]
        w = np.bincount(rng.integers(0, m, m), minlength=m)
        cnt = w[u] * w[v]
        keep = np.repeat(np.arange(n), cnt)
        word_b[b] = stats.spearmanr(r[keep], s[keep])[0] if len(keep) > 2 else np.nan
    return stats.spearmanr(r, s)[0], width(pair_b), width(word_b), n, m


def main():
    vg, data, work = sys.argv[1:4]
    reps = int(sys.argv[4]) if len(sys.argv) > 4 else 500
    os.makedirs(work, exist_ok=True)
    items = suites(vg, data, work)
    rng = np.random.default_rng(353)
    print("suite,pairs,words,pairs_per_word,setting,rho,pair_width,word_width,ratio")
    for sid, pairs in items.items():
        for name, sa, se in (("words", 0.35, 0.6), ("pairs", 0.0, 0.7)):
            rho, pw, ww, n, m = study(pairs, rng, reps, sa, se)
            print("%s,%d,%d,%.2f,%s,%.3f,%.3f,%.3f,%.2f" % (sid, n, m, 2 * n / m, name, rho, pw,
                                                            ww, ww / pw))


if __name__ == "__main__":
    main()
