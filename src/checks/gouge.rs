//! Local gouge check and the smallest lead angle that avoids local gouging.
//!
//! Second-order contact: near the contact point both the surface and the cutter are described
//! by their curvatures in the tangent plane. The cutter does not cut into the surface locally
//! when, in every tangent direction X, it bends away from the surface at least as fast as the
//! surface bends toward it:
//!
//! D = K_tool − s II ⪰ 0 (positive semi-definite),
//!
//! with s II the surface's second fundamental form concave toward the tool (see
//! [`super`]) and K_tool the cutter's curvature at its contact point (common practice in
//! curvature-matched 5-axis machining; derived here). For a cutter described as a torus
//! (major radius R, corner radius r, see [`Cutter`]) whose axis is inclined by β from the
//! tool-side normal, the contact point lies on the corner circle, and K_tool has principal
//! directions m (the tangential part of the axis, the meridian of the torus) and p = N × m:
//! 1/r along m (the corner circle) and sin β/(R + r sin β) along p (the parallel through the
//! contact point, by Meusnier's theorem), i.e. the inverse of the effective radius
//! R/sin β + r of Vickers & Quan (J. Eng. Ind. 111(1) (1989) 22–26).
//!
//! For a ball-end mill (R = 0) the condition reduces to r · max(s k1, s k2) ≤ 1: the ball radius
//! must not exceed the smallest concave radius of curvature (common practice).
//!
//! **Rear (heel) gouging.** A flat or toroidal cutter inclined by β touches at the front of its
//! bottom; the rest of the bottom, up to the heel, must stay clear of the surface too, which
//! the local condition does not see. The cutter is the solid swept by a disc of radius R
//! (perpendicular to the axis) and a ball of radius r, so it stays out of the material exactly
//! when the disc of corner-circle centres stays on the tool side of the surface offset by r
//! toward the tool, whose principal curvatures (concave toward the tool) are
//! s k_i / (1 − r s k_i). The disc's rim, from the contact point (rim angle α = 0) round to
//! the heel (α = π), is at the tangent-plane offset X(α) = R ((cos α − 1) cos β m + sin α p)
//! and the height z_d(α) = R (1 − cos α) sin β above the tangent plane. The (offset) surface's
//! height there is modelled as z_s(X) = k_X |X|² / (1 + √(1 − k_max² |X|²)) in a direction
//! X of normal curvature k_X > 0 (k_max the largest concave curvature; beyond k_max |X| = 1
//! the root is taken as 0, above the arc), and ½ k_X |X|² where k_X ≤ 0: second order in
//! every direction, exact on the osculating arc along a principal direction and on a sphere,
//! and above the true surface of a cylinder in the other directions. The rear margin is the
//! smallest (z_d − z_s)/(R (1 − cos α)) over the rim (dimensionless); the heel clears when
//! it is ≥ 0. On a circular arc of radius ρ concave along the feed this is the exact chord
//! condition: the bottom's diameter 2R fits in the chord 2(ρ − r) sin β, i.e.
//! sin β ≥ R/(ρ − r) (a flat cutter R = 5 around a concave arc ρ = 20 needs 14.48° of lead).
//!
//! With the axis exactly along the normal (β = 0) a flat or toroidal cutter touches with its
//! flat bottom, centred on the axis; the rim is then X(α) = R (cos α m + sin α p) at z_d = 0
//! and the margin is the smallest −z_s/R: the bottom clears only where the surface bends away
//! from the tool in every direction.
//!
//! What these checks do not see: the holder and the shank, the flank above the corner, the
//! cutter elsewhere along the path (whole-cutter interference), and the surface between
//! samples. They are local aids; verify toolpaths by simulation.

use super::cutter::{Cutter, CutterRadii, ToolSide, cutter_radii};
use super::tool_axis::{ToolAngles, ToolFrame};
use crate::error::Result;
use crate::geometry::frame::DarbouxFrame;
use crate::geometry::math::Vec3;

/// Rear (heel) gouging of the cutter's bottom at one sample (see the module docs).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct RearGouge {
    /// Smallest (z_d − z_s)/(R (1 − cos α)) over the rim of the disc of corner-circle centres
    /// (dimensionless, like a sine); −z_s/R with the flat bottom touching (β = 0). Negative
    /// means the bottom or the heel is inside the material. +1 (the largest value a clear rim
    /// can have) for a ball-end mill, which has no bottom. −f64::MAX when the corner circle
    /// does not fit the concavity (r s k ≥ 1, the offset surface folds; the cutter gouges
    /// locally anyway).
    pub margin: f64,
    /// How deep the deepest rim point is inside the material (host length unit, ≥ 0; 0 when
    /// clear), in the model of the module docs.
    pub depth: f64,
    /// Rim angle α of the worst rim point (radians, 0 at the contact point, π at the heel,
    /// increasing toward p = n_t × m).
    pub worst_angle: f64,
    /// True when the margin is below zero beyond round-off.
    pub gouges: bool,
}

/// The gouge situation at one sample: local (second-order contact) and rear (the bottom and
/// the heel).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct GougeState {
    /// Largest curvature concave toward the tool, max(s k1, s k2) (1/length); ≤ 0 where the
    /// surface bends away from the tool in every direction.
    pub concave_curvature: f64,
    /// Smallest concave radius of curvature 1/concave_curvature; infinite when
    /// `concave_curvature` ≤ 0.
    pub concave_radius: f64,
    /// Effective cutting radius normal to the inclination plane (R/sin β + r; infinite for a
    /// flat or toroidal cutter at β = 0). Across the path only for pure lead: see `radii`.
    pub effective_radius_cross: f64,
    /// Effective cutting radius in the inclination plane: the corner radius r (0 for a
    /// flat-end mill, whose corner is sharp).
    pub effective_radius_along: f64,
    /// The cutter's radii across and along the path (see [`cutter_radii`]).
    pub radii: CutterRadii,
    /// Smallest eigenvalue of D = K_tool − s II (1/length): how much faster the cutter bends
    /// away than the surface bends toward it, in the worst direction. Negative means local
    /// gouging.
    pub margin: f64,
    /// True when the cutter gouges locally (margin below zero beyond round-off).
    pub local_gouges: bool,
    /// Rear gouging of the bottom and heel.
    pub rear: RearGouge,
    /// True when the cutter gouges locally or at the rear.
    pub gouges: bool,
    /// The smallest lead angle λ ≥ 0 (radians, with the given tilt) at which the cutter gouges
    /// neither locally nor at the rear; `None` when no lead angle in [0, π/2) avoids both.
    pub min_lead: Option<f64>,
}

/// The gouge state of `cutter` at frame `f`, with the tool on `side` and its axis set by
/// `angles` (see [`mod@super::tool_axis`] for the conventions).
///
/// Errors: `InvalidArgument` for an invalid cutter or angles, or a frame that is not
/// orthonormal.
pub fn gouge_state(
    f: &DarbouxFrame,
    side: ToolSide,
    cutter: &Cutter,
    angles: &ToolAngles,
) -> Result<GougeState> {
    cutter.validate()?;
    angles.validate()?;
    let frame = ToolFrame::new(f, side)?;
    let s = side.sign();
    let (k1, k2) = (f.principal.k1, f.principal.k2);
    let concave_curvature = (s * k1).max(s * k2);
    let concave_radius = if concave_curvature > 0.0 {
        1.0 / concave_curvature
    } else {
        f64::INFINITY
    };
    let (margin, local_gouges) = local_margin(f, &frame, cutter, angles);
    let rear = rear_gouge_at(f, &frame, cutter, angles);
    let min_lead = smallest_lead(f, &frame, cutter, angles.tilt);
    let (_, r) = cutter.torus_radii();
    Ok(GougeState {
        concave_curvature,
        concave_radius,
        effective_radius_cross: cutter.effective_radius(angles.inclination()),
        effective_radius_along: r,
        radii: cutter_radii(cutter, angles)?,
        margin,
        local_gouges,
        rear,
        gouges: local_gouges || rear.gouges,
        min_lead,
    })
}

/// Rear gouging only (see the module docs): the bottom and the heel of `cutter` at frame `f`.
///
/// Errors: as for [`gouge_state`].
pub fn rear_gouge(
    f: &DarbouxFrame,
    side: ToolSide,
    cutter: &Cutter,
    angles: &ToolAngles,
) -> Result<RearGouge> {
    cutter.validate()?;
    angles.validate()?;
    let frame = ToolFrame::new(f, side)?;
    Ok(rear_gouge_at(f, &frame, cutter, angles))
}

/// The inclination direction m (tangential part of the axis, T when upright) and sin β.
fn inclination_direction(frame: &ToolFrame, angles: &ToolAngles) -> (Vec3, f64) {
    let [at, ab, _] = angles.local();
    let sb = at.hypot(ab);
    if sb > 0.0 {
        ((frame.t * at + frame.b * ab) / sb, sb)
    } else {
        (frame.t, 0.0)
    }
}

/// (smallest eigenvalue of D, gouges?) for the given angles.
fn local_margin(
    f: &DarbouxFrame,
    frame: &ToolFrame,
    cutter: &Cutter,
    angles: &ToolAngles,
) -> (f64, bool) {
    let s = frame.sign;
    let (big_r, r) = cutter.torus_radii();
    let (m, sb) = inclination_direction(frame, angles);
    // Surface curvatures in the basis (m, p = N × m), from Euler's formula.
    let c = m.dot(&f.principal.d1);
    let sn = m.dot(&f.principal.d2);
    let (k1, k2) = (f.principal.k1, f.principal.k2);
    let kn_m = k1 * c * c + k2 * sn * sn;
    let kn_p = k1 * sn * sn + k2 * c * c;
    let tg_m = (k2 - k1) * sn * c;
    // Cutter curvatures: 1/r along m, sin β/(R + r sin β) along p.
    let kp_tool = if big_r == 0.0 {
        1.0 / r
    } else {
        sb / (big_r + r * sb)
    };
    let cc = kp_tool - s * kn_p;
    let b = -s * tg_m;
    let scale = k1.abs().max(k2.abs()).max(kp_tool.abs());
    let margin = if r == 0.0 {
        // Sharp corner: infinite curvature along m, D's smallest eigenvalue tends to cc.
        cc
    } else {
        let a = 1.0 / r - s * kn_m;
        0.5 * (a + cc) - (0.5 * (a - cc)).hypot(b)
    };
    let slack = 16.0 * f64::EPSILON * scale.max(if r > 0.0 { 1.0 / r } else { 0.0 });
    (margin, margin < -slack)
}

/// Smallest lead λ in [0, π/2) without local or rear gouging, at the given tilt: a scan in
/// steps of 0.25° followed by bisection to 1e-12 rad. With tilt 0 both margins grow with λ
/// (the cross-feed curvature sin β/(R + r sin β) and the heel's height 2R sin β), so the first
/// admissible λ is the answer; with tilt the scan finds the first admissible λ on the grid.
fn smallest_lead(f: &DarbouxFrame, frame: &ToolFrame, cutter: &Cutter, tilt: f64) -> Option<f64> {
    let ok = |lead: f64| {
        let a = ToolAngles { lead, tilt };
        !local_margin(f, frame, cutter, &a).1 && !rear_gouge_at(f, frame, cutter, &a).gouges
    };
    if ok(0.0) {
        return Some(0.0);
    }
    let step = 0.25f64.to_radians();
    let max = std::f64::consts::FRAC_PI_2 - 1e-9;
    let mut lo = 0.0;
    let mut hi = step;
    while hi < max {
        if ok(hi) {
            while hi - lo > 1e-12 {
                let mid = 0.5 * (lo + hi);
                if ok(mid) {
                    hi = mid;
                } else {
                    lo = mid;
                }
            }
            return Some(hi);
        }
        lo = hi;
        hi = (hi + step).min(max);
    }
    if ok(max) { Some(max) } else { None }
}

/// Rim samples of the rear check (2° apart; α = π, the heel, is one of them).
const RIM_SAMPLES: usize = 180;

/// The rear check at the given angles (module docs).
fn rear_gouge_at(
    f: &DarbouxFrame,
    frame: &ToolFrame,
    cutter: &Cutter,
    angles: &ToolAngles,
) -> RearGouge {
    let (big_r, r) = cutter.torus_radii();
    if big_r == 0.0 {
        return RearGouge {
            margin: 1.0,
            depth: 0.0,
            worst_angle: 0.0,
            gouges: false,
        };
    }
    let s = frame.sign;
    let p = &f.principal;
    // Offset surface's principal curvatures, concave toward the tool.
    let (c1, c2) = (s * p.k1, s * p.k2);
    if r * c1.max(c2) >= 1.0 {
        return RearGouge {
            margin: -f64::MAX,
            depth: 0.0,
            worst_angle: 0.0,
            gouges: true,
        };
    }
    let (o1, o2) = (c1 / (1.0 - r * c1), c2 / (1.0 - r * c2));
    let kmax = o1.max(o2).max(0.0);
    let (m, sb) = inclination_direction(frame, angles);
    let pv = frame.n.cross(&m);
    // Components of m and p along the principal directions.
    let (m1, m2) = (m.dot(&p.d1), m.dot(&p.d2));
    let (p1, p2) = (pv.dot(&p.d1), pv.dot(&p.d2));
    let cb = angles.lead.cos() * angles.tilt.cos();
    // Height of the (offset) surface at the tangent offset ξ m + η p.
    let surface = |xi: f64, eta: f64| {
        let (x1, x2) = (xi * m1 + eta * p1, xi * m2 + eta * p2);
        let q = o1 * x1 * x1 + o2 * x2 * x2;
        if q <= 0.0 {
            0.5 * q
        } else {
            let len2 = xi * xi + eta * eta;
            q / (1.0 + (1.0 - kmax * kmax * len2).max(0.0).sqrt())
        }
    };
    let upright = sb == 0.0;
    // Normalised clearance at rim angle α.
    let q_at = |alpha: f64| {
        let (sa, ca) = alpha.sin_cos();
        if upright {
            let z = surface(big_r * ca, big_r * sa);
            (-z / big_r, z)
        } else {
            let omc = 2.0 * (0.5 * alpha).sin().powi(2);
            let zd = big_r * omc * sb;
            let zs = surface(-big_r * omc * cb, big_r * sa);
            ((zd - zs) / (big_r * omc), zs - zd)
        }
    };
    let (mut worst, mut worst_alpha, mut depth) = (f64::INFINITY, 0.0, 0.0f64);
    let (first, last) = if upright {
        (0, RIM_SAMPLES)
    } else {
        (1, RIM_SAMPLES)
    };
    let step = std::f64::consts::TAU / RIM_SAMPLES as f64;
    for k in first..last {
        let alpha = step * k as f64;
        let (q, d) = q_at(alpha);
        depth = depth.max(d);
        if q < worst {
            worst = q;
            worst_alpha = alpha;
        }
    }
    // Golden-section refinement around the worst sample (the margin is smooth in α).
    let (mut lo, mut hi) = (worst_alpha - step, worst_alpha + step);
    if !upright {
        lo = lo.max(1e-3 * step);
        hi = hi.min(std::f64::consts::TAU - 1e-3 * step);
    }
    let g = 0.5 * (5f64.sqrt() - 1.0);
    for _ in 0..40 {
        let a = hi - g * (hi - lo);
        let b = lo + g * (hi - lo);
        if q_at(a).0 < q_at(b).0 {
            hi = b;
        } else {
            lo = a;
        }
    }
    let mid = 0.5 * (lo + hi);
    let (qm, dm) = q_at(mid);
    if qm < worst {
        worst = qm;
        worst_alpha = mid;
        depth = depth.max(dm);
    }
    let slack = 64.0 * f64::EPSILON * (1.0 + big_r * (o1.abs().max(o2.abs())));
    RearGouge {
        margin: worst,
        depth,
        worst_angle: worst_alpha.rem_euclid(std::f64::consts::TAU),
        gouges: worst < -slack,
    }
}
