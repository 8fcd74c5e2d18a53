//! The C ABI: the only module with `extern "C"` and raw pointers. Thin by design: each function
//! checks its arguments, converts them, calls the layers above and maps errors to statuses.
//! Nothing of the math lives here. The header `include/strake.h` is generated from these items
//! by cbindgen (see `cbindgen.toml` and `tests/header.rs`).
//!
//! Rules every exported function follows:
//! - Its name starts with `strake_`, types with `Strake`, constants with `STRAKE_`.
//! - Its whole body runs inside the guard of `guard.rs` (one `catch_unwind` boundary): no panic
//!   crosses into the host; a caught panic is `STRAKE_STATUS_INTERNAL_PANIC`.
//! - It returns a [`StrakeStatus`] (functions that cannot fail return their value instead).
//! - Every pointer is checked: NULL (or misaligned) gives `STRAKE_STATUS_NULL_POINTER` naming
//!   the argument; counts of zero or sizes that overflow give `STRAKE_STATUS_INVALID_ARGUMENT`.
//! - Outputs are written only on success; on failure the thread-local message (see
//!   `strake_last_error_message`) says which argument, index, value or sample was wrong. The
//!   one exception: a function that fills a caller buffer (`buf`, `capacity`, `count`, see
//!   `guard::OutBuffer`) writes `*count` = the number of elements needed when it returns
//!   `STRAKE_STATUS_BUFFER_TOO_SMALL`, and nothing else.
//! - Inputs are `const` pointers, outputs non-`const`; arrays are copied at creation, so the
//!   host may free them after the call. Handles are owned by the host and released with the
//!   matching `_free` function, where NULL is a no-op.
//!
//! Threads: handles are immutable after creation; one handle may be evaluated from many
//! threads at once. Host callbacks may then be called concurrently from those threads, so the
//! host's callback and `user_data` must allow that (or the host evaluates from one thread).
//! Messages and callback codes are per thread.
//!
//! Adding a constructor for another kind of surface or curve takes one new file here: build the
//! Rust object, wrap it with [`StrakeSurface::new`] or [`StrakeCurve::new`] and hand it out; the
//! evaluation functions work unchanged.

pub(crate) mod guard;

pub mod batch_callback;
pub mod checks;
pub mod courses;
pub mod curve;
pub mod evaluate;
pub mod geodesics;
pub mod high_callback;
pub mod message;
pub mod nurbs_surface;
pub mod parallel;
pub mod path_curves;
pub mod planning;
pub mod sampling;
pub mod status;
pub mod surface;
pub mod surface_evaluate;
pub mod toolpath;
pub mod types;
pub mod version;

pub use batch_callback::{StrakeSurfaceBatchFn, strake_surface_from_batch_callback};
pub use checks::{
    strake_check_feed, strake_check_fibre, strake_check_gouge, strake_check_scallop,
    strake_check_step_over, strake_path_extremes, strake_path_violations, strake_tool_axis,
};
pub use courses::{
    strake_course_adjacent, strake_course_check, strake_course_fixed_angle, strake_course_gaps,
};
pub use curve::{
    StrakeCurve, StrakeCurveFn, StrakeCurveHighFn, strake_curve_free, strake_curve_from_callback,
    strake_curve_from_high_callback, strake_curve_new_nurbs,
};
pub use evaluate::{strake_frame_at, strake_frame_from_jets, strake_frames_at, strake_frames_even};
pub use geodesics::{
    StrakeOffset, strake_geodesic_between, strake_geodesic_trace, strake_offset_exits,
    strake_offset_free, strake_offset_loops, strake_offset_new, strake_offset_piece_curve,
    strake_offset_piece_points, strake_offset_summary,
};
pub use message::{strake_callback_report, strake_last_callback_code, strake_last_error_message};
pub use nurbs_surface::{StrakeNurbsSurfaceData, strake_surface_new_nurbs};
pub use parallel::strake_frames_at_parallel;
pub use path_curves::{
    strake_curve_project_nurbs, strake_curve_through_space_points, strake_curve_through_uv_points,
    strake_surface_project_points,
};
pub use planning::{
    StrakeDriveResult, StrakePassPlan, strake_curve_new_spiral, strake_drive_project,
    strake_drive_result_free, strake_drive_result_intervals, strake_drive_result_piece,
    strake_drive_result_piece_count, strake_pass_plan_curve, strake_pass_plan_free,
    strake_pass_plan_passes, strake_pass_plan_summary, strake_plan_passes,
};
pub use sampling::{
    strake_arc_length, strake_sample_chordal, strake_sample_even_arc, strake_sample_even_t,
    strake_samples_at,
};
pub use status::{StrakeStatus, strake_status_name};
pub use surface::{
    StrakeSurface, StrakeSurfaceFn, strake_surface_free, strake_surface_from_callback,
    strake_surface_set_knot_lines,
};
pub use surface_evaluate::strake_surface_evaluate;
pub use types::{StrakeCourseCheck, StrakeCourseGap};
pub use types::{
    StrakeCurveHighJet, StrakeCurveJet, StrakeCutter, StrakeCutterKind, StrakeExtremes,
    StrakeFeedLimits, StrakeFibreLimits, StrakeFibreState, StrakeFrame, StrakeGougeState,
    StrakeParamScales, StrakeParametrization, StrakeProjection, StrakeProjectionOptions,
    StrakeSample, StrakeScallop, StrakeStepOver, StrakeSurfaceJet, StrakeToolAngles,
    StrakeToolAxis, StrakeToolSide, StrakeViolation,
};
pub use types::{
    StrakeDirectionKind, StrakeDomainSide, StrakeDriveOptions, StrakeDrivePlane, StrakeGeodesicEnd,
    StrakeGeodesicInfo, StrakeGeodesicOptions, StrakeOffsetOptions, StrakeOffsetPoint,
    StrakeOffsetSide, StrakeOffsetSummary, StrakePassInfo, StrakePassOptions, StrakePassSummary,
    StrakePathInterval, StrakePatternInterval, StrakePatternIntervalKind, StrakeStepRule,
};
pub use version::strake_version;
// The cutter's radii, rear gouging, tow edges, the width-limited step-over and the path
// versions of the checks.
pub use checks::{
    strake_check_feed_path, strake_check_fibre_path, strake_check_gouge_path,
    strake_check_rear_gouge, strake_check_rear_gouge_path, strake_check_scallop_path,
    strake_check_step_over_cutter, strake_check_step_over_cutter_path, strake_check_tow_edges,
    strake_check_tow_edges_path, strake_cutter_radii, strake_tool_axis_path,
};
pub use types::{StrakeCutterRadii, StrakeCutterStepOver, StrakeRearGouge, StrakeTowEdges};
// Crease flags of knot lines of reduced continuity.
pub use evaluate::strake_knot_line_flags;
pub use types::StrakeKnotLineFlag;
// The path the machine runs: rates of the invariants, the tool-centre path, its feed.
pub use high_callback::{StrakeSurfaceHighFn, strake_surface_from_high_callback};
pub use sampling::strake_sample_chordal_centre;
pub use toolpath::{
    strake_centre_feed, strake_centre_feed_path, strake_centre_path_at, strake_centre_point_at,
    strake_invariant_rates_at, strake_invariant_rates_path,
};
pub use types::StrakeSurfaceHighJet;
pub use types::{
    StrakeCentreFeed, StrakeCentreFeedLimits, StrakeCentrePoint, StrakeFeedBound,
    StrakeInvariantRates,
};
