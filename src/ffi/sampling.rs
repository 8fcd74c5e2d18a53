//! Sampling a curve on a surface into the host's buffer: evenly in t, evenly in arc length, or
//! adaptively to a chord tolerance; and the arc length between two parameters.
//!
//! Every sampling function uses the one buffer pattern of the ABI: the host passes
//! `StrakeSample *buf, size_t capacity, size_t *count`. On success `*count` is the number of
//! samples written. When they do not fit, the function returns
//! `STRAKE_STATUS_BUFFER_TOO_SMALL`, sets `*count` to the number needed and writes nothing to
//! `buf`; sampling is deterministic, so a second call with that capacity gives exactly the
//! samples a large enough first call would have given. `buf` may be NULL with `capacity` 0 to
//! ask for the size.
//!
//! The samples are computed into a scratch buffer (grown as needed, up to `capacity`) and
//! copied to `buf` once every sample has succeeded.

use super::curve::StrakeCurve;
use super::guard::{Failure, OutBuffer, guard, input, out_buffer, output};
use super::status::StrakeStatus;
use super::surface::{StrakeSurface, finite};
use super::types::{StrakeCutter, StrakeSample, StrakeToolAngles};
use crate::paths::curve_on_surface::{CurveOnSurface, PathSample};
use crate::paths::sampling::{
    ChordalOptions, SinkFn, arc_length, sample_chordal, sample_even_arc, sample_even_t,
};
use crate::toolpath::{ToolSetup, sample_chordal_centre};
use std::mem::MaybeUninit;

/// Which sampling rule to run.
enum Rule {
    EvenT(usize),
    EvenArc(usize),
    Chordal(ChordalOptions),
    /// Chords judged on the tool-centre path of the setup.
    ChordalCentre(ChordalOptions, ToolSetup),
}

/// Runs `rule` on the pair and delivers the samples to the host's buffer.
fn sample(
    surface: &StrakeSurface,
    curve: &StrakeCurve,
    rule: Rule,
    arc_tolerance: f64,
    buf: OutBuffer<StrakeSample>,
) -> Result<(), Failure> {
    let pair = CurveOnSurface::new(surface.source(), curve.curve());
    let capacity = buf.capacity();
    // The even rules know their count up front: refuse a small buffer before any work.
    if let Rule::EvenT(n) | Rule::EvenArc(n) = rule {
        if n == 0 {
            return Err(Failure::invalid(
                "`n` is 0; at least 1 sample is needed".into(),
            ));
        }
        // Validate every argument before answering a size query, as chordal sampling does:
        // an invalid tolerance is INVALID_ARGUMENT whatever the capacity.
        crate::paths::sampling::check_arc_tolerance(arc_tolerance)?;
        if n > capacity {
            return Err(buf.too_small(n, "samples"));
        }
    }
    let mut scratch: Vec<StrakeSample> = Vec::new();
    if let Rule::EvenT(n) | Rule::EvenArc(n) = rule {
        scratch.try_reserve_exact(n).map_err(|_| {
            Failure::invalid(format!("cannot allocate scratch space for {n} samples"))
        })?;
    }
    let mut alloc_failed = false;
    let mut sink = SinkFn(|index: usize, s: &PathSample| {
        if index < capacity && !alloc_failed {
            if scratch.len() == scratch.capacity() && scratch.try_reserve(1).is_err() {
                alloc_failed = true;
                return;
            }
            scratch.push(StrakeSample::new(s));
        }
    });
    let needed = match rule {
        Rule::EvenT(n) => sample_even_t(&pair, n, arc_tolerance, &mut sink)?,
        Rule::EvenArc(n) => sample_even_arc(&pair, n, arc_tolerance, &mut sink)?,
        Rule::Chordal(opts) => sample_chordal(&pair, &opts, &mut sink)?,
        Rule::ChordalCentre(opts, setup) => sample_chordal_centre(&pair, &opts, &setup, &mut sink)?,
    };
    if alloc_failed {
        return Err(Failure::invalid(format!(
            "cannot allocate scratch space for {needed} samples"
        )));
    }
    if needed > capacity {
        return Err(buf.too_small(needed, "samples"));
    }
    buf.deliver(&scratch, "samples")
}

/// Samples `curve` on `surface` at `n` evenly spaced curve parameters from the start to the
/// end of the curve's domain, both included (`n` = 1 gives the start), each with its arc length
/// from the start (adaptive Gauss-Legendre quadrature to the relative tolerance
/// `arc_tolerance`, e.g. 1e-10).
///
/// Buffer: `buf` with room for `capacity` samples (NULL when `capacity` is 0); on success
/// `*count` = `n` samples are written. When `capacity` < `n`, returns
/// `STRAKE_STATUS_BUFFER_TOO_SMALL` with `*count` = `n` and nothing written to `buf`, without
/// evaluating anything.
///
/// Errors: NULL_POINTER (`surface`, `curve`, `count`; `buf` when `capacity` > 0);
/// INVALID_ARGUMENT (`n` of 0, `arc_tolerance` not positive and finite, `capacity` too
/// large); BUFFER_TOO_SMALL; and every error of `strake_frame_at` at a sample, the message
/// naming the sample's index and t. On any failure but BUFFER_TOO_SMALL nothing is written,
/// `*count` included. Thread-safe.
///
/// # Safety
/// `surface`, `curve` NULL or live handles; `buf` NULL or room for `capacity` samples; `count`
/// NULL or a writable size_t.
#[unsafe(no_mangle)]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn strake_sample_even_t(
    surface: *const StrakeSurface,
    curve: *const StrakeCurve,
    n: usize,
    arc_tolerance: f64,
    buf: *mut StrakeSample,
    capacity: usize,
    count: *mut usize,
) -> StrakeStatus {
    guard("strake_sample_even_t", || {
        // SAFETY: the caller passes live handles or NULL.
        let (s, c) = unsafe { (input(surface, "surface")?, input(curve, "curve")?) };
        let out = out_buffer(buf, capacity, count)?;
        sample(s, c, Rule::EvenT(n), arc_tolerance, out)
    })
}

/// Samples `curve` on `surface` at `n` points evenly spaced in arc length from the start to the
/// end of the curve, both included (`n` = 1 gives the start): sample i lies at arc length
/// i L/(n - 1), L the curve's length, to the relative tolerance `arc_tolerance` (e.g. 1e-10) of
/// L (quadrature, then Newton's method on s(t) for each sample).
///
/// Buffer, errors and safety as for `strake_sample_even_t`, plus NOT_CONVERGED when the
/// arc-length inversion fails (it does not on a curve whose speed stays positive).
///
/// # Safety
/// As for `strake_sample_even_t`.
#[unsafe(no_mangle)]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn strake_sample_even_arc(
    surface: *const StrakeSurface,
    curve: *const StrakeCurve,
    n: usize,
    arc_tolerance: f64,
    buf: *mut StrakeSample,
    capacity: usize,
    count: *mut usize,
) -> StrakeStatus {
    guard("strake_sample_even_arc", || {
        // SAFETY: the caller passes live handles or NULL.
        let (s, c) = unsafe { (input(surface, "surface")?, input(curve, "curve")?) };
        let out = out_buffer(buf, capacity, count)?;
        sample(s, c, Rule::EvenArc(n), arc_tolerance, out)
    })
}

/// Samples `curve` on `surface` adaptively: the chord between consecutive samples stays within
/// `chord_tolerance` (host length unit) of the curve, and their arc-length spacing within
/// `max_step` (0 or INFINITY: no limit). Steps follow the space curvature
/// k = sqrt(kn^2 + kg^2): a chord of length L on radius 1/k deviates by
/// 1/k - sqrt(1/k^2 - L^2/4), so L <= 2 sqrt(2 d/k - d^2) for tolerance d; each step is then
/// verified by measuring the deviation at its quarters and shrunk if needed. The first sample
/// is at the start of the curve's domain, the last at its end; arc lengths to the relative
/// tolerance `arc_tolerance` (e.g. 1e-10).
///
/// Buffer: as for `strake_sample_even_t`, except that the number of samples is known only
/// after sampling: when it exceeds `capacity`, the whole path is still sampled to count them,
/// `*count` receives the number needed, nothing is written to `buf`, and the call returns
/// `STRAKE_STATUS_BUFFER_TOO_SMALL`. The result is deterministic: calling again with
/// `capacity` >= `*count` writes exactly those samples. (A size query with `buf` = NULL,
/// `capacity` = 0 costs one full sampling.)
///
/// Errors: NULL_POINTER; INVALID_ARGUMENT (`chord_tolerance` not positive and finite,
/// `max_step` negative or NaN, `arc_tolerance` not positive and finite, a tolerance below
/// round-off so that steps shrink below 1e-13 of the domain, more than 10 million samples
/// needed: the message names the sample that could not be placed); BUFFER_TOO_SMALL; and every
/// error of `strake_frame_at` at a sample, naming its index and t. Thread-safe.
///
/// # Safety
/// As for `strake_sample_even_t`.
#[unsafe(no_mangle)]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn strake_sample_chordal(
    surface: *const StrakeSurface,
    curve: *const StrakeCurve,
    chord_tolerance: f64,
    max_step: f64,
    arc_tolerance: f64,
    buf: *mut StrakeSample,
    capacity: usize,
    count: *mut usize,
) -> StrakeStatus {
    guard("strake_sample_chordal", || {
        // SAFETY: the caller passes live handles or NULL.
        let (s, c) = unsafe { (input(surface, "surface")?, input(curve, "curve")?) };
        let out = out_buffer(buf, capacity, count)?;
        let mut opts = ChordalOptions::new(
            chord_tolerance,
            if max_step == 0.0 {
                f64::INFINITY
            } else {
                max_step
            },
        );
        opts.arc_tolerance = arc_tolerance;
        sample(s, c, Rule::Chordal(opts), arc_tolerance, out)
    })
}

/// `strake_sample_chordal` with the chord error judged on the tool-centre path: the chord
/// between the cutter-location points of consecutive samples stays within `chord_tolerance`
/// of the path the centre of `cutter` runs (on `tool_side`, axis at `angles`; see
/// `strake_centre_point_at`), since that is the path a controller interpolates. Steps follow
/// the centre path's curvature kc (exact, from third-order derivatives) with the same chord
/// rule, converted to t by the centre path's speed, and are verified on the centre points at
/// the step's quarters. The samples are those of the contact path (frame, contact-path arc
/// length), as from `strake_sample_chordal`; `max_step` is in contact-path arc length. Their
/// centre points follow from `strake_centre_path_at` at the samples' `frame.curve_param`.
/// For a ball of radius r inside a cylinder of radius rho the centre path is a circle of
/// radius rho - r: fewer samples than on the contact path; outside, radius rho + r: more.
///
/// Buffer: as for `strake_sample_chordal`. Errors: those of `strake_sample_chordal`;
/// NULL_POINTER (`cutter`, `angles`); INVALID_ARGUMENT (`tool_side`, the cutter or an angle,
/// named); ORDER_UNAVAILABLE (a surface or curve without third derivatives, e.g. a callback of
/// `strake_surface_from_callback`); CENTRE_PATH_FOLDS (the centre path folds back at a sample,
/// named). Checked only at samples and the step's quarters: a fold between them is not seen.
/// Thread-safe.
///
/// # Safety
/// As for `strake_sample_chordal`; `cutter` and `angles` NULL or valid.
#[unsafe(no_mangle)]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn strake_sample_chordal_centre(
    surface: *const StrakeSurface,
    curve: *const StrakeCurve,
    chord_tolerance: f64,
    max_step: f64,
    arc_tolerance: f64,
    tool_side: u32,
    cutter: *const StrakeCutter,
    angles: *const StrakeToolAngles,
    buf: *mut StrakeSample,
    capacity: usize,
    count: *mut usize,
) -> StrakeStatus {
    guard("strake_sample_chordal_centre", || {
        // SAFETY: the caller passes live handles and valid values, or NULL.
        let (s, c) = unsafe { (input(surface, "surface")?, input(curve, "curve")?) };
        let setup = ToolSetup {
            cutter: super::checks::cutter(unsafe { input(cutter, "cutter")? })?,
            side: super::checks::tool_side(tool_side)?,
            angles: super::checks::angles(unsafe { input(angles, "angles")? }),
        };
        let out = out_buffer(buf, capacity, count)?;
        let mut opts = ChordalOptions::new(
            chord_tolerance,
            if max_step == 0.0 {
                f64::INFINITY
            } else {
                max_step
            },
        );
        opts.arc_tolerance = arc_tolerance;
        sample(s, c, Rule::ChordalCentre(opts, setup), arc_tolerance, out)
    })
}

/// Computes the arc length of `curve` on `surface` between curve parameters `t0` and `t1`
/// (signed: negative when t1 < t0), in the host's length unit, to the relative tolerance
/// `rel_tol` (e.g. 1e-10): s = integral of |c'(t)| dt by adaptive Gauss-Legendre quadrature.
///
/// Returns `STRAKE_STATUS_OK` and writes `*out`; otherwise `*out` is untouched. Errors:
/// NULL_POINTER (`surface`, `curve`, `out`); NON_FINITE (`t0`, `t1`); INVALID_ARGUMENT
/// (`rel_tol` not positive and finite); OUT_OF_DOMAIN (a parameter outside the curve's domain);
/// and the evaluation errors of `strake_frame_at`. Thread-safe.
///
/// # Safety
/// `surface`, `curve` NULL or live handles; `out` NULL or a writable double.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_arc_length(
    surface: *const StrakeSurface,
    curve: *const StrakeCurve,
    t0: f64,
    t1: f64,
    rel_tol: f64,
    out: *mut f64,
) -> StrakeStatus {
    guard("strake_arc_length", || {
        // SAFETY: the caller passes live handles or NULL.
        let (s, c) = unsafe { (input(surface, "surface")?, input(curve, "curve")?) };
        let slot = output(out, "out")?;
        let (t0, t1) = (finite("t0", t0)?, finite("t1", t1)?);
        let pair = CurveOnSurface::new(s.source(), c.curve());
        let length = arc_length(&pair, t0, t1, rel_tol)?;
        // SAFETY: `out` checked non-null and aligned; the caller provides a writable double.
        unsafe { slot.as_ptr().write(MaybeUninit::new(length)) };
        Ok(())
    })
}

/// Computes the frames at the host's `count` curve parameters `ts`, each with its arc length
/// from the start of the curve's domain: `out[i].frame` is what `strake_frames_at` gives at
/// `ts[i]`, and `out[i].arc_length` = s(`ts[i]`) = integral of |c'(t)| dt from t_min to `ts[i]`
/// (adaptive Gauss-Legendre quadrature between consecutive parameters to the relative tolerance
/// `arc_tolerance`, e.g. 1e-10, summed; signed, so a parameter below the one before it gets a
/// smaller s). The result feeds `strake_path_extremes` and `strake_path_violations` directly:
/// a host with its own parameters evaluates the path once.
///
/// Returns `STRAKE_STATUS_OK` and writes `out[0..count]`; otherwise `out` is untouched and the
/// message names the failing sample's index and t. Errors: those of `strake_frames_at`, plus
/// INVALID_ARGUMENT (`arc_tolerance` not positive and finite) and NOT_CONVERGED (the
/// quadrature between two samples, which also names the sample). Thread-safe.
///
/// # Safety
/// `surface`, `curve` NULL or live handles; `ts` NULL or `count` doubles; `out` NULL or room
/// for `count` samples, not overlapping `ts`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_samples_at(
    surface: *const StrakeSurface,
    curve: *const StrakeCurve,
    ts: *const f64,
    count: usize,
    arc_tolerance: f64,
    out: *mut StrakeSample,
) -> StrakeStatus {
    guard("strake_samples_at", || {
        // SAFETY: the caller passes live handles or NULL, and `count` readable doubles at `ts`.
        let (s, c) = unsafe { (input(surface, "surface")?, input(curve, "curve")?) };
        let ts = unsafe { super::guard::input_slice(ts, count, "ts", "count")? };
        let slot = output(out, "out")?;
        super::guard::check_count::<StrakeSample>(count, "count")?;
        if !(arc_tolerance.is_finite() && arc_tolerance > 0.0) {
            return Err(Failure::invalid(format!(
                "`arc_tolerance` = {arc_tolerance} must be positive and finite (e.g. 1e-10)",
                arc_tolerance = crate::numfmt::Exact(arc_tolerance)
            )));
        }
        let pair = CurveOnSurface::new(s.source(), c.curve());
        let mut frames = super::evaluate::scratch(count)?;
        crate::engine::batch::frames_blocked_into(
            pair.surface(),
            pair.curve(),
            pair.scales(),
            count,
            &mut crate::paths::curve_on_surface::Hints::default(),
            |i| ts[i],
            &mut super::evaluate::IntoScratch::new(&mut frames),
        )?;
        let mut samples: Vec<StrakeSample> = Vec::new();
        samples.try_reserve_exact(count).map_err(|_| {
            Failure::invalid(format!("cannot allocate scratch space for {count} samples"))
        })?;
        // Every frame was evaluated, so every t lies inside the domain or within round-off of
        // an end, where it is taken as that end (as the frame reports it).
        let domain = pair.curve().domain();
        let (mut t_prev, mut s_prev) = (domain.lo, 0.0);
        for (index, (f, &t)) in frames.iter().zip(ts).enumerate() {
            let t = domain.snap("t", t)?;
            let ds = arc_length(&pair, t_prev, t, arc_tolerance)
                .map_err(|error| crate::paths::curve_on_surface::SampleError { index, t, error })?;
            s_prev += ds;
            t_prev = t;
            samples.push(StrakeSample {
                // SAFETY: frames_blocked_into succeeded, so every element was written.
                frame: unsafe { f.assume_init_read() },
                arc_length: s_prev,
            });
        }
        // SAFETY: `out` checked non-null and aligned, room for `count` samples is the caller's
        // contract; `samples` holds `count` samples and is our own buffer.
        unsafe {
            std::ptr::copy_nonoverlapping(
                samples.as_ptr(),
                slot.as_ptr().cast::<StrakeSample>(),
                count,
            )
        };
        Ok(())
    })
}
