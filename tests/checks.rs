//! Machining and fibre-placement checks against closed forms and brute-force geometry.
//! Each check names its source beside it.

use std::f64::consts::{FRAC_PI_2, PI};
use strake::analytic::{cylinder, plane, sphere, torus};
use strake::checks::*;
use strake::{CurveOnSurface, Hints, PathSample, Vec3, uv_line};

fn rel(a: f64, b: f64) -> f64 {
    (a - b).abs() / b.abs().max(1e-300)
}

// ---------------------------------------------------------------- scallop height

// Plane: h = r − √(r² − w²/4) and h ≈ w²/(8r) (common practice; every machining handbook).
#[test]
fn scallop_on_a_plane() {
    let (r, w) = (5.0, 2.0);
    let h = scallop_height(r, w, 0.0).unwrap();
    assert!(rel(h, 5.0 - 24f64.sqrt()) < 1e-14);
    assert!(rel(scallop_height_approx(r, w, 0.0).unwrap(), 0.1) < 1e-15);
    assert!(rel(step_over_for_scallop(r, h, 0.0).unwrap(), w) < 1e-13);
}

/// Scallop height by brute force: along rays from the centre of the surface's cross-section
/// circle, find where each ray enters (convex) or leaves (concave) the swept cutter circles,
/// and take the worst remaining material over the ray angles (ternary search after a scan).
/// A route independent of the library's law-of-cosines cusp formula.
fn brute_scallop(r: f64, w: f64, kappa: f64) -> f64 {
    let rho = 1.0 / kappa.abs();
    let theta = w / rho;
    let convex = kappa < 0.0;
    let rc = if convex { rho + r } else { rho - r };
    let centres =
        [(-theta / 2.0).sin_cos(), (theta / 2.0).sin_cos()].map(|(s, c)| (rc * c, rc * s));
    let height = |phi: f64| {
        let (s, c) = phi.sin_cos();
        let mut best: f64 = if convex {
            f64::INFINITY
        } else {
            f64::NEG_INFINITY
        };
        for &(cx, cy) in &centres {
            let proj = cx * c + cy * s;
            let disc = r * r - (cx * cx + cy * cy) + proj * proj;
            if disc < 0.0 {
                continue;
            }
            if convex {
                best = best.min(proj - disc.sqrt());
            } else {
                best = best.max(proj + disc.sqrt());
            }
        }
        if convex { best - rho } else { rho - best }
    };
    let n = 2000;
    let mut k_best = 0;
    for k in 0..=n {
        let phi = -theta / 2.0 + theta * k as f64 / n as f64;
        if height(phi) > height(-theta / 2.0 + theta * k_best as f64 / n as f64) {
            k_best = k;
        }
    }
    let (mut a, mut b) = (
        -theta / 2.0 + theta * (k_best.max(1) - 1) as f64 / n as f64,
        -theta / 2.0 + theta * (k_best + 1).min(n) as f64 / n as f64,
    );
    for _ in 0..200 {
        let (m1, m2) = (a + (b - a) / 3.0, b - (b - a) / 3.0);
        if height(m1) < height(m2) {
            a = m1
        } else {
            b = m2
        }
    }
    height(0.5 * (a + b))
}

// Curved surfaces: exact circle geometry (Suresh & Yang 1994; Lin & Koren 1996) against the
// brute-force ray computation above, and the approximation (w²/8)(1/r − κ) for small step-overs.
#[test]
fn scallop_on_curved_surfaces_matches_brute_force() {
    for &(r, w, kappa) in &[
        (3.0, 1.5, -0.02),
        (3.0, 1.5, 0.02),
        (6.0, 4.0, 0.1),
        (2.0, 2.0, -0.3),
        (10.0, 0.5, 0.09),
    ] {
        let h = scallop_height(r, w, kappa).unwrap();
        let b = brute_scallop(r, w, kappa);
        assert!(rel(h, b) < 1e-9, "r {r} w {w} k {kappa}: {h} vs brute {b}");
        // Inverse.
        let w2 = step_over_for_scallop(r, h, kappa).unwrap();
        assert!(rel(w2, w) < 1e-10, "{w2} vs {w}");
    }
    // The approximation converges to the exact value as w → 0: relative error O(w²).
    let (r, kappa) = (4.0, 0.05);
    let e = |w: f64| {
        rel(
            scallop_height_approx(r, w, kappa).unwrap(),
            scallop_height(r, w, kappa).unwrap(),
        )
    };
    let (e1, e2) = (e(0.4), e(0.2));
    assert!(e1 < 1e-2 && (e1 / e2 - 4.0).abs() < 0.2, "{e1} {e2}");
    assert!(
        rel(
            step_over_for_scallop_approx(r, 1e-6, kappa).unwrap(),
            step_over_for_scallop(r, 1e-6, kappa).unwrap()
        ) < 1e-6
    );
}

#[test]
fn scallop_refuses_bad_input() {
    let msg = |e: strake::StrakeError| e.to_string();
    assert!(msg(scallop_height(-1.0, 1.0, 0.0).unwrap_err()).contains("cutter radius"));
    assert!(msg(scallop_height(1.0, f64::NAN, 0.0).unwrap_err()).contains("step-over"));
    assert!(msg(scallop_height(1.0, 1.0, f64::INFINITY).unwrap_err()).contains("curvature"));
    assert!(msg(scallop_height(2.0, 1.0, 0.6).unwrap_err()).contains("gouges"));
    assert!(msg(scallop_height(1.0, 3.0, 0.0).unwrap_err()).contains("too wide"));
    assert!(msg(step_over_for_scallop(1.0, 2.0, 0.0).unwrap_err()).contains("not reachable"));
}

// ---------------------------------------------------------------- effective radius, gouging

// Effective radius R/sin β + r (Vickers & Quan 1989) against the curvature of the tilted
// cutter's silhouette computed numerically: project the corner-circle centre circle onto the
// plane across the inclination, fit the osculating circle at its lowest point by a finite
// difference of the projected curve, and offset by r.
#[test]
fn effective_radius_matches_projected_silhouette() {
    let cutter = Cutter::Toroidal {
        radius: 8.0,
        corner_radius: 2.0,
    };
    for &beta in &[0.05f64, 0.2, 0.6, 1.2] {
        let big_r = 6.0;
        // Centre circle: (R cos φ, R sin φ cos β, R sin φ sin β) in (across, along, up); its
        // silhouette seen along "along" is (R cos φ, R sin φ sin β): an ellipse; lowest point at
        // φ = −π/2. Curvature of a parametric plane curve x(φ), y(φ) (do Carmo §1-5).
        let h = 1e-4;
        let p = |phi: f64| (big_r * phi.cos(), big_r * phi.sin() * beta.sin());
        let phi = -FRAC_PI_2;
        let (x0, y0) = p(phi);
        let (xp, yp) = p(phi + h);
        let (xm, ym) = p(phi - h);
        let (dx, dy) = ((xp - xm) / (2.0 * h), (yp - ym) / (2.0 * h));
        let (ddx, ddy) = (
            (xp - 2.0 * x0 + xm) / (h * h),
            (yp - 2.0 * y0 + ym) / (h * h),
        );
        let k = (dx * ddy - dy * ddx).abs() / (dx * dx + dy * dy).powf(1.5);
        let expect = 1.0 / k + 2.0;
        assert!(rel(cutter.effective_radius(beta), expect) < 1e-6, "{beta}");
    }
    assert_eq!(Cutter::Ball { radius: 3.0 }.effective_radius(0.4), 3.0);
    assert!(
        Cutter::Flat { radius: 3.0 }
            .effective_radius(0.0)
            .is_infinite()
    );
}

/// Largest penetration of the cutter into the material near the contact point, sampled on the
/// cutter's torus over a small window of its parameters. `inside_depth(X)` is positive where X
/// lies in the material. The cutter touches the surface at `p` with tool-side normal `nt`.
fn max_penetration(
    cutter: &Cutter,
    axis: Vec3,
    p: Vec3,
    nt: Vec3,
    window: f64,
    inside_depth: impl Fn(Vec3) -> f64,
) -> f64 {
    let (big_r, r) = cutter.torus_radii();
    // The corner-circle centre whose tube touches with normal −nt lies toward −(tangential
    // part of nt relative to the axis); the contact point is that centre − r nt.
    let radial = -(nt - axis * nt.dot(&axis));
    let e1 = radial.normalize();
    let e2 = axis.cross(&e1);
    let q = p + nt * r - e1 * big_r;
    // Tube angle ψ0 of the contact: the tube normal (cos ψ e1 + sin ψ axis) equals −nt.
    let psi0 = (-nt).dot(&axis).atan2((-nt).dot(&e1));
    let n = 60;
    let mut worst = f64::NEG_INFINITY;
    for i in 0..=n {
        for j in 0..=n {
            let al = window * (2.0 * i as f64 / n as f64 - 1.0);
            let ps = psi0 + window * (2.0 * j as f64 / n as f64 - 1.0);
            let radial = e1 * al.cos() + e2 * al.sin();
            let x = q + radial * (big_r + r * ps.cos()) + axis * (r * ps.sin());
            worst = worst.max(inside_depth(x));
        }
    }
    worst
}

// Ball-end mill inside a sphere of radius ρ: it fits iff r ≤ ρ (common practice: r·k ≤ 1 for
// the largest concave curvature). A toroidal cutter with lead λ: local gouging stops at
// sin λ = R/(ρ − r), from R_eff = R/sin λ + r ≤ ρ (Vickers & Quan 1989). Both checked against a
// dense sampling of the cutter near the contact point.
#[test]
fn gouge_on_a_sphere_against_dense_sampling() {
    let rho = 50.0;
    let s = sphere(rho); // N points to the centre: the tool inside is on the N side.
    let path = uv_line(0.3, 1.0, 2.0, 1.4).unwrap();
    let f = CurveOnSurface::new(&s, &path)
        .frame(0.5, &mut Hints::default())
        .unwrap();
    let side = ToolSide::AlongNormal;
    let flat = ToolAngles {
        lead: 0.0,
        tilt: 0.0,
    };
    let g = gouge_state(&f, side, &Cutter::Ball { radius: 49.0 }, &flat).unwrap();
    assert!(!g.gouges && rel(g.concave_radius, rho) < 1e-12);
    assert!(
        gouge_state(&f, side, &Cutter::Ball { radius: 51.0 }, &flat)
            .unwrap()
            .gouges
    );

    let cutter = Cutter::Toroidal {
        radius: 10.0,
        corner_radius: 2.0,
    };
    let g = gouge_state(&f, side, &cutter, &flat).unwrap();
    let expect = (8.0f64 / (rho - 2.0)).asin();
    let lead = g.min_lead.unwrap();
    assert!((lead - expect).abs() < 1e-9, "{lead} vs {expect}");
    let depth = |x: Vec3| x.norm() - rho; // outside the sphere = in the material
    for (delta, should_gouge) in [(-2f64.to_radians(), true), (2f64.to_radians(), false)] {
        let angles = ToolAngles {
            lead: lead + delta,
            tilt: 0.0,
        };
        let st = gouge_state(&f, side, &cutter, &angles).unwrap();
        assert_eq!(st.gouges, should_gouge);
        let axis = tool_axis(&f, side, &angles).unwrap().space;
        let pen = max_penetration(&cutter, axis, f.point, f.n, 0.15, depth);
        if should_gouge {
            assert!(pen > 1e-6, "expected penetration, got {pen}");
        } else {
            assert!(pen < 1e-9, "unexpected penetration {pen}");
        }
    }
}

// Torus (R = 40, r = 15) seen from outside, on its inner side where it is concave toward the
// tool in the parallel direction, along a slanted path (so τg ≠ 0): the smallest lead angle
// from the curvature condition separates gouging from clearance in dense sampling. The exact
// distance to a torus: √((√(x² + y²) − R)² + z²) − r.
#[test]
fn gouge_on_a_torus_against_dense_sampling() {
    let (big_r, r) = (40.0, 15.0);
    let s = torus(big_r, r); // outward N: the tool outside is on the N side
    let path = uv_line(0.2, 2.6, 0.35, 3.3).unwrap();
    let f = CurveOnSurface::new(&s, &path)
        .frame(0.5, &mut Hints::default())
        .unwrap();
    assert!(f.geodesic_torsion.abs() > 1e-3);
    let side = ToolSide::AlongNormal;
    let cutter = Cutter::Toroidal {
        radius: 6.0,
        corner_radius: 1.0,
    };
    let depth = |x: Vec3| {
        let rho_xy = x.x.hypot(x.y);
        r - ((rho_xy - big_r).hypot(x.z))
    };
    let g = gouge_state(
        &f,
        side,
        &cutter,
        &ToolAngles {
            lead: 0.0,
            tilt: 0.0,
        },
    )
    .unwrap();
    let lead = g.min_lead.expect("a lead angle exists");
    assert!(g.gouges && lead > 0.05, "{lead}");
    for (delta, should_gouge) in [(-3f64.to_radians(), true), (3f64.to_radians(), false)] {
        let angles = ToolAngles {
            lead: lead + delta,
            tilt: 0.0,
        };
        assert_eq!(
            gouge_state(&f, side, &cutter, &angles).unwrap().gouges,
            should_gouge
        );
        let axis = tool_axis(&f, side, &angles).unwrap().space;
        let pen = max_penetration(&cutter, axis, f.point, f.n, 0.12, depth);
        if should_gouge {
            assert!(pen > 1e-7, "expected penetration, got {pen}");
        } else {
            assert!(pen < 1e-9, "unexpected penetration {pen}");
        }
    }
    // Tilting the axis toward B instead turns the corner circle (radius 1) into the concave
    // cross direction and the wide effective radius into the convex feed direction: no local
    // gouging, and the dense sampling near the contact agrees. But the bottom's far rim (the
    // heel, now across the path) dips into the surface that is concave across: rear gouging,
    // which the windowed sampling cannot see (tests/checks_cutter.rs samples the whole
    // bottom).
    let tilted = ToolAngles {
        lead: 0.0,
        tilt: 0.15,
    };
    let g = gouge_state(&f, side, &cutter, &tilted).unwrap();
    assert!(!g.local_gouges && g.rear.gouges && g.gouges);
    let axis = tool_axis(&f, side, &tilted).unwrap().space;
    assert!(max_penetration(&cutter, axis, f.point, f.n, 0.12, depth) < 1e-9);
}

#[test]
fn cutter_and_angle_validation_names_the_field() {
    let bad = [
        Cutter::Ball { radius: 0.0 },
        Cutter::Flat { radius: f64::NAN },
        Cutter::Toroidal {
            radius: 5.0,
            corner_radius: 6.0,
        },
        Cutter::Toroidal {
            radius: 5.0,
            corner_radius: -1.0,
        },
    ];
    let words = ["radius", "radius", "exceeds", "corner_radius"];
    for (c, w) in bad.iter().zip(words) {
        let e = c.validate().unwrap_err().to_string();
        assert!(e.contains(w), "{e}");
    }
    let e = ToolAngles {
        lead: 2.0,
        tilt: 0.0,
    }
    .validate()
    .unwrap_err()
    .to_string();
    assert!(e.contains("lead"), "{e}");
    let e = ToolAngles {
        lead: 0.0,
        tilt: f64::NAN,
    }
    .validate()
    .unwrap_err()
    .to_string();
    assert!(e.contains("tilt"), "{e}");
    let e = FeedLimits {
        feed: 1.0,
        max_acceleration: -1.0,
        max_jerk: None,
    }
    .validate()
    .unwrap_err();
    assert!(e.to_string().contains("max_acceleration"));
    let e = FibreLimits {
        tow_width: 6.35,
        min_steering_radius: 600.0,
        max_twist_rate: f64::INFINITY,
    };
    assert!(
        e.validate()
            .unwrap_err()
            .to_string()
            .contains("max_twist_rate")
    );
}

// ---------------------------------------------------------------- curvature across the path

// Cylinder of radius R, helix at angle α from the circumferential direction: κn = −cos²α/R
// along the path with the outward normal (REFERENCES.md closed forms), so across it, at α + 90°,
// Euler's formula gives κn(B) = −sin²α/R (do Carmo §3-2). The tool outside (on the N side) sees
// it convex (negative); from inside it is concave (positive).
#[test]
fn cross_path_curvature_on_a_cylinder_helix() {
    let rr = 4.0;
    let s = cylinder(rr, -5.0, 5.0);
    for (a, b) in [(1.0, 0.0), (1.0, 2.0), (0.5, -3.0), (1e-9, 2.0)] {
        let f = CurveOnSurface::new(&s, &uv_line(0.3, -1.0, 0.3 + a, -1.0 + b).unwrap())
            .frame(0.4, &mut Hints::default())
            .unwrap();
        let alpha = (b / (rr * a)).atan();
        let want = -alpha.sin().powi(2) / rr;
        let got = cross_path_curvature(&f, ToolSide::AlongNormal);
        assert!((got - want).abs() < 1e-15, "a {a}, b {b}: {got} vs {want}");
        assert_eq!(cross_path_curvature(&f, ToolSide::AgainstNormal), -got);
        // κn(T) + κn(B) = k1 + k2 (do Carmo §3-2).
        let sum = f.normal_curvature + got;
        assert!((sum - (f.principal.k1 + f.principal.k2)).abs() < 1e-15);
    }
}

// ---------------------------------------------------------------- tool axis

#[test]
fn tool_axis_conventions() {
    let s = sphere(10.0);
    let f = CurveOnSurface::new(&s, &uv_line(0.1, 1.0, 1.0, 1.2).unwrap())
        .frame(0.3, &mut Hints::default())
        .unwrap();
    let a = tool_axis(
        &f,
        ToolSide::AlongNormal,
        &ToolAngles {
            lead: 0.0,
            tilt: 0.0,
        },
    )
    .unwrap();
    assert!((a.space - f.n).norm() < 1e-15);
    let a = tool_axis(
        &f,
        ToolSide::AgainstNormal,
        &ToolAngles {
            lead: 0.0,
            tilt: 0.0,
        },
    )
    .unwrap();
    assert!((a.space + f.n).norm() < 1e-15);
    let (lead, tilt) = (0.3, -0.2);
    let ang = ToolAngles { lead, tilt };
    let a = tool_axis(&f, ToolSide::AlongNormal, &ang).unwrap();
    assert!((a.space.norm() - 1.0).abs() < 1e-15);
    // Inclination from the normal: cos β = cos λ cos θ; leaning toward +T by λ.
    assert!((a.space.dot(&f.n) - lead.cos() * tilt.cos()).abs() < 1e-15);
    assert!((a.space.dot(&f.t) - lead.sin()).abs() < 1e-15);
    assert!((ang.inclination() - (lead.cos() * tilt.cos()).acos()).abs() < 1e-15);
    assert!(a.space.dot(&f.b) < 0.0);
}

// ---------------------------------------------------------------- feed and fibre

// Latitude circle of a sphere: space curvature 1/(R sin φ), so the feed limit is
// √(a R sin φ) (centripetal acceleration v²/ρ, physics) and (j ρ²)^{1/3} for jerk.
#[test]
fn feed_limit_on_a_circle() {
    let (big_r, phi) = (20.0, 0.8);
    let s = sphere(big_r);
    let f = CurveOnSurface::new(&s, &uv_line(0.0, phi, 3.0, phi).unwrap())
        .frame(0.5, &mut Hints::default())
        .unwrap();
    let rho = big_r * phi.sin();
    let lim = FeedLimits {
        feed: 1e6,
        max_acceleration: 3000.0,
        max_jerk: None,
    };
    assert!(
        rel(
            curvature_limited_feed(&f, &lim).unwrap(),
            (3000.0 * rho).sqrt()
        ) < 1e-12
    );
    let lim = FeedLimits {
        feed: 1e6,
        max_acceleration: 1e12,
        max_jerk: Some(5e4),
    };
    assert!(
        rel(
            curvature_limited_feed(&f, &lim).unwrap(),
            (5e4 * rho * rho).cbrt()
        ) < 1e-12
    );
    let lim = FeedLimits {
        feed: 50.0,
        max_acceleration: 3000.0,
        max_jerk: None,
    };
    assert_eq!(curvature_limited_feed(&f, &lim).unwrap(), 50.0);
}

// A course steered on a circle of radius ρ in a plane: steering radius ρ, tow-edge strain
// w/(2ρ) (REFERENCES.md, composites); τg = 0 on a plane.
#[test]
fn fibre_steering_on_a_plane_circle() {
    let s = plane((-2000.0, 2000.0), (-2000.0, 2000.0));
    let rho = 800.0;
    let circle = strake::FnCurve::new(
        strake::Interval::new("t", 0.0, 1.0).unwrap(),
        move |t: f64| {
            let (st, ct) = t.sin_cos();
            Ok(strake::CurveJet {
                u: rho * ct,
                v: rho * st,
                du: -rho * st,
                dv: rho * ct,
                ddu: -rho * ct,
                ddv: -rho * st,
            })
        },
    );
    let f = CurveOnSurface::new(&s, &circle)
        .frame(0.4, &mut Hints::default())
        .unwrap();
    let lim = FibreLimits {
        tow_width: 6.35,
        min_steering_radius: 1000.0,
        max_twist_rate: 1e-3,
    };
    let st = fibre_state(&f, &lim).unwrap();
    assert!(rel(st.steering_radius, rho) < 1e-12);
    assert!(rel(st.edge_strain, 6.35 / (2.0 * rho)) < 1e-12);
    assert!(st.steering_violated && !st.twist_violated);
}

// ---------------------------------------------------------------- summaries

// A ball-end mill of radius rb outside a torus (R, r), along a meridian v ∈ [0, 2π]: the
// concave curvature toward the tool is −cos v/(R + r cos v) on the inner side (do Carmo §3-3,
// torus), so the cutter gouges where cos v < −R/(rb + r); the meridian's arc length is r v.
// The violation interval must come out at those arc lengths.
#[test]
fn violation_interval_on_a_torus_meridian() {
    let (big_r, r, rb) = (5.0, 1.5, 5.0);
    let s = torus(big_r, r);
    let eps = 1e-9;
    let path = uv_line(0.7, eps, 0.7, 2.0 * PI - eps).unwrap();
    let cs = CurveOnSurface::new(&s, &path);
    let n = 4001;
    let mut samples = Vec::with_capacity(n);
    let mut hints = Hints::default();
    for i in 0..n {
        let t = i as f64 / (n - 1) as f64;
        let frame = cs.frame(t, &mut hints).unwrap();
        samples.push(PathSample {
            t,
            arc_length: r * frame.v,
            frame,
        });
    }
    let cutter = Cutter::Ball { radius: rb };
    let flat = ToolAngles {
        lead: 0.0,
        tilt: 0.0,
    };
    let kc: Vec<f64> = samples
        .iter()
        .map(|p| {
            gouge_state(&p.frame, ToolSide::AlongNormal, &cutter, &flat)
                .unwrap()
                .concave_curvature
        })
        .collect();
    let mut out = Vec::new();
    violations(&samples, &kc, 1.0 / rb, &mut out).unwrap();
    assert_eq!(out.len(), 1, "{out:?}");
    let v0 = (-big_r / (rb + r)).acos();
    let (s0, s1) = (r * v0, r * (2.0 * PI - v0));
    assert!(
        (out[0].start_arc_length - s0).abs() < 1e-6,
        "{} vs {s0}",
        out[0].start_arc_length
    );
    assert!(
        (out[0].end_arc_length - s1).abs() < 1e-6,
        "{} vs {s1}",
        out[0].end_arc_length
    );
    // The worst point is the innermost circle v = π: curvature 1/(R − r).
    let ex = extremes(&samples, &kc).unwrap();
    assert!(rel(ex.max, 1.0 / (big_r - r)) < 1e-9);
    assert!((ex.max_arc_length - r * PI).abs() < 2.0 * r * PI / (n - 1) as f64);
    assert!(rel(out[0].worst, ex.max) < 1e-15);
}

#[test]
fn summaries_refuse_bad_input() {
    assert!(extremes::<PathSample>(&[], &[]).is_err());
    let s = plane((-1.0, 1.0), (-1.0, 1.0));
    let f = CurveOnSurface::new(&s, &uv_line(0.0, 0.0, 0.5, 0.5).unwrap())
        .frame(0.0, &mut Hints::default())
        .unwrap();
    let samples = [PathSample {
        t: 0.0,
        arc_length: 0.0,
        frame: f,
    }];
    let e = extremes(&samples, &[f64::NAN]).unwrap_err().to_string();
    assert!(e.contains("value[0]"), "{e}");
    assert!(violations(&samples, &[1.0, 2.0], 0.0, &mut Vec::new()).is_err());
    // A sample whose arc length is not finite is refused by index.
    let mut bad = [samples[0], samples[0]];
    bad[1].arc_length = f64::INFINITY;
    let e = extremes(&bad, &[1.0, 2.0]).unwrap_err().to_string();
    assert!(e.contains("sample[1] has arc length = inf"), "{e}");
}
