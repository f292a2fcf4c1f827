#!/usr/bin/env bash
# analogy_cli.sh - `vecgauge score --analogies`: options, the rows loaded,
# bad input, determinism and both tasks in one run.
source "$(dirname "$0")/lib.bash"

# A small set: 12 words in 4 dims, written by hand (cli-1 ... cli-9).
cat > "$TMP/vec.txt" <<'V'
12 4
king 1 1 0 0
queen 1 0 1 0
man 0 1 0 0.1
woman 0 0 1 0.1
boy 0 1 0 1
girl 0 0 1 1
prince 1 1 0 1
princess 1 0 1 1
apple 0 0 0 1
pear 0 0.1 0 1
noun 0.3 0.3 0.3 0.3
verb 0.2 0.2 0.1 0.3
V
cat > "$TMP/ana.txt" <<'Q'
: royal
man woman king queen
boy girl prince princess
: missing
man woman pear nosuchword
Q
printf 'king\tqueen\t7\nman\twoman\t6\napple\tpear\t8\n' > "$TMP/pairs.tsv"

expect_status "cli-1: --analogies alone scores a run" 0 \
    "$VG_BIN" score --analogies "$TMP/ana.txt" --bootstrap 100 --out "$TMP/r1" "$TMP/vec.txt"
expect_in "cli-1: stdout lists the four methods" "only_b" "$TMP/out"
# man:woman::king:? -> queen (3CosAdd 1.204, next princess 0.983) and
# boy:girl::prince:? -> princess (1.075, next queen 0.908): numpy on these
# vectors, computed while writing the test.
check "cli-2: 3cosadd accuracy is 1 on the covered questions (2/2), 2/3 on all" "$PY" - "$TMP/r1/scores.csv" <<'PYEOF'
import csv, sys
rows = {(r["subset"], r["metric"]): r for r in csv.DictReader(open(sys.argv[1]))}
r, a = rows[("", "3cosadd")], rows[("", "3cosadd_all")]
ok = float(r["value"]) == 1.0 and abs(float(a["value"]) - 2 / 3) < 1e-15 and \
     r["n_used"] == "2" and r["n_items"] == "3" and r["ci_method"] == "pair-bootstrap" and \
     rows[("royal", "3cosadd")]["n_items"] == "2" and rows[("missing", "3cosadd")]["n_used"] == "0"
sys.exit(0 if ok else 1)
PYEOF
expect_in "cli-3: summary.md has the analogy table" "## Analogies: accuracy" "$TMP/r1/summary.md"
expect_in "cli-3: summary.md says question words are excluded" "excluded (common practice)" "$TMP/r1/summary.md"
expect_in "cli-3: summary.md records the candidates" "the first 300000 rows of each vector set (rows used: vec 12)" "$TMP/r1/summary.md"

expect_status "cli-4: the same run again" 0 \
    "$VG_BIN" score --analogies "$TMP/ana.txt" --bootstrap 100 --out "$TMP/r2" -j 1 "$TMP/vec.txt"
check "cli-4: scores.csv is byte-identical with 1 thread and the default" cmp "$TMP/r1/scores.csv" "$TMP/r2/scores.csv"

# Both tasks: a vocabulary of 4 rows keeps the first 4 rows and the words
# of the pairs (apple, pear), so apple/pear are loaded but not candidates.
expect_status "cli-5: pairs and analogies in one run, --analogy-vocab 4" 0 \
    "$VG_BIN" score --pairs "$TMP/pairs.tsv" --analogies "$TMP/ana.txt" --analogy-vocab 4 \
    --bootstrap 0 --out "$TMP/r3" "$TMP/vec.txt"
expect_in "cli-5: the loader kept the first 4 rows and the pair words" "(6 rows kept" "$TMP/r3/summary.md"
check "cli-5: scores.csv holds both tasks, similarity first" "$PY" - "$TMP/r3/scores.csv" <<'PYEOF'
import csv, sys
tasks = [r["task"] for r in csv.DictReader(open(sys.argv[1]))]
rows = {(r["subset"], r["metric"]): r for r in csv.DictReader(open(sys.argv[1])) if r["task"] == "analogy"}
ok = tasks[0] == "similarity" and tasks[-1] == "analogy" and rows[("", "3cosadd")]["n_used"] == "1"
sys.exit(0 if ok else 1)
PYEOF
expect_status "cli-6: --analogy-vocab 0 takes every row" 0 \
    "$VG_BIN" score --analogies "$TMP/ana.txt" --analogy-vocab 0 --bootstrap 0 --out "$TMP/r4" "$TMP/vec.txt"
expect_in "cli-6: summary.md says so" "every row of each vector set" "$TMP/r4/summary.md"

# Bad input: exit 1, file and line, nothing written.
printf ': s\nman woman king\n' > "$TMP/bad.txt"
expect_status "cli-7: a question of three words: exit 1" 1 \
    "$VG_BIN" score --analogies "$TMP/bad.txt" --out "$TMP/rbad" "$TMP/vec.txt"
expect_in "cli-7: the message names file and line" "bad.txt:2:" "$TMP/err"
if [ ! -e "$TMP/rbad" ]; then ok "cli-7: no run directory"; else not_ok "cli-7: a run directory was left"; fi
expect_status "cli-8: a missing analogy file: exit 1" 1 \
    "$VG_BIN" score --analogies "$TMP/none.txt" --out "$TMP/rbad" "$TMP/vec.txt"
expect_status "cli-9: --analogy-vocab -1 is a usage error" 2 \
    "$VG_BIN" score --analogies "$TMP/ana.txt" --analogy-vocab -1 --out "$TMP/rbad" "$TMP/vec.txt"
done_testing
