//! Frames along a curve on a surface: at one parameter, at the host's array of parameters, or
//! at n evenly spaced parameters. Every entry point reuses span hints from one point to the
//! next and allocates nothing per point.

use crate::curve::UvCurve;
use crate::error::{Result, StrakeError};
use crate::frame::{DarbouxFrame, ParamScales, darboux_frame_at};
use crate::jet::DerivOrder;
use crate::nurbs::SpanHint;
use crate::principal::SurfacePoint;
use crate::surface::{SurfaceHint, SurfaceSource};

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
        write!(f, "sample {} (t = {}): {}", self.index, self.t, self.error)
    }
}

impl std::error::Error for SampleError {}

/// A curve on a surface: the pair the frame is computed for. Borrowing, cheap to build.
pub struct CurveOnSurface<'a, S: SurfaceSource + ?Sized, C: UvCurve + ?Sized> {
    surface: &'a S,
    curve: &'a C,
    scales: ParamScales,
}

/// Per-caller evaluation state: span hints for the surface and the curve.
#[derive(Debug, Clone, Copy, Default)]
pub struct Hints {
    /// Surface hint.
    pub surface: SurfaceHint,
    /// Curve hint.
    pub curve: SpanHint,
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
    /// Errors: every error of [`UvCurve::checked_jet`], [`SurfaceSource::checked_jet`] (the
    /// curve leaving the surface's domain gives `OutOfDomain` for u or v) and
    /// [`crate::frame::darboux_frame`].
    #[inline]
    pub fn frame(&self, t: f64, hints: &mut Hints) -> Result<DarbouxFrame> {
        let cj = self.curve.checked_jet(t, &mut hints.curve)?;
        let sj = self
            .surface
            .checked_jet(cj.u, cj.v, DerivOrder::Second, &mut hints.surface)?;
        let sp = SurfacePoint::new(
            &sj,
            self.surface.orientation(),
            cj.u,
            cj.v,
            self.scales.u_extent,
            self.scales.v_extent,
        )?;
        darboux_frame_at(&sj, &sp, &cj, &self.scales, t)
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
        crate::batch::frames_blocked_into(
            self,
            ts.len(),
            &mut Hints::default(),
            |i| ts[i],
            &mut crate::batch::IntoSlice(out),
        )
    }

    /// Frames at `out.len()` evenly spaced parameters from the start to the end of the curve's
    /// domain (both ends included; a single frame is at the start), t_i as by
    /// [`crate::Interval::even`]. Evaluated like [`Self::frames_at`].
    pub fn frames_even(&self, out: &mut [DarbouxFrame]) -> std::result::Result<(), SampleError> {
        let n = out.len();
        let dom = self.curve.domain();
        crate::batch::frames_blocked_into(
            self,
            n,
            &mut Hints::default(),
            |i| dom.even(i, n),
            &mut crate::batch::IntoSlice(out),
        )
    }
}
