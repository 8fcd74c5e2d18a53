//! Regression: arc length across the interior knots of a UV spline.
//!
//! The speed |c'(t)| of a cubic spline on a surface is only C¹ at the spline's knots. When a
//! knot lay between an interval's end and its first Gauss node, the whole-interval 5-point
//! Gauss–Legendre value and the two halves made the same error, so the adaptive rule stopped
//! with a relative error of ~4e-9 whatever the tolerance asked. The quadrature now splits at
//! the curve's breakpoints. Reference: composite Simpson's rule with 2¹⁶ panels over each knot
//! span (an independent rule; its error on a smooth span is O(h⁴), far below the tolerance).

use strake::analytic::torus;
use strake::nurbs::CircleForm;
use strake::nurbs::conics::cylinder;
use strake::{CurveOnSurface, Hints, NurbsCurve, SurfaceSource, UvCurve, arc_length};

fn simpson(f: impl Fn(f64) -> f64, a: f64, b: f64, n: usize) -> f64 {
    let h = (b - a) / n as f64;
    let mut s = f(a) + f(b);
    for i in 1..n {
        s += f(a + i as f64 * h) * if i % 2 == 1 { 4.0 } else { 2.0 };
    }
    s * h / 3.0
}

#[test]
fn arc_length_across_knots_meets_its_tolerance() {
    let s = torus(40.0, 12.0);
    // A cubic with uneven interior knots winding over the torus (invented data); the knot at
    // 0.0503 lies in the first 5% of [t0, t1], left of the first Gauss node at every level of
    // the old bisection (without the split the error was 1.8e-8 at a tolerance of 1e-8).
    let knots = [
        0.0, 0.0, 0.0, 0.0, 0.0503, 0.29, 0.61, 0.7, 1.0, 1.0, 1.0, 1.0,
    ];
    let pts = [
        [0.2, 0.3],
        [0.9, 1.8],
        [1.5, 0.4],
        [2.4, 2.9],
        [3.0, 4.4],
        [3.9, 3.1],
        [4.6, 5.0],
        [5.5, 5.9],
    ];
    let c = NurbsCurve::new(3, &knots, &pts, None).unwrap();
    let cs = CurveOnSurface::new(&s, &c);
    let speed = |t: f64| cs.frame(t, &mut Hints::default()).unwrap().speed;
    let (t0, t1) = (0.05, 0.93);
    let mut cuts = vec![t0];
    cuts.extend(
        c.breakpoints()
            .iter()
            .copied()
            .filter(|&k| k > t0 && k < t1),
    );
    cuts.push(t1);
    let reference: f64 = cuts
        .windows(2)
        .map(|w| simpson(speed, w[0], w[1], 1 << 16))
        .sum();
    for tol in [1e-8, 1e-10, 1e-12] {
        let got = arc_length(&cs, t0, t1, tol).unwrap();
        let err = (got - reference).abs() / reference;
        assert!(err <= tol.max(1e-13), "tol {tol:e}: relative error {err:e}");
    }
    assert_eq!(c.breakpoints(), &[0.0503, 0.29, 0.61, 0.7]);
}

// Regression: arc length across the knot lines of the *surface*. The rational quadratic
// circles have double knots (a kink in the parametric speed where the arcs join); before the
// quadrature split there, the full circle came out 2.4e-8 (nine-point form) and 5.4e-8
// (seven-point form) short whatever the tolerance. Reference: the circumference 2πR of the
// exact circle the NURBS represents (The NURBS Book, 2nd ed., §7.5). The curve u = t² sweeps
// the whole circle at v = 0.5 with the knot lines at non-dyadic t (√0.25 = 0.5 for the
// nine-point form is a scan point: the case of a line hit exactly).
#[test]
fn arc_length_across_surface_knot_lines_meets_its_tolerance() {
    let r = 3.0;
    let exact = 2.0 * std::f64::consts::PI * r;
    for form in [CircleForm::NinePoint, CircleForm::SevenPoint] {
        let s = cylinder(r, 0.0, 2.0, form).unwrap();
        let ud = s.u_domain();
        assert!(!s.u_breaks().is_empty());
        let c = NurbsCurve::new(
            2,
            &[0.0, 0.0, 0.0, 1.0, 1.0, 1.0],
            &[[ud.lo, 0.5], [ud.lo, 0.5], [ud.hi, 0.5]],
            None,
        )
        .unwrap();
        let cs = CurveOnSurface::new(&s, &c);
        for tol in [1e-8, 1e-10, 1e-12] {
            let got = arc_length(&cs, 0.0, 1.0, tol).unwrap();
            let err = (got - exact).abs() / exact;
            assert!(
                err <= tol.max(1e-14),
                "{form:?}, tol {tol:e}: relative error {err:e}"
            );
        }
    }
}
