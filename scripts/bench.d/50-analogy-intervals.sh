#!/usr/bin/env bash
# 50-analogy-intervals.sh - what the analogy intervals cost in a whole
# `vecgauge score` process: 100,000 x 300 binary vectors, all candidates,
# the four methods, on Google's 19,544 questions and on BATS 3.0's 98,000
# (20,000 candidates), with --bootstrap 0 against the default 2000
# replicates of the pair bootstrap (target: under 5% of the run); and the
# pair bootstrap alone (vgstat pairboot-time) on each suite's design.
# Needs ../shared/public-benchmarks (google-analogy, bats3) and numpy.
# Part of vecgauge; MIT licence, see LICENSE.
#
# Environment: VG_BUILD, VG_BIN, VG_BENCH_DIR (set by scripts/bench),
#   VG_BENCH_REPS  timed runs of each configuration (default 5)
set -euo pipefail
PY=/usr/bin/python3
[ -x /usr/bin/time ] || { echo "50-analogy-intervals: /usr/bin/time is missing (Debian package time)"; exit 0; }
bin=${VG_BIN:-build/vecgauge}
dir=${VG_BENCH_DIR:-build/bench}/analogy-intervals
reps=${VG_BENCH_REPS:-5}
shared=../shared/public-benchmarks
ga=$shared/google-analogy/questions-words.txt
bats=$shared/bats3
if [ ! -f "$ga" ] || [ ! -d "$bats" ]; then
    echo "50-analogy-intervals: ../shared/public-benchmarks is absent: nothing measured"; exit 0
fi
mkdir -p "$dir"
if [ ! -f "$dir/vectors.bin" ]; then
    # Random vectors; the question words of both suites first (as frequent
    # words come first in real files), then distractors up to 100,000 rows.
    "$PY" - "$dir/vectors.bin" "$ga" "$bats" <<'PYEOF'
import os, sys
import numpy as np
out, ga, bats = sys.argv[1:4]
words = {}
for line in open(ga, encoding="utf-8"):
    if not line.startswith(":"):
        for w in line.split():
            words.setdefault(w, 0)
for root, _, files in os.walk(bats):
    for name in sorted(files):
        if name.endswith(".txt") and not name.lower().startswith("readme"):
            for line in open(os.path.join(root, name), encoding="utf-8"):
                for w in line.replace("\t", "/").rstrip("\n").split("/"):
                    w = w.strip()
                    if w and not any(c.isspace() for c in w):
                        words.setdefault(w, 0)
rng = np.random.default_rng(50)
rows, dims = 100000, 300
names = list(words)[:rows]
names += ["zz%d" % i for i in range(rows - len(names))]
m = rng.standard_normal((rows, dims), dtype=np.float32)
with open(out, "wb") as f:
    f.write(b"%d %d\n" % (rows, dims))
    for i, w in enumerate(names):
        f.write(w.encode("utf-8") + b" " + m[i].tobytes() + b"\n")
PYEOF
fi
median() { sort -n | awk '{ a[NR] = $1 } END { m = int((NR + 1) / 2); printf "%.3f %.3f %.3f\n", a[m], a[1], a[NR] }'; }
# run KIND suite-args...: median min max of the whole process's wall-clock
# seconds (KIND wall) or CPU seconds, user + system (KIND cpu), which a
# shared machine disturbs less.
run() {
    local kind=$1
    shift
    for ((i = 0; i < reps; i++)); do
        rm -rf "$dir/run"
        /usr/bin/time -f "%e %U %S" -o "$dir/time" \
            "$bin" score --no-progress --out "$dir/run" "$@" v="$dir/vectors.bin" > /dev/null \
            2> "$dir/stderr" || { cat "$dir/stderr" >&2; exit 1; }
        if [ "$kind" = wall ]; then awk '{ print $1 }' "$dir/time"; else awk '{ print $2 + $3 }' "$dir/time"; fi
    done | median
}
echo "| suite | candidates | time | --bootstrap 0: median s (min-max) | default 2000: median s (min-max) | intervals' share |"
echo "|---|---:|---|---|---|---:|"
load_before=$(cut -d' ' -f1-3 /proc/loadavg)
for case in "google|0|$ga" "bats3|20000|$bats"; do
    IFS='|' read -r name cand path <<< "$case"
    for kind in wall cpu; do
        read -r z0 z0lo z0hi < <(run $kind --analogy-vocab "$cand" --bootstrap 0 --analogies "$path")
        read -r d0 d0lo d0hi < <(run $kind --analogy-vocab "$cand" --analogies "$path")
        share=$(awk -v a="$z0" -v b="$d0" 'BEGIN { printf "%.1f%%", 100 * (b - a) / b }')
        echo "| $name | ${cand/#0/all (100000)} | $kind | $z0 ($z0lo-$z0hi) | $d0 ($d0lo-$d0hi) | $share |"
    done
done
echo
echo "Whole processes (load included, hashing on), $reps runs each; the share is"
echo "(default - none) / default. Load average before: $load_before; after: $(cut -d' ' -f1-3 /proc/loadavg)."
