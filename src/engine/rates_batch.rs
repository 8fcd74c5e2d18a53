//! The rates of change of the invariants along a path, a chunk at a time: the batch behind
//! [`crate::CurveOnSurface::frames_with_rates_at`].
//!
//! It rides on the frame batch ([`crate::engine::batch`]): per chunk the surface's jets come
//! with its third partials from one evaluation where the surface has one
//! ([`SurfaceSource::jets_and_third_block`]: native NURBS), the frames from the frame kernel
//! as always (the same bits as [`crate::CurveOnSurface::frames_at`]), then the curve's third
//! derivatives (one [`UvCurve::third_derivatives_block`] call per chunk) and the closed forms
//! of [`crate::geometry::rates::rates_from_jets`] from the frames and the jets, 16 samples at
//! a time on the widest vector registers allowed ([`lane_rates`]); a sample whose third-order
//! inputs or rates are not all finite goes through the one-point steps ([`rates_at`]), which
//! name its error. The one-point path ([`crate::CurveOnSurface::frame_with_rates`]) takes the
//! same steps through [`rates_at`], and every lane performs its operations in the same order,
//! so both give the same bits and the same errors (tested). Nothing is allocated.

use crate::curve::UvCurve;
use crate::engine::batch::{CHUNK, FrameSink, SampleError};
use crate::engine::frame_block::FrameSlots;
use crate::engine::lanes::{LANES, Lane, Mask, W};
use crate::error::{NonFiniteSource, Result, StrakeError};
use crate::geometry::frame::DarbouxFrame;
use crate::geometry::jet::{CurveJet, DerivOrder, SurfaceJet};
use crate::geometry::math::all_finite;
use crate::geometry::rates::{InvariantRates, RatesIn, ThirdPartials, rates_from_jets, rates_math};
use crate::nurbs::SpanHint;
use crate::surface::crease::sides_for_order;
use crate::surface::{SurfaceHint, SurfaceSource};
use std::mem::MaybeUninit;

/// The rates at a sample from its frame `f`, its jets `sj`, `cj`, the curve's third
/// derivatives `c3` and, when the surface gave them with its jets, the third partials
/// `third` (otherwise asked of [`SurfaceSource::checked_partials`] at order 3 with `hint`).
/// A sample on a knot line across which the surface is not C3 (a crease, or a simple knot of
/// a bicubic; [`crate::surface::crease::sides_for_order`]) takes its third partials from
/// [`SurfaceSource::checked_partials_sided`] at the knot on the side the curve moves into,
/// whatever `third` holds: the third partials differ between the two sides, and the rates
/// must be those of the side the curve moves into (on a crease the side of its frame).
///
/// Errors, in this order: `NonFinite` (curve jet, "d3u" / "d3v"); the errors of
/// `checked_partials` (e.g. `OrderUnavailable`) or `NonFinite` (surface jet, "Suuu" …);
/// those of [`rates_from_jets`].
#[inline]
pub(crate) fn rates_at<S: SurfaceSource + ?Sized>(
    surface: &S,
    f: &DarbouxFrame,
    sj: &SurfaceJet,
    cj: &CurveJet,
    c3: [f64; 2],
    third: Option<&ThirdPartials>,
    hint: &mut SurfaceHint,
) -> Result<InvariantRates> {
    for (what, value) in [("d3u", c3[0]), ("d3v", c3[1])] {
        if !value.is_finite() {
            return Err(StrakeError::NonFinite {
                source: NonFiniteSource::CurveJet,
                what,
                value,
            });
        }
    }
    let (u, v, sides, on_line) = sides_for_order(surface, cj, 3);
    let th = match (on_line, third) {
        (true, _) => {
            let p = surface.checked_partials_sided(u, v, sides, 3, hint)?;
            [p.d[3][0], p.d[2][1], p.d[1][2], p.d[0][3]]
        }
        (false, Some(th)) => {
            for (what, v) in ["Suuu", "Suuv", "Suvv", "Svvv"].into_iter().zip(th) {
                if !all_finite(v) {
                    let value = [v.x, v.y, v.z]
                        .into_iter()
                        .find(|c| !c.is_finite())
                        .unwrap_or(f64::NAN);
                    return Err(StrakeError::NonFinite {
                        source: NonFiniteSource::SurfaceJet,
                        what,
                        value,
                    });
                }
            }
            *th
        }
        (false, None) => {
            let p = surface.checked_partials(cj.u, cj.v, 3, hint)?;
            [p.d[3][0], p.d[2][1], p.d[1][2], p.d[0][3]]
        }
    };
    rates_from_jets(f, sj, &th, cj, c3)
}

/// The curve's third derivatives at one parameter, by the block call of one point (what the
/// batch does per chunk).
#[inline]
pub(crate) fn curve_third_at<C: UvCurve + ?Sized>(
    curve: &C,
    t: f64,
    hint: &mut SpanHint,
) -> Result<[f64; 2]> {
    let mut out = [[0.0; 2]];
    match curve.third_derivatives_block(&[t], hint, &mut out) {
        Ok(()) => Ok(out[0]),
        Err(StrakeError::AtPoint { error, .. }) => Err(*error),
        Err(e) => Err(e),
    }
}

/// The sink of the rates' batch: frames written in place in the caller's array, rates in
/// theirs, the chunk's third partials and third derivatives on the stack.
pub(crate) struct RatesSink<'a> {
    frames: &'a mut [DarbouxFrame],
    rates: &'a mut [InvariantRates],
    third: [ThirdPartials; CHUNK],
    have_third: bool,
    c3: [[f64; 2]; CHUNK],
    curve_hint: SpanHint,
    surface_hint: SurfaceHint,
    scratch: LaneScratch,
}

impl<'a> RatesSink<'a> {
    /// Frames into `frames`, rates into `rates` (the same length as the samples).
    pub(crate) fn new(frames: &'a mut [DarbouxFrame], rates: &'a mut [InvariantRates]) -> Self {
        RatesSink {
            frames,
            rates,
            third: [[crate::geometry::math::Vec3::zeros(); 4]; CHUNK],
            have_third: false,
            c3: [[0.0; 2]; CHUNK],
            curve_hint: SpanHint::default(),
            surface_hint: SurfaceHint::default(),
            scratch: LaneScratch::new(),
        }
    }
}

impl FrameSink for RatesSink<'_> {
    #[inline]
    fn room(&mut self, base: usize, len: usize) -> FrameSlots<'_> {
        let room = &mut self.frames[base..base + len];
        // SAFETY: as in `batch::IntoSlice::room`: only whole frames are written through it.
        let room =
            unsafe { &mut *(room as *mut [DarbouxFrame] as *mut [MaybeUninit<DarbouxFrame>]) };
        FrameSlots::of(room)
    }
    #[inline]
    fn put(&mut self, index: usize, _: f64, frame: &DarbouxFrame) {
        self.frames[index] = *frame;
    }
    #[inline]
    fn surface_jets<S: SurfaceSource + ?Sized>(
        &mut self,
        surface: &S,
        u: &[f64],
        v: &[f64],
        hint: &mut SurfaceHint,
        out: &mut [SurfaceJet],
    ) -> Result<()> {
        self.have_third = surface.jets_and_third_block(u, v, hint, out, &mut self.third[..u.len()]);
        if self.have_third {
            return Ok(());
        }
        surface.jets_in_domain_block(u, v, DerivOrder::Second, hint, out)
    }
    #[inline]
    fn chunk_done<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
        &mut self,
        surface: &S,
        curve: &C,
        base: usize,
        ts: &[f64],
        cj: &[CurveJet],
        sj: &[SurfaceJet],
    ) -> std::result::Result<(), SampleError> {
        let n = ts.len();
        let block = curve.third_derivatives_block(ts, &mut self.curve_hint, &mut self.c3[..n]);
        // Lanes before `written` hold third derivatives; lane `written` (if < n) failed.
        let (written, mut failure) = match block {
            Ok(()) => (n, None),
            Err(StrakeError::AtPoint { index, error }) if index < n => (index, Some(*error)),
            Err(error) => {
                return Err(SampleError {
                    index: base,
                    t: ts[0],
                    error,
                });
            }
        };
        let fail = |i: usize, error| SampleError {
            index: base + i,
            t: ts[i],
            error,
        };
        // Blocks of LANES samples: the closed forms lane-wide (`lane_rates`); a lane whose
        // inputs or rates are not all finite goes through the one-point steps (`rates_at`),
        // which report its error, in sample order.
        for start in (0..written).step_by(LANES) {
            let m = LANES.min(written - start);
            let range = start..start + m;
            let frames = &self.frames[base + start..base + start + m];
            let ok = if self.have_third {
                lane_rates(
                    &mut self.scratch,
                    frames,
                    &sj[range.clone()],
                    &cj[range.clone()],
                    &self.c3[range.clone()],
                    &self.third[range],
                    &mut self.rates[base + start..base + start + m],
                )
            } else {
                // Third partials asked of the surface sample by sample (an analytic surface or
                // a host); a lane whose request fails is left to the one-point steps.
                let mut third = [[crate::geometry::math::Vec3::zeros(); 4]; LANES];
                let mut asked = 0;
                for (k, th) in third[..m].iter_mut().enumerate() {
                    let c = &cj[start + k];
                    match surface.checked_partials(c.u, c.v, 3, &mut self.surface_hint) {
                        Ok(p) => *th = [p.d[3][0], p.d[2][1], p.d[1][2], p.d[0][3]],
                        Err(_) => break,
                    }
                    asked += 1;
                }
                let ok = lane_rates(
                    &mut self.scratch,
                    frames,
                    &sj[range.clone()],
                    &cj[range],
                    &self.c3[start..start + m],
                    &third[..m],
                    &mut self.rates[base + start..base + start + m],
                );
                ok & ((1u32 << asked) - 1)
            };
            // A lane on a knot line across which the surface is not C3 takes its third
            // partials on the side it moves into: left to the one-point steps (`rates_at`),
            // which choose the side, whatever the block computed.
            let mut on_line = 0u32;
            for (k, c) in cj[start..start + m].iter().enumerate() {
                if sides_for_order(surface, c, 3).3 {
                    on_line |= 1 << k;
                }
            }
            let ok = ok & !on_line;
            if ok == (1u32 << m) - 1 {
                continue;
            }
            for i in start..start + m {
                if ok & (1 << (i - start)) != 0 {
                    continue;
                }
                let third = self.have_third.then_some(&self.third[i]);
                self.rates[base + i] = rates_at(
                    surface,
                    &self.frames[base + i],
                    &sj[i],
                    &cj[i],
                    self.c3[i],
                    third,
                    &mut self.surface_hint,
                )
                .map_err(|e| fail(i, e))?;
            }
        }
        if written < n {
            let error = failure.take().unwrap_or_else(|| {
                StrakeError::InvalidArgument("third derivatives of the curve missing".into())
            });
            return Err(fail(written, error));
        }
        Ok(())
    }
}

/// The rates of up to [`LANES`] samples at once (`m` = the shortest of the slices, at most
/// [`LANES`]): the closed forms of [`rates_from_jets`] ([`rates_math`]) on the widest lane
/// type [`crate::isa::vector_kernels`] allows (8 lanes on AVX-512F, 4 on AVX2, the 16-lane
/// arrays elsewhere), every lane performing the `f64` operations of the one-point path in the
/// same order, so a lane's rates are the bits `rates_from_jets` gives its sample. Returns bit
/// i set where sample i's third derivatives, third partials and rates are all finite; only
/// those rates are written (the others are left for the one-point steps, which report the
/// error).
#[inline]
pub(crate) fn lane_rates(
    scratch: &mut LaneScratch,
    frames: &[DarbouxFrame],
    sj: &[SurfaceJet],
    cj: &[CurveJet],
    c3: &[[f64; 2]],
    third: &[ThirdPartials],
    rates: &mut [InvariantRates],
) -> u32 {
    let m = frames
        .len()
        .min(sj.len())
        .min(cj.len())
        .min(c3.len())
        .min(third.len())
        .min(rates.len())
        .min(LANES);
    if m == 0 {
        return 0;
    }
    let LaneScratch { x, out, finite } = scratch;
    gather(x, frames, sj, cj, c3, third, m);
    match crate::isa::vector_kernels() {
        #[cfg(target_arch = "x86_64")]
        crate::isa::VectorKernels::Avx512 => {
            // SAFETY: the processor supports AVX-512F (`vector_kernels` never exceeds the
            // supported variant).
            unsafe { block_rates_avx512(x, out, finite) }
        }
        #[cfg(target_arch = "x86_64")]
        crate::isa::VectorKernels::Avx2 => {
            // SAFETY: as above, AVX2.
            unsafe { block_rates_avx2(x, out, finite) }
        }
        _ => block_rates_baseline(x, out, finite),
    }
    let mut ok = 0u32;
    for (l, r) in rates[..m].iter_mut().enumerate() {
        if finite.0[l] {
            *r = InvariantRates {
                normal_curvature: out[0].0[l],
                geodesic_curvature: out[1].0[l],
                geodesic_torsion: out[2].0[l],
                space_curvature: out[3].0[l],
            };
            ok |= 1 << l;
        }
    }
    ok
}

/// The lane-wide inputs and outputs of [`lane_rates`], kept by the caller so that they are
/// neither cleared nor moved per block (about 6 KiB; they are copies of the samples' numbers).
pub(crate) struct LaneScratch {
    x: RatesIn<W>,
    out: [W; 4],
    /// Lanes whose third-order inputs and rates are all finite.
    finite: Mask,
}

impl LaneScratch {
    pub(crate) fn new() -> Self {
        let z = W::splat(0.0);
        LaneScratch {
            x: RatesIn {
                c: [z; 6],
                s: [[z; 3]; 5],
                s3: [[z; 3]; 4],
                tbn: [[z; 3]; 3],
                k: [z; 3],
            },
            out: [z; 4],
            finite: Mask([false; LANES]),
        }
    }
}

/// The inputs of `m` ≥ 1 samples into `x`, one lane each (lanes from `m` on repeat the last
/// sample).
#[inline(always)]
fn gather(
    x: &mut RatesIn<W>,
    frames: &[DarbouxFrame],
    sj: &[SurfaceJet],
    cj: &[CurveJet],
    c3: &[[f64; 2]],
    third: &[ThirdPartials],
    m: usize,
) {
    let (frames, sj, cj, c3, third) = (&frames[..m], &sj[..m], &cj[..m], &c3[..m], &third[..m]);
    for l in 0..LANES {
        let i = l.min(m - 1);
        let (f, s, c) = (&frames[i], &sj[i], &cj[i]);
        for (k, value) in [c.du, c.dv, c.ddu, c.ddv, c3[i][0], c3[i][1]]
            .into_iter()
            .enumerate()
        {
            x.c[k].0[l] = value;
        }
        for (k, v) in [&s.su, &s.sv, &s.suu, &s.suv, &s.svv]
            .into_iter()
            .enumerate()
        {
            put3(&mut x.s[k], l, v);
        }
        for (k, v) in third[i].iter().enumerate() {
            put3(&mut x.s3[k], l, v);
        }
        for (k, v) in [&f.t, &f.b, &f.n].into_iter().enumerate() {
            put3(&mut x.tbn[k], l, v);
        }
        x.k[0].0[l] = f.normal_curvature;
        x.k[1].0[l] = f.geodesic_curvature;
        x.k[2].0[l] = f.geodesic_torsion;
    }
}

#[inline(always)]
fn put3(w: &mut [W; 3], l: usize, v: &crate::geometry::math::Vec3) {
    w[0].0[l] = v.x;
    w[1].0[l] = v.y;
    w[2].0[l] = v.z;
}

/// Lanes `at .. at + T::N` of three blocks.
///
/// # Safety
/// `T`'s instructions must be available.
#[inline(always)]
unsafe fn load3<T: Lane>(w: &[W; 3], at: usize) -> [T; 3] {
    // SAFETY: passed on from the caller.
    unsafe { [T::load(&w[0], at), T::load(&w[1], at), T::load(&w[2], at)] }
}

/// [`rates_math`] over the block, `T::N` lanes at a time (no closures: see `comb` in
/// `geometry::rates`).
///
/// # Safety
/// `T`'s instructions must be available.
#[inline(always)]
unsafe fn block_rates<T: Lane>(x: &RatesIn<W>, out: &mut [W; 4], finite: &mut Mask) {
    for at in (0..LANES).step_by(T::N) {
        // SAFETY: passed on from the caller.
        let y: RatesIn<T> = unsafe {
            let c = &x.c;
            RatesIn {
                c: [
                    T::load(&c[0], at),
                    T::load(&c[1], at),
                    T::load(&c[2], at),
                    T::load(&c[3], at),
                    T::load(&c[4], at),
                    T::load(&c[5], at),
                ],
                s: [
                    load3(&x.s[0], at),
                    load3(&x.s[1], at),
                    load3(&x.s[2], at),
                    load3(&x.s[3], at),
                    load3(&x.s[4], at),
                ],
                s3: [
                    load3(&x.s3[0], at),
                    load3(&x.s3[1], at),
                    load3(&x.s3[2], at),
                    load3(&x.s3[3], at),
                ],
                tbn: [
                    load3(&x.tbn[0], at),
                    load3(&x.tbn[1], at),
                    load3(&x.tbn[2], at),
                ],
                k: load3(&x.k, at),
            }
        };
        let r = rates_math(&y);
        for k in 0..4 {
            r[k].store(&mut out[k], at);
        }
        // Finite where every product with zero is zero (a non-finite value gives NaN); of the
        // inputs, those the frames did not already check: the curve's third derivatives and
        // the third partials.
        let zero = <T as crate::geometry::rates::RateNum>::k(0.0);
        let [s0, s1, s2, s3] = y.s3;
        let t0 = (y.c[4] * zero + y.c[5] * zero)
            + (r[0] * zero + r[1] * zero)
            + (r[2] * zero + r[3] * zero);
        let t1 = (s0[0] * zero + s0[1] * zero)
            + (s0[2] * zero + s1[0] * zero)
            + (s1[1] * zero + s1[2] * zero);
        let t2 = (s2[0] * zero + s2[1] * zero)
            + (s2[2] * zero + s3[0] * zero)
            + (s3[1] * zero + s3[2] * zero);
        let sum = t0 + t1 + t2;
        T::store_mask(sum.ge(zero) & sum.le(zero), finite, at);
    }
}

/// [`block_rates`] on the 16-lane arrays (the baseline build).
#[inline(never)]
fn block_rates_baseline(x: &RatesIn<W>, out: &mut [W; 4], finite: &mut Mask) {
    // SAFETY: the arrays need no particular instructions.
    unsafe { block_rates::<W>(x, out, finite) }
}

/// [`block_rates`] on AVX2 registers, four lanes at a time.
///
/// # Safety
/// The processor must support AVX2.
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
unsafe fn block_rates_avx2(x: &RatesIn<W>, out: &mut [W; 4], finite: &mut Mask) {
    // SAFETY: AVX2 is available (the caller's promise).
    unsafe { block_rates::<crate::engine::lanes::x86::Avx4>(x, out, finite) }
}

/// [`block_rates`] on AVX-512 registers, eight lanes at a time.
///
/// # Safety
/// The processor must support AVX-512F.
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx512f")]
unsafe fn block_rates_avx512(x: &RatesIn<W>, out: &mut [W; 4], finite: &mut Mask) {
    // SAFETY: AVX-512F is available (the caller's promise).
    unsafe { block_rates::<crate::engine::lanes::x86_512::Avx8>(x, out, finite) }
}
