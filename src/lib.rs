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

pub mod analytic;
pub mod checks;
pub mod curve;
pub mod engine;
pub mod error;
pub mod ffi;
pub mod geometry;
pub(crate) mod numfmt;
pub mod nurbs;
pub mod paths;
pub mod surface;

pub use curve::{FnCurve, UvCurve, uv_line};
pub use engine::frame_block::{BLOCK, darboux_frames};
pub use error::{NonFiniteSource, Result, StrakeError};
pub use geometry::frame::{
    Conditioning, DarbouxFrame, ParamScales, darboux_frame, principal_angle, space_curvature,
};
pub use geometry::jet::{CurveJet, DOMAIN_SNAP_ULPS, DerivOrder, Interval, SurfaceJet};
pub use geometry::math::Vec3;
pub use geometry::principal::{Orientation, PrincipalCurvatures, SurfacePoint};
pub use nurbs::{
    EndDerivatives, KnotVector, NurbsCurve, NurbsSurface, NurbsSurfaceData, Parametrization,
    SpanHint, interpolate,
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
pub use surface::{FnSurface, SurfaceHint, SurfaceSource};
