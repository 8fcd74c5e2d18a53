//! The jets of many points of a NURBS surface in one call (the batch path's
//! [`SurfaceSource::jets_in_domain_block`](crate::surface::SurfaceSource::jets_in_domain_block)),
//! a group of [`GROUP`] points at a time.
//!
//! One point at a time, an evaluation is bound by latency: the Cox–de Boor recursion is a chain
//! of dependent multiplications and additions, and the quotient rule waits for one division.
//! Here, per group: the span searches of its points in order (the hint carried as by a loop of
//! one-point evaluations), the basis rows of all its points at once in lane-wide form
//! ([`basis_rows_lanes`], one lane per point), then point by point the tensor sums and the
//! quotient rule, both four wide over [x, y, z, w] (`tensor_sums_v`, `quotient_into`; the points
//! are independent, so the processor overlaps them), written straight into the caller's jets.
//! Every lane and component performs the one-point path's operations in the same order, so the
//! jets are the bits of [`NurbsSurface::jet_unchecked`] (tested below).

use super::super::basis::{Lanes, basis_rows_lanes};
use super::super::quad::QuadOps;
#[cfg(not(target_arch = "x86_64"))]
use super::super::quad::Scalar as Sse2;
#[cfg(target_arch = "x86_64")]
use super::super::quad::{Avx, Sse2};
use super::NurbsSurface;
use crate::geometry::jet::{DerivOrder, SurfaceJet};
use crate::surface::SurfaceHint;

/// Points evaluated together: the lanes of the basis rows. Four fill
/// one AVX vector.
const GROUP: usize = 4;

type L = Lanes<GROUP>;

impl NurbsSurface {
    /// The jets at (u\[i\], v\[i\]) up to `order` into `out[i]`, for i below the shortest of
    /// the three lengths: the bits of [`Self::jet_unchecked`] at each point, with `hint`
    /// carried from point to point as by a loop of [`Self::jet_unchecked`] calls (and left
    /// where the last point put it). The same conditions on (u, v) as [`Self::jet_unchecked`];
    /// never panics, never allocates.
    pub(super) fn jets_unchecked_block(
        &self,
        u: &[f64],
        v: &[f64],
        order: DerivOrder,
        hint: &mut SurfaceHint,
        out: &mut [SurfaceJet],
    ) {
        #[cfg(target_arch = "x86_64")]
        if crate::isa::vector_kernels() >= crate::isa::VectorKernels::Avx2 {
            // SAFETY: the processor supports AVX2 (`vector_kernels` never exceeds the
            // supported variant; the AVX-512F variant implies AVX2).
            unsafe { self.block_avx2(u, v, order, hint, out) };
            return;
        }
        self.block_portable(u, v, order, hint, out);
    }

    /// [`Self::block_with`] in the baseline instruction set (SSE2 on x86-64). Out of line, so
    /// that the dispatcher's stack frame stays small in unoptimised builds, which give every
    /// local of every inlined copy of the kernel its own slot.
    #[inline(never)]
    fn block_portable(
        &self,
        u: &[f64],
        v: &[f64],
        order: DerivOrder,
        hint: &mut SurfaceHint,
        out: &mut [SurfaceJet],
    ) {
        self.block_with::<Sse2>(u, v, order, hint, out);
    }

    /// [`Self::block_with`] compiled for AVX2 (the basis rows and the quotient rule on 256-bit
    /// vectors of four points, the tensor sums on one 256-bit vector per homogeneous point).
    ///
    /// # Safety
    /// The processor must support AVX2.
    #[cfg(target_arch = "x86_64")]
    #[target_feature(enable = "avx2")]
    unsafe fn block_avx2(
        &self,
        u: &[f64],
        v: &[f64],
        order: DerivOrder,
        hint: &mut SurfaceHint,
        out: &mut [SurfaceJet],
    ) {
        self.block_with::<Avx>(u, v, order, hint, out);
    }

    /// The block evaluation with the vector arithmetic `M` of the tensor sums (usable on this
    /// processor: `Avx` only with AVX2), dispatched on the order and the degrees. Second-order
    /// jets (what the batch path asks for) of degrees up to 3 in each direction, at least 2 in
    /// one, take the grouped path; everything else is a loop of one-point evaluations.
    #[inline(always)]
    pub(super) fn block_with<M: QuadOps>(
        &self,
        u: &[f64],
        v: &[f64],
        order: DerivOrder,
        hint: &mut SurfaceHint,
        out: &mut [SurfaceJet],
    ) {
        if order == DerivOrder::Second {
            match (self.u_knots.degree(), self.v_knots.degree()) {
                (3, 3) => return self.groups::<2, 4, 3, 3, M>(u, v, hint, out),
                (3, 2) => return self.groups::<2, 4, 3, 2, M>(u, v, hint, out),
                (2, 3) => return self.groups::<2, 4, 2, 3, M>(u, v, hint, out),
                (2, 2) => return self.groups::<2, 3, 2, 2, M>(u, v, hint, out),
                (2, 1) => return self.groups::<2, 3, 2, 1, M>(u, v, hint, out),
                (1, 2) => return self.groups::<2, 3, 1, 2, M>(u, v, hint, out),
                _ => {}
            }
        }
        for ((&u, &v), o) in u.iter().zip(v).zip(out.iter_mut()) {
            *o = self.jet_with::<M>(u, v, order, hint);
        }
    }

    /// The grouped evaluation for derivatives up to order K, degrees `P`, `Q` (> 0, known at
    /// compile time, the surface's), basis rows of N entries (`P`, `Q` < N), the arithmetic of
    /// [`Self::eval`] with per-span reciprocals lane by lane.
    #[inline(always)]
    fn groups<const K: usize, const N: usize, const P: usize, const Q: usize, M: QuadOps>(
        &self,
        u: &[f64],
        v: &[f64],
        hint: &mut SurfaceHint,
        out: &mut [SurfaceJet],
    ) {
        debug_assert!(P == self.u_knots.degree() && Q == self.v_knots.degree());
        let n = u.len().min(v.len()).min(out.len());
        let (knots_u, knots_v) = (self.u_knots.knots(), self.v_knots.knots());
        for start in (0..n).step_by(GROUP) {
            let len = GROUP.min(n - start);
            // Lanes past the end repeat the last point; their results are dropped.
            let (mut xu, mut xv) = ([0.0; GROUP], [0.0; GROUP]);
            for l in 0..GROUP {
                let i = start + l.min(len - 1);
                (xu[l], xv[l]) = (u[i], v[i]);
            }
            // The spans in point order, each direction with its own hint, as a loop of
            // one-point evaluations searches them (the u hint never depends on v).
            let (span_u, same_u) = self.u_knots.group_spans(&xu, len, &mut hint.u);
            let (span_v, same_v) = self.v_knots.group_spans(&xv, len, &mut hint.v);
            let (ru, rv) = (&self.u_recip[..], &self.v_recip[..]);
            let nu = if same_u {
                basis_rows_lanes::<N, P, GROUP, true, 3>(knots_u, ru, &span_u, Lanes(xu), K)
            } else {
                basis_rows_lanes::<N, P, GROUP, false, 3>(knots_u, ru, &span_u, Lanes(xu), K)
            };
            let nv = if same_v {
                basis_rows_lanes::<N, Q, GROUP, true, 3>(knots_v, rv, &span_v, Lanes(xv), K)
            } else {
                basis_rows_lanes::<N, Q, GROUP, false, 3>(knots_v, rv, &span_v, Lanes(xv), K)
            };
            // Per point in vector form: first the tensor sums of every point, then the
            // quotient rule of every point, written straight into `out` (the divisions and the
            // quotients' dependent chains of the group's points overlap).
            let out = &mut out[start..start + len];
            // SAFETY: the caller chose `M` for this processor.
            let mut h = [[unsafe { M::zero() }; 6]; GROUP];
            for (l, h) in h.iter_mut().enumerate().take(len) {
                *h = self.tensor_sums_v::<K, N, M>(
                    P,
                    Q,
                    span_u[l],
                    span_v[l],
                    &lane(&nu, l),
                    &lane(&nv, l),
                );
            }
            for (o, h) in out.iter_mut().zip(&h) {
                self.quotient_into::<K, M>(h, o);
            }
        }
    }
}

/// Lane `l` of basis rows.
#[inline(always)]
fn lane<const N: usize, const R: usize>(rows: &[[L; N]; R], l: usize) -> [[f64; N]; R] {
    let mut out = [[0.0; N]; R];
    for (o, row) in out.iter_mut().zip(rows) {
        for (o, x) in o.iter_mut().zip(row) {
            *o = x.0[l];
        }
    }
    out
}

#[cfg(test)]
mod tests {
    use super::super::super::quad::Scalar;
    use super::*;
    use crate::nurbs::SpanHint;
    use crate::surface::SurfaceSource;

    use crate::geometry::math::lcg;

    /// A random surface with (p + 5) × (q + 4) control points.
    fn surface(p: usize, q: usize, rational: bool, st: &mut u64) -> NurbsSurface {
        super::super::random_test_surface(p, q, p + 5, q + 4, rational, st)
    }

    /// A parameter in `kv`'s domain: mostly marching forward (so that hints hit), sometimes
    /// jumping, sometimes exactly on a knot or a domain end.
    fn param(kv: &crate::nurbs::KnotVector, prev: f64, st: &mut u64) -> f64 {
        let d = kv.domain();
        let k = kv.knots();
        match (lcg(st) * 10.0) as usize {
            0 => d.lo,
            1 => d.hi,
            2 | 3 => {
                let i = (lcg(st) * k.len() as f64) as usize;
                k[i.min(k.len() - 1)].clamp(d.lo, d.hi)
            }
            4 => d.lo + d.width() * lcg(st),
            _ => (prev + 0.02 * d.width() * lcg(st)).min(d.hi),
        }
    }

    /// [`NurbsSurface::block_with`] with `M`, out of line (each copy of the kernel takes a
    /// large stack frame in unoptimised builds).
    #[inline(never)]
    fn with<M: QuadOps>(
        s: &NurbsSurface,
        u: &[f64],
        v: &[f64],
        order: DerivOrder,
        hint: &mut SurfaceHint,
        out: &mut [SurfaceJet],
    ) {
        s.block_with::<M>(u, v, order, hint, out);
    }

    fn bits(j: &SurfaceJet) -> [u64; 18] {
        let mut b = [0; 18];
        for (i, v) in [j.p, j.su, j.sv, j.suu, j.suv, j.svv].iter().enumerate() {
            for c in 0..3 {
                b[3 * i + c] = v[c].to_bits();
            }
        }
        b
    }

    // The block evaluation gives, point by point, the bits of the one-point path
    // (`jet_unchecked`), and leaves the hint where a loop of one-point calls leaves it: for
    // chunks of every length 1..=64, rational and non-rational, every degree pair of the
    // grouped path and some of the one-point fallback, every order, points on knots and at the
    // domain ends, each vector arithmetic.
    #[test]
    fn block_gives_the_bits_of_the_one_point_path() {
        let mut st = 2024u64;
        let orders = [DerivOrder::Position, DerivOrder::First, DerivOrder::Second];
        let mut on_knot = 0;
        for (p, q) in [
            (3, 3),
            (3, 2),
            (2, 3),
            (2, 2),
            (2, 1),
            (1, 2),
            (1, 1),
            (3, 1),
            (4, 2),
        ] {
            for rational in [true, false] {
                let s = surface(p, q, rational, &mut st);
                let (mut u0, mut v0) = (s.u_knots.domain().lo, s.v_knots.domain().lo);
                for len in 1..=64 {
                    let mut us = [0.0; 64];
                    let mut vs = [0.0; 64];
                    for i in 0..len {
                        u0 = param(&s.u_knots, u0, &mut st);
                        v0 = param(&s.v_knots, v0, &mut st);
                        (us[i], vs[i]) = (u0, v0);
                        let on = |x: f64, k: &[f64]| k.contains(&x);
                        if on(u0, s.u_knots.knots()) || on(v0, s.v_knots.knots()) {
                            on_knot += 1;
                        }
                    }
                    let order = orders[len % 3];
                    // Start from a hint that is sometimes stale, sometimes empty.
                    let start = if len % 4 == 0 {
                        SurfaceHint::default()
                    } else {
                        SurfaceHint {
                            u: SpanHint(Some(p + len % 3)),
                            v: SpanHint(Some(q)),
                        }
                    };
                    let mut want_hint = start;
                    let want: Vec<[u64; 18]> = (0..len)
                        .map(|i| bits(&s.jet_unchecked(us[i], vs[i], order, &mut want_hint)))
                        .collect();
                    let check = |name: &str, got: &[SurfaceJet], hint: SurfaceHint| {
                        for i in 0..len {
                            assert_eq!(
                                bits(&got[i]),
                                want[i],
                                "{name}: degrees ({p}, {q}), rational {rational}, {order:?}, \
                                 chunk of {len}, point {i} at ({}, {})",
                                us[i],
                                vs[i]
                            );
                        }
                        assert_eq!(hint, want_hint, "{name}: hint after the block");
                    };
                    let mut out = [SurfaceJet::default(); 64];
                    let mut hint = start;
                    s.jets_in_domain_block(
                        &us[..len],
                        &vs[..len],
                        order,
                        &mut hint,
                        &mut out[..len],
                    )
                    .unwrap();
                    check("dispatched", &out[..len], hint);
                    type Variant = fn(
                        &NurbsSurface,
                        &[f64],
                        &[f64],
                        DerivOrder,
                        &mut SurfaceHint,
                        &mut [SurfaceJet],
                    );
                    let variants: &[(&str, Variant)] = &[
                        ("scalar", with::<Scalar>),
                        #[cfg(target_arch = "x86_64")]
                        ("sse2", with::<Sse2>),
                    ];
                    for &(name, f) in variants {
                        let mut hint = start;
                        f(
                            &s,
                            &us[..len],
                            &vs[..len],
                            order,
                            &mut hint,
                            &mut out[..len],
                        );
                        check(name, &out[..len], hint);
                    }
                }
            }
        }
        assert!(on_knot > 500, "only {on_knot} points on a knot");
    }
}
