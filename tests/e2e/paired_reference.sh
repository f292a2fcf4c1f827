#!/usr/bin/env bash
# paired_reference.sh - the paired tests against reference implementations:
# Steiger's Z and Williams' t against R's psych::r.test (r-cran-psych),
# McNemar's exact test against scipy.stats.binomtest, Holm's adjustment
# against statsmodels' multipletests (python3-statsmodels).
source "$(dirname "$0")/lib.bash"
T="$VG_BUILD/tests/vgpaired"

close() { # got want tol
    "$PY" -c "import sys, math; g, w = float('$1'), float('$2'); sys.exit(not (abs(g - w) <= $3 * max(1.0, abs(w))))"
}

if command -v Rscript > /dev/null && Rscript -e 'suppressMessages(library(psych))' > /dev/null 2>&1; then
    # (n, r_ha, r_hb, r_ab) cases: a typical suite comparison, a large
    # suite with close sets, a small suite, a negative correlation.
    for c in "353 0.65 0.58 0.80" "3000 0.71 0.70 0.93" "30 0.80 0.60 0.50" "999 0.35 0.42 0.62" "65 -0.20 0.30 0.10"; do
        set -- $c
        n=$1 a=$2 b=$3 ab=$4
        # Williams' t: psych's r.test(n, r12, r13, r23), the dependent
        # case sharing variable 1.
        ref=$(Rscript -e "suppressMessages(library(psych)); r <- r.test(n=$n, r12=$a, r13=$b, r23=$ab); cat(sprintf('%.17g %.17g', r\$t, r\$p))")
        got=$("$T" williams "$n" "$a" "$b" "$ab")
        check "Williams' t, n=$n r=($a, $b, $ab): t $(echo $got | cut -d' ' -f1) vs R $(echo $ref | cut -d' ' -f1)" \
            bash -c "$(declare -f close); PY=$PY; close $(echo $got | cut -d' ' -f1) $(echo $ref | cut -d' ' -f1) 1e-10 && close $(echo $got | cut -d' ' -f3) $(echo $ref | cut -d' ' -f2) 1e-9"
        # Steiger's Z without pooling: psych's r.test four-variable form
        # (pooled=FALSE) with variable 3 = variable 1 (r13 = 1, r14 = r_hb,
        # r23 = r_ha, r24 = r_ab) reduces algebraically to Steiger's (1980)
        # eq. 11 for the shared-variable case.
        ref=$(Rscript -e "suppressMessages(library(psych)); r <- r.test(n=$n, r12=$a, r34=$b, r13=1, r14=$b, r23=$a, r24=$ab, pooled=FALSE); cat(sprintf('%.17g %.17g', r\$z, r\$p))")
        got=$("$T" steiger-unpooled "$n" "$a" "$b" "$ab")
        check "Steiger's Z (unpooled), n=$n r=($a, $b, $ab): z $(echo $got | cut -d' ' -f1) vs R $(echo $ref | cut -d' ' -f1)" \
            bash -c "$(declare -f close); PY=$PY; close $(echo $got | cut -d' ' -f1) $(echo $ref | cut -d' ' -f1) 1e-10 && close $(echo $got | cut -d' ' -f2) $(echo $ref | cut -d' ' -f2) 1e-9"
        # Steiger's pooled Z1* (the one reported): his eq. 11 and 14
        # evaluated independently in Python, with scipy's normal tail.
        ref=$("$PY" -c "
import math
from scipy.stats import norm
n, a, b, s = $n, $a, $b, $ab
r = (a + b) / 2
psi = s * (1 - 2 * r * r) - 0.5 * r * r * (1 - 2 * r * r - s * s)
c = psi / (1 - r * r) ** 2
z = (math.atanh(a) - math.atanh(b)) * math.sqrt(n - 3) / math.sqrt(2 - 2 * c)
print('%.17g %.17g' % (z, 2 * norm.sf(abs(z))))")
        got=$("$T" steiger "$n" "$a" "$b" "$ab")
        check "Steiger's Z1* (pooled), n=$n r=($a, $b, $ab): z $(echo $got | cut -d' ' -f1) vs formula $(echo $ref | cut -d' ' -f1)" \
            bash -c "$(declare -f close); PY=$PY; close $(echo $got | cut -d' ' -f1) $(echo $ref | cut -d' ' -f1) 1e-12 && close $(echo $got | cut -d' ' -f2) $(echo $ref | cut -d' ' -f2) 1e-10"
    done
else
    skip "R with r-cran-psych is not installed (scripts/install-deps installs it)"
fi

if "$PY" -c 'import scipy.stats' 2> /dev/null; then
    for c in "12 3" "0 5" "40 40" "7 0" "150 121" "0 0" "1 2"; do
        set -- $c
        want=$("$PY" -c "from scipy.stats import binomtest; n=$1+$2; print('%.17g' % (binomtest(min($1,$2), n, 0.5).pvalue if n else 1.0))")
        got=$("$T" mcnemar "$1" "$2" | cut -d' ' -f2)
        check "McNemar exact, discordant ($1, $2): p $got vs scipy binomtest $want" close "$got" "$want" 1e-12
    done
else
    skip "python3-scipy is not installed"
fi

if "$PY" -c 'import statsmodels' 2> /dev/null; then
    for ps in "0.01 0.04 0.03 0.005" "0.2 0.2 0.2" "0.001 0.5 0.049 0.0125 0.9 0.02" "0.7"; do
        got=$("$T" holm $ps | tr '\n' ' ')
        want=$("$PY" -c "from statsmodels.stats.multitest import multipletests; print(' '.join('%.17g' % x for x in multipletests([float(x) for x in '$ps'.split()], method='holm')[1]))")
        check "Holm adjustment of ($ps) equals statsmodels multipletests(method='holm')" \
            "$PY" -c "import sys; g=[float(x) for x in '$got'.split()]; w=[float(x) for x in '$want'.split()]; sys.exit(not all(abs(a-b) <= 1e-15 for a, b in zip(g, w)) or len(g) != len(w))"
    done
else
    skip "python3-statsmodels is not installed"
fi
done_testing
