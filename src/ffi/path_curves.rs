//! Curves a host has, made into curve handles: a curve through points in the parameter plane,
//! a curve through points in space projected onto a surface, a 3D NURBS curve projected onto
//! a surface; and plain projection of points onto a surface.
//!
//! The curves are interpolating B-splines in the surface's parameter plane (The NURBS Book
//! A9.1) on t in [0, 1]; projection is point inversion (§6.1). Every refusal names the point
//! (or, for a projected NURBS curve, the sample) at fault.

use super::curve::{StrakeCurve, publish};
use super::guard::{Failure, check_count, guard, input, input_slice, output};
use super::status::StrakeStatus;
use super::surface::StrakeSurface;
use super::types::{StrakeParametrization, StrakeProjection, StrakeProjectionOptions};
use crate::nurbs::{EndDerivatives, NurbsCurve, Parametrization, interpolate};
use crate::paths::projection::{
    FitOptions, Projection, ProjectionOptions, project_curve, project_points,
    uv_curve_through_points,
};
use std::mem::MaybeUninit;

/// The parametrization for a `parametrization` argument.
fn parametrization(code: u32) -> Result<Parametrization, Failure> {
    match code {
        c if c == StrakeParametrization::ChordLength as u32 => Ok(Parametrization::ChordLength),
        c if c == StrakeParametrization::Centripetal as u32 => Ok(Parametrization::Centripetal),
        other => Err(Failure::invalid(format!(
            "`parametrization` = {other}; it must be 0 (STRAKE_PARAMETRIZATION_CHORD_LENGTH) or \
             1 (STRAKE_PARAMETRIZATION_CENTRIPETAL)"
        ))),
    }
}

/// A 0/1 flag of the projection options.
fn flag(name: &str, x: i32) -> Result<bool, Failure> {
    match x {
        0 => Ok(false),
        1 => Ok(true),
        other => Err(Failure::invalid(format!(
            "`{name}` = {other}; it must be 0 or 1"
        ))),
    }
}

/// The projection options of the Rust API for the C options (0 = default for the grid and the
/// iteration cap), checked.
pub(crate) fn projection_options(
    o: &StrakeProjectionOptions,
) -> Result<ProjectionOptions, Failure> {
    let mut opts = ProjectionOptions::new(o.tolerance).periodic(
        flag("options.periodic_u", o.periodic_u)?,
        flag("options.periodic_v", o.periodic_v)?,
    );
    if o.grid != 0 {
        opts.grid = o.grid as usize;
    }
    if o.max_iterations != 0 {
        opts.max_iterations = o.max_iterations as usize;
    }
    opts.check()?;
    Ok(opts)
}

/// Creates a curve in the surface's parameter plane through `point_count` points
/// (u0, v0, u1, v1, ...): the B-spline of degree `degree` (3: a C2 cubic) interpolating them,
/// on t in [0, 1] (The NURBS Book A9.1: parameters by `parametrization`, knots by averaging).
///
/// `start_derivative` and `end_derivative` are NULL (free ends) or both point to 2 doubles
/// (du/dt, dv/dt) the curve must have at t = 0 and t = 1; with the chord-length
/// parametrization a derivative of about the length of the point polygon (in the parameter
/// plane) keeps the speed even. The data are copied.
///
/// Returns `STRAKE_STATUS_OK` and writes a new handle to `*out` (free it with
/// `strake_curve_free`); otherwise `*out` is left untouched. Errors: NULL_POINTER
/// (`uv_points`, `out`); INVALID_ARGUMENT (`point_count` of 0, too few points for the degree
/// (degree + 1, or degree - 1 and at least 2 with end derivatives), two consecutive points
/// that coincide (the message names the point's index), only one of the two derivatives
/// given, `parametrization` not 0 or 1); INVALID_DEGREE (degree 0 or above 24, end
/// derivatives with degree 1); NON_FINITE (a coordinate, naming the point's index, or an end
/// derivative).
///
/// # Safety
/// `uv_points` must be NULL or point to `2 * point_count` doubles; each derivative NULL or 2
/// doubles; `out` NULL or a writable `StrakeCurve *`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_curve_through_uv_points(
    uv_points: *const f64,
    point_count: usize,
    degree: u32,
    parametrization: u32,
    start_derivative: *const f64,
    end_derivative: *const f64,
    out: *mut *mut StrakeCurve,
) -> StrakeStatus {
    guard("strake_curve_through_uv_points", || {
        output(out, "out")?;
        // SAFETY: the caller guarantees the element counts documented above.
        let points = unsafe {
            input_slice(
                uv_points.cast::<[f64; 2]>(),
                point_count,
                "uv_points",
                "point_count",
            )?
        };
        let method = self::parametrization(parametrization)?;
        let ends = match (start_derivative.is_null(), end_derivative.is_null()) {
            (true, true) => None,
            (false, false) => Some(EndDerivatives {
                // SAFETY: non-NULL, each pointing to 2 doubles by the contract.
                start: *unsafe { input(start_derivative.cast::<[f64; 2]>(), "start_derivative")? },
                end: *unsafe { input(end_derivative.cast::<[f64; 2]>(), "end_derivative")? },
            }),
            (false, true) => {
                return Err(Failure::invalid(
                    "`start_derivative` is given but `end_derivative` is NULL: give both end \
                     derivatives or neither"
                        .into(),
                ));
            }
            (true, false) => {
                return Err(Failure::invalid(
                    "`end_derivative` is given but `start_derivative` is NULL: give both end \
                     derivatives or neither"
                        .into(),
                ));
            }
        };
        let curve = interpolate(points, degree as usize, method, ends.as_ref())?;
        publish(StrakeCurve::new(Box::new(curve)), out)
    })
}

/// Writes `projections` (our own) to the host's array `out` of the same length.
fn write_projections(out: std::ptr::NonNull<MaybeUninit<StrakeProjection>>, p: &[Projection]) {
    let out = out.as_ptr().cast::<StrakeProjection>();
    for (i, pj) in p.iter().enumerate() {
        // SAFETY: the caller of the exported function provides room for `p.len()` projections
        // at `out` (non-null, aligned, size checked).
        unsafe { out.add(i).write(StrakeProjection::from(pj)) };
    }
}

/// Creates a curve on `surface` through `point_count` points in space (x0, y0, z0, x1, ...),
/// given in path order, e.g. contact points a host computed on its own copy of the surface:
/// each point is projected onto the surface (point inversion, continuing from the previous foot
/// point, across a seam declared periodic in `options`), and the foot points' (u, v) are
/// interpolated by a B-spline of degree `degree` (3: a C2 cubic) in the parameter plane, on t
/// in [0, 1], with parameters by `parametrization`. A path across a declared seam stays
/// continuous; the curve's (u, v) are wrapped back into the domain when evaluated.
///
/// `projections` is NULL, or an array of `point_count` that receives, on success, each point's
/// foot point, (u, v) and distances (to see how far the host's points were from the surface).
///
/// Returns `STRAKE_STATUS_OK`, writes `projections` (if given) and a new handle to `*out` (free
/// it with `strake_curve_free`); otherwise nothing is written. Errors (the message names the
/// point's index): NULL_POINTER (`surface`, `points`, `options`, `out`); INVALID_ARGUMENT
/// (`point_count` of 0 or too few for the degree, a bad option, two consecutive points with
/// the same foot point, `parametrization` not 0 or 1); INVALID_DEGREE; NON_FINITE (a
/// coordinate); TOO_FAR_FROM_SURFACE (a point farther than `options->tolerance`, with its
/// distance and foot point); NOT_CONVERGED (point inversion found no foot point);
/// DEGENERATE_SURFACE (a foot point where the normal is undefined); the surface's own errors
/// (SURFACE_CALLBACK_FAILED, OUT_OF_DOMAIN ...).
///
/// # Safety
/// `surface` NULL or a live handle; `points` NULL or `3 * point_count` doubles; `options` NULL
/// or valid; `projections` NULL or room for `point_count` projections; `out` NULL or writable.
#[unsafe(no_mangle)]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn strake_curve_through_space_points(
    surface: *const StrakeSurface,
    points: *const f64,
    point_count: usize,
    options: *const StrakeProjectionOptions,
    degree: u32,
    parametrization: u32,
    projections: *mut StrakeProjection,
    out: *mut *mut StrakeCurve,
) -> StrakeStatus {
    guard("strake_curve_through_space_points", || {
        // SAFETY: the caller passes live handles, valid arrays of the stated sizes, or NULL.
        let s = unsafe { input(surface, "surface")? };
        let pts = unsafe {
            input_slice(
                points.cast::<[f64; 3]>(),
                point_count,
                "points",
                "point_count",
            )?
        };
        let opts = projection_options(unsafe { input(options, "options")? })?;
        output(out, "out")?;
        let proj_out = if projections.is_null() {
            None
        } else {
            check_count::<StrakeProjection>(point_count, "point_count")?;
            Some(output(projections, "projections")?)
        };
        let fit = FitOptions {
            degree: degree as usize,
            parametrization: self::parametrization(parametrization)?,
        };
        let fitted = uv_curve_through_points(s.source(), pts, &opts, &fit)?;
        if let Some(slot) = proj_out {
            write_projections(slot, &fitted.projections);
        }
        publish(StrakeCurve::new(Box::new(fitted.curve)), out)
    })
}

/// Creates a curve on `surface` from a curve in space, a NURBS curve of degree `degree` given
/// as for `strake_curve_new_nurbs` but with points in space (`points`: x, y, z per control
/// point; `weights` NULL for a non-rational curve), projected onto the surface: the curve is
/// sampled (max(4, 2 degree) samples per knot span), the samples are projected, their foot
/// points interpolated by a C2 cubic in the parameter plane (chord length, t in [0, 1], not the
/// space curve's parameter), and intervals whose midpoint lies farther than `fit_tolerance`
/// (host length unit) from the fitted curve are halved until none does. Split a space curve
/// with corners at its corners first: near a corner the fit converges slowly.
///
/// Returns `STRAKE_STATUS_OK` and writes a new handle to `*out`; otherwise `*out` is left
/// untouched. Errors: those of `strake_curve_new_nurbs` for the NURBS data; those of
/// `strake_curve_through_space_points` for the projection, the message naming the sample's
/// index and its parameter on the space curve; INVALID_ARGUMENT also for a `fit_tolerance`
/// that is not positive, or not met at 100000 samples.
///
/// # Safety
/// As for `strake_curve_new_nurbs` (with 3 doubles per point), plus `surface` NULL or a live
/// handle and `options` NULL or valid.
#[unsafe(no_mangle)]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn strake_curve_project_nurbs(
    surface: *const StrakeSurface,
    degree: u32,
    knots: *const f64,
    knot_count: usize,
    points: *const f64,
    point_count: usize,
    weights: *const f64,
    options: *const StrakeProjectionOptions,
    fit_tolerance: f64,
    out: *mut *mut StrakeCurve,
) -> StrakeStatus {
    guard("strake_curve_project_nurbs", || {
        // SAFETY (all inputs): the caller passes a live handle and arrays of the documented
        // sizes, or NULL.
        let s = unsafe { input(surface, "surface")? };
        let knots = unsafe { input_slice(knots, knot_count, "knots", "knot_count")? };
        let pts = unsafe {
            input_slice(
                points.cast::<[f64; 3]>(),
                point_count,
                "points",
                "point_count",
            )?
        };
        let weights = if weights.is_null() {
            None
        } else {
            Some(unsafe { input_slice(weights, point_count, "weights", "point_count")? })
        };
        let opts = projection_options(unsafe { input(options, "options")? })?;
        output(out, "out")?;
        let space = NurbsCurve::<3>::new(degree as usize, knots, pts, weights)?;
        let fitted = project_curve(
            s.source(),
            &space,
            &opts,
            &FitOptions::default(),
            fit_tolerance,
        )?;
        publish(StrakeCurve::new(Box::new(fitted.curve)), out)
    })
}

/// Projects `point_count` points in space (x, y, z each) onto `surface`, in order: each from
/// the previous foot point (so points along a path are fast and stay continuous across a seam
/// declared periodic in `options`), the first from a coarse search. `out[i]` receives point
/// i's foot point, (u, v) (inside the domain) and distances.
///
/// Returns `STRAKE_STATUS_OK` and writes `out[0..point_count]`; otherwise `out` is untouched.
/// Errors (the message names the point's index): NULL_POINTER (`surface`, `points`,
/// `options`, `out`); INVALID_ARGUMENT (`point_count` of 0 or too large, a bad option);
/// NON_FINITE; TOO_FAR_FROM_SURFACE; NOT_CONVERGED; DEGENERATE_SURFACE; the surface's own
/// errors.
///
/// # Safety
/// `surface` NULL or a live handle; `points` NULL or `3 * point_count` doubles; `options` NULL
/// or valid; `out` NULL or room for `point_count` projections, not overlapping `points`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_surface_project_points(
    surface: *const StrakeSurface,
    points: *const f64,
    point_count: usize,
    options: *const StrakeProjectionOptions,
    out: *mut StrakeProjection,
) -> StrakeStatus {
    guard("strake_surface_project_points", || {
        // SAFETY: the caller passes a live handle and arrays of the documented sizes, or NULL.
        let s = unsafe { input(surface, "surface")? };
        let pts = unsafe {
            input_slice(
                points.cast::<[f64; 3]>(),
                point_count,
                "points",
                "point_count",
            )?
        };
        let opts = projection_options(unsafe { input(options, "options")? })?;
        let slot = output(out, "out")?;
        check_count::<StrakeProjection>(point_count, "point_count")?;
        let projections = project_points(s.source(), pts, &opts)?;
        write_projections(slot, &projections);
        Ok(())
    })
}
