//! Fibre courses through the C ABI. A natural course is `strake_geodesic_trace` with an angle;
//! here: the fixed-angle course, the adjacent course (a `StrakeOffset`), the gaps and overlaps
//! between two courses (buffer protocol), and the steering and twist summary of a course.

use super::curve::{StrakeCurve, publish};
use super::geodesics::StrakeOffset;
use super::guard::{Failure, guard, input, out_buffer, output};
use super::status::StrakeStatus;
use super::surface::{StrakeSurface, finite};
use super::types::{
    StrakeCourseCheck, StrakeCourseGap, StrakeFibreLimits, StrakeGeodesicEnd, StrakeGeodesicInfo,
    StrakeGeodesicOptions, StrakeOffsetOptions, StrakeOffsetSide,
};
use crate::checks::fibre::FibreLimits;
use crate::geodesics::offset::OffsetSide;
use crate::geodesics::trace::{GeodesicEnd, TraceOptions};
use crate::geometry::math::Vec3;
use crate::planning::courses::{adjacent_course, course_check, course_gaps, fixed_angle_course};
use std::mem::MaybeUninit;

fn side_of(side: u32) -> Result<OffsetSide, Failure> {
    match side {
        x if x == StrakeOffsetSide::Left as u32 => Ok(OffsetSide::Left),
        x if x == StrakeOffsetSide::Right as u32 => Ok(OffsetSide::Right),
        other => Err(Failure::invalid(format!(
            "`side` = {other}; it must be 0 (left) or 1 (right)"
        ))),
    }
}

fn trace_options(o: &StrakeGeodesicOptions) -> TraceOptions {
    let mut t = TraceOptions::new(o.tolerance);
    if o.max_steps != 0 {
        t.max_steps = o.max_steps;
    }
    t
}

/// A fixed-angle course from (u, v): its unit tangent keeps the angle `angle` (radians) to the
/// reference direction e, the space direction `axis` (3 doubles) projected onto the tangent
/// plane, counted toward N x e: T = cos(angle) e + sin(angle) (N x e). Integrated for arc
/// length `length` with the error per step `options.tolerance` in space.
///
/// On success writes a new curve handle to `*out_curve` (t = arc length) and, when `out_info`
/// is not NULL, why it ended (`end` 0: the length; 1: the domain side `side`, exactly on
/// it; 2: where the axis runs along the normal); `point`, `tangent`, `u`, `v` give the end.
///
/// Errors (nothing written): NULL_POINTER (`surface`, `axis`, `options`, `out_curve`);
/// INVALID_ARGUMENT (a zero axis or one along the normal at the start, `length` or
/// `tolerance` not positive, naming the values); NON_FINITE; OUT_OF_DOMAIN;
/// DEGENERATE_SURFACE; LEAVES_SURFACE; GEODESIC_INCOMPLETE; SURFACE_CALLBACK_FAILED.
/// Thread-safe.
///
/// # Safety
/// `surface` NULL or live; `axis` NULL or 3 doubles; `options` NULL or valid; `out_curve`
/// NULL or a writable `StrakeCurve *`; `out_info` NULL or writable.
#[unsafe(no_mangle)]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn strake_course_fixed_angle(
    surface: *const StrakeSurface,
    u: f64,
    v: f64,
    axis: *const f64,
    angle: f64,
    length: f64,
    options: *const StrakeGeodesicOptions,
    out_curve: *mut *mut StrakeCurve,
    out_info: *mut StrakeGeodesicInfo,
) -> StrakeStatus {
    guard("strake_course_fixed_angle", || {
        // SAFETY: live handle and valid pointers or NULL, by the contract.
        let s = unsafe { input(surface, "surface")? };
        let a = unsafe { input(axis.cast::<[f64; 3]>(), "axis")? };
        let o = unsafe { input(options, "options")? };
        output(out_curve, "out_curve")?;
        if !out_info.is_null() {
            output(out_info, "out_info")?;
        }
        let c = fixed_angle_course(
            s.source(),
            finite("u", u)?,
            finite("v", v)?,
            Vec3::new(a[0], a[1], a[2]),
            angle,
            length,
            &trace_options(o),
        )?;
        let last = *c.curve.nodes().last().expect("two nodes or more");
        let mut info = StrakeGeodesicInfo {
            length: c.length,
            u: last.u,
            v: last.v,
            accepted_steps: c.stats.accepted,
            rejected_steps: c.stats.rejected,
            jets: c.stats.jets,
            ..Default::default()
        };
        let j = s.source().checked_jet(
            last.u,
            last.v,
            crate::geometry::jet::DerivOrder::First,
            &mut Default::default(),
        )?;
        let t = (j.su * last.du + j.sv * last.dv).normalize();
        info.point = [j.p.x, j.p.y, j.p.z];
        info.tangent = [t.x, t.y, t.z];
        let (end, side) = match c.end {
            GeodesicEnd::Length => (StrakeGeodesicEnd::Length as u32, 0),
            GeodesicEnd::Boundary(side) => (StrakeGeodesicEnd::Boundary as u32, 1 + side as u32),
            GeodesicEnd::Degenerate { .. } => (StrakeGeodesicEnd::Degenerate as u32, 0),
        };
        info.end = end;
        info.side = side;
        publish(StrakeCurve::new(Box::new(c.curve)), out_curve)?;
        if !out_info.is_null() {
            let slot = output(out_info, "out_info")?;
            // SAFETY: checked non-null and aligned.
            unsafe { slot.as_ptr().write(MaybeUninit::new(info)) };
        }
        Ok(())
    })
}

/// The adjacent course one tow band `band_width` to `side` (a `StrakeOffsetSide` value) of
/// `course`: its geodesic parallel at that distance, as an offset handle (read and free it
/// like one from `strake_offset_new`, whose errors and options apply; INVALID_ARGUMENT also
/// for a band width not positive and finite).
///
/// # Safety
/// Handles NULL or live; `options` NULL or valid; `out` NULL or a writable `StrakeOffset *`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_course_adjacent(
    surface: *const StrakeSurface,
    course: *const StrakeCurve,
    band_width: f64,
    side: u32,
    options: *const StrakeOffsetOptions,
    out: *mut *mut StrakeOffset,
) -> StrakeStatus {
    guard("strake_course_adjacent", || {
        // SAFETY: live handles and valid pointers or NULL.
        let (s, c) = unsafe { (input(surface, "surface")?, input(course, "course")?) };
        let o = unsafe { input(options, "options")? };
        let slot = output(out, "out")?;
        let side = side_of(side)?;
        let opts = super::geodesics::offset_options(o)?;
        let offset = adjacent_course(s.source(), c.curve(), band_width, side, &opts)?;
        // SAFETY: checked non-null and aligned.
        unsafe {
            slot.as_ptr().write(MaybeUninit::new(Box::into_raw(Box::new(
                StrakeOffset::new(offset),
            ))))
        };
        Ok(())
    })
}

/// Gaps and overlaps between the bands of width `band_width` centred on courses `a` and `b`
/// (`b` to `side` of `a`): at `samples` even parameters of `a` the geodesic perpendicular
/// to `a` meets the edge of `b`'s band (its geodesic parallel at band_width/2); the width
/// across `a` from `a`'s edge to it is a gap (> 0) or an overlap (< 0). Intervals where its
/// size exceeds `tolerance` go to the buffer (`buf`, `capacity`, `count`; BUFFER_TOO_SMALL
/// sets `*count` to the number needed); an edge of `b` beyond `a`'s centreline (an overlap
/// deeper than band_width/2) is met by the perpendicular the other way, within 1.5 band
/// widths; `*unmatched` (when not NULL) receives the number of samples where no edge of `b`
/// was met (within 3 band widths toward `b`, 1.5 away). `options.tolerance` is the error per
/// step of the traces.
///
/// Errors: NULL_POINTER (`surface`, `a`, `b`, `options`, `count`; `buf` when `capacity` > 0);
/// INVALID_ARGUMENT (`side`, `band_width` or `tolerance` not positive, fewer than 2
/// samples); BUFFER_TOO_SMALL; the errors of the traces and of `a`'s frames. Thread-safe.
///
/// # Safety
/// Handles NULL or live; `options` NULL or valid; `buf` NULL or room for `capacity`; `count`
/// NULL or writable; `unmatched` NULL or writable.
#[unsafe(no_mangle)]
#[allow(clippy::too_many_arguments)]
pub unsafe extern "C" fn strake_course_gaps(
    surface: *const StrakeSurface,
    a: *const StrakeCurve,
    b: *const StrakeCurve,
    side: u32,
    band_width: f64,
    samples: usize,
    tolerance: f64,
    options: *const StrakeGeodesicOptions,
    buf: *mut StrakeCourseGap,
    capacity: usize,
    count: *mut usize,
    unmatched: *mut usize,
) -> StrakeStatus {
    guard("strake_course_gaps", || {
        // SAFETY: live handles and valid pointers or NULL.
        let s = unsafe { input(surface, "surface")? };
        let (ca, cb) = unsafe { (input(a, "a")?, input(b, "b")?) };
        let o = unsafe { input(options, "options")? };
        let out = out_buffer(buf, capacity, count)?;
        if !unmatched.is_null() {
            output(unmatched, "unmatched")?;
        }
        let gaps = course_gaps(
            s.source(),
            ca.curve(),
            cb.curve(),
            side_of(side)?,
            band_width,
            samples,
            tolerance,
            &trace_options(o),
        )?;
        let items: Vec<StrakeCourseGap> = gaps
            .intervals
            .iter()
            .map(|g| StrakeCourseGap {
                t0: g.t0,
                t1: g.t1,
                overlap: g.overlap as i32,
                worst: g.worst,
            })
            .collect();
        out.deliver(&items, "intervals")?;
        if !unmatched.is_null() {
            let slot = output(unmatched, "unmatched")?;
            // SAFETY: checked non-null and aligned.
            unsafe { slot.as_ptr().write(MaybeUninit::new(gaps.unmatched)) };
        }
        Ok(())
    })
}

/// Steering and twist along `course` at `samples` (>= 2) even parameters, with the limits of
/// `strake_check_fibre`, summarised into `*out` (largest |kg|, smallest steering radius,
/// largest edge strain and |tg|, violation counts, length).
///
/// Errors: NULL_POINTER (`surface`, `course`, `limits`, `out`); INVALID_ARGUMENT (a limit not
/// positive and finite, fewer than 2 samples); every error of `strake_frame_at` on the course.
/// Thread-safe.
///
/// # Safety
/// Handles NULL or live; `limits` NULL or valid; `out` NULL or writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_course_check(
    surface: *const StrakeSurface,
    course: *const StrakeCurve,
    limits: *const StrakeFibreLimits,
    samples: usize,
    out: *mut StrakeCourseCheck,
) -> StrakeStatus {
    guard("strake_course_check", || {
        // SAFETY: live handles and valid pointers or NULL.
        let (s, c) = unsafe { (input(surface, "surface")?, input(course, "course")?) };
        let l = unsafe { input(limits, "limits")? };
        let slot = output(out, "out")?;
        let limits = FibreLimits {
            tow_width: l.tow_width,
            min_steering_radius: l.min_steering_radius,
            max_twist_rate: l.max_twist_rate,
        };
        let r = course_check(s.source(), c.curve(), &limits, samples)?;
        let v = StrakeCourseCheck {
            max_steering_curvature: r.max_steering_curvature,
            min_steering_radius: r.min_steering_radius,
            max_edge_strain: r.max_edge_strain,
            max_twist_rate: r.max_twist_rate,
            steering_violations: r.steering_violations,
            twist_violations: r.twist_violations,
            length: r.length,
        };
        // SAFETY: checked non-null and aligned.
        unsafe { slot.as_ptr().write(MaybeUninit::new(v)) };
        Ok(())
    })
}
