//! `strake_knot_line_flags`: the crease flags through the C ABI, every status it returns with
//! the flags array left untouched, and agreement with the frames of `strake_frame_at`.
//!
//! The surface is the roof of `tests/regression_crease_side.rs` (two parabolic pieces joined by
//! a double knot at u = 1, degree 2: only C0 there; invented data), with the same closed-form
//! normals of the two sides: (−1, 0, 1)/√2 below the knot, (0, 0, 1) above it.

#[path = "support/ffi_util.rs"]
mod ffi_util;

use ffi_util::{expect, frame_at, free, nurbs};
use std::ptr;
use strake::ffi::{
    StrakeKnotLineFlag, StrakeNurbsSurfaceData, StrakeStatus, StrakeSurface,
    strake_knot_line_flags, strake_surface_new_nurbs,
};

fn roof() -> *mut StrakeSurface {
    let ku = [0.0, 0.0, 0.0, 1.0, 1.0, 2.0, 2.0, 2.0];
    let kv = [0.0, 0.0, 1.0, 1.0];
    let c = [
        [0.0, 0.0, 0.0],
        [1.0, 0.0, 0.0],
        [2.0, 0.0, 1.0],
        [3.0, 0.0, 1.0],
        [4.0, 0.0, 0.0],
    ];
    let mut pts = Vec::new();
    for p in c {
        pts.extend_from_slice(&p);
        pts.extend_from_slice(&[p[0], 1.0, p[2]]);
    }
    let data = StrakeNurbsSurfaceData {
        degree_u: 2,
        degree_v: 1,
        count_u: 5,
        count_v: 2,
        knots_u: ku.as_ptr(),
        knot_count_u: ku.len(),
        knots_v: kv.as_ptr(),
        knot_count_v: kv.len(),
        points: pts.as_ptr(),
        weights: ptr::null(),
    };
    let mut s = ptr::null_mut();
    // SAFETY: the arrays hold the stated counts and outlive the call.
    let st = unsafe { strake_surface_new_nurbs(&data, 0, &mut s) };
    assert_eq!(st, StrakeStatus::Ok);
    s
}

const SENTINEL: u32 = 0xdead_beef;

#[test]
fn flags_and_frames_of_a_path_crossing_and_one_along_the_crease() {
    let s = roof();
    // Crossing toward decreasing u: at t = 1/2 on the knot (rational line, middle point).
    let cross = nurbs(
        2,
        &[0.0, 0.0, 0.0, 1.0, 1.0, 1.0],
        &[[1.7, 0.2], [1.0, 0.5], [0.3, 0.8]],
        Some(&[1.0, 0.37, 1.0]),
    );
    let ts = [0.1, 0.5, 0.9];
    let mut flags = [SENTINEL; 3];
    // SAFETY: live handles, 3 doubles, room for 3 flags.
    let st = unsafe { strake_knot_line_flags(s, cross, ts.as_ptr(), 3, flags.as_mut_ptr()) };
    assert_eq!(st, StrakeStatus::Ok);
    let crease = StrakeKnotLineFlag::ULine as u32 | StrakeKnotLineFlag::UOnlyC0 as u32;
    assert_eq!(flags, [0, crease, 0]);
    let f = frame_at(s, cross, 0.5);
    assert_eq!(f.u, 1.0);
    let h = 0.5f64.sqrt();
    for (a, b) in f.normal.iter().zip([-h, 0.0, h]) {
        assert!((a - b).abs() < 1e-15, "left side's normal: {:?}", f.normal);
    }
    // Along the line u = 1: the side above the knot, flagged as chosen by rule.
    let along = nurbs(1, &[0.0, 0.0, 1.0, 1.0], &[[1.0, 0.1], [1.0, 0.9]], None);
    let mut flag = [SENTINEL];
    // SAFETY: as above, one sample.
    let st = unsafe { strake_knot_line_flags(s, along, [0.3].as_ptr(), 1, flag.as_mut_ptr()) };
    assert_eq!(st, StrakeStatus::Ok);
    assert_eq!(flag[0], crease | StrakeKnotLineFlag::AlongU as u32);
    assert_eq!(frame_at(s, along, 0.3).normal, [0.0, 0.0, 1.0]);
    free(ptr::null_mut(), along);
    free(s, cross);
}

#[test]
fn every_status_leaves_the_flags_untouched() {
    let s = roof();
    let c = nurbs(1, &[0.0, 0.0, 1.0, 1.0], &[[0.5, 0.1], [1.5, 0.9]], None);
    let ts = [0.25, 0.5];
    let mut flags = [SENTINEL; 2];
    let call = |s, c, ts: *const f64, n, out: *mut u32| {
        // SAFETY: each pointer is NULL or valid for `n` elements.
        unsafe { strake_knot_line_flags(s, c, ts, n, out) }
    };
    let out = flags.as_mut_ptr();
    expect(
        call(ptr::null(), c, ts.as_ptr(), 2, out),
        StrakeStatus::NullPointer,
        &["surface"],
    );
    expect(
        call(s, ptr::null(), ts.as_ptr(), 2, out),
        StrakeStatus::NullPointer,
        &["curve"],
    );
    expect(
        call(s, c, ptr::null(), 2, out),
        StrakeStatus::NullPointer,
        &["ts"],
    );
    expect(
        call(s, c, ts.as_ptr(), 2, ptr::null_mut()),
        StrakeStatus::NullPointer,
        &["flags"],
    );
    expect(
        call(s, c, ts.as_ptr(), 0, out),
        StrakeStatus::InvalidArgument,
        &["count"],
    );
    let bad = [0.25, 1.5];
    expect(
        call(s, c, bad.as_ptr(), 2, out),
        StrakeStatus::OutOfDomain,
        &["sample 1", "1.5"],
    );
    let nan = [f64::NAN, 0.5];
    expect(
        call(s, c, nan.as_ptr(), 2, out),
        StrakeStatus::NonFinite,
        &["sample 0"],
    );
    assert_eq!(flags, [SENTINEL; 2]);
    // And the curve leaving the surface's domain in u.
    let off = nurbs(1, &[0.0, 0.0, 1.0, 1.0], &[[1.5, 0.5], [2.5, 0.5]], None);
    let far = [0.25, 0.75];
    expect(
        call(s, off, far.as_ptr(), 2, flags.as_mut_ptr()),
        StrakeStatus::OutOfDomain,
        &["sample 1", "u"],
    );
    assert_eq!(flags, [SENTINEL; 2]);
    free(ptr::null_mut(), off);
    free(s, c);
}
