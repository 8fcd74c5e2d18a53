//! Regressions found by the fuzz targets (`fuzz/`, `tests/fuzz_checks/mod.rs`); the inputs that
//! found them are also in the committed corpus (`fuzz/corpus/<target>/finding-*`).

mod fuzz_checks;

use fuzz_checks::{fixed_surface, line};
use strake::ffi::*;
use strake::geometry::frame::darboux_frame;
use strake::{CurveJet, Orientation, ParamScales, StrakeError, SurfaceJet, Vec3};

/// A t one ulp past the end of the curve's domain is on the end (it is snapped, issue 16 item
/// 1): `strake_frame_at` reported the caller's t in `curve_param` while the batch calls
/// reported the end, so the one-point and batch frames differed in that field.
#[test]
fn frame_at_reports_the_snapped_t_as_the_batch_calls_do() {
    let s = fixed_surface(0);
    let c = line([0.1, 0.2], [0.9, 0.7]).expect("line");
    for t in [1f64.next_up(), -5e-324, 0.0, 0.5, 1.0] {
        let mut one = StrakeFrame::default();
        // SAFETY: live handles, writable frame.
        let st = unsafe { strake_frame_at(s.0, c.0, t, &mut one) };
        assert_eq!(st, StrakeStatus::Ok, "t = {t:e}");
        let mut batch = [StrakeFrame::default()];
        // SAFETY: one readable t, one writable frame.
        let st = unsafe { strake_frames_at(s.0, c.0, &t, 1, batch.as_mut_ptr()) };
        assert_eq!(st, StrakeStatus::Ok, "t = {t:e}");
        let snapped = t.clamp(0.0, 1.0);
        assert_eq!(one.curve_param.to_bits(), snapped.to_bits(), "t = {t:e}");
        assert_eq!(one, batch[0], "t = {t:e}");
    }
}

/// `strake_samples_at` measured arc length up to the caller's unsnapped t (and reported it)
/// although the frame was evaluated at the snapped end.
#[test]
fn samples_at_takes_a_t_within_round_off_of_an_end_as_that_end() {
    let s = fixed_surface(1);
    let c = line([0.1, 0.2], [0.9, 0.7]).expect("line");
    let ts = [-5e-324, 0.5, 1f64.next_up()];
    let mut out = [StrakeSample::default(); 3];
    // SAFETY: three readable t, three writable samples.
    let st = unsafe { strake_samples_at(s.0, c.0, ts.as_ptr(), 3, 1e-10, out.as_mut_ptr()) };
    assert_eq!(st, StrakeStatus::Ok);
    assert_eq!(out[0].frame.curve_param.to_bits(), 0f64.to_bits());
    assert_eq!(out[0].arc_length, 0.0);
    assert_eq!(out[2].frame.curve_param, 1.0);
    let mut whole = f64::NAN;
    // SAFETY: live handles, writable output.
    let st = unsafe { strake_arc_length(s.0, c.0, 0.0, 1.0, 1e-10, &mut whole) };
    assert_eq!(st, StrakeStatus::Ok);
    assert!((out[2].arc_length - whole).abs() <= 1e-9 * whole);
}

/// Finite partials with |Su| |Sv| ~ 1e300: |Su x Sv| overflowed, and the frame came back under
/// OK with an infinite conditioning figure and a zero normal. Now refused as NON_FINITE naming
/// |Su x Sv|, in the Rust API and through the C ABI.
#[test]
fn overflowing_su_cross_sv_is_refused_not_an_infinite_conditioning() {
    let sj = SurfaceJet {
        p: Vec3::new(f64::MAX, 1.125, -0.03125),
        su: Vec3::new(1.0, 1e150, -0.03125),
        sv: Vec3::new(1e150, 1.0, 0.0),
        suu: Vec3::new(0.0, 15.375, 1.53125),
        suv: Vec3::zeros(),
        svv: Vec3::zeros(),
    };
    let cj = CurveJet {
        u: 0.5,
        v: 0.5,
        du: 1.0,
        dv: 0.0,
        ddu: 0.0,
        ddv: 0.0,
    };
    let scales = ParamScales {
        u_extent: 1.0,
        v_extent: 1.0,
        t_extent: 1.0,
    };
    let e = darboux_frame(&sj, &cj, Orientation::Forward, &scales, 0.0).unwrap_err();
    assert!(
        matches!(
            e,
            StrakeError::NonFinite {
                what: "|Su x Sv|",
                ..
            }
        ),
        "{e}"
    );
    // The batch kernel flags the lane and the one-point path gives the same error.
    let regular = SurfaceJet {
        su: Vec3::new(1.0, 0.0, 0.0),
        sv: Vec3::new(0.0, 1.0, 0.0),
        ..sj
    };
    let ok = darboux_frame(&regular, &cj, Orientation::Forward, &scales, 0.0).expect("regular");
    let mut out = [ok; 4];
    let jets = [regular, regular, sj, regular];
    let e = strake::darboux_frames(
        &jets,
        &[cj; 4],
        &[0.0; 4],
        Orientation::Forward,
        &scales,
        &mut out,
    )
    .unwrap_err();
    assert_eq!(e.index, 2);
    assert!(
        matches!(
            e.error,
            StrakeError::NonFinite {
                what: "|Su x Sv|",
                ..
            }
        ),
        "{}",
        e.error
    );
    let c_sj = StrakeSurfaceJet {
        p: [f64::MAX, 1.125, -0.03125],
        su: [1.0, 1e150, -0.03125],
        sv: [1e150, 1.0, 0.0],
        suu: [0.0, 15.375, 1.53125],
        suv: [0.0; 3],
        svv: [0.0; 3],
    };
    let c_cj = StrakeCurveJet {
        du: 1.0,
        u: 0.5,
        v: 0.5,
        ..StrakeCurveJet::default()
    };
    let c_scales = StrakeParamScales {
        u_extent: 1.0,
        v_extent: 1.0,
        t_extent: 1.0,
    };
    let mut f = StrakeFrame {
        k1: 7.0,
        ..StrakeFrame::default()
    };
    // SAFETY: valid inputs, writable frame.
    let st = unsafe { strake_frame_from_jets(&c_sj, &c_cj, 0, &c_scales, &mut f) };
    assert_eq!(st, StrakeStatus::NonFinite);
    assert!(
        fuzz_checks::message().contains("|Su x Sv|"),
        "{}",
        fuzz_checks::message()
    );
    assert_eq!(f.k1, 7.0, "output written on failure");
}

/// A point a denormal 5e-324 above the plane: the distance |P − S| underflowed to 0 while the
/// signed distance (P − S)·N was 5e-324, so |signed distance| exceeded the distance.
#[test]
fn signed_distance_never_exceeds_the_distance_at_a_denormal_gap() {
    let s = fixed_surface(2);
    let p = [1.0, 0.75, 5e-324];
    let opts = StrakeProjectionOptions {
        tolerance: 1.0,
        periodic_u: 0,
        periodic_v: 0,
        grid: 0,
        max_iterations: 0,
    };
    let mut out = [StrakeProjection::default()];
    // SAFETY: one readable point, one writable projection.
    let st = unsafe { strake_surface_project_points(s.0, p.as_ptr(), 1, &opts, out.as_mut_ptr()) };
    assert_eq!(st, StrakeStatus::Ok);
    assert!(
        out[0].signed_distance.abs() <= out[0].distance,
        "{:?}",
        out[0]
    );
}

/// Found by the `fit` target (`finding-ba0266c671a3`): the point (1e300, 8.75, 8.75),
/// projected with an infinite distance tolerance, came back OK with distance = inf: |S − P|
/// was computed as the square root of a sum of squares, which overflowed although the
/// distance (about 1e300) does not. The length is now scaled where the squares overflow, and
/// a point whose distance itself overflows is refused with NON_FINITE naming the distance.
#[test]
fn projecting_a_far_point_gives_a_finite_distance() {
    let s = fixed_surface(2);
    let opts = StrakeProjectionOptions {
        tolerance: f64::INFINITY,
        periodic_u: 0,
        periodic_v: 1,
        grid: 0,
        max_iterations: 0,
    };
    // The finding's two points: the second starts from the first one's foot (continuation).
    let mut out = [StrakeProjection::default(); 2];
    let p = [2.0, 8.0, -0.5, 1e300, 8.75, 8.75];
    // SAFETY: two readable points, two writable projections.
    let st = unsafe { strake_surface_project_points(s.0, p.as_ptr(), 2, &opts, out.as_mut_ptr()) };
    assert_eq!(st, StrakeStatus::Ok, "{}", fuzz_checks::message());
    // The foot is on the fixed plane patch [0, 2] x [0, 1.5] (z = 0), so the distance is 1e300
    // to round-off (the other coordinates vanish against it).
    let d = out[1].distance;
    assert!(
        d.is_finite() && (d - 1e300).abs() <= 1e-15 * 1e300,
        "{:?}",
        out[1]
    );
    assert!(out[1].signed_distance.abs() <= d);
}

/// Found by the `checks` target (`finding-529e71234f7c`): an upright flat cutter's
/// `inclination_plane` radius is INFINITY under OK. That is the documented value (R/sin β + r
/// at β = 0: the flat bottom touches; `Cutter::effective_radius`), which the C field's doc
/// did not state and the fuzz check refused; both now say so, and this pins the value.
#[test]
fn an_upright_flat_cutter_has_an_infinite_inclination_plane_radius() {
    let c = StrakeCutter {
        kind: StrakeCutterKind::Flat as u32,
        radius: 0.5,
        corner_radius: 0.0,
    };
    let a = StrakeToolAngles {
        lead: 0.0,
        tilt: 0.0,
    };
    let mut o = StrakeCutterRadii::default();
    // SAFETY: valid inputs and output.
    let st = unsafe { strake_cutter_radii(&c, &a, &mut o) };
    assert_eq!(st, StrakeStatus::Ok, "{}", fuzz_checks::message());
    assert_eq!(o.inclination_plane, f64::INFINITY);
    assert_eq!(o.across_path, f64::INFINITY);
    assert_eq!(o.flat_bottom_contact, 1);
    assert_eq!(o.inclination, 0.0);
}

/// `strake_check_step_over` at extreme but valid scales gave a step-over of 0 (or NaN) under
/// STATUS_OK: h/r and κ r, the units the inverse worked in, under- or overflowed (a ball of
/// radius DBL_MAX on a convex cross-section, a denormal scallop height). The inputs that found
/// it are `fuzz/corpus/checks/finding-step-over-*`. Each is checked against the limit the exact
/// geometry tends to there (closed forms of the two-circle construction, common practice):
/// - r → ∞ on a convex cross-section of radius ρ: the ball is a plane, and the tangent lines of
///   two passes meet at h = ρ (1/cos(θ/2) − 1), θ = w/ρ, so w = 2ρ acos(ρ/(ρ + h));
/// - h → 0: w = √(8 h / (1/r − κ)) (1 + O(h)).
#[test]
fn step_over_holds_its_digits_at_extreme_scales() {
    use strake::checks::{step_over_for_scallop, step_over_for_scallop_approx};
    let rel = |got: f64, want: f64| ((got - want) / want).abs();
    // A ball as wide as a double allows, on convex cross-sections (radius 0.3 and 3e-4).
    for rho in [0.3, 3e-4] {
        let h = 1.5625e-2;
        let w = step_over_for_scallop(f64::MAX, h, -1.0 / rho).expect("step-over");
        let want = 2.0 * rho * (rho / (rho + h)).acos();
        assert!(rel(w, want) < 1e-13, "rho = {rho}: {w:e} against {want:e}");
        let approx = step_over_for_scallop_approx(f64::MAX, h, -1.0 / rho).expect("approx");
        assert!(
            rel(approx, (8.0 * h * rho).sqrt()) < 1e-15,
            "approx {approx:e}"
        );
    }
    // Denormal and tiny heights on concave, convex and flat cross-sections, and radii from the
    // smallest normal double to 1e150.
    for (r, h, kappa) in [
        (12.75, 5e-324, 0.05),
        (4.625, 5e-324, 1.0842021724855044e-19),
        (1e150, 1.28981331e-315, -0.2226933294046529),
        (
            2.2250738585072014e-308,
            1.850043846e-314,
            -0.3123282375051456,
        ),
        (f64::MAX, 2.2250738585072014e-308, -0.12656610838742888),
        (3.0, 1e-300, 1e-300),
    ] {
        let w = step_over_for_scallop(r, h, kappa).expect("step-over");
        let want = (8.0 * h).sqrt() * (1.0 / (1.0 / r - kappa)).sqrt();
        // Within a denormal result's own precision (5e-324 in 1e-310 is 5e-14), plus the
        // limit's own error, of relative order h/r (the chord is 2 √(h (2r − h)) on a plane).
        let tol = if want < 2.2250738585072014e-308 {
            1e-10
        } else {
            1e-12
        } + h / r;
        assert!(
            w > 0.0 && rel(w, want) < tol,
            "r = {r:e}, h = {h:e}, kappa = {kappa:e}: {w:e} against {want:e}"
        );
        let approx = step_over_for_scallop_approx(r, h, kappa).expect("approx");
        assert!(
            rel(approx, want) < tol,
            "approx {approx:e} against {want:e}"
        );
    }
    // Still refused: a height the geometry cannot reach, a ball that does not fit.
    assert!(step_over_for_scallop(1.40625, 4.0, 0.0).is_err());
    assert!(step_over_for_scallop(1.0, 0.1, 1.0).is_err());
}
