#!/usr/bin/python3
"""Reference values for tests/measure/kappa, alpha and agreement tests, produced once.

Run with Debian's python3-sklearn (1.2.1 when these fixtures were made):
    /usr/bin/python3 tests/reference/measure/make_agreement_fixtures.py
It rewrites agreement.json beside this script. All data are invented here (seeded).

Cohen's kappa comes from scikit-learn's cohen_kappa_score. The `krippendorff` Python package is
not installed here, so Krippendorff's alpha comes from `alpha_pairwise` below: a deliberately
plain implementation of the pairwise-disagreement form of alpha (every ordered pair of values
within a unit for D_o, every ordered pair of pairable values in the whole data for D_e), which
shares no code and no method with the coincidence-matrix code under test.
"""
import json
import math
import os
import random

import numpy as np
import sklearn
from sklearn.metrics import cohen_kappa_score

HERE = os.path.dirname(os.path.abspath(__file__))


def delta(level, x, y):
    if level == "nominal":
        return 0.0 if x == y else 1.0
    return float(x - y) ** 2


def alpha_pairwise(data, level="nominal"):
    """data[coder][unit], None = missing. Returns alpha, or None when undefined."""
    n_units = len(data[0]) if data else 0
    units = []
    for u in range(n_units):
        vals = [row[u] for row in data if row[u] is not None]
        if len(vals) >= 2:
            units.append(vals)
    pool = [v for vals in units for v in vals]
    n = len(pool)
    if n == 0:
        return None
    d_o = 0.0
    for vals in units:
        m = len(vals)
        s = 0.0
        for i in range(m):
            for j in range(m):
                if i != j:
                    s += delta(level, vals[i], vals[j])
        d_o += s / (m - 1)
    d_o /= n
    d_e = 0.0
    for i in range(n):
        for j in range(n):
            if i != j:
                d_e += delta(level, pool[i], pool[j])
    d_e /= n * (n - 1)
    if d_e == 0:
        return None
    return 1.0 - d_o / d_e


def kappa_or_none(a, b):
    import warnings

    with warnings.catch_warnings():
        warnings.simplefilter("ignore")
        k = cohen_kappa_score(a, b)
    return None if (k is None or math.isnan(k)) else float(k)


def kappa_pairs(rng):
    pairs = []

    def add(name, a, b):
        pairs.append({"name": name, "a": a, "b": b, "kappa": kappa_or_none(a, b)})

    # Two coders who mostly agree on a binary presence/absence.
    truth = [int(rng.random() < 0.35) for _ in range(60)]
    flip = lambda v, p: [1 - x if rng.random() < p else x for x in v]
    add("binary, mostly agreeing", flip(truth, 0.1), flip(truth, 0.15))
    # A rare theme: high percent agreement, modest kappa.
    rare = [int(rng.random() < 0.08) for _ in range(80)]
    add("binary, rare theme", rare, flip(rare, 0.06))
    # Independent coders: kappa near 0.
    add("binary, independent", [int(rng.random() < 0.5) for _ in range(50)], [int(rng.random() < 0.5) for _ in range(50)])
    # Systematic disagreement: negative kappa.
    base = [int(rng.random() < 0.5) for _ in range(30)]
    add("binary, opposite", base, flip([1 - x for x in base], 0.1))
    # Several themes as string labels, one per passage.
    cats = ["Workload", "Wellbeing", "Management", "Training"]
    t = [rng.choice(cats) for _ in range(45)]
    add("four string labels", t, [x if rng.random() < 0.7 else rng.choice(cats) for x in t])
    # One coder constant: defined (p_e < 1), and 0 here.
    add("one coder constant", [0] * 10, [0, 1, 0, 0, 1, 0, 0, 0, 1, 0])
    # Both constant, different labels: p_o = p_e = 0, kappa = 0.
    add("both constant, different labels", [1] * 8, [0] * 8)
    # Both constant, same label: undefined (scikit-learn returns nan).
    add("both constant, same label", [0] * 12, [0] * 12)
    # Perfect agreement.
    add("perfect", [1, 0, 1, 1, 0, 0, 1], [1, 0, 1, 1, 0, 0, 1])
    return pairs


def random_reliability(rng, coders, units, values, missing):
    data = [[rng.choice(values) if rng.random() >= missing else None for _ in range(units)] for _ in range(coders)]
    # Make agreement better than chance for some units by copying coder 0's value.
    for u in range(units):
        if data[0][u] is not None and rng.random() < 0.5:
            for c in range(1, coders):
                if data[c][u] is not None:
                    data[c][u] = data[0][u]
    return data


def alpha_sets(rng):
    sets = []
    specs = [
        ("3 coders x 40 units, 5 values, 30% missing", 3, 40, [1, 2, 3, 4, 5], 0.3, "nominal"),
        ("5 coders x 25 units, strings, 40% missing", 5, 25, ["a", "b", "c"], 0.4, "nominal"),
        ("2 coders x 60 units, binary, 20% missing", 2, 60, [0, 1], 0.2, "nominal"),
        ("4 coders x 30 units, 1-7, 35% missing, interval", 4, 30, [1, 2, 3, 4, 5, 6, 7], 0.35, "interval"),
        ("3 coders x 20 units, decimals, interval", 3, 20, [0.5, 1.25, 2.0, 3.75], 0.1, "interval"),
    ]
    for name, c, u, values, missing, level in specs:
        data = random_reliability(rng, c, u, values, missing)
        sets.append({"name": name, "level": level, "data": data, "alpha": alpha_pairwise(data, level)})
    return sets


def study_expectations(study):
    """Per-theme and pooled figures by the rules stated in src/measure/agreement.ts."""
    coders, passages, themes = study["coders"], study["passages"], study["themes"]
    looked = {(r["coder"], r["passageId"]) for r in study["coded"]}
    has = set()
    for r in study["codings"]:
        looked.add((r["coder"], r["passageId"]))
        has.add((r["coder"], r["passageId"], r["themeId"]))
    pairable = [p for p in passages if sum((c, p) in looked for c in coders) >= 2]

    def value(c, p, t):
        if (c, p) not in looked:
            return None
        return 1 if (c, p, t) in has else 0

    def figures(rows):
        units = 0
        agree = 0
        pairs = 0
        for u in range(len(rows[0])):
            vals = [r[u] for r in rows if r[u] is not None]
            if len(vals) < 2:
                continue
            units += 1
            for i in range(len(vals)):
                for j in range(i + 1, len(vals)):
                    pairs += 1
                    agree += vals[i] == vals[j]
        kappa = None
        if len(rows) == 2:
            both = [u for u in range(len(rows[0])) if rows[0][u] is not None and rows[1][u] is not None]
            if both:
                kappa = kappa_or_none([rows[0][u] for u in both], [rows[1][u] for u in both])
        return {
            "units": units,
            "percentAgreement": agree / pairs if pairs else None,
            "kappa": kappa,
            "alpha": alpha_pairwise(rows, "nominal"),
        }

    per_theme = []
    for t in themes:
        rows = [[value(c, p, t) for p in pairable] for c in coders]
        f = figures(rows)
        f["themeId"] = t
        per_theme.append(f)
    pooled_rows = [[value(c, p, t) for p in pairable for t in themes] for c in coders]

    def mean(key):
        got = [f[key] for f in per_theme if f[key] is not None]
        return (sum(got) / len(got) if got else None), len(got)

    m = {}
    for key in ("percentAgreement", "kappa", "alpha"):
        m[key], m["n_" + key] = mean(key)
    return {"pairablePassages": len(pairable), "themes": per_theme, "pooled": figures(pooled_rows), "meanOfThemes": m}


def random_study(rng, name, coders, n_passages, themes, p_look, p_theme):
    passages = [f"p{i:03d}" for i in range(n_passages)]
    coded, codings = [], []
    # A shared "truth" per passage that coders follow with some noise.
    truth = {p: [t for t in themes if rng.random() < p_theme.get(t, 0.25)] for p in passages}
    for c in coders:
        for p in passages:
            if rng.random() >= p_look:
                continue
            coded.append({"coder": c, "passageId": p})
            for t in themes:
                rate = p_theme.get(t, 0.25)
                present = (t in truth[p]) if rng.random() < 0.8 else (rng.random() < rate)
                # One theme that only the first coder ever applies.
                if t == "T-first-only" and c != coders[0]:
                    present = False
                if present:
                    codings.append({"coder": c, "passageId": p, "themeId": t})
    # A coding by a coder with no `coded` row: it implies the coder looked at the passage.
    extra = {"coder": coders[-1], "passageId": passages[-1], "themeId": themes[0]}
    if not any(r["coder"] == extra["coder"] and r["passageId"] == extra["passageId"] for r in coded):
        codings.append(extra)
    study = {"passages": passages, "coders": coders, "themes": themes, "codings": codings, "coded": coded}
    return {"name": name, "input": study, "expected": study_expectations(study)}


def main():
    rng = random.Random(20240611)
    studies = [
        random_study(rng, "two coders, some passages seen by one only", ["ana", "ben"], 36,
                     ["Workload", "Wellbeing", "Management", "T-unused", "T-first-only"], 0.85,
                     {"Workload": 0.4, "Wellbeing": 0.3, "Management": 0.15, "T-unused": 0.0, "T-first-only": 0.2}),
        random_study(rng, "three coders, missing values", ["ana", "ben", "cai"], 40,
                     ["Workload", "Wellbeing", "Management", "Training", "T-unused"], 0.7,
                     {"Workload": 0.45, "Wellbeing": 0.3, "Management": 0.2, "Training": 0.1, "T-unused": 0.0}),
    ]
    # The paper's worked example (its table as quoted in tests/measure/alpha.test.ts), as a check
    # that the pairwise implementation used here reproduces the published 0.743.
    paper = [
        [1, 2, 3, 3, 2, 1, 4, 1, 2, None, None, None],
        [1, 2, 3, 3, 2, 2, 4, 1, 2, 5, None, 3],
        [None, 3, 3, 3, 2, 3, 4, 2, 2, 5, 1, None],
        [1, 2, 3, 3, 2, 4, 4, 1, 2, 5, 1, None],
    ]
    paper_alpha = alpha_pairwise(paper)
    assert abs(paper_alpha - 0.743) < 5e-4, paper_alpha
    assert abs(alpha_pairwise(paper, "interval") - 0.849) < 5e-4
    out = {
        "generator": "tests/reference/measure/make_agreement_fixtures.py",
        "sklearn": sklearn.__version__,
        "numpy": np.__version__,
        "alpha_method": "pairwise-disagreement implementation in the script (krippendorff package not installed)",
        "paper_example_alpha_pairwise": paper_alpha,
        "paper_example_interval_alpha_pairwise": alpha_pairwise(paper, "interval"),
        "kappa_pairs": kappa_pairs(rng),
        "alpha_sets": alpha_sets(rng),
        "studies": studies,
    }
    with open(os.path.join(HERE, "agreement.json"), "w") as f:
        json.dump(out, f, indent=1)
        f.write("\n")
    print("paper example, pairwise alpha:", paper_alpha)
    for p in out["kappa_pairs"]:
        print(f'{p["name"]:35s} kappa={p["kappa"]}')
    for s in out["alpha_sets"]:
        print(f'{s["name"]:50s} alpha={s["alpha"]}')


if __name__ == "__main__":
    main()
