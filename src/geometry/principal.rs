//! The surface at one point: unit normal, fundamental forms, principal curvatures and
//! directions, mean and Gaussian curvature.
//!
//! Sign convention: N = σ (Su × Sv)/|Su × Sv| with σ = +1 for [`Orientation::Forward`]
//! and −1 for [`Orientation::Reversed`]. The second fundamental form uses this N:
//! L = Suu·N, M = Suv·N, Nn = Svv·N, so a curvature is positive where the surface bends toward N
//! (a sphere with the outward normal has k1 = k2 = −1/R).
//!
//! Principal curvatures are the eigenvalues of the shape operator, computed as the symmetric
//! 2 × 2 matrix of the second fundamental form in the orthonormal tangent basis
//! e1 = Su/|Su|, e2 = N × e1. Its eigenvalues are m ± d with m = (W11 + W22)/2 and
//! d = √(((W11 − W22)/2)² + W12²): no H² − K cancellation, so they stay accurate at and near
//! umbilics (do Carmo §3-3 gives k = H ± √(H² − K), which loses half the digits there).

use crate::error::{NonFiniteSource, Result, StrakeError};
use crate::geometry::jet::SurfaceJet;
use crate::geometry::math::{Vec3, all_finite};

/// Which way the unit normal points.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum Orientation {
    /// N = (Su × Sv)/|Su × Sv|.
    #[default]
    Forward,
    /// N = −(Su × Sv)/|Su × Sv| (e.g. to put the normal on the tool side).
    Reversed,
}

impl Orientation {
    /// σ: +1.0 for `Forward`, −1.0 for `Reversed`.
    #[inline(always)]
    pub fn sign(self) -> f64 {
        match self {
            Orientation::Forward => 1.0,
            Orientation::Reversed => -1.0,
        }
    }
}

/// Below this surface conditioning figure c (see [`surface_conditioning`]) a point is refused as
/// degenerate ([`StrakeError::DegenerateSurface`]).
///
/// Measured (`examples/conditioning_sweep.rs`, tables in `docs/accuracy.md`): with surface jets
/// that carry the rounding error of an ordinary evaluator (ε = 2.2e-16 times the size of each
/// derivative order), the relative error of κn, τg, k1 and k2 grows like 7 ε/c² near a pole and
/// where Su and Sv turn parallel (fitted exponent 2.0), and reaches 1e-6 at c ≈ 4e-5. At this
/// limit the worst measured error is about 2e-7; above it, below 1e-6 with a margin of five for
/// noisier host evaluators.
pub const DEGENERATE_SURFACE_LIMIT: f64 = 1e-4;

/// The conditioning figure of a surface point: how far it is from a degenerate one.
///
/// c = |Su × Sv| Δu Δv / max(|Su| Δu, |Sv| Δv)², where Δu and Δv are the widths of the
/// parameter domain (so that the figure does not depend on how the parameters are scaled).
/// It is the sine of the angle between Su and Sv when |Su| Δu = |Sv| Δv, at most that sine
/// otherwise, and it tends to 0 both when Su and Sv become parallel and when one of them
/// vanishes (a pole). c = 0 when Su = Sv = 0. Dimensionless, in [0, 1].
#[inline]
pub fn surface_conditioning(
    su: &Vec3,
    sv: &Vec3,
    cross_norm: f64,
    u_extent: f64,
    v_extent: f64,
) -> f64 {
    // max(|Su| Δu, |Sv| Δv)² = max(E Δu², G Δv²): no square roots needed.
    let a = su.norm_squared() * (u_extent * u_extent);
    let b = sv.norm_squared() * (v_extent * v_extent);
    let m = a.max(b);
    if m == 0.0 || !m.is_finite() {
        return 0.0;
    }
    (cross_norm * u_extent * v_extent) / m
}

/// Principal curvatures and directions at a surface point.
///
/// Laid out as C lays out the same fields (`#[repr(C)]`): k1, k2, d1, d2, mean, gaussian
/// (10 f64).
#[derive(Debug, Clone, Copy, PartialEq)]
#[repr(C)]
pub struct PrincipalCurvatures {
    /// Larger principal curvature k1 (1/length; sign as in the module docs).
    pub k1: f64,
    /// Smaller principal curvature k2 ≤ k1.
    pub k2: f64,
    /// Unit direction of k1, tangent to the surface. At an umbilic (k1 = k2) every direction is
    /// principal and this is Su/|Su|.
    pub d1: Vec3,
    /// Unit direction of k2: N × d1, so (d1, d2, N) is right-handed.
    pub d2: Vec3,
    /// Mean curvature H = (k1 + k2)/2.
    pub mean: f64,
    /// Gaussian curvature K = k1 k2 (1/length²).
    pub gaussian: f64,
}

/// The local geometry of a surface point, everything that does not depend on a curve.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct SurfacePoint {
    /// Unit normal N (sign per [`Orientation`]).
    pub n: Vec3,
    /// First fundamental form E = Su·Su.
    pub e: f64,
    /// First fundamental form F = Su·Sv.
    pub f: f64,
    /// First fundamental form G = Sv·Sv.
    pub g: f64,
    /// |Su × Sv| = √(EG − F²).
    pub area: f64,
    /// Second fundamental form L = Suu·N.
    pub l: f64,
    /// Second fundamental form M = Suv·N.
    pub m: f64,
    /// Second fundamental form Nn = Svv·N.
    pub nn: f64,
    /// Principal curvatures and directions.
    pub principal: PrincipalCurvatures,
    /// Conditioning figure (see [`surface_conditioning`]).
    pub conditioning: f64,
}

impl SurfacePoint {
    /// Computes the normal, fundamental forms and principal curvatures from a second-order jet.
    ///
    /// `u`, `v` are only used in the error message. `u_extent`, `v_extent` are the widths of the
    /// surface's parameter domain (for the conditioning figure). Errors: `NonFinite` for a
    /// non-finite jet entry, `DegenerateSurface` when the conditioning figure is below
    /// [`DEGENERATE_SURFACE_LIMIT`].
    #[inline]
    pub fn new(
        jet: &SurfaceJet,
        orientation: Orientation,
        u: f64,
        v: f64,
        u_extent: f64,
        v_extent: f64,
    ) -> Result<Self> {
        Self::new_with_limit(
            jet,
            orientation,
            u,
            v,
            u_extent,
            v_extent,
            DEGENERATE_SURFACE_LIMIT,
        )
    }

    /// As [`SurfacePoint::new`], refusing below `limit` instead of [`DEGENERATE_SURFACE_LIMIT`].
    ///
    /// For measuring accuracy next to degenerate points (`examples/conditioning_sweep.rs`) and
    /// for callers that want a stricter limit. Below the default limit the results carry the
    /// errors documented in `docs/accuracy.md`; a `limit` of 0 refuses only a point where
    /// |Su × Sv| is exactly 0 (reported as `NonFinite`, since nothing can be divided by it).
    #[inline]
    pub fn new_with_limit(
        jet: &SurfaceJet,
        orientation: Orientation,
        u: f64,
        v: f64,
        u_extent: f64,
        v_extent: f64,
        limit: f64,
    ) -> Result<Self> {
        jet.check_finite()?;
        let su = &jet.su;
        let sv = &jet.sv;
        let cross = su.cross(sv);
        let area = cross.norm();
        let conditioning = surface_conditioning(su, sv, area, u_extent, v_extent);
        if conditioning.is_nan() || limit.is_nan() || conditioning < limit {
            return Err(StrakeError::DegenerateSurface { u, v, conditioning });
        }
        let sigma = orientation.sign();
        // One division for 1/A, used for N, the tangent basis and (in `components`) 1/A².
        let inv_area = 1.0 / area;
        let n = cross * (sigma * inv_area);
        let e = su.dot(su);
        let f = su.dot(sv);
        let g = sv.dot(sv);
        let l = jet.suu.dot(&n);
        let m = jet.suv.dot(&n);
        let nn = jet.svv.dot(&n);

        // Second fundamental form in the orthonormal basis e1 = Su/|Su|, e2 = N × e1.
        // e2 = α Su + β Sv with β = σ|Su|/A, α = −σF/(|Su| A), A = |Su × Sv|.
        let su_len = e.sqrt();
        let inv_su = 1.0 / su_len;
        let beta = sigma * su_len * inv_area;
        let alpha = -sigma * f * inv_su * inv_area;
        let w11 = l * inv_su * inv_su;
        let w12 = (l * alpha + m * beta) * inv_su;
        let w22 = l * alpha * alpha + 2.0 * m * alpha * beta + nn * beta * beta;
        let half_diff = 0.5 * (w11 - w22);
        let mean = 0.5 * (w11 + w22);
        // √ rather than hypot: hypot is several times slower, and the squares cannot overflow
        // for curvatures below 1e150 per unit length.
        let d = (half_diff * half_diff + w12 * w12).sqrt();
        let k1 = mean + d;
        let k2 = mean - d;
        // Eigenvector of k1, from whichever of the two equivalent forms is better conditioned:
        // (d + h, W12) when h = (W11 − W22)/2 ≥ 0, else (W12, d − h). At an umbilic (d at
        // round-off level) every direction is principal: take e1.
        let scale = w11.abs().max(w22.abs()).max(w12.abs());
        let (x, y) = if d <= 4.0 * f64::EPSILON * scale {
            (1.0, 0.0)
        } else if half_diff >= 0.0 {
            (d + half_diff, w12)
        } else {
            (w12, d - half_diff)
        };
        let inv = 1.0 / (x * x + y * y).sqrt();
        let e1 = su * inv_su;
        let e2 = n.cross(&e1);
        let d1 = e1 * (x * inv) + e2 * (y * inv);
        let d2 = n.cross(&d1);
        let principal = PrincipalCurvatures {
            k1,
            k2,
            d1,
            d2,
            mean,
            gaussian: k1 * k2,
        };
        let out = SurfacePoint {
            n,
            e,
            f,
            g,
            area,
            l,
            m,
            nn,
            principal,
            conditioning,
        };
        if !(k1.is_finite()
            && k2.is_finite()
            && all_finite(&n)
            && out.principal.gaussian.is_finite())
        {
            return Err(StrakeError::NonFinite {
                source: NonFiniteSource::Result,
                what: "principal curvature",
                value: if k1.is_finite() { k2 } else { k1 },
            });
        }
        Ok(out)
    }

    /// The second fundamental form II(X, Y) = L x₁y₁ + M (x₁y₂ + x₂y₁) + Nn x₂y₂ on tangent
    /// vectors given by their (u, v) components x = (x₁, x₂), y = (y₁, y₂).
    #[inline]
    pub fn second_form(&self, x: (f64, f64), y: (f64, f64)) -> f64 {
        self.l * x.0 * y.0 + self.m * (x.0 * y.1 + x.1 * y.0) + self.nn * x.1 * y.1
    }

    /// The (u, v) components (a, b) of a tangent vector X = a Su + b Sv, from X·Su and X·Sv
    /// (solving the Gram system with the first fundamental form).
    #[inline]
    pub fn components(&self, x_dot_su: f64, x_dot_sv: f64) -> (f64, f64) {
        // 1/det = (1/A)²: one division instead of two (the batch kernel reuses 1/A).
        let inv_area = 1.0 / self.area;
        let inv_det = inv_area * inv_area;
        (
            (self.g * x_dot_su - self.f * x_dot_sv) * inv_det,
            (self.e * x_dot_sv - self.f * x_dot_su) * inv_det,
        )
    }
}
