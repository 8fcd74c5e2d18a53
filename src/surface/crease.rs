//! Knot lines of reduced continuity ("creases") met by a curve: snapping onto them, choosing
//! the side by the direction of travel, and the flags that tell a host it happened.
//!
//! A NURBS surface of degree p in u is only C^(p − m) across an interior u knot of
//! multiplicity m; for m ≥ p − 1 it is not C2 there (see [`KnotLine`]): the curvatures may
//! jump across the line, and for m ≥ p the normal may jump too. At a point on such a line the
//! jet of either side is a valid answer, and which one a plain evaluation gives depends on
//! whether the computed u lands one ulp below or above the knot. Instead:
//!
//! 1. a u within the domain's snap distance ([`crate::Interval::snap_tolerance`]:
//!    [`crate::DOMAIN_SNAP_ULPS`] units of round-off of the domain's larger end) of a crease
//!    knot is taken as on it and set to the knot exactly;
//! 2. the side is the one the curve moves into: above the knot (the span that starts at it)
//!    when u' > 0, below (the span that ends at it, the left-continuous basis) when u' < 0;
//! 3. a curve that runs along the line (|u'|/Δu ≤ [`crate::DOMAIN_SNAP_ULPS`] ε ·
//!    hypot(u'/Δu, v'/Δv): u' is zero up to the round-off of computing it) moves into neither
//!    side. The rule then: the side u'' points to when u'' ≠ 0 (the side the curve bends
//!    into), otherwise the side above the knot (the side a plain span search takes at a knot).
//!    The result carries [`CreaseFlags::ALONG_U`] so a host knows the side was chosen by rule.
//!
//! Likewise in v. The frame then carries [`CreaseFlags::U_LINE`] (and [`CreaseFlags::U_C0`] for
//! a line that is at most C0), so that a host can tell a point on a crease from a smooth point.
//! Only sources that know their knots report creases (native NURBS surfaces); a host callback
//! surface reports none (its jets are what the host computes at the given (u, v)).
//!
//! Every other evaluation on a path takes the same sides (the partials of the rates of change,
//! the tool-centre path, its chordal sampling, the arc-length speed), and partials of an order
//! above a line's continuity follow the same rule on every knot line, crease or not
//! ([`sides_for_order`]: the third partials of a bicubic jump across its simple knots, where it
//! is C2 and no flag is set).

use crate::geometry::frame::ParamScales;
use crate::geometry::jet::{CurveJet, DOMAIN_SNAP_ULPS, Interval};
pub use crate::nurbs::KnotLine;
use crate::surface::SurfaceSource;

/// Which side of a knot line a jet is evaluated on.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum KnotSide {
    /// The span that starts at the knot (the limit from above; what a span search gives at a
    /// knot). Also the side of every point that is not on a knot.
    #[default]
    Above,
    /// The span that ends at the knot (the limit from below, the left-continuous basis).
    Below,
}

/// The sides of the u and v knot lines a jet is evaluated on (both [`KnotSide::Above`] by
/// default, which is a plain evaluation).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct KnotSides {
    /// Side of a u knot line.
    pub u: KnotSide,
    /// Side of a v knot line.
    pub v: KnotSide,
}

/// Bit flags saying whether a point of a path lies on a crease of the surface (see the module
/// docs). 0: a smooth point (or a source that knows no knot lines).
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default, Hash)]
pub struct CreaseFlags(pub u32);

impl CreaseFlags {
    /// u lies on an interior u knot of multiplicity ≥ p − 1: the surface is not C2 across the
    /// line; the jet is that of the side the curve moves into.
    pub const U_LINE: u32 = 1;
    /// As [`Self::U_LINE`] in v.
    pub const V_LINE: u32 = 2;
    /// The u line is at most C0 (multiplicity ≥ p): the first derivatives, and so the normal,
    /// may differ between its sides.
    pub const U_C0: u32 = 4;
    /// As [`Self::U_C0`] in v.
    pub const V_C0: u32 = 8;
    /// The curve runs along the u line (u' is zero to round-off): the side was chosen by the
    /// rule of the module docs, not by the direction of travel.
    pub const ALONG_U: u32 = 16;
    /// As [`Self::ALONG_U`] in v.
    pub const ALONG_V: u32 = 32;

    /// No flag set: a smooth point.
    #[inline]
    pub fn is_smooth(self) -> bool {
        self.0 == 0
    }

    /// Whether every bit of `bits` is set.
    #[inline]
    pub fn has(self, bits: u32) -> bool {
        self.0 & bits == bits
    }
}

/// The crease knot within the snap distance of `x`, if any (`lines` ascending).
#[inline]
fn nearest(lines: &[KnotLine], x: f64, tol: f64) -> Option<KnotLine> {
    if lines.is_empty() {
        return None;
    }
    let i = lines.partition_point(|l| l.at < x);
    [i.checked_sub(1), Some(i)]
        .into_iter()
        .flatten()
        .filter_map(|j| lines.get(j))
        .find(|l| (l.at - x).abs() <= tol)
        .copied()
}

/// The side for a parameter on a knot line, from its rate `d` and second rate `dd`
/// (`along`: `d` is zero to round-off).
#[inline]
fn side_of(d: f64, dd: f64, along: bool) -> KnotSide {
    let lead = if along { dd } else { d };
    if lead < 0.0 {
        KnotSide::Below
    } else {
        KnotSide::Above
    }
}

/// Snaps the curve point `cj` (its (u, v) already inside the domains `ud` × `vd`) onto the
/// crease knots `u_lines`, `v_lines` it lies on to round-off, and returns the flags and the
/// sides to evaluate the surface on (see the module docs). A point on no crease is left
/// unchanged, with no flag and [`KnotSides::default`].
#[inline]
pub fn snap_onto_creases(
    cj: &mut CurveJet,
    ud: Interval,
    vd: Interval,
    u_lines: &[KnotLine],
    v_lines: &[KnotLine],
    scales: &ParamScales,
) -> (CreaseFlags, KnotSides) {
    let mut flags = 0;
    let mut sides = KnotSides::default();
    if u_lines.is_empty() && v_lines.is_empty() {
        return (CreaseFlags(0), sides);
    }
    let on_u = nearest(u_lines, cj.u, ud.snap_tolerance());
    let on_v = nearest(v_lines, cj.v, vd.snap_tolerance());
    if on_u.is_none() && on_v.is_none() {
        return (CreaseFlags(0), sides);
    }
    let (a, b) = (cj.du / scales.u_extent, cj.dv / scales.v_extent);
    let rate = a.hypot(b);
    let still = DOMAIN_SNAP_ULPS * f64::EPSILON * rate;
    if let Some(l) = on_u {
        cj.u = l.at;
        let along = a.abs() <= still;
        sides.u = side_of(cj.du, cj.ddu, along);
        flags |= CreaseFlags::U_LINE;
        if l.continuity <= 0 {
            flags |= CreaseFlags::U_C0;
        }
        if along {
            flags |= CreaseFlags::ALONG_U;
        }
    }
    if let Some(l) = on_v {
        cj.v = l.at;
        let along = b.abs() <= still;
        sides.v = side_of(cj.dv, cj.ddv, along);
        flags |= CreaseFlags::V_LINE;
        if l.continuity <= 0 {
            flags |= CreaseFlags::V_C0;
        }
        if along {
            flags |= CreaseFlags::ALONG_V;
        }
    }
    (CreaseFlags(flags), sides)
}

/// Where and on which sides the partials of order `order` are evaluated at the curve point
/// `cj` (its (u, v) inside the domain, already snapped onto the creases by
/// [`snap_onto_surface_creases`]): on a knot line of [`SurfaceSource::u_knot_lines`] whose
/// continuity is below `order` (within the snap distance, as for a crease), the knot itself
/// and the side the curve moves into by the rule of the module docs; elsewhere (u, v)
/// unchanged on [`KnotSides::default`]. For `order` 2 these are the point and sides of
/// [`snap_onto_surface_creases`]; for 3 also the C2 lines across which the third partials
/// jump. Returns (u, v, sides, whether the point is on such a line).
#[inline]
pub fn sides_for_order<S: SurfaceSource + ?Sized>(
    surface: &S,
    cj: &CurveJet,
    order: usize,
) -> (f64, f64, KnotSides, bool) {
    let (ul, vl) = (surface.u_knot_lines(), surface.v_knot_lines());
    let mut sides = KnotSides::default();
    if ul.is_empty() && vl.is_empty() {
        return (cj.u, cj.v, sides, false);
    }
    let (ud, vd) = (surface.u_domain(), surface.v_domain());
    let below = |l: &KnotLine| i64::from(l.continuity) < order as i64;
    let on_u = nearest(ul, cj.u, ud.snap_tolerance()).filter(below);
    let on_v = nearest(vl, cj.v, vd.snap_tolerance()).filter(below);
    if on_u.is_none() && on_v.is_none() {
        return (cj.u, cj.v, sides, false);
    }
    let (a, b) = (cj.du / ud.width(), cj.dv / vd.width());
    let still = DOMAIN_SNAP_ULPS * f64::EPSILON * a.hypot(b);
    let (mut u, mut v) = (cj.u, cj.v);
    if let Some(l) = on_u {
        u = l.at;
        sides.u = side_of(cj.du, cj.ddu, a.abs() <= still);
    }
    if let Some(l) = on_v {
        v = l.at;
        sides.v = side_of(cj.dv, cj.ddv, b.abs() <= still);
    }
    (u, v, sides, true)
}

/// [`snap_onto_creases`] with the domains and crease lines of `surface`.
#[inline]
pub fn snap_onto_surface_creases<S: SurfaceSource + ?Sized>(
    surface: &S,
    cj: &mut CurveJet,
    scales: &ParamScales,
) -> (CreaseFlags, KnotSides) {
    let (ul, vl) = (surface.u_creases(), surface.v_creases());
    if ul.is_empty() && vl.is_empty() {
        return (CreaseFlags(0), KnotSides::default());
    }
    snap_onto_creases(cj, surface.u_domain(), surface.v_domain(), ul, vl, scales)
}

#[cfg(test)]
mod tests {
    use super::*;

    fn lines() -> [KnotLine; 2] {
        [
            KnotLine {
                at: 0.25,
                continuity: 0,
            },
            KnotLine {
                at: 0.5,
                continuity: 1,
            },
        ]
    }

    // Derived from the rule of the module docs: the side the curve moves into, u'' when it
    // runs along the line, above when u'' = 0 too.
    #[test]
    fn the_side_follows_the_direction_of_travel() {
        let d = Interval { lo: 0.0, hi: 1.0 };
        let s = ParamScales {
            u_extent: 1.0,
            v_extent: 1.0,
            t_extent: 1.0,
        };
        let l = lines();
        let cases = [
            (0.25f64.next_up(), 1.0, 0.0, KnotSide::Above, false),
            (0.25f64.next_down(), -1.0, 0.0, KnotSide::Below, false),
            (0.25, 0.0, -2.0, KnotSide::Below, true),
            (0.25, 0.0, 0.0, KnotSide::Above, true),
        ];
        for (u, du, ddu, side, along) in cases {
            let mut cj = CurveJet {
                u,
                v: 0.7,
                du,
                dv: 1.0,
                ddu,
                ddv: 0.0,
            };
            let (f, sides) = snap_onto_creases(&mut cj, d, d, &l, &[], &s);
            assert_eq!(cj.u, 0.25);
            assert_eq!(sides.u, side);
            assert!(f.has(CreaseFlags::U_LINE | CreaseFlags::U_C0));
            assert_eq!(f.has(CreaseFlags::ALONG_U), along);
            assert!(!f.has(CreaseFlags::V_LINE));
        }
        // Far from any knot: untouched.
        let mut cj = CurveJet {
            u: 0.3,
            v: 0.7,
            du: 1.0,
            ..CurveJet::default()
        };
        let (f, _) = snap_onto_creases(&mut cj, d, d, &l, &l, &s);
        assert!(f.is_smooth());
        assert_eq!(cj.u, 0.3);
    }
}
