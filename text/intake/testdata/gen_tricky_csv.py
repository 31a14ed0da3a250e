#!/usr/bin/python3
"""Writes tricky.csv and tricky_expected.json: a seeded, invented export written by
Python's csv module (QUOTE_MINIMAL, CRLF line ends, the RFC 4180 dialect) with fields
holding commas, doubled quotes, CR/LF line breaks, leading and trailing blanks and
non-ASCII letters, and the records as Python's csv.reader reads them back, with the
physical line where each starts. The Go test
reads tricky.csv and must find the same fields.

Usage: /usr/bin/python3 testdata/gen_tricky_csv.py testdata
"""
import csv, io, json, random, sys

rng = random.Random(20240105)
streets = ["Alder Way", "Birch Street", "Quarry Lane", "Maple Row", "Cedar Court"]
bits = ["RP states", "veh parked", "subj left", "checked the area", "all clear", "said \"stop\"",
        "a, b, and c", "line one\r\nline two", "line\nbreak", "  padded  ", "café", "naïve", "Zoë",
        "50% done", "'single'", "semi;colon", "tab\there", "\"\"", "trailing,"]
rows = [["Report No", "Occurred", "Narrative", "Street"]]
for i in range(200):
    words = " ".join(rng.choice(bits) for _ in range(rng.randint(1, 8)))
    rows.append(["R-%04d" % i, "%d/%d/20%02d %d:%02d" % (rng.randint(1, 12), rng.randint(1, 28), rng.randint(15, 24), rng.randint(0, 23), rng.randint(0, 59)),
                 words, rng.choice(streets)])
buf = io.StringIO(newline="")
csv.writer(buf, lineterminator="\r\n").writerows(rows)
data = buf.getvalue()
out = sys.argv[1]
with open(out + "/tricky.csv", "w", newline="", encoding="utf-8") as f:
    f.write(data)
reader = csv.reader(io.StringIO(data, newline=""))
back, prev = [], 0
for rec in reader:
    back.append({"line": prev + 1, "fields": rec})  # physical line where the record starts
    prev = reader.line_num
with open(out + "/tricky_expected.json", "w", encoding="utf-8") as f:
    json.dump(back, f, ensure_ascii=False, separators=(",", ":"))
    f.write("\n")
