#!/usr/bin/env bash
# vectors_cli.sh - `vecgauge inspect` and the load options of `score`:
# layouts found, JSON keys, hashes against coreutils sha256sum, gzip made
# by gzip(1), pipes, errors with file and line.
source "$(dirname "$0")/lib.bash"
F="$VG_FIXTURES/vectors"

# ids: vcli-1..
expect_status "vcli-1 inspect text exits 0" 0 "$VG_BIN" inspect "$F/header.txt"
expect_in "vcli-1 names the layout" "text-header" "$TMP/out"
expect_in "vcli-1 says why" "count dims" "$TMP/out"
expect_in "vcli-1 counts the zero row" "all-zero rows:       1" "$TMP/out"
if [ ! -s "$TMP/err" ]; then ok "vcli-2 no progress line when stderr is not a terminal"; else
    not_ok "vcli-2 stderr not empty"; sed 's/^/# /' "$TMP/err"; fi

# vcli-3: --json has the keys the issue lists, and the row norms agree
# with NumPy's on the same rows (source: numpy.linalg.norm, Debian numpy).
expect_status "vcli-3 inspect --json exits 0" 0 "$VG_BIN" inspect --json "$F/header.txt"
cp "$TMP/out" "$TMP/header.json"
check "vcli-3 JSON keys and values (numpy norms as reference)" "$PY" - "$TMP/header.json" "$F/header.txt" <<'PY'
import json, sys, numpy as np
o = json.loads(open(sys.argv[1]).read())
for k in ["layout", "rows", "dims", "bytes", "duplicates", "zero_rows", "bad_rows",
          "words_with_spaces", "invalid_utf8", "norm_min", "norm_median", "norm_max"]:
    assert k in o, k
rows = [l.split() for l in open(sys.argv[2]).read().splitlines()[1:]]
m = np.array([[float(x) for x in r[1:]] for r in rows], dtype=np.float32)
n = np.linalg.norm(m.astype(np.float64), axis=1)
assert o["layout"] == "text-header" and o["rows"] == 4 and o["dims"] == 3, o
assert o["zero_rows"] == 1 and o["duplicates"] == 0
for key, want in [("norm_min", n.min()), ("norm_median", np.median(n)), ("norm_max", n.max())]:
    assert abs(o[key] - want) <= 1e-6 * max(1, abs(want)), (key, o[key], want)
PY

# vcli-4: sha256 of the file as stored equals coreutils sha256sum, for
# text, binary, gzip and npy (and the npy's vocabulary).
for f in header.txt basic.bin header.txt.gz basic.npy; do
    "$VG_BIN" inspect --json "$F/$f" > "$TMP/h.json" 2> "$TMP/h.err"
    want=$(sha256sum < "$F/$f" | cut -d' ' -f1)
    got=$("$PY" -c "import json,sys; print(json.load(open(sys.argv[1]))['sha256'])" "$TMP/h.json")
    check "vcli-4 sha256 of $f equals sha256sum" test "$got" = "$want"
done
want=$(sha256sum < "$F/basic.vocab" | cut -d' ' -f1)
got=$("$PY" -c "import json,sys; print(json.load(open(sys.argv[1]))['vocab_sha256'])" "$TMP/h.json")
check "vcli-4 vocabulary sha256 equals sha256sum" test "$got" = "$want"
"$VG_BIN" inspect --json --no-hash "$F/header.txt" > "$TMP/nh.json"
check "vcli-5 --no-hash gives sha256 null" "$PY" -c "import json,sys; assert json.load(open(sys.argv[1]))['sha256'] is None" "$TMP/nh.json"

# vcli-6: gzip(1) of each layout reads as the plain file does (magic
# bytes, not names: the copies are named .dat).
for f in header.txt basic.bin basic.npy; do
    gzip -c "$F/$f" > "$TMP/gz-$f.dat"
    [ "$f" = basic.npy ] && cp "$F/basic.vocab" "$TMP/gz-basic.npy.vocab"  # stem: the name less its last extension
    "$VG_BIN" inspect --json "$F/$f" > "$TMP/plain.json"
    "$VG_BIN" inspect --json "$TMP/gz-$f.dat" > "$TMP/gz.json" 2> "$TMP/gz.err"
    check "vcli-6 gzip of $f: same rows and norms, gzip noticed" "$PY" - "$TMP/plain.json" "$TMP/gz.json" <<'PY'
import json, sys
a, b = (json.load(open(p)) for p in sys.argv[1:3])
assert b["gzip"] is True and a["gzip"] is False, (a, b)
for k in ["layout", "rows", "dims", "zero_rows", "norm_min", "norm_median", "norm_max"]:
    assert a[k] == b[k], (k, a[k], b[k])
PY
done

# vcli-7: a pipe (process substitution), plain and gzip: read as it
# comes, hashed all the same.
"$VG_BIN" inspect --json <(cat "$F/header.txt") > "$TMP/p1.json" 2> "$TMP/p1.err"
"$VG_BIN" inspect --json <(gzip -c "$F/header.txt") > "$TMP/p2.json" 2> "$TMP/p2.err"
want=$(sha256sum < "$F/header.txt" | cut -d' ' -f1)
check "vcli-7 pipe: rows and sha256" "$PY" -c "
import json,sys; o=json.load(open(sys.argv[1])); assert o['rows']==4 and o['sha256']==sys.argv[2], o" "$TMP/p1.json" "$want"
check "vcli-7 gzip through a pipe: rows" "$PY" -c "
import json,sys; o=json.load(open(sys.argv[1])); assert o['rows']==4 and o['gzip'], o" "$TMP/p2.json"

# vcli-8: errors: file and line, exit 1; bad options exit 2.
expect_status "vcli-8 bad value: exit 1" 1 "$VG_BIN" inspect "$F/notnumber.txt"
expect_in "vcli-8 message names file:line:field" "notnumber.txt:3:3:" "$TMP/err"
expect_status "vcli-8 truncated header: exit 1" 1 "$VG_BIN" inspect "$F/short.txt"
expect_in "vcli-8 names both counts" "promises 5 rows but the file has 2" "$TMP/err"
expect_status "vcli-8 unknown --format: usage error 2" 2 "$VG_BIN" inspect --format word2vec "$F/header.txt"
expect_status "vcli-8 no file: usage error 2" 2 "$VG_BIN" inspect
expect_status "vcli-8 --max-words 0: usage error 2" 2 "$VG_BIN" inspect --max-words 0 "$F/header.txt"
expect_status "vcli-8 missing file: exit 1" 1 "$VG_BIN" inspect "$F/nope.txt"

# vcli-9: the quirk options.
expect_status "vcli-9 --skip-bad-rows: exit 0" 0 "$VG_BIN" inspect --skip-bad-rows "$F/notnumber.txt"
expect_in "vcli-9 counts the skipped row" "bad rows skipped:    1" "$TMP/out"
expect_status "vcli-9 --allow-short: exit 0" 0 "$VG_BIN" inspect --allow-short "$F/short.txt"
expect_status "vcli-9 --max-words 2" 0 "$VG_BIN" inspect --json --max-words 2 "$F/header.txt"
check "vcli-9 --max-words 2 reads 2 rows" "$PY" -c "import json,sys; assert json.load(open(sys.argv[1]))['rows']==2" "$TMP/out"
expect_status "vcli-9 --format text-header" 0 "$VG_BIN" inspect --format text-header "$F/header.txt"
expect_status "vcli-9 --vocab" 0 "$VG_BIN" inspect --vocab "$F/basic.vocab" "$F/novocab.npy"
expect_status "vcli-9 words with spaces counted" 0 "$VG_BIN" inspect --json "$F/spaces.txt"
check "vcli-9 words_with_spaces = 2" "$PY" -c "import json,sys; assert json.load(open(sys.argv[1]))['words_with_spaces']==2" "$TMP/out"

# vcli-10: score reads every layout alike: the same vectors as text and
# as .npy give the same scores.csv values.
cat > "$TMP/pairs.tsv" <<'TSV'
alpha	beta	1
alpha	gamma	5
beta	gamma	3
TSV
printf '3 3\nalpha 1 0 0.5\nbeta 0 -1.25 2\ngamma 0.25 0.5 1\n' > "$TMP/v.txt"
"$PY" - "$TMP" <<'PY'
import numpy as np, sys
np.save(sys.argv[1] + "/v.npy", np.array([[1, 0, 0.5], [0, -1.25, 2], [0.25, 0.5, 1]], dtype=">f8"))
open(sys.argv[1] + "/words.txt", "w").write("alpha\nbeta\ngamma\n")
PY
"$VG_BIN" score --pairs "$TMP/pairs.tsv" --out "$TMP/r1" --no-progress "$TMP/v.txt" > /dev/null 2>&1
expect_status "vcli-10 score a .npy with --vocab and --format" 0 "$VG_BIN" score --pairs "$TMP/pairs.tsv" --out "$TMP/r2" --format npy --vocab "$TMP/words.txt" "$TMP/v.npy"
check "vcli-10 same values from text and npy" test "$(cut -d, -f2- "$TMP/r1/scores.csv")" = "$(cut -d, -f2- "$TMP/r2/scores.csv")"
expect_status "vcli-10 score --skip-bad-rows" 0 "$VG_BIN" score --pairs "$F/../pairs/basic.tsv" --out "$TMP/r3" --skip-bad-rows "$F/notnumber.txt"
expect_status "vcli-10 score bad --format: usage 2" 2 "$VG_BIN" score --pairs "$TMP/pairs.tsv" --format xyz "$TMP/v.txt"
# vcli-11: on a terminal (a pseudo-terminal from script(1)) the progress
# line appears on stderr; --no-progress hides it.
if command -v script > /dev/null 2>&1; then
    big="$TMP/big.txt"
    "$PY" -c "
import random; random.seed(3)
with open('$big', 'w') as f:
    for i in range(40000): f.write('w%d %s\n' % (i, ' '.join('%.6f' % random.uniform(-1, 1) for _ in range(60))))"
    script -qc "'$VG_BIN' inspect '$big' > /dev/null" /dev/null > "$TMP/tty.out" 2>&1
    expect_in "vcli-11 progress line on a terminal" "MB of" "$TMP/tty.out"
    script -qc "'$VG_BIN' inspect --no-progress '$big' > /dev/null" /dev/null > "$TMP/tty2.out" 2>&1
    if ! grep -q "MB of" "$TMP/tty2.out"; then ok "vcli-11 --no-progress hides it"; else not_ok "vcli-11 --no-progress still drew"; fi
else
    skip "vcli-11 script(1) not available for a pseudo-terminal"
    skip "vcli-11 script(1) not available for a pseudo-terminal"
fi
done_testing
