//! Every status of the C ABI, reached by calling the `extern "C"` functions as a host would:
//! each check looks at the status, at the message (which must name the argument, index, value
//! or sample), and at the output (prefilled with a sentinel, which must survive a failure).

#[path = "support/ffi_util.rs"]
mod ffi_util;

use ffi_util::*;
use std::ffi::{CStr, c_void};
use std::ptr;
use std::sync::atomic::{AtomicUsize, Ordering};
use strake::ffi::*;

const OK: StrakeStatus = StrakeStatus::Ok;
/// A handle value that no constructor returns, to see that `*out` is left alone on failure.
fn bogus_surface() -> *mut StrakeSurface {
    ptr::dangling_mut()
}
fn bogus_curve() -> *mut StrakeCurve {
    ptr::dangling_mut()
}

// The numbers are the ABI (policy in src/ffi/status.rs: a number never changes meaning).
#[test]
fn status_numbers_are_stable() {
    use StrakeStatus::*;
    let table = [
        (Ok, 0),
        (NullPointer, 1),
        (InvalidArgument, 2),
        (NonFinite, 3),
        (BufferTooSmall, 4),
        (InvalidDegree, 10),
        (InvalidKnots, 11),
        (InvalidControlPoint, 12),
        (InvalidWeight, 13),
        (OutOfDomain, 20),
        (DegenerateSurface, 21),
        (StalledCurve, 22),
        (TooFarFromSurface, 23),
        (NotConverged, 24),
        (SurfaceCallbackFailed, 30),
        (CurveCallbackFailed, 31),
        (GeodesicIncomplete, 50),
        (GeodesicNotFound, 51),
        (LeavesSurface, 52),
        (CutterTooLarge, 55),
        (PassLimit, 56),
        (InternalPanic, 90),
        (OrderUnavailable, 32),
        (CentrePathFolds, 40),
    ];
    assert_eq!(table.len(), StrakeStatus::ALL.len());
    for (s, n) in table {
        assert_eq!(s as u32, n);
        // SAFETY: strake_status_name returns a static C string.
        let name = unsafe { CStr::from_ptr(strake_status_name(n)) }
            .to_str()
            .unwrap();
        assert_eq!(name, s.c_name().to_str().unwrap());
        assert!(name.starts_with("STRAKE_STATUS_"));
    }
    for unknown in [5, 9, 14, 25, 33, 41, 89, 91, u32::MAX] {
        // SAFETY: as above.
        let name = unsafe { CStr::from_ptr(strake_status_name(unknown)) };
        assert_eq!(name.to_str().unwrap(), "STRAKE_STATUS_UNKNOWN");
    }
}

#[test]
fn null_pointers_are_refused_by_name() {
    let r = 1.0f64;
    let rp = &r as *const f64 as *mut c_void;
    let s = surface(Some(sphere), rp, (0.0, 6.0), (0.1, 3.0), 0);
    let c = uv_line([1.0, 1.0], [2.0, 2.0]);
    let mut out_s = bogus_surface();
    let mut out_c = bogus_curve();
    let mut f = sentinel();
    let mut fs = [sentinel(), sentinel()];
    let ts = [0.0, 1.0];
    let knots = [0.0, 0.0, 1.0, 1.0];
    let uv = [0.0, 0.0, 1.0, 1.0];
    let sj = StrakeSurfaceJet::default();
    let cj = StrakeCurveJet::default();
    let scales = StrakeParamScales {
        u_extent: 1.0,
        v_extent: 1.0,
        t_extent: 1.0,
    };
    let np = StrakeStatus::NullPointer;
    // SAFETY: every non-NULL pointer below is valid; NULL ones are what is being tested.
    unsafe {
        expect(
            strake_surface_from_callback(None, rp, 0.0, 1.0, 0.0, 1.0, 0, &mut out_s),
            np,
            &["`f`", "strake_surface_from_callback"],
        );
        expect(
            strake_surface_from_callback(Some(sphere), rp, 0.0, 1.0, 0.0, 1.0, 0, ptr::null_mut()),
            np,
            &["`out`"],
        );
        expect(
            strake_curve_new_nurbs(1, ptr::null(), 4, uv.as_ptr(), 2, ptr::null(), &mut out_c),
            np,
            &["`knots`"],
        );
        expect(
            strake_curve_new_nurbs(
                1,
                knots.as_ptr(),
                4,
                ptr::null(),
                2,
                ptr::null(),
                &mut out_c,
            ),
            np,
            &["`uv_points`"],
        );
        expect(
            strake_curve_new_nurbs(
                1,
                knots.as_ptr(),
                4,
                uv.as_ptr(),
                2,
                ptr::null(),
                ptr::null_mut(),
            ),
            np,
            &["`out`"],
        );
        expect(
            strake_curve_from_callback(None, ptr::null_mut(), 0.0, 1.0, &mut out_c),
            np,
            &["`f`"],
        );
        expect(
            strake_curve_from_callback(
                Some(line_curve),
                ptr::null_mut(),
                0.0,
                1.0,
                ptr::null_mut(),
            ),
            np,
            &["`out`"],
        );
        expect(
            strake_frame_at(ptr::null(), c, 0.5, &mut f),
            np,
            &["`surface`", "strake_frame_at"],
        );
        expect(
            strake_frame_at(s, ptr::null(), 0.5, &mut f),
            np,
            &["`curve`"],
        );
        expect(strake_frame_at(s, c, 0.5, ptr::null_mut()), np, &["`out`"]);
        expect(
            strake_frames_at(ptr::null(), c, ts.as_ptr(), 2, fs.as_mut_ptr()),
            np,
            &["`surface`"],
        );
        expect(
            strake_frames_at(s, ptr::null(), ts.as_ptr(), 2, fs.as_mut_ptr()),
            np,
            &["`curve`"],
        );
        expect(
            strake_frames_at(s, c, ptr::null(), 2, fs.as_mut_ptr()),
            np,
            &["`ts`"],
        );
        expect(
            strake_frames_at(s, c, ts.as_ptr(), 2, ptr::null_mut()),
            np,
            &["`out`"],
        );
        expect(
            strake_frames_even(ptr::null(), c, 2, fs.as_mut_ptr()),
            np,
            &["`surface`"],
        );
        expect(
            strake_frames_even(s, ptr::null(), 2, fs.as_mut_ptr()),
            np,
            &["`curve`"],
        );
        expect(strake_frames_even(s, c, 2, ptr::null_mut()), np, &["`out`"]);
        expect(
            strake_frame_from_jets(ptr::null(), &cj, 0, &scales, &mut f),
            np,
            &["`surface_jet`"],
        );
        expect(
            strake_frame_from_jets(&sj, ptr::null(), 0, &scales, &mut f),
            np,
            &["`curve_jet`"],
        );
        expect(
            strake_frame_from_jets(&sj, &cj, 0, ptr::null(), &mut f),
            np,
            &["`scales`"],
        );
        expect(
            strake_frame_from_jets(&sj, &cj, 0, &scales, ptr::null_mut()),
            np,
            &["`out`"],
        );
    }
    assert_eq!(out_s, bogus_surface());
    assert_eq!(out_c, bogus_curve());
    assert_eq!(f, sentinel());
    assert_eq!(fs, [sentinel(), sentinel()]);
    free(s, c);
}

#[test]
fn misaligned_pointers_are_refused() {
    let s = surface(Some(plane), ptr::null_mut(), (0.0, 1.0), (0.0, 1.0), 0);
    let c = uv_line([0.0, 0.0], [1.0, 1.0]);
    let storage = [0u64; 4];
    let misaligned = (storage.as_ptr() as *const u8).wrapping_add(4) as *const f64;
    let mut fs = [sentinel(); 2];
    // SAFETY: the misaligned pointer is refused before any read.
    let st = unsafe { strake_frames_at(s, c, misaligned, 2, fs.as_mut_ptr()) };
    expect(st, StrakeStatus::NullPointer, &["`ts`", "not aligned"]);
    assert_eq!(fs, [sentinel(); 2]);
    free(s, c);
}

#[test]
fn bad_sizes_are_refused() {
    let knots = [0.0, 0.0, 1.0, 1.0];
    let uv = [0.0, 0.0, 1.0, 1.0];
    let mut out_c = bogus_curve();
    let ia = StrakeStatus::InvalidArgument;
    let s = surface(Some(plane), ptr::null_mut(), (0.0, 1.0), (0.0, 1.0), 0);
    let c = uv_line([0.0, 0.0], [1.0, 1.0]);
    let ts = [0.5];
    let mut f = [sentinel()];
    // SAFETY: sizes are refused before the arrays are read.
    unsafe {
        expect(
            strake_curve_new_nurbs(
                1,
                knots.as_ptr(),
                0,
                uv.as_ptr(),
                2,
                ptr::null(),
                &mut out_c,
            ),
            ia,
            &["`knot_count` is 0"],
        );
        expect(
            strake_curve_new_nurbs(
                1,
                knots.as_ptr(),
                4,
                uv.as_ptr(),
                0,
                ptr::null(),
                &mut out_c,
            ),
            ia,
            &["`point_count` is 0"],
        );
        // 2 * point_count overflows.
        let huge = usize::MAX / 2 + 1;
        expect(
            strake_curve_new_nurbs(
                1,
                knots.as_ptr(),
                4,
                uv.as_ptr(),
                huge,
                ptr::null(),
                &mut out_c,
            ),
            ia,
            &["`point_count`", "too large"],
        );
        expect(
            strake_frames_at(s, c, ts.as_ptr(), 0, f.as_mut_ptr()),
            ia,
            &["`count` is 0"],
        );
        expect(
            strake_frames_at(s, c, ts.as_ptr(), usize::MAX, f.as_mut_ptr()),
            ia,
            &["too large"],
        );
        expect(
            strake_frames_even(s, c, 0, f.as_mut_ptr()),
            ia,
            &["`count` is 0"],
        );
        expect(
            strake_frames_even(s, c, usize::MAX / 8, f.as_mut_ptr()),
            ia,
            &["too large"],
        );
    }
    assert_eq!(out_c, bogus_curve());
    assert_eq!(f, [sentinel()]);
    free(s, c);
}

/// Calls strake_curve_new_nurbs and returns its status, checking that `out` stays untouched on
/// failure (and freeing the curve on success).
fn try_curve(degree: u32, knots: &[f64], uv: &[f64], weights: Option<&[f64]>) -> StrakeStatus {
    let mut out = bogus_curve();
    let w = weights.map_or(ptr::null(), <[f64]>::as_ptr);
    // SAFETY: lengths as documented: uv holds 2 values per point.
    let st = unsafe {
        strake_curve_new_nurbs(
            degree,
            knots.as_ptr(),
            knots.len(),
            uv.as_ptr(),
            uv.len() / 2,
            w,
            &mut out,
        )
    };
    if st == OK {
        // SAFETY: a fresh handle.
        unsafe { strake_curve_free(out) };
    } else {
        assert_eq!(out, bogus_curve(), "out was written on failure");
    }
    st
}

// Knot vectors must be non-decreasing (The NURBS Book 2nd ed. §2.2: u_i <= u_{i+1}).
#[test]
fn non_monotone_and_non_finite_knots() {
    let uv = [0.0, 0.0, 0.5, 1.0, 1.0, 0.0];
    let st = try_curve(2, &[0.0, 0.0, 0.0, 0.7, 0.4, 1.0], &uv, None);
    expect(
        st,
        StrakeStatus::InvalidKnots,
        &["knot[4] = 0.4", "knot[3] = 0.7"],
    );
    let st = try_curve(2, &[0.0, 0.0, 0.0, f64::NAN, 1.0, 1.0], &uv, None);
    expect(st, StrakeStatus::InvalidKnots, &["knot[3] = NaN"]);
    // A zero-length domain.
    let st = try_curve(2, &[0.0, 0.0, 1.0, 1.0, 2.0, 2.0], &uv, None);
    expect(st, StrakeStatus::InvalidKnots, &["zero length"]);
    // Multiplicity above degree + 1.
    let st = try_curve(1, &[0.0, 0.5, 0.5, 0.5, 1.0], &uv, None);
    expect(st, StrakeStatus::InvalidKnots, &["multiplicity 3"]);
}

// Weights must be positive (The NURBS Book 2nd ed. §4.2: w_i > 0 keeps the curve in the convex
// hull and the denominator non-zero).
#[test]
fn bad_weights() {
    let knots = [0.0, 0.0, 0.0, 1.0, 1.0, 1.0];
    let uv = [0.0, 0.0, 0.5, 1.0, 1.0, 0.0];
    for (bad, text) in [
        (0.0, "weight[1] = 0"),
        (-0.5, "weight[1] = -0.5"),
        (f64::NAN, "weight[1] = NaN"),
        (f64::INFINITY, "weight[1] = inf"),
    ] {
        let st = try_curve(2, &knots, &uv, Some(&[1.0, bad, 1.0]));
        expect(
            st,
            StrakeStatus::InvalidWeight,
            &[text, "strake_curve_new_nurbs"],
        );
    }
    assert_eq!(try_curve(2, &knots, &uv, Some(&[1.0, 0.5, 2.0])), OK);
}

#[test]
fn non_finite_control_points() {
    let knots = [0.0, 0.0, 0.0, 1.0, 1.0, 1.0];
    let st = try_curve(2, &knots, &[0.0, 0.0, 0.5, f64::NAN, 1.0, 0.0], None);
    expect(
        st,
        StrakeStatus::InvalidControlPoint,
        &["control point 1", "NaN"],
    );
    let st = try_curve(
        2,
        &knots,
        &[0.0, 0.0, 0.5, 0.5, f64::NEG_INFINITY, 0.0],
        None,
    );
    expect(
        st,
        StrakeStatus::InvalidControlPoint,
        &["control point 2", "-inf"],
    );
}

// m + 1 = n + p + 2 knots for n + 1 control points of degree p (The NURBS Book 2nd ed. §2.2
// [memory: eq. numbering]).
#[test]
fn degree_and_count_mismatch() {
    let uv3 = [0.0, 0.0, 0.5, 1.0, 1.0, 0.0];
    expect(
        try_curve(3, &[0.0, 0.0, 0.0, 0.0, 1.0, 1.0, 1.0], &uv3, None),
        StrakeStatus::InvalidDegree,
        &["at least 4 control points, got 3"],
    );
    expect(
        try_curve(2, &[0.0, 0.0, 0.0, 1.0, 1.0], &uv3, None),
        StrakeStatus::InvalidDegree,
        &["needs count + degree + 1 = 6 knots, got 5"],
    );
    expect(
        try_curve(0, &[0.0, 0.5, 1.0], &uv3, None),
        StrakeStatus::InvalidDegree,
        &["degree 0"],
    );
    expect(
        try_curve(1, &[0.0, 0.0, 1.0, 1.0], &uv3[..4], Some(&[1.0, 1.0])),
        OK,
        &[],
    );
}

#[test]
fn bad_domains_and_flags() {
    let mut out = bogus_surface();
    let mut out_c = bogus_curve();
    // SAFETY: valid pointers throughout.
    unsafe {
        let st = strake_surface_from_callback(
            Some(plane),
            ptr::null_mut(),
            1.0,
            1.0,
            0.0,
            1.0,
            0,
            &mut out,
        );
        expect(
            st,
            StrakeStatus::InvalidArgument,
            &["u range [1, 1] is empty"],
        );
        let st = strake_surface_from_callback(
            Some(plane),
            ptr::null_mut(),
            0.0,
            1.0,
            2.0,
            -1.0,
            0,
            &mut out,
        );
        expect(st, StrakeStatus::InvalidArgument, &["v range [2, -1]"]);
        let st = strake_surface_from_callback(
            Some(plane),
            ptr::null_mut(),
            f64::NAN,
            1.0,
            0.0,
            1.0,
            0,
            &mut out,
        );
        expect(st, StrakeStatus::NonFinite, &["u_min = NaN"]);
        let st = strake_surface_from_callback(
            Some(plane),
            ptr::null_mut(),
            0.0,
            1.0,
            0.0,
            f64::INFINITY,
            0,
            &mut out,
        );
        expect(st, StrakeStatus::NonFinite, &["v_max = inf"]);
        let st = strake_surface_from_callback(
            Some(plane),
            ptr::null_mut(),
            0.0,
            1.0,
            0.0,
            1.0,
            2,
            &mut out,
        );
        expect(st, StrakeStatus::InvalidArgument, &["`flip_normal` = 2"]);
        let st =
            strake_curve_from_callback(Some(line_curve), ptr::null_mut(), 3.0, 1.0, &mut out_c);
        expect(st, StrakeStatus::InvalidArgument, &["t range [3, 1]"]);
        let st = strake_curve_from_callback(
            Some(line_curve),
            ptr::null_mut(),
            f64::NEG_INFINITY,
            1.0,
            &mut out_c,
        );
        expect(st, StrakeStatus::NonFinite, &["t_min = -inf"]);
        let sj = plane_jet();
        let cj = StrakeCurveJet {
            u: 0.5,
            v: 0.5,
            du: 1.0,
            dv: 0.0,
            ddu: 0.0,
            ddv: 0.0,
        };
        let mut f = sentinel();
        let bad = StrakeParamScales {
            u_extent: 1.0,
            v_extent: 0.0,
            t_extent: 1.0,
        };
        let st = strake_frame_from_jets(&sj, &cj, 0, &bad, &mut f);
        expect(st, StrakeStatus::InvalidArgument, &["v_extent = 0"]);
        let good = StrakeParamScales {
            u_extent: 1.0,
            v_extent: 1.0,
            t_extent: 1.0,
        };
        let st = strake_frame_from_jets(&sj, &cj, -1, &good, &mut f);
        expect(st, StrakeStatus::InvalidArgument, &["`flip_normal` = -1"]);
        assert_eq!(f, sentinel());
    }
    assert_eq!(out, bogus_surface());
    assert_eq!(out_c, bogus_curve());
}

fn plane_jet() -> StrakeSurfaceJet {
    StrakeSurfaceJet {
        p: [0.5, 0.5, 0.0],
        su: [1.0, 0.0, 0.0],
        sv: [0.0, 1.0, 0.0],
        ..Default::default()
    }
}

/// u = t, v = 0.5 for t in the domain.
unsafe extern "C" fn line_curve(_: *mut c_void, t: f64, out: *mut StrakeCurveJet) -> i32 {
    // SAFETY: strake passes a valid jet.
    unsafe {
        *out = StrakeCurveJet {
            u: t,
            v: 0.5,
            du: 1.0,
            dv: 0.0,
            ddu: 0.0,
            ddv: 0.0,
        }
    };
    0
}

#[test]
fn out_of_domain_and_non_finite_parameters() {
    let s = surface(Some(plane), ptr::null_mut(), (0.0, 1.0), (0.0, 1.0), 0);
    let c = uv_line([0.2, 0.2], [0.8, 0.9]);
    // This one leaves the surface's u domain at t = 0.5 (u = 1).
    let leaving = uv_line([0.0, 0.5], [2.0, 0.5]);
    let mut f = sentinel();
    // SAFETY: live handles, valid output.
    unsafe {
        expect(
            strake_frame_at(s, c, 1.5, &mut f),
            StrakeStatus::OutOfDomain,
            &["t = 1.5 is outside [0, 1]"],
        );
        expect(
            strake_frame_at(s, c, -1e-9, &mut f),
            StrakeStatus::OutOfDomain,
            &["t = -1e-09"],
        );
        expect(
            strake_frame_at(s, c, f64::NAN, &mut f),
            StrakeStatus::NonFinite,
            &["t = NaN"],
        );
        expect(
            strake_frame_at(s, leaving, 0.75, &mut f),
            StrakeStatus::OutOfDomain,
            &["u = 1.5 is outside [0, 1]"],
        );
    }
    assert_eq!(f, sentinel());
    // No clamping at the ends either: exactly the end of the domain is inside.
    assert_eq!(frame_at(s, leaving, 0.5).u, 1.0);
    // SAFETY: made above.
    unsafe { strake_curve_free(leaving) };
    free(s, c);
}

// A batch stops at the first failing sample, names it, and writes nothing.
#[test]
fn batch_failure_names_the_sample_and_writes_nothing() {
    let s = surface(Some(plane), ptr::null_mut(), (0.0, 1.0), (0.0, 1.0), 0);
    let c = uv_line([0.2, 0.2], [0.8, 0.9]);
    let ts = [0.0, 0.5, 1.25, 0.1];
    let mut out = [sentinel(); 4];
    // SAFETY: four parameters and room for four frames.
    let st = unsafe { strake_frames_at(s, c, ts.as_ptr(), 4, out.as_mut_ptr()) };
    expect(
        st,
        StrakeStatus::OutOfDomain,
        &["strake_frames_at", "sample 2 (t = 1.25)"],
    );
    assert_eq!(out, [sentinel(); 4]);
    // And with the bad sample removed every frame is written, matching strake_frame_at.
    let ts = [0.0, 0.5, 1.0, 0.1];
    // SAFETY: as above.
    assert_eq!(
        unsafe { strake_frames_at(s, c, ts.as_ptr(), 4, out.as_mut_ptr()) },
        OK
    );
    for (t, f) in ts.iter().zip(&out) {
        assert_eq!(*f, frame_at(s, c, *t));
    }
    // Evenly spaced: both ends included, count 1 gives the start.
    let mut even = [sentinel(); 5];
    // SAFETY: room for five frames.
    assert_eq!(
        unsafe { strake_frames_even(s, c, 5, even.as_mut_ptr()) },
        OK
    );
    let params: Vec<f64> = even.iter().map(|f| f.curve_param).collect();
    assert_eq!(params, [0.0, 0.25, 0.5, 0.75, 1.0]);
    assert_eq!(even[4], frame_at(s, c, 1.0));
    let mut one = [sentinel()];
    // SAFETY: room for one frame.
    assert_eq!(unsafe { strake_frames_even(s, c, 1, one.as_mut_ptr()) }, OK);
    assert_eq!(one[0], frame_at(s, c, 0.0));
    free(s, c);
}

// The sphere's pole: Sv = 0 at v = 0, so Su x Sv vanishes (do Carmo §2-2: the parametrisation is
// not regular there).
#[test]
fn degenerate_surface_point() {
    let r = 2.0f64;
    let s = surface(
        Some(sphere),
        &r as *const f64 as *mut c_void,
        (0.0, 6.0),
        (0.0, 3.0),
        0,
    );
    let to_pole = uv_line([1.0, 1.0], [1.0, 0.0]);
    let mut f = sentinel();
    let mut fs = [sentinel(); 3];
    // SAFETY: live handles, valid outputs.
    unsafe {
        expect(
            strake_frame_at(s, to_pole, 1.0, &mut f),
            StrakeStatus::DegenerateSurface,
            &["(u, v) = (1, 0)", "normal is undefined"],
        );
        let st = strake_frames_even(s, to_pole, 3, fs.as_mut_ptr());
        expect(st, StrakeStatus::DegenerateSurface, &["sample 2 (t = 1)"]);
    }
    assert_eq!(f, sentinel());
    assert_eq!(fs, [sentinel(); 3]);
    // Pure jets: Su parallel to Sv.
    let sj = StrakeSurfaceJet {
        su: [1.0, 1.0, 0.0],
        sv: [2.0, 2.0, 0.0],
        ..Default::default()
    };
    let cj = StrakeCurveJet {
        u: 0.0,
        v: 0.0,
        du: 1.0,
        dv: 0.0,
        ddu: 0.0,
        ddv: 0.0,
    };
    let scales = StrakeParamScales {
        u_extent: 1.0,
        v_extent: 1.0,
        t_extent: 1.0,
    };
    // SAFETY: valid pointers.
    let st = unsafe { strake_frame_from_jets(&sj, &cj, 0, &scales, &mut f) };
    expect(
        st,
        StrakeStatus::DegenerateSurface,
        &["degenerate surface point"],
    );
    assert_eq!(f, sentinel());
    free(s, to_pole);
}

// A quadratic B-spline whose first two control points coincide has C'(0) = 2 (P1 - P0)/u_3 = 0
// (The NURBS Book 2nd ed. §3.3, derivative at the ends of a clamped curve [memory]).
#[test]
fn stalled_curve() {
    let s = surface(Some(plane), ptr::null_mut(), (0.0, 1.0), (0.0, 1.0), 0);
    let c = nurbs(
        2,
        &[0.0, 0.0, 0.0, 1.0, 1.0, 1.0],
        &[[0.3, 0.3], [0.3, 0.3], [0.9, 0.6]],
        None,
    );
    let mut f = sentinel();
    // SAFETY: live handles, valid output.
    unsafe {
        expect(
            strake_frame_at(s, c, 0.0, &mut f),
            StrakeStatus::StalledCurve,
            &["stalled curve at t = 0", "tangent is undefined"],
        );
    }
    assert_eq!(f, sentinel());
    // Just after the start the curve moves.
    assert!(frame_at(s, c, 0.5).speed > 0.0);
    let sj = plane_jet();
    let cj = StrakeCurveJet {
        u: 0.5,
        v: 0.5,
        du: 0.0,
        dv: 0.0,
        ddu: 1.0,
        ddv: 0.0,
    };
    let scales = StrakeParamScales {
        u_extent: 1.0,
        v_extent: 1.0,
        t_extent: 1.0,
    };
    // SAFETY: valid pointers.
    let st = unsafe { strake_frame_from_jets(&sj, &cj, 0, &scales, &mut f) };
    expect(
        st,
        StrakeStatus::StalledCurve,
        &["velocity (du, dv) = (0, 0)"],
    );
    assert_eq!(f, sentinel());
    free(s, c);
}

/// Fails with the code *user_data when u > 0.5; otherwise the plane.
unsafe extern "C" fn failing_right_half(
    user_data: *mut c_void,
    u: f64,
    v: f64,
    order: i32,
    out: *mut StrakeSurfaceJet,
) -> i32 {
    if u > 0.5 {
        // SAFETY: the test passes an i32.
        return unsafe { *(user_data as *const i32) };
    }
    // SAFETY: forwarded unchanged.
    unsafe { plane(ptr::null_mut(), u, v, order, out) }
}

#[test]
fn surface_callback_failure_passes_the_code_back() {
    let code: i32 = -31337;
    let s = surface(
        Some(failing_right_half),
        &code as *const i32 as *mut c_void,
        (0.0, 1.0),
        (0.0, 1.0),
        0,
    );
    let c = uv_line([0.0, 0.5], [1.0, 0.5]);
    let mut fs = [sentinel(); 5];
    // SAFETY: live handles, room for five frames.
    let st = unsafe { strake_frames_even(s, c, 5, fs.as_mut_ptr()) };
    expect(
        st,
        StrakeStatus::SurfaceCallbackFailed,
        &[
            "host surface callback failed with code -31337",
            "sample 3 (t = 0.75)",
        ],
    );
    assert_eq!(strake_last_callback_code(), -31337);
    assert_eq!(fs, [sentinel(); 5]);
    // A later success leaves the code and the message in place.
    let _ = frame_at(s, c, 0.25);
    assert_eq!(strake_last_callback_code(), -31337);
    assert!(message().contains("-31337"));
    free(s, c);
}

unsafe extern "C" fn failing_curve(
    user_data: *mut c_void,
    t: f64,
    out: *mut StrakeCurveJet,
) -> i32 {
    if t > 0.3 {
        // SAFETY: the test passes an i32.
        return unsafe { *(user_data as *const i32) };
    }
    // SAFETY: forwarded unchanged.
    unsafe { line_curve(ptr::null_mut(), t, out) }
}

#[test]
fn curve_callback_failure_passes_the_code_back() {
    let code: i32 = 77;
    let s = surface(Some(plane), ptr::null_mut(), (0.0, 1.0), (0.0, 1.0), 0);
    let mut c = ptr::null_mut();
    let mut f = sentinel();
    // SAFETY: valid callback, user_data and outputs.
    unsafe {
        assert_eq!(
            strake_curve_from_callback(
                Some(failing_curve),
                &code as *const i32 as *mut c_void,
                0.0,
                1.0,
                &mut c
            ),
            OK
        );
        assert_eq!(strake_frame_at(s, c, 0.2, &mut f), OK);
        f = sentinel();
        let st = strake_frame_at(s, c, 0.4, &mut f);
        expect(
            st,
            StrakeStatus::CurveCallbackFailed,
            &["host curve callback failed with code 77"],
        );
    }
    assert_eq!(strake_last_callback_code(), 77);
    assert_eq!(f, sentinel());
    free(s, c);
}

/// The plane, with a NaN in the y component of Suv.
unsafe extern "C" fn nan_surface(
    _: *mut c_void,
    u: f64,
    v: f64,
    order: i32,
    out: *mut StrakeSurfaceJet,
) -> i32 {
    // SAFETY: strake passes a valid jet.
    unsafe {
        plane(ptr::null_mut(), u, v, order, out);
        (*out).suv[1] = f64::NAN;
    }
    0
}

unsafe extern "C" fn inf_curve(_: *mut c_void, t: f64, out: *mut StrakeCurveJet) -> i32 {
    // SAFETY: strake passes a valid jet.
    unsafe {
        line_curve(ptr::null_mut(), t, out);
        (*out).ddv = f64::INFINITY;
    }
    0
}

#[test]
fn non_finite_values_from_callbacks_are_named() {
    let s_nan = surface(
        Some(nan_surface),
        ptr::null_mut(),
        (0.0, 1.0),
        (0.0, 1.0),
        0,
    );
    let s = surface(Some(plane), ptr::null_mut(), (0.0, 1.0), (0.0, 1.0), 0);
    let line = uv_line([0.1, 0.1], [0.9, 0.9]);
    let mut c_inf = ptr::null_mut();
    let mut f = sentinel();
    // SAFETY: valid pointers throughout.
    unsafe {
        assert_eq!(
            strake_curve_from_callback(Some(inf_curve), ptr::null_mut(), 0.0, 1.0, &mut c_inf),
            OK
        );
        expect(
            strake_frame_at(s_nan, line, 0.5, &mut f),
            StrakeStatus::NonFinite,
            &["surface jet", "Suv = NaN"],
        );
        expect(
            strake_frame_at(s, c_inf, 0.5, &mut f),
            StrakeStatus::NonFinite,
            &["curve jet", "ddv = inf"],
        );
        let mut sj = plane_jet();
        sj.p[2] = f64::NEG_INFINITY;
        let cj = StrakeCurveJet {
            u: 0.5,
            v: 0.5,
            du: 1.0,
            dv: 0.0,
            ddu: 0.0,
            ddv: 0.0,
        };
        let scales = StrakeParamScales {
            u_extent: 1.0,
            v_extent: 1.0,
            t_extent: 1.0,
        };
        expect(
            strake_frame_from_jets(&sj, &cj, 0, &scales, &mut f),
            StrakeStatus::NonFinite,
            &["S = -inf"],
        );
    }
    assert_eq!(f, sentinel());
    free(s_nan, line);
    free(s, c_inf);
}

/// Counts calls whose incoming jet was not all zero, or whose order was not 2, in *user_data.
unsafe extern "C" fn zero_checking(
    user_data: *mut c_void,
    u: f64,
    v: f64,
    order: i32,
    out: *mut StrakeSurfaceJet,
) -> i32 {
    // SAFETY: the test passes two AtomicUsize; strake a valid jet.
    let (bad, calls) = unsafe { &*(user_data as *const (AtomicUsize, AtomicUsize)) };
    calls.fetch_add(1, Ordering::Relaxed);
    // SAFETY: valid jet.
    if unsafe { *out } != StrakeSurfaceJet::default() || order != 2 {
        bad.fetch_add(1, Ordering::Relaxed);
    }
    // Fill the jet: a strake that reused it without zeroing would trip the check above.
    // SAFETY: valid jet.
    unsafe {
        plane(ptr::null_mut(), u, v, order, out);
    }
    0
}

// strake zeroes the jet before each call and asks for second order (the contract of
// StrakeSurfaceFn), so a host that fills only what it needs never leaks stale values.
#[test]
fn callback_jets_are_zeroed_and_order_two_is_requested() {
    let counters = (AtomicUsize::new(0), AtomicUsize::new(0));
    let s = surface(
        Some(zero_checking),
        &counters as *const _ as *mut c_void,
        (0.0, 1.0),
        (0.0, 1.0),
        0,
    );
    let c = uv_line([0.1, 0.1], [0.9, 0.9]);
    let mut fs = [sentinel(); 16];
    // SAFETY: room for 16 frames.
    assert_eq!(unsafe { strake_frames_even(s, c, 16, fs.as_mut_ptr()) }, OK);
    assert_eq!(counters.1.load(Ordering::Relaxed), 16);
    assert_eq!(counters.0.load(Ordering::Relaxed), 0);
    free(s, c);
}

#[test]
fn message_buffer_too_small_is_cut_and_terminated() {
    let s = surface(Some(plane), ptr::null_mut(), (0.0, 1.0), (0.0, 1.0), 0);
    let c = uv_line([0.2, 0.2], [0.8, 0.9]);
    let mut f = sentinel();
    // SAFETY: live handles.
    let st = unsafe { strake_frame_at(s, c, 2.0, &mut f) };
    assert_eq!(st, StrakeStatus::OutOfDomain);
    let full = message();
    let needed = full.len() + 1;
    // SAFETY: every buffer below is at least as long as the length passed.
    unsafe {
        assert_eq!(strake_last_error_message(ptr::null_mut(), 0), needed);
        assert_eq!(strake_last_error_message(ptr::null_mut(), 100), needed);
        let mut zero_len = [b'x'; 4];
        assert_eq!(
            strake_last_error_message(zero_len.as_mut_ptr().cast(), 0),
            needed
        );
        assert_eq!(zero_len, [b'x'; 4], "buf_len 0 writes nothing");
        let mut one = [b'x'; 2];
        assert_eq!(
            strake_last_error_message(one.as_mut_ptr().cast(), 1),
            needed
        );
        assert_eq!(one, [0, b'x']);
        let mut small = [b'x'; 11];
        assert_eq!(
            strake_last_error_message(small.as_mut_ptr().cast(), 10),
            needed
        );
        assert_eq!(&small[..9], &full.as_bytes()[..9]);
        assert_eq!(small[9], 0);
        assert_eq!(small[10], b'x', "nothing written past buf_len");
        let mut exact = vec![b'x'; needed];
        assert_eq!(
            strake_last_error_message(exact.as_mut_ptr().cast(), needed),
            needed
        );
        assert_eq!(&exact[..needed - 1], full.as_bytes());
        assert_eq!(exact[needed - 1], 0);
    }
    free(s, c);
}

#[test]
fn free_null_is_a_no_op() {
    // SAFETY: NULL is documented as a no-op.
    unsafe {
        strake_surface_free(ptr::null_mut());
        strake_curve_free(ptr::null_mut());
    }
}

// Handles are immutable: one surface and one curve evaluated from several threads at once give
// exactly the single-threaded results; messages stay per thread (common practice for C
// libraries with an errno-like last-error message).
#[test]
fn one_handle_from_many_threads() {
    struct Shared(*mut StrakeSurface, *mut StrakeCurve);
    // SAFETY: the handles are documented as usable from many threads at once.
    unsafe impl Sync for Shared {}
    let r = 3.0f64;
    let s = surface(
        Some(sphere),
        &r as *const f64 as *mut c_void,
        (0.0, 6.3),
        (0.0, 3.2),
        0,
    );
    let c = nurbs(
        3,
        &[0.0, 0.0, 0.0, 0.0, 1.0, 1.0, 1.0, 1.0],
        &[[0.5, 0.4], [2.0, 2.5], [4.0, 0.8], [5.5, 2.7]],
        None,
    );
    let shared = Shared(s, c);
    const N: usize = 400;
    let mut reference = vec![sentinel(); N];
    // SAFETY: room for N frames.
    assert_eq!(
        unsafe { strake_frames_even(s, c, N, reference.as_mut_ptr()) },
        OK
    );
    let barrier = std::sync::Barrier::new(4);
    std::thread::scope(|scope| {
        for k in 0..4 {
            let (shared, reference, barrier) = (&shared, &reference, &barrier);
            scope.spawn(move || {
                barrier.wait();
                for round in 0..5 {
                    let mut out = vec![sentinel(); N];
                    // SAFETY: shared live handles, room for N frames.
                    assert_eq!(
                        unsafe { strake_frames_even(shared.0, shared.1, N, out.as_mut_ptr()) },
                        OK
                    );
                    assert_eq!(&out, reference);
                    // Each thread fails in its own way; its message is its own.
                    let t = 2.0 + k as f64 + round as f64 / 10.0;
                    let mut f = sentinel();
                    // SAFETY: as above.
                    let st = unsafe { strake_frame_at(shared.0, shared.1, t, &mut f) };
                    assert_eq!(st, StrakeStatus::OutOfDomain);
                    assert!(
                        message().contains(&format!("t = {t} ")),
                        "thread {k}: {}",
                        message()
                    );
                }
            });
        }
    });
    free(s, c);
}
