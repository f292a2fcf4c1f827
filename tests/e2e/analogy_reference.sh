#!/usr/bin/env bash
# analogy_reference.sh - the four analogy methods against a straightforward
# numpy implementation (tests/ref/analogy_case.py, python3-numpy), question
# by question, on random data and on the real public suites; thread and
# kernel independence; the Wilson interval against statsmodels.
source "$(dirname "$0")/lib.bash"

VGA="$VG_ROOT/$VG_BUILD/tests/vganalogy"

# compare EXPECTED GOT: identical status and answers for every question and
# method. A difference is excused only where the reference itself has a
# near-tie (best minus second best under 1e-5), which float32 rounding may
# legitimately flip; the number excused is reported (it is 0 on these cases).
compare() {
    "$PY" - "$1" "$2" <<'PYEOF'
import sys
exp = [l.rstrip("\n").split("\t") for l in open(sys.argv[1])]
got = [l.rstrip("\n").split("\t") for l in open(sys.argv[2])]
if len(exp) != len(got):
    print("%d questions expected, %d answered" % (len(exp), len(got)))
    sys.exit(1)
bad = excused = 0
for i, (e, g) in enumerate(zip(exp, got)):
    if e[0] != g[0]:
        bad += 1
        print("question %d: status %s, expected %s" % (i + 1, g[0], e[0]))
        continue
    for m in range(4):
        if e[1 + m] != g[1 + m]:
            if float(e[5 + m]) < 1e-5:
                excused += 1
            else:
                bad += 1
                print("question %d, method %d: %s, expected %s (margin %s)"
                      % (i + 1, m, g[1 + m], e[1 + m], e[5 + m]))
print("%d questions, %d differences, %d excused near-ties" % (len(exp), bad, excused))
sys.exit(1 if bad else 0)
PYEOF
}

if ! "$PY" -c 'import numpy' 2>/dev/null; then
    skip "python3-numpy is not installed (scripts/install-deps installs it)"
    done_testing; exit 0
fi

# ref-1..3: random clustered vectors (3,000 rows, 24 dims, a zero row,
# questions with unknown and rare words): default, question words kept,
# and a candidate vocabulary of the first 1,500 rows.
run_case() { # name seed ref-args... -- vganalogy-args...
    local name=$1 seed=$2; shift 2
    local ref=() tool=()
    while [ $# -gt 0 ] && [ "$1" != -- ]; do ref+=("$1"); shift; done
    shift
    tool=("$@")
    mkdir -p "$TMP/$name"
    "$PY" tests/ref/analogy_case.py "$TMP/$name" "$seed" "${ref[@]}"
    "$VGA" answer "$TMP/$name/vectors.txt" "$TMP/$name/questions.txt" "${tool[@]}" \
        > "$TMP/$name/got" 2> "$TMP/$name/err"
    check "ref-$name: every answer of the four methods equals numpy's" \
        compare "$TMP/$name/expected" "$TMP/$name/got"
}
run_case excluded 1 --
run_case kept 2 --keep -- -k
run_case vocab 3 --vocab 1500 -- -n 1500

# ref-4: the same answers whatever the thread count (blocks handed out by
# a shared counter, merged by value then row) and whatever the kernels
# (AVX-512F, AVX2 with FMA, plain C perform the same IEEE operations).
ok_all=1
for j in 1 2 3 5; do
    "$VGA" answer "$TMP/excluded/vectors.txt" "$TMP/excluded/questions.txt" -j "$j" \
        > "$TMP/j$j" && cmp -s "$TMP/j$j" "$TMP/excluded/got" || ok_all=0
done
if [ "$ok_all" = 1 ]; then ok "ref-4: answers identical with 1, 2, 3 and 5 threads"; else
    not_ok "ref-4: answers depend on the thread count"; fi
for k in scalar avx2 avx512f; do
    if "$VGA" answer "$TMP/excluded/vectors.txt" "$TMP/excluded/questions.txt" -K "$k" \
        > "$TMP/k$k" 2> /dev/null; then
        check "ref-4: answers of the $k kernels identical to the default ones" \
            cmp "$TMP/k$k" "$TMP/excluded/got"
    else
        skip "ref-4: this CPU cannot run the $k kernels"
    fi
done

# ref-5, ref-6: the real suites of ../shared (read as distributed: mixed
# case, 14 sections; tab-separated CRLF with apostrophes), answered with
# random vectors for their own words plus 1,000 fillers.
ga="$SHARED/google-analogy/questions-words.txt"
if [ -f "$ga" ]; then
    mkdir -p "$TMP/google"
    "$PY" tests/ref/analogy_case.py "$TMP/google" 5 --questions "$ga"
    "$VGA" answer "$TMP/google/vectors.txt" "$ga" > "$TMP/google/got"
    check "ref-5: google-analogy, 19,544 questions: every answer equals numpy's" \
        compare "$TMP/google/expected" "$TMP/google/got"
else
    skip "ref-5: ../shared/public-benchmarks/google-analogy is absent (a fresh clone has no ../shared)"
fi
msr="$SHARED/msr-analogy/msr.txt"
if [ -f "$msr" ]; then
    mkdir -p "$TMP/msr"
    "$PY" tests/ref/analogy_case.py "$TMP/msr" 6 --keep --questions "$msr"
    "$VGA" answer "$TMP/msr/vectors.txt" "$msr" -k > "$TMP/msr/got"
    check "ref-6: msr-analogy, 8,000 questions, question words kept: every answer equals numpy's" \
        compare "$TMP/msr/expected" "$TMP/msr/got"
else
    skip "ref-6: ../shared/public-benchmarks/msr-analogy is absent (a fresh clone has no ../shared)"
fi

# ref-7: `vecgauge score --analogies` reports, per method, the accuracy on
# covered questions and on all questions that the reference's answers give
# (the suite's fourth word is the one accepted answer).
"$VG_BIN" score --analogies "$TMP/vocab/questions.txt" --analogy-vocab 1500 --bootstrap 50 \
    --out "$TMP/vocab/run" "$TMP/vocab/vectors.txt" > "$TMP/vocab/stdout" 2> "$TMP/vocab/stderr"
check "ref-7: accuracies in scores.csv follow from numpy's answers" "$PY" - \
    "$TMP/vocab/run/scores.csv" "$TMP/vocab/expected" "$TMP/vocab/questions.txt" <<'PYEOF'
import csv, sys
rows = {(r["subset"], r["metric"]): r for r in csv.DictReader(open(sys.argv[1]))}
exp = [l.rstrip("\n").split("\t") for l in open(sys.argv[2])]
answers = [l.split()[3] for l in open(sys.argv[3]) if l.strip() and not l.startswith(":")]
covered = [e[0] == "scored" for e in exp]
bad = []
for m, name in enumerate(("3cosadd", "3cosmul", "pairdir", "only_b")):
    right = sum(1 for e, a in zip(exp, answers) if e[0] == "scored" and e[1 + m] == a)
    want = {name: right / sum(covered), name + "_all": right / len(exp)}
    for k, v in want.items():
        got = float(rows[("", k)]["value"])
        if abs(got - v) > 1e-12:
            bad.append("%s: %.17g, expected %.17g" % (k, got, v))
    r = rows[("", name)]
    if int(r["n_used"]) != sum(covered) or int(r["n_items"]) != len(exp):
        bad.append("%s counts %s/%s" % (name, r["n_used"], r["n_items"]))
print("\n".join(bad))
sys.exit(1 if bad else 0)
PYEOF
expect_in "ref-7: summary.md records the candidate vocabulary" \
    "the first 1500 rows of each vector set" "$TMP/vocab/run/summary.md"

"$VG_BIN" score --analogies "$TMP/kept/questions.txt" --keep-question-words --bootstrap 0 \
    --out "$TMP/kept/run" "$TMP/kept/vectors.txt" > "$TMP/kept/stdout" 2> /dev/null
expect_in "ref-8: summary.md says when question words were kept" "**Question words kept**" \
    "$TMP/kept/run/summary.md"
expect_in "ref-8: the stdout table says so too" "question words kept" "$TMP/kept/stdout"
expect_status "ref-9: --analogy-vocab with a bad value is a usage error" 2 \
    "$VG_BIN" score --analogies "$TMP/kept/questions.txt" --analogy-vocab many \
    --out "$TMP/never" "$TMP/kept/vectors.txt"

# ref-10: the Wilson interval against statsmodels' proportion_confint
# (method="wilson"), python3-statsmodels.
if "$PY" -c 'import statsmodels' 2>/dev/null; then
    check "ref-10: vg_stats_wilson equals statsmodels to 1e-12 on 40 cases" "$PY" - "$VGA" <<'PYEOF'
import subprocess, sys
from statsmodels.stats.proportion import proportion_confint
bad = 0
for k, n in [(0, 1), (1, 1), (0, 7), (3, 7), (7, 7), (81, 263), (15, 148), (1, 29),
             (12345, 19544), (19544, 19544)]:
    for level in (0.8, 0.9, 0.95, 0.99):
        out = subprocess.run([sys.argv[1], "wilson", str(k), str(n), repr(level)],
                             capture_output=True, text=True).stdout.split()
        lo, hi = proportion_confint(k, n, alpha=1 - level, method="wilson")
        if abs(float(out[0]) - lo) > 1e-12 or abs(float(out[1]) - hi) > 1e-12:
            bad += 1
            print(k, n, level, out, lo, hi)
sys.exit(1 if bad else 0)
PYEOF
else
    skip "ref-10: python3-statsmodels is not installed (scripts/install-deps installs it)"
fi
done_testing
