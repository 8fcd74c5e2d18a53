//! Global interpolation of points by a non-rational B-spline curve of degree p (a C^{p−1} curve;
//! the default p = 3 gives a C2 cubic), in D dimensions.
//!
//! The NURBS Book, 2nd ed. (L. Piegl, W. Tiller, 1997), §9.2.1 and A9.1 GlobalCurveInterp
//! (pp. 369–370 \[memory\]), with the end-derivative variant of §9.2.2
//! \[equation numbers: memory\]:
//!
//! - Parameters ū_0 = 0, ū_n = 1, ū_k = ū_{k−1} + |Q_k − Q_{k−1}|^e / d with
//!   d = Σ |Q_k − Q_{k−1}|^e; e = 1 is the chord-length method (eqs. 9.4–9.5), e = ½ the
//!   centripetal method (eq. 9.6).
//! - Knots by averaging (eq. 9.8): u_0 = … = u_p = 0, u_{m−p} = … = u_m = 1,
//!   u_{j+p} = (1/p) Σ_{i=j}^{j+p−1} ū_i for j = 1, …, n − p.
//! - The n + 1 control points solve the collocation system C(ū_k) = Q_k, i.e.
//!   Σ_i N_{i,p}(ū_k) P_i = Q_k; the matrix is banded (at most p + 1 non-zeros a row about the
//!   diagonal) and is solved by band LU with partial pivoting (see the private module `banded`), in
//!   O(n p²) operations, one solve for all D coordinates.
//! - With end derivatives D_0 = C'(0), D_n = C'(1) (§9.2.2): n + 3 control points, knots
//!   u_{j+p} = (1/p) Σ_{i=j−1}^{j+p−2} ū_i for j = 1, …, n − p + 2, and two more equations
//!   −P_0 + P_1 = (u_{p+1}/p) D_0 and −P_{n+1} + P_{n+2} = ((1 − u_{m−p−1})/p) D_n.
//!
//! The curve parameter runs over [0, 1]; derivatives are with respect to it, so an end
//! derivative of a chord-length curve has about the magnitude of the polygon length d (a unit
//! tangent times d is the natural choice). For a curve through points taken from a smooth curve
//! at spacing h, chord-length cubic interpolation is fourth-order accurate in position and so
//! second-order in curvature (M. S. Floater, "Chordal cubic spline interpolation is fourth
//! order accurate", IMA J. Numer. Anal. 26 (2006) 25–33 \[memory\]); the centripetal and uniform
//! choices are in general only second-order. The tests measure these orders.

use super::banded::BandMatrix;
use super::basis::basis_rows;
use super::curve::NurbsCurve;
use super::knots::{KnotVector, MAX_DEGREE, SpanHint};
use crate::error::{NonFiniteSource, Result, StrakeError};

/// How the parameters ū_k of the points are chosen.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Parametrization {
    /// Chord length: ū_k − ū_{k−1} proportional to |Q_k − Q_{k−1}| (The NURBS Book eq. 9.5).
    #[default]
    ChordLength,
    /// Centripetal: ū_k − ū_{k−1} proportional to |Q_k − Q_{k−1}|^½ (eq. 9.6); gentler on sharp
    /// turns of the data, less accurate on smooth data.
    Centripetal,
}

/// First derivatives C'(0) and C'(1) that the interpolating curve must have at its ends, with
/// respect to its parameter on [0, 1].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct EndDerivatives<const D: usize> {
    /// C'(0).
    pub start: [f64; D],
    /// C'(1).
    pub end: [f64; D],
}

/// A short name of coordinate `c` of a D-dimensional point, for messages: u, v in the parameter
/// plane, x, y, z in space.
pub fn coordinate_name(d: usize, c: usize) -> &'static str {
    match (d, c) {
        (2, 0) => "u",
        (2, 1) => "v",
        (3, 0) => "x",
        (3, 1) => "y",
        (3, 2) => "z",
        _ => "coordinate",
    }
}

fn at_point(index: usize, error: StrakeError) -> StrakeError {
    StrakeError::AtPoint {
        index,
        error: Box::new(error),
    }
}

/// Checks that every coordinate of every point is finite. Errors: `AtPoint { index, NonFinite }`
/// naming the coordinate and value.
pub fn check_points_finite<const D: usize>(points: &[[f64; D]]) -> Result<()> {
    for (index, q) in points.iter().enumerate() {
        for (c, &x) in q.iter().enumerate() {
            if !x.is_finite() {
                return Err(at_point(
                    index,
                    StrakeError::NonFinite {
                        source: NonFiniteSource::InputPoint,
                        what: coordinate_name(D, c),
                        value: x,
                    },
                ));
            }
        }
    }
    Ok(())
}

fn distance<const D: usize>(a: &[f64; D], b: &[f64; D]) -> f64 {
    // Scaled sum of squares, so that coordinates near 1e200 do not overflow.
    let scale = a
        .iter()
        .zip(b)
        .fold(0.0_f64, |m, (x, y)| m.max((x - y).abs()));
    if scale == 0.0 || !scale.is_finite() {
        return scale;
    }
    let s: f64 = a
        .iter()
        .zip(b)
        .map(|(x, y)| ((x - y) / scale).powi(2))
        .sum();
    scale * s.sqrt()
}

/// The parameters ū_0 = 0 < ū_1 < … < ū_n = 1 of `points` (The NURBS Book eqs. 9.4–9.6).
///
/// Errors: `InvalidArgument` for fewer than 2 points; `AtPoint { index, NonFinite }` for a
/// non-finite coordinate; `AtPoint { index, InvalidArgument }` when point `index` coincides
/// with point `index − 1` (a zero chord, judged to round-off: |Q_k − Q_{k−1}| ≤
/// 8 ε max(|Q_k|∞, |Q_{k−1}|∞), ε the machine epsilon). Points may repeat non-consecutively
/// (a closed path returns to its start).
pub fn interpolation_parameters<const D: usize>(
    points: &[[f64; D]],
    method: Parametrization,
) -> Result<Vec<f64>> {
    if points.len() < 2 {
        return Err(StrakeError::InvalidArgument(format!(
            "interpolation needs at least 2 points, got {}",
            points.len()
        )));
    }
    check_points_finite(points)?;
    let mut params = Vec::with_capacity(points.len());
    params.push(0.0);
    let mut total = 0.0;
    for k in 1..points.len() {
        let chord = distance(&points[k], &points[k - 1]);
        let mag = points[k]
            .iter()
            .chain(&points[k - 1])
            .fold(0.0_f64, |m, x| m.max(x.abs()));
        if chord <= 8.0 * f64::EPSILON * mag || chord == 0.0 {
            return Err(at_point(
                k,
                StrakeError::InvalidArgument(format!(
                    "point {k} coincides with point {} (chord length {chord}): consecutive \
                     points must differ",
                    k - 1,
                    chord = crate::numfmt::Num(chord)
                )),
            ));
        }
        let step = match method {
            Parametrization::ChordLength => chord,
            Parametrization::Centripetal => chord.sqrt(),
        };
        total += step;
        params.push(total);
    }
    if !total.is_finite() {
        return Err(StrakeError::NonFinite {
            source: NonFiniteSource::Result,
            what: "total chord length",
            value: total,
        });
    }
    let n = params.len() - 1;
    for x in &mut params[1..n] {
        *x /= total;
    }
    params[n] = 1.0;
    Ok(params)
}

/// The smallest number of points that degree `p` accepts: p + 1 without end derivatives
/// (n + 1 control points), max(2, p − 1) with them (n + 3 control points ≥ p + 1).
pub fn min_points(degree: usize, with_end_derivatives: bool) -> usize {
    if with_end_derivatives {
        degree.saturating_sub(1).max(2)
    } else {
        (degree + 1).max(2)
    }
}

/// Interpolates `points` by a non-rational B-spline curve of `degree` on [0, 1] (see the module
/// docs for the method), with optional end derivatives.
///
/// Errors: `InvalidDegree` for a degree outside 1..=[`MAX_DEGREE`], or end derivatives with
/// degree 1; `InvalidArgument` for fewer than [`min_points`] points or non-finite end
/// derivatives; the errors of [`interpolation_parameters`] (each naming the point's index).
pub fn interpolate<const D: usize>(
    points: &[[f64; D]],
    degree: usize,
    method: Parametrization,
    ends: Option<&EndDerivatives<D>>,
) -> Result<NurbsCurve<D>> {
    check_degree(points.len(), degree, ends.is_some())?;
    let params = interpolation_parameters(points, method)?;
    interpolate_with_parameters(points, &params, degree, ends)
}

/// Checks the degree (1..=[`MAX_DEGREE`], ≥ 2 with end derivatives) and that `count` points
/// are enough for it ([`min_points`]).
pub(crate) fn check_degree(count: usize, degree: usize, with_ends: bool) -> Result<()> {
    if degree == 0 || degree > MAX_DEGREE {
        return Err(StrakeError::InvalidDegree(format!(
            "interpolation degree {degree} is outside 1..={MAX_DEGREE}"
        )));
    }
    if with_ends && degree < 2 {
        return Err(StrakeError::InvalidDegree(
            "end derivatives need degree 2 or more (degree 1 has no room for them)".into(),
        ));
    }
    let need = min_points(degree, with_ends);
    if count < need {
        return Err(StrakeError::InvalidArgument(format!(
            "interpolation of degree {degree}{} needs at least {need} points, got {count}",
            if with_ends {
                " with end derivatives"
            } else {
                ""
            }
        )));
    }
    Ok(())
}

/// As [`interpolate`], with the parameters given (strictly increasing from 0 to 1, one per
/// point, as from [`interpolation_parameters`]).
///
/// Errors: those of [`interpolate`]; `InvalidArgument` when the parameters are not strictly
/// increasing from 0 to 1 or their count differs from the point count.
pub fn interpolate_with_parameters<const D: usize>(
    points: &[[f64; D]],
    params: &[f64],
    degree: usize,
    ends: Option<&EndDerivatives<D>>,
) -> Result<NurbsCurve<D>> {
    check_degree(points.len(), degree, ends.is_some())?;
    check_points_finite(points)?;
    if params.len() != points.len() {
        return Err(StrakeError::InvalidArgument(format!(
            "{} parameters for {} points",
            params.len(),
            points.len()
        )));
    }
    let n = points.len() - 1;
    if params[0] != 0.0
        || params[n] != 1.0
        || params.windows(2).any(|w| w[1] <= w[0] || !w[1].is_finite())
    {
        return Err(StrakeError::InvalidArgument(
            "interpolation parameters must increase strictly from 0 to 1".into(),
        ));
    }
    if let Some(e) = ends {
        for (what, d) in [("start derivative", &e.start), ("end derivative", &e.end)] {
            if let Some(&bad) = d.iter().find(|x| !x.is_finite()) {
                return Err(StrakeError::NonFinite {
                    source: NonFiniteSource::Parameter,
                    what,
                    value: bad,
                });
            }
        }
    }
    let p = degree;
    let count = if ends.is_some() { n + 3 } else { n + 1 };
    // Knots by averaging (eq. 9.8, or its end-derivative form of §9.2.2).
    let mut knots = vec![0.0; count + p + 1];
    for k in &mut knots[count..] {
        *k = 1.0;
    }
    let shift = usize::from(ends.is_some());
    let pf = p as f64;
    for j in 1..count - p {
        let s: f64 = params[j - shift..j - shift + p].iter().sum();
        knots[j + p] = s / pf;
    }
    let kv = KnotVector::new("interpolation knots", &knots, p, count)?;

    // Rows of the system, in order: [P_0 = Q_0], [derivative at 0], C(ū_k) = Q_k for interior
    // k, [derivative at 1], [P_last = Q_n]. Collect (first column, coefficients) to size the
    // band.
    let mut rows: Vec<(usize, [f64; MAX_DEGREE + 1])> = Vec::with_capacity(count);
    let mut rhs: Vec<[f64; D]> = Vec::with_capacity(count);
    let mut unit = [0.0; MAX_DEGREE + 1];
    unit[0] = 1.0;
    rows.push((0, unit));
    rhs.push(points[0]);
    if let Some(e) = ends {
        let mut r = [0.0; MAX_DEGREE + 1];
        r[0] = -1.0;
        r[1] = 1.0;
        rows.push((0, r));
        let f = knots[p + 1] / pf;
        rhs.push(e.start.map(|x| x * f));
    }
    let mut hint = SpanHint::default();
    for k in 1..n {
        let span = kv.find_span(params[k], &mut hint);
        let b = basis_rows(&knots, p, span, params[k], 0);
        rows.push((span - p, b.d[0]));
        rhs.push(points[k]);
    }
    if let Some(e) = ends {
        let mut r = [0.0; MAX_DEGREE + 1];
        r[0] = -1.0;
        r[1] = 1.0;
        rows.push((count - 2, r));
        let f = (1.0 - knots[count - 1]) / pf;
        rhs.push(e.end.map(|x| x * f));
    }
    rows.push((count - 1, unit));
    rhs.push(points[n]);
    debug_assert_eq!(rows.len(), count);

    let width = |i: usize, first: usize| -> (usize, usize) {
        let last = (first + p).min(count - 1);
        (i.saturating_sub(first), last.saturating_sub(i))
    };
    let (mut kl, mut ku) = (0, 0);
    for (i, (first, _)) in rows.iter().enumerate() {
        let (l, u) = width(i, *first);
        kl = kl.max(l);
        ku = ku.max(u);
    }
    let mut a = BandMatrix::zeros(count, kl, ku);
    for (i, (first, coef)) in rows.iter().enumerate() {
        for (r, &c) in coef.iter().enumerate().take(p + 1) {
            let j = first + r;
            if j < count && c != 0.0 {
                a.set(i, j, c);
            }
        }
    }
    // Entries are basis values in [0, 1] or ±1; a pivot below 1e-14 means a singular system.
    a.factorise(1e-14)?;
    a.solve(&mut rhs);
    NurbsCurve::new(p, &knots, &rhs, None)
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geometry::jet::DerivOrder;

    fn eval<const D: usize>(c: &NurbsCurve<D>, t: f64) -> [f64; D] {
        c.derivs(t, DerivOrder::Position, &mut SpanHint::default())
            .unwrap()
            .p
    }

    // The NURBS Book 2nd ed., Ex. 9.1 [memory; values recomputed here]: Q = (0,0), (3,4),
    // (−1,4), (−4,0), (−4,−3); chords 5, 4, 5, 3, d = 17; chord-length ū = 0, 5/17, 9/17,
    // 14/17, 1; cubic knots by averaging {0,0,0,0, 28/51, 1,1,1,1}.
    #[test]
    fn parameters_and_knots_of_the_worked_example() {
        let q = [
            [0.0, 0.0],
            [3.0, 4.0],
            [-1.0, 4.0],
            [-4.0, 0.0],
            [-4.0, -3.0],
        ];
        let u = interpolation_parameters(&q, Parametrization::ChordLength).unwrap();
        let expect = [0.0, 5.0 / 17.0, 9.0 / 17.0, 14.0 / 17.0, 1.0];
        for (a, b) in u.iter().zip(&expect) {
            assert!((a - b).abs() < 1e-15, "{u:?}");
        }
        let c = interpolate(&q, 3, Parametrization::ChordLength, None).unwrap();
        let k = c.knot_vector().knots();
        assert_eq!(k.len(), 9);
        assert!((k[4] - 28.0 / 51.0).abs() < 1e-15, "{k:?}");
        // Interpolation: C(ū_k) = Q_k (A9.1's defining property).
        for (t, qk) in u.iter().zip(&q) {
            let p = eval(&c, *t);
            assert!((p[0] - qk[0]).abs() < 1e-13 && (p[1] - qk[1]).abs() < 1e-13);
        }
        // Centripetal (eq. 9.6): increments √5, 2, √5, √3 over their sum.
        let uc = interpolation_parameters(&q, Parametrization::Centripetal).unwrap();
        let d = 2.0 * 5f64.sqrt() + 2.0 + 3f64.sqrt();
        assert!((uc[1] - 5f64.sqrt() / d).abs() < 1e-15);
        assert!((uc[3] - (2.0 * 5f64.sqrt() + 2.0) / d).abs() < 1e-15);
    }

    // Polynomial reproduction (The NURBS Book §9.2.1: the interpolant of degree p reproduces
    // any polynomial curve of degree ≤ p sampled at the interpolation parameters, since that
    // curve lies in the spline space and the collocation system has a unique solution).
    #[test]
    fn reproduces_a_cubic_polynomial_with_and_without_end_derivatives() {
        let f = |t: f64| {
            [
                1.0 + 2.0 * t - t * t * t,
                0.5 * t * t - 3.0 * t,
                2.0 * t * t * t,
            ]
        };
        let df = |t: f64| [2.0 - 3.0 * t * t, t - 3.0, 6.0 * t * t];
        let params: Vec<f64> = (0..9).map(|k| (k as f64 / 8.0).powf(1.3)).collect();
        let pts: Vec<[f64; 3]> = params.iter().map(|&t| f(t)).collect();
        let ends = EndDerivatives {
            start: df(0.0),
            end: df(1.0),
        };
        for e in [None, Some(&ends)] {
            let c = interpolate_with_parameters(&pts, &params, 3, e).unwrap();
            for i in 0..=50 {
                let t = i as f64 / 50.0;
                let (a, b) = (eval(&c, t), f(t));
                for k in 0..3 {
                    assert!((a[k] - b[k]).abs() < 1e-12, "t {t}: {a:?} vs {b:?}");
                }
            }
            if e.is_some() {
                let d = c
                    .derivs(0.0, DerivOrder::First, &mut SpanHint::default())
                    .unwrap();
                assert!((d.d1[0] - 2.0).abs() < 1e-12 && (d.d1[1] + 3.0).abs() < 1e-12);
            }
        }
    }

    // §9.2.2: the end derivative equations hold for any data (C'(0) = D_0, C'(1) = D_n).
    #[test]
    fn end_derivatives_are_honoured() {
        let q = [[0.0, 0.0], [1.0, 2.0], [3.0, 2.5], [4.0, 0.0]];
        for p in 2..=4 {
            let ends = EndDerivatives {
                start: [0.0, 7.0],
                end: [5.0, -5.0],
            };
            let c = interpolate(&q, p, Parametrization::ChordLength, Some(&ends)).unwrap();
            assert_eq!(c.control_points().len(), q.len() + 2);
            let mut h = SpanHint::default();
            let d0 = c.derivs(0.0, DerivOrder::First, &mut h).unwrap();
            let d1 = c.derivs(1.0, DerivOrder::First, &mut h).unwrap();
            for k in 0..2 {
                assert!((d0.d1[k] - ends.start[k]).abs() < 1e-12, "p {p}: {d0:?}");
                assert!((d1.d1[k] - ends.end[k]).abs() < 1e-12, "p {p}: {d1:?}");
            }
        }
    }

    #[test]
    fn degree_one_is_the_polygon_and_two_points_make_a_line() {
        let q = [[0.0, 0.0], [2.0, 0.0], [2.0, 1.0]];
        let c = interpolate(&q, 1, Parametrization::ChordLength, None).unwrap();
        // Chord-length parameters 0, 2/3, 1: the polygon's corner is at t = 2/3.
        let p = eval(&c, 1.0 / 3.0);
        assert!((p[0] - 1.0).abs() < 1e-15 && p[1].abs() < 1e-15);
        let line = interpolate(
            &[[1.0, 1.0], [3.0, 5.0]],
            1,
            Parametrization::ChordLength,
            None,
        )
        .unwrap();
        let m = eval(&line, 0.5);
        assert!((m[0] - 2.0).abs() < 1e-15 && (m[1] - 3.0).abs() < 1e-15);
    }

    #[test]
    fn refusals_name_what_is_wrong() {
        let q = [[0.0, 0.0], [1.0, 0.0], [1.0, 0.0], [2.0, 1.0], [3.0, 0.0]];
        let e = interpolate(&q, 3, Parametrization::ChordLength, None).unwrap_err();
        assert!(matches!(e, StrakeError::AtPoint { index: 2, .. }), "{e}");
        assert!(
            e.to_string().contains("point 2 coincides with point 1"),
            "{e}"
        );

        let mut q2 = [[0.0, 0.0], [1.0, 0.0], [2.0, 1.0], [3.0, 0.0]];
        q2[2][1] = f64::NAN;
        let e = interpolate(&q2, 3, Parametrization::ChordLength, None).unwrap_err();
        assert!(matches!(e, StrakeError::AtPoint { index: 2, .. }), "{e}");
        assert!(e.to_string().contains("v = NaN"), "{e}");

        let e = interpolate(&q2[..2], 3, Parametrization::ChordLength, None).unwrap_err();
        assert!(e.to_string().contains("at least 4 points, got 2"), "{e}");
        let e = interpolate(&[[0.0, 0.0]], 1, Parametrization::ChordLength, None).unwrap_err();
        assert!(e.to_string().contains("at least 2 points, got 1"), "{e}");
        for p in [0, MAX_DEGREE + 1] {
            let e = interpolate(&q, p, Parametrization::ChordLength, None).unwrap_err();
            assert!(matches!(e, StrakeError::InvalidDegree(_)), "{e}");
        }
        let ends = EndDerivatives {
            start: [f64::INFINITY, 0.0],
            end: [0.0, 0.0],
        };
        let q3 = [[0.0, 0.0], [1.0, 0.0], [2.0, 1.0]];
        let e = interpolate(&q3, 3, Parametrization::ChordLength, Some(&ends)).unwrap_err();
        assert!(e.to_string().contains("start derivative = inf"), "{e}");
        let e = interpolate(&q3, 1, Parametrization::ChordLength, Some(&ends)).unwrap_err();
        assert!(matches!(e, StrakeError::InvalidDegree(_)), "{e}");
    }
}
