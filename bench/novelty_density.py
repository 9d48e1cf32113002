"""A density-ratio novelty score on the bench:discover protocol, tried and not kept
(docs/discovery.md, "The ceiling").

For each test passage: the mean cosine to its K nearest coded passages, and to its K * (uncoded /
coded) nearest uncoded passages of other transcripts. The score is the second minus the first.
Material the template lacks should be denser among the uncoded passages than near the coded ones.
The script prints the AUC of "the left-out category scores higher", per passage and averaged over
the transcript. Reads the passages file that bench/discover-ceiling.mjs writes; Debian's
python3-sklearn.

usage: novelty_density.py bench/out/ceiling-passages-1.json CATEGORY [K]
"""
import json
import sys

import numpy as np
from sklearn.feature_extraction.text import TfidfVectorizer
from sklearn.metrics import roc_auc_score

passages = json.load(open(sys.argv[1], encoding="utf-8"))
left, K = sys.argv[2], int(sys.argv[3]) if len(sys.argv) > 3 else 10
coded = np.array([p["coded"] and p["label"] != left for p in passages])
label = np.array([p["label"] for p in passages])
transcript = np.array([p["transcript"] for p in passages])
X = TfidfVectorizer(token_pattern=r"\S+", sublinear_tf=True, min_df=2).fit_transform([" ".join(p["terms"]) for p in passages])
test = np.where(~coded)[0]
S = (X[test] @ X.T).toarray()
S[transcript[test][:, None] == transcript[None, :]] = -1  # never a passage's own transcript
ku = int(round(K * (~coded).sum() / coded.sum()))
near_coded = -np.sort(-S[:, coded], axis=1)[:, :K].mean(1)
near_uncoded = -np.sort(-S[:, ~coded], axis=1)[:, :ku].mean(1)
score = near_uncoded - near_coded
smooth = np.zeros_like(score)
for t in np.unique(transcript[test]):
    m = transcript[test] == t
    smooth[m] = score[m].mean()
y = label[test] == left
print(json.dumps({"left_out": left, "auc_passage": roc_auc_score(y, score), "auc_transcript": roc_auc_score(y, smooth)}))
