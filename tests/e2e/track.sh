#!/usr/bin/env bash
# track.sh - `vecgauge track`: the regression gate on the demo's training
# run (gen-demo.c plants a regression at checkpoint 6), quiet on
# noise-level differences, concurrent appends from 8 processes, refusals
# that leave the history untouched.
source "$(dirname "$0")/lib.bash"
"$VG_BUILD/gen-demo" "$TMP/demo" > /dev/null
D="$TMP/demo"
P="$D/tidewater-pairs.tsv"
W="$TMP/work"
mkdir -p "$W"
for i in 1 2 3 4 5 6; do
    "$VG_BIN" score --bootstrap 500 --pairs "$P" --out "$W/ckpt$i" tide-ckpt$i="$D/tide-ckpt$i.txt" \
        > /dev/null 2>&1
done
H="$W/history.csv"

# trk-1: checkpoints 1 to 5 pass the gate; checkpoint 6 fails it with
# status 3, naming the suite (the planted regression).
for i in 1 2 3 4 5; do
    expect_status "trk-1: checkpoint $i passes --fail-on-regression" 0 \
        "$VG_BIN" track --history "$H" --fail-on-regression "$W/ckpt$i"
    cp "$TMP/out" "$TMP/out$i"
done
expect_in "trk-1b: checkpoint 1 is the first run" "nothing to compare with yet" "$TMP/out1"
expect_in "trk-1c: checkpoint 2 is significantly better than 1" "step 2 better" "$TMP/out2"
expect_in "trk-1d: checkpoint 5 vs 4 is noise: no regression" "no significant regression" "$TMP/out5"
expect_status "trk-1e: checkpoint 6 fails the gate with status 3" 3 \
    "$VG_BIN" track --history "$H" --fail-on-regression "$W/ckpt6"
expect_in "trk-1f: naming the suite" "regression: significantly worse (Holm, alpha 0.05) on tidewater-pairs" "$TMP/out"
expect_in "trk-1g: against the previous run" "step 6  step 5" "$TMP/out"
expect_in "trk-1h: and against the best earlier run (step 4)" "step 6  step 4" "$TMP/out"

# trk-2: the history: a header and one line per step, runs recorded
# relative to the history's folder, values equal to each run's scores.csv.
check "trk-2: history.csv holds steps 1..6 with the runs' own headline scores" "$PY" - "$H" "$W" <<'PYEOF'
import csv, sys
rows = list(csv.DictReader(open(sys.argv[1])))
assert [int(r["step"]) for r in rows] == [1, 2, 3, 4, 5, 6], rows
for r in rows:
    assert r["run"] == "ckpt" + r["step"], r["run"]
    s = [x for x in csv.DictReader(open(sys.argv[2] + "/" + r["run"] + "/scores.csv"))
         if x["metric"] == "spearman" and x["subset"] == ""][0]
    assert r["value"] == s["value"] and r["ci_low"] == s["ci_low"], (r, s)
    assert r["vectors"] == "tide-ckpt" + r["step"]
PYEOF
check "trk-2b: plots beside the history" test -s "$W/history-plots/tidewater-pairs.png" -a -s "$W/history-plots/tidewater-pairs.svg"
check "trk-2c: no temporary plot file is left" bash -c "! ls -a '$W/history-plots' | grep -q tmp"

# trk-3: without --fail-on-regression the regression is reported, status 0.
cp -r "$W/ckpt6" "$W/ckpt6b"
expect_status "trk-3: a regression without the gate option exits 0" 0 \
    "$VG_BIN" track --history "$H" --step 7 --no-plots "$W/ckpt6b"
expect_in "trk-3b: and still names it" "regression:" "$TMP/out"

# trk-4: the demo candidates: tide-half after tide-full is within noise
# (quiet), tide-quick after tide-full is clearly worse (fires).
for s in full half quick; do
    "$VG_BIN" score --bootstrap 500 --pairs "$P" --out "$W/cand-$s" tide-$s="$D/tide-$s.txt" > /dev/null 2>&1
done
expect_status "trk-4: tide-full starts a history" 0 "$VG_BIN" track --history "$W/cand.csv" --no-plots "$W/cand-full"
expect_status "trk-4b: tide-half after tide-full: noise-level, the gate stays quiet" 0 \
    "$VG_BIN" track --history "$W/cand.csv" --no-plots --fail-on-regression "$W/cand-half"
expect_status "trk-4c: tide-quick after them: the gate fires" 3 \
    "$VG_BIN" track --history "$W/cand.csv" --no-plots --fail-on-regression "$W/cand-quick"

# trk-5: 8 processes append to one history at once (xargs -P, as GNU
# parallel would run them): no line lost, none damaged. Without --step
# each takes the largest step so far + 1, which is only right when the
# read and the append happen under one lock; the test hook holds each
# lock 200 ms so that the processes really overlap.
for i in 1 2 3 4 5 6 7 8; do cp -r "$W/ckpt$(( (i - 1) % 6 + 1 ))" "$W/par$i"; done
seq 1 8 | VECGAUGE_TEST_SLOW_WRITE=1 xargs -P 8 -I{} "$VG_BIN" track --history "$W/par.csv" \
    --plots "$W/par-plots" "$W/par{}" > "$TMP/par.out" 2>&1
xst=$?
check "trk-5: 8 concurrent tracks: one header, 8 complete lines, steps 1..8 once each" "$PY" - "$W/par.csv" <<'PYEOF'
import csv, sys
text = open(sys.argv[1]).read()
assert text.endswith("\n")
lines = text.split("\n")[:-1]
assert lines[0].startswith("step,run,vectors,") and sum(l.startswith("step,") for l in lines) == 1
rows = list(csv.reader(lines[1:]))
assert len(rows) == 8, len(rows)
assert all(len(r) == 13 for r in rows), [len(r) for r in rows]
assert sorted(int(r[0]) for r in rows) == list(range(1, 9)), sorted(int(r[0]) for r in rows)
assert sorted(r[1] for r in rows) == ["par%d" % i for i in range(1, 9)]
assert all(float(r[6]) > 0.5 for r in rows)
PYEOF
check "trk-5b: ... and every process exited 0 (xargs status $xst)" test "$xst" -eq 0

# trk-6: a history damaged by something else is refused and left as is.
cp "$H" "$W/damaged.csv"
printf '8,ckpt1,tide-ckpt1,tidewater-pairs,similarity,spearman,0.6' >> "$W/damaged.csv"
cp "$W/damaged.csv" "$W/damaged.before"
expect_status "trk-6: a history whose last line is cut short is refused" 1 \
    "$VG_BIN" track --history "$W/damaged.csv" "$W/ckpt1"
expect_in "trk-6b: saying so" "does not end with a newline" "$TMP/err"
check "trk-6c: the file is unchanged" cmp "$W/damaged.csv" "$W/damaged.before"
echo "a,b" > "$W/foreign.csv"
expect_status "trk-6d: another program's CSV is refused" 1 "$VG_BIN" track --history "$W/foreign.csv" "$W/ckpt1"

# trk-7: a run the history names has gone: error, nothing appended.
cp "$H" "$W/gone.csv"
mv "$W/ckpt6b" "$W/ckpt6b.moved"
lines=$(wc -l < "$W/gone.csv")
expect_status "trk-7: the previous run's directory is missing: status 1" 1 \
    "$VG_BIN" track --history "$W/gone.csv" --no-plots "$W/ckpt1"
check "trk-7b: nothing appended" test "$(wc -l < "$W/gone.csv")" -eq "$lines"
mv "$W/ckpt6b.moved" "$W/ckpt6b"

# trk-8: the history and its runs move together (relative paths).
cp -r "$W" "$TMP/moved"
expect_status "trk-8: tracking in a moved copy still finds the earlier runs" 0 \
    "$VG_BIN" track --history "$TMP/moved/history.csv" --no-plots "$TMP/moved/ckpt5"
expect_in "trk-8b: compared with step 7" "step 7" "$TMP/out"

# trk-9: a run of several sets needs --vectors.
"$VG_BIN" score --bootstrap 100 --pairs "$P" --out "$W/two" a="$D/tide-ckpt5.txt" b="$D/tide-ckpt6.txt" \
    > /dev/null 2>&1
expect_status "trk-9: two sets without --vectors is a usage error" 2 \
    "$VG_BIN" track --history "$W/two.csv" "$W/two"
expect_status "trk-9b: --vectors b picks one" 0 "$VG_BIN" track --history "$W/two.csv" --vectors b "$W/two"
expect_in "trk-9c: the history records the set's label" ",two,b," "$W/two.csv"
expect_status "trk-9d: no --history is a usage error" 2 "$VG_BIN" track "$W/ckpt1"

# trk-10: --out writes a report directory whole; interrupted, nothing.
expect_status "trk-10: --out report" 0 \
    "$VG_BIN" track --history "$W/rep.csv" --step 1 --no-plots --out "$W/rep1" "$W/ckpt5"
"$VG_BIN" track --history "$W/rep.csv" --step 2 --no-plots --out "$W/rep2" "$W/ckpt6" > /dev/null 2>&1
check "trk-10b: the report holds comparison.csv, summary.md and both plots" \
    test -s "$W/rep2/comparison.csv" -a -s "$W/rep2/summary.md" -a -s "$W/rep2/plots/tidewater-pairs.png"
expect_in "trk-10c: the summary names the regression" "Significant regression" "$W/rep2/summary.md"
VECGAUGE_TEST_SLOW_WRITE=1 "$VG_BIN" track --history "$W/rep.csv" --step 3 --no-plots \
    --out "$W/rep3" "$W/ckpt4" > /dev/null 2>&1 &
interrupt_while_writing INT $! "$W/.rep3.tmp-*"
check "trk-10d: interrupted while writing --out: status $st, no report directory left" \
    bash -c "test $st -eq 130 && ! ls -a '$W' | grep -q 'rep3'"

# trk-11: SIGINT or SIGTERM while track holds the history's lock (before
# its one-write append) leaves the history byte for byte as it was. The
# lock being held is seen with flock(1) -n failing (util-linux).
for sig in INT TERM; do
    cp "$W/rep.csv" "$W/rep-before.csv"
    VECGAUGE_TEST_SLOW_WRITE=1 "$VG_BIN" track --history "$W/rep.csv" --no-plots "$W/ckpt3" \
        > /dev/null 2>&1 &
    pid=$!
    for _ in $(seq 1 3000); do
        flock -n "$W/rep.csv" true 2> /dev/null || break
        kill -0 "$pid" 2> /dev/null || break
        sleep 0.01
    done
    kill -s "$sig" "$pid" 2> /dev/null
    wait "$pid"
    st=$?
    check "trk-11 ($sig): interrupted under the lock: killed (status $st), history unchanged" \
        bash -c "test $st -ge 128 && cmp -s '$W/rep.csv' '$W/rep-before.csv'"
done

# trk-12 (issue 25): with steps 10 to 60 in a history and the best score
# at step 40, a run tracked as step 25 is compared with step 20 (the
# previous run) and with the best of steps 10 and 20 only: never with a
# later step.
for i in 1 2 3 4 5 6; do
    "$VG_BIN" track --history "$W/gaps.csv" --step "${i}0" --no-plots "$W/ckpt$i" > /dev/null 2>&1
done
cp -r "$W/ckpt3" "$W/ckpt3b"
expect_status "trk-12: a step between the history's steps" 0 \
    "$VG_BIN" track --history "$W/gaps.csv" --step 25 --no-plots "$W/ckpt3b"
expect_in "trk-12b: compared with the previous run, step 20" "step 25  step 20" "$TMP/out"
check "trk-12c: and with no later step (30 to 60)" bash -c "! grep -qE 'step 25  step [3-6]0' '$TMP/out'"

# trk-13: a step already in the history is refused (usage error, named),
# and nothing is appended.
cp "$W/gaps.csv" "$W/gaps.before"
expect_status "trk-13: --step 40 again is refused" 2 \
    "$VG_BIN" track --history "$W/gaps.csv" --step 40 --no-plots "$W/ckpt3b"
expect_in "trk-13b: saying why" "step 40 is already in" "$TMP/err"
check "trk-13c: the history is unchanged" cmp "$W/gaps.csv" "$W/gaps.before"
done_testing
