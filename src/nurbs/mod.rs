//! NURBS: knot vectors, basis functions, curves, surfaces and exact conics (L. Piegl,
//! W. Tiller, *The NURBS Book*, 2nd ed., 1997, chapters 2–4, 7–8).

mod banded;
pub mod basis;
pub mod conics;
pub mod curve;
mod curve_lanes;
mod high_order;
pub mod interpolate;
pub mod knots;
mod quad;
pub mod surface;

pub use basis::{BasisRows, basis_rows};
pub use conics::CircleForm;
pub use curve::{CurvePointDerivs, NurbsCurve};
pub use interpolate::{EndDerivatives, Parametrization, interpolate};
pub use knots::{KnotLine, KnotVector, MAX_DEGREE, SpanHint};
pub use surface::{NurbsSurface, NurbsSurfaceData};
