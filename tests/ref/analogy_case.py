#!/usr/bin/python3
"""analogy_case.py - build a random analogy case and answer it with a
straightforward numpy implementation (the reference), for
tests/e2e/analogy_reference.sh.

Usage: analogy_case.py OUTDIR SEED [--keep] [--vocab N] [--questions FILE]
Writes OUTDIR/vectors.txt (text layout with header), OUTDIR/questions.txt
(sectioned; not with --questions, whose FILE, a real suite, is answered
with random vectors for its words instead) and OUTDIR/expected: one line per question, tab-separated:
status, then the answer word of 3cosadd, 3cosmul, pairdir and only_b
("-" when none), then the four margins (best minus second best score,
used to tell a genuine near-tie that float32 rounding may flip).

The reference follows the published definitions literally, in float64,
one question at a time, on the unit-normalised candidate matrix:
  3CosAdd        argmax cos(x, b) - cos(x, a) + cos(x, c)   (Mikolov et al. 2013)
  3CosMul        argmax cos'(x, b) cos'(x, c) / (cos'(x, a) + 0.001),
                 cos' = (cos + 1) / 2                       (Levy and Goldberg 2014)
  PairDirection  argmax cos(x - c, b - a), with x - c formed explicitly
                                                            (Levy and Goldberg 2014)
  only-b         argmax cos(x, b)                           (Linzen 2016)
Candidates are the first N rows with a non-zero vector; a, b and c are
excluded unless --keep (common practice); with --keep, x = c is still
excluded from PairDirection (x - c is the zero vector, no direction). Ties
go to the lower row (np.argmax returns the first maximum).
"""
import sys
import numpy as np

out, seed = sys.argv[1], int(sys.argv[2])
keep = "--keep" in sys.argv
vocab = int(sys.argv[sys.argv.index("--vocab") + 1]) if "--vocab" in sys.argv else 0
qfile = sys.argv[sys.argv.index("--questions") + 1] if "--questions" in sys.argv else None
rng = np.random.default_rng(seed)


def write_vectors(words, base):
    """Write the text layout; return what vecgauge reads back (float32)."""
    text = [[("%.6f" % x) for x in row] for row in base]
    with open(out + "/vectors.txt", "w") as f:
        f.write("%d %d\n" % (len(words), base.shape[1]))
        for w, row in zip(words, text):
            f.write(w + " " + " ".join(row) + "\n")
    return np.array([[np.float32(t) for t in row] for row in text], dtype=np.float64)


if qfile:
    # A real suite (sectioned or four columns): its own words, plus 1000
    # filler words, in a random order, with random vectors.
    questions = []
    section = 0
    with open(qfile, encoding="utf-8") as f:
        for line in f:
            line = line.strip()
            if not line or line.startswith("#"):
                continue
            if line.startswith(":"):
                section += 1
                continue
            questions.append((section,) + tuple(line.split()))
    vocab_words = list(dict.fromkeys(w for q in questions for w in q[1:]))
    words = vocab_words + ["zz%04d" % i for i in range(1000)]
    words = [words[i] for i in rng.permutation(len(words))]
    rows, dims = len(words), 24
    W = write_vectors(words, rng.standard_normal((rows, dims)))
else:
    rows, dims = 3000, 24
    words = ["w%04d" % i for i in range(rows)]
    # Clustered vectors so that analogies have real structure: 30 groups,
    # each word = group centre + own part; relations are shared offsets.
    centres = rng.standard_normal((30, dims))
    offsets = rng.standard_normal((3, dims)) * 0.8
    base = centres[rng.integers(0, 30, rows)] + 0.6 * rng.standard_normal((rows, dims))
    # Words 0..599 come in related pairs (i, i + 1) along one of the offsets.
    for i in range(0, 600, 2):
        base[i + 1] = base[i] + offsets[(i // 2) % 3] + 0.3 * rng.standard_normal(dims)
    base[2999] = 0.0  # a zero vector: never a candidate; a question on it is unscored
    W = write_vectors(words, base)

    # Questions: pairs of related pairs within a relation, plus a few with
    # rarer words, words outside the vocabulary, and one on the zero vector.
    questions = []
    for rel in range(3):
        pairs = [(i, i + 1) for i in range(2 * rel, 600, 6)]
        for _ in range(130):
            p, q = rng.choice(len(pairs), 2, replace=False)
            questions.append((rel, words[pairs[p][0]], words[pairs[p][1]],
                              words[pairs[q][0]], words[pairs[q][1]]))
    # Words from the rarer half: a candidate vocabulary of the first 1500
    # rows leaves some of these questions uncovered.
    for _ in range(12):
        r = rng.integers(1000, 2999, 4)
        questions.append((2,) + tuple(words[i] for i in r))
    for _ in range(8):
        questions.append((2, "unknown", words[rng.integers(rows)], words[rng.integers(rows)],
                          words[rng.integers(rows)]))
    questions.append((2, words[2999], words[3], words[4], words[5]))
    with open(out + "/questions.txt", "w") as f:
        last = None
        for rel, a, b, c, d in questions:
            if rel != last:
                f.write(": relation-%d\n" % rel)
                last = rel
            f.write("%s %s %s %s\n" % (a, b, c, d))

n_cand = vocab if vocab else rows
index = {w: i for i, w in enumerate(words)}
norms = np.linalg.norm(W, axis=1)
cand = np.arange(rows) < n_cand
cand &= norms > 0
Wn = np.where(norms[:, None] > 0, W / np.where(norms > 0, norms, 1)[:, None], 0.0)


def status(ws):
    for w in ws:
        if w not in index or index[w] >= n_cand:
            return "missing_word"
    for w in ws:
        if norms[index[w]] == 0:
            return "zero_vector"
    return "scored"


def pick(score, exclude):
    s = np.where(cand & ~np.isnan(score), score, -np.inf)
    for r in exclude:
        s[r] = -np.inf
    best = int(np.argmax(s))  # the first maximum: ties go to the lower row
    if s[best] == -np.inf:
        return "-", np.inf
    top = s[best]
    s[best] = -np.inf
    return words[best], float(top - s.max())


with open(out + "/expected", "w") as f:
    for rel, a, b, c, d in questions:
        st = status((a, b, c, d))
        if st != "scored":
            f.write(st + "\t-\t-\t-\t-\tinf\tinf\tinf\tinf\n")
            continue
        ra, rb, rc = index[a], index[b], index[c]
        A, B, C = Wn @ Wn[ra], Wn @ Wn[rb], Wn @ Wn[rc]
        add = B - A + C
        mul = ((B + 1) / 2) * ((C + 1) / 2) / ((A + 1) / 2 + 0.001)
        D = Wn - Wn[rc]
        ba = Wn[rb] - Wn[ra]
        with np.errstate(invalid="ignore", divide="ignore"):
            pd = (D @ ba) / (np.linalg.norm(D, axis=1) * np.linalg.norm(ba))
        ex = [] if keep else [ra, rb, rc]
        res = [pick(add, ex), pick(mul, ex), pick(pd, ex + [rc]), pick(B, ex)]
        f.write("scored\t" + "\t".join(r[0] for r in res) + "\t" +
                "\t".join("%.3g" % r[1] for r in res) + "\n")
