//! The C functions for curves a host has (through points in the parameter plane or in space,
//! projected NURBS curves, point projection) and for sampling, called as a host would: every
//! status with its message and untouched outputs, NULL for each pointer, the buffer protocol
//! (BUFFER_TOO_SMALL, then a retry with the size it reported), and agreement with the Rust API
//! and with closed forms.

#[path = "support/ffi_util.rs"]
mod ffi_util;

use ffi_util::*;
use std::f64::consts::{FRAC_1_SQRT_2, PI, TAU};
use std::ptr;
use strake::analytic::{cylinder, plane as plane_surface, sphere as sphere_surface, torus};
use strake::ffi::*;
use strake::paths::sampling::{ChordalOptions, sample_chordal, sample_even_arc, sample_even_t};
use strake::{
    CurveOnSurface, EndDerivatives, FitOptions, Hints, NurbsCurve, Parametrization, PathSample,
    ProjectionOptions, SurfaceSource, UvCurve, interpolate, project_points,
    uv_curve_through_points,
};

const OK: StrakeStatus = StrakeStatus::Ok;
const NP: StrakeStatus = StrakeStatus::NullPointer;
const IA: StrakeStatus = StrakeStatus::InvalidArgument;

/// A surface handle around any surface of the Rust API (what a native constructor would give).
fn own_surface(s: impl SurfaceSource + 'static) -> *mut StrakeSurface {
    Box::into_raw(Box::new(StrakeSurface::new(Box::new(s))))
}

/// A curve handle around any curve of the Rust API.
fn own_curve(c: impl UvCurve + 'static) -> *mut StrakeCurve {
    Box::into_raw(Box::new(StrakeCurve::new(Box::new(c))))
}

/// A handle value no constructor returns, to see that `*out` is left alone.
fn bogus() -> *mut StrakeCurve {
    ptr::dangling_mut()
}

fn sample_sentinel() -> StrakeSample {
    StrakeSample {
        frame: sentinel(),
        arc_length: -7777.25,
    }
}

fn projection_sentinel() -> StrakeProjection {
    StrakeProjection {
        u: -7777.25,
        v: -7777.25,
        foot: [-7777.25; 3],
        distance: -7777.25,
        signed_distance: -7777.25,
    }
}

fn options(tolerance: f64) -> StrakeProjectionOptions {
    StrakeProjectionOptions {
        tolerance,
        periodic_u: 0,
        periodic_v: 0,
        grid: 0,
        max_iterations: 0,
    }
}

/// Frees a curve made by a constructor under test.
fn free_curve(c: *mut StrakeCurve) {
    // SAFETY: a handle from a strake constructor (or NULL), freed once.
    unsafe { strake_curve_free(c) };
}

fn free_surface(s: *mut StrakeSurface) {
    // SAFETY: as above.
    unsafe { strake_surface_free(s) };
}

/// strake_curve_through_uv_points with flat arrays, checking that `out` is untouched on
/// failure; returns the status and the handle (NULL on failure).
fn through_uv(
    uv: &[[f64; 2]],
    degree: u32,
    method: u32,
    ends: Option<([f64; 2], [f64; 2])>,
) -> (StrakeStatus, *mut StrakeCurve) {
    let mut out = bogus();
    let (d0, d1) = match &ends {
        Some((a, b)) => (a.as_ptr(), b.as_ptr()),
        None => (ptr::null(), ptr::null()),
    };
    // SAFETY: 2 doubles per point, derivatives of 2 doubles or NULL.
    let st = unsafe {
        strake_curve_through_uv_points(
            uv.as_ptr().cast(),
            uv.len(),
            degree,
            method,
            d0,
            d1,
            &mut out,
        )
    };
    if st == OK {
        (st, out)
    } else {
        assert_eq!(out, bogus(), "out written on failure");
        (st, ptr::null_mut())
    }
}

// ---------------------------------------------------------------- curves through uv points

// Collinear, evenly spaced points: B-splines reproduce polynomials up to their degree, so the
// interpolant of data from a linear function is that function (The NURBS Book 2nd ed. ch. 2,
// polynomial precision [memory]; common practice): with chord-length parameters the curve is
// u(t) = u0 + t (u1 - u0), v likewise, and its speed is constant.
#[test]
fn uv_points_on_a_line_give_the_line() {
    let s = own_surface(plane_surface((-2.0, 2.0), (-2.0, 2.0)));
    let (a, b) = ([-1.0, -0.5], [1.5, 0.75]);
    let pts: Vec<[f64; 2]> = (0..7)
        .map(|i| {
            let t = i as f64 / 6.0;
            [a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1])]
        })
        .collect();
    for method in [0, 1] {
        let (st, c) = through_uv(&pts, 3, method, None);
        assert_eq!(st, OK, "{}", message());
        for t in [0.0, 0.13, 0.5, 0.77, 1.0] {
            let f = frame_at(s, c, t);
            close("u", f.u, a[0] + t * (b[0] - a[0]), 1e-14, 1.0);
            close("v", f.v, a[1] + t * (b[1] - a[1]), 1e-14, 1.0);
            close("speed", f.speed, (2.5f64).hypot(1.25), 1e-13, 1.0);
            assert!(f.geodesic_curvature.abs() < 1e-12);
        }
        free_curve(c);
    }
    free_surface(s);
}

// The C constructor gives the curve of the Rust API (same points, degree, method and end
// derivatives), evaluated through the same frame code.
#[test]
fn uv_points_agree_with_the_rust_api() {
    let s = sphere_surface(2.0);
    let sh = own_surface(sphere_surface(2.0));
    let pts: Vec<[f64; 2]> = (0..9)
        .map(|i| {
            let x = i as f64 / 8.0;
            [0.3 + 4.0 * x, 1.2 + 0.4 * (3.0 * x).sin()]
        })
        .collect();
    let ends = ([3.0, 0.5], [4.5, -1.0]);
    for (method, p, e) in [
        (0, Parametrization::ChordLength, None),
        (1, Parametrization::Centripetal, None),
        (0, Parametrization::ChordLength, Some(ends)),
    ] {
        let (st, c) = through_uv(&pts, 3, method, e);
        assert_eq!(st, OK, "{}", message());
        let ed = e.map(|(start, end)| EndDerivatives { start, end });
        let rust = interpolate(&pts, 3, p, ed.as_ref()).unwrap();
        let pair = CurveOnSurface::new(&s, &rust);
        for k in 0..=20 {
            let t = k as f64 / 20.0;
            let want = StrakeFrame::new(t, &pair.frame(t, &mut Hints::default()).unwrap());
            assert_eq!(frame_at(sh, c, t), want, "method {method}, t = {t}");
        }
        free_curve(c);
    }
    free_surface(sh);
}

#[test]
fn uv_points_refusals_name_the_point() {
    let good: Vec<[f64; 2]> = vec![[0.0, 0.0], [1.0, 0.5], [2.0, 0.0], [3.0, 1.0], [4.0, 0.2]];
    // Two consecutive points coincide.
    let mut dup = good.clone();
    dup[3] = dup[2];
    let (st, _) = through_uv(&dup, 3, 0, None);
    expect(
        st,
        IA,
        &[
            "strake_curve_through_uv_points",
            "point 3",
            "coincides with point 2",
        ],
    );
    // Too few points for the degree.
    let (st, _) = through_uv(&good[..3], 3, 0, None);
    expect(st, IA, &["needs at least 4 points, got 3"]);
    // Non-finite coordinates.
    let mut nan = good.clone();
    nan[4][1] = f64::NAN;
    let (st, _) = through_uv(&nan, 3, 0, None);
    expect(st, StrakeStatus::NonFinite, &["point 4", "v = NaN"]);
    let (st, _) = through_uv(&good, 3, 0, Some(([1.0, f64::INFINITY], [1.0, 0.0])));
    expect(st, StrakeStatus::NonFinite, &["start derivative = inf"]);
    // Degrees.
    let (st, _) = through_uv(&good, 0, 0, None);
    expect(st, StrakeStatus::InvalidDegree, &["degree 0"]);
    let (st, _) = through_uv(&good, 25, 0, None);
    expect(st, StrakeStatus::InvalidDegree, &["degree 25"]);
    let (st, _) = through_uv(&good, 1, 0, Some(([1.0, 0.0], [1.0, 0.0])));
    expect(
        st,
        StrakeStatus::InvalidDegree,
        &["end derivatives need degree 2"],
    );
    // Flags and half-given derivatives.
    let (st, _) = through_uv(&good, 3, 2, None);
    expect(st, IA, &["`parametrization` = 2"]);
    let d = [1.0, 0.0];
    let mut out = bogus();
    // SAFETY: valid arrays; the NULLs are what is tested.
    unsafe {
        let st = strake_curve_through_uv_points(
            good.as_ptr().cast(),
            5,
            3,
            0,
            d.as_ptr(),
            ptr::null(),
            &mut out,
        );
        expect(st, IA, &["`end_derivative` is NULL"]);
        let st = strake_curve_through_uv_points(
            good.as_ptr().cast(),
            5,
            3,
            0,
            ptr::null(),
            d.as_ptr(),
            &mut out,
        );
        expect(st, IA, &["`start_derivative` is NULL"]);
        let st = strake_curve_through_uv_points(
            ptr::null(),
            5,
            3,
            0,
            ptr::null(),
            ptr::null(),
            &mut out,
        );
        expect(st, NP, &["`uv_points`"]);
        let st = strake_curve_through_uv_points(
            good.as_ptr().cast(),
            5,
            3,
            0,
            ptr::null(),
            ptr::null(),
            ptr::null_mut(),
        );
        expect(st, NP, &["`out`"]);
        let st = strake_curve_through_uv_points(
            good.as_ptr().cast(),
            0,
            3,
            0,
            ptr::null(),
            ptr::null(),
            &mut out,
        );
        expect(st, IA, &["`point_count` is 0"]);
    }
    assert_eq!(out, bogus());
}

// ---------------------------------------------------------------- curves through space points

/// Points S(u_i, v_i) of a sphere of radius `r` along a known path in (u, v).
fn sphere_points(r: f64, n: usize) -> (Vec<[f64; 2]>, Vec<[f64; 3]>) {
    let s = sphere_surface(r);
    let uv: Vec<[f64; 2]> = (0..n)
        .map(|i| {
            let x = i as f64 / (n - 1) as f64;
            [0.4 + 2.0 * x, 1.0 + 0.5 * (2.0 * x).sin()]
        })
        .collect();
    let pts = uv
        .iter()
        .map(|p| {
            let j = s
                .checked_jet(
                    p[0],
                    p[1],
                    strake::DerivOrder::Position,
                    &mut Default::default(),
                )
                .unwrap();
            [j.p.x, j.p.y, j.p.z]
        })
        .collect();
    (uv, pts)
}

/// strake_curve_through_space_points, checking that nothing is written on failure.
fn through_space(
    s: *const StrakeSurface,
    pts: &[[f64; 3]],
    opts: &StrakeProjectionOptions,
    degree: u32,
) -> (StrakeStatus, *mut StrakeCurve, Vec<StrakeProjection>) {
    let mut out = bogus();
    let mut proj = vec![projection_sentinel(); pts.len()];
    // SAFETY: 3 doubles per point, room for one projection per point.
    let st = unsafe {
        strake_curve_through_space_points(
            s,
            pts.as_ptr().cast(),
            pts.len(),
            opts,
            degree,
            0,
            proj.as_mut_ptr(),
            &mut out,
        )
    };
    if st == OK {
        (st, out, proj)
    } else {
        assert_eq!(out, bogus(), "out written on failure");
        assert!(
            proj.iter().all(|p| *p == projection_sentinel()),
            "projections written on failure"
        );
        (st, ptr::null_mut(), proj)
    }
}

// Points generated from known (u, v) on a sphere project back to those (u, v) at distance 0
// (point inversion of a point on the surface, The NURBS Book 2nd ed. §6.1), and the curve
// through them is the Rust API's.
#[test]
fn space_points_from_known_uv_come_back() {
    let r = 3.0;
    let (uv, pts) = sphere_points(r, 12);
    let sh = own_surface(sphere_surface(r));
    let (st, c, proj) = through_space(sh, &pts, &options(1e-9), 3);
    assert_eq!(st, OK, "{}", message());
    for (i, (p, want)) in proj.iter().zip(&uv).enumerate() {
        close(&format!("u[{i}]"), p.u, want[0], 1e-12, 1.0);
        close(&format!("v[{i}]"), p.v, want[1], 1e-12, 1.0);
        assert!(p.distance < 1e-12 && p.signed_distance.abs() < 1e-12);
        for (x, y) in p.foot.iter().zip(&pts[i]) {
            close("foot", *x, *y, 1e-12, 1.0);
        }
    }
    // The curve starts and ends at the first and last foot points.
    let f0 = frame_at(sh, c, 0.0);
    let f1 = frame_at(sh, c, 1.0);
    close("u(0)", f0.u, uv[0][0], 1e-12, 1.0);
    close("v(1)", f1.v, uv[11][1], 1e-12, 1.0);
    // Every curve on a sphere with the inward normal has kn = 1/R (REFERENCES.md, sphere).
    for k in 0..=10 {
        close(
            "kn",
            frame_at(sh, c, k as f64 / 10.0).normal_curvature,
            1.0 / r,
            1e-12,
            1.0,
        );
    }
    // The Rust API on the same surface and points.
    let s = sphere_surface(r);
    let fitted = uv_curve_through_points(
        &s,
        &pts,
        &ProjectionOptions::new(1e-9),
        &FitOptions::default(),
    )
    .unwrap();
    let pair = CurveOnSurface::new(&s, &fitted.curve);
    for k in 0..=10 {
        let t = k as f64 / 10.0;
        let want = StrakeFrame::new(t, &pair.frame(t, &mut Hints::default()).unwrap());
        assert_eq!(frame_at(sh, c, t), want);
    }
    // Projections are optional.
    let mut out = bogus();
    // SAFETY: valid arrays; NULL projections is allowed.
    let st = unsafe {
        strake_curve_through_space_points(
            sh,
            pts.as_ptr().cast(),
            pts.len(),
            &options(1e-9),
            3,
            0,
            ptr::null_mut(),
            &mut out,
        )
    };
    assert_eq!(st, OK);
    assert_eq!(frame_at(sh, out, 0.6), frame_at(sh, c, 0.6));
    free_curve(out);
    free_curve(c);
    free_surface(sh);
}

// A circle around a cylinder of radius R crosses the seam u = 0 = 2 pi. Declared periodic, the
// curve stays continuous across it and is the parallel circle: |kn| = 1/R, kg = 0 (REFERENCES.md,
// cylinder helix with alpha = 0), to the accuracy of the interpolation.
#[test]
fn space_points_across_a_seam() {
    let r = 2.0;
    let sh = own_surface(cylinder(r, -1.0, 1.0));
    let pts: Vec<[f64; 3]> = (0..41)
        .map(|i| {
            let a = 5.0 + 2.5 * i as f64 / 40.0; // from 5 rad past 2 pi to 7.5 rad
            [r * a.cos(), r * a.sin(), 0.25]
        })
        .collect();
    let mut o = options(1e-9);
    o.periodic_u = 1;
    let (st, c, proj) = through_space(sh, &pts, &o, 3);
    assert_eq!(st, OK, "{}", message());
    assert!(proj.iter().all(|p| (0.0..=TAU).contains(&p.u)));
    for k in 0..=50 {
        let f = frame_at(sh, c, k as f64 / 50.0);
        assert!((0.0..=TAU).contains(&f.u));
        close("kn", f.normal_curvature, -1.0 / r, 1e-6, 1.0);
        assert!(
            f.geodesic_curvature.abs() < 1e-6,
            "kg {}",
            f.geodesic_curvature
        );
    }
    free_curve(c);
    free_surface(sh);
}

#[test]
fn space_points_refusals() {
    let r = 3.0;
    let (_, pts) = sphere_points(r, 8);
    let sh = own_surface(sphere_surface(r));
    // A point 0.1 off the surface with a tolerance of 1e-3.
    let mut far = pts.clone();
    for x in &mut far[5] {
        *x *= (r + 0.1) / r;
    }
    let (st, _, _) = through_space(sh, &far, &options(1e-3), 3);
    expect(
        st,
        StrakeStatus::TooFarFromSurface,
        &[
            "strake_curve_through_space_points",
            "point 5",
            "too far from the surface",
        ],
    );
    // Within a looser tolerance it is accepted, and its distances are reported: the point lies
    // outside, against the inward normal.
    let (st, c, proj) = through_space(sh, &far, &options(0.2), 3);
    assert_eq!(st, OK, "{}", message());
    close("distance", proj[5].distance, 0.1, 1e-10, 1.0);
    close("signed distance", proj[5].signed_distance, -0.1, 1e-10, 1.0);
    free_curve(c);
    // Non-finite, repeated, too few.
    let mut nan = pts.clone();
    nan[2][0] = f64::NAN;
    let (st, _, _) = through_space(sh, &nan, &options(1e-6), 3);
    expect(st, StrakeStatus::NonFinite, &["point 2", "x = NaN"]);
    let mut dup = pts.clone();
    dup[4] = dup[3];
    let (st, _, _) = through_space(sh, &dup, &options(1e-6), 3);
    expect(st, IA, &["point 4", "coincides with point 3"]);
    let (st, _, _) = through_space(sh, &pts[..3], &options(1e-6), 3);
    expect(st, IA, &["needs at least 4 points, got 3"]);
    let (st, _, _) = through_space(sh, &pts, &options(1e-6), 0);
    expect(st, StrakeStatus::InvalidDegree, &["degree 0"]);
    // Newton's method with one iteration does not reach the foot point from a grid node.
    let mut one = options(1e-9);
    one.max_iterations = 1;
    let (st, _, _) = through_space(sh, &pts, &one, 3);
    expect(
        st,
        StrakeStatus::NotConverged,
        &["point 0", "not converged"],
    );
    // Options.
    for (o, needle) in [
        (options(0.0), "projection tolerance = 0"),
        (options(f64::NAN), "projection tolerance = NaN"),
        (
            StrakeProjectionOptions {
                periodic_u: 2,
                ..options(1.0)
            },
            "`options.periodic_u` = 2",
        ),
        (
            StrakeProjectionOptions {
                periodic_v: -1,
                ..options(1.0)
            },
            "`options.periodic_v` = -1",
        ),
        (
            StrakeProjectionOptions {
                grid: 1,
                ..options(1.0)
            },
            "projection grid = 1",
        ),
        (
            StrakeProjectionOptions {
                max_iterations: 5000,
                ..options(1.0)
            },
            "projection max_iterations = 5000",
        ),
    ] {
        let (st, _, _) = through_space(sh, &pts, &o, 3);
        expect(st, IA, &[needle]);
    }
    // NULL pointers.
    let mut out = bogus();
    let o = options(1e-6);
    // SAFETY: valid arrays; the NULLs are what is tested.
    unsafe {
        let p = pts.as_ptr().cast();
        let st = strake_curve_through_space_points(
            ptr::null(),
            p,
            8,
            &o,
            3,
            0,
            ptr::null_mut(),
            &mut out,
        );
        expect(st, NP, &["`surface`"]);
        let st = strake_curve_through_space_points(
            sh,
            ptr::null(),
            8,
            &o,
            3,
            0,
            ptr::null_mut(),
            &mut out,
        );
        expect(st, NP, &["`points`"]);
        let st = strake_curve_through_space_points(
            sh,
            p,
            8,
            ptr::null(),
            3,
            0,
            ptr::null_mut(),
            &mut out,
        );
        expect(st, NP, &["`options`"]);
        let st =
            strake_curve_through_space_points(sh, p, 8, &o, 3, 0, ptr::null_mut(), ptr::null_mut());
        expect(st, NP, &["`out`"]);
        let st = strake_curve_through_space_points(sh, p, 8, &o, 3, 7, ptr::null_mut(), &mut out);
        expect(st, IA, &["`parametrization` = 7"]);
        let st = strake_curve_through_space_points(sh, p, 0, &o, 3, 0, ptr::null_mut(), &mut out);
        expect(st, IA, &["`point_count` is 0"]);
    }
    assert_eq!(out, bogus());
    free_surface(sh);
}

// ---------------------------------------------------------------- projected NURBS curves

/// A quarter of the circle of latitude at colatitude `phi` on the sphere of radius `r`, as an
/// exact rational quadratic (The NURBS Book 2nd ed. §7.3: control points at the ends and the
/// corner of the tangents, middle weight cos 45 deg): (knots, points, weights).
fn latitude_quarter(r: f64, phi: f64) -> (Vec<f64>, Vec<[f64; 3]>, Vec<f64>) {
    let (rho, z) = (r * phi.sin(), r * phi.cos());
    (
        vec![0.0, 0.0, 0.0, 1.0, 1.0, 1.0],
        vec![[rho, 0.0, z], [rho, rho, z], [0.0, rho, z]],
        vec![1.0, FRAC_1_SQRT_2, 1.0],
    )
}

/// strake_curve_project_nurbs with a checked `out` on failure.
fn project_nurbs(
    s: *const StrakeSurface,
    knots: &[f64],
    pts: &[[f64; 3]],
    weights: Option<&[f64]>,
    opts: &StrakeProjectionOptions,
    fit_tolerance: f64,
) -> (StrakeStatus, *mut StrakeCurve) {
    let mut out = bogus();
    // SAFETY: arrays of the documented sizes.
    let st = unsafe {
        strake_curve_project_nurbs(
            s,
            2,
            knots.as_ptr(),
            knots.len(),
            pts.as_ptr().cast(),
            pts.len(),
            weights.map_or(ptr::null(), <[f64]>::as_ptr),
            opts,
            fit_tolerance,
            &mut out,
        )
    };
    if st == OK {
        (st, out)
    } else {
        assert_eq!(out, bogus(), "out written on failure");
        (st, ptr::null_mut())
    }
}

// A circle of latitude given as an exact NURBS arc in space, projected onto the sphere: on it
// kn = 1/R (inward normal) and |kg| = cot(phi)/R (REFERENCES.md, sphere), to the fit tolerance's
// order; its arc length is R sin(phi) pi/2 (elementary).
#[test]
fn projected_latitude_arc() {
    let (r, phi) = (2.0, 1.1);
    let sh = own_surface(sphere_surface(r));
    let (knots, pts, w) = latitude_quarter(r, phi);
    let (st, c) = project_nurbs(sh, &knots, &pts, Some(&w), &options(1e-9), 1e-7);
    assert_eq!(st, OK, "{}", message());
    for k in 0..=20 {
        let f = frame_at(sh, c, k as f64 / 20.0);
        close("kn", f.normal_curvature, 1.0 / r, 1e-9, 1.0);
        close(
            "|kg|",
            f.geodesic_curvature.abs(),
            1.0 / (phi.tan() * r),
            1e-3,
            1.0,
        );
        close("v", f.v, phi, 1e-7, 1.0);
    }
    let mut len = 0.0;
    // SAFETY: live handles, valid output.
    assert_eq!(
        unsafe { strake_arc_length(sh, c, 0.0, 1.0, 1e-12, &mut len) },
        OK
    );
    close("length", len, r * phi.sin() * PI / 2.0, 1e-7, 1.0);
    free_curve(c);
    free_surface(sh);
}

#[test]
fn projected_nurbs_refusals() {
    let (r, phi) = (2.0, 1.1);
    let sh = own_surface(sphere_surface(r));
    let (knots, pts, w) = latitude_quarter(r, phi);
    let o = options(1e-9);
    let (st, _) = project_nurbs(
        sh,
        &[0.0, 0.0, 0.0, 1.0, 0.5, 1.0],
        &pts,
        Some(&w),
        &o,
        1e-7,
    );
    expect(st, StrakeStatus::InvalidKnots, &["knot[4] = 0.5"]);
    let (st, _) = project_nurbs(sh, &knots, &pts, Some(&[1.0, 0.0, 1.0]), &o, 1e-7);
    expect(st, StrakeStatus::InvalidWeight, &["weight[1] = 0"]);
    let mut bad = pts.clone();
    bad[1][2] = f64::INFINITY;
    let (st, _) = project_nurbs(sh, &knots, &bad, Some(&w), &o, 1e-7);
    expect(st, StrakeStatus::InvalidControlPoint, &["control point 1"]);
    let (st, _) = project_nurbs(sh, &knots, &pts, Some(&w), &o, 0.0);
    expect(st, IA, &["fit tolerance = 0"]);
    // The message of a refusal of the whole call carries no sample number.
    assert!(!message().contains("sample"), "{}", message());
    // The arc lifted 0.5 off the sphere, with a tolerance of 0.01: the first sample is refused.
    let lifted: Vec<[f64; 3]> = pts.iter().map(|p| p.map(|x| x * 1.25)).collect();
    let (st, _) = project_nurbs(sh, &knots, &lifted, Some(&w), &options(0.01), 1e-7);
    expect(
        st,
        StrakeStatus::TooFarFromSurface,
        &["strake_curve_project_nurbs", "sample 0 (t = 0)", "too far"],
    );
    let mut out = bogus();
    // SAFETY: valid arrays; the NULLs are what is tested.
    unsafe {
        let st = strake_curve_project_nurbs(
            sh,
            2,
            ptr::null(),
            6,
            pts.as_ptr().cast(),
            3,
            ptr::null(),
            &o,
            1e-7,
            &mut out,
        );
        expect(st, NP, &["`knots`"]);
        let st = strake_curve_project_nurbs(
            ptr::null(),
            2,
            knots.as_ptr(),
            6,
            pts.as_ptr().cast(),
            3,
            ptr::null(),
            &o,
            1e-7,
            &mut out,
        );
        expect(st, NP, &["`surface`"]);
        let st = strake_curve_project_nurbs(
            sh,
            2,
            knots.as_ptr(),
            6,
            ptr::null(),
            3,
            ptr::null(),
            &o,
            1e-7,
            &mut out,
        );
        expect(st, NP, &["`points`"]);
        let st = strake_curve_project_nurbs(
            sh,
            2,
            knots.as_ptr(),
            6,
            pts.as_ptr().cast(),
            3,
            ptr::null(),
            ptr::null(),
            1e-7,
            &mut out,
        );
        expect(st, NP, &["`options`"]);
        let st = strake_curve_project_nurbs(
            sh,
            2,
            knots.as_ptr(),
            6,
            pts.as_ptr().cast(),
            3,
            ptr::null(),
            &o,
            1e-7,
            ptr::null_mut(),
        );
        expect(st, NP, &["`out`"]);
    }
    assert_eq!(out, bogus());
    free_surface(sh);
}

// ---------------------------------------------------------------- point projection

// Points offset by d along the unit normal of a torus at known (u, v) project back to (u, v)
// with distance |d| and signed distance d (the foot point of P = S + d N on a surface whose
// curvature radii exceed |d| is S: The NURBS Book 2nd ed. §6.1, the zero-cosine condition), as
// the Rust API says.
#[test]
fn points_project_to_known_foot_points() {
    let (big_r, r) = (5.0, 1.5);
    let t = torus(big_r, r);
    let sh = own_surface(torus(big_r, r));
    let known: [(f64, f64, f64); 4] = [
        (0.3, 0.2, 0.4),
        (0.5, 1.0, -0.7),
        (0.8, 2.5, 0.1),
        (1.1, 3.5, -1.2),
    ];
    let pts: Vec<[f64; 3]> = known
        .iter()
        .map(|&(u, v, d)| {
            let (w, n) = (
                (big_r + r * v.cos()),
                [v.cos() * u.cos(), v.cos() * u.sin(), v.sin()],
            );
            [
                w * u.cos() + d * n[0],
                w * u.sin() + d * n[1],
                r * v.sin() + d * n[2],
            ]
        })
        .collect();
    let mut out = vec![projection_sentinel(); 4];
    let o = options(2.0);
    // SAFETY: 4 points, room for 4 projections.
    let st =
        unsafe { strake_surface_project_points(sh, pts.as_ptr().cast(), 4, &o, out.as_mut_ptr()) };
    assert_eq!(st, OK, "{}", message());
    let rust = project_points(&t, &pts, &ProjectionOptions::new(2.0)).unwrap();
    for (i, ((p, want), rp)) in out.iter().zip(&known).zip(&rust).enumerate() {
        close(&format!("u[{i}]"), p.u, want.0, 1e-12, 1.0);
        close(&format!("v[{i}]"), p.v, want.1, 1e-12, 1.0);
        close("distance", p.distance, want.2.abs(), 1e-12, 1.0);
        close("signed distance", p.signed_distance, want.2, 1e-12, 1.0);
        assert_eq!((p.u, p.v, p.distance), (rp.u, rp.v, rp.distance));
    }
    // Too far: nothing written, the point named.
    let mut out = vec![projection_sentinel(); 4];
    let o = options(1.0);
    // SAFETY: as above.
    let st =
        unsafe { strake_surface_project_points(sh, pts.as_ptr().cast(), 4, &o, out.as_mut_ptr()) };
    expect(
        st,
        StrakeStatus::TooFarFromSurface,
        &[
            "strake_surface_project_points",
            "point 3",
            "above the tolerance 1",
        ],
    );
    assert!(out.iter().all(|p| *p == projection_sentinel()));
    // NULLs and counts.
    // SAFETY: the NULLs and the zero count are refused before anything is read.
    unsafe {
        let p = pts.as_ptr().cast();
        let q = out.as_mut_ptr();
        expect(
            strake_surface_project_points(ptr::null(), p, 4, &o, q),
            NP,
            &["`surface`"],
        );
        expect(
            strake_surface_project_points(sh, ptr::null(), 4, &o, q),
            NP,
            &["`points`"],
        );
        expect(
            strake_surface_project_points(sh, p, 4, ptr::null(), q),
            NP,
            &["`options`"],
        );
        expect(
            strake_surface_project_points(sh, p, 4, &o, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        expect(
            strake_surface_project_points(sh, p, 0, &o, q),
            IA,
            &["`point_count` is 0"],
        );
        let mut nan = pts.clone();
        nan[1][2] = f64::NEG_INFINITY;
        expect(
            strake_surface_project_points(sh, nan.as_ptr().cast(), 4, &options(2.0), q),
            StrakeStatus::NonFinite,
            &["point 1", "z = -inf"],
        );
    }
    assert!(out.iter().all(|p| *p == projection_sentinel()));
    free_surface(sh);
}

// ---------------------------------------------------------------- sampling

/// A slanted path on a torus (R = 5, r = 1.5), as a cubic in (u, v): kn, kg and tg all vary.
fn torus_path() -> NurbsCurve<2> {
    NurbsCurve::new(
        3,
        &[0.0, 0.0, 0.0, 0.0, 0.5, 1.0, 1.0, 1.0, 1.0],
        &[[0.2, 0.3], [1.0, 1.5], [2.0, 2.0], [3.0, 3.6], [4.0, 4.2]],
        None,
    )
    .unwrap()
}

/// Calls a sampling function through a closure taking (buf, capacity, count).
fn run_sampling(
    f: &dyn Fn(*mut StrakeSample, usize, *mut usize) -> StrakeStatus,
    capacity: usize,
) -> (StrakeStatus, usize, Vec<StrakeSample>) {
    let mut buf = vec![sample_sentinel(); capacity];
    let mut count = 777_777usize;
    let p = if capacity == 0 {
        ptr::null_mut()
    } else {
        buf.as_mut_ptr()
    };
    let st = f(p, capacity, &mut count);
    (st, count, buf)
}

fn c_samples(rust: &[PathSample]) -> Vec<StrakeSample> {
    rust.iter().map(StrakeSample::new).collect()
}

// The three sampling functions give exactly the Rust API's samples; a buffer too small gives
// BUFFER_TOO_SMALL with the count needed and an untouched buffer, and a retry with that count
// gives exactly what a large enough first call gives (the protocol of status 4).
#[test]
fn sampling_agrees_with_rust_and_follows_the_buffer_protocol() {
    let (t, path) = (torus(5.0, 1.5), torus_path());
    let (sh, ch) = (own_surface(torus(5.0, 1.5)), own_curve(torus_path()));
    let pair = CurveOnSurface::new(&t, &path);
    let tol = 1e-10;

    let mut even_t = Vec::new();
    sample_even_t(&pair, 9, tol, &mut even_t).unwrap();
    let mut even_arc = Vec::new();
    sample_even_arc(&pair, 9, tol, &mut even_arc).unwrap();
    let mut chordal = Vec::new();
    let n_chordal = sample_chordal(&pair, &ChordalOptions::new(1e-3, 0.8), &mut chordal).unwrap();
    assert!(n_chordal > 20, "{n_chordal}");

    type Call = Box<dyn Fn(*mut StrakeSample, usize, *mut usize) -> StrakeStatus>;
    let cases: Vec<(&str, Call, Vec<StrakeSample>)> = vec![
        (
            "even_t",
            // SAFETY (all three): live handles; buffers as run_sampling provides them.
            Box::new(move |b, c, n| unsafe { strake_sample_even_t(sh, ch, 9, tol, b, c, n) }),
            c_samples(&even_t),
        ),
        (
            "even_arc",
            Box::new(move |b, c, n| unsafe { strake_sample_even_arc(sh, ch, 9, tol, b, c, n) }),
            c_samples(&even_arc),
        ),
        (
            "chordal",
            Box::new(move |b, c, n| unsafe {
                strake_sample_chordal(sh, ch, 1e-3, 0.8, tol, b, c, n)
            }),
            c_samples(&chordal),
        ),
    ];
    for (name, call, want) in &cases {
        let needed = want.len();
        // Large enough at once.
        let (st, count, buf) = run_sampling(call.as_ref(), needed + 5);
        assert_eq!(st, OK, "{name}: {}", message());
        assert_eq!(count, needed, "{name}");
        assert_eq!(&buf[..needed], &want[..], "{name}");
        assert!(buf[needed..].iter().all(|s| *s == sample_sentinel()));
        // Too small: status 4, the count needed, nothing written.
        for small in [0, 1, needed - 1] {
            let (st, count, buf) = run_sampling(call.as_ref(), small);
            expect(
                st,
                StrakeStatus::BufferTooSmall,
                &["buffer too small", &format!("{needed} samples needed")],
            );
            assert_eq!(count, needed, "{name}, capacity {small}");
            assert!(buf.iter().all(|s| *s == sample_sentinel()), "{name}");
        }
        // Retry with exactly the count reported.
        let (st, count, buf) = run_sampling(call.as_ref(), needed);
        assert_eq!((st, count), (OK, needed), "{name}");
        assert_eq!(buf, *want, "{name}");
    }
    free(sh, ch);
}

// Closed forms on a torus parallel v = v0 (a circle of radius rho = R + r cos v0): arc length
// rho du (elementary); even-arc samples equally spaced; chordal samples within the chord
// tolerance: a chord of length L on radius rho deviates by rho - sqrt(rho^2 - L^2/4)
// (REFERENCES.md, chord error), and within the maximum step.
#[test]
fn sampling_a_torus_parallel() {
    let (big_r, r, v0) = (5.0, 1.5, 0.7);
    let rho = big_r + r * f64::cos(v0);
    let sh = own_surface(torus(big_r, r));
    let c = uv_line([0.1, v0], [5.9, v0]);
    let total = rho * 5.8;
    let mut len = 0.0;
    // SAFETY: live handles, valid output.
    assert_eq!(
        unsafe { strake_arc_length(sh, c, 0.0, 1.0, 1e-12, &mut len) },
        OK
    );
    close("length", len, total, 1e-12, 1.0);
    // SAFETY: as above.
    assert_eq!(
        unsafe { strake_arc_length(sh, c, 0.75, 0.25, 1e-12, &mut len) },
        OK
    );
    close("reversed", len, -0.5 * total, 1e-12, 1.0);

    let mut buf = vec![sample_sentinel(); 11];
    let mut n = 0;
    // SAFETY: room for 11 samples.
    let st = unsafe { strake_sample_even_arc(sh, c, 11, 1e-12, buf.as_mut_ptr(), 11, &mut n) };
    assert_eq!((st, n), (OK, 11), "{}", message());
    for (i, s) in buf.iter().enumerate() {
        close("s_i", s.arc_length, total * i as f64 / 10.0, 1e-11, 1.0);
        close("u_i", s.frame.u, 0.1 + 5.8 * i as f64 / 10.0, 1e-11, 1.0);
    }

    let (delta, max_step) = (1e-2, 0.3);
    let mut buf = vec![sample_sentinel(); 400];
    // SAFETY: room for 400 samples.
    let st = unsafe {
        strake_sample_chordal(sh, c, delta, max_step, 1e-12, buf.as_mut_ptr(), 400, &mut n)
    };
    assert_eq!(st, OK, "{}", message());
    let got = &buf[..n];
    assert_eq!(got[0].arc_length, 0.0);
    close("last", got[n - 1].arc_length, total, 1e-11, 1.0);
    for w in got.windows(2) {
        let step = w[1].arc_length - w[0].arc_length;
        assert!(step <= max_step * (1.0 + 1e-12), "step {step}");
        let chord = (0..3)
            .map(|k| (w[1].frame.point[k] - w[0].frame.point[k]).powi(2))
            .sum::<f64>()
            .sqrt();
        let dev = rho - (rho * rho - chord * chord / 4.0).sqrt();
        assert!(dev <= delta * (1.0 + 1e-9), "deviation {dev}");
    }
    // Max step 0 means no limit: fewer, longer steps, still within the chord tolerance.
    let mut m = 0;
    // SAFETY: as above.
    let st =
        unsafe { strake_sample_chordal(sh, c, delta, 0.0, 1e-12, buf.as_mut_ptr(), 400, &mut m) };
    assert_eq!(st, OK, "{}", message());
    assert!(m < n, "{m} vs {n}");
    let full = 2.0 * (delta * (2.0 * rho - delta)).sqrt();
    assert!(
        (m as f64) >= total / full,
        "{m} samples for chords of at most {full}"
    );
    free(sh, c);
}

#[test]
fn sampling_refusals() {
    let sh = own_surface(torus(5.0, 1.5));
    // A line that leaves the torus's domain v in [0, 2 pi] at t = 0.75.
    let off = uv_line([0.5, 4.0], [1.0, 4.0 + 4.0 * (TAU - 4.0) / 3.0]);
    let c = uv_line([0.5, 1.0], [1.0, 2.0]);
    let mut buf = vec![sample_sentinel(); 8];
    let sentinel_count = 4242usize;
    let mut n = sentinel_count;
    let b = buf.as_mut_ptr();
    // SAFETY: room for 8 samples; the NULLs and bad values are what is tested.
    unsafe {
        expect(
            strake_sample_even_t(sh, off, 5, 1e-10, b, 8, &mut n),
            StrakeStatus::OutOfDomain,
            &["strake_sample_even_t", "sample 4 (t = 1)", "v = "],
        );
        expect(
            strake_sample_even_arc(sh, c, 0, 1e-10, b, 8, &mut n),
            IA,
            &["`n` is 0"],
        );
        expect(
            strake_sample_even_t(sh, c, 3, 0.0, b, 8, &mut n),
            IA,
            &["arc length tolerance = 0"],
        );
        assert!(!message().contains("sample 0"), "{}", message());
        expect(
            strake_sample_chordal(sh, c, f64::NAN, 1.0, 1e-10, b, 8, &mut n),
            IA,
            &["chord tolerance = NaN"],
        );
        expect(
            strake_sample_chordal(sh, c, 1e-3, -1.0, 1e-10, b, 8, &mut n),
            IA,
            &["max step = -1"],
        );
        expect(
            strake_sample_chordal(sh, c, 1e-3, 1.0, f64::INFINITY, b, 8, &mut n),
            IA,
            &["arc length tolerance = inf"],
        );
        expect(
            strake_sample_chordal(sh, c, 1e-20, 1.0, 1e-10, b, 8, &mut n),
            IA,
            &["cannot be met"],
        );
        expect(
            strake_sample_even_t(ptr::null(), c, 3, 1e-10, b, 8, &mut n),
            NP,
            &["`surface`"],
        );
        expect(
            strake_sample_even_arc(sh, ptr::null(), 3, 1e-10, b, 8, &mut n),
            NP,
            &["`curve`"],
        );
        expect(
            strake_sample_chordal(sh, c, 1e-3, 1.0, 1e-10, ptr::null_mut(), 8, &mut n),
            NP,
            &["`buf`"],
        );
        expect(
            strake_sample_chordal(sh, c, 1e-3, 1.0, 1e-10, b, 8, ptr::null_mut()),
            NP,
            &["`count`"],
        );
        expect(
            strake_sample_even_t(sh, c, 3, 1e-10, b, usize::MAX / 4, &mut n),
            IA,
            &["`capacity`", "too large"],
        );
    }
    assert_eq!(n, sentinel_count, "count written on failure");
    assert!(buf.iter().all(|s| *s == sample_sentinel()));
    // A size query: buf NULL with capacity 0.
    // SAFETY: NULL buffer with capacity 0 is allowed.
    let st = unsafe { strake_sample_even_t(sh, c, 6, 1e-10, ptr::null_mut(), 0, &mut n) };
    assert_eq!((st, n), (StrakeStatus::BufferTooSmall, 6));
    // Arc length.
    let mut len = -1.0;
    // SAFETY: the NULLs and bad values are what is tested.
    unsafe {
        expect(
            strake_arc_length(sh, c, f64::NAN, 1.0, 1e-10, &mut len),
            StrakeStatus::NonFinite,
            &["t0 = NaN"],
        );
        expect(
            strake_arc_length(sh, c, 0.0, 1.5, 1e-10, &mut len),
            StrakeStatus::OutOfDomain,
            &["t = 1.5"],
        );
        expect(
            strake_arc_length(sh, c, 0.0, 1.0, -1.0, &mut len),
            IA,
            &["arc length tolerance = -1"],
        );
        expect(
            strake_arc_length(sh, c, 0.0, 1.0, 1e-10, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        expect(
            strake_arc_length(ptr::null(), c, 0.0, 1.0, 1e-10, &mut len),
            NP,
            &["`surface`"],
        );
    }
    assert_eq!(len, -1.0);
    free_curve(off);
    free(sh, c);
}

/// Fails with code 99 when u > 1; otherwise the plane.
unsafe extern "C" fn failing_beyond_one(
    _: *mut std::ffi::c_void,
    u: f64,
    v: f64,
    order: i32,
    out: *mut StrakeSurfaceJet,
) -> i32 {
    if u > 1.0 {
        return 99;
    }
    // SAFETY: forwarded unchanged.
    unsafe { plane(ptr::null_mut(), u, v, order, out) }
}

#[test]
fn sampling_passes_callback_failures_back() {
    let s = surface(
        Some(failing_beyond_one),
        ptr::null_mut(),
        (0.0, 2.0),
        (0.0, 2.0),
        0,
    );
    let c = uv_line([0.0, 0.5], [2.0, 0.5]);
    let mut buf = vec![sample_sentinel(); 100];
    let mut n = 5usize;
    // SAFETY: room for 100 samples.
    let st =
        unsafe { strake_sample_chordal(s, c, 1e-3, 0.1, 1e-10, buf.as_mut_ptr(), 100, &mut n) };
    expect(
        st,
        StrakeStatus::SurfaceCallbackFailed,
        &["host surface callback failed with code 99", "sample"],
    );
    assert_eq!(strake_last_callback_code(), 99);
    assert_eq!(n, 5);
    assert!(buf.iter().all(|s| *s == sample_sentinel()));
    free(s, c);
}

// The sphere's poles: Sv = 0 at v = 0, so the normal, and with it the signed distance, is
// undefined there (do Carmo §2-2: the parametrisation is not regular at the poles). A point
// whose foot point is a pole is refused by index; so is a host callback's failure.
#[test]
fn projection_at_a_pole_and_callback_failures() {
    let r = 2.0;
    let sh = own_surface(sphere_surface(r));
    let (_, mut pts) = sphere_points(r, 6);
    pts[3] = [0.0, 0.0, r + 0.1]; // above the north pole (v = 0)
    let mut out = vec![projection_sentinel(); 6];
    let o = options(1.0);
    // SAFETY: 6 points, room for 6 projections.
    let st =
        unsafe { strake_surface_project_points(sh, pts.as_ptr().cast(), 6, &o, out.as_mut_ptr()) };
    expect(
        st,
        StrakeStatus::DegenerateSurface,
        &["point 3", "degenerate surface point"],
    );
    assert!(out.iter().all(|p| *p == projection_sentinel()));
    let (st, _, _) = through_space(sh, &pts, &o, 3);
    expect(st, StrakeStatus::DegenerateSurface, &["point 3"]);
    free_surface(sh);

    let failing = surface(
        Some(failing_beyond_one),
        ptr::null_mut(),
        (0.0, 2.0),
        (0.0, 2.0),
        0,
    );
    let pts = [
        [0.2, 0.2, 0.0],
        [0.6, 0.4, 0.0],
        [1.4, 0.6, 0.0],
        [1.8, 0.8, 0.0],
    ];
    let (st, _, _) = through_space(failing, &pts, &o, 3);
    expect(
        st,
        StrakeStatus::SurfaceCallbackFailed,
        &["host surface callback failed with code 99"],
    );
    // SAFETY: 4 points, room for 4 projections.
    let st = unsafe {
        strake_surface_project_points(failing, pts.as_ptr().cast(), 4, &o, out.as_mut_ptr())
    };
    expect(st, StrakeStatus::SurfaceCallbackFailed, &["code 99"]);
    free_surface(failing);
}

#[test]
fn projected_nurbs_degree_and_convergence() {
    let sh = own_surface(sphere_surface(2.0));
    let (knots, pts, w) = latitude_quarter(2.0, 1.1);
    let mut out = bogus();
    // SAFETY: arrays of the documented sizes.
    let st = unsafe {
        strake_curve_project_nurbs(
            sh,
            0,
            knots.as_ptr(),
            knots.len(),
            pts.as_ptr().cast(),
            3,
            w.as_ptr(),
            &options(1e-9),
            1e-7,
            &mut out,
        )
    };
    expect(st, StrakeStatus::InvalidDegree, &["degree 0"]);
    let mut one = options(1e-9);
    one.max_iterations = 1;
    let (st, _) = project_nurbs(sh, &knots, &pts, Some(&w), &one, 1e-7);
    expect(
        st,
        StrakeStatus::NotConverged,
        &["sample 0 (t = 0)", "not converged"],
    );
    assert_eq!(out, bogus());
    free_surface(sh);
}

// Every pointer of every sampling function, NULL in turn: refused by name, nothing written.
#[test]
fn sampling_null_pointers() {
    let sh = own_surface(torus(5.0, 1.5));
    let c = uv_line([0.5, 1.0], [1.0, 2.0]);
    let mut buf = vec![sample_sentinel(); 4];
    let mut n = 4242usize;
    let (b, np, nc) = (
        buf.as_mut_ptr(),
        ptr::null_mut::<StrakeSample>(),
        ptr::null_mut::<usize>(),
    );
    let (ns, ncv) = (ptr::null::<StrakeSurface>(), ptr::null::<StrakeCurve>());
    // SAFETY: valid pointers but for the NULL under test.
    unsafe {
        type F = unsafe extern "C" fn(
            *const StrakeSurface,
            *const StrakeCurve,
            usize,
            f64,
            *mut StrakeSample,
            usize,
            *mut usize,
        ) -> StrakeStatus;
        for (name, f) in [
            ("strake_sample_even_t", strake_sample_even_t as F),
            ("strake_sample_even_arc", strake_sample_even_arc as F),
        ] {
            expect(f(ns, c, 3, 1e-10, b, 4, &mut n), NP, &[name, "`surface`"]);
            expect(f(sh, ncv, 3, 1e-10, b, 4, &mut n), NP, &[name, "`curve`"]);
            expect(f(sh, c, 3, 1e-10, np, 4, &mut n), NP, &[name, "`buf`"]);
            expect(f(sh, c, 3, 1e-10, b, 4, nc), NP, &[name, "`count`"]);
        }
        let chordal = |s, cv, bb, cnt| strake_sample_chordal(s, cv, 1e-3, 1.0, 1e-10, bb, 4, cnt);
        expect(chordal(ns, c, b, &mut n), NP, &["`surface`"]);
        expect(chordal(sh, ncv, b, &mut n), NP, &["`curve`"]);
        expect(chordal(sh, c, np, &mut n), NP, &["`buf`"]);
        expect(chordal(sh, c, b, nc), NP, &["`count`"]);
        let mut len = -1.0;
        expect(
            strake_arc_length(sh, ncv, 0.0, 1.0, 1e-10, &mut len),
            NP,
            &["`curve`"],
        );
        assert_eq!(len, -1.0);
    }
    assert_eq!(n, 4242);
    assert!(buf.iter().all(|s| *s == sample_sentinel()));
    free(sh, c);
}

// A quadratic B-spline whose first two control points coincide stalls at t = 0 (C'(0) =
// 2 (P1 - P0)/u_3 = 0, The NURBS Book 2nd ed. §3.3 [memory]): sampling names sample 0.
#[test]
fn sampling_a_stalled_curve() {
    let s = own_surface(plane_surface((0.0, 1.0), (0.0, 1.0)));
    let c = nurbs(
        2,
        &[0.0, 0.0, 0.0, 1.0, 1.0, 1.0],
        &[[0.3, 0.3], [0.3, 0.3], [0.9, 0.6]],
        None,
    );
    let mut buf = vec![sample_sentinel(); 8];
    let mut n = 4242usize;
    // SAFETY: room for 8 samples.
    let st = unsafe { strake_sample_chordal(s, c, 1e-3, 1.0, 1e-10, buf.as_mut_ptr(), 8, &mut n) };
    expect(
        st,
        StrakeStatus::StalledCurve,
        &["sample 0 (t = 0)", "stalled curve"],
    );
    assert_eq!(n, 4242);
    free(s, c);
}
