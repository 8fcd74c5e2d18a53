//! Jets: a point together with its derivatives, the currency between surfaces, curves and the
//! frame computation.

use crate::error::{NonFiniteSource, Result, StrakeError};
use crate::geometry::math::{Vec3, all_finite};

/// How many derivatives a surface or curve must supply.
#[derive(Debug, Clone, Copy, PartialEq, Eq, PartialOrd, Ord)]
pub enum DerivOrder {
    /// Position only.
    Position = 0,
    /// Position and first partial derivatives.
    First = 1,
    /// Position, first and second partial derivatives.
    Second = 2,
}

/// A surface point S(u, v) with its partial derivatives up to second order.
///
/// Lengths are in the host's unit; derivatives are per unit of the surface parameters. Entries
/// beyond the order that was requested are zero.
///
/// Laid out as C lays out the same fields (`#[repr(C)]`): 18 f64 in the order p, Su, Sv, Suu,
/// Suv, Svv, each x, y, z. The batch frame kernel reads them in that order (checked at compile
/// time in `frame_block.rs`).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
#[repr(C)]
pub struct SurfaceJet {
    /// The point S.
    pub p: Vec3,
    /// ∂S/∂u.
    pub su: Vec3,
    /// ∂S/∂v.
    pub sv: Vec3,
    /// ∂²S/∂u².
    pub suu: Vec3,
    /// ∂²S/∂u∂v.
    pub suv: Vec3,
    /// ∂²S/∂v².
    pub svv: Vec3,
}

impl SurfaceJet {
    /// Fails with [`StrakeError::NonFinite`] naming the first non-finite entry.
    #[inline]
    pub fn check_finite(&self) -> Result<()> {
        // Non-short-circuit `&`: one branch for the common case.
        let mut finite = true;
        for v in [&self.p, &self.su, &self.sv, &self.suu, &self.suv, &self.svv] {
            finite &= v.x.is_finite() & v.y.is_finite() & v.z.is_finite();
        }
        if finite {
            return Ok(());
        }
        self.non_finite_entry()
    }

    #[cold]
    #[inline(never)]
    fn non_finite_entry(&self) -> Result<()> {
        let entries: [(&'static str, &Vec3); 6] = [
            ("S", &self.p),
            ("Su", &self.su),
            ("Sv", &self.sv),
            ("Suu", &self.suu),
            ("Suv", &self.suv),
            ("Svv", &self.svv),
        ];
        for (name, v) in entries {
            if !all_finite(v) {
                let value = [v.x, v.y, v.z]
                    .into_iter()
                    .find(|c| !c.is_finite())
                    .unwrap_or(f64::NAN);
                return Err(StrakeError::NonFinite {
                    source: NonFiniteSource::SurfaceJet,
                    what: name,
                    value,
                });
            }
        }
        Ok(())
    }
}

/// A point (u, v) of a curve in the surface's parameter plane, with its first and second
/// derivatives with respect to the curve parameter t.
///
/// Laid out as C lays out the same fields (`#[repr(C)]`): 6 f64 in the order u, v, u', v',
/// u'', v'' (the frame kernel loads them, and the block evaluation of NURBS curves stores
/// them, with vector loads and stores).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
#[repr(C)]
pub struct CurveJet {
    /// u(t).
    pub u: f64,
    /// v(t).
    pub v: f64,
    /// du/dt.
    pub du: f64,
    /// dv/dt.
    pub dv: f64,
    /// d²u/dt².
    pub ddu: f64,
    /// d²v/dt².
    pub ddv: f64,
}

impl CurveJet {
    /// Fails with [`StrakeError::NonFinite`] naming the first non-finite entry.
    #[inline]
    pub fn check_finite(&self) -> Result<()> {
        // Non-short-circuit `&`: one branch for the common case.
        let finite = self.u.is_finite()
            & self.v.is_finite()
            & self.du.is_finite()
            & self.dv.is_finite()
            & self.ddu.is_finite()
            & self.ddv.is_finite();
        if finite {
            return Ok(());
        }
        self.non_finite_entry()
    }

    #[cold]
    #[inline(never)]
    fn non_finite_entry(&self) -> Result<()> {
        let entries = [
            ("u", self.u),
            ("v", self.v),
            ("du", self.du),
            ("dv", self.dv),
            ("ddu", self.ddu),
            ("ddv", self.ddv),
        ];
        for (name, value) in entries {
            if !value.is_finite() {
                return Err(StrakeError::NonFinite {
                    source: NonFiniteSource::CurveJet,
                    what: name,
                    value,
                });
            }
        }
        Ok(())
    }
}

/// How many units of round-off (of the larger end's magnitude) a parameter may lie outside a
/// domain and still be taken as on its end, and snapped onto it exactly: see
/// [`Interval::snap`].
pub const DOMAIN_SNAP_ULPS: f64 = 8.0;

/// A closed interval `[lo, hi]` of a parameter, with `lo < hi`.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Interval {
    /// Lower end.
    pub lo: f64,
    /// Upper end.
    pub hi: f64,
}

impl Interval {
    /// Validates and builds an interval; `name` is used in the error message.
    ///
    /// Errors: `InvalidArgument` for a non-finite end, `lo ≥ hi`, or a width `hi − lo` that
    /// overflows (e.g. [−1e308, 1e308]): every figure scaled by the width would be meaningless.
    pub fn new(name: &str, lo: f64, hi: f64) -> Result<Self> {
        if !lo.is_finite() || !hi.is_finite() {
            return Err(StrakeError::InvalidArgument(format!(
                "{name} range [{lo}, {hi}] is not finite",
                lo = crate::numfmt::Exact(lo),
                hi = crate::numfmt::Exact(hi)
            )));
        }
        if lo >= hi {
            return Err(StrakeError::InvalidArgument(format!(
                "{name} range [{lo}, {hi}] is empty: the lower end must be below the upper end",
                lo = crate::numfmt::Exact(lo),
                hi = crate::numfmt::Exact(hi)
            )));
        }
        if !(hi - lo).is_finite() {
            return Err(StrakeError::InvalidArgument(format!(
                "{name} range [{lo}, {hi}] is too wide: its width hi - lo overflows to {}",
                hi - lo,
                lo = crate::numfmt::Exact(lo),
                hi = crate::numfmt::Exact(hi)
            )));
        }
        Ok(Interval { lo, hi })
    }

    /// `hi − lo`.
    #[inline]
    pub fn width(&self) -> f64 {
        self.hi - self.lo
    }

    /// How far outside the interval a parameter may lie and still be taken as on its end:
    /// [`DOMAIN_SNAP_ULPS`] units of round-off of the larger end's magnitude,
    /// `DOMAIN_SNAP_ULPS · ε · max(|lo|, |hi|)` (ε = `f64::EPSILON`). A curve that ends on
    /// (or runs along) the edge of a surface computes its (u, v) a few ulps off the edge; such
    /// a point is on the edge, not outside it.
    #[inline]
    pub fn snap_tolerance(&self) -> f64 {
        DOMAIN_SNAP_ULPS * f64::EPSILON * self.lo.abs().max(self.hi.abs())
    }

    /// The parameter `x` as evaluated: `x` itself when `lo ≤ x ≤ hi`; exactly `lo` (or `hi`)
    /// when `x` lies below `lo` (above `hi`) by at most [`Self::snap_tolerance`].
    ///
    /// Errors: [`StrakeError::NonFinite`] for a non-finite `x`, [`StrakeError::OutOfDomain`]
    /// for an `x` farther outside.
    #[inline]
    pub fn snap(&self, name: &'static str, x: f64) -> Result<f64> {
        if self.lo <= x && x <= self.hi {
            return Ok(x);
        }
        if !x.is_finite() {
            return Err(StrakeError::NonFinite {
                source: NonFiniteSource::Parameter,
                what: name,
                value: x,
            });
        }
        let tol = self.snap_tolerance();
        if x < self.lo && self.lo - x <= tol {
            return Ok(self.lo);
        }
        if x > self.hi && x - self.hi <= tol {
            return Ok(self.hi);
        }
        Err(StrakeError::OutOfDomain {
            name,
            value: x,
            lo: self.lo,
            hi: self.hi,
        })
    }

    /// Fails with [`StrakeError::OutOfDomain`] (or `NonFinite`) unless `x` lies in
    /// `[lo, hi]` or within [`Self::snap_tolerance`] of it (see [`Self::snap`], which also
    /// gives the value to evaluate at).
    #[inline]
    pub fn check(&self, name: &'static str, x: f64) -> Result<()> {
        self.snap(name, x).map(|_| ())
    }

    /// `n` evenly spaced values from `lo` to `hi` inclusive (`n ≥ 2`), or `lo` when `n == 1`.
    /// The last value is exactly `hi`.
    #[inline]
    pub fn even(&self, i: usize, n: usize) -> f64 {
        if n <= 1 {
            return self.lo;
        }
        if i + 1 == n {
            return self.hi;
        }
        self.lo + self.width() * (i as f64 / (n - 1) as f64)
    }
}

/// The highest derivative order of [`SurfacePartials`] and [`CurvePartials`]: third order for
/// the rates of change of the invariants, fourth for the rate of change of the tool-centre
/// path's curvature.
pub const MAX_PARTIAL_ORDER: usize = 4;

/// A surface point with its partial derivatives up to order [`MAX_PARTIAL_ORDER`]:
/// `d[i][j]` = ∂^(i+j) S / ∂u^i ∂v^j for i + j ≤ `order` (entries above `order`, and those
/// with i + j > 4, are zero). `d[0][0]` is the point.
///
/// Lengths in the host's unit, derivatives per unit of the surface parameters. The first
/// entries are those of [`SurfaceJet`]: `d[1][0]` = Su, `d[0][1]` = Sv, `d[2][0]` = Suu,
/// `d[1][1]` = Suv, `d[0][2]` = Svv; the third-order ones have accessors
/// ([`Self::suuu`] …).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SurfacePartials {
    /// The highest order filled (0 ..= [`MAX_PARTIAL_ORDER`]).
    pub order: usize,
    /// `d[i][j]` = ∂^(i+j) S / ∂u^i ∂v^j.
    pub d: [[Vec3; MAX_PARTIAL_ORDER + 1]; MAX_PARTIAL_ORDER + 1],
}

impl Default for SurfacePartials {
    fn default() -> Self {
        SurfacePartials {
            order: 0,
            d: [[Vec3::zeros(); MAX_PARTIAL_ORDER + 1]; MAX_PARTIAL_ORDER + 1],
        }
    }
}

impl SurfacePartials {
    /// The partials of a second-order jet (`order` = 2, everything above zero).
    pub fn from_jet(j: &SurfaceJet) -> Self {
        let mut p = SurfacePartials {
            order: 2,
            ..Default::default()
        };
        p.d[0][0] = j.p;
        p.d[1][0] = j.su;
        p.d[0][1] = j.sv;
        p.d[2][0] = j.suu;
        p.d[1][1] = j.suv;
        p.d[0][2] = j.svv;
        p
    }

    /// The second-order part as a [`SurfaceJet`].
    pub fn jet(&self) -> SurfaceJet {
        SurfaceJet {
            p: self.d[0][0],
            su: self.d[1][0],
            sv: self.d[0][1],
            suu: self.d[2][0],
            suv: self.d[1][1],
            svv: self.d[0][2],
        }
    }

    /// ∂³S/∂u³.
    pub fn suuu(&self) -> Vec3 {
        self.d[3][0]
    }
    /// ∂³S/∂u²∂v.
    pub fn suuv(&self) -> Vec3 {
        self.d[2][1]
    }
    /// ∂³S/∂u∂v².
    pub fn suvv(&self) -> Vec3 {
        self.d[1][2]
    }
    /// ∂³S/∂v³.
    pub fn svvv(&self) -> Vec3 {
        self.d[0][3]
    }

    /// Fails with [`StrakeError::NonFinite`] naming the first non-finite partial up to
    /// `order` (e.g. "S_uuv" for `d[2][1]`).
    pub fn check_finite(&self) -> Result<()> {
        const NAMES: [[&str; 5]; 5] = [
            ["S", "Sv", "Svv", "Svvv", "Svvvv"],
            ["Su", "Suv", "Suvv", "Suvvv", ""],
            ["Suu", "Suuv", "Suuvv", "", ""],
            ["Suuu", "Suuuv", "", "", ""],
            ["Suuuu", "", "", "", ""],
        ];
        for (i, row) in self.d.iter().enumerate() {
            for (j, v) in row.iter().enumerate() {
                if i + j <= self.order && !all_finite(v) {
                    let value = [v.x, v.y, v.z]
                        .into_iter()
                        .find(|c| !c.is_finite())
                        .unwrap_or(f64::NAN);
                    return Err(StrakeError::NonFinite {
                        source: NonFiniteSource::SurfaceJet,
                        what: NAMES[i][j],
                        value,
                    });
                }
            }
        }
        Ok(())
    }
}

/// A point (u, v) of a curve in the parameter plane with its derivatives up to order
/// [`MAX_PARTIAL_ORDER`] in the curve parameter t: `u[k]` = d^k u / dt^k, `v[k]` likewise,
/// for k ≤ `order` (higher entries zero).
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct CurvePartials {
    /// The highest order filled (0 ..= [`MAX_PARTIAL_ORDER`]).
    pub order: usize,
    /// u and its derivatives in t.
    pub u: [f64; MAX_PARTIAL_ORDER + 1],
    /// v and its derivatives in t.
    pub v: [f64; MAX_PARTIAL_ORDER + 1],
}

impl CurvePartials {
    /// The derivatives of a second-order jet (`order` = 2).
    pub fn from_jet(j: &CurveJet) -> Self {
        CurvePartials {
            order: 2,
            u: [j.u, j.du, j.ddu, 0.0, 0.0],
            v: [j.v, j.dv, j.ddv, 0.0, 0.0],
        }
    }

    /// The second-order part as a [`CurveJet`].
    pub fn jet(&self) -> CurveJet {
        CurveJet {
            u: self.u[0],
            v: self.v[0],
            du: self.u[1],
            dv: self.v[1],
            ddu: self.u[2],
            ddv: self.v[2],
        }
    }

    /// Fails with [`StrakeError::NonFinite`] naming the first non-finite derivative up to
    /// `order` ("u", "du", "ddu", "d3u", "d4u", and the same for v).
    pub fn check_finite(&self) -> Result<()> {
        const NAMES: [[&str; 5]; 2] = [
            ["u", "du", "ddu", "d3u", "d4u"],
            ["v", "dv", "ddv", "d3v", "d4v"],
        ];
        for k in 0..=self.order.min(MAX_PARTIAL_ORDER) {
            for (names, x) in NAMES.iter().zip([self.u[k], self.v[k]]) {
                if !x.is_finite() {
                    return Err(StrakeError::NonFinite {
                        source: NonFiniteSource::CurveJet,
                        what: names[k],
                        value: x,
                    });
                }
            }
        }
        Ok(())
    }
}
