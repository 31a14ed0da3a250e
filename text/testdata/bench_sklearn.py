#!/usr/bin/python3
# Side-by-side baseline for BenchmarkPipeline: scikit-learn CountVectorizer (English stop
# words) with Snowball stemming (Debian's python3-sklearn and python3-snowballstemmer), the
# usual Python route, on the same narratives. Prints one JSON line:
#   {"bench": "pipeline", "system": "sklearn", "corpus": ..., "seconds": ..., "mb_per_s": ...,
#    "peak_mb": ..., "cpu_seconds": ..., "docs": ..., "vocab": ..., "nnz": ...}
# cpu_seconds (process CPU time) is steadier than seconds on a shared machine.
# seconds is the best of --repeat runs (wall clock); MB are 10^6 bytes of UTF-8 narrative text.
# Stems are memoised in a dict (the fast usual route); --no-cache stems every token.
# Usage (from the repository root):
#   /usr/bin/python3 text/testdata/bench_sklearn.py --csv /work/shared/corpora/osha-abstracts/osha.csv \
#       --column "Abstract Text" --corpus osha
#   (a generated corpus: go test ./text -run TestWriteGeneratedCorpus with
#    UNDERCURRENT_GEN_CORPUS=/tmp/gen.csv, then --csv /tmp/gen.csv --column narrative)
import argparse
import csv
import json
import resource
import sys
import time

import snowballstemmer
from sklearn.feature_extraction.text import CountVectorizer


def main():
    ap = argparse.ArgumentParser()
    ap.add_argument("--csv", required=True)
    ap.add_argument("--column", required=True)
    ap.add_argument("--corpus", required=True)
    ap.add_argument("--repeat", type=int, default=3)
    ap.add_argument("--no-cache", action="store_true",
                    help="stem every token (pure-Python snowballstemmer is slow); default memoises stems in a dict")
    a = ap.parse_args()
    csv.field_size_limit(sys.maxsize)
    with open(a.csv, newline="", encoding="utf-8") as f:
        docs = [row[a.column] for row in csv.DictReader(f)]
    nbytes = sum(len(d.encode("utf-8")) for d in docs)
    stemmer = snowballstemmer.stemmer("english")
    base = CountVectorizer(stop_words="english").build_analyzer()

    cache = {}

    def stem(w):
        s = cache.get(w)
        if s is None:
            s = cache[w] = stemmer.stemWord(w)
        return s

    if a.no_cache:
        def analyzer(doc):
            return stemmer.stemWords(base(doc))
    else:
        def analyzer(doc):
            return [stem(w) for w in base(doc)]

    best = best_cpu = None
    for _ in range(a.repeat):
        cache.clear()
        t0, c0 = time.perf_counter(), time.process_time()
        v = CountVectorizer(analyzer=analyzer, min_df=2, max_df=0.95)
        x = v.fit_transform(docs)
        el, cpu = time.perf_counter() - t0, time.process_time() - c0
        best = el if best is None or el < best else best
        best_cpu = cpu if best_cpu is None or cpu < best_cpu else best_cpu
    peak = resource.getrusage(resource.RUSAGE_SELF).ru_maxrss / 1024.0
    print(json.dumps({
        "bench": "pipeline", "system": "sklearn-nocache" if a.no_cache else "sklearn", "corpus": a.corpus,
        "seconds": round(best, 4), "mb_per_s": round(nbytes / 1e6 / best, 3),
        "peak_mb": round(peak, 1), "cpu_seconds": round(best_cpu, 4), "docs": len(docs), "vocab": len(v.vocabulary_), "nnz": int(x.nnz),
    }))


if __name__ == "__main__":
    main()
