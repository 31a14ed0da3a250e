#!/usr/bin/python3
# Generates words.json: weighted log-odds with an informative Dirichlet prior (Monroe,
# Colaresi & Quinn 2008, eqs. 16, 20, 22), computed with numpy directly from the
# equations, with an informative prior alpha_w = alpha0 * background share.
#   /usr/bin/python3 gen_words.py > words.json
import json
import numpy as np

a = {"door": 12, "kicked": 4, "window": 3, "alarm": 9, "car": 1}
b = {"door": 5, "alarm": 20, "car": 14, "parked": 6, "window": 2}
background = {"door": 40, "kicked": 6, "window": 11, "alarm": 50, "car": 45, "parked": 9, "street": 30}
alpha0 = 10.0
vocab = sorted(set(a) | set(b))
ya = np.array([a.get(w, 0) for w in vocab], float)
yb = np.array([b.get(w, 0) for w in vocab], float)
bg = np.array([background[w] for w in vocab], float)
alpha = alpha0 * bg / sum(background.values())
a0 = alpha.sum()
na, nb = ya.sum(), yb.sum()
delta = np.log((ya + alpha) / (na + a0 - ya - alpha)) - np.log((yb + alpha) / (nb + a0 - yb - alpha))
se = np.sqrt(1 / (ya + alpha) + 1 / (yb + alpha))
print(json.dumps({"source": "numpy %s, Monroe et al. 2008 eqs. 16-22" % np.__version__,
                  "a": a, "b": b, "background": background, "alpha0": alpha0,
                  "scores": [{"word": w, "delta": float(d), "se": float(s), "z": float(d / s)}
                             for w, d, s in zip(vocab, delta, se)]}, indent=1))
