#!/usr/bin/env python3
"""Reference solutions of charge neutrality with density-dependent dopant levels.

An independent implementation (mpmath, 40 significant digits, nothing taken from
bandgauge's code) of the published ionization models, for
core/tests/carriers_reference.rs:

  * Altermatt, Schenk, Schmithuesen, Heiser, J. Appl. Phys. 100, 113714 and 113715
    (2006): level E(N) = E0 / (1 + (N/N_ref)^c) from the band edge; a fraction
    b(N) = 1 / (1 + (N/N_b)^d) of the dopants is localized and follows the
    occupancy of that level, the rest is always ionized. Table 1 sets:
    P 45.5 meV, 3e18, 2, 6e18, 2.3; As 53.7 meV, 4e18, 1.5, 1.4e19, 3;
    B 44.39 meV, 1.7e18, 1.4, 6e18, 2.4.
  * Pearson & Bardeen, Phys. Rev. 75, 865 (1949): E(N) = E0 - alpha N^(1/3),
    alpha 3.1e-8 eV cm (donors), 3.037e-8 eV cm (acceptors); E(N) <= 0 means the
    level has merged with the band and the species is fully ionized.

N is the total density of the dopants of the species' kind. Occupancy:
N+ = N [(1 - b) + b / (1 + g exp((E_F - E_D)/kT))] for donors (g = 2) and the mirror
form for acceptors (g = 4). Carriers: n = Nc F_1/2((E_F - E_C)/kT),
p = Nv F_1/2((E_V - E_F)/kT), F_1/2(eta) = -Re Li_3/2(-e^eta). Silicon: Varshni
gap 1.17 eV, 4.73e-4 eV/K, 636 K (Thurmond 1975); Nc = 2.86e19 (T/300)^1.58,
Nv = 3.10e19 (T/300)^1.85 (Green 1990); dilute levels (Sze 1981): Sb 39 meV,
Ga 72 meV; k = 8.617333262e-5 eV/K.

Run (needs `pip install mpmath`, about five minutes, most of it the scan):

    python3 core/tests/data/gen_ionization_reference.py

It prints, per case, E_F - E_V (eV), log10 n, log10 p and the ionized fraction of
the first species, to 17 significant digits, then the scan of the neutral fraction
of phosphorus at 300 K for the position of its maximum.
"""

import mpmath as mp

mp.mp.dps = 40

K_EV = mp.mpf("8.617333262e-5")
EG0, ALPHA, BETA = mp.mpf("1.17"), mp.mpf("4.73e-4"), mp.mpf(636)
NC300, XC, NV300, XV = mp.mpf("2.86e19"), mp.mpf("1.58"), mp.mpf("3.10e19"), mp.mpf("1.85")

ALTERMATT = {
    "P": ("d", "0.0455", "3e18", "2", "6e18", "2.3"),
    "As": ("d", "0.0537", "4e18", "1.5", "1.4e19", "3"),
    "B": ("a", "0.04439", "1.7e18", "1.4", "6e18", "2.4"),
}
DILUTE = {"P": ("d", "0.045"), "B": ("a", "0.045"), "Sb": ("d", "0.039"), "Ga": ("a", "0.072")}
PB_ALPHA = {"d": mp.mpf("3.1e-8"), "a": mp.mpf("3.037e-8")}


def level(symbol, model, kind_density):
    """(kind, E(N) eV, localized fraction b) of one species."""
    n = mp.mpf(kind_density)
    if model == "altermatt" and symbol in ALTERMATT:
        kind, e0, nref, c, nb, d = ALTERMATT[symbol]
        e = mp.mpf(e0) / (1 + (n / mp.mpf(nref)) ** mp.mpf(c))
        b = 1 / (1 + (n / mp.mpf(nb)) ** mp.mpf(d))
        return kind, e, b
    kind, e0 = DILUTE[symbol]
    if model == "dilute":
        return kind, mp.mpf(e0), mp.mpf(1)
    e = mp.mpf(e0) - PB_ALPHA[kind] * mp.cbrt(n)
    if e <= 0:
        return kind, mp.mpf(0), mp.mpf(0)
    return kind, e, mp.mpf(1)


def ln_f_half(eta):
    return mp.log(mp.re(-mp.polylog(mp.mpf(3) / 2, -mp.exp(eta))))


def solve(t_k, doping, model):
    t = mp.mpf(t_k)
    kt = K_EV * t
    gap = (EG0 - ALPHA * t * t / (t + BETA)) / kt
    ln_nc = mp.log(NC300) + XC * mp.log(t / 300)
    ln_nv = mp.log(NV300) + XV * mp.log(t / 300)
    totals = {"d": mp.mpf(0), "a": mp.mpf(0)}
    for symbol, n in doping:
        totals[(ALTERMATT.get(symbol) or DILUTE[symbol])[0]] += mp.mpf(n)
    species = []
    for symbol, n in doping:
        kind = (ALTERMATT.get(symbol) or DILUTE[symbol])[0]
        kind, e, b = level(symbol, model, totals[kind])
        g = 2 if kind == "d" else 4
        species.append((kind, e / kt, b, mp.mpf(g), mp.mpf(n)))

    def ionized_fraction(u, s):
        kind, e, b, g, _ = s
        z = (u - gap + e) if kind == "d" else (e - u)
        return (1 - b) + b / (1 + g * mp.exp(z))

    def h(u):
        pos = mp.exp(ln_nv + ln_f_half(-u))
        neg = mp.exp(ln_nc + ln_f_half(u - gap))
        for s in species:
            if s[0] == "d":
                pos += s[4] * ionized_fraction(u, s)
            else:
                neg += s[4] * ionized_fraction(u, s)
        return mp.log(pos) - mp.log(neg)

    lo, hi = mp.mpf(-50), gap + 50
    for _ in range(300):
        mid = (lo + hi) / 2
        if h(mid) > 0:
            lo = mid
        else:
            hi = mid
        if hi - lo < mp.mpf(10) ** -32:
            break
    u = (lo + hi) / 2
    return {
        "ef": u * kt,
        "log10_n": (ln_nc + ln_f_half(u - gap)) / mp.log(10),
        "log10_p": (ln_nv + ln_f_half(-u)) / mp.log(10),
        "fraction": ionized_fraction(u, species[0]),
    }


CASES = [
    (300.0, [("P", 1e17)], "altermatt"),
    (300.0, [("P", 1e18)], "altermatt"),
    (300.0, [("P", 3e18)], "altermatt"),
    (300.0, [("P", 1e19)], "altermatt"),
    (300.0, [("P", 1e20)], "altermatt"),
    (300.0, [("As", 3e18)], "altermatt"),
    (300.0, [("B", 1e18)], "altermatt"),
    (300.0, [("B", 1e19)], "altermatt"),
    (300.0, [("B", 1e20)], "altermatt"),
    (77.0, [("P", 1e18)], "altermatt"),
    (30.0, [("P", 1e16)], "altermatt"),
    (300.0, [("P", 2e18), ("As", 2e18), ("B", 1e17)], "altermatt"),
    (300.0, [("Sb", 1e18)], "pearson-bardeen"),
    (300.0, [("Ga", 2e19), ("P", 1e17)], "pearson-bardeen"),
    (300.0, [("P", 1e18)], "pearson-bardeen"),
    (300.0, [("P", 1e19)], "dilute"),
    (300.0, [("P", 1e20)], "dilute"),
]


def main():
    print(f"# mpmath {mp.__version__}, {mp.mp.dps} digits")
    for t_k, doping, model in CASES:
        r = solve(t_k, doping, model)
        print(
            f"{model} {t_k} K {doping}: EF-EV {mp.nstr(r['ef'], 17)} eV, "
            f"log10 n {mp.nstr(r['log10_n'], 17)}, log10 p {mp.nstr(r['log10_p'], 17)}, "
            f"fraction {mp.nstr(r['fraction'], 17)}"
        )
    # Neutral fraction of phosphorus at 300 K on a grid of 40 points per decade.
    mp.mp.dps = 20
    best = (0, 0)
    for i in range(17 * 40, 20 * 40 + 1):
        n = mp.mpf(10) ** (mp.mpf(i) / 40)
        neutral = 1 - solve(300.0, [("P", n)], "altermatt")["fraction"]
        if neutral > best[1]:
            best = (n, neutral)
    print(f"P at 300 K: largest neutral fraction {mp.nstr(best[1], 6)} at {mp.nstr(best[0], 4)} cm^-3")


if __name__ == "__main__":
    main()
