#!/usr/bin/python3
# Generates newcombe.json: hybrid score intervals for the difference of two independent
# proportions (Newcombe 1998, method 10) from Debian's python3-statsmodels
# confint_proportions_2indep(method="newcomb", compare="diff").
#   /usr/bin/python3 gen_newcombe.py > newcombe.json
import json
import statsmodels
from statsmodels.stats.proportion import confint_proportions_2indep

pairs = [(56, 70, 48, 80), (9, 10, 3, 10), (6, 7, 2, 7), (5, 56, 0, 29), (0, 10, 0, 20),
         (10, 10, 0, 20), (81, 263, 15, 148), (1, 29, 0, 20), (300, 1000, 280, 1100), (3, 5, 3, 5)]
cases = []
for x1, n1, x2, n2 in pairs:
    for conf in (0.95, 0.90):
        low, high = confint_proportions_2indep(x1, n1, x2, n2, method="newcomb", compare="diff", alpha=1 - conf)
        cases.append({"x1": x1, "n1": n1, "x2": x2, "n2": n2, "conf": conf, "low": float(low), "high": float(high)})
print(json.dumps({"source": "statsmodels %s confint_proportions_2indep(method='newcomb')" % statsmodels.__version__,
                  "cases": cases}, indent=1))
