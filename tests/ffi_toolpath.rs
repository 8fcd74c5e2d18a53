//! The C functions of the path the machine runs (`src/ffi/toolpath.rs`) and the host callback
//! with derivatives beyond second order (`src/ffi/high_callback.rs`), called as a host would:
//! a C-ABI torus callback to fourth order against strake's analytic torus, closed forms (a
//! ball inside a cylinder: the centre path is a circle of radius rho - r), every status with
//! its message, NULL for each pointer, and outputs untouched on failure.

#[path = "support/ffi_util.rs"]
mod ffi_util;

use ffi_util::*;
use std::ffi::c_void;
use std::ptr;
use strake::analytic::{cylinder as analytic_cylinder, torus as analytic_torus};
use strake::ffi::*;
use strake::{CurveOnSurface, Hints, SurfaceSource};

const OK: StrakeStatus = StrakeStatus::Ok;
const NP: StrakeStatus = StrakeStatus::NullPointer;
const IA: StrakeStatus = StrakeStatus::InvalidArgument;
const NF: StrakeStatus = StrakeStatus::NonFinite;
const OU: StrakeStatus = StrakeStatus::OrderUnavailable;
const FOLDS: StrakeStatus = StrakeStatus::CentrePathFolds;
const ALONG: u32 = StrakeToolSide::AlongNormal as u32;
const AGAINST: u32 = StrakeToolSide::AgainstNormal as u32;
const S: f64 = -7777.25;

fn own_surface(s: impl SurfaceSource + 'static) -> *mut StrakeSurface {
    Box::into_raw(Box::new(StrakeSurface::new(Box::new(s))))
}

/// d^k/dx^k of cos and sin at x, exactly (no phase shift added to x).
fn dcos(k: usize, x: f64) -> f64 {
    let (s, c) = x.sin_cos();
    [c, -s, -c, s][k % 4]
}
fn dsin(k: usize, x: f64) -> f64 {
    let (s, c) = x.sin_cos();
    [s, c, -s, -c][k % 4]
}

/// What the torus callback does, set through `user_data`.
#[repr(C)]
struct TorusHost {
    big_r: f64,
    r: f64,
    /// Non-zero: return this code instead of a jet.
    fail: i32,
    /// Set Suuv to NaN.
    nan_suuv: bool,
    /// The highest `order` strake asked for.
    asked: std::sync::atomic::AtomicI32,
}

fn torus_host(big_r: f64, r: f64) -> TorusHost {
    TorusHost {
        big_r,
        r,
        fail: 0,
        nan_suuv: false,
        asked: std::sync::atomic::AtomicI32::new(-1),
    }
}

/// A host's torus S(u, v) = ((R + r cos v) cos u, (R + r cos v) sin u, r sin v) with exact
/// partials to fourth order, as a C host would write it (the same surface as
/// `strake::analytic::torus`).
unsafe extern "C" fn torus_cb(
    ud: *mut c_void,
    u: f64,
    v: f64,
    order: i32,
    out: *mut StrakeSurfaceHighJet,
) -> i32 {
    // SAFETY: the tests pass a live TorusHost and strake a valid jet.
    let (h, j) = unsafe { (&*(ud as *const TorusHost), &mut *out) };
    h.asked
        .fetch_max(order, std::sync::atomic::Ordering::Relaxed);
    if h.fail != 0 {
        return h.fail;
    }
    let d = |i: usize, k: usize| -> [f64; 3] {
        let w = if k == 0 {
            h.big_r + h.r * v.cos()
        } else {
            h.r * dcos(k, v)
        };
        let z = if i == 0 { h.r * dsin(k, v) } else { 0.0 };
        [w * dcos(i, u), w * dsin(i, u), z]
    };
    let slots: [(&mut [f64; 3], usize, usize); 15] = [
        (&mut j.p, 0, 0),
        (&mut j.su, 1, 0),
        (&mut j.sv, 0, 1),
        (&mut j.suu, 2, 0),
        (&mut j.suv, 1, 1),
        (&mut j.svv, 0, 2),
        (&mut j.suuu, 3, 0),
        (&mut j.suuv, 2, 1),
        (&mut j.suvv, 1, 2),
        (&mut j.svvv, 0, 3),
        (&mut j.suuuu, 4, 0),
        (&mut j.suuuv, 3, 1),
        (&mut j.suuvv, 2, 2),
        (&mut j.suvvv, 1, 3),
        (&mut j.svvvv, 0, 4),
    ];
    for (slot, i, k) in slots {
        if (i + k) as i32 <= order {
            *slot = d(i, k);
        }
    }
    if h.nan_suuv && order >= 3 {
        j.suuv[1] = f64::NAN;
    }
    0
}

fn high_surface(h: &TorusHost, max_order: u32) -> *mut StrakeSurface {
    let tau = std::f64::consts::TAU;
    let mut out = ptr::null_mut();
    // SAFETY: a valid callback, `h` outlives the handle, a valid output slot.
    let st = unsafe {
        strake_surface_from_high_callback(
            Some(torus_cb),
            h as *const TorusHost as *mut c_void,
            max_order,
            0.0,
            tau,
            0.0,
            tau,
            0,
            &mut out,
        )
    };
    assert_eq!(st, OK, "{}", message());
    out
}

fn ball(r: f64) -> StrakeCutter {
    StrakeCutter {
        kind: StrakeCutterKind::Ball as u32,
        radius: r,
        corner_radius: 0.0,
    }
}

fn toroidal() -> StrakeCutter {
    StrakeCutter {
        kind: StrakeCutterKind::Toroidal as u32,
        radius: 3.0,
        corner_radius: 1.0,
    }
}

const ANG: StrakeToolAngles = StrakeToolAngles {
    lead: 0.1,
    tilt: 0.05,
};
const UPRIGHT: StrakeToolAngles = StrakeToolAngles {
    lead: 0.0,
    tilt: 0.0,
};

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
        order: 77,
    }
}

fn sentinel_rates() -> StrakeInvariantRates {
    StrakeInvariantRates {
        normal_curvature_rate: S,
        geodesic_curvature_rate: S,
        geodesic_torsion_rate: S,
        curvature_rate: S,
    }
}

fn sentinel_feed() -> StrakeCentreFeed {
    StrakeCentreFeed {
        feed: S,
        acceleration_feed: S,
        jerk_feed: S,
        angular_feed: S,
        contact_feed: S,
        bound: 77,
    }
}

fn centre_at(
    s: *const StrakeSurface,
    c: *const StrakeCurve,
    t: f64,
    side: u32,
    cutter: &StrakeCutter,
    angles: &StrakeToolAngles,
    order: u32,
) -> (StrakeStatus, StrakeCentrePoint) {
    let mut p = sentinel_point();
    // SAFETY: live handles and valid values.
    let st = unsafe { strake_centre_point_at(s, c, t, side, cutter, angles, order, &mut p) };
    (st, p)
}

#[track_caller]
fn close3(what: &str, a: [f64; 3], b: [f64; 3], tol: f64) {
    for k in 0..3 {
        close(&format!("{what}[{k}]"), a[k], b[k], tol, 1.0);
    }
}

/// A slanted line on the torus (R = 40, r = 15): neither a parallel nor a meridian, so every
/// rate is non-zero.
fn torus_line() -> *mut StrakeCurve {
    uv_line([0.2, 2.6], [0.9, 3.9])
}

const TS: [f64; 5] = [0.0, 0.2, 0.45, 0.7, 1.0];

// A host callback giving fourth order (the C-ABI torus) gives what strake's own analytic torus
// gives, through every function of the area, to round-off; one point and whole path agree.
#[test]
fn high_callback_torus_agrees_with_the_analytic_torus() {
    let host = torus_host(40.0, 15.0);
    let hs = high_surface(&host, 4);
    let ns = own_surface(analytic_torus(40.0, 15.0));
    let c = torus_line();
    let n = TS.len();
    for (s, label) in [(hs, "host"), (ns, "analytic")] {
        let _ = label;
        let mut frames = vec![sentinel(); n];
        let mut rates = vec![sentinel_rates(); n];
        // SAFETY: live handles, arrays of n elements.
        let st = unsafe {
            strake_invariant_rates_path(
                s,
                c,
                TS.as_ptr(),
                n,
                frames.as_mut_ptr(),
                rates.as_mut_ptr(),
            )
        };
        assert_eq!(st, OK, "{}", message());
        let mut pts = vec![sentinel_point(); n];
        // SAFETY: as above.
        let st = unsafe {
            strake_centre_path_at(
                s,
                c,
                TS.as_ptr(),
                n,
                AGAINST,
                &toroidal(),
                &ANG,
                4,
                pts.as_mut_ptr(),
            )
        };
        assert_eq!(st, OK, "{}", message());
        for i in 0..n {
            // One point = the same sample of the whole path, bit for bit.
            let mut f1 = sentinel();
            let mut r1 = sentinel_rates();
            // SAFETY: live handles, valid outputs.
            let st = unsafe { strake_invariant_rates_at(s, c, TS[i], &mut f1, &mut r1) };
            assert_eq!(st, OK, "{}", message());
            assert_eq!((f1, r1), (frames[i], rates[i]));
            assert_eq!(f1, frame_at(s, c, TS[i]));
            let (st, p1) = centre_at(s, c, TS[i], AGAINST, &toroidal(), &ANG, 4);
            assert_eq!(st, OK, "{}", message());
            assert_eq!(p1, pts[i]);
            assert_eq!(p1.order, 4);
            assert_eq!(p1.curve_param, TS[i]);
        }
    }
    // Host against analytic: the same formulas, the same derivatives up to rounding of the
    // callback's arithmetic.
    for &t in &TS {
        let (mut fa, mut ra, mut fb, mut rb) =
            (sentinel(), sentinel_rates(), sentinel(), sentinel_rates());
        // SAFETY: live handles, valid outputs.
        unsafe {
            assert_eq!(strake_invariant_rates_at(hs, c, t, &mut fa, &mut ra), OK);
            assert_eq!(strake_invariant_rates_at(ns, c, t, &mut fb, &mut rb), OK);
        }
        let scale = 1e-4; // rates here are of order 1e-4 / mm^2
        close(
            "dkn/ds",
            ra.normal_curvature_rate,
            rb.normal_curvature_rate,
            1e-10,
            scale,
        );
        close(
            "dkg/ds",
            ra.geodesic_curvature_rate,
            rb.geodesic_curvature_rate,
            1e-10,
            scale,
        );
        close(
            "dtg/ds",
            ra.geodesic_torsion_rate,
            rb.geodesic_torsion_rate,
            1e-10,
            scale,
        );
        close("dk/ds", ra.curvature_rate, rb.curvature_rate, 1e-10, scale);
        assert!(rb.normal_curvature_rate.abs() > 1e-7, "{rb:?}");
        assert!(rb.geodesic_torsion_rate.abs() > 1e-7, "{rb:?}");
        let (_, pa) = centre_at(hs, c, t, AGAINST, &toroidal(), &ANG, 4);
        let (_, pb) = centre_at(ns, c, t, AGAINST, &toroidal(), &ANG, 4);
        close3("centre", pa.centre, pb.centre, 1e-12);
        close3("tip", pa.tip, pb.tip, 1e-12);
        close3("axis", pa.axis, pb.axis, 1e-12);
        close3("tangent", pa.tangent, pb.tangent, 1e-12);
        close("speed ratio", pa.speed_ratio, pb.speed_ratio, 1e-12, 1.0);
        close("curvature", pa.curvature, pb.curvature, 1e-10, 1e-2);
        close(
            "curvature rate",
            pa.curvature_rate,
            pb.curvature_rate,
            1e-8,
            1e-4,
        );
        close("torsion", pa.torsion, pb.torsion, 1e-8, 1e-2);
        close("jerk figure", pa.jerk_figure, pb.jerk_figure, 1e-8, 1e-4);
        close("axis rate", pa.axis_rate, pb.axis_rate, 1e-10, 1e-2);
    }
    assert_eq!(host.asked.load(std::sync::atomic::Ordering::Relaxed), 4);
    // The C results are those of the Rust API on the same surface.
    let rs = analytic_torus(40.0, 15.0);
    let rc =
        strake::NurbsCurve::<2>::new(1, &[0.0, 0.0, 1.0, 1.0], &[[0.2, 2.6], [0.9, 3.9]], None)
            .unwrap();
    let (rf, rr) = CurveOnSurface::new(&rs, &rc)
        .frame_with_rates(0.45, &mut Hints::default())
        .unwrap();
    let (mut f, mut r) = (sentinel(), sentinel_rates());
    // SAFETY: live handles, valid outputs.
    assert_eq!(
        unsafe { strake_invariant_rates_at(ns, c, 0.45, &mut f, &mut r) },
        OK
    );
    assert_eq!(f, StrakeFrame::new(0.45, &rf));
    assert_eq!(r.normal_curvature_rate, rr.normal_curvature);
    assert_eq!(r.geodesic_curvature_rate, rr.geodesic_curvature);
    assert_eq!(r.geodesic_torsion_rate, rr.geodesic_torsion);
    assert_eq!(r.curvature_rate, rr.space_curvature);
    free(hs, c);
    // SAFETY: a handle made above, freed once.
    unsafe { strake_surface_free(ns) };
}

// Closed form (circle geometry): a ball of radius r = 10 inside a cylinder of radius
// rho = 12, running around a circle of the cylinder, has its centre on a circle of radius
// rho - r = 2: speed ratio 2/12, curvature 1/2, no rate of change, no torsion; the
// acceleration limit a = 2000 mm/s^2 allows sqrt(a (rho - r)) = 63.2 mm/s on the centre path
// (the contact path's curvature 1/12 would allow sqrt(12 a) = 154.9 mm/s: issue 12's
// example). Against a helix of the cylinder: a helix of radius 2 and the same pitch.
#[test]
fn ball_inside_a_cylinder_runs_its_centre_on_radius_rho_minus_r() {
    let s = own_surface(analytic_cylinder(12.0, -1.0, 30.0));
    // N points outward: a tool inside is against the normal.
    let circle = uv_line([0.0, 1.0], [3.0, 1.0]);
    let (st, p) = centre_at(s, circle, 0.4, AGAINST, &ball(10.0), &UPRIGHT, 4);
    assert_eq!(st, OK, "{}", message());
    close("speed ratio", p.speed_ratio, 2.0 / 12.0, 1e-13, 1.0);
    close("curvature", p.curvature, 0.5, 1e-12, 1.0);
    assert!(p.curvature_rate.abs() < 1e-10, "{p:?}");
    assert!(p.torsion.abs() < 1e-10, "{p:?}");
    // |d3 CL / ds_c^3| of a circle: kappa^2.
    close("jerk figure", p.jerk_figure, 0.25, 1e-10, 1.0);
    let radial = (p.centre[0].powi(2) + p.centre[1].powi(2)).sqrt();
    close("centre radius", radial, 2.0, 1e-13, 1.0);
    // The tip, r below the centre along the axis, is the contact point on the wall.
    close("tip radius", p.tip[0].hypot(p.tip[1]), 12.0, 1e-13, 1.0);
    // The axis of an upright ball is the tool-side normal: toward the cylinder's axis.
    close3(
        "axis",
        p.axis,
        [-(0.4f64 * 3.0).cos(), -(0.4f64 * 3.0).sin(), 0.0],
        1e-13,
    );
    let limits = StrakeCentreFeedLimits {
        feed: 500.0,
        max_acceleration: 2000.0,
        max_jerk: 0.0,
        max_angular_speed: 0.0,
    };
    let mut f = sentinel_feed();
    // SAFETY: valid values.
    assert_eq!(unsafe { strake_centre_feed(&p, &limits, &mut f) }, OK);
    close("feed", f.feed, (2000.0f64 * 2.0).sqrt(), 1e-12, 1.0);
    assert_eq!(f.bound, StrakeFeedBound::Acceleration as u32);
    assert!(f.jerk_feed.is_infinite() && f.angular_feed.is_infinite());
    close("contact feed", f.contact_feed, f.feed * 6.0, 1e-12, 1.0);
    // The old contact-path figure for comparison.
    let frame = frame_at(s, circle, 0.4);
    let old = StrakeFeedLimits {
        feed: 500.0,
        max_acceleration: 2000.0,
        max_jerk: 0.0,
    };
    let mut contact = S;
    // SAFETY: valid values.
    assert_eq!(unsafe { strake_check_feed(&frame, &old, &mut contact) }, OK);
    close(
        "contact-path figure",
        contact,
        (2000.0f64 * 12.0).sqrt(),
        1e-12,
        1.0,
    );
    assert!(contact > 2.4 * f.feed);
    // Jerk limit: on a circle of radius 2 at v, jerk = v^3 / 4.
    let jl = StrakeCentreFeedLimits {
        max_jerk: 1.0e5,
        max_acceleration: 1e9,
        ..limits
    };
    // SAFETY: valid values.
    assert_eq!(unsafe { strake_centre_feed(&p, &jl, &mut f) }, OK);
    close("jerk feed", f.feed, (4.0e5f64).cbrt(), 1e-10, 1.0);
    assert_eq!(f.bound, StrakeFeedBound::Jerk as u32);
    // Helix: (u, v) = (3t, 20t) on radius 12, ball r = 4: the centre runs a helix of radius 8
    // and the same pitch; curvature a / (a^2 + b^2) with a = 8, b = dz/du = 20/3.
    let helix = uv_line([0.0, 0.0], [3.0, 20.0]);
    let ts = [0.1, 0.5, 0.9];
    let mut pts = vec![sentinel_point(); 3];
    // SAFETY: live handles, arrays of 3.
    let st = unsafe {
        strake_centre_path_at(
            s,
            helix,
            ts.as_ptr(),
            3,
            AGAINST,
            &ball(4.0),
            &UPRIGHT,
            4,
            pts.as_mut_ptr(),
        )
    };
    assert_eq!(st, OK, "{}", message());
    let (a, b) = (8.0f64, 20.0f64 / 3.0);
    for p in &pts {
        close(
            "helix curvature",
            p.curvature,
            a / (a * a + b * b),
            1e-12,
            1.0,
        );
        close(
            "helix torsion",
            p.torsion.abs(),
            b / (a * a + b * b),
            1e-10,
            1.0,
        );
        assert!(p.curvature_rate.abs() < 1e-10);
        let ratio = (a * a + b * b).sqrt() / (12.0f64 * 12.0 + b * b).sqrt();
        close("helix speed ratio", p.speed_ratio, ratio, 1e-13, 1.0);
    }
    let mut feeds = vec![sentinel_feed(); 3];
    // SAFETY: arrays of 3.
    let st = unsafe { strake_centre_feed_path(pts.as_ptr(), 3, &limits, feeds.as_mut_ptr()) };
    assert_eq!(st, OK, "{}", message());
    for (p, f) in pts.iter().zip(&feeds) {
        let mut one = sentinel_feed();
        // SAFETY: valid values.
        assert_eq!(unsafe { strake_centre_feed(p, &limits, &mut one) }, OK);
        assert_eq!(&one, f);
        close(
            "helix feed",
            f.feed,
            (2000.0 / p.curvature).sqrt(),
            1e-12,
            1.0,
        );
    }
    // SAFETY: handles made above, freed once.
    unsafe { strake_curve_free(helix) };
    free(s, circle);
}

// A ball larger than the concave radius folds the centre path: its own status, the first
// sample and the count named, nothing written.
#[test]
fn a_folding_centre_path_is_refused_naming_the_first_sample_and_the_count() {
    let s = own_surface(analytic_cylinder(12.0, -1.0, 30.0));
    let c = uv_line([0.0, 1.0], [3.0, 1.0]);
    let (st, p) = centre_at(s, c, 0.3, AGAINST, &ball(13.0), &UPRIGHT, 3);
    expect(
        st,
        FOLDS,
        &["strake_centre_point_at", "folds back", "t = 0.3"],
    );
    assert_eq!(p, sentinel_point());
    // Outside, the same ball is fine.
    assert_eq!(centre_at(s, c, 0.3, ALONG, &ball(13.0), &UPRIGHT, 3).0, OK);
    let mut pts = vec![sentinel_point(); TS.len()];
    // SAFETY: live handles, arrays of TS.len().
    let st = unsafe {
        strake_centre_path_at(
            s,
            c,
            TS.as_ptr(),
            TS.len(),
            AGAINST,
            &ball(13.0),
            &UPRIGHT,
            4,
            pts.as_mut_ptr(),
        )
    };
    expect(
        st,
        FOLDS,
        &[
            "strake_centre_path_at",
            "sample 0",
            "5 sample(s) of the call fold",
        ],
    );
    assert!(pts.iter().all(|p| *p == sentinel_point()));
    free(s, c);
}

// A host surface of the old constructor (second order) gets ORDER_UNAVAILABLE from exactly
// the calls that need third or fourth order, naming the call and the orders; its frames are
// unaffected. A host declaring order 3 gets it only where order 4 is asked for.
#[test]
fn second_order_hosts_get_order_unavailable_from_exactly_the_calls_that_need_more() {
    let mut rho = 12.0f64;
    let old = surface(
        Some(cylinder),
        (&mut rho as *mut f64).cast(),
        (0.0, 6.3),
        (-1.0, 30.0),
        0,
    );
    let c = uv_line([0.0, 1.0], [3.0, 1.0]);
    let f = frame_at(old, c, 0.5); // second order: fine
    assert!(f.normal_curvature.is_finite());
    let (mut fr, mut rr) = (sentinel(), sentinel_rates());
    // SAFETY: live handles, valid outputs.
    let st = unsafe { strake_invariant_rates_at(old, c, 0.5, &mut fr, &mut rr) };
    expect(
        st,
        OU,
        &["strake_invariant_rates_at", "surface", "order 3", "order 2"],
    );
    assert_eq!((fr, rr), (sentinel(), sentinel_rates()));
    let (mut frs, mut rrs) = (vec![sentinel(); 2], vec![sentinel_rates(); 2]);
    let ts = [0.1, 0.2];
    // SAFETY: arrays of 2.
    let st = unsafe {
        strake_invariant_rates_path(old, c, ts.as_ptr(), 2, frs.as_mut_ptr(), rrs.as_mut_ptr())
    };
    expect(
        st,
        OU,
        &["strake_invariant_rates_path", "sample 0", "order 3"],
    );
    assert!(frs.iter().all(|f| *f == sentinel()) && rrs.iter().all(|r| *r == sentinel_rates()));
    for order in [3, 4] {
        let (st, p) = centre_at(old, c, 0.5, AGAINST, &ball(4.0), &UPRIGHT, order);
        expect(
            st,
            OU,
            &["strake_centre_point_at", &format!("order {order}")],
        );
        assert_eq!(p, sentinel_point());
        let mut pts = vec![sentinel_point(); 2];
        // SAFETY: arrays of 2.
        let st = unsafe {
            strake_centre_path_at(
                old,
                c,
                ts.as_ptr(),
                2,
                AGAINST,
                &ball(4.0),
                &UPRIGHT,
                order,
                pts.as_mut_ptr(),
            )
        };
        expect(
            st,
            OU,
            &["strake_centre_path_at", &format!("order {order}")],
        );
    }
    // A curve from the old curve callback is named as the source that falls short.
    // (ffi_util has none with derivatives in t beyond second order.)
    free(old, c);

    // Declared order 3: rates and the centre path's curvature work, order 4 is refused.
    let host = torus_host(40.0, 15.0);
    let s3 = high_surface(&host, 3);
    let c = torus_line();
    // SAFETY: live handles, valid outputs.
    assert_eq!(
        unsafe { strake_invariant_rates_at(s3, c, 0.5, &mut fr, &mut rr) },
        OK,
        "{}",
        message()
    );
    let (st, p3) = centre_at(s3, c, 0.5, ALONG, &ball(2.0), &ANG, 3);
    assert_eq!(st, OK, "{}", message());
    assert_eq!(p3.order, 3);
    assert_eq!(
        (p3.curvature_rate, p3.torsion, p3.jerk_figure),
        (0.0, 0.0, 0.0)
    );
    let (st, p) = centre_at(s3, c, 0.5, ALONG, &ball(2.0), &ANG, 4);
    expect(
        st,
        OU,
        &["strake_centre_point_at", "order 4", "order 3 at most"],
    );
    assert_eq!(p, sentinel_point());
    assert_eq!(host.asked.load(std::sync::atomic::Ordering::Relaxed), 3);
    // A point of order 3 with a jerk limit: refused, not a feed without the jerk rule.
    let jl = StrakeCentreFeedLimits {
        feed: 100.0,
        max_acceleration: 1000.0,
        max_jerk: 1e4,
        max_angular_speed: 0.0,
    };
    let mut out = sentinel_feed();
    // SAFETY: valid values.
    let st = unsafe { strake_centre_feed(&p3, &jl, &mut out) };
    expect(st, OU, &["strake_centre_feed", "order 4"]);
    assert_eq!(out, sentinel_feed());
    let no_jerk = StrakeCentreFeedLimits {
        max_jerk: 0.0,
        ..jl
    };
    // SAFETY: valid values.
    assert_eq!(unsafe { strake_centre_feed(&p3, &no_jerk, &mut out) }, OK);
    free(s3, c);
}

// The high-order constructor: every argument checked, the host's failure code and a
// non-finite third derivative reported by name.
#[test]
fn high_callback_constructor_and_callback_failures() {
    let host = torus_host(40.0, 15.0);
    let ud = &host as *const TorusHost as *mut c_void;
    let mut out = ptr::null_mut::<StrakeSurface>();
    // SAFETY (each call): valid or NULL pointers, as each case states.
    unsafe {
        let st = strake_surface_from_high_callback(None, ud, 4, 0.0, 1.0, 0.0, 1.0, 0, &mut out);
        expect(st, NP, &["strake_surface_from_high_callback", "`f`"]);
        let st = strake_surface_from_high_callback(
            Some(torus_cb),
            ud,
            4,
            0.0,
            1.0,
            0.0,
            1.0,
            0,
            ptr::null_mut(),
        );
        expect(st, NP, &["`out`"]);
        for bad in [0, 2, 5] {
            let st = strake_surface_from_high_callback(
                Some(torus_cb),
                ud,
                bad,
                0.0,
                1.0,
                0.0,
                1.0,
                0,
                &mut out,
            );
            expect(st, IA, &[&format!("`max_order` = {bad}")]);
        }
        let st = strake_surface_from_high_callback(
            Some(torus_cb),
            ud,
            3,
            1.0,
            0.0,
            0.0,
            1.0,
            0,
            &mut out,
        );
        expect(st, IA, &["u range"]);
        let st = strake_surface_from_high_callback(
            Some(torus_cb),
            ud,
            3,
            0.0,
            f64::NAN,
            0.0,
            1.0,
            0,
            &mut out,
        );
        expect(st, NF, &["u_max"]);
        let st = strake_surface_from_high_callback(
            Some(torus_cb),
            ud,
            3,
            0.0,
            1.0,
            0.0,
            1.0,
            2,
            &mut out,
        );
        expect(st, IA, &["`flip_normal` = 2"]);
    }
    assert!(out.is_null());
    let failing = TorusHost {
        fail: -5,
        ..torus_host(40.0, 15.0)
    };
    let s = high_surface(&failing, 4);
    let c = torus_line();
    let (mut f, mut r) = (sentinel(), sentinel_rates());
    // SAFETY: live handles, valid outputs.
    let st = unsafe { strake_invariant_rates_at(s, c, 0.5, &mut f, &mut r) };
    expect(st, StrakeStatus::SurfaceCallbackFailed, &["code -5"]);
    assert_eq!(strake_last_callback_code(), -5);
    free(s, c);
    let nan = TorusHost {
        nan_suuv: true,
        ..torus_host(40.0, 15.0)
    };
    let s = high_surface(&nan, 4);
    let c = torus_line();
    assert!(frame_at(s, c, 0.5).speed > 0.0); // second order is clean
    // SAFETY: live handles, valid outputs.
    let st = unsafe { strake_invariant_rates_at(s, c, 0.5, &mut f, &mut r) };
    expect(st, NF, &["Suuv"]);
    assert_eq!(r, sentinel_rates());
    free(s, c);
}

// Every NULL pointer and every bad argument of the area's functions, with the message naming
// it and the outputs untouched.
#[test]
fn null_pointers_and_bad_arguments_are_named() {
    let s = own_surface(analytic_torus(40.0, 15.0));
    let c = torus_line();
    let n = ptr::null::<StrakeSurface>();
    let nc = ptr::null::<StrakeCurve>();
    let (mut f, mut r) = (sentinel(), sentinel_rates());
    let ts = [0.2, 0.4];
    let (mut fs, mut rs) = (vec![sentinel(); 2], vec![sentinel_rates(); 2]);
    let mut pts = vec![sentinel_point(); 2];
    let mut p = sentinel_point();
    let cut = ball(2.0);
    // SAFETY (each call): NULL where the case says, valid pointers otherwise.
    unsafe {
        // strake_invariant_rates_at
        expect(
            strake_invariant_rates_at(n, c, 0.5, &mut f, &mut r),
            NP,
            &["`surface`"],
        );
        expect(
            strake_invariant_rates_at(s, nc, 0.5, &mut f, &mut r),
            NP,
            &["`curve`"],
        );
        expect(
            strake_invariant_rates_at(s, c, 0.5, ptr::null_mut(), &mut r),
            NP,
            &["`frame_out`"],
        );
        expect(
            strake_invariant_rates_at(s, c, 0.5, &mut f, ptr::null_mut()),
            NP,
            &["`rates_out`"],
        );
        expect(
            strake_invariant_rates_at(s, c, 1.5, &mut f, &mut r),
            StrakeStatus::OutOfDomain,
            &["t"],
        );
        expect(
            strake_invariant_rates_at(s, c, f64::NAN, &mut f, &mut r),
            NF,
            &["t"],
        );
        assert_eq!((f, r), (sentinel(), sentinel_rates()));
        // strake_invariant_rates_path
        let (fp, rp) = (fs.as_mut_ptr(), rs.as_mut_ptr());
        expect(
            strake_invariant_rates_path(n, c, ts.as_ptr(), 2, fp, rp),
            NP,
            &["`surface`"],
        );
        expect(
            strake_invariant_rates_path(s, nc, ts.as_ptr(), 2, fp, rp),
            NP,
            &["`curve`"],
        );
        expect(
            strake_invariant_rates_path(s, c, ptr::null(), 2, fp, rp),
            NP,
            &["`ts`"],
        );
        expect(
            strake_invariant_rates_path(s, c, ts.as_ptr(), 2, ptr::null_mut(), rp),
            NP,
            &["`frames_out`"],
        );
        expect(
            strake_invariant_rates_path(s, c, ts.as_ptr(), 2, fp, ptr::null_mut()),
            NP,
            &["`rates_out`"],
        );
        expect(
            strake_invariant_rates_path(s, c, ts.as_ptr(), 0, fp, rp),
            IA,
            &["`count` is 0"],
        );
        let bad_ts = [0.2, 1.7];
        expect(
            strake_invariant_rates_path(s, c, bad_ts.as_ptr(), 2, fp, rp),
            StrakeStatus::OutOfDomain,
            &["sample 1"],
        );
        assert!(fs.iter().all(|x| *x == sentinel()) && rs.iter().all(|x| *x == sentinel_rates()));
        // strake_centre_point_at
        let pp: *mut StrakeCentrePoint = &mut p;
        expect(
            strake_centre_point_at(n, c, 0.5, ALONG, &cut, &ANG, 4, pp),
            NP,
            &["`surface`"],
        );
        expect(
            strake_centre_point_at(s, nc, 0.5, ALONG, &cut, &ANG, 4, pp),
            NP,
            &["`curve`"],
        );
        expect(
            strake_centre_point_at(s, c, 0.5, ALONG, ptr::null(), &ANG, 4, pp),
            NP,
            &["`cutter`"],
        );
        expect(
            strake_centre_point_at(s, c, 0.5, ALONG, &cut, ptr::null(), 4, pp),
            NP,
            &["`angles`"],
        );
        expect(
            strake_centre_point_at(s, c, 0.5, ALONG, &cut, &ANG, 4, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        expect(
            strake_centre_point_at(s, c, 0.5, 2, &cut, &ANG, 4, pp),
            IA,
            &["`tool_side` = 2"],
        );
        for order in [0, 2, 5] {
            expect(
                strake_centre_point_at(s, c, 0.5, ALONG, &cut, &ANG, order, pp),
                IA,
                &[&format!("`order` = {order}")],
            );
        }
        let bad_kind = StrakeCutter { kind: 9, ..cut };
        expect(
            strake_centre_point_at(s, c, 0.5, ALONG, &bad_kind, &ANG, 4, pp),
            IA,
            &["`cutter->kind` = 9"],
        );
        let zero = ball(0.0);
        expect(
            strake_centre_point_at(s, c, 0.5, ALONG, &zero, &ANG, 4, pp),
            IA,
            &["radius"],
        );
        let steep = StrakeToolAngles {
            lead: 2.0,
            tilt: 0.0,
        };
        expect(
            strake_centre_point_at(s, c, 0.5, ALONG, &cut, &steep, 4, pp),
            IA,
            &["lead"],
        );
        expect(
            strake_centre_point_at(s, c, -0.5, ALONG, &cut, &ANG, 4, pp),
            StrakeStatus::OutOfDomain,
            &["t"],
        );
        assert_eq!(p, sentinel_point());
        // strake_centre_path_at
        let ptsp = pts.as_mut_ptr();
        let tp = ts.as_ptr();
        expect(
            strake_centre_path_at(n, c, tp, 2, ALONG, &cut, &ANG, 4, ptsp),
            NP,
            &["`surface`"],
        );
        expect(
            strake_centre_path_at(s, nc, tp, 2, ALONG, &cut, &ANG, 4, ptsp),
            NP,
            &["`curve`"],
        );
        expect(
            strake_centre_path_at(s, c, ptr::null(), 2, ALONG, &cut, &ANG, 4, ptsp),
            NP,
            &["`ts`"],
        );
        expect(
            strake_centre_path_at(s, c, tp, 2, ALONG, ptr::null(), &ANG, 4, ptsp),
            NP,
            &["`cutter`"],
        );
        expect(
            strake_centre_path_at(s, c, tp, 2, ALONG, &cut, ptr::null(), 4, ptsp),
            NP,
            &["`angles`"],
        );
        expect(
            strake_centre_path_at(s, c, tp, 2, ALONG, &cut, &ANG, 4, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        expect(
            strake_centre_path_at(s, c, tp, 0, ALONG, &cut, &ANG, 4, ptsp),
            IA,
            &["`count` is 0"],
        );
        expect(
            strake_centre_path_at(s, c, tp, 2, 7, &cut, &ANG, 4, ptsp),
            IA,
            &["`tool_side` = 7"],
        );
        expect(
            strake_centre_path_at(s, c, tp, 2, ALONG, &cut, &ANG, 1, ptsp),
            IA,
            &["`order` = 1"],
        );
        expect(
            strake_centre_path_at(s, c, bad_ts.as_ptr(), 2, ALONG, &cut, &ANG, 4, ptsp),
            StrakeStatus::OutOfDomain,
            &["sample 1"],
        );
        assert!(pts.iter().all(|x| *x == sentinel_point()));
    }
    // The feed functions.
    let (st, good) = centre_at(s, c, 0.5, ALONG, &cut, &ANG, 4);
    assert_eq!(st, OK, "{}", message());
    let limits = StrakeCentreFeedLimits {
        feed: 100.0,
        max_acceleration: 1000.0,
        max_jerk: 1e5,
        max_angular_speed: 2.0,
    };
    let mut out = sentinel_feed();
    let mut outs = vec![sentinel_feed(); 2];
    let two = [good, good];
    // SAFETY (each call): NULL where the case says, valid pointers otherwise.
    unsafe {
        assert_eq!(strake_centre_feed(&good, &limits, &mut out), OK);
        assert!(out.feed > 0.0 && out.feed <= 100.0);
        let mut again = sentinel_feed();
        expect(
            strake_centre_feed(ptr::null(), &limits, &mut again),
            NP,
            &["`point`"],
        );
        expect(
            strake_centre_feed(&good, ptr::null(), &mut again),
            NP,
            &["`limits`"],
        );
        expect(
            strake_centre_feed(&good, &limits, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        let op = outs.as_mut_ptr();
        expect(
            strake_centre_feed_path(ptr::null(), 2, &limits, op),
            NP,
            &["`points`"],
        );
        expect(
            strake_centre_feed_path(two.as_ptr(), 2, ptr::null(), op),
            NP,
            &["`limits`"],
        );
        expect(
            strake_centre_feed_path(two.as_ptr(), 2, &limits, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        expect(
            strake_centre_feed_path(two.as_ptr(), 0, &limits, op),
            IA,
            &["`count` is 0"],
        );
        // Limits of zero, NaN, negative: named.
        let cases: [(StrakeCentreFeedLimits, &str); 7] = [
            (
                StrakeCentreFeedLimits {
                    feed: 0.0,
                    ..limits
                },
                "limits->feed = 0",
            ),
            (
                StrakeCentreFeedLimits {
                    feed: f64::NAN,
                    ..limits
                },
                "limits->feed = NaN",
            ),
            (
                StrakeCentreFeedLimits {
                    max_acceleration: 0.0,
                    ..limits
                },
                "limits->max_acceleration = 0",
            ),
            (
                StrakeCentreFeedLimits {
                    max_acceleration: f64::INFINITY,
                    ..limits
                },
                "limits->max_acceleration = inf",
            ),
            (
                StrakeCentreFeedLimits {
                    max_jerk: f64::NAN,
                    ..limits
                },
                "limits->max_jerk = NaN",
            ),
            (
                StrakeCentreFeedLimits {
                    max_jerk: -1.0,
                    ..limits
                },
                "limits->max_jerk = -1",
            ),
            (
                StrakeCentreFeedLimits {
                    max_angular_speed: -2.0,
                    ..limits
                },
                "limits->max_angular_speed = -2",
            ),
        ];
        for (l, needle) in cases {
            expect(
                strake_centre_feed(&good, &l, &mut again),
                IA,
                &["strake_centre_feed", needle],
            );
            expect(
                strake_centre_feed_path(two.as_ptr(), 2, &l, op),
                IA,
                &[needle],
            );
        }
        // Bad points: named field, and the sample in the path version.
        let bad: [(StrakeCentrePoint, StrakeStatus, &str); 5] = [
            (
                StrakeCentrePoint {
                    curvature: f64::NAN,
                    ..good
                },
                NF,
                "point.curvature",
            ),
            (
                StrakeCentrePoint { order: 5, ..good },
                IA,
                "point.order = 5",
            ),
            (
                StrakeCentrePoint {
                    speed_ratio: 0.0,
                    ..good
                },
                IA,
                "point.speed_ratio = 0",
            ),
            (
                StrakeCentrePoint {
                    axis_rate: -1.0,
                    ..good
                },
                IA,
                "point.axis_rate = -1",
            ),
            (
                StrakeCentrePoint {
                    tangent: [2.0, 0.0, 0.0],
                    ..good
                },
                IA,
                "point.tangent",
            ),
        ];
        for (b, status, needle) in bad {
            expect(
                strake_centre_feed(&b, &limits, &mut again),
                status,
                &[needle],
            );
            let pair = [good, b];
            expect(
                strake_centre_feed_path(pair.as_ptr(), 2, &limits, op),
                status,
                &["strake_centre_feed_path", "sample 1", needle],
            );
        }
        assert_eq!(again, sentinel_feed());
        assert!(outs.iter().all(|x| *x == sentinel_feed()));
    }
    free(s, c);
}

/// Chord-tolerance samples through the C ABI (contact rule, or judged on the centre path of a
/// cutter when `centre` is given).
fn chordal(
    s: *const StrakeSurface,
    c: *const StrakeCurve,
    tol: f64,
    centre: Option<(u32, StrakeCutter, StrakeToolAngles)>,
) -> Vec<StrakeSample> {
    let mut count = 0usize;
    let mut buf = vec![StrakeSample::default(); 4000];
    // SAFETY: live handles, a buffer of 4000 samples.
    let st = unsafe {
        match centre {
            None => {
                strake_sample_chordal(s, c, tol, 0.0, 1e-12, buf.as_mut_ptr(), 4000, &mut count)
            }
            Some((side, cut, ang)) => strake_sample_chordal_centre(
                s,
                c,
                tol,
                0.0,
                1e-12,
                side,
                &cut,
                &ang,
                buf.as_mut_ptr(),
                4000,
                &mut count,
            ),
        }
    };
    assert_eq!(st, OK, "{}", message());
    buf.truncate(count);
    buf
}

/// Largest deviation of the centre path from the chords between the centre points of
/// consecutive samples, brute force: 64 centre points per interval (strake_centre_path_at).
fn centre_chord_error(
    s: *const StrakeSurface,
    c: *const StrakeCurve,
    samples: &[StrakeSample],
    side: u32,
    cut: &StrakeCutter,
    ang: &StrakeToolAngles,
) -> f64 {
    let ts: Vec<f64> = samples.iter().map(|x| x.frame.curve_param).collect();
    let at = |ts: &[f64]| -> Vec<StrakeCentrePoint> {
        let mut out = vec![sentinel_point(); ts.len()];
        // SAFETY: live handles, arrays of ts.len().
        let st = unsafe {
            strake_centre_path_at(
                s,
                c,
                ts.as_ptr(),
                ts.len(),
                side,
                cut,
                ang,
                3,
                out.as_mut_ptr(),
            )
        };
        assert_eq!(st, OK, "{}", message());
        out
    };
    let ends = at(&ts);
    let mut worst: f64 = 0.0;
    for k in 0..ts.len() - 1 {
        let inner: Vec<f64> = (1..64)
            .map(|j| ts[k] + (ts[k + 1] - ts[k]) * j as f64 / 64.0)
            .collect();
        let (a, b) = (ends[k].centre, ends[k + 1].centre);
        let ab = [b[0] - a[0], b[1] - a[1], b[2] - a[2]];
        let len2 = ab.iter().map(|x| x * x).sum::<f64>();
        for p in at(&inner) {
            let ax = [p.centre[0] - a[0], p.centre[1] - a[1], p.centre[2] - a[2]];
            let f = (ax.iter().zip(&ab).map(|(x, y)| x * y).sum::<f64>() / len2).clamp(0.0, 1.0);
            let d = (0..3)
                .map(|i| (ax[i] - ab[i] * f).powi(2))
                .sum::<f64>()
                .sqrt();
            worst = worst.max(d);
        }
    }
    worst
}

// Closed form (circle geometry): on a circle of radius R a chord spanning the angle dphi
// deviates by R (1 - cos(dphi/2)). A ball of radius 10 around a circle of a cylinder of
// radius 12 runs its centre on radius 2 inside and 22 outside. Judged on the centre path, the
// centre chords stay within the tolerance; judged on the contact path they exceed it outside
// (by about 22/12) and are finer than needed inside. The sample counts are compared with the
// least count the exact chord rule allows.
#[test]
fn chordal_sampling_judged_on_the_centre_path_of_a_ball_in_and_on_a_cylinder() {
    let s = own_surface(analytic_cylinder(12.0, -1.0, 30.0));
    let c = uv_line([0.0, 1.0], [3.0, 1.0]); // u = 3t: the angle around the axis
    let tol = 0.01;
    let contact = chordal(s, c, tol, None);
    let deviation = |samples: &[StrakeSample], radius: f64| -> f64 {
        samples
            .windows(2)
            .map(|w| {
                let dphi = 3.0 * (w[1].frame.curve_param - w[0].frame.curve_param);
                radius * (1.0 - (0.5 * dphi).cos())
            })
            .fold(0.0, f64::max)
    };
    // The least count: steps of at most 2 acos(1 - tol/R) over the angle 3.
    let least = |radius: f64| (3.0 / (2.0 * (1.0 - tol / radius).acos())).ceil() as usize + 1;
    assert!(deviation(&contact, 12.0) <= tol * (1.0 + 1e-9));
    for (side, radius) in [(AGAINST, 2.0), (ALONG, 22.0)] {
        let judged = chordal(s, c, tol, Some((side, ball(10.0), UPRIGHT)));
        let dev = deviation(&judged, radius);
        assert!(
            dev <= tol * (1.0 + 1e-9),
            "centre chord error {dev} above {tol}"
        );
        let n = judged.len();
        assert!(n >= least(radius) && n <= least(radius) + least(radius) / 5 + 1);
        let brute = centre_chord_error(s, c, &judged, side, &ball(10.0), &UPRIGHT);
        assert!(
            brute <= tol * (1.0 + 1e-6),
            "brute-force chord error {brute}"
        );
        close("closed form vs brute force", brute, dev, 2e-3, 1e-6);
        let on_contact = deviation(&contact, radius);
        eprintln!(
            "ball 10 {} a cylinder of radius 12, tolerance {tol}: {n} samples judged on the \
             centre path (least {}), {} on the contact path (centre chord error {on_contact:.5})",
            if side == AGAINST { "inside" } else { "outside" },
            least(radius),
            contact.len()
        );
        if side == AGAINST {
            assert!(n < contact.len());
            assert!(on_contact < tol);
        } else {
            assert!(n > contact.len());
            assert!(on_contact > 1.5 * tol, "{on_contact}");
        }
        // The samples are contact-path samples: the same frames strake_frame_at gives.
        for x in &judged {
            assert_eq!(x.frame, frame_at(s, c, x.frame.curve_param));
        }
    }
    free(s, c);
}

// A toroidal cutter at lead and tilt on a torus: the centre chords, measured by brute force
// between the samples, stay within the tolerance.
#[test]
fn chordal_sampling_on_the_centre_path_of_a_tilted_toroidal_cutter_meets_the_tolerance() {
    let s = own_surface(analytic_torus(40.0, 15.0));
    let c = torus_line();
    let tol = 0.02;
    let judged = chordal(s, c, tol, Some((ALONG, toroidal(), ANG)));
    let brute = centre_chord_error(s, c, &judged, ALONG, &toroidal(), &ANG);
    assert!(brute <= tol * (1.0 + 1e-6), "{brute}");
    assert!(brute > 0.5 * tol, "steps far finer than needed: {brute}");
    let contact = chordal(s, c, tol, None);
    eprintln!(
        "toroidal 3/1 at lead 0.1, tilt 0.05 on a torus 40/15, tolerance {tol}: {} samples on \
         the centre path (chord error {brute:.5}), {} on the contact path",
        judged.len(),
        contact.len()
    );
    free(s, c);
}

// The centre rule's own failures: NULL and bad setup arguments, a second-order host, a
// folding centre path; nothing written but `*count` on BUFFER_TOO_SMALL.
#[test]
fn chordal_centre_sampling_statuses() {
    let s = own_surface(analytic_cylinder(12.0, -1.0, 30.0));
    let c = uv_line([0.0, 1.0], [3.0, 1.0]);
    let mut buf = vec![StrakeSample::default(); 4];
    let mut count = 12345usize;
    let b = ball(10.0);
    // SAFETY (each call): NULL where the case says, valid pointers otherwise.
    unsafe {
        let bp = buf.as_mut_ptr();
        let call = |s,
                    c,
                    side,
                    cut: *const StrakeCutter,
                    ang: *const StrakeToolAngles,
                    cap,
                    count: *mut usize| {
            strake_sample_chordal_centre(s, c, 0.01, 0.0, 1e-12, side, cut, ang, bp, cap, count)
        };
        expect(
            call(ptr::null(), c, AGAINST, &b, &UPRIGHT, 4, &mut count),
            NP,
            &["`surface`"],
        );
        expect(
            call(s, ptr::null(), AGAINST, &b, &UPRIGHT, 4, &mut count),
            NP,
            &["`curve`"],
        );
        expect(
            call(s, c, AGAINST, ptr::null(), &UPRIGHT, 4, &mut count),
            NP,
            &["`cutter`"],
        );
        expect(
            call(s, c, AGAINST, &b, ptr::null(), 4, &mut count),
            NP,
            &["`angles`"],
        );
        expect(
            call(s, c, AGAINST, &b, &UPRIGHT, 4, ptr::null_mut()),
            NP,
            &["`count`"],
        );
        expect(
            call(s, c, 3, &b, &UPRIGHT, 4, &mut count),
            IA,
            &["`tool_side` = 3"],
        );
        expect(
            call(s, c, AGAINST, &ball(-1.0), &UPRIGHT, 4, &mut count),
            IA,
            &["radius"],
        );
        assert_eq!(count, 12345);
        let st = strake_sample_chordal_centre(
            s,
            c,
            f64::NAN,
            0.0,
            1e-12,
            AGAINST,
            &b,
            &UPRIGHT,
            bp,
            4,
            &mut count,
        );
        expect(st, IA, &["chord tolerance"]);
        // Too small a buffer: the count needed, nothing else.
        expect(
            call(s, c, AGAINST, &b, &UPRIGHT, 4, &mut count),
            StrakeStatus::BufferTooSmall,
            &["samples needed"],
        );
        assert!(count > 4);
        assert!(buf.iter().all(|x| *x == StrakeSample::default()));
        // A fold at the first sample.
        expect(
            call(s, c, AGAINST, &ball(13.0), &UPRIGHT, 4, &mut count),
            FOLDS,
            &["strake_sample_chordal_centre", "folds back at sample 0"],
        );
    }
    free(s, c);
    let mut rho = 12.0f64;
    let old = surface(
        Some(cylinder),
        (&mut rho as *mut f64).cast(),
        (0.0, 6.3),
        (-1.0, 30.0),
        0,
    );
    let c = uv_line([0.0, 1.0], [3.0, 1.0]);
    let mut count = 0usize;
    // SAFETY: live handles, a buffer of 4.
    let st = unsafe {
        strake_sample_chordal_centre(
            old,
            c,
            0.01,
            0.0,
            1e-12,
            AGAINST,
            &b,
            &UPRIGHT,
            buf.as_mut_ptr(),
            4,
            &mut count,
        )
    };
    expect(st, OU, &["strake_sample_chordal_centre", "order 3"]);
    free(old, c);
}
