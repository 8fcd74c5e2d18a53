//! The opaque curve handle: a 2D NURBS curve in the surface's parameter plane, or a curve
//! evaluated by a host callback. Like surfaces, the handle holds a `Box<dyn UvCurve>`, so a new
//! kind of curve needs only a new constructor.

use super::guard::{Failure, guard, input_slice, output};
use super::status::StrakeStatus;
use super::surface::finite;
use super::types::{StrakeCurveHighJet, StrakeCurveJet};
use crate::curve::UvCurve;
use crate::error::{Result, StrakeError};
use crate::geometry::jet::{CurveJet, CurvePartials, Interval};
use crate::nurbs::{NurbsCurve, SpanHint};
use std::ffi::c_void;

/// A host curve evaluator: t -> (u(t), v(t)) in the surface's parameter plane.
///
/// Called with the host's `user_data`, a parameter t inside the domain given at creation and a
/// jet that strake has set to zero; fill u, v and their first and second derivatives with
/// respect to t and return 0, or return a non-zero code to report a failure (strake returns
/// `STRAKE_STATUS_CURVE_CALLBACK_FAILED` and passes the code back). Entries must be finite.
/// The same rules on threads and unwinding apply as for `StrakeSurfaceFn`.
///
/// Such a curve gives second order only: the calls that need the curve's third derivatives
/// (`strake_invariant_rates_at`, `strake_invariant_rates_path`, `strake_centre_point_at`,
/// `strake_centre_path_at`, `strake_sample_chordal_centre`) return
/// `STRAKE_STATUS_ORDER_UNAVAILABLE` with it, naming the order needed; use
/// `strake_curve_from_high_callback` for them.
pub type StrakeCurveFn =
    Option<unsafe extern "C" fn(user_data: *mut c_void, t: f64, out: *mut StrakeCurveJet) -> i32>;

/// An opaque curve in a surface's parameter plane: created by `strake_curve_new_nurbs`,
/// `strake_curve_from_callback`, `strake_curve_through_uv_points`,
/// `strake_curve_through_space_points` or `strake_curve_project_nurbs`, released by
/// `strake_curve_free`. Immutable after creation, so
/// one handle may be evaluated from many threads at once, and used with any surface.
pub struct StrakeCurve {
    curve: Box<dyn UvCurve>,
}

impl StrakeCurve {
    /// Wraps any curve of the Rust API.
    pub fn new(curve: Box<dyn UvCurve>) -> Self {
        StrakeCurve { curve }
    }

    /// The curve inside.
    pub fn curve(&self) -> &dyn UvCurve {
        &*self.curve
    }
}

pub(crate) fn publish(
    curve: StrakeCurve,
    out: *mut *mut StrakeCurve,
) -> std::result::Result<(), Failure> {
    let slot = output(out, "out")?;
    // SAFETY: `out` was checked non-null and aligned; the caller provides a writable slot.
    unsafe {
        slot.as_ptr()
            .write(std::mem::MaybeUninit::new(Box::into_raw(Box::new(curve))))
    };
    Ok(())
}

/// Creates a NURBS curve of degree `degree` in the surface's parameter plane.
///
/// - `knots`: `knot_count` non-decreasing finite knots; `knot_count` must be
///   `point_count + degree + 1`. Clamped and unclamped vectors are both accepted; the curve's
///   domain is `[knots[degree], knots[point_count]]`.
/// - `uv_points`: `2 * point_count` values, u then v for each control point.
/// - `weights`: NULL for a non-rational curve, else `point_count` positive finite weights.
///
/// The data are copied; the arrays may be freed after the call. Returns `STRAKE_STATUS_OK` and
/// writes a new handle to `*out` (free it with `strake_curve_free`); otherwise `*out` is left
/// untouched. Errors: NULL_POINTER (`knots`, `uv_points`, `out`), INVALID_ARGUMENT (a count of 0
/// or too large), INVALID_DEGREE (degree 0 or above 24, too few points, knot count mismatch),
/// INVALID_KNOTS (non-finite or decreasing knot, multiplicity above degree + 1, empty domain),
/// INVALID_CONTROL_POINT (non-finite coordinate), INVALID_WEIGHT (weight not positive and
/// finite). The message names the offending index and value.
///
/// # Safety
/// Each pointer must be NULL or point to the number of valid elements stated above; `out` must
/// be NULL or point to a writable `StrakeCurve *`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_curve_new_nurbs(
    degree: u32,
    knots: *const f64,
    knot_count: usize,
    uv_points: *const f64,
    point_count: usize,
    weights: *const f64,
    out: *mut *mut StrakeCurve,
) -> StrakeStatus {
    guard("strake_curve_new_nurbs", || {
        output(out, "out")?;
        // SAFETY (all three slices): the caller guarantees the element counts documented above.
        let knots = unsafe { input_slice(knots, knot_count, "knots", "knot_count")? };
        let points = unsafe {
            input_slice(
                uv_points.cast::<[f64; 2]>(),
                point_count,
                "uv_points",
                "point_count",
            )?
        };
        let weights = if weights.is_null() {
            None
        } else {
            Some(unsafe { input_slice(weights, point_count, "weights", "point_count")? })
        };
        let curve = NurbsCurve::<2>::new(degree as usize, knots, points, weights)?;
        publish(StrakeCurve::new(Box::new(curve)), out)
    })
}

/// A curve evaluated by a host callback.
struct CallbackCurve {
    f: unsafe extern "C" fn(*mut c_void, f64, *mut StrakeCurveJet) -> i32,
    user_data: *mut c_void,
    domain: Interval,
}

// SAFETY: strake never dereferences `user_data`; the contract of `StrakeCurveFn` puts thread
// safety of the callback and its `user_data` on the host.
unsafe impl Send for CallbackCurve {}
// SAFETY: as above; the struct is never mutated after creation.
unsafe impl Sync for CallbackCurve {}

impl UvCurve for CallbackCurve {
    fn domain(&self) -> Interval {
        self.domain
    }
    #[inline]
    fn jet_in_domain(&self, t: f64, _hint: &mut SpanHint) -> Result<CurveJet> {
        let mut jet = StrakeCurveJet::default();
        // SAFETY: the host promised a callback with this signature; `jet` is valid and zeroed.
        let code = unsafe { (self.f)(self.user_data, t, &mut jet) };
        if code != 0 {
            return Err(super::message::callback_error("curve", code));
        }
        Ok(CurveJet::from(&jet))
    }
}

/// Creates a curve evaluated by the host's callback `f` over [t_min, t_max]. `user_data` is
/// handed back to `f` unchanged and may be NULL; strake calls `f` only with t in the domain.
///
/// Returns `STRAKE_STATUS_OK` and writes a new handle to `*out`; otherwise `*out` is left
/// untouched. Errors: NULL_POINTER (`f`, `out`), NON_FINITE (a domain end), INVALID_ARGUMENT
/// (an empty or reversed range).
///
/// # Safety
/// `f` must be NULL or a function with the signature of [`StrakeCurveFn`] honouring its
/// contract; `out` must be NULL or point to a writable `StrakeCurve *`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_curve_from_callback(
    f: StrakeCurveFn,
    user_data: *mut c_void,
    t_min: f64,
    t_max: f64,
    out: *mut *mut StrakeCurve,
) -> StrakeStatus {
    guard("strake_curve_from_callback", || {
        let f = f.ok_or_else(|| Failure::null("f"))?;
        output(out, "out")?;
        let domain = Interval::new("t", finite("t_min", t_min)?, finite("t_max", t_max)?)?;
        publish(
            StrakeCurve::new(Box::new(CallbackCurve {
                f,
                user_data,
                domain,
            })),
            out,
        )
    })
}

/// A host curve evaluator with derivatives to third or fourth order: t -> (u(t), v(t)).
///
/// Called with the host's `user_data`, a parameter t inside the domain given at creation, the
/// highest derivative order needed (0 to the `max_order` declared at creation: 0 u, v; 1 also
/// du, dv; 2 also ddu, ddv; 3 also d3u, d3v; 4 also d4u, d4v) and a jet that strake has set
/// to zero. Fill the entries up to `order` and return 0; any non-zero code reports a failure
/// (`STRAKE_STATUS_CURVE_CALLBACK_FAILED`, the code passed back). Entries must be finite (a NaN
/// or infinity gives `STRAKE_STATUS_NON_FINITE` naming the entry, e.g. "d3u"). The same rules
/// on threads and unwinding apply as for `StrakeSurfaceFn`.
pub type StrakeCurveHighFn = Option<
    unsafe extern "C" fn(
        user_data: *mut c_void,
        t: f64,
        order: i32,
        out: *mut StrakeCurveHighJet,
    ) -> i32,
>;

type CurveHighFn = unsafe extern "C" fn(*mut c_void, f64, i32, *mut StrakeCurveHighJet) -> i32;

/// A curve evaluated by a host callback with derivatives to `max_order`.
struct HighCallbackCurve {
    f: CurveHighFn,
    user_data: *mut c_void,
    max_order: usize,
    domain: Interval,
}

// SAFETY: strake never dereferences `user_data`; the contract of `StrakeCurveHighFn` puts
// thread safety of the callback and its `user_data` on the host.
unsafe impl Send for HighCallbackCurve {}
// SAFETY: as above; the struct is never mutated after creation.
unsafe impl Sync for HighCallbackCurve {}

impl HighCallbackCurve {
    fn call(&self, t: f64, order: usize) -> Result<StrakeCurveHighJet> {
        let mut jet = StrakeCurveHighJet::default();
        // SAFETY: the host promised a callback with this signature; `jet` is a valid, zeroed,
        // exclusively borrowed jet for the duration of the call.
        let code = unsafe { (self.f)(self.user_data, t, order as i32, &mut jet) };
        if code != 0 {
            return Err(super::message::callback_error("curve", code));
        }
        Ok(jet)
    }
}

impl UvCurve for HighCallbackCurve {
    fn domain(&self) -> Interval {
        self.domain
    }
    #[inline]
    fn jet_in_domain(&self, t: f64, _hint: &mut SpanHint) -> Result<CurveJet> {
        Ok(self.call(t, 2)?.jet())
    }
    fn max_order(&self) -> usize {
        self.max_order
    }
    fn partials_in_domain(
        &self,
        t: f64,
        order: usize,
        _hint: &mut SpanHint,
    ) -> Result<CurvePartials> {
        if order > self.max_order {
            return Err(StrakeError::OrderUnavailable {
                which: "curve",
                needed: order,
                available: self.max_order,
            });
        }
        Ok(self.call(t, order)?.partials(order))
    }
}

/// Creates a curve evaluated by the host's callback `f` over [t_min, t_max] that gives
/// derivatives up to `max_order` (3 or 4): as `strake_curve_from_callback` (same domain and
/// `user_data` rules; frames, sampling and every second-order call are the same, `f` asked for
/// order 2), and in addition the calls that need the curve's higher derivatives work:
/// `strake_invariant_rates_at`, `strake_invariant_rates_path` and the tool-centre path's calls
/// at order 3 (`strake_centre_point_at`, `strake_centre_path_at`,
/// `strake_sample_chordal_centre`), which ask `f` for order 3, and the tool-centre path at
/// order 4 (the curvature's rate of change, torsion and jerk figure), which asks for order 4.
/// Asked for more than `max_order`, those calls return `STRAKE_STATUS_ORDER_UNAVAILABLE`
/// naming the curve and both orders; `f` is never called with `order` above `max_order`.
///
/// Returns `STRAKE_STATUS_OK` and writes a new handle to `*out` (free it with
/// `strake_curve_free`); otherwise `*out` is left untouched. Errors: NULL_POINTER (`f`,
/// `out`), NON_FINITE (a domain end), INVALID_ARGUMENT (`max_order` not 3 or 4, an empty or
/// reversed range).
///
/// # Safety
/// `f` must be NULL or a function with the signature of [`StrakeCurveHighFn`] honouring its
/// contract; `out` must be NULL or point to a writable `StrakeCurve *`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_curve_from_high_callback(
    f: StrakeCurveHighFn,
    user_data: *mut c_void,
    max_order: u32,
    t_min: f64,
    t_max: f64,
    out: *mut *mut StrakeCurve,
) -> StrakeStatus {
    guard("strake_curve_from_high_callback", || {
        let f = f.ok_or_else(|| Failure::null("f"))?;
        output(out, "out")?;
        if !(max_order == 3 || max_order == 4) {
            return Err(Failure::invalid(format!(
                "`max_order` = {max_order}; it must be 3 or 4 (for second order use \
                 strake_curve_from_callback)"
            )));
        }
        let domain = Interval::new("t", finite("t_min", t_min)?, finite("t_max", t_max)?)?;
        publish(
            StrakeCurve::new(Box::new(HighCallbackCurve {
                f,
                user_data,
                max_order: max_order as usize,
                domain,
            })),
            out,
        )
    })
}

/// Releases a curve. NULL is a no-op. The handle must not be used afterwards, nor be in use by
/// another thread.
///
/// # Safety
/// `curve` must be NULL or a handle returned by a strake curve constructor and not yet freed.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_curve_free(curve: *mut StrakeCurve) {
    let _ = guard("strake_curve_free", || {
        if !curve.is_null() {
            // SAFETY: the caller passes a handle made by `Box::into_raw` in `publish`.
            drop(unsafe { Box::from_raw(curve) });
        }
        Ok(())
    });
}
