//! strake: the Darboux frame of a curve on a freeform surface and its invariants (normal
//! curvature, geodesic curvature, geodesic torsion), with the surface's principal curvatures,
//! computed exactly from analytic derivatives, for CAM toolpath generation.
//!
//! Layers, data flowing one way: [`nurbs`] → [`surface`] / [`curve`] → [`frame`]
//! (with [`principal`]) → [`path`] → `ffi` (the C ABI, the only module with raw pointers).
//! Conventions (signs, orientation, units) are documented in [`frame`] and [`principal`].

#![warn(missing_docs)]

pub mod analytic;
mod batch;
pub mod checks;
pub mod curve;
pub mod error;
pub mod ffi;
pub mod frame;
mod frame_block;
pub mod jet;
mod lanes;
pub mod math;
pub mod nurbs;
pub mod parallel;
pub mod path;
pub mod principal;
pub mod projection;
pub mod sampling;
pub mod surface;

pub use curve::{FnCurve, UvCurve, uv_line};
pub use error::{NonFiniteSource, Result, StrakeError};
pub use frame::{
    Conditioning, DarbouxFrame, ParamScales, darboux_frame, principal_angle, space_curvature,
};
pub use frame_block::{BLOCK, darboux_frames};
pub use jet::{CurveJet, DerivOrder, Interval, SurfaceJet};
pub use math::Vec3;
pub use nurbs::{
    EndDerivatives, KnotVector, NurbsCurve, NurbsSurface, NurbsSurfaceData, Parametrization,
    SpanHint, interpolate,
};
pub use path::{CurveOnSurface, Hints, PathSample, SampleError};
pub use principal::{Orientation, PrincipalCurvatures, SurfacePoint};
pub use projection::{
    FitOptions, ProjectedCurve, Projection, ProjectionOptions, Projector, SeamCurve, project_curve,
    project_points, project_points_into, uv_curve_through_points,
};
pub use sampling::{
    ChordalOptions, SampleSink, SinkFn, arc_length, sample_chordal, sample_even_arc, sample_even_t,
};
pub use surface::{FnSurface, SurfaceHint, SurfaceSource};
