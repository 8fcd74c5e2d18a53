//! The pure geometry: vector aliases, jets (a surface's and a curve's derivatives at a point),
//! the surface's normal, fundamental forms and principal curvatures, and the Darboux frame
//! with its invariants. Jets in, numbers out: no allocation, no I/O, no knowledge of where the
//! jets came from.

pub mod frame;
pub mod jet;
pub mod math;
pub mod principal;
pub mod rates;
pub(crate) mod taylor;
