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
use crate::geometry::jet::{CurvePartials, SurfacePartials};
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
    /// c'', valid to degree `order − 2`.
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
pub(crate) fn invariant_series(ps: &PathSeries) -> (Tay, Tay, Tay) {
    let speed2 = ps.speed.mul(&ps.speed);
    let kn = ps.c2.dot(&ps.n).div(&speed2);
    let kg = ps.c2.dot(&ps.b).div(&speed2);
    let tg = ps.n.deriv().dot(&ps.b).scale(-1.0).div(&ps.speed);
    (kn, kg, tg)
}

/// The rates of change along arc length of κn, κg, τg and κ at a sample whose frame `f` has
/// already been computed (so the point is known not to be degenerate), from the surface's
/// partials and the curve's derivatives there, both of order 3 or more.
///
/// Errors: `OrderUnavailable` when either has order below 3 (naming which);
/// `NonFinite` (result) when a rate overflows.
pub fn invariant_rates(
    f: &DarbouxFrame,
    surface: &SurfacePartials,
    curve: &CurvePartials,
    orientation: Orientation,
) -> Result<InvariantRates> {
    for (which, have) in [("surface", surface.order), ("curve", curve.order)] {
        if have < 3 {
            return Err(StrakeError::OrderUnavailable {
                which,
                needed: 3,
                available: have,
            });
        }
    }
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
