//! NURBS: knot vectors, basis functions, curves (L. Piegl, W. Tiller, *The NURBS Book*,
//! 2nd ed., 1997, chapters 2–4).

mod banded;
pub mod basis;
pub mod curve;
pub mod interpolate;
pub mod knots;

pub use basis::{BasisRows, basis_rows};
pub use curve::{CurvePointDerivs, NurbsCurve};
pub use interpolate::{EndDerivatives, Parametrization, interpolate};
pub use knots::{KnotVector, MAX_DEGREE, SpanHint};
