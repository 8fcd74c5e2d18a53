//! The Darboux frame of a curve on a surface and its three invariants, from jets.
//!
//! Inputs: a second-order surface jet (S, Su, Sv, Suu, Suv, Svv at (u, v)) and a curve jet
//! (u, v, u', v', u'', v'' at t). With c(t) = S(u(t), v(t)):
//!
//! - c' = Su u' + Sv v';  c'' = Suu u'² + 2 Suv u'v' + Svv v'² + Su u'' + Sv v''.
//! - T = c'/|c'|; N = σ (Su × Sv)/|Su × Sv| (σ from [`Orientation`]); B = N × T, so that
//!   (T, B, N) is right-handed (T × B = N).
//! - Normal curvature κn = c''·N/|c'|² (positive when the curve bends toward N), evaluated as
//!   II(u', v')/|c'|² = (L u'² + 2M u'v' + Nn v'²)/|c'|², the same value without the tangential
//!   part of c'' (Meusnier; do Carmo §3-2), so it stays accurate as the curve stalls.
//! - Geodesic curvature κg = c''·B/|c'|² (positive when the curve turns toward B, i.e. to the
//!   left when looking down N).
//! - Geodesic torsion τg = II(T, B), with II built from L = Suu·N, M = Suv·N, Nn = Svv·N.
//!
//! These satisfy the Darboux equations in arc length s: dT/ds = κg B + κn N,
//! dB/ds = −κg T + τg N, dN/ds = −κn T − τg B (do Carmo, *Differential Geometry of Curves and
//! Surfaces*, ch. 3). Reversing N flips κn and κg but not τg; reversing the direction of travel
//! flips κg only. Curvatures are in 1/length, lengths in the host's unit.
//!
//! Nothing here allocates or performs I/O.

use crate::error::{NonFiniteSource, Result, StrakeError};
use crate::geometry::jet::{CurveJet, SurfaceJet};
use crate::geometry::math::{Vec3, all_finite};
pub use crate::geometry::principal::{Orientation, PrincipalCurvatures, SurfacePoint};

/// Below this speed figure f (see [`curve_speed_figure`]) a curve point is refused as stalled
/// ([`StrakeError::StalledCurve`]).
///
/// Measured (`examples/conditioning_sweep.rs`, tables in `docs/accuracy.md`): κn, τg, k1 and k2
/// do not depend on the speed and keep round-off accuracy at any f. The geodesic curvature of a
/// curve that starts from rest along a straight (u, v) line (u' ~ t, u'' constant, as at a doubled
/// end control point) loses accuracy like ε/f² (fitted exponent 2.0), because its inputs do:
/// computed in the parameter plane it stays within 0.2 of the change that rounding the inputs
/// alone causes, and with jets carrying one unit of round-off it reaches 1e-6 relative between
/// f = 3.2e-6 and 1e-6; a curve that stops while turning, or comes to rest more smoothly, loses
/// less. At this limit the worst measured error of κg is about 6e-8.
pub const STALLED_CURVE_LIMIT: f64 = 1e-5;

/// The widths of the parameter domains, which set the scale against which degeneracy is
/// judged (never an absolute epsilon).
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ParamScales {
    /// Width of the surface's u domain.
    pub u_extent: f64,
    /// Width of the surface's v domain.
    pub v_extent: f64,
    /// Width of the curve's t domain.
    pub t_extent: f64,
}

impl ParamScales {
    /// Fails with `InvalidArgument` unless every extent is positive and finite.
    pub fn check(&self) -> Result<()> {
        for (name, x) in [
            ("u_extent", self.u_extent),
            ("v_extent", self.v_extent),
            ("t_extent", self.t_extent),
        ] {
            if !(x.is_finite() && x > 0.0) {
                return Err(StrakeError::InvalidArgument(format!(
                    "{name} = {x}: parameter extents must be positive and finite"
                )));
            }
        }
        Ok(())
    }
}

/// The speed figure of a curve point: hypot(u'/Δu, v'/Δv) · Δt, how many domain widths the
/// curve would cross over its whole parameter range at its present speed. About 1 for a curve
/// that crosses the surface once; tends to 0 where the curve stalls. Dimensionless.
#[inline]
pub fn curve_speed_figure(jet: &CurveJet, s: &ParamScales) -> f64 {
    // Multiplications by the reciprocal extents (the batch kernel computes them once per block).
    let (a, b) = (jet.du * (1.0 / s.u_extent), jet.dv * (1.0 / s.v_extent));
    (a * a + b * b).sqrt() * s.t_extent
}

/// How far a result is from the degenerate cases that make it untrustworthy.
///
/// The relative error of κn, τg, k1 and k2 grows like 7 ε / surface², that of κg also by about
/// ε |c''| / |c'|² as the curve stalls (measured; `docs/accuracy.md` has the tables).
///
/// Laid out as C lays out the same fields (`#[repr(C)]`): surface, curve.
#[derive(Debug, Clone, Copy, PartialEq)]
#[repr(C)]
pub struct Conditioning {
    /// The surface conditioning figure (see [`crate::geometry::principal::surface_conditioning`]); 1 is
    /// ideal, refusal below [`crate::geometry::principal::DEGENERATE_SURFACE_LIMIT`].
    pub surface: f64,
    /// The curve speed figure (see [`curve_speed_figure`]); refusal below
    /// [`STALLED_CURVE_LIMIT`].
    pub curve: f64,
}

/// The Darboux frame and invariants of a curve on a surface at one point, with the surface's
/// principal curvatures there.
///
/// Laid out as C lays out the same fields (`#[repr(C)]`): 30 f64 in the order of the fields
/// below, vectors as x, y, z. The batch frame kernel writes frames in that order (checked at
/// compile time in `frame_block.rs`).
#[derive(Debug, Clone, Copy, PartialEq)]
#[repr(C)]
pub struct DarbouxFrame {
    /// Surface parameter u of the point.
    pub u: f64,
    /// Surface parameter v of the point.
    pub v: f64,
    /// The point c(t) = S(u, v).
    pub point: Vec3,
    /// Unit tangent T = c'/|c'|.
    pub t: Vec3,
    /// Unit tangent normal B = N × T (in the tangent plane, to the left of T seen from N).
    pub b: Vec3,
    /// Unit surface normal N.
    pub n: Vec3,
    /// Normal curvature κn (1/length).
    pub normal_curvature: f64,
    /// Geodesic curvature κg (1/length).
    pub geodesic_curvature: f64,
    /// Geodesic torsion τg (radians/length).
    pub geodesic_torsion: f64,
    /// Speed |c'| = ds/dt (length per unit t).
    pub speed: f64,
    /// Principal curvatures, directions, mean and Gaussian curvature of the surface.
    pub principal: PrincipalCurvatures,
    /// Conditioning figures of the point.
    pub conditioning: Conditioning,
}

impl DarbouxFrame {
    /// Every number of the frame, 30 f64 in the order of its memory layout: u, v, the point
    /// (x, y, z), T, B, N, κn, κg, τg, speed, k1, k2, d1, d2, mean and Gaussian curvature, the
    /// surface conditioning figure and the curve speed figure. For writing a frame out as a
    /// row of numbers, or comparing frames bit for bit (`PartialEq` takes −0 and +0 as equal).
    pub fn to_array(&self) -> [f64; 30] {
        let p = &self.principal;
        let [point, t, b, n, d1, d2] = [self.point, self.t, self.b, self.n, p.d1, p.d2];
        [
            self.u,
            self.v,
            point.x,
            point.y,
            point.z,
            t.x,
            t.y,
            t.z,
            b.x,
            b.y,
            b.z,
            n.x,
            n.y,
            n.z,
            self.normal_curvature,
            self.geodesic_curvature,
            self.geodesic_torsion,
            self.speed,
            p.k1,
            p.k2,
            d1.x,
            d1.y,
            d1.z,
            d2.x,
            d2.y,
            d2.z,
            p.mean,
            p.gaussian,
            self.conditioning.surface,
            self.conditioning.curve,
        ]
    }
}

/// Computes the Darboux frame and invariants from a surface jet and a curve jet.
///
/// `t` is only used in error messages. Errors: `NonFinite` (input jets, or an overflowing
/// result), `DegenerateSurface`, `StalledCurve`, `InvalidArgument` for bad scales.
#[inline]
pub fn darboux_frame(
    surface: &SurfaceJet,
    curve: &CurveJet,
    orientation: Orientation,
    scales: &ParamScales,
    t: f64,
) -> Result<DarbouxFrame> {
    scales.check()?;
    curve.check_finite()?;
    let sp = SurfacePoint::new(
        surface,
        orientation,
        curve.u,
        curve.v,
        scales.u_extent,
        scales.v_extent,
    )?;
    darboux_frame_at(surface, &sp, curve, scales, t)
}

/// As [`darboux_frame`], for a surface point already computed (several curves through one
/// point, or a caller that needs [`SurfacePoint`] too). `scales` must be valid and `curve`
/// finite; this is not checked again.
#[inline]
pub fn darboux_frame_at(
    surface: &SurfaceJet,
    sp: &SurfacePoint,
    curve: &CurveJet,
    scales: &ParamScales,
    t: f64,
) -> Result<DarbouxFrame> {
    let speed_figure = curve_speed_figure(curve, scales);
    if speed_figure.is_nan() || speed_figure < STALLED_CURVE_LIMIT {
        return Err(StrakeError::StalledCurve { t, speed_figure });
    }
    let (du, dv) = (curve.du, curve.dv);
    let c1 = surface.su * du + surface.sv * dv;
    // W = Suu u'² + 2 Suv u'v' + Svv v'²: c'' without its part Su u'' + Sv v'' (see κg below).
    let w = surface.suu * (du * du) + surface.suv * (2.0 * du * dv) + surface.svv * (dv * dv);
    // u'v'' − v'u'': the turning of the curve in the parameter plane.
    let turn = du * curve.ddv - dv * curve.ddu;
    let speed2 = c1.norm_squared();
    let speed = speed2.sqrt();
    let inv_speed = 1.0 / speed;
    let tan = c1 * inv_speed;
    let n = sp.n;
    let b = n.cross(&tan);
    let inv_speed2 = inv_speed * inv_speed;
    // κn = II(c', c')/|c'|², which equals c''·N/|c'|² since Su·N = Sv·N = 0 (do Carmo §3-2).
    // Taking c''·N instead subtracts the tangential part Su u'' + Sv v'' of c'' numerically,
    // which costs ε|c''|/(κn|c'|²) near a stalled curve (docs/accuracy.md).
    let kn = sp.second_form((du, dv), (du, dv)) * inv_speed2;
    // κg = c''·B/|c'|² with c'' = W + Su u'' + Sv v'': since (Su u'' + Sv v'')·(N × T) =
    // N·(Su × Sv) (u'v'' − v'u'')/|c'|,
    //   κg = (W·B + σ|Su × Sv| (u'v'' − v'u'')/|c'|) / |c'|²,
    // the parameter-plane (Christoffel) form: W's tangential part is Su Γ¹(u', v') +
    // Sv Γ²(u', v') (`geodesics::christoffel`), and only its B part enters. The tangential
    // part of the acceleration along T, which c''·B cancels numerically (costing
    // ε|c''|/|c'|² as the curve stalls), cancels exactly in u'v'' − v'u'' when (u'', v'') is
    // parallel to (u', v') (docs/accuracy.md has the measurement).
    let kg = (w.dot(&b) + sp.signed_area * turn * inv_speed) * inv_speed2;
    // τg = II(T, B): T has (u, v) components (u', v')/|c'|; those of B come from B·Su, B·Sv.
    let tc = (du * inv_speed, dv * inv_speed);
    let bc = sp.components(b.dot(&surface.su), b.dot(&surface.sv));
    let tg = sp.second_form(tc, bc);
    let frame = DarbouxFrame {
        u: curve.u,
        v: curve.v,
        point: surface.p,
        t: tan,
        b,
        n,
        normal_curvature: kn,
        geodesic_curvature: kg,
        geodesic_torsion: tg,
        speed,
        principal: sp.principal,
        conditioning: Conditioning {
            surface: sp.conditioning,
            curve: speed_figure,
        },
    };
    check_result(&frame)?;
    Ok(frame)
}

fn check_result(f: &DarbouxFrame) -> Result<()> {
    let scalars = [
        ("normal curvature", f.normal_curvature),
        ("geodesic curvature", f.geodesic_curvature),
        ("geodesic torsion", f.geodesic_torsion),
        ("speed", f.speed),
    ];
    for (what, value) in scalars {
        if !value.is_finite() {
            return Err(StrakeError::NonFinite {
                source: NonFiniteSource::Result,
                what,
                value,
            });
        }
    }
    if !(all_finite(&f.t) && all_finite(&f.b)) || f.speed == 0.0 {
        return Err(StrakeError::NonFinite {
            source: NonFiniteSource::Result,
            what: "tangent",
            value: f.speed,
        });
    }
    Ok(())
}

/// The space curvature κ = √(κn² + κg²) of the curve (1/length).
#[inline]
pub fn space_curvature(f: &DarbouxFrame) -> f64 {
    f.normal_curvature.hypot(f.geodesic_curvature)
}

/// Angle θ from the first principal direction d1 to T, measured toward d2 (radians, in
/// (−π, π]). With it, Euler's formula reads κn = k1 cos²θ + k2 sin²θ and
/// τg = (k2 − k1) sin θ cos θ.
#[inline]
pub fn principal_angle(f: &DarbouxFrame) -> f64 {
    f.t.dot(&f.principal.d2).atan2(f.t.dot(&f.principal.d1))
}

#[cfg(test)]
mod tests {
    use super::*;

    // Common practice: `to_array` lists the numbers in the order they lie in memory
    // (`#[repr(C)]`), every one of them once.
    #[test]
    fn to_array_is_the_memory_order() {
        let mut raw = [0.0f64; 30];
        for (i, x) in raw.iter_mut().enumerate() {
            *x = i as f64 + 0.5;
        }
        assert_eq!(
            std::mem::size_of::<DarbouxFrame>(),
            std::mem::size_of_val(&raw)
        );
        // SAFETY: a DarbouxFrame is 30 f64 (`#[repr(C)]`, size checked above); any bits are
        // valid f64.
        let frame: DarbouxFrame = unsafe { std::mem::transmute(raw) };
        assert_eq!(frame.to_array(), raw);
        assert_eq!(frame.principal.d2.z, 25.5);
    }
}
