//! Cutter descriptions and the side of the surface the tool is on.

use crate::error::{Result, StrakeError};

/// Which side of the surface the tool is on.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ToolSide {
    /// On the side the surface normal N points to.
    AlongNormal,
    /// On the side opposite to N.
    AgainstNormal,
}

impl ToolSide {
    /// s = +1 for `AlongNormal`, −1 for `AgainstNormal`: multiply a normal curvature by s to
    /// get the curvature concave toward the tool.
    #[inline]
    pub fn sign(self) -> f64 {
        match self {
            ToolSide::AlongNormal => 1.0,
            ToolSide::AgainstNormal => -1.0,
        }
    }
}

/// A milling cutter's shape (lengths in the host's unit).
///
/// Every cutter is described as a torus swept about the tool axis: a corner circle of radius
/// `r` whose centre lies at distance `R` (the major radius) from the axis. A ball-end mill has
/// R = 0, r = radius; a flat-end mill R = radius, r = 0; a toroidal (bull-nose) mill
/// R = tool radius − corner radius.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Cutter {
    /// Ball-end mill of the given radius.
    Ball {
        /// Ball radius (> 0).
        radius: f64,
    },
    /// Flat-end mill of the given radius.
    Flat {
        /// Tool radius (> 0).
        radius: f64,
    },
    /// Toroidal (bull-nose) mill.
    Toroidal {
        /// Tool radius (> 0), axis to the outermost point of the cutting edge.
        radius: f64,
        /// Corner radius, 0 < corner_radius ≤ radius.
        corner_radius: f64,
    },
}

impl Cutter {
    /// Checks the dimensions. Errors (`InvalidArgument`, naming the field): a radius that is not
    /// positive and finite, a corner radius that is not positive and finite or exceeds the tool
    /// radius.
    pub fn validate(&self) -> Result<()> {
        let positive = |name: &str, x: f64| {
            if x.is_finite() && x > 0.0 {
                Ok(())
            } else {
                Err(StrakeError::InvalidArgument(format!(
                    "cutter {name} = {x} must be positive and finite"
                )))
            }
        };
        match *self {
            Cutter::Ball { radius } | Cutter::Flat { radius } => positive("radius", radius),
            Cutter::Toroidal {
                radius,
                corner_radius,
            } => {
                positive("radius", radius)?;
                positive("corner_radius", corner_radius)?;
                if corner_radius > radius {
                    return Err(StrakeError::InvalidArgument(format!(
                        "cutter corner_radius = {corner_radius} exceeds the tool radius {radius}"
                    )));
                }
                Ok(())
            }
        }
    }

    /// (R, r): the major radius (axis to corner-circle centre) and the corner radius.
    #[inline]
    pub fn torus_radii(&self) -> (f64, f64) {
        match *self {
            Cutter::Ball { radius } => (0.0, radius),
            Cutter::Flat { radius } => (radius, 0.0),
            Cutter::Toroidal {
                radius,
                corner_radius,
            } => (radius - corner_radius, corner_radius),
        }
    }

    /// The effective cutting radius across the direction in which the axis is inclined, for an
    /// axis inclined by β from the surface normal: R/sin β + r (Vickers & Quan, J. Eng. Ind.
    /// 111(1) (1989) 22–26). Infinite for a flat or toroidal cutter at β = 0 (the flat bottom
    /// touches along a line); r for a ball (independent of β).
    ///
    /// Derivation (checked in the tests): the corner-circle centres form a circle of radius R in
    /// a plane inclined by β; seen along the inclination direction it is an ellipse with
    /// semi-axes R and R sin β whose radius of curvature at the contact end is R/sin β; the
    /// cutting edge is that curve offset by r.
    #[inline]
    pub fn effective_radius(&self, beta: f64) -> f64 {
        let (big_r, r) = self.torus_radii();
        if big_r == 0.0 {
            return r;
        }
        let s = beta.sin().abs();
        if s == 0.0 {
            f64::INFINITY
        } else {
            big_r / s + r
        }
    }
}
