//! First passes laid on a surface by projecting a planar pattern along a direction: each point
//! of a curve drawn in a plane (parallel lines, a spiral, or any curve of the host) is carried
//! along a fixed direction d until its ray meets the surface; the hits, in order, make a curve
//! on the surface (a curve in its parameter plane, like every other curve of strake).
//!
//! **The ray and the hit.** A pattern point (x, y) is the space point P = O + x X + y Y of the
//! plane ([`DrivePlane`]); its ray is the whole line P + λ d (λ of either sign, d unit), so the
//! result does not depend on where the plane sits along d. A hit solves
//! F(u, v, λ) = S(u, v) − P − λ d = 0 by Newton's method on (u, v, λ) with the Jacobian
//! [Su Sv −d] (Cramer's rule; singular where the ray is tangent to the surface, d·N = 0), the
//! step halved while |F| grows, u and v clamped to the domain in an open direction and kept
//! unwrapped in a periodic one (seams as in [`crate::paths::projection`]). A start converges
//! when |F| ≤ ε₁ (ε₁ = 1e-14 × the surface's size + round-off of P, as for point inversion) or
//! when the step has become shorter than ε₁ with |F| within the projection tolerance.
//!
//! **The start, and which hit is taken.** The surface is tessellated once, at construction, on
//! the (grid + 1)² nodes of [`ProjectionOptions::grid`], and the nodes are projected onto the
//! plane across d. Every cell triangle whose projection contains the ray's foot (enlarged by a
//! quarter of its size, so that hits near a silhouette, where the triangles are thin, are not
//! lost) gives a start, interpolated barycentrically in (u, v, λ). All converged hits are kept
//! (two within 1e-9 × the size of each other are one hit). **The hit taken is the first along
//! d: the smallest λ.** A ray that meets the surface more than once is reported in a
//! [`PatternIntervalKind::SeveralHits`] interval; a ray that meets it nowhere (within the
//! domain) in a [`PatternIntervalKind::Miss`] interval.
//!
//! **Pieces and folds.** The pattern is sampled ([`DriveOptions::samples`] even parameters).
//! Two neighbouring hits belong to one piece when Newton's method started from each one's
//! (u, v, λ) on the other's ray lands on the other (continuation): the first hit then moves
//! continuously. Where it does not, the pattern interval is bisected down to
//! [`DriveOptions::locate_tolerance`] (relative to the pattern's domain): the image of the
//! pattern breaks there. A break with no hit in its middle is a miss; a break where the first
//! hit jumps to another part of the surface (the pattern's image turning back over a
//! silhouette, where the ray grazes the surface and a farther sheet takes over, or a nearer
//! sheet appearing) is a [`PatternIntervalKind::Fold`]. Each piece is fitted by a C2 cubic in
//! the parameter plane through its hits (as [`crate::paths::projection::project_curve`]), the
//! sample intervals halved until the first hit at every interval's midpoint lies within
//! [`DriveOptions::fit_tolerance`] of the fitted curve.
//!
//! **What it does not see.** A hole, a miss or a fold narrower than the sample spacing that
//! neither the continuation test nor the midpoint test meets is not found: the sampling is the
//! resolution. A second hit that no triangle of the coarse tessellation contains (a sliver of
//! surface thinner than a grid cell seen along d) is not found either. The ends of
//! `SeveralHits` intervals are located to the sample spacing only; those of misses and folds
//! to the locate tolerance.

use crate::curve::UvCurve;
use crate::error::{Result, StrakeError};
use crate::geometry::jet::{CurveJet, DerivOrder, Interval, SurfaceJet};
use crate::geometry::math::{Vec3, vec3};
use crate::nurbs::SpanHint;
use crate::paths::curve_on_surface::SampleError;
use crate::paths::projection::{
    FitOptions, MAX_CURVE_SAMPLES, Projection, ProjectionOptions, RELATIVE_COINCIDENCE, SeamCurve,
    distance_to_fitted, fit_projections,
};
use crate::surface::{SurfaceHint, SurfaceSource};

/// A plane in space with coordinates: the pattern point (x, y) is O + x X + y Y.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DrivePlane {
    origin: Vec3,
    x_axis: Vec3,
    y_axis: Vec3,
}

impl DrivePlane {
    /// The plane through `origin` with axes `x_axis` and `y_axis` (host length unit per unit of
    /// x and y; they need not be unit or orthogonal, only independent).
    ///
    /// Errors: `NonFinite` for a non-finite coordinate; `InvalidArgument` when the axes are
    /// parallel or one is zero (|X × Y| ≤ 1e-12 |X| |Y|).
    pub fn new(origin: [f64; 3], x_axis: [f64; 3], y_axis: [f64; 3]) -> Result<Self> {
        for (what, a) in [
            ("plane origin", origin),
            ("plane x axis", x_axis),
            ("plane y axis", y_axis),
        ] {
            if let Some(&bad) = a.iter().find(|c| !c.is_finite()) {
                return Err(StrakeError::NonFinite {
                    source: crate::error::NonFiniteSource::Parameter,
                    what,
                    value: bad,
                });
            }
        }
        let (x, y) = (vec3(x_axis), vec3(y_axis));
        let area = x.cross(&y).norm();
        if area.is_nan() || area <= 1e-12 * x.norm() * y.norm() || area == 0.0 {
            return Err(StrakeError::InvalidArgument(format!(
                "plane axes x = {} and y = {} are parallel or zero: they must span a plane",
                crate::numfmt::ExactVec(&x_axis),
                crate::numfmt::ExactVec(&y_axis)
            )));
        }
        Ok(DrivePlane {
            origin: vec3(origin),
            x_axis: x,
            y_axis: y,
        })
    }

    /// The space point of the pattern point (x, y).
    #[inline]
    pub fn point(&self, x: f64, y: f64) -> Vec3 {
        self.origin + self.x_axis * x + self.y_axis * y
    }
}

/// Options of the projection of a pattern along a direction.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct DriveOptions {
    /// Tolerance (largest |F| accepted when Newton's steps stall), periodic directions, grid of
    /// the tessellation and iteration cap per start, as for point inversion.
    pub projection: ProjectionOptions,
    /// Even samples of the pattern's parameter to start from (≥ 2; default 64).
    pub samples: usize,
    /// Largest distance from the first hit at an interval's midpoint to the fitted curve
    /// (host length unit; positive).
    pub fit_tolerance: f64,
    /// Width, relative to the pattern's domain, to which the ends of misses and folds are
    /// located (in (0, 0.1]; default 1e-9).
    pub locate_tolerance: f64,
}

impl DriveOptions {
    /// 64 samples, the given hit and fit tolerances, locate tolerance 1e-9, a 16 × 16 grid.
    pub fn new(tolerance: f64, fit_tolerance: f64) -> Self {
        DriveOptions {
            projection: ProjectionOptions::new(tolerance),
            samples: 64,
            fit_tolerance,
            locate_tolerance: 1e-9,
        }
    }

    /// Fails with `InvalidArgument` naming the field unless every option is in range.
    pub fn check(&self) -> Result<()> {
        self.projection.check()?;
        if !(2..=MAX_CURVE_SAMPLES).contains(&self.samples) {
            return Err(StrakeError::InvalidArgument(format!(
                "drive samples = {}: it must lie in 2..={MAX_CURVE_SAMPLES}",
                self.samples
            )));
        }
        if !(self.fit_tolerance.is_finite() && self.fit_tolerance > 0.0) {
            return Err(StrakeError::InvalidArgument(format!(
                "drive fit_tolerance = {}: it must be positive and finite",
                crate::numfmt::Exact(self.fit_tolerance)
            )));
        }
        if !(self.locate_tolerance > 0.0 && self.locate_tolerance <= 0.1) {
            return Err(StrakeError::InvalidArgument(format!(
                "drive locate_tolerance = {}: it must lie in (0, 0.1]",
                crate::numfmt::Exact(self.locate_tolerance)
            )));
        }
        Ok(())
    }
}

/// One ray's hit on the surface.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RayHit {
    /// Surface parameter u, inside the domain.
    pub u: f64,
    /// Surface parameter v, inside the domain.
    pub v: f64,
    /// u continued along the piece (unwrapped across a periodic seam).
    pub u_path: f64,
    /// v continued along the piece.
    pub v_path: f64,
    /// The hit S(u, v).
    pub point: Vec3,
    /// λ: signed distance from the pattern point to the hit along the unit direction.
    pub ray_parameter: f64,
    /// |S(u, v) − P − λ d|: how far the hit is from the ray.
    pub residual: f64,
    /// d·N at the hit (N the oriented unit normal): the cosine between the ray and the normal;
    /// near 0 the ray grazes the surface.
    pub cosine: f64,
    /// How many distinct hits the ray has (≥ 1; the one kept is the first along d).
    pub hit_count: usize,
}

/// What happens over an interval of the pattern's parameter.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum PatternIntervalKind {
    /// The rays miss the surface (within its domain).
    Miss,
    /// The first hit jumps: the image of the pattern breaks between two parts of the surface.
    Fold,
    /// The rays meet the surface more than once; the first hit along d is taken.
    SeveralHits,
}

/// An interval of the pattern's parameter with a [`PatternIntervalKind`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PatternInterval {
    /// What happens there.
    pub kind: PatternIntervalKind,
    /// First pattern parameter of the interval.
    pub start: f64,
    /// Last pattern parameter of the interval.
    pub end: f64,
}

/// The curve of a piece: the interpolating curve through the hits, wrapped across declared
/// seams, with (u, v) held on the domain's edge in an open direction. Where a piece runs to the
/// edge of the surface, the interpolant between the last hits may overshoot the edge by a
/// little (less than the fit tolerance in space, which the midpoint test bounds); there the
/// parameter is held on the edge (its derivatives are those of the interpolant).
#[derive(Debug, Clone, PartialEq)]
pub struct PieceCurve {
    curve: SeamCurve,
    u_dom: Interval,
    v_dom: Interval,
}

impl PieceCurve {
    /// The interpolating curve (wrapped across seams, not held on the edges).
    pub fn seam_curve(&self) -> &SeamCurve {
        &self.curve
    }

    #[inline]
    fn hold(&self, j: &mut CurveJet) {
        j.u = j.u.clamp(self.u_dom.lo, self.u_dom.hi);
        j.v = j.v.clamp(self.v_dom.lo, self.v_dom.hi);
    }
}

impl UvCurve for PieceCurve {
    fn domain(&self) -> Interval {
        self.curve.domain()
    }
    fn breakpoints(&self) -> &[f64] {
        self.curve.breakpoints()
    }
    #[inline]
    fn jet_in_domain(&self, t: f64, hint: &mut SpanHint) -> Result<CurveJet> {
        let mut j = self.curve.jet_in_domain(t, hint)?;
        self.hold(&mut j);
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
            self.hold(j);
        }
        r
    }
}

/// A continuous piece of the projected pattern.
#[derive(Debug, Clone, PartialEq)]
pub struct DrivePiece {
    /// The curve in the parameter plane through the hits (t in [0, 1], chord length in the
    /// parameter plane), wrapped across declared seams and held on the domain's edges.
    pub curve: PieceCurve,
    /// The pattern parameter of each hit, ascending.
    pub pattern_params: Vec<f64>,
    /// The curve parameter t at each hit.
    pub params: Vec<f64>,
    /// The hits, in order.
    pub hits: Vec<RayHit>,
}

/// The pattern projected along a direction.
#[derive(Debug, Clone, PartialEq)]
pub struct DriveProjection {
    /// The continuous pieces, in the pattern's order.
    pub pieces: Vec<DrivePiece>,
    /// Misses, folds and multiple hits, ordered by start.
    pub intervals: Vec<PatternInterval>,
}

/// Casts rays of one direction onto one surface: holds the tessellation for the starts.
pub struct RayCaster<'a, S: SurfaceSource + ?Sized> {
    surface: &'a S,
    opts: ProjectionOptions,
    d: Vec3,
    e1: Vec3,
    e2: Vec3,
    u_dom: Interval,
    v_dom: Interval,
    size: f64,
    n: usize,
    // (u, v, point, coordinates across d, coordinate along d) per node, row-major in u.
    nodes: Vec<(f64, f64, Vec3, [f64; 2], f64)>,
    hint: SurfaceHint,
}

/// The most hits of one ray that are kept.
pub const MAX_HITS: usize = 8;

impl<'a, S: SurfaceSource + ?Sized> RayCaster<'a, S> {
    /// Checks the options and the direction, and tessellates the surface.
    ///
    /// Errors: `InvalidArgument` for bad options or a direction of zero length; `NonFinite`
    /// for a non-finite direction; any error of the surface at a node.
    pub fn new(surface: &'a S, direction: [f64; 3], opts: ProjectionOptions) -> Result<Self> {
        opts.check()?;
        if let Some(&bad) = direction.iter().find(|c| !c.is_finite()) {
            return Err(StrakeError::NonFinite {
                source: crate::error::NonFiniteSource::Parameter,
                what: "direction",
                value: bad,
            });
        }
        let d = vec3(direction);
        let len = d.norm();
        if len == 0.0 || !len.is_finite() {
            return Err(StrakeError::InvalidArgument(format!(
                "direction = {} has zero length: it must be a nonzero vector",
                crate::numfmt::ExactVec(&direction)
            )));
        }
        let d = d / len;
        let helper = if d.x.abs() < 0.6 {
            Vec3::x()
        } else {
            Vec3::y()
        };
        let e1 = d.cross(&helper).normalize();
        let e2 = d.cross(&e1);
        let (u_dom, v_dom) = (surface.u_domain(), surface.v_domain());
        let n = opts.grid + 1;
        let mut nodes = Vec::with_capacity(n * n);
        let mut hint = SurfaceHint::default();
        let (mut lo, mut hi) = (Vec3::repeat(f64::INFINITY), Vec3::repeat(f64::NEG_INFINITY));
        for i in 0..n {
            let u = u_dom.even(i, n);
            for j in 0..n {
                let v = v_dom.even(j, n);
                let p = surface
                    .checked_jet(u, v, DerivOrder::Position, &mut hint)?
                    .p;
                lo = lo.inf(&p);
                hi = hi.sup(&p);
                nodes.push((u, v, p, [p.dot(&e1), p.dot(&e2)], p.dot(&d)));
            }
        }
        Ok(RayCaster {
            surface,
            opts,
            d,
            e1,
            e2,
            u_dom,
            v_dom,
            size: (hi - lo).norm(),
            n,
            nodes,
            hint,
        })
    }

    /// The unit direction.
    pub fn direction(&self) -> Vec3 {
        self.d
    }

    /// The diagonal of the bounding box of the tessellation.
    pub fn size(&self) -> f64 {
        self.size
    }

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

    fn constrain(x: f64, d: Interval, periodic: bool) -> f64 {
        if periodic { x } else { x.clamp(d.lo, d.hi) }
    }

    fn eps1(&self, p: &Vec3) -> f64 {
        RELATIVE_COINCIDENCE * self.size + 8.0 * f64::EPSILON * p.amax()
    }

    /// Newton's method for the hit of the ray p + λ d from (u0, v0, λ0); `None` when it does
    /// not converge (the ray misses near there, grazes, or leaves the domain).
    pub fn hit_from(&mut self, p: Vec3, u0: f64, v0: f64, l0: f64) -> Result<Option<RayHit>> {
        let (pu, pv) = (self.opts.periodic_u, self.opts.periodic_v);
        let (ud, vd) = (self.u_dom, self.v_dom);
        let d = self.d;
        let eps1 = self.eps1(&p);
        let mut u = Self::constrain(u0, ud, pu);
        let mut v = Self::constrain(v0, vd, pv);
        let mut l = l0;
        let mut jet = self.eval(u, v, DerivOrder::First)?;
        let noise = 8.0 * f64::EPSILON * (p.amax() + jet.p.amax() + l.abs());
        let mut f = jet.p - p - d * l;
        let mut r = f.norm();
        for _ in 0..self.opts.max_iterations {
            if r <= eps1 {
                return Ok(Some(self.finish(u, v, l, &jet, r)));
            }
            let (su, sv) = (jet.su, jet.sv);
            let c = su.cross(&sv);
            let det = -c.dot(&d);
            if det.is_nan() || det.abs() <= 1e-12 * c.norm() {
                return Ok(None);
            }
            let rhs = -f;
            let md = -d;
            let du = rhs.dot(&sv.cross(&md)) / det;
            let dv = su.dot(&rhs.cross(&md)) / det;
            let dl = su.dot(&sv.cross(&rhs)) / det;
            if !(du.is_finite() && dv.is_finite() && dl.is_finite()) {
                return Ok(None);
            }
            let mut lambda = 1.0;
            let mut accepted = false;
            for _ in 0..40 {
                let un = Self::constrain(u + lambda * du, ud, pu);
                let vn = Self::constrain(v + lambda * dv, vd, pv);
                let ln = l + lambda * dl;
                let step = (su * (un - u) + sv * (vn - v)).norm() + (ln - l).abs();
                let jn = self.eval(un, vn, DerivOrder::First)?;
                let fnew = jn.p - p - d * ln;
                let rn = fnew.norm();
                if rn <= r + noise {
                    let stalled = step <= eps1;
                    u = un;
                    v = vn;
                    l = ln;
                    jet = jn;
                    f = fnew;
                    r = rn;
                    accepted = true;
                    if stalled {
                        return Ok(
                            (r <= self.opts.tolerance).then(|| self.finish(u, v, l, &jet, r))
                        );
                    }
                    break;
                }
                lambda *= 0.5;
            }
            if !accepted {
                return Ok(None);
            }
        }
        Ok((r <= eps1).then(|| self.finish(u, v, l, &jet, r)))
    }

    fn finish(&self, u: f64, v: f64, l: f64, jet: &SurfaceJet, r: f64) -> RayHit {
        let c = jet.su.cross(&jet.sv);
        let n = c * (self.surface.orientation().sign() / c.norm());
        RayHit {
            u: Self::wrap(u, self.u_dom, self.opts.periodic_u),
            v: Self::wrap(v, self.v_dom, self.opts.periodic_v),
            u_path: u,
            v_path: v,
            point: jet.p,
            ray_parameter: l,
            residual: r,
            cosine: n.dot(&self.d),
            hit_count: 1,
        }
    }

    /// Every hit of the ray through `p` (up to [`MAX_HITS`]), sorted by λ, into `out`;
    /// returns how many. Each hit's `hit_count` is the number found.
    pub fn all_hits(&mut self, p: Vec3, out: &mut [RayHit; MAX_HITS]) -> Result<usize> {
        let foot = [p.dot(&self.e1), p.dot(&self.e2)];
        let along = p.dot(&self.d);
        let dedupe = 1e-9 * self.size;
        let mut count = 0;
        let n = self.n;
        for i in 0..n - 1 {
            for j in 0..n - 1 {
                let a = i * n + j;
                let cell = [a, a + n, a + n + 1, a + 1];
                for tri in [[cell[0], cell[1], cell[2]], [cell[0], cell[2], cell[3]]] {
                    let Some(w) = barycentric(
                        foot,
                        self.nodes[tri[0]].3,
                        self.nodes[tri[1]].3,
                        self.nodes[tri[2]].3,
                    ) else {
                        continue;
                    };
                    if w.iter().any(|&x| x < -0.25) {
                        continue;
                    }
                    let mut uv = [0.0; 3];
                    for (k, &node) in tri.iter().enumerate() {
                        let nd = &self.nodes[node];
                        uv[0] += w[k] * nd.0;
                        uv[1] += w[k] * nd.1;
                        uv[2] += w[k] * (nd.4 - along);
                    }
                    let Some(h) = self.hit_from(p, uv[0], uv[1], uv[2])? else {
                        continue;
                    };
                    if out[..count]
                        .iter()
                        .any(|o| (o.point - h.point).norm() <= dedupe)
                    {
                        continue;
                    }
                    if count < MAX_HITS {
                        out[count] = h;
                        count += 1;
                    }
                }
            }
        }
        out[..count].sort_by(|a, b| a.ray_parameter.total_cmp(&b.ray_parameter));
        for h in out[..count].iter_mut() {
            h.hit_count = count;
        }
        Ok(count)
    }

    /// The first hit along d of the ray through `p`, with the number of hits; `None` for a
    /// miss.
    pub fn first_hit(&mut self, p: Vec3) -> Result<Option<RayHit>> {
        let mut out = [EMPTY_HIT; MAX_HITS];
        let n = self.all_hits(p, &mut out)?;
        Ok((n > 0).then_some(out[0]))
    }

    /// Whether the hit `b` on the ray through `pb` is reached from `a` by continuation (and
    /// `a` from `b` on the ray through `pa`); on success the hit reached from `a` (its
    /// unwrapped parameters continue `a`'s).
    fn continues(&mut self, pa: Vec3, a: &RayHit, pb: Vec3, b: &RayHit) -> Result<Option<RayHit>> {
        let tol = 1e-9 * self.size;
        let Some(fwd) = self.hit_from(pb, a.u_path, a.v_path, a.ray_parameter)? else {
            return Ok(None);
        };
        if (fwd.point - b.point).norm() > tol {
            return Ok(None);
        }
        let Some(back) = self.hit_from(pa, b.u_path, b.v_path, b.ray_parameter)? else {
            return Ok(None);
        };
        if (back.point - a.point).norm() > tol {
            return Ok(None);
        }
        Ok(Some(RayHit {
            hit_count: b.hit_count,
            ..fwd
        }))
    }
}

const EMPTY_HIT: RayHit = RayHit {
    u: 0.0,
    v: 0.0,
    u_path: 0.0,
    v_path: 0.0,
    point: Vec3::new(0.0, 0.0, 0.0),
    ray_parameter: 0.0,
    residual: 0.0,
    cosine: 0.0,
    hit_count: 0,
};

/// Barycentric coordinates of `p` in the triangle (a, b, c); `None` for a degenerate one.
fn barycentric(p: [f64; 2], a: [f64; 2], b: [f64; 2], c: [f64; 2]) -> Option<[f64; 3]> {
    let det = (b[0] - a[0]) * (c[1] - a[1]) - (c[0] - a[0]) * (b[1] - a[1]);
    let scale =
        ((b[0] - a[0]).abs() + (c[0] - a[0]).abs() + (b[1] - a[1]).abs() + (c[1] - a[1]).abs())
            .powi(2);
    if det.is_nan() || det.abs() <= 1e-14 * scale {
        return None;
    }
    let wb = ((p[0] - a[0]) * (c[1] - a[1]) - (c[0] - a[0]) * (p[1] - a[1])) / det;
    let wc = ((b[0] - a[0]) * (p[1] - a[1]) - (p[0] - a[0]) * (b[1] - a[1])) / det;
    Some([1.0 - wb - wc, wb, wc])
}

struct Sample {
    s: f64,
    p: Vec3,
    hit: Option<RayHit>,
}

/// Projects the planar curve `pattern` (its (u, v) read as the plane's (x, y)) onto `surface`
/// along `direction`: see the module docs for the method, the hit taken and what is reported.
///
/// Errors (`index` = the sample's number in the final sample list where known, `t` = the
/// pattern parameter; `t` NaN for a failure of the whole call): `InvalidArgument` for bad
/// options or a zero direction, or when the fit is still outside the tolerance at
/// [`MAX_CURVE_SAMPLES`] samples; `NonFinite`; the pattern's and the surface's own errors.
pub fn project_along<S, C>(
    surface: &S,
    plane: &DrivePlane,
    direction: [f64; 3],
    pattern: &C,
    opts: &DriveOptions,
) -> std::result::Result<DriveProjection, SampleError>
where
    S: SurfaceSource + ?Sized,
    C: UvCurve + ?Sized,
{
    let whole = |error| SampleError {
        index: 0,
        t: f64::NAN,
        error,
    };
    opts.check().map_err(whole)?;
    let mut rc = RayCaster::new(surface, direction, opts.projection).map_err(whole)?;
    let dom = pattern.domain();
    let locate = opts.locate_tolerance * dom.width();
    let mut hint = SpanHint::default();
    let mut sample =
        |rc: &mut RayCaster<'_, S>, s: f64| -> std::result::Result<Sample, SampleError> {
            let at = |error| SampleError {
                index: 0,
                t: s,
                error,
            };
            let j: CurveJet = pattern.checked_jet(s, &mut hint).map_err(at)?;
            let p = plane.point(j.u, j.v);
            let hit = rc.first_hit(p).map_err(at)?;
            Ok(Sample { s, p, hit })
        };
    let mut samples = Vec::with_capacity(opts.samples);
    for i in 0..opts.samples {
        samples.push(sample(&mut rc, dom.even(i, opts.samples))?);
    }
    // `linked[k]`: samples k and k + 1 are on one piece (continuation), with the hit of
    // k + 1 continued from k.
    loop {
        // 1. Classify neighbours; bisect every broken interval wider than the locate width.
        let mut inserted = Vec::new();
        let mut linked = vec![false; samples.len() - 1];
        for k in 0..samples.len() - 1 {
            let (a, b) = (&samples[k], &samples[k + 1]);
            let ok = match (a.hit, b.hit) {
                (Some(ha), Some(hb)) => {
                    let (pa, pb) = (a.p, b.p);
                    let r = rc
                        .continues(pa, &ha, pb, &hb)
                        .map_err(|error| SampleError {
                            index: k + 1,
                            t: samples[k + 1].s,
                            error,
                        })?;
                    if let Some(h) = r {
                        samples[k + 1].hit = Some(h);
                        true
                    } else {
                        false
                    }
                }
                (None, None) => true,
                _ => false,
            };
            linked[k] = ok && samples[k].hit.is_some();
            if !ok && samples[k + 1].s - samples[k].s > locate {
                inserted.push(0.5 * (samples[k].s + samples[k + 1].s));
            }
        }
        // 2. Fit each piece; split intervals whose midpoint is off the fit.
        let mut pieces = Vec::new();
        if inserted.is_empty() {
            let mut k = 0;
            while k < samples.len() {
                if samples[k].hit.is_none() {
                    k += 1;
                    continue;
                }
                let start = k;
                while k < linked.len() && linked[k] {
                    k += 1;
                }
                let end = k; // inclusive
                k += 1;
                if end == start {
                    continue; // a lone hit below the locate width: left in the gap
                }
                let run = &samples[start..=end];
                let projections: Vec<Projection> = run
                    .iter()
                    .map(|x| {
                        let h = x.hit.expect("hits in a run");
                        Projection {
                            u: h.u,
                            v: h.v,
                            u_path: h.u_path,
                            v_path: h.v_path,
                            foot: h.point,
                            distance: h.residual,
                            signed_distance: 0.0,
                            iterations: 0,
                        }
                    })
                    .collect();
                let fit = FitOptions {
                    degree: 3.min(run.len() - 1),
                    ..FitOptions::default()
                };
                let fitted = fit_projections(surface, projections, &opts.projection, &fit)
                    .map_err(|e| match e {
                        StrakeError::AtPoint { index, error } => SampleError {
                            index: start + index,
                            t: samples[start + index].s,
                            error: *error,
                        },
                        other => whole(other),
                    })?;
                let curve = PieceCurve {
                    curve: fitted.curve,
                    u_dom: surface.u_domain(),
                    v_dom: surface.v_domain(),
                };
                for m in 0..run.len() - 1 {
                    let sm = 0.5 * (run[m].s + run[m + 1].s);
                    let probe = sample(&mut rc, sm)?;
                    let off = match probe.hit {
                        Some(h) => distance_to_fitted(
                            surface,
                            &curve,
                            fitted.params[m],
                            fitted.params[m + 1],
                            &h.point,
                        )
                        .map_err(|error| SampleError {
                            index: start + m,
                            t: sm,
                            error,
                        })?,
                        None => f64::INFINITY,
                    };
                    if off > opts.fit_tolerance {
                        inserted.push(sm);
                    }
                }
                pieces.push(DrivePiece {
                    curve,
                    pattern_params: run.iter().map(|x| x.s).collect(),
                    params: fitted.params,
                    hits: run.iter().map(|x| x.hit.expect("hits in a run")).collect(),
                });
            }
        }
        if inserted.is_empty() {
            return Ok(DriveProjection {
                intervals: intervals(&mut rc, &samples, &pieces, plane, pattern)?,
                pieces,
            });
        }
        if samples.len() + inserted.len() > MAX_CURVE_SAMPLES {
            return Err(whole(StrakeError::InvalidArgument(format!(
                "the projected pattern still needs refining at {} samples: loosen the fit \
                 tolerance or split the pattern",
                samples.len()
            ))));
        }
        for s in inserted {
            samples.push(sample(&mut rc, s)?);
        }
        samples.sort_by(|a, b| a.s.total_cmp(&b.s));
        samples.dedup_by(|a, b| a.s == b.s);
    }
}

/// The misses, folds and multiple-hit runs of a final sample list.
fn intervals<S, C>(
    rc: &mut RayCaster<'_, S>,
    samples: &[Sample],
    pieces: &[DrivePiece],
    plane: &DrivePlane,
    pattern: &C,
) -> std::result::Result<Vec<PatternInterval>, SampleError>
where
    S: SurfaceSource + ?Sized,
    C: UvCurve + ?Sized,
{
    let mut out = Vec::new();
    // Gaps: the complement of the pieces in the pattern's domain.
    let dom = pattern.domain();
    let mut edges = vec![dom.lo];
    for p in pieces {
        edges.push(p.pattern_params[0]);
        edges.push(*p.pattern_params.last().expect("pieces have hits"));
    }
    edges.push(dom.hi);
    let mut hint = SpanHint::default();
    for g in edges.chunks(2) {
        let (a, b) = (g[0], g[1]);
        if b <= a {
            continue;
        }
        // A gap with a hit in its middle is a fold (the first hit jumps), else a miss.
        let sm = 0.5 * (a + b);
        let at = |error| SampleError {
            index: 0,
            t: sm,
            error,
        };
        let j = pattern.checked_jet(sm, &mut hint).map_err(at)?;
        let mid = rc.first_hit(plane.point(j.u, j.v)).map_err(at)?;
        let any_miss = samples
            .iter()
            .any(|x| x.s >= a && x.s <= b && x.hit.is_none());
        let kind = if mid.is_none() || any_miss {
            PatternIntervalKind::Miss
        } else {
            PatternIntervalKind::Fold
        };
        out.push(PatternInterval {
            kind,
            start: a,
            end: b,
        });
    }
    // Runs of samples whose rays meet the surface more than once.
    let mut k = 0;
    while k < samples.len() {
        if samples[k].hit.is_some_and(|h| h.hit_count > 1) {
            let start = k;
            while k + 1 < samples.len() && samples[k + 1].hit.is_some_and(|h| h.hit_count > 1) {
                k += 1;
            }
            out.push(PatternInterval {
                kind: PatternIntervalKind::SeveralHits,
                start: samples[start].s,
                end: samples[k].s,
            });
        }
        k += 1;
    }
    out.sort_by(|a, b| a.start.total_cmp(&b.start));
    Ok(out)
}
