//! The plain C structs of the ABI: jets in, frames out, the parameter scales; samples,
//! projections; the inputs and results of the checks; and the enums whose values some
//! arguments take.

use crate::checks::summary::PathPosition;
use crate::checks::tool_axis::ToolAxis;
use crate::checks::{
    CutterRadii, CutterStepOver, Extremes, FibreState, GougeState, RearGouge, TowEdges, Violation,
};
use crate::error::{NonFiniteSource, StrakeError};
use crate::geometry::frame::{Conditioning, DarbouxFrame, ParamScales};
use crate::geometry::jet::{CurveJet, SurfaceJet};
use crate::geometry::math::{arr3, vec3};
use crate::geometry::principal::PrincipalCurvatures;
use crate::paths::curve_on_surface::PathSample;
use crate::paths::projection::Projection;

/// A surface point S(u, v) with its partial derivatives, filled by a host surface callback
/// (or passed to `strake_frame_from_jets`). Each entry is an (x, y, z) triple in the host's
/// length unit per power of the surface parameters. strake sets every entry to zero before it
/// calls the host, so entries above the requested order may be left alone.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeSurfaceJet {
    /// The point S(u, v).
    pub p: [f64; 3],
    /// dS/du (needed for order >= 1).
    pub su: [f64; 3],
    /// dS/dv (needed for order >= 1).
    pub sv: [f64; 3],
    /// d2S/du2 (needed for order 2).
    pub suu: [f64; 3],
    /// d2S/dudv (needed for order 2).
    pub suv: [f64; 3],
    /// d2S/dv2 (needed for order 2).
    pub svv: [f64; 3],
}

impl From<&StrakeSurfaceJet> for SurfaceJet {
    #[inline]
    fn from(j: &StrakeSurfaceJet) -> Self {
        SurfaceJet {
            p: vec3(j.p),
            su: vec3(j.su),
            sv: vec3(j.sv),
            suu: vec3(j.suu),
            suv: vec3(j.suv),
            svv: vec3(j.svv),
        }
    }
}

/// A point (u(t), v(t)) of a curve in the surface's parameter plane with its first and second
/// derivatives with respect to the curve parameter t; filled by a host curve callback (or
/// passed to `strake_frame_from_jets`). strake zeroes it before calling the host.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeCurveJet {
    /// u(t).
    pub u: f64,
    /// v(t).
    pub v: f64,
    /// du/dt.
    pub du: f64,
    /// dv/dt.
    pub dv: f64,
    /// d2u/dt2.
    pub ddu: f64,
    /// d2v/dt2.
    pub ddv: f64,
}

impl From<&StrakeCurveJet> for CurveJet {
    fn from(j: &StrakeCurveJet) -> Self {
        CurveJet {
            u: j.u,
            v: j.v,
            du: j.du,
            dv: j.dv,
            ddu: j.ddu,
            ddv: j.ddv,
        }
    }
}

/// A point (u(t), v(t)) of a curve in the surface's parameter plane with its derivatives with
/// respect to the curve parameter t to fourth order, filled by a host callback of
/// `strake_curve_from_high_callback`. The first six entries are those of `StrakeCurveJet`, in
/// the same order. strake sets every entry to zero before it calls the host, so entries above
/// the requested order may be left alone.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeCurveHighJet {
    /// u(t).
    pub u: f64,
    /// v(t).
    pub v: f64,
    /// du/dt (order >= 1).
    pub du: f64,
    /// dv/dt (order >= 1).
    pub dv: f64,
    /// d2u/dt2 (order >= 2).
    pub ddu: f64,
    /// d2v/dt2 (order >= 2).
    pub ddv: f64,
    /// d3u/dt3 (order >= 3).
    pub d3u: f64,
    /// d3v/dt3 (order >= 3).
    pub d3v: f64,
    /// d4u/dt4 (order 4).
    pub d4u: f64,
    /// d4v/dt4 (order 4).
    pub d4v: f64,
}

impl StrakeCurveHighJet {
    /// The second-order part, as the Rust jet.
    pub fn jet(&self) -> CurveJet {
        CurveJet {
            u: self.u,
            v: self.v,
            du: self.du,
            dv: self.dv,
            ddu: self.ddu,
            ddv: self.ddv,
        }
    }

    /// The derivatives of the Rust API to `order` (≤ 4; entries above it zero).
    pub fn partials(&self, order: usize) -> crate::geometry::jet::CurvePartials {
        let mut p = crate::geometry::jet::CurvePartials {
            order,
            u: [self.u, self.du, self.ddu, self.d3u, self.d4u],
            v: [self.v, self.dv, self.ddv, self.d3v, self.d4v],
        };
        for k in order + 1..p.u.len() {
            p.u[k] = 0.0;
            p.v[k] = 0.0;
        }
        p
    }
}

/// The widths of the parameter domains, for `strake_frame_from_jets`: degeneracy is judged
/// relative to them (a surface point is degenerate when |Su x Sv| is small against |Su| u_extent
/// and |Sv| v_extent; a curve stalls when (du/u_extent, dv/v_extent) t_extent is small). Each
/// must be positive and finite. With handles strake takes them from the domains.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct StrakeParamScales {
    /// Width of the surface's u domain (u_max - u_min).
    pub u_extent: f64,
    /// Width of the surface's v domain (v_max - v_min).
    pub v_extent: f64,
    /// Width of the curve's t domain (t_max - t_min).
    pub t_extent: f64,
}

impl From<&StrakeParamScales> for ParamScales {
    fn from(s: &StrakeParamScales) -> Self {
        ParamScales {
            u_extent: s.u_extent,
            v_extent: s.v_extent,
            t_extent: s.t_extent,
        }
    }
}

/// The Darboux frame of the curve on the surface at one point, its invariants, and the
/// surface's principal curvatures there.
///
/// Conventions: c(t) = S(u(t), v(t)); N = +-(Su x Sv)/|Su x Sv| (minus when the surface was
/// created with flip_normal = 1); T = c'/|c'|; B = N x T, so (T, B, N) is right-handed
/// (T x B = N) and B points to the left of the direction of travel when seen from the side N
/// points to. Lengths are in the host's unit, curvatures in 1/length, torsion in
/// radians/length. A curvature is positive when the curve or the surface bends toward N
/// (a sphere with N pointing inward has k1 = k2 = +1/R).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeFrame {
    /// The curve parameter t of this sample (0 for `strake_frame_from_jets`).
    pub curve_param: f64,
    /// Surface parameter u of the point.
    pub u: f64,
    /// Surface parameter v of the point.
    pub v: f64,
    /// The point c(t) = S(u, v) (host length unit).
    pub point: [f64; 3],
    /// T: unit tangent, in the direction of increasing t.
    pub tangent: [f64; 3],
    /// B = N x T: unit vector in the tangent plane, to the left of T seen from N.
    pub side: [f64; 3],
    /// N: unit surface normal (orientation as chosen at creation).
    pub normal: [f64; 3],
    /// Normal curvature kn = c''.N/|c'|^2 (1/length): positive when the path bends toward N.
    pub normal_curvature: f64,
    /// Geodesic curvature kg = c''.B/|c'|^2 (1/length): positive when the path turns toward B
    /// (to the left seen from N); 0 along a geodesic. Flips with the direction of travel and
    /// with N.
    pub geodesic_curvature: f64,
    /// Geodesic torsion tg = II(T, B) (radians/length): the rate at which N turns about T as
    /// the path advances (dN/ds = -kn T - tg B); 0 along a line of curvature. Independent of the
    /// sign of N.
    pub geodesic_torsion: f64,
    /// Speed |c'| = ds/dt (length per unit t).
    pub speed: f64,
    /// Larger principal curvature k1 of the surface (1/length, sign as kn).
    pub k1: f64,
    /// Smaller principal curvature k2 <= k1.
    pub k2: f64,
    /// Unit principal direction of k1 (tangent to the surface). At an umbilic (k1 = k2) every
    /// direction is principal and this is Su/|Su|.
    pub dir1: [f64; 3],
    /// Unit principal direction of k2: N x dir1.
    pub dir2: [f64; 3],
    /// Mean curvature H = (k1 + k2)/2 (1/length).
    pub mean_curvature: f64,
    /// Gaussian curvature K = k1 k2 (1/length^2).
    pub gaussian_curvature: f64,
    /// How far the surface point is from degenerate: |Su x Sv| u_extent v_extent /
    /// max(|Su| u_extent, |Sv| v_extent)^2, in (0, 1]; 1 is ideal; results lose about
    /// -log10 of it digits. Dimensionless.
    pub surface_conditioning: f64,
    /// How far the curve is from stalling: hypot(du/u_extent, dv/v_extent) t_extent, about 1
    /// for a curve that crosses the surface once over its domain. Dimensionless.
    pub curve_speed_figure: f64,
}

impl StrakeFrame {
    /// The C frame for a frame computed at curve parameter `t`.
    #[inline]
    pub fn new(t: f64, f: &DarbouxFrame) -> Self {
        StrakeFrame {
            curve_param: t,
            u: f.u,
            v: f.v,
            point: arr3(&f.point),
            tangent: arr3(&f.t),
            side: arr3(&f.b),
            normal: arr3(&f.n),
            normal_curvature: f.normal_curvature,
            geodesic_curvature: f.geodesic_curvature,
            geodesic_torsion: f.geodesic_torsion,
            speed: f.speed,
            k1: f.principal.k1,
            k2: f.principal.k2,
            dir1: arr3(&f.principal.d1),
            dir2: arr3(&f.principal.d2),
            mean_curvature: f.principal.mean,
            gaussian_curvature: f.principal.gaussian,
            surface_conditioning: f.conditioning.surface,
            curve_speed_figure: f.conditioning.curve,
        }
    }
}

/// Fails with `NonFinite` naming `what` unless every entry of `x` is finite.
fn finite_field(what: &'static str, x: &[f64]) -> Result<(), StrakeError> {
    match x.iter().find(|v| !v.is_finite()) {
        Some(&value) => Err(StrakeError::NonFinite {
            source: NonFiniteSource::Parameter,
            what,
            value,
        }),
        None => Ok(()),
    }
}

/// How far from 1 the length of a unit vector of a frame passed in by the host may be
/// (relative): loose enough for a frame stored in single precision, tight enough to catch a
/// zeroed or half-filled struct.
pub const UNIT_VECTOR_SLACK: f64 = 1e-6;

impl StrakeFrame {
    /// The frame of the Rust API for a frame passed in by the host (to the check functions),
    /// checked: every number must be finite (`NonFinite` naming the field, e.g. "frame.k1"),
    /// and T, B, N, dir1 and dir2 must have unit length to [`UNIT_VECTOR_SLACK`]
    /// (`InvalidArgument` naming the field). The one place where a C frame becomes a
    /// [`DarbouxFrame`] again.
    pub fn to_darboux(&self) -> Result<DarbouxFrame, StrakeError> {
        let scalars: [(&'static str, f64); 16] = [
            ("frame.curve_param", self.curve_param),
            ("frame.u", self.u),
            ("frame.v", self.v),
            ("frame.normal_curvature", self.normal_curvature),
            ("frame.geodesic_curvature", self.geodesic_curvature),
            ("frame.geodesic_torsion", self.geodesic_torsion),
            ("frame.speed", self.speed),
            ("frame.k1", self.k1),
            ("frame.k2", self.k2),
            ("frame.mean_curvature", self.mean_curvature),
            ("frame.gaussian_curvature", self.gaussian_curvature),
            ("frame.surface_conditioning", self.surface_conditioning),
            ("frame.curve_speed_figure", self.curve_speed_figure),
            ("frame.point.x", self.point[0]),
            ("frame.point.y", self.point[1]),
            ("frame.point.z", self.point[2]),
        ];
        for (what, x) in scalars {
            finite_field(what, &[x])?;
        }
        let units: [(&'static str, &[f64; 3]); 5] = [
            ("frame.tangent", &self.tangent),
            ("frame.side", &self.side),
            ("frame.normal", &self.normal),
            ("frame.dir1", &self.dir1),
            ("frame.dir2", &self.dir2),
        ];
        for (what, x) in units {
            finite_field(what, x)?;
            let len = vec3(*x).norm();
            if (len - 1.0).abs() > UNIT_VECTOR_SLACK {
                return Err(StrakeError::InvalidArgument(format!(
                    "{what} = {} has length {}; it must be a unit vector (pass a \
                     frame computed by strake)",
                    crate::numfmt::ExactVec(&x[..]),
                    crate::numfmt::Num(len)
                )));
            }
        }
        Ok(DarbouxFrame {
            u: self.u,
            v: self.v,
            point: vec3(self.point),
            t: vec3(self.tangent),
            b: vec3(self.side),
            n: vec3(self.normal),
            normal_curvature: self.normal_curvature,
            geodesic_curvature: self.geodesic_curvature,
            geodesic_torsion: self.geodesic_torsion,
            speed: self.speed,
            principal: PrincipalCurvatures {
                k1: self.k1,
                k2: self.k2,
                d1: vec3(self.dir1),
                d2: vec3(self.dir2),
                mean: self.mean_curvature,
                gaussian: self.gaussian_curvature,
            },
            conditioning: Conditioning {
                surface: self.surface_conditioning,
                curve: self.curve_speed_figure,
            },
        })
    }
}

/// One sample of a path, from the sampling functions (`strake_sample_even_t`,
/// `strake_sample_even_arc`, `strake_sample_chordal`): the frame (whose `curve_param` is the
/// sample's t) and the arc length along the curve on the surface from the start of the
/// curve's domain to the sample (host length unit).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeSample {
    /// The frame at the sample; `frame.curve_param` is its curve parameter t.
    pub frame: StrakeFrame,
    /// Arc length from the start of the curve to this sample (host length unit).
    pub arc_length: f64,
}

impl StrakeSample {
    /// The C sample for a sample of the Rust API.
    pub fn new(s: &PathSample) -> Self {
        StrakeSample {
            frame: StrakeFrame::new(s.t, &s.frame),
            arc_length: s.arc_length,
        }
    }
}

impl PathPosition for StrakeSample {
    #[inline]
    fn t(&self) -> f64 {
        self.frame.curve_param
    }
    #[inline]
    fn arc_length(&self) -> f64 {
        self.arc_length
    }
}

/// How interpolation places the curve parameters of the points: the values of the
/// `parametrization` argument of the interpolating constructors.
#[repr(u32)]
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum StrakeParametrization {
    /// 0: chord length, parameter steps proportional to the distances between consecutive
    /// points (The NURBS Book eq. 9.5); the accurate choice for smooth data.
    ChordLength = 0,
    /// 1: centripetal, steps proportional to the square roots of the distances (eq. 9.6);
    /// gentler on sharp turns of the data.
    Centripetal = 1,
}

/// Options of point projection (point inversion onto a surface), for the functions that take
/// points in space.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct StrakeProjectionOptions {
    /// The largest accepted distance from a point to the surface (host length unit); positive,
    /// or INFINITY to accept any distance. A point farther away gives
    /// `STRAKE_STATUS_TOO_FAR_FROM_SURFACE`.
    pub tolerance: f64,
    /// 1 when the surface closes across u = u_min / u_max (a seam, e.g. around a cylinder), so
    /// that a path may cross it; 0 otherwise.
    pub periodic_u: i32,
    /// 1 when the surface closes across v = v_min / v_max; 0 otherwise.
    pub periodic_v: i32,
    /// Cells per direction of the coarse search grid that finds the first foot point: 0 for the
    /// default (16), else 2 to 1000.
    pub grid: u32,
    /// Newton iterations per start: 0 for the default (40), else 1 to 1000.
    pub max_iterations: u32,
}

/// Where a point in space lands on the surface.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeProjection {
    /// Surface parameter u of the foot point (inside the u domain).
    pub u: f64,
    /// Surface parameter v of the foot point.
    pub v: f64,
    /// The foot point S(u, v).
    pub foot: [f64; 3],
    /// Distance |S(u, v) - P| from the point to its foot point (host length unit).
    pub distance: f64,
    /// Signed distance (P - S).N: positive when the point lies on the side N points to.
    pub signed_distance: f64,
}

impl From<&Projection> for StrakeProjection {
    fn from(p: &Projection) -> Self {
        StrakeProjection {
            u: p.u,
            v: p.v,
            foot: arr3(&p.foot),
            distance: p.distance,
            signed_distance: p.signed_distance,
        }
    }
}

/// The side of the surface the tool is on: the values of the `tool_side` argument of the
/// checks.
#[repr(u32)]
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum StrakeToolSide {
    /// 0: on the side the surface normal N points to.
    AlongNormal = 0,
    /// 1: on the side opposite to N.
    AgainstNormal = 1,
}

/// The kinds of milling cutter: the values of `StrakeCutter.kind`.
#[repr(u32)]
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum StrakeCutterKind {
    /// 0: ball-end mill of radius `radius`.
    Ball = 0,
    /// 1: flat-end mill of radius `radius`.
    Flat = 1,
    /// 2: toroidal (bull-nose) mill of radius `radius` (axis to the outermost point of the
    /// cutting edge) and corner radius `corner_radius`.
    Toroidal = 2,
}

/// A milling cutter's shape (host length unit). Every cutter is a torus swept about the tool
/// axis: a corner circle of radius r whose centre lies at R from the axis (ball: R = 0,
/// r = radius; flat: R = radius, r = 0; toroidal: R = radius - corner_radius,
/// r = corner_radius).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeCutter {
    /// One of the `STRAKE_CUTTER_KIND_...` values.
    pub kind: u32,
    /// Tool radius, positive and finite.
    pub radius: f64,
    /// Corner radius of a toroidal cutter, 0 < corner_radius <= radius; ignored for ball and
    /// flat cutters.
    pub corner_radius: f64,
}

/// Lead and tilt angles of the tool axis (radians, each strictly inside (-pi/2, pi/2)).
///
/// The axis a (from the cutter tip toward the spindle) is
/// a = sin(lead) T + cos(lead) sin(tilt) b_t + cos(lead) cos(tilt) n_t, in the tool-side frame:
/// n_t = N when the tool is on the N side and -N otherwise, b_t = n_t x T (B on the N side, -B
/// on the other): lead leans the axis from the tool-side normal toward the feed direction T,
/// tilt then toward b_t, the left of travel seen from the tool, whichever side it is on. Both
/// 0: the axis along the tool-side normal. (Changed: tilt used to lean toward B on both
/// sides.)
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeToolAngles {
    /// Lead angle (radians): toward the feed direction T.
    pub lead: f64,
    /// Tilt angle (radians): toward b_t = n_t x T (left of travel seen from the tool).
    pub tilt: f64,
}

/// The local gouge situation of a cutter at one sample (second-order contact). Curvatures in
/// 1/length, radii in the host's length unit; "concave" means bending toward the tool.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeGougeState {
    /// Largest curvature of the surface concave toward the tool, max(s k1, s k2) with s = +1
    /// for a tool on the N side, -1 otherwise; <= 0 where the surface bends away from the tool
    /// in every direction.
    pub concave_curvature: f64,
    /// Smallest concave radius of curvature 1/concave_curvature: the largest ball-end radius
    /// free of local gouging. INFINITY when concave_curvature <= 0.
    pub concave_radius: f64,
    /// Effective cutting radius across the direction in which the axis is inclined by beta
    /// from the tool-side normal: R/sin(beta) + r (the ball radius for a ball-end mill;
    /// INFINITY for a flat or toroidal cutter with its axis along the normal). Across the path
    /// only for pure lead: scallop and step-over need `StrakeCutterRadii.across_path`
    /// (`strake_cutter_radii`).
    pub effective_radius_cross: f64,
    /// Effective cutting radius along the inclination: the corner radius r (0 for a flat-end
    /// mill).
    pub effective_radius_along: f64,
    /// Smallest eigenvalue of (cutter curvature - surface curvature toward the tool) over the
    /// tangent directions (1/length); negative means local gouging.
    pub margin: f64,
    /// 1 when the cutter gouges locally (margin below zero beyond round-off) or at the rear
    /// (the bottom or the heel inside the material, see `strake_check_rear_gouge`), else 0.
    /// (Changed: it used to see local gouging only.)
    pub gouges: i32,
    /// 1 when some lead angle in [0, pi/2) avoids local and rear gouging at the given tilt; 0
    /// when none does (the cutter is too large for the concavity whatever its inclination).
    pub has_min_lead: i32,
    /// The smallest such lead angle (radians) when has_min_lead is 1; 0 otherwise. (Changed:
    /// it used to avoid local gouging only, which let the heel of a flat or toroidal cutter
    /// into the material.)
    pub min_lead: f64,
}

impl From<&GougeState> for StrakeGougeState {
    fn from(g: &GougeState) -> Self {
        StrakeGougeState {
            concave_curvature: g.concave_curvature,
            concave_radius: g.concave_radius,
            effective_radius_cross: g.effective_radius_cross,
            effective_radius_along: g.effective_radius_along,
            margin: g.margin,
            gouges: i32::from(g.gouges),
            has_min_lead: i32::from(g.min_lead.is_some()),
            min_lead: g.min_lead.unwrap_or(0.0),
        }
    }
}

/// Scallop height left between adjacent passes of a cutter at one sample.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeScallop {
    /// Curvature of the surface across the path, concave toward the tool:
    /// kappa = s kn(B) (1/length; positive where the surface bends toward the tool).
    pub cross_curvature: f64,
    /// Exact scallop height (circle geometry in the plane across the path; host length unit).
    pub height: f64,
    /// The approximation (w^2/8)(1/r - kappa).
    pub height_approx: f64,
}

/// The largest step-over for a target scallop height at one sample.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeStepOver {
    /// Curvature across the path, concave toward the tool (as in `StrakeScallop`).
    pub cross_curvature: f64,
    /// The largest step-over (arc length across the path) keeping the exact scallop height at
    /// or below the target.
    pub step_over: f64,
    /// The approximation sqrt(8 h / (1/r - kappa)).
    pub step_over_approx: f64,
}

/// Machine limits of the curvature-limited feed, in one consistent set of units (e.g. mm, s:
/// feed in mm/s, acceleration in mm/s^2, jerk in mm/s^3).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeFeedLimits {
    /// Programmed (largest) feed; positive and finite.
    pub feed: f64,
    /// Largest acceleration normal to the path; positive and finite.
    pub max_acceleration: f64,
    /// Largest jerk; positive and finite, or 0 for none (jerk not limited).
    pub max_jerk: f64,
}

/// Limits of a fibre course (host length unit).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeFibreLimits {
    /// Tow (or tape) width; positive and finite.
    pub tow_width: f64,
    /// Smallest admissible steering radius; positive and finite.
    pub min_steering_radius: f64,
    /// Largest admissible twist rate |tg| (radians per length); positive and finite.
    pub max_twist_rate: f64,
}

/// Steering and twist of a fibre course at one sample.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeFibreState {
    /// Steering curvature |kg| (1/length): the in-plane bending of the tow.
    pub steering_curvature: f64,
    /// Steering radius 1/|kg| (INFINITY along a geodesic, the unsteered path).
    pub steering_radius: f64,
    /// The larger tow-edge strain magnitude, max(|e_left|, |e_right|) of `StrakeTowEdges`
    /// (dimensionless), including the Gaussian-curvature term. (Changed: it was (w/2)|kg|,
    /// which reads 0 along a great circle of a sphere where both edges shorten.)
    pub edge_strain: f64,
    /// Twist rate tg (radians per length, signed): how fast the tangent plane turns about the
    /// course.
    pub twist_rate: f64,
    /// 1 when the steering radius is below the minimum, else 0.
    pub steering_violated: i32,
    /// 1 when |tg| exceeds the largest twist rate, else 0.
    pub twist_violated: i32,
}

impl From<&FibreState> for StrakeFibreState {
    fn from(f: &FibreState) -> Self {
        StrakeFibreState {
            steering_curvature: f.steering_curvature,
            steering_radius: f.steering_radius,
            edge_strain: f.edge_strain,
            twist_rate: f.twist_rate,
            steering_violated: i32::from(f.steering_violated),
            twist_violated: i32::from(f.twist_violated),
        }
    }
}

/// The tool axis at one sample (unit vector from the cutter tip toward the spindle).
///
/// Changed: the components were along (T, B, N) in a field `darboux`; they are now along the
/// tool-side frame (T, b_t, n_t) in `local` (n_t = N and b_t = B on the N side, n_t = -N and
/// b_t = -B on the other side), and the tilt leans toward b_t.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeToolAxis {
    /// Components along the tool-side frame (T, b_t, n_t): (sin(lead), cos(lead) sin(tilt),
    /// cos(lead) cos(tilt)).
    pub local: [f64; 3],
    /// The axis in space: the three components above times T, B and N, summed.
    pub space: [f64; 3],
}

impl From<&ToolAxis> for StrakeToolAxis {
    fn from(a: &ToolAxis) -> Self {
        StrakeToolAxis {
            local: a.local,
            space: arr3(&a.space),
        }
    }
}

/// Where a per-sample quantity is smallest and largest along a path (the first sample on
/// ties).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeExtremes {
    /// Smallest value.
    pub min: f64,
    /// Index of the sample where it occurs.
    pub min_index: usize,
    /// Arc length there.
    pub min_arc_length: f64,
    /// Curve parameter there.
    pub min_t: f64,
    /// Largest value.
    pub max: f64,
    /// Index of the sample where it occurs.
    pub max_index: usize,
    /// Arc length there.
    pub max_arc_length: f64,
    /// Curve parameter there.
    pub max_t: f64,
}

impl From<&Extremes> for StrakeExtremes {
    fn from(e: &Extremes) -> Self {
        StrakeExtremes {
            min: e.min,
            min_index: e.min_index,
            min_arc_length: e.min_arc_length,
            min_t: e.min_t,
            max: e.max,
            max_index: e.max_index,
            max_arc_length: e.max_arc_length,
            max_t: e.max_t,
        }
    }
}

/// An interval along a path where a per-sample quantity exceeds its limit. Its ends are the
/// crossings of the limit, placed by linear interpolation between the samples on either side
/// (or the first/last sample when the path starts/ends in violation).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeViolation {
    /// Arc length where the violation starts.
    pub start_arc_length: f64,
    /// Arc length where it ends.
    pub end_arc_length: f64,
    /// Curve parameter where it starts.
    pub start_t: f64,
    /// Curve parameter where it ends.
    pub end_t: f64,
    /// Index of the first violating sample.
    pub first_index: usize,
    /// Index of the last violating sample.
    pub last_index: usize,
    /// Largest value inside the interval.
    pub worst: f64,
}

impl From<&Violation> for StrakeViolation {
    fn from(v: &Violation) -> Self {
        StrakeViolation {
            start_arc_length: v.start_arc_length,
            end_arc_length: v.end_arc_length,
            start_t: v.start_t,
            end_t: v.end_t,
            first_index: v.first_index,
            last_index: v.last_index,
            worst: v.worst,
        }
    }
}

/// A plane in space with coordinates, for patterns projected along a direction: the pattern
/// point (x, y) is origin + x * x_axis + y * y_axis (host length unit; the axes need not be
/// unit or orthogonal, only independent).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeDrivePlane {
    /// A point of the plane: the pattern's (0, 0).
    pub origin: [f64; 3],
    /// The space vector of one unit of pattern x.
    pub x_axis: [f64; 3],
    /// The space vector of one unit of pattern y.
    pub y_axis: [f64; 3],
}

/// Options of `strake_drive_project`.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct StrakeDriveOptions {
    /// Hit tolerance (largest distance from a hit to its ray when Newton's steps stall),
    /// periodic directions, grid of the tessellation (0: 16) and iteration cap per start
    /// (0: 40).
    pub projection: StrakeProjectionOptions,
    /// Even samples of the pattern to start from (0: 64; else 2..=100000).
    pub samples: u32,
    /// Largest distance from the first hit at an interval's midpoint to the fitted curve
    /// (host length unit; positive).
    pub fit_tolerance: f64,
    /// Width, relative to the pattern's domain, to which the ends of misses and folds are
    /// located (0: 1e-9; else in (0, 0.1]).
    pub locate_tolerance: f64,
}

/// The kinds of pattern interval: the values of `StrakePatternInterval.kind`.
#[repr(u32)]
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum StrakePatternIntervalKind {
    /// 0: the rays miss the surface (within its domain).
    Miss = 0,
    /// 1: the first hit jumps (the image of the pattern breaks between two parts of the
    /// surface: a silhouette, or a nearer sheet appearing).
    Fold = 1,
    /// 2: the rays meet the surface more than once; the first hit along the direction is taken.
    SeveralHits = 2,
}

/// An interval of the pattern's parameter where rays miss, fold or hit more than once.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakePatternInterval {
    /// One of the `STRAKE_PATTERN_INTERVAL_KIND_...` values.
    pub kind: u32,
    /// First pattern parameter of the interval.
    pub start: f64,
    /// Last pattern parameter of the interval.
    pub end: f64,
}

/// The rules for the distance between neighbouring passes: the values of
/// `StrakePassOptions.rule`.
#[repr(u32)]
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum StrakeStepRule {
    /// 0: iso-scallop: each next pass where the ball leaves `scallop_height`, point by point.
    IsoScallop = 0,
    /// 1: each next pass the geodesic distance `step_over` away.
    ConstantStepOver = 1,
}

/// Options of `strake_plan_passes` (host length unit).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakePassOptions {
    /// Radius of the ball-end mill; positive and finite.
    pub ball_radius: f64,
    /// One of the `STRAKE_TOOL_SIDE_...` values.
    pub tool_side: u32,
    /// One of the `STRAKE_STEP_RULE_...` values.
    pub rule: u32,
    /// Target scallop height (rule ISO_SCALLOP); positive and finite.
    pub scallop_height: f64,
    /// Step-over, geodesic distance across the path (rule CONSTANT_STEP_OVER); positive and
    /// finite.
    pub step_over: f64,
    /// A `STRAKE_OFFSET_SIDE_...` value: LEFT (0) lays each next pass to the left of the one
    /// before (toward B = N x T), RIGHT (1) to the right.
    pub advance: u32,
    /// Chord tolerance of the offsets (host length unit; positive): their sampling and fit.
    pub chord_tolerance: f64,
    /// Parameters of each pass at which the step-over is computed (0: 129; else 2..=10000).
    pub distance_samples: u32,
    /// Points of each new pass at which the scallop left is measured (0: 9; else 1..=10000).
    pub scallop_samples: u32,
    /// Most passes, the first included (0: 1000; else 1..=100000).
    pub max_passes: u32,
    /// Most rows beside the first pass (0: no limit, until the surface is covered); a plan
    /// stopped by it is a band around the first pass (`StrakePassSummary.covered` = 0).
    pub max_rows: u32,
    /// 0: plan for the ball of `ball_radius` (`cutter` and `angles` are not read); 1: plan
    /// for `cutter` at `angles` (`ball_radius` is not read). Added after `max_rows`: a host
    /// that zero-initialises the struct keeps the ball.
    pub use_cutter: u32,
    /// The cutter (when `use_cutter` is 1): a flat-end or toroidal cutter spaces iso-scallop
    /// passes by the exact cusp of its two profiles across the path at lead and tilt (the
    /// width it cuts included) and reports the scallop of that cusp at the step-over the
    /// offsets made; a ball-end mill is planned as the ball of its radius.
    pub cutter: StrakeCutter,
    /// Lead and tilt of the axis in each pass's tool-side frame (when `use_cutter` is 1;
    /// radians, each strictly inside (-pi/2, pi/2)).
    pub angles: StrakeToolAngles,
    /// Most surface jets the geodesic traces of the whole plan may evaluate (0: 200000000);
    /// a plan that needs more ends with NOT_CONVERGED naming the pass it was making.
    pub max_jets: u64,
    /// Most surface jets the traces of one offset may evaluate (0: 2000000), each offset
    /// also held to what is left of `max_jets`.
    pub max_offset_jets: u64,
}

/// Totals of a plan of passes.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakePassSummary {
    /// Number of passes, the first included.
    pub count: usize,
    /// Rows of passes, the first pass being row 0.
    pub rows: usize,
    /// Length of the first pass.
    pub first_length: f64,
    /// Length of all passes, the first included.
    pub total_length: f64,
    /// Largest scallop measured between neighbouring passes (0 with a single pass).
    pub scallop_max: f64,
    /// Smallest scallop measured between neighbouring passes (0 with a single pass).
    pub scallop_min: f64,
    /// Points of all the offsets (the output points of the plan).
    pub offset_points: usize,
    /// Surface jets evaluated by the geodesic traces of the offsets.
    pub trace_jets: usize,
    /// 1 when the plan ran until no parallel lay on the surface; 0 when it stopped at
    /// `max_rows` before trying the parallels of its last row.
    pub covered: i32,
    /// Offsets computed, the iso-scallop corrections included (a plan without corrections
    /// makes one per pass that has a neighbour).
    pub offset_attempts: usize,
    /// Probes of the scallop left that could not be measured (the neighbour not beside the
    /// probe: no cusp in the section); their scallop is not in `scallop_max` / `scallop_min`.
    pub unmeasured: usize,
}

/// One pass after the first in a plan of passes.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakePassInfo {
    /// Its row: 1 for the neighbours of the first pass, 2 for theirs, ...
    pub row: usize,
    /// 1 when it was laid beside another pass after the first (index in `parent`), 0 when
    /// beside the first pass.
    pub has_parent: i32,
    /// The index of the pass it was laid beside, when `has_parent` is 1 (else 0).
    pub parent: usize,
    /// Its length on the surface.
    pub length: f64,
    /// Smallest step-over from its parent (geodesic distance).
    pub step_over_min: f64,
    /// Largest step-over from its parent.
    pub step_over_max: f64,
    /// Largest scallop measured between it and its parent.
    pub scallop_max: f64,
    /// Smallest scallop measured between it and its parent.
    pub scallop_min: f64,
    /// Intervals of its parent whose parallel left the surface.
    pub exits: usize,
    /// Intervals of its parent whose parallel looped and was cut.
    pub loops: usize,
}

/// The cutter's radii of curvature at its contact point for given lead and tilt (host length
/// unit), from `strake_cutter_radii`.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeCutterRadii {
    /// Radius of the profile the cutter sweeps across the path (the outline of the cutter seen
    /// along T, at the contact point): r + R sin(lead)^2 / sin(beta)^3, the radius scallop and
    /// step-over need. r for a ball; INFINITY for a flat or toroidal cutter upright (its flat
    /// bottom touches); 0 for a flat cutter tilted without lead (its sharp corner cuts across).
    pub across_path: f64,
    /// Radius of the cutter's normal section in the direction b_t (Euler's formula on the
    /// torus's principal curvatures 1/r and sin(beta)/(R + r sin(beta))).
    pub across_section: f64,
    /// Radius of the cutter's normal section along T.
    pub along_path: f64,
    /// R/sin(beta) + r: normal to the inclination plane (across the path only for pure lead).
    /// r for a ball; INFINITY for a flat or toroidal cutter upright (beta = 0: its flat bottom
    /// touches) and where R/sin(beta) exceeds DBL_MAX.
    pub inclination_plane: f64,
    /// Inclination beta of the axis from the tool-side normal (radians).
    pub inclination: f64,
    /// 1 when the flat bottom (centred on the axis), not the corner, touches: R > 0 and the
    /// axis along the normal; else 0.
    pub flat_bottom_contact: i32,
}

impl From<&CutterRadii> for StrakeCutterRadii {
    fn from(c: &CutterRadii) -> Self {
        StrakeCutterRadii {
            across_path: c.across_path,
            across_section: c.across_section,
            along_path: c.along_path,
            inclination_plane: c.inclination_plane,
            inclination: c.inclination,
            flat_bottom_contact: i32::from(c.flat_bottom_contact),
        }
    }
}

/// Rear (heel) gouging of a flat or toroidal cutter's bottom at one sample.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeRearGouge {
    /// Smallest normalised clearance of the bottom's rim over the surface (dimensionless, like
    /// a sine; negative: inside the material). 1 for a ball-end mill; -DBL_MAX when the corner
    /// does not fit the concavity (the cutter gouges locally anyway).
    pub margin: f64,
    /// Depth of the deepest rim point inside the material (host length unit; 0 when clear).
    pub depth: f64,
    /// Rim angle of the worst point (radians; 0 at the contact point, pi at the heel).
    pub worst_angle: f64,
    /// 1 when the bottom or the heel is inside the material, else 0.
    pub gouges: i32,
}

impl From<&RearGouge> for StrakeRearGouge {
    fn from(g: &RearGouge) -> Self {
        StrakeRearGouge {
            margin: g.margin,
            depth: g.depth,
            worst_angle: g.worst_angle,
            gouges: i32::from(g.gouges),
        }
    }
}

/// The strain of the two edges of a tow or tape centred on a course at one sample
/// (dimensionless; negative = compressed, relative to the centreline).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeTowEdges {
    /// Left edge (y = +w/2, on the B side): -kg w/2 - K w^2/8.
    pub left: f64,
    /// Right edge (y = -w/2): +kg w/2 - K w^2/8.
    pub right: f64,
    /// Steering part (w/2)|kg|.
    pub steering_term: f64,
    /// Gaussian-curvature part -K w^2/8 (both edges).
    pub gaussian_term: f64,
    /// 1 when the left edge is compressed, else 0.
    pub left_compressed: i32,
    /// 1 when the right edge is compressed, else 0.
    pub right_compressed: i32,
}

impl From<&TowEdges> for StrakeTowEdges {
    fn from(t: &TowEdges) -> Self {
        StrakeTowEdges {
            left: t.left,
            right: t.right,
            steering_term: t.steering_term,
            gaussian_term: t.gaussian_term,
            left_compressed: i32::from(t.left_compressed),
            right_compressed: i32::from(t.right_compressed),
        }
    }
}

/// The step-over for a target scallop height with a given cutter and axis at one sample (host
/// length unit), from `strake_check_step_over_cutter`.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeCutterStepOver {
    /// Curvature across the path, concave toward the tool (as in `StrakeScallop`).
    pub cross_curvature: f64,
    /// The step-over to use: min(model, width_limit).
    pub step_over: f64,
    /// Circle-geometry step-over for the swept profile's radius across the path (INFINITY when
    /// that model sets no limit: a flat bottom on a plane, a sharp corner).
    pub model: f64,
    /// The width the cutter cuts at the scallop height (exact on a plane).
    pub width_limit: f64,
    /// The radius across the path used by the model.
    pub radius_across: f64,
    /// 1 when the width limit set the step-over, else 0.
    pub limited_by_width: i32,
}

impl StrakeCutterStepOver {
    /// The C result for a step-over at cross-path curvature `kappa`.
    pub fn new(kappa: f64, c: &CutterStepOver) -> Self {
        StrakeCutterStepOver {
            cross_curvature: kappa,
            step_over: c.step_over,
            model: c.model,
            width_limit: c.width_limit,
            radius_across: c.radius_across,
            limited_by_width: i32::from(c.limited_by_width),
        }
    }
}
/// The kinds of start direction: the values of `direction_kind` in `strake_geodesic_trace`.
#[repr(u32)]
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum StrakeDirectionKind {
    /// 0: `direction` points to 1 double, an angle θ (radians) from e1 = Su/|Su| toward
    /// e2 = N x e1: the direction cos θ e1 + sin θ e2.
    Angle = 0,
    /// 1: `direction` points to 3 doubles, a direction in space; its component along the
    /// normal is removed.
    Space = 1,
    /// 2: `direction` points to 2 doubles (du, dv) in the parameter plane.
    Parameter = 2,
}

/// Why a geodesic trace ended: the values of `StrakeGeodesicInfo.end`.
#[repr(u32)]
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum StrakeGeodesicEnd {
    /// 0: it reached the length asked.
    Length = 0,
    /// 1: it left the parameter domain; the end lies exactly on the side `side`.
    Boundary = 1,
    /// 2: it stopped before a degenerate point (a pole, a collapsed edge).
    Degenerate = 2,
}

/// Sides of the parameter domain: the values of `StrakeGeodesicInfo.side`.
#[repr(u32)]
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum StrakeDomainSide {
    /// 0: no side (the trace did not end at the boundary).
    None = 0,
    /// 1: u = u_min.
    UMin = 1,
    /// 2: u = u_max.
    UMax = 2,
    /// 3: v = v_min.
    VMin = 3,
    /// 4: v = v_max.
    VMax = 4,
}

/// Options of a geodesic trace or of the geodesic between two points.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeGeodesicOptions {
    /// Error allowed per step in space (host length unit), > 0. For
    /// `strake_geodesic_between`: the largest distance from the geodesic's end to the
    /// target; its traces run at a hundredth of it.
    pub tolerance: f64,
    /// Most step attempts of a trace; 0 for the default (100000). For
    /// `strake_geodesic_between`: most Newton iterations per solve; 0 for the default (30).
    pub max_steps: usize,
}

/// What a geodesic trace did.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeGeodesicInfo {
    /// Why it ended: a `StrakeGeodesicEnd` value.
    pub end: u32,
    /// The domain side where it ended: a `StrakeDomainSide` value (0 unless `end` is 1).
    pub side: u32,
    /// Length traced (host length unit); the curve's domain is [0, length], t = arc length.
    pub length: f64,
    /// Surface parameter u at the end.
    pub u: f64,
    /// Surface parameter v at the end.
    pub v: f64,
    /// The end point S(u, v).
    pub point: [f64; 3],
    /// The unit tangent at the end.
    pub tangent: [f64; 3],
    /// Accepted steps.
    pub accepted_steps: usize,
    /// Rejected step attempts.
    pub rejected_steps: usize,
    /// Surface evaluations (second-order jets) spent.
    pub jets: usize,
}

/// Sides of a path: the values of `side` in `strake_offset_new`.
#[repr(u32)]
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum StrakeOffsetSide {
    /// 0: toward B = N x T (left of the direction of travel, seen from N).
    Left = 0,
    /// 1: toward -B.
    Right = 1,
}

/// Options of an offset; zeros give the defaults.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeOffsetOptions {
    /// Largest space distance between an interval's midpoint offset and its prediction from
    /// the neighbouring points (host length unit), > 0.
    pub chord_tolerance: f64,
    /// Error per step of each geodesic trace; 0 for chord_tolerance / 1000.
    pub trace_tolerance: f64,
    /// Evenly spaced path parameters to start with; 0 for 17, else at least 2.
    pub samples: usize,
    /// Most offset points computed in all; 0 for 20000.
    pub max_samples: usize,
}

/// Counts and figures of an offset.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeOffsetSummary {
    /// Connected pieces (`strake_offset_piece_curve`, `strake_offset_piece_points`).
    pub pieces: usize,
    /// Path intervals whose offset leaves the surface (`strake_offset_exits`).
    pub exits: usize,
    /// Path intervals whose offset formed a loop and was cut (`strake_offset_loops`).
    pub loops: usize,
    /// Offset points kept in all pieces.
    pub points: usize,
    /// Largest measured distance between a piece's curve and offset points not used to fit
    /// it (host length unit).
    pub fit_error: f64,
    /// Geodesics traced.
    pub traces: usize,
    /// Surface jets the traces evaluated.
    pub jets: usize,
}

/// One offset point.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeOffsetPoint {
    /// Path parameter of the path point it belongs to.
    pub t: f64,
    /// Geodesic distance from that path point (host length unit).
    pub distance: f64,
    /// Surface parameter u.
    pub u: f64,
    /// Surface parameter v.
    pub v: f64,
    /// The point in space.
    pub point: [f64; 3],
    /// The path's unit tangent carried to the point along the geodesic.
    pub carried_tangent: [f64; 3],
}

/// An interval of path parameters [t0, t1].
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakePathInterval {
    /// Start.
    pub t0: f64,
    /// End.
    pub t1: f64,
}

/// A gap or an overlap between neighbouring courses' band edges (`strake_course_gaps`).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeCourseGap {
    /// Start, as a parameter of course A.
    pub t0: f64,
    /// End, as a parameter of course A.
    pub t1: f64,
    /// 1 for an overlap (the bands cover each other), 0 for a gap.
    pub overlap: i32,
    /// Largest width inside the interval (host length unit, >= 0).
    pub worst: f64,
}

/// Steering and twist along a course (`strake_course_check`).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeCourseCheck {
    /// Largest steering curvature |kg| (1/length).
    pub max_steering_curvature: f64,
    /// Smallest steering radius 1/|kg| (INFINITY along a geodesic).
    pub min_steering_radius: f64,
    /// Largest tow-edge strain (w/2)|kg|.
    pub max_edge_strain: f64,
    /// Largest |tg| (radians per length).
    pub max_twist_rate: f64,
    /// Samples where the steering radius is below the limit.
    pub steering_violations: usize,
    /// Samples where |tg| exceeds the limit.
    pub twist_violations: usize,
    /// Course length (host length unit).
    pub length: f64,
}

/// Bits of the crease flags `strake_knot_line_flags` writes (a `uint32_t` per sample; 0: a
/// smooth point). A native NURBS surface of degree p is only C^(p - m) across an interior knot
/// of multiplicity m; for m >= p - 1 it is not C2 there ("crease"). A curve point within a few
/// units of round-off of such a knot line is snapped onto it, and the frame there is that of
/// the side the curve moves into (u' > 0: the span starting at the knot; u' < 0: the span
/// ending at it). When the curve runs along the line (u' zero to round-off) the side is the
/// one u'' points to, or the side above the knot when u'' = 0 too. The continuity is that of
/// the parametrisation (an exact NURBS circle with double knots is only C0 in its parameter,
/// yet geometrically smooth). Host callback surfaces report no creases.
#[repr(u32)]
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum StrakeKnotLineFlag {
    /// 1: u lies on an interior u knot of multiplicity >= p - 1 (the surface is not C2 across
    /// it); the frame is that of the side the curve moves into.
    ULine = 1,
    /// 2: the same for a v knot line.
    VLine = 2,
    /// 4: that u line is at most C0 (multiplicity >= p): the normal may differ between sides.
    UOnlyC0 = 4,
    /// 8: the same for the v line.
    VOnlyC0 = 8,
    /// 16: the curve runs along the u line (u' is zero to round-off): the side was chosen by
    /// the rule above, not by the direction of travel.
    AlongU = 16,
    /// 32: the same for the v line.
    AlongV = 32,
}

/// The rates of change along arc length s of the invariants at one sample (1/length^2 each;
/// positive when the invariant grows in the direction of travel T), exact from third-order
/// derivatives (see `strake_invariant_rates_at`).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeInvariantRates {
    /// d kn / ds.
    pub normal_curvature_rate: f64,
    /// d kg / ds.
    pub geodesic_curvature_rate: f64,
    /// d tg / ds.
    pub geodesic_torsion_rate: f64,
    /// d kappa / ds of the space curvature kappa = sqrt(kn^2 + kg^2); where kappa = 0 the
    /// one-sided rate sqrt((d kn/ds)^2 + (d kg/ds)^2).
    pub curvature_rate: f64,
}

impl From<&crate::geometry::rates::InvariantRates> for StrakeInvariantRates {
    fn from(r: &crate::geometry::rates::InvariantRates) -> Self {
        StrakeInvariantRates {
            normal_curvature_rate: r.normal_curvature,
            geodesic_curvature_rate: r.geodesic_curvature,
            geodesic_torsion_rate: r.geodesic_torsion,
            curvature_rate: r.space_curvature,
        }
    }
}

/// The tool-centre path at one sample of a contact path (host length unit; see
/// `strake_centre_point_at` for the geometry). Fields of fourth order (`curvature_rate`,
/// `torsion`, `jerk_figure`) are 0 when `order` is 3.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeCentrePoint {
    /// The curve parameter t of the contact-path sample.
    pub curve_param: f64,
    /// Cutter-location point CL: on the axis, in the plane of the corner-circle centres (a
    /// ball's centre).
    pub centre: [f64; 3],
    /// Tool tip: the lowest point of the axis, CL - r a (r the corner radius).
    pub tip: [f64; 3],
    /// Unit tool axis a, from the tip toward the spindle.
    pub axis: [f64; 3],
    /// Unit tangent of the centre path, in the direction of travel.
    pub tangent: [f64; 3],
    /// d s_c / d s: the centre path's speed relative to the contact path's (> 0).
    pub speed_ratio: f64,
    /// Curvature kc of the centre path (1/length, >= 0).
    pub curvature: f64,
    /// d kc / d s_c along the centre path's own arc length (1/length^2); 0 when `order` is 3.
    pub curvature_rate: f64,
    /// Torsion of the centre path (1/length; 0 where kc = 0); 0 when `order` is 3.
    pub torsion: f64,
    /// |d^3 CL / d s_c^3| = sqrt(kc'^2 + kc^4 + kc^2 tc^2) (1/length^2): the jerk at unit
    /// speed along the centre path; 0 when `order` is 3.
    pub jerk_figure: f64,
    /// Angular rate of the tool axis per unit length of the centre path (radians/length).
    pub axis_rate: f64,
    /// The derivative order the point was computed from: 3 (no curvature rate, torsion or jerk
    /// figure) or 4 (all fields).
    pub order: u32,
}

impl StrakeCentrePoint {
    /// The C point for a point of the Rust API computed at `t` from partials of `order`.
    pub fn new(t: f64, p: &crate::toolpath::CentrePoint, order: usize) -> Self {
        StrakeCentrePoint {
            curve_param: t,
            centre: arr3(&p.centre),
            tip: arr3(&p.tip),
            axis: arr3(&p.axis),
            tangent: arr3(&p.tangent),
            speed_ratio: p.speed_ratio,
            curvature: p.curvature,
            curvature_rate: p.curvature_rate.unwrap_or(0.0),
            torsion: p.torsion.unwrap_or(0.0),
            jerk_figure: p.jerk_figure.unwrap_or(0.0),
            axis_rate: p.axis_rate,
            order: order as u32,
        }
    }

    /// The point of the Rust API for a point passed in by the host (to the feed functions),
    /// checked: every number finite (`NonFinite` naming the field, e.g. "point.curvature"),
    /// `order` 3 or 4, `speed_ratio` > 0, `curvature`, `jerk_figure` and `axis_rate` >= 0, the
    /// axis and tangent of unit length to [`UNIT_VECTOR_SLACK`] (`InvalidArgument` naming the
    /// field).
    pub fn to_rust(&self) -> Result<crate::toolpath::CentrePoint, StrakeError> {
        let scalars: [(&'static str, f64); 19] = [
            ("point.curve_param", self.curve_param),
            ("point.centre[0]", self.centre[0]),
            ("point.centre[1]", self.centre[1]),
            ("point.centre[2]", self.centre[2]),
            ("point.tip[0]", self.tip[0]),
            ("point.tip[1]", self.tip[1]),
            ("point.tip[2]", self.tip[2]),
            ("point.axis[0]", self.axis[0]),
            ("point.axis[1]", self.axis[1]),
            ("point.axis[2]", self.axis[2]),
            ("point.tangent[0]", self.tangent[0]),
            ("point.tangent[1]", self.tangent[1]),
            ("point.tangent[2]", self.tangent[2]),
            ("point.speed_ratio", self.speed_ratio),
            ("point.curvature", self.curvature),
            ("point.curvature_rate", self.curvature_rate),
            ("point.torsion", self.torsion),
            ("point.jerk_figure", self.jerk_figure),
            ("point.axis_rate", self.axis_rate),
        ];
        for (what, value) in scalars {
            if !value.is_finite() {
                return Err(StrakeError::NonFinite {
                    source: NonFiniteSource::Parameter,
                    what,
                    value,
                });
            }
        }
        let invalid = |m: String| Err(StrakeError::InvalidArgument(m));
        if !(self.order == 3 || self.order == 4) {
            return invalid(format!("point.order = {} must be 3 or 4", self.order));
        }
        if self.speed_ratio <= 0.0 {
            return invalid(format!(
                "point.speed_ratio = {} must be positive",
                crate::numfmt::Exact(self.speed_ratio)
            ));
        }
        for (name, x) in [
            ("point.curvature", self.curvature),
            ("point.jerk_figure", self.jerk_figure),
            ("point.axis_rate", self.axis_rate),
        ] {
            if x < 0.0 {
                return invalid(format!(
                    "{name} = {} must not be negative",
                    crate::numfmt::Exact(x)
                ));
            }
        }
        for (name, v) in [("point.axis", self.axis), ("point.tangent", self.tangent)] {
            let len = vec3(v).norm();
            if (len - 1.0).abs() > UNIT_VECTOR_SLACK {
                return invalid(format!("{name} has length {len}, not 1"));
            }
        }
        let four = self.order == 4;
        Ok(crate::toolpath::CentrePoint {
            centre: vec3(self.centre),
            tip: vec3(self.tip),
            axis: vec3(self.axis),
            tangent: vec3(self.tangent),
            speed_ratio: self.speed_ratio,
            curvature: self.curvature,
            curvature_rate: four.then_some(self.curvature_rate),
            torsion: four.then_some(self.torsion),
            jerk_figure: four.then_some(self.jerk_figure),
            axis_rate: self.axis_rate,
        })
    }
}

/// Machine limits of the feed on the tool-centre path, in one consistent set of units (e.g.
/// mm and s: feed in mm/s, acceleration in mm/s^2, jerk in mm/s^3, angular speed in rad/s).
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeCentreFeedLimits {
    /// Programmed (largest) feed of the cutter-location point; positive and finite.
    pub feed: f64,
    /// Largest path acceleration; positive and finite.
    pub max_acceleration: f64,
    /// Largest jerk; positive and finite, or 0 for none (the jerk rule needs points of order 4).
    pub max_jerk: f64,
    /// Largest angular speed of the tool axis (rad per time unit); positive and finite, or 0
    /// for none.
    pub max_angular_speed: f64,
}

/// Which limit decides the feed on the centre path: the values of `StrakeCentreFeed.bound`.
#[repr(u32)]
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum StrakeFeedBound {
    /// 0: the programmed feed.
    Programmed = 0,
    /// 1: the acceleration limit.
    Acceleration = 1,
    /// 2: the jerk limit.
    Jerk = 2,
    /// 3: the tool axis's angular speed limit.
    AngularSpeed = 3,
}

/// The feed allowed at a sample of the centre path and what limits it (feeds in length per
/// time unit of the limits). A bound that does not apply (no curvature, no jerk limit, an axis
/// that does not turn) is +infinity (`HUGE_VAL`); `feed` is always finite.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeCentreFeed {
    /// The highest feed of the cutter-location point: the least of the programmed feed and
    /// the three bounds below.
    pub feed: f64,
    /// sqrt(a_max / kc).
    pub acceleration_feed: f64,
    /// (j_max / jerk_figure)^(1/3).
    pub jerk_feed: f64,
    /// w_max / axis_rate.
    pub angular_feed: f64,
    /// The same feed as the contact point moves: feed / speed_ratio (for hosts that program
    /// the contact path).
    pub contact_feed: f64,
    /// Which bound gives `feed`: a `STRAKE_FEED_BOUND_...` value (the first of programmed,
    /// acceleration, jerk, angular speed on a tie).
    pub bound: u32,
}

impl From<&crate::toolpath::CentreFeed> for StrakeCentreFeed {
    fn from(f: &crate::toolpath::CentreFeed) -> Self {
        use crate::toolpath::FeedBound;
        StrakeCentreFeed {
            feed: f.feed,
            acceleration_feed: f.acceleration_feed,
            jerk_feed: f.jerk_feed,
            angular_feed: f.angular_feed,
            contact_feed: f.contact_feed,
            bound: match f.bound {
                FeedBound::Programmed => StrakeFeedBound::Programmed,
                FeedBound::Acceleration => StrakeFeedBound::Acceleration,
                FeedBound::Jerk => StrakeFeedBound::Jerk,
                FeedBound::AngularSpeed => StrakeFeedBound::AngularSpeed,
            } as u32,
        }
    }
}

/// A surface point with its partial derivatives to fourth order, filled by a host callback of
/// `strake_surface_from_high_callback`. The first six entries are those of
/// `StrakeSurfaceJet`, in the same order; each entry is an (x, y, z) triple in the host's
/// length unit per power of the surface parameters. strake sets every entry to zero before it
/// calls the host, so entries above the requested order may be left alone.
#[repr(C)]
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct StrakeSurfaceHighJet {
    /// The point S(u, v).
    pub p: [f64; 3],
    /// dS/du (order >= 1).
    pub su: [f64; 3],
    /// dS/dv (order >= 1).
    pub sv: [f64; 3],
    /// d2S/du2 (order >= 2).
    pub suu: [f64; 3],
    /// d2S/dudv (order >= 2).
    pub suv: [f64; 3],
    /// d2S/dv2 (order >= 2).
    pub svv: [f64; 3],
    /// d3S/du3 (order >= 3).
    pub suuu: [f64; 3],
    /// d3S/du2dv (order >= 3).
    pub suuv: [f64; 3],
    /// d3S/dudv2 (order >= 3).
    pub suvv: [f64; 3],
    /// d3S/dv3 (order >= 3).
    pub svvv: [f64; 3],
    /// d4S/du4 (order 4).
    pub suuuu: [f64; 3],
    /// d4S/du3dv (order 4).
    pub suuuv: [f64; 3],
    /// d4S/du2dv2 (order 4).
    pub suuvv: [f64; 3],
    /// d4S/dudv3 (order 4).
    pub suvvv: [f64; 3],
    /// d4S/dv4 (order 4).
    pub svvvv: [f64; 3],
}

impl StrakeSurfaceHighJet {
    /// The second-order part, as the Rust jet.
    pub fn jet(&self) -> SurfaceJet {
        SurfaceJet {
            p: vec3(self.p),
            su: vec3(self.su),
            sv: vec3(self.sv),
            suu: vec3(self.suu),
            suv: vec3(self.suv),
            svv: vec3(self.svv),
        }
    }

    /// The partials of the Rust API to `order` (entries above it zero).
    pub fn partials(&self, order: usize) -> crate::geometry::jet::SurfacePartials {
        let mut p = crate::geometry::jet::SurfacePartials {
            order,
            ..Default::default()
        };
        // (i, j, entry): d[i][j] = d^(i+j) S / du^i dv^j.
        let entries: [(usize, usize, [f64; 3]); 15] = [
            (0, 0, self.p),
            (1, 0, self.su),
            (0, 1, self.sv),
            (2, 0, self.suu),
            (1, 1, self.suv),
            (0, 2, self.svv),
            (3, 0, self.suuu),
            (2, 1, self.suuv),
            (1, 2, self.suvv),
            (0, 3, self.svvv),
            (4, 0, self.suuuu),
            (3, 1, self.suuuv),
            (2, 2, self.suuvv),
            (1, 3, self.suvvv),
            (0, 4, self.svvvv),
        ];
        for (i, j, e) in entries {
            if i + j <= order {
                p.d[i][j] = vec3(e);
            }
        }
        p
    }
}
