//! Planning the passes of a job on a surface: first passes laid by projecting a planar pattern
//! along a direction ([`drive_pattern`]) from planar patterns ([`planar_pattern`]).

pub mod drive_pattern;
pub mod planar_pattern;
