#!/usr/bin/python3
"""spearman_case.py - build a scoring case and its expected Spearman values
with numpy and scipy (the reference), for tests/e2e/spearman_reference.sh.

Usage: spearman_case.py OUTDIR SEED [PAIRS_FILE]
Without PAIRS_FILE: random words and integer ratings 0..10 (many ties).
With PAIRS_FILE (a real suite, already split into word1<TAB>word2<TAB>rating
by the caller): its own words and ratings.
Writes OUTDIR/vectors.txt (text layout with header; 10% of the words left
out so that coverage is incomplete), OUTDIR/pairs.tsv and OUTDIR/expected
("spearman VALUE" and "spearman_all VALUE" lines, %.17g).
"""
import sys
import numpy as np
from scipy.stats import spearmanr

out, seed = sys.argv[1], int(sys.argv[2])
rng = np.random.default_rng(seed)
if len(sys.argv) > 3:
    pairs = []
    with open(sys.argv[3], encoding="utf-8") as f:
        for line in f:
            w1, w2, r = line.rstrip("\n").split("\t")
            pairs.append((w1, w2, float(r)))
else:
    vocab = ["w%03d" % i for i in range(120)]
    pairs = []
    for _ in range(400):
        a, b = rng.choice(len(vocab), 2, replace=False)
        pairs.append((vocab[a], vocab[b], float(rng.integers(0, 11))))
words = sorted({w for p in pairs for w in p[:2]})
dims = 16
missing = set(rng.choice(words, max(1, len(words) // 10), replace=False))
vecs = {}
with open(out + "/vectors.txt", "w", encoding="utf-8") as f:
    kept = [w for w in words if w not in missing]
    f.write("%d %d\n" % (len(kept), dims))
    for w in kept:
        v = rng.standard_normal(dims)
        text = ["%.6f" % x for x in v]
        # The reference reads back exactly what the file says, as float32.
        vecs[w] = np.array([np.float32(t) for t in text], dtype=np.float64)
        f.write(w + " " + " ".join(text) + "\n")
with open(out + "/pairs.tsv", "w", encoding="utf-8") as f:
    for w1, w2, r in pairs:
        f.write("%s\t%s\t%r\n" % (w1, w2, r))

def cos(a, b):
    return float(a @ b / (np.linalg.norm(a) * np.linalg.norm(b)))

human, model, human_all, model_all = [], [], [], []
for w1, w2, r in pairs:
    covered = w1 in vecs and w2 in vecs
    c = cos(vecs[w1], vecs[w2]) if covered else 0.0
    if covered:
        human.append(r)
        model.append(c)
    human_all.append(r)
    model_all.append(c)
with open(out + "/expected", "w") as f:
    f.write("spearman %.17g\n" % spearmanr(human, model).correlation)
    f.write("spearman_all %.17g\n" % spearmanr(human_all, model_all).correlation)
    f.write("n_used %d\n" % len(human))
    f.write("n_items %d\n" % len(pairs))
