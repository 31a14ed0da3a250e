#!/usr/bin/python3
"""Writes dates_ref.json: reference readings of date strings and Excel serial numbers by
two Debian reference libraries, python3-dateutil (dateutil.parser.parse) and
python3-openpyxl (openpyxl.utils.datetime.from_excel, 1900 date system). The Go test
compares ParseDate and the Excel serial conversion with them.

Only forms the package documents are listed. dateutil is told dayfirst where the Go
side reads day-first. Serial 60 (the nonexistent 1900-02-29) is left out: the Go side
rejects it on purpose.

Usage: /usr/bin/python3 testdata/gen_dates.py > testdata/dates_ref.json
"""
import json
from dateutil import parser
from openpyxl.utils.datetime import from_excel

month_first = [
    "2020-01-05", "2020-01-05T14:30:00Z", "2020-01-05T14:30:00+02:00", "2020-01-05 14:30",
    "1985-04-12T23:20:50.52Z", "1996-12-19T16:39:57-08:00", "20200105", "20200105T143000",
    "1/5/2020", "01/05/2020", "12/31/1999", "1/5/20", "1/5/99", "8/10/2017", "12/12/2005 14:00",
    "1/5/2020 3:45 PM", "1/5/2020 12:10 am", "1/5/2020 15:45:10", "Jan 5, 2020", "January 5 2020",
    "5 January 2020", "05-Jan-2020", "Sept 30, 2019", "Sunday, January 5, 2020", "March 1st, 2021",
    "2021-03-01 00:00:00", "2/29/2020", "2020/01/05", "Dec 31, 1999 11:59 PM",
]
day_first = ["25/12/2020", "05/01/2020", "31.12.1999", "13/1/2021 08:00", "5/1/2020 3:45 PM"]

def entry(s, dayfirst):
    d = parser.parse(s, dayfirst=dayfirst)
    off = None if d.tzinfo is None else int(d.utcoffset().total_seconds())
    return [s, dayfirst, d.replace(tzinfo=None).isoformat(timespec="microseconds"), off]

out = {"dateutil": [entry(s, False) for s in month_first] + [entry(s, True) for s in day_first]}
serials = [1, 2, 31, 59, 61, 100, 366, 1000, 25569, 36526, 39448, 43831, 43835.5, 43835.25, 44197.75, 2958465]
out["openpyxl"] = [[str(n), from_excel(n).isoformat(timespec="microseconds")] for n in serials]
json.dump(out, __import__("sys").stdout, separators=(",", ":"))
print()
