//! Pins the refusal limits: just below [`DEGENERATE_SURFACE_LIMIT`] and [`STALLED_CURVE_LIMIT`]
//! evaluation returns `DegenerateSurface` / `StalledCurve`; just above it succeeds with the
//! accuracy measured in `docs/accuracy.md` (relative error below 1e-6 even with jets that carry
//! an evaluator's rounding error), checked against closed forms.

use strake::geometry::frame::STALLED_CURVE_LIMIT;
use strake::geometry::math::vec3;
use strake::geometry::principal::DEGENERATE_SURFACE_LIMIT;
use strake::{
    CurveJet, DerivOrder, Orientation, ParamScales, StrakeError, SurfaceJet, SurfaceSource,
    analytic, darboux_frame,
};

/// The accuracy documented above the limits (docs/accuracy.md).
const DOCUMENTED: f64 = 1e-6;

/// A deterministic perturbation of every jet entry by ±ε times the size of its derivative
/// order, the "host-noise" model of docs/accuracy.md (alternating signs per component).
fn host_noise(j: &SurfaceJet, sign: f64) -> SurfaceJet {
    let e = f64::EPSILON;
    let m1 = j.su.norm().max(j.sv.norm()) * e * sign;
    let m2 = j.suu.norm().max(j.suv.norm()).max(j.svv.norm()) * e * sign;
    SurfaceJet {
        p: j.p,
        su: j.su + vec3([m1, -m1, m1]),
        sv: j.sv + vec3([-m1, m1, m1]),
        suu: j.suu + vec3([m2, m2, -m2]),
        suv: j.suv + vec3([-m2, m2, -m2]),
        svv: j.svv + vec3([m2, -m2, -m2]),
    }
}

fn rel(got: f64, want: f64) -> f64 {
    (got - want).abs() / want.abs()
}

#[test]
fn sphere_pole_is_refused_just_below_the_surface_limit() {
    // Unit sphere S = (sin v cos u, sin v sin u, cos v) on [0, 2π] × [0, π]: the figure is
    // |Su × Sv| / (ρu ρv) with ρu² = |Su|² + |Suu|² Δu² + |Suv|² Δv² and ρv² = |Sv|² +
    // |Svv|² Δv² + |Suv|² Δu²: |Su × Sv| = |Su| = |Suu| = sin v, |Suv| = cos v, |Sv| = |Svv| = 1,
    // so c(v) = sin v / √((sin²v (1 + 4π²) + π² cos²v)(1 + π² + 4π² cos²v)) (derived), about
    // sin v / 22 near the pole; `pole_angle` inverts it by bisection.
    let pole_angle = |c: f64| {
        let pi2 = std::f64::consts::PI * std::f64::consts::PI;
        let fig = |v: f64| {
            let (s, co) = (v.sin(), v.cos());
            s / ((s * s * (1.0 + 4.0 * pi2) + pi2 * co * co) * (1.0 + pi2 + 4.0 * pi2 * co * co))
                .sqrt()
        };
        let (mut lo, mut hi) = (0.0, 0.5);
        for _ in 0..200 {
            let m = 0.5 * (lo + hi);
            if fig(m) < c { lo = m } else { hi = m }
        }
        0.5 * (lo + hi)
    };
    let sphere = analytic::sphere(1.0);
    let scales = ParamScales {
        u_extent: std::f64::consts::TAU,
        v_extent: std::f64::consts::PI,
        t_extent: 1.0,
    };
    let latitude = |v: f64| CurveJet {
        u: 0.7,
        v,
        du: 1.0,
        dv: 0.0,
        ddu: 0.0,
        ddv: 0.0,
    };
    let jet_at = |v: f64| {
        sphere
            .checked_jet(0.7, v, DerivOrder::Second, &mut Default::default())
            .unwrap()
    };

    let below = pole_angle(DEGENERATE_SURFACE_LIMIT * 0.99);
    match darboux_frame(
        &jet_at(below),
        &latitude(below),
        Orientation::Forward,
        &scales,
        0.0,
    ) {
        Err(StrakeError::DegenerateSurface { conditioning, .. }) => {
            assert!(
                conditioning < DEGENERATE_SURFACE_LIMIT
                    && conditioning > 0.98 * DEGENERATE_SURFACE_LIMIT
            )
        }
        other => panic!("expected DegenerateSurface just below the limit, got {other:?}"),
    }

    let above = pole_angle(DEGENERATE_SURFACE_LIMIT * 1.01);
    for sign in [0.0, 1.0, -1.0] {
        let jet = if sign == 0.0 {
            jet_at(above)
        } else {
            host_noise(&jet_at(above), sign)
        };
        let f = darboux_frame(&jet, &latitude(above), Orientation::Forward, &scales, 0.0)
            .unwrap_or_else(|e| panic!("just above the limit: {e}"));
        assert!(f.conditioning.surface >= DEGENERATE_SURFACE_LIMIT);
        // Unit sphere with this parametrisation: Su × Sv points inward, so every normal
        // curvature is +1 and every direction principal (τg = 0); a latitude at colatitude v has
        // |κg| = cot v (REFERENCES.md, sphere closed forms; do Carmo §3-2).
        let tol = if sign == 0.0 { 1e-14 } else { DOCUMENTED };
        assert!(
            rel(f.normal_curvature, 1.0) <= tol,
            "kn = {}",
            f.normal_curvature
        );
        assert!(
            rel(f.principal.k1, 1.0) <= tol && rel(f.principal.k2, 1.0) <= tol,
            "{:?}",
            f.principal
        );
        assert!(
            f.geodesic_torsion.abs() <= tol,
            "tg = {}",
            f.geodesic_torsion
        );
        let cot = above.cos() / above.sin();
        assert!(
            rel(f.geodesic_curvature.abs(), cot) <= tol,
            "kg = {}, cot v = {cot}",
            f.geodesic_curvature
        );
    }
}

#[test]
fn skewed_parametrisation_is_refused_just_below_the_surface_limit() {
    // Sheared plane S = (u + v cos p, v sin p, 0) on [−1, 1]²: |Su| = |Sv| = 1, so the figure is
    // the sine of the angle between them, sin p. A curve's geodesic curvature is the signed
    // curvature of its image (x, y): (x'y'' − y'x'')/(x'² + y'²)^{3/2} (do Carmo §1-5), and
    // κn = τg = k1 = k2 = 0 (REFERENCES.md, plane).
    let jet_for = |p: f64| {
        let (s, c) = p.sin_cos();
        SurfaceJet {
            p: vec3([0.3 + 0.4 * c, 0.4 * s, 0.0]),
            su: vec3([1.0, 0.0, 0.0]),
            sv: vec3([c, s, 0.0]),
            ..Default::default()
        }
    };
    let cj = CurveJet {
        u: 0.3,
        v: 0.4,
        du: 1.0,
        dv: -0.5,
        ddu: 0.3,
        ddv: 0.7,
    };
    let scales = ParamScales {
        u_extent: 2.0,
        v_extent: 2.0,
        t_extent: 1.0,
    };

    let below = (DEGENERATE_SURFACE_LIMIT * 0.99).asin();
    assert!(matches!(
        darboux_frame(&jet_for(below), &cj, Orientation::Forward, &scales, 0.0),
        Err(StrakeError::DegenerateSurface { .. })
    ));

    let above = (DEGENERATE_SURFACE_LIMIT * 1.01).asin();
    let (s, c) = above.sin_cos();
    let (x1, y1) = (cj.du + cj.dv * c, cj.dv * s);
    let (x2, y2) = (cj.ddu + cj.ddv * c, cj.ddv * s);
    let kg = (x1 * y2 - y1 * x2) / (x1 * x1 + y1 * y1).powf(1.5);
    for sign in [0.0, 1.0, -1.0] {
        let jet = if sign == 0.0 {
            jet_for(above)
        } else {
            host_noise(&jet_for(above), sign)
        };
        let f = darboux_frame(&jet, &cj, Orientation::Forward, &scales, 0.0)
            .expect("just above the limit");
        // Su × Sv = +z, so B = N × T turns left in the (x, y) plane and κg has the planar sign.
        assert!(
            rel(f.geodesic_curvature, kg) <= DOCUMENTED,
            "kg = {}, want {kg}",
            f.geodesic_curvature
        );
        assert!(f.normal_curvature.abs() <= DOCUMENTED * kg.abs());
        assert!(f.geodesic_torsion.abs() <= DOCUMENTED * kg.abs());
    }
}

#[test]
fn stalled_curve_is_refused_just_below_the_curve_limit() {
    // A straight (u, v) line starting from rest on the torus (3, 1): u = u0 + a t², v = v0 + b t²,
    // so (u', v') = 2t (a, b) and (u'', v'') = 2 (a, b), the measured worst case. Its frame and
    // invariants do not depend on the parametrisation (do Carmo §1-3, §3-2): they are those of the
    // same direction at unit speed without acceleration, where the evaluation is well
    // conditioned (curve figure 1).
    let torus = analytic::torus(3.0, 1.0);
    let scales = ParamScales {
        u_extent: std::f64::consts::TAU,
        v_extent: std::f64::consts::TAU,
        t_extent: 1.0,
    };
    let (a, b) = (0.8, 0.6);
    let jet = torus
        .checked_jet(0.4, 0.9, DerivOrder::Second, &mut Default::default())
        .unwrap();
    // The speed figure of (u', v') = 2t (a, b) is 2t |(a, b)| / 2π · Δt = 2t / 2π.
    let stalled = |figure: f64| {
        let two_t = figure * std::f64::consts::TAU;
        CurveJet {
            u: 0.4,
            v: 0.9,
            du: two_t * a,
            dv: two_t * b,
            ddu: 2.0 * a,
            ddv: 2.0 * b,
        }
    };
    let unit = CurveJet {
        u: 0.4,
        v: 0.9,
        du: a,
        dv: b,
        ddu: 0.0,
        ddv: 0.0,
    };
    let want = darboux_frame(&jet, &unit, Orientation::Forward, &scales, 0.0).unwrap();

    match darboux_frame(
        &jet,
        &stalled(STALLED_CURVE_LIMIT * 0.99),
        Orientation::Forward,
        &scales,
        0.0,
    ) {
        Err(StrakeError::StalledCurve { speed_figure, .. }) => {
            assert!(speed_figure < STALLED_CURVE_LIMIT)
        }
        other => panic!("expected StalledCurve just below the limit, got {other:?}"),
    }

    let above = stalled(STALLED_CURVE_LIMIT * 1.01);
    for sign in [0.0, 1.0, -1.0] {
        let e = f64::EPSILON * sign;
        let cj = CurveJet {
            du: above.du * (1.0 + e),
            ddu: above.ddu * (1.0 - e),
            ddv: above.ddv * (1.0 + e),
            ..above
        };
        let jet = if sign == 0.0 {
            jet
        } else {
            host_noise(&jet, sign)
        };
        let f = darboux_frame(&jet, &cj, Orientation::Forward, &scales, 0.0)
            .expect("just above the limit");
        assert!(f.conditioning.curve >= STALLED_CURVE_LIMIT);
        let kappa = want.normal_curvature.hypot(want.geodesic_curvature);
        let scale = want.principal.k1.abs().max(want.principal.k2.abs());
        assert!(
            rel(f.geodesic_curvature, want.geodesic_curvature) * want.geodesic_curvature.abs()
                <= DOCUMENTED * kappa
        );
        assert!((f.normal_curvature - want.normal_curvature).abs() <= 1e-14 * scale);
        assert!((f.geodesic_torsion - want.geodesic_torsion).abs() <= 1e-14 * scale);
        assert!((f.t - want.t).norm() <= 1e-14);
    }
}
