//! The Darboux frame and invariants of a block of points at once, in structure-of-arrays form.
//!
//! The same formulas as [`crate::principal::SurfacePoint::new`] and
//! [`crate::frame::darboux_frame_at`], in the same order of operations, written once per lane
//! over plain `[f64; BLOCK]` arrays with no branches (the choices become selects). The compiler
//! turns the loop over lanes into vector instructions, so that the square roots and divisions of
//! several points overlap instead of waiting on each other (one point at a time, the frame is
//! bound by their latency). Since every lane performs exactly the operations of the one-point
//! path, each in IEEE double precision (no fused multiply-add, no reassociation), the results
//! are the same bits; `tests/block.rs` checks it.
//!
//! The kernel does not report errors: it computes every lane and flags the lanes whose checks
//! fail (the checks of the one-point path, the same comparisons). The caller evaluates flagged
//! lanes again by the one-point path, which gives the exact error (or, should a flag be set
//! for a lane the one-point path accepts, its result).
//!
//! Costs, per point, from the formulas (counted by hand): about 250 additions and
//! multiplications, 4 square roots and 9 divisions; no allocation.

use crate::error::StrakeError;
use crate::frame::{Conditioning, DarbouxFrame, ParamScales, STALLED_CURVE_LIMIT, darboux_frame};
use crate::jet::{CurveJet, SurfaceJet};
use crate::math::Vec3;
use crate::path::SampleError;
use crate::principal::{DEGENERATE_SURFACE_LIMIT, Orientation, PrincipalCurvatures};

/// Number of points the kernel processes together: four vectors of two lanes with SSE2 (the
/// portable x86-64 baseline), two of four with AVX2. Measured: 8 and 16 are within noise of
/// each other; 4 leaves latency exposed (`examples/speed_report.rs`).
pub const BLOCK: usize = 8;

type Lanes = [f64; BLOCK];

/// A 3-vector per lane: `v[k][i]` is component k (x, y, z) of lane i.
type Lanes3 = [Lanes; 3];

/// The inputs of a block in structure-of-arrays form.
#[derive(Clone, Copy)]
pub(crate) struct BlockInput {
    su: Lanes3,
    sv: Lanes3,
    suu: Lanes3,
    suv: Lanes3,
    svv: Lanes3,
    du: Lanes,
    dv: Lanes,
    ddu: Lanes,
    ddv: Lanes,
}

/// The outputs of a block in structure-of-arrays form, with a flag per lane.
#[derive(Clone, Copy)]
pub(crate) struct BlockOutput {
    n: Lanes3,
    t: Lanes3,
    b: Lanes3,
    d1: Lanes3,
    d2: Lanes3,
    kn: Lanes,
    kg: Lanes,
    tg: Lanes,
    speed: Lanes,
    k1: Lanes,
    k2: Lanes,
    mean: Lanes,
    gaussian: Lanes,
    conditioning: Lanes,
    speed_figure: Lanes,
    /// 1.0 where every check of the one-point path passes, 0.0 where one fails.
    ok: Lanes,
}

impl BlockInput {
    /// Gathers `len` ≤ [`BLOCK`] lanes from jets; lanes from `len` on repeat lane 0 (their
    /// results are ignored; repeating real data keeps them free of NaN and of slow paths).
    pub(crate) fn gather(surface: &[SurfaceJet], curve: &[CurveJet]) -> Self {
        let len = surface.len().min(curve.len());
        debug_assert!((1..=BLOCK).contains(&len));
        let z = [[0.0; BLOCK]; 3];
        let mut x = BlockInput {
            su: z,
            sv: z,
            suu: z,
            suv: z,
            svv: z,
            du: [0.0; BLOCK],
            dv: [0.0; BLOCK],
            ddu: [0.0; BLOCK],
            ddv: [0.0; BLOCK],
        };
        for i in 0..BLOCK {
            let k = if i < len { i } else { 0 };
            let (s, c) = (&surface[k], &curve[k]);
            for a in 0..3 {
                x.su[a][i] = s.su[a];
                x.sv[a][i] = s.sv[a];
                x.suu[a][i] = s.suu[a];
                x.suv[a][i] = s.suv[a];
                x.svv[a][i] = s.svv[a];
            }
            x.du[i] = c.du;
            x.dv[i] = c.dv;
            x.ddu[i] = c.ddu;
            x.ddv[i] = c.ddv;
        }
        x
    }
}

impl BlockOutput {
    /// True when lane `i` passed every check.
    #[inline]
    pub(crate) fn ok(&self, i: usize) -> bool {
        self.ok[i] != 0.0
    }

    /// The frame of lane `i` (meaningful when [`Self::ok`]); (u, v) and the point come from
    /// the jets.
    #[inline]
    pub(crate) fn frame(&self, i: usize, surface: &SurfaceJet, curve: &CurveJet) -> DarbouxFrame {
        let v = |a: &Lanes3| Vec3::new(a[0][i], a[1][i], a[2][i]);
        DarbouxFrame {
            u: curve.u,
            v: curve.v,
            point: surface.p,
            t: v(&self.t),
            b: v(&self.b),
            n: v(&self.n),
            normal_curvature: self.kn[i],
            geodesic_curvature: self.kg[i],
            geodesic_torsion: self.tg[i],
            speed: self.speed[i],
            principal: PrincipalCurvatures {
                k1: self.k1[i],
                k2: self.k2[i],
                d1: v(&self.d1),
                d2: v(&self.d2),
                mean: self.mean[i],
                gaussian: self.gaussian[i],
            },
            conditioning: Conditioning {
                surface: self.conditioning[i],
                curve: self.speed_figure[i],
            },
        }
    }
}

#[inline(always)]
fn dot(a: [f64; 3], b: [f64; 3]) -> f64 {
    // nalgebra's order for 3-vectors: (a0 b0 + a1 b1) + a2 b2.
    a[0] * b[0] + a[1] * b[1] + a[2] * b[2]
}

#[inline(always)]
fn cross(a: [f64; 3], b: [f64; 3]) -> [f64; 3] {
    [
        a[1] * b[2] - a[2] * b[1],
        a[2] * b[0] - a[0] * b[2],
        a[0] * b[1] - a[1] * b[0],
    ]
}

#[inline(always)]
fn scale(a: [f64; 3], s: f64) -> [f64; 3] {
    [a[0] * s, a[1] * s, a[2] * s]
}

#[inline(always)]
fn finite(x: f64) -> bool {
    // |x| < ∞: a mask and a compare, which vectorise.
    x.is_finite()
}

/// The frame math of one lane: the body of the loop over lanes.
#[inline(always)]
fn lane(x: &BlockInput, i: usize, sigma: f64, s: &ParamScales, y: &mut BlockOutput) {
    let g3 = |a: &Lanes3| [a[0][i], a[1][i], a[2][i]];
    let (su, sv, suu, suv, svv) = (g3(&x.su), g3(&x.sv), g3(&x.suu), g3(&x.suv), g3(&x.svv));
    let (du, dv, ddu, ddv) = (x.du[i], x.dv[i], x.ddu[i], x.ddv[i]);

    // --- SurfacePoint::new_with_limit ---
    let cr = cross(su, sv);
    let area = dot(cr, cr).sqrt();
    // surface_conditioning
    let ea = dot(su, su) * (s.u_extent * s.u_extent);
    let eb = dot(sv, sv) * (s.v_extent * s.v_extent);
    let mx = ea.max(eb);
    let cond_raw = (area * s.u_extent * s.v_extent) / mx;
    let conditioning = if mx == 0.0 || !finite(mx) {
        0.0
    } else {
        cond_raw
    };
    let mut ok = conditioning >= DEGENERATE_SURFACE_LIMIT;
    let n = scale(cr, sigma / area);
    let e = dot(su, su);
    let f = dot(su, sv);
    let g = dot(sv, sv);
    let l = dot(suu, n);
    let m = dot(suv, n);
    let nn = dot(svv, n);
    let su_len = e.sqrt();
    let inv_su = 1.0 / su_len;
    let inv_area = 1.0 / area;
    let beta = sigma * su_len * inv_area;
    let alpha = -sigma * f * inv_su * inv_area;
    let w11 = l * inv_su * inv_su;
    let w12 = (l * alpha + m * beta) * inv_su;
    let w22 = l * alpha * alpha + 2.0 * m * alpha * beta + nn * beta * beta;
    let half_diff = 0.5 * (w11 - w22);
    let mean = 0.5 * (w11 + w22);
    let d = (half_diff * half_diff + w12 * w12).sqrt();
    let k1 = mean + d;
    let k2 = mean - d;
    let sc = w11.abs().max(w22.abs()).max(w12.abs());
    let umbilic = d <= 4.0 * f64::EPSILON * sc;
    let forward = half_diff >= 0.0;
    let ex = if umbilic {
        1.0
    } else if forward {
        d + half_diff
    } else {
        w12
    };
    let ey = if umbilic {
        0.0
    } else if forward {
        w12
    } else {
        d - half_diff
    };
    let inv = 1.0 / (ex * ex + ey * ey).sqrt();
    let e1 = scale(su, inv_su);
    let e2 = cross(n, e1);
    let (cx, cy) = (ex * inv, ey * inv);
    let d1 = [
        e1[0] * cx + e2[0] * cy,
        e1[1] * cx + e2[1] * cy,
        e1[2] * cx + e2[2] * cy,
    ];
    let d2 = cross(n, d1);
    let gaussian = k1 * k2;
    ok &= finite(k1) & finite(k2) & finite(n[0]) & finite(n[1]) & finite(n[2]);
    ok &= finite(gaussian);

    // --- darboux_frame_at ---
    let (a, b_) = (du / s.u_extent, dv / s.v_extent);
    let speed_figure = (a * a + b_ * b_).sqrt() * s.t_extent;
    ok &= speed_figure >= STALLED_CURVE_LIMIT;
    let c1 = [
        su[0] * du + sv[0] * dv,
        su[1] * du + sv[1] * dv,
        su[2] * du + sv[2] * dv,
    ];
    let (duu, duv, dvv) = (du * du, 2.0 * du * dv, dv * dv);
    let c2 = [
        suu[0] * duu + suv[0] * duv + svv[0] * dvv + su[0] * ddu + sv[0] * ddv,
        suu[1] * duu + suv[1] * duv + svv[1] * dvv + su[1] * ddu + sv[1] * ddv,
        suu[2] * duu + suv[2] * duv + svv[2] * dvv + su[2] * ddu + sv[2] * ddv,
    ];
    let speed2 = dot(c1, c1);
    let speed = speed2.sqrt();
    let inv_speed = 1.0 / speed;
    let tan = scale(c1, inv_speed);
    let b = cross(n, tan);
    let inv_speed2 = 1.0 / speed2;
    // SurfacePoint::second_form(x, y) = L x0 y0 + M (x0 y1 + x1 y0) + Nn x1 y1.
    let form =
        |x0: f64, x1: f64, y0: f64, y1: f64| l * x0 * y0 + m * (x0 * y1 + x1 * y0) + nn * x1 * y1;
    let kn = form(du, dv, du, dv) * inv_speed2;
    let kg = dot(c2, b) * inv_speed2;
    let (tc0, tc1) = (du * inv_speed, dv * inv_speed);
    // SurfacePoint::components(B·Su, B·Sv).
    let (xs, xv) = (dot(b, su), dot(b, sv));
    let det = area * area;
    let (bc0, bc1) = ((g * xs - f * xv) / det, (e * xv - f * xs) / det);
    let tg = form(tc0, tc1, bc0, bc1);
    ok &= finite(kn) & finite(kg) & finite(tg) & finite(speed);
    ok &= finite(tan[0]) & finite(tan[1]) & finite(tan[2]);
    ok &= finite(b[0]) & finite(b[1]) & finite(b[2]) & (speed != 0.0);

    for k in 0..3 {
        y.n[k][i] = n[k];
        y.t[k][i] = tan[k];
        y.b[k][i] = b[k];
        y.d1[k][i] = d1[k];
        y.d2[k][i] = d2[k];
    }
    y.kn[i] = kn;
    y.kg[i] = kg;
    y.tg[i] = tg;
    y.speed[i] = speed;
    y.k1[i] = k1;
    y.k2[i] = k2;
    y.mean[i] = mean;
    y.gaussian[i] = gaussian;
    y.conditioning[i] = conditioning;
    y.speed_figure[i] = speed_figure;
    y.ok[i] = if ok { 1.0 } else { 0.0 };
}

/// The frame math over all lanes of a block. `scales` must be valid (positive, finite).
#[inline(never)]
pub(crate) fn frames_of_block(
    x: &BlockInput,
    orientation: Orientation,
    scales: &ParamScales,
) -> BlockOutput {
    let z = [[0.0; BLOCK]; 3];
    let o = [0.0; BLOCK];
    let mut y = BlockOutput {
        n: z,
        t: z,
        b: z,
        d1: z,
        d2: z,
        kn: o,
        kg: o,
        tg: o,
        speed: o,
        k1: o,
        k2: o,
        mean: o,
        gaussian: o,
        conditioning: o,
        speed_figure: o,
        ok: o,
    };
    let sigma = orientation.sign();
    for i in 0..BLOCK {
        lane(x, i, sigma, scales, &mut y);
    }
    y
}

/// Frames from jets the caller has evaluated, many at once: `out[i]` is
/// [`crate::frame::darboux_frame`]`(&surface[i], &curve[i], orientation, scales, ts[i])`, bit
/// for bit, computed a block of [`BLOCK`] points at a time in structure-of-arrays form (the
/// square roots and divisions of several points overlap). `ts` are the curve parameters, used
/// only in error messages.
///
/// Errors: `InvalidArgument` (as index 0) when the four slices differ in length or `scales` is
/// invalid; otherwise the first failing sample with the error `darboux_frame` gives for it
/// (`NonFinite`, `DegenerateSurface`, `StalledCurve`); `out` is then written up to that sample.
/// Allocates nothing (but the message of an error).
pub fn darboux_frames(
    surface: &[SurfaceJet],
    curve: &[CurveJet],
    ts: &[f64],
    orientation: Orientation,
    scales: &ParamScales,
    out: &mut [DarbouxFrame],
) -> Result<(), SampleError> {
    let n = out.len();
    if surface.len() != n || curve.len() != n || ts.len() != n {
        return Err(SampleError {
            index: 0,
            t: ts.first().copied().unwrap_or(f64::NAN),
            error: StrakeError::InvalidArgument(format!(
                "{} surface jets, {} curve jets, {} parameters and room for {n} frames: the counts must agree",
                surface.len(),
                curve.len(),
                ts.len()
            )),
        });
    }
    let scales_ok = scales.check().is_ok();
    for (k, ((sb, cb), (tb, ob))) in surface
        .chunks(BLOCK)
        .zip(curve.chunks(BLOCK))
        .zip(ts.chunks(BLOCK).zip(out.chunks_mut(BLOCK)))
        .enumerate()
    {
        let y = frames_of_block(&BlockInput::gather(sb, cb), orientation, scales);
        for (i, o) in ob.iter_mut().enumerate() {
            // The one-point path checks the scales and the jets' finiteness first; a lane the
            // kernel flags (or any lane after invalid scales) goes through it for its error.
            *o = if y.ok(i) && scales_ok && finite_jets(&sb[i], &cb[i]) {
                y.frame(i, &sb[i], &cb[i])
            } else {
                darboux_frame(&sb[i], &cb[i], orientation, scales, tb[i]).map_err(|error| {
                    SampleError {
                        index: k * BLOCK + i,
                        t: tb[i],
                        error,
                    }
                })?
            };
        }
    }
    Ok(())
}

#[inline]
fn finite_jets(s: &SurfaceJet, c: &CurveJet) -> bool {
    s.check_finite().is_ok() && c.check_finite().is_ok()
}
