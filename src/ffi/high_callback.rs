//! A surface evaluated by a host callback that can give partial derivatives beyond second
//! order (to third or fourth), for the calls that need them: the rates of change of the
//! invariants (third order), the tool-centre path's curvature (third) and its rate of change,
//! torsion and jerk (fourth). The jet of `strake_surface_from_callback` is unchanged (ABI);
//! this constructor takes its own, longer jet.

use super::guard::{Failure, guard, output};
use super::status::StrakeStatus;
use super::surface::{StrakeSurface, callback_domain, publish};
use super::types::StrakeSurfaceHighJet;
use crate::error::{Result, StrakeError};
use crate::geometry::jet::{DerivOrder, Interval, SurfaceJet, SurfacePartials};
use crate::geometry::principal::Orientation;
use crate::surface::{SurfaceHint, SurfaceSource};
use std::ffi::c_void;

/// A host surface evaluator with derivatives to third or fourth order.
///
/// Called with the host's `user_data`, a point (u, v) inside the domain given at creation,
/// the highest derivative order needed (0 to the `max_order` declared at creation: 0 point;
/// 1 also su, sv; 2 also suu, suv, svv; 3 also suuu, suuv, suvv, svvv; 4 also the five fourth
/// partials) and a jet that strake has set to zero. Fill the entries up to `order` and return
/// 0; any non-zero code reports a failure (`STRAKE_STATUS_SURFACE_CALLBACK_FAILED`, the code
/// passed back). Entries must be finite (a NaN or infinity gives `STRAKE_STATUS_NON_FINITE`
/// naming the entry, e.g. "Suuv"). The same rules on threads and unwinding apply as for
/// `StrakeSurfaceFn`.
pub type StrakeSurfaceHighFn = Option<
    unsafe extern "C" fn(
        user_data: *mut c_void,
        u: f64,
        v: f64,
        order: i32,
        out: *mut StrakeSurfaceHighJet,
    ) -> i32,
>;

type HighFn = unsafe extern "C" fn(*mut c_void, f64, f64, i32, *mut StrakeSurfaceHighJet) -> i32;

/// A surface evaluated by a host callback with derivatives to `max_order`.
struct HighCallbackSurface {
    f: HighFn,
    user_data: *mut c_void,
    max_order: usize,
    u: Interval,
    v: Interval,
    orientation: Orientation,
}

// SAFETY: strake never dereferences `user_data`; it only hands it back to the host's callback.
// The documented contract of `StrakeSurfaceHighFn` puts thread safety of the callback and its
// `user_data` on the host.
unsafe impl Send for HighCallbackSurface {}
// SAFETY: as above; the struct is never mutated after creation.
unsafe impl Sync for HighCallbackSurface {}

impl HighCallbackSurface {
    fn call(&self, u: f64, v: f64, order: usize) -> Result<StrakeSurfaceHighJet> {
        let mut jet = StrakeSurfaceHighJet::default();
        // SAFETY: the host promised a callback with this signature; `jet` is a valid, zeroed,
        // exclusively borrowed jet for the duration of the call.
        let code = unsafe { (self.f)(self.user_data, u, v, order as i32, &mut jet) };
        if code != 0 {
            return Err(super::message::callback_error("surface", code));
        }
        Ok(jet)
    }
}

impl SurfaceSource for HighCallbackSurface {
    fn u_domain(&self) -> Interval {
        self.u
    }
    fn v_domain(&self) -> Interval {
        self.v
    }
    fn orientation(&self) -> Orientation {
        self.orientation
    }
    fn jet_in_domain(
        &self,
        u: f64,
        v: f64,
        order: DerivOrder,
        _hint: &mut SurfaceHint,
    ) -> Result<SurfaceJet> {
        Ok(self.call(u, v, order as usize)?.jet())
    }
    fn max_order(&self) -> usize {
        self.max_order
    }
    fn partials_in_domain(
        &self,
        u: f64,
        v: f64,
        order: usize,
        _hint: &mut SurfaceHint,
    ) -> Result<SurfacePartials> {
        if order > self.max_order {
            return Err(StrakeError::OrderUnavailable {
                which: "surface",
                needed: order,
                available: self.max_order,
            });
        }
        Ok(self.call(u, v, order)?.partials(order))
    }
}

/// Creates a surface evaluated by the host's callback `f` over [u_min, u_max] x [v_min, v_max]
/// that gives partial derivatives up to `max_order` (3 or 4): as `strake_surface_from_callback`
/// (same domain, `flip_normal` and `user_data` rules; the frames and every second-order call
/// are the same), and in addition the calls that need higher derivatives work:
/// `strake_invariant_rates_at` and `strake_invariant_rates_path` (order 3),
/// `strake_centre_point_at` and `strake_centre_path_at` (order 3, or 4 for the curvature's rate
/// of change, torsion and jerk figure). Asked for more than `max_order`, they return
/// `STRAKE_STATUS_ORDER_UNAVAILABLE` naming the call and both orders; `f` is never called with
/// `order` above `max_order`.
///
/// Returns `STRAKE_STATUS_OK` and writes a new handle to `*out` (free it with
/// `strake_surface_free`); otherwise `*out` is left untouched. Errors: NULL_POINTER (`f`,
/// `out`), NON_FINITE (a domain end), INVALID_ARGUMENT (`max_order` not 3 or 4, an empty or
/// reversed range, `flip_normal` not 0 or 1).
///
/// # Safety
/// `f` must be NULL or a function with the signature of [`StrakeSurfaceHighFn`] honouring its
/// contract; `out` must be NULL or point to a writable `StrakeSurface *`.
#[unsafe(no_mangle)]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn strake_surface_from_high_callback(
    f: StrakeSurfaceHighFn,
    user_data: *mut c_void,
    max_order: u32,
    u_min: f64,
    u_max: f64,
    v_min: f64,
    v_max: f64,
    flip_normal: i32,
    out: *mut *mut StrakeSurface,
) -> StrakeStatus {
    guard("strake_surface_from_high_callback", || {
        let f = f.ok_or_else(|| Failure::null("f"))?;
        output(out, "out")?;
        if !(max_order == 3 || max_order == 4) {
            return Err(Failure::invalid(format!(
                "`max_order` = {max_order}; it must be 3 or 4 (for second order use \
                 strake_surface_from_callback)"
            )));
        }
        let (u, v, orientation) = callback_domain(u_min, u_max, v_min, v_max, flip_normal)?;
        let source = HighCallbackSurface {
            f,
            user_data,
            max_order: max_order as usize,
            u,
            v,
            orientation,
        };
        publish(StrakeSurface::new(Box::new(source)), out)
    })
}
