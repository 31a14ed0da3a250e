#!/usr/bin/python3
"""Time scipy and fastcluster on the rows the Go benchmarks use.

    /usr/bin/python3 cluster/testdata/bench_ref.py [--sizes 5000,10000,20000]
        [--systems scipy,fastcluster] [--benches ward,average] [--dump DIR]

Rows: the flat Dirichlet distribution on d = 20 components, drawn as the
spacings of 19 sorted uniforms from a splitmix64 generator seeded with
20260101 -- the same integers and the same IEEE operations as
dirichletRows in cluster/bench_test.go, so both sides cluster identical
numbers. Each (system, bench, n) runs in its own process so that its peak
resident memory (ru_maxrss, including the interpreter and the data) is its
own. Prints one JSON line per run:

    {"bench": "ward", "system": "fastcluster", "n": 20000, "seconds": ...,
     "cpu_seconds": ..., "peak_mb": ...}

cpu_seconds (user + system time of the process during the call) is less
disturbed than seconds when other work shares the machine.

Ward: scipy.cluster.hierarchy.linkage(X, "ward") and
fastcluster.linkage_vector(X, "ward"); average: linkage(X, "average") and
fastcluster.linkage(X, "average") (both build the condensed matrix).
--dump DIR writes the merge pairs of each run to DIR/<system>-<bench>-<n>.txt
("a b" per line) so that cluster's benchmarks can compare their merges
(UNDERCURRENT_BENCH_REF=DIR go test -bench ...).
"""
import argparse
import json
import os
import resource
import subprocess
import sys
import time

import numpy as np

MASK = (1 << 64) - 1
SEED = 20260101
D = 20


def dirichlet_rows(n, d, seed):
    s = seed
    out = np.empty((n, d))
    u = [0.0] * (d + 1)
    for i in range(n):
        u[0], u[d] = 0.0, 1.0
        for k in range(1, d):
            s = (s + 0x9E3779B97F4A7C15) & MASK
            z = s
            z = ((z ^ (z >> 30)) * 0xBF58476D1CE4E5B9) & MASK
            z = ((z ^ (z >> 27)) * 0x94D049BB133111EB) & MASK
            z = z ^ (z >> 31)
            u[k] = float(z >> 11) * 2.0 ** -53
        mid = sorted(u[1:d])
        v = [0.0] + mid + [1.0]
        out[i] = [v[k + 1] - v[k] for k in range(d)]
    return out


def run_one(system, bench, n, dump):
    x = dirichlet_rows(n, D, SEED)
    if system == "scipy":
        from scipy.cluster.hierarchy import linkage
    else:
        import fastcluster
    r0 = resource.getrusage(resource.RUSAGE_SELF)
    t0 = time.perf_counter()
    if system == "scipy":
        z = linkage(x, method=bench)
    else:
        if bench == "ward":
            z = fastcluster.linkage_vector(x, method="ward")
        else:
            z = fastcluster.linkage(x, method=bench)
    sec = time.perf_counter() - t0
    r1 = resource.getrusage(resource.RUSAGE_SELF)
    cpu = (r1.ru_utime - r0.ru_utime) + (r1.ru_stime - r0.ru_stime)
    peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0
    if dump:
        with open(os.path.join(dump, "%s-%s-%d.txt" % (system, bench, n)), "w") as f:
            for r in z:
                f.write("%d %d %.17g\n" % (int(r[0]), int(r[1]), r[2]))
    print(json.dumps({"bench": bench, "system": system, "n": n,
                      "seconds": round(sec, 3), "cpu_seconds": round(cpu, 3),
                      "peak_mb": round(peak, 1)}))
    sys.stdout.flush()


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--sizes", default="5000,10000,20000")
    ap.add_argument("--systems", default="scipy,fastcluster")
    ap.add_argument("--benches", default="ward,average")
    ap.add_argument("--dump", default="")
    ap.add_argument("--one", nargs=3, metavar=("SYSTEM", "BENCH", "N"))
    a = ap.parse_args()
    if a.one:
        run_one(a.one[0], a.one[1], int(a.one[2]), a.dump)
        return
    for bench in a.benches.split(","):
        for n in [int(v) for v in a.sizes.split(",")]:
            for system in a.systems.split(","):
                cmd = [sys.executable, __file__, "--one", system, bench, str(n)]
                if a.dump:
                    cmd += ["--dump", a.dump]
                subprocess.run(cmd, check=True)


if __name__ == "__main__":
    main()
