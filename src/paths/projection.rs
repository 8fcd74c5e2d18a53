//! Point inversion onto a surface, and curves in space brought onto the surface as curves in
//! its parameter plane.
//!
//! **Point inversion** (The NURBS Book, 2nd ed., §6.1): the foot point (u, v) of P minimises
//! f(u, v) = ½ |S(u, v) − P|². With r = S − P, Newton's method solves g = (Su·r, Sv·r) = 0 with
//! the Hessian
//!
//! ```text
//! J = | Su·Su + r·Suu   Su·Sv + r·Suv |
//!     | Su·Sv + r·Suv   Sv·Sv + r·Svv |
//! ```
//!
//! and steps (δu, δv) = −J⁻¹ g. Iteration stops, as in §6.1, on the first of
//! - point coincidence: |r| ≤ ε₁ (ε₁ = 1e-14 × the surface's size + 8 ε_mach |P|∞, the size being
//!   the diagonal of the bounding box of the search grid below);
//! - zero cosine: |Su·r| / (|Su| |r|) ≤ ε₂ and |Sv·r| / (|Sv| |r|) ≤ ε₂, ε₂ = 1e-12 (on a
//!   boundary of an open direction whose gradient points outward, that direction's test counts
//!   as met: the foot point is on the boundary);
//! - parameters that no longer change: |δu Su + δv Sv| ≤ ε₁.
//!
//! Safeguards beyond §6.1, all of them common practice in Newton minimisation: where J is not
//! positive definite (a point beyond a centre of curvature) the step uses the first fundamental
//! form instead (Gauss–Newton, always a descent direction), and where that is singular too (a
//! pole, a collapsed edge) steepest descent scaled by 1/(E + G); a start with no finite step
//! fails and the next start is tried; a step that increases |r| by more
//! than its round-off (8 ε_mach (|P|∞ + |S|∞)) is halved until it does not or becomes shorter
//! than ε₁; on a boundary whose gradient points
//! outward, that parameter is held and the other one is solved for alone.
//!
//! **Domain, seams and boundaries** (§6.1's treatment of open and closed directions): in an open
//! direction a step that leaves the domain is clamped to the boundary; in a direction the caller
//! declares periodic (a seam, e.g. u of a torus or a cylinder) the parameter is wrapped when the
//! surface is evaluated but kept unwrapped in the iteration, so that along a batch of points
//! the parameters stay continuous across the seam ([`Projection::u_path`]).
//!
//! **Start**: the first point of a batch (and any point whose continuation fails) starts from a
//! coarse search: the surface is evaluated once, at construction, on a grid of
//! (`grid` + 1) × (`grid` + 1) nodes ([`ProjectionOptions::grid`], 16 by default, so 289
//! evaluations; a periodic direction drops its duplicate last row), and Newton's method is run
//! from the [`GRID_CANDIDATES`] nearest nodes, keeping the nearest converged foot point. Every
//! following point starts from the previous foot point (continuation along the path); when that
//! does not converge within the tolerance, the coarse search is used. Continuation finds the
//! nearest *local* foot point; a point accepted within the host's tolerance is on the surface
//! to that tolerance either way.
//!
//! **Distances**: every projection reports |S − P| and the signed distance (P − S)·N, N the
//! surface's unit normal with its [`Orientation`](crate::Orientation); they agree in magnitude
//! at an interior foot point, where P − S is along N.
//!
//! Nothing here allocates per point, apart from the output arrays.

use crate::curve::UvCurve;
use crate::error::{Result, StrakeError};
use crate::geometry::jet::{CurveJet, DerivOrder, Interval, SurfaceJet};
use crate::geometry::math::{Vec3, vec3};
use crate::geometry::principal::{DEGENERATE_SURFACE_LIMIT, surface_conditioning};
use crate::nurbs::interpolate::{Parametrization, check_points_finite, interpolation_parameters};
use crate::nurbs::{NurbsCurve, SpanHint};
use crate::paths::curve_on_surface::SampleError;
use crate::surface::{SurfaceHint, SurfaceSource};

/// How many of the nearest grid nodes the coarse search starts Newton's method from.
pub const GRID_CANDIDATES: usize = 4;

/// The zero-cosine threshold ε₂ of the convergence test (see the module docs).
pub const ZERO_COSINE: f64 = 1e-12;

/// The relative point-coincidence threshold: ε₁ = this × the surface's size (+ round-off of P).
pub const RELATIVE_COINCIDENCE: f64 = 1e-14;

/// Options of point inversion.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ProjectionOptions {
    /// The largest accepted distance |S(u, v) − P| from a point to the surface, in the host's
    /// length unit; positive (may be `f64::INFINITY` to accept any distance).
    pub tolerance: f64,
    /// u is periodic (the surface closes across u = u_min / u_max).
    pub periodic_u: bool,
    /// v is periodic.
    pub periodic_v: bool,
    /// Grid cells per direction of the coarse search (2..=1000; default 16).
    pub grid: usize,
    /// Iteration cap of Newton's method per start (1..=1000; default 40).
    pub max_iterations: usize,
}

impl ProjectionOptions {
    /// Options with the given tolerance, no periodic direction, a 16 × 16 grid and 40
    /// iterations at most.
    pub fn new(tolerance: f64) -> Self {
        ProjectionOptions {
            tolerance,
            periodic_u: false,
            periodic_v: false,
            grid: 16,
            max_iterations: 40,
        }
    }

    /// The same options with u and v declared periodic or not.
    pub fn periodic(mut self, u: bool, v: bool) -> Self {
        self.periodic_u = u;
        self.periodic_v = v;
        self
    }

    /// Fails with `InvalidArgument` naming the field unless every option is in range.
    pub fn check(&self) -> Result<()> {
        if self.tolerance.is_nan() || self.tolerance <= 0.0 {
            return Err(StrakeError::InvalidArgument(format!(
                "projection tolerance = {}: it must be positive",
                crate::numfmt::Exact(self.tolerance)
            )));
        }
        if !(2..=1000).contains(&self.grid) {
            return Err(StrakeError::InvalidArgument(format!(
                "projection grid = {}: it must lie in 2..=1000",
                self.grid
            )));
        }
        if !(1..=1000).contains(&self.max_iterations) {
            return Err(StrakeError::InvalidArgument(format!(
                "projection max_iterations = {}: it must lie in 1..=1000",
                self.max_iterations
            )));
        }
        Ok(())
    }
}

/// The foot point of one projected point.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Projection {
    /// Surface parameter u of the foot point, inside the u domain.
    pub u: f64,
    /// Surface parameter v of the foot point, inside the v domain.
    pub v: f64,
    /// u continued along the batch: equal to `u` up to whole periods in a periodic direction,
    /// chosen so that consecutive points do not jump across the seam. Equal to `u` in an open
    /// direction and for a single point.
    pub u_path: f64,
    /// v continued along the batch (as `u_path`).
    pub v_path: f64,
    /// The foot point S(u, v).
    pub foot: Vec3,
    /// Distance |S(u, v) − P| (host length unit).
    pub distance: f64,
    /// Signed distance (P − S)·N, positive on the side N points to.
    pub signed_distance: f64,
    /// Newton iterations spent on the start that was kept.
    pub iterations: usize,
}

struct Newton {
    u: f64,
    v: f64,
    jet: SurfaceJet,
    distance: f64,
    iterations: usize,
    converged: bool,
}

/// Projects points onto one surface, one after the other, with continuation from the previous
/// foot point. Holds the coarse search grid; build one per batch (or per path) and call
/// [`Projector::project`] for each point in path order.
pub struct Projector<'a, S: SurfaceSource + ?Sized> {
    surface: &'a S,
    opts: ProjectionOptions,
    u_dom: Interval,
    v_dom: Interval,
    size: f64,
    grid: Vec<(f64, f64, Vec3)>,
    hint: SurfaceHint,
    last: Option<(f64, f64)>,
}

impl<'a, S: SurfaceSource + ?Sized> Projector<'a, S> {
    /// Validates the options and evaluates the coarse search grid.
    ///
    /// Errors: `InvalidArgument` for bad options; any error of the surface at a grid node.
    pub fn new(surface: &'a S, opts: ProjectionOptions) -> Result<Self> {
        opts.check()?;
        let (u_dom, v_dom) = (surface.u_domain(), surface.v_domain());
        let g = opts.grid;
        let nu = if opts.periodic_u { g } else { g + 1 };
        let nv = if opts.periodic_v { g } else { g + 1 };
        let mut grid = Vec::with_capacity(nu * nv);
        let mut hint = SurfaceHint::default();
        let (mut lo, mut hi) = (Vec3::repeat(f64::INFINITY), Vec3::repeat(f64::NEG_INFINITY));
        for i in 0..nu {
            let u = u_dom.even(i, g + 1);
            for j in 0..nv {
                let v = v_dom.even(j, g + 1);
                let p = surface
                    .checked_jet(u, v, DerivOrder::Position, &mut hint)?
                    .p;
                lo = lo.inf(&p);
                hi = hi.sup(&p);
                grid.push((u, v, p));
            }
        }
        let size = (hi - lo).norm();
        Ok(Projector {
            surface,
            opts,
            u_dom,
            v_dom,
            size,
            grid,
            hint,
            last: None,
        })
    }

    /// The diagonal of the bounding box of the search grid: the surface's size against which
    /// the coincidence threshold is set.
    pub fn size(&self) -> f64 {
        self.size
    }

    /// Forgets the previous foot point: the next point starts from the coarse search.
    pub fn reset(&mut self) {
        self.last = None;
    }

    #[inline]
    fn wrap(x: f64, d: Interval, periodic: bool) -> f64 {
        if periodic {
            d.lo + (x - d.lo).rem_euclid(d.width())
        } else {
            x
        }
    }

    fn eval(&mut self, u: f64, v: f64, order: DerivOrder) -> Result<SurfaceJet> {
        let uw = Self::wrap(u, self.u_dom, self.opts.periodic_u);
        let vw = Self::wrap(v, self.v_dom, self.opts.periodic_v);
        self.surface.checked_jet(uw, vw, order, &mut self.hint)
    }

    #[inline]
    fn constrain(x: f64, d: Interval, periodic: bool) -> f64 {
        if periodic { x } else { x.clamp(d.lo, d.hi) }
    }

    fn newton(&mut self, p: &Vec3, u0: f64, v0: f64, eps1: f64) -> Result<Newton> {
        let (per_u, per_v) = (self.opts.periodic_u, self.opts.periodic_v);
        let (ud, vd) = (self.u_dom, self.v_dom);
        let mut u = Self::constrain(u0, ud, per_u);
        let mut v = Self::constrain(v0, vd, per_v);
        let mut jet = self.eval(u, v, DerivOrder::Second)?;
        let noise = 8.0 * f64::EPSILON * (p.amax() + jet.p.amax());
        let mut r = jet.p - p;
        let mut d = length(&r);
        let done = |u, v, jet, distance, iterations, converged| {
            Ok(Newton {
                u,
                v,
                jet,
                distance,
                iterations,
                converged,
            })
        };
        for it in 0..self.opts.max_iterations {
            if d <= eps1 {
                return done(u, v, jet, d, it, true);
            }
            let (su, sv) = (jet.su, jet.sv);
            let (gu, gv) = (su.dot(&r), sv.dot(&r));
            let active_u = !per_u && ((u <= ud.lo && gu > 0.0) || (u >= ud.hi && gu < 0.0));
            let active_v = !per_v && ((v <= vd.lo && gv > 0.0) || (v >= vd.hi && gv < 0.0));
            let (nsu, nsv) = (su.norm(), sv.norm());
            let flat_u = active_u || gu.abs() <= ZERO_COSINE * nsu * d;
            let flat_v = active_v || gv.abs() <= ZERO_COSINE * nsv * d;
            if flat_u && flat_v {
                return done(u, v, jet, d, it, true);
            }
            let (e, f, g) = (su.dot(&su), su.dot(&sv), sv.dot(&sv));
            let h11 = e + r.dot(&jet.suu);
            let h12 = f + r.dot(&jet.suv);
            let h22 = g + r.dot(&jet.svv);
            let (du, dv) = if active_u {
                (0.0, -gv / if h22 > 0.0 { h22 } else { g })
            } else if active_v {
                (-gu / if h11 > 0.0 { h11 } else { e }, 0.0)
            } else {
                let det = h11 * h22 - h12 * h12;
                let gram = e * g - f * f;
                if h11 > 0.0 && det > 0.0 {
                    ((-h22 * gu + h12 * gv) / det, (h12 * gu - h11 * gv) / det)
                } else if gram > 1e-12 * e * g {
                    ((-g * gu + f * gv) / gram, (f * gu - e * gv) / gram)
                } else {
                    // Su ∥ Sv or one of them zero (a pole): steepest descent, scaled.
                    let s = e + g;
                    (-gu / s, -gv / s)
                }
            };
            if !(du.is_finite() && dv.is_finite()) {
                // No usable step from here (e.g. a collapsed edge): this start fails.
                return done(u, v, jet, d, it + 1, false);
            }
            // Halve the step until |r| does not grow, or until it is shorter than ε₁.
            let mut lambda = 1.0;
            loop {
                let un = Self::constrain(u + lambda * du, ud, per_u);
                let vn = Self::constrain(v + lambda * dv, vd, per_v);
                let step = (su * (un - u) + sv * (vn - v)).norm();
                let jn = self.eval(un, vn, DerivOrder::Second)?;
                let rn = jn.p - p;
                let dn = length(&rn);
                // A growth within the round-off of |r| counts as no growth: near the foot
                // point |r| is flat to second order and its rounding would block the last,
                // most accurate steps.
                if dn <= d + noise || step <= eps1 {
                    u = un;
                    v = vn;
                    jet = jn;
                    r = rn;
                    d = dn;
                    if step <= eps1 {
                        return done(u, v, jet, d, it + 1, true);
                    }
                    break;
                }
                lambda *= 0.5;
            }
        }
        done(u, v, jet, d, self.opts.max_iterations, false)
    }

    /// Projects `p`: from the previous foot point if there is one, else (or when that fails)
    /// from the coarse search. Allocates nothing.
    ///
    /// Errors: `NonFinite` for a non-finite coordinate of `p`; `NotConverged` when no start
    /// converges within the iteration cap; `TooFarFromSurface` when the foot point found is
    /// farther than the tolerance; `DegenerateSurface` when the normal at the foot point is
    /// undefined (a pole), so that the signed distance is; any error of the surface.
    pub fn project(&mut self, p: [f64; 3]) -> Result<Projection> {
        check_points_finite(&[p]).map_err(|e| match e {
            StrakeError::AtPoint { error, .. } => *error,
            other => other,
        })?;
        let pv = vec3(p);
        let eps1 = RELATIVE_COINCIDENCE * self.size + 8.0 * f64::EPSILON * pv.amax();
        let mut best: Option<Newton> = None;
        if let Some((u0, v0)) = self.last {
            let n = self.newton(&pv, u0, v0, eps1)?;
            if n.converged && n.distance <= self.opts.tolerance {
                best = Some(n);
            }
        }
        let mut spent = 0;
        if best.is_none() {
            // The nearest grid nodes, kept sorted in a fixed array.
            let mut cand = [(f64::INFINITY, 0.0, 0.0); GRID_CANDIDATES];
            for &(u, v, q) in &self.grid {
                let d = (q - pv).norm_squared();
                if d < cand[GRID_CANDIDATES - 1].0 {
                    let mut k = GRID_CANDIDATES - 1;
                    while k > 0 && cand[k - 1].0 > d {
                        cand[k] = cand[k - 1];
                        k -= 1;
                    }
                    cand[k] = (d, u, v);
                }
            }
            let mut fallback: Option<Newton> = None;
            for &(d, u, v) in &cand {
                if !d.is_finite() {
                    continue;
                }
                let n = self.newton(&pv, u, v, eps1)?;
                spent += n.iterations;
                let slot = if n.converged {
                    &mut best
                } else {
                    &mut fallback
                };
                if slot.as_ref().is_none_or(|b| n.distance < b.distance) {
                    *slot = Some(n);
                }
            }
            let Some(b) = best.as_mut() else {
                let (d, u, v) = fallback.map(|n| (n.distance, n.u, n.v)).unwrap_or((
                    f64::NAN,
                    f64::NAN,
                    f64::NAN,
                ));
                return Err(StrakeError::NotConverged {
                    what: format!(
                        "Newton's method for point inversion from the {GRID_CANDIDATES} nearest \
                         grid nodes (best distance {d} at (u, v) = ({u}, {v}))",
                        d = crate::numfmt::Num(d),
                        u = crate::numfmt::Exact(u),
                        v = crate::numfmt::Exact(v)
                    ),
                    iterations: spent,
                });
            };
            // Continue across seams: the whole period nearest to the previous foot point.
            if let Some((lu, lv)) = self.last {
                if self.opts.periodic_u {
                    let w = self.u_dom.width();
                    b.u += w * ((lu - b.u) / w).round();
                }
                if self.opts.periodic_v {
                    let w = self.v_dom.width();
                    b.v += w * ((lv - b.v) / w).round();
                }
            }
        }
        let b = best.expect("set above");
        let uw = Self::wrap(b.u, self.u_dom, self.opts.periodic_u);
        let vw = Self::wrap(b.v, self.v_dom, self.opts.periodic_v);
        if !b.distance.is_finite() {
            // A point so far out (coordinates near ±DBL_MAX) that |S − P| overflows: no
            // distance to report, never an infinite one under OK.
            return Err(StrakeError::NonFinite {
                source: crate::error::NonFiniteSource::Result,
                what: "distance |S - P| from the point to the surface",
                value: b.distance,
            });
        }
        if b.distance > self.opts.tolerance {
            return Err(StrakeError::TooFarFromSurface {
                distance: b.distance,
                tolerance: self.opts.tolerance,
                u: uw,
                v: vw,
            });
        }
        let cross = b.jet.su.cross(&b.jet.sv);
        let area = cross.norm();
        let cond = surface_conditioning(&b.jet, area, self.u_dom.width(), self.v_dom.width());
        if cond.is_nan() || cond < DEGENERATE_SURFACE_LIMIT {
            return Err(StrakeError::DegenerateSurface {
                u: uw,
                v: vw,
                conditioning: cond,
            });
        }
        let n = cross * (self.surface.orientation().sign() / area);
        self.last = Some((b.u, b.v));
        Ok(Projection {
            u: uw,
            v: vw,
            u_path: b.u,
            v_path: b.v,
            foot: b.jet.p,
            distance: b.distance,
            // |(P − S)·N| ≤ |P − S|, also where |P − S| underflowed to 0 (a denormal gap).
            signed_distance: (pv - b.jet.p).dot(&n).clamp(-b.distance, b.distance),
            iterations: b.iterations + spent,
        })
    }
}

/// |r| without overflow where the sum of squares overflows but the length does not (a point
/// 1e300 from the surface): scaled by the largest component first (exact for powers of two,
/// to round-off otherwise). The plain `norm` elsewhere, where it is the same bits.
#[inline]
fn length(r: &Vec3) -> f64 {
    let n = r.norm();
    if n.is_finite() {
        return n;
    }
    let m = r.amax();
    if m.is_finite() && m > 0.0 {
        m * (r / m).norm()
    } else {
        n
    }
}

fn at_point(index: usize, error: StrakeError) -> StrakeError {
    StrakeError::AtPoint {
        index,
        error: Box::new(error),
    }
}

/// Projects `points` (in path order) onto `surface`, writing one [`Projection`] per point into
/// `out` (same length). The C-friendly form: no allocation besides the search grid.
///
/// Errors: `InvalidArgument` for bad options or mismatched lengths; every per-point error of
/// [`Projector::project`] wrapped as `AtPoint { index, .. }`, `index` being the point's index.
/// `out` is partly written on failure.
pub fn project_points_into<S: SurfaceSource + ?Sized>(
    surface: &S,
    points: &[[f64; 3]],
    opts: &ProjectionOptions,
    out: &mut [Projection],
) -> Result<()> {
    if points.len() != out.len() {
        return Err(StrakeError::InvalidArgument(format!(
            "{} points but room for {} projections",
            points.len(),
            out.len()
        )));
    }
    let mut pr = Projector::new(surface, *opts)?;
    for (index, (p, o)) in points.iter().zip(out.iter_mut()).enumerate() {
        *o = pr.project(*p).map_err(|e| at_point(index, e))?;
    }
    Ok(())
}

/// Projects `points` (in path order) onto `surface`: one [`Projection`] per point. See
/// [`project_points_into`] for the errors.
pub fn project_points<S: SurfaceSource + ?Sized>(
    surface: &S,
    points: &[[f64; 3]],
    opts: &ProjectionOptions,
) -> Result<Vec<Projection>> {
    let mut pr = Projector::new(surface, *opts)?;
    points
        .iter()
        .enumerate()
        .map(|(index, p)| pr.project(*p).map_err(|e| at_point(index, e)))
        .collect()
}

/// A curve in the parameter plane whose u and/or v are read modulo a surface's period.
///
/// The underlying [`NurbsCurve<2>`] is continuous (unwrapped across seams, see
/// [`Projection::u_path`]); each evaluation wraps u into `u_period` and v into `v_period`
/// (lo + (x − lo) mod width), derivatives unchanged. Without periods it is the curve itself.
#[derive(Debug, Clone, PartialEq)]
pub struct SeamCurve {
    curve: NurbsCurve<2>,
    u_period: Option<Interval>,
    v_period: Option<Interval>,
}

impl SeamCurve {
    /// Wraps `curve`'s u into `u_period` and v into `v_period` when given.
    pub fn new(
        curve: NurbsCurve<2>,
        u_period: Option<Interval>,
        v_period: Option<Interval>,
    ) -> Self {
        SeamCurve {
            curve,
            u_period,
            v_period,
        }
    }

    /// The continuous (unwrapped) curve.
    pub fn curve(&self) -> &NurbsCurve<2> {
        &self.curve
    }

    /// The period interval of u, if u is periodic.
    pub fn u_period(&self) -> Option<Interval> {
        self.u_period
    }

    /// The period interval of v, if v is periodic.
    pub fn v_period(&self) -> Option<Interval> {
        self.v_period
    }
}

impl UvCurve for SeamCurve {
    fn domain(&self) -> Interval {
        self.curve.domain()
    }
    fn breakpoints(&self) -> &[f64] {
        self.curve.breakpoints()
    }
    #[inline]
    fn jet_in_domain(&self, t: f64, hint: &mut SpanHint) -> Result<CurveJet> {
        let mut j = self.curve.jet_in_domain(t, hint)?;
        self.wrap(&mut j);
        Ok(j)
    }
    fn jets_in_domain_block(
        &self,
        ts: &[f64],
        hint: &mut SpanHint,
        out: &mut [CurveJet],
    ) -> Result<()> {
        let r = self.curve.jets_in_domain_block(ts, hint, out);
        // The lanes before a failing point are used by the caller too.
        for j in out
            .iter_mut()
            .take(crate::curve::lanes_written(&r, ts.len()))
        {
            self.wrap(j);
        }
        r
    }
    fn max_order(&self) -> usize {
        self.curve.max_order()
    }
    /// The unwrapped curve's derivatives (wrapping shifts u and v only), u and v wrapped.
    fn partials_in_domain(
        &self,
        t: f64,
        order: usize,
        hint: &mut SpanHint,
    ) -> Result<crate::geometry::jet::CurvePartials> {
        let mut p = self.curve.partials_in_domain(t, order, hint)?;
        let mut j = p.jet();
        self.wrap(&mut j);
        (p.u[0], p.v[0]) = (j.u, j.v);
        Ok(p)
    }
}

impl SeamCurve {
    /// Wraps u and v of a jet of the unwrapped curve into their periods.
    #[inline]
    fn wrap(&self, j: &mut CurveJet) {
        if let Some(d) = self.u_period {
            j.u = d.lo + (j.u - d.lo).rem_euclid(d.width());
        }
        if let Some(d) = self.v_period {
            j.v = d.lo + (j.v - d.lo).rem_euclid(d.width());
        }
    }
}

/// How the parameter-plane curve is fitted through projected points.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FitOptions {
    /// Degree of the interpolating curve (default 3: a C2 cubic).
    pub degree: usize,
    /// Parameters of the interpolation (default chord length, in the parameter plane).
    pub parametrization: Parametrization,
}

impl Default for FitOptions {
    fn default() -> Self {
        FitOptions {
            degree: 3,
            parametrization: Parametrization::ChordLength,
        }
    }
}

/// A curve on the surface built from points or a curve in space.
#[derive(Debug, Clone, PartialEq)]
pub struct ProjectedCurve {
    /// The curve in the parameter plane (t in [0, 1]), wrapped across the declared seams.
    pub curve: SeamCurve,
    /// The foot points the curve interpolates, in order.
    pub projections: Vec<Projection>,
    /// The curve parameter t at which the curve passes through each foot point.
    pub params: Vec<f64>,
}

fn periods<S: SurfaceSource + ?Sized>(
    s: &S,
    opts: &ProjectionOptions,
) -> (Option<Interval>, Option<Interval>) {
    (
        opts.periodic_u.then(|| s.u_domain()),
        opts.periodic_v.then(|| s.v_domain()),
    )
}

pub(crate) fn fit_projections<S: SurfaceSource + ?Sized>(
    surface: &S,
    projections: Vec<Projection>,
    opts: &ProjectionOptions,
    fit: &FitOptions,
) -> Result<ProjectedCurve> {
    let uv: Vec<[f64; 2]> = projections.iter().map(|p| [p.u_path, p.v_path]).collect();
    let params = interpolation_parameters(&uv, fit.parametrization)?;
    let curve =
        crate::nurbs::interpolate::interpolate_with_parameters(&uv, &params, fit.degree, None)?;
    let (pu, pv) = periods(surface, opts);
    Ok(ProjectedCurve {
        curve: SeamCurve::new(curve, pu, pv),
        projections,
        params,
    })
}

/// Projects `points` (in path order) onto `surface` and interpolates their foot points by a
/// curve in the parameter plane (through the continued parameters `u_path`, `v_path`, so a path
/// crossing a declared seam stays continuous).
///
/// Errors: those of [`project_points`], then those of
/// [`crate::nurbs::interpolate::interpolate`] (too few points for the degree; two consecutive
/// points with the same foot point are refused as `AtPoint { index, .. }`).
pub fn uv_curve_through_points<S: SurfaceSource + ?Sized>(
    surface: &S,
    points: &[[f64; 3]],
    opts: &ProjectionOptions,
    fit: &FitOptions,
) -> Result<ProjectedCurve> {
    // Checked before projecting, so that a short list is not reported as something else.
    crate::nurbs::interpolate::check_degree(points.len(), fit.degree, false)?;
    let projections = project_points(surface, points, opts)?;
    fit_projections(surface, projections, opts, fit)
}

/// Most samples [`project_curve`] takes before giving up.
pub const MAX_CURVE_SAMPLES: usize = 100_000;

/// Projects a curve in space onto `surface` and fits a curve in the parameter plane to it.
///
/// Sampling: each non-empty knot span of `curve` is first cut into max(4, 2p) equal parameter
/// steps (p its degree); the samples are projected (with continuation) and interpolated
/// ([`FitOptions`]). Then, for each interval between consecutive samples, the midpoint of the
/// space curve is projected and its distance to the fitted curve on the surface is measured
/// (a few steps of Newton's method for the nearest point of S(u(t), v(t)) within the interval);
/// every interval where it exceeds `fit_tolerance` is halved, and the fit is repeated until no
/// interval exceeds it, at most [`MAX_CURVE_SAMPLES`] samples. The fitted curve's parameter t
/// runs over [0, 1] (chord length in the parameter plane), not over the space curve's
/// parameter. Interpolation is C2 (for a cubic): a space curve with corners is best split at
/// them by the host, since near a corner the fit converges only linearly.
///
/// Errors (`index` = sample number, or for a midpoint check the number of the sample that
/// starts the interval; `t` = parameter of `curve` there): every error of
/// [`Projector::project`] (`TooFarFromSurface`, `NotConverged`, …); `InvalidArgument` when the
/// fit tolerance is not positive or below the resolution of the curve's coordinates
/// ([`crate::paths::sampling::RESOLUTION_ULPS`] ulps of its largest coordinate, refused before
/// any projection), or when the fit is still outside it at the sample cap;
/// interpolation errors.
pub fn project_curve<S: SurfaceSource + ?Sized>(
    surface: &S,
    curve: &NurbsCurve<3>,
    opts: &ProjectionOptions,
    fit: &FitOptions,
    fit_tolerance: f64,
) -> std::result::Result<ProjectedCurve, SampleError> {
    let whole = |error| SampleError {
        index: 0,
        t: f64::NAN,
        error,
    };
    if fit_tolerance.is_nan() || fit_tolerance <= 0.0 {
        return Err(whole(StrakeError::InvalidArgument(format!(
            "fit tolerance = {}: it must be positive",
            crate::numfmt::Num(fit_tolerance)
        ))));
    }
    let kv = curve.knot_vector();
    let p = kv.degree();
    let knots = kv.knots();
    let per_span = (2 * p).max(4);
    let mut ts: Vec<f64> = Vec::new();
    for i in p..kv.count() {
        let (a, b) = (knots[i], knots[i + 1]);
        if b > a {
            for k in 0..per_span {
                ts.push(a + (b - a) * (k as f64 / per_span as f64));
            }
        }
    }
    ts.push(curve.domain().hi);
    let mut hint = SpanHint::default();
    // A fit tolerance below what the curve's coordinates resolve cannot be met: refused at
    // once rather than after halving the intervals down to the sample cap (a denormal
    // tolerance took 40 s).
    let mut size = 0.0_f64;
    for (index, &t) in ts.iter().enumerate() {
        let q = curve
            .derivs(t, DerivOrder::Position, &mut hint)
            .map_err(|error| SampleError { index, t, error })?
            .p;
        size = size.max(q.iter().fold(0.0_f64, |m, x| m.max(x.abs())));
    }
    let resolution = crate::paths::sampling::RESOLUTION_ULPS * f64::EPSILON * size;
    if fit_tolerance < resolution {
        return Err(whole(StrakeError::InvalidArgument(format!(
            "fit tolerance = {}: below what the curve's coordinates (up to {}) resolve in f64, \
             {} ulps = {}; it cannot be met",
            crate::numfmt::Num(fit_tolerance),
            crate::numfmt::Num(size),
            crate::paths::sampling::RESOLUTION_ULPS,
            crate::numfmt::Num(resolution)
        ))));
    }
    let mut pr = Projector::new(surface, *opts).map_err(whole)?;
    loop {
        pr.reset();
        let mut projections = Vec::with_capacity(ts.len());
        for (index, &t) in ts.iter().enumerate() {
            let q = curve
                .derivs(t, DerivOrder::Position, &mut hint)
                .map_err(|error| SampleError { index, t, error })?
                .p;
            let pj = pr
                .project(q)
                .map_err(|error| SampleError { index, t, error })?;
            projections.push(pj);
        }
        let fitted = fit_projections(surface, projections, opts, fit).map_err(|e| match e {
            StrakeError::AtPoint { index, error } => SampleError {
                index,
                t: ts[index],
                error: *error,
            },
            other => whole(other),
        })?;
        // Check each interval at its midpoint.
        let mut refined = Vec::with_capacity(ts.len() * 2);
        let mut split = 0;
        let mut worst = 0.0_f64;
        for k in 0..ts.len() - 1 {
            refined.push(ts[k]);
            let tm = 0.5 * (ts[k] + ts[k + 1]);
            let q = curve
                .derivs(tm, DerivOrder::Position, &mut hint)
                .map_err(|error| SampleError {
                    index: k,
                    t: tm,
                    error,
                })?
                .p;
            let foot = pr
                .project(q)
                .map_err(|error| SampleError {
                    index: k,
                    t: tm,
                    error,
                })?
                .foot;
            let dev = distance_to_fitted(
                surface,
                &fitted.curve,
                fitted.params[k],
                fitted.params[k + 1],
                &foot,
            )
            .map_err(|error| SampleError {
                index: k,
                t: tm,
                error,
            })?;
            worst = worst.max(dev);
            if dev > fit_tolerance {
                refined.push(tm);
                split += 1;
            }
        }
        refined.push(ts[ts.len() - 1]);
        if split == 0 {
            return Ok(fitted);
        }
        if refined.len() > MAX_CURVE_SAMPLES {
            return Err(whole(StrakeError::InvalidArgument(format!(
                "the fit of the projected curve is still {worst} away (fit tolerance \
                 {fit_tolerance}) at {} samples; split the curve at its corners or loosen \
                 the fit tolerance",
                ts.len(),
                worst = crate::numfmt::Num(worst),
                fit_tolerance = crate::numfmt::Num(fit_tolerance)
            ))));
        }
        ts = refined;
    }
}

/// Distance from `x` to the curve S(u(t), v(t)) for t in [a, b]: Newton's method on
/// ½|c(t) − x|² started at the midpoint, clamped to [a, b], 8 steps at most (enough for the
/// nearly-quadratic convergence near a foot point), compared with the ends.
pub(crate) fn distance_to_fitted<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    surface: &S,
    curve: &C,
    a: f64,
    b: f64,
    x: &Vec3,
) -> Result<f64> {
    let mut hint = SpanHint::default();
    let mut sh = SurfaceHint::default();
    let mut at = |t: f64, order| -> Result<(Vec3, Vec3, Vec3)> {
        let cj = curve.checked_jet(t, &mut hint)?;
        let sj = surface.checked_jet(cj.u, cj.v, order, &mut sh)?;
        let c1 = sj.su * cj.du + sj.sv * cj.dv;
        let c2 = sj.suu * (cj.du * cj.du)
            + sj.suv * (2.0 * cj.du * cj.dv)
            + sj.svv * (cj.dv * cj.dv)
            + sj.su * cj.ddu
            + sj.sv * cj.ddv;
        Ok((sj.p, c1, c2))
    };
    let mut best = (at(a, DerivOrder::Position)?.0 - x)
        .norm()
        .min((at(b, DerivOrder::Position)?.0 - x).norm());
    let mut t = 0.5 * (a + b);
    for _ in 0..8 {
        let (c, c1, c2) = at(t, DerivOrder::Second)?;
        let r = c - x;
        best = best.min(r.norm());
        let g = r.dot(&c1);
        let h = c1.dot(&c1) + r.dot(&c2);
        let h = if h > 0.0 { h } else { c1.dot(&c1) };
        let tn = (t - g / h).clamp(a, b);
        if tn == t || !tn.is_finite() {
            break;
        }
        t = tn;
    }
    let (c, _, _) = at(t, DerivOrder::Position)?;
    Ok(best.min((c - x).norm()))
}
