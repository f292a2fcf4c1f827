#!/usr/bin/python3
"""width_study.py - how much wider the pair bootstrap's analogy interval is
than Wilson's, on the public analogy suites, with planted vectors.

Usage: scripts/width_study.py VECGAUGE SHARED_DIR WORK_DIR [SEED]

Writes a binary vector file of 100,000 x 300 invented vectors into WORK_DIR:
every word of the Google, MSR and BATS 3.0 questions, then random
distractors. Each section (relation) gets an offset; a pair (x, y) of it
gets y = x + offset + noise, the noise's size drawn per pair (log-normal),
so that some pairs are easy and some hard, as in real vectors. Then it
scores the three suites with VECGAUGE (2000 replicates) and prints, per
suite and for its whole-suite 3CosAdd accuracy, the Wilson width, the
pair-bootstrap width and their ratio. Invented data: the widths depend on
the vectors; the ratio shows how much sharing pairs matters.
Needs numpy (Debian's python3-numpy).
"""
import csv
import os
import subprocess
import sys

import numpy as np


def google_pairs(path):
    sec, out = None, []
    for line in open(path, encoding="utf-8"):
        if line.startswith(":"):
            sec = line[1:].strip()
            continue
        a, b, c, d = line.split()
        out += [(sec, a, b), (sec, c, d)]
    return out


def msr_pairs(path):
    out = []
    for line in open(path, encoding="utf-8"):
        f = line.split()
        if len(f) == 4:
            out += [("msr", f[0], f[1]), ("msr", f[2], f[3])]
    return out


def bats_pairs(folder):
    out = []
    for root, _, files in os.walk(folder):
        for name in sorted(files):
            if not name.endswith(".txt") or name.lower().startswith("readme"):
                continue
            for line in open(os.path.join(root, name), encoding="utf-8"):
                f = line.rstrip("\n").split("\t")
                if len(f) == 2:
                    for ans in f[1].split("/"):
                        out.append((name, f[0], ans))
    return out


def main():
    vg, shared, work = sys.argv[1:4]
    seed = int(sys.argv[4]) if len(sys.argv) > 4 else 27
    rng = np.random.default_rng(seed)
    dim, rows = 300, 100_000
    suites = {
        "google": os.path.join(shared, "google-analogy", "questions-words.txt"),
        "msr": os.path.join(shared, "msr-analogy", "msr.txt"),
        "bats3": os.path.join(shared, "bats3"),
    }
    pairs = google_pairs(suites["google"]) + msr_pairs(suites["msr"]) + bats_pairs(suites["bats3"])
    vec, offset = {}, {}
    for sec, x, y in pairs:
        x, y = x.strip(), y.strip()
        if not x or not y or any(ch.isspace() for ch in x + y):
            continue
        if sec not in offset:
            offset[sec] = rng.normal(0, 1.0 / np.sqrt(dim), dim) * 0.9
        if x not in vec:
            vec[x] = rng.normal(0, 1.0 / np.sqrt(dim), dim)
        if y not in vec:
            scale = 0.8 * np.exp(rng.normal(0, 0.5))
            vec[y] = vec[x] + offset[sec] + rng.normal(0, scale / np.sqrt(dim), dim)
    words = list(vec)
    n_extra = rows - len(words)
    os.makedirs(work, exist_ok=True)
    path = os.path.join(work, "planted.bin")
    with open(path, "wb") as fh:
        fh.write(b"%d %d\n" % (rows, dim))
        for w in words:
            fh.write(w.encode("utf-8") + b" " + vec[w].astype(np.float32).tobytes() + b"\n")
        extra = rng.normal(0, 1.0 / np.sqrt(dim), (n_extra, dim)).astype(np.float32)
        for i in range(n_extra):
            fh.write(b"zz%d " % i + extra[i].tobytes() + b"\n")
    out = os.path.join(work, "run")
    subprocess.run([vg, "score", "--no-progress", "--bootstrap", "2000", "--out", out,
                    "--analogies", suites["google"], "--analogies", suites["msr"],
                    "--analogies", suites["bats3"], "planted=" + path],
                   check=True, stdout=subprocess.DEVNULL)
    print("suite,accuracy,questions,wilson_width,pair_bootstrap_width,ratio")
    rows_ = [r for r in csv.DictReader(open(os.path.join(out, "intervals.csv")))
             if r["metric"] == "3cosadd" and r["subset"] == ""]
    for suite in dict.fromkeys(r["suite"] for r in rows_):
        w = {r["method"]: float(r["ci_high"]) - float(r["ci_low"]) for r in rows_
             if r["suite"] == suite}
        acc = next(float(r["value"]) for r in rows_ if r["suite"] == suite)
        n = next(r2["n_used"] for r2 in csv.DictReader(open(os.path.join(out, "scores.csv")))
                 if r2["suite"] == suite and r2["metric"] == "3cosadd" and r2["subset"] == "")
        print("%s,%.3f,%s,%.4f,%.4f,%.2f" % (suite, acc, n, w["wilson-independent"],
                                             w["pair-bootstrap"],
                                             w["pair-bootstrap"] / w["wilson-independent"]))


if __name__ == "__main__":
    main()
