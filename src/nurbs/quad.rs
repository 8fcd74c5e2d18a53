//! Four-wide arithmetic on homogeneous control points [w x, w y, w z, w]: the inner operation of
//! the tensor-product sums of a surface evaluation, acc + a · P, written with explicit vector
//! instructions so that it takes one AVX instruction pair (or two SSE2 pairs) per control point
//! and derivative whatever the optimiser makes of the surrounding code.
//!
//! Three implementations of [`QuadOps`], all computing acc[i] + a · x[i] for each component
//! with one IEEE multiplication and one IEEE addition (no fused multiply-add), so all give the
//! same bits:
//! - [`Avx`]: one 256-bit vector, for x86-64 processors with AVX2 (detected at run time by the
//!   caller, which must use it only then);
//! - [`Sse2`]: two 128-bit vectors, the x86-64 baseline;
//! - [`Scalar`]: plain arrays, for every other target.

/// A homogeneous control point [w x, w y, w z, w], aligned for one 256-bit vector.
#[derive(Debug, Clone, Copy, PartialEq)]
#[repr(C, align(32))]
pub(crate) struct Quad(pub(crate) [f64; 4]);

/// Vector arithmetic on [`Quad`]s.
///
/// # Safety
/// Every method is `unsafe` because [`Avx`] needs the AVX instruction set: callers must use
/// [`Avx`] only on a processor that has AVX2 (`is_x86_feature_detected!("avx2")`). The other
/// implementations have no requirement.
pub(crate) trait QuadOps {
    /// The vector type holding one quadruple.
    type V: Copy;
    /// [0, 0, 0, 0].
    unsafe fn zero() -> Self::V;
    /// Loads a quadruple.
    unsafe fn load(q: &Quad) -> Self::V;
    /// acc + a · x, component by component (a multiplication, then an addition).
    unsafe fn madd(acc: Self::V, a: f64, x: Self::V) -> Self::V;
    /// The components.
    unsafe fn store(v: Self::V) -> [f64; 4];
}

/// Plain arrays (any target).
#[allow(dead_code)]
pub(crate) struct Scalar;

impl QuadOps for Scalar {
    type V = [f64; 4];
    #[inline(always)]
    unsafe fn zero() -> [f64; 4] {
        [0.0; 4]
    }
    #[inline(always)]
    unsafe fn load(q: &Quad) -> [f64; 4] {
        q.0
    }
    #[inline(always)]
    unsafe fn madd(acc: [f64; 4], a: f64, x: [f64; 4]) -> [f64; 4] {
        [
            acc[0] + a * x[0],
            acc[1] + a * x[1],
            acc[2] + a * x[2],
            acc[3] + a * x[3],
        ]
    }
    #[inline(always)]
    unsafe fn store(v: [f64; 4]) -> [f64; 4] {
        v
    }
}

#[cfg(target_arch = "x86_64")]
pub(crate) use x86::{Avx, Sse2};

#[cfg(target_arch = "x86_64")]
mod x86 {
    use super::{Quad, QuadOps};
    use std::arch::x86_64::*;

    /// Two 128-bit SSE2 vectors (the x86-64 baseline).
    pub(crate) struct Sse2;

    impl QuadOps for Sse2 {
        type V = (__m128d, __m128d);
        #[inline(always)]
        #[allow(unused_unsafe)]
        unsafe fn zero() -> Self::V {
            // SAFETY: SSE2 is part of every x86-64 processor.
            unsafe { (_mm_setzero_pd(), _mm_setzero_pd()) }
        }
        #[inline(always)]
        unsafe fn load(q: &Quad) -> Self::V {
            // SAFETY: `q` is 32-byte aligned, so both halves are 16-byte aligned; SSE2 as above.
            unsafe { (_mm_load_pd(q.0.as_ptr()), _mm_load_pd(q.0.as_ptr().add(2))) }
        }
        #[inline(always)]
        #[allow(unused_unsafe)]
        unsafe fn madd(acc: Self::V, a: f64, x: Self::V) -> Self::V {
            // SAFETY: SSE2 as above.
            unsafe {
                let b = _mm_set1_pd(a);
                (
                    _mm_add_pd(acc.0, _mm_mul_pd(b, x.0)),
                    _mm_add_pd(acc.1, _mm_mul_pd(b, x.1)),
                )
            }
        }
        #[inline(always)]
        unsafe fn store(v: Self::V) -> [f64; 4] {
            let mut out = [0.0; 4];
            // SAFETY: `out` holds four f64; unaligned stores; SSE2 as above.
            unsafe {
                _mm_storeu_pd(out.as_mut_ptr(), v.0);
                _mm_storeu_pd(out.as_mut_ptr().add(2), v.1);
            }
            out
        }
    }

    /// One 256-bit AVX vector. Only for processors with AVX2 (see [`QuadOps`]).
    pub(crate) struct Avx;

    // The `unsafe` blocks below are needed on older compilers (intrinsics were unsafe to call);
    // newer ones call them safely inside an AVX function.
    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn avx_zero() -> __m256d {
        // SAFETY: AVX is enabled for this function.
        unsafe { _mm256_setzero_pd() }
    }

    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn avx_load(q: &Quad) -> __m256d {
        // SAFETY: `q` is 32-byte aligned and holds four f64.
        unsafe { _mm256_load_pd(q.0.as_ptr()) }
    }

    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn avx_madd(acc: __m256d, a: f64, x: __m256d) -> __m256d {
        // SAFETY: AVX is enabled for this function.
        unsafe { _mm256_add_pd(acc, _mm256_mul_pd(_mm256_set1_pd(a), x)) }
    }

    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn avx_store(v: __m256d) -> [f64; 4] {
        let mut out = [0.0; 4];
        // SAFETY: `out` holds four f64; unaligned store.
        unsafe { _mm256_storeu_pd(out.as_mut_ptr(), v) };
        out
    }

    impl QuadOps for Avx {
        type V = __m256d;
        #[inline(always)]
        unsafe fn zero() -> __m256d {
            // SAFETY: the caller uses `Avx` only with AVX2 present (trait contract).
            unsafe { avx_zero() }
        }
        #[inline(always)]
        unsafe fn load(q: &Quad) -> __m256d {
            // SAFETY: as above.
            unsafe { avx_load(q) }
        }
        #[inline(always)]
        unsafe fn madd(acc: __m256d, a: f64, x: __m256d) -> __m256d {
            // SAFETY: as above.
            unsafe { avx_madd(acc, a, x) }
        }
        #[inline(always)]
        unsafe fn store(v: __m256d) -> [f64; 4] {
            // SAFETY: as above.
            unsafe { avx_store(v) }
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    // Common practice: each implementation computes acc + a·x with one rounded multiplication
    // and one rounded addition per component, so all agree bit for bit with plain f64
    // arithmetic (values chosen so that a fused multiply-add would differ).
    #[test]
    fn every_implementation_gives_the_bits_of_plain_arithmetic() {
        let x = Quad([1.0 + f64::EPSILON, -3.0e-7, 7.0, 0.1]);
        let acc = Quad([-1.0, 2.5e-9, 1e300, 0.3]);
        let a = 1.0 - f64::EPSILON;
        let want: [f64; 4] = std::array::from_fn(|i| acc.0[i] + a * x.0[i]);
        // SAFETY: Scalar has no requirement.
        let s = unsafe { Scalar::store(Scalar::madd(Scalar::load(&acc), a, Scalar::load(&x))) };
        assert_eq!(s.map(f64::to_bits), want.map(f64::to_bits));
        #[cfg(target_arch = "x86_64")]
        {
            // SAFETY: SSE2 is baseline on x86-64.
            let s = unsafe { Sse2::store(Sse2::madd(Sse2::load(&acc), a, Sse2::load(&x))) };
            assert_eq!(s.map(f64::to_bits), want.map(f64::to_bits));
            if std::arch::is_x86_feature_detected!("avx2") {
                // SAFETY: AVX2 present.
                let s = unsafe { Avx::store(Avx::madd(Avx::load(&acc), a, Avx::load(&x))) };
                assert_eq!(s.map(f64::to_bits), want.map(f64::to_bits));
            }
        }
    }
}
