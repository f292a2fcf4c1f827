#!/usr/bin/env bash
# 10-load.sh - loading speed and memory: text, binary, npy and gzip text,
# beside `cat FILE > /dev/null` and `zcat FILE > /dev/null` on the same
# page-cached file.
# Part of vecgauge; MIT licence, see LICENSE.
#
# Environment (all optional):
#   VG_BENCH_LOAD_SIZES  "ROWSxDIMS ..."   (default "400000x300 2000000x300")
#   VG_BENCH_LOAD_LAYOUTS "text binary npy gzip"  (default: all four)
#   VG_BENCH_REPS        timed runs per figure (default 5; 3 above 1M rows)
#   VG_BENCH_SEED        generator seed (default 1)
#   VG_BENCH_TOUCH_PAUSE seconds of pause before each fresh-memory timing (default 5)
# Files are generated with a fixed seed into $VG_BENCH_DIR/load, one at a
# time, and deleted after their rows are measured (2M x 300 text is about
# 5.5 GB). Each load runs in a fresh process (10-load.c) that reports the
# wall time of vg_vectors_load alone and the process's peak resident set.
# Figures: medians with the min-max spread; GB/s are of the file as
# stored (compressed bytes for gzip); "x cat" is the load's speed over
# cat's (zcat's for gzip) on the same file. A "(first write of fresh
# memory)" row per size times the first write of the matrix's bytes into
# new memory: any layout copied into the matrix cannot load faster.
# Text, binary and npy are then timed again with the file brought into
# the page cache by vecgauge's own first read (dropped from the cache
# first with dd iflag=nocache): text and npy are read through a mapping
# advised for huge pages, so the cache holds them in 2 MiB folios, which
# map with one entry each; binary is read with pread(), whose readahead
# fills large folios too; a file just written is held in small ones. The
# first read itself, from disk, gets a row of its own.
set -euo pipefail
cd "$(dirname "$0")/../.."
build=${VG_BUILD:-build}
dir=${VG_BENCH_DIR:-$build/bench}/load
mkdir -p "$dir"
seed=${VG_BENCH_SEED:-1}
sizes=${VG_BENCH_LOAD_SIZES:-"400000x300 2000000x300"}
layouts=${VG_BENCH_LOAD_LAYOUTS:-"text binary npy gzip"}
helper="$dir/10-load"

# The helper, against the library just built.
pkgs="openblas zlib libcrypto jansson libcurl libarchive cairo"
# shellcheck disable=SC2046
cc -std=c11 -O2 -D_GNU_SOURCE -Iinclude -o "$helper" scripts/bench.d/10-load.c "$build/libvecgauge.a" \
    -lgsl $(pkg-config --libs $pkgs) -lcsv -lunistring -lm -pthread

now() { date +%s.%N; }
load() { cut -d' ' -f1-3 /proc/loadavg; }

# median and spread of the numbers on stdin: "median min max"
stats() { sort -g | awk '{a[NR] = $1} END {m = NR % 2 ? a[(NR + 1) / 2] : (a[NR / 2] + a[NR / 2 + 1]) / 2; print m, a[1], a[NR]}'; }

# time_cmd N CMD...: N wall-clock timings of CMD (output discarded), one per line
time_cmd() {
    local n=$1 i t0 t1; shift
    for ((i = 0; i < n; i++)); do
        t0=$(now); "$@" > /dev/null; t1=$(now)
        awk -v a="$t0" -v b="$t1" 'BEGIN {printf "%.6f\n", b - a}'
    done
}

need_gb() { # free space check before generating a file of about $1 GB
    local avail
    avail=$(df -Pk "$dir" | awk 'NR == 2 {print $4}')
    if [ "$avail" -lt $(( ($1 + 2) * 1024 * 1024 )) ]; then
        echo "# not enough disk for a $1 GB file in $dir; skipped" >&2
        return 1
    fi
}

# timed_rows LABEL: a row per hash setting for $f, REPS timed loads each
# after one untimed one (fresh memory is slow to touch the first time).
timed_rows() {
    local label=$1 hash flag m lo hi pk mat nrows i
    for hash in on off; do
        flag=""; [ $hash = off ] && flag=--no-hash
        : > "$dir/runs"
        "$helper" load "$f" $flag > /dev/null
        for ((i = 0; i < reps; i++)); do "$helper" load "$f" $flag >> "$dir/runs"; done
        read -r m lo hi < <(sed 's/.*seconds=\([^ ]*\).*/\1/' "$dir/runs" | stats)
        read -r pk _ _ < <(sed 's/.*peak_kb=\([^ ]*\).*/\1/' "$dir/runs" | stats)
        mat=$(sed -n '1s/.*matrix_bytes=\([^ ]*\).*/\1/p' "$dir/runs")
        nrows=$(sed -n '1s/.*rows=\([^ ]*\).*/\1/p' "$dir/runs")
        awk -v set="$size" -v lay="$label" -v hash="$hash" -v bytes="$bytes" -v m="$m" -v lo="$lo" \
            -v hi="$hi" -v rows="$nrows" -v cat="$cat_m" -v ref="$ref" -v pk="$pk" -v mat="$mat" \
            -v la="$(load)" -v gz="$([ "$lay" = gzip ] && echo 1 || echo 0)" 'BEGIN {
            printf "| %s | %s | %s | %.2f | %.3f (%.3f-%.3f) | %.2f | %.2fM | %.2f | %.2f%s | %.0f | %.0f | %.3f | %s |\n",
                set, lay, hash, bytes / 1e9, m, lo, hi, bytes / m / 1e9, rows / m / 1e6,
                bytes / cat / 1e9, ref / m, gz ? " (of zcat)" : "", pk / 1024, mat / 1048576,
                pk * 1024 / mat, la }'
    done
}

echo "# helper: $helper; files in $dir; seed $seed; load average at start $(load)"
echo "# gzip files: gzip -6 (the default) of the text file"
echo
printf '| set | layout | hash | file GB | median s (min-max) | GB/s | rows/s | cat GB/s | x cat | peak RSS MiB | matrix MiB | RSS / matrix | load avg |\n'
printf '|---|---|---|---|---|---|---|---|---|---|---|---|---|\n'

for size in $sizes; do
    rows=${size%x*} dims=${size#*x}
    reps=${VG_BENCH_REPS:-$([ "$rows" -gt 1000000 ] && echo 3 || echo 5)}
    # The floor under any copy into a new matrix: the first write of that
    # much fresh memory, two threads, a new process each time, after a
    # pause (a VM hands freed memory back to its host within seconds;
    # written again at once, it is still there and looks fast).
    mbytes=$(( rows * dims * 4 ))
    : > "$dir/runs"
    for ((i = 0; i < reps; i++)); do sleep "${VG_BENCH_TOUCH_PAUSE:-5}"; "$helper" touch "$mbytes" >> "$dir/runs"; done
    read -r m lo hi < <(sed 's/.*seconds=\([^ ]*\).*/\1/' "$dir/runs" | stats)
    awk -v set="$size" -v b="$mbytes" -v m="$m" -v lo="$lo" -v hi="$hi" -v la="$(load)" 'BEGIN {
        printf "| %s | (first write of fresh memory, matrix size) | - | %.2f | %.3f (%.3f-%.3f) | %.2f | | | | | | | %s |\n",
            set, b / 1e9, m, lo, hi, b / m / 1e9, la }'
    for lay in $layouts; do
        case $lay in
        text) f="$dir/v$size.txt"; gen=text ;;
        binary) f="$dir/v$size.bin"; gen=binary ;;
        npy) f="$dir/v$size.npy"; gen=npy ;;
        gzip) f="$dir/v$size.txt.gz"; gen=text ;;
        *) echo "unknown layout $lay" >&2; exit 2 ;;
        esac
        gb=$(( rows * dims * 11 / 1000000000 + 1 ))
        need_gb "$gb" || continue
        if [ "$lay" = gzip ]; then
            "$helper" gen text "$rows" "$dims" "$seed" "$dir/v$size.tmp.txt"
            gzip -6 -c "$dir/v$size.tmp.txt" > "$f"
            rm -f "$dir/v$size.tmp.txt"
        else
            "$helper" gen "$gen" "$rows" "$dims" "$seed" "$f"
        fi
        bytes=$(stat -c %s "$f")
        cat "$f" > /dev/null; cat "$f" > /dev/null   # into the page cache
        [ "$lay" = npy ] && cat "${f%.npy}.vocab" > /dev/null
        read -r cat_m _ _ < <(time_cmd "$reps" cat "$f" | stats)
        ref=$cat_m
        if [ "$lay" = gzip ]; then
            read -r ref zlo zhi < <(time_cmd "$reps" zcat "$f" | stats)
            awk -v set="$size" -v b="$bytes" -v m="$ref" -v lo="$zlo" -v hi="$zhi" -v la="$(load)" 'BEGIN {
                printf "| %s | (zcat) | - | %.2f | %.3f (%.3f-%.3f) | %.2f | | | | | | | %s |\n",
                    set, b / 1e9, m, lo, hi, b / m / 1e9, la }'
        fi
        timed_rows "$lay"
        if [ "$lay" != gzip ]; then
            # The same file brought into the page cache by vecgauge's own
            # first read: the cache then holds it in large folios (2 MiB
            # ones for text and npy, read through a mapping advised for
            # huge pages), where a file just written is in small ones, and
            # text is then parsed straight from the mapping instead of
            # read() into buffers. That first read, from disk, is timed too.
            dd if="$f" iflag=nocache count=0 status=none   # out of the page cache
            : > "$dir/runs"
            "$helper" load "$f" --no-hash >> "$dir/runs"
            read -r m _ _ < <(sed 's/.*seconds=\([^ ]*\).*/\1/' "$dir/runs" | stats)
            awk -v set="$size" -v lay="$lay" -v b="$bytes" -v m="$m" -v la="$(load)" 'BEGIN {
                printf "| %s | %s (first load, from disk) | off | %.2f | %.3f | %.2f | | | | | | | %s |\n",
                    set, lay, b / 1e9, m, b / m / 1e9, la }'
            timed_rows "$lay (cached by a first load)"
        fi
        rm -f "$f" "${f%.npy}.vocab" "$dir/runs"
    done
done
echo
echo "# load average at the end $(load)"
