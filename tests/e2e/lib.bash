# lib.bash - TAP helpers for the end-to-end tests (sourced, not run).
# Part of vecgauge; MIT licence, see LICENSE.
#
# Every script prints TAP lines through these helpers; tests/run counts
# them. VG_BIN is the vecgauge binary under test, VG_ROOT the checkout.
set -u
: "${VG_ROOT:=$(cd "$(dirname "${BASH_SOURCE[0]}")/../.." && pwd)}"
: "${VG_BUILD:=build}"
: "${VG_BIN:=$VG_BUILD/vecgauge}"
: "${VG_FIXTURES:=tests/fixtures}"
cd "$VG_ROOT" || exit 2
case "$VG_BIN" in /*) ;; *) VG_BIN="$VG_ROOT/$VG_BIN" ;; esac
case "$VG_FIXTURES" in /*) ;; *) VG_FIXTURES="$VG_ROOT/$VG_FIXTURES" ;; esac
PY=/usr/bin/python3          # Debian's python3, which has numpy and scipy
SHARED="$VG_ROOT/../shared/public-benchmarks"
TMP=$(mktemp -d "${TMPDIR:-/tmp}/vge2e.XXXXXX")
trap 'rm -rf "$TMP"' EXIT
# The digest cache of vector files (vecgauge keeps it under
# $XDG_CACHE_HOME/vecgauge): one per test script, never the user's.
export XDG_CACHE_HOME="$TMP/cache"
_n=0

ok() { _n=$((_n + 1)); echo "ok $_n - $*"; }
not_ok() { _n=$((_n + 1)); echo "not ok $_n - $*"; }
skip() { _n=$((_n + 1)); echo "ok $_n # SKIP $*"; }
diag() { echo "# $*"; }

# check NAME COMMAND...: ok when the command succeeds.
check() {
    local name=$1; shift
    if "$@" > "$TMP/check.out" 2>&1; then ok "$name"; else
        not_ok "$name"; sed 's/^/# /' "$TMP/check.out" | head -n 40; fi
}

# expect_status NAME STATUS COMMAND...: ok when the command exits with STATUS.
expect_status() {
    local name=$1 want=$2; shift 2
    "$@" > "$TMP/out" 2> "$TMP/err"
    local got=$?
    if [ "$got" -eq "$want" ]; then ok "$name"; else
        not_ok "$name (exit $got, expected $want)"; sed 's/^/# /' "$TMP/err" | head -n 20; fi
}

# expect_in NAME NEEDLE FILE: ok when FILE contains the fixed string NEEDLE.
expect_in() {
    if grep -qF -- "$2" "$3"; then ok "$1"; else
        not_ok "$1 ('$2' not in $(basename "$3"))"; sed 's/^/# /' "$3" | head -n 20; fi
}

# have_shared DIR: 0 when ../shared/public-benchmarks/DIR is present.
have_shared() { [ -d "$SHARED/${1:-}" ]; }

# interrupt_while_writing SIG PID TEMP_GLOB: send SIG to PID as soon as a
# path matching TEMP_GLOB (a run directory's temporary, or a file inside
# it) exists, polling every 20 ms for at most 60 s; then wait for PID and
# leave its exit status in $st. With VECGAUGE_TEST_SLOW_WRITE=1 the
# command pauses 200 ms before each file, so the signal lands mid-write
# however loaded the machine is (a fixed sleep does not).
interrupt_while_writing() {
    local sig=$1 pid=$2 glob=$3 i
    for i in $(seq 1 3000); do
        compgen -G "$glob" > /dev/null && break
        kill -0 "$pid" 2> /dev/null || break
        sleep 0.02
    done
    kill -s "$sig" "$pid" 2> /dev/null
    wait "$pid"
    st=$?
}

done_testing() { echo "1..$_n"; }
