#!/usr/bin/python3
"""Reference values from scikit-learn for tests/text and tests/suggest, produced once.

Run with Debian's python3-sklearn (1.2.1 when these fixtures were made):
    /usr/bin/python3 tests/reference/make_fixtures.py
It rewrites tfidf.json, calibration.json and fewshot.json beside this script. All data are
invented here.
"""
import json
import os

import numpy as np
import sklearn
from sklearn.calibration import _sigmoid_calibration
from sklearn.feature_extraction.text import TfidfVectorizer
from sklearn.isotonic import IsotonicRegression

HERE = os.path.dirname(os.path.abspath(__file__))

# Pre-tokenised passages (content lemmas, as trellis stores them), including repeats so the
# sub-linear tf matters and a bigram-like term with a space.
TRAIN = [
    ["rota", "overtime", "rota", "shift", "night shift"],
    ["manager", "support", "listen", "support", "support"],
    ["overtime", "pay", "shift", "shift", "rota"],
    ["training", "course", "manager", "support"],
    ["night shift", "handover", "late", "handover"],
    ["pay"],
]
TEST = [
    ["rota", "rota", "rota", "unseen", "pay"],
    ["support", "handover", "training"],
    ["unseen", "words", "only"],
]


def tfidf():
    vec = TfidfVectorizer(analyzer=lambda d: d, sublinear_tf=True)
    a = vec.fit_transform(TRAIN)
    b = vec.transform(TEST)
    terms = vec.get_feature_names_out().tolist()

    def rows(m):
        out = []
        for r in m.toarray():
            out.append({terms[j]: float(v) for j, v in enumerate(r) if v != 0})
        return out

    return {
        "sklearn": sklearn.__version__,
        "call": "TfidfVectorizer(analyzer=lambda d: d, sublinear_tf=True)",
        "train": TRAIN,
        "test": TEST,
        "vocabulary": terms,
        "idf": vec.idf_.tolist(),
        "train_rows": rows(a),
        "test_rows": rows(b),
    }


def calibration():
    rng = np.random.RandomState(7)
    n = 60
    y = (rng.rand(n) < 0.4).astype(int)
    scores = rng.normal(loc=np.where(y == 1, 1.0, -0.5), scale=1.0)
    scores = np.round(scores, 4)
    a, b = _sigmoid_calibration(scores, y)
    grid = np.linspace(-3, 3, 13)
    platt_p = 1.0 / (1.0 + np.exp(a * grid + b))

    # Isotonic: ties in x and violators, predictions inside and outside the fitted range.
    ix = np.array([0.1, 0.2, 0.2, 0.3, 0.35, 0.5, 0.5, 0.5, 0.6, 0.8, 0.9, 0.95])
    iy = np.array([0, 1, 0, 0, 1, 0, 1, 1, 0, 1, 1, 1], dtype=float)
    iso = IsotonicRegression(out_of_bounds="clip").fit(ix, iy)
    igrid = np.array([0.0, 0.1, 0.15, 0.2, 0.25, 0.33, 0.5, 0.55, 0.7, 0.85, 0.95, 1.2])
    return {
        "sklearn": sklearn.__version__,
        "platt": {
            "call": "sklearn.calibration._sigmoid_calibration(scores, labels) -> (a, b), p = 1/(1+exp(a*s+b))",
            "scores": scores.tolist(),
            "labels": y.tolist(),
            "a": float(a),
            "b": float(b),
            "grid": grid.tolist(),
            "p": platt_p.tolist(),
        },
        "isotonic": {
            "call": "IsotonicRegression(out_of_bounds='clip').fit(x, y).predict(grid)",
            "x": ix.tolist(),
            "y": iy.tolist(),
            "grid": igrid.tolist(),
            "predicted": iso.predict(igrid).tolist(),
            "x_thresholds": iso.X_thresholds_.tolist(),
            "y_thresholds": iso.y_thresholds_.tolist(),
        },
    }


# The few-example scorer's Complement Naive Bayes signal and its shared calibration.
# Passages: one transcript each; the first six coded with one flat theme each, the rest uncoded.
NB_DOCS = [
    ["rota", "overtime", "rota", "shift"],
    ["shift", "overtime", "pay"],
    ["manager", "support", "listen"],
    ["support", "manager", "training"],
    ["login", "password", "screen", "slow"],
    ["screen", "frozen", "login"],
    ["rota", "shift", "pay", "pay"],
    ["support", "listen", "training", "course"],
    ["password", "slow", "screen", "rota"],
]
NB_LABELS = ["hours", "hours", "support", "support", "system", "system"]


def fewshot():
    from sklearn.linear_model import LogisticRegression
    from sklearn.naive_bayes import ComplementNB
    vec = TfidfVectorizer(analyzer=lambda d: d, sublinear_tf=True)
    x = vec.fit_transform(NB_DOCS)  # idf from every passage of the study, coded or not
    n = len(NB_LABELS)
    nb = ComplementNB(alpha=0.3, norm=False).fit(x[:n], NB_LABELS)
    # ComplementNB adds no class prior when there are several classes: the joint
    # log-likelihood is X @ feature_log_prob_.T.
    jll = (x[n:] @ nb.feature_log_prob_.T)
    rng = np.random.RandomState(11)
    m = 80
    f = rng.normal(size=(m, 3))
    z = 1.5 * f[:, 0] - 1.0 * f[:, 1] + 0.2 * f[:, 2] - 0.5
    y = (rng.rand(m) < 1 / (1 + np.exp(-z))).astype(int)
    lr = LogisticRegression(C=1.0 / 10, tol=1e-10, max_iter=10000).fit(f, y)
    return {
        "sklearn": sklearn.__version__,
        "complement_nb": {
            "call": "TfidfVectorizer(analyzer=lambda d: d, sublinear_tf=True).fit_transform(docs); ComplementNB(alpha=0.3, norm=False).fit(x[:6], labels); x[6:] @ feature_log_prob_.T",
            "docs": NB_DOCS,
            "labels": NB_LABELS,
            "classes": nb.classes_.tolist(),
            "jll": jll.tolist(),
        },
        "logistic": {
            "call": "LogisticRegression(C=1/10).fit(x, y): ridge 10 on the weights, none on the intercept",
            "x": f.tolist(),
            "y": y.tolist(),
            "coef": lr.coef_[0].tolist(),
            "intercept": float(lr.intercept_[0]),
        },
    }


if __name__ == "__main__":
    for name, data in (("tfidf.json", tfidf()), ("calibration.json", calibration()), ("fewshot.json", fewshot())):
        with open(os.path.join(HERE, name), "w", encoding="utf-8") as f:
            json.dump(data, f, indent=1)
            f.write("\n")
        print("wrote", name)
