//! Rational and non-rational B-spline (NURBS) curves of any degree in D dimensions, with
//! derivatives to second order.
//!
//! C(t) = Σ N_{i,p}(t) w_i P_i / Σ N_{i,p}(t) w_i. With A(t) = Σ N_i w_i P_i and
//! W(t) = Σ N_i w_i (The NURBS Book, 2nd ed., A4.2 RatCurveDerivs, p. 127, eq. 4.8):
//! C = A/W, C' = (A' − W'C)/W, C'' = (A'' − 2W'C' − W''C)/W.
//! A [`NurbsCurve<2>`] is a curve in a surface's parameter plane; a [`NurbsCurve<3>`] a curve in
//! space.

use super::basis::basis_rows;
use super::knots::{KnotVector, SpanHint};
use crate::error::{Result, StrakeError};
use crate::jet::{DerivOrder, Interval};

/// A NURBS curve in D dimensions. Immutable after creation, so it can be evaluated from many
/// threads at once.
#[derive(Debug, Clone, PartialEq)]
pub struct NurbsCurve<const D: usize> {
    knots: KnotVector,
    /// Control points multiplied by their weights (w_i P_i); plain P_i when non-rational.
    weighted: Vec<[f64; D]>,
    /// Weights; empty when the curve is non-rational (all weights 1).
    weights: Vec<f64>,
}

/// A point of a curve with its first two derivatives with respect to the curve parameter.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CurvePointDerivs<const D: usize> {
    /// C(t).
    pub p: [f64; D],
    /// C'(t).
    pub d1: [f64; D],
    /// C''(t).
    pub d2: [f64; D],
}

impl<const D: usize> NurbsCurve<D> {
    /// Builds a curve of degree `degree` from its knots, control points and optional weights
    /// (`None` = non-rational).
    ///
    /// Errors name the offending index and value: see [`KnotVector::new`] for degree and knot
    /// checks; `InvalidControlPoint` for a non-finite coordinate; `InvalidWeight` for a weight
    /// that is not positive and finite; `InvalidArgument` when the weight count differs from the
    /// control-point count.
    pub fn new(
        degree: usize,
        knots: &[f64],
        points: &[[f64; D]],
        weights: Option<&[f64]>,
    ) -> Result<Self> {
        let kv = KnotVector::new("curve knots", knots, degree, points.len())?;
        for (i, p) in points.iter().enumerate() {
            if let Some(&bad) = p.iter().find(|c| !c.is_finite()) {
                return Err(StrakeError::InvalidControlPoint {
                    index: i,
                    value: bad,
                });
            }
        }
        let (weighted, weights) = match weights {
            None => (points.to_vec(), Vec::new()),
            Some(w) => {
                if w.len() != points.len() {
                    return Err(StrakeError::InvalidArgument(format!(
                        "{} weights given for {} control points",
                        w.len(),
                        points.len()
                    )));
                }
                for (i, &wi) in w.iter().enumerate() {
                    if !(wi.is_finite() && wi > 0.0) {
                        return Err(StrakeError::InvalidWeight {
                            index: i,
                            value: wi,
                        });
                    }
                }
                let weighted = points
                    .iter()
                    .zip(w)
                    .map(|(p, &wi)| p.map(|c| c * wi))
                    .collect();
                (weighted, w.to_vec())
            }
        };
        Ok(NurbsCurve {
            knots: kv,
            weighted,
            weights,
        })
    }

    /// The parameter domain [t_p, t_{n+1}].
    #[inline]
    pub fn domain(&self) -> Interval {
        self.knots.domain()
    }

    /// The degree.
    #[inline]
    pub fn degree(&self) -> usize {
        self.knots.degree()
    }

    /// The knot vector.
    #[inline]
    pub fn knot_vector(&self) -> &KnotVector {
        &self.knots
    }

    /// True when weights were given.
    #[inline]
    pub fn is_rational(&self) -> bool {
        !self.weights.is_empty()
    }

    /// The control points P_i (unweighted).
    pub fn control_points(&self) -> Vec<[f64; D]> {
        if self.weights.is_empty() {
            return self.weighted.clone();
        }
        self.weighted
            .iter()
            .zip(&self.weights)
            .map(|(p, &w)| p.map(|c| c / w))
            .collect()
    }

    /// The point and derivatives at `t` up to `order` (higher entries are zero).
    ///
    /// Errors: `NonFinite` for a non-finite t, `OutOfDomain` outside [`Self::domain`].
    /// `hint` remembers the knot span for the next call.
    #[inline]
    pub fn derivs(
        &self,
        t: f64,
        order: DerivOrder,
        hint: &mut SpanHint,
    ) -> Result<CurvePointDerivs<D>> {
        self.domain().check("t", t)?;
        Ok(self.derivs_unchecked(t, order, hint))
    }

    /// As [`Self::derivs`] for a `t` already known to lie in the domain.
    #[inline]
    pub fn derivs_unchecked(
        &self,
        t: f64,
        order: DerivOrder,
        hint: &mut SpanHint,
    ) -> CurvePointDerivs<D> {
        let p = self.degree();
        let span = self.knots.find_span(t, hint);
        let k = order as usize;
        let rows = basis_rows(self.knots.knots(), p, span, t, k);
        let first = span - p;
        let mut a = [[0.0; D]; 3];
        let mut w = [0.0; 3];
        for r in 0..=p {
            let cp = &self.weighted[first + r];
            let wi = if self.weights.is_empty() {
                1.0
            } else {
                self.weights[first + r]
            };
            for (kk, ak) in a.iter_mut().enumerate().take(k + 1) {
                let n = rows.d[kk][r];
                for (c, &x) in ak.iter_mut().zip(cp) {
                    *c += n * x;
                }
                w[kk] += n * wi;
            }
        }
        if self.weights.is_empty() {
            return CurvePointDerivs {
                p: a[0],
                d1: a[1],
                d2: a[2],
            };
        }
        let inv_w = 1.0 / w[0];
        let mut out = CurvePointDerivs {
            p: [0.0; D],
            d1: [0.0; D],
            d2: [0.0; D],
        };
        // One index runs over a, out.p, out.d1 and out.d2 together.
        #[allow(clippy::needless_range_loop)]
        for c in 0..D {
            let c0 = a[0][c] * inv_w;
            let c1 = (a[1][c] - w[1] * c0) * inv_w;
            let c2 = (a[2][c] - 2.0 * w[1] * c1 - w[2] * c0) * inv_w;
            out.p[c] = c0;
            if k >= 1 {
                out.d1[c] = c1;
            }
            if k >= 2 {
                out.d2[c] = c2;
            }
        }
        out
    }
}
