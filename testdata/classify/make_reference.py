#!/usr/bin/python3
"""Reference fits for the logistic learners of gapwise/attribution/classify.

Run with Debian's interpreter so that its python3-sklearn is used:

    /usr/bin/python3 testdata/classify/make_reference.py > testdata/classify/reference.json

Every dataset is synthetic, drawn here with a fixed numpy seed. The script
rebuilds the learners' design matrices independently in numpy, following
the rules stated in the Go doc comments (logistic.go, basis.go):

  * raw column c: weighted mean m and population sd s over all rows
    (weights w, nil = 1); a column whose values are all equal on the rows
    with w > 0 is dropped; z_c = (x_c - m)/s;
  * linear design: z_c for the kept columns, in column order;
  * expanded design: originals, then squares of the non-binary columns of
    the interaction set (binary = two distinct values on rows with w > 0),
    then products z_I*z_J (I < J) within the interaction set; a product of
    two binary columns is dropped unless all four value pairs occur on rows
    with w > 0; every term is standardised again like a raw column and
    dropped if constant on rows with w > 0. The interaction set is all kept
    columns if there are at most K of them, else the K with the largest
    |sum_i w_i z_ic y_i| (ties to the lower index), in column order.

It then fits sklearn.linear_model.LogisticRegression(penalty="l2",
C=1/lambda, solver=S, tol=T, max_iter=2000) with sample_weight=w,
for (S, T) = ("lbfgs", 1e-12) and ("newton-cg", 1e-9), which minimises C*sum_i w_i l_i + ||beta||^2/2 with an
unpenalised intercept, i.e. the same minimiser as the Go objective
sum_i w_i l_i + lambda/2 ||beta||^2. Recorded per case: the data, the
design terms and, per solver, sklearn's coefficients, decision_function
(log-odds) on train and test rows, sklearn.metrics.log_loss (with
sample_weight on the training rows, unweighted on the test rows), and
rel_grad, the max-norm of the gradient of the objective at sklearn's
solution divided by sum(w): how far that solver stopped from the exact
minimiser (lbfgs stops on its relative function-change test around 1e-6;
newton-cg reaches about 1e-12).
"""
import json
import sys
import warnings

import numpy as np
import sklearn
from sklearn.linear_model import LogisticRegression
from sklearn.metrics import log_loss


def col_scale(v, w):
    pos = w > 0
    lo, hi = v[pos].min(), v[pos].max()
    if lo == hi:
        return None
    sw = w.sum()
    m = np.sum(w * v) / sw
    s = np.sqrt(np.sum(w * (v - m) ** 2) / sw)
    binary = np.unique(v[pos]).size <= 2
    return m, s, binary


def design(x, y, w, expanded, k):
    """Returns (training design, terms, transform for new raw rows)."""
    p = x.shape[1]
    raw = {}
    binary = {}
    active = []
    for c in range(p):
        sc = col_scale(x[:, c], w)
        if sc is None:
            continue
        raw[c] = sc[:2]
        binary[c] = sc[2]
        active.append(c)

    def std_raw(xx):
        return {c: (xx[:, c] - raw[c][0]) / raw[c][1] for c in active}

    z = std_raw(x)
    if not expanded:
        def transform(xx):
            zz = std_raw(xx)
            return np.column_stack([zz[c] for c in active])
        return transform(x), [(c, -1) for c in active], transform
    if len(active) <= k:
        inter = active
    else:
        score = np.array([abs(np.sum(w * z[c] * y)) for c in active])
        order = np.argsort(-score, kind="stable")[:k]
        inter = sorted(active[i] for i in order)
    cand = [(c, -1) for c in active]
    cand += [(c, c) for c in inter if not binary[c]]
    cand += [(a, b) for i, a in enumerate(inter) for b in inter[i + 1:]]
    pos = w > 0

    def term(zz, i, j):
        return zz[i] if j < 0 else zz[i] * zz[j]

    terms, scales = [], []
    for (i, j) in cand:
        if j > i and binary[i] and binary[j]:
            pairs = set(zip(z[i][pos].tolist(), z[j][pos].tolist()))
            if len(pairs) < 4:
                continue
        sc = col_scale(term(z, i, j), w)
        if sc is None:
            continue
        terms.append((i, j))
        scales.append(sc[:2])

    def transform(xx):
        zz = std_raw(xx)
        return np.column_stack([(term(zz, i, j) - m) / s for (i, j), (m, s) in zip(terms, scales)])
    return transform(x), terms, transform


def objective_grad(z, y, w, lam, b0, beta):
    eta = b0 + z @ beta
    p = 1 / (1 + np.exp(-eta))
    r = w * (p - y)
    g = np.concatenate([[r.sum()], z.T @ r + lam * beta])
    return np.max(np.abs(g)) / w.sum()


def case(name, x, y, w, xt, yt, lam, expanded, k=8):
    # Round the data to 4 decimals so the fixture stays small; the fits
    # below use the rounded values, exactly as the Go test reads them.
    x, xt = np.round(x, 4), np.round(xt, 4)
    w = None if w is None else np.round(w, 4)
    wfit = np.ones(len(y)) if w is None else w
    z, terms, transform = design(x, y, wfit, expanded, k)
    zt = transform(xt)
    fits = {}
    # newton-cg's tol is an absolute bound on the gradient of a sum over
    # rows; 1e-12 is below its rounding noise, so it gets 1e-9.
    for solver, tol in (("lbfgs", 1e-12), ("newton-cg", 1e-9)):
        clf = LogisticRegression(penalty="l2", C=1.0 / lam, solver=solver,
                                 tol=tol, max_iter=2000)
        with warnings.catch_warnings():
            # newton-cg warns when rounding stops its line search at the
            # optimum; the recorded gradient shows how close it got.
            warnings.simplefilter("ignore")
            clf.fit(z, y, sample_weight=wfit)
        fits[solver.replace("-", "_")] = {
            "intercept": float(clf.intercept_[0]),
            "coef": clf.coef_[0].tolist(),
            "log_odds": clf.decision_function(z).tolist(),
            "log_odds_test": clf.decision_function(zt).tolist(),
            "log_loss": log_loss(y, clf.predict_proba(z)[:, 1], sample_weight=wfit),
            "log_loss_test": log_loss(yt, clf.predict_proba(zt)[:, 1]),
            "rel_grad": objective_grad(z, y, wfit, lam, clf.intercept_[0], clf.coef_[0]),
            "iterations": int(clf.n_iter_[0]),
        }
    return {
        "name": name,
        "learner": "expanded" if expanded else "linear",
        "lambda": lam,
        "max_interact": k,
        "x": x.tolist(), "y": y.tolist(),
        "w": None if w is None else w.tolist(),
        "x_test": xt.tolist(), "y_test": yt.tolist(),
        "terms": [list(t) for t in terms],
        "fits": fits,
    }


def draw_y(rng, logit):
    return (rng.random(len(logit)) < 1 / (1 + np.exp(-logit))).astype(float)


def main():
    rng = np.random.default_rng(20240611)
    cases = []

    # plain: continuous, binary, constant and one-hot (3 levels) columns.
    def plain(n):
        x0 = 5 + 3 * rng.standard_normal(n)
        x1 = rng.standard_normal(n)
        x2 = (rng.random(n) < 0.3).astype(float)
        x3 = np.full(n, 7.0)
        x4 = 10 * rng.random(n)
        lvl = rng.integers(0, 3, n)
        x5 = (lvl == 1).astype(float)
        x6 = (lvl == 2).astype(float)
        x = np.column_stack([x0, x1, x2, x3, x4, x5, x6])
        logit = 0.2 + 0.3 * (x0 - 5) - x1 + 0.7 * x2 + 0.5 * x1 * x2 - 0.4 * x5 + 0.6 * x6 + 0.05 * (x4 - 5) ** 2
        return x, draw_y(rng, logit)
    x, y = plain(400)
    xt, yt = plain(200)
    cases.append(case("plain", x, y, None, xt, yt, 1.0, False))
    cases.append(case("plain", x, y, None, xt, yt, 1.0, True))

    # weighted: exponential weights with 10% zeros; x3 is constant on the
    # rows with positive weight but not on the zero-weight rows.
    def weighted(n):
        x = rng.standard_normal((n, 4)) * np.array([1.0, 2.0, 0.5, 1.0])
        w = rng.exponential(1.0, n)
        zero = rng.random(n) < 0.1
        w[zero] = 0
        x[~zero, 3] = 2.0
        logit = -0.5 + x[:, 0] - 0.5 * x[:, 1] + x[:, 0] * x[:, 2] * 2
        return x, draw_y(rng, logit), w
    x, y, w = weighted(500)
    xt, yt, _ = weighted(200)
    cases.append(case("weighted", x, y, w, xt, yt, 2.0, False))
    cases.append(case("weighted", x, y, w, xt, yt, 2.0, True))

    # separable: y = 1[x0 + 0.5 x1 > 0] exactly; only the penalty keeps the
    # coefficients finite.
    def separable(n):
        x = rng.standard_normal((n, 2))
        return x, (x[:, 0] + 0.5 * x[:, 1] > 0).astype(float)
    x, y = separable(200)
    xt, yt = separable(100)
    cases.append(case("separable", x, y, None, xt, yt, 1.0, False))
    cases.append(case("separable", x, y, None, xt, yt, 1.0, True))

    # interaction: true log-odds 0.3 + 2 x0 x1 + 0.5 x2.
    def interaction(n):
        x = rng.standard_normal((n, 3))
        return x, draw_y(rng, 0.3 + 2 * x[:, 0] * x[:, 1] + 0.5 * x[:, 2])
    x, y = interaction(1000)
    xt, yt = interaction(500)
    cases.append(case("interaction", x, y, None, xt, yt, 1.0, False))
    cases.append(case("interaction", x, y, None, xt, yt, 1.0, True))

    # wide: 14 columns with interaction set K = 4 chosen by relevance.
    def wide(n):
        x = rng.standard_normal((n, 14))
        logit = 1.2 * x[:, 3] - 1.0 * x[:, 9] + 0.8 * x[:, 12] + 0.6 * x[:, 5] + x[:, 3] * x[:, 9]
        return x, draw_y(rng, logit)
    x, y = wide(600)
    xt, yt = wide(200)
    cases.append(case("wide", x, y, None, xt, yt, 1.0, True, k=4))

    json.dump({
        "generator": "testdata/classify/make_reference.py",
        "sklearn_version": sklearn.__version__,
        "numpy_version": np.__version__,
        "cases": cases,
    }, sys.stdout)
    sys.stdout.write("\n")


if __name__ == "__main__":
    main()
