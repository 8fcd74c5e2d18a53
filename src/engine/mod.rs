//! The batch engine: many points per call. Vector lanes (`lanes`: 16-point blocks and AVX
//! registers), the frame kernel written once on them (`frame_block`), the chunked batch that
//! feeds it from a surface and a curve (`batch`) and the same over scoped threads
//! ([`parallel`]). It knows surfaces, curves and the geometry layer, not the path types built
//! on top of it.

pub(crate) mod batch;
pub(crate) mod frame_block;
pub(crate) mod lanes;
pub mod parallel;
pub(crate) mod rates_batch;
