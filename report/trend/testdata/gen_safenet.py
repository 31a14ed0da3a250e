#!/usr/bin/python3
# Generates safenet.json from the public SAFENET wildland-firefighting safety reports
# (/work/shared/corpora/safenet/SAFENET_YYYY.csv, courtesy of the National Interagency
# Fire Center; see /work/shared/corpora/SOURCES.md). Each report's "Event Incident Type"
# labels (";"-separated, often several) stand in for themes: theta shares 1/k over its
# k labels, "(none)" when it has none. Rows with a blank "Event Start Date" are counted
# and left out. Reference values: monthly totals, dominant counts (ties to the first
# label in sorted order) and expected counts by hand; Farrington limits for two labels
# by gen_farrington.limits (statsmodels GLM).
#   /usr/bin/python3 gen_safenet.py > safenet.json
import csv
import glob
import json
import os
import sys

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from gen_farrington import limits  # noqa: E402

DIR = "/work/shared/corpora/safenet"
reports, blank = [], 0
for path in sorted(glob.glob(os.path.join(DIR, "SAFENET_*.csv"))):
    rows = list(csv.reader(open(path, newline="", encoding="utf-8"), skipinitialspace=True))
    head = rows[0]
    di, ti = head.index("Event Start Date"), head.index("Event Incident Type")
    for r in rows[1:]:
        date = r[di].strip()
        if not date:
            blank += 1
            continue
        m, d, y = date.split(" ")[0].split("/")
        labels = sorted({v.strip() for v in r[ti].split(";") if v.strip()}) or ["(none)"]
        reports.append(((int(y), int(m)), labels))
names = sorted({l for _, ls in reports for l in ls})
first = min(ym for ym, _ in reports)
last = max(ym for ym, _ in reports)
months = []
y, m = first
while (y, m) <= last:
    months.append((y, m))
    y, m = (y + 1, 1) if m == 12 else (y, m + 1)
idx = {ym: i for i, ym in enumerate(months)}
K = len(names)
totals = [0] * len(months)
counts = [[0] * K for _ in months]
expected = [[0.0] * K for _ in months]
for ym, labels in reports:
    i = idx[ym]
    totals[i] += 1
    ks = [names.index(l) for l in labels]
    counts[i][min(ks)] += 1  # equal shares: the lowest index is dominant
    for k in ks:
        expected[i][k] += 1 / len(ks)
checked = ["Prescribed/Fuels Treatment", "Wildland"]
far = {}
for name in checked:
    k = names.index(name)
    far[name] = limits([t if t > 0 else None for t in totals],
                       [c[k] if t > 0 else None for c, t in zip(counts, totals)])
print(json.dumps({"source": "SAFENET_1999..2021.csv", "names": names, "blank_dates": blank,
                  "reports": len(reports), "months": ["%04d-%02d" % ym for ym in months],
                  "totals": totals, "counts": counts, "expected": expected,
                  "farrington": far}, indent=1))
