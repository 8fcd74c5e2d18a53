//! The C functions of the checks (gouge, scallop and step-over, feed, fibre, tool axis) and of
//! the path summaries, called as a host would: every status with its message and untouched
//! outputs, NULL for each pointer, closed forms, and agreement with the Rust API on the same
//! frames.

#[path = "support/ffi_util.rs"]
mod ffi_util;

use ffi_util::*;
use std::f64::consts::{FRAC_1_SQRT_2, FRAC_PI_2, PI, TAU};
use std::ptr;
use strake::analytic::{cylinder, plane as plane_surface, sphere as sphere_surface, torus};
use strake::checks::{
    Cutter, FeedLimits, FibreLimits, ToolAngles, ToolSide, cross_path_curvature,
    curvature_limited_feed, extremes, fibre_state, gouge_state, scallop_height,
    scallop_height_approx, step_over_for_scallop, tool_axis, violations,
};
use strake::ffi::*;
use strake::{DarbouxFrame, SurfaceSource};

const OK: StrakeStatus = StrakeStatus::Ok;
const NP: StrakeStatus = StrakeStatus::NullPointer;
const IA: StrakeStatus = StrakeStatus::InvalidArgument;
const ALONG: u32 = StrakeToolSide::AlongNormal as u32;
const AGAINST: u32 = StrakeToolSide::AgainstNormal as u32;

fn own_surface(s: impl SurfaceSource + 'static) -> *mut StrakeSurface {
    Box::into_raw(Box::new(StrakeSurface::new(Box::new(s))))
}

/// The frame at t of a uv line on `s`, through the C ABI, and the same frame for the Rust API.
fn frame_on(
    s: *mut StrakeSurface,
    a: [f64; 2],
    b: [f64; 2],
    t: f64,
) -> (StrakeFrame, DarbouxFrame) {
    let c = uv_line(a, b);
    let f = frame_at(s, c, t);
    // SAFETY: a fresh handle.
    unsafe { strake_curve_free(c) };
    (f, f.to_darboux().expect("a frame from strake converts"))
}

fn ball(radius: f64) -> StrakeCutter {
    StrakeCutter {
        kind: StrakeCutterKind::Ball as u32,
        radius,
        corner_radius: 0.0,
    }
}

const NO_ANGLES: StrakeToolAngles = StrakeToolAngles {
    lead: 0.0,
    tilt: 0.0,
};

fn gouge_sentinel() -> StrakeGougeState {
    StrakeGougeState {
        concave_curvature: -7777.25,
        min_lead: -7777.25,
        gouges: 77,
        ..Default::default()
    }
}

/// strake_check_gouge, checking that `out` is untouched on failure.
fn gouge(
    f: &StrakeFrame,
    side: u32,
    c: &StrakeCutter,
    a: &StrakeToolAngles,
) -> (StrakeStatus, StrakeGougeState) {
    let mut out = gouge_sentinel();
    // SAFETY: valid pointers.
    let st = unsafe { strake_check_gouge(f, side, c, a, &mut out) };
    if st != OK {
        assert_eq!(out, gouge_sentinel(), "out written on failure");
    }
    (st, out)
}

// ---------------------------------------------------------------- frames passed in

// A frame given to a check must be a frame: finite fields (named) and unit vectors (a zeroed
// struct is refused by its tangent).
#[test]
fn frames_passed_in_are_checked() {
    let s = own_surface(plane_surface((-1.0, 1.0), (-1.0, 1.0)));
    let (f, _) = frame_on(s, [0.0, 0.0], [0.5, 0.2], 0.5);
    let limits = StrakeFeedLimits {
        feed: 100.0,
        max_acceleration: 1000.0,
        max_jerk: 0.0,
    };
    let mut v = -1.0;
    let mut bad = f;
    bad.k1 = f64::NAN;
    // SAFETY: valid pointers; the NULLs are what is tested.
    unsafe {
        expect(
            strake_check_feed(&bad, &limits, &mut v),
            StrakeStatus::NonFinite,
            &["strake_check_feed", "frame.k1 = NaN"],
        );
        let mut bad = f;
        bad.point[1] = f64::INFINITY;
        expect(
            strake_check_feed(&bad, &limits, &mut v),
            StrakeStatus::NonFinite,
            &["frame.point.y = inf"],
        );
        let mut bad = f;
        bad.dir2[0] = f64::NAN;
        expect(
            strake_check_feed(&bad, &limits, &mut v),
            StrakeStatus::NonFinite,
            &["frame.dir2 = NaN"],
        );
        expect(
            strake_check_feed(&StrakeFrame::default(), &limits, &mut v),
            IA,
            &["frame.tangent = (0, 0, 0) has length 0", "unit vector"],
        );
        let mut bad = f;
        bad.normal = [0.0, 0.0, 2.0];
        let (st, _) = gouge(&bad, ALONG, &ball(1.0), &NO_ANGLES);
        expect(st, IA, &["strake_check_gouge", "frame.normal", "length 2"]);
        expect(
            strake_check_feed(ptr::null(), &limits, &mut v),
            NP,
            &["`frame`"],
        );
        expect(
            strake_check_feed(&f, ptr::null(), &mut v),
            NP,
            &["`limits`"],
        );
        expect(
            strake_check_feed(&f, &limits, ptr::null_mut()),
            NP,
            &["`out`"],
        );
    }
    assert_eq!(v, -1.0);
    // A frame stored in single precision still passes.
    let mut single = f;
    for x in single.tangent.iter_mut().chain(&mut single.normal) {
        *x = *x as f32 as f64;
    }
    // SAFETY: valid pointers.
    assert_eq!(unsafe { strake_check_feed(&single, &limits, &mut v) }, OK);
    // SAFETY: a fresh handle.
    unsafe { strake_surface_free(s) };
}

// ---------------------------------------------------------------- gouge

// Inside a sphere of radius rho (normal toward the centre, so the tool inside is on the N side):
// a ball-end mill of radius r fits iff r <= rho, whatever its inclination (common practice:
// r k <= 1 for the largest concave curvature); a toroidal cutter (R, r) needs the lead with
// sin(lead) = R/(rho - r), from R/sin(lead) + r <= rho (Vickers & Quan, J. Eng. Ind. 111(1)
// (1989) 22-26). Each C result equals the Rust API's on the same frame.
#[test]
fn gouge_inside_a_sphere() {
    let rho = 10.0;
    let s = own_surface(sphere_surface(rho));
    let (f, df) = frame_on(s, [0.3, 1.0], [1.3, 1.4], 0.4);
    let (st, g) = gouge(&f, ALONG, &ball(8.0), &NO_ANGLES);
    assert_eq!(st, OK, "{}", message());
    close(
        "concave curvature",
        g.concave_curvature,
        1.0 / rho,
        1e-14,
        1.0,
    );
    close("concave radius", g.concave_radius, rho, 1e-13, 1.0);
    close("margin", g.margin, 1.0 / 8.0 - 1.0 / rho, 1e-13, 1.0);
    assert_eq!((g.gouges, g.has_min_lead, g.min_lead), (0, 1, 0.0));
    assert_eq!(
        (g.effective_radius_cross, g.effective_radius_along),
        (8.0, 8.0)
    );
    let (st, g) = gouge(&f, ALONG, &ball(12.0), &NO_ANGLES);
    assert_eq!(st, OK);
    assert_eq!((g.gouges, g.has_min_lead, g.min_lead), (1, 0, 0.0));
    // From outside the sphere nothing is concave.
    let (_, g) = gouge(&f, AGAINST, &ball(12.0), &NO_ANGLES);
    assert_eq!(g.concave_radius, f64::INFINITY);
    assert_eq!(g.gouges, 0);
    // Toroidal: radius 6, corner 2, so R = 4: sin(lead) = 4/8.
    let torc = StrakeCutter {
        kind: StrakeCutterKind::Toroidal as u32,
        radius: 6.0,
        corner_radius: 2.0,
    };
    let (st, g) = gouge(&f, ALONG, &torc, &NO_ANGLES);
    assert_eq!(st, OK, "{}", message());
    assert_eq!((g.gouges, g.has_min_lead), (1, 1));
    close("min lead", g.min_lead, PI / 6.0, 1e-9, 1.0);
    assert_eq!(g.effective_radius_cross, f64::INFINITY);
    let lead = StrakeToolAngles {
        lead: 0.6,
        tilt: 0.0,
    };
    let (_, g) = gouge(&f, ALONG, &torc, &lead);
    assert_eq!(g.gouges, 0);
    close(
        "effective radius",
        g.effective_radius_cross,
        4.0 / 0.6f64.sin() + 2.0,
        1e-14,
        1.0,
    );
    // The Rust API on the same frame.
    for (side, ts, c, rc, a) in [
        (
            ALONG,
            ToolSide::AlongNormal,
            torc,
            Cutter::Toroidal {
                radius: 6.0,
                corner_radius: 2.0,
            },
            lead,
        ),
        (
            AGAINST,
            ToolSide::AgainstNormal,
            ball(3.0),
            Cutter::Ball { radius: 3.0 },
            NO_ANGLES,
        ),
        (
            ALONG,
            ToolSide::AlongNormal,
            StrakeCutter {
                kind: StrakeCutterKind::Flat as u32,
                radius: 5.0,
                corner_radius: 123.0, // ignored for a flat cutter
            },
            Cutter::Flat { radius: 5.0 },
            StrakeToolAngles {
                lead: 0.2,
                tilt: -0.1,
            },
        ),
    ] {
        let (st, g) = gouge(&f, side, &c, &a);
        assert_eq!(st, OK, "{}", message());
        let want = gouge_state(
            &df,
            ts,
            &rc,
            &ToolAngles {
                lead: a.lead,
                tilt: a.tilt,
            },
        )
        .unwrap();
        assert_eq!(g.concave_curvature, want.concave_curvature);
        assert_eq!(g.margin, want.margin);
        assert_eq!(g.gouges == 1, want.gouges);
        assert_eq!(g.has_min_lead == 1, want.min_lead.is_some());
        assert_eq!(g.min_lead, want.min_lead.unwrap_or(0.0));
        assert_eq!(g.effective_radius_cross, want.effective_radius_cross);
    }
    // SAFETY: a fresh handle.
    unsafe { strake_surface_free(s) };
}

#[test]
fn gouge_refusals_name_the_field() {
    let s = own_surface(sphere_surface(10.0));
    let (f, _) = frame_on(s, [0.3, 1.0], [1.3, 1.4], 0.4);
    let toroidal = |radius, corner_radius| StrakeCutter {
        kind: StrakeCutterKind::Toroidal as u32,
        radius,
        corner_radius,
    };
    for (side, c, a, status, needle) in [
        (ALONG, ball(-1.0), NO_ANGLES, IA, "cutter radius = -1"),
        (
            ALONG,
            ball(f64::INFINITY),
            NO_ANGLES,
            IA,
            "cutter radius = inf",
        ),
        (
            ALONG,
            toroidal(3.0, 4.0),
            NO_ANGLES,
            IA,
            "corner_radius = 4 exceeds the tool radius 3",
        ),
        (
            ALONG,
            toroidal(3.0, 0.0),
            NO_ANGLES,
            IA,
            "corner_radius = 0",
        ),
        (
            ALONG,
            StrakeCutter {
                kind: 3,
                radius: 1.0,
                corner_radius: 0.0,
            },
            NO_ANGLES,
            IA,
            "`cutter->kind` = 3",
        ),
        (
            ALONG,
            ball(1.0),
            StrakeToolAngles {
                lead: 2.0,
                tilt: 0.0,
            },
            IA,
            "lead angle = 2",
        ),
        (
            ALONG,
            ball(1.0),
            StrakeToolAngles {
                lead: 0.0,
                tilt: f64::NAN,
            },
            IA,
            "tilt angle = NaN",
        ),
        (
            ALONG,
            ball(1.0),
            StrakeToolAngles {
                lead: -FRAC_PI_2,
                tilt: 0.0,
            },
            IA,
            "lead angle",
        ),
        (2, ball(1.0), NO_ANGLES, IA, "`tool_side` = 2"),
    ] {
        let (st, _) = gouge(&f, side, &c, &a);
        expect(st, status, &[needle]);
    }
    let mut out = gouge_sentinel();
    // SAFETY: the NULLs are what is tested.
    unsafe {
        expect(
            strake_check_gouge(ptr::null(), ALONG, &ball(1.0), &NO_ANGLES, &mut out),
            NP,
            &["`frame`"],
        );
        expect(
            strake_check_gouge(&f, ALONG, ptr::null(), &NO_ANGLES, &mut out),
            NP,
            &["`cutter`"],
        );
        expect(
            strake_check_gouge(&f, ALONG, &ball(1.0), ptr::null(), &mut out),
            NP,
            &["`angles`"],
        );
        expect(
            strake_check_gouge(&f, ALONG, &ball(1.0), &NO_ANGLES, ptr::null_mut()),
            NP,
            &["`out`"],
        );
    }
    assert_eq!(out, gouge_sentinel());
    // SAFETY: a fresh handle.
    unsafe { strake_surface_free(s) };
}

// ---------------------------------------------------------------- scallop and step-over

fn scallop_sentinel() -> StrakeScallop {
    StrakeScallop {
        cross_curvature: -7777.25,
        height: -7777.25,
        height_approx: -7777.25,
    }
}

// On a plane: h = r - sqrt(r^2 - w^2/4), about w^2/(8 r), and back w = 2 sqrt(h (2r - h))
// (common practice; every machining handbook). On a cylinder seen from outside (convex across
// a slanted path) the C result is the Rust API's with the curvature across the path.
#[test]
fn scallop_on_a_plane_and_a_cylinder() {
    let s = own_surface(plane_surface((-50.0, 50.0), (-50.0, 50.0)));
    let (f, _) = frame_on(s, [-10.0, 0.0], [20.0, 15.0], 0.3);
    for (r, w) in [(6.0, 1.2), (3.0, 0.25), (5.0, 9.9)] {
        let mut out = scallop_sentinel();
        // SAFETY: valid pointers.
        let st = unsafe { strake_check_scallop(&f, ALONG, r, w, &mut out) };
        assert_eq!(st, OK, "{}", message());
        assert_eq!(out.cross_curvature, 0.0);
        close(
            "h",
            out.height,
            r - (r * r - w * w / 4.0).sqrt(),
            1e-13,
            1e-300,
        );
        close(
            "approx",
            out.height_approx,
            w * w / (8.0 * r),
            1e-14,
            1e-300,
        );
        let mut so = StrakeStepOver::default();
        // SAFETY: valid pointers.
        let st = unsafe { strake_check_step_over(&f, AGAINST, r, out.height, &mut so) };
        assert_eq!(st, OK, "{}", message());
        close("w", so.step_over, w, 1e-9, 1.0);
        close(
            "w approx",
            so.step_over_approx,
            (8.0 * out.height * r).sqrt(),
            1e-14,
            1.0,
        );
    }
    // SAFETY: a fresh handle.
    unsafe { strake_surface_free(s) };

    let c = own_surface(cylinder(20.0, -30.0, 30.0));
    let (f, df) = frame_on(c, [0.2, -10.0], [1.0, 12.0], 0.5);
    for side in [ALONG, AGAINST] {
        let ts = if side == ALONG {
            ToolSide::AlongNormal
        } else {
            ToolSide::AgainstNormal
        };
        let kappa = cross_path_curvature(&df, ts);
        let mut out = scallop_sentinel();
        // SAFETY: valid pointers.
        let st = unsafe { strake_check_scallop(&f, side, 5.0, 2.0, &mut out) };
        assert_eq!(st, OK, "{}", message());
        assert_eq!(out.cross_curvature, kappa);
        assert_eq!(out.height, scallop_height(5.0, 2.0, kappa).unwrap());
        assert_eq!(
            out.height_approx,
            scallop_height_approx(5.0, 2.0, kappa).unwrap()
        );
        let mut so = StrakeStepOver::default();
        // SAFETY: valid pointers.
        let st = unsafe { strake_check_step_over(&f, side, 5.0, 0.01, &mut so) };
        assert_eq!(st, OK, "{}", message());
        assert_eq!(
            so.step_over,
            step_over_for_scallop(5.0, 0.01, kappa).unwrap()
        );
    }
    // Convex (tool outside) leaves a higher scallop than concave for the same step-over.
    let mut outside = scallop_sentinel();
    let mut inside = scallop_sentinel();
    // SAFETY: valid pointers.
    unsafe {
        strake_check_scallop(&f, ALONG, 5.0, 2.0, &mut outside);
        strake_check_scallop(&f, AGAINST, 5.0, 2.0, &mut inside);
    }
    assert!(outside.cross_curvature < 0.0 && outside.height > inside.height);
    // SAFETY: a fresh handle.
    unsafe { strake_surface_free(c) };
}

#[test]
fn scallop_refusals_name_the_field() {
    let c = own_surface(cylinder(4.0, -30.0, 30.0));
    // Along the axis: across the path the circle of radius 4 (concave seen from inside).
    let (f, _) = frame_on(c, [0.5, -10.0], [0.5, 12.0], 0.5);
    let mut out = scallop_sentinel();
    let mut so = StrakeStepOver {
        step_over: -7777.25,
        ..Default::default()
    };
    let keep = so;
    // SAFETY: valid pointers; the NULLs are what is tested.
    unsafe {
        for (side, r, w, needle) in [
            (ALONG, 0.0, 1.0, "cutter radius = 0"),
            (ALONG, 3.0, f64::NAN, "step-over = NaN"),
            (ALONG, 3.0, 7.0, "too wide"),
            (
                AGAINST,
                5.0,
                1.0,
                "does not fit the concave radius of curvature 4",
            ),
            (9, 3.0, 1.0, "`tool_side` = 9"),
        ] {
            expect(
                strake_check_scallop(&f, side, r, w, &mut out),
                IA,
                &[needle],
            );
        }
        for (side, r, h, needle) in [
            (ALONG, 3.0, 0.0, "scallop height = 0"),
            (AGAINST, 3.0, 4.0, "not reachable"),
            (ALONG, -3.0, 0.1, "cutter radius = -3"),
            (7, 3.0, 0.1, "`tool_side` = 7"),
        ] {
            expect(
                strake_check_step_over(&f, side, r, h, &mut so),
                IA,
                &[needle],
            );
        }
        expect(
            strake_check_scallop(ptr::null(), ALONG, 3.0, 1.0, &mut out),
            NP,
            &["`frame`"],
        );
        expect(
            strake_check_scallop(&f, ALONG, 3.0, 1.0, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        expect(
            strake_check_step_over(ptr::null(), ALONG, 3.0, 0.1, &mut so),
            NP,
            &["`frame`"],
        );
        expect(
            strake_check_step_over(&f, ALONG, 3.0, 0.1, ptr::null_mut()),
            NP,
            &["`out`"],
        );
    }
    assert_eq!(out, scallop_sentinel());
    assert_eq!(so, keep);
    // SAFETY: a fresh handle.
    unsafe { strake_surface_free(c) };
}

// ---------------------------------------------------------------- feed

// A circle of latitude at colatitude phi on a sphere of radius R has space curvature
// 1/(R sin phi) (its radius), so the feed is limited to sqrt(a R sin phi) by the normal
// acceleration v^2/rho (physics) and to (j rho^2)^(1/3) by the jerk v^3/rho^2 of uniform
// circular motion (physics); a straight line keeps the programmed feed.
#[test]
fn feed_on_a_circle() {
    let (r, phi) = (50.0, 0.9);
    let s = own_surface(sphere_surface(r));
    let (f, df) = frame_on(s, [0.2, phi], [2.0, phi], 0.3);
    let rho = r * phi.sin();
    let feed = |l: &StrakeFeedLimits| {
        let mut v = -1.0;
        // SAFETY: valid pointers.
        let st = unsafe { strake_check_feed(&f, l, &mut v) };
        assert_eq!(st, OK, "{}", message());
        v
    };
    let mut l = StrakeFeedLimits {
        feed: 1000.0,
        max_acceleration: 2000.0,
        max_jerk: 0.0,
    };
    close(
        "acceleration-limited",
        feed(&l),
        (2000.0 * rho).sqrt(),
        1e-13,
        1.0,
    );
    l.max_jerk = 5000.0;
    close(
        "jerk-limited",
        feed(&l),
        (5000.0 * rho * rho).cbrt(),
        1e-13,
        1.0,
    );
    l.feed = 10.0;
    assert_eq!(feed(&l), 10.0);
    let want = curvature_limited_feed(
        &df,
        &FeedLimits {
            feed: 10.0,
            max_acceleration: 2000.0,
            max_jerk: Some(5000.0),
        },
    )
    .unwrap();
    assert_eq!(feed(&l), want);
    let p = own_surface(plane_surface((-5.0, 5.0), (-5.0, 5.0)));
    let (line, _) = frame_on(p, [-1.0, -1.0], [2.0, 1.0], 0.5);
    let mut v = 0.0;
    // SAFETY: valid pointers.
    assert_eq!(unsafe { strake_check_feed(&line, &l, &mut v) }, OK);
    assert_eq!(v, 10.0);
    // Refusals, each naming its field.
    for (bad, needle) in [
        (StrakeFeedLimits { feed: 0.0, ..l }, "feed = 0"),
        (
            StrakeFeedLimits {
                max_acceleration: f64::INFINITY,
                ..l
            },
            "max_acceleration = inf",
        ),
        (
            StrakeFeedLimits {
                max_acceleration: -1.0,
                ..l
            },
            "max_acceleration = -1",
        ),
        (
            StrakeFeedLimits {
                max_jerk: -1.0,
                ..l
            },
            "max_jerk = -1",
        ),
        (
            StrakeFeedLimits {
                max_jerk: f64::NAN,
                ..l
            },
            "max_jerk = NaN",
        ),
        (
            StrakeFeedLimits {
                max_jerk: f64::INFINITY,
                ..l
            },
            "or 0 for no jerk limit",
        ),
    ] {
        let mut v = -1.0;
        // SAFETY: valid pointers.
        expect(
            unsafe { strake_check_feed(&f, &bad, &mut v) },
            IA,
            &[needle],
        );
        assert_eq!(v, -1.0);
    }
    // SAFETY: fresh handles.
    unsafe {
        strake_surface_free(s);
        strake_surface_free(p);
    }
}

// ---------------------------------------------------------------- fibre

// A course steered on a circle of radius rho in a plane: steering curvature 1/rho (the signed
// curvature of a circle, do Carmo §1-5), tow-edge strain w/(2 rho) (REFERENCES.md, composites),
// twist 0 (a plane's II vanishes). The circle is an exact rational quadratic quarter (The NURBS
// Book 2nd ed. §7.3).
#[test]
fn fibre_on_a_plane_circle() {
    let rho = 800.0;
    let s = own_surface(plane_surface((-1000.0, 1000.0), (-1000.0, 1000.0)));
    let c = nurbs(
        2,
        &[0.0, 0.0, 0.0, 1.0, 1.0, 1.0],
        &[[rho, 0.0], [rho, rho], [0.0, rho]],
        Some(&[1.0, FRAC_1_SQRT_2, 1.0]),
    );
    let f = frame_at(s, c, 0.37);
    let df = f.to_darboux().unwrap();
    let limits = StrakeFibreLimits {
        tow_width: 6.35,
        min_steering_radius: 1000.0,
        max_twist_rate: 1e-3,
    };
    let mut out = StrakeFibreState::default();
    // SAFETY: valid pointers.
    let st = unsafe { strake_check_fibre(&f, &limits, &mut out) };
    assert_eq!(st, OK, "{}", message());
    close(
        "steering curvature",
        out.steering_curvature,
        1.0 / rho,
        1e-13,
        1.0,
    );
    close("steering radius", out.steering_radius, rho, 1e-12, 1.0);
    close(
        "edge strain",
        out.edge_strain,
        6.35 / (2.0 * rho),
        1e-12,
        1.0,
    );
    assert!(out.twist_rate.abs() < 1e-15);
    assert_eq!((out.steering_violated, out.twist_violated), (1, 0));
    let want = fibre_state(
        &df,
        &FibreLimits {
            tow_width: 6.35,
            min_steering_radius: 1000.0,
            max_twist_rate: 1e-3,
        },
    )
    .unwrap();
    assert_eq!(out.edge_strain, want.edge_strain);
    assert_eq!(out.steering_radius, want.steering_radius);
    // A straight course is a geodesic: infinite steering radius.
    let line = uv_line([-100.0, 0.0], [100.0, 50.0]);
    let g = frame_at(s, line, 0.5);
    // SAFETY: valid pointers.
    assert_eq!(unsafe { strake_check_fibre(&g, &limits, &mut out) }, OK);
    assert_eq!(out.steering_radius, f64::INFINITY);
    assert_eq!(out.steering_violated, 0);
    let keep = out;
    for (bad, needle) in [
        (
            StrakeFibreLimits {
                tow_width: 0.0,
                ..limits
            },
            "tow_width = 0",
        ),
        (
            StrakeFibreLimits {
                min_steering_radius: f64::NAN,
                ..limits
            },
            "min_steering_radius = NaN",
        ),
        (
            StrakeFibreLimits {
                max_twist_rate: -1.0,
                ..limits
            },
            "max_twist_rate = -1",
        ),
    ] {
        // SAFETY: valid pointers.
        expect(
            unsafe { strake_check_fibre(&f, &bad, &mut out) },
            IA,
            &[needle],
        );
    }
    // SAFETY: the NULLs are what is tested.
    unsafe {
        expect(
            strake_check_fibre(ptr::null(), &limits, &mut out),
            NP,
            &["`frame`"],
        );
        expect(
            strake_check_fibre(&f, ptr::null(), &mut out),
            NP,
            &["`limits`"],
        );
        expect(
            strake_check_fibre(&f, &limits, ptr::null_mut()),
            NP,
            &["`out`"],
        );
    }
    assert_eq!(out, keep);
    // SAFETY: fresh handles.
    unsafe { strake_curve_free(line) };
    free(s, c);
}

// ---------------------------------------------------------------- tool axis

// a = sin(lead) T + cos(lead) sin(tilt) b_t + cos(lead) cos(tilt) n_t (our convention, stated in
// src/checks/tool_axis.rs): with both angles 0 the axis is the tool-side normal.
#[test]
fn tool_axis_conventions() {
    let s = own_surface(torus(5.0, 1.5));
    let (f, df) = frame_on(s, [0.3, 0.5], [1.5, 2.0], 0.4);
    let mut a = StrakeToolAxis::default();
    // SAFETY: valid pointers.
    unsafe {
        assert_eq!(strake_tool_axis(&f, ALONG, &NO_ANGLES, &mut a), OK);
        assert_eq!(a.space, f.normal);
        assert_eq!(a.local, [0.0, 0.0, 1.0]);
        assert_eq!(strake_tool_axis(&f, AGAINST, &NO_ANGLES, &mut a), OK);
        assert_eq!(a.space, f.normal.map(|x| -x));
        let ang = StrakeToolAngles {
            lead: 0.3,
            tilt: -0.2,
        };
        assert_eq!(strake_tool_axis(&f, ALONG, &ang, &mut a), OK);
        close("along T", a.local[0], 0.3f64.sin(), 1e-15, 1.0);
        close(
            "along B",
            a.local[1],
            0.3f64.cos() * (-0.2f64).sin(),
            1e-15,
            1.0,
        );
        let want = tool_axis(
            &df,
            ToolSide::AlongNormal,
            &ToolAngles {
                lead: 0.3,
                tilt: -0.2,
            },
        )
        .unwrap();
        assert_eq!(a.space, [want.space.x, want.space.y, want.space.z]);
        let keep = a;
        expect(
            strake_tool_axis(
                &f,
                ALONG,
                &StrakeToolAngles {
                    lead: 0.0,
                    tilt: 1.6,
                },
                &mut a,
            ),
            IA,
            &["tilt angle = 1.6"],
        );
        expect(
            strake_tool_axis(&f, 3, &NO_ANGLES, &mut a),
            IA,
            &["`tool_side` = 3"],
        );
        expect(
            strake_tool_axis(ptr::null(), ALONG, &NO_ANGLES, &mut a),
            NP,
            &["`frame`"],
        );
        expect(
            strake_tool_axis(&f, ALONG, ptr::null(), &mut a),
            NP,
            &["`angles`"],
        );
        expect(
            strake_tool_axis(&f, ALONG, &NO_ANGLES, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        assert_eq!(a, keep);
        strake_surface_free(s);
    }
}

// ---------------------------------------------------------------- path summaries

/// `n` samples evenly spaced in arc length along `curve` on `s`, through the C ABI.
fn samples(s: *const StrakeSurface, c: *const StrakeCurve, n: usize) -> Vec<StrakeSample> {
    let mut buf = vec![StrakeSample::default(); n];
    let mut count = 0;
    // SAFETY: room for n samples.
    let st = unsafe { strake_sample_even_arc(s, c, n, 1e-12, buf.as_mut_ptr(), n, &mut count) };
    assert_eq!((st, count), (OK, n), "{}", message());
    buf
}

/// strake_path_violations into a buffer of `capacity` (NULL when 0).
fn find_violations(
    s: &[StrakeSample],
    v: &[f64],
    limit: f64,
    capacity: usize,
) -> (StrakeStatus, usize, Vec<StrakeViolation>) {
    let mut buf = vec![
        StrakeViolation {
            worst: -7777.25,
            ..Default::default()
        };
        capacity
    ];
    let mut count = 4242;
    let p = if capacity == 0 {
        ptr::null_mut()
    } else {
        buf.as_mut_ptr()
    };
    // SAFETY: arrays of s.len() elements, room for `capacity` intervals.
    let st = unsafe {
        strake_path_violations(
            s.as_ptr(),
            v.as_ptr(),
            s.len(),
            limit,
            p,
            capacity,
            &mut count,
        )
    };
    (st, count, buf)
}

// A ball-end mill of radius rb outside a torus (R, r), along a meridian v in [0, 2 pi]: the
// curvature concave toward the tool is -cos v/(R + r cos v) (do Carmo §3-3, torus; outward
// normal), so the cutter gouges where cos v < -R/(rb + r), at arc lengths r v. The C summary of
// the values from strake_check_gouge gives that interval, the extremes put the worst point at
// v = pi with curvature 1/(R - r), and both equal the Rust API's summaries of the same data.
#[test]
fn gouge_interval_on_a_torus_meridian() {
    let (big_r, r, rb) = (5.0, 1.5, 6.0);
    let s = own_surface(torus(big_r, r));
    let c = uv_line([0.7, 0.0], [0.7, TAU]);
    let smp = samples(s, c, 2001);
    let values: Vec<f64> = smp
        .iter()
        .map(|x| {
            let (st, g) = gouge(&x.frame, ALONG, &ball(rb), &NO_ANGLES);
            assert_eq!(st, OK, "{}", message());
            g.concave_curvature
        })
        .collect();
    let (st, n, found) = find_violations(&smp, &values, 1.0 / rb, 4);
    assert_eq!((st, n), (OK, 1), "{}", message());
    let v1 = (-big_r / (rb + r)).acos();
    close("start", found[0].start_arc_length, r * v1, 1e-5, 1.0);
    close("end", found[0].end_arc_length, r * (TAU - v1), 1e-5, 1.0);
    close("worst", found[0].worst, 1.0 / (big_r - r), 1e-9, 1.0);
    let mut ex = StrakeExtremes::default();
    // SAFETY: arrays of 2001 elements.
    let st = unsafe { strake_path_extremes(smp.as_ptr(), values.as_ptr(), smp.len(), &mut ex) };
    assert_eq!(st, OK);
    close("max", ex.max, 1.0 / (big_r - r), 1e-12, 1.0);
    close("max at", ex.max_arc_length, r * PI, 1e-9, 1.0);
    assert_eq!(ex.max_index, 1000);
    // The Rust API on the same samples and values.
    let want = extremes(&smp, &values).unwrap();
    assert_eq!(
        (ex.min, ex.min_index, ex.min_arc_length, ex.min_t),
        (want.min, want.min_index, want.min_arc_length, want.min_t)
    );
    let mut rv = Vec::new();
    violations(&smp, &values, 1.0 / rb, &mut rv).unwrap();
    assert_eq!(found[0], StrakeViolation::from(&rv[0]));
    free(s, c);
}

// Several intervals: BUFFER_TOO_SMALL with the number found and nothing written, then a retry
// with that capacity giving exactly the intervals of a large enough first call; none found
// needs no buffer at all.
#[test]
fn violations_follow_the_buffer_protocol() {
    let s = own_surface(plane_surface((-10.0, 10.0), (-10.0, 10.0)));
    let c = uv_line([-9.0, 0.0], [9.0, 0.0]);
    let smp = samples(s, c, 181);
    // sin(s) over s in [0, 18] exceeds 0.5 on three intervals (s in (pi/6, 5 pi/6) + 2 k pi).
    let values: Vec<f64> = smp.iter().map(|x| x.arc_length.sin()).collect();
    let (st, n, big) = find_violations(&smp, &values, 0.5, 10);
    assert_eq!((st, n), (OK, 3), "{}", message());
    for (k, v) in big[..3].iter().enumerate() {
        close(
            "start",
            v.start_arc_length,
            PI / 6.0 + TAU * k as f64,
            1e-3,
            1.0,
        );
        close(
            "end",
            v.end_arc_length,
            5.0 * PI / 6.0 + TAU * k as f64,
            1e-3,
            1.0,
        );
    }
    assert_eq!(big[3].worst, -7777.25);
    for small in [0, 1, 2] {
        let (st, n, buf) = find_violations(&smp, &values, 0.5, small);
        expect(
            st,
            StrakeStatus::BufferTooSmall,
            &["strake_path_violations", "3 violation intervals needed"],
        );
        assert_eq!(n, 3);
        assert!(buf.iter().all(|v| v.worst == -7777.25));
    }
    let (st, n, retry) = find_violations(&smp, &values, 0.5, 3);
    assert_eq!((st, n), (OK, 3));
    assert_eq!(retry[..], big[..3]);
    let (st, n, _) = find_violations(&smp, &values, 2.0, 0);
    assert_eq!((st, n), (OK, 0), "{}", message());
    free(s, c);
}

#[test]
fn summary_refusals() {
    let s = own_surface(plane_surface((-10.0, 10.0), (-10.0, 10.0)));
    let c = uv_line([-9.0, 0.0], [9.0, 0.0]);
    let smp = samples(s, c, 5);
    let mut values = vec![1.0, 2.0, 3.0, f64::NAN, 0.0];
    let (st, n, _) = find_violations(&smp, &values, 0.5, 4);
    expect(st, IA, &["value[3] is NaN"]);
    assert_eq!(n, 4242);
    values[3] = f64::INFINITY; // infinite values are allowed
    let (st, n, _) = find_violations(&smp, &values, f64::NAN, 4);
    expect(st, IA, &["limit is NaN"]);
    assert_eq!(n, 4242);
    let (st, n, _) = find_violations(&smp, &values, 0.5, 4);
    assert_eq!((st, n), (OK, 1), "{}", message());
    let mut bad = smp.clone();
    bad[2].arc_length = f64::INFINITY;
    let (st, _, _) = find_violations(&bad, &values, 0.5, 4);
    expect(st, IA, &["sample[2] has arc length = inf"]);
    let mut ex = StrakeExtremes {
        max: -7777.25,
        ..Default::default()
    };
    let keep = ex;
    let mut count = 4242usize;
    let mut buf = [StrakeViolation::default(); 2];
    // SAFETY: arrays of 5 elements; the NULLs and zero counts are what is tested.
    unsafe {
        let (sp, vp) = (smp.as_ptr(), values.as_ptr());
        expect(
            strake_path_extremes(ptr::null(), vp, 5, &mut ex),
            NP,
            &["`samples`"],
        );
        expect(
            strake_path_extremes(sp, ptr::null(), 5, &mut ex),
            NP,
            &["`values`"],
        );
        expect(
            strake_path_extremes(sp, vp, 5, ptr::null_mut()),
            NP,
            &["`out`"],
        );
        expect(
            strake_path_extremes(sp, vp, 0, &mut ex),
            IA,
            &["`sample_count` is 0"],
        );
        expect(
            strake_path_extremes(bad.as_ptr(), vp, 5, &mut ex),
            IA,
            &["sample[2] has arc length = inf"],
        );
        let b = buf.as_mut_ptr();
        expect(
            strake_path_violations(ptr::null(), vp, 5, 0.5, b, 2, &mut count),
            NP,
            &["`samples`"],
        );
        expect(
            strake_path_violations(sp, ptr::null(), 5, 0.5, b, 2, &mut count),
            NP,
            &["`values`"],
        );
        expect(
            strake_path_violations(sp, vp, 5, 0.5, ptr::null_mut(), 2, &mut count),
            NP,
            &["`buf`"],
        );
        expect(
            strake_path_violations(sp, vp, 5, 0.5, b, 2, ptr::null_mut()),
            NP,
            &["`count`"],
        );
        expect(
            strake_path_violations(sp, vp, 0, 0.5, b, 2, &mut count),
            IA,
            &["`sample_count` is 0"],
        );
    }
    assert_eq!(ex, keep);
    assert_eq!(count, 4242);
    free(s, c);
}
