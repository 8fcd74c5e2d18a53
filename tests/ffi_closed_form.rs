//! Closed forms through the C ABI: host callbacks for a sphere and a cylinder, a host curve
//! callback and a rational NURBS curve, checked against textbook values. (The main closed-form
//! tests of the math live with the Rust API; these show the C path carries them unchanged.)

#[path = "support/ffi_util.rs"]
mod ffi_util;

use ffi_util::*;
use std::f64::consts::{FRAC_PI_2, FRAC_PI_3, FRAC_PI_4, PI, TAU};
use std::ffi::c_void;
use std::ptr;
use strake::ffi::*;

// Sphere of radius R: every point is umbilical, k1 = k2 = 1/R, so every curve has |kn| = 1/R and
// tg = 0 (do Carmo §3-2, §3-3). With S = R (sin v cos u, sin v sin u, cos v), Su x Sv points
// inward, so the curve bends toward N and kn = +1/R, K = 1/R^2, H = 1/R.
// A parallel at colatitude phi has |kg| = cot(phi)/R (REFERENCES.md, sphere; do Carmo §4-4
// [memory]). Sign, derived here: at u = 0 travelling toward +u, T = (0, 1, 0),
// N = -(sin phi, 0, cos phi), B = N x T = (cos phi, 0, -sin phi), c'' = Suu u'^2 =
// -R sin phi (1, 0, 0) u'^2 and |c'|^2 = R^2 sin^2 phi u'^2, so kg = c''.B/|c'|^2 = -cot(phi)/R.
#[test]
fn sphere_parallels_through_the_c_abi() {
    let r = 2.5f64;
    let s = surface(
        Some(sphere),
        &r as *const f64 as *mut c_void,
        (0.0, TAU),
        (0.0, PI),
        0,
    );
    for phi in [0.4, FRAC_PI_3, FRAC_PI_2, 2.0, 2.9] {
        let c = uv_line([0.5, phi], [5.5, phi]);
        for t in [0.0, 0.3, 0.77, 1.0] {
            let f = frame_at(s, c, t);
            close("kn", f.normal_curvature, 1.0 / r, 1e-13, 1.0 / r);
            close(
                "kg",
                f.geodesic_curvature,
                -1.0 / (phi.tan() * r),
                1e-12,
                1.0 / r,
            );
            close("tg", f.geodesic_torsion, 0.0, 1e-13, 1.0 / r);
            close("k1", f.k1, 1.0 / r, 1e-13, 1.0 / r);
            close("k2", f.k2, 1.0 / r, 1e-13, 1.0 / r);
            close("H", f.mean_curvature, 1.0 / r, 1e-13, 1.0 / r);
            close(
                "K",
                f.gaussian_curvature,
                1.0 / (r * r),
                1e-13,
                1.0 / (r * r),
            );
            // The normal points to the centre.
            for k in 0..3 {
                close("N", f.normal[k], -f.point[k] / r, 1e-13, 1.0);
            }
        }
        // SAFETY: made above.
        unsafe { strake_curve_free(c) };
    }
    // Any curve on the sphere: still kn = 1/R and tg = 0.
    let c = nurbs(
        3,
        &[0.0, 0.0, 0.0, 0.0, 1.0, 1.0, 1.0, 1.0],
        &[[0.3, 0.5], [2.0, 2.6], [3.5, 0.7], [6.0, 2.4]],
        None,
    );
    let mut out = vec![sentinel(); 101];
    // SAFETY: live handles, room for 101 frames.
    assert_eq!(
        unsafe { strake_frames_even(s, c, 101, out.as_mut_ptr()) },
        StrakeStatus::Ok,
        "{}",
        message()
    );
    for f in &out {
        close("kn", f.normal_curvature, 1.0 / r, 1e-12, 1.0 / r);
        close("tg", f.geodesic_torsion, 0.0, 1e-12, 1.0 / r);
    }
    free(s, c);
}

/// A helix on the cylinder as a host curve callback, by arc length: user_data = (R, alpha),
/// u(t) = t cos(alpha)/R, v(t) = t sin(alpha).
unsafe extern "C" fn helix(user_data: *mut c_void, t: f64, out: *mut StrakeCurveJet) -> i32 {
    // SAFETY: the test passes (f64, f64); strake a valid jet.
    let ((r, alpha), j) = unsafe { (*(user_data as *const (f64, f64)), &mut *out) };
    let (sa, ca) = alpha.sin_cos();
    *j = StrakeCurveJet {
        u: t * ca / r,
        v: t * sa,
        du: ca / r,
        dv: sa,
        ddu: 0.0,
        ddv: 0.0,
    };
    0
}

// Cylinder of radius R, helix at angle alpha from the circumferential direction:
// |kn| = cos^2(alpha)/R, kg = 0, |tg| = sin(alpha) cos(alpha)/R (REFERENCES.md, cylinder; Euler's
// formula with k = -1/R around and 0 along, do Carmo §3-2). Signs, derived here for
// S = (R cos u, R sin u, v) with N = Su x Sv/|Su x Sv| outward: c'' = Suu u'^2 so
// kn = c''.N = -cos^2(alpha)/R; with do Carmo's formula tg = [(Eg - Ge) u'v'] / (sqrt(EG) I) and
// E = R^2, G = 1, e = -R, g = 0, I = 1: tg = R u'v'/R = +sin(alpha) cos(alpha)/R. Reversing N
// flips kn but not tg (REFERENCES.md, what flips).
#[test]
fn cylinder_helices_through_the_c_abi() {
    let r = 1.5f64;
    for flip in [0, 1] {
        let s = surface(
            Some(cylinder),
            &r as *const f64 as *mut c_void,
            (0.0, TAU),
            (-1.0, 10.0),
            flip,
        );
        let sign = if flip == 0 { 1.0 } else { -1.0 };
        for alpha in [0.3, FRAC_PI_4, 1.2] {
            let data = (r, alpha);
            let mut c = ptr::null_mut();
            // SAFETY: valid callback and user_data that outlives the handle.
            let st = unsafe {
                strake_curve_from_callback(
                    Some(helix),
                    &data as *const _ as *mut c_void,
                    0.0,
                    5.0,
                    &mut c,
                )
            };
            assert_eq!(st, StrakeStatus::Ok, "{}", message());
            let (sa, ca) = alpha.sin_cos();
            let ts = [0.0, 1.1, 2.5, 4.9];
            let mut out = [sentinel(); 4];
            // SAFETY: four parameters, room for four frames.
            assert_eq!(
                unsafe { strake_frames_at(s, c, ts.as_ptr(), 4, out.as_mut_ptr()) },
                StrakeStatus::Ok
            );
            for f in &out {
                close(
                    "kn",
                    f.normal_curvature,
                    -sign * ca * ca / r,
                    1e-13,
                    1.0 / r,
                );
                close("kg", f.geodesic_curvature, 0.0, 1e-13, 1.0 / r);
                close("tg", f.geodesic_torsion, sa * ca / r, 1e-13, 1.0 / r);
                close("speed", f.speed, 1.0, 1e-14, 1.0);
                close("K", f.gaussian_curvature, 0.0, 1e-13, 1.0 / (r * r));
                close("H", f.mean_curvature, -sign * 0.5 / r, 1e-13, 1.0 / r);
            }
            free(ptr::null_mut(), c);
        }
        free(s, ptr::null_mut());
    }
}

// A rational quadratic quarter circle: control points (r, 0), (r, r), (0, r) about a centre,
// weights 1, cos 45° = sqrt(2)/2, 1, knots {0,0,0,1,1,1} (The NURBS Book 2nd ed. §7.3 [memory]),
// drawn in the parameter plane of the plane S(u, v) = (u, v, 0), N = +z. It runs counter-
// clockwise seen from +z, so it turns toward B = N x T: kg = +1/r, the signed curvature of a
// circle (do Carmo §1-5 [memory]); kn = tg = 0 on a plane (do Carmo §3-2).
#[test]
fn rational_quarter_circle_on_a_plane() {
    let s = surface(Some(plane), ptr::null_mut(), (-5.0, 5.0), (-5.0, 5.0), 0);
    let (cu, cv, r) = (-1.0, 0.5, 3.0);
    let w = [1.0, std::f64::consts::FRAC_1_SQRT_2, 1.0];
    let c = nurbs(
        2,
        &[0.0, 0.0, 0.0, 1.0, 1.0, 1.0],
        &[[cu + r, cv], [cu + r, cv + r], [cu, cv + r]],
        Some(&w),
    );
    let mut out = vec![sentinel(); 33];
    // SAFETY: live handles, room for 33 frames.
    assert_eq!(
        unsafe { strake_frames_even(s, c, 33, out.as_mut_ptr()) },
        StrakeStatus::Ok
    );
    for f in &out {
        close("radius", (f.u - cu).hypot(f.v - cv), r, 1e-15, 1.0);
        close("kg", f.geodesic_curvature, 1.0 / r, 1e-13, 1.0 / r);
        assert_eq!(f.normal_curvature, 0.0);
        assert_eq!(f.geodesic_torsion, 0.0);
        assert_eq!(f.normal, [0.0, 0.0, 1.0]);
    }
    free(s, c);
}

// strake_frame_from_jets gives the same frame as the handle path for the same jets (to
// round-off: the handle path gets (u', v') from the NURBS line's basis functions).
#[test]
fn frame_from_jets_matches_the_handles() {
    let r = 2.0f64;
    let s = surface(
        Some(sphere),
        &r as *const f64 as *mut c_void,
        (0.0, TAU),
        (0.0, PI),
        1,
    );
    let c = uv_line([1.0, 0.7], [2.0, 2.2]);
    let f = frame_at(s, c, 0.4);
    let (u, v) = (f.u, f.v);
    let mut sj = StrakeSurfaceJet::default();
    // SAFETY: valid radius and jet.
    unsafe { sphere(&r as *const f64 as *mut c_void, u, v, 2, &mut sj) };
    let cj = StrakeCurveJet {
        u,
        v,
        du: 1.0,
        dv: 1.5,
        ddu: 0.0,
        ddv: 0.0,
    };
    let scales = StrakeParamScales {
        u_extent: TAU,
        v_extent: PI,
        t_extent: 1.0,
    };
    let mut g = sentinel();
    // SAFETY: valid pointers.
    assert_eq!(
        unsafe { strake_frame_from_jets(&sj, &cj, 1, &scales, &mut g) },
        StrakeStatus::Ok
    );
    assert_eq!(g.curve_param, 0.0);
    let flat = |f: &StrakeFrame| {
        let mut v = vec![
            f.u,
            f.v,
            f.normal_curvature,
            f.geodesic_curvature,
            f.geodesic_torsion,
            f.speed,
        ];
        v.extend([
            f.k1,
            f.k2,
            f.mean_curvature,
            f.gaussian_curvature,
            f.surface_conditioning,
            f.curve_speed_figure,
        ]);
        for a in [f.point, f.tangent, f.side, f.normal, f.dir1, f.dir2] {
            v.extend(a);
        }
        v
    };
    for (a, b) in flat(&f).into_iter().zip(flat(&g)) {
        close("field", b, a, 1e-14, 1.0);
    }
    // Flipped normal: N points outward, kn = -1/R (do Carmo §3-2 with the opposite normal).
    close("kn", f.normal_curvature, -1.0 / r, 1e-13, 1.0);
    free(s, c);
}
