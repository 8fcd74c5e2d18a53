//! The tool axis for given lead and tilt angles.
//!
//! Conventions (our own, stated once): the tool axis a is the unit vector from the cutter tip
//! toward the spindle. n_t = s N is the surface normal on the tool side (s from [`ToolSide`]).
//! The lead angle λ leans the axis from n_t toward the feed direction T; the tilt angle θ then
//! leans it toward B = N × T:
//!
//! a = sin λ T + cos λ sin θ B + cos λ cos θ n_t.
//!
//! λ = θ = 0 puts the axis along the tool-side normal. The inclination β of the axis from n_t
//! satisfies cos β = cos λ cos θ. Both angles in radians, each in (−π/2, π/2).

use super::cutter::ToolSide;
use crate::error::{Result, StrakeError};
use crate::geometry::frame::DarbouxFrame;
use crate::geometry::math::Vec3;

/// Lead and tilt angles (radians).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ToolAngles {
    /// Lead angle λ: toward the feed direction T, in (−π/2, π/2).
    pub lead: f64,
    /// Tilt angle θ: toward the side direction B, in (−π/2, π/2).
    pub tilt: f64,
}

impl ToolAngles {
    /// Errors (`InvalidArgument`, naming the field) unless both angles are finite and strictly
    /// inside (−π/2, π/2).
    pub fn validate(&self) -> Result<()> {
        for (name, x) in [("lead", self.lead), ("tilt", self.tilt)] {
            if !(x.is_finite() && x.abs() < std::f64::consts::FRAC_PI_2) {
                return Err(StrakeError::InvalidArgument(format!(
                    "{name} angle = {x} rad is outside (-pi/2, pi/2)"
                )));
            }
        }
        Ok(())
    }

    /// Inclination β of the axis from the tool-side normal: acos(cos λ cos θ), in [0, π/2).
    #[inline]
    pub fn inclination(&self) -> f64 {
        (self.lead.cos() * self.tilt.cos()).clamp(-1.0, 1.0).acos()
    }

    /// Components (along T, along B, along n_t) of the axis.
    #[inline]
    pub fn local(&self) -> [f64; 3] {
        let (sl, cl) = self.lead.sin_cos();
        let (st, ct) = self.tilt.sin_cos();
        [sl, cl * st, cl * ct]
    }
}

/// The tool axis at a sample.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ToolAxis {
    /// Components along (T, B, N) of the Darboux frame (note: along N, not n_t).
    pub darboux: [f64; 3],
    /// The unit axis in space.
    pub space: Vec3,
}

/// The tool axis for `angles` at frame `f` with the tool on `side` (see the module docs).
pub fn tool_axis(f: &DarbouxFrame, side: ToolSide, angles: &ToolAngles) -> Result<ToolAxis> {
    angles.validate()?;
    let [at, ab, an] = angles.local();
    let an = an * side.sign();
    Ok(ToolAxis {
        darboux: [at, ab, an],
        space: f.t * at + f.b * ab + f.n * an,
    })
}
