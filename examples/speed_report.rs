//! Speed report: every hot path of strake timed in one process, side by side, and the ratios
//! the project's speed targets are stated in, with the arithmetic floor of each kernel and the
//! accuracy of the finite-difference code a host would write instead.
//!
//! ```text
//! cargo run --release --example speed_report
//! ```
//!
//! Method: every case processes the same path (a rational cubic in the parameter plane of a
//! bicubic rational 8 × 8 NURBS surface, `benches/common`) and is timed as the median over
//! `ROUNDS` rounds; within a round the cases run one after the other, so that a change in the
//! machine's load touches all of them alike and the ratios stay meaningful on a shared machine.
//! `benches/README.md` explains every line of the output.

#[path = "../benches/common/mod.rs"]
mod common;

use common::*;
use std::cell::RefCell;
use std::hint::black_box;
use std::time::Instant;
use strake::ffi::{StrakeFrame, StrakeSurfaceJet, strake_curve_free, strake_surface_free};
use strake::geometry::jet::{CurveJet, DerivOrder, SurfaceJet};
use strake::nurbs::SpanHint;
use strake::surface::{SurfaceHint, SurfaceSource};
use strake::{
    CurveOnSurface, DarbouxFrame, Hints, Orientation, UvCurve, VectorKernels, darboux_frame,
    darboux_frames,
};

/// Points of the path in the per-point cases (their jets and frames stay in the L2 cache).
const N: usize = 4096;
/// Points of the path in the parallel cases (enough work to amortise starting a thread).
const N_PARALLEL: usize = 65536;
/// Points of the long parallel cases: a longer path, over which starting the second thread
/// (and waking its core from idle) weighs less.
const N_PARALLEL_LONG: usize = 1 << 20;
/// Rounds; each case reports its median.
const ROUNDS: usize = 31;
/// Each timed sample lasts at least this long (repetitions of the case).
const SAMPLE_NS: f64 = 2e6;

struct Case<'a> {
    name: &'static str,
    points: usize,
    run: Box<dyn FnMut() + 'a>,
    reps: usize,
    samples: Vec<f64>,
}

impl<'a> Case<'a> {
    fn new(name: &'static str, points: usize, run: impl FnMut() + 'a) -> Self {
        Case {
            name,
            points,
            run: Box::new(run),
            reps: 1,
            samples: Vec::new(),
        }
    }
    fn median(&self) -> f64 {
        let mut s = self.samples.clone();
        s.sort_by(f64::total_cmp);
        s[s.len() / 2]
    }
    fn spread(&self) -> (f64, f64) {
        let mut s = self.samples.clone();
        s.sort_by(f64::total_cmp);
        (s[s.len() / 4], s[3 * s.len() / 4])
    }
}

/// Nanoseconds of CPU time this thread has run (Linux `CLOCK_THREAD_CPUTIME_ID`): on a
/// machine shared with other programs, the time the thread was not scheduled is left out,
/// which wall-clock time counts.
#[cfg(target_os = "linux")]
fn thread_cpu_ns() -> f64 {
    let mut ts = libc::timespec {
        tv_sec: 0,
        tv_nsec: 0,
    };
    // SAFETY: a valid timespec to write; the clock exists on every Linux.
    let rc = unsafe { libc::clock_gettime(libc::CLOCK_THREAD_CPUTIME_ID, &mut ts) };
    assert_eq!(rc, 0, "clock_gettime(CLOCK_THREAD_CPUTIME_ID)");
    ts.tv_sec as f64 * 1e9 + ts.tv_nsec as f64
}

/// Whether the one-thread cases are timed by this thread's CPU time (the default on Linux;
/// `STRAKE_SPEED_CLOCK=wall` asks for wall-clock time). Cases with more than one thread (the
/// parallel ones) are always timed by the wall clock.
fn cpu_clock() -> bool {
    match std::env::var("STRAKE_SPEED_CLOCK").as_deref() {
        Ok("wall") => false,
        Ok("cpu") | Err(_) => cfg!(target_os = "linux"),
        Ok(v) => panic!("STRAKE_SPEED_CLOCK={v}: expected cpu or wall"),
    }
}

/// A time stamp in ns: this thread's CPU time when `cpu`, else the wall clock from `origin`.
fn stamp(cpu: bool, origin: Instant) -> f64 {
    #[cfg(target_os = "linux")]
    if cpu {
        return thread_cpu_ns();
    }
    let _ = cpu;
    origin.elapsed().as_nanos() as f64
}

/// A time stamp in ns by the clock of [`cpu_clock`] (for the machine-rate measurements of the
/// floors, so that they too leave out the time the thread was not scheduled).
fn now_ns() -> f64 {
    static ORIGIN: std::sync::OnceLock<Instant> = std::sync::OnceLock::new();
    stamp(cpu_clock(), *ORIGIN.get_or_init(Instant::now))
}

/// Runs every case `ROUNDS` times, interleaved, and records ns per point.
fn measure(cases: &mut [Case]) {
    let cpu = cpu_clock();
    let origin = Instant::now();
    for c in cases.iter_mut() {
        // Warm up, then calibrate the repetitions to reach SAMPLE_NS per sample.
        (c.run)();
        let t = Instant::now();
        (c.run)();
        let once = t.elapsed().as_nanos().max(1) as f64;
        c.reps = ((SAMPLE_NS / once).ceil() as usize).max(1);
    }
    for _ in 0..ROUNDS {
        for c in cases.iter_mut() {
            let cpu = cpu && !c.name.starts_with("parallel");
            let t = stamp(cpu, origin);
            for _ in 0..c.reps {
                (c.run)();
            }
            let ns = stamp(cpu, origin) - t;
            c.samples.push(ns / (c.reps * c.points) as f64);
        }
    }
}

fn get(cases: &[Case], name: &str) -> f64 {
    cases
        .iter()
        .find(|c| c.name == name)
        .unwrap_or_else(|| panic!("no case {name}"))
        .median()
}

// ---------------------------------------------------------------------------------------------
// The machine's own rates, for the arithmetic floors.

/// Dependent additions per ns (a chain: one addition's latency each).
fn add_chain_rate() -> f64 {
    let n = 50_000_000u64;
    let y = black_box(1e-9);
    let mut best = f64::INFINITY;
    for _ in 0..3 {
        let mut x = 1.0f64;
        let t = now_ns();
        for _ in 0..n {
            x += y;
        }
        black_box(x);
        best = best.min(now_ns() - t);
    }
    n as f64 / best
}

/// Independent additions and multiplications per ns, as the compiler vectorises them in a
/// portable build (SSE2: two lanes).
fn flop_rate() -> f64 {
    flop_rate_body::<24>()
}

/// As [`flop_rate`] compiled for AVX2 (four lanes), as strake's kernels run where AVX2 is
/// present.
///
/// # Safety
/// The processor must support AVX2.
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
unsafe fn flop_rate_avx2() -> f64 {
    flop_rate_body::<48>()
}

/// As [`flop_rate`] compiled for AVX-512F (eight lanes), as strake's kernels run where
/// AVX-512F is present.
///
/// # Safety
/// The processor must support AVX-512F.
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx512f")]
unsafe fn flop_rate_avx512() -> f64 {
    flop_rate_body::<96>()
}

/// `L` independent multiply-add chains (enough to cover the latency with 12 vector registers).
#[inline(always)]
fn flop_rate_body<const L: usize>() -> f64 {
    let n = 2_000_000usize;
    let (x, y) = (black_box(0.999_999_9), black_box(1e-7));
    let mut best = f64::INFINITY;
    for _ in 0..3 {
        let mut a = [1.0f64; L];
        let t = now_ns();
        for _ in 0..n {
            for v in a.iter_mut() {
                *v = *v * x + y;
            }
        }
        black_box(a);
        best = best.min(now_ns() - t);
    }
    (2 * L * n) as f64 / best
}

/// Independent divisions (or square roots) per ns, vectorised as the compiler does.
fn div_sqrt_rates() -> (f64, f64) {
    div_sqrt_body()
}

/// As [`div_sqrt_rates`] compiled for AVX2.
///
/// # Safety
/// The processor must support AVX2.
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx2")]
unsafe fn div_sqrt_rates_avx2() -> (f64, f64) {
    div_sqrt_body()
}

/// As [`div_sqrt_rates`] compiled for AVX-512F.
///
/// # Safety
/// The processor must support AVX-512F.
#[cfg(target_arch = "x86_64")]
#[target_feature(enable = "avx512f")]
unsafe fn div_sqrt_rates_avx512() -> (f64, f64) {
    div_sqrt_body()
}

/// Bytes per ns copied from one array of C frames to another (as the C batch calls copy their
/// results to the host's array once every point has succeeded), over `n` frames.
fn copy_rate(n: usize) -> f64 {
    let a = vec![StrakeFrame::default(); n];
    let mut b = vec![StrakeFrame::default(); n];
    let mut best = f64::INFINITY;
    for _ in 0..50 {
        let t = now_ns();
        b.copy_from_slice(black_box(&a));
        black_box(&mut b);
        best = best.min(now_ns() - t);
    }
    (n * std::mem::size_of::<StrakeFrame>()) as f64 / best
}

#[inline(always)]
fn div_sqrt_body() -> (f64, f64) {
    const M: usize = 1024;
    let a: Vec<f64> = (0..M).map(|i| 1.0 + i as f64 * 1e-3).collect();
    let b: Vec<f64> = (0..M).map(|i| 3.0 - i as f64 * 1e-3).collect();
    let mut o = vec![0.0; M];
    let reps = 3000;
    let mut best = (f64::INFINITY, f64::INFINITY);
    for _ in 0..3 {
        let t = now_ns();
        for _ in 0..reps {
            for ((o, x), y) in o.iter_mut().zip(black_box(&a)).zip(black_box(&b)) {
                *o = x / y;
            }
            black_box(&mut o);
        }
        best.0 = best.0.min(now_ns() - t);
        let t = now_ns();
        for _ in 0..reps {
            for (o, x) in o.iter_mut().zip(black_box(&a)) {
                *o = x.sqrt();
            }
            black_box(&mut o);
        }
        best.1 = best.1.min(now_ns() - t);
    }
    ((M * reps) as f64 / best.0, (M * reps) as f64 / best.1)
}

/// Operation counts per point of a kernel (additions, multiplications, compares and selects;
/// divisions; square roots), counted from the formulas of the code.
#[derive(Clone, Copy)]
struct Ops {
    flops: f64,
    divs: f64,
    sqrts: f64,
}

impl std::ops::Add for Ops {
    type Output = Ops;
    fn add(self, o: Ops) -> Ops {
        Ops {
            flops: self.flops + o.flops,
            divs: self.divs + o.divs,
            sqrts: self.sqrts + o.sqrts,
        }
    }
}

impl std::ops::Mul<Ops> for f64 {
    type Output = Ops;
    fn mul(self, o: Ops) -> Ops {
        Ops {
            flops: self * o.flops,
            divs: self * o.divs,
            sqrts: self * o.sqrts,
        }
    }
}

/// Basis functions of degree p on one span and their derivatives to `order` (Cox–de Boor with
/// reciprocals; The NURBS Book A2.2, derivatives by eq. 2.7): 2p differences, 2p(p + 1) for the
/// triangle, 3p + 1 for the first derivative row, 6p − 1 more for the second.
fn basis_ops(p: f64, order: u32) -> f64 {
    let mut f = 2.0 * p + 2.0 * p * (p + 1.0);
    if order >= 1 {
        f += 3.0 * p + 1.0;
    }
    if order >= 2 {
        f += 6.0 * p - 1.0;
    }
    f
}

/// A rational surface jet of degrees (p, q) to `order`: both basis rows, the tensor sums on
/// [x, y, z, w] (per control point and v-derivative a multiply and an add per component, then
/// per row and output a multiply and an add per component), and the quotient rule.
fn surface_ops(p: f64, q: f64, order: u32) -> Ops {
    let (tv, outs, quotient) = match order {
        0 => (1.0, 1.0, 3.0),
        1 => (2.0, 3.0, 21.0),
        _ => (3.0, 6.0, 74.0),
    };
    Ops {
        flops: basis_ops(p, order)
            + basis_ops(q, order)
            + 8.0 * tv * (p + 1.0) * (q + 1.0)
            + 8.0 * outs * (p + 1.0)
            + quotient,
        divs: 1.0,
        sqrts: 0.0,
    }
}

/// A rational curve jet of degree p in the plane to second order: basis, sums on [u, v, w]
/// (3 derivatives × 3 components × multiply and add per control point), quotient rule.
fn curve_ops(p: f64) -> Ops {
    Ops {
        flops: basis_ops(p, 2) + 18.0 * (p + 1.0) + 20.0,
        divs: 1.0,
        sqrts: 0.0,
    }
}

/// The frame and invariants from the jets (`src/engine/frame_block.rs`, counted line by line):
/// 158 operations for the normal, fundamental forms and principal curvatures, 135 for the
/// frame, κn, κg, τg and the checks; 5 divisions (1/A, 1/|Su|, the principal direction's
/// norm, 1/|c'| and the conditioning figure), 6 square roots.
const FRAME: Ops = Ops {
    flops: 293.0,
    divs: 5.0,
    sqrts: 6.0,
};

/// The finite-difference jet from nine positions: 12 for Su, Sv, 24 for Suu, Svv, 12 for Suv,
/// 4 for the step constants, plus one division.
const FD_COMBINE: Ops = Ops {
    flops: 52.0,
    divs: 1.0,
    sqrts: 0.0,
};

struct Rates {
    flops: f64,
    divs: f64,
    sqrts: f64,
}

/// The floor in ns per point: every operation at the machine's measured independent rate, the
/// add/multiply pipes and the divide/square-root unit busy at once (the larger of the two).
fn floor_ns(o: Ops, r: &Rates) -> f64 {
    (o.flops / r.flops).max(o.divs / r.divs + o.sqrts / r.sqrts)
}

// ---------------------------------------------------------------------------------------------
// Finite-difference accuracy.

struct FdErrors {
    /// Worst relative error per quantity: kn, kg, tg, k1, k2.
    worst: [f64; 5],
    /// Sample of the worst error per quantity.
    at: [usize; 5],
    /// Worst error (any quantity) where the stencil straddles a knot line, and elsewhere, with
    /// the number of such samples.
    near: (f64, usize),
    far: (f64, usize),
    /// Median over samples of the worst error of each sample.
    median: f64,
}

/// Distance from x to the nearest interior knot.
fn knot_distance(x: f64, knots: &[f64]) -> f64 {
    knots
        .iter()
        .filter(|&&k| k > 0.0 && k < 1.0)
        .map(|&k| (x - k).abs())
        .fold(f64::INFINITY, f64::min)
}

fn knot_gap(f: &DarbouxFrame) -> f64 {
    knot_distance(f.u, &KNOTS_U).min(knot_distance(f.v, &KNOTS_V))
}

/// Errors of κn, τg, k1, k2 relative to the curvature scale max(|k1|, |k2|), of κg relative to
/// the space curvature √(κn² + κg²) (as in docs/accuracy.md).
fn fd_errors(exact: &[DarbouxFrame], fd: &[DarbouxFrame], h: f64) -> FdErrors {
    let mut e = FdErrors {
        worst: [0.0; 5],
        at: [0; 5],
        near: (0.0, 0),
        far: (0.0, 0),
        median: 0.0,
    };
    let mut per_sample = Vec::new();
    for (i, (x, y)) in exact.iter().zip(fd).enumerate() {
        let scale = x.principal.k1.abs().max(x.principal.k2.abs());
        let kappa = x.normal_curvature.hypot(x.geodesic_curvature);
        let errs = [
            (y.normal_curvature - x.normal_curvature).abs() / scale,
            (y.geodesic_curvature - x.geodesic_curvature).abs() / kappa,
            (y.geodesic_torsion - x.geodesic_torsion).abs() / scale,
            (y.principal.k1 - x.principal.k1).abs() / scale,
            (y.principal.k2 - x.principal.k2).abs() / scale,
        ];
        let mut w: f64 = 0.0;
        for (k, &err) in errs.iter().enumerate() {
            if err > e.worst[k] {
                e.worst[k] = err;
                e.at[k] = i;
            }
            w = w.max(err);
        }
        let slot = if knot_gap(x) < h {
            &mut e.near
        } else {
            &mut e.far
        };
        *slot = (slot.0.max(w), slot.1 + 1);
        per_sample.push(w);
    }
    per_sample.sort_by(f64::total_cmp);
    e.median = per_sample[per_sample.len() / 2];
    e
}

fn fd_frames(
    s: &strake::NurbsSurface,
    c: &strake::NurbsCurve<2>,
    ts: &[f64],
    h: f64,
) -> Vec<DarbouxFrame> {
    let (mut hs, mut hc) = (SurfaceHint::default(), SpanHint::default());
    ts.iter()
        .map(|&t| {
            let cj = c.checked_jet(t, &mut hc).unwrap();
            let sj = fd_jet(s, cj.u, cj.v, h, &mut hs);
            darboux_frame(&sj, &cj, Orientation::Forward, &SCALES, t).unwrap()
        })
        .collect()
}

fn load_average() -> String {
    std::fs::read_to_string("/proc/loadavg")
        .map(|s| s.split_whitespace().take(3).collect::<Vec<_>>().join(" "))
        .unwrap_or_else(|_| "n/a".into())
}

fn main() {
    let threads = std::thread::available_parallelism().map_or(1, |n| n.get());
    println!("strake speed report (portable build, no target-cpu flags)");
    println!(
        "machine: {threads} hardware threads; load average before: {}",
        load_average()
    );
    #[cfg(target_arch = "x86_64")]
    println!(
        "CPU features present: avx2 {}, fma {} (not used: no fused multiply-add), avx512f {}",
        std::arch::is_x86_feature_detected!("avx2"),
        std::arch::is_x86_feature_detected!("fma"),
        std::arch::is_x86_feature_detected!("avx512f")
    );
    // STRAKE_SPEED_KERNELS=avx2 (or baseline) limits strake's batch kernels to that variant,
    // for comparing variants on one machine (they give the same bits).
    if let Ok(v) = std::env::var("STRAKE_SPEED_KERNELS") {
        let limit = match v.as_str() {
            "baseline" => VectorKernels::Baseline,
            "avx2" => VectorKernels::Avx2,
            "avx512" => VectorKernels::Avx512,
            _ => panic!("STRAKE_SPEED_KERNELS={v}: expected baseline, avx2 or avx512"),
        };
        strake::limit_vector_kernels(limit);
    }
    let variant = strake::vector_kernels();
    println!(
        "strake's batch kernels in this run: {} ({} f64 per vector; widest supported here: {})",
        variant.name(),
        variant.lanes(),
        strake::supported_vector_kernels().name()
    );

    println!(
        "clock: {}",
        if cpu_clock() {
            "this thread's CPU time for the one-thread cases (time not scheduled left out; STRAKE_SPEED_CLOCK=wall for wall clock), wall clock for the parallel ones"
        } else {
            "wall clock for every case"
        }
    );

    let surface = wing_skin(true);
    let curve = wing_path();
    let ts = path_ts(N);
    let ts_random = random_ts(N, 11);
    let (us, vs) = path_uv(&curve, &ts);
    let mut rng = Lcg(7);
    let random_uv: Vec<(f64, f64)> = (0..N).map(|_| (rng.next(), rng.next())).collect();
    let cs = CurveOnSurface::new(&surface, &curve);
    // The textbook evaluator of the second baseline must be the same surface.
    let textbook = TextbookSurface::wing_skin();
    let textbook_gap = us
        .iter()
        .zip(&vs)
        .map(|(&u, &v)| {
            let a = surface
                .jet(u, v, DerivOrder::Position, &mut SurfaceHint::default())
                .unwrap()
                .p;
            (textbook.point(u, v) - a).norm()
        })
        .fold(0.0, f64::max);
    assert!(
        textbook_gap < 1e-12,
        "textbook evaluator off by {textbook_gap:e}"
    );
    let exact: Vec<DarbouxFrame> = {
        let mut h = Hints::default();
        ts.iter().map(|&t| cs.frame(t, &mut h).unwrap()).collect()
    };
    let surface_jets: Vec<SurfaceJet> = us
        .iter()
        .zip(&vs)
        .map(|(&u, &v)| {
            surface
                .jet(u, v, DerivOrder::Second, &mut SurfaceHint::default())
                .unwrap()
        })
        .collect();
    let curve_jets: Vec<CurveJet> = ts
        .iter()
        .map(|&t| curve.checked_jet(t, &mut SpanHint::default()).unwrap())
        .collect();

    // C handles.
    let c_native = c_native_surface();
    let c_callback = c_callback_surface(&surface);
    let c_batch = c_batch_callback_surface(&surface);
    let c_curve = c_path();
    let c_line = c_line();
    let (line_us, line_vs) = line_uv(&ts);
    let ts_par = path_ts(N_PARALLEL);

    // Output buffers shared by several cases (one case runs at a time).
    let out = RefCell::new(vec![exact[0]; N]);
    let out_c = RefCell::new(vec![StrakeFrame::default(); N]);
    let out_par = RefCell::new(vec![exact[0]; N_PARALLEL]);
    let out_par_c = RefCell::new(vec![StrakeFrame::default(); N_PARALLEL]);
    let ts_long = path_ts(N_PARALLEL_LONG);
    let out_long = RefCell::new(vec![exact[0]; N_PARALLEL_LONG]);
    let ud = &surface as *const strake::NurbsSurface as *mut std::ffi::c_void;
    let jets_c = RefCell::new(vec![StrakeSurfaceJet::default(); N]);
    let jets_block = RefCell::new(vec![SurfaceJet::default(); N]);
    let rates_out = RefCell::new(vec![strake::InvariantRates::default(); N]);
    let third_block = RefCell::new(vec![[strake::geometry::math::Vec3::zeros(); 4]; N]);

    let mut cases = vec![
        Case::new("surface jet, marching", N, || {
            let mut h = SurfaceHint::default();
            for (&u, &v) in us.iter().zip(&vs) {
                black_box(surface.jet(u, v, DerivOrder::Second, &mut h).unwrap());
            }
        }),
        Case::new("surface jets, block of 64, marching", N, || {
            // What the batch entry points do: one `jets_in_domain_block` call per 64 points.
            let mut h = SurfaceHint::default();
            let mut out = jets_block.borrow_mut();
            for ((u, v), o) in us.chunks(64).zip(vs.chunks(64)).zip(out.chunks_mut(64)) {
                surface
                    .jets_in_domain_block(u, v, DerivOrder::Second, &mut h, o)
                    .unwrap();
            }
            black_box(&mut *out);
        }),
        Case::new("surface jets + third partials, block of 64", N, || {
            // What the third-order batch asks of a native surface per chunk.
            let mut h = SurfaceHint::default();
            let mut out = jets_block.borrow_mut();
            let mut third = third_block.borrow_mut();
            for (((u, v), o), t) in us
                .chunks(64)
                .zip(vs.chunks(64))
                .zip(out.chunks_mut(64))
                .zip(third.chunks_mut(64))
            {
                assert!(surface.jets_and_third_block(u, v, &mut h, o, t));
            }
            black_box(&mut *out);
        }),
        Case::new("surface jet, random", N, || {
            for &(u, v) in &random_uv {
                let mut h = SurfaceHint::default();
                black_box(surface.jet(u, v, DerivOrder::Second, &mut h).unwrap());
            }
        }),
        Case::new("surface position, marching", N, || {
            let mut h = SurfaceHint::default();
            for (&u, &v) in us.iter().zip(&vs) {
                black_box(surface.jet(u, v, DerivOrder::Position, &mut h).unwrap());
            }
        }),
        Case::new("curve jet, marching", N, || {
            let mut h = SpanHint::default();
            for &t in &ts {
                black_box(curve.checked_jet(t, &mut h).unwrap());
            }
        }),
        Case::new("curve jets, block of 64, marching", N, || {
            let mut h = SpanHint::default();
            let mut jets = [CurveJet::default(); 64];
            for chunk in ts.chunks(64) {
                let out = &mut jets[..chunk.len()];
                curve.jets_in_domain_block(chunk, &mut h, out).unwrap();
                black_box(&*out);
            }
        }),
        Case::new("curve third derivatives, block of 64", N, || {
            // What the third-order batch asks of the curve per chunk.
            let mut h = SpanHint::default();
            let mut out = [[0.0; 2]; 64];
            for chunk in ts.chunks(64) {
                let out = &mut out[..chunk.len()];
                curve.third_derivatives_block(chunk, &mut h, out).unwrap();
                black_box(&*out);
            }
        }),
        Case::new("curve jet, random", N, || {
            for &t in &ts_random {
                black_box(curve.checked_jet(t, &mut SpanHint::default()).unwrap());
            }
        }),
        Case::new("frame from jets, one at a time", N, || {
            for ((s, c), &t) in surface_jets.iter().zip(&curve_jets).zip(&ts) {
                black_box(darboux_frame(s, c, Orientation::Forward, &SCALES, t).unwrap());
            }
        }),
        Case::new("frame from jets, batch", N, || {
            darboux_frames(
                &surface_jets,
                &curve_jets,
                &ts,
                Orientation::Forward,
                &SCALES,
                &mut out.borrow_mut(),
            )
            .unwrap();
        }),
        Case::new("path point, one at a time", N, || {
            let mut h = Hints::default();
            for &t in &ts {
                black_box(cs.frame(t, &mut h).unwrap());
            }
        }),
        Case::new("path point, batch", N, || {
            cs.frames_at(&ts, &mut out.borrow_mut()).unwrap();
        }),
        Case::new("path point with rates (third order), batch", N, || {
            let mut rates = rates_out.borrow_mut();
            cs.frames_with_rates_at(&ts, &mut out.borrow_mut(), &mut rates)
                .unwrap();
        }),
        Case::new("path point, batch, random order", N, || {
            cs.frames_at(&ts_random, &mut out.borrow_mut()).unwrap();
        }),
        Case::new("finite differences", N, || {
            let (mut hs, mut hc) = (SurfaceHint::default(), SpanHint::default());
            for &t in &ts {
                black_box(fd_frame(&surface, &curve, t, &mut hs, &mut hc).unwrap());
            }
        }),
        Case::new("finite differences, textbook evaluator", N, || {
            let mut hc = SpanHint::default();
            for &t in &ts {
                black_box(fd_frame_textbook(&textbook, &curve, t, &mut hc).unwrap());
            }
        }),
        Case::new("C: host callback alone", N, || {
            for (j, (&u, &v)) in jets_c.borrow_mut().iter_mut().zip(us.iter().zip(&vs)) {
                // SAFETY: the callback's contract: live surface, valid jet.
                let st = unsafe { host_surface(ud, black_box(u), black_box(v), 2, j) };
                assert_eq!(st, 0);
            }
        }),
        Case::new("C: host batch callback alone", N, || {
            for (j, (u, v)) in jets_c
                .borrow_mut()
                .chunks_mut(64)
                .zip(us.chunks(64).zip(vs.chunks(64)))
            {
                // SAFETY: as above, `u.len()` points and jets.
                let st = unsafe {
                    host_surface_batch(ud, u.as_ptr(), v.as_ptr(), u.len(), 2, j.as_mut_ptr())
                };
                assert_eq!(st, 0);
            }
        }),
        Case::new("C: strake_frames_at, callback", N, || {
            c_frames_at(c_callback, c_curve, &ts, &mut out_c.borrow_mut())
        }),
        Case::new("C: strake_frames_at, batch callback", N, || {
            c_frames_at(c_batch, c_curve, &ts, &mut out_c.borrow_mut())
        }),
        Case::new("C: strake_frames_at, native", N, || {
            c_frames_at(c_native, c_curve, &ts, &mut out_c.borrow_mut())
        }),
        Case::new("C: host batch callback alone, line", N, || {
            for (j, (u, v)) in jets_c
                .borrow_mut()
                .chunks_mut(64)
                .zip(line_us.chunks(64).zip(line_vs.chunks(64)))
            {
                // SAFETY: as above, `u.len()` points and jets.
                let st = unsafe {
                    host_surface_batch(ud, u.as_ptr(), v.as_ptr(), u.len(), 2, j.as_mut_ptr())
                };
                assert_eq!(st, 0);
            }
        }),
        Case::new("C: strake_frames_at, batch callback, line", N, || {
            c_frames_at(c_batch, c_line, &ts, &mut out_c.borrow_mut())
        }),
        Case::new("parallel: frames_at_parallel, 1 thread", N_PARALLEL, || {
            cs.frames_at_parallel(&ts_par, &mut out_par.borrow_mut(), 1)
                .unwrap();
        }),
        Case::new(
            "parallel: frames_at_parallel, 2 threads",
            N_PARALLEL,
            || {
                cs.frames_at_parallel(&ts_par, &mut out_par.borrow_mut(), 2)
                    .unwrap();
            },
        ),
        Case::new("parallel: C, native, 1 thread", N_PARALLEL, || {
            c_frames_at_parallel(c_native, c_curve, &ts_par, 1, &mut out_par_c.borrow_mut())
        }),
        Case::new("parallel: C, native, 2 threads", N_PARALLEL, || {
            c_frames_at_parallel(c_native, c_curve, &ts_par, 2, &mut out_par_c.borrow_mut())
        }),
        Case::new(
            "parallel, long path: frames_at_parallel, 1 thread",
            N_PARALLEL_LONG,
            || {
                cs.frames_at_parallel(&ts_long, &mut out_long.borrow_mut(), 1)
                    .unwrap();
            },
        ),
        Case::new(
            "parallel, long path: frames_at_parallel, 2 threads",
            N_PARALLEL_LONG,
            || {
                cs.frames_at_parallel(&ts_long, &mut out_long.borrow_mut(), 2)
                    .unwrap();
            },
        ),
    ];
    // STRAKE_SPEED_ONLY=text keeps only the cases whose name contains `text` and prints them
    // alone (no ratios, no floors): for profiling one case.
    let only = std::env::var("STRAKE_SPEED_ONLY").ok();
    if let Some(text) = &only {
        cases.retain(|c| c.name.contains(text.as_str()));
    }
    // The planning section (geodesic steps, offsets, iso-scallop passes): with the rest, or
    // alone with STRAKE_SPEED_ONLY=planning.
    let planning = only.as_deref().is_none_or(|t| "planning".contains(t));
    if planning {
        planning_report(&surface, &curve, &us, &vs);
    }
    if only.as_deref() == Some("planning") {
        return;
    }
    let wall = Instant::now();
    measure(&mut cases);
    let wall = wall.elapsed().as_secs_f64();

    println!(
        "\n{N} path points per case ({N_PARALLEL} in the parallel cases, {N_PARALLEL_LONG} in the long ones); median of {ROUNDS} interleaved rounds, quartiles in brackets; {wall:.1} s"
    );
    println!("{:<44} {:>10}", "case", "ns/point");
    for c in &cases {
        let (q1, q3) = c.spread();
        println!(
            "{:<44} {:>10.1}   [{:.1} .. {:.1}]",
            c.name,
            c.median(),
            q1,
            q3
        );
    }

    if only.is_some() {
        return;
    }
    let g = |n: &str| get(&cases, n);
    let ratio = |what: &str, a: f64, b: f64, target: &str| {
        println!("{what:<62} {:>6.3}   {target}", a / b);
    };
    // Floors: the machine's rates, measured in the same run.
    let chain = add_chain_rate();
    let portable = {
        let (divs, sqrts) = div_sqrt_rates();
        Rates {
            flops: flop_rate(),
            divs,
            sqrts,
        }
    };
    #[cfg(target_arch = "x86_64")]
    let avx2 = std::arch::is_x86_feature_detected!("avx2").then(|| {
        // SAFETY: AVX2 is present (checked just above).
        let (divs, sqrts) = unsafe { div_sqrt_rates_avx2() };
        Rates {
            // SAFETY: as above.
            flops: unsafe { flop_rate_avx2() },
            divs,
            sqrts,
        }
    });
    #[cfg(not(target_arch = "x86_64"))]
    let avx2: Option<Rates> = None;
    #[cfg(target_arch = "x86_64")]
    let avx512 = std::arch::is_x86_feature_detected!("avx512f").then(|| {
        // SAFETY: AVX-512F is present (checked just above).
        let (divs, sqrts) = unsafe { div_sqrt_rates_avx512() };
        Rates {
            // SAFETY: as above.
            flops: unsafe { flop_rate_avx512() },
            divs,
            sqrts,
        }
    });
    #[cfg(not(target_arch = "x86_64"))]
    let avx512: Option<Rates> = None;
    // The floors at the rates of the widest vectors the machine has (the targets' basis),
    // whichever variant this run's kernels use.
    let (rates, rates_name) = match (&avx512, &avx2) {
        (Some(r), _) => (r, "AVX-512F"),
        (None, Some(r)) => (r, "AVX2"),
        _ => (&portable, "baseline"),
    };
    let copy = copy_rate(N);
    let frame_bytes = std::mem::size_of::<StrakeFrame>() as f64;
    let copy_ns = frame_bytes / copy;
    println!("\nratios (same run)");
    ratio(
        "native path point (batch) / finite differences",
        g("path point, batch"),
        g("finite differences"),
        "target <= 0.12",
    );
    ratio(
        "third-order path point (frames with rates, batch) / second-order",
        g("path point with rates (third order), batch"),
        g("path point, batch"),
        "target <= 1.5",
    );
    {
        // Where the third order's extra time goes (same run): the surface's third partials
        // (block with them minus block without), the curve's third derivatives, and the rest
        // (the rates' closed forms, their gathers and checks).
        let extra = g("path point with rates (third order), batch") - g("path point, batch");
        let surf3 = g("surface jets + third partials, block of 64")
            - g("surface jets, block of 64, marching");
        let crv3 = g("curve third derivatives, block of 64");
        println!(
            "{:<62} {extra:6.1} ns: surface third partials {surf3:.1}, curve third derivatives {crv3:.1}, rates and the rest {:.1}",
            "  third order's extra time per point",
            extra - surf3 - crv3
        );
    }
    ratio(
        "native path point (batch) / finite differences, textbook evaluator",
        g("path point, batch"),
        g("finite differences, textbook evaluator"),
        "",
    );
    ratio(
        "native path point (one at a time) / finite differences",
        g("path point, one at a time"),
        g("finite differences"),
        "",
    );
    ratio(
        "(callback + frame) / callback alone, batch callback",
        g("C: strake_frames_at, batch callback"),
        g("C: host batch callback alone"),
        "",
    );
    ratio(
        "(callback + frame) / callback alone, batch callback, line",
        g("C: strake_frames_at, batch callback, line"),
        g("C: host batch callback alone, line"),
        "",
    );
    ratio(
        "(callback + frame) / callback alone, per-point callback",
        g("C: strake_frames_at, callback"),
        g("C: host callback alone"),
        "",
    );
    ratio(
        "parallel speed-up, frames_at_parallel 2 threads vs 1",
        g("parallel: frames_at_parallel, 1 thread"),
        g("parallel: frames_at_parallel, 2 threads"),
        "target >= 1.8",
    );
    ratio(
        "parallel speed-up, frames_at_parallel, long path",
        g("parallel, long path: frames_at_parallel, 1 thread"),
        g("parallel, long path: frames_at_parallel, 2 threads"),
        "target >= 1.9",
    );
    ratio(
        "parallel speed-up, C strake_frames_at_parallel 2 vs 1",
        g("parallel: C, native, 1 thread"),
        g("parallel: C, native, 2 threads"),
        "",
    );
    ratio(
        "marching / random, surface jet",
        g("surface jet, marching"),
        g("surface jet, random"),
        "",
    );
    ratio(
        "surface jets: block of 64 / one at a time (marching)",
        g("surface jets, block of 64, marching"),
        g("surface jet, marching"),
        "",
    );
    ratio(
        "marching / random, curve jet",
        g("curve jet, marching"),
        g("curve jet, random"),
        "",
    );
    ratio(
        "marching / random, path point (batch)",
        g("path point, batch"),
        g("path point, batch, random order"),
        "",
    );
    ratio(
        "frame from jets: batch / one at a time",
        g("frame from jets, batch"),
        g("frame from jets, one at a time"),
        "",
    );
    ratio(
        "path point: batch / one at a time",
        g("path point, batch"),
        g("path point, one at a time"),
        "",
    );
    ratio(
        "C native strake_frames_at / Rust frames_at",
        g("C: strake_frames_at, native"),
        g("path point, batch"),
        "",
    );

    // strake's own time per point on top of the host's batch callback, against the floor of
    // what strake computes there: the curve jet, the frame and the copy of the results that
    // the C ABI's rule (outputs written only on success) needs.
    let crv = curve_ops(3.0);
    let own_floor = floor_ns(crv + FRAME, rates) + copy_ns;
    println!(
        "\nstrake's own time per point on top of the host's evaluation (same run); floor {own_floor:.1} ns = curve jet {:.1} + frame {:.1} at the {rates_name} rates + copy of one {frame_bytes:.0}-byte C frame {copy_ns:.1} (copy rate {copy:.1} bytes per ns, {N} frames)",
        floor_ns(crv, rates),
        floor_ns(FRAME, rates)
    );
    for (label, with, alone, target) in [
        (
            "batch callback",
            "C: strake_frames_at, batch callback",
            "C: host batch callback alone",
            "target <= 2",
        ),
        (
            "batch callback, line",
            "C: strake_frames_at, batch callback, line",
            "C: host batch callback alone, line",
            "",
        ),
        (
            "per-point callback",
            "C: strake_frames_at, callback",
            "C: host callback alone",
            "",
        ),
    ] {
        let (w, a) = (g(with), g(alone));
        let added = w - a;
        println!(
            "{label:<24} {added:6.1} ns over a {a:5.1} ns host evaluation; {:5.2} x the floor   {target}",
            added / own_floor
        );
    }
    println!("\narithmetic floors");
    let show = |name: &str, r: &Rates| {
        println!(
            "machine rates, {name}: {:.1} independent adds/multiplies per ns, {:.2} divisions and {:.2} square roots per ns",
            r.flops, r.divs, r.sqrts
        )
    };
    show("baseline build (SSE2, 2 lanes)", &portable);
    if let Some(r) = &avx2 {
        show("AVX2 (4 lanes)", r);
    }
    if let Some(r) = &avx512 {
        show("AVX-512F (8 lanes)", r);
    }
    println!("dependent additions: {chain:.2} per ns (one addition's latency each)");
    println!(
        "floor = the larger of (operations / add-multiply rate) and (divisions / division rate + square roots / square-root rate), at the {rates_name} rates (the widest vectors here; this run's kernels: {}): every operation of the formulas perfectly vectorised and scheduled, the add/multiply pipes and the divide/sqrt unit busy at once; loads, stores, transposes, span searches, branches and conversions free; target for the batch kernels <= 2 x floor",
        variant.name()
    );
    let surf = surface_ops(3.0, 3.0, 2);
    let pos = surface_ops(3.0, 3.0, 0);
    let fd = 9.0 * pos + FD_COMBINE + crv + FRAME;
    let native = surf + crv + FRAME;
    println!(
        "{:<40} {:>7} {:>5} {:>5} {:>11} {:>11} {:>9}",
        "kernel", "ops", "div", "sqrt", "floor ns", "measured", "x floor"
    );
    let row = |name: &str, o: Ops, measured: f64| {
        let f = floor_ns(o, rates);
        println!(
            "{name:<40} {:>7.0} {:>5.0} {:>5.0} {:>11.1} {:>11.1} {:>9.1}",
            o.flops,
            o.divs,
            o.sqrts,
            f,
            measured,
            measured / f
        );
    };
    row(
        "surface jet (bicubic rational, 2nd)",
        surf,
        g("surface jet, marching"),
    );
    row(
        "surface jets, block of 64",
        surf,
        g("surface jets, block of 64, marching"),
    );
    row(
        "surface position (bicubic rational)",
        pos,
        g("surface position, marching"),
    );
    row(
        "curve jet (cubic rational, 2nd)",
        crv,
        g("curve jet, marching"),
    );
    row(
        "curve jets, block of 64",
        crv,
        g("curve jets, block of 64, marching"),
    );
    row("frame from jets", FRAME, g("frame from jets, batch"));
    row("native path point", native, g("path point, batch"));
    row("finite-difference path point", fd, g("finite differences"));
    println!(
        "native / finite differences at the floors: {:.3}",
        floor_ns(native, rates) / floor_ns(fd, rates)
    );

    // Accuracy of the finite-difference baseline.
    println!(
        "\nfinite-difference baseline accuracy over the {N} path points (errors of kn, tg, k1, k2 relative to max(|k1|, |k2|), of kg relative to the space curvature)"
    );
    let names = ["kn", "kg", "tg", "k1", "k2"];
    let eps = f64::EPSILON;
    for (label, h) in [
        ("1e-4 (the baseline; ~ eps^(1/4))", FD_STEP),
        ("1e-3", 1e-3),
        ("eps^(1/3) = 6.1e-6", eps.cbrt()),
        ("1e-6", 1e-6),
    ] {
        let fd = fd_frames(&surface, &curve, &ts, h);
        let e = fd_errors(&exact, &fd, h);
        let worst = e.worst.iter().cloned().fold(0.0, f64::max);
        let part = |(w, n): (f64, usize)| {
            if n == 0 {
                "no sample".to_string()
            } else {
                format!("worst {w:.1e} ({n} samples)")
            }
        };
        println!(
            "h = {label:<34} worst {worst:.1e}, median {:.1e}; stencil across a knot line: {}; elsewhere: {}",
            e.median,
            part(e.near),
            part(e.far)
        );
        if h == FD_STEP {
            for (k, name) in names.iter().enumerate() {
                let x = &exact[e.at[k]];
                println!(
                    "    {:<3} worst {:.2e} at t = {:.4} (u, v) = ({:.4}, {:.4}), {:.1} h from the nearest knot line",
                    name,
                    e.worst[k],
                    ts[e.at[k]],
                    x.u,
                    x.v,
                    knot_gap(x) / h
                );
            }
        }
    }
    println!("\nload average after: {}", load_average());
    // SAFETY: handles made above, freed once.
    unsafe {
        strake_surface_free(c_native);
        strake_surface_free(c_callback);
        strake_surface_free(c_batch);
        strake_curve_free(c_curve);
        strake_curve_free(c_line);
    }
}

// ---------------------------------------------------------------------------------------------
// Planning: geodesic steps, offsets and iso-scallop passes, against the cost of one surface jet.

/// Median of `rounds` timings (ns) of `run`, each repeated until it lasts 20 ms.
fn median_ns(rounds: usize, mut run: impl FnMut()) -> f64 {
    run();
    let t = Instant::now();
    run();
    let once = t.elapsed().as_nanos().max(1) as f64;
    let reps = ((2e7 / once).ceil() as usize).max(1);
    let mut v: Vec<f64> = (0..rounds)
        .map(|_| {
            let t = Instant::now();
            for _ in 0..reps {
                run();
            }
            t.elapsed().as_nanos() as f64 / reps as f64
        })
        .collect();
    v.sort_by(f64::total_cmp);
    v[v.len() / 2]
}

/// The planning section of the report (see benches/README.md, "Planning").
fn planning_report(
    surface: &strake::NurbsSurface,
    curve: &strake::NurbsCurve<2>,
    us: &[f64],
    vs: &[f64],
) {
    use strake::checks::{Cutter, ToolAngles, ToolSide};
    use strake::{
        OffsetDistance, OffsetOptions, OffsetSide, PassCutter, PassOptions, StartDirection,
        TraceOptions, offset_path, plan_passes, trace_geodesic,
    };
    println!("\nplanning (the wing-skin surface; medians of 7 rounds)");
    // One second-order surface jet, marching along the path (the access a trace makes).
    let jet_ns = median_ns(7, || {
        let mut hint = SurfaceHint::default();
        for (&u, &v) in us.iter().zip(vs) {
            black_box(
                surface
                    .jet_in_domain(u, v, DerivOrder::Second, &mut hint)
                    .unwrap(),
            );
        }
    }) / us.len() as f64;
    println!("one surface jet (2nd order, marching)       {jet_ns:8.1} ns");
    for tol in [1e-6, 1e-9] {
        let opts = TraceOptions::new(tol);
        let trace =
            || trace_geodesic(surface, 0.05, 0.5, StartDirection::Angle(0.3), 6.0, &opts).unwrap();
        let g = trace();
        let st = g.stats;
        let ns = median_ns(7, || {
            black_box(trace());
        });
        let per_step = ns / st.accepted as f64;
        println!(
            "geodesic, tolerance {tol:.0e}: {} accepted + {} rejected steps, {} jets over {:.3}: {:.2} jets per accepted step (target <= 8); {per_step:.0} ns per accepted step = {:.2} jets' time",
            st.accepted,
            st.rejected,
            st.jets,
            g.length,
            st.jets as f64 / st.accepted as f64,
            per_step / jet_ns
        );
    }
    let off_opts = OffsetOptions::new(1e-6);
    let offset = || {
        offset_path(
            surface,
            curve,
            OffsetSide::Left,
            &OffsetDistance::Constant(0.15),
            &off_opts,
        )
        .unwrap()
    };
    let o = offset();
    let points: usize = o.pieces.iter().map(|p| p.samples.len()).sum();
    let ns = median_ns(7, || {
        black_box(offset());
    });
    println!(
        "offset of the path at 0.15 (chord 1e-6): {points} points, {:.0} jets per point, {:.1} us per point = {:.0} jets' time",
        o.jets as f64 / points as f64,
        ns / points as f64 * 1e-3,
        ns / points as f64 / jet_ns
    );
    let ball = PassOptions {
        max_rows: Some(2),
        ..PassOptions::iso_scallop(0.5, ToolSide::AlongNormal, 0.002, OffsetSide::Left, 1e-6)
    };
    let toroidal = PassOptions {
        cutter: Some(PassCutter {
            cutter: Cutter::Toroidal {
                radius: 0.5,
                corner_radius: 0.1,
            },
            angles: ToolAngles {
                lead: 0.05,
                tilt: 0.3,
            },
        }),
        ..ball
    };
    for (name, opts) in [
        ("ball r 0.5", ball),
        ("toroidal 0.5/0.1, lead 0.05, tilt 0.3", toroidal),
    ] {
        let plan = || plan_passes(surface, curve, &opts).unwrap();
        let p = plan();
        let ns = median_ns(3, || {
            black_box(plan());
        });
        println!(
            "iso-scallop, {name}, h 0.002, 2 rows: {} passes, {} offsets, {} output points, {:.0} jets per point, {:.1} us per point = {:.0} jets' time",
            p.count,
            p.offset_attempts,
            p.offset_points,
            p.trace_jets as f64 / p.offset_points as f64,
            ns / p.offset_points as f64 * 1e-3,
            ns / p.offset_points as f64 / jet_ns
        );
    }
}
