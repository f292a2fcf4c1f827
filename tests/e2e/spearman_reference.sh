#!/usr/bin/env bash
# spearman_reference.sh - Spearman's rho from `vecgauge score` against
# scipy.stats.spearmanr (python3-scipy) on the same cosines, ties included.
source "$(dirname "$0")/lib.bash"

# Compare scores.csv of run directory $1 with the expected file $2.
compare() {
    local run=$1 exp=$2
    "$PY" - "$run/scores.csv" "$exp" <<'PYEOF'
import csv, sys
rows = {r["metric"]: r for r in csv.DictReader(open(sys.argv[1]))}
exp = dict(l.split() for l in open(sys.argv[2]))
bad = []
for m in ("spearman", "spearman_all"):
    got, want = float(rows[m]["value"]), float(exp[m])
    if abs(got - want) > 1e-12:
        bad.append("%s: got %.17g want %.17g" % (m, got, want))
if rows["spearman"]["n_used"] != exp["n_used"] or rows["spearman"]["n_items"] != exp["n_items"]:
    bad.append("counts: got %s/%s want %s/%s" % (rows["spearman"]["n_used"],
               rows["spearman"]["n_items"], exp["n_used"], exp["n_items"]))
if bad:
    print("\n".join(bad))
    sys.exit(1)
PYEOF
}

if ! "$PY" -c 'import scipy, numpy' 2>/dev/null; then
    skip "python3-scipy is not installed (scripts/install-deps installs it)"
    done_testing; exit 0
fi

# Random words with integer ratings 0..10: many tied ratings (reference:
# scipy.stats.spearmanr, which ranks ties by their average rank).
for seed in 1 2 3; do
    mkdir -p "$TMP/case$seed"
    "$PY" tests/ref/spearman_case.py "$TMP/case$seed" "$seed"
    "$VG_BIN" score --pairs "$TMP/case$seed/pairs.tsv" --out "$TMP/case$seed/run" \
        "$TMP/case$seed/vectors.txt" > /dev/null 2>&1
    check "tied ratings, seed $seed: rho and rho on all pairs match scipy to 1e-12" \
        compare "$TMP/case$seed/run" "$TMP/case$seed/expected"
done

# The real WordSim-353 file (../shared), read by vecgauge as distributed
# (comma-separated, header line, CRLF) and by the reference after a plain
# split, with random vectors for its words.
ws="$SHARED/ws353/combined.csv"
if [ -f "$ws" ]; then
    mkdir -p "$TMP/ws"
    tail -n +2 "$ws" | tr -d '\r' | awk -F, '{print $1 "\t" $2 "\t" $3}' > "$TMP/ws/split.tsv"
    "$PY" tests/ref/spearman_case.py "$TMP/ws" 7 "$TMP/ws/split.tsv"
    "$VG_BIN" score --pairs "$ws" --out "$TMP/ws/run" "$TMP/ws/vectors.txt" > /dev/null 2>&1
    check "ws353 combined.csv: rho and rho on all pairs match scipy to 1e-12" \
        compare "$TMP/ws/run" "$TMP/ws/expected"
else
    skip "../shared/public-benchmarks/ws353 is absent (a fresh clone has no ../shared)"
fi

# vgstat (the library's statistics, called directly) on heavy ties.
"$PY" - "$TMP/ties.txt" <<'PYEOF'
import sys, numpy as np
rng = np.random.default_rng(11)
x = rng.integers(0, 5, 300); y = x + rng.integers(0, 3, 300)
np.savetxt(sys.argv[1], np.column_stack([x, y]), fmt="%d")
PYEOF
got=$("$VG_BUILD/tests/vgstat" spearman "$TMP/ties.txt")
want=$("$PY" -c "import numpy as np; from scipy.stats import spearmanr; d=np.loadtxt('$TMP/ties.txt'); print('%.17g' % spearmanr(d[:,0], d[:,1]).correlation)")
check "heavy ties (5 distinct values in 300): vg_stats_spearman $got vs scipy $want" \
    "$PY" -c "import sys; sys.exit(abs($got - $want) > 1e-12)"
ranks_ok=$("$PY" - "$TMP/ties.txt" "$VG_BUILD/tests/vgstat" <<'PYEOF'
import subprocess, sys, numpy as np
from scipy.stats import rankdata
d = np.loadtxt(sys.argv[1])
got = np.array(subprocess.run([sys.argv[2], "rank-x", sys.argv[1]], capture_output=True,
               text=True).stdout.split(), dtype=float)
print("yes" if np.array_equal(got, rankdata(d[:, 0], method="average")) else "no")
PYEOF
)
if [ "$ranks_ok" = yes ]; then ok "vg_stats_rank equals scipy.stats.rankdata(method='average')"; else
    not_ok "vg_stats_rank differs from scipy.stats.rankdata"; fi
done_testing
