#!/usr/bin/env bash
# stats_pairboot.sh - the pair bootstrap (Owen 2007, the pigeonhole
# bootstrap for crossed designs) against an independent numpy
# implementation: exactly on the very draws vecgauge makes, statistically
# against numpy's own draws, and the degenerate design against the
# question bootstrap.
source "$(dirname "$0")/lib.bash"
VGSTAT="$VG_BUILD/tests/vgstat"
REF=tests/ref/pairboot_check.py

if ! "$PY" -c 'import numpy' 2>/dev/null; then
    skip "python3-numpy is not installed (scripts/install-deps installs it)"
    done_testing; exit 0
fi

for shape in crossed mixed sparse distinct; do
    "$PY" "$REF" design "$TMP/$shape.txt" 5 "$shape"
done

# pairboot-1..4: levels numbered in order of first appearance, isolated
# questions found, multiplicities of the right sizes and totals, weights
# w[row] v[col] (or u) and weighted totals: equal to numpy's, exactly, on
# the draws vecgauge makes. crossed: every ordered pair of distinct pairs
# of a stratum (how Google's and BATS's sections are built; the dense
# table and dgemm); mixed: shared and unshared pairs; sparse: the cell
# list; distinct: nothing shared.
for shape in crossed mixed sparse distinct; do
    check "pairboot-exact-$shape: weights and totals equal numpy on the same draws" \
        "$PY" "$REF" exact "$TMP/$shape.txt" "$VGSTAT" 300 11
done

# pairboot-mc-1..2: the standard deviation and mean of the accuracy over
# 3000 replicates agree with numpy's own pigeonhole bootstrap (numpy
# multinomial draws) within Monte Carlo error.
check "pairboot-mc-1: crossed design, SD and mean within Monte Carlo error of numpy's draws" \
    "$PY" "$REF" mc "$TMP/crossed.txt" "$VGSTAT" 3000 11
check "pairboot-mc-2: mixed design, SD and mean within Monte Carlo error of numpy's draws" \
    "$PY" "$REF" mc "$TMP/mixed.txt" "$VGSTAT" 3000 12

# pairboot-degenerate-1: when no pair is shared the pair bootstrap is the
# bootstrap over questions: replicate by replicate, the weights equal the
# multiplicities of `vgstat indices` on the same stream.
check "pairboot-degenerate-1: no shared pair: the question bootstrap's draws" \
    "$PY" "$REF" degenerate "$TMP/distinct.txt" "$VGSTAT" 200 11 google

# pairboot-threads-1: the same output for 1 and 2 threads (common practice:
# results never depend on the thread count).
"$VGSTAT" pairboot "$TMP/mixed.txt" 500 3 1 > "$TMP/t1"
"$VGSTAT" pairboot "$TMP/mixed.txt" 500 3 2 > "$TMP/t2"
check "pairboot-threads-1: byte-identical for 1 and 2 threads" cmp "$TMP/t1" "$TMP/t2"

# pairboot-enum-1: `vecgauge compare` on two saved runs of a suite built as
# Google's sections are (every ordered pair of 4 word pairs, two sections):
# its test's p (2 Phi(-|d| / sd*)) and the shifted bootstrap p lie within
# Monte Carlo error of their exact values, found by enumerating every one
# of the 2^32 equally likely resamples (brute force, numpy); the pair
# identities are taken from items.csv's words and subsets.
if "$PY" -c 'import scipy' 2>/dev/null; then
    "$PY" tests/ref/pairboot_enum.py write "$TMP/enum"
    "$VG_BIN" compare --bootstrap 20000 --out "$TMP/enum/cmp" "$TMP/enum/run-a" "$TMP/enum/run-b" \
        > /dev/null 2>&1
    check "pairboot-enum-1: compare's pair-bootstrap p within Monte Carlo error of the exact one" \
        "$PY" tests/ref/pairboot_enum.py check "$TMP/enum" "$TMP/enum/cmp/comparison.csv" 20000
else
    skip "python3-scipy is not installed (scripts/install-deps installs it)"
fi

done_testing
