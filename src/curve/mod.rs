//! Curves in the surface's parameter plane: "give me (u, v) and its first two derivatives at
//! t". Implemented by 2D NURBS curves, Rust closures ([`FnCurve`]) and host callbacks (in the
//! C ABI).

use crate::error::{Result, StrakeError};
use crate::geometry::jet::{CurveJet, CurvePartials, DerivOrder, Interval, MAX_PARTIAL_ORDER};
use crate::nurbs::{NurbsCurve, SpanHint};

/// A curve t ↦ (u(t), v(t)) in a surface's parameter plane.
///
/// Implementations must be safe to evaluate from several threads at once; per-caller state
/// lives in the [`SpanHint`] the caller passes.
pub trait UvCurve: Send + Sync {
    /// The parameter domain of t.
    fn domain(&self) -> Interval;
    /// The jet at t, called only with t inside the domain; checked by the caller
    /// ([`UvCurve::checked_jet`]).
    fn jet_in_domain(&self, t: f64, hint: &mut SpanHint) -> Result<CurveJet>;

    /// The third derivatives [u''', v'''] at `ts[i]` into `out[i]` (same lengths, t inside
    /// the domain), for the batch of the rates of change; checked for finiteness by the
    /// caller. The default asks [`UvCurve::partials_in_domain`] for order 3 point by point (a
    /// curve without third order refuses there, naming the order), a failure at point i
    /// returned as `StrakeError::AtPoint { index: i, .. }`; a source that evaluates the block
    /// as a whole may fail for the whole block with any other error.
    fn third_derivatives_block(
        &self,
        ts: &[f64],
        hint: &mut SpanHint,
        out: &mut [[f64; 2]],
    ) -> Result<()> {
        for (index, (&t, o)) in ts.iter().zip(out.iter_mut()).enumerate() {
            let p = self
                .partials_in_domain(t, 3, hint)
                .map_err(|error| StrakeError::AtPoint {
                    index,
                    error: Box::new(error),
                })?;
            *o = [p.u[3], p.v[3]];
        }
        Ok(())
    }

    /// The jets at `ts[i]` into `out[i]`, i = 0..ts.len() (`ts` and `out` have the same
    /// length), all called with t inside the domain; batch entry points call it once per block
    /// of samples. The hint is carried through the points in order.
    ///
    /// The default evaluates one point after the other by [`UvCurve::jet_in_domain`]. A failure
    /// at point i is returned as `StrakeError::AtPoint { index: i, error }` with `out[..i]`
    /// written; an implementation that evaluates the block as a whole may instead fail for the
    /// whole block with any other error. Results are checked for finiteness by the caller.
    /// NURBS curves of degree 1 to 3 evaluate several points at once, with the bits of
    /// [`UvCurve::jet_in_domain`] at each.
    #[inline]
    fn jets_in_domain_block(
        &self,
        ts: &[f64],
        hint: &mut SpanHint,
        out: &mut [CurveJet],
    ) -> Result<()> {
        jets_one_by_one(self, ts, hint, out)
    }

    /// Parameters strictly inside the domain, ascending, where the curve's derivatives may be
    /// discontinuous (a spline's interior knots). Arc-length quadrature splits there, since an
    /// integrand that is not smooth inside an interval defeats its error estimate. None by
    /// default.
    fn breakpoints(&self) -> &[f64] {
        &[]
    }

    /// The highest derivative order [`UvCurve::partials_in_domain`] provides: 2 by default;
    /// NURBS curves give [`MAX_PARTIAL_ORDER`].
    fn max_order(&self) -> usize {
        2
    }

    /// u, v and their derivatives in t up to `order` (≤ [`MAX_PARTIAL_ORDER`]), called only
    /// with t inside the domain. The default serves orders up to 2 from
    /// [`UvCurve::jet_in_domain`] and refuses higher ones with
    /// [`StrakeError::OrderUnavailable`].
    fn partials_in_domain(
        &self,
        t: f64,
        order: usize,
        hint: &mut SpanHint,
    ) -> Result<CurvePartials> {
        if order > self.max_order().min(2) {
            return Err(StrakeError::OrderUnavailable {
                which: "curve",
                needed: order,
                available: self.max_order().min(2),
            });
        }
        let mut p = CurvePartials::from_jet(&self.jet_in_domain(t, hint)?);
        p.order = order;
        Ok(p)
    }

    /// [`UvCurve::partials_in_domain`] with the checks of [`UvCurve::checked_jet`] (t finite
    /// and inside the domain, `order` at most [`MAX_PARTIAL_ORDER`], the result finite).
    fn checked_partials(&self, t: f64, order: usize, hint: &mut SpanHint) -> Result<CurvePartials> {
        if order > MAX_PARTIAL_ORDER {
            return Err(StrakeError::InvalidArgument(format!(
                "derivative order {order} is above {MAX_PARTIAL_ORDER}"
            )));
        }
        self.domain().check("t", t)?;
        let p = self.partials_in_domain(t, order, hint)?;
        p.check_finite()?;
        Ok(p)
    }

    /// The jet at t: checks that t is finite and inside the domain (within
    /// [`Interval::snap_tolerance`] of an end snapped onto it exactly), evaluates, and checks that
    /// the jet is finite. Errors: `NonFinite`, `OutOfDomain`, and whatever the source reports.
    #[inline]
    fn checked_jet(&self, t: f64, hint: &mut SpanHint) -> Result<CurveJet> {
        let t = self.domain().snap("t", t)?;
        let jet = self.jet_in_domain(t, hint)?;
        jet.check_finite()?;
        Ok(jet)
    }
}

/// The default of [`UvCurve::jets_in_domain_block`]: [`UvCurve::jet_in_domain`] point by
/// point, a failure at point i returned as `StrakeError::AtPoint { index: i, .. }`.
#[inline]
pub(crate) fn jets_one_by_one<C: UvCurve + ?Sized>(
    curve: &C,
    ts: &[f64],
    hint: &mut SpanHint,
    out: &mut [CurveJet],
) -> Result<()> {
    for (index, (&t, o)) in ts.iter().zip(out.iter_mut()).enumerate() {
        *o = curve
            .jet_in_domain(t, hint)
            .map_err(|error| StrakeError::AtPoint {
                index,
                error: Box::new(error),
            })?;
    }
    Ok(())
}

impl UvCurve for NurbsCurve<2> {
    fn domain(&self) -> Interval {
        NurbsCurve::domain(self)
    }
    fn breakpoints(&self) -> &[f64] {
        self.knot_vector().interior_breaks()
    }
    #[inline]
    fn jet_in_domain(&self, t: f64, hint: &mut SpanHint) -> Result<CurveJet> {
        let d = self.derivs_unchecked(t, DerivOrder::Second, hint);
        Ok(CurveJet {
            u: d.p[0],
            v: d.p[1],
            du: d.d1[0],
            dv: d.d1[1],
            ddu: d.d2[0],
            ddv: d.d2[1],
        })
    }
    #[inline]
    fn jets_in_domain_block(
        &self,
        ts: &[f64],
        hint: &mut SpanHint,
        out: &mut [CurveJet],
    ) -> Result<()> {
        self.jets_block(ts, hint, out);
        Ok(())
    }
    #[inline]
    fn third_derivatives_block(
        &self,
        ts: &[f64],
        hint: &mut SpanHint,
        out: &mut [[f64; 2]],
    ) -> Result<()> {
        self.third_block(ts, hint, out);
        Ok(())
    }
    fn max_order(&self) -> usize {
        MAX_PARTIAL_ORDER
    }
    #[inline]
    fn partials_in_domain(
        &self,
        t: f64,
        order: usize,
        hint: &mut SpanHint,
    ) -> Result<CurvePartials> {
        let d = self.high_derivs_unchecked(t, order.min(MAX_PARTIAL_ORDER), hint);
        let mut p = CurvePartials {
            order,
            ..Default::default()
        };
        for (k, dk) in d.iter().enumerate().take(order.min(MAX_PARTIAL_ORDER) + 1) {
            p.u[k] = dk[0];
            p.v[k] = dk[1];
        }
        Ok(p)
    }
}

/// A curve whose jet comes from a closure `f(t)`.
pub struct FnCurve<F> {
    f: F,
    domain: Interval,
}

impl<F> FnCurve<F>
where
    F: Fn(f64) -> Result<CurveJet> + Send + Sync,
{
    /// A curve on `domain` evaluated by `f`.
    pub fn new(domain: Interval, f: F) -> Self {
        FnCurve { f, domain }
    }
}

impl<F> UvCurve for FnCurve<F>
where
    F: Fn(f64) -> Result<CurveJet> + Send + Sync,
{
    fn domain(&self) -> Interval {
        self.domain
    }
    #[inline]
    fn jet_in_domain(&self, t: f64, _hint: &mut SpanHint) -> Result<CurveJet> {
        (self.f)(t)
    }
}

impl<C: UvCurve + ?Sized> UvCurve for &C {
    fn domain(&self) -> Interval {
        (**self).domain()
    }
    fn jet_in_domain(&self, t: f64, hint: &mut SpanHint) -> Result<CurveJet> {
        (**self).jet_in_domain(t, hint)
    }
    fn jets_in_domain_block(
        &self,
        ts: &[f64],
        hint: &mut SpanHint,
        out: &mut [CurveJet],
    ) -> Result<()> {
        (**self).jets_in_domain_block(ts, hint, out)
    }
    fn third_derivatives_block(
        &self,
        ts: &[f64],
        hint: &mut SpanHint,
        out: &mut [[f64; 2]],
    ) -> Result<()> {
        (**self).third_derivatives_block(ts, hint, out)
    }
    fn breakpoints(&self) -> &[f64] {
        (**self).breakpoints()
    }
    fn max_order(&self) -> usize {
        (**self).max_order()
    }
    fn partials_in_domain(
        &self,
        t: f64,
        order: usize,
        hint: &mut SpanHint,
    ) -> Result<CurvePartials> {
        (**self).partials_in_domain(t, order, hint)
    }
}

/// Straight line in the parameter plane from (u0, v0) to (u1, v1) for t in [0, 1]; a
/// convenience for iso-curves and slanted paths.
pub fn uv_line(u0: f64, v0: f64, u1: f64, v1: f64) -> Result<NurbsCurve<2>> {
    if !(u0.is_finite() && v0.is_finite() && u1.is_finite() && v1.is_finite()) {
        return Err(StrakeError::InvalidArgument(format!(
            "uv line endpoints {} -> {} are not finite",
            crate::numfmt::ExactVec(&[u0, v0]),
            crate::numfmt::ExactVec(&[u1, v1])
        )));
    }
    NurbsCurve::new(1, &[0.0, 0.0, 1.0, 1.0], &[[u0, v0], [u1, v1]], None)
}

/// How many leading lanes of a block evaluation's output hold jets, from its result: all `len`
/// on success, the lanes before the failing point of a [`StrakeError::AtPoint`] error, none for
/// any other error. Curves that post-process the jets of an inner curve's block (seam wrapping,
/// domain holding) treat exactly these lanes.
pub(crate) fn lanes_written(r: &Result<()>, len: usize) -> usize {
    match r {
        Ok(()) => len,
        Err(StrakeError::AtPoint { index, .. }) => *index,
        Err(_) => 0,
    }
}
