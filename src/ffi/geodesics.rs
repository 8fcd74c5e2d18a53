//! Geodesics and offsets on the surface through the C ABI: a traced geodesic and the geodesic
//! between two points as curve handles (usable as `StrakeCurve` with every curve function),
//! and offsets as a handle of their own whose pieces become curve handles and whose points,
//! exits and loops come through the buffer protocol.

use super::curve::{StrakeCurve, publish};
use super::guard::{Failure, guard, input, input_slice, out_buffer, output};
use super::status::StrakeStatus;
use super::surface::{StrakeSurface, finite};
use super::types::{
    StrakeDirectionKind, StrakeDomainSide, StrakeGeodesicEnd, StrakeGeodesicInfo,
    StrakeGeodesicOptions, StrakeOffsetOptions, StrakeOffsetPoint, StrakeOffsetSide,
    StrakeOffsetSummary, StrakePathInterval,
};
use crate::geodesics::between::{BetweenOptions, geodesic_between};
use crate::geodesics::offset::{
    OffsetDistance, OffsetOptions, OffsetSide, SurfaceOffset, offset_path,
};
use crate::geodesics::trace::{
    DomainSide, Geodesic, GeodesicEnd, StartDirection, TraceOptions, trace_geodesic,
};
use crate::geometry::math::Vec3;
use std::mem::MaybeUninit;

fn write<T>(p: *mut T, name: &str, value: T) -> Result<(), Failure> {
    let slot = output(p, name)?;
    // SAFETY: checked non-null and aligned; the caller provides a writable T.
    unsafe { slot.as_ptr().write(MaybeUninit::new(value)) };
    Ok(())
}

fn info(g: &Geodesic) -> StrakeGeodesicInfo {
    let (end, side) = match g.end {
        GeodesicEnd::Length => (StrakeGeodesicEnd::Length, StrakeDomainSide::None),
        GeodesicEnd::Boundary(s) => (
            StrakeGeodesicEnd::Boundary,
            match s {
                DomainSide::ULow => StrakeDomainSide::UMin,
                DomainSide::UHigh => StrakeDomainSide::UMax,
                DomainSide::VLow => StrakeDomainSide::VMin,
                DomainSide::VHigh => StrakeDomainSide::VMax,
            },
        ),
        GeodesicEnd::Degenerate { .. } => (StrakeGeodesicEnd::Degenerate, StrakeDomainSide::None),
    };
    let (u, v) = g.end_uv();
    StrakeGeodesicInfo {
        end: end as u32,
        side: side as u32,
        length: g.length,
        u,
        v,
        point: [g.end_point.x, g.end_point.y, g.end_point.z],
        tangent: [g.end_tangent.x, g.end_tangent.y, g.end_tangent.z],
        accepted_steps: g.stats.accepted,
        rejected_steps: g.stats.rejected,
        jets: g.stats.jets,
    }
}

/// Traces the geodesic of `surface` from (u, v) in a start direction for arc length `length`
/// (host length unit): the geodesic equations with the surface's Christoffel symbols,
/// integrated by an embedded Runge-Kutta 5(4) pair with the error measured in space.
///
/// - `direction_kind` / `direction`: a `StrakeDirectionKind` value and 1 (angle), 3 (space
///   vector) or 2 ((du, dv)) doubles.
/// - `options`: `tolerance` > 0 is the error allowed per step in space; `max_steps` caps
///   the step attempts (0: 100000).
///
/// On success writes a new curve handle to `*out_curve` (free with `strake_curve_free`): the
/// geodesic in the parameter plane, t = arc length in [0, info.length], C2, usable with every
/// curve function (frames, sampling, checks; its geodesic curvature is 0 to the tolerance).
/// When `out_info` is not NULL it receives why the trace ended: at the length, at the domain
/// boundary (the end lies exactly on it), or before a degenerate point; these are all
/// STRAKE_STATUS_OK, so read `info.end` to know whether the full length was traced.
///
/// Errors (nothing written): NULL_POINTER (`surface`, `direction`, `options`, `out_curve`);
/// INVALID_ARGUMENT (`direction_kind` unknown, a zero direction or one along the normal,
/// `length` or `tolerance` not positive, naming the value); NON_FINITE; OUT_OF_DOMAIN (start
/// outside the domain, naming u or v); DEGENERATE_SURFACE (start at a degenerate point);
/// LEAVES_SURFACE (start on the boundary heading out); GEODESIC_INCOMPLETE (the tolerance
/// cannot be met or the step cap is used up; the message names the arc length and (u, v)
/// reached); SURFACE_CALLBACK_FAILED. Thread-safe.
///
/// # Safety
/// `surface` NULL or a live handle; `direction` NULL or the number of doubles above;
/// `options` NULL or valid; `out_curve` NULL or a writable `StrakeCurve *`; `out_info` NULL
/// or writable.
#[unsafe(no_mangle)]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn strake_geodesic_trace(
    surface: *const StrakeSurface,
    u: f64,
    v: f64,
    direction_kind: u32,
    direction: *const f64,
    length: f64,
    options: *const StrakeGeodesicOptions,
    out_curve: *mut *mut StrakeCurve,
    out_info: *mut StrakeGeodesicInfo,
) -> StrakeStatus {
    guard("strake_geodesic_trace", || {
        // SAFETY: the caller passes a live handle and valid pointers or NULL.
        let s = unsafe { input(surface, "surface")? };
        let o = unsafe { input(options, "options")? };
        output(out_curve, "out_curve")?;
        if !out_info.is_null() {
            output(out_info, "out_info")?;
        }
        let dir = match direction_kind {
            k if k == StrakeDirectionKind::Angle as u32 => {
                // SAFETY: 1 double by the contract.
                StartDirection::Angle(unsafe { *input(direction, "direction")? })
            }
            k if k == StrakeDirectionKind::Space as u32 => {
                // SAFETY: 3 doubles by the contract.
                let d = unsafe { input_slice(direction, 3, "direction", "3")? };
                StartDirection::Space(Vec3::new(d[0], d[1], d[2]))
            }
            k if k == StrakeDirectionKind::Parameter as u32 => {
                // SAFETY: 2 doubles by the contract.
                let d = unsafe { input_slice(direction, 2, "direction", "2")? };
                StartDirection::Parameter(d[0], d[1])
            }
            other => {
                return Err(Failure::invalid(format!(
                    "`direction_kind` = {other}; it must be 0 (angle), 1 (space) or 2 \
                     (parameter)"
                )));
            }
        };
        let mut opts = TraceOptions::new(o.tolerance);
        if o.max_steps != 0 {
            opts.max_steps = o.max_steps;
        }
        let g = trace_geodesic(
            s.source(),
            finite("u", u)?,
            finite("v", v)?,
            dir,
            length,
            &opts,
        )?;
        let i = info(&g);
        publish(StrakeCurve::new(Box::new(g.curve)), out_curve)?;
        if !out_info.is_null() {
            write(out_info, "out_info", i)?;
        }
        Ok(())
    })
}

/// The geodesic of `surface` from (u0, v0) to (u1, v1) and the geodesic distance between
/// them, by shooting: Newton's method on the start angle and the length from the straight
/// parameter line, with continuation when that fails.
///
/// `options.tolerance` > 0 is the largest space distance left between the geodesic's end and
/// the target (host length unit); the traces run at a hundredth of it; `options.max_steps`
/// caps the Newton iterations per solve (0: 30). Seams are not crossed: on a closed surface
/// the result is the shortest geodesic within the parameter domain.
///
/// On success writes the distance to `*out_distance` and, when `out_curve` is not NULL, a new
/// curve handle (t = arc length from (u0, v0), free with `strake_curve_free`).
///
/// Errors (nothing written): NULL_POINTER (`surface`, `options`, `out_distance`);
/// INVALID_ARGUMENT (points that coincide, a bad tolerance); NON_FINITE; OUT_OF_DOMAIN;
/// DEGENERATE_SURFACE (either point); GEODESIC_NOT_FOUND (shooting failed, or found a
/// geodesic longer than the straight parameter line, which cannot be the shortest: the
/// message names the miss, angle and length reached); GEODESIC_INCOMPLETE;
/// SURFACE_CALLBACK_FAILED. Thread-safe.
///
/// # Safety
/// `surface` NULL or a live handle; `options` NULL or valid; `out_curve` NULL or a writable
/// `StrakeCurve *`; `out_distance` NULL or a writable double.
#[unsafe(no_mangle)]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn strake_geodesic_between(
    surface: *const StrakeSurface,
    u0: f64,
    v0: f64,
    u1: f64,
    v1: f64,
    options: *const StrakeGeodesicOptions,
    out_curve: *mut *mut StrakeCurve,
    out_distance: *mut f64,
) -> StrakeStatus {
    guard("strake_geodesic_between", || {
        // SAFETY: the caller passes a live handle and valid pointers or NULL.
        let s = unsafe { input(surface, "surface")? };
        let o = unsafe { input(options, "options")? };
        output(out_distance, "out_distance")?;
        if !out_curve.is_null() {
            output(out_curve, "out_curve")?;
        }
        let mut opts = BetweenOptions::new(o.tolerance);
        if o.max_steps != 0 {
            opts.max_iterations = o.max_steps;
        }
        let r = geodesic_between(
            s.source(),
            (finite("u0", u0)?, finite("v0", v0)?),
            (finite("u1", u1)?, finite("v1", v1)?),
            &opts,
        )?;
        if !out_curve.is_null() {
            publish(StrakeCurve::new(Box::new(r.geodesic.curve)), out_curve)?;
        }
        write(out_distance, "out_distance", r.distance)
    })
}

/// An opaque offset of a path on a surface: made by `strake_offset_new`, released by
/// `strake_offset_free`. Immutable; may be read from many threads at once.
pub struct StrakeOffset {
    offset: SurfaceOffset,
}

impl StrakeOffset {
    /// Wraps an offset of the Rust API.
    pub fn new(offset: SurfaceOffset) -> Self {
        StrakeOffset { offset }
    }
}

/// The offset options of the Rust API for the C options (zeros give the defaults), checked.
pub(crate) fn offset_options(o: &StrakeOffsetOptions) -> Result<OffsetOptions, Failure> {
    let mut opts = OffsetOptions::new(o.chord_tolerance);
    if o.trace_tolerance != 0.0 {
        opts.trace = TraceOptions::new(o.trace_tolerance);
    }
    if o.samples != 0 {
        opts.samples = o.samples;
    }
    if o.max_samples != 0 {
        opts.max_samples = o.max_samples;
    }
    opts.check()?;
    Ok(opts)
}

/// The offset of `curve` on `surface`: the curve at geodesic distance d to the left (B side)
/// or right of it, computed point by point as the end of the geodesic leaving the path
/// perpendicularly, sampled adaptively, trimmed where it leaves the surface and where it forms
/// loops (d beyond the radius of geodesic curvature on a concave side, or parts far apart
/// along the path crossing each other, as the legs of a U: the parts nearer the path than d
/// are cut).
///
/// - `side`: a `StrakeOffsetSide` value.
/// - Distance: `distance_t` NULL and `distance_count` = 1: the constant `distances[0]`;
///   otherwise `distance_count` distances at the strictly increasing path parameters
///   `distance_t`, linear between them and held beyond the ends. Finite and >= 0.
/// - `options`: see `StrakeOffsetOptions` (zeros except `chord_tolerance` give defaults).
///
/// On success writes a new handle to `*out` (free with `strake_offset_free`); read it with
/// `strake_offset_summary`, `strake_offset_piece_curve`, `strake_offset_piece_points`,
/// `strake_offset_exits` and `strake_offset_loops`.
///
/// Errors (nothing written): NULL_POINTER (`surface`, `curve`, `distances`, `options`,
/// `out`); INVALID_ARGUMENT (`side` unknown, a distance negative or not finite, parameters not
/// increasing, bad options; naming the index and value); LEAVES_SURFACE (no part of the
/// offset lies on the surface; naming the distance); NOT_CONVERGED (`max_samples` used up);
/// GEODESIC_INCOMPLETE; every error of `strake_frame_at` on the path. Thread-safe.
///
/// # Safety
/// Handles NULL or live; `distance_t` NULL or `distance_count` doubles; `distances` NULL or
/// `distance_count` doubles; `options` NULL or valid; `out` NULL or a writable
/// `StrakeOffset *`.
#[unsafe(no_mangle)]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn strake_offset_new(
    surface: *const StrakeSurface,
    curve: *const StrakeCurve,
    side: u32,
    distance_t: *const f64,
    distances: *const f64,
    distance_count: usize,
    options: *const StrakeOffsetOptions,
    out: *mut *mut StrakeOffset,
) -> StrakeStatus {
    guard("strake_offset_new", || {
        // SAFETY: the caller passes live handles and valid pointers or NULL.
        let (s, c) = unsafe { (input(surface, "surface")?, input(curve, "curve")?) };
        let o = unsafe { input(options, "options")? };
        let slot = output(out, "out")?;
        // SAFETY: `distance_count` doubles by the contract.
        let d = unsafe { input_slice(distances, distance_count, "distances", "distance_count")? };
        let distance = if distance_t.is_null() {
            if d.len() != 1 {
                return Err(Failure::invalid(format!(
                    "`distance_t` is NULL but `distance_count` = {}: a constant distance is \
                     one value",
                    d.len()
                )));
            }
            OffsetDistance::Constant(d[0])
        } else {
            // SAFETY: as above.
            let t =
                unsafe { input_slice(distance_t, distance_count, "distance_t", "distance_count")? };
            OffsetDistance::Table {
                t: t.to_vec(),
                d: d.to_vec(),
            }
        };
        let side = match side {
            x if x == StrakeOffsetSide::Left as u32 => OffsetSide::Left,
            x if x == StrakeOffsetSide::Right as u32 => OffsetSide::Right,
            other => {
                return Err(Failure::invalid(format!(
                    "`side` = {other}; it must be 0 (left) or 1 (right)"
                )));
            }
        };
        let opts = offset_options(o)?;
        let offset = offset_path(s.source(), c.curve(), side, &distance, &opts)?;
        // SAFETY: checked non-null and aligned.
        unsafe {
            slot.as_ptr()
                .write(MaybeUninit::new(Box::into_raw(Box::new(StrakeOffset {
                    offset,
                }))))
        };
        Ok(())
    })
}

/// Releases an offset. NULL is a no-op. Curve handles made from it stay valid.
///
/// # Safety
/// `offset` must be NULL or a handle from `strake_offset_new` not yet freed.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_offset_free(offset: *mut StrakeOffset) {
    let _ = guard("strake_offset_free", || {
        if !offset.is_null() {
            // SAFETY: made by `Box::into_raw` in `strake_offset_new`.
            drop(unsafe { Box::from_raw(offset) });
        }
        Ok(())
    });
}

/// Counts and figures of an offset into `*out`. Errors: NULL_POINTER. Thread-safe.
///
/// # Safety
/// `offset` NULL or live; `out` NULL or writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_offset_summary(
    offset: *const StrakeOffset,
    out: *mut StrakeOffsetSummary,
) -> StrakeStatus {
    guard("strake_offset_summary", || {
        // SAFETY: live handle or NULL.
        let o = &unsafe { input(offset, "offset")? }.offset;
        let summary = StrakeOffsetSummary {
            pieces: o.pieces.len(),
            exits: o.exits.len(),
            loops: o.loops.len(),
            points: o.pieces.iter().map(|p| p.samples.len()).sum(),
            fit_error: o.fit_error,
            traces: o.traces,
            jets: o.jets,
        };
        write(out, "out", summary)
    })
}

fn piece(
    o: &SurfaceOffset,
    index: usize,
) -> Result<&crate::geodesics::offset::OffsetPiece, Failure> {
    o.pieces.get(index).ok_or_else(|| {
        Failure::invalid(format!(
            "`index` = {index} but the offset has {} pieces",
            o.pieces.len()
        ))
    })
}

/// A new curve handle for piece `index` of an offset: a cubic B-spline in (u, v) on t in
/// [0, 1] through the piece's points (free with `strake_curve_free`; it outlives the offset).
/// Errors: NULL_POINTER; INVALID_ARGUMENT (`index` not below the piece count). Thread-safe.
///
/// # Safety
/// `offset` NULL or live; `out` NULL or a writable `StrakeCurve *`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_offset_piece_curve(
    offset: *const StrakeOffset,
    index: usize,
    out: *mut *mut StrakeCurve,
) -> StrakeStatus {
    guard("strake_offset_piece_curve", || {
        // SAFETY: live handle or NULL.
        let o = &unsafe { input(offset, "offset")? }.offset;
        output(out, "out")?;
        let p = piece(o, index)?;
        publish(StrakeCurve::new(Box::new(p.curve.clone())), out)
    })
}

/// The points of piece `index` of an offset, in path order, through the buffer protocol
/// (`buf`, `capacity`, `count`; BUFFER_TOO_SMALL sets `*count` to the number needed).
/// Errors: NULL_POINTER; INVALID_ARGUMENT (`index`); BUFFER_TOO_SMALL. Thread-safe.
///
/// # Safety
/// `offset` NULL or live; `buf` NULL or room for `capacity` points; `count` NULL or writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_offset_piece_points(
    offset: *const StrakeOffset,
    index: usize,
    buf: *mut StrakeOffsetPoint,
    capacity: usize,
    count: *mut usize,
) -> StrakeStatus {
    guard("strake_offset_piece_points", || {
        // SAFETY: live handle or NULL.
        let o = &unsafe { input(offset, "offset")? }.offset;
        let out = out_buffer(buf, capacity, count)?;
        let p = piece(o, index)?;
        let pts: Vec<StrakeOffsetPoint> = p
            .samples
            .iter()
            .map(|s| StrakeOffsetPoint {
                t: s.t,
                distance: s.distance,
                u: s.u,
                v: s.v,
                point: [s.point.x, s.point.y, s.point.z],
                carried_tangent: [
                    s.carried_tangent.x,
                    s.carried_tangent.y,
                    s.carried_tangent.z,
                ],
            })
            .collect();
        out.deliver(&pts, "offset points")
    })
}

fn intervals(v: &[crate::geodesics::offset::PathInterval]) -> Vec<StrakePathInterval> {
    v.iter()
        .map(|i| StrakePathInterval { t0: i.t0, t1: i.t1 })
        .collect()
}

/// The path intervals whose offset leaves the surface (or meets a degenerate point), through
/// the buffer protocol. Errors: NULL_POINTER; BUFFER_TOO_SMALL. Thread-safe.
///
/// # Safety
/// As `strake_offset_piece_points`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_offset_exits(
    offset: *const StrakeOffset,
    buf: *mut StrakePathInterval,
    capacity: usize,
    count: *mut usize,
) -> StrakeStatus {
    guard("strake_offset_exits", || {
        // SAFETY: live handle or NULL.
        let o = &unsafe { input(offset, "offset")? }.offset;
        out_buffer(buf, capacity, count)?.deliver(&intervals(&o.exits), "intervals")
    })
}

/// The path intervals whose offset formed a loop and was cut off, through the buffer
/// protocol. Errors: NULL_POINTER; BUFFER_TOO_SMALL. Thread-safe.
///
/// # Safety
/// As `strake_offset_piece_points`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_offset_loops(
    offset: *const StrakeOffset,
    buf: *mut StrakePathInterval,
    capacity: usize,
    count: *mut usize,
) -> StrakeStatus {
    guard("strake_offset_loops", || {
        // SAFETY: live handle or NULL.
        let o = &unsafe { input(offset, "offset")? }.offset;
        out_buffer(buf, capacity, count)?.deliver(&intervals(&o.loops), "intervals")
    })
}
