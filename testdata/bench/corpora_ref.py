#!/usr/bin/python3
"""Reference side of BenchmarkCorpora (cmd/undercurrent/bench_corpora_test.go) for `make bench`:
scikit-learn LatentDirichletAllocation (batch) and gensim LdaModel on the public corpora of
../shared/corpora, with the usual Python route for the text (scikit-learn's CountVectorizer,
English stop words, Snowball stems, words in at least 2 documents and at most 95%).

Prints one JSON line per system and corpus, with the same fields as the Go side:

    {"bench": "corpus-themes", "system": "sklearn-batch", "corpus": "osha-abstracts",
     "docs": ..., "k": 15, "seconds": ..., "cpu_seconds": ..., "peak_mb": ...,
     "nmi_event_type": ..., "npmi": ..., "stability": ...}

NMI is scikit-learn's normalized_mutual_info_score (arithmetic mean) of the dominant theme
against each ground-truth column; NPMI is the mean over themes of the top-10 words' NPMI with
each document as one window (the boolean-document convention, computed here directly); stability
is the matched top-10-word Jaccard agreement of two fits with seeds 1 and 2 (Greene,
O'Callaghan & Cunningham 2014), matched with scipy's linear_sum_assignment.

Usage: /usr/bin/python3 testdata/bench/corpora_ref.py SHARED_DIR
Uses only Debian's python3-sklearn, -scipy, -snowballstemmer and -gensim.
"""
import csv
import glob
import json
import math
import os
import re
import resource
import sys
import time

import numpy as np
import snowballstemmer
from scipy.optimize import linear_sum_assignment
from sklearn.decomposition import LatentDirichletAllocation
from sklearn.feature_extraction.text import CountVectorizer
from sklearn.metrics import normalized_mutual_info_score

K = 15


def read_rows(paths, text_col, truth_cols, id_col, sep_space=False):
    seen = set()
    docs, truth = [], {c: [] for c in truth_cols}
    for p in paths:
        with open(p, newline="", encoding="utf-8", errors="replace") as f:
            r = csv.DictReader(f, skipinitialspace=sep_space)
            for row in r:
                t = (row.get(text_col) or "").strip()
                rid = row.get(id_col)
                if not t or rid in seen:
                    continue
                seen.add(rid)
                docs.append(t)
                for c in truth_cols:
                    truth[c].append(row.get(c) or "")
    return docs, truth


def analyzer():
    stem = snowballstemmer.stemmer("english").stemWord
    base = CountVectorizer(stop_words="english").build_analyzer()
    cache = {}

    def analyze(doc):
        out = []
        for w in base(doc):
            s = cache.get(w)
            if s is None:
                s = cache[w] = stem(w)
            out.append(s)
        return out
    return analyze


def npmi(X, tops):
    B = (X > 0).astype(np.float64).tocsc()
    n = B.shape[0]
    vals = []
    for top in tops:
        s, m = 0.0, 0
        for i in range(len(top)):
            for j in range(i + 1, len(top)):
                a, b = B[:, top[i]], B[:, top[j]]
                pa, pb = a.sum() / n, b.sum() / n
                pab = a.multiply(b).sum() / n
                if pab == 0:
                    v = -1.0
                else:
                    v = math.log(pab / (pa * pb)) / -math.log(pab)
                s += v
                m += 1
        vals.append(s / m)
    return float(np.mean(vals))


def stability(tops_a, tops_b):
    cost = np.zeros((len(tops_a), len(tops_b)))
    for i, a in enumerate(tops_a):
        for j, b in enumerate(tops_b):
            sa, sb = set(a), set(b)
            cost[i, j] = -len(sa & sb) / len(sa | sb)
    r, c = linear_sum_assignment(cost)
    return float(-cost[r, c].mean())


def fit_sklearn(X, seed):
    lda = LatentDirichletAllocation(n_components=K, learning_method="batch", max_iter=50, random_state=seed)
    theta = lda.fit_transform(X)
    tops = [list(np.argsort(-row)[:10]) for row in lda.components_]
    return theta, tops


def fit_gensim(X, seed):
    from gensim.matutils import Sparse2Corpus
    from gensim.models import LdaModel
    corpus = Sparse2Corpus(X, documents_columns=False)
    lda = LdaModel(corpus, num_topics=K, id2word={i: str(i) for i in range(X.shape[1])}, passes=10,
                   random_state=seed, alpha="auto", eta="auto")
    theta = np.zeros((X.shape[0], K))
    for d, bow in enumerate(corpus):
        for k, p in lda.get_document_topics(bow, minimum_probability=0):
            theta[d, k] = p
    tops = [[int(w) for w, _ in lda.get_topic_terms(k, topn=10)] for k in range(K)]
    return theta, tops


def main():
    shared = sys.argv[1]
    cases = [
        ("osha-abstracts", [os.path.join(shared, "corpora/osha-abstracts/osha.csv")], "Abstract Text",
         ["Event type", "Nature of Injury"], "summary_nr", False),
        ("safenet", sorted(glob.glob(os.path.join(shared, "corpora/safenet/SAFENET_*.csv"))), "Narrative",
         ["Event Incident Type"], "ID", True),
    ]
    for name, paths, text_col, truth_cols, id_col, spaced in cases:
        docs, truth = read_rows(paths, text_col, truth_cols, id_col, spaced)
        for system, fit in (("sklearn-batch", fit_sklearn), ("gensim", fit_gensim)):
            t0, c0 = time.time(), time.process_time()
            X = CountVectorizer(analyzer=analyzer(), min_df=2, max_df=0.95).fit_transform(docs)
            theta, tops = fit(X, 1)
            secs, cpu = time.time() - t0, time.process_time() - c0
            _, tops2 = fit(X, 2)
            rec = {"bench": "corpus-themes", "system": system, "corpus": name, "docs": len(docs), "k": K,
                   "seconds": round(secs, 3), "cpu_seconds": round(cpu, 3),
                   "peak_mb": round(resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024, 1)}
            dom = theta.argmax(axis=1)
            for c in truth_cols:
                key = "nmi_" + re.sub(r"\s+", "_", c.lower())
                rec[key] = float(normalized_mutual_info_score(truth[c], dom))
            rec["npmi"] = npmi(X, tops)
            rec["stability"] = stability(tops, tops2)
            print(json.dumps(rec), flush=True)


if __name__ == "__main__":
    main()
