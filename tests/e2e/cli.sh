#!/usr/bin/env bash
# cli.sh - the command line's conventions: help, version, exit statuses,
# error messages with file and line, no half-written run directory.
source "$(dirname "$0")/lib.bash"
F="$VG_FIXTURES"

expect_status "--version exits 0" 0 "$VG_BIN" --version
expect_in "--version prints the library version" "vecgauge $(sed -n 's/#define VG_VERSION_STRING "\(.*\)"/\1/p' include/vecgauge/vg_config.h)" "$TMP/out"
expect_status "help exits 0" 0 "$VG_BIN" help
expect_in "help lists score" "score" "$TMP/out"
expect_status "score --help exits 0" 0 "$VG_BIN" score --help
expect_in "score --help shows usage" "Usage: vecgauge score" "$TMP/out"
expect_status "help --help exits 0 (help about help is the main help)" 0 "$VG_BIN" help --help
expect_in "help --help lists the commands" "compare" "$TMP/out"
expect_status "help score equals score --help" 0 "$VG_BIN" help score
expect_status "no command: usage error 2" 2 "$VG_BIN"
expect_status "unknown command: usage error 2" 2 "$VG_BIN" frobnicate
expect_in "unknown command names itself" "frobnicate" "$TMP/err"
expect_status "unknown option: usage error 2" 2 "$VG_BIN" score --no-such-option x
expect_in "errors are prefixed with the program name" "vecgauge score:" "$TMP/err"
expect_status "no vector set: usage error 2" 2 "$VG_BIN" score --pairs "$F/pairs/basic.tsv"
expect_status "bad --seed: usage error 2" 2 "$VG_BIN" score --seed -3 --pairs "$F/pairs/basic.tsv" "$F/vectors/header.txt"

# Bad input: exit 1, a message with file and line, nothing written.
expect_status "bad vector row: exit 1" 1 "$VG_BIN" score --pairs "$F/pairs/basic.tsv" --out "$TMP/run-bad" "$F/vectors/notnumber.txt"
expect_in "bad vector row: message names file:line" "notnumber.txt:3:" "$TMP/err"
if [ ! -e "$TMP/run-bad" ] && [ -z "$(ls -A "$TMP" | grep '^\.run-bad')" ]; then
    ok "bad input leaves no run directory and no temporary"; else not_ok "bad input left a run directory"; fi
expect_status "bad pair file: exit 1" 1 "$VG_BIN" score --pairs "$F/pairs/missing_column.txt" --out "$TMP/run-bad2" "$F/vectors/header.txt"
expect_in "bad pair file: message names file:line" "missing_column.txt:1:" "$TMP/err"

# A good run, then the same --out again: never overwritten.
expect_status "score writes a run directory" 0 "$VG_BIN" score --pairs "$F/pairs/basic.tsv" --out "$TMP/run" "$F/vectors/header.txt"
for f in scores.csv summary.md missing.csv; do
    if [ -s "$TMP/run/$f" ]; then ok "run directory has $f"; else not_ok "run directory lacks $f"; fi
done
expect_in "stdout has the headline table" "spearman" "$TMP/out"
cp "$TMP/run/scores.csv" "$TMP/scores.before"
expect_status "an existing run directory is not overwritten: exit 1" 1 "$VG_BIN" score --pairs "$F/pairs/basic.tsv" --out "$TMP/run" "$F/vectors/header.txt"
check "the existing run directory is unchanged" cmp "$TMP/scores.before" "$TMP/run/scores.csv"
expect_status "two sets with one label: usage error 2" 2 "$VG_BIN" score --pairs "$F/pairs/basic.tsv" --out "$TMP/run2" "$F/vectors/header.txt" "$F/vectors/header.txt"
expect_status "LABEL=PATH names sets apart" 0 "$VG_BIN" score --pairs "$F/pairs/basic.tsv" --out "$TMP/run3" a="$F/vectors/header.txt" b="$F/vectors/header.txt"
check "scores.csv header is the documented column list" \
    test "$(head -n 1 "$TMP/run3/scores.csv")" = "vectors,suite,subset,task,metric,value,ci_low,ci_high,ci_method,n_items,n_used,coverage"
done_testing
