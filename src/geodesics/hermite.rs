//! A piecewise quintic Hermite curve in the parameter plane: at each knot sᵢ the curve takes
//! given values of (u, v) and of their first and second derivatives, so the curve is C² (its
//! first and second derivatives are continuous across knots, which the Darboux frame needs).
//!
//! On a segment [s₀, s₁] with h = s₁ − s₀ and τ = (s − s₀)/h, each coordinate is
//! x(s) = H₀ x₀ + h H₁ x₀' + h² H₂ x₀'' + H₃ x₁ + h H₄ x₁' + h² H₅ x₁'' with
//! H₀ = 1 − 10τ³ + 15τ⁴ − 6τ⁵, H₁ = τ − 6τ³ + 8τ⁴ − 3τ⁵, H₂ = (τ² − 3τ³ + 3τ⁴ − τ⁵)/2,
//! H₃ = 10τ³ − 15τ⁴ + 6τ⁵, H₄ = −4τ³ + 7τ⁴ − 3τ⁵, H₅ = (τ³ − 2τ⁴ + τ⁵)/2.
//! With nodes from a fifth-order integrator the interpolant errs by O(h⁶) in position and
//! O(h⁴) in the second derivative between knots, and is exact to the nodes at them.
//!
//! A knot may appear twice in a row: the first node ends the segment before it and the second
//! starts the one after, so the second derivative may jump there (a geodesic crossing a knot
//! line of a surface whose parametrisation is only C¹ there, such as a rational circle's
//! double knots; the curve in space stays smooth).

use crate::curve::UvCurve;
use crate::error::{Result, StrakeError};
use crate::geometry::jet::{CurveJet, Interval};
use crate::nurbs::SpanHint;

/// A C² piecewise quintic Hermite curve t ↦ (u, v) (see the module docs). Built by the
/// geodesic tracer with t = arc length; immutable, cheap to evaluate (no allocation).
#[derive(Debug, Clone, PartialEq)]
pub struct HermiteUvCurve {
    knots: Vec<f64>,
    nodes: Vec<CurveJet>,
    breaks: Vec<f64>,
}

impl HermiteUvCurve {
    /// A curve through `nodes[i]` (value, first and second derivatives) at `knots[i]`.
    ///
    /// Errors: `InvalidArgument` unless there are at least two knots, finite and increasing
    /// (a knot may repeat once, inside, for a jump of the second derivative), one node each,
    /// all finite.
    pub fn new(knots: Vec<f64>, nodes: Vec<CurveJet>) -> Result<Self> {
        if knots.len() < 2 || knots.len() != nodes.len() {
            return Err(StrakeError::InvalidArgument(format!(
                "a Hermite curve needs at least 2 knots and one node per knot; got {} knots and \
                 {} nodes",
                knots.len(),
                nodes.len()
            )));
        }
        let m = knots.len();
        for (i, w) in knots.windows(2).enumerate() {
            let repeat_ok = w[1] == w[0] && i > 0 && i + 2 < m && knots[i - 1] < w[0];
            if !(w[0].is_finite() && w[1].is_finite() && (w[1] > w[0] || repeat_ok)) {
                return Err(StrakeError::InvalidArgument(format!(
                    "Hermite knots must increase (a knot may repeat once, inside): knot {} = {} \
                     then {}",
                    i,
                    crate::numfmt::Exact(w[0]),
                    crate::numfmt::Exact(w[1])
                )));
            }
        }
        for (i, n) in nodes.iter().enumerate() {
            n.check_finite().map_err(|e| StrakeError::AtPoint {
                index: i,
                error: Box::new(e),
            })?;
        }
        let mut breaks = knots[1..knots.len() - 1].to_vec();
        breaks.dedup();
        Ok(HermiteUvCurve {
            knots,
            nodes,
            breaks,
        })
    }

    /// The knots (for a traced geodesic: the arc lengths of the accepted steps).
    pub fn knots(&self) -> &[f64] {
        &self.knots
    }

    /// The node at each knot: (u, v) with first and second derivatives.
    pub fn nodes(&self) -> &[CurveJet] {
        &self.nodes
    }

    /// The segment holding t (the last one for t at the end).
    fn segment(&self, t: f64, hint: &mut SpanHint) -> usize {
        let last = self.knots.len() - 2;
        if let Some(h) = hint.0 {
            if h <= last && self.knots[h] <= t && (t < self.knots[h + 1] || h == last) {
                return h;
            }
        }
        let i = self
            .knots
            .partition_point(|&k| k <= t)
            .saturating_sub(1)
            .min(last);
        hint.0 = Some(i);
        i
    }
}

/// The six quintic Hermite basis functions and their first and second derivatives in τ.
#[inline]
fn basis(t: f64) -> [[f64; 6]; 3] {
    let t2 = t * t;
    let t3 = t2 * t;
    let t4 = t3 * t;
    let t5 = t4 * t;
    [
        [
            1.0 - 10.0 * t3 + 15.0 * t4 - 6.0 * t5,
            t - 6.0 * t3 + 8.0 * t4 - 3.0 * t5,
            0.5 * (t2 - 3.0 * t3 + 3.0 * t4 - t5),
            10.0 * t3 - 15.0 * t4 + 6.0 * t5,
            -4.0 * t3 + 7.0 * t4 - 3.0 * t5,
            0.5 * (t3 - 2.0 * t4 + t5),
        ],
        [
            -30.0 * t2 + 60.0 * t3 - 30.0 * t4,
            1.0 - 18.0 * t2 + 32.0 * t3 - 15.0 * t4,
            0.5 * (2.0 * t - 9.0 * t2 + 12.0 * t3 - 5.0 * t4),
            30.0 * t2 - 60.0 * t3 + 30.0 * t4,
            -12.0 * t2 + 28.0 * t3 - 15.0 * t4,
            0.5 * (3.0 * t2 - 8.0 * t3 + 5.0 * t4),
        ],
        [
            -60.0 * t + 180.0 * t2 - 120.0 * t3,
            -36.0 * t + 96.0 * t2 - 60.0 * t3,
            0.5 * (2.0 - 18.0 * t + 36.0 * t2 - 20.0 * t3),
            60.0 * t - 180.0 * t2 + 120.0 * t3,
            -24.0 * t + 84.0 * t2 - 60.0 * t3,
            0.5 * (6.0 * t - 24.0 * t2 + 20.0 * t3),
        ],
    ]
}

impl UvCurve for HermiteUvCurve {
    fn domain(&self) -> Interval {
        Interval {
            lo: self.knots[0],
            hi: self.knots[self.knots.len() - 1],
        }
    }

    fn breakpoints(&self) -> &[f64] {
        &self.breaks
    }

    #[inline]
    fn jet_in_domain(&self, t: f64, hint: &mut SpanHint) -> Result<CurveJet> {
        let i = self.segment(t, hint);
        let (s0, s1) = (self.knots[i], self.knots[i + 1]);
        let h = s1 - s0;
        let tau = ((t - s0) / h).clamp(0.0, 1.0);
        let b = basis(tau);
        let (a, c) = (&self.nodes[i], &self.nodes[i + 1]);
        let coord = |x0: f64, d0: f64, e0: f64, x1: f64, d1: f64, e1: f64, k: usize| {
            let w = &b[k];
            w[0] * x0
                + h * w[1] * d0
                + h * h * w[2] * e0
                + w[3] * x1
                + h * w[4] * d1
                + h * h * w[5] * e1
        };
        let inv_h = 1.0 / h;
        let inv_h2 = inv_h * inv_h;
        Ok(CurveJet {
            u: coord(a.u, a.du, a.ddu, c.u, c.du, c.ddu, 0),
            v: coord(a.v, a.dv, a.ddv, c.v, c.dv, c.ddv, 0),
            du: coord(a.u, a.du, a.ddu, c.u, c.du, c.ddu, 1) * inv_h,
            dv: coord(a.v, a.dv, a.ddv, c.v, c.dv, c.ddv, 1) * inv_h,
            ddu: coord(a.u, a.du, a.ddu, c.u, c.du, c.ddu, 2) * inv_h2,
            ddv: coord(a.v, a.dv, a.ddv, c.v, c.dv, c.ddv, 2) * inv_h2,
        })
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    fn node(t: f64) -> CurveJet {
        // A quintic in each coordinate: reproduced exactly by the interpolant.
        let f = |t: f64| {
            [
                1.0 + t - 2.0 * t.powi(3) + 0.5 * t.powi(5),
                3.0 * t * t - t.powi(4),
            ]
        };
        let d = |t: f64| {
            [
                1.0 - 6.0 * t * t + 2.5 * t.powi(4),
                6.0 * t - 4.0 * t.powi(3),
            ]
        };
        let dd = |t: f64| [-12.0 * t + 10.0 * t.powi(3), 6.0 - 12.0 * t * t];
        let (a, b, c) = (f(t), d(t), dd(t));
        CurveJet {
            u: a[0],
            v: a[1],
            du: b[0],
            dv: b[1],
            ddu: c[0],
            ddv: c[1],
        }
    }

    /// The interpolant reproduces quintic polynomials (its defining property), with their
    /// first and second derivatives, at and between knots.
    #[test]
    fn reproduces_quintics() {
        let knots = vec![0.0, 0.3, 0.35, 1.0, 1.7];
        let nodes = knots.iter().map(|&t| node(t)).collect();
        let c = HermiteUvCurve::new(knots, nodes).unwrap();
        let mut hint = SpanHint::default();
        for k in 0..=68 {
            let t = 1.7 * k as f64 / 68.0;
            let got = c.checked_jet(t, &mut hint).unwrap();
            let want = node(t);
            for (g, w) in [
                (got.u, want.u),
                (got.v, want.v),
                (got.du, want.du),
                (got.dv, want.dv),
                (got.ddu, want.ddu),
                (got.ddv, want.ddv),
            ] {
                assert!((g - w).abs() < 1e-11 * (1.0 + w.abs()), "t {t}: {g} vs {w}");
            }
        }
    }

    /// A repeated knot joins two pieces with different second derivatives.
    #[test]
    fn a_repeated_knot_lets_the_second_derivative_jump() {
        let a = CurveJet {
            u: 0.0,
            v: 0.0,
            du: 1.0,
            dv: 0.0,
            ddu: 0.0,
            ddv: 1.0,
        };
        let b = CurveJet {
            u: 1.0,
            v: 0.5,
            du: 1.0,
            dv: 1.0,
            ddu: 0.0,
            ddv: 1.0,
        };
        let b2 = CurveJet { ddv: -1.0, ..b };
        let c = CurveJet {
            u: 2.0,
            v: 1.0,
            du: 1.0,
            dv: 0.0,
            ddu: 0.0,
            ddv: -1.0,
        };
        let k = vec![0.0, 1.0, 1.0, 2.0];
        let h = HermiteUvCurve::new(k, vec![a, b, b2, c]).unwrap();
        assert_eq!(h.breakpoints(), &[1.0]);
        let mut hint = SpanHint::default();
        let at = h.checked_jet(1.0, &mut hint).unwrap();
        assert_eq!((at.u, at.ddv), (1.0, -1.0)); // the right piece's start
        let before = h.checked_jet(1.0 - 1e-9, &mut hint).unwrap();
        assert!((before.ddv - 1.0).abs() < 1e-6);
        assert!(HermiteUvCurve::new(vec![0.0, 0.0, 1.0], vec![a, a, c]).is_err());
    }

    #[test]
    fn refuses_bad_knots() {
        let n = node(0.0);
        assert!(HermiteUvCurve::new(vec![0.0], vec![n]).is_err());
        assert!(HermiteUvCurve::new(vec![0.0, 0.0], vec![n, n]).is_err());
        assert!(HermiteUvCurve::new(vec![0.0, f64::NAN], vec![n, n]).is_err());
    }
}
