//! Derivatives of NURBS curves to fourth order: A2.3 basis rows and the general quotient rule
//! (A4.2 RatCurveDerivs): C^(k) = (A^(k) − Σ_{i=1..k} C(k,i) w^(i) C^(k−i)) / w. A path of its
//! own beside the second-order one, which keeps its bits and speed.

// The formulas index their rows and coefficients as the sources write them.
#![allow(clippy::needless_range_loop)]

use super::NurbsCurve;
use crate::geometry::jet::MAX_PARTIAL_ORDER;
use crate::nurbs::SpanHint;
use crate::nurbs::basis::{Lanes, MAX_ORDER, basis_rows_lanes};
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

    /// The third derivatives at `ts[i]` into `out[i]`, for i below the shorter length; the
    /// hint carried as by a loop of one-point evaluations. t is not checked against the
    /// domain; never allocates. Degrees 2 and 3: four points at a time (spans in order, the
    /// basis rows of the four lane-wide with the third derivative, `basis_rows_lanes`), then
    /// per point the sums over the span's control points and the quotient rule
    /// C^(k) = (A^(k) − Σ_{i=1..k} C(k,i) w^(i) C^(k−i)) / w (A4.2) to k = 3, the same
    /// operations in every lane, so a block of one point gives the bits it gives that point
    /// in any block. Other degrees: [`Self::high_derivs_unchecked`] point by point.
    pub(crate) fn third_block(&self, ts: &[f64], hint: &mut SpanHint, out: &mut [[f64; D]]) {
        let n = ts.len().min(out.len());
        match self.degree() {
            3 => self.third_groups::<4, 3>(&ts[..n], hint, &mut out[..n]),
            2 => self.third_groups::<3, 2>(&ts[..n], hint, &mut out[..n]),
            _ => {
                for (&t, o) in ts.iter().zip(out.iter_mut()) {
                    *o = self.high_derivs_unchecked(t, 3, hint)[3];
                }
            }
        }
    }

    #[inline(always)]
    fn third_groups<const N: usize, const P: usize>(
        &self,
        ts: &[f64],
        hint: &mut SpanHint,
        out: &mut [[f64; D]],
    ) {
        const G: usize = 4;
        let knots = self.knots.knots();
        let rational = !self.weights.is_empty();
        for start in (0..ts.len()).step_by(G) {
            let len = G.min(ts.len() - start);
            let mut x = [0.0; G];
            for (l, x) in x.iter_mut().enumerate() {
                *x = ts[start + l.min(len - 1)];
            }
            let (spans, same) = self.knots.group_spans(&x, len, hint);
            let rows: [[Lanes<G>; N]; 4] = if same {
                basis_rows_lanes::<N, P, G, true, 4>(knots, &self.recip, &spans, Lanes(x), 3)
            } else {
                basis_rows_lanes::<N, P, G, false, 4>(knots, &self.recip, &spans, Lanes(x), 3)
            };
            for (l, o) in out[start..start + len].iter_mut().enumerate() {
                let first = spans[l] - P;
                let mut a = [[0.0; D]; 4];
                let mut w = [0.0; 4];
                for r in 0..P + 1 {
                    let cp = &self.weighted[first + r];
                    for k in 0..4 {
                        let nk = rows[k][r].0[l];
                        for (c, &x) in a[k].iter_mut().zip(cp) {
                            *c += nk * x;
                        }
                        if rational {
                            w[k] += nk * self.weights[first + r];
                        }
                    }
                }
                if !rational {
                    *o = a[3];
                    continue;
                }
                let inv_w = 1.0 / w[0];
                let mut c = [[0.0; D]; 4];
                for k in 0..4 {
                    for d in 0..D {
                        let mut x = a[k][d];
                        for i in 1..=k {
                            x -= BINOMIAL[k][i] * w[i] * c[k - i][d];
                        }
                        c[k][d] = x * inv_w;
                    }
                }
                *o = c[3];
            }
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

    /// The block of third derivatives: every point's against `high_derivs_unchecked` to
    /// round-off, and a block of one point the same bits as the point within a longer block.
    #[test]
    fn third_block_agrees_with_the_general_path() {
        let knots = [0.0, 0.0, 0.0, 0.0, 0.25, 0.4, 0.7, 1.0, 1.0, 1.0, 1.0];
        let pts = [
            [0.0, 0.1],
            [0.3, 0.6],
            [0.5, 0.2],
            [0.8, 0.9],
            [1.0, 0.4],
            [0.7, 0.1],
            [0.2, 0.5],
        ];
        let ws = [1.0, 0.7, 1.6, 0.9, 1.2, 0.8, 1.1];
        let qk = [0.0, 0.0, 0.0, 0.3, 0.5, 0.8, 1.0, 1.0, 1.0];
        for (p, k) in [(3, &knots[..]), (2, &qk[..])] {
            let n = k.len() - p - 1;
            for weights in [None, Some(&ws[..n])] {
                let c = NurbsCurve::<2>::new(p, k, &pts[..n], weights).unwrap();
                let ts: Vec<f64> = (0..41).map(|i| i as f64 / 40.0).collect();
                let mut out = vec![[0.0; 2]; ts.len()];
                c.third_block(&ts, &mut SpanHint::default(), &mut out);
                for (i, &t) in ts.iter().enumerate() {
                    let want = c.high_derivs_unchecked(t, 3, &mut SpanHint::default())[3];
                    for d in 0..2 {
                        assert!(
                            (out[i][d] - want[d]).abs() <= 1e-11 * (1.0 + want[d].abs()),
                            "degree {p} t {t}: {:?} vs {want:?}",
                            out[i]
                        );
                    }
                    let mut one = [[0.0; 2]];
                    c.third_block(&[t], &mut SpanHint::default(), &mut one);
                    assert_eq!(one[0], out[i]);
                }
            }
        }
    }
}
