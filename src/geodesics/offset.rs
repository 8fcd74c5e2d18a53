//! Offsets of a path on the surface: the geodesic parallel at distance d to the left (the B
//! side) or right of a path, d constant or varying along the path.
//!
//! The offset point of the path point c(t) is the end of the geodesic that starts at c(t)
//! perpendicular to the path, along ±B(t) (B = N × T), and runs for arc length d(t) (Gauss's
//! lemma: such geodesics meet the parallels at right angles; do Carmo §4-6). Each point is one
//! trace ([`crate::geodesics::trace`]).
//!
//! Sampling: `samples` evenly spaced path parameters, then each interval is halved until the
//! offset point of its midpoint lies within `chord_tolerance` (space distance) of the cubic
//! through the interval's ends and their neighbours (Lagrange in the path parameter; the
//! chord's midpoint at the ends of a piece), up to `max_samples` points in all. This
//! estimates the error of the cubic fit; the error actually left is measured afterwards.
//!
//! Where the offset leaves the surface: where a geodesic meets the domain boundary (or stops
//! before a degenerate point) before length d, there is no offset point. The path parameter
//! where that starts is found by bisection (to 1e-12 of the path's parameter range), the piece
//! ends there on the boundary, and the interval of path parameters without an offset is
//! reported in [`SurfaceOffset::exits`].
//!
//! Loops: where d exceeds the radius of geodesic curvature on the offset side (a concave
//! region seen from the offset), the parallel runs backwards and forms a swallowtail. A
//! segment runs backwards when its chord points against the path tangent carried along the
//! geodesic (T̃ = g × N on the left, N × g on the right, g the geodesic's end tangent: parallel
//! transport keeps T perpendicular to g). Around each backward run the two segments of the
//! offset polygon that cross (in the parameter plane) are found, the part between them is cut
//! off, the piece is split at the crossing (a corner), and the path interval that was cut is
//! reported in [`SurfaceOffset::loops`]. When no crossing is found (the swallowtail is cut by
//! the boundary or by the path's end) the backward run alone is cut. Then crossings of parts
//! far apart along the path (the legs of a U whose offsets cross without any backward run) are
//! found among all segments of all pieces through a grid of their bounding boxes, refined the
//! same way, and the side of each branch that lies nearer the path than d (judged by the
//! other branch's geodesic direction at the crossing) is cut and reported in
//! [`SurfaceOffset::loops`] too (`cut_crossings`). What is still not seen is listed in
//! `docs/geodesics.md`.
//!
//! Each piece is a cubic B-spline in (u, v) interpolating its points (The NURBS Book A9.1,
//! chord-length parameters, t ∈ [0, 1]); [`SurfaceOffset::fit_error`] is the largest space
//! distance measured between the curve and the offset points of the interval midpoints that
//! were computed but not kept.

// `!(x > 0.0)` and the like are meant: they refuse NaN too. Index loops follow the formulas
// (Butcher tableaux, stage sums) term by term.
#![allow(clippy::neg_cmp_op_on_partial_ord, clippy::needless_range_loop)]

use crate::curve::UvCurve;
use crate::error::{Result, StrakeError};
use crate::geodesics::trace::{GeodesicEnd, StartDirection, TraceOptions, trace_geodesic};
use crate::geometry::jet::DerivOrder;
use crate::geometry::math::Vec3;
use crate::nurbs::{NurbsCurve, Parametrization, SpanHint, interpolate};
use crate::paths::curve_on_surface::{CurveOnSurface, Hints};
use crate::surface::{SurfaceHint, SurfaceSource};

/// Which side of the path the offset lies on.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum OffsetSide {
    /// Toward B = N × T (left of the direction of travel, seen from N).
    Left,
    /// Toward −B.
    Right,
}

/// The offset distance along the path (host length unit, ≥ 0).
pub enum OffsetDistance {
    /// The same distance everywhere.
    Constant(f64),
    /// Distances `d[i]` at path parameters `t[i]` (strictly increasing), linear in t between
    /// them and held constant beyond the first and last.
    Table {
        /// Path parameters, strictly increasing.
        t: Vec<f64>,
        /// Distances, finite and ≥ 0.
        d: Vec<f64>,
    },
    /// Any function of the path parameter.
    Function(Box<dyn Fn(f64) -> f64 + Send + Sync>),
}

impl OffsetDistance {
    /// Checks a table (lengths, order, finiteness, signs), naming the entry at fault.
    pub fn check(&self) -> Result<()> {
        match self {
            OffsetDistance::Constant(d) => check_distance(*d, f64::NAN),
            OffsetDistance::Function(_) => Ok(()),
            OffsetDistance::Table { t, d } => {
                if t.is_empty() || t.len() != d.len() {
                    return Err(StrakeError::InvalidArgument(format!(
                        "distance table: {} parameters and {} distances; give the same \
                         number, at least one",
                        t.len(),
                        d.len()
                    )));
                }
                for i in 0..t.len() {
                    if !t[i].is_finite() || (i > 0 && t[i] <= t[i - 1]) {
                        return Err(StrakeError::InvalidArgument(format!(
                            "distance table: t[{i}] = {} must be finite and above the one \
                             before",
                            crate::numfmt::Exact(t[i])
                        )));
                    }
                    check_distance(d[i], t[i])?;
                }
                Ok(())
            }
        }
    }

    /// The distance at path parameter `t`.
    pub fn at(&self, t: f64) -> f64 {
        match self {
            OffsetDistance::Constant(d) => *d,
            OffsetDistance::Function(f) => f(t),
            OffsetDistance::Table { t: ts, d } => {
                let n = ts.len();
                if t <= ts[0] {
                    return d[0];
                }
                if t >= ts[n - 1] {
                    return d[n - 1];
                }
                let i = ts.partition_point(|&x| x <= t) - 1;
                let w = (t - ts[i]) / (ts[i + 1] - ts[i]);
                d[i] + w * (d[i + 1] - d[i])
            }
        }
    }
}

fn check_distance(d: f64, t: f64) -> Result<()> {
    if d.is_finite() && d >= 0.0 {
        return Ok(());
    }
    Err(StrakeError::InvalidArgument(if t.is_nan() {
        format!(
            "offset distance = {d} must be finite and >= 0",
            d = crate::numfmt::Exact(d)
        )
    } else {
        format!(
            "offset distance at path parameter t = {t} is {d}; it must be finite and >= 0",
            t = crate::numfmt::Exact(t),
            d = crate::numfmt::Exact(d)
        )
    }))
}

/// Options of an offset.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct OffsetOptions {
    /// Options of each geodesic trace.
    pub trace: TraceOptions,
    /// Evenly spaced path parameters to start with, ≥ 2 (default 17).
    pub samples: usize,
    /// Largest space distance between an interval's midpoint offset and its prediction from
    /// the neighbouring points (see the module docs), > 0 (host length unit).
    pub chord_tolerance: f64,
    /// Most offset points computed in all, including midpoints and bisection (default 20000).
    pub max_samples: usize,
    /// Most surface jets the traces of one offset may evaluate, all told (≥ 1; default
    /// [`DEFAULT_OFFSET_JETS`]): the work cap that ends an offset whatever its inputs, with
    /// `NotConverged` naming the path parameter it was at and how many points it had.
    pub max_jets: usize,
}

/// Default [`OffsetOptions::max_jets`]: two million surface jets (about a second of a
/// bicubic surface's evaluations).
pub const DEFAULT_OFFSET_JETS: usize = 2_000_000;

impl OffsetOptions {
    /// Options with the given chord tolerance, traces at a thousandth of it.
    pub fn new(chord_tolerance: f64) -> Self {
        OffsetOptions {
            trace: TraceOptions::new(chord_tolerance * 1e-3),
            samples: 17,
            chord_tolerance,
            max_samples: 20000,
            max_jets: DEFAULT_OFFSET_JETS,
        }
    }

    /// Errors (`InvalidArgument`, naming the field) for a bad option.
    pub fn check(&self) -> Result<()> {
        if !(self.chord_tolerance.is_finite() && self.chord_tolerance > 0.0) {
            return Err(StrakeError::InvalidArgument(format!(
                "chord_tolerance = {} must be positive and finite",
                crate::numfmt::Exact(self.chord_tolerance)
            )));
        }
        self.trace.check()?;
        if self.max_jets == 0 {
            return Err(StrakeError::InvalidArgument(
                "max_jets = 0: the offset needs at least one surface jet".into(),
            ));
        }
        if self.samples < 2 || self.max_samples < self.samples {
            return Err(StrakeError::InvalidArgument(format!(
                "samples = {} must be at least 2 and max_samples = {} at least samples",
                self.samples, self.max_samples
            )));
        }
        Ok(())
    }
}

/// One offset point.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct OffsetSample {
    /// Path parameter of the path point it belongs to.
    pub t: f64,
    /// Geodesic distance from the path point (the distance asked, or less at a boundary end).
    pub distance: f64,
    /// Surface parameter u of the offset point.
    pub u: f64,
    /// Surface parameter v of the offset point.
    pub v: f64,
    /// The offset point in space.
    pub point: Vec3,
    /// The path's unit tangent carried to the offset point along the geodesic (the offset's
    /// direction of travel where it does not run backwards).
    pub carried_tangent: Vec3,
}

/// A connected piece of an offset.
#[derive(Debug, Clone, PartialEq)]
pub struct OffsetPiece {
    /// The curve in (u, v), t ∈ [0, 1], through [`OffsetPiece::samples`].
    pub curve: NurbsCurve<2>,
    /// Its points, in path order.
    pub samples: Vec<OffsetSample>,
}

/// An interval of path parameters.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PathInterval {
    /// Start (path parameter).
    pub t0: f64,
    /// End (path parameter).
    pub t1: f64,
}

/// An offset of a path.
#[derive(Debug, Clone, PartialEq)]
pub struct SurfaceOffset {
    /// The connected pieces, in path order.
    pub pieces: Vec<OffsetPiece>,
    /// Path intervals whose offset leaves the surface (or meets a degenerate point).
    pub exits: Vec<PathInterval>,
    /// Path intervals whose offset formed a loop and was cut off.
    pub loops: Vec<PathInterval>,
    /// Largest measured distance between a piece's curve and offset points not used to fit
    /// it (host length unit).
    pub fit_error: f64,
    /// Geodesics traced.
    pub traces: usize,
    /// Surface jets evaluated by the traces.
    pub jets: usize,
}

struct Eval<'a, S: SurfaceSource + ?Sized, C: UvCurve + ?Sized> {
    path: CurveOnSurface<'a, S, C>,
    side: OffsetSide,
    distance: &'a OffsetDistance,
    trace: TraceOptions,
    hints: Hints,
    traces: usize,
    jets: usize,
    /// The work cap on `jets` ([`OffsetOptions::max_jets`]).
    max_jets: usize,
}

/// The offset point of path parameter t: `Ok(Ok(sample))`, or `Ok(Err(end))` when the
/// geodesic stops short (at the boundary, carrying where it ended, or before a degenerate
/// point).
type Point = std::result::Result<OffsetSample, OffsetSample>;

impl<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized> Eval<'_, S, C> {
    fn at(&mut self, t: f64) -> Result<Point> {
        let d = self.distance.at(t);
        check_distance(d, t)?;
        let f = self.path.frame(t, &mut self.hints)?;
        let sign = match self.side {
            OffsetSide::Left => 1.0,
            OffsetSide::Right => -1.0,
        };
        if d == 0.0 {
            return Ok(Ok(OffsetSample {
                t,
                distance: 0.0,
                u: f.u,
                v: f.v,
                point: f.point,
                carried_tangent: f.t,
            }));
        }
        // Each trace gets what is left of the offset's budget (a Dormand–Prince step attempt
        // evaluates at most six jets, the start one more).
        let left = self.max_jets.saturating_sub(self.jets);
        if left <= 7 {
            return Err(self.budget_spent(t));
        }
        let trace = TraceOptions {
            max_steps: self.trace.max_steps.min((left - 1) / 6),
            ..self.trace
        };
        let g = trace_geodesic(
            self.path.surface(),
            f.u,
            f.v,
            StartDirection::Space(f.b * sign),
            d,
            &trace,
        );
        self.traces += 1;
        let g = match g {
            Ok(g) => g,
            Err(StrakeError::GeodesicIncomplete { .. })
                if trace.max_steps < self.trace.max_steps =>
            {
                self.jets = self.max_jets;
                return Err(self.budget_spent(t));
            }
            Err(StrakeError::LeavesSurface { .. }) => {
                return Ok(Err(OffsetSample {
                    t,
                    distance: 0.0,
                    u: f.u,
                    v: f.v,
                    point: f.point,
                    carried_tangent: f.t,
                }));
            }
            Err(e) => return Err(e),
        };
        self.jets += g.stats.jets;
        let (u, v) = g.end_uv();
        let carried = g.end_tangent.cross(&g.end_normal) * sign;
        let s = OffsetSample {
            t,
            distance: g.length,
            u,
            v,
            point: g.end_point,
            carried_tangent: carried,
        };
        Ok(match g.end {
            GeodesicEnd::Length => Ok(s),
            _ => Err(s),
        })
    }
}

impl<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized> Eval<'_, S, C> {
    /// The error that ends an offset whose work cap is used up at path parameter `t`.
    fn budget_spent(&self, t: f64) -> StrakeError {
        StrakeError::NotConverged {
            what: format!(
                "offset: the work cap max_jets = {} surface jets was used up at path parameter \
                 t = {t}, after {} geodesic traces",
                self.max_jets, self.traces
            ),
            iterations: self.traces,
        }
    }
}

/// The offset of `path` on `surface` at `distance` to `side` (see the module docs).
///
/// Errors: `InvalidArgument` for bad options or distances (naming the parameter and value);
/// `LeavesSurface` when no offset point lies on the surface (naming the first path parameter
/// and the distance); `NotConverged` when `max_samples` is used up before the chord
/// tolerance is met, or the work cap `max_jets` (naming the path parameter reached); every error of the path's frames and of the traces
/// (`GeodesicIncomplete`, `DegenerateSurface` for a path point at a degenerate point, ...).
pub fn offset_path<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    surface: &S,
    path: &C,
    side: OffsetSide,
    distance: &OffsetDistance,
    opts: &OffsetOptions,
) -> Result<SurfaceOffset> {
    opts.check()?;
    distance.check()?;
    let mut ev = Eval {
        path: CurveOnSurface::new(surface, path),
        side,
        distance,
        trace: opts.trace,
        hints: Hints::default(),
        traces: 0,
        jets: 0,
        max_jets: opts.max_jets,
    };
    let dom = path.domain();
    let mut pts: Vec<Point> = Vec::with_capacity(opts.samples);
    for i in 0..opts.samples {
        pts.push(ev.at(dom.even(i, opts.samples))?);
    }
    if pts.iter().all(|p| p.is_err()) {
        let first = pts[0].unwrap_err();
        return Err(StrakeError::LeavesSurface {
            what: format!(
                "the offset at distance {} leaves the surface at every sample: at path \
                 parameter t = {} the geodesic ends after {} at (u, v) = ({}, {})",
                crate::numfmt::Exact(distance.at(first.t)),
                crate::numfmt::Exact(first.t),
                crate::numfmt::Num(first.distance),
                crate::numfmt::Exact(first.u),
                crate::numfmt::Exact(first.v)
            ),
        });
    }
    let mut computed = pts.len();
    // Refinement by halving: `done[i]` holds the midpoint of interval i once it passed.
    let mut mids: Vec<Option<OffsetSample>> = vec![None; pts.len() - 1];
    loop {
        let mut next: Vec<Point> = Vec::with_capacity(pts.len() * 2);
        let mut next_mids: Vec<Option<OffsetSample>> = Vec::with_capacity(pts.len() * 2);
        let mut changed = false;
        for i in 0..pts.len() - 1 {
            next.push(pts[i]);
            let (a, b) = (pts[i], pts[i + 1]);
            let (Ok(a), Ok(b)) = (a, b) else {
                next_mids.push(None);
                continue;
            };
            if mids[i].is_some() {
                next_mids.push(mids[i]);
                continue;
            }
            let tm = 0.5 * (a.t + b.t);
            if !(tm > a.t && tm < b.t) {
                next_mids.push(None);
                continue;
            }
            if computed >= opts.max_samples {
                return Err(StrakeError::NotConverged {
                    what: format!(
                        "offset: max_samples = {} used up before the chord tolerance {} \
                         was met (near path parameter t = {})",
                        opts.max_samples,
                        crate::numfmt::Num(opts.chord_tolerance),
                        crate::numfmt::Exact(tm)
                    ),
                    iterations: computed,
                });
            }
            let m = ev.at(tm)?;
            computed += 1;
            let keep = match m {
                Ok(ms) => {
                    let prev = if i > 0 { pts[i - 1].ok() } else { None };
                    let after = pts.get(i + 2).and_then(|p| p.ok());
                    let predicted = match (prev, after) {
                        (Some(p0), Some(p3)) => cubic_prediction([&p0, &a, &b, &p3], tm),
                        _ => (a.point + b.point) * 0.5,
                    };
                    (ms.point - predicted).norm() > opts.chord_tolerance
                }
                Err(_) => true,
            };
            if keep {
                next.push(m);
                next_mids.push(None);
                next_mids.push(None);
                changed = true;
            } else {
                next_mids.push(m.ok());
            }
        }
        next.push(pts[pts.len() - 1]);
        pts = next;
        mids = next_mids;
        if !changed {
            break;
        }
    }
    // Exits: bisect each transition between a point on the surface and one off it.
    let t_scale = dom.width();
    let mut runs: Vec<Vec<OffsetSample>> = Vec::new();
    let mut run_mids: Vec<Vec<Option<OffsetSample>>> = Vec::new();
    let mut exits: Vec<PathInterval> = Vec::new();
    let mut current: Vec<OffsetSample> = Vec::new();
    let mut current_mids: Vec<Option<OffsetSample>> = Vec::new();
    let mut exit_start: Option<f64> = match pts[0] {
        Ok(_) => None,
        Err(_) => Some(dom.lo),
    };
    for i in 0..pts.len() {
        match pts[i] {
            Ok(s) => {
                if i > 0 {
                    if let Err(off) = pts[i - 1] {
                        // Re-entry between pts[i-1] (off) and s (on).
                        let (edge, t_edge) = bisect(&mut ev, off.t, s.t, t_scale)?;
                        exits.push(PathInterval {
                            t0: exit_start.take().unwrap_or(off.t),
                            t1: t_edge,
                        });
                        current.push(edge);
                        current_mids.push(None);
                    }
                }
                current.push(s);
                if i + 1 < pts.len() {
                    current_mids.push(mids[i]);
                }
            }
            Err(off) => {
                if i > 0 {
                    if let Ok(on) = pts[i - 1] {
                        let (edge, t_edge) = bisect(&mut ev, off.t, on.t, t_scale)?;
                        current.push(edge);
                        exit_start = Some(t_edge);
                        runs.push(std::mem::take(&mut current));
                        run_mids.push(std::mem::take(&mut current_mids));
                    }
                }
            }
        }
    }
    if let Some(t0) = exit_start {
        exits.push(PathInterval { t0, t1: dom.hi });
    }
    if !current.is_empty() {
        // Trailing mids entry for the last point is not pushed; trim to intervals.
        current_mids.truncate(current.len().saturating_sub(1));
        runs.push(current);
        run_mids.push(current_mids);
    }
    // Loops: cut backward runs at the crossing around them.
    let mut pieces_pts: Vec<(Vec<OffsetSample>, Vec<Option<OffsetSample>>)> = Vec::new();
    let mut loops = Vec::new();
    for (run, rm) in runs.into_iter().zip(run_mids) {
        split_loops(&mut ev, run, rm, &mut pieces_pts, &mut loops)?;
    }
    // Crossings of parts far apart along the path (the legs of a U).
    cut_crossings(&mut ev, &mut pieces_pts, &mut loops)?;
    loops.sort_by(|a, b| a.t0.total_cmp(&b.t0));
    // Fit.
    let mut pieces = Vec::new();
    let mut fit_error: f64 = 0.0;
    for (mut samples, rmids) in pieces_pts {
        samples.dedup_by(|b, a| a.u == b.u && a.v == b.v);
        let mut rmids = rmids;
        rmids.resize(samples.len().saturating_sub(1), None);
        prune_crowded_ends(&mut samples, &mut rmids);
        if samples.len() < 2 {
            continue;
        }
        let uv: Vec<[f64; 2]> = samples.iter().map(|s| [s.u, s.v]).collect();
        let degree = (samples.len() - 1).min(3);
        let curve = inside_domain(
            surface,
            interpolate(&uv, degree, Parametrization::ChordLength, None)?,
        )?;
        fit_error = fit_error.max(measure_fit(surface, &curve, &samples, &rmids)?);
        pieces.push(OffsetPiece { curve, samples });
    }
    if pieces.is_empty() {
        return Err(StrakeError::LeavesSurface {
            what: "no piece of the offset with two distinct points remains on the surface".into(),
        });
    }
    Ok(SurfaceOffset {
        pieces,
        exits,
        loops,
        fit_error,
        traces: ev.traces,
        jets: ev.jets,
    })
}

/// The curve with its control points moved into the surface's domain where the interpolant
/// overshoots it (beside a piece that ends on the boundary): by the convex hull property the
/// curve then stays inside; the end points (control points of the clamped curve) and every
/// sample inside the domain are kept where they were to the extent the move allows, and the
/// move shows in [`SurfaceOffset::fit_error`], measured afterwards.
fn inside_domain<S: SurfaceSource + ?Sized>(
    surface: &S,
    curve: NurbsCurve<2>,
) -> Result<NurbsCurve<2>> {
    let (ud, vd) = (surface.u_domain(), surface.v_domain());
    let pts = curve.control_points();
    if pts
        .iter()
        .all(|p| (ud.lo..=ud.hi).contains(&p[0]) && (vd.lo..=vd.hi).contains(&p[1]))
    {
        return Ok(curve);
    }
    let moved: Vec<[f64; 2]> = pts
        .iter()
        .map(|p| [p[0].clamp(ud.lo, ud.hi), p[1].clamp(vd.lo, vd.hi)])
        .collect();
    NurbsCurve::new(curve.degree(), curve.knot_vector().knots(), &moved, None)
}

/// Drops the sample next to an end of a piece when it lies within a quarter of the spacing
/// before it from the end sample (an edge found by bisection just beside a regular sample):
/// chord-length parameters that uneven make the interpolating cubic overshoot, out of the
/// domain at a boundary end. The merged interval loses its measured midpoint.
fn prune_crowded_ends(samples: &mut Vec<OffsetSample>, mids: &mut Vec<Option<OffsetSample>>) {
    let gap = |a: &OffsetSample, b: &OffsetSample| (a.u - b.u).hypot(a.v - b.v);
    while samples.len() > 3 {
        let n = samples.len();
        if gap(&samples[n - 1], &samples[n - 2]) < 0.25 * gap(&samples[n - 2], &samples[n - 3]) {
            samples.remove(n - 2);
            mids.truncate(n - 3);
            mids.push(None);
        } else {
            break;
        }
    }
    while samples.len() > 3 {
        if gap(&samples[0], &samples[1]) < 0.25 * gap(&samples[1], &samples[2]) {
            samples.remove(1);
            mids.remove(0);
            mids[0] = None;
        } else {
            break;
        }
    }
}

/// The cubic through four offset points (Lagrange in the path parameter), at `t`.
fn cubic_prediction(p: [&OffsetSample; 4], t: f64) -> Vec3 {
    let mut out = Vec3::zeros();
    for k in 0..4 {
        let mut w = 1.0;
        for m in 0..4 {
            if m != k {
                w *= (t - p[m].t) / (p[k].t - p[m].t);
            }
        }
        out += p[k].point * w;
    }
    out
}

/// Bisection between path parameters `t_off` (offset off the surface) and `t_on` (on it):
/// returns the boundary point at the edge (the end of the geodesic that just stops short,
/// lying on the domain side) and its path parameter.
fn bisect<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    ev: &mut Eval<'_, S, C>,
    mut t_off: f64,
    mut t_on: f64,
    t_scale: f64,
) -> Result<(OffsetSample, f64)> {
    let mut off_sample = None;
    for _ in 0..60 {
        if (t_off - t_on).abs() <= 1e-12 * t_scale {
            break;
        }
        let tm = 0.5 * (t_off + t_on);
        match ev.at(tm)? {
            Ok(_) => t_on = tm,
            Err(s) => {
                t_off = tm;
                off_sample = Some(s);
            }
        }
    }
    let s = match off_sample {
        Some(s) => s,
        None => match ev.at(t_off)? {
            Ok(s) | Err(s) => s,
        },
    };
    Ok((s, s.t))
}

/// Segments a→b and c→d in the plane: the parameters (α, β) of their crossing, if they cross.
fn crossing(a: [f64; 2], b: [f64; 2], c: [f64; 2], d: [f64; 2]) -> Option<(f64, f64)> {
    let r = [b[0] - a[0], b[1] - a[1]];
    let s = [d[0] - c[0], d[1] - c[1]];
    let den = r[0] * s[1] - r[1] * s[0];
    if den == 0.0 {
        return None;
    }
    let w = [c[0] - a[0], c[1] - a[1]];
    let alpha = (w[0] * s[1] - w[1] * s[0]) / den;
    let beta = (w[0] * r[1] - w[1] * r[0]) / den;
    ((0.0..=1.0).contains(&alpha) && (0.0..=1.0).contains(&beta)).then_some((alpha, beta))
}

fn lerp_sample(a: &OffsetSample, b: &OffsetSample, w: f64) -> OffsetSample {
    OffsetSample {
        t: a.t + w * (b.t - a.t),
        distance: a.distance + w * (b.distance - a.distance),
        u: a.u + w * (b.u - a.u),
        v: a.v + w * (b.v - a.v),
        point: a.point + (b.point - a.point) * w,
        carried_tangent: (a.carried_tangent + (b.carried_tangent - a.carried_tangent) * w)
            .normalize(),
    }
}

type PiecePoints = (Vec<OffsetSample>, Vec<Option<OffsetSample>>);

/// The crossing of the offset with itself near the crossing of the polygon segments
/// a0→a1 and b0→b1 at (α, β), refined by Newton's method on (t_a, t_b) for
/// uv(t_a) = uv(t_b) with true offset points (secant slopes from the segments).
fn refine_crossing<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    ev: &mut Eval<'_, S, C>,
    seg_a: (&OffsetSample, &OffsetSample),
    seg_b: (&OffsetSample, &OffsetSample),
    alpha: f64,
    beta: f64,
) -> Result<(OffsetSample, OffsetSample)> {
    let slope = |p: &OffsetSample, q: &OffsetSample| {
        let dt = q.t - p.t;
        [(q.u - p.u) / dt, (q.v - p.v) / dt]
    };
    let mut a_best = lerp_sample(seg_a.0, seg_a.1, alpha);
    let mut b_best = lerp_sample(seg_b.0, seg_b.1, beta);
    let (da, db) = (slope(seg_a.0, seg_a.1), slope(seg_b.0, seg_b.1));
    let (mut ta, mut tb) = (a_best.t, b_best.t);
    let wa = (seg_a.1.t - seg_a.0.t).abs();
    let wb = (seg_b.1.t - seg_b.0.t).abs();
    let mut best = f64::INFINITY;
    for _ in 0..8 {
        let (Ok(a), Ok(b)) = (ev.at(ta)?, ev.at(tb)?) else {
            break;
        };
        let r = [a.u - b.u, a.v - b.v];
        let size = r[0].hypot(r[1]);
        if size < best {
            best = size;
            a_best = a;
            b_best = b;
        } else {
            break;
        }
        if size == 0.0 {
            break;
        }
        // [da, −db] (δa, δb)ᵀ = −r
        let det = -da[0] * db[1] + db[0] * da[1];
        if det == 0.0 {
            break;
        }
        let dta = (-r[0] * -db[1] + db[0] * -r[1]) / det;
        let dtb = (da[0] * -r[1] - da[1] * -r[0]) / det;
        ta = (ta + dta).clamp(seg_a.0.t - wa, seg_a.1.t + wa);
        tb = (tb + dtb).clamp(seg_b.0.t - wb, seg_b.1.t + wb);
    }
    Ok((a_best, b_best))
}

fn split_loops<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    ev: &mut Eval<'_, S, C>,
    run: Vec<OffsetSample>,
    mids: Vec<Option<OffsetSample>>,
    out: &mut Vec<PiecePoints>,
    loops: &mut Vec<PathInterval>,
) -> Result<()> {
    let n = run.len();
    if n < 3 {
        out.push((run, mids));
        return Ok(());
    }
    let backward: Vec<bool> = (0..n - 1)
        .map(|i| {
            let chord = run[i + 1].point - run[i].point;
            chord.dot(&(run[i].carried_tangent + run[i + 1].carried_tangent)) < 0.0
        })
        .collect();
    let uv = |s: &OffsetSample| [s.u, s.v];
    let mut start = 0usize; // first sample of the piece being built
    let mut lead: Option<OffsetSample> = None; // corner that starts it
    let mut i = 0usize;
    let emit = |from: usize,
                to_incl: usize,
                lead: Option<OffsetSample>,
                tail: Option<OffsetSample>,
                out: &mut Vec<PiecePoints>| {
        let mut pts = Vec::new();
        let mut ms = Vec::new();
        if let Some(l) = lead {
            pts.push(l);
            ms.push(None);
        }
        for k in from..=to_incl {
            pts.push(run[k]);
            if k < to_incl {
                ms.push(mids.get(k).copied().flatten());
            }
        }
        if let Some(t) = tail {
            ms.push(None);
            pts.push(t);
        }
        ms.truncate(pts.len().saturating_sub(1));
        out.push((pts, ms));
    };
    while i < n - 1 {
        if !backward[i] {
            i += 1;
            continue;
        }
        let a = i;
        let mut b = i;
        while b + 1 < n - 1 && backward[b + 1] {
            b += 1;
        }
        // Search the crossing of segment j < a with segment k > b, nearest first.
        let mut found = None;
        'search: for j in (start..a).rev() {
            for k in b + 1..n - 1 {
                if let Some((al, be)) =
                    crossing(uv(&run[j]), uv(&run[j + 1]), uv(&run[k]), uv(&run[k + 1]))
                {
                    found = Some((j, k, al, be));
                    break 'search;
                }
            }
        }
        match found {
            Some((j, k, al, be)) => {
                let (ca, cb) =
                    refine_crossing(ev, (&run[j], &run[j + 1]), (&run[k], &run[k + 1]), al, be)?;
                loops.push(PathInterval { t0: ca.t, t1: cb.t });
                emit(start, j, lead, Some(ca), out);
                // The corner starts the next piece (same point, later path parameter).
                let corner = OffsetSample { t: cb.t, ..ca };
                lead = Some(corner);
                start = k + 1;
                i = k + 1;
            }
            None => {
                loops.push(PathInterval {
                    t0: run[a].t,
                    t1: run[b + 1].t,
                });
                if a > start || lead.is_some() {
                    emit(start, a, lead, None, out);
                }
                lead = None;
                start = b + 1;
                i = b + 1;
            }
        }
    }
    if start < n {
        emit(start, n - 1, lead, None, out);
    }
    Ok(())
}

/// Largest space distance from the midpoint offsets to the fitted curve (nearest point on the
/// curve between the parameters of the interval's ends, by golden-section search).
fn measure_fit<S: SurfaceSource + ?Sized>(
    surface: &S,
    curve: &NurbsCurve<2>,
    samples: &[OffsetSample],
    mids: &[Option<OffsetSample>],
) -> Result<f64> {
    // Chord-length parameters of the samples, as the interpolation used.
    let uv: Vec<[f64; 2]> = samples.iter().map(|s| [s.u, s.v]).collect();
    let params =
        crate::nurbs::interpolate::interpolation_parameters(&uv, Parametrization::ChordLength)?;
    let mut worst: f64 = 0.0;
    let mut ch = SpanHint::default();
    let mut sh = SurfaceHint::default();
    let ud = surface.u_domain();
    let vd = surface.v_domain();
    let mut polish_hints = (SpanHint::default(), SurfaceHint::default());
    let mut dist = |tau: f64, target: &Vec3| -> Result<f64> {
        let j = curve.checked_jet(tau, &mut ch)?;
        let (u, v) = (j.u.clamp(ud.lo, ud.hi), j.v.clamp(vd.lo, vd.hi));
        let p = surface.checked_jet(u, v, DerivOrder::Position, &mut sh)?.p;
        Ok((p - target).norm())
    };
    for (i, m) in mids.iter().enumerate() {
        let Some(m) = m else { continue };
        if i + 1 >= params.len() {
            break;
        }
        let (mut a, mut b) = (params[i], params[i + 1]);
        let (lo, hi) = (a, b);
        let g = 0.5 * (5f64.sqrt() - 1.0);
        let mut x1 = b - g * (b - a);
        let mut x2 = a + g * (b - a);
        let mut f1 = dist(x1, &m.point)?;
        let mut f2 = dist(x2, &m.point)?;
        for _ in 0..40 {
            if f1 < f2 {
                b = x2;
                x2 = x1;
                f2 = f1;
                x1 = b - g * (b - a);
                f1 = dist(x1, &m.point)?;
            } else {
                a = x1;
                x1 = x2;
                f1 = f2;
                x2 = a + g * (b - a);
                f2 = dist(x2, &m.point)?;
            }
        }
        // Gauss–Newton on the foot of the perpendicular, from the bracket's better end: the
        // bracket alone leaves its width times the curve's speed (5e-10 of a piece of length
        // 10 after 40 steps); a step is kept only while the distance decreases.
        let (mut tau, mut best) = if f1 < f2 { (x1, f1) } else { (x2, f2) };
        for _ in 0..4 {
            let j = curve.checked_jet(tau, &mut polish_hints.0)?;
            let (u, v) = (j.u.clamp(ud.lo, ud.hi), j.v.clamp(vd.lo, vd.hi));
            let sj = surface.checked_jet(u, v, DerivOrder::First, &mut polish_hints.1)?;
            let dp = sj.su * j.du + sj.sv * j.dv;
            let speed2 = dp.norm_squared();
            if !(speed2 > 0.0) {
                break;
            }
            let next = (tau - (sj.p - m.point).dot(&dp) / speed2).clamp(lo, hi);
            let f = dist(next, &m.point)?;
            if !(f < best) {
                break;
            }
            (tau, best) = (next, f);
        }
        worst = worst.max(best);
    }
    Ok(worst)
}

/// A crossing of two segments of the offset polygons: (piece, segment) of the earlier one,
/// (piece, segment) of the later one, and the parameters along each segment.
#[derive(Debug, Clone, Copy)]
struct Crossing {
    a: (usize, usize),
    b: (usize, usize),
    alpha: f64,
    beta: f64,
}

/// A segment of the offset polygons: (piece, index of its first sample), its ends in (u, v).
type Segment = ((usize, usize), [f64; 2], [f64; 2]);

/// Every crossing of two segments of `pieces` (in the parameter plane) that are not
/// neighbours (sharing an end point), found through a uniform grid of the segments' bounding
/// boxes: about √n cells a side for n segments, each pair tested once, in the cell that is the
/// lowest corner of the overlap of their cell ranges. Returns the crossing whose earlier
/// segment comes first along the path (then the later one), if any.
fn first_crossing(pieces: &[PiecePoints]) -> Option<Crossing> {
    let mut segs: Vec<Segment> = Vec::new();
    for (p, (pts, _)) in pieces.iter().enumerate() {
        for j in 0..pts.len().saturating_sub(1) {
            segs.push(((p, j), [pts[j].u, pts[j].v], [pts[j + 1].u, pts[j + 1].v]));
        }
    }
    let n = segs.len();
    if n < 3 {
        return None;
    }
    let (mut lo, mut hi) = ([f64::INFINITY; 2], [f64::NEG_INFINITY; 2]);
    for (_, a, b) in &segs {
        for c in 0..2 {
            lo[c] = lo[c].min(a[c]).min(b[c]);
            hi[c] = hi[c].max(a[c]).max(b[c]);
        }
    }
    let cells = ((n as f64).sqrt().ceil() as usize).clamp(1, 1024);
    let size = [
        ((hi[0] - lo[0]) / cells as f64).max(f64::MIN_POSITIVE),
        ((hi[1] - lo[1]) / cells as f64).max(f64::MIN_POSITIVE),
    ];
    let cell = |x: f64, c: usize| (((x - lo[c]) / size[c]) as usize).min(cells - 1);
    let range = |s: &Segment| {
        let (_, a, b) = s;
        [
            (cell(a[0].min(b[0]), 0), cell(a[0].max(b[0]), 0)),
            (cell(a[1].min(b[1]), 1), cell(a[1].max(b[1]), 1)),
        ]
    };
    let ranges: Vec<_> = segs.iter().map(range).collect();
    let mut grid: Vec<Vec<u32>> = vec![Vec::new(); cells * cells];
    for (i, r) in ranges.iter().enumerate() {
        for x in r[0].0..=r[0].1 {
            for y in r[1].0..=r[1].1 {
                grid[x * cells + y].push(i as u32);
            }
        }
    }
    let mut best: Option<(Crossing, f64, f64)> = None;
    for x in 0..cells {
        for y in 0..cells {
            let list = &grid[x * cells + y];
            for (m, &i) in list.iter().enumerate() {
                for &k in &list[m + 1..] {
                    let (i, k) = (i as usize, k as usize);
                    let (ri, rk) = (ranges[i], ranges[k]);
                    // Test the pair only in the first cell both ranges cover.
                    if (ri[0].0.max(rk[0].0), ri[1].0.max(rk[1].0)) != (x, y) {
                        continue;
                    }
                    let (si, sk) = (&segs[i], &segs[k]);
                    if [si.1, si.2]
                        .iter()
                        .any(|p| [sk.1, sk.2].iter().any(|q| p == q))
                    {
                        continue;
                    }
                    let Some((al, be)) = crossing(si.1, si.2, sk.1, sk.2) else {
                        continue;
                    };
                    let ti = pieces[si.0.0].0[si.0.1].t;
                    let tk = pieces[sk.0.0].0[sk.0.1].t;
                    let c = if (si.0, ti) <= (sk.0, tk) {
                        Crossing {
                            a: si.0,
                            b: sk.0,
                            alpha: al,
                            beta: be,
                        }
                    } else {
                        Crossing {
                            a: sk.0,
                            b: si.0,
                            alpha: be,
                            beta: al,
                        }
                    };
                    let (ta, tb) = (ti.min(tk), ti.max(tk));
                    if best.is_none_or(|(_, ba, bb)| (ta, tb) < (ba, bb)) {
                        best = Some((c, ta, tb));
                    }
                }
            }
        }
    }
    best.map(|b| b.0)
}

/// Samples `from..=to` of a piece, with the midpoints of the intervals between them.
fn slice_piece(p: &PiecePoints, from: usize, to: usize) -> PiecePoints {
    let samples = p.0[from..=to].to_vec();
    let mids = (from..to).map(|i| p.1.get(i).copied().flatten()).collect();
    (samples, mids)
}

/// Cuts the parts of the offset that lie nearer the path than the distance, at crossings of
/// parts far apart along the path (the inner offset of a U whose legs lean together), which
/// the backward runs of [`split_loops`] do not show. At a crossing X of the branch a (path
/// parameter t_a) with the later branch b (t_b), the geodesic from the path point c(t_b)
/// arrives at X along g_b (pointing away from the path; g_b = ±N × T̃_b, the sign of the
/// side), so the distance to the path near c(t_b) grows along g_b: the part of branch a on the
/// side of X where its direction of travel a′ has a′ · g_b < 0 lies nearer the path than d,
/// and likewise for branch b with g_a. Cut: a forward and b backward bad, (t_a, t_b) (a loop,
/// as a swallowtail); a backward and b forward bad, the ends of their pieces beyond X (the
/// part between them closes on X); both forward, (t_a, end of b's piece]; both backward,
/// [start of a's piece, t_b). Each cut interval is reported in [`SurfaceOffset::loops`]; the
/// crossing is refined as in [`refine_crossing`], and the search repeats until no crossing is
/// left (at most once per segment).
fn cut_crossings<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    ev: &mut Eval<'_, S, C>,
    pieces: &mut Vec<PiecePoints>,
    loops: &mut Vec<PathInterval>,
) -> Result<()> {
    let sign = match ev.side {
        OffsetSide::Left => 1.0,
        OffsetSide::Right => -1.0,
    };
    let cap = pieces.iter().map(|p| p.0.len()).sum::<usize>();
    for _ in 0..cap {
        let Some(c) = first_crossing(pieces) else {
            return Ok(());
        };
        let ((pa, ja), (pb, jb)) = (c.a, c.b);
        let (a0, a1) = (pieces[pa].0[ja], pieces[pa].0[ja + 1]);
        let (b0, b1) = (pieces[pb].0[jb], pieces[pb].0[jb + 1]);
        let (ca, cb) = refine_crossing(ev, (&a0, &a1), (&b0, &b1), c.alpha, c.beta)?;
        // Keep the crossing inside its segments' parameter ranges, so the cut pieces stay in
        // path order.
        let ca = OffsetSample {
            t: ca.t.clamp(a0.t, a1.t),
            ..ca
        };
        let cb_t = cb.t.clamp(b0.t, b1.t);
        let jet = ev.path.surface().checked_jet(
            ca.u,
            ca.v,
            DerivOrder::First,
            &mut SurfaceHint::default(),
        )?;
        let cross = jet.su.cross(&jet.sv);
        let n = cross * (ev.path.surface().orientation().sign() / cross.norm());
        let g_a = n.cross(&ca.carried_tangent) * sign;
        let g_b = n.cross(&cb.carried_tangent) * sign;
        let a_fwd_bad = (a1.point - a0.point).dot(&g_b) < 0.0;
        let b_fwd_bad = (b1.point - b0.point).dot(&g_a) < 0.0;
        // The crossing as the end of a's part and as the start of b's part.
        let end_a = ca;
        let start_b = OffsetSample { t: cb_t, ..ca };
        let mut out: Vec<PiecePoints> = Vec::with_capacity(pieces.len() + 1);
        let with_end = |mut p: PiecePoints, x: OffsetSample| {
            p.1.push(None);
            p.0.push(x);
            p
        };
        let with_start = |mut p: PiecePoints, x: OffsetSample| {
            p.0.insert(0, x);
            p.1.insert(0, None);
            p
        };
        let last = |i: usize| pieces[i].0.len() - 1;
        match (a_fwd_bad, b_fwd_bad) {
            (true, false) => {
                // (t_a, t_b): a loop.
                loops.push(PathInterval { t0: ca.t, t1: cb_t });
                out.extend(pieces[..pa].iter().cloned());
                out.push(with_end(slice_piece(&pieces[pa], 0, ja), end_a));
                out.push(with_start(
                    slice_piece(&pieces[pb], jb + 1, last(pb)),
                    start_b,
                ));
                out.extend(pieces[pb + 1..].iter().cloned());
            }
            (false, true) => {
                // The ends beyond X: [start of a's piece, t_a) and (t_b, end of b's piece].
                loops.push(PathInterval {
                    t0: pieces[pa].0[0].t,
                    t1: ca.t,
                });
                loops.push(PathInterval {
                    t0: cb_t,
                    t1: pieces[pb].0[last(pb)].t,
                });
                out.extend(pieces[..pa].iter().cloned());
                if pa == pb {
                    let mid = slice_piece(&pieces[pa], ja + 1, jb);
                    out.push(with_end(with_start(mid, end_a), start_b));
                } else {
                    out.push(with_start(
                        slice_piece(&pieces[pa], ja + 1, last(pa)),
                        end_a,
                    ));
                    out.extend(pieces[pa + 1..pb].iter().cloned());
                    out.push(with_end(slice_piece(&pieces[pb], 0, jb), start_b));
                }
                out.extend(pieces[pb + 1..].iter().cloned());
            }
            (true, true) => {
                loops.push(PathInterval {
                    t0: ca.t,
                    t1: pieces[pb].0[last(pb)].t,
                });
                out.extend(pieces[..pa].iter().cloned());
                out.push(with_end(slice_piece(&pieces[pa], 0, ja), end_a));
                out.extend(pieces[pb + 1..].iter().cloned());
            }
            (false, false) => {
                loops.push(PathInterval {
                    t0: pieces[pa].0[0].t,
                    t1: cb_t,
                });
                out.extend(pieces[..pa].iter().cloned());
                out.push(with_start(
                    slice_piece(&pieces[pb], jb + 1, last(pb)),
                    start_b,
                ));
                out.extend(pieces[pb + 1..].iter().cloned());
            }
        }
        out.retain(|p| p.0.len() >= 2);
        *pieces = out;
    }
    Ok(())
}
