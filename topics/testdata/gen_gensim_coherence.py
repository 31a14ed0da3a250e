#!/usr/bin/python3
"""Make gensim_coherence.json: UMass and NPMI coherence computed by gensim's CoherenceModel
(Debian python3-gensim) on a small synthetic corpus, for topics/coherence_test.go.

Run with Debian's interpreter:  /usr/bin/python3 gen_gensim_coherence.py > gensim_coherence.json

Settings chosen so that our definitions match exactly (see topics/coherence.go):
  u_mass: corpus = bag-of-words of the texts (gensim's boolean document estimation).
  c_npmi: window_size = length of the longest text, so every text is exactly one window
          (gensim's p_boolean_sliding_window then equals boolean document counts).
  processes=1 so the single-process accumulator is used.
"""
import json
import random
import sys

import gensim
from gensim.corpora import Dictionary
from gensim.models.coherencemodel import CoherenceModel

rng = random.Random(20260101)
words = ["ladder", "fell", "roof", "scaffold", "height", "harness",
         "press", "finger", "amputated", "guard", "machine", "caught",
         "truck", "struck", "backing", "forklift", "driver", "crushed",
         "burn", "fire", "explosion", "chemical", "exposed", "hospitalized"]
groups = [words[0:6], words[6:12], words[12:18], words[18:24]]
texts = []
for d in range(150):
    g = rng.sample(range(4), 2)
    n = rng.randint(3, 18)
    doc = []
    for _ in range(n):
        grp = groups[g[0]] if rng.random() < 0.7 else groups[g[1]]
        if rng.random() < 0.1:
            grp = words
        doc.append(rng.choice(grp))
    texts.append(doc)
# (gensim 4 fails on an empty text in the sliding-window accumulator, so none here.)

topics = [
    ["ladder", "fell", "roof", "height", "scaffold"],
    ["press", "finger", "amputated", "machine", "guard", "caught"],
    ["truck", "driver", "burn", "ladder"],
    ["fire", "explosion", "chemical", "hospitalized", "finger", "roof", "forklift"],
]
dct = Dictionary(texts)
corpus = [dct.doc2bow(t) for t in texts]
longest = max(len(t) for t in texts)
out = {"gensim_version": gensim.__version__, "window_size": longest,
       "texts": texts, "topics": topics, "u_mass": [], "c_npmi": []}
for t in topics:
    um = CoherenceModel(topics=[t], corpus=corpus, dictionary=dct, coherence="u_mass",
                        topn=len(t), processes=1)
    out["u_mass"].append(um.get_coherence_per_topic()[0])
    cn = CoherenceModel(topics=[t], texts=texts, dictionary=dct, coherence="c_npmi",
                        window_size=longest, topn=len(t), processes=1)
    out["c_npmi"].append(cn.get_coherence_per_topic()[0])
json.dump(out, sys.stdout, indent=1)
sys.stdout.write("\n")
