#!/usr/bin/env bash
# stats_agreement.sh - the raters' agreement (mean leave-one-out Spearman)
# of suites that carry individual ratings, against the same definition
# computed with scipy (tests/ref/agreement_ref.py), on a hand-made file
# and on the real WS-353 and RW files.
source "$(dirname "$0")/lib.bash"
VGSTAT="$VG_BUILD/tests/vgstat"
REF=tests/ref/agreement_ref.py

if ! "$PY" -c 'import scipy, numpy' 2>/dev/null; then
    skip "python3-scipy is not installed (scripts/install-deps installs it)"
    done_testing; exit 0
fi

# Compare "value columns used min max items": value to 1e-12, counts exactly.
same() {
    local got want
    got=$("$VGSTAT" agreement "$1" "$2") || return 1
    want=$("$PY" "$REF" "$1" "$3" "$4" "$2") || return 1
    echo "vecgauge: $got"
    echo "scipy:    $want"
    "$PY" -c "
import sys
g, w = '$got'.split(), '$want'.split()
sys.exit(not (abs(float(g[0]) - float(w[0])) <= 1e-12 and g[1:] == w[1:]))"
}

# agree-1: hand-made, 2 to 4 ratings per pair, ties, one pair with a single
# rating (left out).
{
    printf 'a\tb\t3\t3\t4\t2\t3\n'
    printf 'b\tc\t8\t8\t7\t9\n'
    printf 'c\td\t6\t6\t5\n'
    printf 'd\te\t1.5\t1\t2\n'
    printf 'e\tf\t5\t5\n'
    printf 'f\tg\t4\t4\t5\t3\t4\n'
    printf 'g\th\t7\t6\t8\t7\n'
    printf 'h\ti\t2\t2\t2\t3\n'
} > "$TMP/hand.tsv"
check "agree-1: hand-made file, 1 to 4 ratings per pair" same "$TMP/hand.tsv" 4 tab 0

# agree-2..4: the real files. WS-353 set1/set2 give every pair 13 and 16
# ratings; RW gives 7 to 10 (SOURCES.md: rows of 10 to 13 fields).
if [ -f "$SHARED/ws353/set1.csv" ]; then
    check "agree-2: ws353 set1 (13 raters, 153 pairs)" same "$SHARED/ws353/set1.csv" 4 , 1
    check "agree-3: ws353 set2 (16 raters, 200 pairs)" same "$SHARED/ws353/set2.csv" 4 , 1
else
    skip "../shared/public-benchmarks/ws353 is absent (a fresh clone has no ../shared)"
fi
if [ -f "$SHARED/rw2034/rw.txt" ]; then
    check "agree-4: rw2034 (7 to 10 ratings per pair)" same "$SHARED/rw2034/rw.txt" 4 tab 0
    got=$("$VGSTAT" agreement "$SHARED/rw2034/rw.txt" 4)
    check "agree-5: rw2034 has 10 rating columns and 7 to 10 ratings per pair over 2034 pairs (SOURCES.md)" \
        test "$(echo "$got" | cut -d' ' -f2,4-6)" = "10 7 10 2034"
else
    skip "../shared/public-benchmarks/rw2034 is absent (a fresh clone has no ../shared)"
fi
done_testing
