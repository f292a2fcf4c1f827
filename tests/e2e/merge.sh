#!/usr/bin/env bash
# merge.sh - `vecgauge merge`: a grid of run directories as one run
# directory that compares exactly like the runs themselves; label clashes
# and mismatched suites are refused; nothing is half written.
source "$(dirname "$0")/lib.bash"
"$VG_BUILD/gen-demo" "$TMP/demo" > /dev/null
D="$TMP/demo"
P="$D/tidewater-pairs.tsv"
G="$TMP/grid"
mkdir -p "$G"
# A small grid, each job in its own run directory, all jobs labelling
# their set "vectors" (as a grid script easily does).
i=0
for s in full half quick; do
    i=$((i + 1))
    "$VG_BIN" score --bootstrap 200 --pairs "$P" --out "$G/job$i" vectors="$D/tide-$s.txt" > /dev/null 2>&1
done

# mrg-1: the same label in every job: refused, with the way out.
expect_status "mrg-1: label clash is refused" 1 "$VG_BIN" merge --out "$TMP/m0" "$G"/job*
expect_in "mrg-1b: naming the label" "label 'vectors'" "$TMP/err"
expect_in "mrg-1c: and the option that fixes it" "--label-from dir" "$TMP/err"
check "mrg-1d: nothing written" test ! -e "$TMP/m0"

# mrg-2: --label-from dir: one table, labels from the directories.
expect_status "mrg-2: merge with --label-from dir" 0 \
    "$VG_BIN" merge --label-from dir --out "$TMP/m1" "$G/job1" "$G/job2" "$G/job3"
check "mrg-2b: scores.csv is the three runs' rows in order, relabelled" "$PY" - "$TMP/m1" "$G" <<'PYEOF'
import csv, sys
m, g = sys.argv[1], sys.argv[2]
got = list(csv.reader(open(m + "/scores.csv")))
want = [None]
for j in (1, 2, 3):
    rows = list(csv.reader(open("%s/job%d/scores.csv" % (g, j))))
    want[0] = rows[0]
    want += [["job%d" % j] + r[1:] for r in rows[1:]]
assert got == want, (got[:3], want[:3])
items = list(csv.reader(open(m + "/items.csv")))
assert len(items) == 1 + 3 * 240 and {r[0] for r in items[1:]} == {"job1", "job2", "job3"}
PYEOF
check "mrg-2c: run.json names the three runs it came from" "$PY" -c "
import json, sys
j = json.load(open('$TMP/m1/run.json'))
assert [s['label'] for s in j['vector_sets']] == ['job1', 'job2', 'job3']
assert len(j['merged_from']) == 3 and j['merged_from'][0]['dir'].endswith('job1')
assert j['argv'][1] == 'merge'"
expect_in "mrg-2d: summary.md lists every set" "| job3 |" "$TMP/m1/summary.md"

# mrg-3: comparing the merged directory = comparing the runs: same
# comparison.csv byte for byte.
"$VG_BIN" compare --out "$TMP/c-merged" "$TMP/m1" > /dev/null 2>&1
"$VG_BIN" compare --label-from dir --out "$TMP/c-runs" "$G/job1" "$G/job2" "$G/job3" > /dev/null 2>&1
check "mrg-3: compare of the merged directory = compare of the runs" \
    cmp "$TMP/c-merged/comparison.csv" "$TMP/c-runs/comparison.csv"
# ... and merging merged directories nests.
"$VG_BIN" merge --out "$TMP/m2" "$TMP/m1" > /dev/null 2>&1
check "mrg-3b: a merged directory merges again to the same items" cmp "$TMP/m1/items.csv" "$TMP/m2/items.csv"

# mrg-4: runs on different suites are refused.
"$VG_BIN" score --bootstrap 0 --pairs "$VG_FIXTURES/pairs/basic.tsv" --out "$G/other" \
    other="$D/tide-half.txt" > /dev/null 2>&1
expect_status "mrg-4: a run on another suite is refused" 1 \
    "$VG_BIN" merge --label-from dir --out "$TMP/m3" "$G/job1" "$G/other"
check "mrg-4b: nothing written" test ! -e "$TMP/m3"

# mrg-5: bad command lines, existing output, interrupted merge.
expect_status "mrg-5: --out is required" 2 "$VG_BIN" merge "$G/job1"
expect_status "mrg-5b: --label-from takes only dir" 2 "$VG_BIN" merge --label-from x --out "$TMP/m4" "$G/job1"
expect_status "mrg-5c: an existing directory is never overwritten" 1 \
    "$VG_BIN" merge --label-from dir --out "$TMP/m1" "$G/job1"
VECGAUGE_TEST_SLOW_WRITE=1 "$VG_BIN" merge --label-from dir --out "$TMP/m5" "$G"/job* > /dev/null 2>&1 &
interrupt_while_writing INT $! "$TMP/.m5.tmp-*"
check "mrg-5d: SIGINT mid-merge exits 130 and leaves nothing (status $st)" \
    bash -c "test $st -eq 130 && ! ls -a '$TMP' | grep -q m5"
expect_status "mrg-5e: rerun refuses a merged directory (its command is not score)" 1 \
    "$VG_BIN" rerun --out "$TMP/m6" "$TMP/m1"
done_testing
