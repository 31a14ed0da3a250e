#!/usr/bin/python3
# Generates longrun.json: Poisson regression of monthly counts on time in years with
# log(total) offset, fitted by Debian's python3-statsmodels GLM(family=Poisson()), the
# quasi-Poisson standard errors from fit(scale="X2"), and Mann-Kendall on the shares:
# S and tau-b from scipy.stats.kendalltau (which equals Mann-Kendall's S-based tau
# when time has no ties), Z and p with continuity correction by hand (formulas in the
# trend package's MannKendall doc comment), Theil-Sen slope from scipy.stats.theilslopes.
#   /usr/bin/python3 gen_longrun.py > longrun.json
import json
import math
import numpy as np
import scipy
import scipy.stats as st
import statsmodels
import statsmodels.api as sm

series = {
    # The EARS fixture series (gaps as None), 2021-01 start.
    "ears": ([40, 52, 47, 61, 58, 49, 55, None, 60, 63, 57, 50,
              48, 66, 59, 62, 70, 65, 58, 61, None, None, 64, 60,
              55, 58, 200, 61, 3, 59],
             [4, 6, 5, 7, 5, 4, 6, None, 7, 6, 5, 5,
              4, 8, 6, 6, 21, 7, 5, 6, None, None, 7, 6,
              5, 6, 22, 15, 2, 5]),
    # A rising share, invented: 24 months.
    "rising": ([80, 85, 90, 78, 88, 95, 100, 92, 97, 105, 99, 110,
                104, 108, 115, 101, 120, 118, 111, 125, 119, 130, 122, 128],
               [8, 9, 8, 9, 11, 12, 12, 13, 12, 15, 14, 16,
                15, 17, 19, 16, 20, 21, 19, 23, 22, 25, 23, 26]),
    # Few months, ties in the shares.
    "ties": ([10, 20, 10, 20, 10], [1, 2, 1, 3, 1]),
}
out = {"source": "statsmodels %s GLM Poisson; scipy %s kendalltau, theilslopes" % (statsmodels.__version__, scipy.__version__),
       "cases": []}
for name, (totals, counts) in series.items():
    t, y, n = [], [], []
    for i, (tot, c) in enumerate(zip(totals, counts)):
        if tot is None:
            continue
        t.append(i / 12)
        y.append(c)
        n.append(tot)
    t, y, n = np.array(t), np.array(y, float), np.array(n, float)
    X = sm.add_constant(t)
    model = sm.GLM(y, X, family=sm.families.Poisson(), offset=np.log(n))
    # statsmodels' IRLS stops on the deviance and takes the standard errors from the
    # weights of its last step; refitting from its own estimate makes that last step
    # start at the converged values, so estimates and standard errors agree to ~1e-12.
    fit = model.fit()
    fit = model.fit(start_params=fit.params)
    quasi = model.fit(scale="X2", start_params=fit.params)
    null = sm.GLM(y, np.ones((len(y), 1)), family=sm.families.Poisson(), offset=np.log(n)).fit()
    best = quasi if fit.pearson_chi2 / fit.df_resid > 1 else fit
    fitted = []
    for x0 in (t[0], t[-1]):
        f = best.get_prediction(np.array([[1.0, x0]]), offset=np.zeros(1)).summary_frame(alpha=0.05)
        fitted.append([float(f["mean"].iloc[0]), float(f["mean_ci_lower"].iloc[0]), float(f["mean_ci_upper"].iloc[0])])
    share = y / n
    tau = st.kendalltau(t, share, method="asymptotic")
    S = 0
    for i in range(len(share)):
        for j in range(i + 1, len(share)):
            S += np.sign(share[j] - share[i])
    _, ties = np.unique(share, return_counts=True)
    m = len(share)
    var = (m * (m - 1) * (2 * m + 5) - sum(g * (g - 1) * (2 * g + 5) for g in ties)) / 18
    z = (S - 1) / math.sqrt(var) if S > 0 else ((S + 1) / math.sqrt(var) if S < 0 else 0.0)
    p = 2 * st.norm.sf(abs(z))
    sen = st.theilslopes(share, t)
    out["cases"].append({
        "name": name, "totals": totals, "counts": counts,
        "beta": [float(v) for v in fit.params], "se": [float(v) for v in fit.bse],
        "p": float(fit.pvalues[1]), "z": float(fit.tvalues[1]),
        "deviance": float(fit.deviance), "null_deviance": float(null.deviance),
        "statsmodels_null_deviance": float(fit.null_deviance),
        "lr_p": float(st.chi2.sf(null.deviance - fit.deviance, 1)),
        "dispersion": float(fit.pearson_chi2 / fit.df_resid),
        "quasi_se": float(quasi.bse[1]), "quasi_p": float(quasi.pvalues[1]),
        "mk_s": float(S), "mk_var": float(var), "mk_z": float(z), "mk_p": float(p),
        "scipy_tau": float(tau.correlation), "scipy_tau_p_no_cc": float(tau.pvalue),
        "sen_slope": float(sen[0]),
        "fitted_first": fitted[0], "fitted_last": fitted[1],
    })
print(json.dumps(out, indent=1))
