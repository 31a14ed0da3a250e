#!/usr/bin/python3
# Generates snowball_debian.tsv: word<TAB>stem from Debian's python3-snowballstemmer (the
# Snowball project's generated Python code; if python3-stemmer is installed the same call
# returns PyStemmer's C stemmer, which gives the same stems). Words: every 10th word of the
# Snowball sample vocabulary (../shared/refdata/snowball-english/voc.txt), every word where
# kljensen/snowball and that vocabulary's output.txt disagree, and incident-report words.
# Run from text/: /usr/bin/python3 testdata/gen_snowball.py > testdata/snowball_debian.tsv
import snowballstemmer

VOC = "/work/shared/refdata/snowball-english/voc.txt"
OUT = "/work/shared/refdata/snowball-english/output.txt"
DISAGREE = """added adding apologists archaeologists ebbed ebbing emergencies emergency
entomologist erred erring evening evenings genealogist geologist geologists hying interfered
interfering internal internality internalization internalize internalized internalizes
internally internalness international internationally internationals internment internments
interval intervals lateral laterally offing oncologist oncologists organic organically
organism organization organizations organize organized ornithologist ornithologists paste
pasted pasting psychologist universal universally universities university vying""".split()
INCIDENT = """vehicle vehicles officer officers suspect suspects victim reporting party residence
arrested arrest arresting complainant witnesses driving intoxicated domestic violence
pedestrian collision injured injuries employee employees hospitalized amputated fractured
ladder scaffold fell falling struck caught trench excavation mental health traffic stop
weapon handcuffed transported dispatched responded located observed stated advised""".split()

words = []
with open(VOC, encoding="utf-8") as f:
    for i, line in enumerate(f):
        w = line.strip()
        if i % 10 == 0 and w.isalpha():
            words.append(w)
words += DISAGREE + INCIDENT
seen = set()
st = snowballstemmer.stemmer("english")
try:
    from importlib.metadata import version
    ver = version("snowballstemmer")
except Exception:
    ver = "?"
print("# word\tstem\t(Debian python3-snowballstemmer %s, english)" % ver)
for w in words:
    if w in seen:
        continue
    seen.add(w)
    print("%s\t%s" % (w, st.stemWord(w)))
