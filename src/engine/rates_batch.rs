//! The rates of change of the invariants along a path, a chunk at a time: the batch behind
//! [`crate::CurveOnSurface::frames_with_rates_at`].
//!
//! It rides on the frame batch ([`crate::engine::batch`]): per chunk the surface's jets come
//! with its third partials from one evaluation where the surface has one
//! ([`SurfaceSource::jets_and_third_block`]: native NURBS), the frames from the frame kernel
//! as always (the same bits as [`crate::CurveOnSurface::frames_at`]), then per sample of the
//! chunk the curve's third derivatives (one [`UvCurve::third_derivatives_block`] call per
//! chunk) and the closed forms of [`crate::geometry::rates::rates_from_jets`] from the frame
//! and the jets. The one-point path ([`crate::CurveOnSurface::frame_with_rates`]) takes the
//! same steps through [`rates_at`], so both give the same bits and the same errors (tested).
//! Nothing is allocated.

use crate::curve::UvCurve;
use crate::engine::batch::{CHUNK, FrameSink, SampleError};
use crate::engine::frame_block::FrameSlots;
use crate::error::{NonFiniteSource, Result, StrakeError};
use crate::geometry::frame::DarbouxFrame;
use crate::geometry::jet::{CurveJet, DerivOrder, SurfaceJet};
use crate::geometry::math::all_finite;
use crate::geometry::rates::{InvariantRates, ThirdPartials, rates_from_jets};
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
        for i in 0..n {
            let fail = |error| SampleError {
                index: base + i,
                t: ts[i],
                error,
            };
            if i == written {
                let error = failure.take().unwrap_or_else(|| {
                    StrakeError::InvalidArgument("third derivatives of the curve missing".into())
                });
                return Err(fail(error));
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
            .map_err(fail)?;
        }
        Ok(())
    }
}
