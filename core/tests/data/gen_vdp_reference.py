#!/usr/bin/env python3
"""Reference values of the van der Pauw correction factor f(r), r = R_A/R_B.

An independent evaluation (mpmath, 50 significant digits, nothing taken from
bandgauge's code) of van der Pauw's equation in the form of his eq. (5)
(L. J. van der Pauw, Philips Res. Rep. 13, 1 (1958)):

    cosh( ((r - 1)/(r + 1)) ln 2 / f ) = exp(ln 2 / f) / 2,

solved for f with mpmath.findroot (a different equation and a different solver
from bandgauge's, which solves exp(-pi R_A/R_s) + exp(-pi R_B/R_s) = 1 for
y = pi R_B/R_s with Brent's method). Also prints pi/ln 2 (the symmetric case
R_s = pi R / ln 2) and, for the round-trip test, y at r = 1000.

Run (needs `pip install mpmath`; values in core/tests/vdp_hall_reference.rs were
made with mpmath 1.4.1):

    python3 core/tests/data/gen_vdp_reference.py
"""

import mpmath as mp

mp.mp.dps = 50
LN2 = mp.log(2)


def f_of(r):
    r = mp.mpf(r)
    if r == 1:
        return mp.mpf(1)
    q = (r - 1) / (r + 1)
    # Both sides divided by exp(ln 2 / f), which keeps the terms near 1 for small f.
    g = lambda f: (mp.exp((q - 1) * LN2 / f) + mp.exp(-(q + 1) * LN2 / f) - 1) / 2
    # f falls from 1 (r = 1) towards 0 (about 0.2 at r = 1000).
    return mp.findroot(g, (mp.mpf("0.01"), mp.mpf(1)), solver="illinois")


def y_of(r):
    """pi R_B / R_s for R_A/R_B = r >= 1: the root of e^-y + e^-(r y) = 1."""
    r = mp.mpf(r)
    if r == 1:
        return LN2
    return mp.findroot(lambda y: mp.exp(-y) + mp.exp(-r * y) - 1,
                       (2 * LN2 / (1 + r), LN2), solver="illinois")


print("mpmath", mp.__version__)
print("pi/ln2 =", mp.nstr(mp.pi / LN2, 20))
for r in ["1", "1.5", "2", "3", "5", "10", "20", "50", "100", "1000"]:
    f = f_of(r)
    # Cross-check between the two forms: R_s/R_B from f must equal pi / y.
    rs_over_rb = mp.pi * (mp.mpf(r) + 1) * f / (2 * LN2)
    assert abs(rs_over_rb - mp.pi / y_of(r)) < mp.mpf("1e-40") * rs_over_rb
    print(f"r = {r:>5}: f = {mp.nstr(f, 20)}, R_s/R_B = {mp.nstr(rs_over_rb, 20)}")
print("y(1000) =", mp.nstr(y_of(1000), 20))
