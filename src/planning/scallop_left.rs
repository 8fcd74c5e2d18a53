//! The scallop a ball-end mill actually leaves between two neighbouring passes, measured by a
//! direct construction in space (not by the curvature formula the step-over was chosen with),
//! and the per-point rule that turns a target scallop height into a step-over.
//!
//! **Construction.** A ball of radius r whose centre runs along a curve C sweeps the tube of
//! radius r about C (the envelope of the balls; exact). A contact path c(t) with tool-side
//! normal n = s N (s = [`ToolSide::sign`]) has the centre path C(t) = c(t) + r n(t), whose
//! tangent per unit arc length of c is g = (1 − r s κn) T − r s τg B (the Darboux equations,
//! dN/ds = −κn T − τg B). At a point of pass A the section of A's tube by the plane through
//! C_A normal to g is exactly the circle of radius r about C_A; n lies in that plane (n ⊥ T,
//! n ⊥ B), and so does the unit vector e toward pass B. The circle is walked from the contact
//! point c_A (angle 0: C_A − r n) toward B (angle π/2: C_A + r e); the first point whose
//! distance to B's centre path falls to r is the cusp where the two tubes meet (bisection to
//! 1e-13 of the angle; the distance to B's centre path by Newton's method on B's parameter,
//! Gauss–Newton steps, safeguarded to B's domain). The scallop height is the distance from the
//! cusp to the surface (point inversion, [`crate::paths::projection::Projector`]).
//!
//! Exactness: on a cylinder with passes along rulings and on a sphere with passes along
//! circles of latitude (both sections normal to both passes) the construction is the
//! two-circle intersection of Suresh & Yang (J. Eng. Ind. 116 (1994) 253–259) and Lin & Koren
//! (J. Eng. Ind. 118 (1996) 20–28) exactly; elsewhere it is the true meeting of the two swept
//! tubes in the section of A's tube, which the curvature formula only approximates.
//!
//! What it does not see: the cutter's other shapes (a flat or toroidal cutter does not sweep a
//! tube; only the ball is measured); material left by the surface bending between the passes
//! beyond what the distance to the surface at the cusp shows (it is the height of the cusp, the
//! largest of the scallop between two passes on a smooth surface, not its profile); gouging.

use super::super::checks::cutter::ToolSide;
use crate::checks::scallop::{cross_path_curvature, step_over_for_scallop};
use crate::curve::UvCurve;
use crate::error::{Result, StrakeError};
use crate::geometry::frame::DarbouxFrame;
use crate::geometry::math::Vec3;
use crate::paths::curve_on_surface::{CurveOnSurface, Hints};
use crate::paths::projection::{ProjectionOptions, Projector};
use crate::surface::SurfaceSource;

/// Checks a target scallop height: positive and finite (`InvalidArgument` naming the value).
pub fn check_target_scallop(h: f64) -> Result<()> {
    if h.is_finite() && h > 0.0 {
        Ok(())
    } else {
        Err(StrakeError::InvalidArgument(format!(
            "target scallop height = {h}: it must be positive and finite",
            h = crate::numfmt::Exact(h)
        )))
    }
}

/// The step-over (arc length across the path) that leaves the target scallop `h` at the path
/// sample `f` for a ball (or a cutter of radius `r` across the path) on `side`: the exact
/// two-circle inverse [`step_over_for_scallop`] with the curvature across the path
/// κ = s κn(B) of [`cross_path_curvature`] (positive concave toward the tool).
///
/// Errors: `InvalidArgument` naming the value for a target that is not positive and finite,
/// or a radius that is not; [`StrakeError::CutterTooLarge`] where the cutter does not fit the
/// concave curvature across the path (κ r ≥ 1); `InvalidArgument` where the target is out of
/// reach of the geometry.
pub fn step_over_at(f: &DarbouxFrame, r: f64, side: ToolSide, h: f64) -> Result<f64> {
    check_target_scallop(h)?;
    let kappa = cross_path_curvature(f, side);
    if r.is_finite() && r > 0.0 && kappa * r >= 1.0 {
        return Err(StrakeError::CutterTooLarge {
            radius: r,
            curvature_radius: 1.0 / kappa,
            u: f.u,
            v: f.v,
        });
    }
    step_over_for_scallop(r, h, kappa)
}

/// A centre path C(t) = c(t) + r s N(t) of a ball along a pass.
struct CentrePath<'a, S: SurfaceSource + ?Sized, C: UvCurve + ?Sized> {
    path: CurveOnSurface<'a, S, C>,
    r: f64,
    s: f64,
    hints: Hints,
}

impl<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized> CentrePath<'_, S, C> {
    /// The centre and its derivative dC/dt at t, with the frame.
    fn at(&mut self, t: f64) -> Result<(Vec3, Vec3, DarbouxFrame)> {
        let f = self.path.frame(t, &mut self.hints)?;
        let (r, s) = (self.r, self.s);
        let c = f.point + f.n * (r * s);
        let g = f.t * (1.0 - r * s * f.normal_curvature) - f.b * (r * s * f.geodesic_torsion);
        Ok((c, g * f.speed, f))
    }

    /// The distance from `q` to the centre path near parameter `t0`, and the parameter of the
    /// nearest point (Gauss–Newton on (C(t) − q)·C'(t) = 0, clamped to the domain).
    fn distance(&mut self, q: &Vec3, t0: f64) -> Result<(f64, f64)> {
        let dom = self.path.curve().domain();
        let mut t = t0.clamp(dom.lo, dom.hi);
        let mut best = (f64::INFINITY, t);
        for _ in 0..60 {
            let (c, dc, _) = self.at(t)?;
            let r = c - q;
            let d = r.norm();
            if d < best.0 {
                best = (d, t);
            }
            let den = dc.norm_squared();
            if den.is_nan() || den <= 0.0 {
                break;
            }
            let tn = (t - r.dot(&dc) / den).clamp(dom.lo, dom.hi);
            if (tn - t).abs() <= 1e-15 * dom.width().max(t.abs()) {
                break;
            }
            t = tn;
        }
        Ok(best)
    }
}

/// The scallop left at one point of pass A by its neighbour B.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ScallopLeft {
    /// Parameter on pass A.
    pub t: f64,
    /// Parameter on pass B of the centre nearest to the cusp.
    pub t_neighbour: f64,
    /// The cusp where the two swept tubes meet.
    pub cusp: Vec3,
    /// Distance from the cusp to the surface: the scallop height (host length unit).
    pub height: f64,
    /// Distance between the two contact points (chord, host length unit).
    pub contact_distance: f64,
}

/// Measures the scallop left between pass `a` and pass `b` (both curves on `surface`) by a
/// ball of radius `r` on `side`, at each parameter of `ts` on `a` (see the module docs).
/// `t_b0` is a parameter of `b` near the point facing `ts[0]` (the search continues from
/// each found one).
///
/// Errors: `InvalidArgument` for a radius that is not positive and finite, or where the two
/// balls do not overlap (the centres 2r or more apart: no cusp, the step-over is too wide);
/// `NotConverged` where the centres are closer than 2r but the circles in the section do not
/// meet (the neighbour is not beside this point: no cusp to measure there);
/// every error of the frames, of point inversion, and of the surface.
pub fn scallop_between<S, A, B>(
    surface: &S,
    a: &A,
    b: &B,
    r: f64,
    side: ToolSide,
    ts: &[f64],
    t_b0: f64,
) -> Result<Vec<ScallopLeft>>
where
    S: SurfaceSource + ?Sized,
    A: UvCurve + ?Sized,
    B: UvCurve + ?Sized,
{
    if !(r.is_finite() && r > 0.0) {
        return Err(StrakeError::InvalidArgument(format!(
            "cutter radius = {r}: it must be positive and finite",
            r = crate::numfmt::Exact(r)
        )));
    }
    let s = side.sign();
    let mut ca = CentrePath {
        path: CurveOnSurface::new(surface, a),
        r,
        s,
        hints: Hints::default(),
    };
    let mut cb = CentrePath {
        path: CurveOnSurface::new(surface, b),
        r,
        s,
        hints: Hints::default(),
    };
    let mut projector = Projector::new(surface, ProjectionOptions::new(f64::INFINITY))?;
    let mut tb = t_b0;
    let mut out = Vec::with_capacity(ts.len());
    for &t in ts {
        let (centre, dc, f) = ca.at(t)?;
        let n = f.n * s;
        let g = dc.normalize();
        // The unit vector in the section plane, normal to n, toward B's centre.
        let (_, tb_near) = cb.distance(&centre, tb)?;
        let (cb_near, _, fb) = cb.at(tb_near)?;
        let e = {
            let w = g.cross(&n);
            if w.dot(&(cb_near - centre)) >= 0.0 {
                w
            } else {
                -w
            }
        };
        let at_angle = |phi: f64| centre + n * (-r * phi.cos()) + e * (r * phi.sin());
        // g(φ) = dist(Q(φ), C_B) − r: ≥ 0 at the contact point, < 0 inside B's tube.
        let mut tq = tb_near;
        let mut excess = |phi: f64, tq: &mut f64| -> Result<f64> {
            let (d, tn) = cb.distance(&at_angle(phi), *tq)?;
            *tq = tn;
            Ok(d - r)
        };
        let (mut lo, mut hi) = (0.0, std::f64::consts::FRAC_PI_2);
        if excess(hi, &mut tq)? >= 0.0 && (cb_near - centre).norm() < 2.0 * r {
            // The balls overlap, yet their circles in this section do not meet: the
            // neighbour's nearest centre is not abeam (not side by side here).
            return Err(StrakeError::NotConverged {
                what: format!(
                    "at t = {} on the pass no cusp was found in the section of its tube: the \
                     neighbour's nearest centre is {} away (less than 2r = {}) but not \
                     beside it",
                    crate::numfmt::Exact(t),
                    crate::numfmt::Num((cb_near - centre).norm()),
                    crate::numfmt::Num(2.0 * r)
                ),
                iterations: 0,
            });
        }
        if excess(hi, &mut tq)? >= 0.0 {
            return Err(StrakeError::InvalidArgument(format!(
                "at t = {} on the pass the neighbouring ball (radius {}) does not reach the \
                 side of this one: the centres are {} apart, the passes do not overlap",
                crate::numfmt::Exact(t),
                crate::numfmt::Num(r),
                crate::numfmt::Num((cb_near - centre).norm())
            )));
        }
        while hi - lo > 1e-13 {
            let m = 0.5 * (lo + hi);
            if excess(m, &mut tq)? >= 0.0 {
                lo = m;
            } else {
                hi = m;
            }
        }
        let cusp = at_angle(0.5 * (lo + hi));
        let pr = projector.project([cusp.x, cusp.y, cusp.z])?;
        tb = tq;
        out.push(ScallopLeft {
            t,
            t_neighbour: tq,
            cusp,
            height: pr.distance,
            contact_distance: (fb.point - f.point).norm(),
        });
    }
    Ok(out)
}
