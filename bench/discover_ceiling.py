"""What clustering can reach on the bench:discover protocol when the pool is ideal.

For each left-out category: an oracle pool of a seeded random share A of that category's test
passages and a share B of every other test passage (the issue's pool targets are A = 0.6,
B = 0.3); scikit-learn's KMeans (k-means++, n_init=5, random_state=0) for k = 2..12 on TF-IDF
of the passages' analysed lemmas; the F1 of the cluster that best matches the category (recall
over the category's passages in the pool), at the k of the best mean silhouette and at the best
k. A benchmark aid, run by bench/discover-ceiling.mjs with Debian's python3-sklearn.

usage: discover_ceiling.py PASSAGES.json SEED A B CATEGORY...
"""
import json
import sys

import numpy as np
from sklearn.cluster import KMeans
from sklearn.feature_extraction.text import TfidfVectorizer
from sklearn.metrics import silhouette_score

path, seed, a, b = sys.argv[1], int(sys.argv[2]), float(sys.argv[3]), float(sys.argv[4])
passages = json.load(open(path, encoding="utf-8"))
for left in sys.argv[5:]:
    # Test passages: every passage of an uncoded sample; the left-out category is never coded.
    test = [p for p in passages if not p["coded"] or p["label"] == left]
    y = np.array([p["label"] == left for p in test])
    draw = np.random.RandomState(seed).rand(len(test))
    keep = np.where(y, draw < a, draw < b)
    pool = [p for p, k in zip(test, keep) if k]
    yp = y[keep]
    X = TfidfVectorizer(token_pattern=r"\S+", sublinear_tf=True).fit_transform([" ".join(p["terms"]) for p in pool])
    by_k = []
    for k in range(2, 13):
        labels = KMeans(n_clusters=k, n_init=5, random_state=0).fit(X).labels_
        f1 = max(2 * (yp & (labels == j)).sum() / ((labels == j).sum() + yp.sum()) for j in range(k))
        sil = silhouette_score(X, labels, sample_size=min(3000, len(pool)), random_state=0)
        by_k.append({"k": k, "f1": float(f1), "silhouette": float(sil)})
    chosen = max(by_k, key=lambda r: r["silhouette"])
    best = max(by_k, key=lambda r: r["f1"])
    print(json.dumps({"left_out": left, "pool": len(pool), "left_out_in_pool": int(yp.sum()), "k_silhouette": chosen["k"],
                      "f1_at_silhouette_k": chosen["f1"], "best_k": best["k"], "best_f1": best["f1"], "by_k": by_k}), flush=True)
