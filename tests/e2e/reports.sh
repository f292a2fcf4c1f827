#!/usr/bin/env bash
# reports.sh - the run directory's files: columns, CSV quoting read back by
# Python's csv module, hashes against coreutils sha256sum, run.json,
# rerun reproducing scores.csv byte for byte, well-formed summary.md and
# table.tex, and an interrupted run leaving nothing behind.
source "$(dirname "$0")/lib.bash"
F="$VG_FIXTURES"

# Awkward labels: a comma, a double quote, a newline, non-ASCII (the CSV
# rules of RFC 4180: quote fields holding these, double inner quotes).
label1=$'a,b "quoted"'
label2=$'caf\u00e9\nline'
"$VG_BIN" score --pairs "$F/pairs/basic.tsv" --out "$TMP/run" "$label1=$F/vectors/header.txt" \
    "$label2=$F/vectors/noheader.txt" > /dev/null 2> "$TMP/err"
check "score with awkward labels succeeds" test -f "$TMP/run/run.json"
for f in scores.csv items.csv missing.csv summary.md table.tex run.json; do
    if [ -s "$TMP/run/$f" ]; then ok "run directory holds $f"; else not_ok "run directory lacks $f"; fi
done
"$PY" - "$TMP/run" "$label1" "$label2" > "$TMP/py" 2>&1 <<'PYEOF'
import csv, json, sys
run, l1, l2 = sys.argv[1], sys.argv[2], sys.argv[3]
rows = list(csv.DictReader(open(run + "/scores.csv", newline="", encoding="utf-8")))
assert list(rows[0].keys()) == ["vectors", "suite", "subset", "task", "metric", "value", "ci_low",
    "ci_high", "ci_method", "n_items", "n_used", "coverage"], rows[0].keys()
labels = sorted({r["vectors"] for r in rows})
assert labels == sorted([l1, l2]), labels
for r in rows:
    assert abs(float(r["coverage"]) - int(r["n_used"]) / int(r["n_items"])) < 1e-15
items = list(csv.DictReader(open(run + "/items.csv", newline="", encoding="utf-8")))
assert {r["vectors"] for r in items} == {l1, l2}
assert len(items) == 2 * 5, len(items)
miss = [r for r in items if r["status"] == "missing_word"]
assert all(r["cosine"] == "" for r in miss), miss
j = json.load(open(run + "/run.json", encoding="utf-8"))
assert [s["label"] for s in j["vector_sets"]] == [l1, l2]
assert j["seed"] == j["options"]["seed"] and j["bootstrap_replicates"] == j["options"]["bootstrap"]
print("ok")
PYEOF
if grep -qx ok "$TMP/py"; then ok "CSV quoting, items.csv and run.json read back with Python's csv and json"; else
    not_ok "reading the run directory back with Python failed"; sed 's/^/# /' "$TMP/py"; fi

# Hashes recorded in run.json equal coreutils sha256sum.
"$PY" -c "
import json, sys
j = json.load(open('$TMP/run/run.json'))
for s in j['vector_sets']: print(s['sha256'], s['path'])
for s in j['suites']:
    for f in s['files']: print(f['sha256'], f['path'])" > "$TMP/hashes"
check "run.json hashes equal sha256sum's" sha256sum --quiet -c "$TMP/hashes"

# rerun: byte-identical scores.csv; refused when an input changed.
expect_status "rerun succeeds" 0 "$VG_BIN" rerun --out "$TMP/rerun" "$TMP/run"
check "rerun reproduces scores.csv byte for byte" cmp "$TMP/run/scores.csv" "$TMP/rerun/scores.csv"
check "rerun reproduces items.csv byte for byte" cmp "$TMP/run/items.csv" "$TMP/rerun/items.csv"
cp "$F/pairs/basic.tsv" "$TMP/pairs.tsv"
"$VG_BIN" score --pairs "$TMP/pairs.tsv" --out "$TMP/run2" "$F/vectors/header.txt" > /dev/null 2>&1
echo "alpha	beta	1" >> "$TMP/pairs.tsv"
expect_status "rerun refuses a changed input: exit 1" 1 "$VG_BIN" rerun --out "$TMP/rerun2" "$TMP/run2"
expect_in "the refusal names the changed file" "pairs.tsv: changed since the run" "$TMP/err"
check "the refused rerun wrote nothing" test ! -e "$TMP/rerun2"
echo '{"format": "something else"}' > "$TMP/bad.json"; mkdir -p "$TMP/badrun"; cp "$TMP/bad.json" "$TMP/badrun/run.json"
expect_status "rerun of a foreign run.json: exit 1" 1 "$VG_BIN" rerun --out "$TMP/rerun3" "$TMP/badrun"

# summary.md: every table row has as many cells as its header.
"$PY" - "$TMP/run/summary.md" > "$TMP/md" <<'PYEOF'
import sys
lines = open(sys.argv[1], encoding="utf-8").read().split("\n")
bad, i = [], 0
while i < len(lines):
    if lines[i].startswith("|") and i + 1 < len(lines) and lines[i + 1].startswith("|-"):
        width = lines[i].replace("\\|", "").count("|")
        j = i
        while j < len(lines) and lines[j].startswith("|"):
            if lines[j].replace("\\|", "").count("|") != width: bad.append(j + 1)
            j += 1
        i = j
    else:
        i += 1
print("bad rows: %s" % bad if bad else "ok")
PYEOF
if grep -qx ok "$TMP/md"; then ok "summary.md tables are well-formed"; else not_ok "summary.md: $(cat "$TMP/md")"; fi

# table.tex: braces balance and every \begin has its \end; compiled with
# pdflatex when a TeX installation is present.
"$PY" - "$TMP/run/table.tex" > "$TMP/tex" <<'PYEOF'
import re, sys
t = open(sys.argv[1], encoding="utf-8").read()
body = re.sub(r"\\[{}%]", "", "\n".join(l for l in t.split("\n") if not l.startswith("%")))
depth = 0
for ch in body:
    depth += (ch == "{") - (ch == "}")
    if depth < 0: break
begins, ends = re.findall(r"\\begin\{(\w+)\}", body), re.findall(r"\\end\{(\w+)\}", body)
print("ok" if depth == 0 and begins == ends[::-1] and "\\toprule" in t and "\\bottomrule" in t else "unbalanced")
PYEOF
if grep -qx ok "$TMP/tex"; then ok "table.tex is balanced booktabs"; else not_ok "table.tex is not balanced"; fi
if command -v pdflatex > /dev/null && kpsewhich booktabs.sty > /dev/null 2>&1; then
    printf '\\documentclass{article}\\usepackage{booktabs}\\usepackage[utf8]{inputenc}\\begin{document}\\input{%s}\\end{document}\n' "$TMP/run/table.tex" > "$TMP/doc.tex"
    check "table.tex compiles with pdflatex" pdflatex -interaction=nonstopmode -output-directory "$TMP" "$TMP/doc.tex"
else
    skip "no TeX installation with booktabs; table.tex not compiled"
fi

# --out in folders that do not exist yet: they are made (as mkdir -p).
"$VG_BIN" score --bootstrap 0 --pairs "$F/pairs/basic.tsv" --out "$TMP/new/deeper/run" \
    "$F/vectors/header.txt" > /dev/null 2>&1
check "--out makes missing parent folders" test -f "$TMP/new/deeper/run/run.json"

# SIGINT while the run directory is being written: nothing is left, not
# the run directory and not its temporary. SIGTERM likewise. The test
# hook's first pause comes just after the temporary directory is made, so
# the interrupt lands before the cleanup would be registered if signals
# were not held back until it is (a CI run once left the directory so).
for sig in INT TERM; do
    VECGAUGE_TEST_SLOW_WRITE=1 "$VG_BIN" score --pairs "$F/pairs/basic.tsv" --out "$TMP/int-$sig" \
        "$F/vectors/header.txt" > /dev/null 2>&1 &
    interrupt_while_writing "$sig" $! "$TMP/.int-$sig.tmp-*"
    status=$st
    left=$(ls -A "$TMP" | grep -c "int-$sig" || true)
    if [ "$status" -ne 0 ] && [ "$left" -eq 0 ]; then ok "SIG$sig during writing: exit $status, nothing left"; else
        not_ok "SIG$sig during writing left $left entries (exit $status)"; fi
done
done_testing
