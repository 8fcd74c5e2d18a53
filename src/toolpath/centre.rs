//! The tool-centre path of a cutter riding a contact path.
//!
//! Cutter geometry ([`Cutter::torus_radii`]): a corner circle of radius r whose centre lies at
//! distance R from the axis (ball: R = 0; flat: r = 0). At a contact point c with tool-side
//! normal n_t = s N (s from [`ToolSide`]) and unit axis a (from [`tool_axis`]), the centre of
//! the corner circle touching there is c + r n_t, and the axis passes at distance R from it on
//! the side n_t leans toward:
//!
//! - cutter-location point (on the axis, in the plane of the corner-circle centres; a ball's
//!   centre): CL = c + r n_t + R e, e = (n_t − (n_t·a) a) / |n_t − (n_t·a) a|;
//! - tool tip (lowest point of the axis): CL − r a.
//!
//! With the axis along n_t (lead = tilt = 0) a flat or toroidal cutter touches with its flat
//! bottom, e is undefined and the axis is taken through the contact point (CL = c + r n_t):
//! right for a convex surface, while on a concave one the bottom's rim digs in (rear gouging,
//! not judged here).
//!
//! With lead and tilt fixed in the frame, the offset d = CL − c has constant components in
//! (T, B, N). Writing a vector as F x with F = [T B N], d(F x)/ds = F (x' + ω × x) with the
//! Darboux vector ω = (τg, −κn, κg) (from dT/ds = κg B + κn N, dB/ds = −κg T + τg N,
//! dN/ds = −κn T − τg B). Hence dCL/ds = T + ω × d: its component along T is
//! 1 − d_B κg − d_N κn (for a ball 1 − r s κn), which vanishes where the centre path folds back
//! (a ball larger than a concave radius along the path). The curvature of the centre path
//! needs ω' (third-order jets), its rate of change and torsion ω'' (fourth order). Both are
//! computed exactly: CL(t) is carried as a Taylor series in t built from the jets
//! ([`crate::geometry::rates`]), so CL', CL'', CL''' are exact derivatives to rounding, and
//! κc = |CL' × CL''| / |CL'|³, dκc/ds_c = (dκc/dt) / |CL'|,
//! τc = (CL' × CL'')·CL''' / |CL' × CL''|² (do Carmo §1-5).
//!
//! The axis, fixed in the frame, turns as the frame does: da/ds = ω × a, so its angular rate
//! per unit length of the contact path is |ω × a| and per unit length of the centre path
//! |ω × a| / (ds_c/ds).

use crate::checks::cutter::{Cutter, ToolSide};
use crate::checks::tool_axis::{ToolAngles, tool_axis};
use crate::curve::UvCurve;
use crate::error::{NonFiniteSource, Result, StrakeError};
use crate::geometry::frame::DarbouxFrame;
use crate::geometry::jet::{CurvePartials, SurfacePartials};
use crate::geometry::math::Vec3;
use crate::geometry::principal::Orientation;
use crate::geometry::rates::{InvariantRates, invariant_rates, path_series};
use crate::paths::curve_on_surface::{CurveOnSurface, Hints, SampleError};
use crate::surface::SurfaceSource;

/// Below this component of dCL/ds along T (dimensionless) the centre path is reported as
/// folding back ([`StrakeError::CentrePathFolds`]): its tangent and curvature are not
/// defined, or would be those of a path running backwards.
pub const FOLD_LIMIT: f64 = 1e-6;

/// A cutter with its lead and tilt on one side of the surface.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ToolSetup {
    /// The cutter's shape.
    pub cutter: Cutter,
    /// The side of the surface the tool is on.
    pub side: ToolSide,
    /// Lead and tilt (see the module `crate::checks::tool_axis`).
    pub angles: ToolAngles,
}

impl ToolSetup {
    /// Checks the cutter and the angles (errors of [`Cutter::validate`] and
    /// [`ToolAngles::validate`], naming the field).
    pub fn validate(&self) -> Result<()> {
        self.cutter.validate()?;
        self.angles.validate()
    }
}

/// The tool-centre path at one sample. (`Default`: every field zero or `None`, a placeholder
/// for output arrays, not a valid point.)
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct CentrePoint {
    /// Cutter-location point: on the axis, in the plane of the corner-circle centres (a
    /// ball's centre) (host length unit).
    pub centre: Vec3,
    /// Tool tip: the lowest point of the axis, `centre − r a`.
    pub tip: Vec3,
    /// Unit tool axis a, from the tip toward the spindle.
    pub axis: Vec3,
    /// Unit tangent of the centre path (in the direction of travel).
    pub tangent: Vec3,
    /// d s_centre / d s: the centre path's speed relative to the contact path's (> 0).
    pub speed_ratio: f64,
    /// Curvature κc of the centre path (1/length).
    pub curvature: f64,
    /// dκc/ds_c along the centre path's own arc length (1/length²); `None` when computed from
    /// third-order jets only.
    pub curvature_rate: Option<f64>,
    /// Torsion τc of the centre path (1/length; 0 where κc = 0); `None` from third order.
    pub torsion: Option<f64>,
    /// |d³CL/ds_c³| = √((dκc/ds_c)² + κc⁴ + κc² τc²) (1/length²): the jerk at unit speed
    /// along the centre path; `None` from third order.
    pub jerk_figure: Option<f64>,
    /// Angular rate of the axis per unit length of the centre path, |ω × a| / (ds_c/ds)
    /// (radians/length).
    pub axis_rate: f64,
}

/// The cutter-location point CL = c + r n_t + R e at the frame `f` (see the module docs):
/// the same point as [`CentrePoint::centre`], from the frame alone (second-order jets), for
/// hosts and samplers that need the position only.
///
/// Errors: those of [`ToolSetup::validate`] and of the tool axis.
pub fn centre_of_frame(f: &DarbouxFrame, setup: &ToolSetup) -> Result<Vec3> {
    setup.validate()?;
    let (d, _, _) = offset_and_axis(f, setup)?;
    Ok(f.point + (f.t * d.x + f.b * d.y + f.n * d.z))
}

/// The tool-centre path at a sample with frame `f` (from the second-order path) and the
/// surface's and curve's partials there, of order 3 (position, axis, tangent, speed ratio,
/// curvature) or 4 (also the curvature's rate of change and the torsion). At order 3 the
/// closed forms of `centre_from_rates` from the rates of [`invariant_rates`] (ω and dω/ds in
/// frame components); at order 4 the series route of the module's description.
///
/// Errors: those of [`ToolSetup::validate`]; `OrderUnavailable` when a partial order is
/// below 3; [`StrakeError::CentrePathFolds`] (index 0) where the component of dCL/ds along
/// T is below [`FOLD_LIMIT`]; `NonFinite` (result) on overflow.
pub fn centre_point(
    f: &DarbouxFrame,
    surface: &SurfacePartials,
    curve: &CurvePartials,
    orientation: Orientation,
    setup: &ToolSetup,
    t: f64,
) -> Result<CentrePoint> {
    setup.validate()?;
    let order = surface.order.min(curve.order);
    if order < 3 {
        let (which, available) = if surface.order < 3 {
            ("surface", surface.order)
        } else {
            ("curve", curve.order)
        };
        return Err(StrakeError::OrderUnavailable {
            which,
            needed: 3,
            available,
        });
    }
    let order = order.min(4);
    // Frame components of the offset and of the axis.
    let (d, a, axis) = offset_and_axis(f, setup)?;
    let (_, r) = setup.cutter.torus_radii();
    // dCL/ds = T + ω × d in frame components.
    let omega = Vec3::new(
        f.geodesic_torsion,
        -f.normal_curvature,
        f.geodesic_curvature,
    );
    let p1 = Vec3::new(1.0, 0.0, 0.0) + omega.cross(&d);
    if p1.x.is_nan() || p1.x < FOLD_LIMIT {
        return Err(StrakeError::CentrePathFolds {
            index: 0,
            t,
            speed_along: p1.x,
            count: 1,
        });
    }
    if order == 3 {
        let r = invariant_rates(f, surface, curve, orientation)?;
        return centre_from_rates(f, &r, setup, t);
    }
    let to_space = |x: Vec3| f.t * x.x + f.b * x.y + f.n * x.z;
    let centre = f.point + to_space(d);
    let tip = centre - axis * r;
    let axis_rate_contact = omega.cross(&a).norm();
    // Exact derivatives in t from the series of the frame.
    let ps = path_series(surface, curve, orientation, order);
    let cl =
        ps.c.add(&ps.t.scale(d.x))
            .add(&ps.b.scale(d.y))
            .add(&ps.n.scale(d.z));
    let x1 = cl.deriv();
    let x2 = x1.deriv();
    let x3 = x2.deriv();
    let (v1, v2) = (x1.coef(0), x2.coef(0));
    let sc = v1.norm();
    let speed_ratio = sc / ps.speed.0[0];
    let tangent = v1 / sc;
    let cr = v1.cross(&v2);
    let crn = cr.norm();
    let q = sc * sc;
    let curvature = crn / (q * sc);
    let (mut rate, mut torsion, mut jerk) = (None, None, None);
    if order >= 4 {
        let v3 = x3.coef(0);
        let dcr = v1.cross(&v3);
        let dq = 2.0 * v1.dot(&v2);
        let dk_dt = if crn > 0.0 {
            cr.dot(&dcr) / crn / (q * sc) - 1.5 * crn * dq / (q * q * sc)
        } else {
            dcr.norm() / (q * sc)
        };
        let k1 = dk_dt / sc;
        let tau = if crn > 0.0 {
            cr.dot(&v3) / (crn * crn)
        } else {
            0.0
        };
        rate = Some(k1);
        torsion = Some(tau);
        jerk = Some((k1 * k1 + curvature.powi(4) + (curvature * tau).powi(2)).sqrt());
    }
    let p = CentrePoint {
        centre,
        tip,
        axis,
        tangent,
        speed_ratio,
        curvature,
        curvature_rate: rate,
        torsion,
        jerk_figure: jerk,
        axis_rate: axis_rate_contact / speed_ratio,
    };
    let scalars = [
        ("centre speed ratio", Some(p.speed_ratio)),
        ("centre curvature", Some(p.curvature)),
        ("centre curvature rate", p.curvature_rate),
        ("centre torsion", p.torsion),
        ("axis rate", Some(p.axis_rate)),
        ("centre", Some(p.centre.norm())),
        ("centre tangent", Some(p.tangent.norm())),
    ];
    for (what, value) in scalars {
        if let Some(value) = value {
            if !value.is_finite() {
                return Err(StrakeError::NonFinite {
                    source: NonFiniteSource::Result,
                    what,
                    value,
                });
            }
        }
    }
    Ok(p)
}

/// The offset d = CL − c in frame components (T, B, N) and the axis a in frame components,
/// for the setup at frame `f` (see the module's formulas).
fn offset_and_axis(f: &DarbouxFrame, setup: &ToolSetup) -> Result<(Vec3, Vec3, Vec3)> {
    let axis = tool_axis(f, setup.side, &setup.angles)?.space;
    let a = Vec3::new(axis.dot(&f.t), axis.dot(&f.b), axis.dot(&f.n));
    let nt = Vec3::new(0.0, 0.0, setup.side.sign());
    let (big_r, r) = setup.cutter.torus_radii();
    let perp = nt - a * nt.dot(&a);
    let perp_len = perp.norm();
    let mut d = nt * r;
    if big_r > 0.0 && perp_len > 0.0 {
        d += perp * (big_r / perp_len);
    }
    Ok((d, a, axis))
}

/// The tool-centre path at a sample from its frame and the rates of change of its
/// invariants ([`crate::geometry::rates`]), to third order (no curvature rate, torsion or
/// jerk figure): closed forms in frame components. With ω = (τg, −κn, κg) and
/// ω' = dω/ds = (dτg/ds, −dκn/ds, dκg/ds), dCL/ds = F y with y = e₁ + ω × d, and
/// d²CL/ds² = F z with z = ω' × d + ω × y (d is constant in the frame); so the speed ratio is
/// |y|, the tangent F y / |y| and the curvature |y × z| / |y|³ (do Carmo §1-5, any
/// parameter). The same quantities as the series route of order 4, to round-off (tested).
///
/// Errors: those of [`ToolSetup::validate`] and [`tool_axis`];
/// [`StrakeError::CentrePathFolds`] (index 0) where y·e₁ < [`FOLD_LIMIT`]; `NonFinite`
/// (result) on overflow.
pub(crate) fn centre_from_rates(
    f: &DarbouxFrame,
    rates: &InvariantRates,
    setup: &ToolSetup,
    t: f64,
) -> Result<CentrePoint> {
    setup.validate()?;
    let (d, a, axis) = offset_and_axis(f, setup)?;
    let (_, r) = setup.cutter.torus_radii();
    let omega = Vec3::new(
        f.geodesic_torsion,
        -f.normal_curvature,
        f.geodesic_curvature,
    );
    let y = Vec3::new(1.0, 0.0, 0.0) + omega.cross(&d);
    if y.x.is_nan() || y.x < FOLD_LIMIT {
        return Err(StrakeError::CentrePathFolds {
            index: 0,
            t,
            speed_along: y.x,
            count: 1,
        });
    }
    let domega = Vec3::new(
        rates.geodesic_torsion,
        -rates.normal_curvature,
        rates.geodesic_curvature,
    );
    let z = domega.cross(&d) + omega.cross(&y);
    let to_space = |x: Vec3| f.t * x.x + f.b * x.y + f.n * x.z;
    let centre = f.point + to_space(d);
    let sc = y.norm();
    let p = CentrePoint {
        centre,
        tip: centre - axis * r,
        axis,
        tangent: to_space(y / sc),
        speed_ratio: sc,
        curvature: y.cross(&z).norm() / (sc * sc * sc),
        curvature_rate: None,
        torsion: None,
        jerk_figure: None,
        axis_rate: omega.cross(&a).norm() / sc,
    };
    for (what, value) in [
        ("centre speed ratio", p.speed_ratio),
        ("centre curvature", p.curvature),
        ("axis rate", p.axis_rate),
        ("centre", p.centre.norm()),
        ("centre tangent", p.tangent.norm()),
    ] {
        if !value.is_finite() {
            return Err(StrakeError::NonFinite {
                source: NonFiniteSource::Result,
                what,
                value,
            });
        }
    }
    Ok(p)
}

/// The tool-centre path at each of `ts` into `out` (same length), from partials of `order`
/// (3: no curvature rate, torsion or jerk figure; 4: all). The frame at each sample is that of
/// [`CurveOnSurface::frame`]; span hints are carried along, nothing is allocated. At order 3
/// the frames and the rates come from the third-order batch
/// ([`CurveOnSurface::frames_with_rates_at`], 64 samples at a time) and the centre point from
/// the closed forms [`centre_point`] uses at order 3 (agreeing with it to round-off: its
/// rates come from the surface's partials, whose second-order entries may differ from the
/// jets' by a few units in the last place); at order 4 one sample at a time. On a crease of
/// the surface every partial is that of the side the curve moves into, as the frame's
/// ([`CurveOnSurface::partials_at`]).
///
/// Errors, naming the sample: those of [`CurveOnSurface::frame_and_partials`] and
/// [`centre_point`]; where the centre path folds back, [`StrakeError::CentrePathFolds`]
/// for the first folding sample with the number of folding samples in the whole call (the
/// call goes on through the path to count them; `out` is then partly written). `order`
/// other than 3 or 4 is refused (`InvalidArgument`).
pub fn centre_path_at<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    path: &CurveOnSurface<'_, S, C>,
    ts: &[f64],
    setup: &ToolSetup,
    order: usize,
    out: &mut [CentrePoint],
) -> std::result::Result<(), SampleError> {
    let fail = |index: usize, t: f64, error| SampleError { index, t, error };
    if ts.len() != out.len() || !(order == 3 || order == 4) {
        return Err(fail(
            0,
            f64::NAN,
            StrakeError::InvalidArgument(format!(
                "{} parameters, room for {} centre points, order {order}: need equal counts and order 3 or 4",
                ts.len(),
                out.len()
            )),
        ));
    }
    setup.validate().map_err(|e| fail(0, f64::NAN, e))?;
    if order == 3 {
        return centre_path_third(path, ts, setup, out);
    }
    let mut hints = Hints::default();
    let orientation = path.surface().orientation();
    let mut first_fold: Option<(usize, f64, f64)> = None;
    let mut folds = 0;
    for (index, (&t, o)) in ts.iter().zip(out.iter_mut()).enumerate() {
        let (f, sp, cp) = path
            .frame_and_partials(t, order, &mut hints)
            .map_err(|e| fail(index, t, e))?;
        match centre_point(&f, &sp, &cp, orientation, setup, t) {
            Ok(p) => *o = p,
            Err(StrakeError::CentrePathFolds { speed_along, .. }) => {
                folds += 1;
                first_fold.get_or_insert((index, t, speed_along));
            }
            Err(e) => return Err(fail(index, t, e)),
        }
    }
    if let Some((index, t, speed_along)) = first_fold {
        return Err(fail(
            index,
            t,
            StrakeError::CentrePathFolds {
                index,
                t,
                speed_along,
                count: folds,
            },
        ));
    }
    Ok(())
}

/// [`centre_path_at`] at order 3: frames and rates by the third-order batch
/// ([`CurveOnSurface::frames_with_rates_at`], a chunk of samples at a time on the stack),
/// then [`centre_from_rates`] per sample; folds counted through the whole path.
fn centre_path_third<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    path: &CurveOnSurface<'_, S, C>,
    ts: &[f64],
    setup: &ToolSetup,
    out: &mut [CentrePoint],
) -> std::result::Result<(), SampleError> {
    const PIECE: usize = 64;
    let Some(&t0) = ts.first() else {
        return Ok(());
    };
    // Any frame fills the scratch (the batch overwrites it); sample 0's fails as the batch
    // would fail there.
    let f0 = path
        .frame(t0, &mut Hints::default())
        .map_err(|error| SampleError {
            index: 0,
            t: t0,
            error,
        })?;
    let mut frames = [f0; PIECE];
    let mut rates = [InvariantRates::default(); PIECE];
    let mut first_fold: Option<(usize, f64, f64)> = None;
    let mut folds = 0;
    for (k, (tp, op)) in ts.chunks(PIECE).zip(out.chunks_mut(PIECE)).enumerate() {
        let base = k * PIECE;
        let n = tp.len();
        path.frames_with_rates_at(tp, &mut frames[..n], &mut rates[..n])
            .map_err(|e| SampleError {
                index: base + e.index,
                ..e
            })?;
        for (i, o) in op.iter_mut().enumerate() {
            let (index, t) = (base + i, tp[i]);
            match centre_from_rates(&frames[i], &rates[i], setup, t) {
                Ok(p) => *o = p,
                Err(StrakeError::CentrePathFolds { speed_along, .. }) => {
                    folds += 1;
                    first_fold.get_or_insert((index, t, speed_along));
                }
                Err(error) => return Err(SampleError { index, t, error }),
            }
        }
    }
    if let Some((index, t, speed_along)) = first_fold {
        return Err(SampleError {
            index,
            t,
            error: StrakeError::CentrePathFolds {
                index,
                t,
                speed_along,
                count: folds,
            },
        });
    }
    Ok(())
}
