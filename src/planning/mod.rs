//! Planning on the surface: first passes laid by projecting a planar pattern along a
//! direction ([`drive_pattern`], patterns in [`planar_pattern`]); the scallop a ball leaves
//! between two passes, measured by a direct construction, and the per-point step-over rule
//! ([`scallop_left`]); the scallop of flat-end and toroidal cutters at lead and tilt, the
//! exact cusp of two cutter profiles, and its inverse ([`scallop_cutter`]); iso-scallop and
//! constant step-over passes until the surface is covered ([`passes`]); fibre-placement courses ([`courses`]). Built on the geodesics and offsets of
//! [`crate::geodesics`].

pub mod courses;
pub mod drive_pattern;
pub mod passes;
pub mod planar_pattern;
pub mod scallop_cutter;
pub mod scallop_left;
