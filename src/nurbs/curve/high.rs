//! Derivatives of NURBS curves to fourth order: A2.3 basis rows and the general quotient rule
//! (A4.2 RatCurveDerivs): C^(k) = (A^(k) − Σ_{i=1..k} C(k,i) w^(i) C^(k−i)) / w. A path of its
//! own beside the second-order one, which keeps its bits and speed.

// The formulas index their rows and coefficients as the sources write them.
#![allow(clippy::needless_range_loop)]

use super::NurbsCurve;
use crate::geometry::jet::MAX_PARTIAL_ORDER;
use crate::nurbs::SpanHint;
use crate::nurbs::basis::MAX_ORDER;
use crate::nurbs::high_order::{BINOMIAL, ders_basis};

impl<const D: usize> NurbsCurve<D> {
    /// C and its derivatives to `order` (at most 4; larger is taken as 4): `out[k]` = C^(k)(t),
    /// rows above `order` zero. t is not checked against the domain (as
    /// [`Self::derivs_unchecked`]); the hint is used and updated as there.
    pub fn high_derivs_unchecked(
        &self,
        t: f64,
        order: usize,
        hint: &mut SpanHint,
    ) -> [[f64; D]; MAX_PARTIAL_ORDER + 1] {
        if self.degree() < 4 {
            self.high_with::<4>(t, order, hint)
        } else if self.degree() < 8 {
            self.high_with::<8>(t, order, hint)
        } else {
            self.high_with::<MAX_ORDER>(t, order, hint)
        }
    }

    fn high_with<const N: usize>(
        &self,
        t: f64,
        order: usize,
        hint: &mut SpanHint,
    ) -> [[f64; D]; MAX_PARTIAL_ORDER + 1] {
        let d = order.min(MAX_PARTIAL_ORDER);
        let p = self.degree();
        let span = self.knots.find_span(t, hint);
        let rows = ders_basis::<N>(self.knots.knots(), p, span, t, d);
        let first = span - p;
        let mut a = [[0.0; D]; MAX_PARTIAL_ORDER + 1];
        let mut w = [0.0; MAX_PARTIAL_ORDER + 1];
        let rational = !self.weights.is_empty();
        for r in 0..=p {
            let cp = &self.weighted[first + r];
            for k in 0..=d {
                let n = rows[k][r];
                for (c, &x) in a[k].iter_mut().zip(cp) {
                    *c += n * x;
                }
                if rational {
                    w[k] += n * self.weights[first + r];
                }
            }
        }
        if !rational {
            return a;
        }
        let inv_w = 1.0 / w[0];
        let mut out = [[0.0; D]; MAX_PARTIAL_ORDER + 1];
        for k in 0..=d {
            for c in 0..D {
                let mut x = a[k][c];
                for i in 1..=k {
                    x -= BINOMIAL[k][i] * w[i] * out[k - i][c];
                }
                out[k][c] = x * inv_w;
            }
        }
        out
    }
}

#[cfg(test)]
mod tests {
    use crate::geometry::jet::DerivOrder;
    use crate::nurbs::{NurbsCurve, SpanHint};

    /// Orders 0–2 agree with the production path; order 3 with a central difference of its
    /// second derivative; order 4 with a central difference of order 3.
    #[test]
    fn agrees_with_the_second_order_path_and_differences() {
        let knots = [0.0, 0.0, 0.0, 0.0, 0.4, 1.0, 1.0, 1.0, 1.0];
        let pts = [[0.0, 0.1], [0.3, 0.6], [0.5, 0.2], [0.8, 0.9], [1.0, 0.4]];
        let ws = [1.0, 0.7, 1.6, 0.9, 1.2];
        for weights in [None, Some(&ws[..])] {
            let c = NurbsCurve::<2>::new(3, &knots, &pts, weights).unwrap();
            for &t in &[0.15, 0.3, 0.6, 0.85] {
                let mut h = SpanHint::default();
                let hi = c.high_derivs_unchecked(t, 4, &mut h);
                let lo = c.derivs_unchecked(t, DerivOrder::Second, &mut h);
                for k in 0..2 {
                    assert!((hi[0][k] - lo.p[k]).abs() < 1e-13);
                    assert!((hi[1][k] - lo.d1[k]).abs() < 1e-12);
                    assert!((hi[2][k] - lo.d2[k]).abs() < 1e-11);
                }
                let e = 1e-5;
                let p = c.high_derivs_unchecked(t + e, 4, &mut h);
                let m = c.high_derivs_unchecked(t - e, 4, &mut h);
                for k in 0..2 {
                    let fd3 = (p[2][k] - m[2][k]) / (2.0 * e);
                    assert!(
                        (hi[3][k] - fd3).abs() < 1e-5 * (1.0 + fd3.abs()),
                        "{} {fd3}",
                        hi[3][k]
                    );
                    let fd4 = (p[3][k] - m[3][k]) / (2.0 * e);
                    assert!(
                        (hi[4][k] - fd4).abs() < 1e-4 * (1.0 + fd4.abs()),
                        "{} {fd4}",
                        hi[4][k]
                    );
                }
                if weights.is_none() {
                    assert_eq!(hi[4], [0.0, 0.0]);
                }
            }
        }
    }
}
