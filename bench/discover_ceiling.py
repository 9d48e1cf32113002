"""What clustering can reach on the bench:discover protocol when the pool is ideal.

For each left-out category: an oracle pool of a seeded random share A of that category's test
passages and a share B of every other test passage (the issue's pool targets are A = 0.6,
B = 0.3); scikit-learn's KMeans (k-means++, n_init=5, random_state=0) for k = 2..12 on TF-IDF
of the passages' analysed lemmas; the F1 of the cluster that best matches the category (recall
over the category's passages in the pool), at the k of the best mean silhouette and at the best
k. A benchmark aid, run by bench/discover-ceiling.mjs with Debian's python3-sklearn.

usage: discover_ceiling.py PASSAGES.json SEED A B CATEGORY...
       discover_ceiling.py pool OUT WORK DISCOVER.json THEME

The second form bounds the clustering of the pool trellis actually gave on a protocol of
../shared/bench/fewshot.py (OUT, run in WORK with --leave-out THEME; DISCOVER.json is
`trellis discover --json` on that study): the F1 of a perfect cluster of that pool (every
left-out passage in it and nothing else: 2r / (1 + r) for pool recall r), and scikit-learn's
KMeans on the same pool (TF-IDF of the passages' text, k = 2..12), scored as the shared script
scores trellis's clusters (F1 against all the left-out theme's test passages).
"""
import json
import sys

import numpy as np
from sklearn.cluster import KMeans
from sklearn.feature_extraction.text import TfidfVectorizer
from sklearn.metrics import silhouette_score



def same_pool(src, work, found_path, leave):
    import os
    sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
    from fewshot_passages import fewshot, matched
    text, hold = {}, set()
    for s, hit in matched(src, work):
        text[s["passage_id"]] = s["text"]
        if hit["split"] == "test" and any(fewshot.under(th, leave) for th in hit["themes"]):
            hold.add(s["passage_id"])
    found = json.load(open(found_path, encoding="utf-8"))
    pool = [pid for pid in found.get("unclaimed", []) if pid in text]
    y = np.array([pid in hold for pid in pool])
    r = y.sum() / max(len(hold), 1)
    out = {"pool": len(pool), "left_out_in_pool": int(y.sum()), "left_out": len(hold), "perfect_cluster_f1": float(2 * r / (1 + r)) if r else 0.0}
    if len(pool) > 12:
        X = TfidfVectorizer(sublinear_tf=True, stop_words="english").fit_transform([text[pid] for pid in pool])
        by_k = []
        for k in range(2, 13):
            labels = KMeans(n_clusters=k, n_init=5, random_state=0).fit(X).labels_
            f1 = max(2 * (y & (labels == j)).sum() / ((labels == j).sum() + len(hold)) for j in range(k))
            by_k.append({"k": k, "f1": float(f1), "silhouette": float(silhouette_score(X, labels, sample_size=min(3000, len(pool)), random_state=0))})
        out.update({"kmeans_best_f1": max(b["f1"] for b in by_k), "kmeans_f1_at_silhouette_k": max(by_k, key=lambda b: b["silhouette"])["f1"], "by_k": by_k})
    print(json.dumps(out))


if sys.argv[1] == "pool":
    same_pool(*sys.argv[2:6])
    sys.exit(0)
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
