//! The native NURBS surface through the C ABI: agreement with the Rust API and with the same
//! surface passed as a host callback, exact conics (closed forms: do Carmo ch. 3; exact
//! rational circles: The NURBS Book 2nd ed. ch. 7–8), and every validation failure with its
//! status and message.

#[path = "support/ffi_util.rs"]
mod ffi_util;

use ffi_util::nurbs_host;
use std::ffi::{CStr, c_void};
use std::ptr;
use strake::ffi::*;
use strake::nurbs::conics::{CircleForm, torus};
use strake::{CurveOnSurface, Hints, NurbsSurface, SurfaceSource, uv_line};

fn message() -> String {
    let mut buf = [0 as std::ffi::c_char; 1024];
    // SAFETY: the buffer is valid for its length.
    unsafe { strake_last_error_message(buf.as_mut_ptr(), buf.len()) };
    // SAFETY: the library NUL-terminates the message.
    unsafe { CStr::from_ptr(buf.as_ptr()) }
        .to_string_lossy()
        .into_owned()
}

/// The arrays of a Rust NURBS surface, in the C layout (v index fastest).
struct Arrays {
    degree_u: u32,
    degree_v: u32,
    count_u: usize,
    count_v: usize,
    knots_u: Vec<f64>,
    knots_v: Vec<f64>,
    points: Vec<f64>,
    weights: Option<Vec<f64>>,
}

impl Arrays {
    fn of(s: &NurbsSurface) -> Self {
        let (cu, cv) = (s.count_u(), s.count_v());
        let mut points = Vec::new();
        let mut weights = Vec::new();
        for i in 0..cu {
            for j in 0..cv {
                points.extend_from_slice(&s.control_point(i, j).unwrap());
                weights.push(s.weight(i, j).unwrap());
            }
        }
        Arrays {
            degree_u: s.degree_u() as u32,
            degree_v: s.degree_v() as u32,
            count_u: cu,
            count_v: cv,
            knots_u: s.u_knots().knots().to_vec(),
            knots_v: s.v_knots().knots().to_vec(),
            points,
            weights: s.is_rational().then_some(weights),
        }
    }

    fn data(&self) -> StrakeNurbsSurfaceData {
        StrakeNurbsSurfaceData {
            degree_u: self.degree_u,
            degree_v: self.degree_v,
            count_u: self.count_u,
            count_v: self.count_v,
            knots_u: self.knots_u.as_ptr(),
            knot_count_u: self.knots_u.len(),
            knots_v: self.knots_v.as_ptr(),
            knot_count_v: self.knots_v.len(),
            points: self.points.as_ptr(),
            weights: self.weights.as_ref().map_or(ptr::null(), |w| w.as_ptr()),
        }
    }
}

fn create(data: &StrakeNurbsSurfaceData, flip: i32) -> (StrakeStatus, *mut StrakeSurface) {
    let mut out: *mut StrakeSurface = ptr::dangling_mut();
    // SAFETY: `data` describes live arrays; `out` is a valid slot.
    let st = unsafe { strake_surface_new_nurbs(data, flip, &mut out) };
    (st, out)
}

/// A bicubic rational patch with non-uniform knots and weights (invented data).
fn patch() -> NurbsSurface {
    let (cu, cv) = (6, 5);
    let mut pts = Vec::new();
    let mut w = Vec::new();
    for i in 0..cu {
        for j in 0..cv {
            let (x, y) = (i as f64 * 20.0, j as f64 * 15.0);
            pts.push([
                x,
                y,
                4.0 * ((i * 7 + j * 3) % 5) as f64 - 0.02 * x * y / 10.0,
            ]);
            w.push(0.7 + 0.15 * ((i + 2 * j) % 4) as f64);
        }
    }
    NurbsSurface::new(&strake::NurbsSurfaceData {
        degree_u: 3,
        degree_v: 3,
        count_u: cu,
        count_v: cv,
        knots_u: &[0.0, 0.0, 0.0, 0.0, 0.3, 0.55, 1.0, 1.0, 1.0, 1.0],
        knots_v: &[0.0, 0.0, 0.0, 0.0, 0.4, 1.0, 1.0, 1.0, 1.0],
        points: &pts,
        weights: Some(&w),
    })
    .unwrap()
}

fn frames(surface: *const StrakeSurface, curve: *const StrakeCurve, n: usize) -> Vec<StrakeFrame> {
    let mut out = vec![StrakeFrame::default(); n];
    // SAFETY: valid handles and an array of n frames.
    let st = unsafe { strake_frames_even(surface, curve, n, out.as_mut_ptr()) };
    assert_eq!(st, StrakeStatus::Ok, "{}", message());
    out
}

// Issue 3: the native surface and the same surface through the callback path agree (here bit
// for bit: the callback evaluates the same Rust surface), and both agree with the Rust API.
#[test]
fn native_and_callback_surfaces_agree() {
    let rust = patch();
    let arrays = Arrays::of(&rust);
    let (st, native) = create(&arrays.data(), 0);
    assert_eq!(st, StrakeStatus::Ok, "{}", message());
    let mut cb: *mut StrakeSurface = ptr::null_mut();
    // SAFETY: nurbs_host honours the callback contract; `rust` outlives the handle.
    let st = unsafe {
        strake_surface_from_callback(
            Some(nurbs_host),
            &rust as *const _ as *mut c_void,
            0.0,
            1.0,
            0.0,
            1.0,
            0,
            &mut cb,
        )
    };
    assert_eq!(st, StrakeStatus::Ok);
    let knots = [0.0, 0.0, 0.0, 0.0, 0.5, 1.0, 1.0, 1.0, 1.0];
    let uv = [0.02, 0.1, 0.3, 0.9, 0.5, 0.2, 0.8, 0.7, 0.97, 0.3];
    let mut curve: *mut StrakeCurve = ptr::null_mut();
    // SAFETY: arrays of the stated sizes.
    assert_eq!(
        unsafe {
            strake_curve_new_nurbs(
                3,
                knots.as_ptr(),
                9,
                uv.as_ptr(),
                5,
                ptr::null(),
                &mut curve,
            )
        },
        StrakeStatus::Ok
    );
    let a = frames(native, curve, 301);
    let b = frames(cb, curve, 301);
    for (x, y) in a.iter().zip(&b) {
        assert_eq!(x.normal_curvature, y.normal_curvature);
        assert_eq!(x.geodesic_curvature, y.geodesic_curvature);
        assert_eq!(x.geodesic_torsion, y.geodesic_torsion);
        assert_eq!(
            (x.k1, x.k2, x.point, x.normal),
            (y.k1, y.k2, y.point, y.normal)
        );
    }
    let rc = strake::NurbsCurve::<2>::new(
        3,
        &knots,
        &[[0.02, 0.1], [0.3, 0.9], [0.5, 0.2], [0.8, 0.7], [0.97, 0.3]],
        None,
    )
    .unwrap();
    let cs = CurveOnSurface::new(&rust, &rc);
    let mut h = Hints::default();
    for x in &a {
        let f = cs.frame(x.curve_param, &mut h).unwrap();
        assert_eq!(f.geodesic_torsion, x.geodesic_torsion);
        assert_eq!(f.normal_curvature, x.normal_curvature);
    }
    // SAFETY: handles from the constructors above, freed once.
    unsafe {
        strake_curve_free(curve);
        strake_surface_free(native);
        strake_surface_free(cb);
    }
}

// The NURBS torus (rational quadratic circles revolved, The NURBS Book ch. 8) through the C ABI:
// a meridian has κn = −1/r with the outward normal and κg = τg = 0 (do Carmo §3-3); flipping
// the normal flips κn only.
#[test]
fn nurbs_torus_through_the_c_abi() {
    let (big_r, r) = (30.0, 8.0);
    for form in [CircleForm::NinePoint, CircleForm::SevenPoint] {
        let arrays = Arrays::of(&torus(big_r, r, form).unwrap());
        for (flip, sign) in [(0, 1.0), (1, -1.0)] {
            let (st, s) = create(&arrays.data(), flip);
            assert_eq!(st, StrakeStatus::Ok, "{}", message());
            let (knots, uv) = ([0.0, 0.0, 1.0, 1.0], [0.3, 0.01, 0.3, 0.99]);
            let mut c: *mut StrakeCurve = ptr::null_mut();
            // SAFETY: arrays of the stated sizes.
            assert_eq!(
                unsafe {
                    strake_curve_new_nurbs(
                        1,
                        knots.as_ptr(),
                        4,
                        uv.as_ptr(),
                        2,
                        ptr::null(),
                        &mut c,
                    )
                },
                StrakeStatus::Ok
            );
            for f in frames(s, c, 50) {
                assert!(
                    (f.normal_curvature + sign / r).abs() < 1e-12 / r,
                    "{}",
                    f.normal_curvature
                );
                assert!(f.geodesic_curvature.abs() < 1e-12 / r);
                assert!(f.geodesic_torsion.abs() < 1e-12 / r);
            }
            // SAFETY: handles from the constructors above.
            unsafe {
                strake_curve_free(c);
                strake_surface_free(s);
            }
        }
    }
    // The Rust API gives the same surface.
    let t = torus(big_r, r, CircleForm::NinePoint).unwrap();
    let f = CurveOnSurface::new(&t, &uv_line(0.3, 0.01, 0.3, 0.99).unwrap())
        .frame(0.5, &mut Hints::default())
        .unwrap();
    assert!((f.normal_curvature + 1.0 / r).abs() < 1e-12 / r);
    assert!(t.u_domain().width() > 0.0);
}

/// Checks a failing creation: status, message words, and `*out` untouched.
fn refused(data: &StrakeNurbsSurfaceData, flip: i32, status: StrakeStatus, words: &[&str]) {
    let (st, out) = create(data, flip);
    assert_eq!(st, status, "{}", message());
    assert_eq!(out, ptr::dangling_mut(), "output touched");
    let m = message();
    assert!(m.starts_with("strake_surface_new_nurbs"), "{m}");
    for w in words {
        assert!(m.contains(w), "`{m}` does not contain `{w}`");
    }
}

// Issue 3, validation: every failure through the C ABI with its status and message.
#[test]
fn every_validation_failure_has_its_status_and_message() {
    let good = Arrays::of(&patch());
    let mut out: *mut StrakeSurface = ptr::dangling_mut();
    // SAFETY: NULL data is refused before any read.
    assert_eq!(
        unsafe { strake_surface_new_nurbs(ptr::null(), 0, &mut out) },
        StrakeStatus::NullPointer
    );
    assert!(message().contains("`data`"));
    // SAFETY: NULL out is refused before any write.
    assert_eq!(
        unsafe { strake_surface_new_nurbs(&good.data(), 0, ptr::null_mut()) },
        StrakeStatus::NullPointer
    );
    assert!(message().contains("`out`"));

    let d = good.data();
    refused(
        &StrakeNurbsSurfaceData {
            knots_u: ptr::null(),
            ..d
        },
        0,
        StrakeStatus::NullPointer,
        &["knots_u"],
    );
    refused(
        &StrakeNurbsSurfaceData {
            points: ptr::null(),
            ..d
        },
        0,
        StrakeStatus::NullPointer,
        &["points"],
    );
    refused(&d, 2, StrakeStatus::InvalidArgument, &["flip_normal", "2"]);
    refused(
        &StrakeNurbsSurfaceData {
            count_u: usize::MAX,
            ..d
        },
        0,
        StrakeStatus::InvalidArgument,
        &["overflows"],
    );
    refused(
        &StrakeNurbsSurfaceData {
            knot_count_v: 0,
            ..d
        },
        0,
        StrakeStatus::InvalidArgument,
        &["knot_count_v"],
    );
    refused(
        &StrakeNurbsSurfaceData { degree_u: 0, ..d },
        0,
        StrakeStatus::InvalidDegree,
        &["u knots", "degree 0"],
    );
    refused(
        &StrakeNurbsSurfaceData { degree_v: 25, ..d },
        0,
        StrakeStatus::InvalidDegree,
        &["v knots", "25"],
    );
    refused(
        &StrakeNurbsSurfaceData {
            knot_count_u: 9,
            ..d
        },
        0,
        StrakeStatus::InvalidDegree,
        &["u knots", "got 9"],
    );
    refused(
        &StrakeNurbsSurfaceData { count_v: 3, ..d },
        0,
        StrakeStatus::InvalidDegree,
        &["v knots", "at least 4"],
    );

    let mut a = Arrays::of(&patch());
    a.knots_v[5] = 0.2;
    refused(
        &a.data(),
        0,
        StrakeStatus::InvalidKnots,
        &["v knots", "knot[5] = 0.2"],
    );
    let mut a = Arrays::of(&patch());
    a.knots_u[4] = f64::NAN;
    refused(
        &a.data(),
        0,
        StrakeStatus::InvalidKnots,
        &["u knots", "knot[4]", "NaN"],
    );
    let mut a = Arrays::of(&patch());
    a.knots_u = vec![0.0, 0.0, 0.0, 0.0, 0.0, 0.55, 1.0, 1.0, 1.0, 1.0];
    refused(
        &a.data(),
        0,
        StrakeStatus::InvalidKnots,
        &["u knots", "multiplicity 5"],
    );
    let mut a = Arrays::of(&patch());
    a.knots_v = vec![1.0; 9];
    refused(&a.data(), 0, StrakeStatus::InvalidKnots, &["v knots"]);
    let mut a = Arrays::of(&patch());
    a.points[3 * 7 + 2] = f64::INFINITY;
    refused(
        &a.data(),
        0,
        StrakeStatus::InvalidControlPoint,
        &["7", "inf"],
    );
    let mut a = Arrays::of(&patch());
    a.weights.as_mut().unwrap()[11] = -0.5;
    refused(&a.data(), 0, StrakeStatus::InvalidWeight, &["11", "-0.5"]);
    let mut a = Arrays::of(&patch());
    a.weights.as_mut().unwrap()[0] = 0.0;
    refused(&a.data(), 0, StrakeStatus::InvalidWeight, &["weight", "0"]);
}

// Evaluation outside the domain gives its status (no clamping).
#[test]
fn out_of_domain_through_the_c_abi() {
    let a = Arrays::of(&patch());
    let (st, s) = create(&a.data(), 0);
    assert_eq!(st, StrakeStatus::Ok);
    let (knots, uv) = ([0.0, 0.0, 1.0, 1.0], [0.5, 0.5, 1.2, 0.5]);
    let mut c: *mut StrakeCurve = ptr::null_mut();
    // SAFETY: arrays of the stated sizes.
    assert_eq!(
        unsafe {
            strake_curve_new_nurbs(1, knots.as_ptr(), 4, uv.as_ptr(), 2, ptr::null(), &mut c)
        },
        StrakeStatus::Ok
    );
    let mut f = StrakeFrame::default();
    // SAFETY: valid handles and output.
    let st = unsafe { strake_frame_at(s, c, 1.0, &mut f) };
    assert_eq!(st, StrakeStatus::OutOfDomain);
    assert!(message().contains("u = 1.2"), "{}", message());
    // SAFETY: handles from the constructors above.
    unsafe {
        strake_curve_free(c);
        strake_surface_free(s);
    }
}
