//! What a machining or fibre-placement engineer asks of a path, per sample (from a
//! `StrakeFrame` the host got from strake) and over a whole path (from the samples of the
//! sampling functions and one value per sample).
//!
//! These are local, second-order geometric aids: they see the surface's curvature at each
//! sample, not the whole cutter and holder against the part, nor the machine's dynamics, nor the
//! material. Toolpaths and courses planned with them must be verified by simulation and on the
//! machine.
//!
//! Sign convention of every check: the tool is on one side of the surface (`tool_side`); a
//! curvature "concave toward the tool" is s kn with s = +1 when the tool is on the side N points
//! to (`STRAKE_TOOL_SIDE_ALONG_NORMAL`) and -1 otherwise: positive where the surface bends
//! toward the tool (a pocket floor seen from the cutter).

use super::guard::{Failure, check_count, guard, input, input_slice, non_null, out_buffer, output};
use super::status::StrakeStatus;
use super::types::{
    StrakeCutter, StrakeCutterKind, StrakeCutterRadii, StrakeCutterStepOver, StrakeExtremes,
    StrakeFeedLimits, StrakeFibreLimits, StrakeFibreState, StrakeFrame, StrakeGougeState,
    StrakeRearGouge, StrakeSample, StrakeScallop, StrakeStepOver, StrakeToolAngles, StrakeToolAxis,
    StrakeToolSide, StrakeTowEdges, StrakeViolation,
};
use crate::checks::{
    Cutter, FeedLimits, FibreLimits, ScallopSample, ToolAngles, ToolSide, cross_path_curvature,
    curvature_limited_feed, cutter_radii, extremes, feed_path, fibre_path, fibre_state, gouge_path,
    gouge_state, rear_gouge, rear_gouge_path, scallop_path, scallop_sample, step_over_for_cutter,
    step_over_for_scallop, step_over_for_scallop_approx, step_over_path, tool_axis, tool_axis_path,
    tow_edges, tow_edges_path, violations,
};
use crate::error::StrakeError;
use crate::geometry::frame::DarbouxFrame;
use std::mem::MaybeUninit;
use std::ptr::NonNull;

/// The checked frame behind a `const StrakeFrame *` argument.
///
/// # Safety
/// `p` must be NULL or point to a valid `StrakeFrame`.
unsafe fn frame(p: *const StrakeFrame) -> Result<DarbouxFrame, Failure> {
    // SAFETY: forwarded from the caller.
    Ok(unsafe { input(p, "frame")? }.to_darboux()?)
}

/// The tool side for a `tool_side` argument.
pub(crate) fn tool_side(code: u32) -> Result<ToolSide, Failure> {
    match code {
        c if c == StrakeToolSide::AlongNormal as u32 => Ok(ToolSide::AlongNormal),
        c if c == StrakeToolSide::AgainstNormal as u32 => Ok(ToolSide::AgainstNormal),
        other => Err(Failure::invalid(format!(
            "`tool_side` = {other}; it must be 0 (STRAKE_TOOL_SIDE_ALONG_NORMAL) or 1 \
             (STRAKE_TOOL_SIDE_AGAINST_NORMAL)"
        ))),
    }
}

/// The cutter for a `StrakeCutter` (its dimensions are checked by the checks themselves).
pub(crate) fn cutter(c: &StrakeCutter) -> Result<Cutter, Failure> {
    match c.kind {
        k if k == StrakeCutterKind::Ball as u32 => Ok(Cutter::Ball { radius: c.radius }),
        k if k == StrakeCutterKind::Flat as u32 => Ok(Cutter::Flat { radius: c.radius }),
        k if k == StrakeCutterKind::Toroidal as u32 => Ok(Cutter::Toroidal {
            radius: c.radius,
            corner_radius: c.corner_radius,
        }),
        other => Err(Failure::invalid(format!(
            "`cutter->kind` = {other}; it must be 0 (BALL), 1 (FLAT) or 2 (TOROIDAL)"
        ))),
    }
}

/// The feed limits for a `StrakeFeedLimits` (a `max_jerk` of 0 means no jerk limit).
fn feed_limits(l: &StrakeFeedLimits) -> Result<FeedLimits, Failure> {
    if !(l.max_jerk.is_finite() && l.max_jerk >= 0.0) {
        return Err(Failure::invalid(format!(
            "limits->max_jerk = {} must be positive and finite, or 0 for no jerk limit",
            crate::numfmt::Exact(l.max_jerk)
        )));
    }
    Ok(FeedLimits {
        feed: l.feed,
        max_acceleration: l.max_acceleration,
        max_jerk: (l.max_jerk > 0.0).then_some(l.max_jerk),
    })
}

fn fibre_limits(l: &StrakeFibreLimits) -> FibreLimits {
    FibreLimits {
        tow_width: l.tow_width,
        min_steering_radius: l.min_steering_radius,
        max_twist_rate: l.max_twist_rate,
    }
}

/// The checked frames of a path's samples; a bad frame fails naming its sample index.
fn path_frames(samples: &[StrakeSample]) -> Result<Vec<DarbouxFrame>, Failure> {
    samples
        .iter()
        .enumerate()
        .map(|(index, s)| {
            s.frame.to_darboux().map_err(|e| {
                Failure::from(StrakeError::AtSample {
                    index,
                    error: Box::new(e),
                })
            })
        })
        .collect()
}

/// The cutter and tool angles behind `const StrakeCutter *` and `const StrakeToolAngles *`
/// arguments (NULL checked, the cutter validated), for every check that takes both.
///
/// # Safety
/// Each pointer NULL or valid for its type.
unsafe fn cutter_and_angles(
    cutter: *const StrakeCutter,
    angles: *const StrakeToolAngles,
) -> Result<(Cutter, ToolAngles), Failure> {
    // SAFETY: the caller's contract.
    let c = self::cutter(unsafe { input(cutter, "cutter")? })?;
    let a = self::angles(unsafe { input(angles, "angles")? });
    Ok((c, a))
}

/// The part every `..._path` function shares: the samples' frames checked (a bad one names
/// its sample), `check` run over them, and its results converted (with the frame they belong
/// to) and copied to the checked output array `dst`, only when every sample succeeded.
fn over_path<G, T>(
    samples: &[StrakeSample],
    dst: NonNull<T>,
    check: impl FnOnce(&[DarbouxFrame], &mut Vec<G>) -> crate::error::Result<()>,
    convert: impl Fn(&DarbouxFrame, &G) -> T,
) -> Result<(), Failure> {
    let frames = path_frames(samples)?;
    let mut got = Vec::new();
    check(&frames, &mut got)?;
    deliver(
        dst,
        frames
            .iter()
            .zip(&got)
            .map(|(f, g)| convert(f, g))
            .collect(),
    );
    Ok(())
}

impl From<&ScallopSample> for StrakeScallop {
    fn from(g: &ScallopSample) -> Self {
        StrakeScallop {
            cross_curvature: g.cross_curvature,
            height: g.height,
            height_approx: g.height_approx,
        }
    }
}

/// An output array of `count` elements (NULL, alignment and size checked); written only on
/// success, by [`deliver`].
fn out_array<T>(p: *mut T, count: usize, name: &str) -> Result<NonNull<T>, Failure> {
    let nn = non_null(p.cast_const(), name)?;
    check_count::<T>(count, "sample_count")?;
    Ok(nn)
}

/// Copies the results of a path check to the caller's array.
fn deliver<T>(out: NonNull<T>, items: Vec<T>) {
    // SAFETY: `out` comes from `out_array`, checked non-null, aligned and sized for
    // `sample_count` elements, which is `items.len()` (one result per sample); the caller
    // provides that much writable room and it cannot overlap our own vector.
    unsafe { std::ptr::copy_nonoverlapping(items.as_ptr(), out.as_ptr(), items.len()) };
}

pub(crate) fn angles(a: &StrakeToolAngles) -> ToolAngles {
    ToolAngles {
        lead: a.lead,
        tilt: a.tilt,
    }
}

/// Writes `value` to a checked output slot.
fn put<T>(slot: NonNull<MaybeUninit<T>>, value: T) {
    // SAFETY: every slot comes from `output`, which checked it non-null and aligned; the
    // exported functions' contracts make it writable.
    unsafe { slot.as_ptr().write(MaybeUninit::new(value)) };
}

/// The local gouge state of `cutter` at the sample `frame` (from strake), with the tool on
/// `tool_side` and its axis set by `angles` (lead toward T, tilt toward B, see
/// `StrakeToolAngles`).
///
/// Second-order contact: the cutter does not cut into the surface near the contact point when,
/// in every tangent direction, it bends away from the surface at least as fast as the surface
/// bends toward it. For a ball-end mill of radius r this is r max(s k1, s k2) <= 1: the largest
/// ball free of local gouging has the radius `out->concave_radius`. For flat and toroidal
/// cutters the effective radius across the inclination plane is R/sin(beta) + r (beta the
/// axis's inclination from the tool-side normal; across the path only for pure lead, see
/// `strake_cutter_radii`). `out->gouges` also covers rear gouging (the bottom and the heel,
/// `strake_check_rear_gouge`), and `out->min_lead` is the smallest lead angle (at the given
/// tilt) that avoids local and rear gouging together. (Changed: both used to see local
/// gouging only.)
///
/// Returns `STRAKE_STATUS_OK` and writes `*out`; otherwise `*out` is untouched. Errors:
/// NULL_POINTER (`frame`, `cutter`, `angles`, `out`); NON_FINITE (a frame field, named);
/// INVALID_ARGUMENT (a frame vector that is not unit length, `tool_side` not 0 or 1, an unknown
/// `cutter->kind`, a radius not positive and finite, a corner radius above the radius, an angle
/// outside (-pi/2, pi/2); the message names the field). Thread-safe.
///
/// # Safety
/// Each pointer NULL or valid for its type; `out` writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_check_gouge(
    frame: *const StrakeFrame,
    tool_side: u32,
    cutter: *const StrakeCutter,
    angles: *const StrakeToolAngles,
    out: *mut StrakeGougeState,
) -> StrakeStatus {
    guard("strake_check_gouge", || {
        // SAFETY: the caller passes valid values or NULL.
        let f = unsafe { self::frame(frame)? };
        let (c, a) = unsafe { cutter_and_angles(cutter, angles)? };
        let slot = output(out, "out")?;
        let g = gouge_state(&f, self::tool_side(tool_side)?, &c, &a)?;
        put(slot, StrakeGougeState::from(&g));
        Ok(())
    })
}

/// The scallop height left at the sample `frame` between this pass and an adjacent one a
/// step-over `step_over` away (arc length across the path), for a cutter of radius
/// `cutter_radius` across the path (the ball radius of a ball-end mill; for flat and toroidal
/// cutters the radius of the profile they sweep across the path,
/// `StrakeCutterRadii.across_path` from `strake_cutter_radii`, not the inclination-plane
/// radius `effective_radius_cross`), with the tool on `tool_side`.
/// `strake_check_step_over_cutter` also limits the step-over by the width the cutter cuts.
///
/// In the plane across the path the surface is its osculating circle of curvature
/// kappa = s kn(B) (`out->cross_curvature`, concave toward the tool when positive). Exact
/// circle geometry gives `out->height`; on a plane it is r - sqrt(r^2 - w^2/4).
/// `out->height_approx` = (w^2/8)(1/r - kappa). Host length unit.
///
/// Returns `STRAKE_STATUS_OK` and writes `*out`; otherwise `*out` is untouched. Errors:
/// NULL_POINTER (`frame`, `out`); NON_FINITE (a frame field); INVALID_ARGUMENT (a frame vector
/// not unit length, `tool_side` not 0 or 1, `cutter_radius` or `step_over` not positive and
/// finite, a cutter that does not fit the concave curvature (kappa r >= 1: it gouges), a
/// step-over so wide that adjacent passes do not overlap). Thread-safe.
///
/// # Safety
/// `frame` NULL or valid; `out` NULL or writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_check_scallop(
    frame: *const StrakeFrame,
    tool_side: u32,
    cutter_radius: f64,
    step_over: f64,
    out: *mut StrakeScallop,
) -> StrakeStatus {
    guard("strake_check_scallop", || {
        // SAFETY: the caller passes a valid frame or NULL.
        let f = unsafe { self::frame(frame)? };
        let slot = output(out, "out")?;
        let side = self::tool_side(tool_side)?;
        let g = scallop_sample(&f, side, cutter_radius, step_over)?;
        put(slot, StrakeScallop::from(&g));
        Ok(())
    })
}

/// The largest step-over (arc length across the path) that keeps the scallop height at the
/// sample `frame` at or below `scallop_height`, for a cutter of radius `cutter_radius` across
/// the path (`StrakeCutterRadii.across_path` for flat and toroidal cutters), with the tool on
/// `tool_side`: the inverse of `strake_check_scallop` (on a plane w = 2 sqrt(h (2r - h))).
/// `out->step_over_approx` = sqrt(8 h / (1/r - kappa)). Not limited by the width the cutter
/// cuts: use `strake_check_step_over_cutter` for that.
///
/// Returns `STRAKE_STATUS_OK` and writes `*out`; otherwise `*out` is untouched. Errors: as for
/// `strake_check_scallop`, with `scallop_height` required positive and finite and reachable
/// (not above what the geometry allows). Thread-safe.
///
/// # Safety
/// `frame` NULL or valid; `out` NULL or writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_check_step_over(
    frame: *const StrakeFrame,
    tool_side: u32,
    cutter_radius: f64,
    scallop_height: f64,
    out: *mut StrakeStepOver,
) -> StrakeStatus {
    guard("strake_check_step_over", || {
        // SAFETY: the caller passes a valid frame or NULL.
        let f = unsafe { self::frame(frame)? };
        let slot = output(out, "out")?;
        let kappa = cross_path_curvature(&f, self::tool_side(tool_side)?);
        let result = StrakeStepOver {
            cross_curvature: kappa,
            step_over: step_over_for_scallop(cutter_radius, scallop_height, kappa)?,
            step_over_approx: step_over_for_scallop_approx(cutter_radius, scallop_height, kappa)?,
        };
        put(slot, result);
        Ok(())
    })
}

/// The highest feed at the sample `frame`: min(feed, sqrt(a_max/k), (j_max/k^2)^(1/3)) with k
/// = sqrt(kn^2 + kg^2) the path's space curvature (normal acceleration v^2 k, and at constant
/// speed on the osculating circle jerk v^3 k^2); the programmed feed where k = 0. Writes it to
/// `*out` in the units of `limits` (e.g. mm/s with mm/s^2 and mm/s^3). Changes of curvature
/// along the path add jerk this local rule does not see: the machine's look-ahead must still
/// handle them.
///
/// Returns `STRAKE_STATUS_OK` and writes `*out`; otherwise `*out` is untouched. Errors:
/// NULL_POINTER (`frame`, `limits`, `out`); NON_FINITE (a frame field); INVALID_ARGUMENT (a
/// frame vector not unit length; `limits->feed` or `limits->max_acceleration` not positive and
/// finite; `limits->max_jerk` negative, NaN or infinite (0 means no jerk limit)). Thread-safe.
///
/// # Safety
/// Each pointer NULL or valid for its type; `out` writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_check_feed(
    frame: *const StrakeFrame,
    limits: *const StrakeFeedLimits,
    out: *mut f64,
) -> StrakeStatus {
    guard("strake_check_feed", || {
        // SAFETY: the caller passes valid values or NULL.
        let f = unsafe { self::frame(frame)? };
        let l = unsafe { input(limits, "limits")? };
        let slot = output(out, "out")?;
        let limits = feed_limits(l)?;
        put(slot, curvature_limited_feed(&f, &limits)?);
        Ok(())
    })
}

/// Steering and twist of a fibre course at the sample `frame`: steering curvature |kg| and
/// radius 1/|kg| (INFINITY along a geodesic), the larger tow-edge strain magnitude including
/// the Gaussian-curvature term (`strake_check_tow_edges`; was (w/2)|kg| alone) for the tow
/// width w,
/// twist rate tg (radians per length: the tangent plane turns about the course at that rate,
/// and the tow or the compaction roller with it), and whether the limits are exceeded.
///
/// Returns `STRAKE_STATUS_OK` and writes `*out`; otherwise `*out` is untouched. Errors:
/// NULL_POINTER (`frame`, `limits`, `out`); NON_FINITE (a frame field); INVALID_ARGUMENT (a
/// frame vector not unit length, a limit not positive and finite, named; NON_FINITE for an
/// edge strain that overflows). Thread-safe.
///
/// # Safety
/// Each pointer NULL or valid for its type; `out` writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_check_fibre(
    frame: *const StrakeFrame,
    limits: *const StrakeFibreLimits,
    out: *mut StrakeFibreState,
) -> StrakeStatus {
    guard("strake_check_fibre", || {
        // SAFETY: the caller passes valid values or NULL.
        let f = unsafe { self::frame(frame)? };
        let l = unsafe { input(limits, "limits")? };
        let slot = output(out, "out")?;
        put(
            slot,
            StrakeFibreState::from(&fibre_state(&f, &fibre_limits(l))?),
        );
        Ok(())
    })
}

/// The tool axis at the sample `frame` for lead and tilt `angles` with the tool on `tool_side`:
/// a = sin(lead) T + cos(lead) sin(tilt) b_t + cos(lead) cos(tilt) n_t in the tool-side frame,
/// n_t = N on the N side and -N otherwise, b_t = n_t x T (unit vector from the cutter tip
/// toward the spindle; `out->local` its components along (T, b_t, n_t), `out->space` the unit
/// vector). A positive tilt leans the axis to the left of travel seen from the tool on either
/// side. (Changed: tilt used to lean toward B on both sides, and the components were along
/// (T, B, N).) The frame's T and N are re-orthonormalised, so the axis is unit to round-off.
///
/// Returns `STRAKE_STATUS_OK` and writes `*out`; otherwise `*out` is untouched. Errors:
/// NULL_POINTER (`frame`, `angles`, `out`); NON_FINITE (a frame field); INVALID_ARGUMENT (a
/// frame vector not unit length, tangent and normal not orthogonal to 1e-6, `tool_side` not 0
/// or 1, an angle outside (-pi/2, pi/2)). Thread-safe.
///
/// # Safety
/// Each pointer NULL or valid for its type; `out` writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_tool_axis(
    frame: *const StrakeFrame,
    tool_side: u32,
    angles: *const StrakeToolAngles,
    out: *mut StrakeToolAxis,
) -> StrakeStatus {
    guard("strake_tool_axis", || {
        // SAFETY: the caller passes valid values or NULL.
        let f = unsafe { self::frame(frame)? };
        let a = self::angles(unsafe { input(angles, "angles")? });
        let slot = output(out, "out")?;
        let axis = tool_axis(&f, self::tool_side(tool_side)?, &a)?;
        put(slot, StrakeToolAxis::from(&axis));
        Ok(())
    })
}

/// Where a per-sample quantity is smallest and largest along a path: `values[i]` is the
/// quantity at `samples[i]` (samples as the sampling functions return them; only their
/// `frame.curve_param` and `arc_length` are read). Values may be infinite; ties give the first
/// sample.
///
/// Returns `STRAKE_STATUS_OK` and writes `*out`; otherwise `*out` is untouched. Errors:
/// NULL_POINTER (`samples`, `values`, `out`); INVALID_ARGUMENT (`sample_count` of 0 or too
/// large, a NaN value, a sample whose t or arc length is not finite; the message names the
/// index). Thread-safe.
///
/// # Safety
/// `samples` and `values` NULL or `sample_count` valid elements; `out` NULL or writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_path_extremes(
    samples: *const StrakeSample,
    values: *const f64,
    sample_count: usize,
    out: *mut StrakeExtremes,
) -> StrakeStatus {
    guard("strake_path_extremes", || {
        // SAFETY: the caller passes arrays of `sample_count` elements or NULL.
        let s = unsafe { input_slice(samples, sample_count, "samples", "sample_count")? };
        let v = unsafe { input_slice(values, sample_count, "values", "sample_count")? };
        let slot = output(out, "out")?;
        put(slot, StrakeExtremes::from(&extremes(s, v)?));
        Ok(())
    })
}

/// Every interval along a path where a per-sample quantity exceeds `limit`: each maximal run of
/// samples with `values[i] > limit`, its ends placed where the quantity crosses the limit
/// (linear interpolation in arc length and t between the samples on either side, or the
/// first/last sample when the path starts/ends in violation), in path order. A quantity that
/// must stay above a limit is checked through its negation or inverse (e.g. a steering
/// curvature |kg| against 1/(smallest radius)). Their accuracy is that of the sampling.
///
/// Buffer (the pattern of the sampling functions): `buf` with room for `capacity` intervals
/// (NULL when `capacity` is 0); on success `*count` intervals are written (0 when the limit is
/// never exceeded). When more are found than fit, returns `STRAKE_STATUS_BUFFER_TOO_SMALL`
/// with `*count` = the number found and nothing written to `buf`; call again with that
/// capacity for the same intervals.
///
/// Errors: NULL_POINTER (`samples`, `values`, `count`; `buf` when `capacity` > 0);
/// INVALID_ARGUMENT (`sample_count` of 0 or too large, `capacity` too large, a NaN value or
/// limit, a sample whose t or arc length is not finite); BUFFER_TOO_SMALL. On any failure but
/// BUFFER_TOO_SMALL nothing is written. Thread-safe.
///
/// # Safety
/// `samples` and `values` NULL or `sample_count` valid elements; `buf` NULL or room for
/// `capacity` intervals; `count` NULL or a writable size_t.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_path_violations(
    samples: *const StrakeSample,
    values: *const f64,
    sample_count: usize,
    limit: f64,
    buf: *mut StrakeViolation,
    capacity: usize,
    count: *mut usize,
) -> StrakeStatus {
    guard("strake_path_violations", || {
        // SAFETY: the caller passes arrays of `sample_count` elements or NULL.
        let s = unsafe { input_slice(samples, sample_count, "samples", "sample_count")? };
        let v = unsafe { input_slice(values, sample_count, "values", "sample_count")? };
        let out = out_buffer(buf, capacity, count)?;
        let mut found = Vec::new();
        violations(s, v, limit, &mut found)?;
        let found: Vec<StrakeViolation> = found.iter().map(StrakeViolation::from).collect();
        out.deliver(&found, "violation intervals")
    })
}

/// The cutter's radii of curvature at its contact point for the axis set by `angles` (lead
/// toward T, tilt toward b_t, see `StrakeToolAngles`); pure cutter geometry, no frame needed.
///
/// `out->across_path` is the radius of the profile the cutter sweeps across the path (the
/// outline of the cutter seen along the feed direction, at the contact point):
/// r + R sin(lead)^2 / sin(beta)^3 with R the major and r the corner radius of the cutter's
/// torus (see `StrakeCutter`) and beta the inclination, cos(beta) = cos(lead) cos(tilt). This
/// is the radius to pass as `cutter_radius` to `strake_check_scallop` and
/// `strake_check_step_over` for flat and toroidal cutters; not `effective_radius_cross` of
/// `StrakeGougeState`, which is across the inclination plane (a 5/1 mm toroidal cutter at 10
/// degrees of tilt: 24.0 mm there, 1 mm across the path). Host length unit.
///
/// Returns `STRAKE_STATUS_OK` and writes `*out`; otherwise `*out` is untouched. Errors:
/// NULL_POINTER (`cutter`, `angles`, `out`); INVALID_ARGUMENT (an unknown `cutter->kind`, a
/// radius not positive and finite or subnormal, a corner radius above the radius, an angle
/// outside (-pi/2, pi/2)). Thread-safe.
///
/// # Safety
/// Each pointer NULL or valid for its type; `out` writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_cutter_radii(
    cutter: *const StrakeCutter,
    angles: *const StrakeToolAngles,
    out: *mut StrakeCutterRadii,
) -> StrakeStatus {
    guard("strake_cutter_radii", || {
        // SAFETY: the caller passes valid values or NULL.
        let (c, a) = unsafe { cutter_and_angles(cutter, angles)? };
        let slot = output(out, "out")?;
        put(slot, StrakeCutterRadii::from(&cutter_radii(&c, &a)?));
        Ok(())
    })
}

/// Rear (heel) gouging of a flat or toroidal cutter at the sample `frame`: whether the rest of
/// its bottom, up to the heel, stays out of the material when the front touches. The cutter is
/// the solid swept by a disc of radius R and a ball of radius r, so it stays out exactly when
/// the disc of corner-circle centres stays on the tool side of the surface offset by r; the
/// disc's rim is checked against that offset surface at second order in every direction and
/// with the exact osculating arc (exact on a circular arc concave along the feed: a flat
/// cutter of radius 5 around a concave arc of radius 20 needs asin(5/20) = 14.48 degrees of
/// lead). With the axis along the normal the flat bottom touches (centred on the axis). A
/// ball-end mill has no bottom (`margin` 1, never gouges here).
///
/// What it does not see: the holder and shank, the flank above the corner, the cutter against
/// the part away from this sample, the surface between samples.
///
/// Returns `STRAKE_STATUS_OK` and writes `*out`; otherwise `*out` is untouched. Errors: as for
/// `strake_check_gouge`, and INVALID_ARGUMENT for a frame whose tangent and normal are not
/// orthogonal to 1e-6. Thread-safe.
///
/// # Safety
/// Each pointer NULL or valid for its type; `out` writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_check_rear_gouge(
    frame: *const StrakeFrame,
    tool_side: u32,
    cutter: *const StrakeCutter,
    angles: *const StrakeToolAngles,
    out: *mut StrakeRearGouge,
) -> StrakeStatus {
    guard("strake_check_rear_gouge", || {
        // SAFETY: the caller passes valid values or NULL.
        let f = unsafe { self::frame(frame)? };
        let (c, a) = unsafe { cutter_and_angles(cutter, angles)? };
        let slot = output(out, "out")?;
        let g = rear_gouge(&f, self::tool_side(tool_side)?, &c, &a)?;
        put(slot, StrakeRearGouge::from(&g));
        Ok(())
    })
}

/// The strain of the two edges of a tow or tape of width `tow_width` centred on the course at
/// the sample `frame`: e(y) = -kg y - K y^2/2 at y = +w/2 (left of travel, the B side) and
/// y = -w/2 (right), K the Gaussian curvature (second order in w: the edges are geodesic
/// parallels of the course). Negative = compressed; which edge is compressed is reported. A
/// 150 mm tape along a great circle of a 1 m sphere: both edges at -0.28 %.
///
/// Returns `STRAKE_STATUS_OK` and writes `*out`; otherwise `*out` is untouched. Errors:
/// NULL_POINTER (`frame`, `out`); NON_FINITE (a frame field; or a strain that overflows, e.g.
/// a width of 1e300); INVALID_ARGUMENT (a frame vector not unit length, `tow_width` not
/// positive and finite). Thread-safe.
///
/// # Safety
/// `frame` NULL or valid; `out` NULL or writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_check_tow_edges(
    frame: *const StrakeFrame,
    tow_width: f64,
    out: *mut StrakeTowEdges,
) -> StrakeStatus {
    guard("strake_check_tow_edges", || {
        // SAFETY: the caller passes a valid frame or NULL.
        let f = unsafe { self::frame(frame)? };
        let slot = output(out, "out")?;
        put(slot, StrakeTowEdges::from(&tow_edges(&f, tow_width)?));
        Ok(())
    })
}

/// The largest step-over at the sample `frame` that keeps the scallop height at or below
/// `scallop_height`, for `cutter` with its axis set by `angles`, with the tool on `tool_side`:
/// the circle model of `strake_check_step_over` with the radius of the profile the cutter
/// sweeps across the path (`StrakeCutterRadii.across_path`), limited by the width the cutter
/// actually cuts at that height (exact on a plane; conservative on a surface concave across
/// the path). A flat 10 mm cutter at 5 degrees of lead and a 0.5 mm scallop: 10 mm, not the
/// model's 15.1 mm.
///
/// Returns `STRAKE_STATUS_OK` and writes `*out`; otherwise `*out` is untouched. Errors:
/// NULL_POINTER (`frame`, `cutter`, `angles`, `out`); NON_FINITE (a frame field);
/// INVALID_ARGUMENT (as for `strake_check_gouge`, and `scallop_height` not positive and finite
/// or unreachable, a cross-section the cutter's profile does not fit). Thread-safe.
///
/// # Safety
/// Each pointer NULL or valid for its type; `out` writable.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_check_step_over_cutter(
    frame: *const StrakeFrame,
    tool_side: u32,
    cutter: *const StrakeCutter,
    angles: *const StrakeToolAngles,
    scallop_height: f64,
    out: *mut StrakeCutterStepOver,
) -> StrakeStatus {
    guard("strake_check_step_over_cutter", || {
        // SAFETY: the caller passes valid values or NULL.
        let f = unsafe { self::frame(frame)? };
        let (c, a) = unsafe { cutter_and_angles(cutter, angles)? };
        let slot = output(out, "out")?;
        let kappa = cross_path_curvature(&f, self::tool_side(tool_side)?);
        let so = step_over_for_cutter(&c, &a, scallop_height, kappa)?;
        put(slot, StrakeCutterStepOver::new(kappa, &so));
        Ok(())
    })
}

// ------------------------------------------------------------------ whole paths per call
//
// Every `..._path` function below takes the samples of a path as the sampling functions return
// them (`samples[0 .. sample_count]`; only their frames are read) and writes one result per
// sample to `out[0 .. sample_count]`, exactly what the per-sample function gives there. Nothing
// is written unless every sample succeeds; a failure at a sample returns that sample's status
// with a message starting "sample <index>: ". Common errors: NULL_POINTER (`samples`, `out`, a
// struct argument); INVALID_ARGUMENT (`sample_count` 0 or too large).

/// `strake_check_gouge` at every sample of a path (see the note above the path functions).
///
/// # Safety
/// `samples` NULL or `sample_count` valid samples; `cutter`, `angles` NULL or valid; `out`
/// NULL or room for `sample_count` results.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_check_gouge_path(
    samples: *const StrakeSample,
    sample_count: usize,
    tool_side: u32,
    cutter: *const StrakeCutter,
    angles: *const StrakeToolAngles,
    out: *mut StrakeGougeState,
) -> StrakeStatus {
    guard("strake_check_gouge_path", || {
        // SAFETY: the caller passes valid values or NULL.
        let s = unsafe { input_slice(samples, sample_count, "samples", "sample_count")? };
        let (c, a) = unsafe { cutter_and_angles(cutter, angles)? };
        let dst = out_array(out, sample_count, "out")?;
        let side = self::tool_side(tool_side)?;
        over_path(
            s,
            dst,
            |frames, got| gouge_path(frames, side, &c, &a, got),
            |_, g| StrakeGougeState::from(g),
        )
    })
}

/// `strake_check_rear_gouge` at every sample of a path.
///
/// # Safety
/// As for `strake_check_gouge_path`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_check_rear_gouge_path(
    samples: *const StrakeSample,
    sample_count: usize,
    tool_side: u32,
    cutter: *const StrakeCutter,
    angles: *const StrakeToolAngles,
    out: *mut StrakeRearGouge,
) -> StrakeStatus {
    guard("strake_check_rear_gouge_path", || {
        // SAFETY: the caller passes valid values or NULL.
        let s = unsafe { input_slice(samples, sample_count, "samples", "sample_count")? };
        let (c, a) = unsafe { cutter_and_angles(cutter, angles)? };
        let dst = out_array(out, sample_count, "out")?;
        let side = self::tool_side(tool_side)?;
        over_path(
            s,
            dst,
            |frames, got| rear_gouge_path(frames, side, &c, &a, got),
            |_, g| StrakeRearGouge::from(g),
        )
    })
}

/// `strake_check_scallop` at every sample of a path.
///
/// # Safety
/// `samples` NULL or `sample_count` valid samples; `out` NULL or room for `sample_count`
/// results.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_check_scallop_path(
    samples: *const StrakeSample,
    sample_count: usize,
    tool_side: u32,
    cutter_radius: f64,
    step_over: f64,
    out: *mut StrakeScallop,
) -> StrakeStatus {
    guard("strake_check_scallop_path", || {
        // SAFETY: the caller passes valid values or NULL.
        let s = unsafe { input_slice(samples, sample_count, "samples", "sample_count")? };
        let dst = out_array(out, sample_count, "out")?;
        let side = self::tool_side(tool_side)?;
        over_path(
            s,
            dst,
            |frames, got| scallop_path(frames, side, cutter_radius, step_over, got),
            |_, g| StrakeScallop::from(g),
        )
    })
}

/// `strake_check_step_over_cutter` at every sample of a path.
///
/// # Safety
/// As for `strake_check_gouge_path`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_check_step_over_cutter_path(
    samples: *const StrakeSample,
    sample_count: usize,
    tool_side: u32,
    cutter: *const StrakeCutter,
    angles: *const StrakeToolAngles,
    scallop_height: f64,
    out: *mut StrakeCutterStepOver,
) -> StrakeStatus {
    guard("strake_check_step_over_cutter_path", || {
        // SAFETY: the caller passes valid values or NULL.
        let s = unsafe { input_slice(samples, sample_count, "samples", "sample_count")? };
        let (c, a) = unsafe { cutter_and_angles(cutter, angles)? };
        let dst = out_array(out, sample_count, "out")?;
        let side = self::tool_side(tool_side)?;
        over_path(
            s,
            dst,
            |frames, got| step_over_path(frames, side, &c, &a, scallop_height, got),
            |f, g| StrakeCutterStepOver::new(cross_path_curvature(f, side), g),
        )
    })
}

/// `strake_check_feed` at every sample of a path: `out[i]` the highest feed at sample i.
///
/// # Safety
/// `samples` NULL or `sample_count` valid samples; `limits` NULL or valid; `out` NULL or room
/// for `sample_count` doubles.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_check_feed_path(
    samples: *const StrakeSample,
    sample_count: usize,
    limits: *const StrakeFeedLimits,
    out: *mut f64,
) -> StrakeStatus {
    guard("strake_check_feed_path", || {
        // SAFETY: the caller passes valid values or NULL.
        let s = unsafe { input_slice(samples, sample_count, "samples", "sample_count")? };
        let l = feed_limits(unsafe { input(limits, "limits")? })?;
        let dst = out_array(out, sample_count, "out")?;
        over_path(s, dst, |frames, got| feed_path(frames, &l, got), |_, g| *g)
    })
}

/// `strake_check_fibre` at every sample of a path.
///
/// # Safety
/// `samples` NULL or `sample_count` valid samples; `limits` NULL or valid; `out` NULL or room
/// for `sample_count` results.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_check_fibre_path(
    samples: *const StrakeSample,
    sample_count: usize,
    limits: *const StrakeFibreLimits,
    out: *mut StrakeFibreState,
) -> StrakeStatus {
    guard("strake_check_fibre_path", || {
        // SAFETY: the caller passes valid values or NULL.
        let s = unsafe { input_slice(samples, sample_count, "samples", "sample_count")? };
        let l = fibre_limits(unsafe { input(limits, "limits")? });
        let dst = out_array(out, sample_count, "out")?;
        over_path(
            s,
            dst,
            |frames, got| fibre_path(frames, &l, got),
            |_, g| StrakeFibreState::from(g),
        )
    })
}

/// `strake_check_tow_edges` at every sample of a path.
///
/// # Safety
/// `samples` NULL or `sample_count` valid samples; `out` NULL or room for `sample_count`
/// results.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_check_tow_edges_path(
    samples: *const StrakeSample,
    sample_count: usize,
    tow_width: f64,
    out: *mut StrakeTowEdges,
) -> StrakeStatus {
    guard("strake_check_tow_edges_path", || {
        // SAFETY: the caller passes valid values or NULL.
        let s = unsafe { input_slice(samples, sample_count, "samples", "sample_count")? };
        let dst = out_array(out, sample_count, "out")?;
        over_path(
            s,
            dst,
            |frames, got| tow_edges_path(frames, tow_width, got),
            |_, g| StrakeTowEdges::from(g),
        )
    })
}

/// `strake_tool_axis` at every sample of a path.
///
/// # Safety
/// `samples` NULL or `sample_count` valid samples; `angles` NULL or valid; `out` NULL or room
/// for `sample_count` results.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_tool_axis_path(
    samples: *const StrakeSample,
    sample_count: usize,
    tool_side: u32,
    angles: *const StrakeToolAngles,
    out: *mut StrakeToolAxis,
) -> StrakeStatus {
    guard("strake_tool_axis_path", || {
        // SAFETY: the caller passes valid values or NULL.
        let s = unsafe { input_slice(samples, sample_count, "samples", "sample_count")? };
        let a = self::angles(unsafe { input(angles, "angles")? });
        let dst = out_array(out, sample_count, "out")?;
        let side = self::tool_side(tool_side)?;
        over_path(
            s,
            dst,
            |frames, got| tool_axis_path(frames, side, &a, got),
            |_, g| StrakeToolAxis::from(g),
        )
    })
}
