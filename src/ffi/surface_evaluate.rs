//! Evaluating a surface handle: the point and its partial derivatives at the host's (u, v).
//!
//! The same evaluation the frame calls run (a native NURBS surface's exact rational
//! derivatives, or the host's callback), offered directly so that a host can draw, mesh or
//! check a surface it gave to strake without a second evaluator.

use super::guard::{Failure, check_count, guard, input, input_slice, output};
use super::status::StrakeStatus;
use super::surface::StrakeSurface;
use super::types::StrakeSurfaceJet;
use crate::error::StrakeError;
use crate::geometry::jet::{DerivOrder, SurfaceJet};
use crate::surface::SurfaceHint;

fn arr3(v: &crate::geometry::math::Vec3) -> [f64; 3] {
    [v.x, v.y, v.z]
}

/// The C jet of `jet` with the entries above `order` set to zero.
fn to_c(jet: &SurfaceJet, order: DerivOrder) -> StrakeSurfaceJet {
    let mut c = StrakeSurfaceJet {
        p: arr3(&jet.p),
        ..StrakeSurfaceJet::default()
    };
    if order >= DerivOrder::First {
        c.su = arr3(&jet.su);
        c.sv = arr3(&jet.sv);
    }
    if order == DerivOrder::Second {
        c.suu = arr3(&jet.suu);
        c.suv = arr3(&jet.suv);
        c.svv = arr3(&jet.svv);
    }
    c
}

fn deriv_order(order: u32) -> Result<DerivOrder, Failure> {
    match order {
        0 => Ok(DerivOrder::Position),
        1 => Ok(DerivOrder::First),
        2 => Ok(DerivOrder::Second),
        _ => Err(Failure::invalid(format!(
            "`order` = {order} must be 0 (point), 1 (and first partials) or 2 (and second \
             partials)"
        ))),
    }
}

/// Evaluates `surface` at `count` parameter pairs: `out[i]` is the point S(u_i, v_i) and its
/// partial derivatives up to `order` (0: the point; 1: and Su, Sv; 2: and Suu, Suv, Svv), at
/// (u_i, v_i) = (`uv[2 i]`, `uv[2 i + 1]`). Entries above `order` are set to zero. Lengths are
/// in the host's unit, derivatives per unit of the surface parameters; for a host callback
/// surface these are the callback's own values, checked.
///
/// Returns `STRAKE_STATUS_OK` and writes `out[0..count]`; otherwise `out` is untouched and the
/// message names the failing point's index. Errors: NULL_POINTER (`surface`, `uv`, `out`);
/// INVALID_ARGUMENT (`count` of 0 or too large, `order` above 2); NON_FINITE (a parameter, or
/// an entry the callback filled); OUT_OF_DOMAIN ((u, v) outside the surface's domain: never
/// clamped); SURFACE_CALLBACK_FAILED. Thread-safe.
///
/// # Safety
/// `surface` NULL or a live handle; `uv` NULL or `2 * count` doubles; `out` NULL or room for
/// `count` jets, not overlapping `uv`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_surface_evaluate(
    surface: *const StrakeSurface,
    uv: *const f64,
    count: usize,
    order: u32,
    out: *mut StrakeSurfaceJet,
) -> StrakeStatus {
    guard("strake_surface_evaluate", || {
        // SAFETY: the caller passes a live handle or NULL, and 2 * count doubles at `uv`.
        let s = unsafe { input(surface, "surface")? };
        check_count::<[f64; 2]>(count, "count")?;
        let uv = unsafe { input_slice(uv, 2 * count, "uv", "count")? };
        let slot = output(out, "out")?;
        check_count::<StrakeSurfaceJet>(count, "count")?;
        let order = deriv_order(order)?;
        let source = s.source();
        let mut scratch: Vec<StrakeSurfaceJet> = Vec::new();
        scratch.try_reserve_exact(count).map_err(|_| {
            Failure::invalid(format!("cannot allocate scratch space for {count} jets"))
        })?;
        let mut hint = SurfaceHint::default();
        for (index, p) in uv.chunks_exact(2).enumerate() {
            let jet = source
                .checked_jet(p[0], p[1], order, &mut hint)
                .map_err(|e| StrakeError::AtPoint {
                    index,
                    error: Box::new(e),
                })?;
            scratch.push(to_c(&jet, order));
        }
        // SAFETY: `out` checked non-null and aligned, room for `count` jets is the caller's
        // contract; `scratch` holds exactly `count` jets and is our own buffer.
        unsafe {
            std::ptr::copy_nonoverlapping(
                scratch.as_ptr(),
                slot.as_ptr().cast::<StrakeSurfaceJet>(),
                count,
            )
        };
        Ok(())
    })
}
