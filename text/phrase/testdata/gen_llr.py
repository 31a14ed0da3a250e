#!/usr/bin/python3
# Generates llr_scipy.txt: Dunning's G statistic for 2x2 tables, computed by Debian's
# python3-scipy (scipy.stats.chi2_contingency with lambda_="log-likelihood", no continuity
# correction). Run: /usr/bin/python3 testdata/gen_llr.py > testdata/llr_scipy.txt
import scipy
from scipy.stats import chi2_contingency

tables = [
    [[110, 2442], [111, 29114]],
    [[20, 0], [0, 980]],
    [[5, 95], [95, 9805]],
    [[30, 470], [30, 470]],
    [[3, 17], [40, 940]],
    [[1000, 200], [300, 98500]],
]
print("# k11 k12 k21 k22 G  (scipy %s chi2_contingency lambda_=log-likelihood)" % scipy.__version__)
for t in tables:
    g = chi2_contingency(t, correction=False, lambda_="log-likelihood")[0]
    print(t[0][0], t[0][1], t[1][0], t[1][1], repr(float(g)))
