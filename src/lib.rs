//! strake: the Darboux frame of a curve on a freeform surface and its invariants (normal
//! curvature, geodesic curvature, geodesic torsion), with the surface's principal curvatures,
//! computed exactly from analytic derivatives, for CAM toolpath generation.
//!
//! Layers, data flowing one way: [`nurbs`] → [`surface`] / [`curve`] → [`frame`]
//! (with [`principal`]) → [`path`] → `ffi` (the C ABI, the only module with raw pointers).
//! Conventions (signs, orientation, units) are documented in [`frame`] and [`principal`].

#![warn(missing_docs)]

pub mod analytic;
pub mod curve;
pub mod error;
pub mod ffi;
pub mod frame;
pub mod jet;
pub mod math;
pub mod nurbs;
pub mod path;
pub mod principal;
pub mod surface;

pub use curve::{FnCurve, UvCurve, uv_line};
pub use error::{NonFiniteSource, Result, StrakeError};
pub use frame::{
    Conditioning, DarbouxFrame, ParamScales, darboux_frame, principal_angle, space_curvature,
};
pub use jet::{CurveJet, DerivOrder, Interval, SurfaceJet};
pub use math::Vec3;
pub use nurbs::{KnotVector, NurbsCurve, SpanHint};
pub use path::{CurveOnSurface, Hints, SampleError};
pub use principal::{Orientation, PrincipalCurvatures, SurfacePoint};
pub use surface::{FnSurface, SurfaceHint, SurfaceSource};
