#!/usr/bin/python3
"""Writes corpus_counts.json: row accounting expected on the shared corpora, counted
here independently with Python's csv module (not with the Go code).

osha: id "summary_nr", narrative "Abstract Text"; later rows of an id are duplicates,
"different text" when the stripped narrative differs from the first row's.
safenet: 23 files read with skipinitialspace (fields separated by ", "); id "ID",
narrative "Narrative", date "Event Start Date" (M/D/YYYY HH:MM); a row whose fields
are all blank is a blank row, else an empty narrative is an empty narrative; a blank
date is kept without a date.

Usage (SHARED: the folder holding corpora/):
  /usr/bin/python3 testdata/gen_corpus_counts.py $SHARED > testdata/corpus_counts.json
"""
import collections, csv, glob, json, sys

def empty(t):
    """The package's empty-narrative rule: blank, no letter or digit, or a stand-in."""
    return t.lower() in ("null", "n/a", "na", "none", "nil", "nan", "#n/a") or not any(c.isalnum() for c in t)

shared = sys.argv[1]
out = {}

rows = list(csv.reader(open(shared + "/corpora/osha-abstracts/osha.csv", newline="", encoding="utf-8")))
hdr, rows = rows[0], rows[1:]
iid, itext = hdr.index("summary_nr"), hdr.index("Abstract Text")
first, reasons = {}, collections.Counter()
for r in rows:
    t = r[itext].strip()
    if empty(t):
        reasons["empty narrative"] += 1
        continue
    k = r[iid].strip()
    if k in first:
        reasons["duplicate id" if first[k] == t else "duplicate id, different text"] += 1
        continue
    first[k] = t
out["osha"] = {"read": len(rows), "kept": len(first), "rejected": dict(sorted(reasons.items()))}

read, kept, nodate, reasons, first = 0, 0, 0, collections.Counter(), {}
for f in sorted(glob.glob(shared + "/corpora/safenet/SAFENET_*.csv")):
    rs = list(csv.reader(open(f, newline="", encoding="utf-8"), skipinitialspace=True))
    hdr, rs = rs[0], rs[1:]
    iid, itext, idate = hdr.index("ID"), hdr.index("Narrative"), hdr.index("Event Start Date")
    for i, r in enumerate(rs):
        read += 1
        if all(not x.strip() for x in r):
            reasons["blank row"] += 1
            continue
        t = r[itext].strip()
        if empty(t):
            reasons["empty narrative"] += 1
            continue
        k = r[iid].strip() or "%s:%d" % (f, i + 2)
        if k in first:
            reasons["duplicate id" if first[k] == t else "duplicate id, different text"] += 1
            continue
        first[k] = t
        if not r[idate].strip():
            nodate += 1
out["safenet"] = {"read": read, "kept": len(first), "undated": nodate, "rejected": dict(sorted(reasons.items()))}
json.dump(out, sys.stdout, indent=1, sort_keys=True)
print()
