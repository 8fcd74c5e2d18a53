//! Evaluation entry points: one frame, a whole path given by the host's parameters, a path at
//! evenly spaced parameters, and the pure frame from two jets.
//!
//! Outputs are written only on success. The batch calls evaluate into one scratch buffer
//! allocated per call (never per point), and copy it to the host's array once every sample has
//! succeeded; a failure names the sample's index and parameter. They evaluate a block of points
//! at a time (`crate::engine::batch`; the frame kernel writes straight into the scratch buffer's C
//! frames) with the results of `strake_frame_at` at each parameter, bit for bit.

use super::curve::StrakeCurve;
use super::guard::{Failure, check_count, guard, input, input_slice, output};
use super::status::StrakeStatus;
use super::surface::{StrakeSurface, orientation};
use super::types::{StrakeCurveJet, StrakeFrame, StrakeParamScales, StrakeSurfaceJet};
use crate::error::StrakeError;
use crate::geometry::frame::{ParamScales, darboux_frame};
use crate::geometry::jet::{CurveJet, SurfaceJet};
use crate::paths::curve_on_surface::{CurveOnSurface, Hints, SampleError};
use std::mem::MaybeUninit;

/// Computes the frame at curve parameter `t` of `curve` lying on `surface`.
///
/// Returns `STRAKE_STATUS_OK` and writes `*out`; otherwise `*out` is untouched. Errors:
/// NULL_POINTER (`surface`, `curve`, `out`); NON_FINITE (`t`, or a callback's jet entry);
/// OUT_OF_DOMAIN (t outside the curve's domain, or the curve's (u, v) outside the surface's);
/// DEGENERATE_SURFACE; STALLED_CURVE; SURFACE_CALLBACK_FAILED; CURVE_CALLBACK_FAILED.
///
/// Thread-safe: any number of threads may evaluate the same handles at once.
///
/// # Safety
/// `surface` and `curve` must be NULL or live handles; `out` NULL or writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_frame_at(
    surface: *const StrakeSurface,
    curve: *const StrakeCurve,
    t: f64,
    out: *mut StrakeFrame,
) -> StrakeStatus {
    guard("strake_frame_at", || {
        // SAFETY: the caller passes live handles or NULL.
        let (s, c) = unsafe { (input(surface, "surface")?, input(curve, "curve")?) };
        let slot = output(out, "out")?;
        let frame = CurveOnSurface::new(s.source(), c.curve()).frame(t, &mut Hints::default())?;
        // SAFETY: `out` checked non-null and aligned; the caller provides a writable frame.
        unsafe {
            slot.as_ptr()
                .write(MaybeUninit::new(StrakeFrame::new(t, &frame)))
        };
        Ok(())
    })
}

/// A scratch buffer of `count` frames for a batch call (one allocation per call, never per
/// point): outputs are written to the host's array only once every sample has succeeded.
pub(crate) fn scratch(count: usize) -> Result<Vec<MaybeUninit<StrakeFrame>>, Failure> {
    let mut v: Vec<MaybeUninit<StrakeFrame>> = Vec::new();
    v.try_reserve_exact(count).map_err(|_| {
        Failure::invalid(format!("cannot allocate scratch space for {count} frames"))
    })?;
    // SAFETY: the capacity is at least `count` and `MaybeUninit` needs no initialisation.
    unsafe { v.set_len(count) };
    Ok(v)
}

/// Copies a fully written scratch buffer to the host's array.
///
/// # Safety
/// Every element of `scratch` must have been written; `out` must have room for
/// `scratch.len()` frames (non-null, aligned, checked by `check_count`) and not overlap it.
pub(crate) unsafe fn publish_frames(
    scratch: &[MaybeUninit<StrakeFrame>],
    out: std::ptr::NonNull<MaybeUninit<StrakeFrame>>,
) {
    // SAFETY: the caller's contract.
    unsafe { std::ptr::copy_nonoverlapping(scratch.as_ptr(), out.as_ptr(), scratch.len()) };
}

// The C frame is the curve parameter followed by the fields of `DarbouxFrame` in the same
// layout (both `#[repr(C)]`; `[f64; 3]` and `Vec3` are three f64 x, y, z), so the frame kernel
// can write a `DarbouxFrame` at the C frame's `u` (`IntoScratch`).
const _: () = {
    use crate::geometry::frame::DarbouxFrame;
    use std::mem::{offset_of, size_of};
    const T: usize = offset_of!(StrakeFrame, u);
    assert!(offset_of!(StrakeFrame, curve_param) == 0 && T == size_of::<f64>());
    assert!(size_of::<StrakeFrame>() == T + size_of::<DarbouxFrame>());
    assert!(offset_of!(StrakeFrame, v) == T + offset_of!(DarbouxFrame, v));
    assert!(offset_of!(StrakeFrame, point) == T + offset_of!(DarbouxFrame, point));
    assert!(offset_of!(StrakeFrame, tangent) == T + offset_of!(DarbouxFrame, t));
    assert!(offset_of!(StrakeFrame, side) == T + offset_of!(DarbouxFrame, b));
    assert!(offset_of!(StrakeFrame, normal) == T + offset_of!(DarbouxFrame, n));
    assert!(
        offset_of!(StrakeFrame, normal_curvature) == T + offset_of!(DarbouxFrame, normal_curvature)
    );
    assert!(
        offset_of!(StrakeFrame, geodesic_curvature)
            == T + offset_of!(DarbouxFrame, geodesic_curvature)
    );
    assert!(
        offset_of!(StrakeFrame, geodesic_torsion) == T + offset_of!(DarbouxFrame, geodesic_torsion)
    );
    assert!(offset_of!(StrakeFrame, speed) == T + offset_of!(DarbouxFrame, speed));
    assert!(offset_of!(StrakeFrame, k1) == T + offset_of!(DarbouxFrame, principal.k1));
    assert!(offset_of!(StrakeFrame, k2) == T + offset_of!(DarbouxFrame, principal.k2));
    assert!(offset_of!(StrakeFrame, dir1) == T + offset_of!(DarbouxFrame, principal.d1));
    assert!(offset_of!(StrakeFrame, dir2) == T + offset_of!(DarbouxFrame, principal.d2));
    assert!(
        offset_of!(StrakeFrame, mean_curvature) == T + offset_of!(DarbouxFrame, principal.mean)
    );
    assert!(
        offset_of!(StrakeFrame, gaussian_curvature)
            == T + offset_of!(DarbouxFrame, principal.gaussian)
    );
    assert!(
        offset_of!(StrakeFrame, surface_conditioning)
            == T + offset_of!(DarbouxFrame, conditioning.surface)
    );
    assert!(
        offset_of!(StrakeFrame, curve_speed_figure)
            == T + offset_of!(DarbouxFrame, conditioning.curve)
    );
};

/// The batch calls' sink: the scratch buffer of C frames, into which the frame kernel writes
/// in place (each frame at its C frame's `u`, then the parameter beside it); frames of the
/// one-point path are converted by [`StrakeFrame::new`].
pub(crate) struct IntoScratch<'a>(&'a mut [MaybeUninit<StrakeFrame>]);

impl<'a> IntoScratch<'a> {
    /// The sink writing into `scratch`.
    pub(crate) fn new(scratch: &'a mut [MaybeUninit<StrakeFrame>]) -> Self {
        IntoScratch(scratch)
    }
}

impl crate::engine::batch::FrameSink for IntoScratch<'_> {
    #[inline]
    fn room(&mut self, base: usize, len: usize) -> crate::engine::frame_block::FrameSlots<'_> {
        let room = &mut self.0[base..base + len];
        let first = room.as_mut_ptr() as *mut u8;
        // SAFETY: C frame i of `room` holds a `DarbouxFrame` at byte offset 8, aligned for it
        // (the layout checked above); the frames are disjoint and borrowed from `self`.
        unsafe {
            crate::engine::frame_block::FrameSlots::from_raw(
                first.add(std::mem::offset_of!(StrakeFrame, u)),
                std::mem::size_of::<StrakeFrame>(),
                len,
            )
        }
    }

    #[inline]
    fn placed(&mut self, index: usize, t: f64) {
        let frame = self.0[index].as_mut_ptr();
        // SAFETY: a field of our own element, written without reading it.
        unsafe { std::ptr::addr_of_mut!((*frame).curve_param).write(t) }
    }

    #[inline]
    fn put(&mut self, index: usize, t: f64, frame: &crate::geometry::frame::DarbouxFrame) {
        self.0[index] = MaybeUninit::new(StrakeFrame::new(t, frame));
    }
}

impl crate::engine::batch::SinkSlice for MaybeUninit<StrakeFrame> {
    type Sink<'a> = IntoScratch<'a>;
    #[inline]
    fn sink(slice: &mut [Self]) -> IntoScratch<'_> {
        IntoScratch(slice)
    }
}

/// Evaluates `count` samples with parameters `t_of(i)` into a scratch buffer (a block of
/// points at a time, see `crate::engine::batch`), then copies them to `out`.
fn batch(
    surface: &StrakeSurface,
    curve: &StrakeCurve,
    count: usize,
    out: std::ptr::NonNull<MaybeUninit<StrakeFrame>>,
    t_of: impl Fn(usize) -> f64,
) -> Result<(), Failure> {
    let pair = CurveOnSurface::new(surface.source(), curve.curve());
    let mut scratch = scratch(count)?;
    crate::engine::batch::frames_blocked_into(
        pair.surface(),
        pair.curve(),
        pair.scales(),
        count,
        &mut Hints::default(),
        t_of,
        &mut IntoScratch(&mut scratch),
    )?;
    // SAFETY: every sample succeeded, so every element was written; the caller provides room
    // for `count` frames at `out` (non-null, aligned, size checked by `check_count`), and
    // `scratch` is our own buffer.
    unsafe { publish_frames(&scratch, out) };
    Ok(())
}

/// Computes the frames at the `count` curve parameters `ts` (a whole path in one call):
/// `out[i]` is the frame at `ts[i]`. The parameters need not be sorted, but marching in order
/// is fastest.
///
/// Returns `STRAKE_STATUS_OK` and writes `out[0..count]`; otherwise `out` is untouched and the
/// message names the failing sample's index and t. Errors: those of `strake_frame_at`, plus
/// NULL_POINTER (`ts`) and INVALID_ARGUMENT (`count` of 0 or too large).
///
/// # Safety
/// `ts` must point to `count` doubles and `out` to room for `count` frames (or be NULL); the
/// two must not overlap.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_frames_at(
    surface: *const StrakeSurface,
    curve: *const StrakeCurve,
    ts: *const f64,
    count: usize,
    out: *mut StrakeFrame,
) -> StrakeStatus {
    guard("strake_frames_at", || {
        // SAFETY: the caller passes live handles or NULL, and `count` readable doubles at `ts`.
        let (s, c) = unsafe { (input(surface, "surface")?, input(curve, "curve")?) };
        let ts = unsafe { input_slice(ts, count, "ts", "count")? };
        let slot = output(out, "out")?;
        check_count::<StrakeFrame>(count, "count")?;
        batch(s, c, count, slot, |i| ts[i])
    })
}

/// Computes the frames at `count` evenly spaced curve parameters from the start to the end of
/// the curve's domain, both included (`count` = 1 gives the start only): t_i = t_min +
/// (t_max - t_min) i/(count - 1), with the last exactly t_max. `out[i].curve_param` holds t_i.
///
/// Returns `STRAKE_STATUS_OK` and writes `out[0..count]`; otherwise `out` is untouched and the
/// message names the failing sample's index and t. Errors: those of `strake_frame_at`, plus
/// INVALID_ARGUMENT (`count` of 0 or too large).
///
/// # Safety
/// `out` must be NULL or have room for `count` frames; handles as in `strake_frame_at`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_frames_even(
    surface: *const StrakeSurface,
    curve: *const StrakeCurve,
    count: usize,
    out: *mut StrakeFrame,
) -> StrakeStatus {
    guard("strake_frames_even", || {
        // SAFETY: the caller passes live handles or NULL.
        let (s, c) = unsafe { (input(surface, "surface")?, input(curve, "curve")?) };
        let slot = output(out, "out")?;
        check_count::<StrakeFrame>(count, "count")?;
        let domain = c.curve().domain();
        batch(s, c, count, slot, |i| domain.even(i, count))
    })
}

/// Computes the frame from a surface jet and a curve jet directly, with no handles: the pure
/// math, for hosts that evaluate both themselves. `surface_jet` must hold second-order
/// derivatives at the curve jet's (u, v). `flip_normal` is 0 (N along Su x Sv) or 1 (reversed);
/// `scales` gives the widths of the parameter domains against which degeneracy is judged.
/// `out->curve_param` is set to 0.
///
/// Returns `STRAKE_STATUS_OK` and writes `*out`; otherwise `*out` is untouched. Errors:
/// NULL_POINTER (each pointer), INVALID_ARGUMENT (`flip_normal`, a scale not positive and
/// finite), NON_FINITE (a jet entry), DEGENERATE_SURFACE, STALLED_CURVE. Thread-safe.
///
/// # Safety
/// Each pointer must be NULL or point to a valid value of its type; `out` writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_frame_from_jets(
    surface_jet: *const StrakeSurfaceJet,
    curve_jet: *const StrakeCurveJet,
    flip_normal: i32,
    scales: *const StrakeParamScales,
    out: *mut StrakeFrame,
) -> StrakeStatus {
    guard("strake_frame_from_jets", || {
        // SAFETY: the caller passes valid values or NULL.
        let sj = SurfaceJet::from(unsafe { input(surface_jet, "surface_jet")? });
        let cj = CurveJet::from(unsafe { input(curve_jet, "curve_jet")? });
        let scales = ParamScales::from(unsafe { input(scales, "scales")? });
        let slot = output(out, "out")?;
        let orientation = orientation(flip_normal)?;
        let frame = darboux_frame(&sj, &cj, orientation, &scales, 0.0).map_err(|e| match e {
            // No curve parameter is involved here: say which velocity stalled instead.
            StrakeError::StalledCurve { speed_figure, .. } => Failure::new(
                StrakeStatus::StalledCurve,
                format!(
                    "stalled curve: the curve jet's velocity (du, dv) = ({}, {}) vanishes relative \
                     to the parameter scales (speed figure {speed_figure:e}); the tangent is undefined",
                    cj.du, cj.dv
                ),
            ),
            e => e.into(),
        })?;
        // SAFETY: `out` checked non-null and aligned; the caller provides a writable frame.
        unsafe {
            slot.as_ptr()
                .write(MaybeUninit::new(StrakeFrame::new(0.0, &frame)))
        };
        Ok(())
    })
}

/// Writes the crease flags of the frames at the `count` curve parameters `ts`: `flags[i]` is 0
/// where the frame at `ts[i]` (from `strake_frame_at`, `strake_frames_at`,
/// `strake_frames_even` or the sampling calls at the same t) lies at a smooth point of the
/// surface, otherwise an OR of `StrakeKnotLineFlag` bits saying which knot lines of reduced
/// continuity it lies on and how the side was chosen. Only the curve is evaluated. A separate
/// call, so that `StrakeFrame` keeps its layout.
///
/// Returns `STRAKE_STATUS_OK` and writes `flags[0..count]`; otherwise `flags` is untouched and
/// the message names the failing sample's index and t. Errors: NULL_POINTER (`surface`,
/// `curve`, `ts`, `flags`); INVALID_ARGUMENT (`count` of 0 or too large); NON_FINITE (a t, or
/// a callback's jet entry); OUT_OF_DOMAIN (a t outside the curve's domain, or a (u, v)
/// outside the surface's); CURVE_CALLBACK_FAILED.
///
/// Thread-safe: any number of threads may use the same handles at once.
///
/// # Safety
/// `surface` and `curve` NULL or live handles; `ts` NULL or `count` readable doubles; `flags`
/// NULL or room for `count` uint32_t, not overlapping `ts`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_knot_line_flags(
    surface: *const StrakeSurface,
    curve: *const StrakeCurve,
    ts: *const f64,
    count: usize,
    flags: *mut u32,
) -> StrakeStatus {
    guard("strake_knot_line_flags", || {
        // SAFETY: the caller passes live handles or NULL, and `count` readable doubles at `ts`.
        let (s, c) = unsafe { (input(surface, "surface")?, input(curve, "curve")?) };
        let ts = unsafe { input_slice(ts, count, "ts", "count")? };
        let slot = output(flags, "flags")?;
        check_count::<u32>(count, "count")?;
        let pair = CurveOnSurface::new(s.source(), c.curve());
        let mut scratch: Vec<u32> = Vec::new();
        scratch.try_reserve_exact(count).map_err(|_| {
            Failure::invalid(format!("cannot allocate scratch space for {count} flags"))
        })?;
        let mut hints = Hints::default();
        for (index, &t) in ts.iter().enumerate() {
            let f = pair
                .crease_flags(t, &mut hints)
                .map_err(|error| SampleError { index, t, error })?;
            scratch.push(f.0);
        }
        // SAFETY: `flags` checked non-null and aligned with room for `count` values (the
        // caller's contract, size checked by `check_count`); `scratch` holds `count` values.
        unsafe {
            std::ptr::copy_nonoverlapping(scratch.as_ptr(), slot.as_ptr().cast::<u32>(), count)
        };
        Ok(())
    })
}
