#!/usr/bin/env python3
"""Reference values for the wafer map's surface (core/src/lots/map.rs, `SurfaceFit`).

An independent computation with SciPy (nothing taken from bandgauge's code), for
core/tests/map_reference.rs:

  * scipy.interpolate.LinearNDInterpolator (Delaunay triangulation by Qhull, linear
    barycentric interpolation within each triangle, NaN outside the convex hull) through
    30 sites in general position (fixed seed; random, so no four are co-circular and the
    Delaunay triangulation is unique) with the nonlinear field
    v = 10 + 0.02 x - 0.01 y + 0.0015 (x^2 + y^2) + sin(x / 17) cos(y / 23);
  * 200 query points uniform in a disc of 55 mm, some outside the hull (written as NaN).
  * numpy.std(ddof=1) etc. for the uniformity figures of a small worked set (printed, and
    copied into core/tests/map_reference.rs beside their source).

Generated with: scipy 1.17.1, numpy 2.4.6 (Python 3). Run (a second):

    python3 core/tests/data/gen_map_reference.py

It writes core/tests/data/map_reference.csv: first the sites (kind "site", x, y, value),
then the queries (kind "query", x, y, value or NaN), with 17 significant digits.
"""

import os

import numpy
import scipy
from scipy.interpolate import LinearNDInterpolator

print(f"scipy {scipy.__version__}, numpy {numpy.__version__}")

rng = numpy.random.default_rng(20261205)


def field(x, y):
    return 10 + 0.02 * x - 0.01 * y + 0.0015 * (x**2 + y**2) + numpy.sin(x / 17) * numpy.cos(y / 23)


# 30 sites uniform in a disc of radius 70 mm.
radius = 70 * numpy.sqrt(rng.uniform(0, 1, 30))
angle = rng.uniform(0, 2 * numpy.pi, 30)
sx, sy = radius * numpy.cos(angle), radius * numpy.sin(angle)
sv = field(sx, sy)

interp = LinearNDInterpolator(numpy.column_stack([sx, sy]), sv)  # fill_value NaN
q_radius = 55 * numpy.sqrt(rng.uniform(0, 1, 200))
q_angle = rng.uniform(0, 2 * numpy.pi, 200)
qx, qy = q_radius * numpy.cos(q_angle), q_radius * numpy.sin(q_angle)
qv = interp(qx, qy)
print(f"{numpy.isnan(qv).sum()} of {len(qv)} queries outside the hull")

out = os.path.join(os.path.dirname(os.path.abspath(__file__)), "map_reference.csv")
with open(out, "w") as f:
    f.write(f"# scipy {scipy.__version__} LinearNDInterpolator, numpy {numpy.__version__}; "
            "written by gen_map_reference.py\n")
    f.write("kind,x,y,value\n")
    for x, y, v in zip(sx, sy, sv):
        f.write(f"site,{x:.17g},{y:.17g},{v:.17g}\n")
    for x, y, v in zip(qx, qy, qv):
        f.write(f"query,{x:.17g},{y:.17g},{'NaN' if numpy.isnan(v) else f'{v:.17g}'}\n")

# Uniformity figures of a small worked set (ohm cm), for the Rust test.
values = numpy.array([9.87, 10.02, 10.15, 9.94, 10.31, 9.78, 10.05])
mean = values.mean()
std = values.std(ddof=1)
lo, hi = values.min(), values.max()
print(f"worked set {values.tolist()}")
print(f"mean {mean!r} std(ddof=1) {std!r}")
print(f"std/mean % {100 * std / mean!r}")
print(f"range/sum % {100 * (hi - lo) / (hi + lo)!r}")
print(f"range/mean % {100 * (hi - lo) / mean!r}")
