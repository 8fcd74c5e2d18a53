//! Four-wide arithmetic on homogeneous control points [w x, w y, w z, w]: the inner operation of
//! the tensor-product sums of a surface evaluation, acc + a · P, written with explicit vector
//! instructions so that it takes one AVX instruction pair (or two SSE2 pairs) per control point
//! and derivative whatever the optimiser makes of the surrounding code; and the component-wise
//! subtraction, multiplication, division and broadcast of w with which the block evaluation
//! applies the quotient rule to [x, y, z, w] at once.
//!
//! Three implementations of [`QuadOps`], all computing acc[i] + a · x[i] for each component
//! with one IEEE multiplication and one IEEE addition (no fused multiply-add), and every other
//! operation with the one IEEE operation of its name, so all give the same bits:
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
    /// The components (the tests read results with it; the evaluations store with
    /// [`Self::store3`]).
    #[cfg(test)]
    unsafe fn store(v: Self::V) -> [f64; 4];
    /// [a, a, a, a].
    unsafe fn splat(a: f64) -> Self::V;
    /// [w, w, w, w] from x = [·, ·, ·, w]: the weight component in every place.
    unsafe fn splat_w(x: Self::V) -> Self::V;
    /// a − b, component by component.
    unsafe fn sub(a: Self::V, b: Self::V) -> Self::V;
    /// a · b, component by component.
    unsafe fn mul(a: Self::V, b: Self::V) -> Self::V;
    /// a / b, component by component.
    unsafe fn div(a: Self::V, b: Self::V) -> Self::V;
    /// The first three components into `out` (the fourth is dropped).
    unsafe fn store3(v: Self::V, out: &mut [f64; 3]);
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
    #[cfg(test)]
    #[inline(always)]
    unsafe fn store(v: [f64; 4]) -> [f64; 4] {
        v
    }
    #[inline(always)]
    unsafe fn splat(a: f64) -> [f64; 4] {
        [a; 4]
    }
    #[inline(always)]
    unsafe fn splat_w(x: [f64; 4]) -> [f64; 4] {
        [x[3]; 4]
    }
    #[inline(always)]
    unsafe fn sub(a: [f64; 4], b: [f64; 4]) -> [f64; 4] {
        [a[0] - b[0], a[1] - b[1], a[2] - b[2], a[3] - b[3]]
    }
    #[inline(always)]
    unsafe fn mul(a: [f64; 4], b: [f64; 4]) -> [f64; 4] {
        [a[0] * b[0], a[1] * b[1], a[2] * b[2], a[3] * b[3]]
    }
    #[inline(always)]
    unsafe fn div(a: [f64; 4], b: [f64; 4]) -> [f64; 4] {
        [a[0] / b[0], a[1] / b[1], a[2] / b[2], a[3] / b[3]]
    }
    #[inline(always)]
    unsafe fn store3(v: [f64; 4], out: &mut [f64; 3]) {
        *out = [v[0], v[1], v[2]];
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
        #[cfg(test)]
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
        #[inline(always)]
        #[allow(unused_unsafe)]
        unsafe fn splat(a: f64) -> Self::V {
            // SAFETY: SSE2 as above.
            unsafe { (_mm_set1_pd(a), _mm_set1_pd(a)) }
        }
        #[inline(always)]
        #[allow(unused_unsafe)]
        unsafe fn splat_w(x: Self::V) -> Self::V {
            // SAFETY: SSE2 as above.
            unsafe {
                let w = _mm_unpackhi_pd(x.1, x.1);
                (w, w)
            }
        }
        #[inline(always)]
        #[allow(unused_unsafe)]
        unsafe fn sub(a: Self::V, b: Self::V) -> Self::V {
            // SAFETY: SSE2 as above.
            unsafe { (_mm_sub_pd(a.0, b.0), _mm_sub_pd(a.1, b.1)) }
        }
        #[inline(always)]
        #[allow(unused_unsafe)]
        unsafe fn mul(a: Self::V, b: Self::V) -> Self::V {
            // SAFETY: SSE2 as above.
            unsafe { (_mm_mul_pd(a.0, b.0), _mm_mul_pd(a.1, b.1)) }
        }
        #[inline(always)]
        #[allow(unused_unsafe)]
        unsafe fn div(a: Self::V, b: Self::V) -> Self::V {
            // SAFETY: SSE2 as above.
            unsafe { (_mm_div_pd(a.0, b.0), _mm_div_pd(a.1, b.1)) }
        }
        #[inline(always)]
        unsafe fn store3(v: Self::V, out: &mut [f64; 3]) {
            // SAFETY: `out` holds three f64: two at 0, one at 2; unaligned stores; SSE2 as
            // above.
            unsafe {
                _mm_storeu_pd(out.as_mut_ptr(), v.0);
                _mm_store_sd(out.as_mut_ptr().add(2), v.1);
            }
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

    #[cfg(test)]
    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn avx_store(v: __m256d) -> [f64; 4] {
        let mut out = [0.0; 4];
        // SAFETY: `out` holds four f64; unaligned store.
        unsafe { _mm256_storeu_pd(out.as_mut_ptr(), v) };
        out
    }

    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn avx_splat(a: f64) -> __m256d {
        // SAFETY: AVX is enabled for this function.
        unsafe { _mm256_set1_pd(a) }
    }

    #[target_feature(enable = "avx2")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn avx_splat_w(x: __m256d) -> __m256d {
        // SAFETY: AVX2 is enabled for this function (a permutation across the halves).
        unsafe { _mm256_permute4x64_pd::<0xff>(x) }
    }

    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn avx_sub(a: __m256d, b: __m256d) -> __m256d {
        // SAFETY: AVX is enabled for this function.
        unsafe { _mm256_sub_pd(a, b) }
    }

    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn avx_mul(a: __m256d, b: __m256d) -> __m256d {
        // SAFETY: AVX is enabled for this function.
        unsafe { _mm256_mul_pd(a, b) }
    }

    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn avx_div(a: __m256d, b: __m256d) -> __m256d {
        // SAFETY: AVX is enabled for this function.
        unsafe { _mm256_div_pd(a, b) }
    }

    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn avx_store3(v: __m256d, out: &mut [f64; 3]) {
        // SAFETY: AVX is enabled for this function; `out` holds three f64: two at 0, one at
        // 2; unaligned stores.
        unsafe {
            _mm_storeu_pd(out.as_mut_ptr(), _mm256_castpd256_pd128(v));
            _mm_store_sd(out.as_mut_ptr().add(2), _mm256_extractf128_pd::<1>(v));
        }
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
        #[cfg(test)]
        #[inline(always)]
        unsafe fn store(v: __m256d) -> [f64; 4] {
            // SAFETY: as above.
            unsafe { avx_store(v) }
        }
        #[inline(always)]
        unsafe fn splat(a: f64) -> __m256d {
            // SAFETY: as above.
            unsafe { avx_splat(a) }
        }
        #[inline(always)]
        unsafe fn splat_w(x: __m256d) -> __m256d {
            // SAFETY: as above.
            unsafe { avx_splat_w(x) }
        }
        #[inline(always)]
        unsafe fn sub(a: __m256d, b: __m256d) -> __m256d {
            // SAFETY: as above.
            unsafe { avx_sub(a, b) }
        }
        #[inline(always)]
        unsafe fn mul(a: __m256d, b: __m256d) -> __m256d {
            // SAFETY: as above.
            unsafe { avx_mul(a, b) }
        }
        #[inline(always)]
        unsafe fn div(a: __m256d, b: __m256d) -> __m256d {
            // SAFETY: as above.
            unsafe { avx_div(a, b) }
        }
        #[inline(always)]
        unsafe fn store3(v: __m256d, out: &mut [f64; 3]) {
            // SAFETY: as above.
            unsafe { avx_store3(v, out) }
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

#[cfg(test)]
mod lane_op_tests {
    use super::*;

    /// The component-wise operations of `M` against plain f64 arithmetic, bit for bit.
    fn check<M: QuadOps>() {
        let a = Quad([1.0 + f64::EPSILON, -3.0e-7, 7.0, 0.1]);
        let b = Quad([3.0, 1e-300, -0.0, 0.7 + 4.0 * f64::EPSILON]);
        let bits = |x: [f64; 4]| x.map(f64::to_bits);
        let plain =
            |f: fn(f64, f64) -> f64| -> [f64; 4] { std::array::from_fn(|i| f(a.0[i], b.0[i])) };
        // SAFETY: the callers pass `Avx` only on an AVX2 processor.
        unsafe {
            let (va, vb) = (M::load(&a), M::load(&b));
            assert_eq!(bits(M::store(M::sub(va, vb))), bits(plain(|x, y| x - y)));
            assert_eq!(bits(M::store(M::mul(va, vb))), bits(plain(|x, y| x * y)));
            assert_eq!(bits(M::store(M::div(va, vb))), bits(plain(|x, y| x / y)));
            assert_eq!(bits(M::store(M::splat_w(va))), bits([a.0[3]; 4]));
            assert_eq!(bits(M::store(M::splat(-2.5))), bits([-2.5; 4]));
            let mut three = [9.0; 3];
            M::store3(vb, &mut three);
            assert_eq!(
                three.map(f64::to_bits),
                [b.0[0], b.0[1], b.0[2]].map(f64::to_bits)
            );
        }
    }

    // Common practice: IEEE 754 subtraction, multiplication and division are correctly
    // rounded, so a vector instruction gives, component by component, the bits of the scalar
    // operation (values include a subnormal product, a signed zero and a division by zero).
    #[test]
    fn component_operations_give_the_bits_of_plain_arithmetic() {
        check::<Scalar>();
        #[cfg(target_arch = "x86_64")]
        {
            check::<Sse2>();
            if std::arch::is_x86_feature_detected!("avx2") {
                check::<Avx>();
            }
        }
    }
}
