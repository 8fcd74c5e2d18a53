//! Scalar and vector aliases used throughout the crate, in one place.
//!
//! Points and vectors in space are [`Vec3`] (nalgebra's `Vector3<f64>`); lengths are in the
//! host's units. Nothing here allocates.

/// A point or vector in space, in the host's length unit.
pub type Vec3 = nalgebra::Vector3<f64>;

/// Builds a [`Vec3`] from an array `[x, y, z]`.
#[inline(always)]
pub fn vec3(a: [f64; 3]) -> Vec3 {
    Vec3::new(a[0], a[1], a[2])
}

/// The components of a [`Vec3`] as an array `[x, y, z]`.
#[inline(always)]
pub fn arr3(v: &Vec3) -> [f64; 3] {
    [v.x, v.y, v.z]
}

/// True when every component of `v` is finite (neither NaN nor infinite).
#[inline(always)]
pub fn all_finite(v: &Vec3) -> bool {
    v.x.is_finite() && v.y.is_finite() && v.z.is_finite()
}

/// 64-bit linear congruential generator (Knuth's MMIX constants; common practice): a uniform
/// value in [0, 1), for reproducible inputs in the unit tests.
#[cfg(test)]
pub(crate) fn lcg(state: &mut u64) -> f64 {
    *state = state
        .wrapping_mul(6364136223846793005)
        .wrapping_add(1442695040888963407);
    (*state >> 11) as f64 / (1u64 << 53) as f64
}
