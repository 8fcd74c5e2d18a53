//! Fibre steering and twist along a course (automated fibre placement, tape laying).
//!
//! - In-plane steering: the tow follows the surface with geodesic curvature κg; its steering
//!   radius is 1/|κg| (infinite along a geodesic, the "natural" path).
//! - Tow-edge strain: the edge at signed geodesic distance y from the centreline (y > 0 to the
//!   left of travel, on the B side) is a geodesic parallel of the course; its length element
//!   is (1 − κg y − K y²/2 + O(y³)) ds (the Jacobi equation for geodesic parallels on a surface
//!   of Gaussian curvature K; do Carmo §4-6), so it is strained by ε(y) ≈ −κg y − K y²/2
//!   relative to the centreline ([`tow_edges`]). Steering (κg) stretches the outer edge and
//!   compresses the inner one by (w/2)|κg| (common practice); on a doubly curved surface
//!   (K > 0) both edges shorten: a 150 mm tape along a great circle of a 1 m sphere has both
//!   edges at −0.28 % (exactly cos(y/R) − 1).
//! - Twist: the tangent plane turns about the path at the rate τg (geodesic torsion, radians per
//!   length), so a tape or the compaction roller twists by τg per unit length.
//!
//! Published orientation for limits: minimum steering radius for 6.35 mm (¼ in) tows around
//! 0.6–1.5 m in production (common practice); one trial found 1350 mm the tightest defect-free
//! radius under its conditions (Smith, Qureshi, Scaife, El-Dessouky, J. Reinf. Plast. Compos.
//! 35(21) (2016) 1527–1542). Use your own material's qualified limits.

use crate::error::{Result, StrakeError};
use crate::geometry::frame::DarbouxFrame;

/// Limits for a fibre course (lengths in the host's unit).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FibreLimits {
    /// Tow (or tape) width, > 0.
    pub tow_width: f64,
    /// Smallest admissible steering radius, > 0.
    pub min_steering_radius: f64,
    /// Largest admissible |τg| (radians per length), > 0.
    pub max_twist_rate: f64,
}

impl FibreLimits {
    /// Errors (`InvalidArgument`, naming the field) unless every limit is positive and finite.
    pub fn validate(&self) -> Result<()> {
        let fields = [
            ("tow_width", self.tow_width),
            ("min_steering_radius", self.min_steering_radius),
            ("max_twist_rate", self.max_twist_rate),
        ];
        for (name, x) in fields {
            if !(x.is_finite() && x > 0.0) {
                return Err(StrakeError::InvalidArgument(format!(
                    "{name} = {x} must be positive and finite",
                    x = crate::numfmt::Exact(x)
                )));
            }
        }
        Ok(())
    }
}

/// Steering and twist at one sample.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FibreState {
    /// Steering curvature |κg| (1/length).
    pub steering_curvature: f64,
    /// Steering radius 1/|κg| (infinite along a geodesic).
    pub steering_radius: f64,
    /// The larger tow-edge strain magnitude max(|ε_left|, |ε_right|) (dimensionless),
    /// including the Gaussian-curvature term (see [`TowEdges`]; was (w/2)|κg| alone).
    pub edge_strain: f64,
    /// The strain of each edge.
    pub edges: TowEdges,
    /// Twist rate τg (radians per length, signed).
    pub twist_rate: f64,
    /// True when the steering radius is below the limit.
    pub steering_violated: bool,
    /// True when |τg| exceeds the limit.
    pub twist_violated: bool,
}

/// The strain of the two edges of a tow or tape centred on the course (dimensionless,
/// negative = compressed, relative to the centreline's length).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct TowEdges {
    /// Strain of the left edge (y = +w/2, on the B side): −κg w/2 − K w²/8.
    pub left: f64,
    /// Strain of the right edge (y = −w/2): +κg w/2 − K w²/8.
    pub right: f64,
    /// The steering part (w/2)|κg| (one edge stretched, the other compressed by it).
    pub steering_term: f64,
    /// The Gaussian-curvature part −K w²/8, the same on both edges (negative on a doubly
    /// curved surface: both edges shorten).
    pub gaussian_term: f64,
    /// True when the left edge is compressed (left < 0).
    pub left_compressed: bool,
    /// True when the right edge is compressed (right < 0).
    pub right_compressed: bool,
}

/// The strain of each edge of a tow of width `tow_width` centred on the course at frame `f`:
/// ε(y) = −κg y − K y²/2 at y = ±w/2 (module docs; second order in w, so accurate while
/// w |κg| and w² |K| are small). K = k1 k2 does not depend on the side of the surface.
///
/// Errors: `InvalidArgument` for a width not positive and finite; `NonFinite` (computed
/// result) when a strain overflows (e.g. a width of 1e300 on a curved surface).
pub fn tow_edges(f: &DarbouxFrame, tow_width: f64) -> Result<TowEdges> {
    if !(tow_width.is_finite() && tow_width > 0.0) {
        return Err(StrakeError::InvalidArgument(format!(
            "tow_width = {tow_width} must be positive and finite",
            tow_width = crate::numfmt::Exact(tow_width)
        )));
    }
    let y = 0.5 * tow_width;
    let kg = f.geodesic_curvature;
    let gauss = f.principal.k1 * f.principal.k2;
    let steer = y * kg;
    let gaussian_term = -0.5 * (y * (y * gauss));
    let left = -steer + gaussian_term;
    let right = steer + gaussian_term;
    for (what, x) in [
        ("tow left edge strain", left),
        ("tow right edge strain", right),
    ] {
        if !x.is_finite() {
            return Err(StrakeError::NonFinite {
                source: crate::error::NonFiniteSource::Result,
                what,
                value: x,
            });
        }
    }
    Ok(TowEdges {
        left,
        right,
        steering_term: steer.abs(),
        gaussian_term,
        left_compressed: left < 0.0,
        right_compressed: right < 0.0,
    })
}

/// Steering and twist of a course at frame `f`.
///
/// Errors: `InvalidArgument` for a limit not positive and finite; `NonFinite` (computed
/// result) when an edge strain overflows.
pub fn fibre_state(f: &DarbouxFrame, limits: &FibreLimits) -> Result<FibreState> {
    limits.validate()?;
    let k = f.geodesic_curvature.abs();
    let edges = tow_edges(f, limits.tow_width)?;
    Ok(FibreState {
        steering_curvature: k,
        steering_radius: if k > 0.0 { 1.0 / k } else { f64::INFINITY },
        edge_strain: edges.left.abs().max(edges.right.abs()),
        edges,
        twist_rate: f.geodesic_torsion,
        steering_violated: k * limits.min_steering_radius > 1.0,
        twist_violated: f.geodesic_torsion.abs() > limits.max_twist_rate,
    })
}
