//! A surface evaluated by a host callback that takes many (u, v) points at once: one call per
//! block of a path instead of one per point, so that a host whose own evaluator works on arrays
//! (or whose calls are expensive, e.g. through a managed-language wrapper) pays its per-call
//! cost once per block.

use super::guard::{Failure, guard, output};
use super::status::StrakeStatus;
use super::surface::{StrakeSurface, callback_domain, publish};
use super::types::StrakeSurfaceJet;
use crate::engine::batch::CHUNK;
use crate::error::Result;
use crate::geometry::jet::{DerivOrder, Interval, SurfaceJet};
use crate::geometry::principal::Orientation;
use crate::surface::{SurfaceHint, SurfaceSource};
use std::ffi::c_void;

/// A host surface evaluator for many points at once.
///
/// Called with the host's `user_data`, `count` points (u\[i\], v\[i\]) inside the domain given at
/// creation (`u` and `v` point to `count` doubles each), the highest derivative order needed
/// (0: point; 1: also su, sv; 2: also suu, suv, svv) and `count` jets at `out` that strake has
/// set to zero: fill `out[i]` for the point (u\[i\], v\[i\]) up to `order` and return 0. Return
/// any non-zero code to report a failure of the call: strake then returns
/// `STRAKE_STATUS_SURFACE_CALLBACK_FAILED` and passes the code back (message and
/// `strake_last_callback_code`); the message names the first sample of the block that was
/// being evaluated. Entries must be finite: a NaN or infinity gives `STRAKE_STATUS_NON_FINITE`
/// naming the sample's index and the entry.
///
/// The batch entry points (`strake_frames_at`, `strake_frames_even`,
/// `strake_frames_at_parallel`) call it with blocks of up to 64 points, in the order of the
/// path; `strake_frame_at` calls it with `count` = 1. The arrays are strake's and valid only
/// during the call. The same rules on threads and unwinding apply as for `StrakeSurfaceFn`.
pub type StrakeSurfaceBatchFn = Option<
    unsafe extern "C" fn(
        user_data: *mut c_void,
        u: *const f64,
        v: *const f64,
        count: usize,
        order: i32,
        out: *mut StrakeSurfaceJet,
    ) -> i32,
>;

type BatchFn = unsafe extern "C" fn(
    *mut c_void,
    *const f64,
    *const f64,
    usize,
    i32,
    *mut StrakeSurfaceJet,
) -> i32;

/// A surface evaluated by a host batch callback.
struct BatchCallbackSurface {
    f: BatchFn,
    user_data: *mut c_void,
    u: Interval,
    v: Interval,
    orientation: Orientation,
}

// SAFETY: strake never dereferences `user_data`; it only hands it back to the host's callback.
// The documented contract of `StrakeSurfaceBatchFn` puts thread safety of the callback and its
// `user_data` on the host.
unsafe impl Send for BatchCallbackSurface {}
// SAFETY: as above; the struct itself is never mutated after creation.
unsafe impl Sync for BatchCallbackSurface {}

impl BatchCallbackSurface {
    /// One call of the host for `u.len()` ≤ [`CHUNK`] points into `out`.
    fn call(&self, u: &[f64], v: &[f64], order: DerivOrder, out: &mut [SurfaceJet]) -> Result<()> {
        let n = u.len();
        debug_assert!(n <= CHUNK && v.len() == n && out.len() == n);
        let mut jets = [StrakeSurfaceJet::default(); CHUNK];
        // SAFETY: the host promised a callback with this signature; `u`, `v` hold `n` values
        // and `jets` has room for `n ≤ CHUNK` zeroed jets, all valid for the call.
        let code = unsafe {
            (self.f)(
                self.user_data,
                u.as_ptr(),
                v.as_ptr(),
                n,
                order as i32,
                jets.as_mut_ptr(),
            )
        };
        if code != 0 {
            return Err(super::message::callback_error("surface batch", code));
        }
        for (o, j) in out.iter_mut().zip(&jets[..n]) {
            *o = SurfaceJet::from(j);
        }
        Ok(())
    }
}

impl SurfaceSource for BatchCallbackSurface {
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
        let mut out = [SurfaceJet::default()];
        self.call(&[u], &[v], order, &mut out)?;
        Ok(out[0])
    }
    /// One host call per [`CHUNK`] points; a failure of a call fails the whole block (not as
    /// `AtPoint`: the host reports no point).
    fn jets_in_domain_block(
        &self,
        u: &[f64],
        v: &[f64],
        order: DerivOrder,
        _hint: &mut SurfaceHint,
        out: &mut [SurfaceJet],
    ) -> Result<()> {
        for ((uc, vc), oc) in u
            .chunks(CHUNK)
            .zip(v.chunks(CHUNK))
            .zip(out.chunks_mut(CHUNK))
        {
            self.call(uc, vc, order, oc)?;
        }
        Ok(())
    }
}

/// Creates a surface evaluated by the host's batch callback `f` (many points per call) over
/// [u_min, u_max] x [v_min, v_max]; used exactly like a surface from
/// `strake_surface_from_callback`, with the same results when both callbacks compute the same
/// jets.
///
/// `flip_normal` = 0 takes N along Su x Sv, 1 takes N = -(Su x Sv)/|Su x Sv|. `user_data` is
/// handed back to `f` unchanged and may be NULL. strake calls `f` only with points inside the
/// domain; a curve that leaves the domain gives `STRAKE_STATUS_OUT_OF_DOMAIN` (no clamping).
///
/// Returns `STRAKE_STATUS_OK` and writes a new handle to `*out` (free it with
/// `strake_surface_free`); otherwise `*out` is left untouched. Errors: NULL_POINTER (`f`,
/// `out`), NON_FINITE (a domain end), INVALID_ARGUMENT (an empty or reversed range,
/// `flip_normal` not 0 or 1).
///
/// # Safety
/// `f` must be NULL or a function with the signature of [`StrakeSurfaceBatchFn`] honouring its
/// contract; `out` must be NULL or point to a writable `StrakeSurface *`.
#[unsafe(no_mangle)]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn strake_surface_from_batch_callback(
    f: StrakeSurfaceBatchFn,
    user_data: *mut c_void,
    u_min: f64,
    u_max: f64,
    v_min: f64,
    v_max: f64,
    flip_normal: i32,
    out: *mut *mut StrakeSurface,
) -> StrakeStatus {
    guard("strake_surface_from_batch_callback", || {
        let f = f.ok_or_else(|| Failure::null("f"))?;
        output(out, "out")?;
        let (u, v, orientation) = callback_domain(u_min, u_max, v_min, v_max, flip_normal)?;
        let source = BatchCallbackSurface {
            f,
            user_data,
            u,
            v,
            orientation,
        };
        publish(StrakeSurface::new(Box::new(source)), out)
    })
}
