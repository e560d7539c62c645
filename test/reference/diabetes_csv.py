#!/usr/bin/python3
"""Copy the diabetes dataset bundled in Debian's python3-sklearn into diabetes.csv (header row).

Source (Debian bookworm package python3-sklearn 1.2.1+dfsg-1, BSD-3-Clause):
  /usr/lib/python3/dist-packages/sklearn/datasets/data/diabetes_data_raw.csv.gz  (442 x 10)
  /usr/lib/python3/dist-packages/sklearn/datasets/data/diabetes_target.csv.gz    (442)
Original data: Efron, Hastie, Johnstone & Tibshirani (2004), "Least Angle Regression",
Annals of Statistics 32(2), 407-499. See README.md in this folder.

The feature values are copied as the exact text tokens of the raw (unscaled) file, so both
sides of the reference check parse the same decimal strings; the target is written with
Python's repr (every target value is a whole number). The copy is checked against
sklearn.datasets.load_diabetes(scaled=False).

Run from the repository root:  /usr/bin/python3 test/reference/diabetes_csv.py
"""
import gzip
import os

import numpy as np
from sklearn.datasets import load_diabetes

DATA = "/usr/lib/python3/dist-packages/sklearn/datasets/data"
HERE = os.path.dirname(os.path.abspath(__file__))
NAMES = ["age", "sex", "bmi", "bp", "s1", "s2", "s3", "s4", "s5", "s6"]
TARGET = "progression"


def main():
    with gzip.open(os.path.join(DATA, "diabetes_data_raw.csv.gz"), "rt") as f:
        rows = [line.split() for line in f if line.strip()]
    with gzip.open(os.path.join(DATA, "diabetes_target.csv.gz"), "rt") as f:
        target = [float(line) for line in f if line.strip()]
    assert len(rows) == len(target) == 442 and all(len(r) == 10 for r in rows)
    assert all(t == int(t) for t in target)
    bundled = load_diabetes(scaled=False)
    assert bundled.feature_names == NAMES
    assert np.array_equal(np.array([[float(v) for v in r] for r in rows]), bundled.data)
    assert np.array_equal(np.array(target), bundled.target)
    with open(os.path.join(HERE, "diabetes.csv"), "w", newline="\n") as out:
        out.write(",".join(NAMES + [TARGET]) + "\n")
        for r, t in zip(rows, target):
            out.write(",".join(r + [repr(int(t))]) + "\n")


if __name__ == "__main__":
    main()
