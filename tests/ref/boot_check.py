#!/usr/bin/python3
"""boot_check.py - check vecgauge's bootstrap against numpy/scipy, for
tests/e2e/stats_bootstrap.sh.

Usage:
  boot_check.py exact DATA INDICES VGSTAT LEVEL B SEED
      Recompute every replicate from the indices vecgauge draws (vgstat
      indices), with scipy.stats.spearmanr / numpy.corrcoef /
      scipy.stats.kendalltau on the drawn items whose y is defined; the
      jackknife by leaving each item out; then the percentile and BCa
      intervals from the published formulas (Efron and Tibshirani 1993,
      eqs. 14.10, 14.14, 14.15; the tie rule of scipy.stats.bootstrap)
      with numpy.percentile and scipy.special.ndtr/ndtri. Compares the
      replicates, the jackknife, z0, a and every endpoint with
      `vgstat replicates` and `vgstat bootstrap` to 1e-12.
  boot_check.py scipy DATA VGSTAT LEVEL B SEED K
      Statistical comparison with scipy.stats.bootstrap (paired, its own
      random draws, B resamples, methods 'percentile' and 'BCa'), for the
      correlations named in K (comma-separated). Two Monte Carlo runs of
      B replicates differ at a quantile p by about SE = (q(p + s) -
      q(p - s)) / 2 with s = sqrt(p (1 - p) / B) (the order-statistic
      spread; David and Nagaraja 2003, ch. 10), for each run; BCa
      endpoints also move with z0's own Monte Carlo error, which is about
      as large, so their SE is doubled. Tolerance: 4 * sqrt(2) * SE.
  boot_check.py se DATA VGSTAT B SEED LOW HIGH
      The bootstrap standard error of Pearson's r (vgstat bootstrap) lies
      in [LOW, HIGH].
Prints one line per check; exit status 1 if any fails.
"""
import subprocess
import sys

import numpy as np
from scipy import special, stats

NAMES = ["spearman", "pearson", "kendall"]


def load(path):
    d = np.loadtxt(path, ndmin=2)
    return d[:, 0], d[:, 1]


def corr(name, x, y):
    if len(x) < 2 or np.all(x == x[0]) or np.all(y == y[0]):
        return np.nan
    if name == "spearman":
        return stats.spearmanr(x, y).correlation
    if name == "pearson":
        return np.corrcoef(x, y)[0, 1]
    return stats.kendalltau(x, y).correlation


def run(args):
    return subprocess.run(args, check=True, capture_output=True, text=True).stdout


def vg_bootstrap(vgstat, data, B, seed, threads, level):
    out = {}
    for line in run([vgstat, "bootstrap", data, str(B), str(seed), str(threads),
                     repr(level)]).split("\n"):
        f = line.split()
        if not f:
            continue
        keys = ["value", "n", "replicates", "se", "pct_low", "pct_high", "z0", "accel",
                "bca_low", "bca_high", "fisher_low", "fisher_high"]
        out[f[0]] = dict(zip(keys, map(float, f[1:])))
    return out


def percentile_of_score(reps, theta):
    # Ties count half: ((reps < theta) + (reps <= theta)) / 2B, as in
    # scipy.stats.bootstrap's BCa.
    return ((reps < theta).sum() + (reps <= theta).sum()) / (2.0 * len(reps))


def bca(reps, theta, jack, level):
    alpha = (1 - level) / 2
    z0 = special.ndtri(percentile_of_score(reps, theta))
    u = jack.mean() - jack
    a = (u ** 3).sum() / (6 * ((u ** 2).sum()) ** 1.5) if (u ** 2).sum() > 0 else 0.0
    za = special.ndtri(alpha)
    a1 = special.ndtr(z0 + (z0 + za) / (1 - a * (z0 + za)))
    a2 = special.ndtr(z0 + (z0 - za) / (1 - a * (z0 - za)))
    return z0, a, np.percentile(reps, 100 * a1), np.percentile(reps, 100 * a2), a1, a2


class Checker:
    def __init__(self):
        self.bad = 0

    def close(self, what, got, want, tol):
        ok = abs(got - want) <= tol or (np.isnan(got) and np.isnan(want))
        print("%s %s: got %.17g want %.17g (tolerance %.3g)" %
              ("ok" if ok else "BAD", what, got, want, tol))
        self.bad += not ok


def exact(data, indices, vgstat, level, B, seed):
    x, y = load(data)
    n = len(x)
    idx = np.loadtxt(indices, dtype=np.int64, ndmin=2)
    assert idx.shape == (B, n), idx.shape
    lines = run([vgstat, "replicates", data, str(B), str(seed)]).split("\n")
    reps = np.array([[float(v) for v in l.split()] for l in lines[:B]])
    assert lines[B] == "jackknife"
    jack = np.array([[float(v) for v in l.split()] for l in lines[B + 1:B + 1 + n]])
    boot = vg_bootstrap(vgstat, data, B, seed, 2, level)
    defined = ~np.isnan(y)
    c = Checker()
    for k, name in enumerate(NAMES):
        want = np.array([corr(name, x[i[defined[i]]], y[i[defined[i]]]) for i in idx])
        diff = np.nanmax(np.abs(reps[:, k] - want))
        same_nan = np.array_equal(np.isnan(reps[:, k]), np.isnan(want))
        c.close("%s: max |replicate - scipy on the same draws| over %d" % (name, B),
                diff if same_nan else np.inf, 0, 1e-12)
        jw = []
        for i in range(n):
            keep = defined.copy()
            keep[i] = False
            jw.append(corr(name, x[keep], y[keep]))
        jw = np.array(jw)
        c.close("%s: max |jackknife - scipy|" % name, np.nanmax(np.abs(jack[:, k] - jw)), 0, 1e-12)
        theta = corr(name, x[defined], y[defined])
        b = boot[name]
        c.close("%s: estimate" % name, b["value"], theta, 1e-12)
        ok = want[~np.isnan(want)]
        alpha = (1 - level) / 2
        c.close("%s: percentile low" % name, b["pct_low"], np.percentile(ok, 100 * alpha), 1e-12)
        c.close("%s: percentile high" % name, b["pct_high"],
                np.percentile(ok, 100 * (1 - alpha)), 1e-12)
        z0, a, lo, hi, _, _ = bca(ok, theta, jw, level)
        c.close("%s: z0" % name, b["z0"], z0, 1e-12)
        c.close("%s: acceleration" % name, b["accel"], a, 1e-12)
        c.close("%s: BCa low" % name, b["bca_low"], lo, 1e-12)
        c.close("%s: BCa high" % name, b["bca_high"], hi, 1e-12)
        c.close("%s: replicates with a value" % name, b["replicates"], len(ok), 0)
    return c.bad


def avg_ranks(a, axis=-1):
    """Average ranks along axis, vectorised (scipy 1.10's rankdata loops in
    Python over the other axes, too slow for 20000 resamples); checked
    against scipy.stats.rankdata by check_avg_ranks."""
    a = np.moveaxis(np.asarray(a, dtype=float), axis, -1)
    o = np.argsort(a, axis=-1, kind="mergesort")
    s = np.take_along_axis(a, o, -1)
    n = s.shape[-1]
    idx = np.broadcast_to(np.arange(n), s.shape)
    new = np.ones(s.shape, bool)
    new[..., 1:] = s[..., 1:] != s[..., :-1]
    last = np.ones(s.shape, bool)
    last[..., :-1] = new[..., 1:]
    start = np.maximum.accumulate(np.where(new, idx, 0), axis=-1)
    end = np.minimum.accumulate(np.where(last, idx, n - 1)[..., ::-1], axis=-1)[..., ::-1]
    r = np.empty(s.shape)
    np.put_along_axis(r, o, (start + end) / 2 + 1, -1)
    return np.moveaxis(r, -1, axis)


def check_avg_ranks(x):
    rng = np.random.default_rng(0)
    rows = np.stack([x[rng.integers(0, len(x), len(x))] for _ in range(20)])
    want = np.stack([stats.rankdata(r) for r in rows])
    assert np.array_equal(avg_ranks(rows), want), "avg_ranks differs from scipy.stats.rankdata"


def vectorized(name):
    def pearson(a, b, axis=-1):
        a = a - a.mean(axis=axis, keepdims=True)
        b = b - b.mean(axis=axis, keepdims=True)
        return (a * b).sum(axis=axis) / np.sqrt((a * a).sum(axis=axis) * (b * b).sum(axis=axis))

    if name == "pearson":
        return pearson, True
    if name == "spearman":
        return (lambda a, b, axis=-1: pearson(avg_ranks(a, axis), avg_ranks(b, axis), axis)), True
    return (lambda a, b: stats.kendalltau(a, b).correlation), False


def mc_se(sorted_reps, p):
    B = len(sorted_reps)
    s = np.sqrt(p * (1 - p) / B)
    lo, hi = np.percentile(sorted_reps, [100 * max(p - s, 0), 100 * min(p + s, 1)])
    return (hi - lo) / 2


def compare_scipy(data, vgstat, level, B, seed, names):
    x, y = load(data)
    assert not np.isnan(y).any(), "the statistical comparison needs every y defined"
    check_avg_ranks(x)
    check_avg_ranks(y)
    boot = vg_bootstrap(vgstat, data, B, seed, 2, level)
    lines = run([vgstat, "replicates", data, str(B), str(seed)]).split("\n")
    reps = np.array([[float(v) for v in l.split()] for l in lines[:B]])
    c = Checker()
    alpha = (1 - level) / 2
    for name in names:
        k = NAMES.index(name)
        ours = np.sort(reps[~np.isnan(reps[:, k]), k])
        fn, vec = vectorized(name)
        kw = dict(paired=True, vectorized=vec, n_resamples=B, confidence_level=level,
                  random_state=np.random.default_rng(seed))
        if vec:
            kw["batch"] = 2000
        for method in ("percentile", "BCa"):
            res = stats.bootstrap((x, y), fn, method=method, **kw)
            lo, hi = res.confidence_interval.low, res.confidence_interval.high
            if method == "percentile":
                p_lo, p_hi, factor = alpha, 1 - alpha, 1
                got_lo, got_hi = boot[name]["pct_low"], boot[name]["pct_high"]
            else:
                # The BCa endpoints sit at our alpha1, alpha2.
                z0 = boot[name]["z0"]
                a = boot[name]["accel"]
                za = special.ndtri(alpha)
                p_lo = special.ndtr(z0 + (z0 + za) / (1 - a * (z0 + za)))
                p_hi = special.ndtr(z0 + (z0 - za) / (1 - a * (z0 - za)))
                factor = 2
                got_lo, got_hi = boot[name]["bca_low"], boot[name]["bca_high"]
            for side, got, want, p in (("low", got_lo, lo, p_lo), ("high", got_hi, hi, p_hi)):
                tol = 4 * np.sqrt(2) * factor * mc_se(ours, p)
                c.close("%s %s %s vs scipy.stats.bootstrap (B = %d each)" %
                        (name, method, side, B), got, want, tol)
    return c.bad


def main():
    mode = sys.argv[1]
    if mode == "exact":
        data, indices, vgstat = sys.argv[2:5]
        bad = exact(data, indices, vgstat, float(sys.argv[5]), int(sys.argv[6]), int(sys.argv[7]))
    elif mode == "scipy":
        data, vgstat = sys.argv[2:4]
        bad = compare_scipy(data, vgstat, float(sys.argv[4]), int(sys.argv[5]), int(sys.argv[6]),
                            sys.argv[7].split(","))
    elif mode == "se":
        data, vgstat = sys.argv[2:4]
        B, seed, lo, hi = int(sys.argv[4]), int(sys.argv[5]), float(sys.argv[6]), float(sys.argv[7])
        se = vg_bootstrap(vgstat, data, B, seed, 2, 0.95)["pearson"]["se"]
        ok = lo <= se <= hi
        print("%s bootstrap SE of Pearson's r = %.4f, expected in [%g, %g]" %
              ("ok" if ok else "BAD", se, lo, hi))
        bad = not ok
    else:
        sys.exit("boot_check.py: unknown mode " + mode)
    sys.exit(1 if bad else 0)


if __name__ == "__main__":
    main()
