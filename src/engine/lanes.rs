//! Lane-wide arithmetic: one f64 per point of a block ([`W`]), every operation a loop over the
//! lanes that the compiler vectorises. Code written with [`W`] reads like the scalar formulas and
//! performs, in each lane, exactly the scalar operations in the same order, so it gives the same
//! bits as the one-point path, while each step is done for all lanes before the next: the
//! latencies of the points overlap instead of adding up.

// Index loops over the lanes on purpose: iterators over arrays by value are not unrolled and
// vectorised as reliably.
#![allow(clippy::needless_range_loop)]

use std::ops::{Add, BitAnd, Div, Mul, Sub};

/// Points per block. Measured (`examples/speed_report.rs`): 16 lanes hide the latency of the
/// frame's square roots and divisions (8 leave some exposed; 32 spill too much).
pub const LANES: usize = 16;

/// One f64 per lane: the kernel's arithmetic type. Every operation is a loop over the lanes,
/// which the compiler vectorises; each step of the formulas is done for all lanes before the
/// next, so that the latencies of the lanes overlap.
#[derive(Clone, Copy)]
pub(crate) struct W(pub(crate) [f64; LANES]);

/// One flag per lane.
#[derive(Clone, Copy)]
pub(crate) struct Mask(pub(crate) [bool; LANES]);

/// A vector in space per lane.
pub(crate) type W3 = [W; 3];

impl W {
    /// The same value in every lane.
    #[inline(always)]
    pub(crate) fn splat(x: f64) -> W {
        W([x; LANES])
    }
    #[inline(always)]
    pub(crate) fn map(self, f: impl Fn(f64) -> f64) -> W {
        let mut r = [0.0; LANES];
        for i in 0..LANES {
            r[i] = f(self.0[i]);
        }
        W(r)
    }
    #[inline(always)]
    pub(crate) fn zip(self, o: W, f: impl Fn(f64, f64) -> f64) -> W {
        let mut r = [0.0; LANES];
        for i in 0..LANES {
            r[i] = f(self.0[i], o.0[i]);
        }
        W(r)
    }
    #[inline(always)]
    pub(crate) fn test(self, o: W, f: impl Fn(f64, f64) -> bool) -> Mask {
        let mut r = [false; LANES];
        for i in 0..LANES {
            r[i] = f(self.0[i], o.0[i]);
        }
        Mask(r)
    }
    #[inline(always)]
    pub(crate) fn sqrt(self) -> W {
        self.map(f64::sqrt)
    }
    #[inline(always)]
    pub(crate) fn abs(self) -> W {
        self.map(f64::abs)
    }
    /// `f64::max` per lane (a NaN loses).
    #[inline(always)]
    pub(crate) fn max(self, o: W) -> W {
        self.zip(o, f64::max)
    }
    #[inline(always)]
    pub(crate) fn finite(self) -> Mask {
        self.test(self, |x, _| x.is_finite())
    }
}

macro_rules! arith {
    ($tr:ident, $f:ident, $op:tt) => {
        impl $tr for W {
            type Output = W;
            #[inline(always)]
            fn $f(self, o: W) -> W {
                self.zip(o, |x, y| x $op y)
            }
        }
        impl $tr<f64> for W {
            type Output = W;
            #[inline(always)]
            fn $f(self, o: f64) -> W {
                self.map(|x| x $op o)
            }
        }
        impl $tr<W> for f64 {
            type Output = W;
            #[inline(always)]
            fn $f(self, o: W) -> W {
                o.map(|y| self $op y)
            }
        }
    };
}
arith!(Add, add, +);
arith!(Sub, sub, -);
arith!(Mul, mul, *);
arith!(Div, div, /);

impl BitAnd for Mask {
    type Output = Mask;
    #[inline(always)]
    fn bitand(self, o: Mask) -> Mask {
        let mut r = [false; LANES];
        for i in 0..LANES {
            r[i] = self.0[i] & o.0[i];
        }
        Mask(r)
    }
}

/// `a` where `m` holds, else `b`, per lane.
#[inline(always)]
pub(crate) fn select(m: Mask, a: W, b: W) -> W {
    let mut r = [0.0; LANES];
    for i in 0..LANES {
        r[i] = if m.0[i] { a.0[i] } else { b.0[i] };
    }
    W(r)
}

impl W {
    /// `self >= o` per lane (false where either is NaN).
    #[inline(always)]
    pub(crate) fn ge(self, o: W) -> Mask {
        self.test(o, |x, y| x >= y)
    }
    /// `self <= o` per lane (false where either is NaN).
    #[inline(always)]
    pub(crate) fn le(self, o: W) -> Mask {
        self.test(o, |x, y| x <= y)
    }
    /// `self != o` per lane (true where either is NaN).
    #[inline(always)]
    pub(crate) fn ne(self, o: W) -> Mask {
        self.test(o, |x, y| x != y)
    }
}

/// A lane-wide value type for kernels written once for several instruction sets: IEEE
/// arithmetic lane by lane (one rounding per operation, no fused multiply-add), compares
/// giving masks, and selects. Every implementation performs, in each lane, the scalar
/// operation of the same name, so a kernel gives the same bits with any of them.
///
/// Kernels take [`LANES`] points in arrays and work on them in groups of [`Lane::N`].
///
/// # Safety
/// A value of an implementing type exists only where its instructions are available: the
/// constructors are `unsafe` and their callers promise it (for [`x86::Avx4`], an AVX2
/// processor); the operations on existing values rely on that.
pub(crate) trait Lane:
    Copy
    + Add<Output = Self>
    + Sub<Output = Self>
    + Mul<Output = Self>
    + Div<Output = Self>
    + Mul<f64, Output = Self>
{
    /// One flag per lane.
    type Mask: Copy + BitAnd<Output = Self::Mask>;
    /// Lanes per value (a divisor of [`LANES`]).
    const N: usize;
    /// All lanes x.
    ///
    /// # Safety
    /// The type's instructions must be available.
    unsafe fn splat(x: f64) -> Self;
    /// Lane l from `a[at + l]`; `at + N` ≤ [`LANES`].
    ///
    /// # Safety
    /// As [`Lane::splat`].
    unsafe fn load(a: &W, at: usize) -> Self;
    /// Lane l into `a[at + l]`; `at + N` ≤ [`LANES`].
    fn store(self, a: &mut W, at: usize);
    /// Flag l into `a[at + l]`; `at + N` ≤ [`LANES`].
    fn store_mask(m: Self::Mask, a: &mut Mask, at: usize);
    /// `f64::sqrt` per lane.
    fn sqrt(self) -> Self;
    /// `f64::abs` per lane.
    fn abs(self) -> Self;
    /// `f64::max` per lane (a NaN loses to a number).
    fn max(self, o: Self) -> Self;
    /// `f64::is_finite` per lane.
    fn finite(self) -> Self::Mask;
    /// `self >= o` per lane (false where either is NaN).
    fn ge(self, o: Self) -> Self::Mask;
    /// `self <= o` per lane (false where either is NaN).
    fn le(self, o: Self) -> Self::Mask;
    /// `self != o` per lane (true where either is NaN).
    fn ne(self, o: Self) -> Self::Mask;
    /// `a` where `m` holds, else `b`, per lane.
    fn select(m: Self::Mask, a: Self, b: Self) -> Self;
}

/// The plain arrays: all [`LANES`] lanes in one value (the baseline build; the optimiser maps
/// the loops onto SSE2 pairs).
impl Lane for W {
    type Mask = Mask;
    const N: usize = LANES;
    #[inline(always)]
    unsafe fn splat(x: f64) -> W {
        W::splat(x)
    }
    #[inline(always)]
    unsafe fn load(a: &W, at: usize) -> W {
        debug_assert_eq!(at, 0);
        *a
    }
    #[inline(always)]
    fn store(self, a: &mut W, at: usize) {
        debug_assert_eq!(at, 0);
        *a = self;
    }
    #[inline(always)]
    fn store_mask(m: Mask, a: &mut Mask, at: usize) {
        debug_assert_eq!(at, 0);
        *a = m;
    }
    #[inline(always)]
    fn sqrt(self) -> W {
        W::sqrt(self)
    }
    #[inline(always)]
    fn abs(self) -> W {
        W::abs(self)
    }
    #[inline(always)]
    fn max(self, o: W) -> W {
        W::max(self, o)
    }
    #[inline(always)]
    fn finite(self) -> Mask {
        W::finite(self)
    }
    #[inline(always)]
    fn ge(self, o: W) -> Mask {
        W::ge(self, o)
    }
    #[inline(always)]
    fn le(self, o: W) -> Mask {
        W::le(self, o)
    }
    #[inline(always)]
    fn ne(self, o: W) -> Mask {
        W::ne(self, o)
    }
    #[inline(always)]
    fn select(m: Mask, a: W, b: W) -> W {
        select(m, a, b)
    }
}

#[cfg(target_arch = "x86_64")]
pub(crate) mod x86 {
    //! Four lanes in one 256-bit AVX register.
    use super::{Lane, Mask, W};
    use std::arch::x86_64::*;
    use std::ops::{Add, BitAnd, Div, Mul, Sub};

    /// Four lanes in one AVX register. Only for processors with AVX2 (see [`Lane`]).
    #[derive(Clone, Copy)]
    pub(crate) struct Avx4(__m256d);

    /// Four flags in one AVX register: each lane all ones (true) or all zeros (false), as
    /// compares give them.
    #[derive(Clone, Copy)]
    pub(crate) struct Mask4(__m256d);

    // The helpers below are the instructions, each compiled for AVX; the `unsafe` blocks are
    // needed on older compilers (intrinsics were unsafe to call), newer ones call them safely
    // inside an AVX function.
    macro_rules! avx {
        ($(fn $name:ident($($a:ident: $t:ty),*) -> $r:ty $body:block)*) => {$(
            #[target_feature(enable = "avx")]
            #[inline]
            #[allow(unused_unsafe)]
            unsafe fn $name($($a: $t),*) -> $r {
                // SAFETY: AVX is enabled for this function; pointers as documented at the
                // call sites.
                unsafe { $body }
            }
        )*};
    }

    avx! {
        fn add(a: __m256d, b: __m256d) -> __m256d { _mm256_add_pd(a, b) }
        fn sub(a: __m256d, b: __m256d) -> __m256d { _mm256_sub_pd(a, b) }
        fn mul(a: __m256d, b: __m256d) -> __m256d { _mm256_mul_pd(a, b) }
        fn div(a: __m256d, b: __m256d) -> __m256d { _mm256_div_pd(a, b) }
        fn sqrt(a: __m256d) -> __m256d { _mm256_sqrt_pd(a) }
        fn and(a: __m256d, b: __m256d) -> __m256d { _mm256_and_pd(a, b) }
        // a with its sign bits cleared.
        fn abs(a: __m256d) -> __m256d { _mm256_andnot_pd(_mm256_set1_pd(-0.0), a) }
        // `f64::max`: the instruction gives its second operand when either is NaN, so with
        // `a` second a NaN in `b` loses; a NaN in `a` is then replaced by `b`.
        fn max(a: __m256d, b: __m256d) -> __m256d {
            let m = _mm256_max_pd(b, a);
            _mm256_blendv_pd(m, b, _mm256_cmp_pd::<_CMP_UNORD_Q>(a, a))
        }
        fn finite(a: __m256d) -> __m256d {
            _mm256_cmp_pd::<_CMP_LT_OQ>(abs(a), _mm256_set1_pd(f64::INFINITY))
        }
        fn ge(a: __m256d, b: __m256d) -> __m256d { _mm256_cmp_pd::<_CMP_GE_OQ>(a, b) }
        fn le(a: __m256d, b: __m256d) -> __m256d { _mm256_cmp_pd::<_CMP_LE_OQ>(a, b) }
        fn ne(a: __m256d, b: __m256d) -> __m256d { _mm256_cmp_pd::<_CMP_NEQ_UQ>(a, b) }
        // a where m is set, else b.
        fn blend(m: __m256d, a: __m256d, b: __m256d) -> __m256d { _mm256_blendv_pd(b, a, m) }
        fn splat(x: f64) -> __m256d { _mm256_set1_pd(x) }
        // p must point to four readable f64.
        fn load(p: *const f64) -> __m256d { _mm256_loadu_pd(p) }
        fn movemask(a: __m256d) -> i32 { _mm256_movemask_pd(a) }
        // Lane l of the first result is p_l[0], of the second p_l[1]; each p_l must point to
        // two readable f64. Two 128-bit loads per register half and one unpack per result.
        fn load_pairs(p0: *const f64, p1: *const f64, p2: *const f64, p3: *const f64)
            -> (__m256d, __m256d) {
            // r0 = [p0[0], p0[1], p2[0], p2[1]], r1 = [p1[0], p1[1], p3[0], p3[1]].
            let r0 = _mm256_insertf128_pd::<1>(_mm256_castpd128_pd256(_mm_loadu_pd(p0)), _mm_loadu_pd(p2));
            let r1 = _mm256_insertf128_pd::<1>(_mm256_castpd128_pd256(_mm_loadu_pd(p1)), _mm_loadu_pd(p3));
            (_mm256_unpacklo_pd(r0, r1), _mm256_unpackhi_pd(r0, r1))
        }
        // The inverse of `load_pairs`: p_l[0] = lane l of a, p_l[1] = lane l of b; each p_l
        // must point to two writable f64.
        fn store_pairs(a: __m256d, b: __m256d, p0: *mut f64, p1: *mut f64, p2: *mut f64, p3: *mut f64)
            -> () {
            // lo = [a0, b0, a2, b2], hi = [a1, b1, a3, b3].
            let lo = _mm256_unpacklo_pd(a, b);
            let hi = _mm256_unpackhi_pd(a, b);
            _mm_storeu_pd(p0, _mm256_castpd256_pd128(lo));
            _mm_storeu_pd(p2, _mm256_extractf128_pd::<1>(lo));
            _mm_storeu_pd(p1, _mm256_castpd256_pd128(hi));
            _mm_storeu_pd(p3, _mm256_extractf128_pd::<1>(hi));
        }
    }

    /// Stores the lanes of `a` at `p`, which must point to four writable f64.
    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn store(p: *mut f64, a: __m256d) {
        // SAFETY: AVX is enabled for this function; `p` as required.
        unsafe { _mm256_storeu_pd(p, a) }
    }

    macro_rules! arith {
        ($tr:ident, $f:ident) => {
            impl $tr for Avx4 {
                type Output = Avx4;
                #[inline(always)]
                fn $f(self, o: Avx4) -> Avx4 {
                    // SAFETY: an `Avx4` exists only on an AVX2 processor (the `Lane` contract).
                    Avx4(unsafe { $f(self.0, o.0) })
                }
            }
            impl $tr<f64> for Avx4 {
                type Output = Avx4;
                #[inline(always)]
                fn $f(self, o: f64) -> Avx4 {
                    // SAFETY: as above.
                    Avx4(unsafe { $f(self.0, splat(o)) })
                }
            }
            impl $tr<Avx4> for f64 {
                type Output = Avx4;
                #[inline(always)]
                fn $f(self, o: Avx4) -> Avx4 {
                    // SAFETY: as above.
                    Avx4(unsafe { $f(splat(self), o.0) })
                }
            }
        };
    }
    arith!(Add, add);
    arith!(Sub, sub);
    arith!(Mul, mul);
    arith!(Div, div);

    impl BitAnd for Mask4 {
        type Output = Mask4;
        #[inline(always)]
        fn bitand(self, o: Mask4) -> Mask4 {
            // SAFETY: as above (a `Mask4` comes from an `Avx4`).
            Mask4(unsafe { and(self.0, o.0) })
        }
    }

    impl Avx4 {
        /// Two values from pairs of adjacent f64 of four points (an array-of-structures to
        /// structure-of-arrays transpose): lane l of the first is `*p[l]`, of the second
        /// `*p[l].add(1)`.
        ///
        /// # Safety
        /// The processor must support AVX2; each `p[l]` must point to two readable f64.
        #[inline(always)]
        pub(crate) unsafe fn load_pairs(p: [*const f64; 4]) -> (Avx4, Avx4) {
            // SAFETY: passed on from the caller.
            let (a, b) = unsafe { load_pairs(p[0], p[1], p[2], p[3]) };
            (Avx4(a), Avx4(b))
        }

        /// The inverse of [`Self::load_pairs`]: `*p[l]` = lane l of `a`, `*p[l].add(1)` = lane
        /// l of `b`.
        ///
        /// # Safety
        /// Each `p[l]` must point to two writable f64.
        #[inline(always)]
        pub(crate) unsafe fn store_pairs(a: Avx4, b: Avx4, p: [*mut f64; 4]) {
            // SAFETY: an `Avx4` exists only on an AVX2 processor; pointers from the caller.
            unsafe { store_pairs(a.0, b.0, p[0], p[1], p[2], p[3]) }
        }

        /// Bit l set where flag l of `m` holds.
        #[inline(always)]
        pub(crate) fn mask_bits(m: Mask4) -> u32 {
            // SAFETY: a `Mask4` exists only on an AVX2 processor.
            (unsafe { movemask(m.0) }) as u32
        }
    }

    impl Lane for Avx4 {
        type Mask = Mask4;
        const N: usize = 4;
        #[inline(always)]
        unsafe fn splat(x: f64) -> Avx4 {
            // SAFETY: the caller promises AVX2 (the `Lane` contract).
            Avx4(unsafe { splat(x) })
        }
        #[inline(always)]
        unsafe fn load(a: &W, at: usize) -> Avx4 {
            let lanes = &a.0[at..at + 4];
            // SAFETY: the caller promises AVX2; `lanes` holds four f64.
            Avx4(unsafe { load(lanes.as_ptr()) })
        }
        #[inline(always)]
        fn store(self, a: &mut W, at: usize) {
            let lanes = &mut a.0[at..at + 4];
            // SAFETY: as in `add`; `lanes` holds four f64.
            unsafe { store(lanes.as_mut_ptr(), self.0) }
        }
        #[inline(always)]
        fn store_mask(m: Mask4, a: &mut Mask, at: usize) {
            // SAFETY: as in `add`.
            let bits = unsafe { movemask(m.0) };
            for (l, flag) in a.0[at..at + 4].iter_mut().enumerate() {
                *flag = bits & (1 << l) != 0;
            }
        }
        #[inline(always)]
        fn sqrt(self) -> Avx4 {
            // SAFETY: as in `add`.
            Avx4(unsafe { sqrt(self.0) })
        }
        #[inline(always)]
        fn abs(self) -> Avx4 {
            // SAFETY: as in `add`.
            Avx4(unsafe { abs(self.0) })
        }
        #[inline(always)]
        fn max(self, o: Avx4) -> Avx4 {
            // SAFETY: as in `add`.
            Avx4(unsafe { max(self.0, o.0) })
        }
        #[inline(always)]
        fn finite(self) -> Mask4 {
            // SAFETY: as in `add`.
            Mask4(unsafe { finite(self.0) })
        }
        #[inline(always)]
        fn ge(self, o: Avx4) -> Mask4 {
            // SAFETY: as in `add`.
            Mask4(unsafe { ge(self.0, o.0) })
        }
        #[inline(always)]
        fn le(self, o: Avx4) -> Mask4 {
            // SAFETY: as in `add`.
            Mask4(unsafe { le(self.0, o.0) })
        }
        #[inline(always)]
        fn ne(self, o: Avx4) -> Mask4 {
            // SAFETY: as in `add`.
            Mask4(unsafe { ne(self.0, o.0) })
        }
        #[inline(always)]
        fn select(m: Mask4, a: Avx4, b: Avx4) -> Avx4 {
            // SAFETY: as in `add`.
            Avx4(unsafe { blend(m.0, a.0, b.0) })
        }
    }
}

#[cfg(target_arch = "x86_64")]
pub(crate) mod x86_512 {
    //! Eight lanes in one 512-bit AVX-512 register.
    use super::{Lane, Mask, W};
    use std::arch::x86_64::*;
    use std::ops::{Add, BitAnd, Div, Mul, Sub};

    /// Eight lanes in one AVX-512 register. Only for processors with AVX-512F (see [`Lane`]).
    #[derive(Clone, Copy)]
    pub(crate) struct Avx8(__m512d);

    /// Eight flags in one AVX-512 mask: bit l for lane l, as compares give them.
    #[derive(Clone, Copy)]
    pub(crate) struct Mask8(__mmask8);

    // The helpers below are the instructions, each compiled for AVX-512F (which implies AVX2);
    // the `unsafe` blocks are needed on older compilers.
    macro_rules! avx512 {
        ($(fn $name:ident($($a:ident: $t:ty),*) -> $r:ty $body:block)*) => {$(
            #[target_feature(enable = "avx512f")]
            #[inline]
            #[allow(unused_unsafe)]
            unsafe fn $name($($a: $t),*) -> $r {
                // SAFETY: AVX-512F is enabled for this function; pointers as documented at
                // the call sites.
                unsafe { $body }
            }
        )*};
    }

    avx512! {
        fn add(a: __m512d, b: __m512d) -> __m512d { _mm512_add_pd(a, b) }
        fn sub(a: __m512d, b: __m512d) -> __m512d { _mm512_sub_pd(a, b) }
        fn mul(a: __m512d, b: __m512d) -> __m512d { _mm512_mul_pd(a, b) }
        fn div(a: __m512d, b: __m512d) -> __m512d { _mm512_div_pd(a, b) }
        fn sqrt(a: __m512d) -> __m512d { _mm512_sqrt_pd(a) }
        // a with its sign bits cleared.
        fn abs(a: __m512d) -> __m512d { _mm512_abs_pd(a) }
        // `f64::max`: the instruction gives its second operand when either is NaN, so with
        // `a` second a NaN in `b` loses; a NaN in `a` is then replaced by `b`.
        fn max(a: __m512d, b: __m512d) -> __m512d {
            let m = _mm512_max_pd(b, a);
            _mm512_mask_blend_pd(_mm512_cmp_pd_mask::<_CMP_UNORD_Q>(a, a), m, b)
        }
        fn finite(a: __m512d) -> __mmask8 {
            _mm512_cmp_pd_mask::<_CMP_LT_OQ>(abs(a), _mm512_set1_pd(f64::INFINITY))
        }
        fn ge(a: __m512d, b: __m512d) -> __mmask8 { _mm512_cmp_pd_mask::<_CMP_GE_OQ>(a, b) }
        fn le(a: __m512d, b: __m512d) -> __mmask8 { _mm512_cmp_pd_mask::<_CMP_LE_OQ>(a, b) }
        fn ne(a: __m512d, b: __m512d) -> __mmask8 { _mm512_cmp_pd_mask::<_CMP_NEQ_UQ>(a, b) }
        // a where m is set, else b.
        fn blend(m: __mmask8, a: __m512d, b: __m512d) -> __m512d { _mm512_mask_blend_pd(m, b, a) }
        fn splat(x: f64) -> __m512d { _mm512_set1_pd(x) }
        // p must point to eight readable f64.
        fn load(p: *const f64) -> __m512d { _mm512_loadu_pd(p) }
        // p must point to eight writable f64.
        fn store(p: *mut f64, a: __m512d) -> () { _mm512_storeu_pd(p, a) }
        // Lane l of the first result is p_l[0], of the second p_l[1]; each p_l must point to
        // two readable f64. Four 128-bit loads per register and one unpack per result.
        fn load_pairs(p: [*const f64; 8]) -> (__m512d, __m512d) {
            let two = |a: *const f64, b: *const f64| {
                _mm256_insertf128_pd::<1>(_mm256_castpd128_pd256(_mm_loadu_pd(a)), _mm_loadu_pd(b))
            };
            // r0 = [p0, p2, p4, p6], r1 = [p1, p3, p5, p7], two f64 each.
            let r0 = _mm512_insertf64x4::<1>(_mm512_castpd256_pd512(two(p[0], p[2])), two(p[4], p[6]));
            let r1 = _mm512_insertf64x4::<1>(_mm512_castpd256_pd512(two(p[1], p[3])), two(p[5], p[7]));
            (_mm512_unpacklo_pd(r0, r1), _mm512_unpackhi_pd(r0, r1))
        }
        // The inverse of `load_pairs`: p_l[0] = lane l of a, p_l[1] = lane l of b; each p_l
        // must point to two writable f64.
        fn store_pairs(a: __m512d, b: __m512d, p: [*mut f64; 8]) -> () {
            // lo = [a0, b0, a2, b2, a4, b4, a6, b6], hi = [a1, b1, a3, b3, ...].
            let lo = _mm512_unpacklo_pd(a, b);
            let hi = _mm512_unpackhi_pd(a, b);
            let (lo0, lo1) = (_mm512_castpd512_pd256(lo), _mm512_extractf64x4_pd::<1>(lo));
            let (hi0, hi1) = (_mm512_castpd512_pd256(hi), _mm512_extractf64x4_pd::<1>(hi));
            _mm_storeu_pd(p[0], _mm256_castpd256_pd128(lo0));
            _mm_storeu_pd(p[2], _mm256_extractf128_pd::<1>(lo0));
            _mm_storeu_pd(p[4], _mm256_castpd256_pd128(lo1));
            _mm_storeu_pd(p[6], _mm256_extractf128_pd::<1>(lo1));
            _mm_storeu_pd(p[1], _mm256_castpd256_pd128(hi0));
            _mm_storeu_pd(p[3], _mm256_extractf128_pd::<1>(hi0));
            _mm_storeu_pd(p[5], _mm256_castpd256_pd128(hi1));
            _mm_storeu_pd(p[7], _mm256_extractf128_pd::<1>(hi1));
        }
    }

    macro_rules! arith {
        ($tr:ident, $f:ident) => {
            impl $tr for Avx8 {
                type Output = Avx8;
                #[inline(always)]
                fn $f(self, o: Avx8) -> Avx8 {
                    // SAFETY: an `Avx8` exists only on an AVX-512F processor (the `Lane`
                    // contract).
                    Avx8(unsafe { $f(self.0, o.0) })
                }
            }
            impl $tr<f64> for Avx8 {
                type Output = Avx8;
                #[inline(always)]
                fn $f(self, o: f64) -> Avx8 {
                    // SAFETY: as above.
                    Avx8(unsafe { $f(self.0, splat(o)) })
                }
            }
            impl $tr<Avx8> for f64 {
                type Output = Avx8;
                #[inline(always)]
                fn $f(self, o: Avx8) -> Avx8 {
                    // SAFETY: as above.
                    Avx8(unsafe { $f(splat(self), o.0) })
                }
            }
        };
    }
    arith!(Add, add);
    arith!(Sub, sub);
    arith!(Mul, mul);
    arith!(Div, div);

    impl BitAnd for Mask8 {
        type Output = Mask8;
        #[inline(always)]
        fn bitand(self, o: Mask8) -> Mask8 {
            Mask8(self.0 & o.0)
        }
    }

    impl Avx8 {
        /// Two values from pairs of adjacent f64 of eight points (an array-of-structures to
        /// structure-of-arrays transpose): lane l of the first is `*p[l]`, of the second
        /// `*p[l].add(1)`.
        ///
        /// # Safety
        /// The processor must support AVX-512F; each `p[l]` must point to two readable f64.
        #[inline(always)]
        pub(crate) unsafe fn load_pairs(p: [*const f64; 8]) -> (Avx8, Avx8) {
            // SAFETY: passed on from the caller.
            let (a, b) = unsafe { load_pairs(p) };
            (Avx8(a), Avx8(b))
        }

        /// The inverse of [`Self::load_pairs`]: `*p[l]` = lane l of `a`, `*p[l].add(1)` = lane
        /// l of `b`.
        ///
        /// # Safety
        /// Each `p[l]` must point to two writable f64.
        #[inline(always)]
        pub(crate) unsafe fn store_pairs(a: Avx8, b: Avx8, p: [*mut f64; 8]) {
            // SAFETY: an `Avx8` exists only on an AVX-512F processor; pointers from the
            // caller.
            unsafe { store_pairs(a.0, b.0, p) }
        }

        /// Bit l set where flag l of `m` holds.
        #[inline(always)]
        pub(crate) fn mask_bits(m: Mask8) -> u32 {
            m.0 as u32
        }
    }

    impl Lane for Avx8 {
        type Mask = Mask8;
        const N: usize = 8;
        #[inline(always)]
        unsafe fn splat(x: f64) -> Avx8 {
            // SAFETY: the caller promises AVX-512F (the `Lane` contract).
            Avx8(unsafe { splat(x) })
        }
        #[inline(always)]
        unsafe fn load(a: &W, at: usize) -> Avx8 {
            let lanes = &a.0[at..at + 8];
            // SAFETY: the caller promises AVX-512F; `lanes` holds eight f64.
            Avx8(unsafe { load(lanes.as_ptr()) })
        }
        #[inline(always)]
        fn store(self, a: &mut W, at: usize) {
            let lanes = &mut a.0[at..at + 8];
            // SAFETY: as in `add`; `lanes` holds eight f64.
            unsafe { store(lanes.as_mut_ptr(), self.0) }
        }
        #[inline(always)]
        fn store_mask(m: Mask8, a: &mut Mask, at: usize) {
            for (l, flag) in a.0[at..at + 8].iter_mut().enumerate() {
                *flag = m.0 & (1 << l) != 0;
            }
        }
        #[inline(always)]
        fn sqrt(self) -> Avx8 {
            // SAFETY: as in `add`.
            Avx8(unsafe { sqrt(self.0) })
        }
        #[inline(always)]
        fn abs(self) -> Avx8 {
            // SAFETY: as in `add`.
            Avx8(unsafe { abs(self.0) })
        }
        #[inline(always)]
        fn max(self, o: Avx8) -> Avx8 {
            // SAFETY: as in `add`.
            Avx8(unsafe { max(self.0, o.0) })
        }
        #[inline(always)]
        fn finite(self) -> Mask8 {
            // SAFETY: as in `add`.
            Mask8(unsafe { finite(self.0) })
        }
        #[inline(always)]
        fn ge(self, o: Avx8) -> Mask8 {
            // SAFETY: as in `add`.
            Mask8(unsafe { ge(self.0, o.0) })
        }
        #[inline(always)]
        fn le(self, o: Avx8) -> Mask8 {
            // SAFETY: as in `add`.
            Mask8(unsafe { le(self.0, o.0) })
        }
        #[inline(always)]
        fn ne(self, o: Avx8) -> Mask8 {
            // SAFETY: as in `add`.
            Mask8(unsafe { ne(self.0, o.0) })
        }
        #[inline(always)]
        fn select(m: Mask8, a: Avx8, b: Avx8) -> Avx8 {
            // SAFETY: as in `add`.
            Avx8(unsafe { blend(m.0, a.0, b.0) })
        }
    }
}

#[cfg(all(test, target_arch = "x86_64"))]
mod tests {
    use super::x86::Avx4;
    use super::x86_512::Avx8;
    use super::*;

    // Common practice: each AVX2 and AVX-512 operation gives, lane by lane, the bits of the scalar f64
    // operation it stands for (IEEE 754 results; NaN compared as NaN), on values that include
    // NaN, infinities, signed zeros and subnormals.
    type Op = fn(f64, f64) -> f64;
    type Test = fn(f64, f64) -> bool;

    #[test]
    fn avx_lanes_match_scalar_operations() {
        if std::arch::is_x86_feature_detected!("avx2") {
            // SAFETY: AVX2 is present (checked just above).
            unsafe { lanes_match_scalar_operations::<Avx4>() };
        }
        if std::arch::is_x86_feature_detected!("avx512f") {
            // SAFETY: AVX-512F is present (checked just above).
            unsafe { lanes_match_scalar_operations::<Avx8>() };
        }
    }

    /// The check of [`avx_lanes_match_scalar_operations`] for one lane type.
    ///
    /// # Safety
    /// `T`'s instructions must be available.
    unsafe fn lanes_match_scalar_operations<T: Lane>() {
        let values = [
            f64::NAN,
            -f64::NAN,
            f64::INFINITY,
            f64::NEG_INFINITY,
            0.0,
            -0.0,
            1.0,
            -2.5,
            f64::MIN_POSITIVE / 4.0,
            f64::MAX,
            3.0e-7,
            -1.0e300,
        ];
        let same = |a: f64, b: f64| (a.is_nan() && b.is_nan()) || a.to_bits() == b.to_bits();
        let pairs: Vec<(f64, f64)> = values
            .iter()
            .flat_map(|&p| values.iter().map(move |&q| (p, q)))
            .collect();
        assert_eq!(pairs.len() % LANES, 0);
        for chunk in pairs.chunks(LANES) {
            let a = W(std::array::from_fn(|l| chunk[l].0));
            let b = W(std::array::from_fn(|l| chunk[l].1));
            for at in (0..LANES).step_by(T::N) {
                // SAFETY: the caller promises `T`'s instructions.
                let (x, y) = unsafe { (T::load(&a, at), T::load(&b, at)) };
                let mut out = W::splat(0.0);
                let mut flags = Mask([false; LANES]);
                let ops: [(T, Op); 7] = [
                    (x + y, |p, q| p + q),
                    (x - y, |p, q| p - q),
                    (x * y, |p, q| p * q),
                    (x / y, |p, q| p / q),
                    (x.sqrt(), |p, _| p.sqrt()),
                    (x.abs(), |p, _| p.abs()),
                    (Lane::max(x, y), f64::max),
                ];
                for (k, (r, f)) in ops.into_iter().enumerate() {
                    r.store(&mut out, at);
                    for l in at..at + T::N {
                        let want = f(a.0[l], b.0[l]);
                        // `f64::max` leaves the sign of max(0, -0) open; the kernel's
                        // operands of `max` are never -0 (squares and absolute values).
                        let zeros = k == 6 && a.0[l] == 0.0 && b.0[l] == 0.0;
                        assert!(
                            zeros || same(out.0[l], want),
                            "{} {} {}",
                            a.0[l],
                            b.0[l],
                            out.0[l]
                        );
                    }
                }
                let tests: [(_, Test); 5] = [
                    (x.finite(), |p, _| p.is_finite()),
                    (x.ge(y), |p, q| p >= q),
                    (x.le(y), |p, q| p <= q),
                    (x.ne(y), |p, q| p != q),
                    (x.ge(y) & x.finite(), |p, q| p >= q && p.is_finite()),
                ];
                for (m, f) in tests {
                    T::store_mask(m, &mut flags, at);
                    T::select(m, x, y).store(&mut out, at);
                    for l in at..at + T::N {
                        let want = f(a.0[l], b.0[l]);
                        assert_eq!(flags.0[l], want, "{} {}", a.0[l], b.0[l]);
                        let pick = if want { a.0[l] } else { b.0[l] };
                        assert_eq!(out.0[l].to_bits(), pick.to_bits());
                    }
                }
            }
        }
    }
}
