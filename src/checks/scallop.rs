//! Scallop height between adjacent passes of a ball-end mill, and its inverse, the largest
//! step-over for a target scallop height.
//!
//! Model: in the plane across the path (spanned by B and N) the surface is its osculating
//! circle of curvature κ = s κn(B) (concave toward the tool when κ > 0, see [`super`]); two
//! adjacent passes touch it at points a step-over w apart, measured along the surface (arc
//! length across the path); the cutter's cross-section is a circle of radius r. The scallop
//! height h is the distance, along the surface normal, from the surface to the cusp where the
//! two cutter circles meet (exact circle geometry).
//!
//! - Plane (κ = 0): h = r − √(r² − w²/4) (common practice).
//! - Curved, ρ = 1/|κ|, θ = w/ρ: the cutter centres lie on the circle of radius ρ ± r concentric
//!   with the surface's (+ convex, − concave), θ apart; the cusp is on the bisector at distance
//!   d from the centre, r² = d² + ρc² − 2 d ρc cos(θ/2) with ρc = ρ ± r; h = d − ρ (convex) or
//!   ρ − d (concave). Same geometry as Suresh & Yang, J. Eng. Ind. 116 (1994) 253–259, and
//!   Lin & Koren, J. Eng. Ind. 118 (1996) 20–28 (derived here, not copied).
//! - Approximation: h ≈ (w²/8)(1/r − κ) (convex surfaces, κ < 0, give larger scallops).
//!
//! For flat and toroidal cutters, pass their effective cutting radius across the path
//! (see [`super::Cutter::effective_radius`]) as `r`: a common approximation.
//! Lengths in the host's unit.

use super::cutter::ToolSide;
use crate::error::{Result, StrakeError};
use crate::geometry::frame::DarbouxFrame;

/// The curvature across the path, concave toward the tool: κ = s κn(B), the normal curvature
/// in the direction B = N × T (across the path, in the tangent plane) times the tool-side sign
/// s of [`ToolSide::sign`] (1/length; positive where the surface bends toward the tool). This is
/// the `kappa` the scallop functions below take.
///
/// By Euler's formula κn(B) = k1 (B·d1)² + k2 (B·d2)² (do Carmo §3-2), which equals
/// k1 + k2 − κn(T). Every finite frame gives a finite value.
pub fn cross_path_curvature(f: &DarbouxFrame, side: ToolSide) -> f64 {
    let p = &f.principal;
    let (c, s) = (f.b.dot(&p.d1), f.b.dot(&p.d2));
    side.sign() * (p.k1 * c * c + p.k2 * s * s)
}

fn check(name: &str, x: f64, positive: bool) -> Result<()> {
    let ok = x.is_finite() && if positive { x > 0.0 } else { true };
    if ok {
        Ok(())
    } else {
        Err(StrakeError::InvalidArgument(format!(
            "{name} = {x} must be {}",
            if positive {
                "positive and finite"
            } else {
                "finite"
            }
        )))
    }
}

fn concave_fit(r: f64, kappa: f64) -> Result<()> {
    if kappa * r >= 1.0 {
        return Err(StrakeError::InvalidArgument(format!(
            "cutter radius {r} does not fit the concave radius of curvature {}: the cutter gouges",
            1.0 / kappa
        )));
    }
    Ok(())
}

/// Exact scallop height for cutter radius `r`, step-over `w` (arc length across the path) and
/// curvature across the path `kappa` (= s κn(B), 1/length, positive concave toward the tool).
///
/// Errors (`InvalidArgument`, naming the field): r or w not positive and finite, kappa not
/// finite, a concave curvature the cutter does not fit (κ r ≥ 1), or a step-over so large that
/// adjacent passes no longer overlap.
pub fn scallop_height(r: f64, w: f64, kappa: f64) -> Result<f64> {
    check("cutter radius", r, true)?;
    check("step-over", w, true)?;
    check("cross-path curvature", kappa, false)?;
    concave_fit(r, kappa)?;
    let too_wide = || {
        StrakeError::InvalidArgument(format!(
            "step-over = {w} is too wide for cutter radius {r}: adjacent passes do not overlap"
        ))
    };
    if kappa == 0.0 {
        let q = r * r - 0.25 * w * w;
        if q < 0.0 {
            return Err(too_wide());
        }
        // r − √q, written without cancellation.
        return Ok(0.25 * w * w / (r + q.sqrt()));
    }
    let rho = 1.0 / kappa.abs();
    let half = 0.5 * w / rho;
    if half >= std::f64::consts::FRAC_PI_2 {
        return Err(too_wide());
    }
    let sh = half.sin();
    if kappa < 0.0 {
        let rc = rho + r;
        let q = r * r - (rc * sh).powi(2);
        if q < 0.0 {
            return Err(too_wide());
        }
        // d = rc cos(θ/2) − √q (the intersection nearer the surface); h = d − ρ, rearranged as
        // (r − √q) − rc (1 − cos(θ/2)) with r − √q = (rc sin(θ/2))²/(r + √q), free of
        // cancellation for small step-overs.
        let one_minus_cos = 2.0 * (0.5 * half).sin().powi(2);
        Ok((rc * sh).powi(2) / (r + q.sqrt()) - rc * one_minus_cos)
    } else {
        let rc = rho - r;
        let q = r * r - (rc * sh).powi(2);
        if q < 0.0 {
            return Err(too_wide());
        }
        // d = rc cos(θ/2) + √q; h = ρ − d = (r − √q) + rc (1 − cos(θ/2)).
        let one_minus_cos = 2.0 * (0.5 * half).sin().powi(2);
        Ok((rc * sh).powi(2) / (r + q.sqrt()) + rc * one_minus_cos)
    }
}

/// The common approximation h ≈ (w²/8)(1/r − κ) (same arguments and sign as
/// [`scallop_height`]).
pub fn scallop_height_approx(r: f64, w: f64, kappa: f64) -> Result<f64> {
    check("cutter radius", r, true)?;
    check("step-over", w, true)?;
    check("cross-path curvature", kappa, false)?;
    concave_fit(r, kappa)?;
    Ok(w * w / 8.0 * (1.0 / r - kappa))
}

/// The largest step-over (arc length across the path) that keeps the exact scallop height at
/// or below `h`; the inverse of [`scallop_height`].
///
/// Errors as for [`scallop_height`], with `h` required positive and finite and below the
/// largest scallop the geometry allows.
pub fn step_over_for_scallop(r: f64, h: f64, kappa: f64) -> Result<f64> {
    check("cutter radius", r, true)?;
    check("scallop height", h, true)?;
    check("cross-path curvature", kappa, false)?;
    concave_fit(r, kappa)?;
    let too_high = || {
        StrakeError::InvalidArgument(format!(
            "scallop height = {h} is not reachable with cutter radius {r} on this curvature"
        ))
    };
    if kappa == 0.0 {
        if h > r {
            return Err(too_high());
        }
        return Ok(2.0 * (h * (2.0 * r - h)).sqrt());
    }
    let rho = 1.0 / kappa.abs();
    // Law of cosines at the cusp, distance d from the centre: cos(θ/2) = (d² + rc² − r²)/(2 d rc).
    let (d, rc) = if kappa < 0.0 {
        (rho + h, rho + r)
    } else {
        (rho - h, rho - r)
    };
    if d <= 0.0 {
        return Err(too_high());
    }
    // 1 − cos(θ/2) = (r² − (d − rc)²)/(2 d rc) = h (2r − h)/(2 d rc), since |d − rc| = |r − h|.
    let one_minus_cos = h * (2.0 * r - h) / (2.0 * d * rc);
    if !(0.0..=2.0).contains(&one_minus_cos) {
        return Err(too_high());
    }
    let cos_half = 1.0 - one_minus_cos;
    let sin_half = (one_minus_cos * (2.0 - one_minus_cos)).sqrt();
    Ok(2.0 * rho * sin_half.atan2(cos_half))
}

/// The approximate inverse w ≈ √(8 h / (1/r − κ)).
pub fn step_over_for_scallop_approx(r: f64, h: f64, kappa: f64) -> Result<f64> {
    check("cutter radius", r, true)?;
    check("scallop height", h, true)?;
    check("cross-path curvature", kappa, false)?;
    concave_fit(r, kappa)?;
    Ok((8.0 * h / (1.0 / r - kappa)).sqrt())
}
