//! A reproducible generator for test inputs: the 64-bit linear congruential generator with
//! Knuth's MMIX constants (common practice; the same as `strake::geometry::math::lcg` in the unit tests),
//! so that the test data does not depend on a crate.

#![allow(dead_code)]

/// The generator's state.
pub struct Lcg(pub u64);

impl Lcg {
    /// A uniform value in [0, 1).
    pub fn next(&mut self) -> f64 {
        self.0 = self
            .0
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (self.0 >> 11) as f64 / (1u64 << 53) as f64
    }

    /// A uniform index in 0..n (n ≥ 1).
    pub fn below(&mut self, n: usize) -> usize {
        ((self.next() * n as f64) as usize).min(n - 1)
    }

    /// A uniform value in [lo, hi).
    pub fn range(&mut self, lo: f64, hi: f64) -> f64 {
        lo + (hi - lo) * self.next()
    }
}
