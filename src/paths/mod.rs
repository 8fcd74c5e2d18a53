//! Paths on a surface: a curve paired with a surface ([`curve_on_surface`]), samples along it by
//! parameter, arc length or chord tolerance ([`sampling`]), and curves made by projecting
//! points or 3D curves onto the surface ([`projection`]).

pub mod curve_on_surface;
pub mod projection;
pub mod sampling;
