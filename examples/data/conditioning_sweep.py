#!/usr/bin/env python3
"""Exact answers for the conditioning sweep (examples/conditioning_sweep.rs).

Writes examples/data/conditioning_sweep.txt (or the path given as the only argument): points
that approach the degenerate cases of a Darboux-frame evaluation, each with its surface jet, its
curve jet and the expected kn, kg, tg, k1, k2, computed in mpmath at 100 digits from the
f64 inputs the Rust side will use (every input is an f64 value, written exactly with repr, so the
expected values are exact for those inputs and the measured error is the library's, plus what the
example adds on purpose).

Formulas (do Carmo, Differential Geometry of Curves and Surfaces, 1976, sec. 3-2, 3-3), with
N = Su x Sv/|Su x Sv|, E F G the first and L M Nn the second fundamental form, I and II the forms
on (u', v'), c' = Su u' + Sv v', c'' = Suu u'^2 + 2 Suv u'v' + Svv v'^2 + Su u'' + Sv v'':
  kn = II/I;  kg = N.(c' x c'')/|c'|^3;
  tg = [(E M - F L) u'^2 + (E Nn - G L) u'v' + (F Nn - G M) v'^2] / (sqrt(EG - F^2) I);
  H = (E Nn - 2 F M + G L) / (2 (EG - F^2)), K = (L Nn - M^2)/(EG - F^2), k1,2 = H +- sqrt(H^2 - K).
At 100 digits the cancellations of these formulas near the degenerate points (figures down to
1e-15) leave more than 60 correct digits.

Cases (invented, each a family indexed by a level; the conditioning figure of each point is
computed by the Rust side with the library's own functions):
  sphere-pole    unit sphere S = (sin v cos u, sin v sin u, cos v) (strake::analytic::sphere(1))
                 at colatitude v = 10^(-level/2), three curve directions;
  skew-monge     the Monge patch M(x, y) = (x, y, f), f = x^2/2 + 3xy/10 - 2y^2/5 + x^3/5, composed
                 with the nearly singular map (x, y) = (u + v cos p, v sin p), p = 10^(-level/2):
                 Su and Sv make an angle p; curves given in (u, v) and in (x, y);
  sheared-plane  S = (u + v cos p, v sin p, 0), the same shear on a plane (kn = tg = 0);
  stall-turning  torus (3, 1) at a fixed point, (u', v') = s (0.8, 0.6), (u'', v'') = (0.5, -0.7),
                 s = 10^(-level/2): the curve stops while turning;
  stall-start    the same torus, u = u0 + 0.8 t^2, v = v0 + 0.6 t^2 at t = 10^(-level/2): a straight
                 (u, v) line starting from rest, as at a doubled end control point of a spline
                 (u' ~ t, u'' constant and parallel to u');
  stall-smooth   the same torus, u = u0 + 0.8 t^3 + 0.3 t^4, v = v0 + 0.6 t^3 - 0.5 t^4 at
                 t = 10^(-level/4): a curve that comes to rest smoothly (u' ~ t^2, u'' ~ t).

Runtime: about a second. Output deterministic.
Usage: python3 examples/data/conditioning_sweep.py [OUTPUT]
"""

import math
import os
import sys

import mpmath
from mpmath import mp, mpf

mp.dps = 100
DIGITS = 30


def fmt(x):
    x = mpf(x)
    if x == 0:
        return "0"
    return mpmath.nstr(x, DIGITS, strip_zeros=False, min_fixed=-4, max_fixed=6)


def exact(x):
    """An f64 input, written so that parsing gives back the same f64."""
    return repr(float(x))


def cross(a, b):
    return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]]


def dot(a, b):
    return sum(x * y for x, y in zip(a, b))


def invariants(jet, cj):
    """kn, kg, tg, k1, k2 from a surface jet and a curve jet (mpf values)."""
    _, su, sv, suu, suv, svv = jet
    u1, v1, uu, vv = cj[2], cj[3], cj[4], cj[5]
    cr = cross(su, sv)
    area = mpmath.sqrt(dot(cr, cr))
    n = [x / area for x in cr]
    E, F, G = dot(su, su), dot(su, sv), dot(sv, sv)
    L, M, Nn = dot(suu, n), dot(suv, n), dot(svv, n)
    first = E * u1 * u1 + 2 * F * u1 * v1 + G * v1 * v1
    second = L * u1 * u1 + 2 * M * u1 * v1 + Nn * v1 * v1
    c1 = [su[i] * u1 + sv[i] * v1 for i in range(3)]
    c2 = [suu[i] * u1 * u1 + 2 * suv[i] * u1 * v1 + svv[i] * v1 * v1 + su[i] * uu + sv[i] * vv for i in range(3)]
    kn = second / first
    kg = dot(n, cross(c1, c2)) / first ** mpf(1.5)
    tg = ((E * M - F * L) * u1 * u1 + (E * Nn - G * L) * u1 * v1 + (F * Nn - G * M) * v1 * v1) / (area * first)
    det = E * G - F * F
    H = (E * Nn - 2 * F * M + G * L) / (2 * det)
    K = (L * Nn - M * M) / det
    disc = H * H - K
    if abs(disc) < mpf(10) ** (-80) * max(1, H * H):
        disc = mpf(0)  # umbilic (the sphere)
    root = mpmath.sqrt(disc)
    return kn, kg, tg, H + root, H - root


def sphere_jet(u, v):
    su, cu, sv, cv = mpmath.sin(u), mpmath.cos(u), mpmath.sin(v), mpmath.cos(v)
    return [
        [sv * cu, sv * su, cv],
        [-sv * su, sv * cu, 0],
        [cv * cu, cv * su, -sv],
        [-sv * cu, -sv * su, 0],
        [-cv * su, cv * cu, 0],
        [-sv * cu, -sv * su, -cv],
    ]


def torus_jet(u, v, big_r=3, r=1):
    su, cu, sv, cv = mpmath.sin(u), mpmath.cos(u), mpmath.sin(v), mpmath.cos(v)
    w = big_r + r * cv
    return [
        [w * cu, w * su, r * sv],
        [-w * su, w * cu, 0],
        [-r * sv * cu, -r * sv * su, r * cv],
        [-w * cu, -w * su, 0],
        [r * sv * su, -r * sv * cu, 0],
        [-r * cv * cu, -r * cv * su, -r * sv],
    ]


def sheared_jet(u, v, p, f):
    """Jet of M(x, y) = (x, y, f(x, y)) at (x, y) = (u + v cos p, v sin p); f gives its 2-jet."""
    c, s = mpmath.cos(p), mpmath.sin(p)
    x, y = u + v * c, v * s
    z, fx, fy, fxx, fxy, fyy = f(x, y)
    mx, my = [1, 0, fx], [0, 1, fy]
    mxx, mxy, myy = [0, 0, fxx], [0, 0, fxy], [0, 0, fyy]
    return [
        [x, y, z],
        mx,
        [mx[i] * c + my[i] * s for i in range(3)],
        mxx,
        [mxx[i] * c + mxy[i] * s for i in range(3)],
        [mxx[i] * c * c + 2 * mxy[i] * c * s + myy[i] * s * s for i in range(3)],
    ]


def monge_f(x, y):
    return (
        x * x / 2 + 3 * x * y / 10 - 2 * y * y / 5 + x**3 / 5,
        x + 3 * y / 10 + 3 * x * x / 5,
        3 * x / 10 - 4 * y / 5,
        1 + 6 * x / 5,
        mpf(3) / 10,
        mpf(-4) / 5,
    )


def plane_f(x, y):
    return (0, 0, 0, 0, 0, 0)


def from_xy(p, xd, yd, xdd, ydd):
    """(u', v', u'', v'') of the curve whose image has (x', y', x'', y'') under the shear p
    (rounded to f64: these are inputs)."""
    c, s = math.cos(p), math.sin(p)
    vd, vdd = yd / s, ydd / s
    return xd - vd * c, vd, xdd - vdd * c, vdd


ROWS = []
HEADER = "case curve level u_extent v_extent t_extent " + " ".join(
    [f"{n}.{c}" for n in ("S", "Su", "Sv", "Suu", "Suv", "Svv") for c in "xyz"]
    + ["u", "v", "du", "dv", "ddu", "ddv", "kn", "kg", "tg", "k1", "k2"]
)


def emit(case, curve, level, extents, jet_fn, cj):
    cjm = [mpf(x) for x in cj]  # the exact f64 inputs
    jet = jet_fn(cjm[0], cjm[1])
    expected = invariants(jet, cjm)
    ROWS.append(
        " ".join(
            [case, curve, str(level)]
            + [exact(x) for x in extents]
            + [fmt(x) for vec in jet for x in vec]
            + [exact(x) for x in cj]
            + [fmt(x) for x in expected]
        )
    )


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    out = sys.argv[1] if len(sys.argv) > 1 else os.path.join(here, "conditioning_sweep.txt")

    # (a) the pole of the parametrised unit sphere.
    for level in range(0, 29):
        v = 10.0 ** (-level / 2)
        ext = (2 * math.pi, math.pi, 1.0)
        for name, jet in [
            ("latitude", (0.7, v, 1.0, 0.0, 0.0, 0.0)),
            ("slanted", (0.7, v, 1.0, 0.5, 0.3, -0.2)),
            ("meridian-bent", (0.7, v, 0.2, 1.0, 1.0, 0.4)),
        ]:
            emit("sphere-pole", name, level, ext, sphere_jet, jet)

    # (b) Su and Sv nearly parallel: a sheared Monge patch and a sheared plane.
    for case, f in [("skew-monge", monge_f), ("sheared-plane", plane_f)]:
        for level in range(0, 29):
            p = 10.0 ** (-level / 2)
            ext = (2.0, 2.0, 1.0)
            (u0, v0) = (0.3, 0.4)
            curves = [
                ("uv-slanted", (u0, v0, 1.0, 0.5, 0.3, -0.2)),
                ("xy-diagonal", (u0, v0) + from_xy(p, 0.6, 0.8, 0.1, -0.3)),
                ("xy-along-x", (u0, v0) + from_xy(p, 1.0, 0.05, -0.2, 0.4)),
            ]
            for name, jet in curves:
                emit(case, name, level, ext, lambda a, b, p=p, f=f: sheared_jet(a, b, mpf(p), f), jet)

    # (c) stalling curves on the torus (3, 1) at (u, v) = (0.4, 0.9).
    ext = (2 * math.pi, 2 * math.pi, 1.0)
    for level in range(0, 31):
        s = 10.0 ** (-level / 2)
        emit("stall-turning", "turning", level, ext, torus_jet, (0.4, 0.9, 0.8 * s, 0.6 * s, 0.5, -0.7))
    for level in range(0, 31):
        t = 10.0 ** (-level / 2)
        jet = (0.4 + 0.8 * t * t, 0.9 + 0.6 * t * t, 1.6 * t, 1.2 * t, 1.6, 1.2)
        emit("stall-start", "start", level, ext, torus_jet, jet)
    for level in range(0, 41):
        t = 10.0 ** (-level / 4)
        jet = (
            0.4 + 0.8 * t**3 + 0.3 * t**4,
            0.9 + 0.6 * t**3 - 0.5 * t**4,
            2.4 * t**2 + 1.2 * t**3,
            1.8 * t**2 - 2.0 * t**3,
            4.8 * t + 3.6 * t**2,
            3.6 * t - 6.0 * t**2,
        )
        emit("stall-smooth", "smooth", level, ext, torus_jet, jet)

    lines = [
        "# Exact answers for examples/conditioning_sweep.rs. Generated by",
        "# examples/data/conditioning_sweep.py (mpmath, 100 digits); do not edit: rerun it.",
        "# Inputs (extents, curve jets) are f64 values written exactly; jets and expectations at",
        "# 30 significant digits. The first non-comment line names the columns.",
        HEADER,
    ] + ROWS
    with open(out, "w", encoding="ascii", newline="\n") as fh:
        fh.write("\n".join(lines) + "\n")
    print(f"wrote {len(ROWS)} points to {out}")


if __name__ == "__main__":
    main()
