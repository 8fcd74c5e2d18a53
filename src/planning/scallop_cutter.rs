//! The scallop between two neighbouring passes of a flat-end, toroidal or ball-end cutter at
//! lead and tilt: the exact cusp of the two cutter profiles in the plane across the path, and
//! its inverse, the step-over that leaves a target scallop.
//!
//! **Model.** In the plane across the path (spanned by b_t and n_t of the tool-side frame,
//! [`crate::checks::tool_axis::ToolFrame`]) the surface is its osculating circle of curvature
//! κ = s κn(B) ([`crate::checks::scallop::cross_path_curvature`], positive concave toward the
//! tool). A cutter moving along T cuts, in that plane, its outline seen along T (its profile:
//! the bottom disc of radius R swept by the corner ball of radius r, continued by the flank
//! along the axis; [`crate::checks::cut_width`] uses the same outline). Two passes whose
//! contacts are the arc length w apart on the circle carry the same profile, each placed in
//! its own tool-side frame (the second is the first turned by the angle w κ about the circle's
//! centre: lead and tilt are measured from each contact's normal). The scallop height is the
//! distance from the surface (radially, from the circle) to the cusp where the first profile's
//! side toward the second meets the second profile: the highest point under both.
//!
//! **The cusp** ([`scallop_between_cutters`]): the first profile's boundary is walked from its
//! contact toward the second pass (its lower outline, then its flank), the first point inside
//! the second profile located by a scan and bisection to round-off; "inside" is decided in the
//! second profile's own frame (above its lower outline, inside both flanks). The lower outline
//! at a lateral position is found by bisection on the outline's normal angle, with linear
//! interpolation between the bracketing points: to round-off where the outline is smooth and
//! exact along the straight edge of a tilted flat bottom.
//!
//! **The inverse** ([`step_over_for_cutter_scallop`]): the second profile is the first turned
//! about the circle's centre, and turning keeps the distance from the circle; so the cusp at
//! height h is the point of the first profile's right side at height h, and turned back by
//! w κ it is the point of the first profile's left side at height h. The step-over is the
//! difference of the arc coordinates σ(Q) = atan2(κ Q_b, 1 − κ Q_n)/κ of those two points
//! (two one-dimensional searches, no iteration on w). On a plane (κ = 0) it is the width of the
//! outline at height h, [`crate::checks::cut_width`], which it reproduces; it is therefore
//! limited by the width the cutter cuts (issue 12) by construction.
//!
//! For a ball-end mill the profile is the circle of radius r (whatever the lead and tilt) and
//! the cusp is the two-circle intersection of [`crate::checks::scallop::scallop_height`]
//! (Suresh & Yang, J. Eng. Ind. 116 (1994) 253–259; Lin & Koren, J. Eng. Ind. 118 (1996)
//! 20–28), which the tests check to 1e-12.
//!
//! What it does not see: the surface's curvature along the path (the profile is the cutter's
//! outline seen along T over the cross-section; the ball's tube construction of
//! [`super::scallop_left`] sees it), passes that run in opposite directions (zig-zag: the
//! tilted profile is then mirrored from one pass to the next; here both passes have the same
//! lead and tilt in the same direction of travel), gouging away from the contact (only the
//! local fit κ ρ_across < 1 is checked), the holder and shank.
//! Lengths in the host's unit, angles in radians.

// `!(x > 0.0)` refuses NaN too.
#![allow(clippy::neg_cmp_op_on_partial_ord)]

use crate::checks::cutter::{Cutter, Outline, cutter_radii};
use crate::checks::tool_axis::ToolAngles;
use crate::error::{Result, StrakeError};
use crate::numfmt::{Exact, Num};

/// Points of the scan that finds the first crossing before the bisection, on each part of the
/// walked boundary (the lower outline and the flank).
const SCAN: usize = 24;

/// The profile of a cutter seen along T, in its own tool-side frame: (b_t, n_t) components
/// from its contact point.
#[derive(Debug, Clone, Copy)]
struct Profile {
    o: Outline,
    /// The contact point X(0) (the lowest point along n_t), from the corner-centre circle.
    c: (f64, f64),
    phi_plus: f64,
    phi_minus: f64,
    /// The ends of the lower outline (where the flanks begin), from the contact.
    xp: (f64, f64),
    xm: (f64, f64),
    /// Unit direction of the flanks (the axis projected: (a_b, a_n)/|(a_b, a_n)|).
    dir: (f64, f64),
}

impl Profile {
    fn new(cutter: &Cutter, angles: &ToolAngles) -> Profile {
        let o = Outline::new(cutter, angles);
        let c = o.point(0.0);
        let phi_plus = o.phi_plus();
        let phi_minus = phi_plus - std::f64::consts::PI;
        let rel = |p: (f64, f64)| (p.0 - c.0, p.1 - c.1);
        let len = o.ab.hypot(o.an);
        Profile {
            o,
            c,
            phi_plus,
            phi_minus,
            xp: rel(o.point(phi_plus)),
            xm: rel(o.point(phi_minus)),
            dir: (o.ab / len, o.an / len),
        }
    }

    /// The outline point of normal angle φ, from the contact.
    fn x(&self, phi: f64) -> (f64, f64) {
        let p = self.o.point(phi);
        (p.0 - self.c.0, p.1 - self.c.1)
    }

    /// The lower outline's height at lateral position y in [xm.0, xp.0] (bisection on φ, the
    /// outline's lateral position being non-decreasing in φ; linear between the bracketing
    /// points, exact along a straight edge).
    fn lower(&self, y: f64) -> f64 {
        let (mut lo, mut hi) = (self.phi_minus, self.phi_plus);
        for _ in 0..200 {
            let mid = 0.5 * (lo + hi);
            if mid == lo || mid == hi {
                break;
            }
            if self.x(mid).0 < y {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        let (a, b) = (self.x(lo), self.x(hi));
        if b.0 > a.0 {
            a.1 + (y - a.0) * (b.1 - a.1) / (b.0 - a.0)
        } else {
            a.1.min(b.1)
        }
    }

    /// True when (y, z) (from the contact, in this profile's frame) lies in the swept profile.
    fn contains(&self, y: f64, z: f64) -> bool {
        let (ab, an) = self.dir;
        // The flanks' half-planes: outward normals (a_n, −a_b) on the +b_t side, the opposite
        // on the −b_t side.
        let right_ok = an * (y - self.xp.0) - ab * (z - self.xp.1) <= 0.0;
        let left_ok = -an * (y - self.xm.0) + ab * (z - self.xm.1) <= 0.0;
        if !(right_ok && left_ok) {
            return false;
        }
        if y < self.xm.0 {
            // Beyond the lower outline's end: inside only above a flank leaning outward.
            ab < 0.0
        } else if y > self.xp.0 {
            ab > 0.0
        } else {
            z >= self.lower(y)
        }
    }

    /// The boundary on the +b_t side at walk parameter τ ≥ 0: the lower outline at lateral
    /// position τ up to its end, then the flank at distance τ − xp.0 from it.
    fn right_side(&self, tau: f64) -> (f64, f64) {
        if tau <= self.xp.0 {
            (tau, self.lower(tau))
        } else {
            let l = tau - self.xp.0;
            (self.xp.0 + l * self.dir.0, self.xp.1 + l * self.dir.1)
        }
    }

    /// The boundary on the −b_t side at walk parameter τ ≥ 0 (lateral position −τ, then the
    /// flank from its end).
    fn left_side(&self, tau: f64) -> (f64, f64) {
        if tau <= -self.xm.0 {
            (-tau, self.lower(-tau))
        } else {
            let l = tau + self.xm.0;
            (self.xm.0 + l * self.dir.0, self.xm.1 + l * self.dir.1)
        }
    }
}

/// The circle of curvature κ through the origin, tangent to the b_t axis, bending toward n_t
/// for κ > 0: heights above it and arc coordinates along it, without overflow for tiny κ.
#[derive(Debug, Clone, Copy)]
struct Section {
    kappa: f64,
}

impl Section {
    /// Distance from the circle (positive on the tool side): ρ − |P − C| (concave) or
    /// |P − C| − ρ (convex), as (2 P_n − κ |P|²)/(1 + |κ| |P − C|) (no cancellation).
    fn height(&self, p: (f64, f64)) -> f64 {
        let k = self.kappa;
        let kd = (k * p.0).hypot(k * p.1 - 1.0);
        (2.0 * p.1 - k * (p.0 * p.0 + p.1 * p.1)) / (1.0 + kd)
    }

    /// Arc coordinate along the circle of the foot of P: atan2(κ P_b, 1 − κ P_n)/κ (P_b for
    /// κ = 0).
    fn arc(&self, p: (f64, f64)) -> f64 {
        let k = self.kappa;
        if k == 0.0 {
            p.0
        } else {
            (k * p.0).atan2(1.0 - k * p.1) / k
        }
    }

    /// The contact point, b_t and n_t at arc coordinate σ.
    fn frame(&self, sigma: f64) -> ((f64, f64), (f64, f64), (f64, f64)) {
        let a = sigma * self.kappa;
        let (s, c) = a.sin_cos();
        let half = 0.5 * a;
        let sinc = |x: f64| if x == 0.0 { 1.0 } else { x.sin() / x };
        // sin a / κ = σ sinc a; (1 − cos a)/κ = 2 sin²(a/2)/κ = σ sin(a/2) sinc(a/2).
        let p = (sigma * sinc(a), sigma * half.sin() * sinc(half));
        (p, (c, s), (-s, c))
    }
}

/// The scallop between two passes of a cutter (see [`scallop_between_cutters`]).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CutterScallop {
    /// Scallop height: distance of the cusp from the surface's circle of curvature across the
    /// path (host length unit, ≥ 0).
    pub height: f64,
    /// The cusp, (along b_t, along n_t) from the first pass's contact point, in its tool-side
    /// frame.
    pub cusp: [f64; 2],
    /// True when the cusp lies on the flank of the first pass's cutter (its side, above the
    /// lower outline of the bottom and corner), false on the lower outline.
    pub on_flank: bool,
}

fn check_inputs(cutter: &Cutter, angles: &ToolAngles, kappa: f64) -> Result<f64> {
    cutter.validate()?;
    angles.validate()?;
    if !kappa.is_finite() {
        return Err(StrakeError::InvalidArgument(format!(
            "cross-path curvature = {}: it must be finite",
            Exact(kappa)
        )));
    }
    let rho = cutter_radii(cutter, angles)?.across_path;
    if kappa > 0.0 && kappa * rho >= 1.0 {
        return Err(StrakeError::InvalidArgument(format!(
            "the cutter's profile across the path (radius {}) does not fit the concave \
             cross-section of radius {}: the cutter gouges",
            Num(rho),
            Num(1.0 / kappa)
        )));
    }
    Ok(rho)
}

/// Largest |w κ| accepted: the two contacts less than half the circle apart.
const MAX_TURN: f64 = 0.5 * std::f64::consts::PI;

/// The scallop between two neighbouring passes of `cutter`, both with the axis at `angles` in
/// their tool-side frames, whose contacts are the arc length `w` apart across the path on a
/// cross-section of curvature `kappa` (= s κn(B), 1/length, positive concave toward the tool);
/// the second pass on the +b_t side of the first (see the module docs for the model and the
/// construction).
///
/// Errors (`InvalidArgument`, naming the value): an invalid cutter or angles, `w` not positive
/// and finite, `kappa` not finite, a profile that does not fit the concave cross-section
/// (κ ρ_across ≥ 1, ρ_across of [`crate::checks::CutterRadii::across_path`]), contacts a
/// quarter circle apart or more (|w κ| ≥ π/2), or profiles that do not meet (the step-over is
/// wider than the cutter cuts).
pub fn scallop_between_cutters(
    cutter: &Cutter,
    angles: &ToolAngles,
    w: f64,
    kappa: f64,
) -> Result<CutterScallop> {
    check_inputs(cutter, angles, kappa)?;
    if !(w.is_finite() && w > 0.0) {
        return Err(StrakeError::InvalidArgument(format!(
            "step-over = {}: it must be positive and finite",
            Exact(w)
        )));
    }
    if !((w * kappa).abs() < MAX_TURN) {
        return Err(StrakeError::InvalidArgument(format!(
            "step-over = {} on a cross-section of radius {}: the passes are a quarter circle \
             apart or more",
            Exact(w),
            Num(1.0 / kappa.abs())
        )));
    }
    let a = Profile::new(cutter, angles);
    let sec = Section { kappa };
    let (cb, bb, nb) = sec.frame(w);
    let in_b = |p: (f64, f64)| {
        let d = (p.0 - cb.0, p.1 - cb.1);
        a.contains(d.0 * bb.0 + d.1 * bb.1, d.0 * nb.0 + d.1 * nb.1)
    };
    let (big_r, r) = cutter.torus_radii();
    let flank = 4.0 * (big_r + r) + 2.0 * w;
    let end = a.xp.0.max(0.0);
    // The first scan point inside B: on the lower outline, then on the flank.
    let grid = (0..=SCAN)
        .map(|k| end * k as f64 / SCAN as f64)
        .chain((1..=SCAN).map(|k| end + flank * k as f64 / SCAN as f64));
    let mut prev = 0.0;
    let mut found = None;
    for tau in grid {
        if in_b(a.right_side(tau)) {
            found = Some(tau);
            break;
        }
        prev = tau;
    }
    let Some(mut hi) = found else {
        return Err(StrakeError::InvalidArgument(format!(
            "step-over = {} is too wide for the cutter: the profiles of the two passes do not \
             meet",
            Exact(w)
        )));
    };
    let mut lo = prev;
    for _ in 0..200 {
        let mid = 0.5 * (lo + hi);
        if mid == lo || mid == hi {
            break;
        }
        if in_b(a.right_side(mid)) {
            hi = mid;
        } else {
            lo = mid;
        }
    }
    let q = a.right_side(0.5 * (lo + hi));
    Ok(CutterScallop {
        height: sec.height(q).max(0.0),
        cusp: [q.0, q.1],
        on_flank: 0.5 * (lo + hi) > end,
    })
}

/// The step-over for a target scallop with a cutter (see [`step_over_for_cutter_scallop`]).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CutterScallopStep {
    /// The step-over (arc length across the path, host length unit): the largest that leaves
    /// at most the target scallop.
    pub step_over: f64,
    /// The width the cutter cuts at the target height on a plane, [`crate::checks::cut_width`]
    /// (equal to `step_over` when κ = 0).
    pub width_on_plane: f64,
    /// True when the cusp at the target height lies on a flank of the cutter (the flank's
    /// straight side, not the bottom or corner, cuts the scallop's side).
    pub on_flank: bool,
}

/// The largest step-over that leaves the scallop `h` between neighbouring passes of `cutter`
/// at `angles` on a cross-section of curvature `kappa` (= s κn(B), positive concave toward the
/// tool): the exact inverse of [`scallop_between_cutters`] by the turning argument of the
/// module docs (the points of the profile's two sides at height h, the difference of their arc
/// coordinates).
///
/// Errors (`InvalidArgument`, naming the value): an invalid cutter or angles, `h` not positive
/// and finite, `kappa` not finite, a profile that does not fit the concave cross-section, a
/// height the profile does not reach on one side within 4 (R + r) + 2 h of flank, or a
/// step-over that would put the contacts a quarter circle apart.
pub fn step_over_for_cutter_scallop(
    cutter: &Cutter,
    angles: &ToolAngles,
    h: f64,
    kappa: f64,
) -> Result<CutterScallopStep> {
    check_inputs(cutter, angles, kappa)?;
    if !(h.is_finite() && h > 0.0) {
        return Err(StrakeError::InvalidArgument(format!(
            "target scallop height = {}: it must be positive and finite",
            Exact(h)
        )));
    }
    let width_on_plane = crate::checks::cut_width(cutter, angles, h)?;
    let a = Profile::new(cutter, angles);
    let sec = Section { kappa };
    let (big_r, r) = cutter.torus_radii();
    let flank = 4.0 * (big_r + r) + 2.0 * h;
    // The first point of a side whose height reaches h: scan, then bisection.
    let reach = |side: &dyn Fn(f64) -> (f64, f64), end: f64| -> Result<((f64, f64), bool)> {
        let end = end.max(0.0);
        let grid = (0..=SCAN)
            .map(|k| end * k as f64 / SCAN as f64)
            .chain((1..=SCAN).map(|k| end + flank * k as f64 / SCAN as f64));
        let mut prev = 0.0;
        let mut found = None;
        for tau in grid {
            if sec.height(side(tau)) >= h {
                found = Some(tau);
                break;
            }
            prev = tau;
        }
        let Some(mut hi) = found else {
            return Err(StrakeError::InvalidArgument(format!(
                "target scallop height = {}: the cutter's profile does not reach it on this \
                 cross-section",
                Exact(h)
            )));
        };
        let mut lo = prev;
        for _ in 0..200 {
            let mid = 0.5 * (lo + hi);
            if mid == lo || mid == hi {
                break;
            }
            if sec.height(side(mid)) >= h {
                hi = mid;
            } else {
                lo = mid;
            }
        }
        // Between the bracketing points (adjacent, or the two ends of a straight edge): the
        // point of the chord at height h, by bisection on the chord.
        let (p, q) = (side(lo), side(hi));
        let (mut s0, mut s1) = (0.0_f64, 1.0_f64);
        for _ in 0..200 {
            let m = 0.5 * (s0 + s1);
            if m == s0 || m == s1 {
                break;
            }
            let x = (p.0 + m * (q.0 - p.0), p.1 + m * (q.1 - p.1));
            if sec.height(x) >= h {
                s1 = m;
            } else {
                s0 = m;
            }
        }
        let m = 0.5 * (s0 + s1);
        Ok((
            (p.0 + m * (q.0 - p.0), p.1 + m * (q.1 - p.1)),
            0.5 * (lo + hi) > end,
        ))
    };
    let (qr, flank_r) = reach(&|t| a.right_side(t), a.xp.0)?;
    let (ql, flank_l) = reach(&|t| a.left_side(t), -a.xm.0)?;
    let w = sec.arc(qr) - sec.arc(ql);
    if !(w.is_finite() && w > 0.0 && (w * kappa).abs() < MAX_TURN) {
        return Err(StrakeError::InvalidArgument(format!(
            "target scallop height = {}: the step-over it needs ({}) puts the passes a quarter \
             circle apart or more on a cross-section of radius {}",
            Exact(h),
            Num(w),
            Num(1.0 / kappa.abs())
        )));
    }
    Ok(CutterScallopStep {
        step_over: w,
        width_on_plane,
        on_flank: flank_r || flank_l,
    })
}

/// A cutter and its axis, for pass planning ([`super::passes::PassOptions::cutter`]).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PassCutter {
    /// The cutter's shape.
    pub cutter: Cutter,
    /// Lead and tilt in the tool-side frame of every pass (the passes all run the same way).
    pub angles: ToolAngles,
}

impl PassCutter {
    /// Errors (`InvalidArgument`, naming the field) for an invalid cutter or angles.
    pub fn validate(&self) -> Result<()> {
        self.cutter.validate()?;
        self.angles.validate()
    }

    /// The ball's radius when the cutter is a ball-end mill (whose profile is its circle at
    /// any lead and tilt), else `None`.
    pub fn ball_radius(&self) -> Option<f64> {
        match self.cutter {
            Cutter::Ball { radius } => Some(radius),
            _ => None,
        }
    }
}

/// The step-over at the path sample `f` for the target scallop `h` with `cutter` on `side`:
/// [`step_over_for_cutter_scallop`] with the curvature across the path κ = s κn(B) of
/// [`crate::checks::scallop::cross_path_curvature`].
///
/// Errors: [`StrakeError::CutterTooLarge`] (radius: the profile's radius across the path)
/// where the profile does not fit the concave cross-section; the other errors of
/// [`step_over_for_cutter_scallop`].
pub fn cutter_step_over_at(
    f: &crate::geometry::frame::DarbouxFrame,
    cutter: &PassCutter,
    side: crate::checks::cutter::ToolSide,
    h: f64,
) -> Result<f64> {
    super::scallop_left::check_target_scallop(h)?;
    cutter.validate()?;
    let kappa = crate::checks::scallop::cross_path_curvature(f, side);
    let rho = cutter_radii(&cutter.cutter, &cutter.angles)?.across_path;
    if kappa > 0.0 && kappa * rho >= 1.0 {
        return Err(StrakeError::CutterTooLarge {
            radius: rho,
            curvature_radius: 1.0 / kappa,
            u: f.u,
            v: f.v,
        });
    }
    Ok(step_over_for_cutter_scallop(&cutter.cutter, &cutter.angles, h, kappa)?.step_over)
}

/// The scallop left at one point of a pass by its neighbour, for a cutter (see
/// [`scallop_between_cutter_passes`]).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CutterScallopLeft {
    /// Parameter on the pass.
    pub t: f64,
    /// Parameter on the neighbour of the contact point nearest to the pass's.
    pub t_neighbour: f64,
    /// Step-over measured: the distance between the two contact points (chord) turned into
    /// arc length on the circle of the mean curvature across the path, 2 asin(d κ/2)/κ.
    pub step_over: f64,
    /// Mean of the two contact points' curvatures across the path (s κn(B)).
    pub kappa: f64,
    /// Scallop height of [`scallop_between_cutters`] for that step-over and curvature.
    pub height: f64,
}

/// Measures the scallop left between pass `a` and its neighbour `b` (curves on `surface`) by
/// `cutter` on `side`, at each parameter of `ts` on `a`: the neighbour's contact point nearest
/// to a's (Gauss–Newton on b's parameter from `t_b0`, then from each found one), the distance
/// between them as arc length on the circle of their mean curvature across the path, and the
/// exact cusp of the two profiles there ([`scallop_between_cutters`]; the pair is the same
/// configuration whichever side the neighbour lies on). Unlike the ball's [`super::scallop_left::scallop_between`] (the meeting of
/// the swept tubes in space) this is the cross-section model at the measured step-over: it
/// sees the distance the offsets actually made and the curvature at both passes, not the
/// surface between them.
///
/// Errors: `NotConverged` where the nearest point of the neighbour is an end of its domain
/// (the neighbour is not beside this point); `InvalidArgument` where the profiles do not meet
/// (the step-over is wider than the cutter cuts) or the cutter is invalid; every error of the
/// frames and of the surface.
#[allow(clippy::too_many_arguments)]
pub fn scallop_between_cutter_passes<S, A, B>(
    surface: &S,
    a: &A,
    b: &B,
    cutter: &PassCutter,
    side: crate::checks::cutter::ToolSide,
    ts: &[f64],
    t_b0: f64,
) -> Result<Vec<CutterScallopLeft>>
where
    S: crate::surface::SurfaceSource + ?Sized,
    A: crate::curve::UvCurve + ?Sized,
    B: crate::curve::UvCurve + ?Sized,
{
    use crate::paths::curve_on_surface::{CurveOnSurface, Hints};
    cutter.validate()?;
    let pa = CurveOnSurface::new(surface, a);
    let pb = CurveOnSurface::new(surface, b);
    let (mut ha, mut hb) = (Hints::default(), Hints::default());
    let dom = b.domain();
    let mut tb = t_b0.clamp(dom.lo, dom.hi);
    let mut out = Vec::with_capacity(ts.len());
    for &t in ts {
        let fa = pa.frame(t, &mut ha)?;
        // The nearest contact point of b: Gauss–Newton on (c(t) − p)·c'(t) = 0.
        let mut best = (f64::INFINITY, tb);
        let mut tq = tb;
        for _ in 0..60 {
            let f = pb.frame(tq, &mut hb)?;
            let d = f.point - fa.point;
            let dist = d.norm();
            if dist < best.0 {
                best = (dist, tq);
            }
            let dc = f.t * f.speed;
            let den = dc.norm_squared();
            if den.is_nan() || den <= 0.0 {
                break;
            }
            let tn = (tq - d.dot(&dc) / den).clamp(dom.lo, dom.hi);
            if (tn - tq).abs() <= 1e-15 * dom.width().max(tq.abs()) {
                break;
            }
            tq = tn;
        }
        let (chord, t_near) = best;
        let fb = pb.frame(t_near, &mut hb)?;
        let end = (t_near - dom.lo).abs().min((dom.hi - t_near).abs()) <= 1e-12 * dom.width();
        let abeam = (fb.point - fa.point).dot(&fb.t).abs() <= 1e-6 * chord.max(f64::MIN_POSITIVE);
        if end && !abeam {
            return Err(StrakeError::NotConverged {
                what: format!(
                    "at t = {} on the pass the nearest point of the neighbour is an end of it \
                     (t = {}): the neighbour is not beside this point",
                    Exact(t),
                    Exact(t_near)
                ),
                iterations: 0,
            });
        }
        tb = t_near;
        let kappa = 0.5
            * (crate::checks::scallop::cross_path_curvature(&fa, side)
                + crate::checks::scallop::cross_path_curvature(&fb, side));
        let x = 0.5 * chord * kappa;
        let w = if x == 0.0 {
            chord
        } else if x.abs() < 1.0 {
            2.0 * x.asin() / kappa
        } else {
            f64::INFINITY
        };
        // Which pass is on the +b_t side does not matter: both carry the same profile, so the
        // pair is the same configuration seen from either.
        let h = scallop_between_cutters(&cutter.cutter, &cutter.angles, w, kappa)?;
        out.push(CutterScallopLeft {
            t,
            t_neighbour: t_near,
            step_over: w,
            kappa,
            height: h.height,
        });
    }
    Ok(out)
}
