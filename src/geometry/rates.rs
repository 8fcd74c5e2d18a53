//! Rates of change along arc length of the invariants of a curve on a surface: dκn/ds,
//! dκg/ds, dτg/ds and the space curvature's dκ/ds, exact from third-order jets.
//!
//! With s the arc length and the frame (T, B, N) of [`crate::geometry::frame`], the Darboux
//! equations dT/ds = κg B + κn N, dB/ds = −κg T + τg N, dN/ds = −κn T − τg B give
//! κn = c''·N / |c'|², κg = c''·B / |c'|² and τg = −(dN/dt · B) / |c'| (do Carmo §3-2; the
//! last from the third Darboux equation). Their t-derivatives need c''' (third partials of
//! S and u''', v'') and dN/dt to second order (again third partials of S). Rather than expand
//! the long closed forms by hand, every quantity is carried as a truncated Taylor series in t
//! (the crate-internal `geometry::taylor`): S(u(t), v(t)) and its partials along the curve by the
//! bivariate Taylor expansion, then T, N, B and the invariants by series arithmetic. The
//! result is d/dt of each invariant, divided by |c'| for d/ds. The tests compare it with a
//! symbolic differentiation (sympy, `tests/reference/rates.py`) and closed forms.
//!
//! The space curvature κ = √(κn² + κg²) has dκ/ds = (κn dκn/ds + κg dκg/ds)/κ; where κ = 0
//! (an inflection, a straight line) |κ| has a corner and the rate reported is the one-sided
//! one, √((dκn/ds)² + (dκg/ds)²).

// The formulas index their rows and coefficients as the sources write them.
#![allow(clippy::needless_range_loop)]

use crate::error::{NonFiniteSource, Result, StrakeError};
use crate::geometry::frame::DarbouxFrame;
use crate::geometry::jet::{CurveJet, CurvePartials, SurfaceJet, SurfacePartials};
use crate::geometry::math::Vec3;
use crate::geometry::principal::Orientation;
use crate::geometry::taylor::{LEN, TVec, Tay};

/// The rates of change of the invariants along arc length at a sample (1/length² each;
/// positive when the invariant grows in the direction of travel).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct InvariantRates {
    /// dκn/ds.
    pub normal_curvature: f64,
    /// dκg/ds.
    pub geodesic_curvature: f64,
    /// dτg/ds.
    pub geodesic_torsion: f64,
    /// dκ/ds of the space curvature κ = √(κn² + κg²) (one-sided where κ = 0).
    pub space_curvature: f64,
}

/// The frame along the path as Taylor series in t about the sample, valid to degree
/// `order − 1` (the position to degree `order`), from partials of that order.
#[derive(Debug, Clone, Copy)]
pub(crate) struct PathSeries {
    /// c(t), valid to degree `order`.
    pub(crate) c: TVec,
    /// T, B, N, valid to degree `order − 1`.
    pub(crate) t: TVec,
    pub(crate) b: TVec,
    pub(crate) n: TVec,
    /// |c'|, valid to degree `order − 1`.
    pub(crate) speed: Tay,
    /// c'', valid to degree `order − 2` (read by the tests' series route).
    #[cfg_attr(not(test), allow(dead_code))]
    pub(crate) c2: TVec,
}

const FACT: [f64; LEN] = [1.0, 1.0, 2.0, 6.0, 24.0];

/// The series of the frame along the curve about the sample, from partials of order
/// `order` (≤ 4) of the surface and of the curve. The point must not be degenerate (the
/// caller has its frame from [`crate::geometry::frame::darboux_frame`]).
pub(crate) fn path_series(
    s: &SurfacePartials,
    cp: &CurvePartials,
    orientation: Orientation,
    order: usize,
) -> PathSeries {
    let k = order.min(LEN - 1);
    // δu(t) = Σ u^(j)/j! t^j, without the constant; its powers.
    let mut du = Tay::default();
    let mut dv = Tay::default();
    for j in 1..=k {
        du.0[j] = cp.u[j] / FACT[j];
        dv.0[j] = cp.v[j] / FACT[j];
    }
    let mut pu = [Tay::constant(1.0); LEN];
    let mut pv = [Tay::constant(1.0); LEN];
    for i in 1..LEN {
        pu[i] = pu[i - 1].mul(&du);
        pv[i] = pv[i - 1].mul(&dv);
    }
    // ∂^(a+b) S along the curve: Σ_{i,j} S_{a+i, b+j} δu^i δv^j / (i! j!), valid to k − a − b.
    let along = |a: usize, b: usize| -> TVec {
        let mut out = TVec::default();
        for i in 0..=k - a - b {
            for j in 0..=k - a - b - i {
                let w = pu[i].mul(&pv[j]).scale(1.0 / (FACT[i] * FACT[j]));
                out = out.add_scaled(s.d[a + i][b + j], &w);
            }
        }
        out
    };
    let c = along(0, 0);
    let su = along(1, 0);
    let sv = along(0, 1);
    let c1 = c.deriv();
    let c2 = c1.deriv();
    let (t, speed) = c1.normalized();
    let (n, _) = su.cross(&sv).normalized();
    let n = n.scale(orientation.sign());
    let b = n.cross(&t);
    PathSeries {
        c,
        t,
        b,
        n,
        speed,
        c2,
    }
}

/// The invariants κn, κg, τg as series in t (valid to degree `order − 2`).
#[cfg(test)]
pub(crate) fn invariant_series(ps: &PathSeries) -> (Tay, Tay, Tay) {
    let speed2 = ps.speed.mul(&ps.speed);
    let kn = ps.c2.dot(&ps.n).div(&speed2);
    let kg = ps.c2.dot(&ps.b).div(&speed2);
    let tg = ps.n.deriv().dot(&ps.b).scale(-1.0).div(&ps.speed);
    (kn, kg, tg)
}

/// The third partials of a surface at a point, [Suuu, Suuv, Suvv, Svvv] (host length per
/// unit of the surface parameters cubed): what the rates need beyond a [`SurfaceJet`].
pub type ThirdPartials = [Vec3; 4];

/// The rates of change along arc length of κn, κg, τg and κ at a sample whose frame `f` has
/// already been computed (so the point is known not to be degenerate), from the surface's
/// partials and the curve's derivatives there, both of order 3 or more.
///
/// The closed forms of [`rates_from_jets`] (which the one-point and the batch paths share, so
/// both give the same bits). `orientation` is that of the frame, which already carries it.
///
/// Errors: `OrderUnavailable` when either has order below 3 (naming which);
/// `NonFinite` (result) when a rate overflows.
pub fn invariant_rates(
    f: &DarbouxFrame,
    surface: &SurfacePartials,
    curve: &CurvePartials,
    orientation: Orientation,
) -> Result<InvariantRates> {
    let _ = orientation;
    for (which, have) in [("surface", surface.order), ("curve", curve.order)] {
        if have < 3 {
            return Err(StrakeError::OrderUnavailable {
                which,
                needed: 3,
                available: have,
            });
        }
    }
    let third = [
        surface.d[3][0],
        surface.d[2][1],
        surface.d[1][2],
        surface.d[0][3],
    ];
    rates_from_jets(
        f,
        &surface.jet(),
        &third,
        &curve.jet(),
        [curve.u[3], curve.v[3]],
    )
}

/// Arithmetic the closed forms of [`rates_from_jets`] are written in once: `f64` (the
/// one-point path) and the lane types of the batch engine (every lane performing the `f64`
/// operation of the same name, so both give the same bits).
pub(crate) trait RateNum:
    Copy
    + std::ops::Add<Output = Self>
    + std::ops::Sub<Output = Self>
    + std::ops::Mul<Output = Self>
    + std::ops::Div<Output = Self>
{
    /// The constant x in every lane.
    fn k(x: f64) -> Self;
    /// IEEE square root.
    fn root(self) -> Self;
    /// `a` where `x != 0` (also where x is NaN), else `b`.
    fn nonzero_select(x: Self, a: Self, b: Self) -> Self;
}

impl RateNum for f64 {
    #[inline(always)]
    fn k(x: f64) -> Self {
        x
    }
    #[inline(always)]
    fn root(self) -> Self {
        self.sqrt()
    }
    #[inline(always)]
    fn nonzero_select(x: Self, a: Self, b: Self) -> Self {
        if x != 0.0 { a } else { b }
    }
}

impl<T: crate::engine::lanes::Lane> RateNum for T {
    #[inline(always)]
    fn k(x: f64) -> Self {
        // SAFETY: a value of a lane type exists only where its instructions are available
        // (the `Lane` contract), and these functions only ever combine existing values.
        unsafe { T::splat(x) }
    }
    #[inline(always)]
    fn root(self) -> Self {
        self.sqrt()
    }
    #[inline(always)]
    fn nonzero_select(x: Self, a: Self, b: Self) -> Self {
        T::select(x.ne(Self::k(0.0)), a, b)
    }
}

/// The inputs of the closed forms at one point (or one lane group): the curve's u', v', u'',
/// v'', u''', v'''; the surface's Su, Sv, Suu, Suv, Svv and [Suuu, Suuv, Suvv, Svvv]; the
/// frame's T, B, N, κn, κg, τg.
#[derive(Clone, Copy)]
pub(crate) struct RatesIn<T> {
    pub(crate) c: [T; 6],
    pub(crate) s: [[T; 3]; 5],
    pub(crate) s3: [[T; 3]; 4],
    pub(crate) tbn: [[T; 3]; 3],
    pub(crate) k: [T; 3],
}

#[inline(always)]
fn dot<T: RateNum>(a: &[T; 3], b: &[T; 3]) -> T {
    a[0] * b[0] + a[1] * b[1] + a[2] * b[2]
}

#[inline(always)]
fn cross<T: RateNum>(a: &[T; 3], b: &[T; 3]) -> [T; 3] {
    [
        a[1] * b[2] - a[2] * b[1],
        a[2] * b[0] - a[0] * b[2],
        a[0] * b[1] - a[1] * b[0],
    ]
}

/// Σ vᵢ xᵢ, component by component, left to right. Plain loops, no closure: a closure is a
/// function of its own, which inside a `#[target_feature]` kernel the optimiser may leave
/// out of line (and then every lane operation in it becomes a call).
#[inline(always)]
fn comb<T: RateNum, const K: usize>(v: [&[T; 3]; K], x: [T; K]) -> [T; 3] {
    let mut acc = [v[0][0] * x[0], v[0][1] * x[0], v[0][2] * x[0]];
    for i in 1..K {
        for c in 0..3 {
            acc[c] = acc[c] + v[i][c] * x[i];
        }
    }
    acc
}

#[inline(always)]
fn add3<T: RateNum>(a: [T; 3], b: [T; 3]) -> [T; 3] {
    [a[0] + b[0], a[1] + b[1], a[2] + b[2]]
}

/// The closed forms of [`rates_from_jets`]: [dκn/ds, dκg/ds, dτg/ds, dκ/ds].
#[inline(always)]
pub(crate) fn rates_math<T: RateNum>(x: &RatesIn<T>) -> [T; 4] {
    let [u1, v1, u2, v2, u3, v3] = x.c;
    let [su, sv, suu, suv, svv] = &x.s;
    let [t, b, n] = &x.tbn;
    let [kn, kg, tg] = x.k;
    let (two, three) = (T::k(2.0), T::k(3.0));
    let (uu, uv, vv) = (u1 * u1, u1 * v1, v1 * v1);
    let uv2 = two * uv;
    let cp = comb([su, sv], [u1, v1]);
    let su1 = comb([suu, suv], [u1, v1]);
    let sv1 = comb([suv, svv], [u1, v1]);
    let s3 = &x.s3;
    let su2 = comb([&s3[0], &s3[1], &s3[2], suu, suv], [uu, uv2, vv, u2, v2]);
    let sv2 = comb([&s3[1], &s3[2], &s3[3], suv, svv], [uu, uv2, vv, u2, v2]);
    let c2 = comb([suu, suv, svv, su, sv], [uu, uv2, vv, u2, v2]);
    let mixed = comb([suu, suv, svv], [u1 * u2, u1 * v2 + u2 * v1, v1 * v2]);
    let c3 = add3(
        comb(
            [&s3[0], &s3[1], &s3[2], &s3[3]],
            [uu * u1, three * (uu * v1), three * (u1 * vv), vv * v1],
        ),
        add3(
            [mixed[0] * three, mixed[1] * three, mixed[2] * three],
            comb([su, sv], [u3, v3]),
        ),
    );
    let sigma = dot(&cp, t);
    let dsigma = dot(&c2, t);
    let inv = T::k(1.0) / sigma;
    let inv2 = inv * inv;
    let inv3 = inv2 * inv;
    let dkn = dot(&c3, n) * inv3 - three * kn * dsigma * inv2 - kg * tg;
    let dkg = dot(&c3, b) * inv3 - three * kg * dsigma * inv2 + kn * tg;
    let m = cross(su, sv);
    let m1 = add3(cross(&su1, sv), cross(su, &sv1));
    let mid = cross(&su1, &sv1);
    let m2 = add3(
        add3(cross(&su2, sv), [mid[0] * two, mid[1] * two, mid[2] * two]),
        cross(su, &sv2),
    );
    let nbb = (dot(&m2, b) + two * dot(n, &m1) * sigma * tg) / dot(n, &m);
    let dtg = T::k(0.0) - (nbb + sigma * sigma * kn * kg + tg * dsigma) * inv2;
    let kappa = (kn * kn + kg * kg).root();
    let dk = T::nonzero_select(
        kappa,
        (kn * dkn + kg * dkg) / kappa,
        (dkn * dkn + dkg * dkg).root(),
    );
    [dkn, dkg, dtg, dk]
}

/// The rates of change along arc length of κn, κg, τg and κ from the frame `f` at a sample,
/// the surface's second-order jet `s` and third partials `s3` there, the curve's jet `c` and
/// third derivatives `c3` = [u''', v'''] (t the curve parameter).
///
/// Closed forms, from the Darboux equations dN/dt = −σ(κn T + τg B), dB/dt = σ(−κg T + τg N)
/// with σ = |c'| = ds/dt (do Carmo §3-2), so that no derivative of the normal beyond the
/// second is formed:
///
/// - c' = Su u' + Sv v', σ = c'·T, σ' = c''·T (= dσ/dt),
///   c'' = Suu u'² + 2 Suv u'v' + Svv v'² + Su u'' + Sv v'',
///   c''' = Suuu u'³ + 3 Suuv u'² v' + 3 Suvv u' v'² + Svvv v'³
///   + 3 (Suu u' u'' + Suv (u' v'' + u'' v') + Svv v' v'') + Su u''' + Sv v''';
/// - dκn/ds = c'''·N / σ³ − 3 κn σ'/σ² − κg τg;
/// - dκg/ds = c'''·B / σ³ − 3 κg σ'/σ² + κn τg;
/// - with m = Su × Sv (N = ±m/|m|, so |m| = ±N·m), m' = Su' × Sv + Su × Sv',
///   m'' = Su'' × Sv + 2 Su' × Sv' + Su × Sv'' (Su' = Suu u' + Suv v', Su'' = Suuu u'² +
///   2 Suuv u'v' + Suvv v'² + Suu u'' + Suv v'', likewise Sv' and Sv''):
///   N''·B = (m''·B + 2 (N·m') σ τg) / (N·m) and dτg/ds = −(N''·B + σ² κn κg + τg σ') / σ²;
/// - dκ/ds = (κn dκn/ds + κg dκg/ds)/κ with κ = √(κn² + κg²), or √((dκn/ds)² + (dκg/ds)²)
///   where κ = 0 (the one-sided rate).
///
/// Only IEEE additions, subtractions, multiplications, divisions and square roots, in the
/// order written (no fused multiply-add; dot and cross products component by component, left
/// to right), written once for `f64` and for the batch engine's lanes (the same bits). Checked against the Taylor-series route of this
/// module and a symbolic differentiation (tests).
///
/// Errors: `NonFinite` (result) when a rate is not finite.
#[inline]
pub fn rates_from_jets(
    f: &DarbouxFrame,
    s: &SurfaceJet,
    s3: &ThirdPartials,
    c: &CurveJet,
    c3: [f64; 2],
) -> Result<InvariantRates> {
    let a3 = |v: &Vec3| [v.x, v.y, v.z];
    let x = RatesIn {
        c: [c.du, c.dv, c.ddu, c.ddv, c3[0], c3[1]],
        s: [a3(&s.su), a3(&s.sv), a3(&s.suu), a3(&s.suv), a3(&s.svv)],
        s3: [a3(&s3[0]), a3(&s3[1]), a3(&s3[2]), a3(&s3[3])],
        tbn: [a3(&f.t), a3(&f.b), a3(&f.n)],
        k: [f.normal_curvature, f.geodesic_curvature, f.geodesic_torsion],
    };
    let [dkn, dkg, dtg, dk] = rates_math(&x);
    let r = InvariantRates {
        normal_curvature: dkn,
        geodesic_curvature: dkg,
        geodesic_torsion: dtg,
        space_curvature: dk,
    };
    checked_rates(r)
}

/// `r` if every rate is finite, else `NonFinite` (result) naming the first that is not.
#[inline]
pub(crate) fn checked_rates(r: InvariantRates) -> Result<InvariantRates> {
    // One test for the common case: the product of zero and a non-finite value is NaN.
    let z = r.normal_curvature * 0.0
        + r.geodesic_curvature * 0.0
        + r.geodesic_torsion * 0.0
        + r.space_curvature * 0.0;
    if z == 0.0 {
        return Ok(r);
    }
    non_finite_rate(&r)
}

#[cold]
#[inline(never)]
fn non_finite_rate(r: &InvariantRates) -> Result<InvariantRates> {
    for (what, value) in [
        ("dkn/ds", r.normal_curvature),
        ("dkg/ds", r.geodesic_curvature),
        ("dtg/ds", r.geodesic_torsion),
        ("dk/ds", r.space_curvature),
    ] {
        if !value.is_finite() {
            return Err(StrakeError::NonFinite {
                source: NonFiniteSource::Result,
                what,
                value,
            });
        }
    }
    Ok(*r)
}

/// The rates by the Taylor-series route (the series of the frame along the path, then the
/// invariants' series): an independent computation the tests compare [`rates_from_jets`]
/// with.
#[cfg(test)]
pub(crate) fn invariant_rates_by_series(
    f: &DarbouxFrame,
    surface: &SurfacePartials,
    curve: &CurvePartials,
    orientation: Orientation,
) -> Result<InvariantRates> {
    let ps = path_series(surface, curve, orientation, 3);
    let (kn, kg, tg) = invariant_series(&ps);
    let inv_speed = 1.0 / ps.speed.0[0];
    let dkn = kn.0[1] * inv_speed;
    let dkg = kg.0[1] * inv_speed;
    let dtg = tg.0[1] * inv_speed;
    let (k_n, k_g) = (f.normal_curvature, f.geodesic_curvature);
    let kappa = k_n.hypot(k_g);
    let dk = if kappa > 0.0 {
        (k_n * dkn + k_g * dkg) / kappa
    } else {
        dkn.hypot(dkg)
    };
    let r = InvariantRates {
        normal_curvature: dkn,
        geodesic_curvature: dkg,
        geodesic_torsion: dtg,
        space_curvature: dk,
    };
    for (what, value) in [
        ("dkn/ds", dkn),
        ("dkg/ds", dkg),
        ("dtg/ds", dtg),
        ("dk/ds", dk),
    ] {
        if !value.is_finite() {
            return Err(StrakeError::NonFinite {
                source: NonFiniteSource::Result,
                what,
                value,
            });
        }
    }
    Ok(r)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::nurbs::NurbsCurve;
    use crate::nurbs::surface::random_test_surface;
    use crate::paths::curve_on_surface::{CurveOnSurface, Hints};
    use crate::surface::SurfaceSource;

    /// The closed forms of `rates_from_jets` against the Taylor-series route, on rational and
    /// polynomial bicubic and biquadratic surfaces along rational cubic curves, at samples on
    /// and off knot lines: the same rates to round-off (1e-9 relative to the rates' scale).
    #[test]
    fn closed_forms_agree_with_the_series_route() {
        let mut checked = 0;
        for (seed, p, q, rational) in [(3u64, 3, 3, true), (5, 3, 2, false), (11, 2, 2, true)] {
            let mut st = seed;
            let s = random_test_surface(p, q, p + 5, q + 4, rational, &mut st);
            let (ud, vd) = (s.u_domain(), s.v_domain());
            let at = |a: f64, b: f64| [ud.lo + a * ud.width(), vd.lo + b * vd.width()];
            let pts = [
                at(0.1, 0.2),
                at(0.3, 0.8),
                at(0.6, 0.1),
                at(0.8, 0.7),
                at(0.9, 0.4),
            ];
            let knots = [0.0, 0.0, 0.0, 0.0, 0.45, 1.0, 1.0, 1.0, 1.0];
            let c =
                NurbsCurve::<2>::new(3, &knots, &pts, Some(&[1.0, 0.7, 1.4, 0.9, 1.1])).unwrap();
            let path = CurveOnSurface::new(&s, &c);
            for i in 0..40 {
                let t = (i as f64 + 0.5) / 40.0;
                let mut h = Hints::default();
                let Ok((f, sp, cp)) = path.frame_and_partials(t, 3, &mut h) else {
                    continue;
                };
                let a = invariant_rates(&f, &sp, &cp, s.orientation()).unwrap();
                let b = invariant_rates_by_series(&f, &sp, &cp, s.orientation()).unwrap();
                let scale = 1.0
                    + b.normal_curvature.abs()
                    + b.geodesic_curvature.abs()
                    + b.geodesic_torsion.abs();
                for (x, y) in [
                    (a.normal_curvature, b.normal_curvature),
                    (a.geodesic_curvature, b.geodesic_curvature),
                    (a.geodesic_torsion, b.geodesic_torsion),
                    (a.space_curvature, b.space_curvature),
                ] {
                    assert!(
                        (x - y).abs() <= 1e-9 * scale,
                        "seed {seed} t {t}: {x} vs {y} ({a:?} / {b:?})"
                    );
                }
                checked += 1;
            }
        }
        assert!(checked > 100, "only {checked} samples checked");
    }
}
