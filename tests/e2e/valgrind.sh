#!/usr/bin/env bash
# valgrind.sh - valgrind memcheck on the demo run (both tasks, three vector
# sets): no error, no leak of any kind. Plain build only: the sanitizer
# build checks the same under ASan, and the two cannot run together.
# tests/valgrind.supp names the one block a library (pixman's load-time
# constructor) keeps for the life of the process.
source "$(dirname "$0")/lib.bash"
if [ "${VG_SANITIZED:-0}" = 1 ]; then
    skip "valgrind runs on the plain build (this one is checked by ASan)"
    done_testing; exit 0
fi
if ! command -v valgrind > /dev/null; then
    skip "valgrind is not installed (scripts/install-deps installs it)"
    done_testing; exit 0
fi
( cd "$TMP" && "$VG_ROOT/$VG_BUILD/gen-demo" demo ) || { not_ok "gen-demo failed"; done_testing; exit 0; }
D="$TMP/demo"
# A smaller bootstrap keeps the run within a minute under valgrind; the
# code paths are the same as with the default.
valgrind --error-exitcode=99 --leak-check=full --show-leak-kinds=all --errors-for-leak-kinds=all \
    --suppressions="$VG_ROOT/tests/valgrind.supp" \
    --track-fds=no "$VG_BIN" score --bootstrap 200 --pairs "$D/tidewater-pairs.tsv" \
    --analogies "$D/tidewater-analogies.txt" --out "$TMP/run" \
    tide-full="$D/tide-full.txt" tide-half="$D/tide-half.txt" tide-quick="$D/tide-quick.txt" \
    > /dev/null 2> "$TMP/vg.log"
status=$?
# With --errors-for-leak-kinds=all every block left at exit that the
# suppressions do not name is an error, so "0 errors" means no leak.
if [ "$status" -eq 0 ] && grep -q "ERROR SUMMARY: 0 errors" "$TMP/vg.log" &&
    { grep -q "All heap blocks were freed" "$TMP/vg.log" ||
        grep -q "still reachable: 0 bytes in 0 blocks" "$TMP/vg.log"; }; then
    ok "valgrind memcheck on the demo run: no errors, all heap blocks freed"
else
    not_ok "valgrind memcheck on the demo run (exit $status)"
    grep -E "ERROR SUMMARY|definitely|indirectly|possibly|still reachable|Invalid|uninitialised" "$TMP/vg.log" | head -n 20 | sed 's/^/# /'
fi
check "the run under valgrind wrote its run directory" test -f "$TMP/run/run.json"
done_testing
