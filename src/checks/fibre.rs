//! Fibre steering and twist along a course (automated fibre placement, tape laying).
//!
//! - In-plane steering: the tow follows the surface with geodesic curvature κg; its steering
//!   radius is 1/|κg| (infinite along a geodesic, the "natural" path).
//! - Tow-edge strain: a tow of width w steered with curvature κg stretches one edge and
//!   compresses the other by ε ≈ (w/2)|κg| (REFERENCES.md, composites; common practice).
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
                    "{name} = {x} must be positive and finite"
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
    /// Tow-edge strain (w/2)|κg| (dimensionless).
    pub edge_strain: f64,
    /// Twist rate τg (radians per length, signed).
    pub twist_rate: f64,
    /// True when the steering radius is below the limit.
    pub steering_violated: bool,
    /// True when |τg| exceeds the limit.
    pub twist_violated: bool,
}

/// Steering and twist of a course at frame `f`.
pub fn fibre_state(f: &DarbouxFrame, limits: &FibreLimits) -> Result<FibreState> {
    limits.validate()?;
    let k = f.geodesic_curvature.abs();
    Ok(FibreState {
        steering_curvature: k,
        steering_radius: if k > 0.0 { 1.0 / k } else { f64::INFINITY },
        edge_strain: 0.5 * limits.tow_width * k,
        twist_rate: f.geodesic_torsion,
        steering_violated: k * limits.min_steering_radius > 1.0,
        twist_violated: f.geodesic_torsion.abs() > limits.max_twist_rate,
    })
}
