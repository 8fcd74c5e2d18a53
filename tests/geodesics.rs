//! Traced geodesics against the outside world.
//!
//! Sources: do Carmo, *Differential Geometry of Curves and Surfaces* (1976): great circles are
//! the geodesics of a sphere and helices those of a circular cylinder (§4-4, examples after
//! the definition of geodesics; the cylinder by unrolling it onto a plane, an isometry);
//! Clairaut's relation r cos ψ = constant along a geodesic of a surface of revolution (§4-4,
//! example 5 / exercise on Clairaut's relation [exact numbering: memory]).

use std::f64::consts::{PI, TAU};
use strake::analytic::{cylinder, sphere, torus};
use strake::{
    CurveJet, CurveOnSurface, DerivOrder, DomainSide, FnSurface, GeodesicEnd, Hints, Interval,
    Orientation, StartDirection, StrakeError, SurfaceHint, SurfaceJet, SurfaceSource, TraceOptions,
    UvCurve, Vec3, trace_geodesic,
};

/// Catenoid S(u, v) = (a cosh(v/a) cos u, a cosh(v/a) sin u, v), u ∈ [0, 2π], v ∈ [−1.5, 1.5].
fn catenoid(a: f64) -> impl SurfaceSource {
    FnSurface::new(
        Interval { lo: 0.0, hi: TAU },
        Interval { lo: -1.5, hi: 1.5 },
        Orientation::Forward,
        move |u: f64, v: f64, _| {
            let (su, cu) = u.sin_cos();
            let (ch, sh) = ((v / a).cosh(), (v / a).sinh());
            Ok(SurfaceJet {
                p: Vec3::new(a * ch * cu, a * ch * su, v),
                su: Vec3::new(-a * ch * su, a * ch * cu, 0.0),
                sv: Vec3::new(sh * cu, sh * su, 1.0),
                suu: Vec3::new(-a * ch * cu, -a * ch * su, 0.0),
                suv: Vec3::new(-sh * su, sh * cu, 0.0),
                svv: Vec3::new(ch * cu / a, ch * su / a, 0.0),
            })
        },
    )
}

fn jet<S: SurfaceSource>(s: &S, u: f64, v: f64) -> SurfaceJet {
    s.checked_jet(u, v, DerivOrder::Second, &mut SurfaceHint::default())
        .unwrap()
}

fn at(c: &impl UvCurve, t: f64) -> CurveJet {
    c.checked_jet(t, &mut Default::default()).unwrap()
}

/// Largest |κg| along the traced curve at `n` even arc lengths, through the ordinary frame.
fn max_kg<S: SurfaceSource>(s: &S, c: &impl UvCurve, n: usize) -> f64 {
    let path = CurveOnSurface::new(s, c);
    let dom = c.domain();
    let mut hints = Hints::default();
    (0..n)
        .map(|i| {
            path.frame(dom.even(i, n), &mut hints)
                .unwrap()
                .geodesic_curvature
                .abs()
        })
        .fold(0.0, f64::max)
}

/// Great circle: from P0 with unit tangent T0 the geodesic of a sphere of radius R is
/// P(s) = P0 cos(s/R) + R T0 sin(s/R) (do Carmo §4-4).
#[test]
fn sphere_geodesics_are_great_circles() {
    let r = 2.0;
    let s = sphere(r);
    let (u0, v0) = (3.0, 1.2);
    for theta in [0.3, 1.0, 2.5] {
        let g = trace_geodesic(
            &s,
            u0,
            v0,
            StartDirection::Angle(theta),
            2.0,
            &TraceOptions::new(1e-10),
        )
        .unwrap();
        assert_eq!(g.end, GeodesicEnd::Length);
        assert_eq!(g.length, 2.0);
        let j0 = jet(&s, u0, v0);
        let c0 = at(&g.curve, 0.0);
        let t0 = (j0.su * c0.du + j0.sv * c0.dv).normalize();
        let mut worst: f64 = 0.0;
        for i in 0..=40 {
            let sl = 2.0 * i as f64 / 40.0;
            let c = at(&g.curve, sl);
            let p = jet(&s, c.u, c.v).p;
            let exact = j0.p * (sl / r).cos() + t0 * (r * (sl / r).sin());
            worst = worst.max((p - exact).norm());
        }
        assert!(
            worst < 1e-8,
            "theta {theta}: distance to the great circle {worst:e}"
        );
        let kg = max_kg(&s, &g.curve, 101);
        assert!(kg < 1e-6, "theta {theta}: |kg| up to {kg:e}");
    }
}

/// Helix: a cylinder of radius R unrolls isometrically onto the plane, so a geodesic at angle
/// α from the circumferential direction is u = u0 + s cos α / R, v = v0 + s sin α
/// (do Carmo §4-4).
#[test]
fn cylinder_geodesics_are_helices() {
    let r = 1.5;
    let s = cylinder(r, -10.0, 10.0);
    for alpha in [0.0, 0.4, 1.2, -0.7] {
        let g = trace_geodesic(
            &s,
            1.0,
            0.5,
            StartDirection::Angle(alpha),
            4.0,
            &TraceOptions::new(1e-11),
        )
        .unwrap();
        let mut worst: f64 = 0.0;
        for i in 0..=50 {
            let sl = 4.0 * i as f64 / 50.0;
            let c = at(&g.curve, sl);
            let du = c.u - (1.0 + sl * alpha.cos() / r);
            let dv = c.v - (0.5 + sl * alpha.sin());
            worst = worst.max((r * du).hypot(dv));
        }
        assert!(worst < 1e-9, "alpha {alpha}: off the helix by {worst:e}");
    }
}

/// r cos ψ along a geodesic of a surface of revolution, ψ the angle with the parallel: with
/// the parallel's unit tangent e = Su/|Su| and r the distance to the z axis, r (T·e) is
/// constant (Clairaut; do Carmo §4-4).
fn clairaut_spread<S: SurfaceSource>(s: &S, g: &strake::Geodesic, n: usize) -> f64 {
    let dom = g.curve.domain();
    let vals: Vec<f64> = (0..n)
        .map(|i| {
            let c = at(&g.curve, dom.even(i, n));
            let j = jet(s, c.u, c.v);
            let t = (j.su * c.du + j.sv * c.dv).normalize();
            let r = j.p.x.hypot(j.p.y);
            r * t.dot(&j.su.normalize())
        })
        .collect();
    let lo = vals.iter().cloned().fold(f64::INFINITY, f64::min);
    let hi = vals.iter().cloned().fold(f64::NEG_INFINITY, f64::max);
    hi - lo
}

#[test]
fn clairaut_holds_on_a_torus_and_a_catenoid() {
    let t = torus(3.0, 1.0);
    for (v0, theta) in [(0.3, 0.8), (2.0, 0.2), (4.0, 1.4)] {
        let g = trace_geodesic(
            &t,
            1.0,
            v0,
            StartDirection::Angle(theta),
            6.0,
            &TraceOptions::new(1e-10),
        )
        .unwrap();
        // Also at every accepted node.
        let spread = clairaut_spread(&t, &g, 201);
        assert!(spread < 1e-7, "torus v0 {v0}: r cos psi spread {spread:e}");
        let kg = max_kg(&t, &g.curve, 201);
        assert!(kg < 1e-5, "torus: |kg| up to {kg:e}");
    }
    let c = catenoid(1.0);
    for (v0, theta) in [(0.0, 0.5), (0.6, -1.0), (-0.4, 2.0)] {
        let g = trace_geodesic(
            &c,
            2.0,
            v0,
            StartDirection::Angle(theta),
            3.0,
            &TraceOptions::new(1e-10),
        )
        .unwrap();
        let spread = clairaut_spread(&c, &g, 201);
        assert!(
            spread < 1e-7,
            "catenoid v0 {v0}: r cos psi spread {spread:e}, end {:?}",
            g.end
        );
    }
}

/// A geodesic that runs into the domain side ends there, exactly on it, and says so.
#[test]
fn exits_land_exactly_on_the_boundary() {
    let s = cylinder(1.0, 0.0, 2.0);
    // Heading up at 45°: v = 0.5 + s sin(π/4) reaches v = 2 at s = 1.5 √2.
    let g = trace_geodesic(
        &s,
        1.0,
        0.5,
        StartDirection::Angle(PI / 4.0),
        10.0,
        &TraceOptions::new(1e-10),
    )
    .unwrap();
    assert_eq!(g.end, GeodesicEnd::Boundary(DomainSide::VHigh));
    let (_, v) = g.end_uv();
    assert_eq!(v, 2.0);
    assert!(
        (g.length - 1.5 * 2f64.sqrt()).abs() < 1e-9,
        "length {}",
        g.length
    );
    assert!(g.stats.accepted < 200, "{:?}", g.stats);
    // The last approaches to the side are folded into the segment before them: no segment
    // shorter than a millionth of the curve (such segments put the curve's parameter at the
    // rounding level of the arc length, and stalled the arc-length quadrature of a 2.3 m
    // course in the C demo).
    let k = g.curve.knots();
    let shortest = k
        .windows(2)
        .map(|w| w[1] - w[0])
        .fold(f64::INFINITY, f64::min);
    assert!(shortest > 1e-6 * g.length, "shortest segment {shortest:e}");
    let path = CurveOnSurface::new(&s, &g.curve);
    let l = strake::arc_length(&path, 0.0, g.length, 1e-12).unwrap();
    assert!(
        (l - g.length).abs() < 1e-9,
        "arc length {l} vs {}",
        g.length
    );
}

/// On a sphere, a meridian runs into the pole, a degenerate point of the parametrisation:
/// the trace stops before it and says so.
#[test]
fn stops_before_a_pole() {
    let s = sphere(1.0);
    // Angle π/2 from Su: e2 = N × e1; with the inward normal e2 points to decreasing or
    // increasing colatitude; try both and require a stop by the pole, not a wrong curve.
    for theta in [PI / 2.0, -PI / 2.0] {
        let g = trace_geodesic(
            &s,
            1.0,
            1.0,
            StartDirection::Angle(theta),
            3.0,
            &TraceOptions::new(1e-10),
        )
        .unwrap();
        assert!(
            matches!(g.end, GeodesicEnd::Degenerate { .. }),
            "{:?}",
            g.end
        );
        let (_, v) = g.end_uv();
        assert!(!(0.05..=PI - 0.05).contains(&v), "stopped at v = {v}");
        assert!(g.stats.accepted + g.stats.rejected < 1000, "{:?}", g.stats);
    }
}

#[test]
fn bad_input_is_refused_with_the_value() {
    let s = sphere(1.0);
    let o = TraceOptions::new(1e-9);
    let e = trace_geodesic(&s, 7.0, 1.0, StartDirection::Angle(0.0), 1.0, &o).unwrap_err();
    assert!(matches!(e, StrakeError::OutOfDomain { name: "u", value, .. } if value == 7.0));
    let e = trace_geodesic(&s, 1.0, 0.0, StartDirection::Angle(0.0), 1.0, &o).unwrap_err();
    assert!(matches!(e, StrakeError::DegenerateSurface { .. }), "{e}");
    let e =
        trace_geodesic(&s, 1.0, 1.0, StartDirection::Space(Vec3::zeros()), 1.0, &o).unwrap_err();
    assert!(e.to_string().contains("(0, 0, 0)"), "{e}");
    let e = trace_geodesic(&s, 1.0, 1.0, StartDirection::Parameter(0.0, 0.0), 1.0, &o).unwrap_err();
    assert!(e.to_string().contains("(0, 0)"), "{e}");
    let e = trace_geodesic(&s, 1.0, 1.0, StartDirection::Angle(0.0), -1.0, &o).unwrap_err();
    assert!(e.to_string().contains("-1"), "{e}");
    let e = trace_geodesic(&s, 1.0, 1.0, StartDirection::Angle(f64::NAN), 1.0, &o).unwrap_err();
    assert!(matches!(e, StrakeError::NonFinite { .. }), "{e}");
    // On the boundary v = 0 of a cylinder, heading down: leaves at once.
    let c = cylinder(1.0, 0.0, 1.0);
    let e = trace_geodesic(&c, 1.0, 0.0, StartDirection::Angle(-1.0), 1.0, &o).unwrap_err();
    assert!(matches!(e, StrakeError::LeavesSurface { .. }), "{e}");
    // A tolerance that cannot be met (below round-off) ends with a status, not a loop.
    let e = trace_geodesic(
        &s,
        1.0,
        1.0,
        StartDirection::Angle(0.3),
        1.0,
        &TraceOptions::new(1e-30),
    )
    .unwrap_err();
    assert!(matches!(e, StrakeError::GeodesicIncomplete { .. }), "{e}");
    // A step cap ends it too.
    let mut few = TraceOptions::new(1e-12);
    few.max_steps = 3;
    let e = trace_geodesic(&s, 1.0, 1.0, StartDirection::Angle(0.3), 3.0, &few).unwrap_err();
    assert!(e.to_string().contains("step cap"), "{e}");
}

/// Cost: six new jets per accepted step (first same as last), plus rejections; the tests
/// print the measured ratio (`cargo test --test geodesics -- --nocapture`).
#[test]
fn jets_per_accepted_step_stay_within_eight() {
    let t = torus(3.0, 1.0);
    for tol in [1e-6, 1e-9, 1e-12] {
        let g = trace_geodesic(
            &t,
            1.0,
            0.5,
            StartDirection::Angle(0.7),
            20.0,
            &TraceOptions::new(tol),
        )
        .unwrap();
        let ratio = g.stats.jets as f64 / g.stats.accepted as f64;
        println!(
            "torus tol {tol:e}: {} accepted, {} rejected, {} jets, {ratio:.2} jets per accepted step",
            g.stats.accepted, g.stats.rejected, g.stats.jets
        );
        assert!(ratio <= 8.0, "{ratio}");
    }
}

/// Convergence: the distance to the exact great circle shrinks with the tolerance (the table
/// in docs/geodesics.md comes from this test's output).
#[test]
fn error_shrinks_with_the_tolerance() {
    let r = 1.0;
    let s = sphere(r);
    let (u0, v0) = (3.0, 1.2);
    let j0 = jet(&s, u0, v0);
    let mut last = f64::INFINITY;
    for tol in [1e-4, 1e-6, 1e-8, 1e-10, 1e-12] {
        let g = trace_geodesic(
            &s,
            u0,
            v0,
            StartDirection::Angle(0.5),
            2.5,
            &TraceOptions::new(tol),
        )
        .unwrap();
        let c0 = at(&g.curve, 0.0);
        let t0 = (j0.su * c0.du + j0.sv * c0.dv).normalize();
        let mut worst: f64 = 0.0;
        for i in 0..=200 {
            let sl = 2.5 * i as f64 / 200.0;
            let c = at(&g.curve, sl);
            let exact = j0.p * (sl / r).cos() + t0 * (r * (sl / r).sin());
            worst = worst.max((jet(&s, c.u, c.v).p - exact).norm());
        }
        let kg = max_kg(&s, &g.curve, 401);
        println!(
            "| {tol:.0e} | {} | {worst:.2e} | {kg:.2e} |",
            g.stats.accepted
        );
        assert!(
            worst < last,
            "tol {tol:e}: error {worst:e} did not shrink from {last:e}"
        );
        assert!(worst < 50.0 * tol, "tol {tol:e}: error {worst:e}");
        last = worst;
    }
}

/// Geodesic distance on a sphere: R times the central angle, arccos(p·q / R²) (do Carmo
/// §4-4; REFERENCES.md, geodesics). On a cylinder: the plane distance after unrolling.
#[test]
fn distance_between_points_matches_closed_forms() {
    use strake::{BetweenOptions, geodesic_between};
    let r = 1.5;
    let s = sphere(r);
    for (p, q) in [
        ((1.0, 1.0), (2.5, 2.0)),
        ((3.0, 0.4), (4.0, 0.5)),
        ((0.5, 1.5), (5.5, 1.7)),
    ] {
        let g = geodesic_between(&s, p, q, &BetweenOptions::new(1e-9)).unwrap();
        let (a, b) = (jet(&s, p.0, p.1).p, jet(&s, q.0, q.1).p);
        let exact = r * (a.dot(&b) / (r * r)).clamp(-1.0, 1.0).acos();
        println!(
            "sphere {p:?} -> {q:?}: distance {} exact {exact} ({} iterations)",
            g.distance, g.iterations
        );
        // (0.5 → 5.5 in u: the shortest path crosses the seam u = 0, outside the chart; the
        // geodesic found stays in the domain: the other arc of the same great circle,
        // 2πR − R·angle.)
        if (q.0 - p.0) < PI {
            assert!(
                (g.distance - exact).abs() < 1e-8,
                "{} vs {exact}",
                g.distance
            );
        } else {
            assert!(
                (g.distance - (TAU * r - exact)).abs() < 1e-8,
                "{} vs the long arc",
                g.distance
            );
        }
        assert!(g.miss <= 1e-9);
    }
    let c = cylinder(2.0, -5.0, 5.0);
    let g = geodesic_between(&c, (0.5, -1.0), (2.0, 1.5), &BetweenOptions::new(1e-10)).unwrap();
    let exact = (2.0f64 * 1.5).hypot(2.5);
    assert!(
        (g.distance - exact).abs() < 1e-9,
        "{} vs {exact}",
        g.distance
    );
}

#[test]
fn between_refusals_name_what_was_reached() {
    use strake::{BetweenOptions, geodesic_between};
    let s = sphere(1.0);
    let e = geodesic_between(&s, (1.0, 1.0), (1.0, 1.0), &BetweenOptions::new(1e-9)).unwrap_err();
    assert!(matches!(e, StrakeError::InvalidArgument(_)), "{e}");
    let e = geodesic_between(&s, (1.0, 1.0), (1.0, 0.0), &BetweenOptions::new(1e-9)).unwrap_err();
    assert!(matches!(e, StrakeError::DegenerateSurface { .. }), "{e}");
    let e = geodesic_between(&s, (1.0, 1.0), (9.0, 1.0), &BetweenOptions::new(1e-9)).unwrap_err();
    assert!(
        matches!(e, StrakeError::OutOfDomain { value, .. } if value == 9.0),
        "{e}"
    );
    // One Newton iteration is not enough for a long curved geodesic: a status naming the
    // miss reached, never the unconverged curve.
    let mut o = BetweenOptions::new(1e-12);
    o.max_iterations = 1;
    let e = geodesic_between(&s, (1.0, 0.5), (3.0, 2.5), &o).unwrap_err();
    assert!(
        matches!(e, StrakeError::GeodesicNotFound { .. }) && e.to_string().contains("miss"),
        "{e}"
    );
}

/// The same on a native NURBS surface: the exact rational torus (The NURBS Book, A8.1
/// revolution of a 9-point circle), R = 3, r = 1, u, v ∈ [0, 1]. Its parametrisation is not
/// by angle and its second derivatives jump at the knot lines, but the geodesics are the
/// torus's: Clairaut's relation holds (do Carmo §4-4). Steps stop at the knot lines (without
/// that, steps straddling them left a spread of 6e-6 at this tolerance; now about 4e-10).
#[test]
fn clairaut_holds_on_a_nurbs_torus() {
    use strake::nurbs::conics::{CircleForm, torus as nurbs_torus};
    let t = nurbs_torus(3.0, 1.0, CircleForm::NinePoint).unwrap();
    for (u0, v0, theta) in [(0.1, 0.05, 0.8), (0.3, 0.4, 0.3)] {
        let g = trace_geodesic(
            &t,
            u0,
            v0,
            StartDirection::Angle(theta),
            5.0,
            &TraceOptions::new(1e-10),
        )
        .unwrap();
        let spread = clairaut_spread(&t, &g, 301);
        println!(
            "NURBS torus: {:?}, {} steps ({} rejected), spread {spread:e}",
            g.end, g.stats.accepted, g.stats.rejected
        );
        assert!(spread < 1e-8, "r cos psi spread {spread:e}");
    }
}
