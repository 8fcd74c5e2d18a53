//! Interpolation reproduces known curves to the accuracy that interpolation theory predicts.
//!
//! Prediction (stated, then measured here by halving the spacing h): a chord-length cubic
//! interpolant of points sampled from a smooth curve is fourth-order accurate in position,
//! error O(h⁴) (M. S. Floater, "Chordal cubic spline interpolation is fourth order accurate",
//! IMA J. Numer. Anal. 26 (2006) 25–33 [memory]; for functions, the classical O(h⁴) of cubic
//! spline interpolation, C. de Boor, *A Practical Guide to Splines*, ch. V [memory]).
//! Curvature involves second derivatives, which lose two orders: O(h²). The observed order is
//! log₂(e(h)/e(h/2)).

use std::f64::consts::TAU;
use strake::analytic::torus;
use strake::nurbs::interpolate::{Parametrization, interpolate};
use strake::{
    CurveJet, CurveOnSurface, DerivOrder, FnCurve, Hints, Interval, NurbsCurve, SpanHint,
};

/// The 9-point rational quadratic circle of radius R (The NURBS Book 2nd ed. §7.5, A7.1
/// [memory]; shared/REFERENCES.md).
fn nurbs_circle(r: f64) -> NurbsCurve<2> {
    let s = std::f64::consts::FRAC_1_SQRT_2;
    let xy = [
        [1.0, 0.0],
        [1.0, 1.0],
        [0.0, 1.0],
        [-1.0, 1.0],
        [-1.0, 0.0],
        [-1.0, -1.0],
        [0.0, -1.0],
        [1.0, -1.0],
        [1.0, 0.0],
    ];
    let pts: Vec<[f64; 2]> = xy.iter().map(|p| [r * p[0], r * p[1]]).collect();
    let w = [1.0, s, 1.0, s, 1.0, s, 1.0, s, 1.0];
    let k = [
        0.0, 0.0, 0.0, 0.25, 0.25, 0.5, 0.5, 0.75, 0.75, 1.0, 1.0, 1.0,
    ];
    NurbsCurve::new(2, &k, &pts, Some(&w)).unwrap()
}

/// Largest radial error | |C| − R | and curvature error |κ − 1/R| of an interpolant, densely.
fn circle_errors(c: &NurbsCurve<2>, r: f64) -> (f64, f64) {
    let mut h = SpanHint::default();
    let (mut ep, mut ek) = (0.0_f64, 0.0_f64);
    for i in 0..=4000 {
        let d = c
            .derivs(i as f64 / 4000.0, DerivOrder::Second, &mut h)
            .unwrap();
        ep = ep.max((d.p[0].hypot(d.p[1]) - r).abs());
        let cross = d.d1[0] * d.d2[1] - d.d1[1] * d.d2[0];
        let sp = d.d1[0].hypot(d.d1[1]);
        ek = ek.max((cross / sp.powi(3) - 1.0 / r).abs());
    }
    (ep, ek)
}

fn sci(e: &[f64]) -> String {
    e.iter()
        .map(|x| format!("{x:.2e}"))
        .collect::<Vec<_>>()
        .join(" ")
}

fn orders(e: &[f64]) -> Vec<f64> {
    e.windows(2).map(|w| (w[0] / w[1]).log2()).collect()
}

// Points on three quarters of the exact rational circle; chord-length cubic interpolation:
// position order 4, curvature order 2 (module docs). The circle is the exact rational curve,
// so its own points are exact; the check is against |C| = R and κ = 1/R (elementary).
#[test]
fn circle_points_converge_at_the_predicted_orders() {
    let r = 1.3;
    let circle = nurbs_circle(r);
    let mut h = SpanHint::default();
    let (mut ep, mut ek) = (Vec::new(), Vec::new());
    for n in [12, 24, 48, 96, 192] {
        let pts: Vec<[f64; 2]> = (0..=n)
            .map(|k| {
                let s = 0.75 * k as f64 / n as f64;
                circle.derivs(s, DerivOrder::Position, &mut h).unwrap().p
            })
            .collect();
        let c = interpolate(&pts, 3, Parametrization::ChordLength, None).unwrap();
        let (p, k) = circle_errors(&c, r);
        ep.push(p);
        ek.push(k);
    }
    let (op, ok) = (orders(&ep), orders(&ek));
    eprintln!(
        "circle, chord length: position errors {} orders {op:.2?}",
        sci(&ep)
    );
    eprintln!(
        "circle, chord length: curvature errors {} orders {ok:.2?}",
        sci(&ek)
    );
    for o in &op[1..] {
        assert!(*o > 3.7, "position order {o}");
    }
    for o in &ok[1..] {
        assert!(*o > 1.8, "curvature order {o}");
    }
    // Centripetal parameters: measured for comparison (no order is promised for them).
    let mut ec = Vec::new();
    for n in [24, 48, 96] {
        let pts: Vec<[f64; 2]> = (0..=n)
            .map(|k| {
                let s = 0.75 * k as f64 / n as f64;
                circle.derivs(s, DerivOrder::Position, &mut h).unwrap().p
            })
            .collect();
        let c = interpolate(&pts, 3, Parametrization::Centripetal, None).unwrap();
        ec.push(circle_errors(&c, r).0);
    }
    eprintln!(
        "circle, centripetal: position errors {} orders {:.2?}",
        sci(&ec),
        orders(&ec)
    );
}

// A torus parallel, given as points (u_k, v0) in the parameter plane, is a line there; the
// chord-length interpolant reproduces it exactly (a line is in the spline space), so its
// invariants are the parallel's closed forms to round-off: κn = −cos v/ρ, κg = sin v/ρ,
// τg = 0, ρ = R + r cos v (do Carmo ch. 3 via shared/REFERENCES.md; signs for the analytic
// torus's outward normal and u increasing, as derived in tests/projection.rs).
#[test]
fn torus_parallel_is_reproduced_to_round_off() {
    let (big_r, r) = (3.0, 1.0);
    let t = torus(big_r, r);
    for v0 in [0.3, 2.0, 4.0] {
        let pts: Vec<[f64; 2]> = (0..=20).map(|k| [0.1 + 0.3 * k as f64, v0]).collect();
        let c = interpolate(&pts, 3, Parametrization::ChordLength, None).unwrap();
        let cs = CurveOnSurface::new(&t, &c);
        let rho = big_r + r * f64::cos(v0);
        let mut h = Hints::default();
        for i in 0..=200 {
            let f = cs.frame(i as f64 / 200.0, &mut h).unwrap();
            assert!(
                (f.normal_curvature + f64::cos(v0) / rho).abs() < 1e-12,
                "{f:?}"
            );
            assert!(
                (f.geodesic_curvature - f64::sin(v0) / rho).abs() < 1e-12,
                "{f:?}"
            );
            assert!(f.geodesic_torsion.abs() < 1e-12, "{f:?}");
        }
    }
}

// A circle in the torus's parameter plane, (u, v) = (cu + a cos θ, cv + a sin θ): its image is
// a curve with varying κn, κg and τg. The interpolant of points on it is compared, at each of
// its points, with the exact curve at the same θ (the radial projection in the parameter
// plane), both through the same frame computation; the invariants converge at the order that
// curvature does: 2.
#[test]
fn torus_curve_invariants_converge_at_second_order() {
    let t = torus(3.0, 1.0);
    let (cu, cv, a) = (2.0, 0.8, 0.6);
    let exact = FnCurve::new(Interval::new("θ", 0.0, TAU).unwrap(), move |th: f64| {
        let (s, c) = th.sin_cos();
        Ok(CurveJet {
            u: cu + a * c,
            v: cv + a * s,
            du: -a * s,
            dv: a * c,
            ddu: -a * c,
            ddv: -a * s,
        })
    });
    let ex = CurveOnSurface::new(&t, &exact);
    let span = 4.5;
    let mut errs = Vec::new();
    for n in [16, 32, 64, 128] {
        let pts: Vec<[f64; 2]> = (0..=n)
            .map(|k| {
                let th = span * k as f64 / n as f64;
                [cu + a * th.cos(), cv + a * th.sin()]
            })
            .collect();
        let c = interpolate(&pts, 3, Parametrization::ChordLength, None).unwrap();
        let cs = CurveOnSurface::new(&t, &c);
        let (mut h1, mut h2) = (Hints::default(), Hints::default());
        let mut e = 0.0_f64;
        for i in 0..=2000 {
            let f = cs.frame(i as f64 / 2000.0, &mut h1).unwrap();
            let th = (f.v - cv).atan2(f.u - cu).rem_euclid(TAU).min(span);
            let g = ex.frame(th, &mut h2).unwrap();
            e = e
                .max((f.normal_curvature - g.normal_curvature).abs())
                .max((f.geodesic_curvature - g.geodesic_curvature).abs())
                .max((f.geodesic_torsion - g.geodesic_torsion).abs());
        }
        errs.push(e);
    }
    let o = orders(&errs);
    eprintln!(
        "torus UV circle: invariant errors {} orders {o:.2?}",
        sci(&errs)
    );
    for x in &o[1..] {
        assert!(*x > 1.8, "order {x}");
    }
}
