//! Second-order jets and third partials of many points of a NURBS surface in one pass, for
//! the rates' batch ([`SurfaceSource::jets_and_third_block`](crate::surface::SurfaceSource::jets_and_third_block)).
//!
//! The grouped evaluation of `block.rs` carried one order further: basis rows with the third
//! derivative (`basis_rows_lanes` with four rows, the first three the same bits), the tensor
//! sums of the ten homogeneous partials A_kl, k + l ≤ 3 (the first six accumulated exactly as
//! `tensor_sums_v` does), and the quotient rule of A4.4 (The NURBS Book, 2nd ed., p. 137) to
//! third order on [x, y, z, w] at once, the second-order part by the operations of
//! `quotient_into`:
//!
//! - S_30 = (A_30 − 3 w_10 S_20 − 3 w_20 S_10 − w_30 S) / w,
//! - S_21 = (A_21 − w_01 S_20 − 2 w_10 S_11 − 2 w_11 S_10 − w_20 S_01 − w_21 S) / w,
//! - S_12 = (A_12 − w_10 S_02 − 2 w_01 S_11 − 2 w_11 S_01 − w_02 S_10 − w_12 S) / w,
//! - S_03 = (A_03 − 3 w_01 S_02 − 3 w_02 S_01 − w_03 S) / w,
//!
//! each left to right, 1/w one division. So the jets are the bits of
//! [`NurbsSurface::jet_unchecked`], and the third partials agree with
//! [`NurbsSurface::partials_unchecked`] to round-off (both tested). Degrees 1 to 3 in each
//! direction, at least 2 in one (the same cases as the second-order block); other degrees
//! take the one-point paths.

use super::super::basis::{Lanes, basis_rows_lanes};
use super::super::quad::QuadOps;
#[cfg(not(target_arch = "x86_64"))]
use super::super::quad::Scalar as Sse2;
#[cfg(target_arch = "x86_64")]
use super::super::quad::{Avx, Sse2};
use super::NurbsSurface;
use crate::geometry::jet::{DerivOrder, SurfaceJet};
use crate::geometry::math::Vec3;
use crate::geometry::rates::ThirdPartials;
use crate::surface::SurfaceHint;

const GROUP: usize = 4;
type L = Lanes<GROUP>;

impl NurbsSurface {
    /// The second-order jets at (u\[i\], v\[i\]) into `jets[i]` (the bits of
    /// [`Self::jet_unchecked`]) and the third partials [Suuu, Suuv, Suvv, Svvv] into
    /// `third[i]`, for i below the shortest length; the hint carried as by a loop of one-point
    /// evaluations. The same conditions on (u, v) as [`Self::jet_unchecked`]; never
    /// allocates. A block of one point gives the bits it gives that point in any block.
    pub(crate) fn jets_third_unchecked_block(
        &self,
        u: &[f64],
        v: &[f64],
        hint: &mut SurfaceHint,
        jets: &mut [SurfaceJet],
        third: &mut [ThirdPartials],
    ) {
        #[cfg(target_arch = "x86_64")]
        if crate::isa::vector_kernels() >= crate::isa::VectorKernels::Avx2 {
            // SAFETY: the processor supports AVX2 (`vector_kernels` never exceeds the
            // supported variant).
            unsafe { self.third_avx2(u, v, hint, jets, third) };
            return;
        }
        self.third_portable(u, v, hint, jets, third);
    }

    #[inline(never)]
    fn third_portable(
        &self,
        u: &[f64],
        v: &[f64],
        hint: &mut SurfaceHint,
        jets: &mut [SurfaceJet],
        third: &mut [ThirdPartials],
    ) {
        self.third_with::<Sse2>(u, v, hint, jets, third);
    }

    /// # Safety
    /// The processor must support AVX2.
    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx2")]
    unsafe fn third_avx2(
        &self,
        u: &[f64],
        v: &[f64],
        hint: &mut SurfaceHint,
        jets: &mut [SurfaceJet],
        third: &mut [ThirdPartials],
    ) {
        self.third_with::<Avx>(u, v, hint, jets, third);
    }

    #[inline(always)]
    fn third_with<M: QuadOps>(
        &self,
        u: &[f64],
        v: &[f64],
        hint: &mut SurfaceHint,
        jets: &mut [SurfaceJet],
        third: &mut [ThirdPartials],
    ) {
        let n = u.len().min(v.len()).min(jets.len()).min(third.len());
        let (u, v, jets, third) = (&u[..n], &v[..n], &mut jets[..n], &mut third[..n]);
        match (self.u_knots.degree(), self.v_knots.degree()) {
            (3, 3) => return self.groups3::<4, 3, 3, M>(u, v, hint, jets, third),
            (3, 2) => return self.groups3::<4, 3, 2, M>(u, v, hint, jets, third),
            (2, 3) => return self.groups3::<4, 2, 3, M>(u, v, hint, jets, third),
            (2, 2) => return self.groups3::<3, 2, 2, M>(u, v, hint, jets, third),
            (2, 1) => return self.groups3::<3, 2, 1, M>(u, v, hint, jets, third),
            (1, 2) => return self.groups3::<3, 1, 2, M>(u, v, hint, jets, third),
            _ => {}
        }
        let mut h3 = *hint;
        self.block_with::<M>(u, v, DerivOrder::Second, hint, jets);
        for ((&u, &v), o) in u.iter().zip(v).zip(third.iter_mut()) {
            let p = self.partials_unchecked(u, v, 3, &mut h3);
            *o = [p.d[3][0], p.d[2][1], p.d[1][2], p.d[0][3]];
        }
    }

    #[inline(always)]
    fn groups3<const N: usize, const P: usize, const Q: usize, M: QuadOps>(
        &self,
        u: &[f64],
        v: &[f64],
        hint: &mut SurfaceHint,
        jets: &mut [SurfaceJet],
        third: &mut [ThirdPartials],
    ) {
        let n = u.len();
        let (knots_u, knots_v) = (self.u_knots.knots(), self.v_knots.knots());
        for start in (0..n).step_by(GROUP) {
            let len = GROUP.min(n - start);
            let (mut xu, mut xv) = ([0.0; GROUP], [0.0; GROUP]);
            for l in 0..GROUP {
                let i = start + l.min(len - 1);
                (xu[l], xv[l]) = (u[i], v[i]);
            }
            let (span_u, same_u) = self.u_knots.group_spans(&xu, len, &mut hint.u);
            let (span_v, same_v) = self.v_knots.group_spans(&xv, len, &mut hint.v);
            let (ru, rv) = (&self.u_recip[..], &self.v_recip[..]);
            let nu: [[L; N]; 4] = if same_u {
                basis_rows_lanes::<N, P, GROUP, true, 4>(knots_u, ru, &span_u, Lanes(xu), 3)
            } else {
                basis_rows_lanes::<N, P, GROUP, false, 4>(knots_u, ru, &span_u, Lanes(xu), 3)
            };
            let nv: [[L; N]; 4] = if same_v {
                basis_rows_lanes::<N, Q, GROUP, true, 4>(knots_v, rv, &span_v, Lanes(xv), 3)
            } else {
                basis_rows_lanes::<N, Q, GROUP, false, 4>(knots_v, rv, &span_v, Lanes(xv), 3)
            };
            // SAFETY: the caller chose `M` for this processor.
            let mut h = [[unsafe { M::zero() }; 10]; GROUP];
            for (l, h) in h.iter_mut().enumerate().take(len) {
                *h = self.tensor_sums3_v::<N, M>(
                    P,
                    Q,
                    span_u[l],
                    span_v[l],
                    &lane4(&nu, l),
                    &lane4(&nv, l),
                );
            }
            let jets = &mut jets[start..start + len];
            let third = &mut third[start..start + len];
            for ((j, t), h) in jets.iter_mut().zip(third.iter_mut()).zip(&h) {
                self.quotient3_into::<M>(h, j, t);
            }
        }
    }

    /// The ten homogeneous partials A, Au, Av, Auu, Auv, Avv, Auuu, Auuv, Auvv, Avvv, each
    /// [x, y, z, w] in one vector of `M`: the first six by the operations of `tensor_sums_v`
    /// at order 2, in the same order.
    #[inline(always)]
    fn tensor_sums3_v<const N: usize, M: QuadOps>(
        &self,
        p: usize,
        q: usize,
        span_u: usize,
        span_v: usize,
        nu: &[[f64; N]; 4],
        nv: &[[f64; N]; 4],
    ) -> [M::V; 10] {
        let count_v = self.v_knots.count();
        let first = (span_u - p) * count_v + (span_v - q);
        // SAFETY (every `M::` call): the caller chose `M` for this processor.
        let z = unsafe { M::zero() };
        let mut h = [z; 10];
        let block = &self.net[first..];
        for r in 0..p + 1 {
            let row = &block[r * count_v..][..q + 1];
            let (mut t0, mut t1, mut t2, mut t3) = (z, z, z, z);
            for (s, cp) in row.iter().enumerate() {
                let cp = unsafe { M::load(cp) };
                t0 = unsafe { M::madd(t0, nv[0][s], cp) };
                t1 = unsafe { M::madd(t1, nv[1][s], cp) };
                t2 = unsafe { M::madd(t2, nv[2][s], cp) };
                t3 = unsafe { M::madd(t3, nv[3][s], cp) };
            }
            unsafe {
                h[0] = M::madd(h[0], nu[0][r], t0);
                h[1] = M::madd(h[1], nu[1][r], t0);
                h[2] = M::madd(h[2], nu[0][r], t1);
                h[3] = M::madd(h[3], nu[2][r], t0);
                h[4] = M::madd(h[4], nu[1][r], t1);
                h[5] = M::madd(h[5], nu[0][r], t2);
                h[6] = M::madd(h[6], nu[3][r], t0);
                h[7] = M::madd(h[7], nu[2][r], t1);
                h[8] = M::madd(h[8], nu[1][r], t2);
                h[9] = M::madd(h[9], nu[0][r], t3);
            }
        }
        h
    }

    /// The jet and the third partials from the ten homogeneous partials (see the module's
    /// formulas), written straight into `jet` and `third`.
    #[inline(always)]
    fn quotient3_into<M: QuadOps>(
        &self,
        h: &[M::V; 10],
        jet: &mut SurfaceJet,
        third: &mut ThirdPartials,
    ) {
        // SAFETY (every `M::` call): the caller chose `M` for this processor.
        let put = |x: M::V, v: &mut Vec3| unsafe { M::store3(x, &mut v.data.0[0]) };
        if !self.rational {
            put(h[0], &mut jet.p);
            put(h[1], &mut jet.su);
            put(h[2], &mut jet.sv);
            put(h[3], &mut jet.suu);
            put(h[4], &mut jet.suv);
            put(h[5], &mut jet.svv);
            for (k, t) in third.iter_mut().enumerate() {
                put(h[6 + k], t);
            }
            return;
        }
        let (mul, sub, w) = (
            |a, b| unsafe { M::mul(a, b) },
            |a, b| unsafe { M::sub(a, b) },
            |a| unsafe { M::splat_w(a) },
        );
        // The second-order part: the operations of `quotient_into` at K = 2.
        let inv_w = unsafe { M::div(M::splat(1.0), w(h[0])) };
        let s = mul(h[0], inv_w);
        put(s, &mut jet.p);
        let (wu, wv) = (w(h[1]), w(h[2]));
        let su = mul(sub(h[1], mul(s, wu)), inv_w);
        let sv = mul(sub(h[2], mul(s, wv)), inv_w);
        put(su, &mut jet.su);
        put(sv, &mut jet.sv);
        let (wuu, wuv, wvv) = (w(h[3]), w(h[4]), w(h[5]));
        let two = unsafe { M::splat(2.0) };
        let (two_wu, two_wv) = (mul(two, wu), mul(two, wv));
        let suu = mul(sub(sub(h[3], mul(su, two_wu)), mul(s, wuu)), inv_w);
        let suv = mul(
            sub(sub(sub(h[4], mul(sv, wu)), mul(su, wv)), mul(s, wuv)),
            inv_w,
        );
        let svv = mul(sub(sub(h[5], mul(sv, two_wv)), mul(s, wvv)), inv_w);
        put(suu, &mut jet.suu);
        put(suv, &mut jet.suv);
        put(svv, &mut jet.svv);
        // Third order.
        let (wuuu, wuuv, wuvv, wvvv) = (w(h[6]), w(h[7]), w(h[8]), w(h[9]));
        let three = unsafe { M::splat(3.0) };
        let (three_wu, three_wv) = (mul(three, wu), mul(three, wv));
        let (three_wuu, three_wvv) = (mul(three, wuu), mul(three, wvv));
        let two_wuv = mul(two, wuv);
        let suuu = mul(
            sub(
                sub(sub(h[6], mul(suu, three_wu)), mul(su, three_wuu)),
                mul(s, wuuu),
            ),
            inv_w,
        );
        let suuv = mul(
            sub(
                sub(
                    sub(
                        sub(sub(h[7], mul(suu, wv)), mul(suv, two_wu)),
                        mul(su, two_wuv),
                    ),
                    mul(sv, wuu),
                ),
                mul(s, wuuv),
            ),
            inv_w,
        );
        let suvv = mul(
            sub(
                sub(
                    sub(
                        sub(sub(h[8], mul(svv, wu)), mul(suv, two_wv)),
                        mul(sv, two_wuv),
                    ),
                    mul(su, wvv),
                ),
                mul(s, wuvv),
            ),
            inv_w,
        );
        let svvv = mul(
            sub(
                sub(sub(h[9], mul(svv, three_wv)), mul(sv, three_wvv)),
                mul(s, wvvv),
            ),
            inv_w,
        );
        put(suuu, &mut third[0]);
        put(suuv, &mut third[1]);
        put(suvv, &mut third[2]);
        put(svvv, &mut third[3]);
    }
}

/// Lane `l` of four basis rows.
#[inline(always)]
fn lane4<const N: usize>(rows: &[[L; N]; 4], l: usize) -> [[f64; N]; 4] {
    let mut out = [[0.0; N]; 4];
    for (o, row) in out.iter_mut().zip(rows) {
        for (o, x) in o.iter_mut().zip(row) {
            *o = x.0[l];
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::*;
    use crate::geometry::math::lcg;

    /// Jets: the bits of `jet_unchecked`; third partials: `partials_unchecked` to round-off;
    /// a block of one point: the same bits as that point within a longer block; every degree
    /// pair of the grouped path and one that is not, rational and not, every vector variant.
    #[test]
    fn jets_are_the_one_point_bits_and_third_partials_agree() {
        let supported = crate::isa::supported_vector_kernels();
        for (p, q) in [
            (3, 3),
            (3, 2),
            (2, 3),
            (2, 2),
            (2, 1),
            (1, 2),
            (1, 1),
            (4, 3),
        ] {
            for rational in [false, true] {
                let mut st = (p * 10 + q) as u64 + rational as u64;
                let s = super::super::random_test_surface(p, q, p + 5, q + 4, rational, &mut st);
                let (ud, vd) = (s.u_knots().domain(), s.v_knots().domain());
                let n = 37;
                let mut us: Vec<f64> = (0..n).map(|_| ud.lo + ud.width() * lcg(&mut st)).collect();
                let vs: Vec<f64> = (0..n).map(|_| vd.lo + vd.width() * lcg(&mut st)).collect();
                us.sort_by(f64::total_cmp);
                for variant in [
                    crate::isa::VectorKernels::Baseline,
                    crate::isa::VectorKernels::Avx2,
                ] {
                    if variant > supported {
                        continue;
                    }
                    let mut jets = vec![SurfaceJet::default(); n];
                    let mut third = vec![[Vec3::zeros(); 4]; n];
                    let mut h = SurfaceHint::default();
                    if variant == crate::isa::VectorKernels::Avx2 {
                        #[cfg(target_arch = "x86_64")]
                        unsafe {
                            s.third_avx2(&us, &vs, &mut h, &mut jets, &mut third)
                        };
                    } else {
                        s.third_portable(&us, &vs, &mut h, &mut jets, &mut third);
                    }
                    for i in 0..n {
                        let j = s.jet_unchecked(
                            us[i],
                            vs[i],
                            DerivOrder::Second,
                            &mut SurfaceHint::default(),
                        );
                        assert_eq!(jets[i], j, "({p}, {q}) {rational} point {i}");
                        let r = s.partials_unchecked(us[i], vs[i], 3, &mut SurfaceHint::default());
                        let want = [r.d[3][0], r.d[2][1], r.d[1][2], r.d[0][3]];
                        for (a, b) in third[i].iter().zip(&want) {
                            assert!(
                                (a - b).norm() <= 1e-11 * (1.0 + b.norm()),
                                "({p}, {q}) {rational} point {i}: {a} vs {b}"
                            );
                        }
                        let (mut j1, mut t1) = ([SurfaceJet::default()], [[Vec3::zeros(); 4]]);
                        s.third_portable(
                            &us[i..=i],
                            &vs[i..=i],
                            &mut SurfaceHint::default(),
                            &mut j1,
                            &mut t1,
                        );
                        assert_eq!(j1[0], jets[i]);
                        assert_eq!(t1[0], third[i], "({p}, {q}) {rational} point {i} alone");
                    }
                }
            }
        }
    }
}
