#!/usr/bin/python3
# Generates wilson.json: Wilson score intervals from Debian's python3-statsmodels,
# statsmodels.stats.proportion.proportion_confint(count, nobs, alpha, method="wilson").
# Run with /usr/bin/python3 (Debian's), not a pyenv python:
#   /usr/bin/python3 gen_wilson.py > wilson.json
import json
import statsmodels
from statsmodels.stats.proportion import proportion_confint

cases = []
for n in (1, 2, 5, 10, 29, 50, 148, 263, 1000, 12345):
    for x in sorted({0, 1, n // 7, n // 3, n // 2, n - 1, n}):
        if x < 0 or x > n:
            continue
        for conf in (0.95, 0.90, 0.99):
            low, high = proportion_confint(x, n, alpha=1 - conf, method="wilson")
            cases.append({"x": x, "n": n, "conf": conf, "low": float(low), "high": float(high)})
print(json.dumps({"source": "statsmodels %s proportion_confint(method='wilson')" % statsmodels.__version__,
                  "cases": cases}, indent=1))
