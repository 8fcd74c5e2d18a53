//! Partial derivatives of NURBS surfaces to fourth order: tensor sums of basis derivatives
//! (A3.6 SurfaceDerivsAlg1 on the homogeneous net) and the general quotient rule (A4.4
//! RatSurfaceDerivs):
//!
//! S_kl = (A_kl − Σ_{j=1..l} C(l,j) w_0j S_k,l−j − Σ_{i=1..k} C(k,i) w_i0 S_k−i,l
//!         − Σ_{i=1..k} C(k,i) Σ_{j=1..l} C(l,j) w_ij S_k−i,l−j) / w.
//!
//! A path of its own beside the second-order one (which keeps its bits and speed): stack
//! arrays only, span hints carried as there.

// The formulas index their rows and coefficients as the sources write them.
#![allow(clippy::needless_range_loop)]

use super::NurbsSurface;
use crate::geometry::jet::{MAX_PARTIAL_ORDER, SurfacePartials};
use crate::geometry::math::Vec3;
use crate::nurbs::basis::MAX_ORDER;
use crate::nurbs::high_order::{BINOMIAL, ders_basis};
use crate::surface::{KnotSide, KnotSides, SurfaceHint};

const K: usize = MAX_PARTIAL_ORDER + 1;

impl NurbsSurface {
    /// All partials ∂^(k+l) S / ∂u^k ∂v^l with k + l ≤ `order` (at most 4, larger values are
    /// taken as 4) at (u, v), not checked against the domain (as [`Self::jet_unchecked`]).
    /// Agrees with [`Self::jet_unchecked`] on the orders both give to a few units in the last
    /// place (tested), but is a separate, slower evaluation (A2.3 rows, any order).
    pub fn partials_unchecked(
        &self,
        u: f64,
        v: f64,
        order: usize,
        hint: &mut SurfaceHint,
    ) -> SurfacePartials {
        self.partials_sided_unchecked(u, v, KnotSides::default(), order, hint)
    }

    /// As [`Self::partials_unchecked`], on the given sides of the knot lines through (u, v)
    /// (as [`Self::jet_sided_unchecked`]: with [`KnotSide::Below`] and u on an interior knot,
    /// the polynomial of the span that ends at the knot, the limit from below).
    pub fn partials_sided_unchecked(
        &self,
        u: f64,
        v: f64,
        sides: KnotSides,
        order: usize,
        hint: &mut SurfaceHint,
    ) -> SurfacePartials {
        let (p, q) = (self.u_knots.degree(), self.v_knots.degree());
        if p.max(q) < 4 {
            self.partials_with::<4>(u, v, sides, order, hint)
        } else if p.max(q) < 8 {
            self.partials_with::<8>(u, v, sides, order, hint)
        } else {
            self.partials_with::<MAX_ORDER>(u, v, sides, order, hint)
        }
    }

    fn partials_with<const N: usize>(
        &self,
        u: f64,
        v: f64,
        sides: KnotSides,
        order: usize,
        hint: &mut SurfaceHint,
    ) -> SurfacePartials {
        let d = order.min(MAX_PARTIAL_ORDER);
        let (p, q) = (self.u_knots.degree(), self.v_knots.degree());
        let mut span_u = self.u_knots.find_span(u, &mut hint.u);
        let mut span_v = self.v_knots.find_span(v, &mut hint.v);
        if sides.u == KnotSide::Below {
            span_u = self.u_knots.span_below(u, span_u);
        }
        if sides.v == KnotSide::Below {
            span_v = self.v_knots.span_below(v, span_v);
        }
        let nu = ders_basis::<N>(self.u_knots.knots(), p, span_u, u, d);
        let nv = ders_basis::<N>(self.v_knots.knots(), q, span_v, v, d);
        let count_v = self.v_knots.count();
        let first = (span_u - p) * count_v + (span_v - q);
        // h[k][l] = Σ_r Σ_s N^(k)_r(u) N^(l)_s(v) Pw_rs, homogeneous [x, y, z, w].
        let mut h = [[[0.0f64; 4]; K]; K];
        for r in 0..=p {
            let row = &self.net[first + r * count_v..][..q + 1];
            // t[l] = Σ_s N^(l)_s(v) Pw_rs.
            let mut t = [[0.0f64; 4]; K];
            for (s, cp) in row.iter().enumerate() {
                for (l, tl) in t.iter_mut().enumerate().take(d + 1) {
                    let n = nv[l][s];
                    for c in 0..4 {
                        tl[c] += n * cp.0[c];
                    }
                }
            }
            for k in 0..=d {
                let n = nu[k][r];
                for l in 0..=d - k {
                    for c in 0..4 {
                        h[k][l][c] += n * t[l][c];
                    }
                }
            }
        }
        let mut out = SurfacePartials {
            order,
            ..Default::default()
        };
        let v3 = |a: &[f64; 4]| Vec3::new(a[0], a[1], a[2]);
        if !self.rational {
            for k in 0..=d {
                for l in 0..=d - k {
                    out.d[k][l] = v3(&h[k][l]);
                }
            }
            return out;
        }
        let inv_w = 1.0 / h[0][0][3];
        for k in 0..=d {
            for l in 0..=d - k {
                let mut x = v3(&h[k][l]);
                for j in 1..=l {
                    x -= out.d[k][l - j] * (BINOMIAL[l][j] * h[0][j][3]);
                }
                for i in 1..=k {
                    x -= out.d[k - i][l] * (BINOMIAL[k][i] * h[i][0][3]);
                    for j in 1..=l {
                        x -= out.d[k - i][l - j] * (BINOMIAL[k][i] * BINOMIAL[l][j] * h[i][j][3]);
                    }
                }
                out.d[k][l] = x * inv_w;
            }
        }
        out
    }
}

#[cfg(test)]
mod tests {
    use crate::geometry::jet::DerivOrder;
    use crate::nurbs::surface::random_test_surface;
    use crate::surface::SurfaceHint;

    /// The second-order part agrees with the production path; the third and fourth partials
    /// agree with central differences of the production second partials.
    #[test]
    fn agrees_with_the_second_order_path_and_differences() {
        for (seed, rational) in [(3u64, false), (5, true), (9, true)] {
            let mut st = seed;
            let s = random_test_surface(3, 2, 6, 5, rational, &mut st);
            let mut h = SurfaceHint::default();
            let mids = |kv: &crate::nurbs::KnotVector| -> Vec<f64> {
                let d = kv.domain();
                let mut k = vec![d.lo];
                k.extend_from_slice(kv.interior_breaks());
                k.push(d.hi);
                k.windows(2).map(|w| 0.5 * (w[0] + w[1])).collect()
            };
            let (mu, mv) = (mids(s.u_knots()), mids(s.v_knots()));
            for (&u, &v) in mu.iter().zip(mv.iter().rev()) {
                let hi = s.partials_unchecked(u, v, 4, &mut h);
                let lo = s.jet_unchecked(u, v, DerivOrder::Second, &mut h);
                let j = hi.jet();
                for (a, b) in [
                    (j.p, lo.p),
                    (j.su, lo.su),
                    (j.sv, lo.sv),
                    (j.suu, lo.suu),
                    (j.suv, lo.suv),
                    (j.svv, lo.svv),
                ] {
                    assert!((a - b).norm() <= 1e-12 * (1.0 + b.norm()), "{a} {b}");
                }
                let e = 1e-5;
                let at = |du: f64, dv: f64| {
                    s.jet_unchecked(
                        u + du,
                        v + dv,
                        DerivOrder::Second,
                        &mut SurfaceHint::default(),
                    )
                };
                let (up, um) = (at(e, 0.0), at(-e, 0.0));
                let (vp, vm) = (at(0.0, e), at(0.0, -e));
                let checks = [
                    (hi.suuu(), (up.suu - um.suu) / (2.0 * e)),
                    (hi.suuv(), (up.suv - um.suv) / (2.0 * e)),
                    (hi.suvv(), (up.svv - um.svv) / (2.0 * e)),
                    (hi.svvv(), (vp.svv - vm.svv) / (2.0 * e)),
                    (hi.suuv(), (vp.suu - vm.suu) / (2.0 * e)),
                ];
                for (a, b) in checks {
                    assert!(
                        (a - b).norm() <= 1e-5 * (1.0 + b.norm()),
                        "seed {seed}: {a} vs {b}"
                    );
                }
                let (hp, hm) = (
                    s.partials_unchecked(u + e, v, 4, &mut SurfaceHint::default()),
                    s.partials_unchecked(u - e, v, 4, &mut SurfaceHint::default()),
                );
                let fd = (hp.d[3][0] - hm.d[3][0]) / (2.0 * e);
                assert!((hi.d[4][0] - fd).norm() <= 1e-4 * (1.0 + fd.norm()));
                let fd = (hp.d[1][2] - hm.d[1][2]) / (2.0 * e);
                assert!((hi.d[2][2] - fd).norm() <= 1e-4 * (1.0 + fd.norm()));
            }
        }
    }
}
