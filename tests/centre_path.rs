//! Rates of change of the invariants and the tool-centre path, against closed forms, a
//! symbolic route (`tests/reference/rates.txt`, from `tests/reference/gen_rates.py`) and a
//! brute-force construction (finite differences of the centre points on a fine sampling).
//!
//! Tilt is 0 in every case here, so the expectations hold in both the current tool-axis
//! convention and the tool-side-frame convention of issue 12 item 6 (they differ only for
//! tilt ≠ 0); the generator uses the tool-side-frame formula.

#![allow(clippy::needless_range_loop)]

use strake::analytic::{self, AnalyticSurface};
use strake::checks::tool_axis::ToolAngles;
use strake::checks::{Cutter, ToolSide};
use strake::toolpath::centre_path_at;
use strake::{
    CentreFeedLimits, CentrePoint, CurveOnSurface, FeedBound, Hints, NurbsCurve, StrakeError,
    SurfaceSource, ToolSetup, centre_feed, centre_point,
};

fn bezier(p: [[f64; 2]; 4]) -> NurbsCurve<2> {
    NurbsCurve::new(3, &[0.0, 0.0, 0.0, 0.0, 1.0, 1.0, 1.0, 1.0], &p, None).unwrap()
}

fn line(u0: f64, v0: f64, u1: f64, v1: f64) -> NurbsCurve<2> {
    bezier(std::array::from_fn(|k| {
        let f = k as f64 / 3.0;
        [u0 + (u1 - u0) * f, v0 + (v1 - v0) * f]
    }))
}

/// z = 0.3 sin x cos 1.3y + 0.1 x² y, exact partials to fourth order.
fn monge() -> AnalyticSurface {
    analytic::monge_high((-2.0, 2.0), (-2.0, 2.0), |x, y| {
        let ds = |k: usize, a: f64| [a.sin(), a.cos(), -a.sin(), -a.cos()][k % 4];
        let dc = |k: usize, a: f64| [a.cos(), -a.sin(), -a.cos(), a.sin()][k % 4];
        let mut d = [[0.0; 5]; 5];
        for i in 0..5 {
            for j in 0..5 - i {
                d[i][j] = 0.3 * ds(i, x) * 1.3f64.powi(j as i32) * dc(j, 1.3 * y);
            }
        }
        // 0.1 x² y.
        d[0][0] += 0.1 * x * x * y;
        d[1][0] += 0.2 * x * y;
        d[0][1] += 0.1 * x * x;
        d[2][0] += 0.2 * y;
        d[1][1] += 0.2 * x;
        d[2][1] += 0.2;
        d
    })
}

fn surface(name: &str) -> AnalyticSurface {
    match name {
        "cylinder12" => analytic::cylinder(12.0, -1.0, 30.0),
        "sphere3" => analytic::sphere(3.0),
        "torus5_2" => analytic::torus(5.0, 2.0),
        "monge" => monge(),
        _ => panic!("unknown surface {name}"),
    }
}

fn cutter(big_r: f64, r: f64) -> Cutter {
    if big_r == 0.0 {
        Cutter::Ball { radius: r }
    } else if r == 0.0 {
        Cutter::Flat { radius: big_r }
    } else {
        Cutter::Toroidal {
            radius: big_r + r,
            corner_radius: r,
        }
    }
}

struct Case {
    name: &'static str,
    surface: &'static str,
    curve: NurbsCurve<2>,
    setup: ToolSetup,
}

fn setup(big_r: f64, r: f64, side: f64, lead: f64) -> ToolSetup {
    ToolSetup {
        cutter: cutter(big_r, r),
        side: if side > 0.0 {
            ToolSide::AlongNormal
        } else {
            ToolSide::AgainstNormal
        },
        angles: ToolAngles { lead, tilt: 0.0 },
    }
}

/// The cases of gen_rates.py, built the same way.
fn cases() -> Vec<Case> {
    let monge_curve = || bezier([[-1.0, -0.5], [-0.2, 0.6], [0.5, -0.3], [1.2, 0.7]]);
    vec![
        Case {
            name: "cyl_circle_ball_in",
            surface: "cylinder12",
            curve: line(0.0, 1.0, 3.0, 1.0),
            setup: setup(0.0, 10.0, -1.0, 0.0),
        },
        Case {
            name: "cyl_circle_ball_out",
            surface: "cylinder12",
            curve: line(0.0, 1.0, 3.0, 1.0),
            setup: setup(0.0, 10.0, 1.0, 0.0),
        },
        Case {
            name: "cyl_helix_ball_in",
            surface: "cylinder12",
            curve: line(0.0, 0.0, 3.0, 20.0),
            setup: setup(0.0, 4.0, -1.0, 0.0),
        },
        Case {
            name: "sphere_latitude_ball_out",
            surface: "sphere3",
            curve: line(0.0, 1.0, 3.0, 1.0),
            setup: setup(0.0, 1.0, -1.0, 0.0),
        },
        Case {
            name: "sphere_curve_ball_in",
            surface: "sphere3",
            curve: bezier([[0.0, 1.0], [0.5, 1.2], [1.5, 0.8], [2.5, 1.3]]),
            setup: setup(0.0, 1.0, 1.0, 0.0),
        },
        Case {
            name: "torus_parallel_ball",
            surface: "torus5_2",
            curve: line(0.0, 0.7, 3.0, 0.7),
            setup: setup(0.0, 0.5, 1.0, 0.0),
        },
        Case {
            name: "torus_curve_toroidal_lead",
            surface: "torus5_2",
            curve: line(0.0, 0.5, 1.5, 0.9),
            setup: setup(1.5, 0.5, 1.0, 0.2),
        },
        Case {
            name: "monge_curve_ball",
            surface: "monge",
            curve: monge_curve(),
            setup: setup(0.0, 0.75, 1.0, 0.0),
        },
        Case {
            name: "monge_curve_flat_lead",
            surface: "monge",
            curve: monge_curve(),
            setup: setup(0.5, 0.0, 1.0, 0.1),
        },
    ]
}

fn close(a: f64, b: f64, tol: f64) -> bool {
    (a - b).abs() <= tol * (1.0 + b.abs())
}

/// Every reference line: the rates from third-order jets and the centre path from fourth
/// order agree with the symbolic route (sympy, 50 digits) to 1e-9.
#[test]
fn rates_and_centre_path_match_the_symbolic_route() {
    let text = std::fs::read_to_string("tests/reference/rates.txt").unwrap();
    let cases = cases();
    let mut lines = 0;
    for line in text
        .lines()
        .filter(|l| !l.starts_with('#') && !l.trim().is_empty())
    {
        let mut it = line.split_whitespace();
        let name = it.next().unwrap();
        let nums: Vec<f64> = it.map(|x| x.parse().unwrap()).collect();
        assert_eq!(nums.len(), 9, "{line}");
        let case = cases.iter().find(|c| c.name == name).expect(name);
        let s = surface(case.surface);
        let path = CurveOnSurface::new(&s, &case.curve);
        let t = nums[0];
        let mut hints = Hints::default();
        let (f, r) = path.frame_with_rates(t, &mut hints).unwrap();
        let got = [
            r.normal_curvature,
            r.geodesic_curvature,
            r.geodesic_torsion,
            r.space_curvature,
        ];
        for (k, (g, w)) in got.iter().zip(&nums[1..5]).enumerate() {
            assert!(close(*g, *w, 1e-9), "{name} t {t} rate {k}: {g} vs {w}");
        }
        let (f4, sp, cp) = path.frame_and_partials(t, 4, &mut hints).unwrap();
        assert_eq!(f4, f);
        let p = centre_point(&f, &sp, &cp, s.orientation(), &case.setup, t).unwrap();
        let got = [
            p.speed_ratio,
            p.curvature,
            p.curvature_rate.unwrap(),
            p.torsion.unwrap(),
        ];
        for (k, (g, w)) in got.iter().zip(&nums[5..9]).enumerate() {
            assert!(
                close(*g, *w, 1e-9),
                "{name} t {t} centre quantity {k}: {g} vs {w}"
            );
        }
        lines += 1;
    }
    assert_eq!(lines, 21);
}

fn centre_at(s: &AnalyticSurface, c: &NurbsCurve<2>, st: &ToolSetup, t: f64) -> CentrePoint {
    let path = CurveOnSurface::new(s, c);
    let (f, sp, cp) = path
        .frame_and_partials(t, 4, &mut Hints::default())
        .unwrap();
    centre_point(&f, &sp, &cp, s.orientation(), st, t).unwrap()
}

/// Closed forms (exact geometry): a ball of radius r moving circumferentially inside a
/// cylinder of radius ρ runs its centre on a circle of radius ρ − r, outside on ρ + r; along a
/// helix of pitch c (dz/du) the centre runs a helix of radius ρ' = ρ − r with curvature
/// ρ'/(ρ'² + c²) and torsion c/(ρ'² + c²) (do Carmo §1-5, example of the helix); a ball
/// outside a sphere of radius R along a circle of colatitude φ runs on a circle of radius
/// (R + r) sin φ; a ball on a torus parallel at v runs on a parallel of radius
/// R + (r_t + r) cos v. Curvature rates are 0 on all of these, and so are the contact path's
/// rates of change of κn, κg, τg.
#[test]
fn closed_forms() {
    let cyl = analytic::cylinder(12.0, -1.0, 30.0);
    let circle = line(0.0, 1.0, 3.0, 1.0);
    let inside = centre_at(&cyl, &circle, &setup(0.0, 10.0, -1.0, 0.0), 0.4);
    assert!(close(inside.curvature, 0.5, 1e-13), "{}", inside.curvature);
    assert!(close(inside.speed_ratio, 2.0 / 12.0, 1e-13));
    assert!(inside.curvature_rate.unwrap().abs() < 1e-12);
    assert!(close(inside.centre.xy().norm(), 2.0, 1e-13));
    let outside = centre_at(&cyl, &circle, &setup(0.0, 10.0, 1.0, 0.0), 0.4);
    assert!(close(outside.curvature, 1.0 / 22.0, 1e-13));
    assert!(close(outside.speed_ratio, 22.0 / 12.0, 1e-13));

    let helix = line(0.0, 0.0, 3.0, 20.0);
    let h = centre_at(&cyl, &helix, &setup(0.0, 4.0, -1.0, 0.0), 0.3);
    let (rho, c) = (8.0, 20.0 / 3.0);
    assert!(close(h.curvature, rho / (rho * rho + c * c), 1e-13));
    assert!(close(h.torsion.unwrap(), c / (rho * rho + c * c), 1e-12));
    assert!(close(
        h.speed_ratio,
        (rho * rho + c * c).sqrt() / (144.0f64 + c * c).sqrt(),
        1e-13
    ));
    assert!(h.curvature_rate.unwrap().abs() < 1e-12);

    let sphere = analytic::sphere(3.0);
    let lat = centre_at(&sphere, &circle, &setup(0.0, 1.0, -1.0, 0.0), 0.6);
    assert!(close(lat.curvature, 1.0 / (4.0 * 1.0f64.sin()), 1e-13));
    assert!(close(lat.centre.norm(), 4.0, 1e-13));

    let torus = analytic::torus(5.0, 2.0);
    let par = line(0.0, 0.7, 3.0, 0.7);
    let tp = centre_at(&torus, &par, &setup(0.0, 0.5, 1.0, 0.0), 0.5);
    let big = 5.0 + 2.5 * 0.7f64.cos();
    assert!(close(tp.curvature, 1.0 / big, 1e-13));
    assert!(close(
        tp.speed_ratio,
        big / (5.0 + 2.0 * 0.7f64.cos()),
        1e-13
    ));
    assert!(tp.curvature_rate.unwrap().abs() < 1e-12);

    for (s, c) in [(&cyl, &helix), (&torus, &par), (&sphere, &circle)] {
        let path = CurveOnSurface::new(s, c);
        let (_, r) = path.frame_with_rates(0.45, &mut Hints::default()).unwrap();
        for x in [
            r.normal_curvature,
            r.geodesic_curvature,
            r.geodesic_torsion,
            r.space_curvature,
        ] {
            assert!(x.abs() < 1e-12, "{r:?}");
        }
    }
}

/// Brute force: the centre points on a fine sampling, differenced; the curvature of the
/// discrete centre path and the difference quotient of the exact curvature agree with the
/// exact values.
#[test]
fn centre_path_against_finite_differences() {
    for case in cases() {
        let s = surface(case.surface);
        for &t in &[0.25, 0.6] {
            let h = 1e-4;
            let at = |x: f64| centre_at(&s, &case.curve, &case.setup, x);
            let (pm, p0, pp) = (at(t - h), at(t), at(t + h));
            let d1 = (pp.centre - pm.centre) / (2.0 * h);
            let d2 = (pp.centre - 2.0 * p0.centre + pm.centre) / (h * h);
            let k = d1.cross(&d2).norm() / d1.norm().powi(3);
            assert!(
                close(k, p0.curvature, 1e-5),
                "{}: {k} vs {}",
                case.name,
                p0.curvature
            );
            assert!((d1.normalize() - p0.tangent).norm() < 1e-7);
            let dk = (pp.curvature - pm.curvature) / (2.0 * h) / d1.norm();
            let rate = p0.curvature_rate.unwrap();
            assert!(
                (dk - rate).abs() < 1e-5 * (1.0 + rate.abs()),
                "{}: {dk} vs {rate}",
                case.name
            );
            // The tool tip lies one corner radius below the centre along the axis.
            let (_, r) = case.setup.cutter.torus_radii();
            assert!(((p0.centre - p0.tip) - p0.axis * r).norm() < 1e-12);
        }
    }
}

/// Issue 12's numbers: a ball of radius 10 mm in a concave cylinder of radius 12 mm under
/// a_max = 2 m/s² = 2000 mm/s² allows √(2000 · 2) ≈ 63.2 mm/s on the centre path; the contact
/// path's curvature 1/12 would allow √(2000 · 12) ≈ 154.9 mm/s.
#[test]
fn feed_on_the_centre_path_of_a_ball_in_a_cylinder() {
    let cyl = analytic::cylinder(12.0, -1.0, 30.0);
    let circle = line(0.0, 1.0, 3.0, 1.0);
    let p = centre_at(&cyl, &circle, &setup(0.0, 10.0, -1.0, 0.0), 0.4);
    let limits = CentreFeedLimits {
        feed: 500.0,
        max_acceleration: 2000.0,
        max_jerk: None,
        max_angular_speed: None,
    };
    let f = centre_feed(&p, &limits).unwrap();
    assert!(close(f.feed, 4000.0f64.sqrt(), 1e-12), "{}", f.feed);
    assert_eq!(f.bound, FeedBound::Acceleration);
    assert!(close(f.contact_feed, 4000.0f64.sqrt() * 6.0, 1e-12));
    let old = strake::checks::curvature_limited_feed(
        &CurveOnSurface::new(&cyl, &circle)
            .frame(0.4, &mut Hints::default())
            .unwrap(),
        &strake::checks::FeedLimits {
            feed: 500.0,
            max_acceleration: 2000.0,
            max_jerk: None,
        },
    )
    .unwrap();
    assert!(close(old, 24000.0f64.sqrt(), 1e-12));
    // Jerk on a circle: |x'''| = κ² (no curvature rate, no torsion): v = (j / κ²)^(1/3).
    let j = centre_feed(
        &p,
        &CentreFeedLimits {
            max_jerk: Some(1000.0),
            ..limits
        },
    )
    .unwrap();
    assert!(close(j.jerk_feed, (1000.0f64 / 0.25).cbrt(), 1e-12));
    assert_eq!(j.bound, FeedBound::Jerk);
    // A ball with lead 0 keeps the axis along N: on the cylinder's circle it turns with the
    // normal, |ω × a| = |κn| = 1/12 per unit contact length, 1/2 per unit centre length.
    assert!(close(p.axis_rate, 0.5, 1e-12));
    let w = centre_feed(
        &p,
        &CentreFeedLimits {
            max_angular_speed: Some(10.0),
            ..limits
        },
    )
    .unwrap();
    assert!(close(w.angular_feed, 20.0, 1e-12));
    assert_eq!(w.bound, FeedBound::AngularSpeed);
    // Bad limits name the field.
    for bad in [0.0, f64::NAN, -1.0] {
        let e = centre_feed(
            &p,
            &CentreFeedLimits {
                max_acceleration: bad,
                ..limits
            },
        )
        .unwrap_err();
        assert!(e.to_string().contains("max_acceleration"), "{e}");
    }
}

/// A ball larger than the concave radius: the centre path folds back; reported with its own
/// error naming the first sample and the count, never a NaN.
#[test]
fn folding_centre_path_is_refused() {
    let cyl = analytic::cylinder(12.0, -1.0, 30.0);
    let circle = line(0.0, 1.0, 3.0, 1.0);
    let path = CurveOnSurface::new(&cyl, &circle);
    let ts = [0.1, 0.2, 0.3];
    let mut out = [centre_at(&cyl, &circle, &setup(0.0, 10.0, -1.0, 0.0), 0.1); 3];
    let e = centre_path_at(&path, &ts, &setup(0.0, 13.0, -1.0, 0.0), 3, &mut out).unwrap_err();
    assert_eq!(e.index, 0);
    match e.error {
        StrakeError::CentrePathFolds {
            count, speed_along, ..
        } => {
            assert_eq!(count, 3);
            assert!(close(speed_along, 1.0 - 13.0 / 12.0, 1e-12));
        }
        other => panic!("{other:?}"),
    }
    // Exactly the concave radius: speed 0, folds too.
    let e = centre_path_at(&path, &ts, &setup(0.0, 12.0, -1.0, 0.0), 3, &mut out).unwrap_err();
    assert!(matches!(e.error, StrakeError::CentrePathFolds { .. }));
    // Whole path at order 3: no rates; at order 4: rates.
    centre_path_at(&path, &ts, &setup(0.0, 10.0, -1.0, 0.0), 3, &mut out).unwrap();
    assert!(
        out.iter()
            .all(|p| p.curvature_rate.is_none() && close(p.curvature, 0.5, 1e-13))
    );
    centre_path_at(&path, &ts, &setup(0.0, 10.0, -1.0, 0.0), 4, &mut out).unwrap();
    assert!(out.iter().all(|p| p.curvature_rate.is_some()));
}

/// A source that gives second order only (a Monge patch built from six values) is refused
/// with OrderUnavailable naming the surface, from exactly the calls that need order 3.
#[test]
fn second_order_source_is_refused_where_third_order_is_needed() {
    let s = analytic::monge((-1.0, 1.0), (-1.0, 1.0), |x, y| {
        [x * y, y, x, 0.0, 1.0, 0.0]
    });
    let c = line(-0.5, -0.5, 0.5, 0.4);
    let path = CurveOnSurface::new(&s, &c);
    let mut hints = Hints::default();
    assert!(path.frame(0.5, &mut hints).is_ok());
    let e = path.frame_with_rates(0.5, &mut hints).unwrap_err();
    assert_eq!(
        e,
        StrakeError::OrderUnavailable {
            which: "surface",
            needed: 3,
            available: 2
        }
    );
    assert!(e.to_string().contains("surface"));
}

/// frames_with_rates_at gives the frames of frames_at bit for bit and the rates of the
/// one-point call.
#[test]
fn frames_with_rates_for_a_whole_path() {
    let s = monge();
    let c = bezier([[-1.0, -0.5], [-0.2, 0.6], [0.5, -0.3], [1.2, 0.7]]);
    let path = CurveOnSurface::new(&s, &c);
    let ts: Vec<f64> = (0..100).map(|i| i as f64 / 99.0).collect();
    let mut frames = vec![path.frame(0.0, &mut Hints::default()).unwrap(); ts.len()];
    let mut plain = frames.clone();
    let mut rates = vec![strake::InvariantRates::default(); ts.len()];
    path.frames_with_rates_at(&ts, &mut frames, &mut rates)
        .unwrap();
    path.frames_at(&ts, &mut plain).unwrap();
    assert_eq!(frames, plain);
    for (i, &t) in ts.iter().enumerate().step_by(17) {
        let (_, r) = path.frame_with_rates(t, &mut Hints::default()).unwrap();
        assert_eq!(r, rates[i]);
    }
}
