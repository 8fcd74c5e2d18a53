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
/// derivative order), the relative error of κn, τg, k1 and k2 grows like 1/c² near a pole and
/// where Su and Sv turn parallel (fitted exponent 2.0), and first exceeds 1e-6 at c ≈ 1.6e-6
/// (Su and Sv nearly parallel; near a pole at c ≈ 4.5e-7). At this limit the worst measured
/// error is about 6e-8; above it, below 1e-6 with a margin of six for noisier evaluators.
pub const DEGENERATE_SURFACE_LIMIT: f64 = 1e-5;

/// The eigen-solve squares (W11 − W22)/2 and W12 directly when the larger lies in
/// [`EIGEN_SAFE_LO`, `EIGEN_SAFE_HI`] (2^−450 … 2^450), and scales them by a power of two first
/// otherwise (see [`SurfacePoint::new`]).
pub const EIGEN_SAFE_LO: f64 = 3.4395525670743494e-136; // 2^-450
/// Upper end of the range squared directly (2^450).
pub const EIGEN_SAFE_HI: f64 = 2.9073548971824276e135; // 2^450

/// The conditioning figure of a surface point: how far it is from a degenerate one.
///
/// c = |Su × Sv| / (ρu ρv), with the reference speeds
///
/// - ρu² = |Su|² + |Suu|² Δu² + |Suv|² Δv²,
/// - ρv² = |Sv|² + |Svv|² Δv² + |Suv|² Δu²,
///
/// Δu, Δv the widths of the parameter domain. ρu estimates how large Su is over the patch (its
/// value plus how much it changes across the domain), so |Su|/ρu tends to 0 where Su collapses
/// locally (a pole, a collapsed edge, a parameter that stops), while a patch of any proportions
/// whose Su does not change (a plane or a cylinder strip, however long and thin) keeps
/// |Su|/ρu = 1. c = sin∠(Su, Sv) · (|Su|/ρu) · (|Sv|/ρv): it tends to 0 when Su and Sv turn
/// parallel and when either collapses, and it does not depend on how the parameters are scaled
/// (u → a u leaves every term's ratio unchanged) nor on the patch's aspect ratio.
/// Dimensionless, in [0, 1]; 1 on a plane parametrised by orthogonal straight lines; c = 0
/// when ρu ρv is 0 or overflows. Costs two square roots and one division.
///
/// Evaluated as `cross_norm / (√ρu² · √ρv²)` with ρu² = (Su·Su + (Suu·Suu)(Δu Δu)) +
/// (Suv·Suv)(Δv Δv) and ρv² = (Sv·Sv + (Svv·Svv)(Δv Δv)) + (Suv·Suv)(Δu Δu), in that order (the
/// batch frame kernel performs the same operations).
#[inline]
pub fn surface_conditioning(
    jet: &SurfaceJet,
    cross_norm: f64,
    u_extent: f64,
    v_extent: f64,
) -> f64 {
    let (uu, vv) = (u_extent * u_extent, v_extent * v_extent);
    let cross2 = jet.suv.dot(&jet.suv);
    let ru2 = jet.su.dot(&jet.su) + jet.suu.dot(&jet.suu) * uu + cross2 * vv;
    let rv2 = jet.sv.dot(&jet.sv) + jet.svv.dot(&jet.svv) * vv + cross2 * uu;
    // Two square roots rather than √(ρu² ρv²): the product would overflow for curvatures
    // times domain widths above ~1e77, each factor only above ~1e154.
    let m = ru2.sqrt() * rv2.sqrt();
    if m == 0.0 || !m.is_finite() {
        return 0.0;
    }
    cross_norm / m
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
    /// N·(Su × Sv) = σ |Su × Sv| (σ = ±1 from [`Orientation`]): the factor of u'v'' − v'u''
    /// in the geodesic curvature (`frame::darboux_frame_at`).
    pub signed_area: f64,
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
        let conditioning = surface_conditioning(jet, area, u_extent, v_extent);
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
        let mut half_diff = 0.5 * (w11 - w22);
        let mean = 0.5 * (w11 + w22);
        let mut w12s = w12;
        // √ rather than hypot: hypot is several times slower. Where the squares could
        // under- or overflow (curvatures beyond 2^±450 per unit length, e.g. a surface scaled
        // by 1e±150), h and W12 are first scaled by a power of two, which is exact: the
        // eigen-solve then gives the bits it would give without the scaling, and neither a
        // false umbilic (d = 0) nor a zero or infinite direction. The batch kernel sends such
        // points here.
        let big = half_diff.abs().max(w12.abs());
        let unscale = if (EIGEN_SAFE_LO..=EIGEN_SAFE_HI).contains(&big) || big == 0.0 {
            1.0
        } else {
            // 2^-e with e the binary exponent of `big` (exact; `big` is finite here or the
            // jet check above would have failed, or it is NaN and everything is NaN).
            let e = ((big.to_bits() >> 52) & 0x7ff) as i32 - 1023;
            let s = 2f64.powi(-e.clamp(-1000, 1000));
            half_diff *= s;
            w12s *= s;
            1.0 / s
        };
        let ds = (half_diff * half_diff + w12s * w12s).sqrt();
        let d = ds * unscale;
        let k1 = mean + d;
        let k2 = mean - d;
        // Eigenvector of k1, from whichever of the two equivalent forms is better conditioned:
        // (d + h, W12) when h = (W11 − W22)/2 ≥ 0, else (W12, d − h) (in the scaled units).
        // At an umbilic (d at round-off level) every direction is principal: take e1.
        let scale = w11.abs().max(w22.abs()).max(w12.abs());
        let (x, y) = if d <= 4.0 * f64::EPSILON * scale {
            (1.0, 0.0)
        } else if half_diff >= 0.0 {
            (ds + half_diff, w12s)
        } else {
            (w12s, ds - half_diff)
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
            signed_area: sigma * area,
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
