#!/usr/bin/python3
"""Write reference.json: metric values computed by scikit-learn (and, for
CITL and ECE, which scikit-learn does not offer, by numpy in this script) on
small deterministic datasets, for the Go tests of package metrics.

Run with Debian's python3-sklearn:  /usr/bin/python3 make_reference.py
The datasets are random numbers from a fixed seed, not patient data.
"""
import json
import sys
import warnings

import numpy as np
import sklearn
from sklearn.exceptions import UndefinedMetricWarning
from sklearn.metrics import (
    accuracy_score,
    brier_score_loss,
    confusion_matrix,
    log_loss,
    precision_score,
    recall_score,
    roc_auc_score,
)

LOG_LOSS_EPS = 1e-15  # same clip as metrics.LogLossEps


def datasets():
    rng = np.random.default_rng(20240611)
    out = []

    # Coarse scores (one decimal) give many ties; small integer weights.
    n = 40
    y = rng.integers(0, 2, n)
    s = np.round(np.clip(0.3 + 0.4 * y + rng.normal(0, 0.2, n), 0, 1), 1)
    w = rng.integers(1, 4, n).astype(float)
    out.append(("ties_integer_weights", y, s, w, 0.5, 10))

    # Continuous scores, continuous weights.
    n = 500
    y = rng.integers(0, 2, n)
    s = np.where(y == 1, rng.beta(4, 2, n), rng.beta(2, 4, n))
    w = rng.exponential(1.0, n)
    out.append(("continuous_weighted", y, s, w, 0.5, 10))

    # Scores on a 0.05 grid including exact 0 and 1 (log-loss clipping),
    # zero weights, and 15 bins.
    n = 300
    y = (rng.random(n) < 0.3).astype(int)
    s = np.round(np.clip(0.2 + 0.5 * y + rng.normal(0, 0.3, n), 0, 1) * 20) / 20
    s[:3] = [0.0, 1.0, 0.0]
    y[:3] = [1, 0, 0]
    w = rng.gamma(2.0, 0.5, n)
    w[rng.random(n) < 0.1] = 0.0
    out.append(("grid_clipped_zero_weights", y, s, w, 0.3, 15))

    # Unweighted.
    n = 200
    y = rng.integers(0, 2, n)
    s = 1 / (1 + np.exp(-(rng.normal(0, 1, n) + 1.2 * (y - 0.5))))
    out.append(("unweighted", y, s, None, 0.4, 10))

    # Threshold above every score: no positive decisions, so PPV is undefined.
    n = 60
    y = rng.integers(0, 2, n)
    s = rng.random(n)
    w = rng.random(n) + 0.5
    out.append(("no_positive_decisions", y, s, w, 1.01, 5))
    return out


def ratio(num, den):
    return None if den == 0 else float(num / den)


def expected(y, s, w, t, bins):
    pred = (s >= t).astype(int)
    ww = np.ones(len(y)) if w is None else w
    # sklearn: confusion_matrix with sample_weight, rows = truth, cols = decision.
    tn, fp, fn, tp = confusion_matrix(y, pred, labels=[0, 1], sample_weight=w).ravel()
    e = {
        "tp": float(tp), "fp": float(fp), "tn": float(tn), "fn": float(fn),
        # rates derived from sklearn's confusion matrix
        "fpr": ratio(fp, fp + tn),
        "fnr": ratio(fn, fn + tp),
        "selection_rate": ratio(tp + fp, tp + fp + tn + fn),
    }
    with warnings.catch_warnings():
        warnings.simplefilter("error", UndefinedMetricWarning)
        for key, fn_, kw in [
            ("tpr", recall_score, {}),
            ("ppv", precision_score, {}),
            ("npv", precision_score, {"pos_label": 0}),
        ]:
            try:
                e[key] = float(fn_(y, pred, sample_weight=w, **kw))
            except UndefinedMetricWarning:
                e[key] = None  # sklearn warns: zero denominator
    e["accuracy"] = float(accuracy_score(y, pred, sample_weight=w))
    e["brier"] = float(brier_score_loss(y, s, sample_weight=w))
    e["log_loss"] = float(log_loss(y, s, sample_weight=w, eps=LOG_LOSS_EPS, labels=[0, 1]))
    e["auc"] = float(roc_auc_score(y, s, sample_weight=w))
    # Not in sklearn: computed here with numpy.
    e["calibration_in_the_large"] = float(np.sum(ww * s) / np.sum(ww) - np.sum(ww * y) / np.sum(ww))
    b = np.minimum(np.floor(s * bins).astype(int), bins - 1)
    ece = 0.0
    for k in range(bins):
        m = b == k
        wb = np.sum(ww[m])
        if wb > 0:
            ece += wb / np.sum(ww) * abs(np.sum(ww[m] * s[m]) / wb - np.sum(ww[m] * y[m]) / wb)
    e["ece"] = float(ece)
    return e


def main():
    cases = []
    for name, y, s, w, t, bins in datasets():
        cases.append({
            "name": name,
            "labels": [int(v) for v in y],
            "scores": [float(v) for v in s],
            "weights": None if w is None else [float(v) for v in w],
            "threshold": t,
            "bins": bins,
            "expected": expected(y, s, w, t, bins),
        })
    doc = {
        "generator": "testdata/metrics/make_reference.py",
        "python": sys.version.split()[0],
        "sklearn_version": sklearn.__version__,
        "numpy_version": np.__version__,
        "log_loss_eps": LOG_LOSS_EPS,
        "numpy_computed": ["calibration_in_the_large", "ece"],
        "cases": cases,
    }
    with open("reference.json", "w") as f:
        json.dump(doc, f, indent=1)
        f.write("\n")


if __name__ == "__main__":
    main()
