#!/usr/bin/env python3
"""Reference rates of change along a curve on a surface, and tool-centre path quantities,
for strake, by symbolic differentiation (a route independent of the library's Taylor-series
arithmetic).

Writes tests/reference/rates.txt (or the path given as the only argument). For each case: an
analytic surface S(u, v), a cubic Bezier curve (u(t), v(t)) in its parameter plane (t in
[0, 1]; the library builds the same curve as a clamped cubic NURBS), and a cutter; one line
per sample t with

  dkn/ds dkg/ds dtg/ds dk/ds  speed_ratio  kc  dkc/dsc  tc

Route (do Carmo, Differential Geometry of Curves and Surfaces, 1976, ch. 1 and 3; sympy 1.14
for the symbolic derivatives, mpmath at 50 digits for the numbers):
  * c(t) = S(u(t), v(t)); T = c'/|c'|, N = sigma (Su x Sv)/|Su x Sv| along the curve,
    B = N x T, as symbolic functions of t;
  * kn = (dT/ds).N, kg = (dT/ds).B, tg = (dB/ds).N with d/ds = (1/|c'|) d/dt (the Darboux
    equations), each differentiated symbolically once more in t, then divided by |c'|;
    k = |c' x c''|/|c'|^3 (Frenet curvature) differentiated the same way;
  * the tool-centre point CL(t) = c + r n_t + R e, n_t = s N the tool-side normal, a the
    axis a = sin(lead) T + cos(lead) sin(tilt) b_t + cos(lead) cos(tilt) n_t with
    b_t = n_t x T, e = (n_t - (n_t.a) a)/|n_t - (n_t.a) a| (R: the cutter's major radius,
    r: its corner radius; a ball has R = 0); then speed ratio |CL'|/|c'|, centre-path
    curvature kc = |CL' x CL''|/|CL'|^3, its rate dkc/dsc = (dkc/dt)/|CL'| and its torsion
    tc = (CL' x CL'').CL'''/|CL' x CL''|^2 (do Carmo sec. 1-5), all by symbolic derivatives.
No Taylor series and no fundamental-form formula is used.

Usage: python3 tests/reference/gen_rates.py [OUTPUT]   (runtime: a few minutes). Cases with a
flat or toroidal cutter at a lead are not here (their symbolic derivatives took too long to
evaluate); tests/centre_path.rs checks them against finite differences of the centre points.
"""

import os
import sys

import mpmath
import sympy as sp
from mpmath import mp, mpf

mp.dps = 50
u, v, t = sp.symbols("u v t", real=True)
R = sp.Rational


def vec(*xs):
    return sp.Matrix(xs)


def bezier(pts):
    """Cubic Bezier in t over [0, 1] with control points pts (4 pairs of rationals)."""
    b = [(1 - t) ** 3, 3 * t * (1 - t) ** 2, 3 * t**2 * (1 - t), t**3]
    return (sum(bi * p[0] for bi, p in zip(b, pts)), sum(bi * p[1] for bi, p in zip(b, pts)))


def line(u0, v0, u1, v1):
    return bezier([(u0 + (u1 - u0) * R(k, 3), v0 + (v1 - v0) * R(k, 3)) for k in range(4)])


SURFACES = {
    # name: S(u, v); the library's strake::analytic constructors with the same arguments.
    "cylinder12": vec(12 * sp.cos(u), 12 * sp.sin(u), v),
    "sphere3": vec(3 * sp.sin(v) * sp.cos(u), 3 * sp.sin(v) * sp.sin(u), 3 * sp.cos(v)),
    "torus5_2": vec((5 + 2 * sp.cos(v)) * sp.cos(u), (5 + 2 * sp.cos(v)) * sp.sin(u), 2 * sp.sin(v)),
    "monge": vec(u, v, R(3, 10) * sp.sin(u) * sp.cos(R(13, 10) * v) + R(1, 10) * u**2 * v),
}

# name, surface, curve, orientation sign sigma, cutter (R, r), tool side s, lead, tilt.
CASES = [
    ("cyl_circle_ball_in", "cylinder12", line(0, 1, 3, 1), 1, (0, 10), -1, 0, 0),
    ("cyl_circle_ball_out", "cylinder12", line(0, 1, 3, 1), 1, (0, 10), 1, 0, 0),
    ("cyl_helix_ball_in", "cylinder12", line(0, 0, 3, 20), 1, (0, 4), -1, 0, 0),
    ("sphere_latitude_ball_out", "sphere3", line(0, 1, 3, 1), 1, (0, 1), -1, 0, 0),
    ("sphere_curve_ball_in", "sphere3",
     bezier([(0, R(1)), (R(1, 2), R(6, 5)), (R(3, 2), R(4, 5)), (R(5, 2), R(13, 10))]),
     1, (0, 1), 1, 0, 0),
    ("torus_parallel_ball", "torus5_2", line(0, R(7, 10), 3, R(7, 10)), 1, (0, R(1, 2)), 1, 0, 0),
    ("monge_curve_ball", "monge",
     bezier([(R(-1), R(-1, 2)), (R(-1, 5), R(3, 5)), (R(1, 2), R(-3, 10)), (R(6, 5), R(7, 10))]),
     1, (0, R(3, 4)), 1, 0, 0),
]
SAMPLES = [R(1, 10), R(2, 5), R(7, 10)]


def norm(x):
    return sp.sqrt(x.dot(x))


def case_lines(name, surf, curve, sigma, cutter, side, lead, tilt):
    S = SURFACES[surf]
    uc, vc = curve
    sub = {u: uc, v: vc}
    c = S.subs(sub)
    su = S.diff(u).subs(sub)
    sv = S.diff(v).subs(sub)
    c1 = c.diff(t)
    speed = norm(c1)
    T = c1 / speed
    nraw = su.cross(sv)
    N = sigma * nraw / norm(nraw)
    B = N.cross(T)
    dds = lambda x: x.diff(t) / speed
    dT = dds(T)
    dB = dds(B)
    kn = dT.dot(N)
    kg = dT.dot(B)
    tg = dB.dot(N)
    c2 = c1.diff(t)
    k = norm(c1.cross(c2)) / speed**3
    rates = [dds(kn), dds(kg), dds(tg), dds(k)]
    # Tool-centre point.
    big_r, r = cutter
    nt = side * N
    bt = nt.cross(T)
    a = sp.sin(lead) * T + sp.cos(lead) * sp.sin(tilt) * bt + sp.cos(lead) * sp.cos(tilt) * nt
    if big_r == 0:
        cl = c + r * nt
    else:
        perp = nt - nt.dot(a) * a
        cl = c + r * nt + big_r * perp / norm(perp)
    p1 = cl.diff(t)
    p2 = p1.diff(t)
    p3 = p2.diff(t)
    fs = [sp.lambdify(t, e, modules="mpmath") for e in rates + [speed]]
    fp = [sp.lambdify(t, list(e), modules="mpmath") for e in (p1, p2, p3)]

    def cross(a, b):
        return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]]

    def dot(a, b):
        return sum(a[i] * b[i] for i in range(3))

    out = []
    for ts in SAMPLES:
        x = mpf(ts.p) / ts.q
        vals = [f(x) for f in fs]
        speed_x = vals.pop()
        # Centre path: the symbolic derivatives CL', CL'', CL''' evaluated, then
        # kc = |A|/|CL'|^3 with A = CL' x CL'', its t-derivative by the product rule with
        # dA/dt = CL' x CL''', and tc = A.CL'''/|A|^2 (do Carmo sec. 1-5).
        q1, q2, q3 = (f(x) for f in fp)
        sc = mpmath.sqrt(dot(q1, q1))
        a = cross(q1, q2)
        da = cross(q1, q3)
        an = mpmath.sqrt(dot(a, a))
        kc = an / sc**3
        dsc = dot(q1, q2) / sc
        if an > mpf("1e-40"):
            dkc = (dot(a, da) / an / sc**3 - 3 * an * dsc / sc**4) / sc
            tc = dot(a, q3) / an**2
        else:
            dkc = mpmath.sqrt(dot(da, da)) / sc**4
            tc = mpf(0)
        vals += [sc / speed_x, kc, dkc, tc]
        vals = [mpmath.re(x) for x in vals]
        vals = [mpf(0) if abs(x) < mpf("1e-35") else x for x in vals]
        out.append(
            f"{name} {mpmath.nstr(mpf(ts.p) / ts.q, 20)} "
            + " ".join(mpmath.nstr(x, 25, min_fixed=-1, max_fixed=-1) for x in vals)
        )
    return out


def main():
    path = sys.argv[1] if len(sys.argv) > 1 else os.path.join(os.path.dirname(__file__), "rates.txt")
    lines = [
        "# Reference rates for strake. Generated by tests/reference/gen_rates.py (sympy",
        "# symbolic derivatives, 50-digit mpmath); do not edit: rerun it.",
        "# case t dkn/ds dkg/ds dtg/ds dk/ds speed_ratio kc dkc/dsc tc",
    ]
    for case in CASES:
        print(case[0], file=sys.stderr)
        lines += case_lines(*case)
    with open(path, "w") as f:
        f.write("\n".join(lines) + "\n")


if __name__ == "__main__":
    main()
