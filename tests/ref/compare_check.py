#!/usr/bin/python3
"""compare_check.py - recompute vecgauge's comparison.csv from scratch with
numpy/scipy/statsmodels, for tests/e2e/compare_reference.sh.

Usage:
  compare_check.py ITEMS_CSV COMPARISON_CSV VGSTAT SEED B LEVEL ALPHA MODE

ITEMS_CSV holds every set's per-item records (a run directory's items.csv,
or several concatenated under one header); MODE is "common" or "as-is".
For every row of COMPARISON_CSV:
  - the items: common = the items every set covers; as-is = each set's own;
  - the scores: scipy.stats.spearmanr of rating and cosine, or the mean of
    the 0/1 answers of 3CosAdd;
  - the paired bootstrap: replicate r takes exactly the items `vgstat
    indices N B SEED SUITE` prints for it (vecgauge's resampling stream of
    the suite), recomputes both sets' statistic on the drawn items each
    covers (scipy.stats.spearmanr, or a mean) and subtracts;
  - the jackknife of the difference, leaving out each item in turn;
  - the percentile and BCa interval from the published formulas (Efron and
    Tibshirani 1993, eqs. 14.10, 14.14, 14.15; ties at the estimate count
    half, as scipy.stats.bootstrap does) with numpy.percentile and
    scipy.special.ndtr/ndtri;
  - the p-value of Hall and Wilson (1991) with the +1 correction of Davison
    and Hinkley (1997): (1 + #{|d* - d| >= |d|}) / (B' + 1) (from memory);
  - Steiger's (1980) Z1* (his eqs. 11 and 14, pooled r) from rho_a, rho_b
    and r_ab = spearmanr(cos_a, cos_b), divided by sqrt(1 + r^2 / 2), the
    variance factor of Fisher's z of Spearman's rho (Bonett and Wright 2000,
    from memory), with scipy.stats.norm;
  - analogy: the pair bootstrap's percentile interval (numpy.percentile)
    and its p, 2 Phi(-|d| / sd*) (scipy.stats.norm); the questions of these
    files share no word pair, so its draws are exactly those of the
    question bootstrap (the degenerate design, stats.h);
  - McNemar's exact p as scipy.stats.binomtest(min(b, c), b + c, 0.5);
  - Holm's adjustment and the rejections at ALPHA by
    statsmodels.stats.multitest.multipletests(method='holm').
Numbers must agree to 1e-12 (the same arithmetic on the same draws).
Prints one line per check; exit status 1 if any fails.
"""
import csv
import math
import subprocess
import sys

import numpy as np
from scipy import special, stats
from statsmodels.stats.multitest import multipletests

TOL = 1e-12
failures = 0


def check(name, got, want, tol=TOL):
    global failures
    if isinstance(want, str) or isinstance(got, str):
        ok = got == want
    elif want is None or (isinstance(want, float) and math.isnan(want)):
        ok = got is None or (isinstance(got, float) and math.isnan(got))
    else:
        ok = got is not None and not math.isnan(got) and abs(got - want) <= tol * max(1.0, abs(want))
    print(("ok   " if ok else "FAIL ") + "%s: vecgauge %r, reference %r" % (name, got, want))
    if not ok:
        failures += 1


def num(s):
    return float(s) if s != "" else float("nan")


def spearman(x, y):
    x, y = np.asarray(x, float), np.asarray(y, float)
    if len(x) < 2 or np.all(x == x[0]) or np.all(y == y[0]):
        return float("nan")
    return float(stats.spearmanr(x, y).correlation)


def bca(reps, theta, jack, level):
    reps = reps[~np.isnan(reps)]
    alpha = (1 - level) / 2
    pct = (np.percentile(reps, 100 * alpha), np.percentile(reps, 100 * (1 - alpha)))
    prop = ((reps < theta).sum() + (reps <= theta).sum()) / (2.0 * len(reps))
    z0 = special.ndtri(prop)
    u = jack.mean() - jack
    den = (u ** 2).sum()
    a = 0.0 if den == 0 else (u ** 3).sum() / (6 * den ** 1.5)
    out = []
    for z in (special.ndtri(alpha), special.ndtri(1 - alpha)):
        q = special.ndtr(z0 + (z0 + z) / (1 - a * (z0 + z)))
        out.append(np.percentile(reps, 100 * q) if np.isfinite(q) else float("nan"))
    return pct, tuple(out)


def steiger(rha, rhb, rab, n):
    r = (rha + rhb) / 2
    psi = rab * (1 - 2 * r * r) - 0.5 * r * r * (1 - 2 * r * r - rab * rab)
    c = psi / (1 - r * r) ** 2
    z = (math.atanh(rha) - math.atanh(rhb)) * math.sqrt(n - 3) / math.sqrt(2 - 2 * c)
    z /= math.sqrt(1 + r * r / 2)
    return z, 2 * stats.norm.sf(abs(z))


def main():
    items_path, cmp_path, vgstat, seed, B, level, alpha, mode = sys.argv[1:9]
    seed, B, level, alpha = int(seed), int(B), float(level), float(alpha)
    as_is = mode == "as-is"
    # Per suite: the items' ratings and every set's cosine / 0-1 answer.
    suites = {}
    for r in csv.DictReader(open(items_path, newline="")):
        s = suites.setdefault(r["suite"], {"task": r["task"], "n": 0, "rating": {}, "sets": {}})
        i = int(r["item"]) - 1
        s["n"] = max(s["n"], i + 1)
        if r["task"] == "similarity":
            s["rating"][i] = float(r["rating"])
            v = float(r["cosine"]) if r["status"] == "scored" and r["cosine"] != "" else np.nan
        else:
            v = float(r["3cosadd_correct"]) if r["3cosadd_correct"] != "" else np.nan
        s["sets"].setdefault(r["vectors"], {})[i] = v
    for s in suites.values():
        n = s["n"]
        s["x"] = np.array([s["rating"].get(i, 0.0) for i in range(n)])
        s["v"] = {k: np.array([d.get(i, np.nan) for i in range(n)]) for k, d in s["sets"].items()}
        s["common"] = np.all([~np.isnan(v) for v in s["v"].values()], axis=0)
    rows = list(csv.DictReader(open(cmp_path, newline="")))
    draws = {}
    for row in rows:
        sid = row["suite"]
        s = suites[sid]
        n = s["n"]
        if sid not in draws:
            out = subprocess.run([vgstat, "indices", str(n), str(B), str(seed), sid], check=True,
                                 capture_output=True, text=True).stdout
            draws[sid] = [np.array(list(map(int, l.split())), dtype=int) for l in out.split("\n") if l]
        a, b = row["set_a"], row["set_b"]
        used = {}
        for k in (a, b):
            u = ~np.isnan(s["v"][k])
            used[k] = u if as_is else s["common"]
        sim = s["task"] == "similarity"

        def stat(k, idx):
            idx = idx[used[k][idx]]
            if sim:
                return spearman(s["x"][idx], s["v"][k][idx])
            return float(s["v"][k][idx].mean()) if len(idx) else float("nan")

        allidx = np.arange(n)
        sa, sb = stat(a, allidx), stat(b, allidx)
        tag = "%s %s-%s" % (sid, a, b)
        check(tag + " score_a", num(row["score_a"]), sa)
        check(tag + " score_b", num(row["score_b"]), sb)
        d = sa - sb
        check(tag + " difference", num(row["difference"]), d)
        check(tag + " items compared", int(row["compared"]),
              int((used[a] | used[b]).sum()) if as_is else int(s["common"].sum()))
        if B > 0:
            reps = np.array([stat(a, idx) - stat(b, idx) for idx in draws[sid]])
            jack = np.array([stat(a, np.delete(allidx, i)) - stat(b, np.delete(allidx, i))
                             for i in range(n)])
            defined = reps[~np.isnan(reps)]
            p = (1 + (np.abs(defined - d) >= abs(d)).sum()) / (len(defined) + 1)
            check(tag + " bootstrap p", num(row["p_bootstrap"]), p)
            if sim:
                pct, bc = bca(reps, d, jack, level)
                want = bc if row["ci_method"] == "bca" else pct
                check(tag + " interval method", row["ci_method"],
                      "bca" if all(np.isfinite(bc)) else "percentile")
            else:
                # The pair bootstrap's percentile interval, and its test:
                # 2 Phi(-|d| / sd*), sd* the SD of the replicate differences.
                want = np.percentile(defined, [100 * (1 - level) / 2, 100 * (1 + level) / 2])
                check(tag + " interval method", row["ci_method"], "pair-bootstrap")
                check(tag + " test", row["test"], "pair-bootstrap")
                sd = defined.std(ddof=1)
                check(tag + " pair-bootstrap p (scipy norm)", num(row["p_value"]),
                      2 * stats.norm.sf(abs(d) / sd))
            check(tag + " ci_low", num(row["ci_low"]), want[0])
            check(tag + " ci_high", num(row["ci_high"]), want[1])
            check(tag + " replicates", int(row["replicates"]), len(defined))
        if sim:
            both = ~np.isnan(s["v"][a]) & ~np.isnan(s["v"][b])
            if not as_is:
                both = s["common"]
            rab = spearman(s["v"][a][both], s["v"][b][both])
            check(tag + " r_ab", num(row["r_ab"]), rab)
            rha = spearman(s["x"][both], s["v"][a][both])
            rhb = spearman(s["x"][both], s["v"][b][both])
            z, pz = steiger(rha, rhb, rab, int(both.sum()))
            check(tag + " Steiger Z1*", num(row["steiger_z"]), z, 1e-10)
            check(tag + " Steiger p", num(row["p_steiger"]), pz, 1e-9)
        else:
            both = used[a] & used[b]
            xa, xb = s["v"][a][both], s["v"][b][both]
            oa, ob = int(((xa == 1) & (xb == 0)).sum()), int(((xb == 1) & (xa == 0)).sum())
            check(tag + " only_a", int(row["only_a"]), oa)
            check(tag + " only_b", int(row["only_b"]), ob)
            pm = stats.binomtest(min(oa, ob), oa + ob, 0.5).pvalue if oa + ob else 1.0
            check(tag + " McNemar p (scipy binomtest)", num(row["p_mcnemar"]), pm)
    ps = [num(r["p_value"]) for r in rows]
    keep = [i for i, p in enumerate(ps) if not math.isnan(p)]
    if keep:
        rej, adj, _, _ = multipletests([ps[i] for i in keep], alpha=alpha, method="holm")
        for j, i in enumerate(keep):
            tag = "%s %s-%s" % (rows[i]["suite"], rows[i]["set_a"], rows[i]["set_b"])
            check(tag + " Holm p (statsmodels)", num(rows[i]["p_holm"]), float(adj[j]), 1e-15)
            check(tag + " significant (statsmodels reject)", rows[i]["significant"],
                  "1" if rej[j] else "0")
    sys.exit(1 if failures else 0)


if __name__ == "__main__":
    main()
