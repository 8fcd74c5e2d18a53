//! The C ABI of geodesics and offsets: results against closed forms (great circles on a
//! sphere, do Carmo §4-4; parallel lines on a plane, exact geometry), the traced curve used as
//! an ordinary curve handle, every status, NULL pointers and untouched outputs on failure.

#[path = "support/ffi_util.rs"]
mod ffi_util;

use ffi_util::*;
use std::f64::consts::{FRAC_PI_2, PI};
use std::ptr;
use strake::ffi::*;

fn opts(tolerance: f64) -> StrakeGeodesicOptions {
    StrakeGeodesicOptions {
        tolerance,
        max_steps: 0,
    }
}

fn sentinel_curve() -> *mut StrakeCurve {
    0x10 as *mut StrakeCurve
}

#[test]
fn trace_gives_a_curve_handle_with_zero_geodesic_curvature() {
    let mut r = 2.0f64;
    let s = surface(Some(sphere), (&raw mut r).cast(), (0.0, 6.2), (0.0, PI), 0);
    let mut c = ptr::null_mut();
    let mut info = StrakeGeodesicInfo::default();
    let theta = 0.4;
    // SAFETY: live handle, valid pointers.
    let st = unsafe {
        strake_geodesic_trace(s, 3.0, 1.2, 0, &theta, 2.0, &opts(1e-10), &mut c, &mut info)
    };
    expect(st, StrakeStatus::Ok, &[]);
    assert_eq!(info.end, StrakeGeodesicEnd::Length as u32);
    assert_eq!(info.length, 2.0);
    assert!(
        info.jets as f64 <= 8.0 * info.accepted_steps as f64 + 1.0,
        "{info:?}"
    );
    // Every point on a great circle: the plane through the centre spanned by the start point
    // and its tangent (do Carmo §4-4).
    let f0 = frame_at(s, c, 0.0);
    let n = cross(f0.point, f0.tangent);
    for i in 0..=20 {
        let f = frame_at(s, c, 2.0 * i as f64 / 20.0);
        assert!(
            f.geodesic_curvature.abs() < 1e-6,
            "kg {}",
            f.geodesic_curvature
        );
        assert!(dot(f.point, n).abs() < 1e-8 * 4.0);
        close("speed", f.speed, 1.0, 1e-8, 1.0);
    }
    // Sampling works on it like on any curve.
    let mut count = 0usize;
    let mut buf = vec![StrakeSample::default(); 5];
    // SAFETY: valid buffer of 5.
    let st = unsafe { strake_sample_even_t(s, c, 5, 1e-10, buf.as_mut_ptr(), 5, &mut count) };
    expect(st, StrakeStatus::Ok, &[]);
    close("arc length", buf[4].arc_length, 2.0, 1e-8, 1.0);
    free(s, c);
}

fn cross(a: [f64; 3], b: [f64; 3]) -> [f64; 3] {
    [
        a[1] * b[2] - a[2] * b[1],
        a[2] * b[0] - a[0] * b[2],
        a[0] * b[1] - a[1] * b[0],
    ]
}

fn dot(a: [f64; 3], b: [f64; 3]) -> f64 {
    a[0] * b[0] + a[1] * b[1] + a[2] * b[2]
}

#[test]
fn trace_statuses() {
    let mut r = 1.0f64;
    let s = surface(Some(sphere), (&raw mut r).cast(), (0.0, 6.2), (0.0, PI), 0);
    let o = opts(1e-9);
    let theta = 0.3;
    let call = |s: *const StrakeSurface,
                u: f64,
                v: f64,
                kind: u32,
                d: *const f64,
                len: f64,
                o: *const StrakeGeodesicOptions,
                c: *mut *mut StrakeCurve,
                i: *mut StrakeGeodesicInfo| {
        // SAFETY: the pointers are valid or NULL on purpose.
        unsafe { strake_geodesic_trace(s, u, v, kind, d, len, o, c, i) }
    };
    let mut c = sentinel_curve();
    let mut info = StrakeGeodesicInfo {
        length: -5.0,
        ..Default::default()
    };
    let dirs = [0.0f64; 3];
    expect(
        call(ptr::null(), 1.0, 1.0, 0, &theta, 1.0, &o, &mut c, &mut info),
        StrakeStatus::NullPointer,
        &["surface"],
    );
    assert_eq!(c, sentinel_curve(), "out_curve written on failure");
    assert_eq!(info.length, -5.0, "out_info written on failure");
    expect(
        call(s, 1.0, 1.0, 0, ptr::null(), 1.0, &o, &mut c, &mut info),
        StrakeStatus::NullPointer,
        &["direction"],
    );
    assert_eq!(c, sentinel_curve(), "out_curve written on failure");
    assert_eq!(info.length, -5.0, "out_info written on failure");
    expect(
        call(s, 1.0, 1.0, 0, &theta, 1.0, ptr::null(), &mut c, &mut info),
        StrakeStatus::NullPointer,
        &["options"],
    );
    assert_eq!(c, sentinel_curve(), "out_curve written on failure");
    assert_eq!(info.length, -5.0, "out_info written on failure");
    expect(
        call(s, 1.0, 1.0, 0, &theta, 1.0, &o, ptr::null_mut(), &mut info),
        StrakeStatus::NullPointer,
        &["out_curve"],
    );
    assert_eq!(c, sentinel_curve(), "out_curve written on failure");
    assert_eq!(info.length, -5.0, "out_info written on failure");
    expect(
        call(s, 1.0, 1.0, 7, &theta, 1.0, &o, &mut c, &mut info),
        StrakeStatus::InvalidArgument,
        &["direction_kind", "7"],
    );
    assert_eq!(c, sentinel_curve(), "out_curve written on failure");
    assert_eq!(info.length, -5.0, "out_info written on failure");
    expect(
        call(s, 1.0, 1.0, 1, dirs.as_ptr(), 1.0, &o, &mut c, &mut info),
        StrakeStatus::InvalidArgument,
        &["(0, 0, 0)"],
    );
    assert_eq!(c, sentinel_curve(), "out_curve written on failure");
    assert_eq!(info.length, -5.0, "out_info written on failure");
    expect(
        call(s, 1.0, 1.0, 2, dirs.as_ptr(), 1.0, &o, &mut c, &mut info),
        StrakeStatus::InvalidArgument,
        &["(0, 0)"],
    );
    assert_eq!(c, sentinel_curve(), "out_curve written on failure");
    assert_eq!(info.length, -5.0, "out_info written on failure");
    expect(
        call(s, 1.0, 1.0, 0, &theta, 0.0, &o, &mut c, &mut info),
        StrakeStatus::InvalidArgument,
        &["length = 0"],
    );
    assert_eq!(c, sentinel_curve(), "out_curve written on failure");
    assert_eq!(info.length, -5.0, "out_info written on failure");
    expect(
        call(s, 1.0, 1.0, 0, &theta, 1.0, &opts(0.0), &mut c, &mut info),
        StrakeStatus::InvalidArgument,
        &["tolerance = 0"],
    );
    assert_eq!(c, sentinel_curve(), "out_curve written on failure");
    assert_eq!(info.length, -5.0, "out_info written on failure");
    expect(
        call(s, 9.0, 1.0, 0, &theta, 1.0, &o, &mut c, &mut info),
        StrakeStatus::OutOfDomain,
        &["u = 9"],
    );
    assert_eq!(c, sentinel_curve(), "out_curve written on failure");
    assert_eq!(info.length, -5.0, "out_info written on failure");
    expect(
        call(s, f64::NAN, 1.0, 0, &theta, 1.0, &o, &mut c, &mut info),
        StrakeStatus::NonFinite,
        &["u"],
    );
    assert_eq!(c, sentinel_curve(), "out_curve written on failure");
    assert_eq!(info.length, -5.0, "out_info written on failure");
    expect(
        call(s, 1.0, 0.0, 0, &theta, 1.0, &o, &mut c, &mut info),
        StrakeStatus::DegenerateSurface,
        &["degenerate"],
    );
    assert_eq!(c, sentinel_curve(), "out_curve written on failure");
    assert_eq!(info.length, -5.0, "out_info written on failure");
    expect(
        call(s, 0.0, 1.0, 0, &PI, 1.0, &o, &mut c, &mut info),
        StrakeStatus::LeavesSurface,
        &["heads out"],
    );
    assert_eq!(c, sentinel_curve(), "out_curve written on failure");
    assert_eq!(info.length, -5.0, "out_info written on failure");
    expect(
        call(s, 1.0, 1.0, 0, &theta, 1.0, &opts(1e-30), &mut c, &mut info),
        StrakeStatus::GeodesicIncomplete,
        &["tolerance"],
    );
    assert_eq!(c, sentinel_curve(), "out_curve written on failure");
    assert_eq!(info.length, -5.0, "out_info written on failure");
    expect(
        call(
            s,
            1.0,
            1.0,
            0,
            &theta,
            3.0,
            &StrakeGeodesicOptions {
                tolerance: 1e-12,
                max_steps: 2,
            },
            &mut c,
            &mut info,
        ),
        StrakeStatus::GeodesicIncomplete,
        &["step cap"],
    );
    assert_eq!(c, sentinel_curve(), "out_curve written on failure");
    assert_eq!(info.length, -5.0, "out_info written on failure");
    // A trace that runs into the seam u = 0: OK, ends exactly on the side.
    let mut c = ptr::null_mut();
    let st = call(s, 0.5, FRAC_PI_2, 0, &PI, 3.0, &o, &mut c, &mut info);
    expect(st, StrakeStatus::Ok, &[]);
    assert_eq!(info.end, StrakeGeodesicEnd::Boundary as u32);
    assert_eq!(info.side, StrakeDomainSide::UMin as u32);
    assert_eq!(info.u, 0.0);
    close("length to the seam", info.length, 0.5, 1e-9, 1.0);
    // NULL info is allowed.
    let mut c2 = ptr::null_mut();
    let st = call(s, 1.0, 1.0, 0, &theta, 1.0, &o, &mut c2, ptr::null_mut());
    expect(st, StrakeStatus::Ok, &[]);
    // SAFETY: handles made above.
    unsafe {
        strake_curve_free(c);
        strake_curve_free(c2);
    }
    free(s, ptr::null_mut());
}

#[test]
fn between_gives_the_central_angle_and_its_statuses() {
    let mut r = 1.5f64;
    let s = surface(Some(sphere), (&raw mut r).cast(), (0.0, 6.2), (0.0, PI), 0);
    let mut d = -1.0;
    let mut c = ptr::null_mut();
    // SAFETY: valid pointers.
    let st = unsafe { strake_geodesic_between(s, 1.0, 1.0, 2.5, 2.0, &opts(1e-9), &mut c, &mut d) };
    expect(st, StrakeStatus::Ok, &[]);
    let p = |u: f64, v: f64| [v.sin() * u.cos(), v.sin() * u.sin(), v.cos()];
    let exact = r * dot(p(1.0, 1.0), p(2.5, 2.0)).acos();
    close("distance", d, exact, 1e-8, 1.0);
    let end = frame_at(s, c, d);
    close("end u", end.u, 2.5, 1e-8, 1.0);
    // SAFETY: as above; NULL out_curve asks for the distance only.
    let st = unsafe {
        strake_geodesic_between(s, 1.0, 1.0, 2.5, 2.0, &opts(1e-9), ptr::null_mut(), &mut d)
    };
    expect(st, StrakeStatus::Ok, &[]);
    let mut d = -1.0;
    let mut c2 = sentinel_curve();
    // SAFETY: NULLs on purpose.
    unsafe {
        let st = strake_geodesic_between(
            ptr::null(),
            1.0,
            1.0,
            2.0,
            2.0,
            &opts(1e-9),
            &mut c2,
            &mut d,
        );
        expect(st, StrakeStatus::NullPointer, &["surface"]);
        let st = strake_geodesic_between(s, 1.0, 1.0, 2.0, 2.0, ptr::null(), &mut c2, &mut d);
        expect(st, StrakeStatus::NullPointer, &["options"]);
        let st =
            strake_geodesic_between(s, 1.0, 1.0, 2.0, 2.0, &opts(1e-9), &mut c2, ptr::null_mut());
        expect(st, StrakeStatus::NullPointer, &["out_distance"]);
        let st = strake_geodesic_between(s, 1.0, 1.0, 1.0, 1.0, &opts(1e-9), &mut c2, &mut d);
        expect(st, StrakeStatus::InvalidArgument, &["coincide"]);
        let st = strake_geodesic_between(s, 1.0, 1.0, 1.0, 0.0, &opts(1e-9), &mut c2, &mut d);
        expect(st, StrakeStatus::DegenerateSurface, &["(1, 0)"]);
        let st = strake_geodesic_between(
            s,
            1.0,
            0.5,
            3.0,
            2.5,
            &StrakeGeodesicOptions {
                tolerance: 1e-12,
                max_steps: 1,
            },
            &mut c2,
            &mut d,
        );
        expect(st, StrakeStatus::GeodesicNotFound, &["miss"]);
    }
    assert_eq!(c2, sentinel_curve());
    assert_eq!(d, -1.0);
    // SAFETY: handle made above.
    unsafe { strake_curve_free(c) };
    free(s, ptr::null_mut());
}

fn offset_options(tol: f64) -> StrakeOffsetOptions {
    StrakeOffsetOptions {
        chord_tolerance: tol,
        ..Default::default()
    }
}

#[test]
fn offset_of_a_plane_line_its_pieces_and_buffers() {
    let s = surface(Some(plane), ptr::null_mut(), (0.0, 10.0), (0.0, 4.0), 0);
    let path = uv_line([1.0, 1.0], [9.0, 3.5]);
    let mut off = ptr::null_mut();
    let d = 1.0;
    // SAFETY: valid pointers.
    let st = unsafe {
        strake_offset_new(
            s,
            path,
            0,
            ptr::null(),
            &d,
            1,
            &offset_options(1e-7),
            &mut off,
        )
    };
    expect(st, StrakeStatus::Ok, &[]);
    let mut sum = StrakeOffsetSummary::default();
    // SAFETY: live handle.
    unsafe {
        expect(strake_offset_summary(off, &mut sum), StrakeStatus::Ok, &[]);
    }
    assert_eq!((sum.pieces, sum.exits, sum.loops), (1, 1, 0), "{sum:?}");
    // Exits: exact where the offset point reaches v = 4 (see tests/offsets.rs).
    let len = (64.0f64 + 6.25).sqrt();
    let t_exit = (3.0 - d * 8.0 / len) / 2.5;
    let mut ivs = [StrakePathInterval::default(); 2];
    let mut n = 0usize;
    // SAFETY: buffers of the sizes given.
    unsafe {
        expect(
            strake_offset_exits(off, ivs.as_mut_ptr(), 2, &mut n),
            StrakeStatus::Ok,
            &[],
        );
        assert_eq!(n, 1);
        close("exit", ivs[0].t0, t_exit, 1e-9, 1.0);
        expect(
            strake_offset_loops(off, ivs.as_mut_ptr(), 2, &mut n),
            StrakeStatus::Ok,
            &[],
        );
        assert_eq!(n, 0);
        // Points: the size query, then the copy.
        let st = strake_offset_piece_points(off, 0, ptr::null_mut(), 0, &mut n);
        expect(st, StrakeStatus::BufferTooSmall, &["needed"]);
        assert_eq!(n, sum.points);
        let mut pts = vec![StrakeOffsetPoint::default(); n];
        let st = strake_offset_piece_points(off, 0, pts.as_mut_ptr(), n, &mut n);
        expect(st, StrakeStatus::Ok, &[]);
        for p in &pts {
            // Signed distance to the line, to its left.
            let dist = (-(p.u - 1.0) * 2.5 + (p.v - 1.0) * 8.0) / len;
            close("offset distance", dist, 1.0, 1e-9, 1.0);
        }
        assert_eq!(pts.last().unwrap().v, 4.0);
        let mut pc = ptr::null_mut();
        expect(
            strake_offset_piece_curve(off, 0, &mut pc),
            StrakeStatus::Ok,
            &[],
        );
        let f = frame_at(s, pc, 0.5);
        assert!(f.geodesic_curvature.abs() < 1e-6);
        // Index out of range, NULLs.
        let mut pc2 = sentinel_curve();
        expect(
            strake_offset_piece_curve(off, 3, &mut pc2),
            StrakeStatus::InvalidArgument,
            &["index", "3"],
        );
        assert_eq!(pc2, sentinel_curve());
        expect(
            strake_offset_piece_curve(ptr::null(), 0, &mut pc2),
            StrakeStatus::NullPointer,
            &["offset"],
        );
        expect(
            strake_offset_piece_curve(off, 0, ptr::null_mut()),
            StrakeStatus::NullPointer,
            &["out"],
        );
        expect(
            strake_offset_piece_points(off, 5, pts.as_mut_ptr(), 1, &mut n),
            StrakeStatus::InvalidArgument,
            &["index"],
        );
        expect(
            strake_offset_piece_points(off, 0, pts.as_mut_ptr(), 1, ptr::null_mut()),
            StrakeStatus::NullPointer,
            &["count"],
        );
        expect(
            strake_offset_exits(off, ptr::null_mut(), 1, &mut n),
            StrakeStatus::NullPointer,
            &["buf"],
        );
        expect(
            strake_offset_loops(ptr::null(), ptr::null_mut(), 0, &mut n),
            StrakeStatus::NullPointer,
            &["offset"],
        );
        expect(
            strake_offset_summary(off, ptr::null_mut()),
            StrakeStatus::NullPointer,
            &["out"],
        );
        expect(
            strake_offset_summary(ptr::null(), &mut sum),
            StrakeStatus::NullPointer,
            &["offset"],
        );
        strake_curve_free(pc);
        strake_offset_free(off);
        strake_offset_free(ptr::null_mut());
    }
    free(s, path);
}

#[test]
fn offset_statuses() {
    let s = surface(Some(plane), ptr::null_mut(), (0.0, 10.0), (0.0, 4.0), 0);
    let path = uv_line([1.0, 1.0], [9.0, 3.5]);
    let o = offset_options(1e-6);
    let d = 1.0;
    let far = 6.0;
    let neg = -2.0;
    let ts = [0.0, 0.5, 0.4];
    let ds = [1.0, 1.0, 1.0];
    let mut off = 0x10 as *mut StrakeOffset;
    let before = off;
    // SAFETY: pointers valid or NULL on purpose.
    unsafe {
        expect(
            strake_offset_new(ptr::null(), path, 0, ptr::null(), &d, 1, &o, &mut off),
            StrakeStatus::NullPointer,
            &["surface"],
        );
        assert_eq!(off, before);
        expect(
            strake_offset_new(s, ptr::null(), 0, ptr::null(), &d, 1, &o, &mut off),
            StrakeStatus::NullPointer,
            &["curve"],
        );
        assert_eq!(off, before);
        expect(
            strake_offset_new(s, path, 0, ptr::null(), ptr::null(), 1, &o, &mut off),
            StrakeStatus::NullPointer,
            &["distances"],
        );
        assert_eq!(off, before);
        expect(
            strake_offset_new(s, path, 0, ptr::null(), &d, 1, ptr::null(), &mut off),
            StrakeStatus::NullPointer,
            &["options"],
        );
        assert_eq!(off, before);
        expect(
            strake_offset_new(s, path, 0, ptr::null(), &d, 1, &o, ptr::null_mut()),
            StrakeStatus::NullPointer,
            &["out"],
        );
        assert_eq!(off, before);
        expect(
            strake_offset_new(s, path, 2, ptr::null(), &d, 1, &o, &mut off),
            StrakeStatus::InvalidArgument,
            &["`side` = 2"],
        );
        assert_eq!(off, before);
        expect(
            strake_offset_new(s, path, 0, ptr::null(), &neg, 1, &o, &mut off),
            StrakeStatus::InvalidArgument,
            &["-2"],
        );
        assert_eq!(off, before);
        expect(
            strake_offset_new(s, path, 0, ptr::null(), ds.as_ptr(), 3, &o, &mut off),
            StrakeStatus::InvalidArgument,
            &["distance_count"],
        );
        assert_eq!(off, before);
        expect(
            strake_offset_new(s, path, 0, ts.as_ptr(), ds.as_ptr(), 3, &o, &mut off),
            StrakeStatus::InvalidArgument,
            &["t[2] = 0.4"],
        );
        assert_eq!(off, before);
        expect(
            strake_offset_new(
                s,
                path,
                0,
                ptr::null(),
                &d,
                1,
                &offset_options(0.0),
                &mut off,
            ),
            StrakeStatus::InvalidArgument,
            &["chord_tolerance"],
        );
        assert_eq!(off, before);
        expect(
            strake_offset_new(s, path, 0, ptr::null(), &far, 1, &o, &mut off),
            StrakeStatus::LeavesSurface,
            &["distance 6"],
        );
        assert_eq!(off, before);
        expect(
            strake_offset_new(
                s,
                path,
                0,
                ptr::null(),
                &d,
                1,
                &StrakeOffsetOptions {
                    chord_tolerance: 1e-6,
                    max_samples: 20,
                    samples: 17,
                    trace_tolerance: 0.0,
                },
                &mut off,
            ),
            StrakeStatus::NotConverged,
            &["max_samples"],
        );
        assert_eq!(off, before);
    }
    free(s, path);
}

/// Every new status has its name.
#[test]
fn new_statuses_are_named() {
    for (st, name) in [
        (
            StrakeStatus::GeodesicIncomplete,
            "STRAKE_STATUS_GEODESIC_INCOMPLETE",
        ),
        (
            StrakeStatus::GeodesicNotFound,
            "STRAKE_STATUS_GEODESIC_NOT_FOUND",
        ),
        (StrakeStatus::LeavesSurface, "STRAKE_STATUS_LEAVES_SURFACE"),
    ] {
        // SAFETY: returns a static string.
        let got = unsafe { std::ffi::CStr::from_ptr(strake_status_name(st as u32)) };
        assert_eq!(got.to_str().unwrap(), name);
    }
    assert_eq!(StrakeStatus::GeodesicIncomplete as u32, 50);
    assert_eq!(StrakeStatus::GeodesicNotFound as u32, 51);
    assert_eq!(StrakeStatus::LeavesSurface as u32, 52);
}

/// Courses through the C ABI on a cylinder of radius 2 (callback): a fixed-angle course
/// about the axis is a helix (do Carmo §4-4), a geodesic; its adjacent course is the parallel
/// helix, which leaves no gap; a copy turned about the axis by more than a band width leaves
/// a gap of the exact width (the cylinder unrolled: the helices are parallel lines).
#[test]
fn courses_through_the_c_abi() {
    let mut r = 2.0f64;
    let s = surface(
        Some(cylinder),
        (&raw mut r).cast(),
        (0.0, 6.2),
        (-5.0, 5.0),
        0,
    );
    let axis = [0.0, 0.0, 1.0];
    let o = opts(1e-11);
    let alpha = 0.5f64;
    let mut c = ptr::null_mut();
    let mut info = StrakeGeodesicInfo::default();
    // SAFETY: valid pointers.
    unsafe {
        let st = strake_course_fixed_angle(
            s,
            5.0,
            -1.0,
            axis.as_ptr(),
            alpha,
            3.0,
            &o,
            &mut c,
            &mut info,
        );
        expect(st, StrakeStatus::Ok, &[]);
    }
    assert_eq!(info.end, StrakeGeodesicEnd::Length as u32);
    close("tangent z", info.tangent[2], alpha.cos(), 1e-9, 1.0);
    let limits = StrakeFibreLimits {
        tow_width: 0.1,
        min_steering_radius: 10.0,
        max_twist_rate: 1.0,
    };
    let mut chk = StrakeCourseCheck::default();
    // SAFETY: valid pointers.
    unsafe {
        expect(
            strake_course_check(s, c, &limits, 20, &mut chk),
            StrakeStatus::Ok,
            &[],
        );
    }
    assert!(
        chk.max_steering_curvature < 1e-6 && chk.steering_violations == 0,
        "{chk:?}"
    );
    // Helix on a cylinder: |tg| = sin α cos α / R (REFERENCES.md closed forms).
    close(
        "twist",
        chk.max_twist_rate,
        alpha.sin() * alpha.cos() / r,
        1e-6,
        1.0,
    );
    close("length", chk.length, 3.0, 1e-9, 1.0);
    let w = 0.2;
    let mut adj = ptr::null_mut();
    let mut adj_curve = ptr::null_mut();
    let mut gaps = [StrakeCourseGap::default(); 4];
    let mut n = 0usize;
    let mut unmatched = 9usize;
    // SAFETY: valid pointers and buffers.
    unsafe {
        let st = strake_course_adjacent(s, c, w, 0, &offset_options(1e-8), &mut adj);
        expect(st, StrakeStatus::Ok, &[]);
        expect(
            strake_offset_piece_curve(adj, 0, &mut adj_curve),
            StrakeStatus::Ok,
            &[],
        );
        let st = strake_course_gaps(
            s,
            c,
            adj_curve,
            0,
            w,
            21,
            1e-6,
            &o,
            gaps.as_mut_ptr(),
            4,
            &mut n,
            &mut unmatched,
        );
        expect(st, StrakeStatus::Ok, &[]);
        assert_eq!((n, unmatched), (0, 0));
    }
    // A copy turned by Δu about the axis: the unrolled distance between the lines is
    // R Δu sin(angle between the helix and the circumference) = R Δu cos α... measured
    // across: the helix makes the angle α with the axis, so across it R Δu cos α.
    let du = 0.15;
    let shifted = {
        // Left of the helix: B = N x T; N outward, T = cos α z + sin α (N x z) has a
        // decreasing-u part, so its left is toward increasing u... check by the sign found.
        let mut pts = Vec::new();
        for i in 0..=40 {
            let f = frame_at(s, c, 3.0 * i as f64 / 40.0);
            pts.push([f.u + du, f.v]);
        }
        let mut out = ptr::null_mut();
        // SAFETY: valid points.
        let st = unsafe {
            strake_curve_through_uv_points(
                pts.as_ptr().cast(),
                pts.len(),
                3,
                0,
                ptr::null(),
                ptr::null(),
                &mut out,
            )
        };
        expect(st, StrakeStatus::Ok, &[]);
        out
    };
    let expected = r * du * alpha.cos() - w;
    let mut found = None;
    for side in [0u32, 1] {
        // SAFETY: valid pointers and buffers.
        let st = unsafe {
            strake_course_gaps(
                s,
                c,
                shifted,
                side,
                w,
                11,
                1e-6,
                &o,
                gaps.as_mut_ptr(),
                4,
                &mut n,
                &mut unmatched,
            )
        };
        expect(st, StrakeStatus::Ok, &[]);
        if unmatched < 11 && n > 0 {
            found = Some(gaps[0]);
        }
    }
    let g = found.expect("the shifted course is found on one side");
    assert_eq!(g.overlap, 0);
    close("gap width", g.worst, expected, 1e-6, 1.0);
    // Statuses.
    let mut chk2 = StrakeCourseCheck {
        length: -3.0,
        ..Default::default()
    };
    let mut c2 = sentinel_curve();
    // SAFETY: NULLs and bad values on purpose.
    unsafe {
        expect(
            strake_course_check(s, c, &limits, 1, &mut chk2),
            StrakeStatus::InvalidArgument,
            &["samples = 1"],
        );
        expect(
            strake_course_check(s, c, ptr::null(), 5, &mut chk2),
            StrakeStatus::NullPointer,
            &["limits"],
        );
        let bad = StrakeFibreLimits {
            tow_width: 0.0,
            ..limits
        };
        expect(
            strake_course_check(s, c, &bad, 5, &mut chk2),
            StrakeStatus::InvalidArgument,
            &["tow_width"],
        );
        assert_eq!(chk2.length, -3.0);
        let zero = [0.0; 3];
        expect(
            strake_course_fixed_angle(
                s,
                5.0,
                0.0,
                zero.as_ptr(),
                0.3,
                1.0,
                &o,
                &mut c2,
                ptr::null_mut(),
            ),
            StrakeStatus::InvalidArgument,
            &["(0, 0, 0)"],
        );
        let radial = [1.0, 0.0, 0.0];
        expect(
            strake_course_fixed_angle(
                s,
                0.0 + 1e-9,
                0.0,
                radial.as_ptr(),
                0.3,
                1.0,
                &o,
                &mut c2,
                ptr::null_mut(),
            ),
            StrakeStatus::InvalidArgument,
            &["along the normal"],
        );
        expect(
            strake_course_fixed_angle(
                s,
                5.0,
                0.0,
                ptr::null(),
                0.3,
                1.0,
                &o,
                &mut c2,
                ptr::null_mut(),
            ),
            StrakeStatus::NullPointer,
            &["axis"],
        );
        assert_eq!(c2, sentinel_curve());
        expect(
            strake_course_gaps(
                s,
                c,
                shifted,
                3,
                w,
                11,
                1e-6,
                &o,
                gaps.as_mut_ptr(),
                4,
                &mut n,
                ptr::null_mut(),
            ),
            StrakeStatus::InvalidArgument,
            &["`side` = 3"],
        );
        expect(
            strake_course_gaps(
                s,
                c,
                ptr::null(),
                0,
                w,
                11,
                1e-6,
                &o,
                gaps.as_mut_ptr(),
                4,
                &mut n,
                ptr::null_mut(),
            ),
            StrakeStatus::NullPointer,
            &["b"],
        );
        expect(
            strake_course_gaps(
                s,
                c,
                shifted,
                0,
                0.0,
                11,
                1e-6,
                &o,
                gaps.as_mut_ptr(),
                4,
                &mut n,
                ptr::null_mut(),
            ),
            StrakeStatus::InvalidArgument,
            &["band_width = 0"],
        );
        let mut adj2 = 0x10 as *mut StrakeOffset;
        expect(
            strake_course_adjacent(s, c, -1.0, 0, &offset_options(1e-6), &mut adj2),
            StrakeStatus::InvalidArgument,
            &["band_width = -1"],
        );
        expect(
            strake_course_adjacent(s, c, 0.1, 0, ptr::null(), &mut adj2),
            StrakeStatus::NullPointer,
            &["options"],
        );
        assert_eq!(adj2, 0x10 as *mut StrakeOffset);
        strake_curve_free(shifted);
        strake_curve_free(adj_curve);
        strake_offset_free(adj);
    }
    free(s, c);
}
