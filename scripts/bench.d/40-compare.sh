#!/usr/bin/env bash
# 40-compare.sh - comparing and tracking: `vecgauge compare` on the demo's
# three candidates and on a 3,000-pair suite (B = 2000, the default), and
# 8 `track` processes appending to one history at once.
set -euo pipefail
bin="$VG_BIN"
dir="$VG_BENCH_DIR/compare"
rm -rf "$dir"
mkdir -p "$dir"
"$VG_BUILD/gen-demo" "$dir/demo" > /dev/null
D="$dir/demo"

# Wall-clock seconds of a command, 7 runs after a warm-up: "median min max".
time7() {
    local t=() s e
    "$@" > /dev/null 2>&1
    for _ in 1 2 3 4 5 6 7; do
        s=$(date +%s.%N)
        "$@" > /dev/null 2>&1
        e=$(date +%s.%N)
        t+=("$(echo "$e - $s" | bc)")
    done
    printf '%s\n' "${t[@]}" | sort -n | awk '{v[NR] = $1} END {printf "%.3f %.3f %.3f\n", v[4], v[1], v[7]}'
}

# A 3,000-pair suite over the demo vocabulary, ratings on MEN's 0-50 scale.
awk 'NR > 1 && NR <= 1501 {print $1}' "$D/tide-full.txt" > "$dir/words"
awk 'BEGIN {srand(3)} {w[NR] = $1} END {
    for (k = 0; k < 3000; k++) { i = int(rand() * NR) + 1; j = int(rand() * NR) + 1;
        if (i == j) { k--; continue } printf "%s\t%s\t%d\n", w[i], w[j], int(rand() * 51) } }' \
    "$dir/words" > "$dir/p3000.tsv"
for s in full half quick; do
    "$bin" score --pairs "$D/tidewater-pairs.tsv" --out "$dir/demo-$s" tide-$s="$D/tide-$s.txt" > /dev/null 2>&1
    "$bin" score --pairs "$dir/p3000.tsv" --out "$dir/big-$s" tide-$s="$D/tide-$s.txt" > /dev/null 2>&1
done

echo "| what | threads | median s | min s | max s |"
echo "|---|---:|---:|---:|---:|"
for th in 1 2; do
    read -r med lo hi < <(time7 bash -c "\"$bin\" compare -j $th --out \"$dir/t-\$\$-\$RANDOM\" \"$dir\"/demo-full \"$dir\"/demo-half \"$dir\"/demo-quick")
    echo "| compare, demo (240 pairs, 3 sets, 3 pairs of sets) | $th | $med | $lo | $hi |"
done
for th in 1 2; do
    read -r med lo hi < <(time7 bash -c "\"$bin\" compare -j $th --out \"$dir/t-\$\$-\$RANDOM\" \"$dir\"/big-full \"$dir\"/big-half" )
    echo "| compare, 3,000 pairs, 2 sets | $th | $med | $lo | $hi |"
    read -r med lo hi < <(time7 bash -c "\"$bin\" compare -j $th --out \"$dir/t-\$\$-\$RANDOM\" \"$dir\"/big-full \"$dir\"/big-half \"$dir\"/big-quick")
    echo "| compare, 3,000 pairs, 3 sets | $th | $med | $lo | $hi |"
done
for i in 1 2 3 4 5 6 7 8; do cp -r "$dir/demo-full" "$dir/job$i"; done
read -r med lo hi < <(time7 bash -c "h=\"$dir/h-\$\$-\$RANDOM.csv\"; seq 1 8 | xargs -P 8 -I{} \"$bin\" track --history \"\$h\" --no-plots \"$dir\"/job{}")
echo "| 8 concurrent track processes, one history (demo suite, no plots) | - | $med | $lo | $hi |"
read -r med lo hi < <(time7 bash -c "h=\"$dir/h-\$\$-\$RANDOM.csv\"; seq 1 8 | xargs -P 8 -I{} \"$bin\" track --history \"\$h\" \"$dir\"/job{}")
echo "| 8 concurrent track processes, with plots | - | $med | $lo | $hi |"
echo
echo "Wall-clock seconds, median of 7 runs after a warm-up, whole commands (reading the"
echo "run directories, the bootstrap, writing every file and plot). B = 2000 resamples."
rm -rf "$dir"
