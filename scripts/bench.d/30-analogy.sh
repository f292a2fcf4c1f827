#!/usr/bin/env bash
# 30-analogy.sh - analogy scoring at google-analogy size: 19,544 questions
# (about 900 distinct words) against 300,000 x 300 candidates, all four
# methods; the sgemm phase alone and the machine's sgemm rate; and a
# straightforward batched numpy implementation on the same data.
# Part of vecgauge; MIT licence, see LICENSE.
#
# Environment: VG_BUILD (set by scripts/bench), VG_BENCH_DIR (data cache),
#   VG_BENCH_REPS          timed runs of vecgauge (default 5)
#   VG_BENCH_NUMPY_QUESTIONS  questions numpy answers (default 2048, 16
#                          batches: about a minute and a half; its batch
#                          time is then scaled to all the questions, which
#                          is exact up to noise since every batch does the
#                          same work; 0: all of them, about 15 minutes)
#   VG_BENCH_ANALOGY_ROWS / VG_BENCH_ANALOGY_DIMS  (default 300000 / 300)
set -euo pipefail
PY=/usr/bin/python3
build=${VG_BUILD:-build}
tool=$build/tests/vganalogy
dir=${VG_BENCH_DIR:-$build/bench}/analogy
rows=${VG_BENCH_ANALOGY_ROWS:-300000}
dims=${VG_BENCH_ANALOGY_DIMS:-300}
reps=${VG_BENCH_REPS:-5}
mkdir -p "$dir"
if [ ! -x "$tool" ]; then echo "30-analogy: $tool is missing (run make)"; exit 1; fi
if ! "$PY" -c 'import numpy' 2>/dev/null; then echo "30-analogy: python3-numpy missing"; exit 1; fi

# The data, cached: a random float32 matrix, and the questions of
# google-analogy (from ../shared when present) with every distinct word
# mapped to a random row among the first 30,000 (frequent words come first
# in real vector files); without ../shared, a synthetic suite of the same
# shape (14 sections of 32 word pairs: 896 words, 19,544 questions).
ga=../shared/public-benchmarks/google-analogy/questions-words.txt
stamp="$rows x $dims, $( [ -f "$ga" ] && echo google-analogy || echo synthetic )"
if [ ! -f "$dir/stamp" ] || [ "$(cat "$dir/stamp")" != "$stamp" ]; then
    "$PY" - "$dir" "$rows" "$dims" "$ga" <<'PYEOF'
import os, sys
import numpy as np
out, rows, dims, ga = sys.argv[1], int(sys.argv[2]), int(sys.argv[3]), sys.argv[4]
rng = np.random.default_rng(20261202)
for start in range(0, rows, 50000):  # in slices, to bound memory
    n = min(50000, rows - start)
    with open(out + "/matrix.f32", "ab" if start else "wb") as f:
        rng.standard_normal((n, dims), dtype=np.float32).tofile(f)
lines = []
if os.path.exists(ga):
    lines = open(ga, encoding="utf-8").read().splitlines()
else:
    for s in range(14):
        lines.append(": section-%d" % s)
        pairs = [("s%dp%da" % (s, i), "s%dp%db" % (s, i)) for i in range(32)]
        for _ in range(19544 // 14 + (1 if s < 19544 % 14 else 0)):
            p, q = rng.choice(32, 2, replace=False)
            lines.append(" ".join(pairs[p] + pairs[q]))
words = {}
for l in lines:
    if not l.startswith(":"):
        for w in l.split():
            words.setdefault(w, len(words))
perm = rng.permutation(min(30000, rows))[:len(words)]
with open(out + "/questions.txt", "w") as f:
    for l in lines:
        f.write(l + "\n" if l.startswith(":") else
                " ".join("w%d" % perm[words[w]] for w in l.split()) + "\n")
PYEOF
    echo "$stamp" > "$dir/stamp"
fi

load_before=$(cut -d' ' -f1-3 /proc/loadavg)
"$tool" bench "$dir/matrix.f32" "$rows" "$dims" "$dir/questions.txt" "$reps" \
    -o "$dir/vecgauge.answers" > "$dir/vecgauge.out"
load_mid=$(cut -d' ' -f1-3 /proc/loadavg)
get() { awk -v k="$1" '$1 == k { $1 = ""; sub(/^ /, ""); print }' "$dir/vecgauge.out"; }

# The straightforward batched numpy implementation: rows normalised once
# (float32), then per batch of 128 questions the three cosine matrices
# W^ a^, W^ b^, W^ c^ (one matrix product each, OpenBLAS through numpy),
# the four scores elementwise, a, b, c masked out, argmax down each
# column. PairDirection uses the same expansion as vecgauge,
# (B - A + c.a - c.b) / sqrt(2 - 2C), which differs from cos(x - c, b - a)
# by the question's positive constant |b - a|.
"$PY" - "$dir" "$rows" "$dims" "${VG_BENCH_NUMPY_QUESTIONS:-2048}" > "$dir/numpy.out" <<'PYEOF'
import sys, time
import numpy as np
out, rows, dims, limit = sys.argv[1], int(sys.argv[2]), int(sys.argv[3]), int(sys.argv[4])
W = np.fromfile(out + "/matrix.f32", dtype=np.float32).reshape(rows, dims)
q = np.array([[int(w[1:]) for w in l.split()] for l in open(out + "/questions.txt")
              if not l.startswith(":")])
nq = len(q) if limit <= 0 else min(limit, len(q))
t0 = time.perf_counter()
Wn = W / np.linalg.norm(W, axis=1, keepdims=True)
t_norm = time.perf_counter() - t0
pred = np.zeros((nq, 4), dtype=np.int64)
for s in range(0, nq, 128):
    a, b, c = q[s:s + 128, 0], q[s:s + 128, 1], q[s:s + 128, 2]
    cols = np.arange(len(a))
    A, B, C = Wn @ Wn[a].T, Wn @ Wn[b].T, Wn @ Wn[c].T
    def best(S):
        S[a, cols] = S[b, cols] = S[c, cols] = -np.inf
        return S.argmax(axis=0)
    pred[s:s + 128, 0] = best(B - A + C)
    pred[s:s + 128, 1] = best(((B + 1) / 2) * ((C + 1) / 2) / ((A + 1) / 2 + 0.001))
    k = (Wn[c] * Wn[a]).sum(axis=1) - (Wn[c] * Wn[b]).sum(axis=1)
    with np.errstate(invalid="ignore", divide="ignore"):
        pd = (B - A + k) / np.sqrt(2 - 2 * C)
    pd[np.isnan(pd)] = -np.inf
    pred[s:s + 128, 2] = best(pd)
    pred[s:s + 128, 3] = best(B)
t = time.perf_counter() - t0
got = np.loadtxt(out + "/vecgauge.answers", dtype=np.int64)[:nq]
# Where the two float32 implementations disagree, how far apart are the
# two picks in float64? A gap near float32 rounding is a near-tie.
W64 = W.astype(np.float64)
W64 /= np.linalg.norm(W64, axis=1, keepdims=True)
gap = 0.0
for i, m in np.argwhere(got != pred):
    ra, rb, rc = q[i, :3]
    def score(x):
        A, B, C = W64[x] @ W64[ra], W64[x] @ W64[rb], W64[x] @ W64[rc]
        k = W64[rc] @ W64[ra] - W64[rc] @ W64[rb]
        return [B - A + C, (B + 1) / 2 * ((C + 1) / 2) / ((A + 1) / 2 + 0.001),
                (B - A + k) / np.sqrt(max(2 - 2 * C, 1e-300)), B][m]
    s1, s2 = score(pred[i, m]), score(got[i, m])
    gap = max(gap, abs(s1 - s2) / max(abs(s1), 1e-300))
print("numpy_questions", nq)
print("gap %.2g" % gap)
print("numpy_seconds %.2f" % t)
print("numpy_all_seconds %.2f" % (t_norm + (t - t_norm) * len(q) / nq))
print("agree", int((got == pred).sum()), "of", pred.size)
PYEOF
load_after=$(cut -d' ' -f1-3 /proc/loadavg)
nget() { awk -v k="$1" '$1 == k { $1 = ""; sub(/^ /, ""); print }' "$dir/numpy.out"; }

full=$(get full_median)
prod=$(get product_median)
numpy=$(nget numpy_all_seconds)
ratio=$(awk -v a="$numpy" -v b="$full" 'BEGIN { printf "%.0f", a / b }')
frac=$(awk -v a="$(get product_gflops)" -v b="$(get sgemm_gflops)" 'BEGIN { printf "%.0f", 100 * a / b }')
partial=""
[ "$(nget numpy_questions)" != "$(get questions)" ] &&
    partial=" (numpy ran $(nget numpy_questions) questions; time scaled to all)"
echo "| measure | value |"
echo "|---|---|"
echo "| work | $(get questions) questions ($(get words) distinct words) x $(get candidates) candidates x $(get dims) dims, all four methods |"
echo "| vecgauge, whole scorer (median of $reps; min-max) | $full s ($(get full_min)-$(get full_max)) |"
echo "| vecgauge, sgemm phase alone (median; min-max) | $prod s ($(get product_min)-$(get product_max)) |"
echo "| vecgauge, all but sgemm (median; min-max) | $(get combine_median) s ($(get combine_min)-$(get combine_max)) |"
echo "| product rate | $(get product_gflops) GFLOP/s = $frac% of the machine's sgemm rate ($(get sgemm_gflops) GFLOP/s, 4096-cube, $(get threads) threads) |"
echo "| numpy, straightforward batched | $numpy s$partial |"
echo "| speed-up over numpy | ${ratio}x |"
agree=$(nget agree)
note=""
[ "${agree%% of *}" != "${agree##* of }" ] &&
    note="; where they differ, the two picks' scores differ by at most $(nget gap) relative in float64 (float32 near-ties)"
echo "| answers identical to numpy's | $agree (question x method)$note |"
echo "| threads; kernels; OpenBLAS core | $(get threads); $(get kernels); $(get openblas_core) (OPENBLAS_CORETYPE=${OPENBLAS_CORETYPE:-<unset>}) |"
echo "| load average (before; after vecgauge; after numpy) | $load_before; $load_mid; $load_after |"
