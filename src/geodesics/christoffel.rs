//! Christoffel symbols of a surface and the geodesic acceleration in the parameter plane.
//!
//! With the metric g = [[E, F], [F, G]] (E = Su·Su, F = Su·Sv, G = Sv·Sv), the Christoffel
//! symbols of the second kind are Γᵏᵢⱼ = Σₗ gᵏˡ (Sᵢⱼ · Sₗ) (do Carmo §4-3, where they are written
//! with the derivatives of E, F, G: Sᵤᵤ·Sᵤ = Eᵤ/2, Sᵤᵤ·Sᵥ = Fᵤ − Eᵥ/2, Sᵤᵥ·Sᵤ = Eᵥ/2,
//! Sᵤᵥ·Sᵥ = Gᵤ/2, Sᵥᵥ·Sᵤ = Fᵥ − Gᵤ/2, Sᵥᵥ·Sᵥ = Gᵥ/2; the two forms are the same numbers).
//! They need the second derivatives of S, i.e. one second-order jet.
//!
//! The geodesic acceleration (u'', v'') = −(Γ¹(u', v'), Γ²(u', v')) is computed without forming
//! the six symbols: with W = Suu u'² + 2 Suv u'v' + Svv v'², solve
//! g (u'', v'')ᵀ = −(W·Su, W·Sv)ᵀ, which says that c'' = W + Su u'' + Sv v'' is normal to the
//! surface (a geodesic has no tangential acceleration). Same numbers, fewer operations.

// `!(x > 0.0)` and the like are meant: they refuse NaN too. Index loops follow the formulas
// (Butcher tableaux, stage sums) term by term.
#![allow(clippy::neg_cmp_op_on_partial_ord, clippy::needless_range_loop)]

use crate::geometry::jet::SurfaceJet;

/// The six Christoffel symbols of the second kind at a surface point.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Christoffel {
    /// Γ¹ as [Γ¹₁₁, Γ¹₁₂, Γ¹₂₂] (index 1 = u, 2 = v).
    pub u: [f64; 3],
    /// Γ² as [Γ²₁₁, Γ²₁₂, Γ²₂₂].
    pub v: [f64; 3],
}

/// The Christoffel symbols from a second-order jet; `None` where EG − F² ≤ 0 (a degenerate
/// point, where the metric cannot be inverted).
pub fn christoffel(jet: &SurfaceJet) -> Option<Christoffel> {
    let (e, f, g) = (
        jet.su.dot(&jet.su),
        jet.su.dot(&jet.sv),
        jet.sv.dot(&jet.sv),
    );
    let det = e * g - f * f;
    if !(det > 0.0) {
        return None;
    }
    let inv = 1.0 / det;
    let mut out = Christoffel {
        u: [0.0; 3],
        v: [0.0; 3],
    };
    for (i, sij) in [jet.suu, jet.suv, jet.svv].iter().enumerate() {
        let (a, b) = (sij.dot(&jet.su), sij.dot(&jet.sv));
        out.u[i] = (g * a - f * b) * inv;
        out.v[i] = (e * b - f * a) * inv;
    }
    Some(out)
}

/// The geodesic acceleration (u'', v'') for the parameter velocity (p, q) = (u', v'), from a
/// second-order jet (see the module docs); `None` where EG − F² ≤ 0.
#[inline]
pub fn geodesic_acceleration(jet: &SurfaceJet, p: f64, q: f64) -> Option<(f64, f64)> {
    let (e, f, g) = (
        jet.su.dot(&jet.su),
        jet.su.dot(&jet.sv),
        jet.sv.dot(&jet.sv),
    );
    let det = e * g - f * f;
    if !(det > 0.0) {
        return None;
    }
    let w = jet.suu * (p * p) + jet.suv * (2.0 * p * q) + jet.svv * (q * q);
    let (r1, r2) = (-w.dot(&jet.su), -w.dot(&jet.sv));
    let inv = 1.0 / det;
    Some(((g * r1 - f * r2) * inv, (e * r2 - f * r1) * inv))
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::analytic::sphere;
    use crate::geometry::jet::DerivOrder;
    use crate::surface::{SurfaceHint, SurfaceSource};

    /// Sphere S = R(sin v cos u, sin v sin u, cos v): E = R² sin² v, F = 0, G = R², so
    /// Γ¹₁₂ = cot v, Γ²₁₁ = −sin v cos v, the others 0 (do Carmo §4-3, from Eᵥ = 2R² sin v cos v).
    #[test]
    fn sphere_symbols_match_the_closed_form() {
        let s = sphere(2.0);
        let (u, v) = (0.7, 1.1);
        let jet = s
            .checked_jet(u, v, DerivOrder::Second, &mut SurfaceHint::default())
            .unwrap();
        let c = christoffel(&jet).unwrap();
        let expect_u = [0.0, v.cos() / v.sin(), 0.0];
        let expect_v = [-v.sin() * v.cos(), 0.0, 0.0];
        for i in 0..3 {
            assert!((c.u[i] - expect_u[i]).abs() < 1e-14, "{:?}", c);
            assert!((c.v[i] - expect_v[i]).abs() < 1e-14, "{:?}", c);
        }
        // The acceleration agrees with the symbols.
        let (p, q) = (0.3, -0.2);
        let (a, b) = geodesic_acceleration(&jet, p, q).unwrap();
        let ea = -(c.u[0] * p * p + 2.0 * c.u[1] * p * q + c.u[2] * q * q);
        let eb = -(c.v[0] * p * p + 2.0 * c.v[1] * p * q + c.v[2] * q * q);
        assert!((a - ea).abs() < 1e-14 && (b - eb).abs() < 1e-14);
    }
}
