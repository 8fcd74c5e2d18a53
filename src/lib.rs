//! strake: the Darboux frame of a curve on a freeform surface and its invariants (normal
//! curvature, geodesic curvature, geodesic torsion), with the surface's principal curvatures,
//! computed exactly from analytic derivatives, for CAM toolpath generation.
//!
//! Layers, data flowing one way: [`nurbs`] → [`surface`] / [`curve`] (the sources) →
//! [`geometry`] (jets, frame, principal curvatures) → [`engine`] (many points per call) →
//! [`paths`] (a curve on a surface, sampling, projection) → [`checks`] → `ffi` (the C ABI, the
//! only module with raw pointers). Conventions (signs, orientation, units) are documented in
//! [`geometry::frame`] and [`geometry::principal`].

#![warn(missing_docs)]
// Since the MSRV is 1.89 (the AVX-512 intrinsics), clippy suggests let-chains for nested
// `if let`; the code keeps the nested form.
#![allow(clippy::collapsible_if)]

pub mod analytic;
pub mod checks;
pub mod curve;
pub mod engine;
pub mod error;
pub mod ffi;
pub mod geodesics;
pub mod geometry;
pub mod isa;
pub(crate) mod numfmt;
pub mod nurbs;
pub mod paths;
pub mod planning;
pub mod surface;
pub mod toolpath;

pub use curve::{FnCurve, UvCurve, uv_line};
pub use engine::frame_block::{BLOCK, darboux_frames};
pub use error::{NonFiniteSource, Result, StrakeError};
pub use geodesics::between::{BetweenOptions, GeodesicBetween, geodesic_between};
pub use geodesics::hermite::HermiteUvCurve;
pub use geodesics::offset::{
    OffsetDistance, OffsetOptions, OffsetPiece, OffsetSample, OffsetSide, PathInterval,
    SurfaceOffset, offset_path,
};
pub use geodesics::trace::{
    DomainSide, Geodesic, GeodesicEnd, StartDirection, TraceOptions, TraceStats, trace_geodesic,
};
pub use geometry::frame::{
    Conditioning, DarbouxFrame, ParamScales, darboux_frame, principal_angle, space_curvature,
};
pub use geometry::jet::{CurveJet, DOMAIN_SNAP_ULPS, DerivOrder, Interval, SurfaceJet};
pub use geometry::jet::{CurvePartials, MAX_PARTIAL_ORDER, SurfacePartials};
pub use geometry::math::Vec3;
pub use geometry::principal::{Orientation, PrincipalCurvatures, SurfacePoint};
pub use geometry::rates::{InvariantRates, invariant_rates};
pub use isa::{VectorKernels, limit_vector_kernels, supported_vector_kernels, vector_kernels};
pub use nurbs::{
    EndDerivatives, KnotLine, KnotVector, NurbsCurve, NurbsSurface, NurbsSurfaceData,
    Parametrization, SpanHint, interpolate,
};
pub use paths::curve_on_surface::{CurveOnSurface, Hints, PathSample, SampleError};
pub use paths::projection::{
    FitOptions, ProjectedCurve, Projection, ProjectionOptions, Projector, SeamCurve, project_curve,
    project_points, project_points_into, uv_curve_through_points,
};
pub use paths::sampling::{
    ChordalOptions, SampleSink, SinkFn, arc_length, sample_chordal, sample_even_arc, sample_even_t,
};
pub use paths::sampling::{MAX_QUADRATURE_RULES, RESOLUTION_ULPS};
pub use planning::courses::{
    CourseCheck, CourseGap, CourseGaps, FieldCourse, adjacent_course, course_check, course_gaps,
    fixed_angle_course, natural_course,
};
pub use planning::drive_pattern::{
    DriveOptions, DrivePiece, DrivePlane, DriveProjection, PatternInterval, PatternIntervalKind,
    PieceCurve, RayCaster, RayHit, project_along,
};
pub use planning::passes::{PassOptions, PassPlan, PlannedPass, StepRule, plan_passes};
pub use planning::planar_pattern::{ArchimedeanSpiral, parallel_lines};
pub use planning::scallop_cutter::{
    CutterScallop, CutterScallopLeft, CutterScallopStep, PassCutter, cutter_step_over_at,
    scallop_between_cutter_passes, scallop_between_cutters, step_over_for_cutter_scallop,
};
pub use planning::scallop_left::{
    ScallopLeft, check_target_scallop, scallop_between, step_over_at,
};
pub use surface::{CreaseFlags, KnotSide, KnotSides};
pub use surface::{FnSurface, SurfaceHint, SurfaceSource};
pub use toolpath::{
    CentreFeed, CentreFeedLimits, CentrePoint, FeedBound, ToolSetup, centre_feed, centre_path_at,
    centre_point,
};
pub use toolpath::{centre_feed_path, centre_of_frame, sample_chordal_centre};
