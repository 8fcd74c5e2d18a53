//! The plain C structs of the ABI: jets in, frames out, and the parameter scales.

use crate::frame::{DarbouxFrame, ParamScales};
use crate::jet::{CurveJet, SurfaceJet};
use crate::math::{arr3, vec3};

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
