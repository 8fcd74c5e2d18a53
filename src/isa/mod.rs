//! Which vector instructions strake's kernels use: detected once at run time, the same portable
//! build on every x86-64 processor (no `target-cpu` flags).
//!
//! The batch kernels exist in up to three variants ([`VectorKernels`]): the baseline
//! instruction set (SSE2 on x86-64: two f64 per instruction), AVX2 (four) and AVX-512F
//! (eight). Every variant performs, in each lane, exactly the IEEE operations of the one-point
//! path in the same order (additions, subtractions, multiplications, divisions, square roots;
//! no fused multiply-add), so all give the same bits; the choice changes only the speed. The
//! widest variant the processor supports is used, unless a process-wide limit
//! ([`limit_vector_kernels`]) asks for a narrower one: for comparing variants on one machine
//! (the speed report does) or for ruling one out.

use std::sync::atomic::{AtomicU8, Ordering};

/// A variant of the batch kernels, by the widest vector instructions it uses. Ordered from
/// the narrowest to the widest.
#[derive(Clone, Copy, Debug, PartialEq, Eq, PartialOrd, Ord, Hash)]
pub enum VectorKernels {
    /// The baseline instruction set of the build (SSE2 on x86-64: two f64 per instruction,
    /// as the compiler vectorises plain arrays).
    Baseline,
    /// AVX2: four f64 per instruction (x86-64 processors with AVX2).
    Avx2,
    /// AVX-512F: eight f64 per instruction (x86-64 processors with AVX-512F).
    Avx512,
}

impl VectorKernels {
    /// f64 lanes per vector instruction of this variant: 2, 4 or 8.
    pub fn lanes(self) -> usize {
        match self {
            VectorKernels::Baseline => 2,
            VectorKernels::Avx2 => 4,
            VectorKernels::Avx512 => 8,
        }
    }

    /// A short name: "baseline", "avx2" or "avx512".
    pub fn name(self) -> &'static str {
        match self {
            VectorKernels::Baseline => "baseline",
            VectorKernels::Avx2 => "avx2",
            VectorKernels::Avx512 => "avx512",
        }
    }

    fn code(self) -> u8 {
        self as u8
    }

    fn from_code(c: u8) -> VectorKernels {
        match c {
            0 => VectorKernels::Baseline,
            1 => VectorKernels::Avx2,
            _ => VectorKernels::Avx512,
        }
    }
}

/// The widest variant this processor supports (detected at run time; cached by the standard
/// library's detection).
pub fn supported_vector_kernels() -> VectorKernels {
    #[cfg(target_arch = "x86_64")]
    {
        // AVX-512F implies AVX2 on every processor made, and the AVX-512F kernels rely on
        // it (their compiled code uses AVX2 instructions too); both are tested.
        if std::arch::is_x86_feature_detected!("avx512f")
            && std::arch::is_x86_feature_detected!("avx2")
        {
            return VectorKernels::Avx512;
        }
        if std::arch::is_x86_feature_detected!("avx2") {
            return VectorKernels::Avx2;
        }
    }
    VectorKernels::Baseline
}

/// The process-wide limit (a [`VectorKernels`] code); the widest by default.
static LIMIT: AtomicU8 = AtomicU8::new(2);

/// Limits the batch kernels of this process to `max` or narrower, from the next batch call
/// on (calls running meanwhile keep the variant they started with); `VectorKernels::Avx512`
/// lifts the limit. Since every variant gives the same bits, this changes only the speed: it
/// is for comparing variants on one machine. A limit wider than the processor supports is
/// harmless ([`vector_kernels`] never exceeds [`supported_vector_kernels`]).
pub fn limit_vector_kernels(max: VectorKernels) {
    LIMIT.store(max.code(), Ordering::Relaxed);
}

/// The variant the batch kernels use now: the narrower of [`supported_vector_kernels`] and the
/// limit of [`limit_vector_kernels`].
#[inline]
pub fn vector_kernels() -> VectorKernels {
    supported_vector_kernels().min(VectorKernels::from_code(LIMIT.load(Ordering::Relaxed)))
}

#[cfg(test)]
mod tests {
    use super::*;

    // Common practice: the active variant never exceeds what the processor supports, and the
    // order of the variants is their width.
    #[test]
    fn the_active_variant_is_within_the_supported_one() {
        assert!(vector_kernels() <= supported_vector_kernels());
        assert!(VectorKernels::Baseline < VectorKernels::Avx2);
        assert!(VectorKernels::Avx2 < VectorKernels::Avx512);
        for v in [
            VectorKernels::Baseline,
            VectorKernels::Avx2,
            VectorKernels::Avx512,
        ] {
            assert_eq!(VectorKernels::from_code(v.code()), v);
        }
        assert_eq!(
            [2, 4, 8],
            [
                VectorKernels::Baseline,
                VectorKernels::Avx2,
                VectorKernels::Avx512
            ]
            .map(VectorKernels::lanes)
        );
    }
}
