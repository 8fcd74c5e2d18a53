//! Jets of a planar NURBS curve at several parameters at once: the arithmetic of
//! `NurbsCurve::eval` (basis rows by `basis_rows_in` with per-span reciprocals, the sums over
//! the span's control points, the quotient rule of The NURBS Book, 2nd ed., A4.2, eq. 4.8)
//! written once per lane of [`LANES`] points, so that the latencies of the points' recursions
//! and divisions overlap instead of following one another.
//!
//! Every lane does the same IEEE operations in the same order as the one-point evaluation
//! (additions, subtractions, multiplications and one division; no fused multiply-add), so each
//! lane gives the bits of the one-point evaluation. Only the knot spans differ between lanes:
//! the knots, reciprocals and control points each lane reads are gathered from its own span.

use super::knots::{KnotVector, SpanHint};
use crate::geometry::jet::CurveJet;
use std::ops::{Add, Mul, Sub};

/// Points evaluated together: four doubles fill one 256-bit AVX register, so a lane-wide value
/// is one register (an earlier block of 16 points in arrays went through the stack and did not
/// beat the one-point evaluation; see `benches/README.md`).
pub(crate) const LANES: usize = 4;

/// One value per lane, with element-wise IEEE arithmetic (one rounding per operation, no fused
/// multiply-add).
///
/// # Safety
/// A value of an implementing type exists only where its instructions are available: the
/// constructors are `unsafe` and their callers promise it (for [`x86::Avx4`], an AVX2
/// processor); the operations on existing values rely on that.
trait Lane: Copy + Add<Output = Self> + Sub<Output = Self> + Mul<Output = Self> {
    /// All lanes x.
    unsafe fn splat(x: f64) -> Self;
    /// Lane l from `a[l]`.
    unsafe fn from_array(a: [f64; LANES]) -> Self;
    /// Lane l from `a[l]`, read from memory.
    #[inline(always)]
    unsafe fn load(a: &[f64; LANES]) -> Self {
        // SAFETY: passed on from the caller.
        unsafe { Self::from_array(*a) }
    }
    /// Whether lo ≤ x < hi in every lane (false for a NaN lane).
    #[inline(always)]
    fn within(self, lo: f64, hi: f64) -> bool {
        self.to_array()
            .iter()
            .fold(true, |all, &x| all & (lo <= x) & (x < hi))
    }
    /// The lanes.
    fn to_array(self) -> [f64; LANES];
    /// 1 / x, lane by lane.
    fn recip(self) -> Self;
    /// Jet l of `out` (l < `out.len()` ≤ [`LANES`]) from lane l of `j` = [u, v, du, dv, ddu,
    /// ddv]: a transposition, no arithmetic.
    #[inline(always)]
    fn put_jets(j: [Self; 6], out: &mut [CurveJet]) {
        put_jets_by_lane(j, out)
    }
}

/// [`Lane::put_jets`] lane by lane, through arrays (the fallback of every lane type).
#[inline(always)]
fn put_jets_by_lane<T: Lane>(j: [T; 6], out: &mut [CurveJet]) {
    // No `array::map`: it is not reliably inlined.
    let [a, b, c, d, e, f] = j;
    let j = [
        a.to_array(),
        b.to_array(),
        c.to_array(),
        d.to_array(),
        e.to_array(),
        f.to_array(),
    ];
    for (l, o) in out.iter_mut().enumerate().take(LANES) {
        *o = CurveJet {
            u: j[0][l],
            v: j[1][l],
            du: j[2][l],
            dv: j[3][l],
            ddu: j[4][l],
            ddv: j[5][l],
        };
    }
}

/// Plain arrays: the baseline build (the optimiser maps them onto SSE2 pairs).
#[derive(Clone, Copy)]
struct Plain([f64; LANES]);

impl Add for Plain {
    type Output = Plain;
    #[inline(always)]
    fn add(self, o: Plain) -> Plain {
        Plain(std::array::from_fn(|l| self.0[l] + o.0[l]))
    }
}

impl Sub for Plain {
    type Output = Plain;
    #[inline(always)]
    fn sub(self, o: Plain) -> Plain {
        Plain(std::array::from_fn(|l| self.0[l] - o.0[l]))
    }
}

impl Mul for Plain {
    type Output = Plain;
    #[inline(always)]
    fn mul(self, o: Plain) -> Plain {
        Plain(std::array::from_fn(|l| self.0[l] * o.0[l]))
    }
}

impl Lane for Plain {
    #[inline(always)]
    unsafe fn splat(x: f64) -> Plain {
        Plain([x; LANES])
    }
    #[inline(always)]
    unsafe fn from_array(a: [f64; LANES]) -> Plain {
        Plain(a)
    }
    #[inline(always)]
    fn to_array(self) -> [f64; LANES] {
        self.0
    }
    #[inline(always)]
    fn recip(self) -> Plain {
        Plain(self.0.map(|x| 1.0 / x))
    }
}

#[cfg(target_arch = "x86_64")]
mod x86 {
    //! One 256-bit AVX vector per lane-wide value.
    use super::{LANES, Lane};
    use crate::geometry::jet::CurveJet;
    use std::arch::x86_64::*;
    use std::ops::{Add, Mul, Sub};

    /// Four lanes in one AVX register. Only for processors with AVX2 (see [`Lane`]).
    #[derive(Clone, Copy)]
    pub(super) struct Avx4(__m256d);

    // The `unsafe` blocks below are needed on older compilers (intrinsics were unsafe to call);
    // newer ones call them safely inside an AVX function.
    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn add(a: __m256d, b: __m256d) -> __m256d {
        // SAFETY: AVX is enabled for this function.
        unsafe { _mm256_add_pd(a, b) }
    }

    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn sub(a: __m256d, b: __m256d) -> __m256d {
        // SAFETY: AVX is enabled for this function.
        unsafe { _mm256_sub_pd(a, b) }
    }

    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn mul(a: __m256d, b: __m256d) -> __m256d {
        // SAFETY: AVX is enabled for this function.
        unsafe { _mm256_mul_pd(a, b) }
    }

    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn div(a: __m256d, b: __m256d) -> __m256d {
        // SAFETY: AVX is enabled for this function.
        unsafe { _mm256_div_pd(a, b) }
    }

    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn set(a: [f64; LANES]) -> __m256d {
        // SAFETY: AVX is enabled for this function.
        unsafe { _mm256_setr_pd(a[0], a[1], a[2], a[3]) }
    }

    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn load(a: &[f64; LANES]) -> __m256d {
        // SAFETY: `a` holds four f64; unaligned load; AVX is enabled for this function.
        unsafe { _mm256_loadu_pd(a.as_ptr()) }
    }

    /// lo ≤ x < hi in all four lanes: ordered comparisons (false on a NaN), as the scalar
    /// `<=` and `<`.
    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn within(x: __m256d, lo: f64, hi: f64) -> bool {
        // SAFETY: AVX is enabled for this function.
        unsafe {
            let ge = _mm256_cmp_pd::<_CMP_LE_OQ>(_mm256_set1_pd(lo), x);
            let lt = _mm256_cmp_pd::<_CMP_LT_OQ>(x, _mm256_set1_pd(hi));
            _mm256_movemask_pd(_mm256_and_pd(ge, lt)) == 0b1111
        }
    }

    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn get(v: __m256d) -> [f64; LANES] {
        let mut out = [0.0; LANES];
        // SAFETY: `out` holds four f64; unaligned store; AVX is enabled for this function.
        unsafe { _mm256_storeu_pd(out.as_mut_ptr(), v) };
        out
    }

    impl Add for Avx4 {
        type Output = Avx4;
        #[inline(always)]
        fn add(self, o: Avx4) -> Avx4 {
            // SAFETY: an `Avx4` exists only on an AVX2 processor (the `Lane` contract).
            Avx4(unsafe { add(self.0, o.0) })
        }
    }

    impl Sub for Avx4 {
        type Output = Avx4;
        #[inline(always)]
        fn sub(self, o: Avx4) -> Avx4 {
            // SAFETY: as above.
            Avx4(unsafe { sub(self.0, o.0) })
        }
    }

    impl Mul for Avx4 {
        type Output = Avx4;
        #[inline(always)]
        fn mul(self, o: Avx4) -> Avx4 {
            // SAFETY: as above.
            Avx4(unsafe { mul(self.0, o.0) })
        }
    }

    impl Lane for Avx4 {
        #[inline(always)]
        unsafe fn splat(x: f64) -> Avx4 {
            // SAFETY: the caller promises AVX2 (the `Lane` contract).
            Avx4(unsafe { set([x; LANES]) })
        }
        #[inline(always)]
        unsafe fn from_array(a: [f64; LANES]) -> Avx4 {
            // SAFETY: as above.
            Avx4(unsafe { set(a) })
        }
        #[inline(always)]
        unsafe fn load(a: &[f64; LANES]) -> Avx4 {
            // SAFETY: the caller promises AVX2; `a` holds four f64.
            Avx4(unsafe { load(a) })
        }
        #[inline(always)]
        fn within(self, lo: f64, hi: f64) -> bool {
            // SAFETY: an `Avx4` exists only on an AVX2 processor.
            unsafe { within(self.0, lo, hi) }
        }
        #[inline(always)]
        fn to_array(self) -> [f64; LANES] {
            // SAFETY: an `Avx4` exists only on an AVX2 processor.
            unsafe { get(self.0) }
        }
        #[inline(always)]
        fn recip(self) -> Avx4 {
            // SAFETY: as above.
            Avx4(unsafe { div(set([1.0; LANES]), self.0) })
        }
        #[inline(always)]
        fn put_jets(j: [Avx4; 6], out: &mut [CurveJet]) {
            if out.len() < LANES {
                return super::put_jets_by_lane(j, out);
            }
            let [a, b, c, d, e, f] = j;
            // SAFETY: an `Avx4` exists only on an AVX2 processor; `out` holds four jets.
            unsafe { put4([a.0, b.0, c.0, d.0, e.0, f.0], &mut out[..LANES]) }
        }
    }

    /// The four jets of `j` = [u, v, du, dv, ddu, ddv] (lane l = jet l) into `out` by
    /// transposition: per jet one 256-bit store of [u, v, du, dv] and one 128-bit store of
    /// [ddu, ddv] (`CurveJet` is six `f64` in field order, `repr(C)`).
    ///
    /// # Safety
    /// AVX must be available; `out` must hold exactly four jets.
    #[target_feature(enable = "avx")]
    #[inline]
    #[allow(unused_unsafe)]
    unsafe fn put4(j: [__m256d; 6], out: &mut [CurveJet]) {
        debug_assert_eq!(out.len(), LANES);
        // SAFETY: AVX is enabled for this function; each jet is 48 bytes of six f64 (the
        // layout `repr(C)` fixes), so the stores at offsets 0 (four f64) and 4 (two f64) of
        // each of the four jets stay inside `out`; unaligned stores.
        unsafe {
            let [u, v, du, dv, ddu, ddv] = j;
            let t0 = _mm256_unpacklo_pd(u, v); // u0 v0 u2 v2
            let t1 = _mm256_unpackhi_pd(u, v); // u1 v1 u3 v3
            let t2 = _mm256_unpacklo_pd(du, dv); // du0 dv0 du2 dv2
            let t3 = _mm256_unpackhi_pd(du, dv); // du1 dv1 du3 dv3
            let s0 = _mm256_unpacklo_pd(ddu, ddv); // ddu0 ddv0 ddu2 ddv2
            let s1 = _mm256_unpackhi_pd(ddu, ddv); // ddu1 ddv1 ddu3 ddv3
            let p = out.as_mut_ptr().cast::<f64>();
            _mm256_storeu_pd(p, _mm256_permute2f128_pd::<0x20>(t0, t2));
            _mm_storeu_pd(p.add(4), _mm256_castpd256_pd128(s0));
            _mm256_storeu_pd(p.add(6), _mm256_permute2f128_pd::<0x20>(t1, t3));
            _mm_storeu_pd(p.add(10), _mm256_castpd256_pd128(s1));
            _mm256_storeu_pd(p.add(12), _mm256_permute2f128_pd::<0x31>(t0, t2));
            _mm_storeu_pd(p.add(16), _mm256_extractf128_pd::<1>(s0));
            _mm256_storeu_pd(p.add(18), _mm256_permute2f128_pd::<0x31>(t1, t3));
            _mm_storeu_pd(p.add(22), _mm256_extractf128_pd::<1>(s1));
        }
    }
}

/// The parts of a planar NURBS curve a block evaluation reads.
pub(crate) struct CurveParts<'a> {
    /// The knot vector (spans are found in it).
    pub(crate) knots: &'a KnotVector,
    /// Per-span reciprocals, `p (p + 1) / 2` per span from span p on (see `span_reciprocals`).
    pub(crate) recip: &'a [f64],
    /// Weighted control points w_i P_i (plain P_i when non-rational).
    pub(crate) weighted: &'a [[f64; 2]],
    /// Weights; empty when non-rational.
    pub(crate) weights: &'a [f64],
}

/// The jets at `ts[i]` into `out[i]` (i < min of both lengths), the hint carried through the
/// points in order as by one-point evaluations. Degrees 1 to 3 run lane-wide; `None` is
/// returned for other degrees (nothing written, hint untouched), which the caller evaluates
/// point by point.
///
/// On x86-64 processors with AVX2 (detected at run time, within the limit of
/// [`crate::isa::limit_vector_kernels`]) the lanes are one AVX register; otherwise plain
/// arrays. The operations are the same, so are the bits.
#[inline]
pub(crate) fn jets_block(
    c: &CurveParts<'_>,
    ts: &[f64],
    hint: &mut SpanHint,
    out: &mut [CurveJet],
) -> Option<()> {
    #[cfg(target_arch = "x86_64")]
    if crate::isa::vector_kernels() >= crate::isa::VectorKernels::Avx2 {
        // SAFETY: the processor supports AVX2 (`vector_kernels` never exceeds the supported
        // variant; the AVX-512F variant implies AVX2).
        return unsafe { jets_block_avx2(c, ts, hint, out) };
    }
    // SAFETY: plain arrays need no particular instructions.
    unsafe { jets_block_with::<Plain>(c, ts, hint, out) }
}

/// [`jets_block_with`] on AVX registers, compiled for AVX2.
///
/// # Safety
/// The processor must support AVX2.
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
unsafe fn jets_block_avx2(
    c: &CurveParts<'_>,
    ts: &[f64],
    hint: &mut SpanHint,
    out: &mut [CurveJet],
) -> Option<()> {
    // SAFETY: the caller promises AVX2.
    unsafe { jets_block_with::<x86::Avx4>(c, ts, hint, out) }
}

/// The block evaluation with lanes `T`, dispatched on degree and weights.
///
/// # Safety
/// `T`'s instructions must be available (see [`Lane`]).
#[inline(always)]
unsafe fn jets_block_with<T: Lane>(
    c: &CurveParts<'_>,
    ts: &[f64],
    hint: &mut SpanHint,
    out: &mut [CurveJet],
) -> Option<()> {
    let rational = !c.weights.is_empty();
    // SAFETY (all arms): passed on from the caller.
    unsafe {
        match (c.knots.degree(), rational) {
            (1, false) => blocks::<T, 1, 2, false>(c, ts, hint, out),
            (1, true) => blocks::<T, 1, 2, true>(c, ts, hint, out),
            (2, false) => blocks::<T, 2, 3, false>(c, ts, hint, out),
            (2, true) => blocks::<T, 2, 3, true>(c, ts, hint, out),
            (3, false) => blocks::<T, 3, 4, false>(c, ts, hint, out),
            (3, true) => blocks::<T, 3, 4, true>(c, ts, hint, out),
            _ => return None,
        }
    }
    Some(())
}

/// `[e(0), e(1), e(2), e(3)]` with `e(l)` the expression for lane l, written out (no closure
/// the optimiser might leave uninlined).
macro_rules! per_lane {
    (|$l:ident| $e:expr) => {
        [
            {
                let $l = 0;
                $e
            },
            {
                let $l = 1;
                $e
            },
            {
                let $l = 2;
                $e
            },
            {
                let $l = 3;
                $e
            },
        ]
    };
}

/// Entries of the knot window and of the reciprocals of one span, up to cubics.
const ROOM: usize = 6;

/// Groups of [`LANES`] points: the spans in order (hint carried; one test per point when the
/// group stays in the hinted span), then the jets lane-wide. A last, short group fills its
/// unused lanes with its last point (computed, not stored).
///
/// # Safety
/// As [`jets_block_with`].
#[inline(always)]
unsafe fn blocks<T: Lane, const P: usize, const N: usize, const RAT: bool>(
    c: &CurveParts<'_>,
    ts: &[f64],
    hint: &mut SpanHint,
    out: &mut [CurveJet],
) {
    let len = ts.len().min(out.len());
    let (ts, out) = (&ts[..len], &mut out[..len]);
    let mut whole = ts.chunks_exact(LANES).zip(out.chunks_exact_mut(LANES));
    for (t, o) in &mut whole {
        let t: &[f64; LANES] = t.try_into().expect("chunks of LANES");
        // SAFETY (both): passed on from the caller.
        let tv = unsafe { T::load(t) };
        unsafe { group::<T, P, N, RAT>(c, t, tv, LANES, hint, o) };
    }
    let rest = len % LANES;
    if rest > 0 {
        let (t, o) = (&ts[len - rest..], &mut out[len - rest..]);
        let mut tl = [t[rest - 1]; LANES];
        tl[..rest].copy_from_slice(t);
        // SAFETY (both): passed on from the caller.
        let tv = unsafe { T::from_array(tl) };
        unsafe { group::<T, P, N, RAT>(c, &tl, tv, rest, hint, o) };
    }
}

/// One group: `t` its parameters (`len` of them, the others repeating the last), `tv` the same
/// lane-wide. When every lane lies in the hinted span (the first test of `find_span`, which then
/// returns the hint and keeps it) one vector comparison and no search; otherwise the spans by
/// [`KnotVector::group_spans`].
///
/// # Safety
/// As [`jets_block_with`].
#[inline(always)]
unsafe fn group<T: Lane, const P: usize, const N: usize, const RAT: bool>(
    c: &CurveParts<'_>,
    t: &[f64; LANES],
    tv: T,
    len: usize,
    hint: &mut SpanHint,
    out: &mut [CurveJet],
) {
    if let Some(h) = hint.0 {
        // As in `group_spans`: h ≤ n, so x < u_{h+1} covers `find_span`'s test x < u_{n+1}.
        if h >= P && h < c.knots.count() {
            let k = c.knots.knots();
            if tv.within(k[h], k[h + 1]) {
                // SAFETY: passed on from the caller.
                unsafe { lanes::<T, P, N, RAT, true>(c, tv, &[h; LANES], out) };
                return;
            }
        }
    }
    let (spans, same) = c.knots.group_spans(t, len, hint);
    // SAFETY (both): passed on from the caller.
    if same {
        unsafe { lanes::<T, P, N, RAT, true>(c, tv, &spans, out) };
    } else {
        unsafe { lanes::<T, P, N, RAT, false>(c, tv, &spans, out) };
    }
}

/// Lane-wide value `i` of the per-lane slices `x`: gathered lane by lane, or with `SAME` (every
/// lane reads the same slice) lane 0's value broadcast.
///
/// # Safety
/// As [`jets_block_with`].
#[inline(always)]
unsafe fn pick<T: Lane, const SAME: bool>(x: &[&[f64]; LANES], i: usize) -> T {
    // SAFETY: passed on from the caller.
    unsafe {
        if SAME {
            T::splat(x[0][i])
        } else {
            T::from_array(per_lane!(|l| x[l][i]))
        }
    }
}

/// The jets of one group into `out` (its first `out.len()` ≤ [`LANES`] lanes):
/// `basis_rows_in::<N, P, Reciprocals>` for order 2 and `eval::<2, N, P, true>` of
/// `NurbsCurve`, operation for operation, each lane on its own span. With `SAME` the caller
/// promises that every lane has the span of lane 0: the knots, reciprocals, control points and
/// weights are then read once and broadcast instead of gathered lane by lane (the same values).
///
/// # Safety
/// As [`jets_block_with`].
#[inline(always)]
unsafe fn lanes<T: Lane, const P: usize, const N: usize, const RAT: bool, const SAME: bool>(
    c: &CurveParts<'_>,
    t: T,
    spans: &[usize; LANES],
    out: &mut [CurveJet],
) {
    debug_assert!(P < N && 2 * P <= ROOM && P * (P + 1) / 2 <= ROOM);
    debug_assert!(!SAME || spans.iter().all(|&s| s == spans[0]));
    // SAFETY (every `T` constructor and `pick` below): passed on from the caller.
    let zero = unsafe { T::splat(0.0) };
    let per = P * (P + 1) / 2;
    let knots = c.knots.knots();
    // Lane l reads the 2P knots u_{s+1−P} ..= u_{s+P} of its span s (kw as in basis_rows_in),
    // the span's reciprocals, control points and weights; one bounds check per lane and slice
    // (with `SAME`, lane 0's only).
    let mut kw: [&[f64]; LANES] = [&[]; LANES];
    let mut rw: [&[f64]; LANES] = [&[]; LANES];
    let mut xs: [&[f64]; LANES] = [&[]; LANES];
    let mut ws: [&[f64]; LANES] = [&[]; LANES];
    for l in 0..if SAME { 1 } else { LANES } {
        let s = spans[l];
        kw[l] = &knots[s + 1 - P..s + P + 1];
        rw[l] = &c.recip[(s - P) * per..][..per];
        xs[l] = c.weighted[s - P..][..P + 1].as_flattened();
        if RAT {
            ws[l] = &c.weights[s - P..][..P + 1];
        }
    }
    let mut kv = [zero; ROOM];
    for (i, k) in kv.iter_mut().enumerate().take(2 * P) {
        *k = unsafe { pick::<T, SAME>(&kw, i) };
    }
    let mut rc = [zero; ROOM];
    for (i, r) in rc.iter_mut().enumerate().take(per) {
        *r = unsafe { pick::<T, SAME>(&rw, i) };
    }

    // --- basis_rows_in (Cox–de Boor with reciprocals) ---
    let mut row = [zero; N];
    let mut left = [zero; N];
    let mut right = [zero; N];
    let mut deg_p1 = [zero; N];
    let mut deg_p2 = [zero; N];
    row[0] = unsafe { T::splat(1.0) };
    for j in 1..P + 1 {
        if j == P {
            deg_p1 = row;
        }
        if j + 1 == P {
            deg_p2 = row;
        }
        left[j] = t - kv[P - j];
        right[j] = kv[P - 1 + j] - t;
        let mut saved = zero;
        for r in 0..j {
            let temp = row[r] * rc[j * (j - 1) / 2 + r];
            row[r] = saved + right[r + 1] * temp;
            saved = left[j - r] * temp;
        }
        row[j] = saved;
    }
    let d1 = derivative_row::<T, N>(P, &deg_p1, zero, &rc);
    let d2 = if P >= 2 {
        let der_p1 = derivative_row::<T, N>(P - 1, &deg_p2, zero, &rc);
        derivative_row::<T, N>(P, &der_p1, zero, &rc)
    } else {
        [zero; N]
    };
    let rows = [row, d1, d2];

    // --- the sums over the span's control points ---
    let mut a = [[zero; 2]; 3];
    let mut w = [zero; 3];
    // `r` selects the control point and the basis functions' entry alike.
    #[allow(clippy::needless_range_loop)]
    for r in 0..P + 1 {
        let x = unsafe { pick::<T, SAME>(&xs, 2 * r) };
        let y = unsafe { pick::<T, SAME>(&xs, 2 * r + 1) };
        let wi = if RAT {
            unsafe { pick::<T, SAME>(&ws, r) }
        } else {
            zero
        };
        for kk in 0..3 {
            let n = rows[kk][r];
            a[kk][0] = a[kk][0] + n * x;
            a[kk][1] = a[kk][1] + n * y;
            if RAT {
                w[kk] = w[kk] + n * wi;
            }
        }
    }
    let [a0, a1, a2] = a;
    let [pu, pv, d1u, d1v, d2u, d2v] = if RAT {
        // --- the quotient rule ---
        let inv_w = w[0].recip();
        let two = unsafe { T::splat(2.0) };
        let mut r = [zero; 6];
        for k in 0..2 {
            let c0 = a0[k] * inv_w;
            let c1 = (a1[k] - w[1] * c0) * inv_w;
            let c2 = (a2[k] - two * w[1] * c1 - w[2] * c0) * inv_w;
            r[k] = c0;
            r[2 + k] = c1;
            r[4 + k] = c2;
        }
        r
    } else {
        [a0[0], a0[1], a1[0], a1[1], a2[0], a2[1]]
    };
    T::put_jets([pu, pv, d1u, d1v, d2u, d2v], out);
}

/// `derivative_row` of `basis_rows_in` lane-wide: out[r] = p (carry − lower[r]·rec), the
/// reciprocals of degree p at index p (p − 1)/2 + r.
#[inline(always)]
fn derivative_row<T: Lane, const N: usize>(
    p: usize,
    lower: &[T; N],
    zero: T,
    rc: &[T; ROOM],
) -> [T; N] {
    // SAFETY: a `T` (`zero`) exists, so its instructions are available.
    let pf = unsafe { T::splat(p as f64) };
    let mut out = [zero; N];
    let mut carry = zero;
    for r in 0..p {
        let term = lower[r] * rc[p * (p - 1) / 2 + r];
        out[r] = pf * (carry - term);
        carry = term;
    }
    out[p] = pf * carry;
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geometry::jet::DerivOrder;
    use crate::nurbs::NurbsCurve;

    use crate::geometry::math::lcg;

    // Common practice: the lanes in plain arrays (the build without AVX2; on an AVX2 machine
    // the integration tests only reach the AVX lanes) give the bits of the one-point
    // evaluation, for degrees 1–3, rational or not, every group length 1..=9, with t on knots
    // and at the domain ends.
    #[test]
    fn plain_lanes_give_the_one_point_bits() {
        let mut st = 3u64;
        for p in 1..=3 {
            for rational in [false, true] {
                let n = p + 5;
                let mut knots = vec![0.0; p + 1];
                let mut x = 0.0;
                for i in 0..n - p - 1 {
                    if i != 2 {
                        x += 0.1 + lcg(&mut st);
                    }
                    knots.push(x);
                }
                x += 0.1 + lcg(&mut st);
                knots.extend(std::iter::repeat_n(x, p + 1));
                let pts: Vec<[f64; 2]> =
                    (0..n).map(|_| [lcg(&mut st), lcg(&mut st) - 0.5]).collect();
                let ws: Vec<f64> = (0..n).map(|_| 0.3 + 2.0 * lcg(&mut st)).collect();
                let c = NurbsCurve::new(p, &knots, &pts, rational.then_some(&ws[..])).unwrap();
                let dom = c.domain();
                for len in 1..=9 {
                    let ts: Vec<f64> = (0..len)
                        .map(|i| match i % 4 {
                            0 => dom.lo,
                            1 => knots[p + 1 + (i % (n - p))],
                            2 => dom.hi,
                            _ => dom.lo + dom.width() * lcg(&mut st),
                        })
                        .collect();
                    let mut h1 = SpanHint::default();
                    let mut h2 = SpanHint::default();
                    let mut block = vec![CurveJet::default(); len];
                    // SAFETY: plain arrays need no particular instructions.
                    let done =
                        unsafe { jets_block_with::<Plain>(&c.parts(), &ts, &mut h2, &mut block) };
                    assert!(done.is_some());
                    for (i, (&t, b)) in ts.iter().zip(&block).enumerate() {
                        let d = c.derivs_unchecked(t, DerivOrder::Second, &mut h1);
                        let one = [d.p[0], d.p[1], d.d1[0], d.d1[1], d.d2[0], d.d2[1]];
                        let got = [b.u, b.v, b.du, b.dv, b.ddu, b.ddv];
                        assert_eq!(
                            one.map(f64::to_bits),
                            got.map(f64::to_bits),
                            "degree {p}, rational {rational}, group of {len}, point {i}, t = {t}"
                        );
                    }
                    assert_eq!(h1, h2);
                }
            }
        }
    }
}
