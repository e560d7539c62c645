#!/usr/bin/python3
"""Reference numbers for test/sparse_test.ts, from scikit-learn (Debian package python3-sklearn).

Data: the diabetes data bundled with scikit-learn (raw, unscaled values; Efron, Hastie, Johnstone
& Tibshirani 2004, "Least angle regression", Annals of Statistics 32(2)); see README.md here.
Writes diabetes.csv (a copy of the data) and reference.json next to this script.

Conventions (the same as lib/sparse): columns standardized with the population SD (divisor N);
sklearn's Lasso minimizes (1/(2N))||y - b - Zw||^2 + alpha ||w||_1 and its ElasticNet
(1/(2N))||y - b - Zw||^2 + alpha*l1_ratio*||w||_1 + 0.5*alpha*(1 - l1_ratio)*||w||^2, so
alpha and l1_ratio are curbfit's alpha and mix, and sklearn's coef_ on Z is curbfit's
standardized coefficients.

Each sklearn solution is checked here against the exact solution on its active set,
w_A = (G_AA + beta I)^-1 (c_A - a sign(w_A)), G = Z'Z/N, c = Z'(y - ybar)/N (a = alpha*mix,
beta = alpha*(1 - mix)), and its largest scaled KKT violation is recorded.

Run: /usr/bin/python3 test/reference/sparse/make_reference.py
"""

import hashlib
import json
import os

import numpy as np
import sklearn
from sklearn.datasets import load_diabetes
from sklearn.linear_model import ElasticNet, Lasso, lars_path

HERE = os.path.dirname(os.path.abspath(__file__))
NAMES = ["age", "sex", "bmi", "bp", "s1", "s2", "s3", "s4", "s5", "s6"]
FRACTIONS = [0.5, 0.2, 0.1, 0.05, 0.02, 0.01, 0.003, 0.001]
MIXES = [1.0, 0.5, 0.2]
TOL = 1e-12


def write_data(x, y):
    lines = [",".join(NAMES + ["y"])]
    for row, target in zip(x, y):
        lines.append(",".join(repr(float(v)) for v in list(row) + [target]))
    text = "\n".join(lines) + "\n"
    path = os.path.join(HERE, "diabetes.csv")
    with open(path, "w", encoding="utf-8") as f:
        f.write(text)
    return hashlib.sha256(text.encode("utf-8")).hexdigest()


def read_data():
    raw = np.loadtxt(os.path.join(HERE, "diabetes.csv"), delimiter=",", skiprows=1)
    return raw[:, :-1], raw[:, -1]


def scaled_kkt(z, yc, w, alpha, mix):
    n = len(yc)
    g = z.T @ (yc - z @ w) / n
    a, beta = alpha * mix, alpha * (1 - mix)
    unit = np.sqrt(np.diag(z.T @ z / n) * (yc @ yc / n))
    v = np.where(w == 0, np.maximum(np.abs(g) - a, 0), np.abs(g - beta * w - a * np.sign(w)))
    return float(np.max(v / unit))


def active_set_solution(z, yc, w, alpha, mix):
    n = len(yc)
    a, beta = alpha * mix, alpha * (1 - mix)
    act = np.flatnonzero(w)
    out = np.zeros_like(w)
    if len(act):
        gram = z[:, act].T @ z[:, act] / n + beta * np.eye(len(act))
        out[act] = np.linalg.solve(gram, z[:, act].T @ yc / n - a * np.sign(w[act]))
    return out


def main():
    data = load_diabetes(scaled=False)
    digest = write_data(data.data, data.target)
    x, y = read_data()
    assert np.array_equal(x, data.data) and np.array_equal(y, data.target)
    n, p = x.shape
    mean, sd = x.mean(axis=0), x.std(axis=0)  # population SD (ddof = 0)
    z = (x - mean) / sd
    ybar = y.mean()
    yc = y - ybar
    fits = []
    for mix in MIXES:
        top = float(np.max(np.abs(z.T @ yc)) / (n * mix))
        for frac in FRACTIONS:
            alpha = top * frac
            common = dict(alpha=alpha, fit_intercept=True, tol=TOL, max_iter=10**7)
            model = Lasso(**common) if mix == 1.0 else ElasticNet(l1_ratio=mix, **common)
            model.fit(z, y)
            w = model.coef_.copy()
            exact = active_set_solution(z, yc, w, alpha, mix)
            assert np.max(np.abs(exact - w)) < 1e-8, (mix, frac, np.max(np.abs(exact - w)))
            orig = w / sd
            fits.append({
                "mix": mix,
                "alpha": alpha,
                "alphaMax": top,
                "standardized": w.tolist(),
                "coefficients": orig.tolist(),
                "intercept": float(ybar - mean @ orig),
                "sklearnIntercept": float(model.intercept_),
                "iterations": int(model.n_iter_),
                "kkt": scaled_kkt(z, yc, w, alpha, mix),
                "exactActiveSetDiff": float(np.max(np.abs(exact - w))),
            })
    alphas, _, coefs = lars_path(z, yc, method="lasso")
    midpoints = []
    for k in range(len(alphas) - 1):
        alpha = 0.5 * (alphas[k] + alphas[k + 1])
        w = 0.5 * (coefs[:, k] + coefs[:, k + 1])  # the lasso path is linear in alpha between breakpoints
        check = Lasso(alpha=alpha, tol=TOL, max_iter=10**7).fit(z, y).coef_
        assert np.max(np.abs(check - w)) < 1e-8, (k, np.max(np.abs(check - w)))
        midpoints.append({
            "alpha": float(alpha),
            "standardized": w.tolist(),
            "active": [NAMES[j] for j in np.flatnonzero(w)],
        })
    # Entry/exit order: changes of the active set between consecutive segments of the path.
    events, before = [], set()
    for point in midpoints:
        now = set(point["active"])
        events += ["+" + name for name in NAMES if name in now - before]
        events += ["-" + name for name in NAMES if name in before - now]
        before = now
    out = {
        "source": "scikit-learn %s (Debian python3-sklearn), NumPy %s" % (
            sklearn.__version__, np.__version__),
        "data": {"file": "diabetes.csv", "sha256": digest, "rows": n, "columns": NAMES},
        "means": mean.tolist(),
        "sds": sd.tolist(),
        "tol": TOL,
        "fits": fits,
        "lars": {
            "alphas": alphas.tolist(),
            "events": events,
            "midpoints": midpoints,
        },
    }
    with open(os.path.join(HERE, "reference.json"), "w", encoding="utf-8") as f:
        json.dump(out, f, indent=2)
        f.write("\n")


if __name__ == "__main__":
    main()
