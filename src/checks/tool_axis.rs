//! The tool-side frame and the tool axis for given lead and tilt angles.
//!
//! Conventions (our own, stated once, used by every check and by everything built on the tool
//! axis): the tool axis a is the unit vector from the cutter tip toward the spindle. The
//! tool-side frame at a sample is ([`ToolFrame`]):
//!
//! - T, the unit tangent (the feed direction);
//! - n_t = s N, the surface normal on the tool side (s from [`ToolSide::sign`]);
//! - b_t = n_t × T, across the path: to the left of travel seen from the tool (looking from
//!   the spindle down n_t toward the surface, with T pointing ahead). b_t = B on the N side
//!   and −B on the other side.
//!
//! (T, b_t, n_t) is right-handed on either side. The lead angle λ leans the axis from n_t
//! toward T; the tilt angle θ then leans it toward b_t:
//!
//! a = sin λ T + cos λ sin θ b_t + cos λ cos θ n_t.
//!
//! So a positive tilt leans the axis to the left of travel seen from the tool whichever side of
//! the surface the tool is on. λ = θ = 0 puts the axis along the tool-side normal. The
//! inclination β of the axis from n_t satisfies cos β = cos λ cos θ. Both angles in radians,
//! each in (−π/2, π/2).
//!
//! Change from the first release: the tilt used to lean toward B = N × T on both sides (so
//! toward the right of travel seen from a tool on the −N side), and the axis components were
//! reported along (T, B, N). They are now along (T, b_t, n_t); the space vector is unchanged
//! for a tool on the N side.

use super::cutter::ToolSide;
use crate::error::{Result, StrakeError};
use crate::geometry::frame::DarbouxFrame;
use crate::geometry::math::Vec3;

/// Lead and tilt angles (radians).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ToolAngles {
    /// Lead angle λ: toward the feed direction T, in (−π/2, π/2).
    pub lead: f64,
    /// Tilt angle θ: toward b_t = n_t × T (left of travel seen from the tool), in (−π/2, π/2).
    pub tilt: f64,
}

impl ToolAngles {
    /// Errors (`InvalidArgument`, naming the field) unless both angles are finite and strictly
    /// inside (−π/2, π/2).
    pub fn validate(&self) -> Result<()> {
        for (name, x) in [("lead", self.lead), ("tilt", self.tilt)] {
            if !(x.is_finite() && x.abs() < std::f64::consts::FRAC_PI_2) {
                return Err(StrakeError::InvalidArgument(format!(
                    "{name} angle = {x} rad is outside (-pi/2, pi/2)",
                    x = crate::numfmt::Exact(x)
                )));
            }
        }
        Ok(())
    }

    /// Inclination β of the axis from the tool-side normal: acos(cos λ cos θ), in [0, π/2).
    /// Computed as atan2(sin β, cos β) with sin β = √(sin²λ + cos²λ sin²θ), accurate for small
    /// angles too.
    #[inline]
    pub fn inclination(&self) -> f64 {
        let [at, ab, an] = self.local();
        at.hypot(ab).atan2(an)
    }

    /// Components (along T, along b_t, along n_t) of the axis: (sin λ, cos λ sin θ,
    /// cos λ cos θ), a unit vector to round-off.
    #[inline]
    pub fn local(&self) -> [f64; 3] {
        let (sl, cl) = self.lead.sin_cos();
        let (st, ct) = self.tilt.sin_cos();
        [sl, cl * st, cl * ct]
    }
}

/// Largest |T·N| accepted from a frame (the frames strake computes are orthogonal to
/// round-off; a frame a host assembled or edited may not be).
pub const FRAME_ORTHOGONALITY_SLACK: f64 = 1e-6;

/// The tool-side frame (T, b_t, n_t) at a sample (see the module docs): orthonormal and
/// right-handed, T × b_t = n_t.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ToolFrame {
    /// Unit tangent T (feed direction).
    pub t: Vec3,
    /// b_t = n_t × T, across the path (left of travel seen from the tool).
    pub b: Vec3,
    /// n_t = s N, the unit normal on the tool side.
    pub n: Vec3,
    /// s = ±1 of [`ToolSide::sign`].
    pub sign: f64,
}

impl ToolFrame {
    /// The tool-side frame of `f` with the tool on `side`. T and N are re-normalised and N is
    /// made exactly orthogonal to T (Gram–Schmidt), so the frame is orthonormal to round-off
    /// even when `f` is only nearly so.
    ///
    /// Errors (`InvalidArgument`): T or N not finite or of length outside 1 ± 1e-6, or
    /// |T·N| > [`FRAME_ORTHOGONALITY_SLACK`] (not a frame strake computed).
    pub fn new(f: &DarbouxFrame, side: ToolSide) -> Result<ToolFrame> {
        for (name, v) in [("tangent T", f.t), ("normal N", f.n)] {
            let len = v.norm();
            if !(len.is_finite() && (len - 1.0).abs() <= 1e-6) {
                return Err(StrakeError::InvalidArgument(format!(
                    "frame {name} = {} has length {}; it must be a unit vector",
                    crate::numfmt::ExactVec(&[v.x, v.y, v.z]),
                    crate::numfmt::Num(len)
                )));
            }
        }
        let t = f.t / f.t.norm();
        let dot = t.dot(&f.n);
        if dot.abs() > FRAME_ORTHOGONALITY_SLACK {
            return Err(StrakeError::InvalidArgument(format!(
                "frame tangent and normal are not orthogonal (T.N = {dot}); pass a frame \
                 computed by strake",
                dot = crate::numfmt::Num(dot)
            )));
        }
        let n0 = f.n - t * dot;
        let s = side.sign();
        let n = n0 * (s / n0.norm());
        let b = n.cross(&t);
        Ok(ToolFrame { t, b, n, sign: s })
    }

    /// The space vector with components `c` along (T, b_t, n_t).
    #[inline]
    pub fn to_space(&self, c: [f64; 3]) -> Vec3 {
        self.t * c[0] + self.b * c[1] + self.n * c[2]
    }

    /// Components (along T, b_t, n_t) of a space vector.
    #[inline]
    pub fn to_local(&self, v: &Vec3) -> [f64; 3] {
        [v.dot(&self.t), v.dot(&self.b), v.dot(&self.n)]
    }
}

/// The tool axis at a sample.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ToolAxis {
    /// Components along (T, b_t, n_t) of the tool-side frame: (sin λ, cos λ sin θ,
    /// cos λ cos θ).
    pub local: [f64; 3],
    /// The unit axis in space (normalised, |a| = 1 to round-off).
    pub space: Vec3,
}

/// The tool axis for `angles` at frame `f` with the tool on `side` (see the module docs).
///
/// Errors: `InvalidArgument` for an angle outside (−π/2, π/2) or a frame that is not
/// orthonormal (see [`ToolFrame::new`]).
pub fn tool_axis(f: &DarbouxFrame, side: ToolSide, angles: &ToolAngles) -> Result<ToolAxis> {
    angles.validate()?;
    let frame = ToolFrame::new(f, side)?;
    let local = angles.local();
    let a = frame.to_space(local);
    Ok(ToolAxis {
        local,
        space: a / a.norm(),
    })
}
