#!/usr/bin/python3
"""The scikit-learn side of test/bench/sparse_vs_sklearn.ts (run by it; not a test).

Reads the rows and fold assignment written by the Deno script, fits LassoCV on the same folds
(PredefinedSplit) with its default path (100 alphas from alpha_max down to 1e-3 alpha_max,
tol 1e-4, Gram precomputed per fold since n > p, refit on all rows at the chosen alpha), and
prints one JSON object: wall seconds of the fit (data already in memory), peak resident memory
(VmHWM) before and after, the alphas, the mean CV error per alpha, the chosen alpha, the BLAS
thread count and how many convergence warnings were raised.

Usage: /usr/bin/python3 test/bench/sparse_vs_sklearn.py DIR
"""

import json
import os
import sys
import time
import warnings

import numpy as np
import sklearn
from sklearn.exceptions import ConvergenceWarning
from sklearn.linear_model import LassoCV
from sklearn.model_selection import PredefinedSplit
from threadpoolctl import threadpool_info


def peak_rss_mb():
    with open("/proc/self/status", encoding="ascii") as f:
        for line in f:
            if line.startswith("VmHWM:"):
                return int(line.split()[1]) / 1024
    return float("nan")


def main():
    folder = sys.argv[1]
    with open(os.path.join(folder, "meta.json"), encoding="utf-8") as f:
        meta = json.load(f)
    n, p = meta["n"], meta["p"]
    x = np.fromfile(os.path.join(folder, "x.f64"), dtype="<f8").reshape(n, p)
    y = np.fromfile(os.path.join(folder, "y.f64"), dtype="<f8")
    folds = np.fromfile(os.path.join(folder, "folds.i32"), dtype="<i4")
    before = peak_rss_mb()
    start = time.perf_counter()
    with warnings.catch_warnings(record=True) as caught:
        warnings.simplefilter("always", ConvergenceWarning)
        model = LassoCV(n_alphas=meta["alphas"], eps=1e-3, cv=PredefinedSplit(folds)).fit(x, y)
    seconds = time.perf_counter() - start
    print(json.dumps({
        "version": "scikit-learn %s, NumPy %s" % (sklearn.__version__, np.__version__),
        "threads": ", ".join(
            "%s %d" % (info["internal_api"], info["num_threads"]) for info in threadpool_info()),
        "seconds": seconds,
        "baselineRssMb": before,
        "peakRssMb": peak_rss_mb(),
        "alphas": model.alphas_.tolist(),
        "cvMean": model.mse_path_.mean(axis=1).tolist(),
        "best": float(model.alpha_),
        "nonzero": int(np.count_nonzero(model.coef_)),
        "coefficients": model.coef_.tolist(),
        "convergenceWarnings": sum(issubclass(w.category, ConvergenceWarning) for w in caught),
    }))


if __name__ == "__main__":
    main()
