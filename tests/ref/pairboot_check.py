#!/usr/bin/python3
"""pairboot_check.py - check vecgauge's pair bootstrap (Owen 2007, the
pigeonhole bootstrap for crossed designs) against an independent numpy
implementation, for tests/e2e/stats_pairboot.sh.

Usage:
  pairboot_check.py design OUT SEED SHAPE
      Write a random design: one question a line, "stratum row col right
      used"; SHAPE is "crossed" (every ordered pair of distinct pairs of
      each stratum, as Google's and BATS's sections are built), "mixed"
      (some questions share pairs, some share none), "sparse" (150
      questions over 90 pairs, too sparse for the dense table) or
      "distinct" (no two questions share a pair).
  pairboot_check.py exact DESIGN VGSTAT B SEED
      From `vgstat pairboot`: numpy numbers the row and column levels of
      each stratum in order of first appearance, finds the isolated
      questions (row and column used by no other question) itself, checks
      that every draw has R, C and I multiplicities summing to R, C and I,
      forms each question's weight (w[row] v[col], or u for an isolated
      one) and each stratum's weighted totals with numpy, and requires
      exact equality with vecgauge's weights and sums.
  pairboot_check.py mc DESIGN VGSTAT B SEED
      Statistical: numpy's own pigeonhole bootstrap (numpy.random
      multinomial draws, B replicates) of the accuracy right / used over
      all strata against vecgauge's replicates: the standard deviations
      agree within Monte Carlo error (the SE of a sample SD is about
      SD / sqrt(2 B) for each run; tolerance 4 sqrt(2) of that), and the
      means within 4 sqrt(2) SD / sqrt(B).
  pairboot_check.py degenerate DESIGN VGSTAT B SEED STREAM
      A design where no pair is shared, in one stratum: the weights equal
      the multiplicities of the question bootstrap's draws (`vgstat
      indices`) on the same stream, replicate by replicate.
Prints one line per check; exit status 1 if any fails.
"""
import subprocess
import sys

import numpy as np


def read_design(path):
    d = np.loadtxt(path, dtype=np.int64, ndmin=2)
    return d[:, 0], d[:, 1], d[:, 2], d[:, 3:]


def run_vgstat(vgstat, design, B, seed, stream=None):
    args = [vgstat, "pairboot", design, str(B), str(seed), "2"]
    if stream:
        args.append(stream)
    out = subprocess.run(args, check=True, capture_output=True, text=True).stdout
    levels, draws, weights, sums = {}, {}, {}, {}
    for line in out.splitlines():
        f = line.split()
        if f[0] == "levels":
            levels[int(f[1])] = tuple(int(v) for v in f[2:5])
        elif f[0] == "draw":
            parts = " ".join(f[3:]).split("|")
            draws[(int(f[1]), int(f[2]))] = [np.array(p.split(), dtype=np.int64) for p in parts]
        elif f[0] == "weights":
            weights[int(f[1])] = np.array(f[2:], dtype=float)
        elif f[0] == "sums":
            sums[(int(f[1]), int(f[2]))] = np.array(f[3:], dtype=float)
    return levels, draws, weights, sums


def numpy_levels(stratum, row, col):
    """Levels in order of first appearance per stratum, and isolation."""
    n = len(stratum)
    key_r = list(zip(stratum, row))
    key_c = list(zip(stratum, col))
    uses_r, uses_c = {}, {}
    for i in range(n):
        uses_r[key_r[i]] = uses_r.get(key_r[i], 0) + 1
        uses_c[key_c[i]] = uses_c.get(key_c[i], 0) + 1
    iso = np.array([uses_r[key_r[i]] == 1 and uses_c[key_c[i]] == 1 for i in range(n)])
    lev_r, lev_c, lev = {}, {}, np.zeros((n, 2), dtype=np.int64)
    cnt = {}
    for i in range(n):
        s = stratum[i]
        R, C, I = cnt.get(s, (0, 0, 0))
        if iso[i]:
            lev[i] = (I, -1)
            I += 1
        else:
            if key_r[i] not in lev_r:
                lev_r[key_r[i]] = R
                R += 1
            if key_c[i] not in lev_c:
                lev_c[key_c[i]] = C
                C += 1
            lev[i] = (lev_r[key_r[i]], lev_c[key_c[i]])
        cnt[s] = (R, C, I)
    return iso, lev, cnt


def cmd_design(out, seed, shape):
    rng = np.random.default_rng(seed)
    rows = []
    if shape == "distinct":
        for q in range(40):
            rows.append((0, 2 * q, 2 * q + 1))
    elif shape == "sparse":  # few questions over many pairs: no dense table
        for q in range(150):
            rows.append((0, int(rng.integers(0, 90)), int(rng.integers(0, 90))))
    else:
        for s in range(3):
            k = int(rng.integers(4, 8))
            for i in range(k):
                for j in range(k):
                    if i != j and (shape == "crossed" or rng.random() < 0.5):
                        rows.append((s, i, j))
            if shape == "mixed":  # questions that share nothing
                for q in range(5):
                    rows.append((s, 100 + 2 * q, 101 + 2 * q))
    p = rng.uniform(0.2, 0.8, 1000)
    with open(out, "w") as fh:
        for s, r, c in rows:
            used = int(rng.random() < 0.9)
            right = int(used and rng.random() < (p[r % 1000] + p[(c + 500) % 1000]) / 2)
            fh.write(f"{s} {r} {c} {right} {used}\n")


def cmd_exact(design, vgstat, B, seed):
    stratum, row, col, x = read_design(design)
    iso, lev, cnt = numpy_levels(stratum, row, col)
    levels, draws, weights, sums = run_vgstat(vgstat, design, B, seed)
    ok = True
    S = int(stratum.max()) + 1
    for s in range(S):
        if levels[s] != cnt.get(s, (0, 0, 0)):
            print(f"FAIL levels of stratum {s}: vecgauge {levels[s]}, numpy {cnt.get(s)}")
            ok = False
    worst = 0.0
    for r in range(B):
        wq = np.zeros(len(stratum))
        for s in range(S):
            w, v, u = draws[(r, s)]
            R, C, I = cnt.get(s, (0, 0, 0))
            if len(w) != R or len(v) != C or len(u) != I or w.sum() != R or v.sum() != C \
                    or u.sum() != I:
                print(f"FAIL draw {r} stratum {s}: sizes or totals differ from {R} {C} {I}")
                ok = False
                continue
            for i in np.nonzero(stratum == s)[0]:
                wq[i] = u[lev[i, 0]] if iso[i] else w[lev[i, 0]] * v[lev[i, 1]]
            want = wq[stratum == s] @ x[stratum == s]
            worst = max(worst, float(np.max(np.abs(want - sums[(r, s)]))))
        worst = max(worst, float(np.max(np.abs(wq - weights[r]))))
    if worst != 0.0:
        print(f"FAIL weights or sums differ from numpy by up to {worst}")
        ok = False
    print(f"{'ok' if ok else 'FAIL'} exact: {B} replicates, {S} strata, weights and sums equal numpy")
    return ok


def cmd_mc(design, vgstat, B, seed):
    stratum, row, col, x = read_design(design)
    iso, lev, cnt = numpy_levels(stratum, row, col)
    _, _, _, sums = run_vgstat(vgstat, design, B, seed)
    S = int(stratum.max()) + 1
    ours = np.array([sum(sums[(r, s)][0] for s in range(S)) / sum(sums[(r, s)][1] for s in range(S))
                     for r in range(B)])
    rng = np.random.default_rng(seed + 1)
    theirs = np.empty(B)
    for b in range(B):
        wq = np.zeros(len(stratum))
        for s in range(S):
            R, C, I = cnt.get(s, (0, 0, 0))
            w = rng.multinomial(R, np.full(R, 1 / R)) if R else np.zeros(0)
            v = rng.multinomial(C, np.full(C, 1 / C)) if C else np.zeros(0)
            u = rng.multinomial(I, np.full(I, 1 / I)) if I else np.zeros(0)
            for i in np.nonzero(stratum == s)[0]:
                wq[i] = u[lev[i, 0]] if iso[i] else w[lev[i, 0]] * v[lev[i, 1]]
        theirs[b] = (wq @ x[:, 0]) / (wq @ x[:, 1])
    sd_o, sd_t = ours.std(ddof=1), theirs.std(ddof=1)
    tol_sd = 4 * np.sqrt(2) * sd_t / np.sqrt(2 * B)
    tol_mean = 4 * np.sqrt(2) * sd_t / np.sqrt(B)
    ok = abs(sd_o - sd_t) <= tol_sd and abs(ours.mean() - theirs.mean()) <= tol_mean
    print(f"{'ok' if ok else 'FAIL'} mc: sd {sd_o:.5f} vs numpy {sd_t:.5f} (tol {tol_sd:.5f}), "
          f"mean {ours.mean():.5f} vs {theirs.mean():.5f} (tol {tol_mean:.5f})")
    return ok


def cmd_degenerate(design, vgstat, B, seed, stream):
    stratum, row, col, x = read_design(design)
    n = len(stratum)
    _, _, weights, _ = run_vgstat(vgstat, design, B, seed, stream)
    out = subprocess.run([vgstat, "indices", str(n), str(B), str(seed), stream], check=True,
                         capture_output=True, text=True).stdout.split("\n")
    ok = True
    for r in range(B):
        counts = np.bincount(np.array(out[r].split(), dtype=np.int64), minlength=n)
        if not np.array_equal(counts, weights[r]):
            print(f"FAIL replicate {r}: weights differ from the question bootstrap's counts")
            ok = False
            break
    print(f"{'ok' if ok else 'FAIL'} degenerate: {B} replicates equal the question bootstrap")
    return ok


def main():
    cmd = sys.argv[1]
    if cmd == "design":
        cmd_design(sys.argv[2], int(sys.argv[3]), sys.argv[4])
        return 0
    if cmd == "exact":
        ok = cmd_exact(sys.argv[2], sys.argv[3], int(sys.argv[4]), int(sys.argv[5]))
    elif cmd == "mc":
        ok = cmd_mc(sys.argv[2], sys.argv[3], int(sys.argv[4]), int(sys.argv[5]))
    else:
        ok = cmd_degenerate(sys.argv[2], sys.argv[3], int(sys.argv[4]), int(sys.argv[5]),
                            sys.argv[6])
    return 0 if ok else 1


if __name__ == "__main__":
    sys.exit(main())
