//! Rational and non-rational B-spline (NURBS) curves of any degree in D dimensions, with
//! derivatives to second order.
//!
//! C(t) = Σ N_{i,p}(t) w_i P_i / Σ N_{i,p}(t) w_i. With A(t) = Σ N_i w_i P_i and
//! W(t) = Σ N_i w_i (The NURBS Book, 2nd ed., A4.2 RatCurveDerivs, p. 127, eq. 4.8):
//! C = A/W, C' = (A' − W'C)/W, C'' = (A'' − 2W'C' − W''C)/W.
//! A [`NurbsCurve<2>`] is a curve in a surface's parameter plane; a [`NurbsCurve<3>`] a curve in
//! space.
//!
//! As for surfaces, the basis functions live in stack arrays sized for the degree (4 entries up
//! to cubics), and the reciprocals of the knot differences they divide by are computed once
//! per span at creation, so an evaluation multiplies instead of dividing; this agrees with plain
//! division (The NURBS Book's arithmetic, [`super::basis_rows`]) to a few units in the last
//! place (tested).

mod high;

use super::basis::{
    Direct, MAX_ORDER, Reciprocals, basis_rows_in, reciprocal_table, reciprocals_per_span,
};
use super::curve_lanes::{CurveParts, jets_block};
use super::knots::{KnotVector, SpanHint};
use crate::error::{Result, StrakeError};
use crate::geometry::jet::{CurveJet, DerivOrder, Interval};

/// A NURBS curve in D dimensions. Immutable after creation, so it can be evaluated from many
/// threads at once.
#[derive(Debug, Clone, PartialEq)]
pub struct NurbsCurve<const D: usize> {
    knots: KnotVector,
    /// Control points multiplied by their weights (w_i P_i); plain P_i when non-rational.
    weighted: Vec<[f64; D]>,
    /// Weights; empty when the curve is non-rational (all weights 1).
    weights: Vec<f64>,
    /// Per-span reciprocals of the knot differences (spans p ..= n,
    /// `reciprocals_per_span(p)` each; see `basis::span_reciprocals`).
    recip: Vec<f64>,
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
            recip: reciprocal_table(&kv),
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

    /// The weights w_i, or `None` for a non-rational curve (all weights 1).
    #[inline]
    pub fn weights(&self) -> Option<&[f64]> {
        if self.weights.is_empty() {
            None
        } else {
            Some(&self.weights)
        }
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
    /// Errors: `NonFinite` for a non-finite t, `OutOfDomain` outside [`Self::domain`] (a t within
    /// [`Interval::snap_tolerance`] of an end is evaluated exactly at the end).
    /// `hint` remembers the knot span for the next call.
    #[inline]
    pub fn derivs(
        &self,
        t: f64,
        order: DerivOrder,
        hint: &mut SpanHint,
    ) -> Result<CurvePointDerivs<D>> {
        let t = self.domain().snap("t", t)?;
        Ok(self.derivs_unchecked(t, order, hint))
    }

    /// As [`Self::derivs`] for a `t` already known to lie in the domain (not checked again: a
    /// `t` outside it gives the polynomial of the nearest span extrapolated, a NaN a NaN
    /// result; never a panic).
    #[inline]
    pub fn derivs_unchecked(
        &self,
        t: f64,
        order: DerivOrder,
        hint: &mut SpanHint,
    ) -> CurvePointDerivs<D> {
        // Stack rows sized for the degree; degrees 1 to 3 known at compile time (unrolled).
        match (order, self.degree()) {
            (DerivOrder::Position, 1) => self.eval::<0, 2, 1, true>(t, hint),
            (DerivOrder::First, 1) => self.eval::<1, 2, 1, true>(t, hint),
            (DerivOrder::Second, 1) => self.eval::<2, 2, 1, true>(t, hint),
            (DerivOrder::Position, 2) => self.eval::<0, 3, 2, true>(t, hint),
            (DerivOrder::First, 2) => self.eval::<1, 3, 2, true>(t, hint),
            (DerivOrder::Second, 2) => self.eval::<2, 3, 2, true>(t, hint),
            (DerivOrder::Position, 3) => self.eval::<0, 4, 3, true>(t, hint),
            (DerivOrder::First, 3) => self.eval::<1, 4, 3, true>(t, hint),
            (DerivOrder::Second, 3) => self.eval::<2, 4, 3, true>(t, hint),
            (DerivOrder::Position, ..=7) => self.eval::<0, 8, 0, true>(t, hint),
            (DerivOrder::First, ..=7) => self.eval::<1, 8, 0, true>(t, hint),
            (DerivOrder::Second, ..=7) => self.eval::<2, 8, 0, true>(t, hint),
            (DerivOrder::Position, _) => self.eval::<0, MAX_ORDER, 0, true>(t, hint),
            (DerivOrder::First, _) => self.eval::<1, MAX_ORDER, 0, true>(t, hint),
            (DerivOrder::Second, _) => self.eval::<2, MAX_ORDER, 0, true>(t, hint),
        }
    }

    /// Sums over the p + 1 control points of the span (A4.2 on the weighted points), then the
    /// quotient rule, for derivatives up to order K with basis rows of N entries (degree below
    /// N; `P` > 0 is the degree known at compile time, see `basis_rows_in`). With `TABLE` the
    /// basis functions multiply by the per-span reciprocals instead of dividing (the tests
    /// compare both; without it the arithmetic is that of [`super::basis_rows`]).
    #[inline(always)]
    fn eval<const K: usize, const N: usize, const P: usize, const TABLE: bool>(
        &self,
        t: f64,
        hint: &mut SpanHint,
    ) -> CurvePointDerivs<D> {
        let p = if P > 0 { P } else { self.degree() };
        let span = self.knots.find_span(t, hint);
        let rows = if TABLE {
            let per = reciprocals_per_span(p);
            let rec = Reciprocals(&self.recip[(span - p) * per..][..per]);
            basis_rows_in::<N, P, _>(self.knots.knots(), p, span, t, K, &rec)
        } else {
            basis_rows_in::<N, P, _>(self.knots.knots(), p, span, t, K, &Direct)
        };
        let first = span - p;
        let mut a = [[0.0; D]; 3];
        let mut w = [0.0; 3];
        let points = &self.weighted[first..=first + p];
        if self.weights.is_empty() {
            for (r, cp) in points.iter().enumerate() {
                for kk in 0..=K {
                    let n = rows[kk][r];
                    for (c, &x) in a[kk].iter_mut().zip(cp) {
                        *c += n * x;
                    }
                }
            }
            return CurvePointDerivs {
                p: a[0],
                d1: a[1],
                d2: a[2],
            };
        }
        let weights = &self.weights[first..=first + p];
        for (r, (cp, &wi)) in points.iter().zip(weights).enumerate() {
            for kk in 0..=K {
                let n = rows[kk][r];
                for (c, &x) in a[kk].iter_mut().zip(cp) {
                    *c += n * x;
                }
                w[kk] += n * wi;
            }
        }
        let inv_w = 1.0 / w[0];
        let mut out = CurvePointDerivs {
            p: [0.0; D],
            d1: [0.0; D],
            d2: [0.0; D],
        };
        let [a0, a1, a2] = a;
        for c in 0..D {
            let c0 = a0[c] * inv_w;
            let c1 = (a1[c] - w[1] * c0) * inv_w;
            let c2 = (a2[c] - 2.0 * w[1] * c1 - w[2] * c0) * inv_w;
            out.p[c] = c0;
            if K >= 1 {
                out.d1[c] = c1;
            }
            if K >= 2 {
                out.d2[c] = c2;
            }
        }
        out
    }
}

impl NurbsCurve<2> {
    /// The jets (point, first and second derivatives) at `ts[i]` into `out[i]` for
    /// i < min(`ts.len()`, `out.len()`), the hint carried through the points in order: the
    /// bits of [`Self::derivs_unchecked`] at each point, as for a `t` known to lie in the
    /// domain (not checked, nor is the result's finiteness). Degrees 1 to 3 evaluate four
    /// points at once (`curve_lanes`); other degrees one after the other.
    pub(crate) fn jets_block(&self, ts: &[f64], hint: &mut SpanHint, out: &mut [CurveJet]) {
        if jets_block(&self.parts(), ts, hint, out).is_some() {
            return;
        }
        for (&t, o) in ts.iter().zip(out.iter_mut()) {
            let d = self.derivs_unchecked(t, DerivOrder::Second, hint);
            *o = CurveJet {
                u: d.p[0],
                v: d.p[1],
                du: d.d1[0],
                dv: d.d1[1],
                ddu: d.d2[0],
                ddv: d.d2[1],
            };
        }
    }

    /// What a lane-wide evaluation reads (`curve_lanes`).
    pub(crate) fn parts(&self) -> CurveParts<'_> {
        CurveParts {
            knots: &self.knots,
            recip: &self.recip,
            weighted: &self.weighted,
            weights: &self.weights,
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    use crate::geometry::math::lcg;

    // Common practice: multiplying by per-span reciprocals of the knot differences gives the
    // same point and derivatives as dividing (the arithmetic of `basis_rows`, The NURBS Book
    // A2.2/A2.3) to 1e-13 relative, for degrees 1..=9 and 24, rational and not, clamped and
    // unclamped, with a double interior knot; and the degree-sized rows (N = 4, 8) give the
    // same bits as rows of MAX_ORDER entries.
    #[test]
    fn reciprocals_and_sized_rows_agree_with_division() {
        let mut st = 5u64;
        let mut worst = 0.0f64;
        for p in (1..=9).chain([24]) {
            for rational in [false, true] {
                let n = p + 6;
                let mut knots = Vec::new();
                let mut x = 0.0;
                for i in 0..n + p + 1 {
                    let clamped = p % 2 == 1 && (i <= p || i > n);
                    if !(clamped || i == p + 2) {
                        x += 0.05 + lcg(&mut st);
                    }
                    knots.push(x);
                }
                let pts: Vec<[f64; 3]> = (0..n)
                    .map(|_| [lcg(&mut st), lcg(&mut st) - 0.5, 3.0 * lcg(&mut st)])
                    .collect();
                let ws: Vec<f64> = (0..n).map(|_| 0.3 + 2.0 * lcg(&mut st)).collect();
                let c = NurbsCurve::new(p, &knots, &pts, rational.then_some(&ws[..])).unwrap();
                let dom = c.domain();
                let mut h = SpanHint::default();
                for i in 0..300 {
                    let t = match i % 50 {
                        0 => dom.lo,
                        1 => dom.hi,
                        _ => dom.lo + dom.width() * lcg(&mut st),
                    };
                    let a = c.derivs_unchecked(t, DerivOrder::Second, &mut h);
                    let b = c.eval::<2, MAX_ORDER, 0, false>(t, &mut h);
                    let full = c.eval::<2, MAX_ORDER, 0, true>(t, &mut h);
                    assert_eq!(
                        a, full,
                        "degree {p}: sized rows vs MAX_ORDER rows at t = {t}"
                    );
                    for (k, (x, y)) in [(a.p, b.p), (a.d1, b.d1), (a.d2, b.d2)]
                        .into_iter()
                        .enumerate()
                    {
                        let norm = |v: [f64; 3]| v.iter().map(|c| c * c).sum::<f64>().sqrt();
                        let d = norm([x[0] - y[0], x[1] - y[1], x[2] - y[2]]);
                        let e = d / norm(y).max(1.0);
                        worst = worst.max(e);
                        assert!(
                            e <= 1e-13,
                            "degree {p}, derivative {k}, t = {t}: {x:?} vs {y:?}"
                        );
                    }
                    for order in [DerivOrder::Position, DerivOrder::First] {
                        let lo = c.derivs_unchecked(t, order, &mut h);
                        assert_eq!(lo.p, a.p);
                        if order == DerivOrder::First {
                            assert_eq!(lo.d1, a.d1);
                            assert_eq!(lo.d2, [0.0; 3]);
                        } else {
                            assert_eq!(lo.d1, [0.0; 3]);
                        }
                    }
                }
            }
        }
        println!("worst relative difference, reciprocals vs division: {worst:e}");
    }
}
