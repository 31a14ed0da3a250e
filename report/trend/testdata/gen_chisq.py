#!/usr/bin/python3
# Generates chisq.json: Pearson chi-square tests of independence from Debian's
# python3-scipy scipy.stats.chi2_contingency(correction=False) and adjusted standardised
# residuals from python3-statsmodels Table(t, shift_zeros=False).standardized_resids
# (the default shift_zeros=True adds 0.5 to every cell of a table with a zero).
#   /usr/bin/python3 gen_chisq.py > chisq.json
import json
import numpy as np
import scipy
import scipy.stats as st
import statsmodels
from statsmodels.stats.contingency_tables import Table

tables = {
    # Invented districts x dominant theme.
    "districts": [[30, 12, 8, 50], [22, 25, 9, 44], [10, 6, 30, 41]],
    "two_by_two": [[12, 5], [3, 17]],
    "small": [[2, 0, 1], [1, 3, 0]],
}
out = {"source": "scipy %s chi2_contingency(correction=False); statsmodels %s Table.standardized_resids"
       % (scipy.__version__, statsmodels.__version__), "cases": []}
for name, t in tables.items():
    a = np.array(t, float)
    chi2, p, dof, exp = st.chi2_contingency(a, correction=False)
    out["cases"].append({"name": name, "counts": t, "stat": float(chi2), "p": float(p), "df": int(dof),
                         "expected": exp.tolist(),
                         "residual": np.asarray(Table(a, shift_zeros=False).standardized_resids).tolist()})
print(json.dumps(out, indent=1))
