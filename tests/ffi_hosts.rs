//! The C calls hosts need around the frame calls: evaluating a surface handle
//! (`strake_surface_evaluate`), frames with their arc length at the host's parameters
//! (`strake_samples_at`), and the text a failing callback hands back
//! (`strake_callback_report`). Every status and NULL pointer of each.

#[path = "support/ffi_util.rs"]
mod ffi_util;

use ffi_util::*;
use std::ffi::{CString, c_void};
use std::ptr;
use strake::ffi::*;

fn jet_sentinel() -> StrakeSurfaceJet {
    StrakeSurfaceJet {
        p: [-9.5; 3],
        su: [-9.5; 3],
        sv: [-9.5; 3],
        suu: [-9.5; 3],
        suv: [-9.5; 3],
        svv: [-9.5; 3],
    }
}

fn evaluate(
    s: *const StrakeSurface,
    uv: &[f64],
    order: u32,
) -> (StrakeStatus, Vec<StrakeSurfaceJet>) {
    let mut out = vec![jet_sentinel(); uv.len() / 2];
    // SAFETY: uv holds 2 n doubles and out n jets.
    let st =
        unsafe { strake_surface_evaluate(s, uv.as_ptr(), uv.len() / 2, order, out.as_mut_ptr()) };
    (st, out)
}

// A callback surface evaluates to the callback's own values, bit for bit, with the entries
// above the order asked set to zero (the contract of strake_surface_evaluate).
#[test]
fn callback_surface_gives_the_callbacks_jet_to_the_order_asked() {
    let mut r = 2.5f64;
    let s = surface(
        Some(sphere),
        (&mut r as *mut f64).cast(),
        (0.0, 6.0),
        (0.2, 3.0),
        0,
    );
    let uv = [0.3, 1.1, 2.0, 0.5, 5.5, 2.9];
    let (st, full) = evaluate(s, &uv, 2);
    assert_eq!(st, StrakeStatus::Ok, "{}", message());
    for (i, j) in full.iter().enumerate() {
        let mut want = StrakeSurfaceJet::default();
        // SAFETY: a valid radius and jet.
        unsafe {
            sphere(
                (&mut r as *mut f64).cast(),
                uv[2 * i],
                uv[2 * i + 1],
                2,
                &mut want,
            )
        };
        assert_eq!(*j, want, "point {i}");
    }
    let (st, first) = evaluate(s, &uv, 1);
    assert_eq!(st, StrakeStatus::Ok);
    let (st, zeroth) = evaluate(s, &uv, 0);
    assert_eq!(st, StrakeStatus::Ok);
    for i in 0..3 {
        assert_eq!(
            (first[i].p, first[i].su, first[i].sv),
            (full[i].p, full[i].su, full[i].sv)
        );
        assert_eq!(
            (first[i].suu, first[i].suv, first[i].svv),
            ([0.0; 3], [0.0; 3], [0.0; 3])
        );
        assert_eq!(zeroth[i].p, full[i].p);
        assert_eq!((zeroth[i].su, zeroth[i].sv), ([0.0; 3], [0.0; 3]));
    }
    free(s, ptr::null_mut());
}

// A bilinear NURBS patch (degree 1 x 1, four corners): S = (1-u)(1-v) P00 + (1-u) v P01 +
// u (1-v) P10 + u v P11 (The NURBS Book eq. 3.11 with degree 1), so Su, Sv and Suv are the
// corner differences and Suu = Svv = 0 exactly.
#[test]
#[allow(clippy::needless_range_loop)] // k indexes the coordinates of five arrays
fn bilinear_nurbs_patch_matches_its_closed_form() {
    let p = [
        [0.0, 0.0, 0.0],
        [0.0, 2.0, 1.0],
        [3.0, 0.0, -1.0],
        [3.0, 2.0, 4.0],
    ];
    let points: Vec<f64> = p.iter().flatten().copied().collect();
    let knots = [0.0, 0.0, 1.0, 1.0];
    let data = StrakeNurbsSurfaceData {
        degree_u: 1,
        degree_v: 1,
        count_u: 2,
        count_v: 2,
        knots_u: knots.as_ptr(),
        knot_count_u: 4,
        knots_v: knots.as_ptr(),
        knot_count_v: 4,
        points: points.as_ptr(),
        weights: ptr::null(),
    };
    let mut s = ptr::null_mut();
    // SAFETY: valid data and output slot.
    assert_eq!(
        unsafe { strake_surface_new_nurbs(&data, 0, &mut s) },
        StrakeStatus::Ok
    );
    let uv = [0.25, 0.5, 0.75, 0.125, 1.0, 0.0];
    let (st, jets) = evaluate(s, &uv, 2);
    assert_eq!(st, StrakeStatus::Ok, "{}", message());
    for (i, j) in jets.iter().enumerate() {
        let (u, v) = (uv[2 * i], uv[2 * i + 1]);
        for k in 0..3 {
            let pt = (1.0 - u) * (1.0 - v) * p[0][k]
                + (1.0 - u) * v * p[1][k]
                + u * (1.0 - v) * p[2][k]
                + u * v * p[3][k];
            let su = (1.0 - v) * (p[2][k] - p[0][k]) + v * (p[3][k] - p[1][k]);
            let sv = (1.0 - u) * (p[1][k] - p[0][k]) + u * (p[3][k] - p[2][k]);
            let suv = p[3][k] - p[2][k] - p[1][k] + p[0][k];
            close("p", j.p[k], pt, 1e-14, 1.0);
            close("su", j.su[k], su, 1e-14, 1.0);
            close("sv", j.sv[k], sv, 1e-14, 1.0);
            close("suv", j.suv[k], suv, 1e-14, 1.0);
            assert_eq!((j.suu[k], j.svv[k]), (0.0, 0.0), "point {i}");
        }
    }
    free(s, ptr::null_mut());
}

#[test]
fn surface_evaluate_refuses_bad_input_and_leaves_output_alone() {
    let s = surface(Some(plane), ptr::null_mut(), (0.0, 1.0), (0.0, 1.0), 0);
    let uv = [0.5, 0.5, 0.25, 1.5];
    let (st, out) = evaluate(s, &uv, 2);
    expect(
        st,
        StrakeStatus::OutOfDomain,
        &["strake_surface_evaluate", "point 1", "v"],
    );
    assert_eq!(out[0], jet_sentinel());
    let (st, _) = evaluate(s, &[0.5, f64::NAN], 1);
    expect(st, StrakeStatus::NonFinite, &["point 0"]);
    let (st, _) = evaluate(s, &[0.5, 0.5], 3);
    expect(st, StrakeStatus::InvalidArgument, &["`order` = 3"]);
    let mut one = [jet_sentinel()];
    // SAFETY: each call passes NULL or valid pointers.
    unsafe {
        expect(
            strake_surface_evaluate(ptr::null(), uv.as_ptr(), 1, 0, one.as_mut_ptr()),
            StrakeStatus::NullPointer,
            &["`surface`"],
        );
        expect(
            strake_surface_evaluate(s, ptr::null(), 1, 0, one.as_mut_ptr()),
            StrakeStatus::NullPointer,
            &["`uv`"],
        );
        expect(
            strake_surface_evaluate(s, uv.as_ptr(), 1, 0, ptr::null_mut()),
            StrakeStatus::NullPointer,
            &["`out`"],
        );
        expect(
            strake_surface_evaluate(s, uv.as_ptr(), 0, 0, one.as_mut_ptr()),
            StrakeStatus::InvalidArgument,
            &["`count` is 0"],
        );
    }
    assert_eq!(one[0], jet_sentinel());
    free(s, ptr::null_mut());
}

// strake_samples_at gives the frames of strake_frames_at bit for bit and the arc lengths of
// strake_sample_even_t at the same parameters; on a cylinder of radius R a line in (u, v) is a
// helix of constant speed, so s(t) = |c'| t exactly (do Carmo, Differential Geometry of Curves
// and Surfaces, sec. 1-3, arc length of the helix).
#[test]
fn samples_at_agree_with_frames_at_and_even_sampling() {
    let mut r = 2.0f64;
    let s = surface(
        Some(cylinder),
        (&mut r as *mut f64).cast(),
        (0.0, 6.0),
        (-1.0, 5.0),
        0,
    );
    let c = uv_line([0.0, 0.0], [3.0, 4.0]);
    let n = 9;
    let mut even = vec![
        StrakeSample {
            frame: sentinel(),
            arc_length: 0.0
        };
        n
    ];
    let mut count = 0;
    // SAFETY: valid handles and buffers.
    let st = unsafe { strake_sample_even_t(s, c, n, 1e-12, even.as_mut_ptr(), n, &mut count) };
    assert_eq!(st, StrakeStatus::Ok, "{}", message());
    let ts: Vec<f64> = even.iter().map(|x| x.frame.curve_param).collect();
    let mut got = vec![
        StrakeSample {
            frame: sentinel(),
            arc_length: -1.0
        };
        n
    ];
    let mut frames = vec![sentinel(); n];
    // SAFETY: as above.
    unsafe {
        assert_eq!(
            strake_samples_at(s, c, ts.as_ptr(), n, 1e-12, got.as_mut_ptr()),
            StrakeStatus::Ok
        );
        assert_eq!(
            strake_frames_at(s, c, ts.as_ptr(), n, frames.as_mut_ptr()),
            StrakeStatus::Ok
        );
    }
    let speed = (36.0f64 + 16.0).sqrt(); // |(3 R, 4)| per unit t with R = 2
    for i in 0..n {
        assert_eq!(got[i].frame, frames[i], "frame {i}");
        close(
            "arc length vs even",
            got[i].arc_length,
            even[i].arc_length,
            1e-12,
            1.0,
        );
        close(
            "arc length vs helix",
            got[i].arc_length,
            speed * ts[i],
            1e-12,
            1.0,
        );
    }
    // Parameters out of order: s is a function of t alone.
    let back = [0.75, 0.25, 0.5];
    let mut three = vec![
        StrakeSample {
            frame: sentinel(),
            arc_length: -1.0
        };
        3
    ];
    // SAFETY: as above.
    assert_eq!(
        unsafe { strake_samples_at(s, c, back.as_ptr(), 3, 1e-12, three.as_mut_ptr()) },
        StrakeStatus::Ok
    );
    for (x, t) in three.iter().zip(back) {
        close("out of order", x.arc_length, speed * t, 1e-12, 1.0);
    }
    free(s, c);
}

#[test]
fn samples_at_refuses_bad_input_and_leaves_output_alone() {
    let s = surface(Some(plane), ptr::null_mut(), (0.0, 1.0), (0.0, 1.0), 0);
    let c = uv_line([0.1, 0.1], [0.9, 0.8]);
    let ts = [0.0, 0.5, 1.5];
    let keep = StrakeSample {
        frame: sentinel(),
        arc_length: -3.0,
    };
    let mut out = vec![keep; 3];
    // SAFETY: each call passes NULL or valid pointers.
    unsafe {
        expect(
            strake_samples_at(s, c, ts.as_ptr(), 3, 1e-10, out.as_mut_ptr()),
            StrakeStatus::OutOfDomain,
            &["strake_samples_at", "sample 2"],
        );
        expect(
            strake_samples_at(s, c, ts.as_ptr(), 2, 0.0, out.as_mut_ptr()),
            StrakeStatus::InvalidArgument,
            &["`arc_tolerance` = 0"],
        );
        expect(
            strake_samples_at(s, c, ts.as_ptr(), 0, 1e-10, out.as_mut_ptr()),
            StrakeStatus::InvalidArgument,
            &["`count` is 0"],
        );
        expect(
            strake_samples_at(ptr::null(), c, ts.as_ptr(), 2, 1e-10, out.as_mut_ptr()),
            StrakeStatus::NullPointer,
            &["`surface`"],
        );
        expect(
            strake_samples_at(s, ptr::null(), ts.as_ptr(), 2, 1e-10, out.as_mut_ptr()),
            StrakeStatus::NullPointer,
            &["`curve`"],
        );
        expect(
            strake_samples_at(s, c, ptr::null(), 2, 1e-10, out.as_mut_ptr()),
            StrakeStatus::NullPointer,
            &["`ts`"],
        );
        expect(
            strake_samples_at(s, c, ts.as_ptr(), 2, 1e-10, ptr::null_mut()),
            StrakeStatus::NullPointer,
            &["`out`"],
        );
    }
    for x in &out {
        assert_eq!((x.frame, x.arc_length), (keep.frame, keep.arc_length));
    }
    free(s, c);
}

/// A plane whose callback fails at u > 0.5 with code 7, reporting why when user_data is not
/// NULL (a C string).
unsafe extern "C" fn picky_plane(
    user_data: *mut c_void,
    u: f64,
    v: f64,
    order: i32,
    out: *mut StrakeSurfaceJet,
) -> i32 {
    if u > 0.5 {
        if !user_data.is_null() {
            // SAFETY: the tests pass a NUL-terminated string.
            unsafe { strake_callback_report(user_data.cast_const().cast()) };
        }
        return 7;
    }
    // SAFETY: a valid jet.
    unsafe { plane(ptr::null_mut(), u, v, order, out) }
}

/// Reports a message, then succeeds: a report that must not outlive its call.
unsafe extern "C" fn chatty_plane(
    _: *mut c_void,
    u: f64,
    v: f64,
    order: i32,
    out: *mut StrakeSurfaceJet,
) -> i32 {
    let text = c"left behind";
    // SAFETY: a NUL-terminated string; a valid jet.
    unsafe {
        strake_callback_report(text.as_ptr());
        plane(ptr::null_mut(), u, v, order, out)
    }
}

#[test]
fn a_failing_callback_hands_its_text_back() {
    let why = CString::new("host kernel: trimmed face 12 has no point at u = 0.75").unwrap();
    let s = surface(
        Some(picky_plane),
        why.as_ptr() as *mut c_void,
        (0.0, 1.0),
        (0.0, 1.0),
        0,
    );
    let (st, _) = evaluate(s, &[0.25, 0.5, 0.75, 0.5], 1);
    expect(
        st,
        StrakeStatus::SurfaceCallbackFailed,
        &[
            "point 1",
            "code 7: host kernel: trimmed face 12 has no point at u = 0.75",
        ],
    );
    assert_eq!(strake_last_callback_code(), 7);
    // Through the frame calls too, and in a parallel call whose worker ran the callback.
    let c = uv_line([0.0, 0.5], [1.0, 0.5]);
    let ts: Vec<f64> = (0..20_000).map(|i| f64::from(i) / 19_999.0).collect();
    let mut frames = vec![sentinel(); ts.len()];
    // SAFETY: valid handles and arrays.
    let st =
        unsafe { strake_frames_at_parallel(s, c, ts.as_ptr(), ts.len(), 2, frames.as_mut_ptr()) };
    expect(
        st,
        StrakeStatus::SurfaceCallbackFailed,
        &["code 7: host kernel: trimmed face 12"],
    );
    free(s, c);

    // Without a report the message is the code alone.
    let s = surface(
        Some(picky_plane),
        ptr::null_mut(),
        (0.0, 1.0),
        (0.0, 1.0),
        0,
    );
    let (st, _) = evaluate(s, &[0.75, 0.5], 1);
    expect(
        st,
        StrakeStatus::SurfaceCallbackFailed,
        &["failed with code 7"],
    );
    assert!(!message().contains("code 7:"), "{}", message());
    free(s, ptr::null_mut());

    // A report left by a callback that succeeded is not attached to a later failure.
    let s = surface(
        Some(chatty_plane),
        ptr::null_mut(),
        (0.0, 1.0),
        (0.0, 1.0),
        0,
    );
    let (st, _) = evaluate(s, &[0.5, 0.5], 0);
    assert_eq!(st, StrakeStatus::Ok);
    free(s, ptr::null_mut());
    let s = surface(
        Some(picky_plane),
        ptr::null_mut(),
        (0.0, 1.0),
        (0.0, 1.0),
        0,
    );
    let (st, _) = evaluate(s, &[0.75, 0.5], 0);
    expect(st, StrakeStatus::SurfaceCallbackFailed, &["code 7"]);
    assert!(!message().contains("left behind"), "{}", message());
    free(s, ptr::null_mut());

    // NULL is accepted (it forgets a report), and long text is cut.
    // SAFETY: NULL and a NUL-terminated string.
    unsafe { strake_callback_report(ptr::null()) };
    let long = CString::new("x".repeat(5000)).unwrap();
    let s = surface(
        Some(picky_plane),
        long.as_ptr() as *mut c_void,
        (0.0, 1.0),
        (0.0, 1.0),
        0,
    );
    let (st, _) = evaluate(s, &[0.75, 0.5], 0);
    expect(st, StrakeStatus::SurfaceCallbackFailed, &["xxx..."]);
    assert!(message().len() < 1200, "{}", message().len());
    free(s, ptr::null_mut());
}
