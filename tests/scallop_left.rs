//! The scallop a ball leaves between two passes, measured by the direct construction (the
//! meeting of the two swept tubes), against the exact two-circle intersection on a cylinder
//! (passes along rulings) and a sphere (passes along circles of latitude).
//!
//! Source of the expected values: the cross-section of two neighbouring ball passes is two
//! circles of radius r whose centres lie on the circle of radius ρ ± r concentric with the
//! surface's section, θ = w/ρ apart (Suresh & Yang, J. Eng. Ind. 116 (1994) 253–259; Lin &
//! Koren, J. Eng. Ind. 118 (1996) 20–28); the cusp is the intersection of the two circles
//! nearer the surface, on the bisector at distance d from the centre of the section:
//! convex: d = (ρ + r) cos(θ/2) − √(r² − (ρ + r)² sin²(θ/2)), h = d − ρ;
//! concave: d = (ρ − r) cos(θ/2) + √(r² − (ρ − r)² sin²(θ/2)), h = ρ − d.
//! (Elementary circle geometry, derived here.)

use strake::analytic::{cylinder, sphere};
use strake::checks::ToolSide;
use strake::{CurveOnSurface, Hints, StrakeError, scallop_between, step_over_at, uv_line};

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

#[test]
fn cylinder_rulings_match_the_two_circle_scallop() {
    let big_r = 10.0;
    let s = cylinder(big_r, -5.0, 5.0);
    let u0 = 1.0;
    let a = uv_line(u0, -4.0, u0, 4.0).unwrap();
    let ts: Vec<f64> = (0..=8).map(|k| k as f64 / 8.0).collect();
    // Su × Sv points outward: a tool outside is on the N side (convex), inside against it.
    for (side, convex) in [
        (ToolSide::AlongNormal, true),
        (ToolSide::AgainstNormal, false),
    ] {
        for (r, w) in [(3.0, 2.0), (1.0, 0.5), (5.0, 6.0)] {
            let b = uv_line(u0 - w / big_r, -4.0, u0 - w / big_r, 4.0).unwrap();
            let got = scallop_between(&s, &a, &b, r, side, &ts, 0.5).unwrap();
            let exact = two_circle(big_r, r, w, convex);
            for g in &got {
                assert!(
                    (g.height - exact).abs() < 1e-11 * big_r,
                    "{side:?} r {r} w {w}: {} vs {exact}",
                    g.height
                );
                assert!((g.t_neighbour - g.t).abs() < 1e-9);
            }
        }
    }
}

#[test]
fn sphere_latitudes_match_the_two_circle_scallop() {
    let big_r = 10.0;
    let s = sphere(big_r);
    let v1 = 1.1;
    let a = uv_line(0.3, v1, 5.5, v1).unwrap();
    let ts: Vec<f64> = (0..=6).map(|k| k as f64 / 6.0).collect();
    // The sphere's Su × Sv points inward: a tool outside is against N (convex).
    for (side, convex) in [
        (ToolSide::AgainstNormal, true),
        (ToolSide::AlongNormal, false),
    ] {
        for (r, w) in [(3.0, 2.0), (1.0, 0.4)] {
            let b = uv_line(0.3, v1 + w / big_r, 5.5, v1 + w / big_r).unwrap();
            let got = scallop_between(&s, &a, &b, r, side, &ts, 0.5).unwrap();
            let exact = two_circle(big_r, r, w, convex);
            for g in &got {
                assert!(
                    (g.height - exact).abs() < 1e-11 * big_r,
                    "{side:?} r {r} w {w}: {} vs {exact}",
                    g.height
                );
            }
        }
    }
}

// The per-point rule: the step-over chosen for a target scallop leaves that scallop, as the
// direct construction measures it.
#[test]
fn the_step_over_for_a_target_leaves_the_target() {
    let big_r = 10.0;
    let s = cylinder(big_r, -5.0, 5.0);
    let a = uv_line(1.0, -4.0, 1.0, 4.0).unwrap();
    let path = CurveOnSurface::new(&s, &a);
    let f = path.frame(0.5, &mut Hints::default()).unwrap();
    for side in [ToolSide::AlongNormal, ToolSide::AgainstNormal] {
        for (r, h) in [(3.0, 0.01), (1.0, 0.002), (6.0, 0.05)] {
            let w = step_over_at(&f, r, side, h).unwrap();
            let b = uv_line(1.0 - w / big_r, -4.0, 1.0 - w / big_r, 4.0).unwrap();
            let got = scallop_between(&s, &a, &b, r, side, &[0.5], 0.5).unwrap();
            assert!(
                (got[0].height - h).abs() < 1e-10 * h.max(1.0),
                "{got:?} vs {h}"
            );
        }
    }
}

#[test]
fn bad_targets_and_cutters_are_refused_naming_the_value() {
    let s = cylinder(10.0, -5.0, 5.0);
    let a = uv_line(1.0, -4.0, 1.0, 4.0).unwrap();
    let f = CurveOnSurface::new(&s, &a)
        .frame(0.5, &mut Hints::default())
        .unwrap();
    for h in [0.0, -1.0, f64::NAN, f64::INFINITY] {
        let e = step_over_at(&f, 1.0, ToolSide::AlongNormal, h).unwrap_err();
        assert!(
            e.to_string()
                .contains(&format!("target scallop height = {h}")),
            "{e}"
        );
    }
    // Inside a cylinder of radius 10 a ball of radius 10 or more cannot cut without gouging.
    let e = step_over_at(&f, 12.0, ToolSide::AgainstNormal, 0.01).unwrap_err();
    assert!(
        matches!(e, StrakeError::CutterTooLarge { radius, curvature_radius, .. }
            if radius == 12.0 && (curvature_radius - 10.0).abs() < 1e-12),
        "{e:?}"
    );
    assert!(e.to_string().contains("radius across the path 12"), "{e}");
    let b = uv_line(0.0, -4.0, 0.0, 4.0).unwrap();
    // 10 apart across the arc: balls of radius 1 do not overlap.
    let e = scallop_between(&s, &a, &b, 1.0, ToolSide::AlongNormal, &[0.5], 0.5).unwrap_err();
    assert!(e.to_string().contains("do not overlap"), "{e}");
    let e = scallop_between(&s, &a, &b, f64::NAN, ToolSide::AlongNormal, &[0.5], 0.5).unwrap_err();
    assert!(e.to_string().contains("cutter radius = NaN"), "{e}");
}
