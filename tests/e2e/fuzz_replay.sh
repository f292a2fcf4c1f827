#!/usr/bin/env bash
# fuzz_replay.sh - replay every saved fuzz input (the seed corpora in
# fuzz/corpus/TARGET and the crash regressions in fuzz/regressions/TARGET)
# through its target, in this build (plain, or ASan+UBSan): no crash, no
# sanitizer report, no leak.
source "$(dirname "$0")/lib.bash"
found=0
for r in "$VG_BUILD"/tests/fuzz_replay_*; do
    [ -x "$r" ] || continue
    found=1
    t=${r##*/fuzz_replay_}
    if "$r" "fuzz/corpus/$t" "fuzz/regressions/$t" > "$TMP/$t.tap" 2>&1; then
        ok "fuzz target $t: $(grep -c '^ok' "$TMP/$t.tap") saved inputs replay cleanly"
    else
        not_ok "fuzz target $t: a saved input fails"
        grep -v '^ok' "$TMP/$t.tap" | sed 's/^/# /' | head -n 40
    fi
done
[ "$found" -eq 1 ] || not_ok "no fuzz replay programs in $VG_BUILD/tests"
done_testing
