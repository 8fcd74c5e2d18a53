//! The C ABI of pass planning: patterns projected along a direction (first passes) and plans
//! of iso-scallop or constant step-over passes. Results whose size the host cannot know
//! beforehand are opaque handles, read piece by piece (curves as new curve handles) and
//! through the buffer protocol (`buf`, `capacity`, `count`).

use super::checks::{angles, cutter, tool_side};
use super::curve::{StrakeCurve, publish as publish_curve};
use super::guard::{Failure, guard, input, out_buffer, output};
use super::path_curves::projection_options;
use super::status::StrakeStatus;
use super::surface::{StrakeSurface, finite};
use super::types::{
    StrakeDriveOptions, StrakeDrivePlane, StrakePassInfo, StrakePassOptions, StrakePassSummary,
    StrakePatternInterval, StrakePatternIntervalKind, StrakeStepRule,
};
use crate::geodesics::offset::{OffsetOptions, OffsetSide};
use crate::planning::drive_pattern::{
    DriveOptions, DrivePlane, DriveProjection, PatternIntervalKind, project_along,
};
use crate::planning::passes::{PassOptions, PassPlan, StepRule, plan_passes};
use crate::planning::planar_pattern::ArchimedeanSpiral;
use crate::planning::scallop_cutter::PassCutter;
use std::mem::MaybeUninit;

/// A pattern projected onto a surface along a direction: its pieces (curves on the surface)
/// and its intervals of misses, folds and multiple hits. Made by `strake_drive_project`,
/// released by `strake_drive_result_free`; immutable, so it may be read from many threads.
pub struct StrakeDriveResult {
    result: DriveProjection,
}

/// A plan of passes across a surface. Made by `strake_plan_passes`, released by
/// `strake_pass_plan_free`; immutable, so it may be read from many threads.
pub struct StrakePassPlan {
    plan: PassPlan,
}

fn put<T>(slot: std::ptr::NonNull<MaybeUninit<T>>, value: T) {
    // SAFETY: every slot comes from `output`, which checked it non-null and aligned; the
    // exported functions' contracts make it writable.
    unsafe { slot.as_ptr().write(MaybeUninit::new(value)) };
}

fn finite3(name: &'static str, a: [f64; 3]) -> Result<[f64; 3], Failure> {
    for x in a {
        finite(name, x)?;
    }
    Ok(a)
}

/// Creates the curve handle of an Archimedean spiral in a plane, for `strake_drive_project`
/// (its u and v are read as the plane's x and y): r(theta) = r_start + pitch theta / (2 pi)
/// about `centre` (2 doubles), theta from 0 to 2 pi (r_end - r_start) / pitch, turning
/// counter-clockwise (from x toward y); the curve's parameter is theta (radians).
///
/// Returns `STRAKE_STATUS_OK` and writes a new handle to `*out` (free it with
/// `strake_curve_free`); otherwise `*out` is untouched. Errors: NULL_POINTER (`centre`, `out`);
/// INVALID_ARGUMENT naming the value (non-finite values, r_start < 0, r_end <= r_start, pitch
/// not positive, more than 1e6 turns). Thread-safe.
///
/// # Safety
/// `centre` NULL or 2 doubles; `out` NULL or a writable `StrakeCurve *`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_curve_new_spiral(
    centre: *const f64,
    r_start: f64,
    r_end: f64,
    pitch: f64,
    out: *mut *mut StrakeCurve,
) -> StrakeStatus {
    guard("strake_curve_new_spiral", || {
        // SAFETY: the caller passes 2 doubles or NULL.
        let c = *unsafe { input(centre.cast::<[f64; 2]>(), "centre")? };
        output(out, "out")?;
        let spiral = ArchimedeanSpiral::new(c, r_start, r_end, pitch)?;
        publish_curve(StrakeCurve::new(Box::new(spiral)), out)
    })
}

/// Projects the planar curve `pattern` (its u and v read as the plane's x and y: make lines
/// with `strake_curve_new_nurbs` of degree 1, a spiral with `strake_curve_new_spiral`, or use
/// any curve handle) onto `surface` along `direction` (3 doubles, any nonzero length): each
/// pattern point's ray is the whole line through it along the direction, and the hit taken is
/// the **first along the direction** (the smallest signed distance), by Newton's method on
/// (u, v, distance) from a coarse tessellation. Where the first hit moves continuously the hits
/// form a piece, fitted by a C2 cubic in the parameter plane (t in [0, 1]) to
/// `options->fit_tolerance`; the pattern intervals where rays miss the surface, where the first
/// hit jumps (a fold: a silhouette, a nearer sheet), and where rays hit more than once are
/// reported. Misses and folds are located to `options->locate_tolerance`; detail narrower than
/// the sample spacing may be missed.
///
/// Returns `STRAKE_STATUS_OK` and writes a new result to `*out` (free it with
/// `strake_drive_result_free`; read it with `strake_drive_result_piece_count`,
/// `strake_drive_result_piece` and `strake_drive_result_intervals`); otherwise `*out` is
/// untouched. A pattern that misses the surface everywhere is a success with no piece and one
/// miss interval. Errors: NULL_POINTER (`surface`, `plane`, `direction`, `pattern`, `options`,
/// `out`); INVALID_ARGUMENT (a direction of zero length, parallel plane axes, a bad option, a
/// fit that still fails at 100000 samples); NON_FINITE (a coordinate of the plane or the
/// direction); the surface's and the pattern's own errors (naming the pattern parameter).
/// Thread-safe.
///
/// # Safety
/// `surface` and `pattern` NULL or live handles; `plane`, `options` NULL or valid;
/// `direction` NULL or 3 doubles; `out` NULL or a writable `StrakeDriveResult *`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_drive_project(
    surface: *const StrakeSurface,
    plane: *const StrakeDrivePlane,
    direction: *const f64,
    pattern: *const StrakeCurve,
    options: *const StrakeDriveOptions,
    out: *mut *mut StrakeDriveResult,
) -> StrakeStatus {
    guard("strake_drive_project", || {
        // SAFETY: the caller passes live handles and valid structs, or NULL.
        let s = unsafe { input(surface, "surface")? };
        let pl = unsafe { input(plane, "plane")? };
        let d = *unsafe { input(direction.cast::<[f64; 3]>(), "direction")? };
        let pat = unsafe { input(pattern, "pattern")? };
        let o = unsafe { input(options, "options")? };
        let slot = output(out, "out")?;
        let plane = DrivePlane::new(
            finite3("plane.origin", pl.origin)?,
            finite3("plane.x_axis", pl.x_axis)?,
            finite3("plane.y_axis", pl.y_axis)?,
        )?;
        let mut opts = DriveOptions::new(o.projection.tolerance, o.fit_tolerance);
        opts.projection = projection_options(&o.projection)?;
        if o.samples != 0 {
            opts.samples = o.samples as usize;
        }
        if o.locate_tolerance != 0.0 {
            opts.locate_tolerance = o.locate_tolerance;
        }
        let result = project_along(s.source(), &plane, d, pat.curve(), &opts)?;
        put(slot, Box::into_raw(Box::new(StrakeDriveResult { result })));
        Ok(())
    })
}

/// Writes the number of pieces of `result` to `*count` (0 when every ray misses).
///
/// Returns `STRAKE_STATUS_OK`, or NULL_POINTER (`result`, `count`). Thread-safe.
///
/// # Safety
/// `result` NULL or a live result; `count` NULL or writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_drive_result_piece_count(
    result: *const StrakeDriveResult,
    count: *mut usize,
) -> StrakeStatus {
    guard("strake_drive_result_piece_count", || {
        // SAFETY: a live result or NULL.
        let r = unsafe { input(result, "result")? };
        let slot = output(count, "count")?;
        put(slot, r.result.pieces.len());
        Ok(())
    })
}

/// Creates a curve handle for piece `index` of `result` (the curve in the surface's parameter
/// plane, t in [0, 1], wrapped across the seams declared periodic and held on the domain's
/// edges), and writes to `pattern_range` (NULL, or 2 doubles) the pattern parameters where the
/// piece starts and ends.
///
/// Returns `STRAKE_STATUS_OK` and writes `*out` (free it with `strake_curve_free`; it does not
/// depend on `result`) and `pattern_range`; otherwise nothing. Errors: NULL_POINTER (`result`,
/// `out`); INVALID_ARGUMENT (`index` not below the piece count). Thread-safe.
///
/// # Safety
/// `result` NULL or live; `pattern_range` NULL or 2 writable doubles; `out` NULL or writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_drive_result_piece(
    result: *const StrakeDriveResult,
    index: usize,
    pattern_range: *mut f64,
    out: *mut *mut StrakeCurve,
) -> StrakeStatus {
    guard("strake_drive_result_piece", || {
        // SAFETY: a live result or NULL.
        let r = unsafe { input(result, "result")? };
        output(out, "out")?;
        let range = if pattern_range.is_null() {
            None
        } else {
            Some(output(pattern_range.cast::<[f64; 2]>(), "pattern_range")?)
        };
        let pieces = &r.result.pieces;
        let Some(p) = pieces.get(index) else {
            return Err(Failure::invalid(format!(
                "`index` = {index}: the result has {} pieces",
                pieces.len()
            )));
        };
        if let Some(slot) = range {
            put(
                slot,
                [
                    p.pattern_params[0],
                    *p.pattern_params.last().expect("pieces have hits"),
                ],
            );
        }
        publish_curve(StrakeCurve::new(Box::new(p.curve.clone())), out)
    })
}

/// Copies the intervals of `result` (misses, folds, multiple hits, ordered by start) to `buf`
/// through the buffer protocol: `*count` receives their number; when `capacity` is smaller,
/// STRAKE_STATUS_BUFFER_TOO_SMALL and only `*count` is written (`buf` may be NULL with
/// `capacity` 0 to ask for the size).
///
/// Errors: NULL_POINTER (`result`, `count`, `buf` with `capacity` > 0); BUFFER_TOO_SMALL.
/// Thread-safe.
///
/// # Safety
/// `result` NULL or live; `buf` NULL or room for `capacity` intervals; `count` NULL or
/// writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_drive_result_intervals(
    result: *const StrakeDriveResult,
    buf: *mut StrakePatternInterval,
    capacity: usize,
    count: *mut usize,
) -> StrakeStatus {
    guard("strake_drive_result_intervals", || {
        // SAFETY: a live result or NULL.
        let r = unsafe { input(result, "result")? };
        let ob = out_buffer(buf, capacity, count)?;
        let items: Vec<StrakePatternInterval> = r
            .result
            .intervals
            .iter()
            .map(|i| StrakePatternInterval {
                kind: match i.kind {
                    PatternIntervalKind::Miss => StrakePatternIntervalKind::Miss,
                    PatternIntervalKind::Fold => StrakePatternIntervalKind::Fold,
                    PatternIntervalKind::SeveralHits => StrakePatternIntervalKind::SeveralHits,
                } as u32,
                start: i.start,
                end: i.end,
            })
            .collect();
        ob.deliver(&items, "intervals")
    })
}

/// Releases a result of `strake_drive_project`. NULL is a no-op; curve handles made from it
/// stay valid.
///
/// # Safety
/// `result` NULL or a live result not in use by another thread.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_drive_result_free(result: *mut StrakeDriveResult) {
    let _ = guard("strake_drive_result_free", || {
        if !result.is_null() {
            // SAFETY: made by `Box::into_raw` in `strake_drive_project`.
            drop(unsafe { Box::from_raw(result) });
        }
        Ok(())
    });
}

fn pass_options(o: &StrakePassOptions) -> Result<PassOptions, Failure> {
    let side = tool_side(o.tool_side)?;
    let advance = match o.advance {
        0 => OffsetSide::Left,
        1 => OffsetSide::Right,
        other => {
            return Err(Failure::invalid(format!(
                "`options->advance` = {other}; it must be 0 (left) or 1 (right)"
            )));
        }
    };
    let rule = match o.rule {
        r if r == StrakeStepRule::IsoScallop as u32 => StepRule::IsoScallop {
            height: o.scallop_height,
        },
        r if r == StrakeStepRule::ConstantStepOver as u32 => StepRule::ConstantStepOver {
            step_over: o.step_over,
        },
        other => {
            return Err(Failure::invalid(format!(
                "`options->rule` = {other}; it must be 0 (STRAKE_STEP_RULE_ISO_SCALLOP) or 1 \
                 (STRAKE_STEP_RULE_CONSTANT_STEP_OVER)"
            )));
        }
    };
    if !(o.chord_tolerance.is_finite() && o.chord_tolerance > 0.0) {
        return Err(Failure::invalid(format!(
            "`options->chord_tolerance` = {}: it must be positive and finite",
            crate::numfmt::Exact(o.chord_tolerance)
        )));
    }
    let mut p = PassOptions::iso_scallop(o.ball_radius, side, 1.0, advance, o.chord_tolerance);
    p.rule = rule;
    p.offset = OffsetOptions::new(o.chord_tolerance);
    if o.distance_samples != 0 {
        p.distance_samples = o.distance_samples as usize;
    }
    if o.scallop_samples != 0 {
        p.scallop_samples = o.scallop_samples as usize;
    }
    if o.max_passes != 0 {
        p.max_passes = o.max_passes as usize;
    }
    if o.max_rows != 0 {
        p.max_rows = Some(o.max_rows as usize);
    }
    p.cutter = match o.use_cutter {
        0 => None,
        1 => Some(PassCutter {
            cutter: cutter(&o.cutter)?,
            angles: angles(&o.angles),
        }),
        other => {
            return Err(Failure::invalid(format!(
                "`options->use_cutter` = {other}; it must be 0 (the ball of `ball_radius`) or 1 \
                 (`cutter` at `angles`)"
            )));
        }
    };
    if o.max_jets != 0 {
        p.max_jets = usize::try_from(o.max_jets).unwrap_or(usize::MAX);
    }
    if o.max_offset_jets != 0 {
        p.offset.max_jets = usize::try_from(o.max_offset_jets).unwrap_or(usize::MAX);
    }
    p.check()?;
    Ok(p)
}

/// Plans passes of a ball-end mill (or, with `options->use_cutter` = 1, of a flat-end or
/// toroidal cutter at lead and tilt) across `surface` from the pass `first` (a curve handle on
/// it): each next pass is the geodesic parallel of the one before at the step-over that leaves
/// `options->scallop_height` point by point (iso-scallop: the exact two-circle rule with the
/// surface's curvature across the path for a ball, the exact cusp of the two cutter profiles
/// across the path for a flat or toroidal cutter, which includes the width it cuts), or at
/// `options->step_over` (constant), laid to the side `options->advance`, until no parallel
/// lies on the surface any more (or for `options->max_rows` rows, when not 0: a band around
/// the first pass). A parallel that breaks (the boundary, a trimmed loop) gives several
/// passes. Between every pass and the one it was laid beside, the scallop left is measured:
/// for a ball by a direct construction (the meeting of the two balls' swept tubes), for a
/// cutter by the cusp of its profiles at the step-over the offsets made; not by the rule.
///
/// Returns `STRAKE_STATUS_OK` and writes a new plan to `*out` (free it with
/// `strake_pass_plan_free`; read it with `strake_pass_plan_summary`, `strake_pass_plan_passes`
/// and `strake_pass_plan_curve`); otherwise `*out` is untouched. Errors: NULL_POINTER
/// (`surface`, `first`, `options`, `out`); INVALID_ARGUMENT naming the field and value (a
/// target scallop of zero, NaN or negative, a radius, step-over or tolerance that is not
/// positive and finite, a flag out of range, an invalid cutter or angles, balls or profiles
/// that do not overlap at the constant step-over); CUTTER_TOO_LARGE (the ball or the cutter's
/// profile does not fit the concave curvature across a pass); NOT_CONVERGED (a work cap,
/// `max_jets` or `max_offset_jets`, used up);
/// PASS_LIMIT (more than `max_passes` passes needed); the errors of the offsets
/// (GEODESIC_INCOMPLETE, DEGENERATE_SURFACE, NOT_CONVERGED ...) and of the surface and curve.
/// Thread-safe.
///
/// # Safety
/// `surface` and `first` NULL or live handles; `options` NULL or valid; `out` NULL or a
/// writable `StrakePassPlan *`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_plan_passes(
    surface: *const StrakeSurface,
    first: *const StrakeCurve,
    options: *const StrakePassOptions,
    out: *mut *mut StrakePassPlan,
) -> StrakeStatus {
    guard("strake_plan_passes", || {
        // SAFETY: the caller passes live handles and a valid struct, or NULL.
        let s = unsafe { input(surface, "surface")? };
        let c = unsafe { input(first, "first")? };
        let opts = pass_options(unsafe { input(options, "options")? })?;
        let slot = output(out, "out")?;
        let plan = plan_passes(s.source(), c.curve(), &opts)?;
        put(slot, Box::into_raw(Box::new(StrakePassPlan { plan })));
        Ok(())
    })
}

/// Writes the totals of `plan` to `*out`.
///
/// Returns `STRAKE_STATUS_OK`, or NULL_POINTER (`plan`, `out`). Thread-safe.
///
/// # Safety
/// `plan` NULL or live; `out` NULL or writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_pass_plan_summary(
    plan: *const StrakePassPlan,
    out: *mut StrakePassSummary,
) -> StrakeStatus {
    guard("strake_pass_plan_summary", || {
        // SAFETY: a live plan or NULL.
        let p = &unsafe { input(plan, "plan")? }.plan;
        let slot = output(out, "out")?;
        put(
            slot,
            StrakePassSummary {
                count: p.count,
                rows: p.rows,
                first_length: p.first_length,
                total_length: p.total_length,
                scallop_max: p.scallop_max,
                scallop_min: p.scallop_min,
                offset_points: p.offset_points,
                trace_jets: p.trace_jets,
                covered: i32::from(p.covered),
                offset_attempts: p.offset_attempts,
                unmeasured: p.unmeasured,
            },
        );
        Ok(())
    })
}

/// Copies one `StrakePassInfo` per pass after the first (in plan order: row by row) to `buf`
/// through the buffer protocol: `*count` receives their number (count - 1 of the summary);
/// when `capacity` is smaller, STRAKE_STATUS_BUFFER_TOO_SMALL and only `*count` is written.
///
/// Errors: NULL_POINTER (`plan`, `count`, `buf` with `capacity` > 0); BUFFER_TOO_SMALL.
/// Thread-safe.
///
/// # Safety
/// `plan` NULL or live; `buf` NULL or room for `capacity` entries; `count` NULL or writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_pass_plan_passes(
    plan: *const StrakePassPlan,
    buf: *mut StrakePassInfo,
    capacity: usize,
    count: *mut usize,
) -> StrakeStatus {
    guard("strake_pass_plan_passes", || {
        // SAFETY: a live plan or NULL.
        let p = &unsafe { input(plan, "plan")? }.plan;
        let ob = out_buffer(buf, capacity, count)?;
        let items: Vec<StrakePassInfo> = p
            .passes
            .iter()
            .map(|x| StrakePassInfo {
                row: x.row,
                has_parent: i32::from(x.parent.is_some()),
                parent: x.parent.unwrap_or(0),
                length: x.length,
                step_over_min: x.step_over.0,
                step_over_max: x.step_over.1,
                scallop_max: x.scallop_max,
                scallop_min: x.scallop_min,
                exits: x.exits.len(),
                loops: x.loops.len(),
            })
            .collect();
        ob.deliver(&items, "passes")
    })
}

/// Creates a curve handle for pass `index` after the first (0-based, in the order of
/// `strake_pass_plan_passes`): the pass in the surface's parameter plane, t in [0, 1].
///
/// Returns `STRAKE_STATUS_OK` and writes `*out` (free it with `strake_curve_free`; it does not
/// depend on `plan`); otherwise `*out` is untouched. Errors: NULL_POINTER (`plan`, `out`);
/// INVALID_ARGUMENT (`index` not below the number of passes after the first). Thread-safe.
///
/// # Safety
/// `plan` NULL or live; `out` NULL or writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_pass_plan_curve(
    plan: *const StrakePassPlan,
    index: usize,
    out: *mut *mut StrakeCurve,
) -> StrakeStatus {
    guard("strake_pass_plan_curve", || {
        // SAFETY: a live plan or NULL.
        let p = &unsafe { input(plan, "plan")? }.plan;
        output(out, "out")?;
        let Some(x) = p.passes.get(index) else {
            return Err(Failure::invalid(format!(
                "`index` = {index}: the plan has {} passes after the first",
                p.passes.len()
            )));
        };
        publish_curve(StrakeCurve::new(Box::new(x.curve.clone())), out)
    })
}

/// Releases a plan of `strake_plan_passes`. NULL is a no-op; curve handles made from it stay
/// valid.
///
/// # Safety
/// `plan` NULL or a live plan not in use by another thread.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_pass_plan_free(plan: *mut StrakePassPlan) {
    let _ = guard("strake_pass_plan_free", || {
        if !plan.is_null() {
            // SAFETY: made by `Box::into_raw` in `strake_plan_passes`.
            drop(unsafe { Box::from_raw(plan) });
        }
        Ok(())
    });
}
