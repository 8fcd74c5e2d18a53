//! Point inversion (The NURBS Book 2nd ed. §6.1) and curves in space brought onto a surface.
//!
//! Every expected value comes from the geometry the points were generated from: a point made as
//! S(u, v) must come back as (u, v); a point pushed off along the unit normal by d must come
//! back at distance |d| (the normal line meets the surface at right angles, so the foot point is
//! S(u, v) while |d| is below the radii of curvature: do Carmo §3-2, the tube / offset
//! argument [memory]); closed forms of the torus parallel from do Carmo ch. 3 as listed in
//! shared/REFERENCES.md.

use std::f64::consts::{PI, TAU};
use strake::analytic::{cylinder, monge, plane, torus};
use strake::paths::projection::{FitOptions, ProjectionOptions, project_curve, project_points};
use strake::{
    CurveOnSurface, DerivOrder, Hints, NurbsCurve, StrakeError, SurfaceHint, SurfaceSource,
    UvCurve, Vec3, uv_curve_through_points,
};

fn jet<S: SurfaceSource>(s: &S, u: f64, v: f64) -> strake::SurfaceJet {
    s.checked_jet(u, v, DerivOrder::First, &mut SurfaceHint::default())
        .unwrap()
}

fn normal<S: SurfaceSource>(s: &S, u: f64, v: f64) -> Vec3 {
    let j = jet(s, u, v);
    j.su.cross(&j.sv).normalize() * s.orientation().sign()
}

fn arr(p: Vec3) -> [f64; 3] {
    [p.x, p.y, p.z]
}

/// Angular difference reduced to (−π, π].
fn angle_diff(a: f64, b: f64) -> f64 {
    let d = (a - b).rem_euclid(TAU);
    if d > PI { d - TAU } else { d }
}

/// A small deterministic generator in [0, 1) (xorshift; common practice).
struct Rng(u64);
impl Rng {
    fn next(&mut self) -> f64 {
        self.0 ^= self.0 << 13;
        self.0 ^= self.0 >> 7;
        self.0 ^= self.0 << 17;
        (self.0 >> 11) as f64 / (1u64 << 53) as f64
    }
}

fn wavy() -> strake::analytic::AnalyticSurface {
    // z = 0.3 sin x cos y over [0, 3] × [0, 2]: curvatures below 0.6, radii above 1.6.
    monge((0.0, 3.0), (0.0, 2.0), |x, y| {
        let (sx, cx) = x.sin_cos();
        let (sy, cy) = y.sin_cos();
        [
            0.3 * sx * cy,
            0.3 * cx * cy,
            -0.3 * sx * sy,
            -0.3 * sx * cy,
            -0.3 * cx * sy,
            -0.3 * sx * cy,
        ]
    })
}

// A point generated as S(u, v) is recovered as (u, v) to 1e-12 (§6.1: the foot point of a
// point on the surface is itself), each point from a fresh coarse search.
#[test]
fn recovers_parameters_of_points_on_the_surface() {
    let t = torus(3.0, 1.0);
    let opts = ProjectionOptions::new(1e-9).periodic(true, true);
    let mut rng = Rng(0x1234_5678_9abc_def1);
    for _ in 0..200 {
        let (u, v) = (TAU * rng.next(), TAU * rng.next());
        let p = arr(jet(&t, u, v).p);
        let pr = &project_points(&t, &[p], &opts).unwrap()[0];
        assert!(angle_diff(pr.u, u).abs() < 1e-12, "u {} vs {u}", pr.u);
        assert!(angle_diff(pr.v, v).abs() < 1e-12, "v {} vs {v}", pr.v);
        assert!(pr.distance < 1e-13, "{}", pr.distance);
        assert!((0.0..TAU).contains(&pr.u) && (0.0..TAU).contains(&pr.v));
    }
    let w = wavy();
    let opts = ProjectionOptions::new(1e-9);
    let pts: Vec<(f64, f64)> = (0..100)
        .map(|_| (3.0 * rng.next(), 2.0 * rng.next()))
        .collect();
    let ps: Vec<[f64; 3]> = pts.iter().map(|&(u, v)| arr(jet(&w, u, v).p)).collect();
    // As one batch: continuation from the previous foot point, restarts where needed.
    for (pr, &(u, v)) in project_points(&w, &ps, &opts).unwrap().iter().zip(&pts) {
        assert!(
            (pr.u - u).abs() < 1e-12 && (pr.v - v).abs() < 1e-12,
            "{pr:?} vs {u}, {v}"
        );
    }
}

// A point pushed off the surface by d along the unit normal comes back at distance |d|, with
// signed distance d, and the foot point's parameters (offset-surface geometry, do Carmo §3-2
// [memory]: valid while |d| is below the smallest radius of curvature).
#[test]
fn pushed_off_points_come_back_with_their_distance() {
    let t = torus(3.0, 1.0);
    let opts = ProjectionOptions::new(1.0).periodic(true, true);
    let mut rng = Rng(42);
    for k in 0..200 {
        let (u, v) = (TAU * rng.next(), TAU * rng.next());
        // Inside the tube |d| < r = 1; outside any d > 0 (normal is outward).
        let d = if k % 2 == 0 {
            0.6 * rng.next() + 0.01
        } else {
            -0.6 * rng.next() - 0.01
        };
        let p = jet(&t, u, v).p + normal(&t, u, v) * d;
        let pr = &project_points(&t, &[arr(p)], &opts).unwrap()[0];
        assert!(
            (pr.distance - d.abs()).abs() < 1e-12,
            "{} vs {d}",
            pr.distance
        );
        assert!(
            (pr.signed_distance - d).abs() < 1e-12,
            "{} vs {d}",
            pr.signed_distance
        );
        assert!(angle_diff(pr.u, u).abs() < 1e-11 && angle_diff(pr.v, v).abs() < 1e-11);
    }
    let w = wavy();
    let opts = ProjectionOptions::new(1.0);
    for _ in 0..100 {
        let (u, v) = (0.2 + 2.6 * rng.next(), 0.2 + 1.6 * rng.next());
        let d = 0.4 * (rng.next() - 0.5);
        let p = jet(&w, u, v).p + normal(&w, u, v) * d;
        let pr = &project_points(&w, &[arr(p)], &opts).unwrap()[0];
        assert!((pr.distance - d.abs()).abs() < 1e-12);
        assert!((pr.signed_distance - d).abs() < 1e-12);
        assert!(
            (pr.u - u).abs() < 1e-11 && (pr.v - v).abs() < 1e-11,
            "{pr:?}"
        );
    }
}

// Seam: a torus parallel running across u = 0 (= 2π). The continued parameters stay
// continuous; the interpolated curve on the surface has the parallel's invariants:
// κn = −cos v/ρ, κg = sin v/ρ, τg = 0 with ρ = R + r cos v, for the analytic torus's outward
// normal and u increasing (do Carmo ch. 3 via shared/REFERENCES.md; signs derived from the
// curvature vector −(cos u, sin u, 0)/ρ of the circle, N = (cos v cos u, cos v sin u, sin v),
// B = N × T = (−sin v cos u, −sin v sin u, cos v)).
#[test]
fn seam_of_a_torus_is_crossed_continuously() {
    let (big_r, r, v0) = (3.0, 1.0, 0.7);
    let t = torus(big_r, r);
    let opts = ProjectionOptions::new(1e-9).periodic(true, true);
    let us: Vec<f64> = (0..41).map(|k| -0.8 + 1.6 * k as f64 / 40.0).collect();
    let pts: Vec<[f64; 3]> = us
        .iter()
        .map(|&u| arr(jet(&t, u.rem_euclid(TAU), v0).p))
        .collect();
    let pc = uv_curve_through_points(&t, &pts, &opts, &FitOptions::default()).unwrap();
    for (w, pr) in pc.projections.windows(2).zip(&pc.projections) {
        let du = w[1].u_path - w[0].u_path;
        assert!((du - 0.04).abs() < 1e-12, "jump {du} at {pr:?}");
        assert!((0.0..TAU).contains(&pr.u));
    }
    let rho = big_r + r * v0.cos();
    let cs = CurveOnSurface::new(&t, &pc.curve);
    let mut h = Hints::default();
    for i in 0..=100 {
        let f = cs.frame(i as f64 / 100.0, &mut h).unwrap();
        assert!((f.normal_curvature + v0.cos() / rho).abs() < 1e-8, "{f:?}");
        assert!(
            (f.geodesic_curvature - v0.sin() / rho).abs() < 1e-8,
            "{f:?}"
        );
        assert!(f.geodesic_torsion.abs() < 1e-8, "{f:?}");
        assert!((0.0..=TAU).contains(&f.u));
    }
}

// Seam of a cylinder: a helix (R cos θ, R sin θ, hθ), θ in [−1, 1], crosses u = 0. Its
// parameters are u = θ (mod 2π), v = hθ (elementary).
#[test]
fn seam_of_a_cylinder_is_crossed_by_a_helix() {
    let (rr, hh) = (2.0, 0.3);
    let c = cylinder(rr, -1.0, 1.0);
    let thetas: Vec<f64> = (0..=30).map(|k| -1.0 + k as f64 / 15.0).collect();
    let pts: Vec<[f64; 3]> = thetas
        .iter()
        .map(|&th| [rr * th.cos(), rr * th.sin(), hh * th])
        .collect();
    let opts = ProjectionOptions::new(1e-9).periodic(true, false);
    let prs = project_points(&c, &pts, &opts).unwrap();
    let offset = prs[0].u_path - thetas[0];
    assert!((offset / TAU - (offset / TAU).round()).abs() < 1e-12);
    for (pr, &th) in prs.iter().zip(&thetas) {
        assert!((pr.u_path - offset - th).abs() < 1e-12, "{pr:?} vs {th}");
        assert!((pr.v - hh * th).abs() < 1e-12);
        assert!(angle_diff(pr.u, th).abs() < 1e-12);
    }
}

// Boundary: a path along v = v_min of a Monge patch. Points on the edge, and pushed off along
// N, come back with v = v_min exactly (clamped Newton steps, §6.1). A point beside the patch
// projects onto the edge: over the plane z = 0 on [0, 3] × [0, 1], P = (x, −a, b) has its foot
// at (x, 0), distance √(a² + b²) and signed distance b (elementary).
#[test]
fn paths_along_a_boundary() {
    let w = wavy();
    let opts = ProjectionOptions::new(1.0);
    let us: Vec<f64> = (0..25).map(|k| 0.1 + 0.1 * k as f64).collect();
    for d in [0.0, 0.05, -0.05] {
        let pts: Vec<[f64; 3]> = us
            .iter()
            .map(|&u| arr(jet(&w, u, 0.0).p + normal(&w, u, 0.0) * d))
            .collect();
        let prs = project_points(&w, &pts, &opts).unwrap();
        for (pr, &u) in prs.iter().zip(&us) {
            assert!(
                pr.v.abs() < 1e-12 && (pr.u - u).abs() < 1e-12,
                "d {d}: {pr:?}"
            );
            assert!((pr.distance - d.abs()).abs() < 1e-12);
        }
    }
    let pl = plane((0.0, 3.0), (0.0, 1.0));
    let pts: Vec<[f64; 3]> = us.iter().map(|&x| [x, -0.3, 0.4]).collect();
    let prs = project_points(&pl, &pts, &opts).unwrap();
    for (pr, &x) in prs.iter().zip(&us) {
        assert!((pr.u - x).abs() < 1e-12 && pr.v == 0.0, "{pr:?}");
        assert!((pr.distance - 0.5).abs() < 1e-12);
        assert!((pr.signed_distance - 0.4).abs() < 1e-12);
    }
    // The parameter-plane curve along the edge stays on it (v = 0 at every foot point).
    let pts: Vec<[f64; 3]> = us.iter().map(|&u| arr(jet(&w, u, 0.0).p)).collect();
    let pc = uv_curve_through_points(&w, &pts, &opts, &FitOptions::default()).unwrap();
    let mut h = strake::SpanHint::default();
    for i in 0..=50 {
        let j = pc.curve.checked_jet(i as f64 / 50.0, &mut h).unwrap();
        assert!(j.v.abs() < 1e-12, "{j:?}");
    }
}

// Every refusal names the point's index and says what is wrong.
#[test]
fn refusals_name_the_point() {
    let t = torus(3.0, 1.0);
    let opts = ProjectionOptions::new(1e-3).periodic(true, true);
    let on = |u: f64, v: f64| arr(jet(&t, u, v).p);
    let mut pts = vec![on(0.1, 0.2), on(0.2, 0.2), on(0.3, 0.2)];
    let off = jet(&t, 0.4, 0.2).p + normal(&t, 0.4, 0.2) * 0.01;
    pts.push(arr(off));
    let e = project_points(&t, &pts, &opts).unwrap_err();
    assert!(
        matches!(&e, StrakeError::AtPoint { index: 3, error } if matches!(**error, StrakeError::TooFarFromSurface { .. })),
        "{e}"
    );
    assert!(
        e.to_string()
            .starts_with("point 3: too far from the surface"),
        "{e}"
    );

    let mut o1 = ProjectionOptions::new(1.0).periodic(true, true);
    o1.max_iterations = 1;
    let p = jet(&t, 1.0, 1.0).p + normal(&t, 1.0, 1.0) * 0.3;
    let e = project_points(&t, &[on(0.5, 0.5), arr(p)], &o1).unwrap_err();
    let s = e.to_string();
    assert!(
        matches!(&e, StrakeError::AtPoint { index: 0 | 1, .. }),
        "{s}"
    );
    assert!(s.contains("not converged"), "{s}");

    let mut bad = pts.clone();
    bad[1][1] = f64::NAN;
    let e = project_points(&t, &bad, &opts).unwrap_err();
    assert_eq!(
        e.to_string(),
        "point 1: non-finite value in input point: y = NaN"
    );

    let e = project_points(&t, &pts, &ProjectionOptions::new(0.0)).unwrap_err();
    assert!(e.to_string().contains("projection tolerance = 0"), "{e}");
    let mut o2 = ProjectionOptions::new(1.0);
    o2.grid = 1;
    assert!(project_points(&t, &pts, &o2).is_err());

    // Two points with the same foot point: the interpolation refuses the second, by index.
    let same = [
        on(0.1, 0.2),
        on(0.2, 0.2),
        on(0.2, 0.2),
        on(0.3, 0.2),
        on(0.4, 0.2),
    ];
    let e = uv_curve_through_points(&t, &same, &opts, &FitOptions::default()).unwrap_err();
    assert!(matches!(e, StrakeError::AtPoint { index: 2, .. }), "{e}");
    let e = uv_curve_through_points(&t, &same[..3], &opts, &FitOptions::default()).unwrap_err();
    assert!(e.to_string().contains("at least 4 points, got 3"), "{e}");
}

/// The 9-point rational quadratic circle of radius ρ at height z (The NURBS Book 2nd ed.
/// §7.5, A7.1 [memory]; weights 1, √2/2, …; knots {0,0,0,¼,¼,½,½,¾,¾,1,1,1}).
fn nurbs_circle(rho: f64, z: f64) -> NurbsCurve<3> {
    let s = std::f64::consts::FRAC_1_SQRT_2;
    let xy = [
        (1.0, 0.0),
        (1.0, 1.0),
        (0.0, 1.0),
        (-1.0, 1.0),
        (-1.0, 0.0),
        (-1.0, -1.0),
        (0.0, -1.0),
        (1.0, -1.0),
        (1.0, 0.0),
    ];
    let pts: Vec<[f64; 3]> = xy.iter().map(|&(x, y)| [rho * x, rho * y, z]).collect();
    let w = [1.0, s, 1.0, s, 1.0, s, 1.0, s, 1.0];
    let k = [
        0.0, 0.0, 0.0, 0.25, 0.25, 0.5, 0.5, 0.75, 0.75, 1.0, 1.0, 1.0,
    ];
    NurbsCurve::new(2, &k, &pts, Some(&w)).unwrap()
}

// A 3D NURBS curve (the exact rational circle of a torus parallel) projected onto the torus:
// the fitted curve stays within the fit tolerance of the circle (checked densely here, at
// points the fit never looked at) and has the parallel's invariants (closed forms as in
// `seam_of_a_torus_is_crossed_continuously`, to the accuracy of a cubic fit: curvature errors
// O(h²)).
#[test]
fn projects_a_nurbs_circle_onto_a_torus() {
    let (big_r, r, v0) = (3.0, 1.0, -0.5);
    let t = torus(big_r, r);
    let rho = big_r + r * f64::cos(v0);
    let circle = nurbs_circle(rho, r * f64::sin(v0));
    let opts = ProjectionOptions::new(1e-9).periodic(true, true);
    let fit_tol = 1e-7;
    let pc = project_curve(&t, &circle, &opts, &FitOptions::default(), fit_tol).unwrap();
    let cs = CurveOnSurface::new(&t, &pc.curve);
    let mut h = Hints::default();
    let mut worst: f64 = 0.0;
    let mut worst_inv: f64 = 0.0;
    for i in 0..=2000 {
        let f = cs.frame(i as f64 / 2000.0, &mut h).unwrap();
        // Distance from the fitted point to the circle: in cylindrical coordinates.
        let p = f.point;
        let dr = p.x.hypot(p.y) - rho;
        let dz = p.z - r * f64::sin(v0);
        worst = worst.max(dr.hypot(dz));
        worst_inv = worst_inv
            .max((f.geodesic_curvature - f64::sin(v0) / rho).abs())
            .max((f.normal_curvature + f64::cos(v0) / rho).abs())
            .max(f.geodesic_torsion.abs());
        assert!(
            (f.geodesic_curvature - f64::sin(v0) / rho).abs() < 1e-3,
            "{f:?}"
        );
        assert!(
            (f.normal_curvature + f64::cos(v0) / rho).abs() < 1e-3,
            "{f:?}"
        );
        assert!(f.geodesic_torsion.abs() < 1e-3, "{f:?}");
    }
    // The midpoint test bounds the deviation between samples; allow a factor 2 for the
    // points in between (the deviation of a cubic fit is smooth between its samples).
    eprintln!(
        "circle on torus: {} samples, worst deviation {worst:e}, worst invariant error \
         {worst_inv:e}",
        pc.projections.len()
    );
    assert!(worst <= 2.0 * fit_tol, "worst deviation {worst:e}");
    // The full turn is continuous: u_path advances by 2π in total.
    let n = pc.projections.len();
    let turn = pc.projections[n - 1].u_path - pc.projections[0].u_path;
    assert!((turn.abs() - TAU).abs() < 1e-9, "{turn}");
}

// A curve in space whose parameter-plane image is not a line: the ellipse where the plane
// z = a x cuts the cylinder of radius R, as an exact rational quadratic (the 9-point circle
// mapped by the linear map (x, y, z) ↦ (x, y, a x); NURBS are invariant under affine maps, The
// NURBS Book 2nd ed. §4.2 [memory]). Its parameters are u = θ, v = a R cos θ. Closed forms at
// angle u, with tan α = a sin u the slope against the circumferential direction:
// |κn| = cos²α / R, |τg| = sin α cos α / R (shared/REFERENCES.md, cylinder helix at angle α; only
// the local slope enters), and κg = the curvature of the developed curve y = aR cos(x/R),
// |y''| / (1 + y'²)^{3/2} = (|a cos u| / R) / (1 + a² sin² u)^{3/2} (geodesic curvature is
// intrinsic, so developing the cylinder onto the plane keeps it: do Carmo §4-2, §4-4
// [memory]).
#[test]
fn projects_a_tilted_ellipse_onto_a_cylinder() {
    let (rr, a) = (2.0, 0.6);
    let c = cylinder(rr, -3.0, 3.0);
    let circle = nurbs_circle(rr, 0.0);
    let pts: Vec<[f64; 3]> = circle
        .control_points()
        .iter()
        .map(|p| [p[0], p[1], a * p[0]])
        .collect();
    let s = std::f64::consts::FRAC_1_SQRT_2;
    let w = [1.0, s, 1.0, s, 1.0, s, 1.0, s, 1.0];
    let ellipse = NurbsCurve::new(2, circle.knot_vector().knots(), &pts, Some(&w)).unwrap();
    let opts = ProjectionOptions::new(1e-9).periodic(true, false);
    let mut last_err = f64::INFINITY;
    for fit_tol in [1e-4, 1e-6] {
        let pc = project_curve(&c, &ellipse, &opts, &FitOptions::default(), fit_tol).unwrap();
        let cs = CurveOnSurface::new(&c, &pc.curve);
        let mut h = Hints::default();
        let (mut worst, mut worst_inv) = (0.0_f64, 0.0_f64);
        for i in 0..=4000 {
            let f = cs.frame(i as f64 / 4000.0, &mut h).unwrap();
            let u = f.u;
            worst = worst.max((f.v - a * rr * u.cos()).abs());
            let (su, cu) = u.sin_cos();
            let q = 1.0 + a * a * su * su;
            let kn = 1.0 / (rr * q);
            let tg = (a * su).abs() / (rr * q);
            let kg = (a * cu).abs() / rr / q.powf(1.5);
            worst_inv = worst_inv
                .max((f.normal_curvature.abs() - kn).abs())
                .max((f.geodesic_torsion.abs() - tg).abs())
                .max((f.geodesic_curvature.abs() - kg).abs());
        }
        eprintln!(
            "ellipse on cylinder, fit tolerance {fit_tol:e}: {} samples, worst deviation \
             {worst:e}, worst invariant error {worst_inv:e}",
            pc.projections.len()
        );
        // On the cylinder, the distance of a surface point from the ellipse is at most its
        // axial offset |v − aR cos u|.
        assert!(worst <= 2.0 * fit_tol, "worst deviation {worst:e}");
        assert!(
            worst_inv < last_err,
            "invariants do not improve: {worst_inv:e}"
        );
        last_err = worst_inv;
    }
    assert!(last_err < 1e-2, "{last_err:e}");
}

// Near a pole of the sphere (Su → 0 there): a point at colatitude 0.01 is recovered (a start at
// a grid node on the pole must not stop the search), and the pole itself, where the normal of
// the parametrisation is undefined, is refused as a degenerate surface point, by index.
#[test]
fn near_and_at_a_pole() {
    let rr = 2.0;
    let s = strake::analytic::sphere(rr);
    let opts = ProjectionOptions::new(1e-9).periodic(true, false);
    let (u, v) = (1.0_f64, 0.01_f64);
    let p = [rr * v.sin() * u.cos(), rr * v.sin() * u.sin(), rr * v.cos()];
    let pr = &project_points(&s, &[p], &opts).unwrap()[0];
    assert!(
        (pr.v - v).abs() < 1e-12 && angle_diff(pr.u, u).abs() < 1e-9,
        "{pr:?}"
    );
    let e = project_points(&s, &[p, [0.0, 0.0, rr]], &opts).unwrap_err();
    assert!(
        matches!(&e, StrakeError::AtPoint { index: 1, error } if matches!(**error, StrakeError::DegenerateSurface { .. })),
        "{e}"
    );
}
