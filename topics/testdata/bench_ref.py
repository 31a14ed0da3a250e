#!/usr/bin/python3
"""Side-by-side reference benchmark for topics.BenchmarkSynthetic (make bench).

  /usr/bin/python3 bench_ref.py [DIR]          # DIR defaults to /tmp/undercurrent-bench

1. If DIR/corpus.txt is missing, draws a corpus from a known LDA model (seeded) and writes
   it, with the true topics, for both this script and the Go benchmark to read:
     corpus.txt  line 1: JSON {"docs","train","V","K","alpha","beta","seed"}
                 then one line per document: "<true dominant topic> <word id> <word id> ..."
                 (word ids in the order drawn; the first `train` documents are for fitting,
                 the rest are held out)
     phi.txt     K lines of V true topic-word probabilities
   Model: φ_k ~ Dirichlet(β = 0.2) over V = 3,000 words, K = 20, θ_d ~ Dirichlet(α = 0.1),
   document length ~ Poisson(60), 20,000 documents (18,000 train, 2,000 held out).
2. Fits scikit-learn batch and online LDA and gensim LdaModel (Debian python3-sklearn,
   python3-gensim), each in its own process so peak memory is its own, and prints JSON lines
   {"bench","system","corpus","seconds","peak_mb","hellinger","ll_per_token","nmi"}:
     hellinger     mean Hellinger distance of the true topics to their Hungarian-matched
                   learned topics
     ll_per_token  held-out document completion (Wallach et al. 2009): θ inferred by the
                   system from the first half of each held-out document's tokens, the second
                   half scored as Σ log Σ_k θ_k φ_kw / tokens
     cpu_seconds_fit      CPU time of the fit alone (time.process_time), and
     cpu_seconds_process  of the whole process (reading, fitting, scoring): on a shared
                   machine wall time overstates fit time
     nmi           NMI (arithmetic normalisation, sklearn's default) of each training
                   document's dominant learned topic against its true dominant topic
"""
import json
import os
import resource
import subprocess
import sys
import time

import numpy as np

D, TRAIN, V, K, ALPHA, BETA, SEED, MEANLEN = 20000, 18000, 3000, 20, 0.1, 0.2, 20260101, 60


def make_corpus(d):
    rng = np.random.default_rng(SEED)
    phi = rng.dirichlet(np.full(V, BETA), size=K)
    with open(os.path.join(d, "phi.txt"), "w") as f:
        for row in phi:
            f.write(" ".join(repr(float(x)) for x in row) + "\n")
    cum = np.cumsum(phi, axis=1)
    with open(os.path.join(d, "corpus.txt"), "w") as f:
        f.write(json.dumps({"docs": D, "train": TRAIN, "V": V, "K": K, "alpha": ALPHA,
                            "beta": BETA, "seed": SEED}) + "\n")
        for _ in range(D):
            th = rng.dirichlet(np.full(K, ALPHA))
            n = max(2, rng.poisson(MEANLEN))
            z = rng.choice(K, size=n, p=th)
            u = rng.random(n)
            w = [min(int(np.searchsorted(cum[k], x, side="right")), V - 1) for k, x in zip(z, u)]
            f.write(str(int(np.argmax(th))) + " " + " ".join(map(str, w)) + "\n")


def read_corpus(d):
    with open(os.path.join(d, "corpus.txt")) as f:
        meta = json.loads(f.readline())
        labels, docs = [], []
        for line in f:
            x = list(map(int, line.split()))
            labels.append(x[0])
            docs.append(x[1:])
    phi = np.loadtxt(os.path.join(d, "phi.txt"))
    return meta, labels, docs, phi


def hellinger_matched(true_phi, phi):
    from scipy.optimize import linear_sum_assignment
    h = np.sqrt(np.maximum(0, 1 - np.sqrt(true_phi) @ np.sqrt(phi).T))
    r, c = linear_sum_assignment(h)
    return float(h[r, c].mean())


def nmi(a, b):
    from sklearn.metrics import normalized_mutual_info_score
    return float(normalized_mutual_info_score(a, b))


def run_system(system, d):
    import scipy.sparse as sp
    meta, labels, docs, true_phi = read_corpus(d)
    train, test = docs[:meta["train"]], docs[meta["train"]:]

    def csr(ds):
        rows, cols = [], []
        for i, doc in enumerate(ds):
            rows += [i] * len(doc)
            cols += doc
        return sp.csr_matrix((np.ones(len(rows)), (rows, cols)), shape=(len(ds), V))

    X = csr(train)
    first = csr([doc[: len(doc) // 2] for doc in test])
    second = [doc[len(doc) // 2:] for doc in test]
    t0, c0 = time.perf_counter(), time.process_time()
    if system.startswith("sklearn"):
        from sklearn.decomposition import LatentDirichletAllocation
        lda = LatentDirichletAllocation(n_components=K, doc_topic_prior=ALPHA,
                                        learning_method=system.split("-")[1], random_state=0)
        theta_train = lda.fit_transform(X)
        secs, cpu = time.perf_counter() - t0, time.process_time() - c0
        phi = lda.components_ / lda.components_.sum(axis=1, keepdims=True)
        theta_test = lda.transform(first)
    else:
        from gensim.models import LdaModel
        bow = [list(zip(*np.unique(doc, return_counts=True))) for doc in train]
        bow = [[(int(a), int(b)) for a, b in doc] for doc in bow]
        lda = LdaModel(corpus=bow, num_topics=K, id2word={i: str(i) for i in range(V)},
                       alpha=[ALPHA] * K, passes=5, random_state=0)
        secs, cpu = time.perf_counter() - t0, time.process_time() - c0
        phi = lda.get_topics()

        def theta_of(corp):
            g, _ = lda.inference(corp)
            return g / g.sum(axis=1, keepdims=True)
        theta_train = theta_of(bow)
        fb = [[(int(a), int(b)) for a, b in zip(*np.unique(doc[: len(doc) // 2], return_counts=True))] for doc in test]
        theta_test = theta_of(fb)
    ll, n = 0.0, 0
    for th, doc in zip(theta_test, second):
        p = th @ phi[:, doc]
        ll += float(np.log(p).sum())
        n += len(doc)
    ru = resource.getrusage(resource.RUSAGE_SELF)
    peak = ru.ru_maxrss / 1024
    print(json.dumps({"bench": "synthetic-lda", "system": system, "corpus": "D20000-V3000-K20",
                      "seconds": round(secs, 3), "cpu_seconds_fit": round(cpu, 3),
                      "cpu_seconds_process": round(ru.ru_utime + ru.ru_stime, 3),
                      "peak_mb": round(peak, 1),
                      "hellinger": round(hellinger_matched(true_phi, phi), 4),
                      "ll_per_token": round(ll / n, 4),
                      "nmi": round(nmi(labels[:meta["train"]], np.argmax(theta_train, axis=1)), 4)}),
          flush=True)


def main():
    if len(sys.argv) > 2 and sys.argv[1] == "--system":
        run_system(sys.argv[2], sys.argv[3])
        return
    d = sys.argv[1] if len(sys.argv) > 1 else "/tmp/undercurrent-bench"
    os.makedirs(d, exist_ok=True)
    if not os.path.exists(os.path.join(d, "corpus.txt")):
        make_corpus(d)
    if os.environ.get("BENCH_CORPUS_ONLY"):
        return
    for system in ["sklearn-batch", "sklearn-online", "gensim"]:
        subprocess.run([sys.executable, __file__, "--system", system, d], check=True)


if __name__ == "__main__":
    main()
