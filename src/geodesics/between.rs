//! The geodesic between two surface points and the geodesic distance, by shooting.
//!
//! Unknowns: the start angle θ (from e₁ = Su/|Su| toward e₂ = N × e₁, as in
//! [`StartDirection::Angle`]) and the length ℓ. Residual: the end's (u, v) minus the target's.
//! Newton's method on (θ, ℓ): ∂(u, v)/∂ℓ is the end velocity (u', v') (exact), ∂(u, v)/∂θ a
//! forward difference with one more trace; each step is halved until the space distance from
//! the end to the target decreases (at most 12 halvings). Converged when that distance is
//! below the tolerance.
//!
//! Start: the straight line in the parameter plane, its direction and its length on the
//! surface (arc-length quadrature). When Newton's method fails from there, continuation:
//! the targets (u, v)ₖ = (u, v)₀ + k/m ((u, v)₁ − (u, v)₀), k = 1..m, are reached in turn,
//! each from the previous solution, for m = 4 and then 16.
//!
//! Which branch: the straight parameter line is a path between the two points on the
//! surface, so no geodesic longer than it is the shortest path. A converged geodesic longer
//! than it (by more than the tolerance) is refused with
//! [`StrakeError::GeodesicNotFound`] instead of being returned as "the" geodesic (the
//! shooting found another branch, e.g. one that winds around). What this does not see: a
//! shorter geodesic that is not the continuation of the straight line (around an obstacle of
//! the metric), and paths through other charts: seams of the parametrisation are not crossed,
//! so on a closed surface the result is the shortest path within the parameter domain.
//! Maekawa (J. Mech. Des. 118 (1996) 499–508 [details: memory]) treats shooting and
//! relaxation on freeform surfaces.

// `!(x > 0.0)` and the like are meant: they refuse NaN too. Index loops follow the formulas
// (Butcher tableaux, stage sums) term by term.
#![allow(clippy::neg_cmp_op_on_partial_ord, clippy::needless_range_loop)]

use crate::curve::uv_line;
use crate::error::{Result, StrakeError};
use crate::geodesics::trace::{
    Geodesic, GeodesicEnd, StartDirection, TraceOptions, trace_geodesic,
};
use crate::geometry::jet::DerivOrder;
use crate::geometry::math::Vec3;
use crate::geometry::principal::SurfacePoint;
use crate::numfmt::{Exact, Num};
use crate::paths::curve_on_surface::CurveOnSurface;
use crate::paths::sampling::arc_length;
use crate::surface::{SurfaceHint, SurfaceSource};

/// Options of [`geodesic_between`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct BetweenOptions {
    /// Options of each trace (its tolerance should be well below `tolerance`).
    pub trace: TraceOptions,
    /// Largest space distance from the geodesic's end to the target, > 0 (host length unit).
    pub tolerance: f64,
    /// Most Newton iterations per solve, ≥ 1 (default 30).
    pub max_iterations: usize,
}

impl BetweenOptions {
    /// Options with the given tolerance (traces at a hundredth of it).
    pub fn new(tolerance: f64) -> Self {
        BetweenOptions {
            trace: TraceOptions::new(tolerance * 1e-2),
            tolerance,
            max_iterations: 30,
        }
    }

    fn check(&self) -> Result<()> {
        self.trace.check()?;
        if !(self.tolerance.is_finite() && self.tolerance > 0.0) || self.max_iterations == 0 {
            return Err(StrakeError::InvalidArgument(format!(
                "tolerance = {} must be positive and finite and max_iterations = {} at least 1",
                crate::numfmt::Exact(self.tolerance),
                self.max_iterations
            )));
        }
        Ok(())
    }
}

/// A geodesic between two points.
#[derive(Debug, Clone, PartialEq)]
pub struct GeodesicBetween {
    /// The geodesic from the first point; its end lies within the tolerance of the second.
    pub geodesic: Geodesic,
    /// The geodesic distance (its length; host length unit).
    pub distance: f64,
    /// The start angle θ found (radians, see [`StartDirection::Angle`]).
    pub angle: f64,
    /// Space distance from the geodesic's end to the target.
    pub miss: f64,
    /// Newton iterations spent in all (with continuation).
    pub iterations: usize,
    /// Length of the straight parameter line between the points (the bound of the branch
    /// check), when its quadrature succeeded.
    pub line_length: Option<f64>,
}

struct Shooter<'a, S: SurfaceSource + ?Sized> {
    surface: &'a S,
    start: (f64, f64),
    opts: BetweenOptions,
    iterations: usize,
}

/// The outcome of one solve: converged, or what was reached.
enum Solve {
    Done(Geodesic, f64, f64, f64),
    Failed(String),
}

impl<S: SurfaceSource + ?Sized> Shooter<'_, S> {
    fn shoot(&self, theta: f64, len: f64) -> Result<Option<Geodesic>> {
        let g = trace_geodesic(
            self.surface,
            self.start.0,
            self.start.1,
            StartDirection::Angle(theta),
            len,
            &self.opts.trace,
        )?;
        Ok(match g.end {
            GeodesicEnd::Length => Some(g),
            _ => None,
        })
    }

    /// Newton on (θ, ℓ) toward `target` (its point `q`).
    fn solve(&mut self, target: (f64, f64), q: &Vec3, theta0: f64, len0: f64) -> Result<Solve> {
        let (mut theta, mut len) = (theta0, len0);
        let Some(mut g) = self.shoot(theta, len)? else {
            return Ok(Solve::Failed(format!(
                "the first shot (angle {}, length {}) leaves the surface",
                Num(theta),
                Num(len)
            )));
        };
        let mut miss = (g.end_point - q).norm();
        for _ in 0..self.opts.max_iterations {
            if miss <= self.opts.tolerance {
                return Ok(Solve::Done(g, theta, len, miss));
            }
            self.iterations += 1;
            let (u, v) = g.end_uv();
            let r = [u - target.0, v - target.1];
            let last = g.curve.nodes().last().copied().expect("two nodes or more");
            let dl = [last.du, last.dv];
            let h = 1e-6;
            let Some(gt) = self.shoot(theta + h, len)? else {
                return Ok(Solve::Failed(format!(
                    "the shot at angle {} for the derivative leaves the surface",
                    Num(theta + h)
                )));
            };
            let (ut, vt) = gt.end_uv();
            let dt = [(ut - u) / h, (vt - v) / h];
            // [dt dl] (δθ, δℓ)ᵀ = −r
            let det = dt[0] * dl[1] - dt[1] * dl[0];
            if !(det.abs() > 0.0) || !det.is_finite() {
                return Ok(Solve::Failed(format!(
                    "the end does not move with the start angle (conjugate point?) at angle \
                     {}, length {}",
                    Num(theta),
                    Num(len)
                )));
            }
            let d_theta = (-r[0] * dl[1] + r[1] * dl[0]) / det;
            let d_len = (-dt[0] * r[1] + dt[1] * r[0]) / det;
            let mut step = 1.0;
            let mut improved = false;
            for _ in 0..12 {
                let (nt, nl) = (theta + step * d_theta, len + step * d_len);
                if nl > 0.0 {
                    if let Some(ng) = self.shoot(nt, nl)? {
                        let nm = (ng.end_point - q).norm();
                        if nm < miss {
                            theta = nt;
                            len = nl;
                            g = ng;
                            miss = nm;
                            improved = true;
                            break;
                        }
                    }
                }
                step *= 0.5;
            }
            if !improved {
                return Ok(Solve::Failed(format!(
                    "no Newton step reduced the miss {miss} (angle {theta}, length {len})",
                    miss = crate::numfmt::Num(miss),
                    theta = crate::numfmt::Num(theta),
                    len = crate::numfmt::Num(len)
                )));
            }
        }
        if miss <= self.opts.tolerance {
            return Ok(Solve::Done(g, theta, len, miss));
        }
        Ok(Solve::Failed(format!(
            "{} iterations left a miss of {miss} (angle {theta}, length {len})",
            self.opts.max_iterations,
            miss = crate::numfmt::Num(miss),
            theta = crate::numfmt::Num(theta),
            len = crate::numfmt::Num(len)
        )))
    }
}

/// The geodesic from (u0, v0) to (u1, v1) and its length, the geodesic distance (see the
/// module docs for the method and what it does not see).
///
/// Errors: `NonFinite` / `OutOfDomain` / `DegenerateSurface` for either point (naming it);
/// `InvalidArgument` when they coincide or an option is bad; `GeodesicNotFound` when
/// shooting fails or finds a geodesic longer than the straight parameter line (naming the
/// miss, angle and length reached); the errors of the traces.
pub fn geodesic_between<S: SurfaceSource + ?Sized>(
    surface: &S,
    from: (f64, f64),
    to: (f64, f64),
    opts: &BetweenOptions,
) -> Result<GeodesicBetween> {
    opts.check()?;
    let (ud, vd) = (surface.u_domain(), surface.v_domain());
    let mut hint = SurfaceHint::default();
    let jp = surface.checked_jet(from.0, from.1, DerivOrder::Second, &mut hint)?;
    let sp = SurfacePoint::new(
        &jp,
        surface.orientation(),
        from.0,
        from.1,
        ud.width(),
        vd.width(),
    )?;
    let jq = surface.checked_jet(to.0, to.1, DerivOrder::Second, &mut hint)?;
    SurfacePoint::new(
        &jq,
        surface.orientation(),
        to.0,
        to.1,
        ud.width(),
        vd.width(),
    )?;
    if (jp.p - jq.p).norm() <= opts.tolerance {
        return Err(StrakeError::InvalidArgument(format!(
            "the points ({}, {}) and ({}, {}) coincide within the tolerance {}",
            Exact(from.0),
            Exact(from.1),
            Exact(to.0),
            Exact(to.1),
            crate::numfmt::Num(opts.tolerance)
        )));
    }
    let line = uv_line(from.0, from.1, to.0, to.1)?;
    let line_length = arc_length(&CurveOnSurface::new(surface, &line), 0.0, 1.0, 1e-12).ok();
    let chord = (jq.p - jp.p).norm();
    let len0 = line_length.unwrap_or(chord);
    let angle_of = |du: f64, dv: f64| {
        let x = jp.su * du + jp.sv * dv;
        let e1 = jp.su / jp.su.norm();
        let e2 = sp.n.cross(&e1);
        x.dot(&e2).atan2(x.dot(&e1))
    };
    let theta0 = angle_of(to.0 - from.0, to.1 - from.1);
    let mut sh = Shooter {
        surface,
        start: from,
        opts: *opts,
        iterations: 0,
    };
    let mut outcome = sh.solve(to, &jq.p, theta0, len0)?;
    for m in [4usize, 16] {
        if matches!(outcome, Solve::Done(..)) {
            break;
        }
        let (mut theta, mut len) = (theta0, len0 / m as f64);
        for k in 1..=m {
            let w = k as f64 / m as f64;
            let tk = (from.0 + w * (to.0 - from.0), from.1 + w * (to.1 - from.1));
            let qk = surface
                .checked_jet(tk.0, tk.1, DerivOrder::Position, &mut hint)?
                .p;
            match sh.solve(tk, &qk, theta, len)? {
                Solve::Done(g, t, l, miss) => {
                    if k == m {
                        outcome = Solve::Done(g, t, l, miss);
                    } else {
                        theta = t;
                        len = l * (k + 1) as f64 / k as f64;
                    }
                }
                f @ Solve::Failed(_) => {
                    if m == 16 {
                        outcome = f;
                    }
                    break;
                }
            }
        }
    }
    match outcome {
        Solve::Failed(what) => Err(StrakeError::GeodesicNotFound {
            what: format!(
                "shooting from ({}, {}) to ({}, {}) failed, also with continuation: {what}",
                Exact(from.0),
                Exact(from.1),
                Exact(to.0),
                Exact(to.1)
            ),
        }),
        Solve::Done(geodesic, angle, len, miss) => {
            if let Some(bound) = line_length {
                if len > bound * (1.0 + 1e-9) + opts.tolerance {
                    return Err(StrakeError::GeodesicNotFound {
                        what: format!(
                            "shooting from ({}, {}) to ({}, {}) converged to a geodesic of \
                             length {}, longer than the straight parameter line ({}): \
                             not the shortest path",
                            Exact(from.0),
                            Exact(from.1),
                            Exact(to.0),
                            Exact(to.1),
                            crate::numfmt::Num(len),
                            crate::numfmt::Num(bound)
                        ),
                    });
                }
            }
            Ok(GeodesicBetween {
                distance: geodesic.length,
                geodesic,
                angle,
                miss,
                iterations: sh.iterations,
                line_length,
            })
        }
    }
}
