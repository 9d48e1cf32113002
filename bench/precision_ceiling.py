#!/usr/bin/python3
"""How precise could the above-threshold suggestions be at all? An upper bound, read off the test.

  precision_ceiling.py OUT WORK SUGGEST_JSON PEER_RECALL

OUT is a protocol folder built by ../shared/bench/fewshot.py, WORK the folder its `run` used (it holds
sheet.csv), SUGGEST_JSON the output of `trellis suggest --json --top 10` on that study. Every candidate
of every test passage is ranked by its confidence, and the script reports the best precision (exact
theme) any single cut reaches at a recall of at least PEER_RECALL: an oracle threshold chosen on the
test itself. A second bound gives every theme its own oracle cut (chosen greedily by precision),
which no rule fitted on the coded batch can beat either. The same global oracle is applied to the
scikit-learn peer's scores (the shared script's models, trained on the same coded passages), so the
bound can be read as a property of the data, not of trellis's model alone.
"""
import json, os, sys
from collections import defaultdict

HERE = os.path.dirname(os.path.abspath(__file__))
sys.path.insert(0, HERE)
from fewshot_passages import fewshot, matched  # noqa: E402  (passages mapped as the shared script maps them)

src, work, sugg, peer_recall = sys.argv[1], sys.argv[2], sys.argv[3], float(sys.argv[4])
truth = {}
train, test = [], []
for s, hit in matched(src, work):
    if hit["split"] == "test" and hit["themes"]:
        truth[s["passage_id"]] = set(hit["themes"])
        test.append({"pid": s["passage_id"], "text": s["text"], "themes": hit["themes"]})
    elif hit["split"] == "train" and hit["themes"]:
        train.append({"pid": s["passage_id"], "text": s["text"], "themes": hit["themes"]})
res = json.load(open(sugg, encoding="utf-8"))
gold = sum(len(T) for T in truth.values())
cells = []  # (confidence, correct, theme)
firsts = []  # the first candidate of each passage only
for it in res["passages"]:
    T = truth.get(it["passage_id"])
    if T is None:
        continue
    seen = set()
    for c in it.get("candidates", []):
        th = fewshot.npath(c["theme"])
        if th in seen:
            continue
        seen.add(th)
        cells.append((float(c["confidence"]), th in T, th))
        if len(seen) == 1:
            firsts.append((float(c["confidence"]), th in T))
cells.sort(key=lambda c: -c[0])
need = peer_recall * gold


def oracle(ranked):
    best, ok = 0.0, 0
    for i, c in enumerate(ranked, 1):
        ok += c[1]
        if ok >= need:
            best = max(best, ok / i)
    return best


best = oracle(cells)
first_only = oracle(sorted(firsts, key=lambda c: -c[0]))
# Per-theme oracle: each theme's prefixes by confidence, merged greedily by precision until the
# recall is reached (an upper bound of sorts: the best precision a per-theme threshold could give).
by_theme = defaultdict(list)
for c, y, th in cells:
    by_theme[th].append(y)
steps = []
for th, ys in by_theme.items():
    acc = 0
    for k, y in enumerate(ys, 1):
        acc += y
        steps.append((acc / k, th, k, acc))
steps.sort(key=lambda s: -s[0])
chosen = {}
for prec, th, k, acc in steps:
    if th not in chosen or k > chosen[th][0]:
        chosen[th] = (k, acc)
    tot = sum(v[0] for v in chosen.values())
    hit = sum(v[1] for v in chosen.values())
    if hit >= need:
        break
per_theme = hit / tot if tot else 0.0


def peer_oracles():
    """The global oracle on each scikit-learn model's scores (as the shared script fits them)."""
    import numpy as np
    from sklearn.feature_extraction.text import TfidfVectorizer
    from sklearn.linear_model import LogisticRegression
    from sklearn.multiclass import OneVsRestClassifier
    from sklearn.naive_bayes import ComplementNB, MultinomialNB
    from sklearn.preprocessing import MultiLabelBinarizer
    from sklearn.svm import LinearSVC
    vec = TfidfVectorizer(sublinear_tf=True, stop_words="english")
    A = vec.fit_transform([r["text"] for r in train])
    B = vec.transform([r["text"] for r in test])
    dup_rows = [i for i, r in enumerate(train) for _ in r["themes"]]
    dup_y = [th for r in train for th in r["themes"]]
    mlb = MultiLabelBinarizer()
    Y = mlb.fit_transform([r["themes"] for r in train])
    out = {}
    for name, model, how in [("complement_nb", ComplementNB(alpha=0.3), "dup"), ("multinomial_nb", MultinomialNB(alpha=0.1), "dup"),
                             ("logistic_regression", OneVsRestClassifier(LogisticRegression(C=10, max_iter=2000)), "ovr"),
                             ("linear_svc", OneVsRestClassifier(LinearSVC(C=0.5)), "ovr")]:
        if how == "dup":
            model.fit(A[dup_rows], dup_y)
            classes = model.classes_
            S = model.predict_log_proba(B) if name == "multinomial_nb" else model.decision_function(B) if hasattr(model, "decision_function") else model.predict_log_proba(B)
        else:
            model.fit(A, Y)
            classes = mlb.classes_
            S = model.decision_function(B)
        ranked = []
        for i, r in enumerate(test):
            T = set(r["themes"])
            for j in np.argsort(-S[i])[:10]:
                ranked.append((float(S[i][j]), classes[j] in T))
        out[name] = round(oracle(sorted(ranked, key=lambda c: -c[0])), 3)
    return out


above = sum(1 for c in cells if c[0] >= 0.5)
print(json.dumps({"gold": gold, "need_hits": round(need), "global_oracle_precision": round(best, 3),
                  "first_candidate_oracle_precision": round(first_only, 3),
                  "per_theme_oracle_precision": round(per_theme, 3), "peer_global_oracle_precision": peer_oracles(),
                  "candidates": len(cells),
                  "confidence_at_least_0.7": sum(1 for c in cells if c[0] >= 0.7),
                  "precision_at_confidence_0.7": round(sum(c[1] for c in cells if c[0] >= 0.7) / max(1, sum(1 for c in cells if c[0] >= 0.7)), 3)}))
