#!/usr/bin/env bash
# 20-bootstrap.sh - the similarity bootstrap: B = 10,000 replicates on a
# 3,000-pair suite (target: under 0.5 s on a 2-core machine), by thread
# count, for Spearman alone and for the three correlations a score row
# set carries (Spearman, Pearson, Kendall).
set -euo pipefail
b="$VG_BUILD/tests/vgbench"
[ -x "$b" ] || { echo "build $b first (make)"; exit 1; }
echo "| correlations | ratings | threads | median s | min s | max s |"
echo "|---|---|---:|---:|---:|---:|"
for kinds in spearman all; do
    for ties in men distinct; do
        for th in 1 2; do
            read -r med lo hi < <("$b" bootstrap 3000 10000 "$th" "$kinds" 7 "$ties")
            echo "| $kinds | $ties | $th | $med | $lo | $hi |"
        done
    done
done
echo
echo "n = 3000 pairs, B = 10000, median of 7 runs after a warm-up; 'men' = ratings on 51"
echo "values (MEN's 0-50 scale), 'distinct' = every rating distinct."
