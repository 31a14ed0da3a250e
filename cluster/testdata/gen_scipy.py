#!/usr/bin/python3
"""Generate cluster/testdata/scipy_linkage.json with Debian's python3-scipy.

Run from the repository root with Debian's interpreter (not the pyenv one):

    /usr/bin/python3 cluster/testdata/gen_scipy.py > cluster/testdata/scipy_linkage.json

Every case records the input (a condensed distance matrix, or vectors), the
method and what scipy.cluster.hierarchy returns for it: linkage (the Z
matrix), cophenet (cophenetic distances and correlation), leaves_list,
leaves_list(optimal_leaf_ordering(Z, y)) and fcluster by maxclust and by
distance. The "prob" section holds probability rows with
scipy.spatial.distance.jensenshannon, the Hellinger distance (Euclidean
distance of square roots over sqrt(2)) and average linkage on the
Jensen-Shannon distances. Inputs are synthetic and seeded (numpy
default_rng); the output is deterministic for a given scipy and numpy.
"""
import json
import sys

import numpy as np
import scipy
from scipy.cluster import hierarchy as h
from scipy.spatial.distance import pdist

METHODS = ["single", "complete", "average", "weighted", "ward", "centroid", "median"]


def case(name, method, y=None, x=None):
    if x is not None:
        Z = h.linkage(x, method=method)
        y = pdist(x)
    else:
        Z = h.linkage(y, method=method)
    n = Z.shape[0] + 1
    c, coph = h.cophenet(Z, y)
    out = {
        "name": name,
        "method": method,
        "n": int(n),
        "z": [[int(r[0]), int(r[1]), float(r[2]), int(r[3])] for r in Z],
        "cophenetic": [float(v) for v in coph],
        "coph_corr": None if np.isnan(c) else float(c),
        "leaves": [int(v) for v in h.leaves_list(Z)],
        "maxclust": {},
        "distance": [],
    }
    if x is not None:
        out["vectors"] = [[float(v) for v in row] for row in x]
    else:
        out["condensed"] = [float(v) for v in y]
    if method not in ("centroid", "median"):
        # optimal_leaf_ordering needs a monotone tree.
        out["olo"] = [int(v) for v in h.leaves_list(h.optimal_leaf_ordering(Z, y))]
    for k in sorted({1, 2, 3, 5, n // 2, n}):
        out["maxclust"][str(k)] = [int(v) for v in h.fcluster(Z, k, criterion="maxclust")]
    hs = sorted(set(float(v) for v in Z[:, 2]))
    for t in [0.0, hs[len(hs) // 3], hs[len(hs) // 2] * 1.0000001, hs[-1]]:
        out["distance"].append({"t": t, "labels": [int(v) for v in h.fcluster(Z, t, criterion="distance")]})
    return out


def main():
    rng = np.random.default_rng(20260101)
    cases = []
    # Wikipedia "Single-linkage clustering" / "UPGMA" / "WPGMA" five-element
    # example, elements a..e in that order.
    wiki = np.array([17, 21, 31, 23, 30, 34, 21, 28, 39, 43], dtype=float)
    for m in METHODS:
        cases.append(case("wikipedia-abcde", m, y=wiki))
    # Ward on the 1-D points 0, 1, 3, 7, 15.
    pts = np.array([[0.0], [1.0], [3.0], [7.0], [15.0]])
    cases.append(case("ward-1d", "ward", x=pts))
    for m in METHODS:
        # Random continuous distances (no ties).
        y = rng.random(40 * 39 // 2)
        cases.append(case("random-40", m, y=y))
        # Integer distances 1..5: many ties.
        y = rng.integers(1, 6, size=30 * 29 // 2).astype(float)
        cases.append(case("ties-30", m, y=y))
        # Integer distances 1..60: some ties at every level.
        y = rng.integers(1, 61, size=30 * 29 // 2).astype(float)
        cases.append(case("ties-wide-30", m, y=y))
        # Integer distances 1..3 on a tiny set: heavy ties.
        y = rng.integers(1, 4, size=12 * 11 // 2).astype(float)
        cases.append(case("ties-12", m, y=y))
    for m in ["ward", "centroid", "median", "single", "complete", "average", "weighted"]:
        # Euclidean vectors (scipy computes pdist itself).
        x = rng.random((50, 4))
        cases.append(case("vectors-50x4", m, x=x))
    # Dirichlet rows with d = 20 (the shape of document-theme vectors).
    x = rng.dirichlet(np.ones(20), size=200)
    for m in ["ward", "centroid", "median"]:
        cases.append(case("dirichlet-200x20", m, x=x))
    # Heights equal up to 1e-9: points on a grid with a tiny jitter.
    g = np.array([[i, j] for i in range(5) for j in range(4)], dtype=float)
    g += rng.random(g.shape) * 1e-9
    for m in METHODS:
        cases.append(case("grid-jitter-20", m, x=g))
    # Exact ties on vectors: an integer grid without jitter.
    g = np.array([[i, j] for i in range(4) for j in range(3)], dtype=float)
    for m in METHODS:
        cases.append(case("grid-exact-12", m, x=g))
    # Probability rows (with exact zeros) for the theme-distance helpers:
    # scipy.spatial.distance.jensenshannon (natural log) and the Hellinger
    # distance as the Euclidean distance of square roots over sqrt(2).
    p = rng.dirichlet(np.full(12, 0.3), size=9)
    p[p < 0.02] = 0.0
    p /= p.sum(axis=1, keepdims=True)
    prob = {
        "rows": [[float(v) for v in r] for r in p],
        "jensenshannon": [float(v) for v in pdist(p, "jensenshannon")],
        "hellinger": [float(v) for v in pdist(np.sqrt(p)) / np.sqrt(2)],
        "average_js_z": [[int(r[0]), int(r[1]), float(r[2]), int(r[3])]
                         for r in h.linkage(pdist(p, "jensenshannon"), "average")],
    }
    json.dump({"source": "scipy.cluster.hierarchy %s (Debian python3-scipy), numpy %s"
               % (scipy.__version__, np.__version__), "cases": cases, "prob": prob},
              sys.stdout, indent=None)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
