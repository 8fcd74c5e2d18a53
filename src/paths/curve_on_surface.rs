//! Frames along a curve on a surface: at one parameter, at the host's array of parameters, or
//! at n evenly spaced parameters. Every entry point reuses span hints from one point to the
//! next and allocates nothing per point.

use crate::curve::UvCurve;
pub use crate::engine::batch::{Hints, SampleError};
use crate::error::{Result, StrakeError};
use crate::geometry::frame::{DarbouxFrame, ParamScales, darboux_frame_at};
use crate::geometry::jet::CurveJet;
use crate::geometry::jet::{CurvePartials, DerivOrder, SurfacePartials};
use crate::geometry::principal::SurfacePoint;
use crate::geometry::rates::{InvariantRates, invariant_rates};
use crate::surface::crease::snap_onto_surface_creases;
use crate::surface::{CreaseFlags, KnotSides, SurfaceSource};

/// One sample of a path: where it is along the curve and its frame there.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct PathSample {
    /// Curve parameter t.
    pub t: f64,
    /// Arc length from the start of the sampled range to this sample (host length unit).
    pub arc_length: f64,
    /// Frame, invariants and principal curvatures at the sample; (u, v) are in `frame.u`,
    /// `frame.v`.
    pub frame: DarbouxFrame,
}

/// A curve on a surface: the pair the frame is computed for. Borrowing, cheap to build.
pub struct CurveOnSurface<'a, S: SurfaceSource + ?Sized, C: UvCurve + ?Sized> {
    surface: &'a S,
    curve: &'a C,
    scales: ParamScales,
}

impl<'a, S: SurfaceSource + ?Sized, C: UvCurve + ?Sized> CurveOnSurface<'a, S, C> {
    /// Pairs a surface with a curve in its parameter plane.
    pub fn new(surface: &'a S, curve: &'a C) -> Self {
        let scales = ParamScales {
            u_extent: surface.u_domain().width(),
            v_extent: surface.v_domain().width(),
            t_extent: curve.domain().width(),
        };
        CurveOnSurface {
            surface,
            curve,
            scales,
        }
    }

    /// The surface.
    pub fn surface(&self) -> &'a S {
        self.surface
    }

    /// The curve in the surface's parameter plane.
    pub fn curve(&self) -> &'a C {
        self.curve
    }

    /// The scales against which degeneracy is judged.
    pub fn scales(&self) -> ParamScales {
        self.scales
    }

    /// The frame at curve parameter `t`.
    ///
    /// A point on a knot line of the surface where it is not C2 is snapped onto the line and
    /// evaluated on the side the curve moves into ([`crate::surface::crease`]); use
    /// [`Self::frame_flagged`] to learn whether that happened.
    ///
    /// Errors: every error of [`UvCurve::checked_jet`], [`SurfaceSource::checked_jet`] (the
    /// curve leaving the surface's domain gives `OutOfDomain` for u or v) and
    /// [`crate::geometry::frame::darboux_frame`].
    #[inline]
    pub fn frame(&self, t: f64, hints: &mut Hints) -> Result<DarbouxFrame> {
        self.frame_flagged(t, hints).map(|(frame, _)| frame)
    }

    /// The frame at curve parameter `t` (as [`Self::frame`]) with the crease flags of the point:
    /// [`CreaseFlags::is_smooth`] at a point on no knot line of reduced continuity; otherwise
    /// which lines it lies on, whether they are only C0, and whether the curve runs along one
    /// (the side then chosen by the rule of [`crate::surface::crease`]).
    #[inline]
    pub fn frame_flagged(&self, t: f64, hints: &mut Hints) -> Result<(DarbouxFrame, CreaseFlags)> {
        let (cj, flags, sides) = self.curve_point(t, hints)?;
        let sj = if flags.is_smooth() {
            self.surface
                .checked_jet(cj.u, cj.v, DerivOrder::Second, &mut hints.surface)?
        } else {
            let sj = self.surface.jet_in_domain_sided(
                cj.u,
                cj.v,
                sides,
                DerivOrder::Second,
                &mut hints.surface,
            )?;
            sj.check_finite()?;
            sj
        };
        let sp = SurfacePoint::new(
            &sj,
            self.surface.orientation(),
            cj.u,
            cj.v,
            self.scales.u_extent,
            self.scales.v_extent,
        )?;
        Ok((darboux_frame_at(&sj, &sp, &cj, &self.scales, t)?, flags))
    }

    /// The crease flags of the frame at `t` (those of [`Self::frame_flagged`]) without the
    /// frame: the curve is evaluated, the surface is not. Errors: those of
    /// [`UvCurve::checked_jet`] and `OutOfDomain` for a (u, v) off the surface's domain.
    pub fn crease_flags(&self, t: f64, hints: &mut Hints) -> Result<CreaseFlags> {
        self.curve_point(t, hints).map(|(_, flags, _)| flags)
    }

    /// The curve jet at `t` with (u, v) snapped onto the surface's edge and onto its creases,
    /// the crease flags and the sides to evaluate on.
    #[inline]
    fn curve_point(&self, t: f64, hints: &mut Hints) -> Result<(CurveJet, CreaseFlags, KnotSides)> {
        let mut cj = self.curve.checked_jet(t, &mut hints.curve)?;
        // A (u, v) within round-off of the surface's edge is on the edge: snapped onto it
        // exactly, so the frame and the batch see the same point.
        cj.u = self.surface.u_domain().snap("u", cj.u)?;
        cj.v = self.surface.v_domain().snap("v", cj.v)?;
        let (flags, sides) = snap_onto_surface_creases(self.surface, &mut cj, &self.scales);
        Ok((cj, flags, sides))
    }

    /// Frames at each of `ts`, written to `out` (same length). Stops at the first failure and
    /// reports its index; `out` is then partly written (every sample before the failing one;
    /// entries from the failing one to the end of its chunk of 64 samples may hold meaningless
    /// numbers, the kernel writes frames in place).
    ///
    /// Evaluated a block of points at a time (the frame math of a block in
    /// structure-of-arrays form, so that the square roots and divisions of several points
    /// overlap); the results and errors are those of [`Self::frame`] at each parameter, bit for
    /// bit, and nothing is allocated.
    pub fn frames_at(
        &self,
        ts: &[f64],
        out: &mut [DarbouxFrame],
    ) -> std::result::Result<(), SampleError> {
        if ts.len() != out.len() {
            return Err(SampleError {
                index: 0,
                t: f64::NAN,
                error: StrakeError::InvalidArgument(format!(
                    "{} parameters but room for {} frames",
                    ts.len(),
                    out.len()
                )),
            });
        }
        crate::engine::batch::frames_blocked_into(
            self.surface,
            self.curve,
            self.scales,
            ts.len(),
            &mut Hints::default(),
            |i| ts[i],
            &mut crate::engine::batch::IntoSlice(out),
        )
    }

    /// Frames at `out.len()` evenly spaced parameters from the start to the end of the curve's
    /// domain (both ends included; a single frame is at the start), t_i as by
    /// [`crate::Interval::even`]. Evaluated like [`Self::frames_at`].
    pub fn frames_even(&self, out: &mut [DarbouxFrame]) -> std::result::Result<(), SampleError> {
        let n = out.len();
        let dom = self.curve.domain();
        crate::engine::batch::frames_blocked_into(
            self.surface,
            self.curve,
            self.scales,
            n,
            &mut Hints::default(),
            |i| dom.even(i, n),
            &mut crate::engine::batch::IntoSlice(out),
        )
    }

    /// Frames at each of `ts` into `out` (same length), over at most `threads` scoped threads
    /// (pieces of the samples handed out in order to whichever thread is free, each piece with its
    /// own span hints), each piece evaluated like [`Self::frames_at`] (the same bits as
    /// one point at a time, whatever the number of threads). `threads` = 0 is refused; 1 runs on
    /// the calling thread. Fewer threads are started when there are fewer than
    /// [`crate::engine::parallel::MIN_SAMPLES_PER_THREAD`] samples per thread. A panic in a worker (e.g. in a Rust closure
    /// surface) is resumed on the calling thread. On failure the error of the lowest failing index
    /// is returned; `out` then holds the frames of the samples before it (as
    /// [`Self::frames_at`] would leave them), while later entries may hold anything: the
    /// frames of pieces done by other threads, the caller's old values, or, from the failing sample
    /// to the end of its chunk of 64, meaningless numbers.
    pub fn frames_at_parallel(
        &self,
        ts: &[f64],
        out: &mut [DarbouxFrame],
        threads: usize,
    ) -> std::result::Result<(), SampleError> {
        if threads == 0 || ts.len() != out.len() {
            return Err(SampleError {
                index: 0,
                t: f64::NAN,
                error: StrakeError::InvalidArgument(format!(
                    "threads = {threads}, {} parameters, room for {} frames: need threads >= 1 and equal counts",
                    ts.len(),
                    out.len()
                )),
            });
        }
        crate::engine::parallel::frames_parallel_with(
            self.surface,
            self.curve,
            self.scales,
            threads,
            |i| ts[i],
            out,
            |_, _| {},
        )
    }

    /// The frame at `t` and the surface's and curve's partials there to `order` (3 or 4):
    /// what the rates of change and the tool-centre path are computed from. The frame is that
    /// of [`Self::frame`], bit for bit.
    ///
    /// Errors: those of [`Self::frame`]; `OrderUnavailable` when the surface or the curve does
    /// not provide `order` (a host callback that gives second order only); `NonFinite` for a
    /// non-finite partial (named).
    pub fn frame_and_partials(
        &self,
        t: f64,
        order: usize,
        hints: &mut Hints,
    ) -> Result<(DarbouxFrame, SurfacePartials, CurvePartials)> {
        let frame = self.frame(t, hints)?;
        let cp = self.curve.checked_partials(t, order, &mut hints.curve)?;
        let sp = self
            .surface
            .checked_partials(cp.u[0], cp.v[0], order, &mut hints.surface)?;
        Ok((frame, sp, cp))
    }

    /// The frame at `t` and the rates of change along arc length of κn, κg, τg and κ there
    /// (see [`crate::geometry::rates`]), from third-order jets.
    ///
    /// Errors: those of [`Self::frame_and_partials`] with order 3.
    pub fn frame_with_rates(
        &self,
        t: f64,
        hints: &mut Hints,
    ) -> Result<(DarbouxFrame, InvariantRates)> {
        let (f, sp, cp) = self.frame_and_partials(t, 3, hints)?;
        let r = invariant_rates(&f, &sp, &cp, self.surface.orientation())?;
        Ok((f, r))
    }

    /// Frames and rates of change of the invariants at each of `ts`, into `frames` and
    /// `rates` (all three the same length): the frames of [`Self::frames_at`] (same bits),
    /// the rates of [`Self::frame_with_rates`] at each sample. Nothing is allocated; the span
    /// hints are carried along. Stops at the first failing sample and reports it (the outputs
    /// are then partly written).
    pub fn frames_with_rates_at(
        &self,
        ts: &[f64],
        frames: &mut [DarbouxFrame],
        rates: &mut [InvariantRates],
    ) -> std::result::Result<(), SampleError> {
        if rates.len() != ts.len() {
            return Err(SampleError {
                index: 0,
                t: f64::NAN,
                error: StrakeError::InvalidArgument(format!(
                    "{} parameters but room for {} rates",
                    ts.len(),
                    rates.len()
                )),
            });
        }
        self.frames_at(ts, frames)?;
        let mut hints = Hints::default();
        let orientation = self.surface.orientation();
        for (index, ((&t, f), r)) in ts
            .iter()
            .zip(frames.iter())
            .zip(rates.iter_mut())
            .enumerate()
        {
            let at = |error| SampleError { index, t, error };
            let cp = self
                .curve
                .checked_partials(t, 3, &mut hints.curve)
                .map_err(at)?;
            let sp = self
                .surface
                .checked_partials(cp.u[0], cp.v[0], 3, &mut hints.surface)
                .map_err(at)?;
            *r = invariant_rates(f, &sp, &cp, orientation).map_err(at)?;
        }
        Ok(())
    }
}
