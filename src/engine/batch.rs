//! Frames along a path a block of points at a time: the engine behind every batch entry point
//! ([`crate::CurveOnSurface::frames_at`], [`crate::CurveOnSurface::frames_even`], the parallel batch and the C
//! batch calls).
//!
//! For each chunk of up to [`CHUNK`] samples: the curve jets of the chunk in one call
//! ([`UvCurve::jets_in_domain_block`], span hint carried; NURBS curves evaluate several points
//! at once), the surface jets of the chunk in one call ([`SurfaceSource::jets_in_domain_block`],
//! which a host's batch callback answers in one call too), then the frame math of the chunk
//! ([`crate::engine::frame_block::FrameKernel`]: on AVX2 four points at a time, the jets transposed
//! straight into AVX registers and the frames straight out of them; elsewhere a block of
//! [`crate::engine::frame_block::BLOCK`] points in structure-of-arrays form). The results are the bits
//! of the one-point path ([`crate::CurveOnSurface::frame`]), and so are the errors: a lane the kernel
//! flags is evaluated again by the one-point path from the same jets, and samples are reported
//! in order, so the first failing sample and its error are those of a point-by-point loop.
//! Only a failure of a block evaluation as a whole (a host's batch callback) has no
//! point-by-point counterpart; it is reported at the first sample of its chunk. The curve is
//! evaluated at every sample of a chunk before the first t outside its domain, so a curve
//! callback may be called at samples after the first failing one (never with such a t), and
//! the hints may have moved past the failing sample (they only ever affect speed).
//!
//! Nothing is allocated: the chunk's jets and the kernel's scratch live on the stack (about 20 KiB).

use crate::curve::UvCurve;
use crate::engine::frame_block::{FrameKernel, FrameSlots};
use crate::error::StrakeError;
use crate::geometry::frame::{DarbouxFrame, ParamScales, darboux_frame_at};
use crate::geometry::jet::{CurveJet, DerivOrder, SurfaceJet};
use crate::geometry::principal::SurfacePoint;
use crate::nurbs::SpanHint;
use crate::surface::SurfaceSource;
use crate::surface::crease::snap_onto_surface_creases;
use crate::surface::{KnotSides, SurfaceHint};
use std::mem::MaybeUninit;

/// Per-caller evaluation state: span hints for the surface and the curve.
#[derive(Debug, Clone, Copy, Default)]
pub struct Hints {
    /// Surface hint.
    pub surface: SurfaceHint,
    /// Curve hint.
    pub curve: SpanHint,
}

/// A failure inside a batch: the index of the sample that failed and why.
#[derive(Debug, Clone, PartialEq)]
pub struct SampleError {
    /// Index of the failing sample in the caller's array.
    pub index: usize,
    /// Curve parameter of the failing sample.
    pub t: f64,
    /// What went wrong there.
    pub error: StrakeError,
}

impl std::fmt::Display for SampleError {
    fn fmt(&self, f: &mut std::fmt::Formatter<'_>) -> std::fmt::Result {
        write!(
            f,
            "sample {} (t = {}): {}",
            self.index,
            crate::numfmt::Exact(self.t),
            self.error
        )
    }
}

impl std::error::Error for SampleError {}

/// Samples per call of [`SurfaceSource::jets_in_domain_block`] (so a host's batch callback gets
/// up to this many points per call): one call of the frame kernel (sixteen groups of four on
/// AVX2, four blocks of sixteen elsewhere).
pub(crate) const CHUNK: usize = crate::engine::frame_block::MAX_POINTS;

/// Where [`frames_blocked_into`] puts the frames.
pub(crate) trait FrameSink {
    /// Room for the frames of the samples `base .. base + len`, for the kernel to write them in
    /// place.
    fn room(&mut self, base: usize, len: usize) -> FrameSlots<'_>;
    /// The kernel wrote the frame of sample `index` (at parameter `t`) into [`Self::room`], and
    /// it is final.
    #[inline]
    fn placed(&mut self, index: usize, t: f64) {
        let _ = (index, t);
    }
    /// The frame of sample `index` (at parameter `t`), computed by the one-point path because
    /// the kernel flagged it.
    fn put(&mut self, index: usize, t: f64, frame: &DarbouxFrame);
    /// The second-order surface jets of a chunk's points, for the frames: by default
    /// [`SurfaceSource::jets_in_domain_block`]. A sink that needs more of the surface per
    /// point (the third partials of the rates) evaluates them here in the same pass; the jets
    /// must be the same bits.
    #[inline]
    fn surface_jets<S: SurfaceSource + ?Sized>(
        &mut self,
        surface: &S,
        u: &[f64],
        v: &[f64],
        hint: &mut SurfaceHint,
        out: &mut [SurfaceJet],
    ) -> crate::error::Result<()> {
        surface.jets_in_domain_block(u, v, DerivOrder::Second, hint, out)
    }
    /// Every frame of the chunk's samples `base .. base + ts.len()` is final (`ts`, `cj`, `sj`
    /// their parameters and jets): work that needs the frames is done here, in sample order.
    /// A failure is that of its sample, and it ends the batch (samples of the chunk after
    /// the first failing frame never come here).
    #[inline]
    fn chunk_done<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
        &mut self,
        surface: &S,
        curve: &C,
        base: usize,
        ts: &[f64],
        cj: &[CurveJet],
        sj: &[SurfaceJet],
    ) -> Result<(), SampleError> {
        let _ = (surface, curve, base, ts, cj, sj);
        Ok(())
    }
}

/// A sink that is the caller's array of frames (`count` long): the kernel writes into it
/// directly, with no copy. On a failure, entries from the failing sample to the end of its
/// chunk of [`CHUNK`] samples may hold meaningless numbers.
pub(crate) struct IntoSlice<'a>(pub(crate) &'a mut [DarbouxFrame]);

impl FrameSink for IntoSlice<'_> {
    #[inline]
    fn room(&mut self, base: usize, len: usize) -> FrameSlots<'_> {
        let room = &mut self.0[base..base + len];
        // SAFETY: the same memory seen as possibly uninitialised frames; only whole frames are
        // written through it (`FrameKernel::frames` writes every f64 of each), so the array
        // stays initialised.
        let room =
            unsafe { &mut *(room as *mut [DarbouxFrame] as *mut [MaybeUninit<DarbouxFrame>]) };
        FrameSlots::of(room)
    }
    #[inline]
    fn put(&mut self, index: usize, _: f64, frame: &DarbouxFrame) {
        self.0[index] = *frame;
    }
}

/// Element types of arrays the batch can write frames into in place: the parallel batch cuts
/// such an array into pieces and makes each piece a [`FrameSink`].
pub(crate) trait SinkSlice: Sized {
    /// The sink over a piece of the array.
    type Sink<'a>: FrameSink
    where
        Self: 'a;
    /// `slice` as a sink whose sample 0 is `slice[0]`.
    fn sink(slice: &mut [Self]) -> Self::Sink<'_>;
}

impl SinkSlice for DarbouxFrame {
    type Sink<'a> = IntoSlice<'a>;
    #[inline]
    fn sink(slice: &mut [Self]) -> IntoSlice<'_> {
        IntoSlice(slice)
    }
}

/// Frames at the `count` parameters `t_of(0)`, …, `t_of(count − 1)`, into `sink` in order.
/// Stops at the first failing sample (every sample before it has been put into the sink or
/// written into its room) and returns its index, parameter and error. `hints` is carried
/// through and left where the last sample put it.
pub(crate) fn frames_blocked_into<S, C>(
    surface: &S,
    curve: &C,
    scales: ParamScales,
    count: usize,
    hints: &mut Hints,
    t_of: impl Fn(usize) -> f64,
    sink: &mut impl FrameSink,
) -> Result<(), SampleError>
where
    S: SurfaceSource + ?Sized,
    C: UvCurve + ?Sized,
{
    let orientation = surface.orientation();
    let (ud, vd) = (surface.u_domain(), surface.v_domain());
    let td = curve.domain();
    let mut ts = [0.0; CHUNK];
    let mut us = [0.0; CHUNK];
    let mut vs = [0.0; CHUNK];
    let mut cj = [CurveJet::default(); CHUNK];
    let mut sj = [SurfaceJet::default(); CHUNK];
    // Lanes on a crease of the surface and the sides to evaluate them on.
    let mut creased = [false; CHUNK];
    let mut sides = [KnotSides::default(); CHUNK];
    let mut kernel = FrameKernel::new();
    let mut base = 0;
    while base < count {
        let len = CHUNK.min(count - base);
        // Lanes 0..good are fine so far; `pending` is the failure of lane `good`, if any.
        let mut good = len;
        let mut pending = None;
        // The checks of `UvCurve::checked_jet` and the surface domain, in a point-by-point
        // loop's order: t of every sample first (a failure there ends the chunk before it),
        // then the curve jets of the samples before it in one call, then per sample the jet's
        // finiteness and (u, v) in the surface's domain. A sample's errors come in the order of
        // `checked_jet` followed by the domain checks, and the first failing sample wins.
        for (i, t) in ts[..len].iter_mut().enumerate() {
            *t = t_of(base + i);
        }
        // t within round-off of an end of the curve's domain is snapped onto it (as
        // `UvCurve::checked_jet` does); the first t that cannot be is the pending failure.
        for (i, t) in ts[..len].iter_mut().enumerate() {
            if !(td.lo <= *t && *t <= td.hi) {
                match td.snap("t", *t) {
                    Ok(s) => *t = s,
                    Err(e) => {
                        good = i;
                        pending = Some(e);
                        break;
                    }
                }
            }
        }
        if good > 0 {
            let block = curve.jets_in_domain_block(&ts[..good], &mut hints.curve, &mut cj[..good]);
            narrow(block, &mut good, &mut pending).map_err(|error| SampleError {
                index: base,
                t: ts[0],
                error,
            })?;
        }
        let evaluated = good;
        for (i, c) in cj[..evaluated].iter_mut().enumerate() {
            // (u, v) within round-off of the surface's edge snapped onto it, as in
            // `CurveOnSurface::frame`.
            let checked = c.check_finite().and_then(|()| {
                let u = ud.snap("u", c.u)?;
                let v = vd.snap("v", c.v)?;
                Ok((u, v))
            });
            match checked {
                Ok((u, v)) => {
                    c.u = u;
                    c.v = v;
                    // Onto a crease it lies on, as in `CurveOnSurface::frame`.
                    let (flags, s) = snap_onto_surface_creases(surface, c, &scales);
                    creased[i] = !flags.is_smooth();
                    sides[i] = s;
                }
                Err(e) => {
                    good = i;
                    pending = Some(e);
                    break;
                }
            }
            us[i] = c.u;
            vs[i] = c.v;
        }
        if good > 0 {
            let block = sink.surface_jets(
                surface,
                &us[..good],
                &vs[..good],
                &mut hints.surface,
                &mut sj[..good],
            );
            narrow(block, &mut good, &mut pending).map_err(|error| SampleError {
                index: base,
                t: ts[0],
                error,
            })?;
            // A lane on a crease: the jet of the side the curve moves into, from the one-point
            // evaluation `CurveOnSurface::frame` makes (the same bits).
            let evaluated = good;
            for i in 0..evaluated {
                if creased[i] {
                    let jet = surface.jet_in_domain_sided(
                        us[i],
                        vs[i],
                        sides[i],
                        DerivOrder::Second,
                        &mut hints.surface,
                    );
                    match jet {
                        Ok(j) => sj[i] = j,
                        Err(e) => {
                            good = i;
                            pending = Some(e);
                            break;
                        }
                    }
                }
            }
        }
        if good > 0 {
            let (sg, cg) = (&sj[..good], &cj[..good]);
            let bits = kernel.frames(sg, cg, orientation, &scales, sink.room(base, good));
            let kernel_lanes = good;
            for i in 0..kernel_lanes {
                // A lane with a non-finite jet is flagged by the kernel; the one-point path
                // then reports the jet's `NonFinite` error.
                if bits & (1 << i) != 0 {
                    sink.placed(base + i, ts[i]);
                } else {
                    match one_point(surface, &scales, &sj[i], &cj[i], ts[i]) {
                        Ok(frame) => sink.put(base + i, ts[i], &frame),
                        Err(e) => {
                            good = i;
                            pending = Some(e);
                            break;
                        }
                    }
                }
            }
        }
        if good > 0 {
            sink.chunk_done(surface, curve, base, &ts[..good], &cj[..good], &sj[..good])?;
        }
        if let Some(error) = pending {
            return Err(SampleError {
                index: base + good,
                t: ts[good],
                error,
            });
        }
        base += len;
    }
    Ok(())
}

/// Takes the result of a block call over lanes `0..good`: a failure at lane `index < good`
/// (`StrakeError::AtPoint`) narrows the good lanes to `0..index` and becomes the pending error;
/// any other error is the block's as a whole (returned, for the caller to report at the first
/// sample of its chunk).
fn narrow(
    block: crate::error::Result<()>,
    good: &mut usize,
    pending: &mut Option<StrakeError>,
) -> Result<(), StrakeError> {
    match block {
        Ok(()) => Ok(()),
        Err(StrakeError::AtPoint { index, error }) if index < *good => {
            *good = index;
            *pending = Some(*error);
            Ok(())
        }
        Err(error) => Err(error),
    }
}

/// The one-point path from given jets (what [`crate::CurveOnSurface::frame`] does after evaluating
/// them): the exact error of a lane the block kernel flagged.
#[cold]
#[inline(never)]
fn one_point<S>(
    surface: &S,
    scales: &ParamScales,
    sj: &SurfaceJet,
    cj: &CurveJet,
    t: f64,
) -> crate::error::Result<DarbouxFrame>
where
    S: SurfaceSource + ?Sized,
{
    let sp = SurfacePoint::new(
        sj,
        surface.orientation(),
        cj.u,
        cj.v,
        scales.u_extent,
        scales.v_extent,
    )?;
    darboux_frame_at(sj, &sp, cj, scales, t)
}
