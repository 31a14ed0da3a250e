#!/usr/bin/python3
"""Writes survey_osha.json: the figures Survey must give on
shared/corpora/osha-abstracts/osha.csv, computed here independently with Python's csv
module and NumPy (Debian's python3-numpy), not with the Go code.

Rules mirrored from the package documentation: narrative = "Abstract Text" stripped,
id = "summary_nr", the first row of each id kept, dates M/D/YYYY from "Event Date";
lengths in code points and whitespace-separated words; quartiles by NumPy's default
'linear' method (Hyndman and Fan definition 7); tokens = runs of letters, lowercased.

Usage (SHARED: the folder holding corpora/): /usr/bin/python3 testdata/gen_survey_osha.py $SHARED > testdata/survey_osha.json
"""
import collections, csv, json, re, sys
import numpy as np

shared = sys.argv[1]
rows = list(csv.reader(open(shared + "/corpora/osha-abstracts/osha.csv", newline="", encoding="utf-8")))
hdr, rows = rows[0], rows[1:]
iid, idate, itext = hdr.index("summary_nr"), hdr.index("Event Date"), hdr.index("Abstract Text")
seen, kept = set(), []
for r in rows:
    if r[iid] in seen:
        continue
    seen.add(r[iid])
    kept.append(r)
texts = [r[itext].strip() for r in kept]
chars = np.array([len(t) for t in texts], dtype=float)
words = np.array([len(t.split()) for t in texts], dtype=float)
def quart(x):
    return [float(x.min()), float(np.percentile(x, 25)), float(np.percentile(x, 50)), float(np.percentile(x, 75)), float(x.max())]
months = collections.Counter()
for r in kept:
    m, d, y = r[idate].split("/")
    months["%04d-%02d" % (int(y), int(m))] += 1
tok = re.compile(r"[^\W\d_]+")
o1, o2, df = collections.Counter(), collections.Counter(), collections.Counter()
for t in texts:
    w = tok.findall(t.lower())
    if w:
        o1[w[0]] += 1
    if len(w) > 1:
        o2[w[0] + " " + w[1]] += 1
    df.update(set(w))
top = lambda c: [[k, v] for k, v in sorted(c.items(), key=lambda kv: (-kv[1], kv[0]))[:20]]
common = [[k, v] for k, v in sorted(df.items(), key=lambda kv: (-kv[1], kv[0])) if v / len(texts) > 0.5]
dups = len(texts) - len(set(texts))
json.dump({"kept": len(texts), "chars": quart(chars), "words": quart(words), "months": sorted(months.items()),
           "duplicates": dups, "openings": top(o1), "bigrams": top(o2), "common": common}, sys.stdout, separators=(",", ":"))
print()
