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
//!
//! Which plane "across the path" is: the plane through the contact point spanned by b_t and
//! n_t of the tool-side frame ([`super::tool_axis::ToolFrame`]), i.e. by B and N.
//! - Curved, ρ = 1/|κ|, θ = w/ρ: the cutter centres lie on the circle of radius ρ ± r concentric
//!   with the surface's (+ convex, − concave), θ apart; the cusp is on the bisector at distance
//!   d from the centre, r² = d² + ρc² − 2 d ρc cos(θ/2) with ρc = ρ ± r; h = d − ρ (convex) or
//!   ρ − d (concave). Same geometry as Suresh & Yang, J. Eng. Ind. 116 (1994) 253–259, and
//!   Lin & Koren, J. Eng. Ind. 118 (1996) 20–28 (derived here, not copied).
//! - Approximation: h ≈ (w²/8)(1/r − κ) (convex surfaces, κ < 0, give larger scallops).
//!
//! For flat and toroidal cutters, pass the radius of the profile they sweep across the path,
//! [`super::CutterRadii::across_path`] from [`super::cutter_radii`] (r + R sin²λ/sin³β), as
//! `r`: the circle of that radius osculates the swept profile at the contact point, so heights
//! agree to leading order in the step-over. Not [`super::Cutter::effective_radius`]: that is
//! the radius normal to the inclination plane, across the path only for pure lead (a 5/1 mm
//! toroidal cutter at 10° tilt: 24 mm there, 1 mm across the path). [`step_over_for_cutter`]
//! does this and also limits the step-over by the width the cutter actually cuts.
//!
//! Scale: every length is divided by r before squaring (and multiplied back), so results keep
//! their relative accuracy for any r, w and κ whose products are representable (tested from
//! 1e-300 to 1e300).
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
            },
            x = crate::numfmt::Exact(x)
        )))
    }
}

/// A computed result, refused when it overflowed (a step-over far wider than the cutter).
fn finite_result(what: &'static str, x: f64) -> Result<f64> {
    if x.is_finite() {
        Ok(x)
    } else {
        Err(StrakeError::NonFinite {
            source: crate::error::NonFiniteSource::Result,
            what,
            value: x,
        })
    }
}

fn concave_fit(r: f64, kappa: f64) -> Result<()> {
    if kappa * r >= 1.0 {
        return Err(StrakeError::InvalidArgument(format!(
            "cutter radius {} does not fit the concave radius of curvature {}: the cutter gouges",
            crate::numfmt::Exact(r),
            crate::numfmt::Num(1.0 / kappa)
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
            "step-over = {w} is too wide for cutter radius {r}: adjacent passes do not overlap",
            w = crate::numfmt::Exact(w),
            r = crate::numfmt::Exact(r)
        ))
    };
    // Work in units of r: w' = w/r, κ' = κ r (no overflow for any representable r).
    let (w1, k1) = (w / r, kappa * r);
    let rho = 1.0 / k1.abs();
    if !rho.is_finite() || k1 == 0.0 {
        // |κ r| below ~1e-308: the plane's answer is exact to round-off.
        let q = 1.0 - 0.25 * w1 * w1;
        if q < 0.0 {
            return Err(too_wide());
        }
        return Ok(r * (0.25 * w1 * w1 / (1.0 + q.sqrt())));
    }
    let half = 0.5 * w1 / rho;
    if half >= std::f64::consts::FRAC_PI_2 {
        return Err(too_wide());
    }
    let sh = half.sin();
    let ch = half.cos();
    // 1 − cos(θ/2) = 2 s2², kept as its two factors: s2² underflows for a nearly flat
    // cross-section (θ ~ 1e-160) while rc s2 and (ρ + d) s2 stay of order w.
    let s2 = (0.5 * half).sin();
    let h1 = if k1 < 0.0 {
        let rc = rho + 1.0;
        let q = (1.0 - rc * sh) * (1.0 + rc * sh);
        if q < 0.0 {
            return Err(too_wide());
        }
        let sq = q.sqrt();
        // The cusp nearer the surface is at d = rc cos(θ/2) − √q from the centre, and
        // h = d − ρ. Without cancellation (r ≫ ρ made the direct forms lose every digit):
        // d = (rc² − 1)/(rc cos(θ/2) + √q) = ρ (ρ + 2)/(rc cos(θ/2) + √q), and
        // h = rc (1 − cos(θ/2)) (ρ + d)/(1 + √q) (from 1 − q = rc² sin²(θ/2)).
        let d = rho * ((rho + 2.0) / (rc * ch + sq));
        2.0 * (rc * s2) * (((rho + d) * s2) / (1.0 + sq))
    } else {
        let rc = rho - 1.0;
        let q = (1.0 - rc * sh) * (1.0 + rc * sh);
        if q < 0.0 {
            return Err(too_wide());
        }
        // d = rc cos(θ/2) + √q; h = ρ − d = (1 − √q) + rc (1 − cos(θ/2)), both terms ≥ 0.
        (rc * sh) * (rc * sh) / (1.0 + q.sqrt()) + 2.0 * (rc * s2) * s2
    };
    Ok(r * h1)
}

/// The common approximation h ≈ (w²/8)(1/r − κ) (same arguments and sign as
/// [`scallop_height`]).
pub fn scallop_height_approx(r: f64, w: f64, kappa: f64) -> Result<f64> {
    check("cutter radius", r, true)?;
    check("step-over", w, true)?;
    check("cross-path curvature", kappa, false)?;
    concave_fit(r, kappa)?;
    // (w/8)(w/r)(1 − κ r): no square of a length, so no overflow at extreme scales.
    let h = (w / 8.0) * (w / r) * (1.0 - kappa * r);
    finite_result("approximate scallop height", h)
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
            "scallop height = {h} is not reachable with cutter radius {r} on this curvature",
            h = crate::numfmt::Exact(h),
            r = crate::numfmt::Exact(r)
        ))
    };
    // In the host's lengths, not in units of r: h/r and κ r under- and overflow at extreme
    // but valid scales (r = DBL_MAX on a convex cross-section of radius 0.3, a denormal h),
    // while every factor below stays representable. √(2r − h) is finite for h < 2r.
    let root_2r_h = sqrt_sum(r, r - h);
    if root_2r_h.is_nan() || root_2r_h <= 0.0 {
        return Err(too_high());
    }
    let rho = 1.0 / kappa.abs();
    if kappa == 0.0 || !rho.is_finite() {
        // The plane: the chord of the circle at depth h, w = 2 √(h (2r − h)).
        if h > r {
            return Err(too_high());
        }
        return finite_result("step-over", 2.0 * h.sqrt() * root_2r_h);
    }
    // Law of cosines at the cusp, distance D from the centre of the cross-section's circle
    // (radius ρ) and Rc from it to the cutter's centre: cos(θ/2) = (D² + Rc² − r²)/(2 D Rc),
    // so 1 − cos(θ/2) = (r² − (D − Rc)²)/(2 D Rc) = h (2r − h)/(2 D Rc) since |D − Rc| = |r − h|.
    let (root_d, root_rc) = if kappa < 0.0 {
        (sqrt_sum(rho, h), sqrt_sum(rho, r))
    } else {
        ((rho - h).sqrt(), (rho - r).sqrt())
    };
    if root_d.is_nan() || root_rc.is_nan() || root_d <= 0.0 || root_rc <= 0.0 {
        return Err(too_high());
    }
    // θ/2 = 2 asin(√((1 − cos(θ/2))/2)) with x = √((1 − cos(θ/2))/2) taken factor by factor
    // (D Rc may be 1e600 for a nearly flat surface, h (2r − h) 1e-320 for a denormal h).
    let x = 0.5 * (h.sqrt() / root_d) * (root_2r_h / root_rc);
    if x.is_nan() || x > 1.0 {
        return Err(too_high());
    }
    // w = 4 ρ asin(x) = 4 ρ x · asin(x)/x, with 4 ρ x = 2 √h √(2r − h) (√ρ/√D)(√ρ/√Rc): the
    // last two factors are near 1 on a nearly flat cross-section, where x itself may
    // underflow (ρ = 1e300, h = 1e-300); asin(x)/x = 1 + x²/6 + … is 1 to round-off below 1e-8.
    let linear = 2.0 * h.sqrt() * root_2r_h * ((rho.sqrt() / root_d) * (rho.sqrt() / root_rc));
    let arc = if x < 1e-8 { 1.0 } else { x.asin() / x };
    finite_result("step-over", linear * arc)
}

/// √(a + b) for finite a ≥ 0 and a + b ≥ 0, without overflow when a + b exceeds the largest
/// double (both scaled by 1/4, exact for such magnitudes).
fn sqrt_sum(a: f64, b: f64) -> f64 {
    let s = a + b;
    if s.is_finite() {
        s.sqrt()
    } else {
        2.0 * (0.25 * a + 0.25 * b).sqrt()
    }
}

/// The approximate inverse w ≈ √(8 h / (1/r − κ)).
pub fn step_over_for_scallop_approx(r: f64, h: f64, kappa: f64) -> Result<f64> {
    check("cutter radius", r, true)?;
    check("scallop height", h, true)?;
    check("cross-path curvature", kappa, false)?;
    concave_fit(r, kappa)?;
    // √8 √h √(r/(1 − κ r)), with r/(1 − κ r) written as 1/(1/r − κ) for r ≥ 1 (κ r may
    // overflow there, 1/r may overflow below 1).
    let q = if r < 1.0 {
        r / (1.0 - kappa * r)
    } else {
        1.0 / (1.0 / r - kappa)
    };
    let w = 8f64.sqrt() * h.sqrt() * q.sqrt();
    finite_result("approximate step-over", w)
}

/// The step-over for a target scallop height with a given cutter and axis: see
/// [`step_over_for_cutter`]. Lengths in the host's unit.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CutterStepOver {
    /// The step-over to use: the smaller of `model` and `width_limit`.
    pub step_over: f64,
    /// The exact circle-geometry step-over of [`step_over_for_scallop`] for the radius of the
    /// swept profile across the path ([`super::CutterRadii::across_path`]); infinite when that
    /// radius is infinite on a surface that is flat across the path (a flat bottom leaves no
    /// scallop of its own), not used (infinite) when it is 0 (a sharp corner cuts across).
    pub model: f64,
    /// The width the cutter actually cuts at the scallop height, [`super::cut_width`]: the
    /// exact step-over on a plane, conservative on a surface concave across the path.
    pub width_limit: f64,
    /// The radius across the path used by the model.
    pub radius_across: f64,
    /// True when the width limit, not the model, set the step-over.
    pub limited_by_width: bool,
}

/// The largest step-over (arc length across the path) that keeps the scallop height at or
/// below `h` for `cutter` with its axis set by `angles`, on a surface of curvature across the
/// path `kappa` (= s κn(B), positive concave toward the tool): the circle model of
/// [`step_over_for_scallop`] with the radius of the profile the cutter sweeps across the path,
/// limited by the width the cutter cuts at height h ([`super::cut_width`]). A flat 10 mm cutter
/// at 5° lead and h = 0.5 mm: the model alone says 15.1 mm, the cutter is 10 mm wide.
///
/// With a flat bottom touching (R > 0, axis along the normal) the model is the exact line
/// geometry: no scallop of its own on a plane (model infinite), on a convex cross-section of
/// radius ρ the tangent lines of adjacent passes meet at h = ρ (1/cos(θ/2) − 1), θ = w/ρ;
/// a concave cross-section gouges (error).
///
/// Errors (`InvalidArgument`): an invalid cutter or angles, `h` not positive and finite,
/// `kappa` not finite, a cross-section the cutter's profile does not fit (κ ρ_across ≥ 1),
/// an unreachable height.
pub fn step_over_for_cutter(
    cutter: &super::Cutter,
    angles: &super::ToolAngles,
    h: f64,
    kappa: f64,
) -> Result<CutterStepOver> {
    check("scallop height", h, true)?;
    check("cross-path curvature", kappa, false)?;
    let radii = super::cutter_radii(cutter, angles)?;
    let rho_c = radii.across_path;
    let width_limit = super::cut_width(cutter, angles, h)?;
    let model = if rho_c == 0.0 {
        f64::INFINITY
    } else if rho_c.is_infinite() {
        if kappa > 0.0 {
            return Err(StrakeError::InvalidArgument(format!(
                "the flat bottom does not fit the concave cross-section of radius {}: the \
                 cutter gouges",
                crate::numfmt::Num(1.0 / kappa)
            )));
        } else if kappa == 0.0 {
            f64::INFINITY
        } else {
            // cos(θ/2) = ρ/(ρ + h): θ/2 = atan(√(h (2ρ + h))/ρ), written in units of ρ.
            let rho = 1.0 / -kappa;
            let h1 = h / rho;
            2.0 * rho * (h1 * (2.0 + h1)).sqrt().atan()
        }
    } else {
        step_over_for_scallop(rho_c, h, kappa)?
    };
    let step_over = model.min(width_limit);
    Ok(CutterStepOver {
        step_over,
        model,
        width_limit,
        radius_across: rho_c,
        limited_by_width: width_limit < model,
    })
}
