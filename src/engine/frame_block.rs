//! The Darboux frame and invariants of a block of points at once, in structure-of-arrays form.
//!
//! The same formulas as [`crate::geometry::principal::SurfacePoint::new`] and
//! [`crate::geometry::frame::darboux_frame_at`], in the same order of operations, written once over a
//! lane-wide type ([`Lane`]) with no branches (the choices become selects), so that the square
//! roots and divisions of several points overlap instead of waiting on each other (one point at
//! a time, the frame is bound by their latency). On AVX2 processors ([`FrameKernel`]) the points
//! are done four at a time, each value one AVX register, the jets transposed straight into the
//! registers and the frames straight out of them (pairs of adjacent f64 of four structures;
//! `#[repr(C)]` layouts checked at compile time), each part of the results stored as soon as
//! it is final; elsewhere a block of [`BLOCK`] points as plain `[f64; BLOCK]` arrays
//! ([`BlockInput`], [`BlockOutput`]), whose loops the compiler vectorises. Since every lane
//! performs exactly the operations of the one-point path, each in IEEE double precision (no
//! fused multiply-add, no reassociation), the results are the same bits; `tests/block.rs` and
//! the unit tests below check it.
//!
//! The kernel does not report errors: it computes every lane and flags the lanes whose checks
//! fail (the checks of the one-point path, the same comparisons). The caller evaluates flagged
//! lanes again by the one-point path, which gives the exact error (or, should a flag be set
//! for a lane the one-point path accepts, its result).
//!
//! Costs, per point, from the formulas (counted by hand): about 250 additions and
//! multiplications, 6 square roots and 5 divisions; no allocation.

// Index loops over the lanes on purpose: iterators over arrays by value are not unrolled and
// vectorised as reliably.
#![allow(clippy::needless_range_loop)]

use crate::engine::batch::SampleError;
use crate::engine::lanes::{LANES, Lane, Mask, W, W3};
use crate::error::StrakeError;
use crate::geometry::frame::{
    Conditioning, DarbouxFrame, ParamScales, STALLED_CURVE_LIMIT, darboux_frame,
};
use crate::geometry::jet::{CurveJet, SurfaceJet};
use crate::geometry::math::Vec3;
use crate::geometry::principal::{
    DEGENERATE_SURFACE_LIMIT, EIGEN_SAFE_HI, EIGEN_SAFE_LO, Orientation, PrincipalCurvatures,
};
use crate::isa::VectorKernels;
use std::marker::PhantomData;
use std::mem::{MaybeUninit, size_of};
use std::ops::{Div, Mul};

/// Number of points the block kernel processes together (16): a multiple of the vector widths
/// (2 lanes with SSE2, 4 with AVX2), large enough to hide the latency of the frame's square
/// roots and divisions (8 leave some exposed; 32 spill too much; measured with
/// `examples/speed_report.rs`).
pub const BLOCK: usize = LANES;

#[inline(always)]
fn dot<T: Lane>(a: [T; 3], b: [T; 3]) -> T {
    // nalgebra's order for 3-vectors: (a0 b0 + a1 b1) + a2 b2.
    a[0] * b[0] + a[1] * b[1] + a[2] * b[2]
}

#[inline(always)]
fn cross<T: Lane>(a: [T; 3], b: [T; 3]) -> [T; 3] {
    [
        a[1] * b[2] - a[2] * b[1],
        a[2] * b[0] - a[0] * b[2],
        a[0] * b[1] - a[1] * b[0],
    ]
}

#[inline(always)]
fn scale<T: Lane>(a: [T; 3], s: T) -> [T; 3] {
    [a[0] * s, a[1] * s, a[2] * s]
}

/// `SurfacePoint::second_form(x, y)` = L x0 y0 + M (x0 y1 + x1 y0) + Nn x1 y1.
#[inline(always)]
fn second_form<T: Lane>(l: T, m: T, nn: T, x0: T, x1: T, y0: T, y1: T) -> T {
    l * x0 * y0 + m * (x0 * y1 + x1 * y0) + nn * x1 * y1
}

/// The inputs of a block in structure-of-arrays form.
#[derive(Clone, Copy)]
pub(crate) struct BlockInput {
    su: W3,
    sv: W3,
    suu: W3,
    suv: W3,
    svv: W3,
    du: W,
    dv: W,
    ddu: W,
    ddv: W,
}

/// The outputs of a block in structure-of-arrays form, with a flag per lane.
#[derive(Clone, Copy)]
pub(crate) struct BlockOutput {
    n: W3,
    t: W3,
    b: W3,
    d1: W3,
    d2: W3,
    kn: W,
    kg: W,
    tg: W,
    speed: W,
    k1: W,
    k2: W,
    mean: W,
    gaussian: W,
    conditioning: W,
    speed_figure: W,
    /// Where the kernel's inputs are finite and every check of the one-point path passes
    /// (the position S and (u, v), which the kernel does not read, are the caller's to check:
    /// [`finite_rest`]).
    ok: Mask,
}

impl BlockInput {
    /// All lanes zero: storage for [`Self::fill`] (made once per batch call, not per block).
    pub(crate) fn zeroed() -> Self {
        let z = W([0.0; BLOCK]);
        BlockInput {
            su: [z; 3],
            sv: [z; 3],
            suu: [z; 3],
            suv: [z; 3],
            svv: [z; 3],
            du: z,
            dv: z,
            ddu: z,
            ddv: z,
        }
    }

    /// Gathers `len` ≤ [`BLOCK`] lanes from jets into a new block (see [`Self::fill`]).
    #[cfg(test)]
    pub(crate) fn gather(surface: &[SurfaceJet], curve: &[CurveJet]) -> Self {
        let mut x = Self::zeroed();
        x.fill(surface, curve);
        x
    }

    /// Overwrites the block with `len` = min(surface.len(), curve.len()) ≤ [`BLOCK`] lanes
    /// from jets (1 ≤ len); lanes from `len` on repeat lane 0 (their results are ignored;
    /// repeating real data keeps them free of NaN and of slow paths).
    pub(crate) fn fill(&mut self, surface: &[SurfaceJet], curve: &[CurveJet]) {
        let len = surface.len().min(curve.len());
        debug_assert!((1..=BLOCK).contains(&len));
        let x = self;
        #[inline(always)]
        fn put(w: &mut W3, i: usize, v: &Vec3) {
            w[0].0[i] = v.x;
            w[1].0[i] = v.y;
            w[2].0[i] = v.z;
        }
        for (i, (s, c)) in surface.iter().zip(curve).enumerate().take(BLOCK) {
            put(&mut x.su, i, &s.su);
            put(&mut x.sv, i, &s.sv);
            put(&mut x.suu, i, &s.suu);
            put(&mut x.suv, i, &s.suv);
            put(&mut x.svv, i, &s.svv);
            x.du.0[i] = c.du;
            x.dv.0[i] = c.dv;
            x.ddu.0[i] = c.ddu;
            x.ddv.0[i] = c.ddv;
        }
        if len < BLOCK {
            for w in [&mut x.su, &mut x.sv, &mut x.suu, &mut x.suv, &mut x.svv] {
                for c in w.iter_mut() {
                    let first = c.0[0];
                    c.0[len..].fill(first);
                }
            }
            for c in [&mut x.du, &mut x.dv, &mut x.ddu, &mut x.ddv] {
                let first = c.0[0];
                c.0[len..].fill(first);
            }
        }
    }
}

impl BlockOutput {
    /// All lanes zero and flagged: storage for [`frames_of_block`] (made once per batch call).
    pub(crate) fn zeroed() -> Self {
        let z = W([0.0; BLOCK]);
        BlockOutput {
            n: [z; 3],
            t: [z; 3],
            b: [z; 3],
            d1: [z; 3],
            d2: [z; 3],
            kn: z,
            kg: z,
            tg: z,
            speed: z,
            k1: z,
            k2: z,
            mean: z,
            gaussian: z,
            conditioning: z,
            speed_figure: z,
            ok: Mask([false; BLOCK]),
        }
    }

    /// True when lane `i` passed every check.
    #[inline]
    pub(crate) fn ok(&self, i: usize) -> bool {
        self.ok.0[i]
    }

    /// The frame of lane `i` (meaningful when [`Self::ok`]); (u, v) and the point come from
    /// the jets.
    #[inline]
    pub(crate) fn frame(&self, i: usize, surface: &SurfaceJet, curve: &CurveJet) -> DarbouxFrame {
        let v = |a: &W3| Vec3::new(a[0].0[i], a[1].0[i], a[2].0[i]);
        DarbouxFrame {
            u: curve.u,
            v: curve.v,
            point: surface.p,
            t: v(&self.t),
            b: v(&self.b),
            n: v(&self.n),
            normal_curvature: self.kn.0[i],
            geodesic_curvature: self.kg.0[i],
            geodesic_torsion: self.tg.0[i],
            speed: self.speed.0[i],
            principal: PrincipalCurvatures {
                k1: self.k1.0[i],
                k2: self.k2.0[i],
                d1: v(&self.d1),
                d2: v(&self.d2),
                mean: self.mean.0[i],
                gaussian: self.gaussian.0[i],
            },
            conditioning: Conditioning {
                surface: self.conditioning.0[i],
                curve: self.speed_figure.0[i],
            },
        }
    }
}

/// The frame math over all lanes of a block: the formulas of `SurfacePoint::new_with_limit`
/// and `darboux_frame_at`, operation for operation. `scales` must be valid (positive, finite).
///
/// On x86-64 processors with AVX-512F or AVX2 (detected at run time; `variant` may ask for a
/// narrower one) the same code runs on AVX-512 or AVX registers, eight or four lanes per
/// instruction, a group of eight or four points at a time. Only additions,
/// subtractions, multiplications, divisions, square roots, compares and selects are used, which
/// round identically in every instruction set (no fused multiply-add), so both give the same
/// bits.
/// The results go to `y` (written in place: a block's output is about 2 KiB, not worth
/// returning by value).
///
/// The batch entry points use [`FrameKernel`], which on AVX2 reads the jets and writes the
/// frames directly; this structure-of-arrays dispatch remains for the unit test that holds the
/// AVX variant of the frame math to the baseline one on the same block.
#[cfg(test)]
#[inline(never)]
pub(crate) fn frames_of_block(
    x: &BlockInput,
    orientation: Orientation,
    s: &ParamScales,
    y: &mut BlockOutput,
    variant: VectorKernels,
) {
    #[cfg(target_arch = "x86_64")]
    match crate::isa::supported_vector_kernels().min(variant) {
        VectorKernels::Avx512 => {
            // SAFETY: the processor supports AVX-512F (checked just above).
            unsafe { frames_of_block_avx512(x, orientation, s, y) };
            return;
        }
        VectorKernels::Avx2 => {
            // SAFETY: the processor supports AVX2 (checked just above).
            unsafe { frames_of_block_avx2(x, orientation, s, y) };
            return;
        }
        VectorKernels::Baseline => {}
    }
    frames_of_block_portable(x, orientation, s, y)
}

/// The kernel on AVX-512 registers ([`crate::engine::lanes::x86_512::Avx8`]), two groups of
/// eight lanes.
///
/// # Safety
/// The processor must support AVX-512F.
#[cfg(all(test, target_arch = "x86_64"))]
#[target_feature(enable = "avx512f")]
unsafe fn frames_of_block_avx512(
    x: &BlockInput,
    orientation: Orientation,
    s: &ParamScales,
    y: &mut BlockOutput,
) {
    use crate::engine::lanes::x86_512::Avx8;
    for at in (0..BLOCK).step_by(Avx8::N) {
        // SAFETY: the caller promises AVX-512F.
        unsafe { frames_of_group::<Avx8>(x, orientation, s, y, at) };
    }
}

/// The kernel on AVX registers ([`crate::engine::lanes::x86::Avx4`]), four groups of four lanes.
///
/// # Safety
/// The processor must support AVX2.
#[cfg(all(test, target_arch = "x86_64"))]
#[target_feature(enable = "avx2")]
unsafe fn frames_of_block_avx2(
    x: &BlockInput,
    orientation: Orientation,
    s: &ParamScales,
    y: &mut BlockOutput,
) {
    use crate::engine::lanes::x86::Avx4;
    for at in (0..BLOCK).step_by(Avx4::N) {
        // SAFETY: the caller promises AVX2.
        unsafe { frames_of_group::<Avx4>(x, orientation, s, y, at) };
    }
}

/// The kernel in the baseline instruction set: all lanes as plain arrays.
#[inline(always)]
pub(crate) fn frames_of_block_portable(
    x: &BlockInput,
    orientation: Orientation,
    s: &ParamScales,
    y: &mut BlockOutput,
) {
    // SAFETY: plain arrays need no particular instructions.
    unsafe { frames_of_group::<W>(x, orientation, s, y, 0) }
}

/// `a * b` in f64, outside [`frame_math`], whose bound `f64: Mul<T>` hides the scalar
/// product from type inference.
#[inline(always)]
fn scalar_mul(a: f64, b: f64) -> f64 {
    a * b
}

/// `a / b` in f64 (see [`scalar_mul`]).
#[inline(always)]
fn scalar_div(a: f64, b: f64) -> f64 {
    a / b
}

/// 4 ε, the umbilic test's relative bound of `SurfacePoint::new_with_limit`.
const UMBILIC_FACTOR: f64 = 4.0 * f64::EPSILON;

/// The inputs of the frame math for [`Lane::N`] points, one lane each.
#[derive(Clone, Copy)]
pub(crate) struct LanesIn<T> {
    su: [T; 3],
    sv: [T; 3],
    suu: [T; 3],
    suv: [T; 3],
    svv: [T; 3],
    du: T,
    dv: T,
    ddu: T,
    ddv: T,
}

/// The results that depend on the surface only, final before the curve's part starts.
pub(crate) struct SurfaceLanes<T> {
    n: [T; 3],
    d1: [T; 3],
    d2: [T; 3],
    k1: T,
    k2: T,
    mean: T,
    gaussian: T,
    conditioning: T,
    /// The curve's speed figure (it needs only u', v' and the extents; computed early so that
    /// it leaves with the conditioning figure).
    speed_figure: T,
}

/// The results of the curve's part, and the flags of every check.
pub(crate) struct CurveLanes<T: Lane> {
    n: [T; 3],
    tan: [T; 3],
    b: [T; 3],
    kn: T,
    kg: T,
    tg: T,
    speed: T,
    ok: T::Mask,
}

/// Where the frame math puts its results, each part as soon as it is final (so that fewer
/// values stay live across the rest of the kernel).
pub(crate) trait LanesOut<T: Lane> {
    /// The surface's part.
    fn surface(&mut self, r: SurfaceLanes<T>);
    /// The curve's part and the flags.
    fn curve(&mut self, r: CurveLanes<T>);
}

/// The frame math for the lanes `at .. at + T::N` of a block in structure-of-arrays form.
///
/// # Safety
/// `T`'s instructions must be available (see [`Lane`]).
#[inline(always)]
unsafe fn frames_of_group<T: Lane>(
    x: &BlockInput,
    orientation: Orientation,
    s: &ParamScales,
    y: &mut BlockOutput,
    at: usize,
) where
    f64: Mul<T, Output = T> + Div<T, Output = T>,
{
    // SAFETY (loads): passed on from the caller.
    let ld = |w: &W| unsafe { T::load(w, at) };
    let ld3 = |w: &W3| [ld(&w[0]), ld(&w[1]), ld(&w[2])];
    let input = LanesIn {
        su: ld3(&x.su),
        sv: ld3(&x.sv),
        suu: ld3(&x.suu),
        suv: ld3(&x.suv),
        svv: ld3(&x.svv),
        du: ld(&x.du),
        dv: ld(&x.dv),
        ddu: ld(&x.ddu),
        ddv: ld(&x.ddv),
    };
    let mut out = SoaOut { y, at };
    // SAFETY: passed on from the caller.
    unsafe { frame_math(&input, orientation, s, &mut out) }
}

/// Stores the three lane values of a vector into `w` at lanes `at ..`.
#[inline(always)]
fn store3<T: Lane>(v: [T; 3], w: &mut W3, at: usize) {
    for (v, w) in v.into_iter().zip(w.iter_mut()) {
        v.store(w, at);
    }
}

/// Stores results into a [`BlockOutput`] at lanes `at ..`.
struct SoaOut<'a> {
    y: &'a mut BlockOutput,
    at: usize,
}

impl<T: Lane> LanesOut<T> for SoaOut<'_> {
    #[inline(always)]
    fn surface(&mut self, r: SurfaceLanes<T>) {
        let (y, at) = (&mut *self.y, self.at);
        let put3 = |v: [T; 3], w: &mut W3| store3(v, w, at);
        put3(r.d1, &mut y.d1);
        put3(r.d2, &mut y.d2);
        put3(r.n, &mut y.n);
        for (v, w) in [
            (r.k1, &mut y.k1),
            (r.k2, &mut y.k2),
            (r.mean, &mut y.mean),
            (r.gaussian, &mut y.gaussian),
            (r.conditioning, &mut y.conditioning),
            (r.speed_figure, &mut y.speed_figure),
        ] {
            v.store(w, at);
        }
    }

    #[inline(always)]
    fn curve(&mut self, r: CurveLanes<T>) {
        let (y, at) = (&mut *self.y, self.at);
        let put3 = |v: [T; 3], w: &mut W3| store3(v, w, at);
        put3(r.tan, &mut y.t);
        put3(r.b, &mut y.b);
        for (v, w) in [
            (r.kn, &mut y.kn),
            (r.kg, &mut y.kg),
            (r.tg, &mut y.tg),
            (r.speed, &mut y.speed),
        ] {
            v.store(w, at);
        }
        T::store_mask(r.ok, &mut y.ok, at);
    }
}

/// The frame math of `T::N` points: the formulas of `SurfacePoint::new_with_limit` and
/// `darboux_frame_at`, operation for operation, results handed to `out` part by part
/// ([`surface_math`], then [`curve_math`] on the same inputs).
///
/// # Safety
/// `T`'s instructions must be available (see [`Lane`]).
#[inline(always)]
unsafe fn frame_math<T: Lane>(
    x: &LanesIn<T>,
    orientation: Orientation,
    s: &ParamScales,
    out: &mut impl LanesOut<T>,
) where
    f64: Mul<T, Output = T> + Div<T, Output = T>,
{
    // SAFETY: passed on from the caller.
    let mid = unsafe { surface_math(x, orientation, s, out) };
    // SAFETY: passed on from the caller.
    unsafe { curve_math(x, &mid, out) }
}

/// What the curve's part needs of the surface's part besides Su, Sv, u', v': the values the
/// two parts share. c'' is computed in the surface's part, as soon as L, M, N are (the second
/// derivatives of the surface and the curve are not used after it), and |c'| early (its
/// square root and division overlap with the surface's); E, F, G are computed again where
/// used rather than kept live (fewer values live across the kernel, fewer spills).
#[derive(Clone, Copy)]
pub(crate) struct SurfaceMid<T: Lane> {
    /// The unit normal N.
    n: [T; 3],
    /// The second fundamental form's L, M, N (`nn`).
    l: T,
    m: T,
    nn: T,
    /// 1 / |Su × Sv|.
    inv_area: T,
    /// |c'| and 1 / |c'| (`darboux_frame_at`).
    speed: T,
    inv_speed: T,
    /// W = Suu u'² + 2 Suv u'v' + Svv v'², u'v'' − v'u'' and σ |Su × Sv| (`darboux_frame_at`).
    w: [T; 3],
    turn: T,
    signed_area: T,
    /// The flags of the surface's checks.
    ok: T::Mask,
}

/// The surface's part of [`frame_math`] (`SurfacePoint::new_with_limit` and the curve's speed
/// figure): results handed to `out.surface`, and the values the curve's part needs.
///
/// # Safety
/// `T`'s instructions must be available (see [`Lane`]).
#[inline(always)]
unsafe fn surface_math<T: Lane>(
    x: &LanesIn<T>,
    orientation: Orientation,
    s: &ParamScales,
    out: &mut impl LanesOut<T>,
) -> SurfaceMid<T>
where
    f64: Mul<T, Output = T> + Div<T, Output = T>,
{
    let sigma = orientation.sign();
    let LanesIn {
        su,
        sv,
        suu,
        suv,
        svv,
        du,
        dv,
        ddu,
        ddv,
    } = *x;
    // SAFETY (splats): passed on from the caller.
    let zero = unsafe { T::splat(0.0) };

    // The one-point path refuses non-finite jets first. A sum of the inputs is finite when
    // they all are (a NaN or an infinity makes it NaN or infinite); when finite inputs overflow
    // it, the lane is merely flagged and goes through the one-point path, which is exact.
    let sum3 = |a: [T; 3]| a[0] + a[1] + a[2];
    let inputs =
        ((sum3(su) + sum3(sv)) + (sum3(suu) + sum3(suv))) + ((sum3(svv) + (du + dv)) + (ddu + ddv));
    let inputs_finite = inputs.finite();

    // --- darboux_frame_at: the speed figure (u', v' and the extents only) ---
    let (a, b_) = (
        du * scalar_div(1.0, s.u_extent),
        dv * scalar_div(1.0, s.v_extent),
    );
    let speed_figure = (a * a + b_ * b_).sqrt() * s.t_extent;
    let stalled = unsafe { T::splat(STALLED_CURVE_LIMIT) };
    // |c'| and its inverse (darboux_frame_at), early: a square root and a division that
    // overlap with the surface's.
    let c1 = [
        su[0] * du + sv[0] * dv,
        su[1] * du + sv[1] * dv,
        su[2] * du + sv[2] * dv,
    ];
    let speed2 = dot(c1, c1);
    let speed = speed2.sqrt();
    let inv_speed = 1.0 / speed;

    // --- SurfacePoint::new_with_limit ---
    let cr = cross(su, sv);
    let area = dot(cr, cr).sqrt();
    // |Su| and its inverse, early (as |c'|).
    let e = dot(su, su);
    let su_len = e.sqrt();
    let inv_su = 1.0 / su_len;
    // surface_conditioning
    let (uu, vv) = (
        scalar_mul(s.u_extent, s.u_extent),
        scalar_mul(s.v_extent, s.v_extent),
    );
    let cross2 = dot(suv, suv);
    let ru2 = e + dot(suu, suu) * uu + cross2 * vv;
    let rv2 = dot(sv, sv) + dot(svv, svv) * vv + cross2 * uu;
    let mx = ru2.sqrt() * rv2.sqrt();
    let cond_raw = area / mx;
    // Degenerate where mx == 0 or mx is not finite.
    let regular = mx.ne(zero) & mx.finite();
    let conditioning = T::select(regular, cond_raw, zero);
    let limit = unsafe { T::splat(DEGENERATE_SURFACE_LIMIT) };
    // An overflowing |Su x Sv| is refused by the one-point path (NonFinite): flagged.
    let mut ok = inputs_finite & area.finite() & conditioning.ge(limit) & speed_figure.ge(stalled);
    let inv_area = 1.0 / area;
    let n = scale(cr, sigma * inv_area);
    let f = dot(su, sv);
    let l = dot(suu, n);
    let m = dot(suv, n);
    let nn = dot(svv, n);
    // W and u'v'' − v'u'' of darboux_frame_at, here: the second derivatives are not needed
    // after them.
    let (duu, duv, dvv) = (du * du, 2.0 * du * dv, dv * dv);
    let w = [
        suu[0] * duu + suv[0] * duv + svv[0] * dvv,
        suu[1] * duu + suv[1] * duv + svv[1] * dvv,
        suu[2] * duu + suv[2] * duv + svv[2] * dvv,
    ];
    let turn = du * ddv - dv * ddu;
    let signed_area = sigma * area;

    let beta = sigma * su_len * inv_area;
    let alpha = -sigma * f * inv_su * inv_area;
    let w11 = l * inv_su * inv_su;
    let w12 = (l * alpha + m * beta) * inv_su;
    let w22 = l * alpha * alpha + 2.0 * m * alpha * beta + nn * beta * beta;
    let half_diff = 0.5 * (w11 - w22);
    let mean = 0.5 * (w11 + w22);
    let d = (half_diff * half_diff + w12 * w12).sqrt();
    // Where the squares could under- or overflow, the one-point path scales first (exactly):
    // such lanes are flagged and go through it.
    let big = half_diff.abs().max(w12.abs());
    let (safe_lo, safe_hi) = unsafe { (T::splat(EIGEN_SAFE_LO), T::splat(EIGEN_SAFE_HI)) };
    let probe = T::select(big.ne(zero), big, safe_lo);
    ok = ok & probe.ge(safe_lo) & probe.le(safe_hi);
    let k1 = mean + d;
    let k2 = mean - d;
    let sc = w11.abs().max(w22.abs()).max(w12.abs());
    let umbilic = d.le(UMBILIC_FACTOR * sc);
    let forward = half_diff.ge(zero);
    let one = unsafe { T::splat(1.0) };
    let ex = T::select(umbilic, one, T::select(forward, d + half_diff, w12));
    let ey = T::select(umbilic, zero, T::select(forward, w12, d - half_diff));
    let inv = 1.0 / (ex * ex + ey * ey).sqrt();
    let e1 = scale(su, inv_su);
    let e2 = cross(n, e1);
    let (cx, cy) = (ex * inv, ey * inv);
    let d1 = [
        e1[0] * cx + e2[0] * cy,
        e1[1] * cx + e2[1] * cy,
        e1[2] * cx + e2[2] * cy,
    ];
    let d2 = cross(n, d1);
    let gaussian = k1 * k2;
    // k1, k2, K and N finite: a sum of them is finite only then (as for the inputs, an
    // overflow of finite values merely sends the lane through the one-point path).
    ok = ok & (((k1 + k2) + gaussian) + ((n[0] + n[1]) + n[2])).finite();
    out.surface(SurfaceLanes {
        n,
        d1,
        d2,
        k1,
        k2,
        mean,
        gaussian,
        conditioning,
        speed_figure,
    });
    SurfaceMid {
        n,
        l,
        m,
        nn,
        inv_area,
        speed,
        inv_speed,
        w,
        turn,
        signed_area,
        ok,
    }
}

/// The curve's part of [`frame_math`] (`darboux_frame_at` after the surface point), results
/// handed to `out.curve`.
///
/// # Safety
/// `T`'s instructions must be available (see [`Lane`]).
#[inline(always)]
unsafe fn curve_math<T: Lane>(x: &LanesIn<T>, mid: &SurfaceMid<T>, out: &mut impl LanesOut<T>)
where
    f64: Mul<T, Output = T> + Div<T, Output = T>,
{
    let LanesIn { su, sv, du, dv, .. } = *x;
    let SurfaceMid {
        n,
        l,
        m,
        nn,
        inv_area,
        speed,
        inv_speed,
        w,
        turn,
        signed_area,
        mut ok,
    } = *mid;
    // SAFETY (splats): passed on from the caller.
    let zero = unsafe { T::splat(0.0) };

    let c1 = [
        su[0] * du + sv[0] * dv,
        su[1] * du + sv[1] * dv,
        su[2] * du + sv[2] * dv,
    ];
    let tan = scale(c1, inv_speed);
    let b = cross(n, tan);
    let inv_speed2 = inv_speed * inv_speed;
    let form = |x0, x1, y0, y1| second_form(l, m, nn, x0, x1, y0, y1);
    let kn = form(du, dv, du, dv) * inv_speed2;
    let (tc0, tc1) = (du * inv_speed, dv * inv_speed);
    // SurfacePoint::components(B·Su, B·Sv).
    let (xs, xv) = (dot(b, su), dot(b, sv));
    // E, F, G of SurfacePoint (the same operations as in the surface's part).
    let e = dot(su, su);
    let f = dot(su, sv);
    let g = dot(sv, sv);
    // SurfacePoint::components: 1/det = (1/A)².
    let inv_det = inv_area * inv_area;
    let (bc0, bc1) = ((g * xs - f * xv) * inv_det, (e * xv - f * xs) * inv_det);
    let tg = form(tc0, tc1, bc0, bc1);
    // κg = (W·B + σ|Su × Sv| (u'v'' − v'u'')/|c'|)/|c'|² (darboux_frame_at).
    let kg = (dot(w, b) + signed_area * turn * inv_speed) * inv_speed2;
    // κn, κg, τg, |c'|, T and B finite (a sum, as above), and |c'| ≠ 0.
    let results =
        ((kn + kg) + (tg + speed)) + (((tan[0] + tan[1]) + (tan[2] + b[0])) + (b[1] + b[2]));
    ok = ok & results.finite() & speed.ne(zero);
    out.curve(CurveLanes {
        n,
        tan,
        b,
        kn,
        kg,
        tg,
        speed,
        ok,
    });
}

/// Room for frames that [`FrameKernel::frames`] writes whole: frame i at byte `i · stride`
/// from the start, so that the frames may sit inside larger records (the C ABI's frame is the
/// curve parameter followed by a [`DarbouxFrame`]'s fields in the same layout).
pub(crate) struct FrameSlots<'a> {
    base: *mut u8,
    stride: usize,
    len: usize,
    _room: PhantomData<&'a mut [u8]>,
}

impl<'a> FrameSlots<'a> {
    /// An array of frames.
    #[inline]
    pub(crate) fn of(frames: &'a mut [MaybeUninit<DarbouxFrame>]) -> Self {
        FrameSlots {
            base: frames.as_mut_ptr() as *mut u8,
            stride: size_of::<DarbouxFrame>(),
            len: frames.len(),
            _room: PhantomData,
        }
    }

    /// `len` frames at byte `i · stride` from `base`.
    ///
    /// # Safety
    /// For every i < `len`, `base + i · stride` must point to room for one [`DarbouxFrame`],
    /// aligned for it, writable for `'a`, overlapping no other of these frames, and used by
    /// nothing else during `'a`.
    #[inline]
    pub(crate) unsafe fn from_raw(base: *mut u8, stride: usize, len: usize) -> Self {
        FrameSlots {
            base,
            stride,
            len,
            _room: PhantomData,
        }
    }

    /// Number of frames.
    #[inline]
    pub(crate) fn len(&self) -> usize {
        self.len
    }

    /// Where frame `i` < `len` goes.
    #[inline(always)]
    fn at(&self, i: usize) -> *mut DarbouxFrame {
        debug_assert!(i < self.len);
        self.base.wrapping_add(i * self.stride) as *mut DarbouxFrame
    }

    /// Writes frame `i` (panics unless `i` < `len`).
    #[inline]
    fn write(&mut self, i: usize, frame: DarbouxFrame) {
        assert!(i < self.len);
        // SAFETY: room for frame i (the contract of the constructors).
        unsafe { self.at(i).write(frame) }
    }
}

/// Most points per call of [`FrameKernel::frames`] (one flag bit each in its result).
pub(crate) const MAX_POINTS: usize = 64;

/// The batch frame kernel as the batch entry points use it: jets in, frames out, a flag per
/// point. On AVX-512F and AVX2 processors (detected once, at construction; see
/// [`crate::isa::vector_kernels`]) the jets are transposed into vector registers eight or four
/// points at a time and the frames out of them (`aos::frames_avx512`, `aos::frames_avx2`),
/// with no structure-of-arrays block in between; elsewhere the block of [`BLOCK`] plain arrays
/// ([`BlockInput`], [`frames_of_block_portable`], [`BlockOutput`]).
pub(crate) struct FrameKernel {
    variant: VectorKernels,
    x: BlockInput,
    y: BlockOutput,
}

impl FrameKernel {
    /// The kernel for this processor (and the process's limit), with its scratch storage
    /// (made once per batch call).
    pub(crate) fn new() -> Self {
        Self::with(crate::isa::vector_kernels())
    }

    /// The kernel in variant `variant`, or the widest the processor supports if that is
    /// narrower (so that a variant is never run where its instructions are missing).
    pub(crate) fn with(variant: VectorKernels) -> Self {
        FrameKernel {
            variant: variant.min(crate::isa::supported_vector_kernels()),
            x: BlockInput::zeroed(),
            y: BlockOutput::zeroed(),
        }
    }

    /// The variant this kernel runs.
    #[cfg(test)]
    pub(crate) fn variant(&self) -> VectorKernels {
        self.variant
    }

    /// Frames of the points `(surface[i], curve[i])`, i < len = `out.len()` ≤ [`MAX_POINTS`]
    /// (the three slices of equal length), into frame i of `out`, every one written. Bit i of
    /// the result is set where point i passed every check of the one-point path: the kernel's
    /// and [`finite_rest`]; frame i is then the bits of [`darboux_frame`] (with valid scales).
    /// Other points must be evaluated again by the one-point path; their frames hold
    /// meaningless numbers.
    #[inline]
    pub(crate) fn frames(
        &mut self,
        surface: &[SurfaceJet],
        curve: &[CurveJet],
        orientation: Orientation,
        s: &ParamScales,
        mut out: FrameSlots<'_>,
    ) -> u64 {
        let len = out.len();
        assert!(surface.len() == len && curve.len() == len && len <= MAX_POINTS);
        #[cfg(target_arch = "x86_64")]
        match self.variant {
            VectorKernels::Avx512 => {
                // SAFETY: the processor supports AVX-512F (`with` never picks a variant wider
                // than the supported one); lengths checked above.
                return unsafe { aos::frames_avx512(surface, curve, orientation, s, &mut out) };
            }
            VectorKernels::Avx2 => {
                // SAFETY: the processor supports AVX2 (as above); lengths checked above.
                return unsafe { aos::frames_avx2(surface, curve, orientation, s, &mut out) };
            }
            VectorKernels::Baseline => {}
        }
        let mut bits = 0u64;
        for start in (0..len).step_by(BLOCK) {
            let end = len.min(start + BLOCK);
            let (sb, cb) = (&surface[start..end], &curve[start..end]);
            self.x.fill(sb, cb);
            frames_of_block_portable(&self.x, orientation, s, &mut self.y);
            for i in 0..end - start {
                out.write(start + i, self.y.frame(i, &sb[i], &cb[i]));
                if self.y.ok(i) && finite_rest(&sb[i], &cb[i]) {
                    bits |= 1 << (start + i);
                }
            }
        }
        bits
    }
}

/// The AVX2 kernel on arrays of jets and frames: four points at a time transposed from their
/// jets into AVX registers (pairs of adjacent f64: two 128-bit loads per register half and one
/// unpack per value), the frame math ([`frame_math`] on [`Avx4`]), and the results transposed
/// back into four [`DarbouxFrame`]s the same way, each part as soon as it is final. Relies on
/// the `#[repr(C)]` layouts of the jets and the frame, checked at compile time below.
#[cfg(target_arch = "x86_64")]
mod aos {
    use super::*;
    use crate::engine::lanes::x86::{Avx4, Mask4};
    use crate::engine::lanes::x86_512::{Avx8, Mask8};
    use std::mem::{offset_of, size_of};

    /// Size of an f64 in bytes.
    const F: usize = size_of::<f64>();

    // The layouts the transposes rely on: every structure a run of f64, fields in declaration
    // order, vectors as three f64 (nalgebra's `Vector3<f64>` is `#[repr(C)]` around
    // `[[f64; 3]; 1]`; x, y, z order checked by the unit test `vectors_are_x_y_z_in_memory`).
    const _: () = {
        assert!(size_of::<Vec3>() == 3 * F);
        assert!(size_of::<SurfaceJet>() == 18 * F);
        assert!(offset_of!(SurfaceJet, p) == 0);
        assert!(offset_of!(SurfaceJet, su) == 3 * F);
        assert!(offset_of!(SurfaceJet, sv) == 6 * F);
        assert!(offset_of!(SurfaceJet, suu) == 9 * F);
        assert!(offset_of!(SurfaceJet, suv) == 12 * F);
        assert!(offset_of!(SurfaceJet, svv) == 15 * F);
        assert!(size_of::<CurveJet>() == 6 * F);
        assert!(offset_of!(CurveJet, u) == 0);
        assert!(offset_of!(CurveJet, v) == F);
        assert!(offset_of!(CurveJet, du) == 2 * F);
        assert!(offset_of!(CurveJet, dv) == 3 * F);
        assert!(offset_of!(CurveJet, ddu) == 4 * F);
        assert!(offset_of!(CurveJet, ddv) == 5 * F);
        assert!(size_of::<DarbouxFrame>() == FRAME_LEN * F);
        assert!(offset_of!(DarbouxFrame, u) == 0);
        assert!(offset_of!(DarbouxFrame, v) == F);
        assert!(offset_of!(DarbouxFrame, point) == 2 * F);
        assert!(offset_of!(DarbouxFrame, t) == 5 * F);
        assert!(offset_of!(DarbouxFrame, b) == 8 * F);
        assert!(offset_of!(DarbouxFrame, n) == 11 * F);
        assert!(offset_of!(DarbouxFrame, normal_curvature) == 14 * F);
        assert!(offset_of!(DarbouxFrame, geodesic_curvature) == 15 * F);
        assert!(offset_of!(DarbouxFrame, geodesic_torsion) == 16 * F);
        assert!(offset_of!(DarbouxFrame, speed) == 17 * F);
        assert!(offset_of!(DarbouxFrame, principal) == PRINCIPAL * F);
        assert!(offset_of!(DarbouxFrame, conditioning) == 28 * F);
        assert!(size_of::<PrincipalCurvatures>() == 10 * F);
        assert!(offset_of!(PrincipalCurvatures, k1) == 0);
        assert!(offset_of!(PrincipalCurvatures, k2) == F);
        assert!(offset_of!(PrincipalCurvatures, d1) == 2 * F);
        assert!(offset_of!(PrincipalCurvatures, d2) == 5 * F);
        assert!(offset_of!(PrincipalCurvatures, mean) == 8 * F);
        assert!(offset_of!(PrincipalCurvatures, gaussian) == 9 * F);
        assert!(size_of::<Conditioning>() == 2 * F);
        assert!(offset_of!(Conditioning, surface) == 0);
        assert!(offset_of!(Conditioning, curve) == F);
    };

    /// f64 per frame.
    const FRAME_LEN: usize = 30;
    /// Where the principal curvatures start in a frame, in f64.
    const PRINCIPAL: usize = 18;

    /// A lane type whose values can be loaded from, and stored to, pairs of adjacent f64 of
    /// [`Lane::N`] structures (the transposes of the kernel).
    trait Pairs: Lane {
        /// Lane l of the first value is `*p(l)`, of the second `*p(l).add(1)`.
        ///
        /// # Safety
        /// `Self`'s instructions must be available; each `p(l)`, l < N, must point to two
        /// readable f64.
        unsafe fn load_pairs(p: impl Fn(usize) -> *const f64) -> (Self, Self);
        /// `*p(l)` = lane l of `a`, `*p(l).add(1)` = lane l of `b`.
        ///
        /// # Safety
        /// Each `p(l)`, l < N, must point to two writable f64.
        unsafe fn store_pairs(a: Self, b: Self, p: impl Fn(usize) -> *mut f64);
        /// Bit l set where flag l of `m` holds.
        fn mask_bits(m: Self::Mask) -> u32;
    }

    impl Pairs for Avx4 {
        #[inline(always)]
        unsafe fn load_pairs(p: impl Fn(usize) -> *const f64) -> (Avx4, Avx4) {
            // SAFETY: passed on from the caller.
            unsafe { Avx4::load_pairs([p(0), p(1), p(2), p(3)]) }
        }
        #[inline(always)]
        unsafe fn store_pairs(a: Avx4, b: Avx4, p: impl Fn(usize) -> *mut f64) {
            // SAFETY: passed on from the caller.
            unsafe { Avx4::store_pairs(a, b, [p(0), p(1), p(2), p(3)]) }
        }
        #[inline(always)]
        fn mask_bits(m: Mask4) -> u32 {
            Avx4::mask_bits(m)
        }
    }

    impl Pairs for Avx8 {
        #[inline(always)]
        unsafe fn load_pairs(p: impl Fn(usize) -> *const f64) -> (Avx8, Avx8) {
            // SAFETY: passed on from the caller.
            unsafe { Avx8::load_pairs(std::array::from_fn(p)) }
        }
        #[inline(always)]
        unsafe fn store_pairs(a: Avx8, b: Avx8, p: impl Fn(usize) -> *mut f64) {
            // SAFETY: passed on from the caller.
            unsafe { Avx8::store_pairs(a, b, std::array::from_fn(p)) }
        }
        #[inline(always)]
        fn mask_bits(m: Mask8) -> u32 {
            Avx8::mask_bits(m)
        }
    }

    /// Stores the results of a group of `T::N` points into their frames.
    struct AosOut<T: Lane> {
        /// The first frame of the group; frame l at byte `l · stride` from it.
        out: *mut u8,
        stride: usize,
        /// z of the points (stored with T.x, its neighbour in the frame).
        pz: T,
        /// The points' S, u, v are finite ([`finite_rest`]).
        rest: T::Mask,
        /// Bit l set where lane l passed every check.
        bits: u32,
    }

    impl<T: Pairs> AosOut<T> {
        /// f64 `k`, `k + 1` of the group's frames from lanes of `a`, `b`.
        #[inline(always)]
        fn put(&self, k: usize, a: T, b: T) {
            let f = |l: usize| {
                // SAFETY: `out` points to T::N frames of FRAME_LEN f64 at `stride` (the
                // contract of `group`); k + 1 < FRAME_LEN at every call.
                unsafe { (self.out.add(l * self.stride) as *mut f64).add(k) }
            };
            debug_assert!(k + 1 < FRAME_LEN);
            // SAFETY: as just above.
            unsafe { T::store_pairs(a, b, f) }
        }
    }

    impl<T: Pairs> LanesOut<T> for AosOut<T> {
        #[inline(always)]
        fn surface(&mut self, r: SurfaceLanes<T>) {
            const P: usize = PRINCIPAL;
            self.put(P, r.k1, r.k2);
            self.put(P + 2, r.d1[0], r.d1[1]);
            self.put(P + 4, r.d1[2], r.d2[0]);
            self.put(P + 6, r.d2[1], r.d2[2]);
            self.put(P + 8, r.mean, r.gaussian);
            self.put(28, r.conditioning, r.speed_figure);
            self.put(12, r.n[1], r.n[2]);
        }

        #[inline(always)]
        fn curve(&mut self, r: CurveLanes<T>) {
            self.put(4, self.pz, r.tan[0]);
            self.put(6, r.tan[1], r.tan[2]);
            self.put(8, r.b[0], r.b[1]);
            self.put(10, r.b[2], r.n[0]);
            self.put(14, r.kn, r.kg);
            self.put(16, r.tg, r.speed);
            self.bits = T::mask_bits(r.ok & self.rest);
        }
    }

    /// The frames of the `T::N` points at `sj`, `cj` into the frames at `out` (frame l at byte
    /// `l · stride`); bit l of the result set where lane l passed every check.
    ///
    /// # Safety
    /// `T`'s instructions must be available; `sj`, `cj` point to `T::N` readable jets each,
    /// `out + l · stride` to a writable frame for each l < `T::N`.
    #[inline(always)]
    unsafe fn group<T: Pairs>(
        sj: *const SurfaceJet,
        cj: *const CurveJet,
        orientation: Orientation,
        s: &ParamScales,
        out: *mut u8,
        stride: usize,
    ) -> u32
    where
        f64: Mul<T, Output = T> + Div<T, Output = T>,
    {
        // SAFETY (all pointer arithmetic and loads): as the caller promises.
        let sp = |k: usize| unsafe { T::load_pairs(|l| (sj.add(l) as *const f64).add(k)) };
        let cp = |k: usize| unsafe { T::load_pairs(|l| (cj.add(l) as *const f64).add(k)) };
        let (u, v) = cp(0);
        let (px, py) = sp(0);
        let (pz, su0) = sp(2);
        let rest = ((px + py) + (pz + (u + v))).finite();
        let mut sink = AosOut {
            out,
            stride,
            pz,
            rest,
            bits: 0,
        };
        let (su1, su2) = sp(4);
        let (sv0, sv1) = sp(6);
        let (sv2, suu0) = sp(8);
        let (suu1, suu2) = sp(10);
        let (suv0, suv1) = sp(12);
        let (suv2, svv0) = sp(14);
        let (svv1, svv2) = sp(16);
        let (du, dv) = cp(2);
        let (ddu, ddv) = cp(4);
        // The first stores after every load: with the stores first the compiler kept the later
        // loads after them (stores through other raw pointers), and loads first measured
        // faster (speed report: 23.2 against 24.2 ns per point).
        sink.put(0, u, v);
        sink.put(2, px, py);
        let input = LanesIn {
            su: [su0, su1, su2],
            sv: [sv0, sv1, sv2],
            suu: [suu0, suu1, suu2],
            suv: [suv0, suv1, suv2],
            svv: [svv0, svv1, svv2],
            du,
            dv,
            ddu,
            ddv,
        };
        // SAFETY: `T`'s instructions, as the caller promises.
        unsafe { frame_math(&input, orientation, s, &mut sink) };
        sink.bits
    }

    /// [`FrameKernel::frames`] on `T`: groups of `T::N` points straight from the slices; the
    /// last group, when short, through padded copies (its missing lanes repeat its first
    /// point, as [`BlockInput::fill`] does).
    ///
    /// # Safety
    /// `T`'s instructions must be available; the three slices have the same length ≤ 64.
    #[inline(always)]
    unsafe fn frames_wide<T: Pairs>(
        surface: &[SurfaceJet],
        curve: &[CurveJet],
        orientation: Orientation,
        s: &ParamScales,
        out: &mut FrameSlots<'_>,
    ) -> u64
    where
        f64: Mul<T, Output = T> + Div<T, Output = T>,
    {
        /// Room for the widest group.
        const MAX_N: usize = 8;
        debug_assert!(T::N <= MAX_N);
        let len = out.len();
        let mut bits = 0u64;
        let mut pad_s: [SurfaceJet; MAX_N];
        let mut pad_c: [CurveJet; MAX_N];
        let mut pad_o = [MaybeUninit::<DarbouxFrame>::uninit(); MAX_N];
        for at in (0..len).step_by(T::N) {
            let full = at + T::N <= len;
            let (sp, cp, op, stride) = if full {
                (
                    surface[at..].as_ptr(),
                    curve[at..].as_ptr(),
                    out.at(at) as *mut u8,
                    out.stride,
                )
            } else {
                let n = len - at;
                pad_s = [surface[at]; MAX_N];
                pad_c = [curve[at]; MAX_N];
                pad_s[..n].copy_from_slice(&surface[at..]);
                pad_c[..n].copy_from_slice(&curve[at..]);
                (
                    pad_s.as_ptr(),
                    pad_c.as_ptr(),
                    pad_o.as_mut_ptr() as *mut u8,
                    size_of::<DarbouxFrame>(),
                )
            };
            // SAFETY: `T`'s instructions (the caller); T::N jets of each kind readable and
            // T::N frames writable at the pointers (a full group of the slices, or the padded
            // copies).
            let b = unsafe { group::<T>(sp, cp, orientation, s, op, stride) };
            if full {
                bits |= (b as u64) << at;
            } else {
                let n = len - at;
                for (l, f) in pad_o[..n].iter().enumerate() {
                    // SAFETY: `group` wrote the first T::N frames of `pad_o`.
                    out.write(at + l, unsafe { f.assume_init() });
                }
                bits |= ((b & ((1 << n) - 1)) as u64) << at;
            }
        }
        bits
    }

    /// [`FrameKernel::frames`] on AVX2: four points per group.
    ///
    /// # Safety
    /// The processor must support AVX2; the three slices have the same length ≤ 64.
    #[target_feature(enable = "avx2")]
    pub(super) unsafe fn frames_avx2(
        surface: &[SurfaceJet],
        curve: &[CurveJet],
        orientation: Orientation,
        s: &ParamScales,
        out: &mut FrameSlots<'_>,
    ) -> u64 {
        // SAFETY: passed on from the caller.
        unsafe { frames_wide::<Avx4>(surface, curve, orientation, s, out) }
    }

    /// [`FrameKernel::frames`] on AVX-512F: eight points per group.
    ///
    /// # Safety
    /// The processor must support AVX-512F; the three slices have the same length ≤ 64.
    #[target_feature(enable = "avx512f")]
    pub(super) unsafe fn frames_avx512(
        surface: &[SurfaceJet],
        curve: &[CurveJet],
        orientation: Orientation,
        s: &ParamScales,
        out: &mut FrameSlots<'_>,
    ) -> u64 {
        // SAFETY: passed on from the caller.
        unsafe { frames_wide::<Avx8>(surface, curve, orientation, s, out) }
    }
}

/// Frames from jets the caller has evaluated, many at once: `out[i]` is
/// [`crate::geometry::frame::darboux_frame`]`(&surface[i], &curve[i], orientation, scales, ts[i])`, bit
/// for bit, computed a block of [`BLOCK`] points at a time in structure-of-arrays form (the
/// square roots and divisions of several points overlap). `ts` are the curve parameters, used
/// only in error messages.
///
/// Errors: `InvalidArgument` (as index 0) when the four slices differ in length or `scales` is
/// invalid; otherwise the first failing sample with the error `darboux_frame` gives for it
/// (`NonFinite`, `DegenerateSurface`, `StalledCurve`); `out` is then written up to that sample,
/// and entries from it to the end of its group of 64 (the kernel writes 64 frames at a time)
/// may hold meaningless numbers.
/// Allocates nothing (but the message of an error).
pub fn darboux_frames(
    surface: &[SurfaceJet],
    curve: &[CurveJet],
    ts: &[f64],
    orientation: Orientation,
    scales: &ParamScales,
    out: &mut [DarbouxFrame],
) -> Result<(), SampleError> {
    let n = out.len();
    if surface.len() != n || curve.len() != n || ts.len() != n {
        return Err(SampleError {
            index: 0,
            t: ts.first().copied().unwrap_or(f64::NAN),
            error: StrakeError::InvalidArgument(format!(
                "{} surface jets, {} curve jets, {} parameters and room for {n} frames: the counts must agree",
                surface.len(),
                curve.len(),
                ts.len()
            )),
        });
    }
    let scales_ok = scales.check().is_ok();
    let mut kernel = FrameKernel::new();
    // SAFETY: the same memory seen as possibly uninitialised frames; only whole frames are
    // written through it (`FrameKernel::frames` writes every f64 of each), so `out` stays
    // initialised.
    let out = unsafe { &mut *(out as *mut [DarbouxFrame] as *mut [MaybeUninit<DarbouxFrame>]) };
    for (k, ((sb, cb), (tb, ob))) in surface
        .chunks(MAX_POINTS)
        .zip(curve.chunks(MAX_POINTS))
        .zip(ts.chunks(MAX_POINTS).zip(out.chunks_mut(MAX_POINTS)))
        .enumerate()
    {
        let bits = kernel.frames(sb, cb, orientation, scales, FrameSlots::of(ob));
        let all = u64::MAX >> (MAX_POINTS - ob.len());
        if bits == all && scales_ok {
            continue;
        }
        for (i, o) in ob.iter_mut().enumerate() {
            // The one-point path checks the scales and the jets' finiteness first; a lane the
            // kernel flags (or any lane after invalid scales) goes through it for its error.
            if bits & (1 << i) == 0 || !scales_ok {
                let frame =
                    darboux_frame(&sb[i], &cb[i], orientation, scales, tb[i]).map_err(|error| {
                        SampleError {
                            index: k * MAX_POINTS + i,
                            t: tb[i],
                            error,
                        }
                    })?;
                o.write(frame);
            }
        }
    }
    Ok(())
}

/// True when the entries of the jets the kernel does not read (S, u, v) are finite, by the
/// same sum test as the kernel's inputs (an overflow of finite entries only sends the lane
/// through the one-point path).
#[inline(always)]
pub(crate) fn finite_rest(s: &SurfaceJet, c: &CurveJet) -> bool {
    ((s.p.x + s.p.y) + (s.p.z + (c.u + c.v))).is_finite()
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geometry::math::Vec3;

    /// A reproducible value in [−0.5, 0.5) (`crate::geometry::math::lcg`).
    fn lcg(state: &mut u64) -> f64 {
        crate::geometry::math::lcg(state) - 0.5
    }

    // Common practice: `FrameKernel::frames` as the batch entry points call it, in every
    // variant this processor supports, each forced (AVX-512F and AVX2: the jets transposed
    // straight into registers and the frames straight out; baseline: the 16-lane block), gives, for every length 1..=64 (short last groups
    // included) and flagged lanes at every position, the flags of `darboux_frame`'s success and
    // for every accepted lane its bits (every f64 of the frame, u, v and the point included).
    #[test]
    fn frame_kernel_gives_the_bits_and_verdicts_of_the_one_point_path() {
        let mut st = 11u64;
        let scales = ParamScales {
            u_extent: 1.25,
            v_extent: 3.0,
            t_extent: 0.5,
        };
        let all_bits = |f: &DarbouxFrame| f.to_array().map(f64::to_bits);
        // Every variant the processor supports, each forced (the widest is what `new` picks).
        let mut kernels: Vec<FrameKernel> = [
            VectorKernels::Baseline,
            VectorKernels::Avx2,
            VectorKernels::Avx512,
        ]
        .into_iter()
        .filter(|&v| v <= crate::isa::supported_vector_kernels())
        .map(FrameKernel::with)
        .collect();
        for (k, v) in kernels.iter().enumerate() {
            assert_eq!(k, v.variant() as usize);
        }
        let mut flagged = 0;
        // Under Miri (which interprets every operation, about a million times slower) one
        // round of each refusal kind, with a full chunk, a partial group and a single lane.
        let rounds = if cfg!(miri) { 5 } else { 3 * MAX_POINTS };
        for round in 0..rounds {
            let len = if cfg!(miri) {
                [MAX_POINTS, 17, 16, 5, 1][round]
            } else {
                1 + round % MAX_POINTS
            };
            let v = |st: &mut u64| Vec3::new(lcg(st), lcg(st), lcg(st));
            let mut sj: Vec<SurfaceJet> = (0..len)
                .map(|_| SurfaceJet {
                    p: v(&mut st),
                    su: v(&mut st) + Vec3::new(1.0, 0.0, 0.0),
                    sv: v(&mut st) + Vec3::new(0.0, 1.0, 0.0),
                    suu: v(&mut st),
                    suv: v(&mut st),
                    svv: v(&mut st),
                })
                .collect();
            let mut cj: Vec<CurveJet> = (0..len)
                .map(|_| CurveJet {
                    u: lcg(&mut st),
                    v: lcg(&mut st),
                    du: lcg(&mut st),
                    dv: lcg(&mut st),
                    ddu: lcg(&mut st),
                    ddv: lcg(&mut st),
                })
                .collect();
            // A refusal of each kind at a position that moves with the round: a stalled
            // curve, a degenerate surface (Sv parallel to Su), a non-finite entry the kernel
            // reads, and one it does not read (S, u, v).
            let at = |k: usize| (round * 7 + k * 13) % len;
            match round % 5 {
                0 => {
                    let i = at(0);
                    (cj[i].du, cj[i].dv) = (0.0, 0.0);
                }
                1 => {
                    let i = at(1);
                    sj[i].sv = sj[i].su * 2.0;
                }
                2 => sj[at(2)].suv.y = f64::INFINITY,
                3 => sj[at(3)].p.z = f64::NAN,
                _ => cj[at(4)].v = f64::NEG_INFINITY,
            }
            for orientation in [Orientation::Forward, Orientation::Reversed] {
                for kernel in kernels.iter_mut() {
                    let mut out = vec![MaybeUninit::<DarbouxFrame>::uninit(); len];
                    let slots = FrameSlots::of(&mut out);
                    let bits = kernel.frames(&sj, &cj, orientation, &scales, slots);
                    assert_eq!(bits.checked_shr(len as u32).unwrap_or(0), 0, "len {len}");
                    for i in 0..len {
                        let want = darboux_frame(&sj[i], &cj[i], orientation, &scales, 0.0);
                        let ok = bits & (1 << i) != 0;
                        assert_eq!(ok, want.is_ok(), "len {len}, lane {i}: {want:?}");
                        flagged += usize::from(!ok);
                        if let Ok(w) = want {
                            // SAFETY: `frames` writes every frame of `out`.
                            let got = unsafe { out[i].assume_init_ref() };
                            assert_eq!(all_bits(got), all_bits(&w), "len {len}, lane {i}");
                        }
                    }
                }
            }
        }
        // Every refusal above reached the kernel and was flagged.
        assert!(flagged >= rounds * 2, "{flagged}");
    }

    // Common practice: a `Vec3` is three f64 in the order x, y, z (what the transposes of the
    // AVX2 kernel assume of the jets and frames).
    #[test]
    fn vectors_are_x_y_z_in_memory() {
        let v = Vec3::new(1.0, 2.0, 3.0);
        // SAFETY: both are 24 bytes (checked at compile time in `aos`), any bits are an f64.
        let a: [f64; 3] = unsafe { std::mem::transmute(v) };
        assert_eq!(a, [1.0, 2.0, 3.0]);
    }

    // Common practice: the kernel compiled for the baseline instruction set and the AVX2 and
    // AVX-512F ones (each where the processor has it) give the same bits, and both the
    // bits of the one-point path (`darboux_frame`), lane by lane, flags included.
    #[test]
    fn baseline_and_dispatched_kernels_agree_bit_for_bit() {
        let mut st = 3u64;
        let scales = ParamScales {
            u_extent: 2.0,
            v_extent: 1.5,
            t_extent: 1.0,
        };
        // Under Miri a full block, a single lane and two partial blocks.
        for round in 0..if cfg!(miri) { 4 } else { 200 } {
            let v = |st: &mut u64| Vec3::new(lcg(st), lcg(st), lcg(st));
            let sj: Vec<SurfaceJet> = (0..BLOCK)
                .map(|_| SurfaceJet {
                    p: v(&mut st),
                    su: v(&mut st) + Vec3::new(1.0, 0.0, 0.0),
                    sv: v(&mut st) + Vec3::new(0.0, 1.0, 0.0),
                    suu: v(&mut st),
                    suv: v(&mut st),
                    svv: v(&mut st),
                })
                .collect();
            let cj: Vec<CurveJet> = (0..BLOCK)
                .map(|i| CurveJet {
                    u: 0.0,
                    v: 0.0,
                    du: if i == 3 && round % 2 == 0 {
                        0.0
                    } else {
                        lcg(&mut st)
                    },
                    dv: lcg(&mut st),
                    ddu: lcg(&mut st),
                    ddv: lcg(&mut st),
                })
                .collect();
            let len = if cfg!(miri) {
                [BLOCK, 1, BLOCK - 1, 5][round]
            } else {
                1 + round % BLOCK
            };
            let x = BlockInput::gather(&sj[..len], &cj[..len]);
            for (orientation, variant) in [Orientation::Forward, Orientation::Reversed]
                .into_iter()
                .flat_map(|o| [VectorKernels::Avx2, VectorKernels::Avx512].map(|v| (o, v)))
            {
                let (mut a, mut b) = (BlockOutput::zeroed(), BlockOutput::zeroed());
                frames_of_block(&x, orientation, &scales, &mut a, variant);
                frames_of_block_portable(&x, orientation, &scales, &mut b);
                for i in 0..len {
                    assert_eq!(a.ok(i), b.ok(i));
                    let fa = a.frame(i, &sj[i], &cj[i]);
                    let fb = b.frame(i, &sj[i], &cj[i]);
                    let want = darboux_frame(&sj[i], &cj[i], orientation, &scales, 0.0);
                    assert_eq!(a.ok(i), want.is_ok(), "lane {i}: {want:?}");
                    if let Ok(w) = want {
                        for (p, q) in [(fa, w), (fb, w)] {
                            let bits = |f: &DarbouxFrame| f.to_array().map(f64::to_bits);
                            assert_eq!(bits(&p), bits(&q), "lane {i}");
                        }
                    }
                }
            }
        }
    }
}
