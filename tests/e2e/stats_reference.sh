#!/usr/bin/env bash
# stats_reference.sh - Spearman's rho, Pearson's r and Kendall's tau-b
# against scipy.stats (python3-scipy) to 1e-12: the library on fixtures
# with ties and on the real suites' ratings, and `vecgauge score` (every
# row of scores.csv, and the Fisher-z intervals of intervals.csv) on real
# suites with random vectors.
source "$(dirname "$0")/lib.bash"
VGSTAT="$VG_BUILD/tests/vgstat"
REF=tests/ref/corr_case.py

if ! "$PY" -c 'import scipy, numpy' 2>/dev/null; then
    skip "python3-scipy is not installed (scripts/install-deps installs it)"
    done_testing; exit 0
fi

# Compare vgstat's three correlations of FILE ("x y" lines) with scipy.
three() {
    local file=$1 bad=0 k got want
    "$PY" "$REF" columns "$file" > "$TMP/want"
    for k in spearman pearson kendall; do
        got=$("$VGSTAT" "$k" "$file")
        want=$(awk -v k="$k" '$1 == k {print $2}' "$TMP/want")
        if ! "$PY" -c "import sys; sys.exit(not abs($got - $want) <= 1e-12)"; then
            echo "$k: vecgauge $got, scipy $want"
            bad=1
        fi
    done
    return $bad
}

# ref-1..4: fixtures made by numpy: heavy ties in both variables, none,
# ties in one, and a 3-item case (spearmanr, pearsonr, kendalltau are the
# reference; scipy's kendalltau is tau-b).
"$PY" - "$TMP" <<'PYEOF'
import sys, numpy as np
d, rng = sys.argv[1], np.random.default_rng(21)
x = rng.integers(0, 5, 300); np.savetxt(d + "/f1", np.column_stack([x, x + rng.integers(0, 3, 300)]), fmt="%d")
x = rng.standard_normal(500); np.savetxt(d + "/f2", np.column_stack([x, -0.3 * x + rng.standard_normal(500)]))
x = np.round(rng.uniform(0, 10, 400), 1); np.savetxt(d + "/f3", np.column_stack([x, x + rng.standard_normal(400)]))
np.savetxt(d + "/f4", np.array([[1, 2], [1, 3], [2, 3]]), fmt="%d")
PYEOF
check "ref-1: heavy ties in both (5 and 7 values in 300)" three "$TMP/f1"
check "ref-2: no ties, negative correlation (500)" three "$TMP/f2"
check "ref-3: ties in x only (ratings to one decimal, 400)" three "$TMP/f3"
check "ref-4: three items with ties" three "$TMP/f4"

# ref-5..11: the real suites' own rating columns against each other.
cols() { # FILE SKIP SEP COLX COLY OUT
    tail -n +"$(($2 + 1))" "$1" | tr -d '\r' | awk -F"$3" -v a="$4" -v b="$5" '{print $a, $b}' > "$6"
}
sl="$SHARED/simlex999/SimLex-999.txt"
if [ -f "$sl" ]; then
    cols "$sl" 1 '\t' 4 8 "$TMP/sl48"
    check "ref-5: simlex999 SimLex999 vs Assoc(USF) (999 pairs)" three "$TMP/sl48"
    cols "$sl" 1 '\t' 4 10 "$TMP/sl410"
    check "ref-6: simlex999 SimLex999 vs SD(SimLex)" three "$TMP/sl410"
    cols "$sl" 1 '\t' 5 6 "$TMP/sl56"
    check "ref-7: simlex999 conc(w1) vs conc(w2)" three "$TMP/sl56"
else
    skip "../shared/public-benchmarks/simlex999 is absent (a fresh clone has no ../shared)"
fi
if [ -f "$SHARED/ws353/set1.csv" ]; then
    cols "$SHARED/ws353/set1.csv" 1 , 3 4 "$TMP/s1a"
    check "ref-8: ws353 set1 mean vs rater 1 (153 pairs)" three "$TMP/s1a"
    cols "$SHARED/ws353/set1.csv" 1 , 4 5 "$TMP/s1b"
    check "ref-9: ws353 set1 rater 1 vs rater 2" three "$TMP/s1b"
    cols "$SHARED/ws353/set2.csv" 1 , 3 19 "$TMP/s2"
    check "ref-10: ws353 set2 mean vs rater 16 (200 pairs)" three "$TMP/s2"
else
    skip "../shared/public-benchmarks/ws353 is absent (a fresh clone has no ../shared)"
fi
if [ -f "$SHARED/rw2034/rw.txt" ]; then
    cols "$SHARED/rw2034/rw.txt" 0 '\t' 3 4 "$TMP/rw"
    check "ref-11: rw2034 mean vs first rating (2034 pairs)" three "$TMP/rw"
else
    skip "../shared/public-benchmarks/rw2034 is absent (a fresh clone has no ../shared)"
fi

# ref-12..16: `vecgauge score` on real suites as distributed, random
# vectors for their words (10% left out): all six rows of scores.csv and
# their Fisher-z intervals against scipy and the formula. The reference
# reads the same suite after a plain split.
score_case() { # NAME FILE SPLIT_COMMAND...
    local name=$1 file=$2; shift 2
    mkdir -p "$TMP/$name"
    "$@" < "$file" > "$TMP/$name/split.tsv"
    "$PY" "$REF" build "$TMP/$name" 5 "$TMP/$name/split.tsv"
    if ! "$VG_BIN" score --pairs "$file" --out "$TMP/$name/run" "$TMP/$name/vectors.txt" \
        > /dev/null 2> "$TMP/$name/err"; then
        cat "$TMP/$name/err"
        return 1
    fi
    "$PY" "$REF" compare "$TMP/$name/run" "$TMP/$name/expected"
}
csv3() { tail -n +2 | tr -d '\r' | awk -F, '{print $1 "\t" $2 "\t" $3}'; }
men3() { tail -n +2 | tr ' ' '\t'; }
tab3() { tr -d '\r' | cut -f1-3; }
for c in "ws353 ws353/combined.csv csv3" "men3k men3k/MEN_dataset_natural_form_full men3" \
    "rw2034 rw2034/rw.txt tab3" "rg65 rg65/RG-65.txt tab3" "card660 card660/Card-660.txt tab3"; do
    set -- $c
    if [ -f "$SHARED/$2" ]; then
        check "ref-$1: vecgauge score on $1: 6 rows and Fisher-z intervals match scipy to 1e-12" \
            score_case "$1" "$SHARED/$2" "$3"
    else
        skip "../shared/public-benchmarks/$2 is absent (a fresh clone has no ../shared)"
    fi
done
done_testing
