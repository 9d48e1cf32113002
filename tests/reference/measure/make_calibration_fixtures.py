#!/usr/bin/python3
"""Reference values for tests/measure/calibration.test.ts and acceptance.test.ts, produced once.

Run with Debian's python3-sklearn (1.2.1 when these fixtures were made):
    /usr/bin/python3 tests/reference/measure/make_calibration_fixtures.py
It rewrites calibration.json beside this script. All data are invented here (seeded).

Per-bin accuracy and mean confidence come from scikit-learn's calibration_curve (uniform
strategy, which reports non-empty bins only); the bin counts that weight them, and so the
expected calibration error, are counted here with numpy on the same edges.
"""
import json
import os

import numpy as np
import sklearn
from sklearn.calibration import calibration_curve

HERE = os.path.dirname(os.path.abspath(__file__))


def reference(conf, outcome, n_bins):
    conf = np.asarray(conf, dtype=float)
    y = np.asarray(outcome, dtype=int)
    prob_true, prob_pred = calibration_curve(y, conf, n_bins=n_bins, strategy="uniform")
    edges = np.linspace(0.0, 1.0, n_bins + 1)
    # The same assignment calibration_curve makes (searchsorted on the inner edges).
    ids = np.searchsorted(edges[1:-1], conf)
    counts = np.bincount(ids, minlength=n_bins)
    nonempty = np.nonzero(counts)[0]
    ece = float(np.sum(counts[nonempty] / len(conf) * np.abs(prob_true - prob_pred)))
    return {
        "nonempty_bins": nonempty.tolist(),
        "counts": counts.tolist(),
        "prob_true": prob_true.tolist(),
        "prob_pred": prob_pred.tolist(),
        "ece": ece,
    }


def main():
    rng = np.random.default_rng(7)
    cases = []

    def add(name, conf, outcome, n_bins=10):
        conf = [float(c) for c in conf]
        outcome = [bool(o) for o in outcome]
        cases.append({"name": name, "bins": n_bins, "confidences": conf, "outcomes": outcome,
                      **reference(conf, outcome, n_bins)})

    # The example worked by hand in tests/measure/calibration.test.ts (ECE 0.2).
    add("hand-worked example", [0.05, 0.15, 0.15, 0.45, 0.45, 0.45, 0.85, 0.95],
        [False, False, True, False, True, True, True, True])
    # Over-confident suggester: accepted less often than its confidence says.
    c = rng.uniform(0, 1, 300)
    add("over-confident", c, rng.uniform(0, 1, 300) < c * 0.7)
    # Roughly calibrated.
    c = rng.beta(2, 2, 400)
    add("calibrated", c, rng.uniform(0, 1, 400) < c)
    # Values on the bin edges, 0 and 1 included, to pin the right-closed bins.
    edges = [0.0, 0.1, 0.2, 0.3, 0.4, 0.5, 0.6, 0.7, 0.8, 0.9, 1.0] * 3
    add("edge values", edges, rng.uniform(0, 1, len(edges)) < 0.5)
    # Five bins instead of ten.
    c = rng.uniform(0.2, 1.0, 120)
    add("five bins", c, rng.uniform(0, 1, 120) < c, n_bins=5)

    out = {"generator": "tests/reference/measure/make_calibration_fixtures.py",
           "sklearn": sklearn.__version__, "numpy": np.__version__, "cases": cases}
    with open(os.path.join(HERE, "calibration.json"), "w") as f:
        json.dump(out, f, indent=1)
        f.write("\n")
    for case in cases:
        print(f'{case["name"]:15s} ECE={case["ece"]:.6f} counts={case["counts"]}')


if __name__ == "__main__":
    main()
