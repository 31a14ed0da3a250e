#!/usr/bin/python3
# Generates ears.json: EARS C1, C2, C3 statistics on a theme's monthly share, computed
# with numpy (mean, std with ddof=1) from the formulas in the trend package's doc comment
# (Hutwagner et al. 2003; the C3 form from memory of Fricker, Hegler & Dunfee 2008),
# including the package's adaptations (gap months skipped, binomial sd floor).
#   /usr/bin/python3 gen_ears.py > ears.json
import json
import math
import numpy as np

# Invented monthly series, 2021-01 .. 2023-06; None marks a gap month (no narratives).
totals = [40, 52, 47, 61, 58, 49, 55, None, 60, 63, 57, 50,
          48, 66, 59, 62, 70, 65, 58, 61, None, None, 64, 60,
          55, 58, 200, 61, 3, 59]
counts = [4, 6, 5, 7, 5, 4, 6, None, 7, 6, 5, 5,
          4, 8, 6, 6, 21, 7, 5, 6, None, None, 7, 6,
          5, 6, 22, 15, 2, 5]
B = 7


def stat(i, guard):
    if totals[i] is None:
        return None
    base = [j for j in range(i) if totals[j] is not None and i - j > guard]
    if len(base) < B:
        return None
    base = base[-B:]
    shares = np.array([counts[j] / totals[j] for j in base])
    mean = shares.mean()
    sd = shares.std(ddof=1)
    q = (sum(counts[j] for j in base) + 1) / (sum(totals[j] for j in base) + 2)
    floor = math.sqrt(q * (1 - q) / totals[i])
    used = max(sd, floor)
    return (counts[i] / totals[i] - mean) / used, mean, used, bool(floor > sd)


out = {"source": "numpy %s, formulas of the trend package doc comment" % np.__version__,
       "start": "2021-01", "totals": totals, "counts": counts, "c1": [], "c2": [], "c3": []}
data = []
c2 = []
for i in range(len(totals)):
    for key, guard in (("c1", 0), ("c2", 2)):
        r = stat(i, guard)
        out[key].append(None if r is None else {"value": r[0], "mean": r[1], "sd": r[2], "floored": r[3]})
    c2.append(None if out["c2"][-1] is None else out["c2"][-1]["value"])
    v = None
    if totals[i] is not None:
        data.append(i)
        if len(data) >= 3 and all(c2[j] is not None for j in data[-3:]):
            v = sum(max(0.0, c2[j] - 1) for j in data[-3:])
    out["c3"].append(v)
print(json.dumps(out, indent=1))
