#!/usr/bin/python3
"""Reference cross-validated ridge errors on the diabetes data, from scikit-learn.

Writes diabetes_ridge_cv.json, which test/reference_sweep_test.ts reads (the test suite needs no
Python). Inputs: diabetes.csv (made by diabetes_csv.py) and diabetes_folds.json (curbfit's
10-fold plan, made by diabetes_folds.ts); the plan's SHA-256 digest is recomputed here.

Run from the repository root with Debian's interpreter and packages (python3-sklearn,
python3-numpy, python3-scipy, python3-mpmath):
    /usr/bin/python3 test/reference/ridge_cv_sklearn.py && deno fmt test/reference/

Same objective on both sides (the reasoning, checked):
  curbfit minimizes  sum_i (y_i - b - x_i'w)^2 + lam * sum_q gamma_q (s_q w_q)^2  with gamma_q = 1
  (ridge) and s_q the training-fold SD of design column q with divisor n; the intercept b is
  not penalized. Writing z_iq = (x_iq - xbar_q)/s_q and v_q = s_q w_q turns this into
      sum_i (y_i - c - z_i'v)^2 + lam * ||v||^2,
  a reparametrization, so the fitted values (and the held-out predictions) are the same.
  scikit-learn's Pipeline(StandardScaler(), Ridge(alpha=lam)) fitted on the training rows:
  StandardScaler subtracts the training mean and divides by the training SD with divisor n
  (numpy var with ddof=0); Ridge(fit_intercept=True) minimizes ||y - Zv - c||^2 + alpha*||v||^2
  with c unpenalized (it centres Z and y, solves, and sets c = ybar - zbar'v). With alpha = lam
  the two problems are identical, so the held-out predictions agree, and so do the held-out
  MSEs (mean of squared errors over the fold's rows; sklearn.metrics.mean_squared_error) and
  their plain mean over the 10 folds (curbfit's cvMean).
  Ridge uses solver="svd" (SVD of the centred training design, float64).

Models:
  "columns":   the ten raw columns age, sex, bmi, bp, s1..s6 (curbfit: column(...) each).
  "bmi_cubed": age, sex, bmi, bmi^2, bmi^3, bp, s1..s6 (curbfit: power("bmi", 3) in bmi's place).
               curbfit computes powers of the raw column in double-double and the sweep reads
               the leading double, i.e. the power of the stored double rounded once; here each
               power is float(Fraction(x)**k), the exactly rounded power of the same double. The
               expanded columns are written to the JSON so the test can check they are equal.

Independent check of the reference itself: the same per-fold MSEs are recomputed from the same
doubles in 50-digit arithmetic (mpmath: mean, SD, normal equations with the penalty, LU solve)
and stored as "highPrecision"; the largest relative gap between scikit-learn and that is
stored as "sklearnVsHighPrecision".
"""
import hashlib
import json
import os
import platform
import struct
import subprocess
import warnings
from fractions import Fraction

import mpmath
import numpy as np
import scipy
import sklearn
from sklearn.linear_model import Ridge
from sklearn.metrics import mean_squared_error
from sklearn.pipeline import make_pipeline
from sklearn.preprocessing import StandardScaler

HERE = os.path.dirname(os.path.abspath(__file__))
TARGET = "progression"
PLAIN = ["age", "sex", "bmi", "bp", "s1", "s2", "s3", "s4", "s5", "s6"]
CUBED = ["age", "sex", "bmi", "bmi^2", "bmi^3", "bp", "s1", "s2", "s3", "s4", "s5", "s6"]
# lambda = 0 (least squares) and 20 values log-spaced over 10^-3 .. 10^4 (sum-of-squares units).
LAMBDAS = [0.0] + [float(v) for v in 10.0 ** np.linspace(-3.0, 4.0, 20)]
mpmath.mp.dps = 50


def read_table():
    with open(os.path.join(HERE, "diabetes.csv")) as f:
        header = f.readline().strip().split(",")
        rows = [[float(v) for v in line.strip().split(",")] for line in f if line.strip()]
    return {name: [r[j] for r in rows] for j, name in enumerate(header)}


def read_folds(n):
    with open(os.path.join(HERE, "diabetes_folds.json")) as f:
        doc = json.load(f)
    folds = doc["assignment"]
    assert doc["nRows"] == n == len(folds) and doc["k"] == 10
    digest = hashlib.sha256(b"".join(struct.pack("<i", v) for v in folds)).hexdigest()
    assert digest == doc["digest"], "fold assignment does not match its digest"
    return np.array(folds), doc


def exact_power(x, k):
    """The power x^k of the double x, rounded once to the nearest double."""
    return float(Fraction(x) ** k)


def design(table, names):
    cols = []
    for name in names:
        base, _, k = name.partition("^")
        cols.append([exact_power(v, int(k)) for v in table[base]] if k else table[name])
    return np.array(cols, dtype=np.float64).T


def sklearn_fold_mse(x, y, train, valid, lam):
    model = make_pipeline(StandardScaler(), Ridge(alpha=lam, solver="svd"))
    with warnings.catch_warnings():
        warnings.simplefilter("error")
        model.fit(x[train], y[train])
    return float(mean_squared_error(y[valid], model.predict(x[valid])))


def high_precision_fold_mse(x, y, train, valid, lambdas):
    """Per-lambda held-out MSE from the same doubles in 50-digit arithmetic."""
    mp = mpmath.mp
    p = x.shape[1]
    xt = [[mp.mpf(float(v)) for v in row] for row in x[train]]
    yt = [mp.mpf(float(v)) for v in y[train]]
    n = len(yt)
    mean = [mp.fsum(r[q] for r in xt) / n for q in range(p)]
    sd = [mp.sqrt(mp.fsum((r[q] - mean[q]) ** 2 for r in xt) / n) for q in range(p)]
    ybar = mp.fsum(yt) / n
    z = [[(r[q] - mean[q]) / sd[q] for q in range(p)] for r in xt]
    gram = mp.matrix(p, p)
    rhs = mp.matrix(p, 1)
    for i in range(p):
        rhs[i] = mp.fsum(z[t][i] * (yt[t] - ybar) for t in range(n))
        for j in range(p):
            gram[i, j] = mp.fsum(z[t][i] * z[t][j] for t in range(n))
    zv = [[(mp.mpf(float(v)) - mean[q]) / sd[q] for q, v in enumerate(row)] for row in x[valid]]
    yv = [mp.mpf(float(v)) for v in y[valid]]
    out = []
    for lam in lambdas:
        a = gram.copy()
        for i in range(p):
            a[i, i] += lam
        v = mp.lu_solve(a, rhs)
        sse = mp.fsum((yv[t] - ybar - mp.fsum(zv[t][q] * v[q] for q in range(p))) ** 2
                      for t in range(len(yv)))
        out.append(float(sse / len(yv)))
    return out


def reference(table, folds, names):
    x = design(table, names)
    y = np.array(table[TARGET], dtype=np.float64)
    k = int(folds.max()) + 1
    fold_mse, precise = [], []
    for f in range(k):
        train, valid = np.flatnonzero(folds != f), np.flatnonzero(folds == f)
        fold_mse.append([sklearn_fold_mse(x, y, train, valid, lam) for lam in LAMBDAS])
        precise.append(high_precision_fold_mse(x, y, train, valid, LAMBDAS))
    cv = [float(np.mean([fold_mse[f][l] for f in range(k)])) for l in range(len(LAMBDAS))]
    cv_precise = [float(np.mean([precise[f][l] for f in range(k)])) for l in range(len(LAMBDAS))]
    gap = max(abs(a - b) / abs(b) for fa, fb in zip(fold_mse + [cv], precise + [cv_precise])
              for a, b in zip(fa, fb))
    return {
        "columns": names,
        "foldMse": fold_mse,
        "cvMean": cv,
        "highPrecision": {"foldMse": precise, "cvMean": cv_precise},
        "sklearnVsHighPrecision": gap,
    }


def debian_version(package):
    out = subprocess.run(["dpkg-query", "-W", "-f=${Version}", package],
                         capture_output=True, text=True, check=False)
    return out.stdout.strip() or None


def main():
    table = read_table()
    folds, plan = read_folds(len(table[TARGET]))
    doc = {
        "source": "scikit-learn Pipeline(StandardScaler(), Ridge(alpha=lambda, solver='svd')), "
                  "per fold; written by test/reference/ridge_cv_sklearn.py",
        "versions": {
            "python": platform.python_version(),
            "sklearn": sklearn.__version__,
            "numpy": np.__version__,
            "scipy": scipy.__version__,
            "mpmath": mpmath.__version__,
            "debian": {pkg: debian_version(pkg)
                       for pkg in ["python3-sklearn", "python3-numpy", "python3-scipy"]},
        },
        "data": "diabetes.csv",
        "target": TARGET,
        "folds": {"file": "diabetes_folds.json", "k": plan["k"], "seed": plan["seed"],
                  "digest": plan["digest"]},
        "objective": "sum_i (y_i - b - z_i'v)^2 + lambda*||v||^2, z = training-fold standardized "
                     "design (SD divisor n), b unpenalized; per-fold MSE = SSE/n_fold; "
                     "cvMean = plain mean of the fold MSEs",
        "lambdas": LAMBDAS,
        "models": {"columns": reference(table, folds, PLAIN),
                   "bmi_cubed": reference(table, folds, CUBED)},
        "powers": {name: [exact_power(v, int(name[4:])) for v in table["bmi"]]
                   for name in ["bmi^2", "bmi^3"]},
    }
    with open(os.path.join(HERE, "diabetes_ridge_cv.json"), "w") as f:
        json.dump(doc, f, indent=1)
        f.write("\n")
    for name, model in doc["models"].items():
        print(name, "sklearn vs 50-digit:", model["sklearnVsHighPrecision"])


if __name__ == "__main__":
    main()
