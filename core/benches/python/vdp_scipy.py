#!/usr/bin/env python3
"""The bandgauge van der Pauw benchmark problem, scripted as a practitioner would.

R_A = 15 ohm, R_B = 10 ohm: the sheet resistance R_s from
exp(-pi R_A / R_s) + exp(-pi R_B / R_s) = 1 (van der Pauw, Philips Res. Rep. 13,
1 (1958)) with SciPy's brentq on the bracket pi R_B/ln 2 <= R_s <= pi (R_A + R_B)/(2 ln 2)
(the bounds derived in core/src/vdp.rs), to a relative tolerance of 1e-15.

Prints R_s and, as its last line,
    python_us_per_solve=<median microseconds per solve>

Needs: pip install scipy
"""

import math
import statistics
import time

from scipy.optimize import brentq


def sheet_resistance(r_a, r_b):
    big, small = max(r_a, r_b), min(r_a, r_b)
    f = lambda rs: math.exp(-math.pi * r_a / rs) + math.exp(-math.pi * r_b / rs) - 1.0
    lo = math.pi * small / math.log(2.0)
    hi = math.pi * (big + small) / (2.0 * math.log(2.0))
    if f(lo) >= 0.0:
        return lo
    return brentq(f, lo, hi, xtol=1e-300, rtol=4 * 2.0**-52)


def main(repeats=2000):
    rs = sheet_resistance(15.0, 10.0)
    samples = []
    for _ in range(repeats):
        start = time.perf_counter()
        sheet_resistance(15.0, 10.0)
        samples.append(time.perf_counter() - start)
    print(f"R_s = {rs:.15g} ohm/sq")
    print(f"python_us_per_solve={statistics.median(samples) * 1e6:.3f}")


if __name__ == "__main__":
    main()
