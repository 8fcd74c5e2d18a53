//! Helpers for tests that call the C ABI from Rust: host callbacks written as a C host would
//! write them, handle constructors that assert success, and message access.

#![allow(dead_code)]

use std::ffi::c_void;
use std::ptr;
use strake::ffi::*;

/// This thread's last error message, read through the C ABI (size query, then copy).
pub fn message() -> String {
    // SAFETY: NULL with length 0 only queries the size; then a buffer of exactly that size.
    unsafe {
        let needed = strake_last_error_message(ptr::null_mut(), 0);
        let mut buf = vec![0u8; needed];
        let again = strake_last_error_message(buf.as_mut_ptr().cast(), buf.len());
        assert_eq!(again, needed);
        assert_eq!(buf[needed - 1], 0, "message is NUL-terminated");
        String::from_utf8(buf[..needed - 1].to_vec()).expect("message is UTF-8")
    }
}

/// Asserts the status and that the message contains every one of `needles`.
#[track_caller]
pub fn expect(status: StrakeStatus, want: StrakeStatus, needles: &[&str]) {
    let m = message();
    assert_eq!(status, want, "message: {m}");
    for n in needles {
        assert!(m.contains(n), "message `{m}` does not contain `{n}`");
    }
}

/// A frame with every number set to an unmistakable value, to see that outputs stay untouched.
pub fn sentinel() -> StrakeFrame {
    let s = -7777.25;
    StrakeFrame {
        curve_param: s,
        u: s,
        v: s,
        point: [s; 3],
        tangent: [s; 3],
        side: [s; 3],
        normal: [s; 3],
        normal_curvature: s,
        geodesic_curvature: s,
        geodesic_torsion: s,
        speed: s,
        k1: s,
        k2: s,
        dir1: [s; 3],
        dir2: [s; 3],
        mean_curvature: s,
        gaussian_curvature: s,
        surface_conditioning: s,
        curve_speed_figure: s,
    }
}

/// The plane S(u, v) = (u, v, 0); N = +z.
pub unsafe extern "C" fn plane(
    _: *mut c_void,
    u: f64,
    v: f64,
    _order: i32,
    out: *mut StrakeSurfaceJet,
) -> i32 {
    // SAFETY: strake passes a valid jet.
    let j = unsafe { &mut *out };
    j.p = [u, v, 0.0];
    j.su = [1.0, 0.0, 0.0];
    j.sv = [0.0, 1.0, 0.0];
    0
}

/// Sphere of radius *user_data (f64) about the origin:
/// S(u, v) = R (sin v cos u, sin v sin u, cos v), u longitude, v colatitude. Su x Sv points
/// inward (toward the centre).
pub unsafe extern "C" fn sphere(
    user_data: *mut c_void,
    u: f64,
    v: f64,
    _order: i32,
    out: *mut StrakeSurfaceJet,
) -> i32 {
    // SAFETY: the tests pass a valid f64 radius and strake a valid jet.
    let (r, j) = unsafe { (*(user_data as *const f64), &mut *out) };
    let (su, cu) = u.sin_cos();
    let (sv, cv) = v.sin_cos();
    j.p = [r * sv * cu, r * sv * su, r * cv];
    j.su = [-r * sv * su, r * sv * cu, 0.0];
    j.sv = [r * cv * cu, r * cv * su, -r * sv];
    j.suu = [-r * sv * cu, -r * sv * su, 0.0];
    j.suv = [-r * cv * su, r * cv * cu, 0.0];
    j.svv = [-r * sv * cu, -r * sv * su, -r * cv];
    0
}

/// Cylinder of radius *user_data (f64) about the z axis: S(u, v) = (R cos u, R sin u, v).
/// Su x Sv points outward.
pub unsafe extern "C" fn cylinder(
    user_data: *mut c_void,
    u: f64,
    v: f64,
    _order: i32,
    out: *mut StrakeSurfaceJet,
) -> i32 {
    // SAFETY: as for `sphere`.
    let (r, j) = unsafe { (*(user_data as *const f64), &mut *out) };
    let (s, c) = u.sin_cos();
    j.p = [r * c, r * s, v];
    j.su = [-r * s, r * c, 0.0];
    j.sv = [0.0, 0.0, 1.0];
    j.suu = [-r * c, -r * s, 0.0];
    0
}

/// Creates a surface from a callback and asserts success.
pub fn surface(
    f: StrakeSurfaceFn,
    user_data: *mut c_void,
    u: (f64, f64),
    v: (f64, f64),
    flip: i32,
) -> *mut StrakeSurface {
    let mut out = ptr::null_mut();
    // SAFETY: valid callback and output slot.
    let st =
        unsafe { strake_surface_from_callback(f, user_data, u.0, u.1, v.0, v.1, flip, &mut out) };
    assert_eq!(st, StrakeStatus::Ok, "{}", message());
    out
}

/// Creates a NURBS curve in the parameter plane and asserts success.
pub fn nurbs(
    degree: u32,
    knots: &[f64],
    uv: &[[f64; 2]],
    weights: Option<&[f64]>,
) -> *mut StrakeCurve {
    let mut out = ptr::null_mut();
    let w = weights.map_or(ptr::null(), <[f64]>::as_ptr);
    // SAFETY: the slices outlive the call and have the documented lengths.
    let st = unsafe {
        strake_curve_new_nurbs(
            degree,
            knots.as_ptr(),
            knots.len(),
            uv.as_ptr().cast(),
            uv.len(),
            w,
            &mut out,
        )
    };
    assert_eq!(st, StrakeStatus::Ok, "{}", message());
    out
}

/// Straight line in the parameter plane from a to b over t in [0, 1].
pub fn uv_line(a: [f64; 2], b: [f64; 2]) -> *mut StrakeCurve {
    nurbs(1, &[0.0, 0.0, 1.0, 1.0], &[a, b], None)
}

/// The frame at t, asserting success.
pub fn frame_at(s: *const StrakeSurface, c: *const StrakeCurve, t: f64) -> StrakeFrame {
    let mut f = sentinel();
    // SAFETY: live handles and a valid output.
    let st = unsafe { strake_frame_at(s, c, t, &mut f) };
    assert_eq!(st, StrakeStatus::Ok, "{}", message());
    f
}

/// Frees both handles.
pub fn free(s: *mut StrakeSurface, c: *mut StrakeCurve) {
    // SAFETY: handles made by the helpers above, freed once.
    unsafe {
        strake_curve_free(c);
        strake_surface_free(s);
    }
}

/// Relative closeness: |a - b| <= tol * max(|b|, floor).
#[track_caller]
pub fn close(what: &str, a: f64, b: f64, tol: f64, floor: f64) {
    assert!(
        (a - b).abs() <= tol * b.abs().max(floor),
        "{what}: got {a}, expected {b} (tol {tol:e})"
    );
}

/// A host's callback over strake's own NURBS code: `ud` is a `&strake::NurbsSurface` that
/// outlives the handle; every jet to second order (the callback may always give more than
/// `order` asks); status 7 when strake refuses the point.
pub unsafe extern "C" fn nurbs_host(
    ud: *mut c_void,
    u: f64,
    v: f64,
    _order: i32,
    out: *mut StrakeSurfaceJet,
) -> i32 {
    // SAFETY: user_data is the &NurbsSurface passed at creation; out is a valid jet.
    let s = unsafe { &*(ud as *const strake::NurbsSurface) };
    let Ok(j) = s.jet(
        u,
        v,
        strake::DerivOrder::Second,
        &mut strake::surface::SurfaceHint::default(),
    ) else {
        return 7;
    };
    let out = unsafe { &mut *out };
    for (dst, src) in [
        (&mut out.p, j.p),
        (&mut out.su, j.su),
        (&mut out.sv, j.sv),
        (&mut out.suu, j.suu),
        (&mut out.suv, j.suv),
        (&mut out.svv, j.svv),
    ] {
        *dst = [src.x, src.y, src.z];
    }
    0
}
