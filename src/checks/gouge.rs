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

use super::cutter::{Cutter, ToolSide};
use super::tool_axis::ToolAngles;
use crate::error::Result;
use crate::geometry::frame::DarbouxFrame;

/// The local gouge situation at one sample.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct GougeState {
    /// Largest curvature concave toward the tool, max(s k1, s k2) (1/length); ≤ 0 where the
    /// surface bends away from the tool in every direction.
    pub concave_curvature: f64,
    /// Smallest concave radius of curvature 1/concave_curvature; infinite when
    /// `concave_curvature` ≤ 0.
    pub concave_radius: f64,
    /// Effective cutting radius across the inclination (R/sin β + r; infinite for a flat or
    /// toroidal cutter at β = 0).
    pub effective_radius_cross: f64,
    /// Effective cutting radius along the inclination: the corner radius r (0 for a flat-end
    /// mill, whose corner is sharp).
    pub effective_radius_along: f64,
    /// Smallest eigenvalue of D = K_tool − s II (1/length): how much faster the cutter bends
    /// away than the surface bends toward it, in the worst direction. Negative means local
    /// gouging.
    pub margin: f64,
    /// True when the cutter gouges locally (margin below zero beyond round-off).
    pub gouges: bool,
    /// The smallest lead angle λ ≥ 0 (radians, with the given tilt) at which the cutter does
    /// not gouge locally; `None` when no lead angle in [0, π/2) avoids it (the cutter is too
    /// large for the surface's concavity whatever its inclination).
    pub min_lead: Option<f64>,
}

/// The local gouge state of `cutter` at frame `f`, with the tool on `side` and its axis set by
/// `angles` (see [`mod@super::tool_axis`] for the conventions).
///
/// Errors: `InvalidArgument` for an invalid cutter or angles.
pub fn gouge_state(
    f: &DarbouxFrame,
    side: ToolSide,
    cutter: &Cutter,
    angles: &ToolAngles,
) -> Result<GougeState> {
    cutter.validate()?;
    angles.validate()?;
    let s = side.sign();
    let (k1, k2) = (f.principal.k1, f.principal.k2);
    let concave_curvature = (s * k1).max(s * k2);
    let concave_radius = if concave_curvature > 0.0 {
        1.0 / concave_curvature
    } else {
        f64::INFINITY
    };
    let (margin, gouges) = local_margin(f, s, cutter, angles);
    let min_lead = smallest_lead(f, s, cutter, angles.tilt);
    let (_, r) = cutter.torus_radii();
    Ok(GougeState {
        concave_curvature,
        concave_radius,
        effective_radius_cross: cutter.effective_radius(angles.inclination()),
        effective_radius_along: r,
        margin,
        gouges,
        min_lead,
    })
}

/// (smallest eigenvalue of D, gouges?) for the given angles.
fn local_margin(f: &DarbouxFrame, s: f64, cutter: &Cutter, angles: &ToolAngles) -> (f64, bool) {
    let (big_r, r) = cutter.torus_radii();
    let beta = angles.inclination();
    let sb = beta.sin();
    // m: the tangential part of the axis (T when the axis is along the normal).
    let [at, ab, _] = angles.local();
    let m = if sb > 0.0 {
        (f.t * at + f.b * ab) / sb
    } else {
        f.t
    };
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

/// Smallest lead λ in [0, π/2) without local gouging, at the given tilt: a scan in steps of
/// 0.25° followed by bisection to 1e-12 rad. With tilt 0 the margin grows with λ (only the
/// cross-feed curvature sin β/(R + r sin β) depends on it), so the first admissible λ is the
/// answer; with tilt the scan finds the first admissible λ on the grid.
fn smallest_lead(f: &DarbouxFrame, s: f64, cutter: &Cutter, tilt: f64) -> Option<f64> {
    let ok = |lead: f64| !local_margin(f, s, cutter, &ToolAngles { lead, tilt }).1;
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
