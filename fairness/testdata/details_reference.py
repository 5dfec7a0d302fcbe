"""Reference values for fairness/details_test.go (TestDescribeReference).

Run with Debian's Python (numpy 1.24.2, scikit-learn 1.2.1 on the
machine that made the committed file):

    /usr/bin/python3 fairness/testdata/details_reference.py > fairness/testdata/details_reference.json

The records are invented (random draws with a fixed seed). The expected
values come from numpy and scikit-learn, independent of our Go code:
confusion counts from sklearn.metrics.confusion_matrix, the reliability
curve from sklearn.calibration.calibration_curve(strategy="uniform"),
histograms from numpy.histogram, means and sample SDs from numpy, the
numeric standardised difference from those, and the categorical one from
the Yang & Dalton (2012) formula written with numpy.linalg.solve.
"""
import json

import numpy as np
from sklearn.calibration import calibration_curve
from sklearn.metrics import confusion_matrix

BINS = 5
THRESHOLD = 0.4
rng = np.random.default_rng(20240611)


def scores_off_edges(n):
    # calibration_curve puts a score equal to an inner edge into the lower
    # bin, our bins are [lo, hi): keep scores off the edges k/BINS.
    s = np.round(rng.uniform(0.01, 0.99, n), 3)
    on_edge = np.isclose((s * BINS) % 1, 0)
    s[on_edge] += 0.001
    return s


groups = {}
for name, n, mu, sd, probs in [("reference", 40, 12.5, 1.3, [0.5, 0.3, 0.2]),
                               ("comparison", 35, 11.8, 1.9, [0.3, 0.3, 0.4])]:
    s = scores_off_edges(n)
    y = (rng.uniform(size=n) < s).astype(int)
    groups[name] = {
        "labels": y.tolist(),
        "scores": s.tolist(),
        "hb": np.round(rng.normal(mu, sd, n), 3).tolist(),
        "clinic": rng.choice(3, size=n, p=probs).tolist(),
        "smoker": rng.choice(2, size=n, p=[0.7 if name == "reference" else 0.55, 0.3 if name == "reference" else 0.45]).tolist(),
    }

out = {"bins": BINS, "threshold": THRESHOLD, "groups": groups, "expected": {}}
exp = out["expected"]
for name, g in groups.items():
    y, s = np.array(g["labels"]), np.array(g["scores"])
    tn, fp, fn, tp = confusion_matrix(y, (s >= THRESHOLD).astype(int), labels=[0, 1]).ravel()
    prob_true, prob_pred = calibration_curve(y, s, n_bins=BINS, strategy="uniform")
    counts = np.bincount(np.minimum((s * BINS).astype(int), BINS - 1), minlength=BINS)
    exp[name] = {
        "confusion": {"tp": int(tp), "fp": int(fp), "tn": int(tn), "fn": int(fn)},
        "event_rate": prob_true.tolist(),
        "mean_score": prob_pred.tolist(),
        "count": [int(c) for c in counts if c > 0],
    }

ref, cmp = groups["reference"], groups["comparison"]
x_ref, x_cmp = np.array(ref["hb"]), np.array(cmp["hb"])
lo, hi = min(x_ref.min(), x_cmp.min()), max(x_ref.max(), x_cmp.max())
h_ref, edges = np.histogram(x_ref, bins=BINS, range=(lo, hi))
h_cmp, _ = np.histogram(x_cmp, bins=BINS, range=(lo, hi))
v_ref, v_cmp = x_ref.var(ddof=1), x_cmp.var(ddof=1)
exp["hb"] = {
    "edges": edges.tolist(),
    "reference": (h_ref / len(x_ref)).tolist(),
    "comparison": (h_cmp / len(x_cmp)).tolist(),
    "mean_reference": x_ref.mean(), "mean_comparison": x_cmp.mean(),
    "sd_reference": np.sqrt(v_ref), "sd_comparison": np.sqrt(v_cmp),
    "std_diff": (x_cmp.mean() - x_ref.mean()) / np.sqrt((v_ref + v_cmp) / 2),
}


def multinomial_smd(a, b, k):
    p_ref = np.bincount(a, minlength=k) / len(a)
    p_cmp = np.bincount(b, minlength=k) / len(b)
    pr, pc = p_ref[1:], p_cmp[1:]
    s = ((np.diag(pr) - np.outer(pr, pr)) + (np.diag(pc) - np.outer(pc, pc))) / 2
    d = pc - pr
    return p_ref.tolist(), p_cmp.tolist(), float(np.sqrt(d @ np.linalg.solve(s, d)))


for col, k in [("clinic", 3), ("smoker", 2)]:
    r, c, d = multinomial_smd(np.array(ref[col]), np.array(cmp[col]), k)
    exp[col] = {"reference": r, "comparison": c, "std_diff": d}

print(json.dumps(out))
