#!/usr/bin/python3
"""Make sklearn_heldout.json for topics/heldout_test.go: a corpus drawn from a known LDA
model (numpy seeded) and scikit-learn's batch LDA fitted to it (Debian python3-sklearn).

Run with Debian's interpreter:  /usr/bin/python3 gen_sklearn_heldout.py > sklearn_heldout.json

Model: K = 8 topics φ_k ~ Dirichlet(0.1) over V = 200 words, θ_d ~ Dirichlet(0.1),
length ~ Poisson(50) (at least 4); 600 training and 150 held-out documents, tokens listed in
the order drawn. scikit-learn: LatentDirichletAllocation(n_components=8,
doc_topic_prior=0.1, topic_word_prior=0.1, learning_method='batch', max_iter=50,
random_state=0). Stored: its φ (components_ normalised by row) and its own held-out
document-completion log-likelihood per token (θ = transform() of each held-out document's
first half, second half scored as Σ log Σ_k θ_k φ_kw).
"""
import json
import sys

import numpy as np
import sklearn
import scipy.sparse as sp
from sklearn.decomposition import LatentDirichletAllocation

K, V, ALPHA, BETA, NTRAIN, NTEST = 8, 200, 0.1, 0.1, 600, 150
rng = np.random.default_rng(7)
phi = rng.dirichlet(np.full(V, BETA), size=K)
docs = []
for _ in range(NTRAIN + NTEST):
    th = rng.dirichlet(np.full(K, ALPHA))
    n = max(4, int(rng.poisson(50)))
    z = rng.choice(K, size=n, p=th)
    docs.append([int(rng.choice(V, p=phi[k])) for k in z])
train, test = docs[:NTRAIN], docs[NTRAIN:]


def csr(ds):
    rows, cols = [], []
    for i, d in enumerate(ds):
        rows += [i] * len(d)
        cols += d
    return sp.csr_matrix((np.ones(len(rows)), (rows, cols)), shape=(len(ds), V))


lda = LatentDirichletAllocation(n_components=K, doc_topic_prior=ALPHA, topic_word_prior=BETA,
                                learning_method="batch", max_iter=50, random_state=0)
lda.fit(csr(train))
sk_phi = lda.components_ / lda.components_.sum(axis=1, keepdims=True)
theta = lda.transform(csr([d[: len(d) // 2] for d in test]))
ll, n = 0.0, 0
for th, d in zip(theta, test):
    second = d[len(d) // 2:]
    ll += float(np.log(th @ sk_phi[:, second]).sum())
    n += len(second)
json.dump({"sklearn_version": sklearn.__version__, "K": K, "V": V, "alpha": ALPHA,
           "train": train, "test": test, "sklearn_phi": sk_phi.tolist(),
           "sklearn_ll_per_token": ll / n}, sys.stdout)
sys.stdout.write("\n")
