#!/usr/bin/env bash
# inprocess.sh - the in-process example (a trainer's vocabulary and matrix
# handed over in memory) gives the same scores as `vecgauge score` on the
# same vectors written to a file.
source "$(dirname "$0")/lib.bash"

cat > "$TMP/pairs.tsv" <<'TSV'
apple	pear	9.1
apple	bread	2.0
bread	bagel	8.5
mop	broom	8.8
pear	mop	0.5
bagel	broom	1.2
apple	kiwi	8.0
TSV
cat > "$TMP/vectors.txt" <<'VEC'
6 4
apple 0.9 0.1 0.0 0.1
pear 0.8 0.2 0.1 0.0
bread 0.1 0.9 0.1 0.0
bagel 0.2 0.8 0.0 0.1
mop 0.0 0.1 0.9 0.3
broom 0.1 0.0 0.8 0.4
VEC
"$VG_BUILD/tests/inprocess_example" "$TMP/pairs.tsv" > "$TMP/inproc" 2>&1
check "the in-process example runs" test -s "$TMP/inproc"
"$VG_BIN" score --pairs "$TMP/pairs.tsv" --out "$TMP/run" "$TMP/vectors.txt" > /dev/null 2>&1
for m in spearman spearman_all; do
    a=$(awk -v m="$m" '$1 == m {print $2}' "$TMP/inproc")
    b=$(awk -F, -v m="$m" '$5 == m {print $6}' "$TMP/run/scores.csv")
    check "$m in-process ($a) equals the CLI's ($b)" "$PY" -c "import sys; sys.exit(float('$a') != float('$b'))"
done
expect_in "in-process coverage: 6 of 7 pairs" "(6 of 7 pairs)" "$TMP/inproc"
done_testing
