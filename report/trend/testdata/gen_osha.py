#!/usr/bin/python3
# Generates osha.json from the public OSHA accident-abstract corpus
# (/work/shared/corpora/osha-abstracts/osha.csv, US federal government data; see
# /work/shared/corpora/SOURCES.md). Each abstract's "Event type" stands in for its
# dominant theme (a one-hot theta), "Degree of Injury" is the group. Aggregates and
# reference values from Debian's python3-statsmodels and python3-scipy:
#   monthly totals and counts (csv + collections, by hand), Wilson intervals
#   (proportion_confint method="wilson"), Poisson GLM with log(total) offset,
#   Kendall's tau of the monthly share, chi-square of degree x event type
#   (chi2_contingency correction=False) with adjusted residuals (Table.standardized_resids).
#   /usr/bin/python3 gen_osha.py > osha.json
import calendar
import collections
import csv
import datetime
import json
import numpy as np
import scipy.stats as st
import statsmodels.api as sm
from statsmodels.stats.contingency_tables import Table
from statsmodels.stats.proportion import proportion_confint

PATH = "/work/shared/corpora/osha-abstracts/osha.csv"
rows = list(csv.DictReader(open(PATH, newline="", encoding="utf-8")))
types = sorted({r["Event type"] for r in rows})
degrees = sorted({r["Degree of Injury"] for r in rows})
dates = []
for r in rows:
    m, d, y = (int(v) for v in r["Event Date"].split("/"))
    dates.append(datetime.date(y, m, d))
first, last = min(dates), max(dates)
months = []
y, m = first.year, first.month
while (y, m) <= (last.year, last.month):
    months.append((y, m))
    y, m = (y + 1, 1) if m == 12 else (y, m + 1)
total = collections.Counter()
count = collections.Counter()
for r, d in zip(rows, dates):
    total[(d.year, d.month)] += 1
    count[(d.year, d.month, r["Event type"])] += 1
first_cov = (calendar.monthrange(first.year, first.month)[1] - first.day + 1) / calendar.monthrange(first.year, first.month)[1]
last_cov = last.day / calendar.monthrange(last.year, last.month)[1]

checked = ["Fall (from elevation)", "Struck-by", "Caught in or between", "Shock"]
series = []
for name in checked:
    k = types.index(name)
    cells, t, yv, nv = [], [], [], []
    for i, (y, m) in enumerate(months):
        n, c = total[(y, m)], count[(y, m, name)]
        if n == 0:
            cells.append(None)
            continue
        low, high = proportion_confint(c, n, alpha=0.05, method="wilson")
        cells.append({"count": c, "total": n, "low": float(low), "high": float(high)})
        t.append(i / 12)
        yv.append(c)
        nv.append(n)
    X = sm.add_constant(np.array(t))
    model = sm.GLM(np.array(yv, float), X, family=sm.families.Poisson(), offset=np.log(np.array(nv, float)))
    fit = model.fit()
    fit = model.fit(start_params=fit.params)
    tau = st.kendalltau(t, np.array(yv) / np.array(nv))
    series.append({"theme": k, "name": name, "cells": cells,
                   "beta": [float(v) for v in fit.params], "se": [float(v) for v in fit.bse],
                   "p": float(fit.pvalues[1]), "deviance": float(fit.deviance),
                   "tau": float(tau.correlation)})

table = [[sum(1 for r in rows if r["Degree of Injury"] == g and r["Event type"] == e) for e in types] for g in degrees]
a = np.array(table, float)
chi2, p, dof, exp = st.chi2_contingency(a, correction=False)
res = np.asarray(Table(a, shift_zeros=False).standardized_resids)
print(json.dumps({
    "source": "osha.csv (%d rows); statsmodels, scipy" % len(rows),
    "types": types, "degrees": degrees,
    "first": first.isoformat(), "last": last.isoformat(),
    "months": ["%04d-%02d" % ym for ym in months],
    "totals": [total[ym] for ym in months],
    "first_coverage": first_cov, "last_coverage": last_cov,
    "series": series,
    "chisq": {"counts": table, "stat": float(chi2), "p": float(p), "df": int(dof), "residual": res.tolist()},
}, indent=1))
