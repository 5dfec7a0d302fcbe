#!/usr/bin/python3
"""Reference fits for the Go tests of attribution/classify (Boosted).

Generates three synthetic binary classification problems with numpy
(seeded, deterministic), splits each into train and test rows, fits
scikit-learn's HistGradientBoostingClassifier with settings comparable to
classify.NewBoosted(), and writes

  <name>.csv.gz     the data: columns split ("train"/"test"), y, x0, x1, ...
  reference.json    per problem: sklearn's test log loss, the Bayes log loss
                    (from the true generating probabilities) and the settings,
                    plus sklearn.__version__ and numpy.__version__.

Run with Debian's interpreter (python3-sklearn):

  /usr/bin/python3 testdata/boost/make_reference.py

All data are invented for testing; they describe nothing real.
"""
import gzip
import json
import os

import numpy as np
import sklearn
from sklearn.ensemble import HistGradientBoostingClassifier
from sklearn.metrics import log_loss

HERE = os.path.dirname(os.path.abspath(__file__))
N_TRAIN, N_TEST = 10000, 5000
SETTINGS = dict(
    learning_rate=0.1,
    max_iter=200,
    max_leaf_nodes=31,
    max_depth=6,
    min_samples_leaf=20,
    l2_regularization=1.0,
    max_bins=255,
    early_stopping=True,
    validation_fraction=0.1,
    n_iter_no_change=10,
    tol=1e-7,
    scoring="loss",
)


def sigmoid(z):
    return 1.0 / (1.0 + np.exp(-z))


def interaction(rng, n):
    """log-odds = 1.5·x0·x1 − 0.3 + 0.5·x2; x3 is noise."""
    x = rng.standard_normal((n, 4))
    p = sigmoid(1.5 * x[:, 0] * x[:, 1] - 0.3 + 0.5 * x[:, 2])
    y = (rng.random(n) < p).astype(float)
    return x, y, p


def variance_shift(rng, n):
    """y ~ Bernoulli(0.4); x0 ~ N(0, 1) for y = 0 and N(0, 1.6²) for y = 1,
    so the true log-odds is log(0.4/0.6) − log 1.6 + x0²(1 − 1/1.6²)/2;
    x1 is noise."""
    y = (rng.random(n) < 0.4).astype(float)
    x = rng.standard_normal((n, 2))
    x[:, 0] *= np.where(y == 1, 1.6, 1.0)
    s = 1.6
    z = np.log(0.4 / 0.6) - np.log(s) + x[:, 0] ** 2 * (1 - 1 / s**2) / 2
    return x, y, sigmoid(z)


def categorical(rng, n):
    """A 4-level category (one-hot in x0..x3, level probabilities
    0.4/0.3/0.2/0.1) with level effects (−1, 0, 0.8, −0.4), plus a numeric
    x4 whose slope is 1.2 in level 2 and 0.3 elsewhere."""
    level = rng.choice(4, size=n, p=[0.4, 0.3, 0.2, 0.1])
    onehot = np.eye(4)[level]
    x4 = rng.standard_normal(n)
    effect = np.array([-1.0, 0.0, 0.8, -0.4])[level]
    slope = np.where(level == 2, 1.2, 0.3)
    p = sigmoid(effect + slope * x4)
    y = (rng.random(n) < p).astype(float)
    return np.column_stack([onehot, x4]), y, p


PROBLEMS = [("interaction", interaction, 101), ("variance_shift", variance_shift, 102), ("categorical", categorical, 103)]


def main():
    out = {"sklearn_version": sklearn.__version__, "numpy_version": np.__version__,
           "settings": SETTINGS, "n_train": N_TRAIN, "n_test": N_TEST, "problems": []}
    for name, gen, seed in PROBLEMS:
        rng = np.random.default_rng(seed)
        x, y, p = gen(rng, N_TRAIN + N_TEST)
        # Round to 9 significant digits, exactly as written to the CSV, so
        # that sklearn and the Go test fit the same numbers.
        x = np.array([[float("%.9g" % v) for v in row] for row in x])
        xtr, ytr, xte, yte, pte = x[:N_TRAIN], y[:N_TRAIN], x[N_TRAIN:], y[N_TRAIN:], p[N_TRAIN:]
        clf = HistGradientBoostingClassifier(random_state=0, **SETTINGS).fit(xtr, ytr)
        ll = log_loss(yte, clf.predict_proba(xte)[:, 1])
        bayes = log_loss(yte, pte)
        out["problems"].append({"name": name, "file": name + ".csv.gz", "seed": seed,
                                "sklearn_test_log_loss": ll, "bayes_test_log_loss": bayes,
                                "sklearn_iterations": int(clf.n_iter_)})
        rows = ["split,y," + ",".join("x%d" % j for j in range(x.shape[1]))]
        for i in range(x.shape[0]):
            split = "train" if i < N_TRAIN else "test"
            rows.append(split + ",%d," % y[i] + ",".join("%.9g" % v for v in x[i]))
        data = ("\n".join(rows) + "\n").encode()
        with open(os.path.join(HERE, name + ".csv.gz"), "wb") as raw:
            with gzip.GzipFile(fileobj=raw, mode="wb", compresslevel=9, mtime=0, filename="") as gz:
                gz.write(data)
        print(name, "sklearn", ll, "bayes", bayes, "iters", clf.n_iter_)
    with open(os.path.join(HERE, "reference.json"), "w") as f:
        json.dump(out, f, indent=2)
        f.write("\n")


if __name__ == "__main__":
    main()
