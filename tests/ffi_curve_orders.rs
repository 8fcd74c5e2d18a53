//! Host curve callbacks and the derivative order a call needs (issue 12, item 1), called
//! through the C ABI as a host would: a curve of `strake_curve_from_callback` gives second
//! order only, so every call that needs the curve's third derivatives (the rates of change of
//! the invariants, the tool-centre path, chordal sampling judged on it) refuses it with
//! ORDER_UNAVAILABLE naming the order, while the calls that need second order work; a curve of
//! `strake_curve_from_high_callback` is asked for order 3 (or 4) by exactly those calls and
//! gives the closed-form answers.
//!
//! The closed forms (derived here, from the conventions of `src/geometry/frame.rs`): the
//! cylinder S(u, v) = (R cos u, R sin u, v) has N = (cos u, sin u, 0) (Su × Sv normalised),
//! L = Suu·N = −R, M = N = 0, E = R², G = 1, so II(X, Y) = −R X_u Y_u on parameter
//! components. It is isometric to the plane (x, y) = (R u, v), with (Su/R, Sv, N)
//! right-handed, so B = N × T is T turned by +90° in (x, y). The curve
//! u = u0 + (ρ/R) cos t, v = v0 + ρ sin t unrolls to a circle of radius ρ run
//! counter-clockwise: arc length s = ρ t, the unrolled tangent at angle φ = t + π/2
//! (cos φ = −sin t, sin φ = cos t), and κg = +1/ρ (the geodesic curvature is the unrolled
//! curve's signed curvature, isometry invariance; do Carmo, Differential Geometry of Curves
//! and Surfaces, §4-4). With T_u = cos φ / R, B_u = −sin φ / R:
//! κn = II(T, T) = −sin² t / R, τg = II(T, B) = −sin t cos t / R, so
//! dκn/ds = −sin 2t / (R ρ), dτg/ds = −cos 2t / (R ρ), dκg/ds = 0, and
//! dκ/ds = κn (dκn/ds) / κ for κ = √(κn² + κg²).
//!
//! The tool-centre path of a ball of radius r on the tool side along N is the same (u, v)
//! curve on the cylinder of radius R + r (the offset of a cylinder): it unrolls to the ellipse
//! (a cos t, ρ sin t), a = ρ (R + r)/R, whose curvature is a ρ / w³ with
//! w = √(a² sin² t + ρ² cos² t) and whose tangent makes cos φ = −a sin t / w with the x axis,
//! so its space curvature is √((a ρ / w³)² + (cos² φ / (R + r))²) (κ² = κg² + κn², Meusnier
//! and Euler on the larger cylinder) and its speed ratio w / ρ.

#[path = "support/ffi_util.rs"]
mod ffi_util;

use ffi_util::*;
use std::ffi::c_void;
use std::ptr;
use std::sync::atomic::{AtomicI32, Ordering};
use strake::ffi::*;

const R: f64 = 10.0;
const RHO: f64 = 2.0;
const U0: f64 = 0.6;
const V0: f64 = 0.0;
const OK: StrakeStatus = StrakeStatus::Ok;
const UNAVAILABLE: StrakeStatus = StrakeStatus::OrderUnavailable;
const ALONG: u32 = StrakeToolSide::AlongNormal as u32;
const S: f64 = -7777.25;

/// The cylinder of radius `R` with its partials to fourth order.
unsafe extern "C" fn cylinder4(
    _: *mut c_void,
    u: f64,
    v: f64,
    _order: i32,
    out: *mut StrakeSurfaceHighJet,
) -> i32 {
    // SAFETY: strake passes a valid jet.
    let j = unsafe { &mut *out };
    let (sn, c) = u.sin_cos();
    *j = StrakeSurfaceHighJet {
        p: [R * c, R * sn, v],
        su: [-R * sn, R * c, 0.0],
        sv: [0.0, 0.0, 1.0],
        suu: [-R * c, -R * sn, 0.0],
        suuu: [R * sn, -R * c, 0.0],
        suuuu: [R * c, R * sn, 0.0],
        ..Default::default()
    };
    0
}

/// The host's state: the highest order strake asked for, a failure code to return, and
/// whether to hand back a NaN third derivative.
struct Host {
    asked: AtomicI32,
    fail: i32,
    nan_d3u: bool,
}

impl Host {
    fn new() -> Host {
        Host {
            asked: AtomicI32::new(-1),
            fail: 0,
            nan_d3u: false,
        }
    }
    fn ud(&self) -> *mut c_void {
        self as *const Host as *mut c_void
    }
}

/// d^k/dt^k of cos and sin.
fn dcos(k: usize, t: f64) -> f64 {
    (t + k as f64 * std::f64::consts::FRAC_PI_2).cos()
}
fn dsin(k: usize, t: f64) -> f64 {
    (t + k as f64 * std::f64::consts::FRAC_PI_2).sin()
}

/// u = U0 + (ρ/R) cos t, v = V0 + ρ sin t with derivatives to `order`, as a C host writes it.
unsafe extern "C" fn circle_high(
    ud: *mut c_void,
    t: f64,
    order: i32,
    out: *mut StrakeCurveHighJet,
) -> i32 {
    // SAFETY: the tests pass a live Host and strake a valid jet.
    let (h, j) = unsafe { (&*(ud as *const Host), &mut *out) };
    h.asked.fetch_max(order, Ordering::Relaxed);
    if h.fail != 0 {
        return h.fail;
    }
    let u = |k| RHO / R * dcos(k, t) + if k == 0 { U0 } else { 0.0 };
    let v = |k| RHO * dsin(k, t) + if k == 0 { V0 } else { 0.0 };
    let slots: [(&mut f64, &mut f64, usize); 5] = [
        (&mut j.u, &mut j.v, 0),
        (&mut j.du, &mut j.dv, 1),
        (&mut j.ddu, &mut j.ddv, 2),
        (&mut j.d3u, &mut j.d3v, 3),
        (&mut j.d4u, &mut j.d4v, 4),
    ];
    for (a, b, k) in slots {
        if k as i32 <= order {
            *a = u(k);
            *b = v(k);
        }
    }
    if h.nan_d3u && order >= 3 {
        j.d3u = f64::NAN;
    }
    0
}

/// The same curve to second order only, through the plain curve callback.
unsafe extern "C" fn circle2(_: *mut c_void, t: f64, out: *mut StrakeCurveJet) -> i32 {
    // SAFETY: strake passes a valid jet.
    let j = unsafe { &mut *out };
    *j = StrakeCurveJet {
        u: U0 + RHO / R * t.cos(),
        v: V0 + RHO * t.sin(),
        du: -RHO / R * t.sin(),
        dv: RHO * t.cos(),
        ddu: -RHO / R * t.cos(),
        ddv: -RHO * t.sin(),
    };
    0
}

fn cylinder() -> *mut StrakeSurface {
    let mut s = ptr::null_mut();
    // SAFETY: a valid callback without user data, a valid output slot.
    let st = unsafe {
        strake_surface_from_high_callback(
            Some(cylinder4),
            ptr::null_mut(),
            4,
            0.0,
            1.2,
            -3.0,
            3.0,
            0,
            &mut s,
        )
    };
    assert_eq!(st, OK, "{}", message());
    s
}

fn high_curve(h: &Host, max_order: u32) -> *mut StrakeCurve {
    let mut c = ptr::null_mut();
    let tau = std::f64::consts::TAU;
    // SAFETY: a valid callback, `h` outlives the handle, a valid output slot.
    let st = unsafe {
        strake_curve_from_high_callback(Some(circle_high), h.ud(), max_order, 0.0, tau, &mut c)
    };
    assert_eq!(st, OK, "{}", message());
    c
}

fn second_order_curve() -> *mut StrakeCurve {
    let mut c = ptr::null_mut();
    let tau = std::f64::consts::TAU;
    // SAFETY: a valid callback, a valid output slot.
    let st =
        unsafe { strake_curve_from_callback(Some(circle2), ptr::null_mut(), 0.0, tau, &mut c) };
    assert_eq!(st, OK, "{}", message());
    c
}

/// The closed-form rates at t (module docs): [dκn/ds, dκg/ds, dτg/ds, dκ/ds].
fn rates_closed_form(t: f64) -> [f64; 4] {
    let kn = -t.sin().powi(2) / R;
    let kg = 1.0 / RHO;
    let dkn = -(2.0 * t).sin() / (R * RHO);
    let dtg = -(2.0 * t).cos() / (R * RHO);
    [dkn, 0.0, dtg, kn * dkn / kn.hypot(kg)]
}

fn rates_of(r: &StrakeInvariantRates) -> [f64; 4] {
    [
        r.normal_curvature_rate,
        r.geodesic_curvature_rate,
        r.geodesic_torsion_rate,
        r.curvature_rate,
    ]
}

fn ball(r: f64) -> StrakeCutter {
    StrakeCutter {
        kind: StrakeCutterKind::Ball as u32,
        radius: r,
        corner_radius: 0.0,
    }
}

const ANGLES: StrakeToolAngles = StrakeToolAngles {
    lead: 0.0,
    tilt: 0.0,
};

fn sentinel_rates() -> StrakeInvariantRates {
    StrakeInvariantRates {
        normal_curvature_rate: S,
        geodesic_curvature_rate: S,
        geodesic_torsion_rate: S,
        curvature_rate: S,
    }
}

fn sentinel_point() -> StrakeCentrePoint {
    StrakeCentrePoint {
        curve_param: S,
        centre: [S; 3],
        tip: [S; 3],
        axis: [S; 3],
        tangent: [S; 3],
        speed_ratio: S,
        curvature: S,
        curvature_rate: S,
        torsion: S,
        jerk_figure: S,
        axis_rate: S,
        order: 7,
    }
}

const TS: [f64; 6] = [0.1, 0.7, 1.3, 2.2, 3.9, 5.5];

#[test]
fn a_third_order_host_curve_gives_the_closed_form_rates() {
    let h = Host::new();
    let (s, c) = (cylinder(), high_curve(&h, 3));
    for &t in &TS {
        let (mut f, mut r) = (sentinel(), sentinel_rates());
        // SAFETY: live handles, valid outputs.
        let st = unsafe { strake_invariant_rates_at(s, c, t, &mut f, &mut r) };
        assert_eq!(st, OK, "{}", message());
        close("κn", f.normal_curvature, -t.sin().powi(2) / R, 1e-13, 1.0);
        close("κg", f.geodesic_curvature, 1.0 / RHO, 1e-13, 1.0);
        close("τg", f.geodesic_torsion, -t.sin() * t.cos() / R, 1e-13, 1.0);
        for (k, (g, w)) in rates_of(&r)
            .into_iter()
            .zip(rates_closed_form(t))
            .enumerate()
        {
            close(&format!("t = {t}: rate {k}"), g, w, 1e-12, 1.0 / (R * RHO));
        }
    }
    assert_eq!(h.asked.load(Ordering::Relaxed), 3, "asked for order 3");
    // The whole path in one call: the same closed forms.
    let mut frames = vec![sentinel(); TS.len()];
    let mut rates = vec![sentinel_rates(); TS.len()];
    // SAFETY: live handles, arrays of TS.len().
    let st = unsafe {
        strake_invariant_rates_path(
            s,
            c,
            TS.as_ptr(),
            TS.len(),
            frames.as_mut_ptr(),
            rates.as_mut_ptr(),
        )
    };
    assert_eq!(st, OK, "{}", message());
    for (r, &t) in rates.iter().zip(&TS) {
        for (k, (g, w)) in rates_of(r)
            .into_iter()
            .zip(rates_closed_form(t))
            .enumerate()
        {
            close(
                &format!("path t = {t}: rate {k}"),
                g,
                w,
                1e-12,
                1.0 / (R * RHO),
            );
        }
    }
    free(s, c);
}

#[test]
fn a_third_order_host_curve_gives_the_closed_form_centre_path() {
    let h = Host::new();
    let (s, c) = (cylinder(), high_curve(&h, 3));
    let r = 1.5;
    let cut = ball(r);
    let a = RHO * (R + r) / R;
    let mut out = vec![sentinel_point(); TS.len()];
    // SAFETY: live handles, valid inputs, an array of TS.len().
    let st = unsafe {
        strake_centre_path_at(
            s,
            c,
            TS.as_ptr(),
            TS.len(),
            ALONG,
            &cut,
            &ANGLES,
            3,
            out.as_mut_ptr(),
        )
    };
    assert_eq!(st, OK, "{}", message());
    for (p, &t) in out.iter().zip(&TS) {
        let w = (a * a * t.sin().powi(2) + RHO * RHO * t.cos().powi(2)).sqrt();
        let cos_phi = -a * t.sin() / w;
        let kc = (a * RHO / w.powi(3)).hypot(cos_phi * cos_phi / (R + r));
        close(
            &format!("t = {t}: centre curvature"),
            p.curvature,
            kc,
            1e-12,
            1.0,
        );
        close(
            &format!("t = {t}: speed ratio"),
            p.speed_ratio,
            w / RHO,
            1e-13,
            1.0,
        );
        let (su, cu) = (U0 + RHO / R * t.cos()).sin_cos();
        let want = [(R + r) * cu, (R + r) * su, V0 + RHO * t.sin()];
        for (g, w) in p.centre.iter().zip(want) {
            close("centre", *g, w, 1e-13, 1.0);
        }
    }
    assert_eq!(h.asked.load(Ordering::Relaxed), 3);
    // Order 4 (the curvature's rate, torsion, jerk) needs the curve's fourth derivatives: a
    // curve declared to order 3 refuses it, naming the curve and both orders, output untouched.
    let mut p = sentinel_point();
    // SAFETY: live handles, valid inputs and output.
    let st = unsafe { strake_centre_point_at(s, c, 0.7, ALONG, &cut, &ANGLES, 4, &mut p) };
    expect(
        st,
        UNAVAILABLE,
        &[
            "strake_centre_point_at",
            "the curve's derivatives to order 4",
            "provides order 3",
        ],
    );
    assert_eq!(p, sentinel_point());
    assert_eq!(
        h.asked.load(Ordering::Relaxed),
        3,
        "never asked above max_order"
    );
    free(s, c);
    // Declared to order 4, the same call works and asks for order 4.
    let h4 = Host::new();
    let (s, c) = (cylinder(), high_curve(&h4, 4));
    // SAFETY: live handles, valid inputs and output.
    let st = unsafe { strake_centre_point_at(s, c, 0.7, ALONG, &cut, &ANGLES, 4, &mut p) };
    assert_eq!(st, OK, "{}", message());
    assert_eq!(h4.asked.load(Ordering::Relaxed), 4);
    assert!(p.curvature_rate.is_finite() && p.torsion.is_finite());
    free(s, c);
}

#[test]
fn a_second_order_host_curve_is_refused_by_exactly_the_calls_that_need_third_order() {
    let (s, c) = (cylinder(), second_order_curve());
    let needs = ["the curve's derivatives to order 3", "provides order 2"];
    // SAFETY (whole block): live handles, valid inputs, outputs of the sizes passed.
    unsafe {
        // Second order is enough for frames and sampling: these work.
        let mut f = sentinel();
        assert_eq!(strake_frame_at(s, c, 0.7, &mut f), OK, "{}", message());
        close(
            "κn",
            f.normal_curvature,
            -0.7f64.sin().powi(2) / R,
            1e-13,
            1.0,
        );
        let mut frames = vec![sentinel(); TS.len()];
        let st = strake_frames_at(s, c, TS.as_ptr(), TS.len(), frames.as_mut_ptr());
        assert_eq!(st, OK, "{}", message());
        let mut buf = vec![std::mem::zeroed::<StrakeSample>(); 4000];
        let mut count = 0;
        let st = strake_sample_chordal(
            s,
            c,
            1e-3,
            0.0,
            1e-12,
            buf.as_mut_ptr(),
            buf.len(),
            &mut count,
        );
        assert_eq!(st, OK, "{}", message());
        // The calls that need the curve's third derivatives refuse, outputs untouched.
        let (mut f, mut r) = (sentinel(), sentinel_rates());
        let st = strake_invariant_rates_at(s, c, 0.7, &mut f, &mut r);
        expect(st, UNAVAILABLE, &needs);
        assert_eq!((f, r), (sentinel(), sentinel_rates()));
        let mut rates = vec![sentinel_rates(); TS.len()];
        let st = strake_invariant_rates_path(
            s,
            c,
            TS.as_ptr(),
            TS.len(),
            frames.as_mut_ptr(),
            rates.as_mut_ptr(),
        );
        expect(st, UNAVAILABLE, &needs);
        assert!(rates.iter().all(|r| *r == sentinel_rates()));
        let cut = ball(1.5);
        for order in [3, 4] {
            let mut p = sentinel_point();
            let st = strake_centre_point_at(s, c, 0.7, ALONG, &cut, &ANGLES, order, &mut p);
            expect(st, UNAVAILABLE, &["provides order 2"]);
            assert_eq!(p, sentinel_point());
            let mut out = vec![sentinel_point(); TS.len()];
            let st = strake_centre_path_at(
                s,
                c,
                TS.as_ptr(),
                TS.len(),
                ALONG,
                &cut,
                &ANGLES,
                order,
                out.as_mut_ptr(),
            );
            expect(st, UNAVAILABLE, &["provides order 2"]);
            assert!(out.iter().all(|p| *p == sentinel_point()));
        }
        count = 77;
        let st = strake_sample_chordal_centre(
            s,
            c,
            1e-3,
            0.0,
            1e-12,
            ALONG,
            &cut,
            &ANGLES,
            buf.as_mut_ptr(),
            buf.len(),
            &mut count,
        );
        expect(st, UNAVAILABLE, &needs);
        assert_eq!(count, 77);
    }
    free(s, c);
}

#[test]
fn high_curve_constructor_and_callback_failures() {
    let h = Host::new();
    let mut out = ptr::null_mut();
    // SAFETY (whole block): valid or NULL arguments as each case states.
    unsafe {
        let st = strake_curve_from_high_callback(None, h.ud(), 3, 0.0, 1.0, &mut out);
        expect(
            st,
            StrakeStatus::NullPointer,
            &["strake_curve_from_high_callback", "`f`"],
        );
        for bad in [0, 2, 5] {
            let st =
                strake_curve_from_high_callback(Some(circle_high), h.ud(), bad, 0.0, 1.0, &mut out);
            expect(
                st,
                StrakeStatus::InvalidArgument,
                &[&format!("`max_order` = {bad}"), "3 or 4"],
            );
        }
        let st =
            strake_curve_from_high_callback(Some(circle_high), h.ud(), 3, f64::NAN, 1.0, &mut out);
        expect(st, StrakeStatus::NonFinite, &["t_min"]);
        let st = strake_curve_from_high_callback(Some(circle_high), h.ud(), 3, 1.0, 1.0, &mut out);
        assert_eq!(st, StrakeStatus::InvalidArgument, "{}", message());
        assert!(out.is_null(), "no handle on failure");
        let st = strake_curve_from_high_callback(
            Some(circle_high),
            h.ud(),
            3,
            0.0,
            1.0,
            ptr::null_mut(),
        );
        expect(st, StrakeStatus::NullPointer, &["`out`"]);
    }
    // A failing host and a NaN third derivative.
    let s = cylinder();
    let mut failing = Host::new();
    failing.fail = 42;
    let c = high_curve(&failing, 3);
    let (mut f, mut r) = (sentinel(), sentinel_rates());
    // SAFETY: live handles, valid outputs.
    let st = unsafe { strake_invariant_rates_at(s, c, 0.7, &mut f, &mut r) };
    expect(st, StrakeStatus::CurveCallbackFailed, &["42"]);
    assert_eq!(strake_last_callback_code(), 42);
    // SAFETY: a handle from the constructor.
    unsafe { strake_curve_free(c) };
    let mut nan = Host::new();
    nan.nan_d3u = true;
    let c = high_curve(&nan, 3);
    // SAFETY: live handles, valid outputs.
    let st = unsafe { strake_invariant_rates_at(s, c, 0.7, &mut f, &mut r) };
    expect(st, StrakeStatus::NonFinite, &["d3u"]);
    assert_eq!(r, sentinel_rates());
    // Frames need second order only: the NaN third derivative is never asked for.
    // SAFETY: live handles, valid output.
    let st = unsafe { strake_frame_at(s, c, 0.7, &mut f) };
    assert_eq!(st, OK, "{}", message());
    free(s, c);
}
