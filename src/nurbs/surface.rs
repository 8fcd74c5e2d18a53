//! Rational and non-rational B-spline (NURBS) surfaces of any degrees, with the point and all
//! partial derivatives up to second order.
//!
//! S(u, v) = Σᵢ Σⱼ N_{i,p}(u) N_{j,q}(v) w_{ij} P_{ij} / Σᵢ Σⱼ N_{i,p}(u) N_{j,q}(v) w_{ij}.
//!
//! Evaluation works on homogeneous coordinates: with A(u, v) = Σ N_i N_j w_{ij} P_{ij} and
//! w(u, v) = Σ N_i N_j w_{ij}, the partials of A and w are tensor-product sums of basis-function
//! derivatives (The NURBS Book, 2nd ed., A3.6 SurfaceDerivsAlg1, p. 111, applied to the
//! weighted points), and the partials of S = A/w follow from the quotient rule (A4.4
//! RatSurfaceDerivs, p. 137):
//!
//! - S = A/w
//! - Su = (Au − wu S)/w, Sv = (Av − wv S)/w
//! - Suu = (Auu − 2 wu Su − wuu S)/w
//! - Suv = (Auv − wu Sv − wv Su − wuv S)/w
//! - Svv = (Avv − 2 wv Sv − wvv S)/w
//!
//! For a non-rational surface (no weights) S = A directly. Everything lives in fixed-size stack
//! arrays sized for the degree: an evaluation never allocates. The reciprocals of the knot
//! differences that the basis functions divide by are computed once per knot span at creation
//! (p(p + 1)/2 per span and direction), so an evaluation multiplies instead of dividing; this
//! agrees with plain division (The NURBS Book's arithmetic) to a few units in the last place.

use super::basis::{
    Direct, MAX_ORDER, Reciprocals, basis_rows_in, reciprocal_table, reciprocals_per_span,
};
use super::knots::KnotVector;
#[cfg(not(target_arch = "x86_64"))]
use super::quad::Scalar as Sse2;
#[cfg(target_arch = "x86_64")]
use super::quad::{Avx, Sse2};
use super::quad::{Quad, QuadOps};
use crate::error::{Result, StrakeError};
use crate::geometry::jet::{DerivOrder, Interval, SurfaceJet};
use crate::geometry::math::Vec3;
use crate::geometry::principal::Orientation;
use crate::surface::crease::KnotLine;
use crate::surface::{KnotSide, KnotSides, SurfaceHint, SurfaceSource};

mod block;
mod block3;
mod high;

/// The arrays that define a NURBS surface, borrowed from the caller, as handed to
/// [`NurbsSurface::new`].
///
/// Memory layout of the control net: control point P_{ij} (i the u index, 0 ≤ i < `count_u`;
/// j the v index, 0 ≤ j < `count_v`) is `points[i * count_v + j]`, i.e. **the v index runs
/// fastest** (row-major with one row per u index). `weights`, when given, uses the same layout.
#[derive(Debug, Clone, Copy)]
pub struct NurbsSurfaceData<'a> {
    /// Degree p in u (1 ..= [`super::MAX_DEGREE`]).
    pub degree_u: usize,
    /// Degree q in v (1 ..= [`super::MAX_DEGREE`]).
    pub degree_v: usize,
    /// Number of control points in u (at least p + 1).
    pub count_u: usize,
    /// Number of control points in v (at least q + 1).
    pub count_v: usize,
    /// Knot vector in u: `count_u + degree_u + 1` non-decreasing values.
    pub knots_u: &'a [f64],
    /// Knot vector in v: `count_v + degree_v + 1` non-decreasing values.
    pub knots_v: &'a [f64],
    /// Control points `[x, y, z]`, `count_u * count_v` of them, v index fastest.
    pub points: &'a [[f64; 3]],
    /// Weights, one per control point in the same layout; `None` for a non-rational surface
    /// (all weights 1).
    pub weights: Option<&'a [f64]>,
}

/// A NURBS surface of degrees (p, q) with its knot vectors, control net and optional weights.
///
/// Immutable after creation, so one surface can be evaluated from many threads at once; each
/// caller keeps its own [`SurfaceHint`]. The parameter domain is [u_p, u_{n+1}] × [v_q, v_{m+1}]
/// (clamped or unclamped knot vectors alike). Closed and periodic surfaces are given as ordinary
/// NURBS with wrapped control points.
#[derive(Debug, Clone, PartialEq)]
pub struct NurbsSurface {
    u_knots: KnotVector,
    v_knots: KnotVector,
    /// Homogeneous control net [w x, w y, w z, w], index i * count_v + j (w = 1 when
    /// non-rational).
    net: Vec<Quad>,
    /// Per-span reciprocals of the knot differences in u (see [`span_reciprocals`]), spans
    /// p ..= n, `reciprocals_per_span(p)` each; likewise in v.
    u_recip: Vec<f64>,
    v_recip: Vec<f64>,
    rational: bool,
    orientation: Orientation,
}

impl NurbsSurface {
    /// Validates the arrays and builds the surface, with [`Orientation::Forward`] (change it
    /// with [`Self::with_orientation`]).
    ///
    /// Errors, each naming the offending index and value:
    /// - `InvalidDegree`: a degree of 0 or above [`super::MAX_DEGREE`], fewer than degree + 1
    ///   control points in a direction, or a knot count other than count + degree + 1 (messages
    ///   prefixed "u knots" / "v knots"; see [`KnotVector::new`]);
    /// - `InvalidKnots`: a non-finite or decreasing knot, a knot of multiplicity above
    ///   degree + 1, or a zero-length domain;
    /// - `InvalidArgument`: `points.len() != count_u * count_v`, or a weight count different from
    ///   the control-point count;
    /// - `InvalidControlPoint`: a non-finite coordinate (index = i * count_v + j);
    /// - `InvalidWeight`: a weight that is not positive and finite (same index).
    pub fn new(data: &NurbsSurfaceData<'_>) -> Result<Self> {
        let u_knots = KnotVector::new("u knots", data.knots_u, data.degree_u, data.count_u)?;
        let v_knots = KnotVector::new("v knots", data.knots_v, data.degree_v, data.count_v)?;
        let total = data.count_u.checked_mul(data.count_v).ok_or_else(|| {
            StrakeError::InvalidArgument(format!(
                "control net of {} x {} points is too large",
                data.count_u, data.count_v
            ))
        })?;
        if data.points.len() != total {
            return Err(StrakeError::InvalidArgument(format!(
                "control net has {} points, but count_u x count_v = {} x {} = {total}",
                data.points.len(),
                data.count_u,
                data.count_v
            )));
        }
        for (index, p) in data.points.iter().enumerate() {
            if let Some(&value) = p.iter().find(|c| !c.is_finite()) {
                return Err(StrakeError::InvalidControlPoint { index, value });
            }
        }
        let net = match data.weights {
            None => data
                .points
                .iter()
                .map(|p| Quad([p[0], p[1], p[2], 1.0]))
                .collect(),
            Some(w) => {
                if w.len() != total {
                    return Err(StrakeError::InvalidArgument(format!(
                        "{} weights given for {total} control points (count_u x count_v = {} x {})",
                        w.len(),
                        data.count_u,
                        data.count_v
                    )));
                }
                if let Some((index, &value)) = w
                    .iter()
                    .enumerate()
                    .find(|(_, wi)| !(wi.is_finite() && **wi > 0.0))
                {
                    return Err(StrakeError::InvalidWeight { index, value });
                }
                data.points
                    .iter()
                    .zip(w)
                    .map(|(p, &wi)| Quad([p[0] * wi, p[1] * wi, p[2] * wi, wi]))
                    .collect()
            }
        };
        Ok(NurbsSurface {
            u_recip: reciprocal_table(&u_knots),
            v_recip: reciprocal_table(&v_knots),
            u_knots,
            v_knots,
            net,
            rational: data.weights.is_some(),
            orientation: Orientation::Forward,
        })
    }

    /// The same surface with the given normal orientation (see [`Orientation`]).
    pub fn with_orientation(mut self, orientation: Orientation) -> Self {
        self.orientation = orientation;
        self
    }

    /// The knot vector in u.
    #[inline]
    pub fn u_knots(&self) -> &KnotVector {
        &self.u_knots
    }

    /// The knot vector in v.
    #[inline]
    pub fn v_knots(&self) -> &KnotVector {
        &self.v_knots
    }

    /// Degree p in u.
    #[inline]
    pub fn degree_u(&self) -> usize {
        self.u_knots.degree()
    }

    /// Degree q in v.
    #[inline]
    pub fn degree_v(&self) -> usize {
        self.v_knots.degree()
    }

    /// Number of control points in u.
    #[inline]
    pub fn count_u(&self) -> usize {
        self.u_knots.count()
    }

    /// Number of control points in v.
    #[inline]
    pub fn count_v(&self) -> usize {
        self.v_knots.count()
    }

    /// True when weights were given.
    #[inline]
    pub fn is_rational(&self) -> bool {
        self.rational
    }

    /// Control point P_{ij} (unweighted, as given), or `None` if `i ≥ count_u` or
    /// `j ≥ count_v`.
    pub fn control_point(&self, i: usize, j: usize) -> Option<[f64; 3]> {
        if i >= self.count_u() || j >= self.count_v() {
            return None;
        }
        let h = self.net[i * self.count_v() + j].0;
        Some(if self.rational {
            [h[0] / h[3], h[1] / h[3], h[2] / h[3]]
        } else {
            [h[0], h[1], h[2]]
        })
    }

    /// Weight w_{ij} (1 for a non-rational surface), or `None` if `i ≥ count_u` or
    /// `j ≥ count_v`.
    pub fn weight(&self, i: usize, j: usize) -> Option<f64> {
        if i >= self.count_u() || j >= self.count_v() {
            return None;
        }
        Some(self.net[i * self.count_v() + j].0[3])
    }

    /// The jet at (u, v) up to `order`: checks that u and v are finite and inside the domain
    /// (a parameter within [`Interval::snap_tolerance`] of an end is snapped onto it exactly;
    /// anything farther out is refused, no clamping), then evaluates. Entries above `order` are zero.
    ///
    /// Errors: `NonFinite` for a non-finite parameter, `OutOfDomain` outside the domain.
    /// `hint` remembers the knot spans for the next call; a wrong or stale hint costs a search,
    /// never a wrong answer.
    #[inline]
    pub fn jet(
        &self,
        u: f64,
        v: f64,
        order: DerivOrder,
        hint: &mut SurfaceHint,
    ) -> Result<SurfaceJet> {
        let u = self.u_knots.domain().snap("u", u)?;
        let v = self.v_knots.domain().snap("v", v)?;
        Ok(self.jet_unchecked(u, v, order, hint))
    }

    /// As [`Self::jet`] for (u, v) already known to lie inside the domain (not checked again:
    /// a parameter outside it gives the polynomial of the nearest span extrapolated, a NaN
    /// parameter a NaN jet; never a panic).
    #[inline]
    pub fn jet_unchecked(
        &self,
        u: f64,
        v: f64,
        order: DerivOrder,
        hint: &mut SurfaceHint,
    ) -> SurfaceJet {
        self.jet_sided_unchecked(u, v, KnotSides::default(), order, hint)
    }

    /// As [`Self::jet_unchecked`], on the given sides of the knot lines through (u, v): with
    /// [`KnotSide::Below`] in u and u equal to an interior knot, the basis of the span that
    /// ends at the knot (the limit from below; [`KnotVector::span_below`]); otherwise the span
    /// a search finds (the limit from above). Off the knots both sides are the same jet.
    #[inline]
    pub fn jet_sided_unchecked(
        &self,
        u: f64,
        v: f64,
        sides: KnotSides,
        order: DerivOrder,
        hint: &mut SurfaceHint,
    ) -> SurfaceJet {
        #[cfg(target_arch = "x86_64")]
        if std::arch::is_x86_feature_detected!("avx2") {
            // SAFETY: the processor supports AVX2 (checked just above).
            return unsafe { self.jet_avx2(u, v, sides, order, hint) };
        }
        self.jet_portable(u, v, sides, order, hint)
    }

    /// [`Self::jet_with`] compiled for AVX2, with the tensor sums on one 256-bit vector per
    /// homogeneous point. The same operations (no fused multiply-add), so the same bits.
    ///
    /// # Safety
    /// The processor must support AVX2.
    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx2")]
    unsafe fn jet_avx2(
        &self,
        u: f64,
        v: f64,
        sides: KnotSides,
        order: DerivOrder,
        hint: &mut SurfaceHint,
    ) -> SurfaceJet {
        self.jet_sided_with::<Avx>(u, v, sides, order, hint)
    }

    /// The evaluation in the baseline instruction set (SSE2 on x86-64).
    #[inline(always)]
    fn jet_portable(
        &self,
        u: f64,
        v: f64,
        sides: KnotSides,
        order: DerivOrder,
        hint: &mut SurfaceHint,
    ) -> SurfaceJet {
        self.jet_sided_with::<Sse2>(u, v, sides, order, hint)
    }

    /// The evaluation with the vector arithmetic `M` (see `quad`), dispatched on the order.
    /// `M` must be usable on this processor (`Avx` only with AVX2).
    #[inline(always)]
    fn jet_with<M: QuadOps>(
        &self,
        u: f64,
        v: f64,
        order: DerivOrder,
        hint: &mut SurfaceHint,
    ) -> SurfaceJet {
        self.jet_sided_with::<M>(u, v, KnotSides::default(), order, hint)
    }

    /// [`Self::jet_with`] on the given sides of the knot lines (see
    /// [`Self::jet_sided_unchecked`]).
    #[inline(always)]
    fn jet_sided_with<M: QuadOps>(
        &self,
        u: f64,
        v: f64,
        sides: KnotSides,
        order: DerivOrder,
        hint: &mut SurfaceHint,
    ) -> SurfaceJet {
        // Stack rows sized for the degree; the common degrees (bicubic, cubic by lower,
        // biquadratic, quadratic by linear, bilinear) known at compile time, so that the basis
        // recursion is unrolled and stays in registers.
        match order {
            DerivOrder::Position => self.eval_order::<0, M>(u, v, sides, hint),
            DerivOrder::First => self.eval_order::<1, M>(u, v, sides, hint),
            DerivOrder::Second => self.eval_order::<2, M>(u, v, sides, hint),
        }
    }

    /// [`Self::eval`] for derivative order K, dispatched on the degrees.
    #[inline(always)]
    fn eval_order<const K: usize, M: QuadOps>(
        &self,
        u: f64,
        v: f64,
        sides: KnotSides,
        hint: &mut SurfaceHint,
    ) -> SurfaceJet {
        match (self.u_knots.degree(), self.v_knots.degree()) {
            (3, 3) => self.eval::<K, 4, 3, 3, true, M>(u, v, sides, hint),
            (3, q) if q < 3 => self.eval::<K, 4, 3, 0, true, M>(u, v, sides, hint),
            (p, 3) if p < 3 => self.eval::<K, 4, 0, 3, true, M>(u, v, sides, hint),
            (2, 2) => self.eval::<K, 3, 2, 2, true, M>(u, v, sides, hint),
            (2, 1) => self.eval::<K, 3, 2, 1, true, M>(u, v, sides, hint),
            (1, 2) => self.eval::<K, 3, 1, 2, true, M>(u, v, sides, hint),
            (1, 1) => self.eval::<K, 2, 1, 1, true, M>(u, v, sides, hint),
            (p, q) if p.max(q) < 8 => self.eval::<K, 8, 0, 0, true, M>(u, v, sides, hint),
            _ => self.eval::<K, MAX_ORDER, 0, 0, true, M>(u, v, sides, hint),
        }
    }

    /// Tensor-product sums on the homogeneous net (A3.6), then the quotient rule (A4.4), for
    /// derivatives up to order K, with basis rows of N entries (both degrees below N; `P`,
    /// `Q` > 0 are the degrees known at compile time, 0 takes them at run time, see
    /// `basis_rows_in`). With `TABLE` the basis functions multiply by the per-span reciprocals
    /// of the knot differences instead of dividing (the same values to a few units in the last
    /// place; the tests compare both). `M` is the vector arithmetic of the tensor sums (see
    /// `quad`); it must be usable on this processor (`Avx` only with AVX2).
    #[inline(always)]
    fn eval<
        const K: usize,
        const N: usize,
        const P: usize,
        const Q: usize,
        const TABLE: bool,
        M: QuadOps,
    >(
        &self,
        u: f64,
        v: f64,
        sides: KnotSides,
        hint: &mut SurfaceHint,
    ) -> SurfaceJet {
        debug_assert!(P == 0 || P == self.u_knots.degree());
        debug_assert!(Q == 0 || Q == self.v_knots.degree());
        let p = if P > 0 { P } else { self.u_knots.degree() };
        let q = if Q > 0 { Q } else { self.v_knots.degree() };
        let mut span_u = self.u_knots.find_span(u, &mut hint.u);
        let mut span_v = self.v_knots.find_span(v, &mut hint.v);
        if sides.u == KnotSide::Below {
            span_u = self.u_knots.span_below(u, span_u);
        }
        if sides.v == KnotSide::Below {
            span_v = self.v_knots.span_below(v, span_v);
        }
        let (nu, nv) = if TABLE {
            let (tu, tv) = (reciprocals_per_span(p), reciprocals_per_span(q));
            let ru = Reciprocals(&self.u_recip[(span_u - p) * tu..][..tu]);
            let rv = Reciprocals(&self.v_recip[(span_v - q) * tv..][..tv]);
            (
                basis_rows_in::<N, P, _>(self.u_knots.knots(), p, span_u, u, K, &ru),
                basis_rows_in::<N, Q, _>(self.v_knots.knots(), q, span_v, v, K, &rv),
            )
        } else {
            (
                basis_rows_in::<N, P, _>(self.u_knots.knots(), p, span_u, u, K, &Direct),
                basis_rows_in::<N, Q, _>(self.v_knots.knots(), q, span_v, v, K, &Direct),
            )
        };
        let h = self.tensor_sums_v::<K, N, M>(p, q, span_u, span_v, &nu, &nv);
        let mut jet = SurfaceJet::default();
        self.quotient_into::<K, M>(&h, &mut jet);
        jet
    }

    /// The homogeneous partials h\[0\] = A, h\[1\] = Au, h\[2\] = Av, h\[3\] = Auu,
    /// h\[4\] = Auv, h\[5\] = Avv, each [x, y, z, w] in one vector value of `M`, up to order K
    /// (higher ones zero): the tensor-product sums (A3.6) of the basis rows `nu` (degree `p`,
    /// span `span_u`) and `nv` (degree `q`, span `span_v`) over the homogeneous net. `M` as in
    /// [`Self::eval`].
    #[inline(always)]
    fn tensor_sums_v<const K: usize, const N: usize, M: QuadOps>(
        &self,
        p: usize,
        q: usize,
        span_u: usize,
        span_v: usize,
        nu: &[[f64; N]; 3],
        nv: &[[f64; N]; 3],
    ) -> [M::V; 6] {
        let count_v = self.v_knots.count();
        let first = (span_u - p) * count_v + (span_v - q);
        // h[0] = A, h[1] = Au, h[2] = Av, h[3] = Auu, h[4] = Auv, h[5] = Avv, each [x, y, z, w]
        // in one vector value of `M` (see `quad`). Row r of the (p + 1) × (q + 1) block starts
        // at first + r * count_v; exclusive ranges, so that the loops unroll for known degrees.
        // SAFETY (every `M::` call): the caller chose `M` for this processor (the contract of
        // `eval` and of this function).
        let z = unsafe { M::zero() };
        let mut h = [z; 6];
        let block = &self.net[first..];
        for r in 0..p + 1 {
            let row = &block[r * count_v..][..q + 1];
            // t_l = Σ_s N⁽ˡ⁾_s(v) Pw_{r,s}: the v-derivatives of this row.
            let (mut t0, mut t1, mut t2) = (z, z, z);
            for (s, cp) in row.iter().enumerate() {
                let cp = unsafe { M::load(cp) };
                t0 = unsafe { M::madd(t0, nv[0][s], cp) };
                if K >= 1 {
                    t1 = unsafe { M::madd(t1, nv[1][s], cp) };
                }
                if K >= 2 {
                    t2 = unsafe { M::madd(t2, nv[2][s], cp) };
                }
            }
            h[0] = unsafe { M::madd(h[0], nu[0][r], t0) };
            if K >= 1 {
                h[1] = unsafe { M::madd(h[1], nu[1][r], t0) };
                h[2] = unsafe { M::madd(h[2], nu[0][r], t1) };
            }
            if K >= 2 {
                h[3] = unsafe { M::madd(h[3], nu[2][r], t0) };
                h[4] = unsafe { M::madd(h[4], nu[1][r], t1) };
                h[5] = unsafe { M::madd(h[5], nu[0][r], t2) };
            }
        }
        h
    }

    /// The jet from the homogeneous partials `h` of [`Self::tensor_sums_v`], written straight
    /// into `out`: S = A directly for a non-rational surface, the quotient rule (A4.4, the
    /// formulas at the top of this module) otherwise; entries above order K zero. Each formula
    /// is applied to the four components [x, y, z, w] at once (the w results are dropped); per
    /// x, y, z component the operations are those of the formulas as written, left to right
    /// (1/w is one division, broadcast; 2 wu and 2 wv are formed first), the arithmetic of the
    /// scalar reference `quotient` of the tests, bit for bit (tested). `M` as in
    /// [`Self::eval`].
    #[inline(always)]
    fn quotient_into<const K: usize, M: QuadOps>(&self, h: &[M::V; 6], out: &mut SurfaceJet) {
        // SAFETY (every `M::` call): the caller chose `M` for this processor.
        let put = |x: M::V, v: &mut Vec3| unsafe { M::store3(x, &mut v.data.0[0]) };
        if !self.rational {
            // Entries above order K are zero in `h` already.
            put(h[0], &mut out.p);
            put(h[1], &mut out.su);
            put(h[2], &mut out.sv);
            put(h[3], &mut out.suu);
            put(h[4], &mut out.suv);
            put(h[5], &mut out.svv);
            return;
        }
        let (mul, sub, w) = (
            |a, b| unsafe { M::mul(a, b) },
            |a, b| unsafe { M::sub(a, b) },
            |a| unsafe { M::splat_w(a) },
        );
        // 1/w in every component: one IEEE division, as `1.0 / h[0][3]`.
        let inv_w = unsafe { M::div(M::splat(1.0), w(h[0])) };
        let s = mul(h[0], inv_w);
        put(s, &mut out.p);
        let zero = Vec3::zeros();
        if K < 2 {
            (out.suu, out.suv, out.svv) = (zero, zero, zero);
        }
        if K < 1 {
            (out.su, out.sv) = (zero, zero);
        }
        if K >= 1 {
            let (wu, wv) = (w(h[1]), w(h[2]));
            let su = mul(sub(h[1], mul(s, wu)), inv_w);
            let sv = mul(sub(h[2], mul(s, wv)), inv_w);
            put(su, &mut out.su);
            put(sv, &mut out.sv);
            if K >= 2 {
                let (wuu, wuv, wvv) = (w(h[3]), w(h[4]), w(h[5]));
                let two = unsafe { M::splat(2.0) };
                let (two_wu, two_wv) = (mul(two, wu), mul(two, wv));
                let suu = mul(sub(sub(h[3], mul(su, two_wu)), mul(s, wuu)), inv_w);
                let suv = mul(
                    sub(sub(sub(h[4], mul(sv, wu)), mul(su, wv)), mul(s, wuv)),
                    inv_w,
                );
                let svv = mul(sub(sub(h[5], mul(sv, two_wv)), mul(s, wvv)), inv_w);
                put(suu, &mut out.suu);
                put(suv, &mut out.suv);
                put(svv, &mut out.svv);
            }
        }
    }

    /// The scalar reference of [`Self::quotient_into`] (the one-point path's arithmetic before
    /// it went to vector form): the jet from the homogeneous partials `h`, each [x, y, z, w],
    /// with S = A directly for a non-rational surface, the quotient rule (A4.4) otherwise;
    /// entries above order K zero.
    #[cfg(test)]
    fn quotient<const K: usize>(&self, h: &[[f64; 4]; 6]) -> SurfaceJet {
        let v3 = |a: &[f64; 4]| Vec3::new(a[0], a[1], a[2]);
        if !self.rational {
            return SurfaceJet {
                p: v3(&h[0]),
                su: v3(&h[1]),
                sv: v3(&h[2]),
                suu: v3(&h[3]),
                suv: v3(&h[4]),
                svv: v3(&h[5]),
            };
        }
        let inv_w = 1.0 / h[0][3];
        let s = v3(&h[0]) * inv_w;
        let mut jet = SurfaceJet {
            p: s,
            ..SurfaceJet::default()
        };
        if K >= 1 {
            let (wu, wv) = (h[1][3], h[2][3]);
            jet.su = (v3(&h[1]) - s * wu) * inv_w;
            jet.sv = (v3(&h[2]) - s * wv) * inv_w;
            if K >= 2 {
                let (wuu, wuv, wvv) = (h[3][3], h[4][3], h[5][3]);
                jet.suu = (v3(&h[3]) - jet.su * (2.0 * wu) - s * wuu) * inv_w;
                jet.suv = (v3(&h[4]) - jet.sv * wu - jet.su * wv - s * wuv) * inv_w;
                jet.svv = (v3(&h[5]) - jet.sv * (2.0 * wv) - s * wvv) * inv_w;
            }
        }
        jet
    }
}

impl SurfaceSource for NurbsSurface {
    fn u_domain(&self) -> Interval {
        self.u_knots.domain()
    }
    fn v_domain(&self) -> Interval {
        self.v_knots.domain()
    }
    fn orientation(&self) -> Orientation {
        self.orientation
    }
    fn u_breaks(&self) -> &[f64] {
        self.u_knots.interior_breaks()
    }
    fn v_breaks(&self) -> &[f64] {
        self.v_knots.interior_breaks()
    }
    fn u_creases(&self) -> &[KnotLine] {
        self.u_knots.creases()
    }
    fn v_creases(&self) -> &[KnotLine] {
        self.v_knots.creases()
    }
    fn u_knot_lines(&self) -> &[KnotLine] {
        self.u_knots.knot_lines()
    }
    fn v_knot_lines(&self) -> &[KnotLine] {
        self.v_knots.knot_lines()
    }
    fn jet_in_domain_sided(
        &self,
        u: f64,
        v: f64,
        sides: KnotSides,
        order: DerivOrder,
        hint: &mut SurfaceHint,
    ) -> Result<SurfaceJet> {
        Ok(self.jet_sided_unchecked(u, v, sides, order, hint))
    }
    #[inline]
    fn max_order(&self) -> usize {
        crate::geometry::jet::MAX_PARTIAL_ORDER
    }
    fn partials_in_domain(
        &self,
        u: f64,
        v: f64,
        order: usize,
        hint: &mut SurfaceHint,
    ) -> Result<crate::geometry::jet::SurfacePartials> {
        Ok(self.partials_unchecked(u, v, order, hint))
    }
    fn partials_in_domain_sided(
        &self,
        u: f64,
        v: f64,
        sides: KnotSides,
        order: usize,
        hint: &mut SurfaceHint,
    ) -> Result<crate::geometry::jet::SurfacePartials> {
        Ok(self.partials_sided_unchecked(u, v, sides, order, hint))
    }
    fn jet_in_domain(
        &self,
        u: f64,
        v: f64,
        order: DerivOrder,
        hint: &mut SurfaceHint,
    ) -> Result<SurfaceJet> {
        Ok(self.jet_unchecked(u, v, order, hint))
    }
    #[inline]
    fn jets_and_third_block(
        &self,
        u: &[f64],
        v: &[f64],
        hint: &mut SurfaceHint,
        jets: &mut [SurfaceJet],
        third: &mut [crate::geometry::rates::ThirdPartials],
    ) -> bool {
        self.jets_third_unchecked_block(u, v, hint, jets, third);
        true
    }
    /// The points of the block a group at a time, with the latencies of several points
    /// overlapping (see `nurbs/surface/block.rs`); the bits of [`NurbsSurface::jet_unchecked`]
    /// at each point, the hint carried as by a loop. Never fails.
    fn jets_in_domain_block(
        &self,
        u: &[f64],
        v: &[f64],
        order: DerivOrder,
        hint: &mut SurfaceHint,
        out: &mut [SurfaceJet],
    ) -> Result<()> {
        self.jets_unchecked_block(u, v, order, hint, out);
        Ok(())
    }
}

/// A surface for unit tests: degrees (p, q), nu × nv control points with coordinates and
/// weights drawn from `crate::geometry::math::lcg` (weights in [0.3, 2.3), used when `rational`), knot
/// vectors from [`super::knots::random_test_knots`].
#[cfg(test)]
pub(crate) fn random_test_surface(
    p: usize,
    q: usize,
    nu: usize,
    nv: usize,
    rational: bool,
    st: &mut u64,
) -> NurbsSurface {
    use crate::geometry::math::lcg;
    let ku = super::knots::random_test_knots(p, nu, st);
    let kv = super::knots::random_test_knots(q, nv, st);
    let pts: Vec<[f64; 3]> = (0..nu * nv).map(|_| [lcg(st), lcg(st), lcg(st)]).collect();
    let ws: Vec<f64> = (0..nu * nv).map(|_| 0.3 + 2.0 * lcg(st)).collect();
    NurbsSurface::new(&NurbsSurfaceData {
        degree_u: p,
        degree_v: q,
        count_u: nu,
        count_v: nv,
        knots_u: &ku,
        knots_v: &kv,
        points: &pts,
        weights: rational.then_some(&ws[..]),
    })
    .unwrap()
}

#[cfg(test)]
mod tests {
    use super::super::quad::Scalar;
    use super::*;

    use crate::geometry::math::lcg;

    // Common practice: multiplying by per-span reciprocals of the knot differences gives the
    // same jets as dividing (the reference arithmetic of `basis_rows`) to 1e-13 relative, for
    // degrees 1..=5, 7 and 9 in each direction, clamped and unclamped, with a double interior
    // knot; and the degree-sized rows give the same bits as rows of MAX_ORDER entries.
    #[test]
    fn reciprocal_tables_agree_with_division() {
        let mut st = 99u64;
        let mut worst = 0.0f64;
        for (p, q) in [
            (1, 1),
            (1, 2),
            (2, 1),
            (2, 2),
            (2, 3),
            (3, 1),
            (3, 3),
            (4, 2),
            (5, 1),
            (7, 3),
            (3, 7),
            (9, 2),
        ] {
            let s = random_test_surface(p, q, p + 4, q + 5, true, &mut st);
            let (du, dv) = (s.u_knots.domain(), s.v_knots.domain());
            let mut h = SurfaceHint::default();
            for i in 0..200 {
                let u = du.lo + du.width() * if i % 10 == 0 { 0.0 } else { lcg(&mut st) };
                let v = dv.lo + dv.width() * if i % 7 == 0 { 1.0 } else { lcg(&mut st) };
                let a = s.jet_unchecked(u, v, DerivOrder::Second, &mut h);
                let b =
                    s.eval::<2, MAX_ORDER, 0, 0, false, Scalar>(u, v, KnotSides::default(), &mut h);
                let full =
                    s.eval::<2, MAX_ORDER, 0, 0, true, Scalar>(u, v, KnotSides::default(), &mut h);
                assert_eq!(a, full, "degrees ({p}, {q}): sized rows vs MAX_ORDER rows");
                // Every vector arithmetic gives the same bits (see `quad`).
                for order in [DerivOrder::Position, DerivOrder::First, DerivOrder::Second] {
                    let want = s.jet_with::<Scalar>(u, v, order, &mut h);
                    assert_eq!(s.jet_unchecked(u, v, order, &mut h), want);
                    #[cfg(target_arch = "x86_64")]
                    assert_eq!(s.jet_with::<Sse2>(u, v, order, &mut h), want);
                }
                let scale = a.su.norm().max(a.sv.norm()).max(1.0);
                for (x, y) in [
                    (a.p, b.p),
                    (a.su, b.su),
                    (a.sv, b.sv),
                    (a.suu, b.suu),
                    (a.suv, b.suv),
                    (a.svv, b.svv),
                ] {
                    let e = (x - y).norm() / y.norm().max(scale);
                    worst = worst.max(e);
                    assert!(
                        e <= 1e-13,
                        "degrees ({p}, {q}) at ({u}, {v}): {x:?} vs {y:?}"
                    );
                }
            }
        }
        println!("worst relative difference, reciprocals vs division: {worst:e}");
    }

    /// `quotient_into` with `M` on partials `h`, for order K.
    fn vector_quotient<const K: usize, M: QuadOps>(
        s: &NurbsSurface,
        h: &[[f64; 4]; 6],
    ) -> SurfaceJet {
        let mut jet = SurfaceJet {
            p: Vec3::repeat(f64::NAN),
            su: Vec3::repeat(f64::NAN),
            sv: Vec3::repeat(f64::NAN),
            suu: Vec3::repeat(f64::NAN),
            suv: Vec3::repeat(f64::NAN),
            svv: Vec3::repeat(f64::NAN),
        };
        // SAFETY: the callers pass `Avx` only on an AVX2 processor.
        let hv = h.map(|x| unsafe { M::load(&Quad(x)) });
        s.quotient_into::<K, M>(&hv, &mut jet);
        jet
    }

    fn jet_bits(j: &SurfaceJet) -> Vec<u64> {
        [j.p, j.su, j.sv, j.suu, j.suv, j.svv]
            .iter()
            .flat_map(|v| v.iter().map(|c| c.to_bits()).collect::<Vec<_>>())
            .collect()
    }

    // Common practice: applied to [x, y, z, w] at once, the quotient rule gives, component by
    // component, the bits of the scalar formulas (IEEE operations are correctly rounded, so the
    // same operations in the same order give the same bits), every entry written (none left
    // from before), for orders 0 to 2, rational and not, and each vector arithmetic; partials
    // of mixed signs and magnitudes with entries above the order zero (as the tensor sums
    // leave them).
    #[test]
    fn vector_quotient_gives_the_bits_of_the_scalar_formulas() {
        let mut st = 41u64;
        let pts = [[0.0, 0.0, 0.0]; 4];
        for rational in [false, true] {
            let s = NurbsSurface::new(&NurbsSurfaceData {
                degree_u: 1,
                degree_v: 1,
                count_u: 2,
                count_v: 2,
                knots_u: &[0.0, 0.0, 1.0, 1.0],
                knots_v: &[0.0, 0.0, 1.0, 1.0],
                points: &pts,
                weights: rational.then_some(&[1.0, 2.0, 0.5, 1.5][..]),
            })
            .unwrap();
            for _ in 0..200 {
                let mut h = [[0.0; 4]; 6];
                for x in h.iter_mut().flatten() {
                    *x = (lcg(&mut st) - 0.3) * 10f64.powi((lcg(&mut st) * 12.0) as i32 - 6);
                }
                h[0][3] = 0.2 + 3.0 * lcg(&mut st);
                for k in 0..3 {
                    let mut hk = h;
                    for e in hk.iter_mut().skip(if k == 0 { 1 } else { 3 * k }) {
                        *e = [0.0; 4];
                    }
                    let want = jet_bits(&match k {
                        0 => s.quotient::<0>(&hk),
                        1 => s.quotient::<1>(&hk),
                        _ => s.quotient::<2>(&hk),
                    });
                    fn all<M: QuadOps>(s: &NurbsSurface, k: usize, h: &[[f64; 4]; 6]) -> Vec<u64> {
                        jet_bits(&match k {
                            0 => vector_quotient::<0, M>(s, h),
                            1 => vector_quotient::<1, M>(s, h),
                            _ => vector_quotient::<2, M>(s, h),
                        })
                    }
                    assert_eq!(
                        all::<Scalar>(&s, k, &hk),
                        want,
                        "rational {rational}, order {k}"
                    );
                    #[cfg(target_arch = "x86_64")]
                    {
                        assert_eq!(all::<Sse2>(&s, k, &hk), want, "rational {rational}");
                        if std::arch::is_x86_feature_detected!("avx2") {
                            assert_eq!(all::<Avx>(&s, k, &hk), want, "rational {rational}");
                        }
                    }
                }
            }
        }
    }
}
