#!/usr/bin/env bash
# stats_bootstrap.sh - the bootstrap intervals against numpy/scipy: exactly,
# from the very resamples vecgauge draws, and statistically against
# scipy.stats.bootstrap's own draws; the law-school data of Efron and
# Tibshirani (1993).
source "$(dirname "$0")/lib.bash"
VGSTAT="$VG_BUILD/tests/vgstat"
REF=tests/ref/boot_check.py

if ! "$PY" -c 'import scipy, numpy' 2>/dev/null; then
    skip "python3-scipy is not installed (scripts/install-deps installs it)"
    done_testing; exit 0
fi

# The law-school data: LSAT and GPA of 15 American law schools (Efron and
# Tibshirani 1993, Table 3.1; from memory, confirmed by the correlation
# 0.776 the book gives for them, which boot-law-1 checks).
cat > "$TMP/law.txt" <<'EOF'
576 3.39
635 3.30
558 2.81
578 3.03
666 3.44
580 3.07
555 3.00
661 3.43
651 3.36
605 3.13
653 3.12
575 2.74
545 2.76
572 2.88
594 2.96
EOF

# Tied ratings 0..7, tied model scores, 10 items without a score (NaN):
# the case of a vector set missing words.
"$PY" - "$TMP/ties.txt" "$TMP/ties2.txt" <<'PYEOF'
import sys, numpy as np
rng = np.random.default_rng(3)
n = 150
x = rng.integers(0, 8, n).astype(float)
y = np.round(x + rng.normal(0, 3, n), 1)
y[rng.choice(n, 10, replace=False)] = np.nan
np.savetxt(sys.argv[1], np.column_stack([x, y]))
# A second "vector set" on the same items, with other missing items.
y2 = np.round(0.5 * x + rng.normal(0, 2, n), 2)
y2[rng.choice(n, 25, replace=False)] = np.nan
np.savetxt(sys.argv[2], np.column_stack([x, y2]))
PYEOF

# boot-exact-1..3: replicates, jackknife, z0, a, percentile and BCa
# endpoints equal scipy/numpy on the same draws to 1e-12 (formulas:
# Efron and Tibshirani 1993, eqs. 14.10, 14.14, 14.15). The indices come
# from vecgauge's resampling streams; the statistics are recomputed from
# scratch by scipy. Two data sets with different unscored items share one
# index file: replicate r draws the same pairs for every vector set.
"$VGSTAT" indices 150 1000 9 > "$TMP/idx150"
check "boot-exact-1: ties and unscored items, B = 1000, level 0.95: equal to scipy on the same draws" \
    "$PY" "$REF" exact "$TMP/ties.txt" "$TMP/idx150" "$VGSTAT" 0.95 1000 9
check "boot-exact-2: another vector set on the same draws, level 0.8" \
    "$PY" "$REF" exact "$TMP/ties2.txt" "$TMP/idx150" "$VGSTAT" 0.8 1000 9
"$VGSTAT" indices 15 2000 4 > "$TMP/idx15"
check "boot-exact-3: law-school data, B = 2000, level 0.9: equal to scipy on the same draws" \
    "$PY" "$REF" exact "$TMP/law.txt" "$TMP/idx15" "$VGSTAT" 0.9 2000 4

# boot-scipy-1..3: against scipy.stats.bootstrap (percentile and BCa, its
# own random draws). Tolerance: 4 combined Monte Carlo standard errors of
# each endpoint (see tests/ref/boot_check.py), B = 20000 for Spearman and
# Pearson, 4000 for Kendall (scipy's Kendall is not vectorised).
check "boot-scipy-1: law school, Spearman and Pearson, B = 20000, level 0.9" \
    "$PY" "$REF" scipy "$TMP/law.txt" "$VGSTAT" 0.9 20000 1 spearman,pearson
check "boot-scipy-2: law school, Kendall, B = 4000, level 0.9" \
    "$PY" "$REF" scipy "$TMP/law.txt" "$VGSTAT" 0.9 4000 2 kendall
set1="$SHARED/ws353/set1.csv"
if [ -f "$set1" ]; then
    # WordSim-353 set 1: the mean rating against the first rater's.
    tail -n +2 "$set1" | tr -d '\r' | awk -F, '{print $3, $4}' > "$TMP/ws1.txt"
    check "boot-scipy-3: ws353 set1 mean vs rater 1 (153 pairs), B = 20000, level 0.95" \
        "$PY" "$REF" scipy "$TMP/ws1.txt" "$VGSTAT" 0.95 20000 3 spearman,pearson
else
    skip "../shared/public-benchmarks/ws353 is absent (a fresh clone has no ../shared)"
fi

# boot-law-1: Pearson's r of the law-school data is 0.776 (Efron and
# Tibshirani 1993, ch. 3; from memory).
r=$("$VGSTAT" pearson "$TMP/law.txt")
check "boot-law-1: law-school r = $r, the book's 0.776" \
    "$PY" -c "import sys; sys.exit(abs($r - 0.776) > 0.0005)"
# boot-law-2: its bootstrap standard error is about 0.13: the book's
# Table 6.1 gives 0.132 to 0.151 for B from 25 to 3200, settling at 0.132
# (from memory). With B = 20000 the Monte Carlo error is near 0.001, so
# [0.125, 0.140] allows for the memory, not for the bootstrap.
check "boot-law-2: law-school bootstrap SE of r within [0.125, 0.140] (B = 20000)" \
    "$PY" "$REF" se "$TMP/law.txt" "$VGSTAT" 20000 1 0.125 0.140
done_testing
