//! Tracing a geodesic from a surface point and a direction.
//!
//! The state y = (u, v, u', v') (primes: d/ds, s = arc length) obeys y' = (u', v', u'', v'')
//! with the geodesic acceleration of [`crate::geodesics::christoffel`]: one second-order
//! surface jet per evaluation. It is integrated by the Dormand–Prince 5(4) pair
//! ([`crate::geodesics::rk`]) with the step controlled by an error measured **in space**: the
//! difference δ between the fifth- and fourth-order solutions is mapped through the surface,
//! e = max(|Su δu + Sv δv|, h |Su δu' + Sv δv'|) (a position error and the position error
//! that a direction error makes over the step), and a step is accepted when e ≤ tolerance
//! (host length unit). The next step is h · min(5, max(0.2, 0.9 (tol/e)^{1/5})).
//!
//! The trace stops
//! - at the length asked ([`GeodesicEnd::Length`]);
//! - at the domain boundary ([`GeodesicEnd::Boundary`]): the step is aimed at the crossing
//!   predicted from the local quadratic (u + u's + u''s²/2), refined step after step, and the
//!   last point is put exactly on the boundary once it is within 1e-11 of the domain width;
//! - before a degenerate point ([`GeodesicEnd::Degenerate`]): a stage whose surface
//!   conditioning figure is below [`DEGENERATE_SURFACE_LIMIT`] is refused, the step halved,
//!   and the trace ends when the step falls below its floor;
//! - with [`StrakeError::GeodesicIncomplete`] when the error cannot be brought below the
//!   tolerance with a step above its floor (1e-13 of the surface's size) or the step cap is
//!   used up: never a loop, never a silent wrong curve.
//!
//! No step crosses a knot line of the surface ([`SurfaceSource::u_breaks`], `v_breaks`),
//! where the parametrisation's second derivatives may jump: steps are aimed just short of the
//! line (by a thousandth of the way) and then onto it, a step that would jump over one is
//! refused, and the node on the line is doubled so that the curve's second derivative can
//! jump with the surface's.
//!
//! The curve is the quintic Hermite interpolant of the accepted nodes (value, u', v' and the
//! geodesic acceleration at each), parametrised by arc length: its frame has κg = 0 at the
//! nodes to the accuracy of the state, and between them to the interpolant's O(h⁴) error in
//! the second derivative (measured in the tests and `docs/geodesics.md`).

// `!(x > 0.0)` and the like are meant: they refuse NaN too. Index loops follow the formulas
// (Butcher tableaux, stage sums) term by term.
#![allow(clippy::neg_cmp_op_on_partial_ord, clippy::needless_range_loop)]

use crate::error::{NonFiniteSource, Result, StrakeError};
use crate::geodesics::christoffel::geodesic_acceleration;
use crate::geodesics::hermite::HermiteUvCurve;
use crate::geodesics::rk;
use crate::geometry::jet::{CurveJet, DerivOrder, SurfaceJet};
use crate::geometry::math::Vec3;
use crate::geometry::principal::{DEGENERATE_SURFACE_LIMIT, SurfacePoint, surface_conditioning};
use crate::surface::{SurfaceHint, SurfaceSource};

/// The start direction of a geodesic, in the tangent plane at the start point.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum StartDirection {
    /// An angle θ (radians) from e₁ = Su/|Su| toward e₂ = N × e₁: the direction
    /// cos θ e₁ + sin θ e₂ (e₂ turns with the surface's orientation).
    Angle(f64),
    /// A direction in space; its component along the normal is removed.
    Space(Vec3),
    /// A direction in the parameter plane (du, dv): the space direction Su du + Sv dv.
    Parameter(f64, f64),
}

/// Options of a trace.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TraceOptions {
    /// Error allowed per step, in space (host length unit), > 0. The global error after n
    /// steps is about n times this at worst (measured in `docs/geodesics.md`).
    pub tolerance: f64,
    /// Most step attempts (accepted and rejected), ≥ 1; default 100 000.
    pub max_steps: usize,
}

impl TraceOptions {
    /// Options with the given tolerance and the default step cap.
    pub fn new(tolerance: f64) -> Self {
        TraceOptions {
            tolerance,
            max_steps: 100_000,
        }
    }

    /// Errors (`InvalidArgument`, naming the field and value) unless the tolerance is positive
    /// and finite and the step cap at least 1.
    pub fn check(&self) -> Result<()> {
        if !(self.tolerance.is_finite() && self.tolerance > 0.0) {
            return Err(StrakeError::InvalidArgument(format!(
                "tolerance = {} must be positive and finite",
                crate::numfmt::Exact(self.tolerance)
            )));
        }
        if self.max_steps == 0 {
            return Err(StrakeError::InvalidArgument(
                "max_steps = 0: at least one step is needed".into(),
            ));
        }
        Ok(())
    }
}

/// A side of the parameter domain.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum DomainSide {
    /// u = u_min.
    ULow,
    /// u = u_max.
    UHigh,
    /// v = v_min.
    VLow,
    /// v = v_max.
    VHigh,
}

/// Why a trace ended (the failures are errors instead).
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum GeodesicEnd {
    /// It reached the length asked.
    Length,
    /// It left the parameter domain; the last point lies exactly on this side.
    Boundary(DomainSide),
    /// It stopped before a degenerate point (a pole, a collapsed edge): the next stage's
    /// conditioning figure was below the limit at every step above the floor.
    Degenerate {
        /// The conditioning figure that refused the last attempted stage.
        conditioning: f64,
    },
}

/// What a trace cost.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct TraceStats {
    /// Accepted steps.
    pub accepted: usize,
    /// Rejected step attempts (error too large, a stage outside the domain or degenerate).
    pub rejected: usize,
    /// Surface jet evaluations (second order), all told.
    pub jets: usize,
}

/// A traced geodesic.
#[derive(Debug, Clone, PartialEq)]
pub struct Geodesic {
    /// The curve in the parameter plane, t = arc length from 0 to [`Geodesic::length`].
    pub curve: HermiteUvCurve,
    /// Why it ended.
    pub end: GeodesicEnd,
    /// Length traced (host length unit).
    pub length: f64,
    /// The end point S(u, v).
    pub end_point: Vec3,
    /// The unit tangent at the end (direction of travel).
    pub end_tangent: Vec3,
    /// The unit normal at the end (with the surface's orientation).
    pub end_normal: Vec3,
    /// Cost.
    pub stats: TraceStats,
}

impl Geodesic {
    /// The (u, v) at the end.
    pub fn end_uv(&self) -> (f64, f64) {
        let n = self
            .curve
            .nodes()
            .last()
            .expect("a Hermite curve has two nodes or more");
        (n.u, n.v)
    }
}

/// Outcome of one stage evaluation that is not an error of the source.
enum Refusal {
    Outside,
    Degenerate(f64),
}

struct Tracer<'a, S: SurfaceSource + ?Sized> {
    surface: &'a S,
    hint: SurfaceHint,
    lo: [f64; 2],
    hi: [f64; 2],
    snap: [f64; 2],
    extent: [f64; 2],
    /// The surface's knot lines in u and in v (derivatives may jump there).
    breaks: [Vec<f64>; 2],
    jets: usize,
}

impl<S: SurfaceSource + ?Sized> Tracer<'_, S> {
    /// y' at y, and the jet there, or a refusal.
    fn eval(
        &mut self,
        y: &[f64; 4],
    ) -> Result<std::result::Result<([f64; 4], SurfaceJet), Refusal>> {
        let mut x = [y[0], y[1]];
        for k in 0..2 {
            if !x[k].is_finite()
                || x[k] < self.lo[k] - self.snap[k]
                || x[k] > self.hi[k] + self.snap[k]
            {
                return Ok(Err(Refusal::Outside));
            }
            x[k] = x[k].clamp(self.lo[k], self.hi[k]);
        }
        if !(y[2].is_finite() && y[3].is_finite()) {
            return Ok(Err(Refusal::Degenerate(f64::NAN)));
        }
        let jet = self
            .surface
            .jet_in_domain(x[0], x[1], DerivOrder::Second, &mut self.hint)?;
        self.jets += 1;
        jet.check_finite()?;
        let cross = jet.su.cross(&jet.sv).norm();
        let cond = surface_conditioning(&jet, cross, self.extent[0], self.extent[1]);
        if cond.is_nan() || cond < DEGENERATE_SURFACE_LIMIT {
            return Ok(Err(Refusal::Degenerate(cond)));
        }
        match geodesic_acceleration(&jet, y[2], y[3]) {
            Some((a, b)) if a.is_finite() && b.is_finite() => Ok(Ok(([y[2], y[3], a, b], jet))),
            _ => Ok(Err(Refusal::Degenerate(cond))),
        }
    }

    /// Smallest s > 0 at which the local quadratic x + x's + x''s²/2 meets a domain side, or
    /// a value ≥ `within` when it meets none before s = `within`: a line farther than
    /// |x'| s + |x''| s²/2 at s = 1.01 `within` (the quadratic cannot reach it) is skipped, which
    /// changes no result below `within` (the caller uses the reach only when it is smaller).
    fn boundary_reach(&self, y: &[f64; 4], f: &[f64; 4], within: f64) -> f64 {
        let mut best = f64::INFINITY;
        let s_far = 1.01 * within;
        for k in 0..2 {
            let (x, d, a) = (y[k], f[k], 0.5 * f[k + 2]);
            let far = d.abs() * s_far + a.abs() * s_far * s_far;
            // Knot lines are aimed at just short of them (by a thousandth of the way), so that
            // no stage of the step lands on the far side; the last approach is within the
            // snap distance after a few such steps.
            let lines = self.breaks[k]
                .iter()
                .copied()
                .filter(|b| (x - b).abs() > self.snap[k])
                .map(|b| (b, 0.999));
            for (b, aim) in [(self.lo[k], 1.0), (self.hi[k], 1.0)]
                .into_iter()
                .chain(lines)
            {
                if (x - b).abs() > far {
                    continue;
                }
                // a s² + d s + (x − b) = 0
                let c = x - b;
                let roots = if a.abs() <= 1e-300 || (a * c).abs() < 1e-12 * d * d {
                    // nearly linear: s = −c/d (and the far root, irrelevant here)
                    [if d != 0.0 { -c / d } else { f64::INFINITY }, f64::INFINITY]
                } else {
                    let disc = d * d - 4.0 * a * c;
                    if disc < 0.0 {
                        [f64::INFINITY; 2]
                    } else {
                        let r = disc.sqrt();
                        let qq = -0.5 * (d + d.signum() * r);
                        if qq == 0.0 {
                            [f64::INFINITY; 2]
                        } else {
                            [qq / a, c / qq]
                        }
                    }
                };
                for r in roots {
                    if r > 0.0 && aim * r < best {
                        best = aim * r;
                    }
                }
            }
        }
        best
    }
}

impl<S: SurfaceSource + ?Sized> Tracer<'_, S> {
    /// True when the step from `a` to `b` crosses a knot line by more than the snap distance
    /// on both sides.
    fn jumps_a_break(&self, a: &[f64; 4], b: &[f64; 4]) -> bool {
        (0..2).any(|k| {
            self.breaks[k].iter().any(|&l| {
                let (x0, x1) = (a[k] - l, b[k] - l);
                x0.abs() > self.snap[k] && x1.abs() > self.snap[k] && (x0 > 0.0) != (x1 > 0.0)
            })
        })
    }
}

/// Appends the node of an accepted step at arc length `s`, or, when the step is below a
/// thousandth of the last segment (the last approaches to the boundary or to a knot line),
/// moves the last node there instead: segments that short would leave the curve's parameter
/// at the rounding level of the arc length. Not across a doubled node (a knot line).
pub(crate) fn push_node(knots: &mut Vec<f64>, nodes: &mut Vec<CurveJet>, s: f64, node: CurveJet) {
    let n = knots.len();
    if n >= 2 {
        let last = knots[n - 1] - knots[n - 2];
        let doubled = n >= 3 && knots[n - 2] == knots[n - 3];
        if last > 0.0 && !doubled && s - knots[n - 1] < 1e-3 * last {
            knots[n - 1] = s;
            nodes[n - 1] = node;
            return;
        }
    }
    knots.push(s);
    nodes.push(node);
}

/// The unit parameter velocity (u', v') (|Su u' + Sv v'| = 1) of a start direction at a
/// surface point, or an error naming the direction.
pub fn start_velocity(
    jet: &SurfaceJet,
    sp: &SurfacePoint,
    dir: StartDirection,
) -> Result<(f64, f64)> {
    let x = match dir {
        StartDirection::Angle(theta) => {
            if !theta.is_finite() {
                return Err(StrakeError::NonFinite {
                    source: NonFiniteSource::Parameter,
                    what: "direction angle",
                    value: theta,
                });
            }
            let e1 = jet.su / jet.su.norm();
            let e2 = sp.n.cross(&e1);
            e1 * theta.cos() + e2 * theta.sin()
        }
        StartDirection::Space(d) => {
            if let Some(bad) = [d.x, d.y, d.z].into_iter().find(|c| !c.is_finite()) {
                return Err(StrakeError::NonFinite {
                    source: NonFiniteSource::Parameter,
                    what: "direction",
                    value: bad,
                });
            }
            let t = d - sp.n * d.dot(&sp.n);
            if !(t.norm() > 1e-12 * d.norm()) || d.norm() == 0.0 {
                return Err(StrakeError::InvalidArgument(format!(
                    "direction {} has no length in the tangent plane (zero, or along the normal)",
                    crate::numfmt::ExactVec(&[d.x, d.y, d.z])
                )));
            }
            t
        }
        StartDirection::Parameter(a, b) => {
            if let Some(bad) = [a, b].into_iter().find(|c| !c.is_finite()) {
                return Err(StrakeError::NonFinite {
                    source: NonFiniteSource::Parameter,
                    what: "direction (du, dv)",
                    value: bad,
                });
            }
            if a == 0.0 && b == 0.0 {
                return Err(StrakeError::InvalidArgument(
                    "direction (du, dv) = (0, 0) has zero length".into(),
                ));
            }
            jet.su * a + jet.sv * b
        }
    };
    let x = x / x.norm();
    let (p, q) = sp.components(x.dot(&jet.su), x.dot(&jet.sv));
    Ok((p, q))
}

/// The start velocity (p, q) with the component across a domain side removed, when the
/// start lies on that side (within the snap distance, 1e-11 of the domain width) and the
/// component is so small that over the whole `length` it moves the point less than the snap
/// distance: a direction along the side up to rounding (the end of a path on the boundary,
/// its perpendicular along the side) is taken as along it, and the velocity is scaled back
/// to unit speed. Without this, a tilt of one rounding unit out of the domain ends the
/// geodesic at its start (a start heading out), or after a fraction of its length at a
/// start just inside; a tilt inward moves the end off the side by rounding units, which
/// repeated offsets accumulate.
fn along_a_side<S: SurfaceSource + ?Sized>(
    jet: &SurfaceJet,
    start: (f64, f64),
    (p, q): (f64, f64),
    length: f64,
    surface: &S,
) -> (f64, f64) {
    let doms = [surface.u_domain(), surface.v_domain()];
    let x = [start.0, start.1];
    let mut vel = [p, q];
    let mut changed = false;
    for k in 0..2 {
        let snap = 1e-11 * doms[k].width();
        let on_side = x[k] - doms[k].lo <= snap || doms[k].hi - x[k] <= snap;
        if on_side && vel[k] != 0.0 && vel[k].abs() * length <= snap {
            vel[k] = 0.0;
            changed = true;
        }
    }
    if !changed {
        return (p, q);
    }
    let speed = (jet.su * vel[0] + jet.sv * vel[1]).norm();
    if !(speed > 0.0) {
        return (p, q);
    }
    (vel[0] / speed, vel[1] / speed)
}

/// Traces the geodesic from (u, v) in direction `dir` for arc length `length` (see the module
/// docs for the method and the ways it ends).
///
/// Errors: `NonFinite` / `OutOfDomain` for a start (u, v) not finite or outside the domain
/// (nothing is clamped); `DegenerateSurface` for a start at a degenerate point;
/// `InvalidArgument` for a length that is not positive and finite, a bad option or a zero
/// direction (naming the value); `LeavesSurface` for a start on the domain boundary heading
/// out (a direction that crosses a side it starts on by less than 1e-11 of the domain width
/// over the whole length is taken along the side instead); `GeodesicIncomplete` when the tolerance cannot be met or the step cap is used up;
/// every error of the surface.
pub fn trace_geodesic<S: SurfaceSource + ?Sized>(
    surface: &S,
    u: f64,
    v: f64,
    dir: StartDirection,
    length: f64,
    opts: &TraceOptions,
) -> Result<Geodesic> {
    opts.check()?;
    if !(length.is_finite() && length > 0.0) {
        return Err(StrakeError::InvalidArgument(format!(
            "length = {length} must be positive and finite",
            length = crate::numfmt::Exact(length)
        )));
    }
    let (ud, vd) = (surface.u_domain(), surface.v_domain());
    let mut hint = SurfaceHint::default();
    let jet0 = surface.checked_jet(u, v, DerivOrder::Second, &mut hint)?;
    let sp = SurfacePoint::new(&jet0, surface.orientation(), u, v, ud.width(), vd.width())?;
    let (p, q) = along_a_side(
        &jet0,
        (u, v),
        start_velocity(&jet0, &sp, dir)?,
        length,
        surface,
    );
    let mut tr = Tracer {
        surface,
        hint,
        lo: [ud.lo, vd.lo],
        hi: [ud.hi, vd.hi],
        snap: [1e-11 * ud.width(), 1e-11 * vd.width()],
        extent: [ud.width(), vd.width()],
        breaks: [surface.u_breaks().to_vec(), surface.v_breaks().to_vec()],
        jets: 1,
    };
    for (k, (x, d)) in [(u, p), (v, q)].into_iter().enumerate() {
        if (x <= tr.lo[k] && d < 0.0) || (x >= tr.hi[k] && d > 0.0) {
            return Err(StrakeError::LeavesSurface {
                what: format!(
                    "the geodesic from (u, v) = ({u}, {v}) on the domain boundary heads out of \
                     the domain at once (direction (du, dv) = ({p}, {q}))",
                    u = crate::numfmt::Exact(u),
                    v = crate::numfmt::Exact(v)
                ),
            });
        }
    }
    let y0 = [u, v, p, q];
    let f0 = match tr.eval(&y0)? {
        Ok((f, _)) => f,
        Err(_) => {
            return Err(StrakeError::DegenerateSurface {
                u,
                v,
                conditioning: sp.conditioning,
            });
        }
    };
    let size = jet0.su.norm() * ud.width() + jet0.sv.norm() * vd.width();
    let tol = opts.tolerance;
    let h_min = 1e-13 * size.max(length);
    let h_max = size / 8.0;
    let mut h = (0.5 * size * (tol / size).powf(0.2)).min(length).min(h_max);

    let mut knots = vec![0.0];
    let mut nodes = vec![CurveJet {
        u,
        v,
        du: p,
        dv: q,
        ddu: f0[2],
        ddv: f0[3],
    }];
    let mut stats = TraceStats::default();
    let (mut s, mut y, mut f, mut jet) = (0.0_f64, y0, f0, jet0);
    let mut just_rejected = false;
    let mut end = GeodesicEnd::Length;
    'steps: loop {
        if s >= length {
            break;
        }
        if stats.accepted + stats.rejected >= opts.max_steps {
            return Err(StrakeError::GeodesicIncomplete {
                what: format!(
                    "step cap of {} attempts used up ({} accepted, {} rejected)",
                    opts.max_steps, stats.accepted, stats.rejected
                ),
                arc_length: s,
                u: y[0],
                v: y[1],
            });
        }
        let remaining = length - s;
        let mut hs = h.min(remaining).min(h_max);
        let reach = tr.boundary_reach(&y, &f, hs);
        if reach < hs {
            hs = reach;
        }
        // The stages.
        let st = match rk::attempt_step(&y, f, hs, jet, |yi| tr.eval(yi))? {
            Ok(st) => st,
            Err(r) => {
                stats.rejected += 1;
                just_rejected = true;
                match r {
                    Refusal::Outside => h = 0.7 * hs,
                    Refusal::Degenerate(cond) => {
                        h = 0.5 * hs;
                        if h < h_min {
                            end = GeodesicEnd::Degenerate { conditioning: cond };
                            break 'steps;
                        }
                    }
                }
                continue;
            }
        };
        let (k, y5, d, last_jet) = (st.k, st.y5, st.err, st.last);
        if tr.jumps_a_break(&y, &y5) {
            // A step must not straddle a knot line: aim again (the reach includes them).
            stats.rejected += 1;
            just_rejected = true;
            h = 0.7 * hs;
            continue;
        }
        let pos = (last_jet.su * d[0] + last_jet.sv * d[1]).norm();
        let dir_err = (last_jet.su * d[2] + last_jet.sv * d[3]).norm();
        let err = pos.max(hs * dir_err);
        if !(err <= tol) {
            stats.rejected += 1;
            let factor = if err.is_finite() {
                (0.9 * (tol / err).powf(0.2)).clamp(0.2, 0.9)
            } else {
                0.2
            };
            h = hs * factor;
            just_rejected = true;
            if h < h_min {
                return Err(StrakeError::GeodesicIncomplete {
                    what: format!(
                        "the error estimate {err} stays above the tolerance {tol} with the \
                         step at its floor {h_min}",
                        err = crate::numfmt::Num(err),
                        tol = crate::numfmt::Num(tol),
                        h_min = crate::numfmt::Num(h_min)
                    ),
                    arc_length: s,
                    u: y[0],
                    v: y[1],
                });
            }
            continue;
        }
        // Accepted.
        let s_new = if hs >= remaining { length } else { s + hs };
        if s_new <= s {
            return Err(StrakeError::GeodesicIncomplete {
                what: format!(
                    "the step {hs} no longer advances the arc length",
                    hs = crate::numfmt::Num(hs)
                ),
                arc_length: s,
                u: y[0],
                v: y[1],
            });
        }
        stats.accepted += 1;
        let growth = if err > 0.0 {
            (0.9 * (tol / err).powf(0.2)).clamp(0.2, 5.0)
        } else {
            5.0
        };
        h = hs
            * if just_rejected {
                growth.min(1.0)
            } else {
                growth
            };
        just_rejected = false;
        s = s_new;
        let y_before = y;
        y = y5;
        f = k[rk::STAGES - 1];
        jet = last_jet;
        // Onto a knot line, exactly, when the step landed there: the node is doubled, the
        // second copy with the derivatives of the far side.
        let mut far_side = None;
        for c in 0..2 {
            for bi in 0..tr.breaks[c].len() {
                let b = tr.breaks[c][bi];
                if (y[c] - b).abs() <= tr.snap[c] && (y_before[c] - b).abs() > tr.snap[c] {
                    y[c] = b;
                    let mut probe = y;
                    let dir = if y[c + 2] >= 0.0 { 1.0 } else { -1.0 };
                    probe[c] = (b + dir * 1e-13 * tr.extent[c]).clamp(tr.lo[c], tr.hi[c]);
                    if let Ok((fb, jb)) = tr.eval(&probe)? {
                        far_side = Some((fb, jb));
                    }
                }
            }
        }
        let doubled_here = far_side.is_some();
        if let Some((fb, jb)) = far_side {
            push_node(
                &mut knots,
                &mut nodes,
                s,
                CurveJet {
                    u: y[0],
                    v: y[1],
                    du: y[2],
                    dv: y[3],
                    ddu: f[2],
                    ddv: f[3],
                },
            );
            f = [y[2], y[3], fb[2], fb[3]];
            jet = jb;
        }
        // Onto the boundary, exactly, once within the snap distance and heading out.
        let mut side = None;
        for c in 0..2 {
            if y[c] - tr.lo[c] <= tr.snap[c] && y[c + 2] < 0.0 {
                y[c] = tr.lo[c];
                side = Some(if c == 0 {
                    DomainSide::ULow
                } else {
                    DomainSide::VLow
                });
            } else if tr.hi[c] - y[c] <= tr.snap[c] && y[c + 2] > 0.0 {
                y[c] = tr.hi[c];
                side = Some(if c == 0 {
                    DomainSide::UHigh
                } else {
                    DomainSide::VHigh
                });
            }
        }
        if side.is_some() {
            if let Ok((fb, jb)) = tr.eval(&y)? {
                f = fb;
                jet = jb;
            }
        }
        let node = CurveJet {
            u: y[0],
            v: y[1],
            du: y[2],
            dv: y[3],
            ddu: f[2],
            ddv: f[3],
        };
        if doubled_here {
            // The far side's copy of the node on the knot line: always a node of its own.
            knots.push(s);
            nodes.push(node);
        } else {
            push_node(&mut knots, &mut nodes, s, node);
        }
        if let Some(side) = side {
            end = GeodesicEnd::Boundary(side);
            break;
        }
    }
    if knots.len() < 2 {
        // Stopped before the first step: only a degenerate point right ahead does that.
        return Err(StrakeError::DegenerateSurface {
            u,
            v,
            conditioning: match end {
                GeodesicEnd::Degenerate { conditioning } => conditioning,
                _ => sp.conditioning,
            },
        });
    }
    stats.jets = tr.jets;
    let tangent = jet.su * y[2] + jet.sv * y[3];
    let cross = jet.su.cross(&jet.sv);
    let normal = cross * (surface.orientation().sign() / cross.norm());
    Ok(Geodesic {
        curve: HermiteUvCurve::new(knots, nodes)?,
        end,
        length: s,
        end_point: jet.p,
        end_tangent: tangent / tangent.norm(),
        end_normal: normal,
        stats,
    })
}
