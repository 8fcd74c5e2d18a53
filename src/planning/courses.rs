//! Fibre courses: a natural (geodesic) course, a fixed-angle course keeping a given angle to a
//! reference direction field, the adjacent course one tow band away, the gaps and overlaps
//! between neighbouring courses, and the steering and twist checks on a course.
//!
//! - Natural course: the geodesic from a start point and angle ([`trace_geodesic`]); tape
//!   laid without steering follows it (REFERENCES.md, composites).
//! - Fixed-angle course: the reference field is a space direction a (e.g. the part's axis)
//!   projected onto the tangent plane, e = (a − (a·N)N)/|a − (a·N)N|; the course's unit
//!   tangent is T = cos α e + sin α (N × e), so it makes the angle α with e, counted toward
//!   N × e. Integrated as the first-order system d(u, v)/ds = (u', v') of T by the same
//!   Dormand–Prince 5(4) pair as the geodesics, with the error measured in space. The
//!   curve's second derivatives at the nodes are exact: T' = cos α e' + sin α (N' × e +
//!   N × e'), with N' = −κn T − τg B (Darboux equations, do Carmo ch. 3) and
//!   e' = (r' − e (e·r'))/|r|, r' = −(a·N')N − (a·N)N'. The course ends at the length, at
//!   the domain boundary (exactly on it), or where the field degenerates (a parallel to N:
//!   |r| below 1e-6 |a|, reported as [`GeodesicEnd::Degenerate`] with that ratio).
//! - Adjacent course: the geodesic parallel of the course at one band width w (the parallel
//!   at w/2 of its edge), [`offset_path`].
//! - Gaps and overlaps ([`course_gaps`]): B's band edge facing A is B's geodesic parallel at
//!   w/2 ([`offset_path`]). At samples of course A the geodesic perpendicular to A (toward
//!   B) is traced for up to 3w and its crossing with B's edge found (polygon crossing, then
//!   Newton on both curve parameters); with d its arc length there, A's edge being w/2 along
//!   the same geodesic, the edge-to-edge width across A is d − w/2: positive a gap, negative
//!   an overlap. Where that geodesic meets no edge of B, B's edge may lie beyond A's
//!   centreline (an overlap deeper than w/2): the perpendicular the other way is traced for
//!   up to 1.5w, and a crossing at arc length s there gives d = −s (overlaps down to 2w
//!   deep). Intervals where |d − w/2| exceeds the tolerance are reported with their worst
//!   width. Where neither perpendicular meets an edge of B (B ended, or diverged) the samples
//!   are counted as unmatched. What it does not see: the gap between samples (taken at
//!   `samples` even parameters of A).
//! - Checks ([`course_check`]): [`fibre_state`] at even samples of the course: steering
//!   curvature |κg|, edge strain (w/2)|κg|, twist rate τg, and whether the limits are passed.

// `!(x > 0.0)` and the like are meant: they refuse NaN too. Index loops follow the formulas
// (Butcher tableaux, stage sums) term by term.
#![allow(clippy::neg_cmp_op_on_partial_ord, clippy::needless_range_loop)]

use crate::checks::fibre::{FibreLimits, fibre_state};
use crate::curve::UvCurve;
use crate::error::{Result, StrakeError};
use crate::geodesics::hermite::HermiteUvCurve;
use crate::geodesics::offset::{
    OffsetDistance, OffsetOptions, OffsetSide, SurfaceOffset, offset_path,
};
use crate::geodesics::rk;
use crate::geodesics::trace::{
    DomainSide, Geodesic, GeodesicEnd, StartDirection, TraceOptions, TraceStats, trace_geodesic,
};
use crate::geometry::jet::{CurveJet, DerivOrder, SurfaceJet};
use crate::geometry::math::Vec3;
use crate::geometry::principal::{DEGENERATE_SURFACE_LIMIT, SurfacePoint};
use crate::nurbs::SpanHint;
use crate::paths::curve_on_surface::{CurveOnSurface, Hints};
use crate::surface::{SurfaceHint, SurfaceSource};

/// A natural course: the geodesic from (u, v) at angle `angle` (radians from Su/|Su| toward
/// N × Su/|Su|) for `length` (see [`trace_geodesic`] for the ends and errors).
pub fn natural_course<S: SurfaceSource + ?Sized>(
    surface: &S,
    u: f64,
    v: f64,
    angle: f64,
    length: f64,
    opts: &TraceOptions,
) -> Result<Geodesic> {
    trace_geodesic(surface, u, v, StartDirection::Angle(angle), length, opts)
}

/// A course that keeps a fixed angle to a reference field.
#[derive(Debug, Clone, PartialEq)]
pub struct FieldCourse {
    /// The course in the parameter plane, t = arc length in [0, length].
    pub curve: HermiteUvCurve,
    /// Why it ended.
    pub end: GeodesicEnd,
    /// Length (host length unit).
    pub length: f64,
    /// Cost.
    pub stats: TraceStats,
}

/// The unit tangent of the fixed-angle field at a point, its parameter components (u', v')
/// and their derivative (u'', v'') along the course; `Err(ratio)` where the field degenerates.
fn field(
    jet: &SurfaceJet,
    sp: &SurfacePoint,
    axis: &Vec3,
    cos_a: f64,
    sin_a: f64,
) -> std::result::Result<[f64; 4], f64> {
    let n = sp.n;
    let an = axis.dot(&n);
    let r = axis - n * an;
    let rl = r.norm();
    let ratio = rl / axis.norm();
    if !(ratio > 1e-6) {
        return Err(ratio);
    }
    let e = r / rl;
    let ne = n.cross(&e);
    let t = e * cos_a + ne * sin_a;
    let (p, q) = sp.components(t.dot(&jet.su), t.dot(&jet.sv));
    // N' = −κn T − τg B along T.
    let b = n.cross(&t);
    let bc = sp.components(b.dot(&jet.su), b.dot(&jet.sv));
    let kn = sp.second_form((p, q), (p, q));
    let tg = sp.second_form((p, q), bc);
    let dn = -(t * kn) - b * tg;
    let dr = -(n * axis.dot(&dn)) - dn * an;
    let de = (dr - e * e.dot(&dr)) / rl;
    let dne = dn.cross(&e) + n.cross(&de);
    let dt = de * cos_a + dne * sin_a;
    let w = jet.suu * (p * p) + jet.suv * (2.0 * p * q) + jet.svv * (q * q);
    let tang = dt - w;
    let (pp, qq) = sp.components(tang.dot(&jet.su), tang.dot(&jet.sv));
    Ok([p, q, pp, qq])
}

/// One evaluation of the field: the field and the jet, or a refusal: `Some(ratio)` where the
/// field or the surface degenerates, `None` outside the domain.
type FieldEval = std::result::Result<([f64; 4], SurfaceJet), Option<f64>>;

/// A fixed-angle course from (u, v): tangent at angle `angle` (radians) from the projection of
/// the space direction `axis` onto the tangent plane, toward N × e (see the module docs), for
/// arc length `length`, with the error per step `opts.tolerance` in space.
///
/// Errors: `NonFinite` / `OutOfDomain` / `DegenerateSurface` for the start; `InvalidArgument`
/// for a zero or non-finite axis, a bad angle or length, or an axis along the normal at the
/// start (naming the values); `LeavesSurface` for a start on the boundary heading out;
/// `GeodesicIncomplete` when the tolerance cannot be met or the step cap is used up.
pub fn fixed_angle_course<S: SurfaceSource + ?Sized>(
    surface: &S,
    u: f64,
    v: f64,
    axis: Vec3,
    angle: f64,
    length: f64,
    opts: &TraceOptions,
) -> Result<FieldCourse> {
    opts.check()?;
    if !(axis.iter().all(|c| c.is_finite()) && axis.norm() > 0.0) {
        return Err(StrakeError::InvalidArgument(format!(
            "axis {} must be finite and not zero",
            crate::numfmt::ExactVec(&[axis.x, axis.y, axis.z])
        )));
    }
    if !(angle.is_finite() && length.is_finite() && length > 0.0) {
        return Err(StrakeError::InvalidArgument(format!(
            "angle = {angle} must be finite and length = {length} positive and finite",
            angle = crate::numfmt::Exact(angle),
            length = crate::numfmt::Exact(length)
        )));
    }
    let (ud, vd) = (surface.u_domain(), surface.v_domain());
    let (lo, hi) = ([ud.lo, vd.lo], [ud.hi, vd.hi]);
    let snap = [1e-11 * ud.width(), 1e-11 * vd.width()];
    let orient = surface.orientation();
    let (cos_a, sin_a) = (angle.cos(), angle.sin());
    let mut hint = SurfaceHint::default();
    let mut jets = 0usize;
    // One evaluation: Ok(Ok(field, jet)), Ok(Err(Some(ratio))) degenerate, Ok(Err(None)) outside.
    let mut eval = |y: [f64; 2]| -> Result<FieldEval> {
        let mut x = y;
        for k in 0..2 {
            if !x[k].is_finite() || x[k] < lo[k] - snap[k] || x[k] > hi[k] + snap[k] {
                return Ok(Err(None));
            }
            x[k] = x[k].clamp(lo[k], hi[k]);
        }
        let jet = surface.jet_in_domain(x[0], x[1], DerivOrder::Second, &mut hint)?;
        jets += 1;
        jet.check_finite()?;
        let sp = match SurfacePoint::new(&jet, orient, x[0], x[1], ud.width(), vd.width()) {
            Ok(sp) => sp,
            Err(StrakeError::DegenerateSurface { conditioning, .. }) => {
                return Ok(Err(Some(conditioning.min(DEGENERATE_SURFACE_LIMIT))));
            }
            Err(e) => return Err(e),
        };
        Ok(match field(&jet, &sp, &axis, cos_a, sin_a) {
            Ok(f) => Ok((f, jet)),
            Err(r) => Err(Some(r)),
        })
    };
    let j0 = surface.checked_jet(u, v, DerivOrder::Second, &mut SurfaceHint::default())?;
    let sp0 = SurfacePoint::new(&j0, orient, u, v, ud.width(), vd.width())?;
    let f0 = field(&j0, &sp0, &axis, cos_a, sin_a).map_err(|r| {
        StrakeError::InvalidArgument(format!(
            "axis ({}, {}, {}) is along the normal at the start (u, v) = ({u}, {v}): its \
             tangent part is {r} of its length",
            axis.x,
            axis.y,
            axis.z,
            r = crate::numfmt::Num(r)
        ))
    })?;
    for k in 0..2 {
        let x = [u, v][k];
        if (x <= lo[k] && f0[k] < 0.0) || (x >= hi[k] && f0[k] > 0.0) {
            return Err(StrakeError::LeavesSurface {
                what: format!(
                    "the course from (u, v) = ({u}, {v}) on the domain boundary heads out at once",
                    u = crate::numfmt::Exact(u),
                    v = crate::numfmt::Exact(v)
                ),
            });
        }
    }
    let size = j0.su.norm() * ud.width() + j0.sv.norm() * vd.width();
    let tol = opts.tolerance;
    let h_min = 1e-13 * size.max(length);
    let h_max = size / 8.0;
    let mut h = (0.5 * size * (tol / size).powf(0.2)).min(length).min(h_max);
    let mut knots = vec![0.0];
    let node = |y: [f64; 2], f: [f64; 4]| CurveJet {
        u: y[0],
        v: y[1],
        du: f[0],
        dv: f[1],
        ddu: f[2],
        ddv: f[3],
    };
    let mut nodes = vec![node([u, v], f0)];
    let mut stats = TraceStats::default();
    let (mut s, mut y, mut f) = (0.0f64, [u, v], f0);
    let mut end = GeodesicEnd::Length;
    let mut just_rejected = false;
    while s < length {
        if stats.accepted + stats.rejected >= opts.max_steps {
            return Err(StrakeError::GeodesicIncomplete {
                what: format!(
                    "fixed-angle course: step cap of {} attempts used up",
                    opts.max_steps
                ),
                arc_length: s,
                u: y[0],
                v: y[1],
            });
        }
        let remaining = length - s;
        let mut hs = h.min(remaining).min(h_max);
        // Boundary reach of the local quadratic.
        for k in 0..2 {
            for b in [lo[k], hi[k]] {
                let (c, d, a) = (y[k] - b, f[k], 0.5 * f[k + 2]);
                let disc = d * d - 4.0 * a * c;
                let cands = if a.abs() < 1e-300 {
                    [if d != 0.0 { -c / d } else { f64::INFINITY }, f64::INFINITY]
                } else if disc >= 0.0 {
                    let r = disc.sqrt();
                    [(-d + r) / (2.0 * a), (-d - r) / (2.0 * a)]
                } else {
                    [f64::INFINITY; 2]
                };
                for r in cands {
                    if r > 0.0 && r < hs {
                        hs = r;
                    }
                }
            }
        }
        let st = match rk::attempt_step(&y, f, hs, None, |yi: &[f64; 2]| {
            Ok::<_, StrakeError>(eval(*yi)?.map(|(fi, ji)| (fi, Some(ji))))
        })? {
            Ok(st) => st,
            Err(r) => {
                stats.rejected += 1;
                just_rejected = true;
                match r {
                    None => h = 0.7 * hs,
                    Some(ratio) => {
                        h = 0.5 * hs;
                        if h < h_min {
                            end = GeodesicEnd::Degenerate {
                                conditioning: ratio,
                            };
                            break;
                        }
                    }
                }
                continue;
            }
        };
        let jet = st.last.expect("six stages evaluated");
        let (k, y5, d) = (st.k, st.y5, st.err);
        let err = (jet.su * d[0] + jet.sv * d[1]).norm();
        if !(err <= tol) {
            stats.rejected += 1;
            h = hs
                * if err.is_finite() {
                    (0.9 * (tol / err).powf(0.2)).clamp(0.2, 0.9)
                } else {
                    0.2
                };
            just_rejected = true;
            if h < h_min {
                return Err(StrakeError::GeodesicIncomplete {
                    what: format!(
                        "fixed-angle course: the error estimate {err} stays above the \
                         tolerance {tol} with the step at its floor",
                        err = crate::numfmt::Num(err),
                        tol = crate::numfmt::Num(tol)
                    ),
                    arc_length: s,
                    u: y[0],
                    v: y[1],
                });
            }
            continue;
        }
        let s_new = if hs >= remaining { length } else { s + hs };
        if s_new <= s {
            return Err(StrakeError::GeodesicIncomplete {
                what: "fixed-angle course: the step no longer advances".into(),
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
        y = y5;
        f = k[rk::STAGES - 1];
        let mut side = None;
        for c in 0..2 {
            if y[c] - lo[c] <= snap[c] && f[c] < 0.0 {
                y[c] = lo[c];
                side = Some([DomainSide::ULow, DomainSide::VLow][c]);
            } else if hi[c] - y[c] <= snap[c] && f[c] > 0.0 {
                y[c] = hi[c];
                side = Some([DomainSide::UHigh, DomainSide::VHigh][c]);
            }
        }
        if side.is_some() {
            if let Ok((fb, _)) = eval(y)? {
                f = fb;
            }
        }
        crate::geodesics::trace::push_node(&mut knots, &mut nodes, s, node(y, f));
        if let Some(side) = side {
            end = GeodesicEnd::Boundary(side);
            break;
        }
    }
    if knots.len() < 2 {
        return Err(StrakeError::DegenerateSurface {
            u,
            v,
            conditioning: sp0.conditioning,
        });
    }
    stats.jets = jets + 1;
    Ok(FieldCourse {
        curve: HermiteUvCurve::new(knots, nodes)?,
        end,
        length: s,
        stats,
    })
}

/// The adjacent course one tow band `band_width` to `side` of `course`: its geodesic parallel
/// at that distance (see [`offset_path`] for the pieces, exits and loops).
pub fn adjacent_course<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    surface: &S,
    course: &C,
    band_width: f64,
    side: OffsetSide,
    opts: &OffsetOptions,
) -> Result<SurfaceOffset> {
    if !(band_width.is_finite() && band_width > 0.0) {
        return Err(StrakeError::InvalidArgument(format!(
            "band_width = {band_width} must be positive and finite",
            band_width = crate::numfmt::Exact(band_width)
        )));
    }
    offset_path(
        surface,
        course,
        side,
        &OffsetDistance::Constant(band_width),
        opts,
    )
}

/// A gap or an overlap between neighbouring courses' band edges.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CourseGap {
    /// Start, as a parameter of course A.
    pub t0: f64,
    /// End, as a parameter of course A.
    pub t1: f64,
    /// True for an overlap (the bands cover each other), false for a gap.
    pub overlap: bool,
    /// Largest width inside the interval (host length unit, ≥ 0).
    pub worst: f64,
}

/// Gaps and overlaps between course A and its neighbour B.
#[derive(Debug, Clone, PartialEq)]
pub struct CourseGaps {
    /// The intervals, in A's order.
    pub intervals: Vec<CourseGap>,
    /// At each sample of A: (t, edge-to-edge width d − w/2, d the distance to B's edge),
    /// `None` where no B was met.
    pub widths: Vec<(f64, Option<f64>)>,
    /// Samples where the perpendicular met no edge of B (within 3w toward B, 1.5w away).
    pub unmatched: usize,
}

/// Gaps and overlaps between the bands of width `band_width` centred on courses `a` and `b`
/// (B to `side` of A), at `samples` even parameters of A, intervals where the edge-to-edge
/// width exceeds `tolerance` in size (see the module docs).
///
/// Errors: `InvalidArgument` for a band width or tolerance not positive, below the resolution of
/// A's coordinates ([`crate::paths::sampling::RESOLUTION_ULPS`] ulps of the largest, 100 times
/// that for the tolerance) or a band width whose triple overflows, fewer than 2 samples or
/// more than [`MAX_COURSE_SAMPLES`];
/// the errors of A's frames and of the traces.
#[allow(clippy::too_many_arguments)]
pub fn course_gaps<S: SurfaceSource + ?Sized, A: UvCurve + ?Sized, B: UvCurve + ?Sized>(
    surface: &S,
    a: &A,
    b: &B,
    side: OffsetSide,
    band_width: f64,
    samples: usize,
    tolerance: f64,
    trace: &TraceOptions,
) -> Result<CourseGaps> {
    if !(band_width.is_finite() && band_width > 0.0 && tolerance.is_finite() && tolerance > 0.0)
        || samples < 2
    {
        return Err(StrakeError::InvalidArgument(format!(
            "band_width = {band_width} and tolerance = {tolerance} must be positive and \
             finite, samples = {samples} at least 2",
            band_width = crate::numfmt::Exact(band_width),
            tolerance = crate::numfmt::Exact(tolerance)
        )));
    }
    check_course_samples(samples)?;
    // A band or a tolerance the coordinates cannot resolve (a denormal width gave a NaN in
    // the traces' jets), or a search length 3 w that overflows, is refused at once.
    let path = CurveOnSurface::new(surface, a);
    let mut hints = Hints::default();
    let ad = a.domain();
    let mut size = 0.0_f64;
    for t in [ad.lo, 0.5 * (ad.lo + ad.hi), ad.hi] {
        size = size.max(path.frame(t, &mut hints)?.point.amax());
    }
    let resolution = crate::paths::sampling::RESOLUTION_ULPS * f64::EPSILON * size;
    for (name, x, floor) in [
        ("band_width", band_width, resolution),
        ("tolerance", tolerance, 100.0 * resolution),
    ] {
        if x < floor {
            return Err(StrakeError::InvalidArgument(format!(
                "{name} = {}: below what the course's coordinates (up to {}) resolve in f64, \
                 {}; it cannot be met",
                crate::numfmt::Exact(x),
                crate::numfmt::Num(size),
                crate::numfmt::Num(floor)
            )));
        }
    }
    if !(3.0 * band_width).is_finite() {
        return Err(StrakeError::InvalidArgument(format!(
            "band_width = {}: three band widths (the search length) overflow",
            crate::numfmt::Exact(band_width)
        )));
    }
    // B's band edge facing A: its geodesic parallel at w/2, as polygons in (u, v) fine
    // enough for the crossing search.
    let facing = match side {
        OffsetSide::Left => OffsetSide::Right,
        OffsetSide::Right => OffsetSide::Left,
    };
    let mut edge_opts = OffsetOptions::new(tolerance * 1e-2);
    edge_opts.trace = *trace;
    let edge = match offset_path(
        surface,
        b,
        facing,
        &OffsetDistance::Constant(0.5 * band_width),
        &edge_opts,
    ) {
        Ok(e) => e.pieces,
        Err(StrakeError::LeavesSurface { .. }) => Vec::new(),
        Err(e) => return Err(e),
    };
    let nb = 512usize;
    let mut polys = Vec::with_capacity(edge.len());
    for piece in &edge {
        let bd = piece.curve.domain();
        let mut bh = SpanHint::default();
        let mut poly = Vec::with_capacity(nb);
        for i in 0..nb {
            let t = bd.even(i, nb);
            let j = piece.curve.checked_jet(t, &mut bh)?;
            poly.push((t, [j.u, j.v]));
        }
        polys.push(poly);
    }
    let sign = match side {
        OffsetSide::Left => 1.0,
        OffsetSide::Right => -1.0,
    };
    let mut widths = Vec::with_capacity(samples);
    let mut unmatched = 0;
    // The arc length along the geodesic from (u, v) toward `dir` (up to `reach`) where it
    // first meets B's edge, if it does.
    let meet = |u: f64, v: f64, dir: Vec3, reach: f64| -> Result<Option<f64>> {
        let g = match trace_geodesic(surface, u, v, StartDirection::Space(dir), reach, trace) {
            Ok(g) => g,
            Err(StrakeError::LeavesSurface { .. }) => return Ok(None),
            Err(e) => return Err(e),
        };
        let mut nearest: Option<f64> = None;
        for (piece, poly) in edge.iter().zip(&polys) {
            if let Some(d) = crossing_distance(&g, &piece.curve, poly)? {
                nearest = Some(nearest.map_or(d, |n: f64| n.min(d)));
            }
        }
        Ok(nearest)
    };
    for i in 0..samples {
        let t = ad.even(i, samples);
        let fr = path.frame(t, &mut hints)?;
        let toward = fr.b * sign;
        // Toward B first; an edge of B beyond A's centreline (an overlap deeper than w/2) is
        // met the other way, at a negative distance.
        let nearest = match meet(fr.u, fr.v, toward, 3.0 * band_width)? {
            Some(d) => Some(d),
            None => meet(fr.u, fr.v, -toward, 1.5 * band_width)?.map(|d| -d),
        };
        match nearest {
            Some(d) => widths.push((t, Some(d - 0.5 * band_width))),
            None => {
                widths.push((t, None));
                unmatched += 1;
            }
        }
    }
    // Intervals.
    let mut intervals: Vec<CourseGap> = Vec::new();
    let mut open: Option<CourseGap> = None;
    for &(t, w) in &widths {
        let kind = w.and_then(|w| (w.abs() > tolerance).then_some((w < 0.0, w.abs())));
        match (kind, open.as_mut()) {
            (Some((ov, size)), Some(cur)) if cur.overlap == ov => {
                cur.t1 = t;
                cur.worst = cur.worst.max(size);
            }
            (Some((ov, size)), _) => {
                if let Some(done) = open.take() {
                    intervals.push(done);
                }
                open = Some(CourseGap {
                    t0: t,
                    t1: t,
                    overlap: ov,
                    worst: size,
                });
            }
            (None, _) => {
                if let Some(done) = open.take() {
                    intervals.push(done);
                }
            }
        }
    }
    if let Some(done) = open {
        intervals.push(done);
    }
    Ok(CourseGaps {
        intervals,
        widths,
        unmatched,
    })
}

/// The arc length along `g` where it first crosses the curve `b` (polygon `bpoly` of
/// (t, (u, v))), refined by Newton's method on (s, t_b) for g(s) = b(t_b) in (u, v).
fn crossing_distance<B: UvCurve + ?Sized>(
    g: &Geodesic,
    b: &B,
    bpoly: &[(f64, [f64; 2])],
) -> Result<Option<f64>> {
    let gc = &g.curve;
    let ng = 96usize;
    let gd = gc.domain();
    let mut gh = SpanHint::default();
    let mut gpoly = Vec::with_capacity(ng);
    for i in 0..ng {
        let s = gd.even(i, ng);
        let j = gc.checked_jet(s, &mut gh)?;
        gpoly.push((s, [j.u, j.v]));
    }
    for w in gpoly.windows(2) {
        for x in bpoly.windows(2) {
            let (p0, p1, q0, q1) = (w[0].1, w[1].1, x[0].1, x[1].1);
            let r = [p1[0] - p0[0], p1[1] - p0[1]];
            let sv = [q1[0] - q0[0], q1[1] - q0[1]];
            let den = r[0] * sv[1] - r[1] * sv[0];
            if den == 0.0 {
                continue;
            }
            let d = [q0[0] - p0[0], q0[1] - p0[1]];
            let al = (d[0] * sv[1] - d[1] * sv[0]) / den;
            let be = (d[0] * r[1] - d[1] * r[0]) / den;
            // A little slack at B's ends: the perpendicular of A's last sample meets the edge
            // of an adjacent course at its very end, within round-off.
            if !((0.0..=1.0).contains(&al) && (-1e-6..=1.0 + 1e-6).contains(&be)) {
                continue;
            }
            let mut s = w[0].0 + al * (w[1].0 - w[0].0);
            let mut tb = x[0].0 + be * (x[1].0 - x[0].0);
            let (gdm, bdm) = (gd, b.domain());
            let mut hb = SpanHint::default();
            for _ in 0..20 {
                let jg = gc.checked_jet(s.clamp(gdm.lo, gdm.hi), &mut gh)?;
                let jb = b.checked_jet(tb.clamp(bdm.lo, bdm.hi), &mut hb)?;
                let res = [jg.u - jb.u, jg.v - jb.v];
                // [g' −b'] (δs, δt)ᵀ = −res
                let det = jg.du * -jb.dv + jb.du * jg.dv;
                if det == 0.0 {
                    break;
                }
                let ds = (-res[0] * -jb.dv + jb.du * -res[1]) / det;
                let dt = (jg.du * -res[1] - jg.dv * -res[0]) / det;
                s = (s + ds).clamp(gdm.lo, gdm.hi);
                tb = (tb + dt).clamp(bdm.lo, bdm.hi);
                if ds.abs() <= 1e-14 * (1.0 + s.abs()) {
                    break;
                }
            }
            return Ok(Some(s));
        }
    }
    Ok(None)
}

/// The most samples [`course_check`] and [`course_gaps`] take: each costs at least one frame
/// (a gap sample a geodesic trace), so a count above it is refused at once rather than
/// evaluated for hours (a `SIZE_MAX` from a host's unsigned underflow).
pub const MAX_COURSE_SAMPLES: usize = 10_000_000;

fn check_course_samples(samples: usize) -> Result<()> {
    if samples > MAX_COURSE_SAMPLES {
        return Err(StrakeError::InvalidArgument(format!(
            "samples = {samples}: at most {MAX_COURSE_SAMPLES} are taken"
        )));
    }
    Ok(())
}

/// Steering and twist along a course, at even samples.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CourseCheck {
    /// Largest steering curvature |κg| (1/length).
    pub max_steering_curvature: f64,
    /// Smallest steering radius 1/|κg| (infinite along a geodesic).
    pub min_steering_radius: f64,
    /// Largest tow-edge strain (w/2)|κg|.
    pub max_edge_strain: f64,
    /// Largest |τg| (radians per length).
    pub max_twist_rate: f64,
    /// Samples where the steering radius is below the limit.
    pub steering_violations: usize,
    /// Samples where |τg| exceeds the limit.
    pub twist_violations: usize,
    /// Course length (host length unit), by quadrature.
    pub length: f64,
}

/// [`fibre_state`] at `samples` even parameters of `course` (≥ 2), summarised.
///
/// Errors: `InvalidArgument` for bad limits, fewer than 2 samples or more than
/// [`MAX_COURSE_SAMPLES`]; the errors of the course's frames.
pub fn course_check<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    surface: &S,
    course: &C,
    limits: &FibreLimits,
    samples: usize,
) -> Result<CourseCheck> {
    limits.validate()?;
    check_course_samples(samples)?;
    if samples < 2 {
        return Err(StrakeError::InvalidArgument(format!(
            "samples = {samples}: at least 2 are needed"
        )));
    }
    let path = CurveOnSurface::new(surface, course);
    let dom = course.domain();
    let mut hints = Hints::default();
    let mut out = CourseCheck {
        max_steering_curvature: 0.0,
        min_steering_radius: f64::INFINITY,
        max_edge_strain: 0.0,
        max_twist_rate: 0.0,
        steering_violations: 0,
        twist_violations: 0,
        length: crate::paths::sampling::arc_length(&path, dom.lo, dom.hi, 1e-10)?,
    };
    for i in 0..samples {
        let f = path.frame(dom.even(i, samples), &mut hints)?;
        let st = fibre_state(&f, limits)?;
        out.max_steering_curvature = out.max_steering_curvature.max(st.steering_curvature);
        out.min_steering_radius = out.min_steering_radius.min(st.steering_radius);
        out.max_edge_strain = out.max_edge_strain.max(st.edge_strain);
        out.max_twist_rate = out.max_twist_rate.max(st.twist_rate.abs());
        out.steering_violations += st.steering_violated as usize;
        out.twist_violations += st.twist_violated as usize;
    }
    Ok(out)
}
