//! Geodesics on any [`crate::SurfaceSource`]: traced from a point and a direction
//! ([`trace`]), between two points with the geodesic distance ([`between`]), and geodesic
//! parallels (offsets) of a path on the surface ([`offset`]).
//!
//! The geodesic equations are integrated in the parameter plane (do Carmo, *Differential
//! Geometry of Curves and Surfaces*, §4-4 and §4-7): with arc length s, (u', v') = d(u, v)/ds,
//!
//!   u'' + Γ¹₁₁ u'² + 2Γ¹₁₂ u'v' + Γ¹₂₂ v'² = 0,   v'' + Γ²₁₁ u'² + 2Γ²₁₂ u'v' + Γ²₂₂ v'² = 0,
//!
//! with the Christoffel symbols of the first fundamental form ([`christoffel`]). The traced
//! curve is a piecewise quintic Hermite curve in (u, v) parametrised by arc length
//! ([`hermite::HermiteUvCurve`]), usable wherever a [`crate::UvCurve`] is.

pub mod between;
pub mod christoffel;
pub mod hermite;
pub mod offset;
pub mod rk;
pub mod trace;
