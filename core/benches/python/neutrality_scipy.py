#!/usr/bin/env python3
"""The bandgauge neutrality benchmark problem, scripted as a practitioner would.

Silicon at 300 K with 1e15 cm^-3 phosphorus and 1e14 cm^-3 boron: the Fermi level
from n + N_A- = p + N_D+ with Fermi-Dirac carriers (F_1/2 from mpmath's
polylogarithm, F_1/2(eta) = -Li_3/2(-e^eta)) and single-level dopant ionization,
solved with SciPy's brentq on E_F. Same parameters as bandgauge-core:
Varshni gap (Thurmond 1975), Nc, Nv power laws (Green 1990), P 45 meV g=2,
B 45 meV g=4 (Sze 1981), k = 8.617333262e-5 eV/K (SI 2019).

Default mode times the solve and prints, as its last line,
    python_us_per_solve=<median microseconds per solve>

`--reference` instead solves a list of cases at 40 significant digits with
mpmath (log-form residual, bisection then Newton via mp.findroot) and prints
reference values used by core/tests/carriers_reference.rs.

Needs: pip install scipy mpmath
"""

import statistics
import sys
import time

import mpmath as mp

K_EV = 8.617333262e-5

MATERIALS = {
    # id: (Eg0, alpha, beta, Nc300, xc, Nv300, xv)
    "si": (1.17, 4.73e-4, 636.0, 2.86e19, 1.58, 3.10e19, 1.85),
    "ge": (0.7437, 4.774e-4, 235.0, 1.04e19, 1.5, 6.0e18, 1.5),
    "gaas": (1.519, 5.405e-4, 204.0, 4.7e17, 1.5, 7.0e18, 1.5),
}
# (kind, ionization energy eV, degeneracy)
DOPANTS = {
    ("si", "P"): ("d", 0.045, 2.0),
    ("si", "As"): ("d", 0.054, 2.0),
    ("si", "B"): ("a", 0.045, 4.0),
    ("si", "In"): ("a", 0.160, 4.0),
    ("ge", "Sb"): ("d", 0.0096, 2.0),
    ("gaas", "Si"): ("d", 0.0058, 2.0),
    ("gaas", "Zn"): ("a", 0.031, 4.0),
}


def f_half(eta):
    """F_1/2(eta), normalised, accurate to double precision (mpmath polylog)."""
    return float(mp.re(-mp.polylog(1.5, -mp.exp(eta))))


def practitioner_solve(t_k, material, doping):
    """E_F - E_V in eV by brentq on the linear charge residual."""
    from scipy.optimize import brentq

    eg0, a, b, nc300, xc, nv300, xv = MATERIALS[material]
    kt = K_EV * t_k
    eg = eg0 - a * t_k * t_k / (t_k + b)
    nc = nc300 * (t_k / 300.0) ** xc
    nv = nv300 * (t_k / 300.0) ** xv
    species = [DOPANTS[(material, s)] + (n,) for s, n in doping]

    def residual(ef):
        n = nc * f_half((ef - eg) / kt)
        p = nv * f_half(-ef / kt)
        charge = p - n
        for kind, e_ion, g, dens in species:
            if kind == "d":
                charge += dens / (1.0 + g * mp.exp((ef - (eg - e_ion)) / kt))
            else:
                charge -= dens / (1.0 + g * mp.exp((e_ion - ef) / kt))
        return float(charge)

    return brentq(residual, -0.2, eg + 0.2, xtol=1e-15, rtol=1e-14)


def time_practitioner(repeats=30):
    doping = [("P", 1e15), ("B", 1e14)]
    practitioner_solve(300.0, "si", doping)  # warm-up (imports)
    samples = []
    for _ in range(repeats):
        start = time.perf_counter()
        ef = practitioner_solve(300.0, "si", doping)
        samples.append(time.perf_counter() - start)
    print(f"E_F - E_V = {ef:.9f} eV")
    return statistics.median(samples) * 1e6


def reference_solve(t_k, material, doping, fit=None):
    """High-precision solution in the log form; returns a dict of results."""
    mp.mp.dps = 40
    eg0, a, b, nc300, xc, nv300, xv = (mp.mpf(x) for x in MATERIALS[material])
    t = mp.mpf(t_k)
    kt = mp.mpf(K_EV) * t
    eg = eg0 - a * t * t / (t + b)
    ln_nc = mp.log(nc300) + xc * mp.log(t / 300)
    ln_nv = mp.log(nv300) + xv * mp.log(t / 300)
    if fit is not None:
        pref, expo, act = (mp.mpf(x) for x in fit)
        ln_fit = mp.log(pref) + expo * mp.log(t / 300) - act / t
        ln_dos = (ln_nc + ln_nv) / 2 - eg / (2 * kt)
        ln_nc += ln_fit - ln_dos
        ln_nv += ln_fit - ln_dos
    gap = eg / kt
    species = [DOPANTS[(material, s)] + (mp.mpf(n),) for s, n in doping]

    def ln_f(eta):
        return mp.log(mp.re(-mp.polylog(mp.mpf(3) / 2, -mp.exp(eta))))

    def parts(u):
        pos = [ln_nv + ln_f(-u)]
        neg = [ln_nc + ln_f(u - gap)]
        for kind, e_ion, g, dens in species:
            if dens == 0:
                continue
            e = mp.mpf(e_ion) / kt
            if kind == "d":
                pos.append(mp.log(dens) - mp.log(1 + g * mp.exp(u - gap + e)))
            else:
                neg.append(mp.log(dens) - mp.log(1 + g * mp.exp(e - u)))
        return pos, neg

    def h(u):
        pos, neg = parts(u)
        lse = lambda xs: mp.log(sum(mp.exp(x - max(xs)) for x in xs)) + max(xs)
        return lse(pos) - lse(neg)

    lo, hi = mp.mpf(-50), gap + 50
    while h(lo) < 0:
        lo -= 50
    while h(hi) > 0:
        hi += 50
    for _ in range(200):  # bisection to a tight bracket, then secant refinement
        mid = (lo + hi) / 2
        if h(mid) > 0:
            lo = mid
        else:
            hi = mid
        if hi - lo < mp.mpf(10) ** -30:
            break
    u = mp.findroot(h, (lo, hi), solver="anderson")
    ln_n = ln_nc + ln_f(u - gap)
    ln_p = ln_nv + ln_f(-u)
    return {
        "ef_minus_ev_ev": u * kt,
        "log10_n": ln_n / mp.log(10),
        "log10_p": ln_p / mp.log(10),
    }


REFERENCE_CASES = [
    (300.0, "si", [("P", 1e15), ("B", 1e14)], None),
    (300.0, "si", [("P", 1e16)], None),
    (30.0, "si", [("P", 1e16)], None),
    (300.0, "si", [("P", 1e20)], None),
    (77.0, "si", [("B", 1e17), ("P", 1e15)], None),
    (600.0, "si", [("P", 1e14)], None),
    (5.0, "si", [("P", 1e16), ("B", 1e14)], None),
    (1500.0, "si", [], None),
    (300.0, "si", [("P", 1e17), ("As", 5e16), ("B", 2e16), ("In", 1e16)], None),
    (300.0, "ge", [("Sb", 1e15)], None),
    (300.0, "gaas", [("Si", 1e17), ("Zn", 1e16)], None),
    (200.0, "si", [("B", 1e13)], (5.29e19, 2.54, 6726.0)),
]


def main():
    if "--reference" in sys.argv:
        print(f"# mpmath {mp.__version__}, 40 digits")
        for t_k, material, doping, fit in REFERENCE_CASES:
            r = reference_solve(t_k, material, doping, fit)
            print(
                f"{material} {t_k} K {doping} fit={fit is not None}: "
                f"EF-EV {mp.nstr(r['ef_minus_ev_ev'], 17)} eV, "
                f"log10 n {mp.nstr(r['log10_n'], 17)}, log10 p {mp.nstr(r['log10_p'], 17)}"
            )
        return
    us = time_practitioner()
    print(f"python_us_per_solve={us:.1f}")


if __name__ == "__main__":
    main()
