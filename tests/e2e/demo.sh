#!/usr/bin/env bash
# demo.sh - the demo runs, shows a real difference between candidates,
# and the committed example run directory (results/example-demo) is what
# the demo produces now.
source "$(dirname "$0")/lib.bash"

work="$TMP/work"
mkdir -p "$work/build" "$work/results"
( cd "$work" && "$VG_ROOT/$VG_BUILD/gen-demo" build/demo ) ||
    { not_ok "gen-demo failed"; done_testing; exit 0; }
ok "gen-demo generates the Tidewater data"
# Same data twice: byte-identical (the generator is seeded).
( cd "$work" && "$VG_ROOT/$VG_BUILD/gen-demo" build/demo2 )
check "gen-demo is deterministic" diff -r "$work/build/demo" "$work/build/demo2"

( cd "$work" && SOURCE_DATE_EPOCH=1796083200 "$VG_BIN" score \
    --pairs build/demo/tidewater-pairs.tsv --analogies build/demo/tidewater-analogies.txt \
    --out results/example-demo \
    tide-full=build/demo/tide-full.txt tide-half=build/demo/tide-half.txt \
    tide-quick=build/demo/tide-quick.txt ) > "$TMP/out" 2> "$TMP/err"
check "the demo command succeeds" test -f "$work/results/example-demo/scores.csv"

# Compare every file with the committed example. What names the build or
# the machine may differ: the tool line of summary.md and table.tex's
# comment (version, git describe), and in run.json the git describe, the
# working directory and the path of the binary (argv[0]).
strip() {
    case "$1" in
    *.json) "$PY" -c "
import json, sys
j = json.load(open(sys.argv[1]))
j['tool'].pop('git_describe', None); j.pop('cwd', None); j['argv'][0] = 'vecgauge'
print(json.dumps(j, indent=1, sort_keys=True))" "$1" ;;
    *) grep -v -e '^- tool: ' -e '^% Headline scores written by' "$1" ;;
    esac
}
# Plots: pixels and glyph outlines depend on the cairo and font
# versions, so a plot must be there, of the same kind and size.
same_plot() {
    "$PY" - "$1" "$2" <<'PYEOF'
import re, struct, sys
def size(p):
    b = open(p, "rb").read()
    if b[:8] == b"\x89PNG\r\n\x1a\n":
        return ("png",) + struct.unpack(">II", b[16:24])
    m = re.search(rb'<svg[^>]*width="([^"]+)"[^>]*height="([^"]+)"', b)
    return ("svg", m.group(1), m.group(2)) if m else None
a, b = size(sys.argv[1]), size(sys.argv[2])
print(a, b)
sys.exit(a is None or a != b)
PYEOF
}
for f in $(cd results/example-demo && find . -type f | sed 's|^\./||' | sort); do
    case "$f" in
    *.png|*.svg)
        check "committed example $f: the demo draws the same kind and size of plot" \
            same_plot "results/example-demo/$f" "$work/results/example-demo/$f"
        continue ;;
    esac
    if diff <(strip "results/example-demo/$f") <(strip "$work/results/example-demo/$f") > "$TMP/diff"; then
        ok "committed example $f matches the demo's output"
    else
        not_ok "committed example $f differs from the demo's output (regenerate: scripts/demo build --example)"
        sed 's/^/# /' "$TMP/diff" | head -n 20
    fi
done

# The candidates genuinely differ: tide-quick is well below the others.
"$PY" - "$work/results/example-demo/scores.csv" > "$TMP/gap" <<'PYEOF'
import csv, sys
v = {r["vectors"]: float(r["value"]) for r in csv.DictReader(open(sys.argv[1]))
     if r["metric"] == "spearman" and r["subset"] == ""}
print("%.3f" % (min(v["tide-full"], v["tide-half"]) - v["tide-quick"]))
PYEOF
check "tide-quick trails both other candidates by more than 0.03 in rho ($(cat "$TMP/gap"))" \
    "$PY" -c "import sys; sys.exit(not float('$(cat "$TMP/gap")') > 0.03)"

# And on analogies (demo-3): tide-quick's 3CosAdd accuracy on all
# questions is far below both others, while tide-full and tide-half are
# within each other's Wilson interval (a noise-level difference).
"$PY" - "$work/results/example-demo/scores.csv" > "$TMP/agap" <<'PYEOF'
import csv, sys
rows = {r["vectors"]: r for r in csv.DictReader(open(sys.argv[1]))
        if r["metric"] == "3cosadd_all" and r["subset"] == ""}
v = {k: float(r["value"]) for k, r in rows.items()}
gap = min(v["tide-full"], v["tide-half"]) - v["tide-quick"]
f, h = rows["tide-full"], rows["tide-half"]
close = float(f["ci_low"]) <= v["tide-half"] <= float(f["ci_high"]) and \
        float(h["ci_low"]) <= v["tide-full"] <= float(h["ci_high"])
print("%.3f %d" % (gap, close))
PYEOF
read -r agap aclose < "$TMP/agap"
check "tide-quick trails both other candidates by more than 0.2 in 3CosAdd accuracy ($agap)" \
    "$PY" -c "import sys; sys.exit(not float('$agap') > 0.2)"
check "tide-full and tide-half lie within each other's Wilson interval on analogies" \
    test "$aclose" = 1
done_testing
