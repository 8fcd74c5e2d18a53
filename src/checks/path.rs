//! Every check over a whole path in one call: one result per frame, in order, for hosts and
//! bindings that should not loop per sample.
//!
//! Each function clears `out`, then pushes one result per frame. A failure at frame i is
//! returned as `StrakeError::AtSample { index: i, error }` (the error the per-sample check
//! gives there) and `out` is left empty. The arguments that do not vary along the path (cutter,
//! angles, limits) are checked once before the first frame. `out` is reused without
//! reallocating when it already has the capacity.

use super::cutter::{Cutter, ToolSide};
use super::feed::{FeedLimits, curvature_limited_feed};
use super::fibre::{FibreLimits, FibreState, TowEdges, fibre_state, tow_edges};
use super::gouge::{GougeState, RearGouge, gouge_state, rear_gouge};
use super::scallop::{
    CutterStepOver, cross_path_curvature, scallop_height, scallop_height_approx,
    step_over_for_cutter,
};
use super::tool_axis::{ToolAngles, ToolAxis, tool_axis};
use crate::error::{Result, StrakeError};
use crate::geometry::frame::DarbouxFrame;

/// The scallop at one sample of a path (see [`scallop_path`]).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ScallopSample {
    /// Curvature across the path concave toward the tool, [`cross_path_curvature`].
    pub cross_curvature: f64,
    /// Exact scallop height, [`scallop_height`].
    pub height: f64,
    /// The approximation, [`scallop_height_approx`].
    pub height_approx: f64,
}

fn along<T>(
    frames: &[DarbouxFrame],
    out: &mut Vec<T>,
    mut check: impl FnMut(&DarbouxFrame) -> Result<T>,
) -> Result<()> {
    out.clear();
    if frames.is_empty() {
        return Err(StrakeError::InvalidArgument(
            "no frames: a path needs at least one sample".into(),
        ));
    }
    out.reserve(frames.len());
    for (index, f) in frames.iter().enumerate() {
        match check(f) {
            Ok(v) => out.push(v),
            Err(error) => {
                out.clear();
                return Err(StrakeError::AtSample {
                    index,
                    error: Box::new(error),
                });
            }
        }
    }
    Ok(())
}

/// [`gouge_state`] (local and rear gouging, smallest safe lead) at every frame.
pub fn gouge_path(
    frames: &[DarbouxFrame],
    side: ToolSide,
    cutter: &Cutter,
    angles: &ToolAngles,
    out: &mut Vec<GougeState>,
) -> Result<()> {
    cutter.validate()?;
    angles.validate()?;
    along(frames, out, |f| gouge_state(f, side, cutter, angles))
}

/// [`rear_gouge`] at every frame.
pub fn rear_gouge_path(
    frames: &[DarbouxFrame],
    side: ToolSide,
    cutter: &Cutter,
    angles: &ToolAngles,
    out: &mut Vec<RearGouge>,
) -> Result<()> {
    cutter.validate()?;
    angles.validate()?;
    along(frames, out, |f| rear_gouge(f, side, cutter, angles))
}

/// The scallop height at every frame for a profile of radius `r` across the path (for flat
/// and toroidal cutters [`super::CutterRadii::across_path`]) and step-over `w`.
pub fn scallop_path(
    frames: &[DarbouxFrame],
    side: ToolSide,
    r: f64,
    w: f64,
    out: &mut Vec<ScallopSample>,
) -> Result<()> {
    scallop_height(r, w, 0.0)?;
    along(frames, out, |f| scallop_sample(f, side, r, w))
}

/// The scallop at one frame: the cross-path curvature, [`scallop_height`] and
/// [`scallop_height_approx`] there (what [`scallop_path`] gives at each frame).
pub fn scallop_sample(f: &DarbouxFrame, side: ToolSide, r: f64, w: f64) -> Result<ScallopSample> {
    let kappa = cross_path_curvature(f, side);
    Ok(ScallopSample {
        cross_curvature: kappa,
        height: scallop_height(r, w, kappa)?,
        height_approx: scallop_height_approx(r, w, kappa)?,
    })
}

/// [`step_over_for_cutter`] at every frame, for scallop height `h`.
pub fn step_over_path(
    frames: &[DarbouxFrame],
    side: ToolSide,
    cutter: &Cutter,
    angles: &ToolAngles,
    h: f64,
    out: &mut Vec<CutterStepOver>,
) -> Result<()> {
    step_over_for_cutter(cutter, angles, h, 0.0)?;
    along(frames, out, |f| {
        step_over_for_cutter(cutter, angles, h, cross_path_curvature(f, side))
    })
}

/// [`curvature_limited_feed`] at every frame.
pub fn feed_path(frames: &[DarbouxFrame], limits: &FeedLimits, out: &mut Vec<f64>) -> Result<()> {
    limits.validate()?;
    along(frames, out, |f| curvature_limited_feed(f, limits))
}

/// [`fibre_state`] at every frame.
pub fn fibre_path(
    frames: &[DarbouxFrame],
    limits: &FibreLimits,
    out: &mut Vec<FibreState>,
) -> Result<()> {
    limits.validate()?;
    along(frames, out, |f| fibre_state(f, limits))
}

/// [`tow_edges`] at every frame.
pub fn tow_edges_path(
    frames: &[DarbouxFrame],
    tow_width: f64,
    out: &mut Vec<TowEdges>,
) -> Result<()> {
    along(frames, out, |f| tow_edges(f, tow_width))
}

/// [`tool_axis`] at every frame.
pub fn tool_axis_path(
    frames: &[DarbouxFrame],
    side: ToolSide,
    angles: &ToolAngles,
    out: &mut Vec<ToolAxis>,
) -> Result<()> {
    angles.validate()?;
    along(frames, out, |f| tool_axis(f, side, angles))
}
