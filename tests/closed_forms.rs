//! The frame and invariants against closed forms of classical differential geometry.
//!
//! Source for every expectation: M. P. do Carmo, *Differential Geometry of Curves and Surfaces*
//! (1976), ch. 3 (§3-2 normal curvature and Meusnier's theorem, §3-3 principal, Gaussian and
//! mean curvature), and the closed forms listed in shared/REFERENCES.md. The expected values are
//! derived in each test's comments from the geometry of the space curve (its centre of
//! curvature, its Frenet curvature and torsion), not from the fundamental-form formulas that the
//! library uses.

use std::f64::consts::{FRAC_PI_2, PI};
use strake::analytic::{cylinder, monge, plane, saddle, sphere, torus};
use strake::{
    CurveJet, CurveOnSurface, FnCurve, Hints, Interval, Orientation, ParamScales, StrakeError,
    SurfaceSource, Vec3, darboux_frame, uv_line,
};

/// Relative agreement: |a − b| ≤ tol · max(|b|, floor), the floor standing in for the scale of
/// the quantity when the expected value is 0.
fn close(a: f64, b: f64, tol: f64, floor: f64) -> bool {
    (a - b).abs() <= tol * b.abs().max(floor)
}

macro_rules! assert_close {
    ($a:expr, $b:expr, $tol:expr, $floor:expr) => {{
        let (a, b) = ($a, $b);
        assert!(
            close(a, b, $tol, $floor),
            "{} = {a:e}, expected {b:e} (tol {:e})",
            stringify!($a),
            $tol
        );
    }};
}

fn assert_vec_close(a: &Vec3, b: &Vec3, tol: f64) {
    assert!((a - b).norm() <= tol, "{a:?} vs {b:?}");
}

const TOL: f64 = 1e-12;

// Sphere of radius R (do Carmo §3-2, example 1): every direction is principal, the normal
// section is a great circle of radius R, so |κn| = 1/R in every direction and τg = 0. The
// analytic sphere's Su × Sv points to the centre, so κn = +1/R and k1 = k2 = +1/R.
#[test]
fn sphere_every_curve_has_normal_curvature_one_over_r() {
    let r = 2.5;
    let s = sphere(r);
    // A latitude, a meridian and two slanted UV lines, away from the poles.
    let paths = [
        uv_line(0.1, 1.0, 6.0, 1.0).unwrap(),
        uv_line(2.0, 0.3, 2.0, 2.8).unwrap(),
        uv_line(0.2, 0.4, 5.0, 2.6).unwrap(),
        uv_line(6.0, 2.9, 1.0, 0.2).unwrap(),
    ];
    for c in &paths {
        let cs = CurveOnSurface::new(&s, c);
        let mut h = Hints::default();
        for i in 0..=20 {
            let f = cs.frame(i as f64 / 20.0, &mut h).unwrap();
            assert_close!(f.normal_curvature, 1.0 / r, TOL, 1.0);
            assert_close!(f.geodesic_torsion, 0.0, TOL, 1.0 / r);
            assert_close!(f.principal.k1, 1.0 / r, TOL, 1.0);
            assert_close!(f.principal.k2, 1.0 / r, TOL, 1.0);
            assert_close!(f.principal.gaussian, 1.0 / (r * r), TOL, 1.0);
            // N is the inward radial direction.
            assert_vec_close(&f.n, &(-f.point / r), 1e-14);
        }
    }
}

// A circle of latitude at colatitude φ has radius ρ = R sin φ and its centre of curvature on the
// axis, so its curvature vector is −(x, y, 0)/ρ². With N = −S/R and T = (−sin u, cos u, 0) for
// increasing u, B = N × T, and κg = κ·B = −cos φ/(R sin φ) = −cot φ / R (|κg| = cot φ / R,
// REFERENCES.md).
#[test]
fn sphere_latitude_geodesic_curvature() {
    let r = 3.0;
    let s = sphere(r);
    for &phi in &[0.3, 0.9, FRAC_PI_2, 2.0, 2.7] {
        let c = uv_line(0.0, phi, 6.0, phi).unwrap();
        let cs = CurveOnSurface::new(&s, &c);
        let f = cs.frame(0.37, &mut Hints::default()).unwrap();
        let p = f.point;
        let rho = r * phi.sin();
        let kappa = -Vec3::new(p.x, p.y, 0.0) / (rho * rho);
        assert_close!(
            f.geodesic_curvature,
            -phi.cos() / (r * phi.sin()),
            TOL,
            1.0 / r
        );
        assert_close!(f.geodesic_curvature, kappa.dot(&f.b), TOL, 1.0 / r);
        assert_close!(f.normal_curvature, kappa.dot(&f.n), TOL, 1.0);
        assert_close!(f.speed, rho * 6.0, TOL, 1.0);
    }
}

// A great circle through two points is a geodesic: κg = 0. The meridian u = const is one.
#[test]
fn sphere_meridian_is_geodesic() {
    let s = sphere(1.5);
    let c = uv_line(1.0, 0.2, 1.0, 2.9).unwrap();
    let cs = CurveOnSurface::new(&s, &c);
    let mut h = Hints::default();
    for i in 0..=10 {
        let f = cs.frame(i as f64 / 10.0, &mut h).unwrap();
        assert_close!(f.geodesic_curvature, 0.0, TOL, 1.0);
    }
}

// Cylinder of radius R with outward N (= Su × Sv here). A helix at angle α from the
// circumferential direction: u = t, v = R tan α · t. It is a geodesic (κg = 0); its space
// curvature is cos²α / R along −N, so κn = −cos²α/R; being a geodesic, τg equals its Frenet
// torsion h/(R² + h²) with h = R tan α, i.e. sin α cos α / R (REFERENCES.md; do Carmo §1-5 for the
// helix's curvature and torsion).
#[test]
fn cylinder_helix() {
    let r = 4.0;
    let s = cylinder(r, -100.0, 100.0);
    for &alpha in &[0.0, 0.2, PI / 4.0, 1.2, -0.7] {
        let rate = r * f64::tan(alpha);
        let c = uv_line(0.5, -rate * 2.0, 5.5, rate * 3.0).unwrap();
        let cs = CurveOnSurface::new(&s, &c);
        let f = cs.frame(0.6, &mut Hints::default()).unwrap();
        let h = rate;
        let (sa, ca) = alpha.sin_cos();
        assert_close!(f.normal_curvature, -ca * ca / r, TOL, 1.0 / r);
        assert_close!(f.geodesic_curvature, 0.0, TOL, 1.0 / r);
        assert_close!(f.geodesic_torsion, sa * ca / r, TOL, 1.0 / r);
        assert_close!(f.geodesic_torsion, h / (r * r + h * h), TOL, 1.0 / r);
        assert_close!(f.principal.k1, 0.0, TOL, 1.0 / r);
        assert_close!(f.principal.k2, -1.0 / r, TOL, 1.0 / r);
        assert_close!(f.principal.mean, -0.5 / r, TOL, 1.0 / r);
        // k1 = 0 along the axis.
        assert_close!(f.principal.d1.z.abs(), 1.0, TOL, 1.0);
    }
}

// Torus (R, r) with outward N. A parallel v = const is a horizontal circle of radius
// w = R + r cos v, curvature vector −(cos u, sin u, 0)/w; N = (cos v cos u, cos v sin u, sin v).
// Hence κn = −cos v / w, κg = sin v / w (|κg| = |sin v|/w, REFERENCES.md), τg = 0 (a line of
// curvature). A meridian is a circle of radius r about the tube's core: κn = −1/r, κg = 0,
// τg = 0. Principal curvatures −cos v / w and −1/r; K = cos v/(r w) (do Carmo §3-3, example 4).
#[test]
fn torus_parallels_and_meridians() {
    let (big_r, r) = (5.0, 1.5);
    let s = torus(big_r, r);
    for &v in &[0.0, 0.7, 1.6, 2.5, PI, 4.0, 5.5] {
        let w = big_r + r * f64::cos(v);
        let par = uv_line(0.3, v, 6.0, v).unwrap();
        let f = CurveOnSurface::new(&s, &par)
            .frame(0.4, &mut Hints::default())
            .unwrap();
        assert_close!(f.normal_curvature, -v.cos() / w, TOL, 1.0 / r);
        assert_close!(f.geodesic_curvature, v.sin() / w, TOL, 1.0 / r);
        assert_close!(f.geodesic_torsion, 0.0, TOL, 1.0 / r);
        let (a, b) = (-v.cos() / w, -1.0 / r);
        assert_close!(f.principal.k1, a.max(b), TOL, 1.0 / r);
        assert_close!(f.principal.k2, a.min(b), TOL, 1.0 / r);
        assert_close!(f.principal.gaussian, v.cos() / (r * w), TOL, 1.0 / (r * r));

        let u = 1.1 + v / 3.0;
        let mer = uv_line(u, 0.0, u, 6.2).unwrap();
        let f = CurveOnSurface::new(&s, &mer)
            .frame(v / 6.2, &mut Hints::default())
            .unwrap();
        assert_close!(f.normal_curvature, -1.0 / r, TOL, 1.0 / r);
        assert_close!(f.geodesic_curvature, 0.0, TOL, 1.0 / r);
        assert_close!(f.geodesic_torsion, 0.0, TOL, 1.0 / r);
    }
}

// Plane z = 0 with N = +z: κn = τg = 0 and κg is the signed planar curvature, positive for a
// counter-clockwise circle seen from +z (it turns toward B = N × T, to the left). An ellipse
// (a cos t, b sin t) has curvature a b / (a² sin² t + b² cos² t)^{3/2} (do Carmo §1-5, ex. 1-5.x
// [memory for the exercise number]).
#[test]
fn plane_curves() {
    let s = plane((-10.0, 10.0), (-10.0, 10.0));
    let (a, b, cx, cy) = (3.0, 1.2, 0.5, -0.25);
    let ellipse = FnCurve::new(Interval::new("t", 0.0, 2.0 * PI).unwrap(), move |t: f64| {
        let (st, ct) = t.sin_cos();
        Ok(CurveJet {
            u: cx + a * ct,
            v: cy + b * st,
            du: -a * st,
            dv: b * ct,
            ddu: -a * ct,
            ddv: -b * st,
        })
    });
    let cs = CurveOnSurface::new(&s, &ellipse);
    let mut h = Hints::default();
    for i in 0..24 {
        let t = i as f64 * 0.26;
        let f = cs.frame(t, &mut h).unwrap();
        let (st, ct) = t.sin_cos();
        let k = a * b / (a * a * st * st + b * b * ct * ct).powf(1.5);
        assert_close!(f.geodesic_curvature, k, TOL, 1.0);
        assert_eq!(f.normal_curvature, 0.0);
        assert_eq!(f.geodesic_torsion, 0.0);
        assert_eq!((f.principal.k1, f.principal.k2), (0.0, 0.0));
    }
}

// Hyperbolic paraboloid z = x y at the origin (REFERENCES.md; do Carmo §3-3): k = ±1, K = −1,
// H = 0. The x axis lies in the surface (an asymptotic line and a geodesic): κn = κg = 0 and, by
// Beltrami–Enneper, τg² = −K = 1; with T = +x and N = +z, B = +y and τg = II(T, B) = z_xy = +1.
#[test]
fn saddle_asymptotic_line() {
    let s = saddle((-1.0, 1.0), (-1.0, 1.0));
    let c = uv_line(-0.5, 0.0, 0.5, 0.0).unwrap();
    let f = CurveOnSurface::new(&s, &c)
        .frame(0.5, &mut Hints::default())
        .unwrap();
    assert_eq!(f.point, Vec3::zeros());
    assert_close!(f.normal_curvature, 0.0, TOL, 1.0);
    assert_close!(f.geodesic_curvature, 0.0, TOL, 1.0);
    assert_close!(f.geodesic_torsion, 1.0, TOL, 1.0);
    assert_close!(f.principal.k1, 1.0, TOL, 1.0);
    assert_close!(f.principal.k2, -1.0, TOL, 1.0);
    assert_close!(f.principal.gaussian, -1.0, TOL, 1.0);
    assert_close!(f.principal.mean, 0.0, TOL, 1.0);
    // Away from the origin the x axis (v = 0) is still straight in space: κn = κg = 0 there,
    // and τg² = −K = 1/(1 + x²)² (K of z = xy is −1/(1 + x² + y²)²).
    for &x in &[-0.4, 0.1, 0.45] {
        let f = CurveOnSurface::new(&s, &c)
            .frame(x + 0.5, &mut Hints::default())
            .unwrap();
        assert_close!(f.normal_curvature, 0.0, TOL, 1.0);
        assert_close!(f.geodesic_curvature, 0.0, TOL, 1.0);
        let k = -1.0 / (1.0 + x * x).powi(2);
        assert_close!(f.principal.gaussian, k, TOL, 1.0);
        assert_close!(f.geodesic_torsion.powi(2), -k, TOL, 1.0);
    }
}

// Near an umbilic: z = (a x² + b y²)/2 at the origin has principal curvatures a and b exactly
// (a Monge patch with vanishing gradient; do Carmo §3-3). With b = a (1 + δ), the split k1 − k2
// = a δ must survive: the textbook route H ± √(H² − K) loses it to cancellation for δ below ~1e-8.
// Rotating the quadratic by 30° makes the off-diagonal term non-zero.
#[test]
fn principal_curvatures_accurate_near_umbilic() {
    for &delta in &[0.0, 1e-14, 1e-12, 1e-9, 1e-6] {
        let (a, b) = (0.8, 0.8 * (1.0 + delta));
        let (s30, c30) = (PI / 6.0).sin_cos();
        let hxx = a * c30 * c30 + b * s30 * s30;
        let hyy = a * s30 * s30 + b * c30 * c30;
        let hxy = (a - b) * c30 * s30;
        let surf = monge((-1.0, 1.0), (-1.0, 1.0), move |x, y| {
            [
                0.5 * (hxx * x * x + 2.0 * hxy * x * y + hyy * y * y),
                hxx * x + hxy * y,
                hxy * x + hyy * y,
                hxx,
                hxy,
                hyy,
            ]
        });
        let c = uv_line(-0.5, -0.5, 0.5, 0.5).unwrap();
        let f = CurveOnSurface::new(&surf, &c)
            .frame(0.5, &mut Hints::default())
            .unwrap();
        assert_close!(f.principal.k1, b, 4e-16, 1.0);
        assert_close!(f.principal.k2, a, 4e-16, 1.0);
        // The split itself, to within the rounding of the Hessian entries.
        assert!(((f.principal.k1 - f.principal.k2) - (b - a)).abs() <= 4.0 * f64::EPSILON * a);
    }
}

// A degenerate surface point (the sphere's pole, where Sv ∥ nothing and Su = 0) and a stalled
// curve each give their own error, never NaN.
#[test]
fn degenerate_point_and_stalled_curve_are_refused() {
    let s = sphere(1.0);
    let pole = uv_line(0.0, 0.0, 1.0, 1.0).unwrap();
    let err = CurveOnSurface::new(&s, &pole)
        .frame(0.0, &mut Hints::default())
        .unwrap_err();
    assert!(
        matches!(err, StrakeError::DegenerateSurface { .. }),
        "{err}"
    );

    let stop = FnCurve::new(Interval::new("t", 0.0, 1.0).unwrap(), |t| {
        Ok(CurveJet {
            u: 1.0 + t * t,
            v: 1.0,
            du: 2.0 * t,
            dv: 0.0,
            ddu: 2.0,
            ddv: 0.0,
        })
    });
    let err = CurveOnSurface::new(&s, &stop)
        .frame(0.0, &mut Hints::default())
        .unwrap_err();
    assert!(matches!(err, StrakeError::StalledCurve { .. }), "{err}");
    assert!(err.to_string().contains("t = 0"), "{err}");

    let jet = s
        .checked_jet(
            1.0,
            1.0,
            strake::DerivOrder::Second,
            &mut Default::default(),
        )
        .unwrap();
    let scales = ParamScales {
        u_extent: 2.0 * PI,
        v_extent: PI,
        t_extent: 1.0,
    };
    let mut cj = CurveJet {
        u: 1.0,
        v: 1.0,
        du: 1.0,
        dv: 0.0,
        ddu: 0.0,
        ddv: 0.0,
    };
    cj.ddv = f64::NAN;
    let err = darboux_frame(&jet, &cj, Orientation::Forward, &scales, 0.0).unwrap_err();
    assert!(err.to_string().contains("ddv"), "{err}");
    let mut bad = jet;
    bad.suv.y = f64::INFINITY;
    cj.ddv = 0.0;
    let err = darboux_frame(&bad, &cj, Orientation::Forward, &scales, 0.0).unwrap_err();
    assert!(err.to_string().contains("Suv"), "{err}");
    let err = CurveOnSurface::new(&s, &uv_line(0.0, 1.0, 7.0, 1.0).unwrap())
        .frame(1.0, &mut Hints::default())
        .unwrap_err();
    assert!(
        matches!(err, StrakeError::OutOfDomain { name: "u", .. }),
        "{err}"
    );
}
