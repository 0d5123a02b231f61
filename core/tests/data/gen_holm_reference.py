#!/usr/bin/env python3
"""Reference values for Holm's step-down adjustment of the lot-to-lot p-values.

An independent computation with statsmodels (nothing taken from bandgauge's code), for
core/tests/lots_stats.rs:

  * Holm, Scand. J. Statist. 6, 65-70 (1979): with m p-values sorted ascending,
    adjusted p_(i) = max over j <= i of min(1, (m - j + 1) p_(j)).
  * statsmodels.stats.multitest.multipletests(p, method="holm") gives the adjusted
    values; statsmodels.stats.weightstats.ttest_ind(..., usevar="unequal") gives
    Welch's t-test (two-sided p) for every pair of four invented groups of ln(wafer
    mean density), in the order bandgauge tests them (a-b, a-c, a-d, b-c, b-d, c-d).

Run (needs `pip install statsmodels`, a few seconds):

    python3 core/tests/data/gen_holm_reference.py

It prints the library versions, then the raw and Holm-adjusted p-values of each case.
"""

import itertools
import math

import numpy
import scipy
import statsmodels
from statsmodels.stats.multitest import multipletests
from statsmodels.stats.weightstats import ttest_ind

print(f"statsmodels {statsmodels.__version__}, scipy {scipy.__version__}, "
      f"numpy {numpy.__version__}")

# Case 1: a family of p-values as given (ties, a value that hits the cap of 1, and an
# input order that is not sorted).
given = [0.009, 0.04, 0.03, 0.005, 0.04, 0.5]
reject, adjusted, _, _ = multipletests(given, alpha=0.05, method="holm")
print("given   ", [repr(p) for p in given])
print("adjusted", [repr(float(p)) for p in adjusted])
print("reject  ", list(map(bool, reject)))

# Case 2: four invented lots, wafer mean densities (cm^-3), tested on ln density.
lots = {
    "a": [1.02e15, 1.05e15, 0.99e15, 1.01e15, 1.03e15],
    "b": [1.04e15, 1.00e15, 1.06e15, 1.02e15],
    "c": [1.10e15, 1.12e15, 1.08e15, 1.13e15, 1.09e15, 1.11e15],
    "d": [1.01e15, 1.09e15, 0.97e15, 1.06e15, 1.03e15],
}
pairs = list(itertools.combinations(lots, 2))
raw = []
for x, y in pairs:
    _, p, _ = ttest_ind([math.log(v) for v in lots[y]], [math.log(v) for v in lots[x]],
                        usevar="unequal")
    raw.append(float(p))
reject, adjusted, _, _ = multipletests(raw, alpha=0.05, method="holm")
for (x, y), p, q, r in zip(pairs, raw, adjusted, reject):
    print(f"{x}-{y} raw {p!r} holm {float(q)!r} reject {bool(r)}")
