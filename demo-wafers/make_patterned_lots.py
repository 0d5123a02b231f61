#!/usr/bin/env python3
# Writes the two patterned demo lots of line C2 (invented data, fixed seed).
#
# Run from the repository root with `python3 demo-wafers/make_patterned_lots.py`; it rewrites
# demo-wafers/c2-4429-radial.csv and demo-wafers/c2-4432-hot-spot.csv byte for byte the same
# every time (Python 3 `random` with a fixed seed, values rounded to 3 decimals).
#
# Both lots are 150 mm phosphorus-doped wafers (notch at the bottom, 270 degrees) measured at 49 sites in a polar pattern: the
# centre, 8 sites on a ring of 22 mm, 16 on a ring of 44 mm and 24 on a ring of 66 mm (each
# ring starting on the +x axis). The demo spec window is 8 to 12 ohm cm.
#
# The invented patterns:
# - C2-4429, radial: rho(r) = level * (1 + 0.11 * (1 - (r / 66 mm)^2)), so the centre reads
#   11 % above the outer ring, plus 0.4 % noise. Wafer 04 runs at a low level, so its outer-ring
#   sites fall below 8 ohm cm while its centre stays inside.
# - C2-4432, hot spot: flat at about 10.2 ohm cm with 0.6 % noise, plus on four of five wafers a
#   Gaussian patch (peak +14 % to +22 %, 1/e radius 16 mm) centred at x = -47 mm, y = +45 mm,
#   near the edge: it lifts the outer-ring site at 135 degrees above 12 ohm cm on wafers 01 and
#   04 and its neighbours by a few percent.
#
# Only comment lines come before the first statement, so `bandgauge lots demo-wafers/*` skips
# this file as not a lot file (its first other line names no lot-file column).

import math
import random

SEED = 4429
RINGS_MM = [(0.0, 1), (22.0, 8), (44.0, 16), (66.0, 24)]
EDGE_MM = 66.0


def sites():
    """The 49 site positions (number, x mm, y mm), centre first, each ring from +x anticlockwise."""
    out = []
    for radius, count in RINGS_MM:
        for k in range(count):
            angle = 2.0 * math.pi * k / count
            out.append((len(out) + 1, radius * math.cos(angle), radius * math.sin(angle)))
    return out


def radial(rng, level):
    """Centre-high wafer: 11 % above the outer ring at the centre, 0.4 % noise."""
    rows = []
    for site, x, y in sites():
        r = math.hypot(x, y)
        rho = level * (1.0 + 0.11 * (1.0 - (r / EDGE_MM) ** 2)) * rng.gauss(1.0, 0.004)
        rows.append((site, x, y, rho))
    return rows


def hot_spot(rng, level, peak):
    """Flat wafer with a Gaussian patch near the edge at (-47, +45) mm; `peak` 0 for none."""
    rows = []
    for site, x, y in sites():
        d2 = (x + 47.0) ** 2 + (y - 45.0) ** 2
        rho = level * (1.0 + peak * math.exp(-d2 / 16.0**2)) * rng.gauss(1.0, 0.006)
        rows.append((site, x, y, rho))
    return rows


def write(path, comment, lot, wafers):
    with open(path, "w", encoding="utf-8", newline="\n") as f:
        f.write(f"# {comment}\n# lot: {lot}\n# dopant: P\n# uncertainty: 1.5\n")
        f.write("# diameter: 150 mm\n# notch: 270\n")
        f.write("wafer,site,x [mm],y [mm],resistivity [ohm-cm]\n")
        for wafer, rows in wafers:
            for site, x, y, rho in rows:
                # Rounded first, so a position on an axis reads 0.0 rather than -0.0.
                x, y = round(x, 1) + 0.0, round(y, 1) + 0.0
                f.write(f"{wafer},{site},{x:.1f},{y:.1f},{rho:.3f}\n")


def main():
    rng = random.Random(SEED)
    radial_levels = [("01", 9.35), ("02", 9.20), ("03", 9.45), ("04", 7.95)]
    write(
        "demo-wafers/c2-4429-radial.csv",
        "Line C2 monitor export, lot C2-4429 (epi reactor 2, centre-high radial profile)",
        "C2-4429",
        [(w, radial(rng, level)) for w, level in radial_levels],
    )
    spot_wafers = [
        ("01", 10.2, 0.22),
        ("02", 10.1, 0.16),
        ("03", 10.3, 0.0),
        ("04", 10.2, 0.21),
        ("05", 10.15, 0.14),
    ]
    write(
        "demo-wafers/c2-4432-hot-spot.csv",
        "Line C2 monitor export, lot C2-4432 (one hot spot near the edge, otherwise flat)",
        "C2-4432",
        [(w, hot_spot(rng, level, peak)) for w, level, peak in spot_wafers],
    )


if __name__ == "__main__":
    main()
