//! Planning on the surface: fibre-placement courses ([`courses`]), built on the geodesics and
//! offsets of [`crate::geodesics`].

pub mod courses;
