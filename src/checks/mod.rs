//! What a machining or fibre-placement engineer asks of a path, computed from the Darboux frame
//! and the principal curvatures: local gouging and the smallest lead angle that avoids it,
//! scallop height and step-over, curvature-limited feed, fibre steering and twist, the tool
//! axis, and path summaries with the intervals where a limit is violated.
//!
//! All of these are geometric aids. Toolpaths planned with them must be verified by simulation
//! and on the machine; machine-builder limits and licensed practice come first.
//!
//! Sign convention shared by every check: the tool is on one side of the surface, given by
//! [`ToolSide`]. A curvature "concave toward the tool" is s·κn with s = +1 when the tool is on
//! the side N points to, −1 otherwise: positive where the surface bends toward the tool (a
//! pocket floor seen from the cutter), negative where it bends away (a convex boss).

pub mod cutter;
pub mod feed;
pub mod fibre;
pub mod gouge;
pub mod path;
pub mod scallop;
pub mod summary;
pub mod tool_axis;

pub use cutter::{Cutter, CutterRadii, ToolSide, cut_width, cutter_radii};
pub use feed::{FeedLimits, curvature_limited_feed};
pub use fibre::{FibreLimits, FibreState, TowEdges, fibre_state, tow_edges};
pub use gouge::{GougeState, RearGouge, gouge_state, rear_gouge};
pub use path::{
    ScallopSample, feed_path, fibre_path, gouge_path, rear_gouge_path, scallop_path,
    scallop_sample, step_over_path, tool_axis_path, tow_edges_path,
};
pub use scallop::{
    CutterStepOver, cross_path_curvature, scallop_height, scallop_height_approx,
    step_over_for_cutter, step_over_for_scallop, step_over_for_scallop_approx,
};
pub use summary::{Extremes, PathPosition, Violation, extremes, violations};
pub use tool_axis::{ToolAngles, ToolAxis, ToolFrame, tool_axis};
