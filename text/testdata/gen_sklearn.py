#!/usr/bin/python3
# Generates sklearn_tfidf.json: TF-IDF weights computed by Debian's python3-sklearn
# TfidfVectorizer on a small invented corpus (no real people or places), for three variants.
# Run from text/: /usr/bin/python3 testdata/gen_sklearn.py > testdata/sklearn_tfidf.json
import json
import sklearn
from sklearn.feature_extraction.text import TfidfVectorizer

corpus = [
    "The caller reported a loud party on Alder Court and the officer advised the host",
    "Officer responded to a traffic stop on Birch Street and the driver was cited",
    "Caller reported a stolen bicycle from the porch of the residence",
    "The driver of the blue sedan left the scene of the traffic collision",
    "Loud music again on Alder Court; the host was advised a second time",
    "A bicycle was found near the school and returned to the owner",
]
variants = {
    "default": dict(),  # raw tf, smooth idf, l2
    "plain_idf": dict(smooth_idf=False),
    "sublinear_plain_none": dict(sublinear_tf=True, smooth_idf=False, norm=None),
    "binary": dict(binary=True),
}
out = {"sklearn": sklearn.__version__, "corpus": corpus, "variants": {}}
for name, kw in variants.items():
    v = TfidfVectorizer(**kw)
    x = v.fit_transform(corpus).toarray()
    out["variants"][name] = {
        "params": kw,
        "vocab": [str(w) for w in v.get_feature_names_out()],
        "idf": [float(a) for a in v.idf_],
        "weights": [[float(a) for a in row] for row in x],
    }
print(json.dumps(out, indent=1))
