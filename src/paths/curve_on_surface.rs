//! Frames along a curve on a surface: at one parameter, at the host's array of parameters, or
//! at n evenly spaced parameters. Every entry point reuses span hints from one point to the
//! next and allocates nothing per point.

use crate::curve::UvCurve;
pub use crate::engine::batch::{Hints, SampleError};
use crate::engine::rates_batch::{RatesSink, curve_third_at, rates_at};
use crate::error::{Result, StrakeError};
use crate::geometry::frame::{DarbouxFrame, ParamScales, darboux_frame_at};
use crate::geometry::jet::CurveJet;
use crate::geometry::jet::{CurvePartials, DerivOrder, SurfaceJet, SurfacePartials};
use crate::geometry::principal::SurfacePoint;
use crate::geometry::rates::InvariantRates;
use crate::surface::crease::{sides_for_order, snap_onto_surface_creases};
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
        let (f, _) = self.frame_of_point(&cj, flags, sides, t, hints)?;
        Ok((f, flags))
    }

    /// The frame and the surface jet at the curve point `cj` (from [`Self::curve_point`]),
    /// the jet on the sides `sides` where the point is on a crease.
    #[inline]
    fn frame_of_point(
        &self,
        cj: &CurveJet,
        flags: CreaseFlags,
        sides: KnotSides,
        t: f64,
        hints: &mut Hints,
    ) -> Result<(DarbouxFrame, SurfaceJet)> {
        let sj = self.surface_jet_at(cj, flags, sides, DerivOrder::Second, hints)?;
        let sp = SurfacePoint::new(
            &sj,
            self.surface.orientation(),
            cj.u,
            cj.v,
            self.scales.u_extent,
            self.scales.v_extent,
        )?;
        Ok((darboux_frame_at(&sj, &sp, cj, &self.scales, t)?, sj))
    }

    /// The surface jet to `order` at the curve point `cj` (from [`Self::curve_point`]): a
    /// plain checked evaluation at a smooth point, the jet of the side the curve moves into on
    /// a crease (checked finite).
    #[inline]
    pub(crate) fn surface_jet_at(
        &self,
        cj: &CurveJet,
        flags: CreaseFlags,
        sides: KnotSides,
        order: DerivOrder,
        hints: &mut Hints,
    ) -> Result<SurfaceJet> {
        if flags.is_smooth() {
            self.surface
                .checked_jet(cj.u, cj.v, order, &mut hints.surface)
        } else {
            let sj =
                self.surface
                    .jet_in_domain_sided(cj.u, cj.v, sides, order, &mut hints.surface)?;
            sj.check_finite()?;
            Ok(sj)
        }
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
    pub(crate) fn curve_point(
        &self,
        t: f64,
        hints: &mut Hints,
    ) -> Result<(CurveJet, CreaseFlags, KnotSides)> {
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
    /// of [`Self::frame`], bit for bit; the partials are those of [`Self::partials_at`].
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
        let (cj, flags, sides) = self.curve_point(t, hints)?;
        let (frame, _) = self.frame_of_point(&cj, flags, sides, t, hints)?;
        let (sp, cp) = self.partials_of_point(&cj, t, order, hints)?;
        Ok((frame, sp, cp))
    }

    /// The surface's and the curve's partials to `order` at `t`, with the crease flags of the
    /// point. (u, v) are those of the frame (snapped onto the surface's edge and onto a crease
    /// as [`Self::frame`] does; `cp.u[0]`, `cp.v[0]` hold them), and on a knot line across
    /// which partials of `order` may jump (a crease, or for third order also a C2 line) the
    /// surface's partials are those of the side the curve moves into, at the knot
    /// ([`crate::surface::crease::sides_for_order`],
    /// [`SurfaceSource::partials_in_domain_sided`]), so that a third-order result (a rate of
    /// change, the tool-centre path's curvature) takes the side of travel, on a crease the
    /// frame's.
    ///
    /// Errors: those of [`UvCurve::checked_partials`], `OutOfDomain` for a (u, v) off the
    /// surface's domain, those of [`SurfaceSource::checked_partials_sided`]
    /// (`OrderUnavailable`, `NonFinite`).
    pub fn partials_at(
        &self,
        t: f64,
        order: usize,
        hints: &mut Hints,
    ) -> Result<(SurfacePartials, CurvePartials, CreaseFlags)> {
        let (cj, flags, _) = self.curve_point(t, hints)?;
        let (sp, cp) = self.partials_of_point(&cj, t, order, hints)?;
        Ok((sp, cp, flags))
    }

    /// The partials of [`Self::partials_at`] at the curve point `cj` of [`Self::curve_point`].
    fn partials_of_point(
        &self,
        cj: &CurveJet,
        t: f64,
        order: usize,
        hints: &mut Hints,
    ) -> Result<(SurfacePartials, CurvePartials)> {
        let ts = self.curve.domain().snap("t", t)?;
        let mut cp = self.curve.checked_partials(ts, order, &mut hints.curve)?;
        cp.u[0] = cj.u;
        cp.v[0] = cj.v;
        // On a knot line across which partials of `order` jump: at the knot, on the side the
        // curve moves into (on a crease the frame's).
        let (u, v, sides, _) = sides_for_order(self.surface, cj, order);
        let sp = self
            .surface
            .checked_partials_sided(u, v, sides, order, &mut hints.surface)?;
        Ok((sp, cp))
    }

    /// The frame at `t` and the rates of change along arc length of κn, κg, τg and κ there
    /// (see [`crate::geometry::rates`]), from third-order jets: the frame of [`Self::frame`]
    /// and the rates of [`crate::geometry::rates::rates_from_jets`] from its jets, the
    /// curve's third derivatives ([`UvCurve::third_derivatives_block`]) and the surface's
    /// third partials ([`SurfaceSource::jets_and_third_block`], else
    /// [`SurfaceSource::checked_partials`]), bit for bit those of
    /// [`Self::frames_with_rates_at`].
    ///
    /// Errors: those of [`Self::frame`]; `OrderUnavailable` when the curve or the surface
    /// does not provide third order (a host callback that gives second order only);
    /// `NonFinite` for a non-finite third derivative (named) or rate.
    pub fn frame_with_rates(
        &self,
        t: f64,
        hints: &mut Hints,
    ) -> Result<(DarbouxFrame, InvariantRates)> {
        // The steps of `Self::frame_flagged`, keeping the jets.
        let (cj, flags, sides) = self.curve_point(t, hints)?;
        let (f, sj) = self.frame_of_point(&cj, flags, sides, t, hints)?;
        let ts = self.curve.domain().snap("t", t)?;
        let c3 = curve_third_at(self.curve, ts, &mut hints.curve)?;
        let mut third = [[crate::geometry::math::Vec3::zeros(); 4]];
        let (mut h, mut scratch) = (hints.surface, [SurfaceJet::default()]);
        let have =
            self.surface
                .jets_and_third_block(&[cj.u], &[cj.v], &mut h, &mut scratch, &mut third);
        let r = rates_at(
            self.surface,
            &f,
            &sj,
            &cj,
            c3,
            have.then_some(&third[0]),
            &mut hints.surface,
        )?;
        Ok((f, r))
    }

    /// Frames and rates of change of the invariants at each of `ts`, into `frames` and
    /// `rates` (all three the same length): the frames of [`Self::frames_at`] (same bits),
    /// the rates of [`Self::frame_with_rates`] at each sample (same bits, same errors).
    /// Evaluated a chunk at a time by the frame batch, with the surface's third partials
    /// from the same evaluation as its jets where the surface has one (native NURBS); nothing
    /// is allocated. Stops at the first failing sample and reports it (the outputs are then
    /// partly written).
    pub fn frames_with_rates_at(
        &self,
        ts: &[f64],
        frames: &mut [DarbouxFrame],
        rates: &mut [InvariantRates],
    ) -> std::result::Result<(), SampleError> {
        if rates.len() != ts.len() || frames.len() != ts.len() {
            return Err(SampleError {
                index: 0,
                t: f64::NAN,
                error: StrakeError::InvalidArgument(format!(
                    "{} parameters but room for {} frames and {} rates",
                    ts.len(),
                    frames.len(),
                    rates.len()
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
            &mut RatesSink::new(frames, rates),
        )
    }
}
