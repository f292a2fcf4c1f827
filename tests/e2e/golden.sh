#!/usr/bin/env bash
# golden.sh - every output of every command is byte for byte what it was:
# score, compare, merge and track on the demo data and on the public
# suites in ../shared, against digests committed in tests/golden/.
#
# A change that means to change an output (a new column, a fixed
# statistic) regenerates the digests and says so in its commit:
#     VG_GOLDEN_UPDATE=1 tests/run --only golden
# A change that only moves code (a refactor) must leave them as they are.
# What names the machine or the build is normalised away first: run.json's
# and compare.json's git describe, working directory and argv[0], the tool
# line of summary.md and table.tex's comment, and the paths of the shared
# data and of the temporary directory. Plots are checked by name only (their
# bytes depend on the cairo and font versions).
source "$(dirname "$0")/lib.bash"
GOLDEN="$VG_ROOT/tests/golden"
export SOURCE_DATE_EPOCH=1796083200   # 2026-12-01T00:00:00Z: pinned times
W="$TMP/w"
mkdir -p "$W"

# The normalised text of one output file on stdout.
normalise() {
    case "$1" in
    *.json) "$PY" - "$1" "$SHARED" "$W" <<'PYEOF'
import json, sys
j = json.load(open(sys.argv[1]))
j.get("tool", {}).pop("git_describe", None)
j.pop("cwd", None)
# Whether a vector digest was computed or taken from the digest cache
# depends on when the file was last loaded, not on the output.
for vs in j.get("vector_sets", []):
    if isinstance(vs, dict):
        vs.pop("sha256_source", None)
if j.get("argv"):
    j["argv"][0] = "vecgauge"
s = json.dumps(j, indent=1, sort_keys=True)
print(s.replace(sys.argv[2], "SHARED").replace(sys.argv[3], "W"))
PYEOF
        ;;
    *) grep -v -e '^- tool: ' -e '^% Headline scores written by' "$1" |
        sed -e "s|$SHARED|SHARED|g" -e "s|$W|W|g" ;;
    esac
}

# digest NAME...: "sha256  name" of each output (files of directories,
# plots by name) relative to $W, in a stable order.
digest() {
    local f
    # (The names are globs, expanded inside $W.)
    for f in $(cd "$W" && find $@ -type f | LC_ALL=C sort); do
        case "$f" in
        *.png|*.svg) echo "plot  $f" ;;
        *.status) echo "exit $(cat "$W/$f")  $f" ;;
        *) echo "$(normalise "$W/$f" | sha256sum | cut -c1-64)  $f" ;;
        esac
    done
}

# run NAME COMMAND...: run in $W, keeping stdout as NAME.stdout.
run() {
    local name=$1; shift
    ( cd "$W" && "$@" ) > "$W/$name.stdout" 2> "$TMP/err"
    local st=$?
    echo "$st" > "$W/$name.status"
    [ "$st" -le 3 ] || { diag "$name: status $st"; sed 's/^/# /' "$TMP/err" | head -n 5; }
}

# check_against FILE DIGESTS: compare, naming the first files that differ.
check_against() {
    local want=$1 got=$2 label=$3
    if [ "${VG_GOLDEN_UPDATE:-0}" = 1 ] && [ "${VG_SANITIZED:-0}" = 0 ]; then
        cp "$got" "$want"
        ok "$label: digests written to ${want#"$VG_ROOT/"}"
        return
    fi
    if [ ! -f "$want" ]; then
        not_ok "$label: no committed digests (${want#"$VG_ROOT/"}); VG_GOLDEN_UPDATE=1 writes them"
        return
    fi
    if diff "$want" "$got" > "$TMP/diff"; then
        ok "$label: every output is byte-identical to the committed digests"
    else
        not_ok "$label: outputs differ from ${want#"$VG_ROOT/"} (an intended change regenerates it: VG_GOLDEN_UPDATE=1)"
        sed 's/^/# /' "$TMP/diff" | head -n 30
    fi
}

B="$VG_BIN"

# ---- the demo: candidates, a training run tracked, compared and merged ----
"$VG_BUILD/gen-demo" "$W/demo" > /dev/null
D=demo
run d-score "$B" score --bootstrap 200 --seed 5 --pairs $D/tidewater-pairs.tsv \
    --analogies $D/tidewater-analogies.txt --methods 3cosadd,3cosmul,pairdir,only_b \
    --out d-cand tide-full=$D/tide-full.txt tide-half=$D/tide-half.txt tide-quick=$D/tide-quick.txt
for i in 1 2 3 4 5 6; do
    run d-score$i "$B" score --bootstrap 200 --pairs $D/tidewater-pairs.tsv \
        --analogies $D/tidewater-analogies.txt --out d-ckpt$i tide-ckpt$i=$D/tide-ckpt$i.txt
done
for i in 1 2 3 4; do run d-track$i "$B" track --history d-hist.csv d-ckpt$i; done
run d-track5 "$B" track --history d-hist.csv --out d-trk5 d-ckpt5
run d-track6 "$B" track --history d-hist.csv --fail-on-regression --out d-trk6 d-ckpt6
run d-compare "$B" compare --out d-cmp d-ckpt4 d-ckpt5 d-ckpt6
run d-compare2 "$B" compare --no-common --methods 3cosadd,3cosmul --seed 9 --bootstrap 300 \
    --ci 0.9 --alpha 0.1 --out d-cmp2 d-ckpt1 d-ckpt6
run d-merge "$B" merge --out d-merged d-ckpt1 d-ckpt2 d-ckpt3
digest d-cand d-ckpt1 d-ckpt6 d-hist.csv d-hist-plots d-trk5 d-trk6 d-cmp d-cmp2 d-merged \
    'd-*.stdout' 'd-*.status' > "$TMP/demo.sha256"
check_against "$GOLDEN/demo.sha256" "$TMP/demo.sha256" "golden-1 demo"

# ---- the public suites: invented vectors over their real words ----
SUITES=ws353,ws353-sim,ws353-rel,simlex999,men3k,rw2034,simverb3500,mturk287,mturk771,rg65,mc30,yp130,verb143,card660,google-analogy,msr-analogy
if ! have_shared; then
    skip "golden-2 public suites: ../shared/public-benchmarks is absent"
elif [ "${VG_SANITIZED:-0}" = 1 ]; then
    # The digests do not depend on the build; the plain build checks them.
    skip "golden-2 public suites: checked by the plain build (slow under the sanitizers)"
else
    # Every word of the suites (missing.csv of a run on a one-word set),
    # then two sets with vectors drawn from sha256 of each word, each
    # leaving out a different tenth of the words so that coverage varies.
    printf '1 2\nzzzz 1 0\n' > "$W/one.txt"
    ( cd "$W" && "$B" score --data "$SHARED" --suite $SUITES --bootstrap 0 --out p-words one=one.txt ) \
        > /dev/null 2>&1
    "$PY" - "$W/p-words/missing.csv" "$W" <<'PYEOF'
import csv, hashlib, sys
words = sorted({r["word"] for r in csv.DictReader(open(sys.argv[1], newline=""))})
for name, salt in (("pa", "a"), ("pb", "b"), ("pc", "c")):
    rows = []
    for w in words:
        h = hashlib.sha256((salt + w).encode()).digest()
        if h[0] % 10 == 0:
            continue
        # A shared part from the word alone, so the sets agree somewhat.
        g = hashlib.sha256(w.encode()).digest()
        v = [((g[i] - 127.5) + 0.6 * (h[i + 1] - 127.5)) / 128 for i in range(24)]
        rows.append(w + " " + " ".join("%.5f" % x for x in v))
    with open(sys.argv[2] + "/" + name + ".txt", "w") as f:
        f.write("%d 24\n" % len(rows) + "\n".join(rows) + "\n")
PYEOF
    S=(--data "$SHARED" --suite "$SUITES" --bootstrap 200 --seed 11)
    run p-score "$B" score "${S[@]}" --out p-ab a=pa.txt b=pb.txt
    for s in a b c; do run p-score$s "$B" score "${S[@]}" --out p-$s $s=p$s.txt; done
    run p-compare "$B" compare --methods 3cosadd,3cosmul,pairdir,only_b --out p-cmp p-a p-b p-c
    run p-merge "$B" merge --out p-merged p-a p-b
    run p-track1 "$B" track --history p-hist.csv --no-plots p-a
    run p-track2 "$B" track --history p-hist.csv --no-plots --out p-trk2 p-b
    run p-track3 "$B" track --history p-hist.csv --no-plots --out p-trk3 p-c
    digest p-ab p-a p-b p-c p-cmp p-merged p-hist.csv p-trk2 p-trk3 'p-*.stdout' 'p-*.status' \
        > "$TMP/public.sha256"
    check_against "$GOLDEN/public.sha256" "$TMP/public.sha256" "golden-2 public suites"
fi
done_testing
