#!/usr/bin/python3
# Generates farrington.json: Farrington et al. (1996) upper limits adapted to monthly
# counts with log(total) offset, following the steps in the trend package's
# FarringtonLimits doc comment. The GLM fits, hat values and covariances come from
# Debian's python3-statsmodels (GLM Poisson with offset and var_weights); the steps
# around them are written here from the doc comment.
#   /usr/bin/python3 gen_farrington.py > farrington.json
import json
import math
import numpy as np
import scipy.stats as st
import statsmodels
import statsmodels.api as sm
from statsmodels.tools.sm_exceptions import PerfectSeparationError

B, W, ALPHA, MINBASE = 3, 1, 0.05, 5
Z = st.norm.ppf(1 - ALPHA / 2)


def fit(x, y, off, omega, trend):
    X = np.column_stack([np.ones(len(y)), x]) if trend else np.ones((len(y), 1))
    m = sm.GLM(y, X, family=sm.families.Poisson(), offset=off, var_weights=omega)
    r = m.fit()
    r = m.fit(start_params=r.params)  # see gen_longrun.py: converged weights
    return X, r


def far(x, y, off, trend):
    try:
        return far1(x, y, off, trend)
    except PerfectSeparationError:
        # statsmodels stops when the fitted means reach the counts: with a trend this
        # is an estimate running off to infinity (all of the counts at one end); the
        # trend package's IRLS fails there too and both fall back to no trend.
        return None


def far1(x, y, off, trend):
    n = len(y)
    p = 2 if trend else 1
    if n <= p:
        return None
    X, r = fit(x, y, off, np.ones(n), trend)
    mu = r.mu
    phi = max(1.0, float(np.sum((y - mu) ** 2 / mu)) / (n - p))
    h = r.get_influence().hat_matrix_diag
    res = 1.5 * (y ** (2 / 3) * mu ** (-1 / 6) - mu ** 0.5) / np.sqrt(phi * (1 - h))
    omega = np.where(res > 1, 1 / np.maximum(res, 1) ** 2, 1.0)
    omega = omega * n / omega.sum()
    X, r = fit(x, y, off, omega, trend)
    mu = r.mu
    phi = max(1.0, float(np.sum(omega * (y - mu) ** 2 / mu)) / (n - p))
    cov = phi * r.normalized_cov_params
    return r.params, cov, phi


def limits(totals, counts):
    out = []
    for t in range(len(totals)):
        if totals[t] is None:
            out.append(None)
            continue
        x, y, off, rate = [], [], [], []
        for yr in range(B, 0, -1):
            for j in range(-W, W + 1):
                k = t - 12 * yr + j
                if k < 0 or k >= len(totals) or totals[k] is None:
                    continue
                x.append((k - t) / 12)
                y.append(counts[k])
                off.append(math.log(totals[k]))
                rate.append(counts[k] / totals[k])
        if len(y) < MINBASE:
            out.append(None)
            continue
        x, y, off = np.array(x), np.array(y, float), np.array(off)
        if y.sum() == 0:
            out.append({"expected": 0.0, "upper": 0.0, "score": None, "phi": 1.0, "trend": False, "baseline": len(y)})
            continue
        offt = math.log(totals[t])
        res = None
        for trend in (True, False):
            res = far(x, y, off, trend)
            if res is None:
                continue
            if not trend:
                break
            beta, cov, phi = res
            zt = beta[1] / math.sqrt(cov[1][1])
            mu0 = math.exp(beta[0] + offt)
            if 2 * st.norm.sf(abs(zt)) < 0.05 and mu0 / totals[t] <= max(rate):
                break
        beta, cov, phi = res
        mu0 = math.exp(beta[0] + offt)
        tau = phi + cov[0][0] * mu0 * mu0 / mu0
        se = math.sqrt(4 / 9 * mu0 ** (1 / 3) * tau)
        out.append({"expected": mu0, "upper": (mu0 ** (2 / 3) + Z * se) ** 1.5,
                    "score": (counts[t] ** (2 / 3) - mu0 ** (2 / 3)) / se, "phi": phi,
                    "trend": len(beta) == 2, "baseline": len(y)})
    return out


def main():
    rng = np.random.default_rng(1996)
    # Invented: 5 years, seasonal theme (summer high), rising volume, a burst in 2023-03.
    totals, counts = [], []
    for t in range(60):
        n = int(60 + t + 10 * math.sin(2 * math.pi * t / 12))
        rate = 0.12 + 0.05 * math.sin(2 * math.pi * (t - 3) / 12) + 0.001 * t
        if t == 50:
            rate *= 2.2
        totals.append(n)
        counts.append(int(rng.binomial(n, rate)))
    totals[20] = counts[20] = None  # a gap
    cases = [{"name": "seasonal", "start": "2019-01", "totals": totals, "counts": counts}]
    # Invented: 4 years, a strongly rising share (the trend is kept).
    tt, tc = [], []
    for t in range(48):
        n = 80 + (t * 7) % 13
        tt.append(n)
        tc.append(int(rng.binomial(n, 0.05 * math.exp(0.5 * t / 12))))
    cases.append({"name": "trending", "start": "2020-01", "totals": tt, "counts": tc})
    ears = json.load(open("ears.json"))
    cases.append({"name": "ears", "start": ears["start"], "totals": ears["totals"], "counts": ears["counts"]})
    for c in cases:
        c["limits"] = limits(c["totals"], c["counts"])
    print(json.dumps({"source": "statsmodels %s GLM Poisson (var_weights), numpy %s" % (statsmodels.__version__, np.__version__),
                      "cases": cases}, indent=1))


if __name__ == "__main__":
    main()
