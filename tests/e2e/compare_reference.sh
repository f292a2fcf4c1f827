#!/usr/bin/env bash
# compare_reference.sh - comparison.csv recomputed from scratch by
# numpy/scipy/statsmodels (tests/ref/compare_check.py): the paired
# bootstrap of the difference from the very resamples vecgauge draws
# (vgstat indices), its BCa/percentile interval and Hall-Wilson p-value,
# Steiger's Z1*, McNemar's exact test (scipy.stats.binomtest) and Holm's
# adjustment (statsmodels multipletests), on the demo data, on tied
# ratings with missing words, and on hand-made analogy runs.
source "$(dirname "$0")/lib.bash"
VGSTAT="$VG_BUILD/tests/vgstat"
REF=tests/ref/compare_check.py

if ! "$PY" -c 'import scipy, numpy, statsmodels' 2>/dev/null; then
    skip "python3-scipy, python3-numpy or python3-statsmodels is not installed"
    done_testing; exit 0
fi

"$VG_BUILD/gen-demo" "$TMP/demo" > /dev/null
D="$TMP/demo"
SEED=14159265

# cmpref-1: the three demo candidates (tide-quick misses words, so 59
# pairs are dropped), 500 resamples, level 0.95.
"$VG_BIN" score --bootstrap 500 --pairs "$D/tidewater-pairs.tsv" --out "$TMP/three" \
    tide-full="$D/tide-full.txt" tide-half="$D/tide-half.txt" tide-quick="$D/tide-quick.txt" \
    > /dev/null 2>&1
check "cmpref-1: demo candidates, common pairs, B = 500: every number equals scipy/statsmodels on the same draws" \
    "$PY" "$REF" "$TMP/three/items.csv" "$TMP/three/comparison.csv" "$VGSTAT" $SEED 500 0.95 0.05 common

# cmpref-2: --no-common (each set on its own pairs), level 0.9, alpha 0.01.
"$VG_BIN" score --bootstrap 400 --ci 0.9 --alpha 0.01 --no-common --pairs "$D/tidewater-pairs.tsv" \
    --out "$TMP/asis" tide-full="$D/tide-full.txt" tide-quick="$D/tide-quick.txt" > /dev/null 2>&1
check "cmpref-2: --no-common, level 0.9, alpha 0.01: equal to scipy/statsmodels" \
    "$PY" "$REF" "$TMP/asis/items.csv" "$TMP/asis/comparison.csv" "$VGSTAT" $SEED 400 0.9 0.01 as-is

# cmpref-3: tied ratings (integers 0..4), tied cosines, and two sets that
# miss different words, with another seed.
"$PY" - "$TMP" <<'PYEOF'
import sys, numpy as np
d = sys.argv[1]
rng = np.random.default_rng(11)
words = ["w%02d" % i for i in range(60)]
lat = rng.normal(size=(60, 6))
with open(d + "/ties.tsv", "w") as f:
    for k in range(120):
        i, j = rng.choice(60, 2, replace=False)
        c = lat[i] @ lat[j] / np.linalg.norm(lat[i]) / np.linalg.norm(lat[j])
        f.write("%s\t%s\t%d\n" % (words[i], words[j], int(np.clip(round(2 + 2 * c + rng.normal(0, 0.8)), 0, 4))))
for name, noise, drop in (("x", 0.6, 5), ("y", 0.8, 8), ("z", 0.7, 0)):
    gone = set(rng.choice(60, drop, replace=False)) if drop else set()
    rows = [(w, np.round(lat[i] + noise * rng.normal(size=6), 1)) for i, w in enumerate(words) if i not in gone]
    with open("%s/%s.txt" % (d, name), "w") as f:
        f.write("%d 6\n" % len(rows))
        for w, v in rows:
            f.write(w + " " + " ".join("%.1f" % t for t in v) + "\n")
PYEOF
"$VG_BIN" score --seed 99 --bootstrap 600 --pairs "$TMP/ties.tsv" --out "$TMP/ties" \
    x="$TMP/x.txt" y="$TMP/y.txt" z="$TMP/z.txt" > /dev/null 2>&1
check "cmpref-3: tied ratings and cosines, sets missing different words, seed 99: equal to scipy/statsmodels" \
    "$PY" "$REF" "$TMP/ties/items.csv" "$TMP/ties/comparison.csv" "$VGSTAT" 99 600 0.95 0.05 common
"$VG_BIN" score --seed 99 --bootstrap 300 --no-common --pairs "$TMP/ties.tsv" --out "$TMP/ties-asis" \
    x="$TMP/x.txt" y="$TMP/y.txt" > /dev/null 2>&1
check "cmpref-4: the same, --no-common" \
    "$PY" "$REF" "$TMP/ties-asis/items.csv" "$TMP/ties-asis/comparison.csv" "$VGSTAT" 99 300 0.95 0.05 as-is

# cmpref-5: analogy runs written by hand (the analogy scorer is another
# stage): three sets on 150 questions, some unanswered; McNemar against
# scipy.stats.binomtest, the accuracy bootstrap against numpy.
"$PY" - "$TMP" <<'PYEOF'
import json, os, sys, numpy as np
d = sys.argv[1]
rng = np.random.default_rng(5)
n = 150
H = ("vectors,suite,item,subset,task,word1,word2,word3,expected,rating,status,cosine,3cosadd,"
     "3cosadd_correct,3cosmul,3cosmul_correct,pairdir,pairdir_correct,only_b,only_b_correct")
skill = {"good": 0.7, "fair": 0.62, "poor": 0.45}
for label, p in skill.items():
    os.makedirs("%s/ana-%s" % (d, label))
    json.dump({"format": "vecgauge-run 1", "utc_time": "", "command_line": "", "seed": 3,
               "bootstrap_replicates": 700, "confidence_level": 0.95,
               "vector_sets": [{"label": label}],
               "suites": [{"id": "hand-ana", "task": "analogy", "items": n,
                           "files": [{"path": "q.txt", "sha256": "ab" * 32}]}]},
              open("%s/ana-%s/run.json" % (d, label), "w"))
    open("%s/ana-%s/scores.csv" % (d, label), "w").write(
        "vectors,suite,subset,task,metric,value,ci_low,ci_high,ci_method,n_items,n_used,coverage\n")
    lines = [H]
    for i in range(n):
        q = "a%d b%d c%d d%d" % (i, i, i, i)
        a, b, c, e = q.split()
        if rng.random() < 0.06:
            lines.append("%s,hand-ana,%d,,analogy,%s,%s,%s,%s,,missing_word,,,,,,,,," % (label, i + 1, a, b, c, e))
        else:
            ok = int(rng.random() < p)
            lines.append("%s,hand-ana,%d,,analogy,%s,%s,%s,%s,,scored,,%s,%d,%s,%d,,,," %
                         (label, i + 1, a, b, c, e, e if ok else "z", ok, e, 1))
    open("%s/ana-%s/items.csv" % (d, label), "w").write("\n".join(lines) + "\n")
with open(d + "/ana-items.csv", "w") as f:
    for k, label in enumerate(skill):
        body = open("%s/ana-%s/items.csv" % (d, label)).read().split("\n", 1)
        f.write(body[0] + "\n" if k == 0 else "")
        f.write(body[1])
PYEOF
"$VG_BIN" compare --out "$TMP/ana-cmp" "$TMP/ana-good" "$TMP/ana-fair" "$TMP/ana-poor" > /dev/null 2>&1
check "cmpref-5: analogy runs, McNemar and the accuracy bootstrap (B = 700 from run.json, seed 3): equal to scipy/statsmodels" \
    "$PY" "$REF" "$TMP/ana-items.csv" "$TMP/ana-cmp/comparison.csv" "$VGSTAT" 3 700 0.95 0.05 common
"$VG_BIN" compare --no-common --bootstrap 300 --seed 8 --out "$TMP/ana-asis" "$TMP/ana-good" "$TMP/ana-poor" > /dev/null 2>&1
check "cmpref-6: analogy runs, --no-common, seed 8, B = 300" \
    "$PY" "$REF" "$TMP/ana-items.csv" "$TMP/ana-asis/comparison.csv" "$VGSTAT" 8 300 0.95 0.05 as-is
done_testing
