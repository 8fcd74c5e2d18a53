//! Iso-scallop and constant step-over passes on a cylinder and a sphere, against the exact
//! scallop of neighbouring passes.
//!
//! Sources: the geodesic parallels of a ruling of a cylinder are rulings, and those of a
//! circle of latitude of a sphere are circles of latitude, at the distance along the
//! circumference / meridian (do Carmo §4-4 [section: memory]: meridians are geodesics, and
//! parallels of a geodesic family cut it at right angles, Gauss's lemma §4-6). The scallop of
//! two neighbouring ball passes in the section normal to both is the two-circle intersection
//! (Suresh & Yang, J. Eng. Ind. 116 (1994) 253–259; Lin & Koren, J. Eng. Ind. 118 (1996)
//! 20–28), in closed form:
//! convex: h = (ρ + r) cos(θ/2) − √(r² − (ρ + r)² sin²(θ/2)) − ρ, θ = w/ρ;
//! concave: h = ρ − (ρ − r) cos(θ/2) − √(r² − (ρ − r)² sin²(θ/2)).

use std::f64::consts::FRAC_PI_2;
use strake::analytic::{cylinder, sphere};
use strake::checks::ToolSide;
use strake::nurbs::SpanHint;
use strake::{
    DerivOrder, FnSurface, Interval, OffsetSide, Orientation, PassOptions, StepRule, StrakeError,
    SurfaceHint, SurfaceSource, UvCurve, plan_passes, uv_line,
};

fn two_circle(rho: f64, r: f64, w: f64, convex: bool) -> f64 {
    let half = 0.5 * w / rho;
    if convex {
        let rc = rho + r;
        rc * half.cos() - (r * r - (rc * half.sin()).powi(2)).sqrt() - rho
    } else {
        let rc = rho - r;
        rho - rc * half.cos() - (r * r - (rc * half.sin()).powi(2)).sqrt()
    }
}

/// The width θ of the two-circle section that leaves scallop h (bisection on the closed form).
fn width_for(rho: f64, r: f64, h: f64, convex: bool) -> f64 {
    let (mut lo, mut hi) = (0.0, 1.9 * r);
    for _ in 0..200 {
        let m = 0.5 * (lo + hi);
        if two_circle(rho, r, m, convex) < h {
            lo = m;
        } else {
            hi = m;
        }
    }
    0.5 * (lo + hi)
}

type Patch = FnSurface<
    Box<dyn Fn(f64, f64, DerivOrder) -> strake::Result<strake::SurfaceJet> + Send + Sync>,
>;

/// A patch of an analytic surface over a smaller domain.
fn patch<S: SurfaceSource + 'static>(s: S, u: (f64, f64), v: (f64, f64)) -> Patch {
    FnSurface::new(
        Interval { lo: u.0, hi: u.1 },
        Interval { lo: v.0, hi: v.1 },
        Orientation::Forward,
        Box::new(move |a, b, o| s.jet_in_domain(a, b, o, &mut SurfaceHint::default())),
    )
}

fn uv_at<C: UvCurve + ?Sized>(c: &C, t: f64) -> (f64, f64) {
    let j = c.checked_jet(t, &mut SpanHint::default()).unwrap();
    (j.u, j.v)
}

#[test]
fn iso_scallop_on_a_cylinder_gives_rulings_at_the_exact_scallop() {
    let (big_r, r, h) = (10.0, 3.0, 0.05);
    let s = patch(cylinder(big_r, -3.0, 3.0), (0.0, 1.2), (-3.0, 3.0));
    let first = uv_line(0.05, -2.5, 0.05, 2.5).unwrap();
    // T = +z and B = N × T points toward decreasing u: advance to the right.
    let opts = PassOptions::iso_scallop(r, ToolSide::AlongNormal, h, OffsetSide::Right, 1e-7);
    let plan = plan_passes(&s, &first, &opts).unwrap();
    let w = width_for(big_r, r, h, true);
    let du = w / big_r;
    let expected = 1 + ((1.2 - 0.05) / du).floor() as usize;
    assert_eq!(plan.count, expected, "step-over {w}");
    assert_eq!(plan.rows, expected);
    for (k, p) in plan.passes.iter().enumerate() {
        let u = 0.05 + (k + 1) as f64 * du;
        for t in [0.0, 0.3, 0.5, 1.0] {
            let (pu, pv) = uv_at(&p.curve, t);
            assert!((pu - u).abs() < 1e-6, "pass {k} at t {t}: u {pu} vs {u}");
            assert!((-2.5 - 1e-6..=2.5 + 1e-6).contains(&pv));
        }
        assert!((p.length - 5.0).abs() < 1e-6, "{}", p.length);
        assert!((p.step_over.0 - w).abs() < 1e-9 && (p.step_over.1 - w).abs() < 1e-9);
        assert_eq!(p.parent, if k == 0 { None } else { Some(k - 1) });
    }
    assert!((plan.scallop_max - h).abs() < 1e-6, "{}", plan.scallop_max);
    assert!((plan.scallop_min - h).abs() < 1e-6, "{}", plan.scallop_min);
    assert!((plan.total_length - 5.0 * expected as f64).abs() < 1e-5);
}

#[test]
fn iso_scallop_on_a_sphere_gives_latitudes_at_the_exact_scallop() {
    let (big_r, r, h) = (10.0, 3.0, 0.05);
    let s = patch(sphere(big_r), (0.2, 2.0), (0.6, 1.7));
    let first = uv_line(0.3, FRAC_PI_2, 1.9, FRAC_PI_2).unwrap();
    // N points inward; the tool outside is against N. B = N × T = −z on the equator: advance
    // to the right, toward the north pole.
    let opts = PassOptions::iso_scallop(r, ToolSide::AgainstNormal, h, OffsetSide::Right, 1e-7);
    let plan = plan_passes(&s, &first, &opts).unwrap();
    let w = width_for(big_r, r, h, true);
    let dv = w / big_r;
    let expected = 1 + ((FRAC_PI_2 - 0.6) / dv).floor() as usize;
    assert_eq!(plan.count, expected);
    for (k, p) in plan.passes.iter().enumerate() {
        let v = FRAC_PI_2 - (k + 1) as f64 * dv;
        for t in [0.0, 0.5, 1.0] {
            let (pu, pv) = uv_at(&p.curve, t);
            assert!((pv - v).abs() < 1e-6, "pass {k}: v {pv} vs {v}");
            assert!((0.3 - 1e-6..=1.9 + 1e-6).contains(&pu));
        }
        let exact_len = big_r * v.sin() * 1.6;
        assert!(
            (p.length - exact_len).abs() < 1e-5,
            "{} vs {exact_len}",
            p.length
        );
    }
    assert!((plan.scallop_max - h).abs() < 1e-6, "{}", plan.scallop_max);
    assert!((plan.scallop_min - h).abs() < 1e-6, "{}", plan.scallop_min);
}

#[test]
fn constant_step_over_leaves_the_two_circle_scallop_inside_a_cylinder() {
    let (big_r, r, w) = (10.0, 2.0, 1.5);
    let s = patch(cylinder(big_r, -3.0, 3.0), (0.0, 1.0), (-3.0, 3.0));
    let first = uv_line(0.05, -2.0, 0.05, 2.0).unwrap();
    let mut opts =
        PassOptions::iso_scallop(r, ToolSide::AgainstNormal, 1.0, OffsetSide::Right, 1e-7);
    opts.rule = StepRule::ConstantStepOver { step_over: w };
    let plan = plan_passes(&s, &first, &opts).unwrap();
    let expected = 1 + ((1.0 - 0.05) / (w / big_r)).floor() as usize;
    assert_eq!(plan.count, expected);
    let exact = two_circle(big_r, r, w, false);
    assert!(
        (plan.scallop_max - exact).abs() < 1e-7,
        "{} vs {exact}",
        plan.scallop_max
    );
    assert!((plan.scallop_min - exact).abs() < 1e-7);
}

#[test]
fn bad_input_gives_a_status_naming_the_value() {
    let s = patch(cylinder(10.0, -3.0, 3.0), (0.0, 1.2), (-3.0, 3.0));
    let first = uv_line(0.05, -2.5, 0.05, 2.5).unwrap();
    for h in [0.0, f64::NAN, -0.1] {
        let opts = PassOptions::iso_scallop(3.0, ToolSide::AlongNormal, h, OffsetSide::Right, 1e-6);
        let e = plan_passes(&s, &first, &opts).unwrap_err();
        assert!(
            e.to_string()
                .contains(&format!("target scallop height = {h}")),
            "{e}"
        );
    }
    // Inside a cylinder of radius 10 a ball of radius 12 gouges.
    let opts =
        PassOptions::iso_scallop(12.0, ToolSide::AgainstNormal, 0.05, OffsetSide::Right, 1e-6);
    let e = plan_passes(&s, &first, &opts).unwrap_err();
    assert!(
        matches!(e, StrakeError::CutterTooLarge { radius: 12.0, .. }),
        "{e:?}"
    );
    let mut opts =
        PassOptions::iso_scallop(3.0, ToolSide::AlongNormal, 0.05, OffsetSide::Right, 1e-6);
    opts.max_passes = 3;
    let e = plan_passes(&s, &first, &opts).unwrap_err();
    assert!(
        matches!(
            e,
            StrakeError::PassLimit {
                passes: 4,
                limit: 3
            }
        ),
        "{e:?}"
    );
    opts.max_passes = 1000;
    opts.ball_radius = f64::INFINITY;
    let e = plan_passes(&s, &first, &opts).unwrap_err();
    assert!(e.to_string().contains("ball radius = inf"), "{e}");
}

// Issue 13 item 4 for every cutter: a flat cutter of radius 5 at 5° lead on a plane. Seen
// along T it cuts the tilted bottom, an ellipse 10 wide and 5 sin 5° deep (closed form of the
// ellipse), so the passes are the ellipse's chord at the target height apart:
// 10 √(1 − (1 − h/depth)²), and the scallop left is the target.
#[test]
fn iso_scallop_passes_of_a_flat_cutter_on_a_plane_are_the_ellipse_chord_apart() {
    use strake::checks::{Cutter, ToolAngles};
    let s = strake::analytic::plane((0.0, 50.0), (0.0, 40.0));
    let first = uv_line(2.0, 2.0, 48.0, 2.0).unwrap();
    let h = 0.1;
    // T = +x, B = N × T = +y: advance to the left.
    let mut opts = PassOptions::iso_scallop(1.0, ToolSide::AlongNormal, h, OffsetSide::Left, 1e-7);
    opts.cutter = Some(strake::PassCutter {
        cutter: Cutter::Flat { radius: 5.0 },
        angles: ToolAngles {
            lead: 5f64.to_radians(),
            tilt: 0.0,
        },
    });
    opts.distance_samples = 9;
    opts.scallop_samples = 3;
    let plan = plan_passes(&s, &first, &opts).unwrap();
    let depth = 5.0 * 5f64.to_radians().sin();
    let w = 10.0 * (1.0 - (1.0 - h / depth).powi(2)).sqrt();
    let expected = 1 + ((40.0 - 2.0) / w).floor() as usize;
    assert_eq!(plan.count, expected, "step-over {w}");
    for (k, p) in plan.passes.iter().enumerate() {
        let y = 2.0 + (k + 1) as f64 * w;
        let (_, py) = uv_at(&p.curve, 0.5);
        assert!((py - y).abs() < 1e-6, "pass {k}: y {py} vs {y}");
        assert!((p.step_over.0 - w).abs() < 1e-9, "{:?}", p.step_over);
    }
    assert!((plan.scallop_max - h).abs() < 1e-6, "{}", plan.scallop_max);
    assert!((plan.scallop_min - h).abs() < 1e-6, "{}", plan.scallop_min);
    assert_eq!(plan.unmeasured, 0);
}

// A toroidal cutter (5/1) at 6° lead and 8° tilt outside a cylinder of radius 10, passes along
// the rulings: each step-over is the exact two-profile inverse on the convex cross-section
// (κ = −1/10, checked against brute force in tests/scallop_cutter.rs), the rulings are the
// geodesic parallels (do Carmo §4-4), and the scallop measured is the target.
#[test]
fn iso_scallop_passes_of_a_toroidal_cutter_on_a_cylinder_are_rulings() {
    use strake::checks::{Cutter, ToolAngles};
    let (big_r, h) = (10.0, 0.02);
    let s = patch(cylinder(big_r, -3.0, 3.0), (0.0, 1.2), (-3.0, 3.0));
    let first = uv_line(0.05, -2.5, 0.05, 2.5).unwrap();
    let tool = strake::PassCutter {
        cutter: Cutter::Toroidal {
            radius: 5.0,
            corner_radius: 1.0,
        },
        angles: ToolAngles {
            lead: 6f64.to_radians(),
            tilt: 8f64.to_radians(),
        },
    };
    let mut opts = PassOptions::iso_scallop(1.0, ToolSide::AlongNormal, h, OffsetSide::Right, 1e-7);
    opts.cutter = Some(tool);
    opts.distance_samples = 9;
    opts.scallop_samples = 3;
    let plan = plan_passes(&s, &first, &opts).unwrap();
    let w = strake::step_over_for_cutter_scallop(&tool.cutter, &tool.angles, h, -1.0 / big_r)
        .unwrap()
        .step_over;
    let du = w / big_r;
    let expected = 1 + ((1.2 - 0.05) / du).floor() as usize;
    assert_eq!(plan.count, expected, "step-over {w}");
    for (k, p) in plan.passes.iter().enumerate() {
        let (pu, _) = uv_at(&p.curve, 0.5);
        assert!(
            (pu - (0.05 + (k + 1) as f64 * du)).abs() < 1e-6,
            "pass {k}: u {pu}"
        );
        assert!((p.step_over.1 - w).abs() < 1e-9, "{:?}", p.step_over);
    }
    assert!((plan.scallop_max - h).abs() < 1e-6, "{}", plan.scallop_max);
    assert!((plan.scallop_min - h).abs() < 1e-6, "{}", plan.scallop_min);
    // The flat bottom does not fit inside a cylinder: the upright toroidal cutter gouges.
    let mut inside = opts;
    inside.tool_side = ToolSide::AgainstNormal;
    inside.cutter = Some(strake::PassCutter {
        angles: ToolAngles {
            lead: 0.0,
            tilt: 0.0,
        },
        ..tool
    });
    let e = plan_passes(&s, &first, &inside).unwrap_err();
    assert!(matches!(e, StrakeError::CutterTooLarge { .. }), "{e:?}");
}
