//! Surfaces: one trait, "give me the jet at (u, v) up to order k, and your domain", implemented
//! by analytic closures ([`FnSurface`]), by host callbacks (in the C ABI) and by native NURBS.

mod closure;
pub mod crease;

pub use closure::FnSurface;
pub use crease::{CreaseFlags, KnotSide, KnotSides};

use crate::error::{Result, StrakeError};
use crate::geometry::jet::{DerivOrder, Interval, MAX_PARTIAL_ORDER, SurfaceJet, SurfacePartials};
use crate::geometry::principal::Orientation;
use crate::geometry::rates::ThirdPartials;
use crate::nurbs::SpanHint;

/// Remembered knot spans in u and v, for surfaces that have them; ignored by others.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct SurfaceHint {
    /// Span hint in u.
    pub u: SpanHint,
    /// Span hint in v.
    pub v: SpanHint,
}

/// A surface S(u, v) that can be evaluated with its partial derivatives.
///
/// Implementations must be safe to evaluate from several threads at once (`Send + Sync`);
/// per-caller state lives in the [`SurfaceHint`] the caller passes.
pub trait SurfaceSource: Send + Sync {
    /// The u parameter domain.
    fn u_domain(&self) -> Interval;
    /// The v parameter domain.
    fn v_domain(&self) -> Interval;
    /// Which way the unit normal points (see [`Orientation`]).
    fn orientation(&self) -> Orientation;
    /// Values of u strictly inside the domain, ascending, where the surface's derivatives may
    /// be discontinuous (a NURBS surface's interior knots in u): arc-length quadrature splits
    /// a curve where it crosses these lines. None by default (a smooth surface, or one whose
    /// knot lines the source does not know, such as a host callback).
    fn u_breaks(&self) -> &[f64] {
        &[]
    }
    /// As [`SurfaceSource::u_breaks`], in v.
    fn v_breaks(&self) -> &[f64] {
        &[]
    }
    /// The u knot lines across which the surface is not C2 (a NURBS surface's interior u
    /// knots of multiplicity ≥ p − 1), ascending: a curve point on one is snapped onto it and
    /// evaluated on the side it moves into ([`crease`]). None by default (a source that does
    /// not know its knots, such as a host callback).
    fn u_creases(&self) -> &[crease::KnotLine] {
        &[]
    }
    /// As [`SurfaceSource::u_creases`], in v.
    fn v_creases(&self) -> &[crease::KnotLine] {
        &[]
    }
    /// Every u knot line with its continuity, ascending, a superset of
    /// [`SurfaceSource::u_creases`]: where partials of an order above the line's continuity
    /// are evaluated on a path (third partials across a simple knot of a bicubic, which is C2
    /// there), the side the curve moves into is chosen as for a crease
    /// ([`crease::sides_for_order`]). By default the creases.
    fn u_knot_lines(&self) -> &[crease::KnotLine] {
        self.u_creases()
    }
    /// As [`SurfaceSource::u_knot_lines`], in v.
    fn v_knot_lines(&self) -> &[crease::KnotLine] {
        self.v_creases()
    }
    /// The jet at (u, v) evaluated on the given sides of the knot lines through the point: on
    /// a line of [`SurfaceSource::u_creases`] the limit from above or below. Called only with
    /// (u, v) inside the domain, like [`SurfaceSource::jet_in_domain`], which the default
    /// calls (a source without knot lines has one jet per point).
    fn jet_in_domain_sided(
        &self,
        u: f64,
        v: f64,
        sides: KnotSides,
        order: DerivOrder,
        hint: &mut SurfaceHint,
    ) -> Result<SurfaceJet> {
        let _ = sides;
        self.jet_in_domain(u, v, order, hint)
    }
    /// The jet at (u, v) up to `order`; entries above `order` may be left zero. Called only
    /// with (u, v) inside the domain; the result is checked for finiteness by the caller
    /// ([`SurfaceSource::checked_jet`]).
    fn jet_in_domain(
        &self,
        u: f64,
        v: f64,
        order: DerivOrder,
        hint: &mut SurfaceHint,
    ) -> Result<SurfaceJet>;

    /// The jets at the points (u\[i\], v\[i\]), i = 0..u.len(), into `out[i]` (`u`, `v` and
    /// `out` have the same length), all called with points inside the domain; batch entry
    /// points call it once per block of points.
    ///
    /// The default evaluates one point after the other by [`SurfaceSource::jet_in_domain`],
    /// carrying the hint. A failure at point i is returned as
    /// `StrakeError::AtPoint { index: i, error }` with `out[..i]` written. A source that
    /// evaluates the block as a whole (a host's batch callback) may instead fail for the whole
    /// block with any other error. Results are checked for finiteness by the caller.
    fn jets_in_domain_block(
        &self,
        u: &[f64],
        v: &[f64],
        order: DerivOrder,
        hint: &mut SurfaceHint,
        out: &mut [SurfaceJet],
    ) -> Result<()> {
        for (index, ((&u, &v), o)) in u.iter().zip(v).zip(out.iter_mut()).enumerate() {
            *o = self
                .jet_in_domain(u, v, order, hint)
                .map_err(|error| StrakeError::AtPoint {
                    index,
                    error: Box::new(error),
                })?;
        }
        Ok(())
    }

    /// The second-order jets and the third partials [Suuu, Suuv, Suvv, Svvv] at the points
    /// (u\[i\], v\[i\]) into `jets[i]` and `third[i]` (all of the same length, points inside
    /// the domain), for the batch of the rates of change: `true` when written. The jets must
    /// be the bits [`SurfaceSource::jets_in_domain_block`] gives at second order; results are
    /// checked for finiteness by the caller.
    ///
    /// The default writes nothing and returns `false`: the caller then takes the jets from
    /// [`SurfaceSource::jets_in_domain_block`] and the third partials from
    /// [`SurfaceSource::checked_partials`] point by point (a source without third order
    /// refuses there, naming the order). Native NURBS surfaces evaluate both in one pass.
    fn jets_and_third_block(
        &self,
        u: &[f64],
        v: &[f64],
        hint: &mut SurfaceHint,
        jets: &mut [SurfaceJet],
        third: &mut [ThirdPartials],
    ) -> bool {
        let _ = (u, v, hint, jets, third);
        false
    }

    /// The highest derivative order [`SurfaceSource::partials_in_domain`] provides: 2 by
    /// default (a source that only has [`SurfaceSource::jet_in_domain`]); native NURBS and
    /// the analytic surfaces give [`MAX_PARTIAL_ORDER`].
    fn max_order(&self) -> usize {
        2
    }

    /// All partials of S at (u, v) up to `order` (≤ [`MAX_PARTIAL_ORDER`]), called only with
    /// (u, v) inside the domain. The default serves orders up to 2 from
    /// [`SurfaceSource::jet_in_domain`] and refuses higher ones with
    /// [`StrakeError::OrderUnavailable`] (never a silently zero third derivative).
    fn partials_in_domain(
        &self,
        u: f64,
        v: f64,
        order: usize,
        hint: &mut SurfaceHint,
    ) -> Result<SurfacePartials> {
        if order > self.max_order().min(2) {
            return Err(StrakeError::OrderUnavailable {
                which: "surface",
                needed: order,
                available: self.max_order().min(2),
            });
        }
        let d = match order {
            0 => DerivOrder::Position,
            1 => DerivOrder::First,
            _ => DerivOrder::Second,
        };
        let mut p = SurfacePartials::from_jet(&self.jet_in_domain(u, v, d, hint)?);
        p.order = order;
        Ok(p)
    }

    /// The partials at (u, v) up to `order` (as [`SurfaceSource::partials_in_domain`])
    /// evaluated on the given sides of the knot lines through the point, as
    /// [`SurfaceSource::jet_in_domain_sided`] does for the jet: on a crease line the third
    /// partials (and, across a C0 or C1 line, the first or second) are those of the side the
    /// curve moves into. The default ignores `sides` (a source without knot lines).
    fn partials_in_domain_sided(
        &self,
        u: f64,
        v: f64,
        sides: KnotSides,
        order: usize,
        hint: &mut SurfaceHint,
    ) -> Result<SurfacePartials> {
        let _ = sides;
        self.partials_in_domain(u, v, order, hint)
    }

    /// [`SurfaceSource::partials_in_domain`] with the checks of
    /// [`SurfaceSource::checked_jet`]: u, v finite and inside the domain, `order` at most
    /// [`MAX_PARTIAL_ORDER`] (`InvalidArgument` otherwise), every entry up to `order` finite.
    fn checked_partials(
        &self,
        u: f64,
        v: f64,
        order: usize,
        hint: &mut SurfaceHint,
    ) -> Result<SurfacePartials> {
        self.checked_partials_sided(u, v, KnotSides::default(), order, hint)
    }

    /// [`SurfaceSource::checked_partials`] on the given sides of the knot lines through
    /// (u, v) ([`SurfaceSource::partials_in_domain_sided`]); with [`KnotSides::default`] the
    /// same as `checked_partials`.
    fn checked_partials_sided(
        &self,
        u: f64,
        v: f64,
        sides: KnotSides,
        order: usize,
        hint: &mut SurfaceHint,
    ) -> Result<SurfacePartials> {
        if order > MAX_PARTIAL_ORDER {
            return Err(StrakeError::InvalidArgument(format!(
                "derivative order {order} is above {MAX_PARTIAL_ORDER}"
            )));
        }
        self.u_domain().check("u", u)?;
        self.v_domain().check("v", v)?;
        let p = self.partials_in_domain_sided(u, v, sides, order, hint)?;
        p.check_finite()?;
        Ok(p)
    }

    /// The jet at (u, v): checks that u and v are finite and inside the domain (within
    /// [`Interval::snap_tolerance`] of an end snapped onto it exactly; farther out refused),
    /// evaluates, and checks that every requested entry is finite.
    ///
    /// Errors: `NonFinite` (parameter or jet), `OutOfDomain`, and whatever the source reports.
    #[inline]
    fn checked_jet(
        &self,
        u: f64,
        v: f64,
        order: DerivOrder,
        hint: &mut SurfaceHint,
    ) -> Result<SurfaceJet> {
        let u = self.u_domain().snap("u", u)?;
        let v = self.v_domain().snap("v", v)?;
        let jet = self.jet_in_domain(u, v, order, hint)?;
        jet.check_finite()?;
        Ok(jet)
    }
}

impl<S: SurfaceSource + ?Sized> SurfaceSource for &S {
    fn u_domain(&self) -> Interval {
        (**self).u_domain()
    }
    fn v_domain(&self) -> Interval {
        (**self).v_domain()
    }
    fn orientation(&self) -> Orientation {
        (**self).orientation()
    }
    fn u_breaks(&self) -> &[f64] {
        (**self).u_breaks()
    }
    fn v_breaks(&self) -> &[f64] {
        (**self).v_breaks()
    }
    fn u_creases(&self) -> &[crease::KnotLine] {
        (**self).u_creases()
    }
    fn v_creases(&self) -> &[crease::KnotLine] {
        (**self).v_creases()
    }
    fn u_knot_lines(&self) -> &[crease::KnotLine] {
        (**self).u_knot_lines()
    }
    fn v_knot_lines(&self) -> &[crease::KnotLine] {
        (**self).v_knot_lines()
    }
    fn jet_in_domain_sided(
        &self,
        u: f64,
        v: f64,
        sides: KnotSides,
        order: DerivOrder,
        hint: &mut SurfaceHint,
    ) -> Result<SurfaceJet> {
        (**self).jet_in_domain_sided(u, v, sides, order, hint)
    }
    fn jet_in_domain(
        &self,
        u: f64,
        v: f64,
        order: DerivOrder,
        hint: &mut SurfaceHint,
    ) -> Result<SurfaceJet> {
        (**self).jet_in_domain(u, v, order, hint)
    }
    fn jets_in_domain_block(
        &self,
        u: &[f64],
        v: &[f64],
        order: DerivOrder,
        hint: &mut SurfaceHint,
        out: &mut [SurfaceJet],
    ) -> Result<()> {
        (**self).jets_in_domain_block(u, v, order, hint, out)
    }
    fn jets_and_third_block(
        &self,
        u: &[f64],
        v: &[f64],
        hint: &mut SurfaceHint,
        jets: &mut [SurfaceJet],
        third: &mut [ThirdPartials],
    ) -> bool {
        (**self).jets_and_third_block(u, v, hint, jets, third)
    }
    fn max_order(&self) -> usize {
        (**self).max_order()
    }
    fn partials_in_domain(
        &self,
        u: f64,
        v: f64,
        order: usize,
        hint: &mut SurfaceHint,
    ) -> Result<SurfacePartials> {
        (**self).partials_in_domain(u, v, order, hint)
    }
    fn partials_in_domain_sided(
        &self,
        u: f64,
        v: f64,
        sides: KnotSides,
        order: usize,
        hint: &mut SurfaceHint,
    ) -> Result<SurfacePartials> {
        (**self).partials_in_domain_sided(u, v, sides, order, hint)
    }
}
