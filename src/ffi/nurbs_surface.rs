//! A native NURBS surface offered to C: the host hands over its knots, control net and weights
//! instead of a callback, and strake evaluates the surface itself.

use super::guard::{Failure, guard, input, input_slice, output};
use super::status::StrakeStatus;
use super::surface::{StrakeSurface, orientation, publish};
use crate::nurbs::NurbsSurface;
use crate::nurbs::NurbsSurfaceData;

/// The description of a NURBS surface, as the host's arrays.
///
/// Control point (i, j), i = 0..count_u − 1 along u and j = 0..count_v − 1 along v, is
/// `points[3 (i count_v + j) + 0..3]` (x, y, z): the v index runs fastest. Weights, when given,
/// use the same layout (`weights[i count_v + j]`). The surface is
/// S(u, v) = Σ N_i,p(u) N_j,q(v) w_ij P_ij / Σ N_i,p(u) N_j,q(v) w_ij over the domain
/// `[knots_u[degree_u], knots_u[count_u]] × [knots_v[degree_v], knots_v[count_v]]` (The NURBS
/// Book, 2nd ed., chapter 4: the definition of a NURBS surface).
#[repr(C)]
#[derive(Debug, Clone, Copy)]
pub struct StrakeNurbsSurfaceData {
    /// Degree p in u, 1 to 24.
    pub degree_u: u32,
    /// Degree q in v, 1 to 24.
    pub degree_v: u32,
    /// Number of control points along u (at least degree_u + 1).
    pub count_u: usize,
    /// Number of control points along v (at least degree_v + 1).
    pub count_v: usize,
    /// `knot_count_u` = count_u + degree_u + 1 non-decreasing finite knots in u.
    pub knots_u: *const f64,
    /// Number of knots in u.
    pub knot_count_u: usize,
    /// `knot_count_v` = count_v + degree_v + 1 non-decreasing finite knots in v.
    pub knots_v: *const f64,
    /// Number of knots in v.
    pub knot_count_v: usize,
    /// 3 count_u count_v coordinates (layout above).
    pub points: *const f64,
    /// NULL for a non-rational surface, else count_u count_v positive finite weights.
    pub weights: *const f64,
}

/// Creates a NURBS surface evaluated by strake itself (exact derivatives to second order,
/// no allocation per evaluation). `flip_normal` = 0 takes N along Su × Sv, 1 the reverse.
///
/// The arrays are copied; they may be freed after the call. Returns `STRAKE_STATUS_OK` and
/// writes a new handle to `*out` (free it with `strake_surface_free`; it is used exactly like a
/// callback surface); otherwise `*out` is left untouched. Errors: NULL_POINTER (`data`, any of
/// its arrays but `weights`, `out`), INVALID_ARGUMENT (a count of 0 or too large, `flip_normal`
/// not 0 or 1), INVALID_DEGREE (degree 0 or above 24, too few control points, knot count
/// mismatch), INVALID_KNOTS (non-finite or decreasing knot, multiplicity above degree + 1, empty
/// domain), INVALID_CONTROL_POINT (non-finite coordinate), INVALID_WEIGHT (weight not positive
/// and finite). The message names the direction (u or v), index and value.
///
/// # Safety
/// `data` must be NULL or point to a valid description whose arrays hold the stated number of
/// elements; `out` must be NULL or point to a writable `StrakeSurface *`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_surface_new_nurbs(
    data: *const StrakeNurbsSurfaceData,
    flip_normal: i32,
    out: *mut *mut StrakeSurface,
) -> StrakeStatus {
    guard("strake_surface_new_nurbs", || {
        output(out, "out")?;
        // SAFETY: the caller guarantees `data` points to a valid description when not NULL.
        let d = unsafe { input(data, "data")? };
        let orientation = orientation(flip_normal)?;
        let net = d.count_u.checked_mul(d.count_v).ok_or_else(|| {
            Failure::invalid(format!(
                "count_u * count_v = {} * {} overflows",
                d.count_u, d.count_v
            ))
        })?;
        // SAFETY (all slices): the caller guarantees the element counts documented above.
        let knots_u = unsafe { input_slice(d.knots_u, d.knot_count_u, "knots_u", "knot_count_u")? };
        let knots_v = unsafe { input_slice(d.knots_v, d.knot_count_v, "knots_v", "knot_count_v")? };
        let points = unsafe {
            input_slice(
                d.points.cast::<[f64; 3]>(),
                net,
                "points",
                "count_u * count_v",
            )?
        };
        let weights = if d.weights.is_null() {
            None
        } else {
            Some(unsafe { input_slice(d.weights, net, "weights", "count_u * count_v")? })
        };
        let surface = NurbsSurface::new(&NurbsSurfaceData {
            degree_u: d.degree_u as usize,
            degree_v: d.degree_v as usize,
            count_u: d.count_u,
            count_v: d.count_v,
            knots_u,
            knots_v,
            points,
            weights,
        })?
        .with_orientation(orientation);
        publish(StrakeSurface::new(Box::new(surface)), out)
    })
}
