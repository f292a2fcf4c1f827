#!/usr/bin/env bash
# compare.sh - `vecgauge compare` and `score` with several sets: saved runs
# compare exactly as in-process, mismatched runs are refused, outputs
# appear whole or not at all, plots are real PNG and SVG files.
source "$(dirname "$0")/lib.bash"
F="$VG_FIXTURES"
"$VG_BUILD/gen-demo" "$TMP/demo" > /dev/null
D="$TMP/demo"
P="$D/tidewater-pairs.tsv"
sets=(tide-full="$D/tide-full.txt" tide-half="$D/tide-half.txt" tide-quick="$D/tide-quick.txt")

# cmp-1: score A B C in one run, and each alone then compare: the same
# comparison.csv, byte for byte (common practice: a comparison of saved
# runs must not depend on how they were produced).
"$VG_BIN" score --bootstrap 300 --pairs "$P" --out "$TMP/abc" "${sets[@]}" > "$TMP/abc.out" 2>&1
for s in "${sets[@]}"; do
    "$VG_BIN" score --bootstrap 300 --pairs "$P" --out "$TMP/one-${s%%=*}" "$s" > /dev/null 2>&1
done
"$VG_BIN" compare --out "$TMP/cmp-sep" "$TMP/one-tide-full" "$TMP/one-tide-half" "$TMP/one-tide-quick" \
    > "$TMP/cmp-sep.out" 2>&1
check "cmp-1: compare of three single-set runs = comparison.csv of score A B C, byte for byte" \
    cmp "$TMP/abc/comparison.csv" "$TMP/cmp-sep/comparison.csv"
"$VG_BIN" compare --out "$TMP/cmp-one" "$TMP/abc" > /dev/null 2>&1
check "cmp-1b: compare of the saved three-set run = the in-process comparison" \
    cmp "$TMP/abc/comparison.csv" "$TMP/cmp-one/comparison.csv"
check "cmp-1c: ranking.csv too" cmp "$TMP/abc/ranking.csv" "$TMP/cmp-sep/ranking.csv"
expect_in "cmp-1d: score prints the comparison table" "tide-full better" "$TMP/abc.out"
expect_in "cmp-1e: summary.md has the comparison section" "## Comparison" "$TMP/abc/summary.md"
expect_in "cmp-1f: and says how many pairs were dropped and why" \
    "59 dropped (tide-quick covers 181)" "$TMP/abc/summary.md"
expect_in "cmp-1g: run.json records alpha" '"alpha": 0.05' "$TMP/abc/run.json"
# A single set: no comparison files.
check "cmp-1h: a single-set run has no comparison.csv or plots" \
    bash -c "! test -e '$TMP/one-tide-full/comparison.csv' && ! test -e '$TMP/one-tide-full/plots'"

# cmp-2: the thread count changes nothing.
"$VG_BIN" compare -j 1 --out "$TMP/j1" "$TMP/abc" > /dev/null 2>&1
"$VG_BIN" compare -j 2 --out "$TMP/j2" "$TMP/abc" > /dev/null 2>&1
check "cmp-2: -j 1 and -j 2 give byte-identical comparison.csv" cmp "$TMP/j1/comparison.csv" "$TMP/j2/comparison.csv"

# cmp-3: the demo behaves as designed (gen-demo.c): tide-full and
# tide-half within noise of each other, tide-quick clearly worse.
"$PY" - "$TMP/abc/comparison.csv" > "$TMP/verdict" <<'PYEOF'
import csv, sys
for r in csv.DictReader(open(sys.argv[1])):
    print(r["set_a"], r["set_b"], r["significant"], r["better"])
PYEOF
expect_in "cmp-3: tide-full vs tide-half: no significant difference" "tide-full tide-half 0 " "$TMP/verdict"
expect_in "cmp-3b: tide-full beats tide-quick" "tide-full tide-quick 1 tide-full" "$TMP/verdict"
expect_in "cmp-3c: tide-half beats tide-quick" "tide-half tide-quick 1 tide-half" "$TMP/verdict"

# cmp-4: refusals. Same suite id, one rating changed; same file name,
# other items; other words; other suite files in run.json.
mkdir -p "$TMP/alt"
sed '5s/\t[0-9.]*$/\t9.9/' "$P" > "$TMP/alt/tidewater-pairs.tsv"
"$VG_BIN" score --bootstrap 0 --pairs "$TMP/alt/tidewater-pairs.tsv" --out "$TMP/alt-run" \
    tide-x="$D/tide-half.txt" > /dev/null 2>&1
expect_status "cmp-4: a run on a suite with a changed rating is refused" 1 \
    "$VG_BIN" compare --out "$TMP/no1" "$TMP/one-tide-full" "$TMP/alt-run"
expect_in "cmp-4b: the message names the suite" "tidewater-pairs" "$TMP/err"
check "cmp-4c: nothing was written" test ! -e "$TMP/no1"
head -n 100 "$P" > "$TMP/alt/short.tsv"
cp "$TMP/alt/short.tsv" "$TMP/alt/tidewater-pairs.tsv"
"$VG_BIN" score --bootstrap 0 --pairs "$TMP/alt/tidewater-pairs.tsv" --out "$TMP/alt-short" \
    tide-x="$D/tide-half.txt" > /dev/null 2>&1
expect_status "cmp-4d: a run on fewer items of a suite with the same id is refused" 1 \
    "$VG_BIN" compare --out "$TMP/no2" "$TMP/one-tide-full" "$TMP/alt-short"
expect_in "cmp-4e: naming the item counts" "240 items" "$TMP/err"
cp -r "$TMP/one-tide-half" "$TMP/words"
"$PY" - "$TMP/words/items.csv" <<'PYEOF'
import sys
p = sys.argv[1]
lines = open(p).read().split("\n")
f = lines[3].split(",")
f[5] = "zzzz"
lines[3] = ",".join(f)
open(p, "w").write("\n".join(lines))
PYEOF
expect_status "cmp-4f: a run whose item 3 has other words is refused" 1 \
    "$VG_BIN" compare --out "$TMP/no3" "$TMP/one-tide-full" "$TMP/words"
expect_in "cmp-4g: naming the item" "item 3" "$TMP/err"
cp -r "$TMP/one-tide-half" "$TMP/sha"
sed -i 's/"sha256": "cdfd4d82/"sha256": "00004d82/' "$TMP/sha/run.json"
expect_status "cmp-4h: a run whose suite file has another sha256 is refused" 1 \
    "$VG_BIN" compare --out "$TMP/no4" "$TMP/one-tide-full" "$TMP/sha"
expect_in "cmp-4i: naming the digest" "sha256" "$TMP/err"
"$VG_BIN" score --bootstrap 0 --pairs "$F/pairs/basic.tsv" --out "$TMP/other-suite" \
    tide-y="$D/tide-half.txt" > /dev/null 2>&1
expect_status "cmp-4j: a run on another suite is refused" 1 \
    "$VG_BIN" compare --out "$TMP/no5" "$TMP/one-tide-full" "$TMP/other-suite"

# cmp-5: bad command lines and inputs.
expect_status "cmp-5: no run directory is a usage error" 2 "$VG_BIN" compare
expect_status "cmp-5b: --alpha 1.5 is a usage error" 2 "$VG_BIN" compare --alpha 1.5 "$TMP/abc"
expect_status "cmp-5c: --methods with an unknown method is a usage error" 2 \
    "$VG_BIN" compare --methods 3cosadd,foo "$TMP/abc"
expect_status "cmp-5d: a folder that is not a run directory" 1 "$VG_BIN" compare --out "$TMP/no6" "$TMP" "$TMP/abc"
expect_in "cmp-5e: says run.json is missing" "run.json" "$TMP/err"
expect_status "cmp-5f: one vector set in all is not a comparison" 1 \
    "$VG_BIN" compare --out "$TMP/no7" "$TMP/one-tide-full"
expect_status "cmp-5g: the same run twice clashes on its label" 1 \
    "$VG_BIN" compare --out "$TMP/no8" "$TMP/one-tide-full" "$TMP/one-tide-full"
expect_status "cmp-5h: an existing output directory is never overwritten" 1 \
    "$VG_BIN" compare --out "$TMP/cmp-one" "$TMP/abc"
expect_status "cmp-5i: compare --help" 0 "$VG_BIN" compare --help
expect_in "cmp-5j: the help names --no-common" "--no-common" "$TMP/out"

# cmp-6: --no-common warns, on stderr and in summary.md.
expect_status "cmp-6: --no-common" 0 "$VG_BIN" compare --no-common --out "$TMP/asis" "$TMP/abc"
expect_in "cmp-6b: warns on stderr" "warning: --no-common" "$TMP/err"
expect_in "cmp-6c: and in summary.md" "Warning (--no-common)" "$TMP/asis/summary.md"

# cmp-7: with --no-common the bootstrap is the test, and too few
# resamples for Holm to reject anything are said plainly; Steiger's test
# (common items) has no such floor.
"$VG_BIN" compare --no-common --bootstrap 30 --out "$TMP/few" "$TMP/abc" > /dev/null 2>&1
expect_in "cmp-7: --no-common with 30 resamples and 3 tests: the summary says to raise --bootstrap" \
    "Too few resamples" "$TMP/few/summary.md"
"$VG_BIN" compare --bootstrap 30 --out "$TMP/few2" "$TMP/abc" > /dev/null 2>&1
check "cmp-7b: on the common items (Steiger's test) no such warning" \
    bash -c "! grep -q 'Too few resamples' '$TMP/few2/summary.md'"
expect_in "cmp-7c: the test is named in comparison.csv" ",steiger-z1-bw," "$TMP/few2/comparison.csv"

# cmp-8: plots are PNG (signature and IHDR size: PNG specification,
# ISO/IEC 15948, section 5.2 and 11.2.2) and well-formed SVG (parsed by
# Python's xml.etree).
check "cmp-8: plots/tidewater-pairs.png is a 1720 pixel wide PNG, .svg is SVG" "$PY" - \
    "$TMP/abc/plots/tidewater-pairs.png" "$TMP/abc/plots/tidewater-pairs.svg" <<'PYEOF'
import struct, sys, xml.etree.ElementTree as ET
b = open(sys.argv[1], "rb").read()
assert b[:8] == b"\x89PNG\r\n\x1a\n" and b[12:16] == b"IHDR", "not a PNG"
w, h = struct.unpack(">II", b[16:24])
assert w == 1720 and 300 < h < 1000, (w, h)
root = ET.parse(sys.argv[2]).getroot()
assert root.tag.endswith("svg"), root.tag
PYEOF

# cmp-9: interrupted while the directory is written: nothing is left, for
# compare and for score with several sets (whose plots/ is a folder).
# The second score case stops it after plots/ is drawn, before run.json
# (ten 200 ms pauses come first).
for cmd in compare score score-plots; do
    if [ $cmd = compare ]; then args=(compare --out "$TMP/int-$cmd" "$TMP/abc"); else
        args=(score --bootstrap 50 --pairs "$P" --out "$TMP/int-$cmd" "${sets[@]}"); fi
    VECGAUGE_TEST_SLOW_WRITE=1 "$VG_BIN" "${args[@]}" > /dev/null 2>&1 &
    if [ $cmd = score-plots ]; then glob="$TMP/.int-$cmd.tmp-*/plots/*.png"; else
        glob="$TMP/.int-$cmd.tmp-*"; fi
    interrupt_while_writing INT $! "$glob"
    left=$(ls -a "$TMP" | grep -c "int-$cmd")
    check "cmp-9 ($cmd): SIGINT mid-write exits 130 and leaves nothing (status $st, $left entries)" \
        test "$st" -eq 130 -a "$left" -eq 0
done

# cmp-10: analogy runs (hand-written fixtures, tests/fixtures/runs): by
# hand, 3CosAdd set-a is right on 3 of the 4 common questions and set-b
# on 2; only set-a is right on question 2 (McNemar p = 1).
expect_status "cmp-10: compare two analogy runs" 0 \
    "$VG_BIN" compare --methods 3cosadd,3cosmul --out "$TMP/ana" "$F/runs/ana-a" "$F/runs/ana-b"
expect_in "cmp-10b: the 3CosAdd row" \
    "mini-ana,analogy,3cosadd,set-a,set-b,6,4,2,4,4,0.75,0.5,0.25" "$TMP/ana/comparison.csv"
expect_in "cmp-10c: McNemar counts and p" ",1,0,1" "$TMP/ana/comparison.csv"
expect_in "cmp-10d: a 3CosMul row" "mini-ana,analogy,3cosmul" "$TMP/ana/comparison.csv"
done_testing
