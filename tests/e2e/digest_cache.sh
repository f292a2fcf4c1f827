#!/usr/bin/env bash
# digest_cache.sh - the digest cache of vector files through the command:
# a miss computes the sha256 and records it, a hit takes it, a changed
# file misses, a file rewritten within the same second is hashed again,
# --rehash computes it whatever the cache holds; run.json says which.
# The digests are checked against sha256sum (GNU coreutils).
source "$(dirname "$0")/lib.bash"

pairs="$TMP/p.tsv"
printf 'a\tb\t1\nb\tc\t2\na\tc\t3\n' > "$pairs"
vec="$TMP/v.txt"
printf '3 2\na 1 0\nb 0 1\nc 1 1\n' > "$vec"

# source DIR: the vector set's sha256 and where it came from.
source_of() {
    "$PY" -c 'import json, sys
v = json.load(open(sys.argv[1] + "/run.json"))["vector_sets"][0]
print(v["sha256"], v["sha256_source"])' "$1"
}
score() { # extra options...: a run, its "sha256 source" on stdout
    local out
    out=$(mktemp -d -u "$TMP/rXXXXXX")
    "$VG_BIN" score --no-progress --bootstrap 0 --pairs "$pairs" --out "$out" "$@" v="$vec" \
        > /dev/null 2>&1 && source_of "$out"
}
want=$(sha256sum "$vec" | cut -c1-64)

# digest-e2e-1: just written, the file is hashed; so is it a moment later,
# since an entry cached within 2 s of the file's last change is racy.
expect_in "digest-e2e-1: a first load computes the digest" "$want computed" <(score)
expect_in "digest-e2e-1: racy entry (file just written): computed again" "$want computed" <(score)
# digest-e2e-2: once the file is older than the margin, a load records a
# trusted entry and the next takes it.
sleep 3
score > /dev/null
expect_in "digest-e2e-2: the unchanged file's digest comes from the cache" "$want cache" <(score)
# digest-e2e-3: --rehash computes it whatever the cache holds.
expect_in "digest-e2e-3: --rehash computes the digest" "$want computed" <(score --rehash)
# digest-e2e-4: rewritten within the same second, same size, its
# modification time set back to what it was: the identity still differs
# (status-change time), or the entry is racy; the digest is the new one.
mt=$(stat -c %y "$vec")
printf '3 2\na 1 0\nb 0 1\nc 1 2\n' > "$vec"
touch -d "$mt" "$vec"
want2=$(sha256sum "$vec" | cut -c1-64)
expect_in "digest-e2e-4: a file rewritten in the same second is hashed again" "$want2 computed" <(score)
# digest-e2e-5: --no-hash records no digest and no source.
"$VG_BIN" score --no-progress --no-hash --bootstrap 0 --pairs "$pairs" --out "$TMP/nohash" v="$vec" \
    > /dev/null 2>&1
check "digest-e2e-5: --no-hash: sha256 and its source are null" "$PY" -c 'import json, sys
v = json.load(open(sys.argv[1] + "/run.json"))["vector_sets"][0]
sys.exit(0 if v["sha256"] is None and v["sha256_source"] is None else 1)' "$TMP/nohash"
check "digest-e2e-6: the cache lives under XDG_CACHE_HOME/vecgauge/digests" \
    test -n "$(ls "$XDG_CACHE_HOME/vecgauge/digests")"

done_testing
