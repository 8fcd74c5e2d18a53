//! The path the machine runs, for C hosts: the rates of change of the invariants along a
//! contact path, the tool-centre (cutter-location) path of a cutter at lead and tilt, and the
//! feed judged on that path (acceleration, jerk with the curvature's rate of change, the tool
//! axis's angular speed). One sample or a whole path per call.
//!
//! These need the surface's and the curve's derivatives beyond second order: native NURBS
//! surfaces and curves give them; a host surface gives them only when created by
//! `strake_surface_from_high_callback` (a surface from `strake_surface_from_callback` or
//! `strake_surface_from_batch_callback`, and a curve from `strake_curve_from_callback`, give
//! second order, and these calls then return `STRAKE_STATUS_ORDER_UNAVAILABLE` naming the
//! source and both orders; never a wrong answer).

use super::checks::{angles, cutter, tool_side};
use super::curve::StrakeCurve;
use super::guard::{Failure, check_count, guard, input, input_slice, output};
use super::status::StrakeStatus;
use super::surface::StrakeSurface;
use super::types::{
    StrakeCentreFeed, StrakeCentreFeedLimits, StrakeCentrePoint, StrakeCutter, StrakeFrame,
    StrakeInvariantRates, StrakeToolAngles,
};
use crate::error::StrakeError;
use crate::geometry::frame::DarbouxFrame;
use crate::geometry::rates::InvariantRates;
use crate::paths::curve_on_surface::{CurveOnSurface, Hints, SampleError};
use crate::toolpath::{
    CentreFeed, CentreFeedLimits, CentrePoint, ToolSetup, centre_feed_path, centre_path_at,
};
use std::mem::MaybeUninit;
use std::ptr::NonNull;

/// Writes `items` to the caller's array `out` (checked non-null, aligned and sized for
/// `items.len()` elements by `output` and `check_count`).
fn publish<T>(out: NonNull<MaybeUninit<T>>, items: &[T]) {
    // SAFETY: `out` was checked non-null and aligned, the caller provides room for the count
    // the items were computed for, and `items` is our own buffer.
    unsafe { std::ptr::copy_nonoverlapping(items.as_ptr(), out.as_ptr().cast::<T>(), items.len()) };
}

/// A scratch buffer of `count` copies of `fill` (one allocation per call, never per point).
fn scratch_filled<T: Clone>(count: usize, what: &str, fill: T) -> Result<Vec<T>, Failure> {
    let mut v = Vec::new();
    v.try_reserve_exact(count).map_err(|_| {
        Failure::invalid(format!("cannot allocate scratch space for {count} {what}"))
    })?;
    v.resize(count, fill);
    Ok(v)
}

/// A scratch buffer of `count` default elements.
fn scratch<T: Default + Clone>(count: usize, what: &str) -> Result<Vec<T>, Failure> {
    scratch_filled(count, what, T::default())
}

/// The tool setup from the C arguments (the cutter's dimensions and the angles checked).
///
/// # Safety
/// `cutter` and `angles` NULL or valid.
unsafe fn setup(
    side: u32,
    cutter_ptr: *const StrakeCutter,
    angles_ptr: *const StrakeToolAngles,
) -> Result<ToolSetup, Failure> {
    // SAFETY: forwarded from the caller.
    let c = cutter(unsafe { input(cutter_ptr, "cutter")? })?;
    let a = angles(unsafe { input(angles_ptr, "angles")? });
    let s = ToolSetup {
        cutter: c,
        side: tool_side(side)?,
        angles: a,
    };
    s.validate()?;
    Ok(s)
}

/// The derivative order argument of the centre-path calls: 3 or 4.
fn centre_order(order: u32) -> Result<usize, Failure> {
    match order {
        3 | 4 => Ok(order as usize),
        other => Err(Failure::invalid(format!(
            "`order` = {other}; it must be 3 (position, tangent, curvature) or 4 (also the \
             curvature's rate of change, the torsion and the jerk figure)"
        ))),
    }
}

/// The feed limits for a `StrakeCentreFeedLimits` (0 for `max_jerk` or `max_angular_speed`:
/// no such limit).
fn centre_limits(l: &StrakeCentreFeedLimits) -> Result<CentreFeedLimits, Failure> {
    let optional = |name: &str, x: f64| -> Result<Option<f64>, Failure> {
        if x == 0.0 {
            Ok(None)
        } else if x.is_finite() && x > 0.0 {
            Ok(Some(x))
        } else {
            Err(Failure::invalid(format!(
                "limits->{name} = {} must be positive and finite, or 0 for no such limit",
                crate::numfmt::Exact(x)
            )))
        }
    };
    let limits = CentreFeedLimits {
        feed: l.feed,
        max_acceleration: l.max_acceleration,
        max_jerk: optional("max_jerk", l.max_jerk)?,
        max_angular_speed: optional("max_angular_speed", l.max_angular_speed)?,
    };
    limits.validate().map_err(|e| match e {
        StrakeError::InvalidArgument(m) => Failure::invalid(format!("limits->{m}")),
        e => Failure::from(e),
    })?;
    Ok(limits)
}

/// The rates of change along arc length of the invariants at curve parameter `t` of `curve`
/// on `surface`: d kn/ds, d kg/ds, d tg/ds and d kappa/ds (1/length^2; s the arc length of
/// the contact path, increasing with t), with the frame there.
///
/// Exact from third-order derivatives of the surface and the curve (the frame carried as a
/// Taylor series in t, differentiated; checked against a symbolic differentiation and closed
/// forms). `*frame_out` is the frame of `strake_frame_at` at `t`, bit for bit.
///
/// Returns `STRAKE_STATUS_OK` and writes `*frame_out` and `*rates_out`; otherwise both are
/// untouched. Errors: those of `strake_frame_at`; NULL_POINTER (`frame_out`, `rates_out`);
/// ORDER_UNAVAILABLE (a surface or curve without third derivatives: a callback from
/// `strake_surface_from_callback`, `strake_surface_from_batch_callback` or
/// `strake_curve_from_callback`; the message names the source and the orders); NON_FINITE (a
/// third derivative, named, or a rate that overflows). Thread-safe.
///
/// # Safety
/// `surface` and `curve` NULL or live handles; `frame_out` and `rates_out` NULL or writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_invariant_rates_at(
    surface: *const StrakeSurface,
    curve: *const StrakeCurve,
    t: f64,
    frame_out: *mut StrakeFrame,
    rates_out: *mut StrakeInvariantRates,
) -> StrakeStatus {
    guard("strake_invariant_rates_at", || {
        // SAFETY: the caller passes live handles or NULL.
        let (s, c) = unsafe { (input(surface, "surface")?, input(curve, "curve")?) };
        let fslot = output(frame_out, "frame_out")?;
        let rslot = output(rates_out, "rates_out")?;
        let (f, r) = CurveOnSurface::new(s.source(), c.curve())
            .frame_with_rates(t, &mut Hints::default())?;
        publish(fslot, &[StrakeFrame::new(t, &f)]);
        publish(rslot, &[StrakeInvariantRates::from(&r)]);
        Ok(())
    })
}

/// `strake_invariant_rates_at` at each of the `count` curve parameters `ts` (a whole path in
/// one call): `frames_out[i]` (the frame of `strake_frames_at`, bit for bit) and
/// `rates_out[i]` at `ts[i]`.
///
/// Returns `STRAKE_STATUS_OK` and writes both arrays; otherwise both are untouched and the
/// message names the failing sample's index and t. Errors: those of
/// `strake_invariant_rates_at`, plus NULL_POINTER (`ts`) and INVALID_ARGUMENT (`count` of 0
/// or too large).
///
/// # Safety
/// `ts` NULL or `count` doubles; `frames_out` and `rates_out` NULL or room for `count`
/// elements each, not overlapping `ts` or each other; handles as in
/// `strake_invariant_rates_at`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_invariant_rates_path(
    surface: *const StrakeSurface,
    curve: *const StrakeCurve,
    ts: *const f64,
    count: usize,
    frames_out: *mut StrakeFrame,
    rates_out: *mut StrakeInvariantRates,
) -> StrakeStatus {
    guard("strake_invariant_rates_path", || {
        // SAFETY: the caller passes live handles or NULL, and `count` doubles at `ts`.
        let (s, c) = unsafe { (input(surface, "surface")?, input(curve, "curve")?) };
        let ts = unsafe { input_slice(ts, count, "ts", "count")? };
        let fslot = output(frames_out, "frames_out")?;
        let rslot = output(rates_out, "rates_out")?;
        check_count::<StrakeFrame>(count, "count")?;
        let path = CurveOnSurface::new(s.source(), c.curve());
        // The frame at the first sample fills the scratch (a frame has no neutral value); a
        // failure there is that of the first sample, as the batch call would report it.
        let first = path
            .frame(ts[0], &mut Hints::default())
            .map_err(|error| SampleError {
                index: 0,
                t: ts[0],
                error,
            })?;
        let mut frames: Vec<DarbouxFrame> = scratch_filled(count, "frames", first)?;
        let mut rates: Vec<InvariantRates> = scratch(count, "rates")?;
        path.frames_with_rates_at(ts, &mut frames, &mut rates)?;
        let cf: Vec<StrakeFrame> = ts
            .iter()
            .zip(&frames)
            .map(|(&t, f)| StrakeFrame::new(t, f))
            .collect();
        let cr: Vec<StrakeInvariantRates> = rates.iter().map(StrakeInvariantRates::from).collect();
        publish(fslot, &cf);
        publish(rslot, &cr);
        Ok(())
    })
}

/// The tool-centre path at curve parameter `t` of the contact path `curve` on `surface`, for
/// `cutter` on `tool_side` with its axis at `angles` (lead and tilt in the tool-side frame,
/// see `StrakeToolAngles`), from derivatives of `order` 3 or 4.
///
/// Geometry: every cutter is a corner circle of radius r whose centre lies at R from the axis
/// (see `StrakeCutter`). At the contact point c with tool-side normal n_t and axis a, the
/// cutter-location point is CL = c + r n_t + R e, e the unit component of n_t across a (with
/// the axis along n_t a flat or toroidal cutter stands on its flat bottom and CL = c + r n_t);
/// the tip is CL - r a. With lead and tilt fixed in the frame, dCL/ds = T + w x d (d = CL - c,
/// w = tg T - kn B + kg N the Darboux vector), so `speed_ratio` = |dCL/ds|; the curvature
/// (order 3), its rate of change along the centre path and the torsion (order 4) are exact
/// derivatives of CL as a Taylor series in t (do Carmo 1-5: kc = |CL' x CL''| / |CL'|^3). For a
/// ball of radius r inside a cylinder of radius rho the centre path is a circle or helix on
/// radius rho - r.
///
/// Returns `STRAKE_STATUS_OK` and writes `*out`; otherwise `*out` is untouched. Errors: those
/// of `strake_frame_at`; NULL_POINTER (`cutter`, `angles`, `out`); INVALID_ARGUMENT
/// (`tool_side`, the cutter or an angle, named; `order` not 3 or 4); ORDER_UNAVAILABLE (a
/// source without derivatives of `order`, named); CENTRE_PATH_FOLDS (the centre path folds
/// back: the component of dCL/ds along T is at or below 1e-6, a cutter larger than a concave
/// radius along the path); NON_FINITE (a result that overflows). Thread-safe.
///
/// # Safety
/// Handles NULL or live; `cutter` and `angles` NULL or valid; `out` NULL or writable.
#[unsafe(no_mangle)]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn strake_centre_point_at(
    surface: *const StrakeSurface,
    curve: *const StrakeCurve,
    t: f64,
    tool_side: u32,
    cutter: *const StrakeCutter,
    angles: *const StrakeToolAngles,
    order: u32,
    out: *mut StrakeCentrePoint,
) -> StrakeStatus {
    guard("strake_centre_point_at", || {
        // SAFETY: the caller passes live handles and valid values, or NULL.
        let (s, c) = unsafe { (input(surface, "surface")?, input(curve, "curve")?) };
        let setup = unsafe { self::setup(tool_side, cutter, angles)? };
        let slot = output(out, "out")?;
        let order = centre_order(order)?;
        let mut p = [CentrePoint::default()];
        let path = CurveOnSurface::new(s.source(), c.curve());
        centre_path_at(&path, &[t], &setup, order, &mut p).map_err(|e| {
            // One sample: the error itself, with t (the index 0 would say nothing).
            Failure::from(e.error)
        })?;
        publish(slot, &[StrakeCentrePoint::new(t, &p[0], order)]);
        Ok(())
    })
}

/// `strake_centre_point_at` at each of the `count` curve parameters `ts`: `out[i]` at
/// `ts[i]`. Where the centre path folds back, the call goes on through the path and fails
/// with CENTRE_PATH_FOLDS naming the first folding sample and how many samples fold.
///
/// Returns `STRAKE_STATUS_OK` and writes `out[0..count]`; otherwise `out` is untouched and the
/// message names the failing sample's index and t. Errors: those of `strake_centre_point_at`,
/// plus NULL_POINTER (`ts`) and INVALID_ARGUMENT (`count` of 0 or too large).
///
/// # Safety
/// `ts` NULL or `count` doubles; `out` NULL or room for `count` points, not overlapping `ts`;
/// otherwise as for `strake_centre_point_at`.
#[unsafe(no_mangle)]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn strake_centre_path_at(
    surface: *const StrakeSurface,
    curve: *const StrakeCurve,
    ts: *const f64,
    count: usize,
    tool_side: u32,
    cutter: *const StrakeCutter,
    angles: *const StrakeToolAngles,
    order: u32,
    out: *mut StrakeCentrePoint,
) -> StrakeStatus {
    guard("strake_centre_path_at", || {
        // SAFETY: the caller passes live handles and valid values, or NULL.
        let (s, c) = unsafe { (input(surface, "surface")?, input(curve, "curve")?) };
        let ts = unsafe { input_slice(ts, count, "ts", "count")? };
        let setup = unsafe { self::setup(tool_side, cutter, angles)? };
        let slot = output(out, "out")?;
        check_count::<StrakeCentrePoint>(count, "count")?;
        let order = centre_order(order)?;
        let mut points: Vec<CentrePoint> = scratch(count, "centre points")?;
        let path = CurveOnSurface::new(s.source(), c.curve());
        centre_path_at(&path, ts, &setup, order, &mut points)?;
        let cp: Vec<StrakeCentrePoint> = ts
            .iter()
            .zip(&points)
            .map(|(&t, p)| StrakeCentrePoint::new(t, p, order))
            .collect();
        publish(slot, &cp);
        Ok(())
    })
}

/// The feed allowed at the centre-path sample `point` (from `strake_centre_point_at`) under
/// `limits`: the feed of the cutter-location point at constant speed v with
///
/// - acceleration v^2 kc <= a_max: v <= sqrt(a_max / kc);
/// - jerk v^3 |d^3 CL / d s_c^3| <= j_max with |d^3 CL / d s_c^3| = sqrt(kc'^2 + kc^4 +
///   kc^2 tc^2) (Frenet, do Carmo 1-5: the jerk rule including the curvature's rate of change);
///   needs a point of order 4;
/// - the axis turning at `axis_rate` radians per unit length: v axis_rate <= w_max.
///
/// Local rules at a sample: the look-ahead of the host or controller must still plan speed
/// changes between samples, and the rotary axes of a machine may turn faster than the tool
/// axis near a kinematic singularity. One time unit throughout (feed per second with
/// acceleration per second squared, or all per minute).
///
/// Returns `STRAKE_STATUS_OK` and writes `*out`; otherwise `*out` is untouched. Errors:
/// NULL_POINTER (`point`, `limits`, `out`); NON_FINITE (a field of `point`, named);
/// INVALID_ARGUMENT (a field of `point` out of range, named; a limit that is not positive and
/// finite, or for `max_jerk` and `max_angular_speed` not 0 either, named); ORDER_UNAVAILABLE
/// (a jerk limit with a point of order 3). Thread-safe.
///
/// # Safety
/// `point` and `limits` NULL or valid; `out` NULL or writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_centre_feed(
    point: *const StrakeCentrePoint,
    limits: *const StrakeCentreFeedLimits,
    out: *mut StrakeCentreFeed,
) -> StrakeStatus {
    guard("strake_centre_feed", || {
        // SAFETY: the caller passes valid values or NULL.
        let p = unsafe { input(point, "point")? };
        let l = centre_limits(unsafe { input(limits, "limits")? })?;
        let slot = output(out, "out")?;
        let rp = p.to_rust()?;
        let mut f = [CentreFeed::default()];
        centre_feed_path(&[rp], &[p.curve_param], &l, &mut f)
            .map_err(|e| Failure::from(e.error))?;
        publish(slot, &[StrakeCentreFeed::from(&f[0])]);
        Ok(())
    })
}

/// `strake_centre_feed` at each of the `count` centre-path samples `points` (from
/// `strake_centre_path_at`): `out[i]` for `points[i]`.
///
/// Returns `STRAKE_STATUS_OK` and writes `out[0..count]`; otherwise `out` is untouched and the
/// message names the failing sample's index (and its `curve_param`). Errors: those of
/// `strake_centre_feed`, plus INVALID_ARGUMENT (`count` of 0 or too large).
///
/// # Safety
/// `points` NULL or `count` valid points; `limits` NULL or valid; `out` NULL or room for
/// `count` results, not overlapping `points`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_centre_feed_path(
    points: *const StrakeCentrePoint,
    count: usize,
    limits: *const StrakeCentreFeedLimits,
    out: *mut StrakeCentreFeed,
) -> StrakeStatus {
    guard("strake_centre_feed_path", || {
        // SAFETY: the caller passes valid values or NULL.
        let ps = unsafe { input_slice(points, count, "points", "count")? };
        let l = centre_limits(unsafe { input(limits, "limits")? })?;
        let slot = output(out, "out")?;
        check_count::<StrakeCentreFeed>(count, "count")?;
        let mut rust = Vec::new();
        rust.try_reserve_exact(count).map_err(|_| {
            Failure::invalid(format!("cannot allocate scratch space for {count} points"))
        })?;
        for (index, p) in ps.iter().enumerate() {
            rust.push(p.to_rust().map_err(|e| {
                Failure::from(StrakeError::AtSample {
                    index,
                    error: Box::new(e),
                })
            })?);
        }
        let ts: Vec<f64> = ps.iter().map(|p| p.curve_param).collect();
        let mut feeds: Vec<CentreFeed> = scratch(count, "feeds")?;
        centre_feed_path(&rust, &ts, &l, &mut feeds)?;
        let cf: Vec<StrakeCentreFeed> = feeds.iter().map(StrakeCentreFeed::from).collect();
        publish(slot, &cf);
        Ok(())
    })
}
