#!/usr/bin/env python3
"""Reference Darboux frames for strake, computed by a route independent of the library.

Writes tests/reference/frames.txt (or the path given as the only argument): for a set of
analytic surfaces S(u, v) and parameter-plane curves (u(t), v(t)), one line per sample with the
surface jet, the curve jet and the expected frame, invariants and principal curvatures, at 30
significant digits.

Route (do Carmo, Differential Geometry of Curves and Surfaces, 1976, ch. 3; sympy 1.14 for the
symbolic derivatives, mpmath 1.3 at 60 digits for the numbers):
  * the space curve c(t) = S(u(t), v(t)) is differentiated symbolically in t;
  * T(t) = c'/|c'|, N(t) = (Su x Sv)/|Su x Sv| along the curve, B(t) = N x T, all as
    functions of t, and differentiated symbolically in t;
  * with d/ds = (1/|c'|) d/dt (arc length s), the Darboux equations
    dT/ds = kg B + kn N, dB/ds = -kg T + tg N, dN/ds = -kn T - tg B (do Carmo ch. 3)
    give kn = (dT/ds).N, kg = (dT/ds).B, tg = (dB/ds).N;
  * principal curvatures are the eigenvalues of the Weingarten map W = -dN, built from the
    symbolic partial derivatives Nu, Nv of the unit normal field (do Carmo sec. 3-2, 3-3):
    [Su Sv] A = -[Nu Nv]; k1 >= k2 are the roots of lambda^2 - tr(A) lambda + det(A) = 0,
    H = tr(A)/2, K = det(A).
No fundamental-form formula for kn, kg or tg is used. The library's conditioning figures are
reproduced from their definitions (src/principal.rs surface_conditioning, src/frame.rs
curve_speed_figure) so that a host-side check can compare them too.

The generator asserts textbook identities on its own output before writing anything:
  * frame orthonormal and right-handed (T x B = N), N = Su x Sv / |Su x Sv|;
  * the derivatives of the frame have the skew form of the Darboux equations
    (dT/ds.T = 0, dB/ds.B = 0, dN/ds = -kn T - tg B from an independent derivative of N);
  * k^2 = kn^2 + kg^2 with the Frenet curvature k = |c' x c''| / |c'|^3 (do Carmo sec. 1-5);
  * kn and tg from the Weingarten map agree with the Darboux route (kn = <W T, T>,
    tg = <W T, B>, do Carmo sec. 3-2);
  * Euler's formula kn = k1 cos^2 th + k2 sin^2 th and tg = (k2 - k1) sin th cos th
    (do Carmo sec. 3-2);
  * kn(T) + kn(B) = k1 + k2 = 2H (do Carmo sec. 3-2, exercise);
  * tg^2 = -K along the asymptotic lines (Beltrami-Enneper; do Carmo sec. 3-2, exercises).

Exact zeros of the geometry (kn on a plane, tg on a sphere, ...) come out of the 60-digit
arithmetic as values of order 1e-55; every value smaller than 1e-40 in magnitude is written as
0. The output is deterministic (same bytes on every run; numbers are rounded once, from 60 to
30 digits). Runtime: under 10 s. Written with sympy 1.14 and mpmath 1.3.

Usage: python3 tests/reference/gen_frames.py [OUTPUT]
"""

import os
import sys

import mpmath
import sympy as sp
from mpmath import mp, mpf

mp.dps = 60
DIGITS = 30
ZERO_SNAP = mpf("1e-40")
TOL = mpf("1e-45")  # identity checks at 60-digit working precision

u, v, t = sp.symbols("u v t", real=True)
R = sp.Rational
PI = sp.pi


def bezier3(i, x):
    """Cubic Bernstein polynomial B_{i,3}(x)."""
    return sp.binomial(3, i) * x**i * (1 - x) ** (3 - i)


# Control net of the bicubic patch: a gently warped sheet (invented data, a wing-skin panel).
_NET_Z = [
    [R(0), R(1, 4), R(1, 5), R(0)],
    [R(1, 5), R(3, 4), R(1, 2), R(-1, 10)],
    [R(1, 10), R(1, 2), R(9, 10), R(3, 10)],
    [R(0), R(-1, 5), R(3, 10), R(1, 5)],
]
_BICUBIC = [
    sp.expand(sum(bezier3(i, u) * bezier3(j, v) * (R(i) + R(j, 10) + R(i * j * (3 - j), 40)) for i in range(4) for j in range(4))),
    sp.expand(sum(bezier3(i, u) * bezier3(j, v) * (R(j) - R(i * i, 20)) for i in range(4) for j in range(4))),
    sp.expand(sum(bezier3(i, u) * bezier3(j, v) * _NET_Z[i][j] for i in range(4) for j in range(4))),
]

# name -> (S(u, v), u extent, v extent). Extents are the widths of the parameter domains
# (they only enter the conditioning figures). Where strake::analytic has the same surface, the
# parametrisation and domain are the same as there.
SURFACES = {
    "ellipsoid": (
        [3 * sp.sin(v) * sp.cos(u), 2 * sp.sin(v) * sp.sin(u), R(3, 2) * sp.cos(v)],
        2 * PI,
        PI,
    ),
    # analytic::torus(3, 1)
    "torus": (
        [(3 + sp.cos(v)) * sp.cos(u), (3 + sp.cos(v)) * sp.sin(u), sp.sin(v)],
        2 * PI,
        2 * PI,
    ),
    # analytic::monge((-2, 2), (-2, 2), f) with f = 2/5 sin x cos(7y/10) + xy^2/10 - 3x^2/20
    "monge": (
        [u, v, R(2, 5) * sp.sin(u) * sp.cos(R(7, 10) * v) + u * v**2 / 10 - R(3, 20) * u**2],
        R(4),
        R(4),
    ),
    "helicoid": ([v * sp.cos(u), v * sp.sin(u), u / 2], 4 * PI, R(4)),
    "catenoid": ([sp.cosh(v) * sp.cos(u), sp.cosh(v) * sp.sin(u), v], 2 * PI, R(3)),
    # analytic::saddle((-1, 1), (-1, 1)): z = xy
    "saddle": ([u, v, u * v], R(2), R(2)),
    # analytic::cylinder(2, 0, 4)
    "cylinder": ([2 * sp.cos(u), 2 * sp.sin(u), v], 2 * PI, R(4)),
    # analytic::sphere(3/2)
    "sphere": (
        [R(3, 2) * sp.sin(v) * sp.cos(u), R(3, 2) * sp.sin(v) * sp.sin(u), R(3, 2) * sp.cos(v)],
        2 * PI,
        PI,
    ),
    "bicubic": (_BICUBIC, R(1), R(1)),
    # A tilted plane with a skewed (non-orthogonal) parametrisation.
    "plane": (
        [R(1, 2) + u + R(3, 10) * v, R(2, 5) * u + v, R(1, 5) * u - R(1, 2) * v],
        R(2),
        R(2),
    ),
}

# (surface, path name, u(t), v(t), t extent, sample values of t). Path names starting with
# "asymptotic" are asymptotic lines (kn = 0); the checker asserts tg^2 = -K on them.
PATHS = [
    ("ellipsoid", "slanted", R(1, 5) + t, R(1, 2) + R(3, 5) * t, R(2), [R(k, 4) for k in range(5)]),
    ("ellipsoid", "wavy", 1 + t, R(6, 5) + R(2, 5) * sp.sin(2 * t), R(2), [R(k, 3) + R(1, 7) for k in range(5)]),
    ("torus", "parallel", t, R(7, 10), 2 * PI, [R(1, 3), R(3, 2)]),
    ("torus", "slanted", t, R(3, 10) + 2 * t, R(3), [R(k, 3) + R(1, 9) for k in range(4)]),
    ("torus", "curved", R(1, 2) + t + t**2 / 4, 2 * sp.sin(t), R(3), [R(k, 2) + R(1, 5) for k in range(4)]),
    ("monge", "slanted", R(-3, 2) + t, R(-1) + R(7, 10) * t, R(3), [R(k, 2) + R(1, 8) for k in range(5)]),
    ("monge", "loop", R(3, 2) * sp.cos(t), sp.sin(t) + t / 5, 2 * PI, [R(k) + R(1, 3) for k in range(5)]),
    ("helicoid", "slanted", R(1, 4) + t, R(-1) + R(3, 5) * t, R(3), [R(k, 2) + R(1, 6) for k in range(5)]),
    ("helicoid", "curved", 2 * t, R(1, 2) + sp.cos(3 * t), R(2), [R(k, 3) + R(1, 10) for k in range(5)]),
    ("catenoid", "slanted", R(1, 3) + t, R(-1) + R(4, 5) * t, R(2), [R(k, 3) + R(1, 8) for k in range(5)]),
    ("catenoid", "curved", t, R(1, 2) * sp.sin(2 * t) + R(1, 5), 2 * PI, [R(k) + R(1, 2) for k in range(5)]),
    ("saddle", "asymptotic-x", t, R(-2, 5), R(2), [R(-3, 4), R(-1, 5), R(3, 5)]),
    ("saddle", "asymptotic-x0", t, R(0), R(2), [R(-1, 2), R(1, 3)]),
    ("saddle", "asymptotic-y", R(3, 10), t, R(2), [R(-9, 10), R(-1, 4), R(1, 2), R(4, 5)]),
    ("saddle", "curved", R(1, 2) * sp.cos(t), R(3, 5) * sp.sin(t), 2 * PI, [R(1, 2), R(2), R(4)]),
    ("cylinder", "helix", t, R(7, 10) * t, 2 * PI, [R(1, 4), R(1), R(3, 2), R(5, 2), R(4)]),
    ("cylinder", "helix-backward", 5 - t, R(1, 2) + t / 3, R(4), [R(1, 5), R(6, 5), R(11, 5)]),
    ("cylinder", "curved", t, R(2) + sp.sin(t) / 2, 2 * PI, [R(1, 2), R(2), R(7, 2), R(5)]),
    ("sphere", "latitude-north", t, R(2, 5), 2 * PI, [R(1, 3), R(5, 2)]),
    ("sphere", "latitude-south", t, R(11, 5), 2 * PI, [R(1), R(9, 2)]),
    ("sphere", "slanted", R(1, 2) + t, R(1, 2) + R(2, 5) * t, R(4), [R(k, 2) + R(1, 7) for k in range(5)]),
    ("bicubic", "slanted", R(1, 10) + R(4, 5) * t, R(1, 5) + R(3, 5) * t, R(1), [R(k, 5) + R(1, 20) for k in range(5)]),
    (
        "bicubic",
        "curved",
        R(1, 2) + R(2, 5) * sp.cos(t),
        R(1, 2) + R(3, 10) * sp.sin(t) + R(1, 20) * t,
        2 * PI,
        [R(k) + R(1, 4) for k in range(5)],
    ),
    ("plane", "curved", R(4, 5) * sp.cos(t), R(1, 2) * sp.sin(t) + t**2 / 10, R(3), [R(k, 2) + R(1, 9) for k in range(5)]),
    ("plane", "cubic", t, t**3 / 3 - t / 2, R(2), [R(-4, 5), R(-1, 3), R(1, 4), R(7, 10), R(1)]),
]

COLUMNS = (
    ["surface", "path", "u_extent", "v_extent", "t_extent", "t"]
    + [f"{name}.{c}" for name in ("S", "Su", "Sv", "Suu", "Suv", "Svv") for c in "xyz"]
    + ["u", "v", "du", "dv", "ddu", "ddv"]
    + [f"{name}.{c}" for name in ("T", "B", "N") for c in "xyz"]
    + ["kn", "kg", "tg", "k1", "k2", "H", "K", "cond_surface", "cond_curve"]
)


_FUNCS = {
    sp.sin: mpmath.sin,
    sp.cos: mpmath.cos,
    sp.sinh: mpmath.sinh,
    sp.cosh: mpmath.cosh,
}


def mp_eval(expr, env, memo):
    """Evaluates a sympy expression in mpmath at the working precision, sharing common
    subexpressions through `memo` (faster than printing the large expressions for lambdify)."""
    hit = memo.get(expr)
    if hit is not None:
        return hit
    if expr.is_Symbol:
        val = env[expr]
    elif expr.is_Rational:
        val = mpf(expr.p) / expr.q
    elif expr is sp.pi:
        val = mp.pi
    elif expr.is_Add:
        val = mpmath.fsum(mp_eval(a, env, memo) for a in expr.args)
    elif expr.is_Mul:
        val = mpmath.fprod(mp_eval(a, env, memo) for a in expr.args)
    elif expr.is_Pow:
        base, ex = expr.args
        b = mp_eval(base, env, memo)
        if ex.is_Integer:
            val = b ** int(ex)
        elif ex == R(1, 2):
            val = mpmath.sqrt(b)
        elif ex == R(-1, 2):
            val = 1 / mpmath.sqrt(b)
        else:
            val = b ** mp_eval(ex, env, memo)
    elif expr.func in _FUNCS:
        val = _FUNCS[expr.func](mp_eval(expr.args[0], env, memo))
    else:
        raise TypeError(f"no mpmath evaluation for {expr.func}")
    memo[expr] = val
    return val


def evaluator(args, tree):
    """A function of `args` evaluating a nested list of sympy expressions in mpmath."""

    def run(*values):
        env = dict(zip(args, (mpf(x) for x in values)))
        memo = {}

        def go(node):
            if isinstance(node, list):
                return [go(x) for x in node]
            return mp_eval(sp.sympify(node), env, memo)

        return go(tree)

    return run


def cross(a, b):
    return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]]


def dot(a, b):
    return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]


def norm(a):
    return sp.sqrt(dot(a, a))


def mdot(a, b):
    return a[0] * b[0] + a[1] * b[1] + a[2] * b[2]


def mnorm(a):
    return mpmath.sqrt(mdot(a, a))


def mcross(a, b):
    return [a[1] * b[2] - a[2] * b[1], a[2] * b[0] - a[0] * b[2], a[0] * b[1] - a[1] * b[0]]


def close(a, b, what, scale=1):
    if abs(a - b) > TOL * max(1, abs(scale)):
        raise AssertionError(f"{what}: {mpmath.nstr(a, 20)} != {mpmath.nstr(b, 20)}")


def close_vec(a, b, what, scale=1):
    for i in range(3):
        close(a[i], b[i], f"{what}[{i}]", scale)


def fmt(x):
    x = mpf(x)
    if abs(x) < ZERO_SNAP:
        return "0"
    return mpmath.nstr(x, DIGITS, strip_zeros=False, min_fixed=-4, max_fixed=6)


def surface_fields(S):
    """Symbolic jet, unit normal field and its partials for a surface S(u, v)."""
    Su = [sp.diff(c, u) for c in S]
    Sv = [sp.diff(c, v) for c in S]
    jet = [
        S,
        Su,
        Sv,
        [sp.diff(c, u, 2) for c in S],
        [sp.diff(c, u, v) for c in S],
        [sp.diff(c, v, 2) for c in S],
    ]
    cr = cross(Su, Sv)
    Nf = [c / norm(cr) for c in cr]
    Nu = [sp.diff(c, u) for c in Nf]
    Nv = [sp.diff(c, v) for c in Nf]
    fn = evaluator((u, v), [jet, Nf, Nu, Nv])
    return fn


def weingarten(Su, Sv, Nu, Nv):
    """Matrix A of W = -dN in the basis (Su, Sv): [Su Sv] A = -[Nu Nv]."""
    g = mpmath.matrix([[mdot(Su, Su), mdot(Su, Sv)], [mdot(Sv, Su), mdot(Sv, Sv)]])
    rhs = mpmath.matrix([[-mdot(Su, Nu), -mdot(Su, Nv)], [-mdot(Sv, Nu), -mdot(Sv, Nv)]])
    return mpmath.lu_solve(g, rhs[:, 0]), mpmath.lu_solve(g, rhs[:, 1])


def components(x, Su, Sv):
    """(a, b) with x = a Su + b Sv for a tangent vector x."""
    g = mpmath.matrix([[mdot(Su, Su), mdot(Su, Sv)], [mdot(Sv, Su), mdot(Sv, Sv)]])
    ab = mpmath.lu_solve(g, mpmath.matrix([mdot(x, Su), mdot(x, Sv)]))
    return ab[0], ab[1]


def apply_w(a_cols, Su, Sv, x):
    """W x as a space vector, for a tangent vector x."""
    a, b = components(x, Su, Sv)
    c0, c1 = a_cols
    p = c0[0] * a + c1[0] * b
    q = c0[1] * a + c1[1] * b
    return [p * Su[i] + q * Sv[i] for i in range(3)]


def path_samples(surf_name, path_name, ut, vt, t_extent, ts, fields):
    S, u_ext, v_ext = SURFACES[surf_name]
    sub = {u: ut, v: vt}
    c = [sp.sympify(comp).subs(sub) for comp in S]
    c1 = [sp.diff(comp, t) for comp in c]
    c2 = [sp.diff(comp, t) for comp in c1]
    speed = norm(c1)
    T = [comp / speed for comp in c1]
    Su_t = [sp.diff(comp, u).subs(sub) for comp in S]
    Sv_t = [sp.diff(comp, v).subs(sub) for comp in S]
    cr = cross(Su_t, Sv_t)
    N = [comp / norm(cr) for comp in cr]
    B = cross(N, T)
    dT = [sp.diff(comp, t) / speed for comp in T]
    dB = [sp.diff(comp, t) / speed for comp in B]
    dN = [sp.diff(comp, t) / speed for comp in N]
    curve_jet = [ut, vt, sp.diff(ut, t), sp.diff(vt, t), sp.diff(ut, t, 2), sp.diff(vt, t, 2)]
    fn = evaluator((t,), [c1, c2, T, B, N, dT, dB, dN, curve_jet])
    rows = []
    for t0 in ts:
        c1v, c2v, Tv, Bv, Nv, dTv, dBv, dNv, cj = fn(mpf(t0.p) / t0.q)
        kn, kg = mdot(dTv, Nv), mdot(dTv, Bv)
        tg = mdot(dBv, Nv)
        jet, Nfield, Nu, Nvv = fields(cj[0], cj[1])
        Su, Sv = jet[1], jet[2]
        scale = max(mpf(1), abs(kn), abs(kg), abs(tg))
        what = f"{surf_name}/{path_name} t={t0}"

        # Orthonormal, right-handed frame; N is the normalised Su x Sv.
        for a, b, want in [(Tv, Tv, 1), (Bv, Bv, 1), (Nv, Nv, 1), (Tv, Bv, 0), (Tv, Nv, 0), (Bv, Nv, 0)]:
            close(mdot(a, b), want, f"{what}: frame dot products")
        close_vec(mcross(Tv, Bv), Nv, f"{what}: T x B = N")
        crv = mcross(Su, Sv)
        close_vec(Nv, [x / mnorm(crv) for x in crv], f"{what}: N = Su x Sv/|Su x Sv|")
        close_vec(Nfield, Nv, f"{what}: normal field at (u(t), v(t))")
        # Darboux equations: no tangential part in dT/ds, dB/ds; dN/ds = -kn T - tg B.
        close(mdot(dTv, Tv), 0, f"{what}: dT/ds . T", scale)
        close(mdot(dBv, Bv), 0, f"{what}: dB/ds . B", scale)
        close(mdot(dBv, Tv), -kg, f"{what}: dB/ds . T = -kg", scale)
        close_vec(dNv, [-kn * Tv[i] - tg * Bv[i] for i in range(3)], f"{what}: dN/ds", scale)
        # Frenet curvature k = |c' x c''|/|c'|^3 and k^2 = kn^2 + kg^2.
        kappa = mnorm(mcross(c1v, c2v)) / mnorm(c1v) ** 3
        close(kappa**2, kn**2 + kg**2, f"{what}: k^2 = kn^2 + kg^2", scale**2)

        # Weingarten map from the symbolic dN.
        a_cols = weingarten(Su, Sv, Nu, Nvv)
        tr = a_cols[0][0] + a_cols[1][1]
        det = a_cols[0][0] * a_cols[1][1] - a_cols[1][0] * a_cols[0][1]
        disc = (tr / 2) ** 2 - det
        if abs(disc) < TOL * scale**2:
            # An umbilic to working precision (a sphere): the square root would turn the
            # round-off of the discriminant into an error of 1e-30 in k1 and k2.
            disc = mpf(0)
        k1 = tr / 2 + mpmath.sqrt(disc)
        k2 = tr / 2 - mpmath.sqrt(disc)
        H, K = tr / 2, det
        scale = max(scale, abs(k1), abs(k2))
        WT = apply_w(a_cols, Su, Sv, Tv)
        WB = apply_w(a_cols, Su, Sv, Bv)
        close(mdot(WT, Tv), kn, f"{what}: kn = <W T, T>", scale)
        close(mdot(WT, Bv), tg, f"{what}: tg = <W T, B>", scale)
        close(mdot(WB, Tv), tg, f"{what}: W self-adjoint", scale)
        close(kn + mdot(WB, Bv), k1 + k2, f"{what}: kn(T) + kn(B) = k1 + k2", scale)
        # Euler's formula with e1 the k1 eigenvector of A (any direction at an umbilic).
        if disc > TOL * scale**2:
            p, q = -a_cols[1][0], a_cols[0][0] - k1  # (A - k1) (p, q) = 0 from the first row
            if abs(p) + abs(q) < mpf("1e-20"):
                p, q = a_cols[1][1] - k1, -a_cols[0][1]
            e1 = [p * Su[i] + q * Sv[i] for i in range(3)]
            e1 = [x / mnorm(e1) for x in e1]
            e2 = mcross(Nv, e1)
            th = mpmath.atan2(mdot(Tv, e2), mdot(Tv, e1))
            close(k1 * mpmath.cos(th) ** 2 + k2 * mpmath.sin(th) ** 2, kn, f"{what}: Euler kn", scale)
            close((k2 - k1) * mpmath.sin(th) * mpmath.cos(th), tg, f"{what}: Euler tg", scale)
        else:
            close(tg, 0, f"{what}: tg at an umbilic", scale)
        if path_name.startswith("asymptotic"):
            close(kn, 0, f"{what}: kn on an asymptotic line", scale)
            close(tg**2, -K, f"{what}: tg^2 = -K on an asymptotic line", scale**2)

        # Conditioning figures, by their definitions in src/principal.rs and src/frame.rs.
        ue, ve, te = (mpf(sp.N(x, 70)) for x in (u_ext, v_ext, t_extent))
        # c = |Su x Sv| / (rho_u rho_v), rho_u^2 = |Su|^2 + |Suu|^2 du^2 + |Suv|^2 dv^2,
        # rho_v^2 = |Sv|^2 + |Svv|^2 dv^2 + |Suv|^2 du^2.
        suu, suv, svv = jet[3], jet[4], jet[5]
        rho_u = mpmath.sqrt(mdot(Su, Su) + mdot(suu, suu) * ue**2 + mdot(suv, suv) * ve**2)
        rho_v = mpmath.sqrt(mdot(Sv, Sv) + mdot(svv, svv) * ve**2 + mdot(suv, suv) * ue**2)
        cond_s = mnorm(crv) / (rho_u * rho_v)
        cond_c = mpmath.hypot(cj[2] / ue, cj[3] / ve) * te
        values = (
            [surf_name, path_name, fmt(ue), fmt(ve), fmt(te), fmt(mpf(t0.p) / t0.q)]
            + [fmt(x) for vec in jet for x in vec]
            + [fmt(x) for x in cj]
            + [fmt(x) for vec in (Tv, Bv, Nv) for x in vec]
            + [fmt(x) for x in (kn, kg, tg, k1, k2, H, K, cond_s, cond_c)]
        )
        assert len(values) == len(COLUMNS)
        rows.append(" ".join(values))
    return rows


def main():
    here = os.path.dirname(os.path.abspath(__file__))
    out = sys.argv[1] if len(sys.argv) > 1 else os.path.join(here, "frames.txt")
    fields = {name: surface_fields(S) for name, (S, _, _) in SURFACES.items()}
    lines = [
        "# Reference Darboux frames for strake. Generated by tests/reference/gen_frames.py",
        f"# ({mp.dps}-digit mpmath arithmetic on sympy derivatives); do not edit: rerun it.",
        "# Route: symbolic derivatives of c(t) = S(u(t), v(t)) and of T, B, N along it, Darboux",
        "# equations in arc length (do Carmo, Differential Geometry of Curves and Surfaces, ch. 3);",
        "# k1 >= k2, H, K from the Weingarten map -dN (do Carmo sec. 3-3). N = Su x Sv/|Su x Sv|,",
        "# B = N x T. Values below 1e-40 in magnitude are written as 0 (exact zeros).",
        "# One sample per line; the first non-comment line names the columns.",
        " ".join(COLUMNS),
    ]
    for surf_name, path_name, ut, vt, t_extent, ts in PATHS:
        lines += path_samples(surf_name, path_name, sp.sympify(ut), sp.sympify(vt), t_extent, ts, fields[surf_name])
    with open(out, "w", encoding="ascii", newline="\n") as f:
        f.write("\n".join(lines) + "\n")
    print(f"wrote {len(lines) - 8} samples to {out}")


if __name__ == "__main__":
    main()
