//! Shared setup of the benchmarks and of `examples/speed_report.rs` (each includes this file with
//! `#[path]`): the bicubic rational test surface, the path on it, a host callback that evaluates
//! the surface as a host's own kernel would, and the finite-difference baseline a host
//! programmer would write instead of strake.

#![allow(dead_code)]

use std::ffi::c_void;
use strake::ffi::{
    StrakeCurve, StrakeFrame, StrakeNurbsSurfaceData, StrakeStatus, StrakeSurface,
    StrakeSurfaceJet, strake_curve_new_nurbs, strake_frames_at, strake_frames_at_parallel,
    strake_surface_from_batch_callback, strake_surface_from_callback, strake_surface_new_nurbs,
};
use strake::geometry::frame::{ParamScales, darboux_frame};
use strake::geometry::jet::{CurveJet, DerivOrder, SurfaceJet};
use strake::nurbs::{NurbsCurve, NurbsSurface, NurbsSurfaceData, SpanHint};
use strake::surface::SurfaceHint;
use strake::{DarbouxFrame, Orientation, Result, UvCurve};

/// Points per benchmark iteration (criterion's throughput is per point).
pub const POINTS: usize = 1024;

/// 64-bit LCG (Knuth's MMIX constants; common practice) for reproducible inputs.
pub struct Lcg(pub u64);

impl Lcg {
    /// A uniform value in [0, 1).
    pub fn next(&mut self) -> f64 {
        self.0 = self
            .0
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (self.0 >> 11) as f64 / (1u64 << 53) as f64
    }
}

/// Knots of the test surface in u and v: clamped cubic, non-uniform interior knots.
pub const KNOTS_U: [f64; 12] = [0.0, 0.0, 0.0, 0.0, 0.1, 0.3, 0.45, 0.8, 1.0, 1.0, 1.0, 1.0];
/// See [`KNOTS_U`].
pub const KNOTS_V: [f64; 12] = [0.0, 0.0, 0.0, 0.0, 0.2, 0.35, 0.6, 0.7, 1.0, 1.0, 1.0, 1.0];

/// The control net of the test surface: 8 × 8 points (v index fastest) of a wavy sheet and
/// weights in [0.5, 2].
pub fn wing_net() -> (Vec<[f64; 3]>, Vec<f64>) {
    let mut rng = Lcg(42);
    let mut pts = Vec::new();
    let mut ws = Vec::new();
    for i in 0..8 {
        for j in 0..8 {
            let (x, y) = (i as f64, 0.7 * j as f64);
            pts.push([
                x + 0.2 * rng.next(),
                y + 0.2 * rng.next(),
                (0.9 * x).sin() * (0.6 * y).cos() + 0.3 * rng.next(),
            ]);
            ws.push(0.5 + 1.5 * rng.next());
        }
    }
    (pts, ws)
}

/// A bicubic 8 × 8 "wing skin" over [0, 1]²: non-uniform knots, the net of [`wing_net`],
/// rational (its weights) or not.
pub fn wing_skin(rational: bool) -> NurbsSurface {
    let (pts, ws) = wing_net();
    NurbsSurface::new(&NurbsSurfaceData {
        degree_u: 3,
        degree_v: 3,
        count_u: 8,
        count_v: 8,
        knots_u: &KNOTS_U,
        knots_v: &KNOTS_V,
        points: &pts,
        weights: if rational { Some(&ws) } else { None },
    })
    .unwrap()
}

/// Knots of the path (a clamped cubic with three interior knots).
pub const PATH_KNOTS: [f64; 11] = [0.0, 0.0, 0.0, 0.0, 0.25, 0.5, 0.75, 1.0, 1.0, 1.0, 1.0];
/// Control points (u, v) of the path.
pub const PATH_POINTS: [[f64; 2]; 7] = [
    [0.03, 0.9],
    [0.2, 0.75],
    [0.35, 0.9],
    [0.5, 0.4],
    [0.7, 0.15],
    [0.85, 0.5],
    [0.97, 0.3],
];
/// Weights of the path.
pub const PATH_WEIGHTS: [f64; 7] = [1.0, 0.8, 1.2, 1.0, 0.9, 1.1, 1.0];

/// The path: a rational cubic curve in the parameter plane over t ∈ [0, 1] that sweeps across
/// the surface (crossing every knot line in u and several in v), staying at least 0.02 inside
/// the domain so that the finite-difference stencil never leaves it.
pub fn wing_path() -> NurbsCurve<2> {
    NurbsCurve::new(3, &PATH_KNOTS, &PATH_POINTS, Some(&PATH_WEIGHTS)).unwrap()
}

/// `n` evenly spaced curve parameters over [0, 1], both ends included.
pub fn path_ts(n: usize) -> Vec<f64> {
    (0..n).map(|i| i as f64 / (n - 1) as f64).collect()
}

/// `n` random curve parameters in [0, 1) (no order: a fresh span search each time).
pub fn random_ts(n: usize, seed: u64) -> Vec<f64> {
    let mut rng = Lcg(seed);
    (0..n).map(|_| rng.next()).collect()
}

/// The (u, v) points of the path at `ts`.
pub fn path_uv(curve: &NurbsCurve<2>, ts: &[f64]) -> (Vec<f64>, Vec<f64>) {
    let mut h = SpanHint::default();
    ts.iter()
        .map(|&t| {
            let j = curve.checked_jet(t, &mut h).unwrap();
            (j.u, j.v)
        })
        .unzip()
}

/// The scales of the path on the surface (both domains are [0, 1]).
pub const SCALES: ParamScales = ParamScales {
    u_extent: 1.0,
    v_extent: 1.0,
    t_extent: 1.0,
};

// ---------------------------------------------------------------------------------------------
// The host's own evaluator, handed to strake as a C callback.

/// A host surface callback: `user_data` is a `*const NurbsSurface`, evaluated with strake's own
/// NURBS code as a stand-in for the host's kernel (a bicubic rational evaluation of S and all
/// partials to second order, the cost a host pays for its own surface).
///
/// # Safety
/// `user_data` must point to a live `NurbsSurface`, `out` to a writable jet.
pub unsafe extern "C" fn host_surface(
    user_data: *mut c_void,
    u: f64,
    v: f64,
    order: i32,
    out: *mut StrakeSurfaceJet,
) -> i32 {
    // SAFETY: the contract above.
    let (s, out) = unsafe { (&*(user_data as *const NurbsSurface), &mut *out) };
    let order = match order {
        0 => DerivOrder::Position,
        1 => DerivOrder::First,
        _ => DerivOrder::Second,
    };
    match s.jet(u, v, order, &mut SurfaceHint::default()) {
        Ok(j) => {
            *out = to_c(&j);
            0
        }
        Err(_) => 1,
    }
}

/// The batch form of [`host_surface`]: `count` points at once, one span hint carried through
/// the block (as a host marching along a path would).
///
/// # Safety
/// `user_data` as for [`host_surface`]; `u`, `v` point to `count` values, `out` to room for
/// `count` jets.
pub unsafe extern "C" fn host_surface_batch(
    user_data: *mut c_void,
    u: *const f64,
    v: *const f64,
    count: usize,
    order: i32,
    out: *mut StrakeSurfaceJet,
) -> i32 {
    // SAFETY: the contract above.
    let (s, u, v, out) = unsafe {
        (
            &*(user_data as *const NurbsSurface),
            std::slice::from_raw_parts(u, count),
            std::slice::from_raw_parts(v, count),
            std::slice::from_raw_parts_mut(out, count),
        )
    };
    let order = match order {
        0 => DerivOrder::Position,
        1 => DerivOrder::First,
        _ => DerivOrder::Second,
    };
    let mut hint = SurfaceHint::default();
    for ((&u, &v), o) in u.iter().zip(v).zip(out) {
        match s.jet(u, v, order, &mut hint) {
            Ok(j) => *o = to_c(&j),
            Err(_) => return 1,
        }
    }
    0
}

/// The C jet of a Rust jet.
pub fn to_c(j: &SurfaceJet) -> StrakeSurfaceJet {
    let a = |v: &strake::Vec3| [v.x, v.y, v.z];
    StrakeSurfaceJet {
        p: a(&j.p),
        su: a(&j.su),
        sv: a(&j.sv),
        suu: a(&j.suu),
        suv: a(&j.suv),
        svv: a(&j.svv),
    }
}

// ---------------------------------------------------------------------------------------------
// The finite-difference baseline.

/// The step of the finite-difference baseline, in parameter units: 1e-4 of the parameter range
/// (both ranges are 1). This is the textbook choice for a second central difference,
/// h ≈ ε^(1/4) ≈ 1.2e-4 times the scale (truncation error O(h²) against round-off O(ε/h²));
/// a host that needs Su, Suu and Suv from one 3 × 3 stencil takes one h for all of them, and
/// the one for the second derivatives is the one that matters (ε^(1/3) ≈ 6e-6, the optimum for
/// a first difference, would give second differences with round-off of ε/h² ≈ 6e-6 relative).
pub const FD_STEP: f64 = 1e-4;

/// A surface jet from central differences of a position-only evaluator: S at the nine points
/// (u + a h, v + b h), a, b ∈ {−1, 0, 1}, then
/// Su = (S₊₀ − S₋₀)/2h, Suu = (S₊₀ − 2S₀₀ + S₋₀)/h², Suv = (S₊₊ − S₊₋ − S₋₊ + S₋₋)/4h² and
/// likewise in v. (u ± h, v ± h) must lie inside the domain.
#[inline(never)]
pub fn fd_jet(s: &NurbsSurface, u: f64, v: f64, h: f64, hint: &mut SurfaceHint) -> SurfaceJet {
    fd_jet_with(
        |uu, vv| s.jet(uu, vv, DerivOrder::Position, hint).unwrap().p,
        u,
        v,
        h,
    )
}

/// The stencil of [`fd_jet`] over any position evaluator `position(u, v)`.
#[inline(always)]
pub fn fd_jet_with(
    mut position: impl FnMut(f64, f64) -> strake::Vec3,
    u: f64,
    v: f64,
    h: f64,
) -> SurfaceJet {
    let mut p = [[strake::Vec3::zeros(); 3]; 3];
    for (a, row) in p.iter_mut().enumerate() {
        for (b, x) in row.iter_mut().enumerate() {
            *x = position(u + (a as f64 - 1.0) * h, v + (b as f64 - 1.0) * h);
        }
    }
    let (i2h, ih2, i4h2) = (0.5 / h, 1.0 / (h * h), 0.25 / (h * h));
    SurfaceJet {
        p: p[1][1],
        su: (p[2][1] - p[0][1]) * i2h,
        sv: (p[1][2] - p[1][0]) * i2h,
        suu: (p[2][1] - p[1][1] * 2.0 + p[0][1]) * ih2,
        suv: (p[2][2] - p[2][0] - p[0][2] + p[0][0]) * i4h2,
        svv: (p[1][2] - p[1][1] * 2.0 + p[1][0]) * ih2,
    }
}

/// The frame the finite-difference host computes at t: the curve's own jet, the surface jet by
/// [`fd_jet`], then strake's frame from the two jets.
#[inline(never)]
pub fn fd_frame(
    s: &NurbsSurface,
    c: &NurbsCurve<2>,
    t: f64,
    hint_s: &mut SurfaceHint,
    hint_c: &mut SpanHint,
) -> Result<DarbouxFrame> {
    let cj: CurveJet = c.checked_jet(t, hint_c)?;
    let sj = fd_jet(s, cj.u, cj.v, FD_STEP, hint_s);
    darboux_frame(&sj, &cj, Orientation::Forward, &SCALES, t)
}

/// The position-only evaluator a host programmer types from the textbook, for a second,
/// less demanding finite-difference baseline: span by binary search (The NURBS Book, 2nd ed.,
/// A2.1 FindSpan, p. 68), basis functions by the triangular recursion with a division per
/// term (A2.2 BasisFuns, p. 70), the tensor sum on the homogeneous net and one division by
/// the weight (A4.3 SurfacePoint applied to Pw, §4.4). Scalar code, no span hint, no tables.
pub struct TextbookSurface {
    knots_u: Vec<f64>,
    knots_v: Vec<f64>,
    count_u: usize,
    count_v: usize,
    /// [w x, w y, w z, w], index i * count_v + j.
    pw: Vec<[f64; 4]>,
}

impl TextbookSurface {
    /// The rational test surface of [`wing_skin`].
    pub fn wing_skin() -> Self {
        let (pts, ws) = wing_net();
        TextbookSurface {
            knots_u: KNOTS_U.to_vec(),
            knots_v: KNOTS_V.to_vec(),
            count_u: 8,
            count_v: 8,
            pw: pts
                .iter()
                .zip(&ws)
                .map(|(p, &w)| [w * p[0], w * p[1], w * p[2], w])
                .collect(),
        }
    }

    /// A2.1: the span index i with u in [U_i, U_{i+1}) (the last non-empty span at the end).
    fn find_span(knots: &[f64], n: usize, p: usize, u: f64) -> usize {
        if u >= knots[n + 1] {
            return n;
        }
        let (mut low, mut high) = (p, n + 1);
        let mut mid = (low + high) / 2;
        while u < knots[mid] || u >= knots[mid + 1] {
            if u < knots[mid] {
                high = mid;
            } else {
                low = mid;
            }
            mid = (low + high) / 2;
        }
        mid
    }

    /// A2.2 for degree 3: the four non-zero basis functions at u on span i.
    fn basis(knots: &[f64], i: usize, u: f64) -> [f64; 4] {
        let mut n = [1.0, 0.0, 0.0, 0.0];
        let (mut left, mut right) = ([0.0; 4], [0.0; 4]);
        for j in 1..=3 {
            left[j] = u - knots[i + 1 - j];
            right[j] = knots[i + j] - u;
            let mut saved = 0.0;
            for r in 0..j {
                let temp = n[r] / (right[r + 1] + left[j - r]);
                n[r] = saved + right[r + 1] * temp;
                saved = left[j - r] * temp;
            }
            n[j] = saved;
        }
        n
    }

    /// S(u, v) for (u, v) in the domain.
    pub fn point(&self, u: f64, v: f64) -> strake::Vec3 {
        let su = Self::find_span(&self.knots_u, self.count_u - 1, 3, u);
        let sv = Self::find_span(&self.knots_v, self.count_v - 1, 3, v);
        let (nu, nv) = (
            Self::basis(&self.knots_u, su, u),
            Self::basis(&self.knots_v, sv, v),
        );
        let mut sw = [0.0; 4];
        for (l, &bv) in nv.iter().enumerate() {
            let mut temp = [0.0; 4];
            for (k, &bu) in nu.iter().enumerate() {
                let cp = &self.pw[(su - 3 + k) * self.count_v + (sv - 3 + l)];
                for c in 0..4 {
                    temp[c] += bu * cp[c];
                }
            }
            for c in 0..4 {
                sw[c] += bv * temp[c];
            }
        }
        strake::Vec3::new(sw[0] / sw[3], sw[1] / sw[3], sw[2] / sw[3])
    }
}

/// As [`fd_frame`] with the nine positions from the [`TextbookSurface`] evaluator.
#[inline(never)]
pub fn fd_frame_textbook(
    s: &TextbookSurface,
    c: &NurbsCurve<2>,
    t: f64,
    hint_c: &mut SpanHint,
) -> Result<DarbouxFrame> {
    let cj: CurveJet = c.checked_jet(t, hint_c)?;
    let sj = fd_jet_with(|uu, vv| s.point(uu, vv), cj.u, cj.v, FD_STEP);
    darboux_frame(&sj, &cj, Orientation::Forward, &SCALES, t)
}

// ---------------------------------------------------------------------------------------------
// Handles of the C ABI for the same surface and path.

/// The test surface (rational) as a native C handle (`strake_surface_new_nurbs`).
pub fn c_native_surface() -> *mut StrakeSurface {
    let (pts, ws) = wing_net();
    let data = StrakeNurbsSurfaceData {
        degree_u: 3,
        degree_v: 3,
        count_u: 8,
        count_v: 8,
        knots_u: KNOTS_U.as_ptr(),
        knot_count_u: KNOTS_U.len(),
        knots_v: KNOTS_V.as_ptr(),
        knot_count_v: KNOTS_V.len(),
        points: pts.as_ptr().cast(),
        weights: ws.as_ptr(),
    };
    let mut out = std::ptr::null_mut();
    // SAFETY: valid data (copied by the call) and output slot.
    let st = unsafe { strake_surface_new_nurbs(&data, 0, &mut out) };
    assert_eq!(st, StrakeStatus::Ok);
    out
}

/// The test surface behind a host callback: `host` must outlive the handle.
pub fn c_callback_surface(host: &NurbsSurface) -> *mut StrakeSurface {
    let mut out = std::ptr::null_mut();
    let ud = host as *const NurbsSurface as *mut c_void;
    // SAFETY: a callback honouring its contract and a valid output slot.
    let st = unsafe {
        strake_surface_from_callback(Some(host_surface), ud, 0.0, 1.0, 0.0, 1.0, 0, &mut out)
    };
    assert_eq!(st, StrakeStatus::Ok);
    out
}

/// The test surface behind a host batch callback: `host` must outlive the handle.
pub fn c_batch_callback_surface(host: &NurbsSurface) -> *mut StrakeSurface {
    let mut out = std::ptr::null_mut();
    let ud = host as *const NurbsSurface as *mut c_void;
    // SAFETY: as above.
    let st = unsafe {
        strake_surface_from_batch_callback(
            Some(host_surface_batch),
            ud,
            0.0,
            1.0,
            0.0,
            1.0,
            0,
            &mut out,
        )
    };
    assert_eq!(st, StrakeStatus::Ok);
    out
}

/// The path as a C handle (`strake_curve_new_nurbs`).
pub fn c_path() -> *mut StrakeCurve {
    let mut out = std::ptr::null_mut();
    // SAFETY: valid arrays (copied by the call) and output slot.
    let st = unsafe {
        strake_curve_new_nurbs(
            3,
            PATH_KNOTS.as_ptr(),
            PATH_KNOTS.len(),
            PATH_POINTS.as_ptr().cast(),
            PATH_POINTS.len(),
            PATH_WEIGHTS.as_ptr(),
            &mut out,
        )
    };
    assert_eq!(st, StrakeStatus::Ok);
    out
}

/// Knots of the straight path (a degree-1 NURBS: a line in the parameter plane, as a raster
/// pass in parameter space is).
pub const LINE_KNOTS: [f64; 4] = [0.0, 0.0, 1.0, 1.0];
/// Ends of the straight path in (u, v).
pub const LINE_POINTS: [[f64; 2]; 2] = [[0.05, 0.1], [0.95, 0.9]];

/// The straight path as a C handle (`strake_curve_new_nurbs`, degree 1, no weights).
pub fn c_line() -> *mut StrakeCurve {
    let mut out = std::ptr::null_mut();
    // SAFETY: valid arrays (copied by the call), no weights, and an output slot.
    let st = unsafe {
        strake_curve_new_nurbs(
            1,
            LINE_KNOTS.as_ptr(),
            LINE_KNOTS.len(),
            LINE_POINTS.as_ptr().cast(),
            LINE_POINTS.len(),
            std::ptr::null(),
            &mut out,
        )
    };
    assert_eq!(st, StrakeStatus::Ok);
    out
}

/// The (u, v) points of the straight path at `ts`.
pub fn line_uv(ts: &[f64]) -> (Vec<f64>, Vec<f64>) {
    let [a, b] = LINE_POINTS;
    ts.iter()
        .map(|&t| (a[0] + t * (b[0] - a[0]), a[1] + t * (b[1] - a[1])))
        .unzip()
}

/// `strake_frames_at` into `out`, asserting success.
pub fn c_frames_at(
    s: *const StrakeSurface,
    c: *const StrakeCurve,
    ts: &[f64],
    out: &mut [StrakeFrame],
) {
    // SAFETY: live handles, `ts.len()` parameters and room for as many frames.
    let st = unsafe { strake_frames_at(s, c, ts.as_ptr(), ts.len(), out.as_mut_ptr()) };
    assert_eq!(st, StrakeStatus::Ok);
}

/// `strake_frames_at_parallel` into `out`, asserting success.
pub fn c_frames_at_parallel(
    s: *const StrakeSurface,
    c: *const StrakeCurve,
    ts: &[f64],
    threads: u32,
    out: &mut [StrakeFrame],
) {
    // SAFETY: as above.
    let st = unsafe {
        strake_frames_at_parallel(s, c, ts.as_ptr(), ts.len(), threads, out.as_mut_ptr())
    };
    assert_eq!(st, StrakeStatus::Ok);
}
