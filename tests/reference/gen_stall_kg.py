#!/usr/bin/env python3
"""Reference geodesic curvatures of curves near a stall, for tests/regression_stall_kg.rs.

Writes tests/reference/stall_kg.txt (or the path given as the only argument): one line per
sample with the family name, the speed figure f, the surface jet (18 numbers: S, Su, Sv, Suu,
Suv, Svv), the curve jet (6 numbers: u, v, u', v', u'', v''), the geodesic curvature of those
inputs taken as exact, and the floor: the relative change of kg that rounding every input by
one unit of round-off can cause (eps * sum_i |x_i dkg/dx_i| / |kg|, eps = 2^-53).

Surface: the torus S(u, v) = ((R + r cos v) cos u, (R + r cos v) sin u, r sin v), R = 3, r = 1
(parameter domains [0, 2 pi] both, curve domain [0, 1]), at (u0, v0) = (0.7, 0.4). Its jet is
evaluated in double precision (Python floats), and from then on the doubles are the inputs.
Curve families (the same as examples/conditioning_sweep.rs):
  * stall-start: (u', v') = 2 t (0.8, 0.6), (u'', v'') = 2 (0.8, 0.6): a straight (u, v) line
    leaving rest, as at a doubled end control point;
  * stall-turning: (u', v') = s (0.8, 0.6), (u'', v'') = (0.5, -0.7): stopping while turning.
The speed figure is f = hypot(u'/2pi, v'/2pi) (t extent 1).

kg = N . (c' x c'') / |c'|^3 with c' = Su u' + Sv v', c'' = Suu u'^2 + 2 Suv u'v' + Svv v'^2
+ Su u'' + Sv v'', N = Su x Sv / |Su x Sv| (do Carmo, Differential Geometry of Curves and
Surfaces, 1976, sec. 4-4; REFERENCES.md), in mpmath at 60 digits; derivatives for the floor by
central differences at 60 digits (step 1e-25 relative). Written with mpmath 1.3; deterministic.
"""

import math
import sys

import mpmath as mp

mp.mp.dps = 60
R, r = 3.0, 1.0
U0, V0 = 0.7, 0.4
TWO_PI = 2.0 * math.pi


def torus_jet(u, v):
    cu, su_, cv, sv_ = math.cos(u), math.sin(u), math.cos(v), math.sin(v)
    rho = R + r * cv
    p = [rho * cu, rho * su_, r * sv_]
    su = [-rho * su_, rho * cu, 0.0]
    sv = [-r * sv_ * cu, -r * sv_ * su_, r * cv]
    suu = [-rho * cu, -rho * su_, 0.0]
    suv = [r * sv_ * su_, -r * sv_ * cu, 0.0]
    svv = [-r * cv * cu, -r * cv * su_, -r * sv_]
    return p + su + sv + suu + suv + svv


def cross(a, b):
    return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]]


def dot(a, b):
    return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]


def kg_of(x):
    """kg from the 24 inputs (18 surface, 6 curve) as mpf."""
    su, sv, suu, suv, svv = x[3:6], x[6:9], x[9:12], x[12:15], x[15:18]
    du, dv, ddu, ddv = x[20], x[21], x[22], x[23]
    c1 = [su[i] * du + sv[i] * dv for i in range(3)]
    c2 = [
        suu[i] * du * du + 2 * suv[i] * du * dv + svv[i] * dv * dv + su[i] * ddu + sv[i] * ddv
        for i in range(3)
    ]
    cr = cross(su, sv)
    n = [c / mp.sqrt(dot(cr, cr)) for c in cr]
    speed = mp.sqrt(dot(c1, c1))
    return dot(n, cross(c1, c2)) / speed**3


def floor(x, kg):
    total = mp.mpf(0)
    for i in range(len(x)):
        if x[i] == 0:
            continue
        h = abs(x[i]) * mp.mpf("1e-25")
        up, dn = list(x), list(x)
        up[i] += h
        dn[i] -= h
        d = (kg_of(up) - kg_of(dn)) / (2 * h)
        total += abs(x[i] * d)
    return total * mp.mpf(2) ** -53 / abs(kg)


def main():
    out = sys.argv[1] if len(sys.argv) > 1 else "tests/reference/stall_kg.txt"
    sj = torus_jet(U0, V0)
    lines = ["# family f S(3) Su(3) Sv(3) Suu(3) Suv(3) Svv(3) u v du dv ddu ddv kg floor"]
    for f in [1e-1, 1e-2, 1e-3, 1e-4, 3e-5, 1e-5, 3e-6, 1e-6, 1e-7, 1e-8]:
        # Speeds whose figure is f: |(u', v')| = 2 pi f (the direction (0.8, 0.6) is unit).
        s = TWO_PI * f
        for fam in ["stall-start", "stall-turning"]:
            if fam == "stall-start":
                du, dv, ddu, ddv = s * 0.8, s * 0.6, 2.0 * 0.8, 2.0 * 0.6
            else:
                du, dv, ddu, ddv = s * 0.8, s * 0.6, 0.5, -0.7
            cj = [U0, V0, du, dv, ddu, ddv]
            fig = math.hypot(du / TWO_PI, dv / TWO_PI)
            x = [mp.mpf(c) for c in sj + cj]
            kg = kg_of(x)
            fl = floor(x, kg)
            nums = [repr(c) for c in sj + cj]
            lines.append(
                " ".join([fam, repr(fig)] + nums + [mp.nstr(kg, 25), mp.nstr(fl, 6)])
            )
    with open(out, "w") as fh:
        fh.write("\n".join(lines) + "\n")


if __name__ == "__main__":
    main()
