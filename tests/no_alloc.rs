//! No heap allocation per evaluated point: a counting global allocator watches the evaluation
//! paths (single frames, frames along a traced geodesic, the batch and parallel entry points, native NURBS surfaces and curves,
//! the frame from jets one at a time and in batches, and the C entry points with callback,
//! batch-callback and native surfaces). Calls that allocate per call (a C batch's scratch
//! buffer, a parallel call's thread handles) must allocate the same number of times for 10 000
//! points as for 20 000.
//!
//! The counter is process-wide (a parallel call's workers must be counted too), so nothing
//! else may allocate while it counts: this file runs without the test harness
//! (`harness = false` in `Cargo.toml`): the harness runs each test on a thread of its own
//! while its main thread allocates on its own schedule (for instance for its "has been
//! running for over 60 seconds" notice), which is the likely cause of a count of single frames
//! once coming out at 4 on a heavily loaded machine. `main` runs the checks one after the
//! other on the only thread there is.

use std::alloc::{GlobalAlloc, Layout, System};
use std::ffi::c_void;
use std::sync::atomic::{AtomicUsize, Ordering};
use strake::analytic::torus;
use strake::ffi::*;
use strake::{
    CurveJet, CurveOnSurface, DarbouxFrame, DerivOrder, Hints, NurbsCurve, NurbsSurface,
    NurbsSurfaceData, Orientation, SpanHint, SurfaceHint, SurfaceJet, SurfaceSource, UvCurve,
    darboux_frames,
};

struct Counting;
static ALLOCS: AtomicUsize = AtomicUsize::new(0);

unsafe impl GlobalAlloc for Counting {
    unsafe fn alloc(&self, layout: Layout) -> *mut u8 {
        ALLOCS.fetch_add(1, Ordering::SeqCst);
        unsafe { System.alloc(layout) }
    }
    unsafe fn dealloc(&self, ptr: *mut u8, layout: Layout) {
        unsafe { System.dealloc(ptr, layout) }
    }
    unsafe fn realloc(&self, ptr: *mut u8, layout: Layout, new_size: usize) -> *mut u8 {
        ALLOCS.fetch_add(1, Ordering::SeqCst);
        unsafe { System.realloc(ptr, layout, new_size) }
    }
}

#[global_allocator]
static GLOBAL: Counting = Counting;

fn count<R>(f: impl FnOnce() -> R) -> (R, usize) {
    let before = ALLOCS.load(Ordering::SeqCst);
    let r = f();
    (r, ALLOCS.load(Ordering::SeqCst) - before)
}

fn main() {
    evaluation_paths_do_not_allocate();
    println!("no_alloc: every evaluation path checked, no allocation per point");
}

fn evaluation_paths_do_not_allocate() {
    let s = torus(5.0, 1.5);
    let knots = [0.0, 0.0, 0.0, 0.0, 0.3, 0.5, 0.8, 1.0, 1.0, 1.0, 1.0];
    let pts = [
        [0.1, 0.2],
        [1.0, 1.5],
        [2.0, 0.5],
        [3.0, 3.0],
        [4.0, 4.5],
        [5.0, 2.0],
        [6.0, 5.5],
    ];
    let c = NurbsCurve::new(3, &knots, &pts, Some(&[1.0, 0.8, 1.2, 1.0, 0.9, 1.1, 1.0])).unwrap();
    let cs = CurveOnSurface::new(&s, &c);
    let n = 10_000;
    let ts: Vec<f64> = (0..n).map(|i| i as f64 / (n - 1) as f64).collect();
    let mut out: Vec<DarbouxFrame> = vec![cs.frame(0.0, &mut Hints::default()).unwrap(); n];

    let (_, a) = count(|| {
        let mut h = Hints::default();
        for &t in &ts {
            std::hint::black_box(cs.frame(t, &mut h).unwrap());
        }
    });
    assert_eq!(a, 0, "single frames allocated {a} times for {n} points");
    let (r, a) = count(|| cs.frames_at(&ts, &mut out));
    r.unwrap();
    assert_eq!(a, 0, "frames_at allocated {a} times");
    let (r, a) = count(|| cs.frames_even(&mut out));
    r.unwrap();
    assert_eq!(a, 0, "frames_even allocated {a} times");
    // Failure paths may allocate for their message; that is per call, not per point.

    // Frames along a traced geodesic (its Hermite curve): tracing allocates its nodes once,
    // evaluating allocates nothing.
    let g = strake::trace_geodesic(
        &s,
        1.0,
        0.5,
        strake::StartDirection::Angle(0.7),
        10.0,
        &strake::TraceOptions::new(1e-9),
    )
    .unwrap();
    let gs = CurveOnSurface::new(&s, &g.curve);
    let (_, a) = count(|| {
        let mut h = Hints::default();
        for &t in &ts {
            std::hint::black_box(gs.frame(10.0 * t, &mut h).unwrap());
        }
    });
    assert_eq!(a, 0, "frames along a traced geodesic allocated {a} times");

    // Native NURBS surface and curve jets.
    let patch = nurbs_patch();
    let (_, a) = count(|| {
        let (mut hs, mut hc) = (SurfaceHint::default(), SpanHint::default());
        for &t in &ts {
            let cj = c.checked_jet(t, &mut hc).unwrap();
            let (u, v) = (cj.u / 6.5, cj.v / 6.5);
            std::hint::black_box(patch.jet(u, v, DerivOrder::Second, &mut hs).unwrap());
        }
    });
    assert_eq!(a, 0, "NURBS jets allocated {a} times");
    // The same points a block at a time (the batch path's call).
    let (us, vs): (Vec<f64>, Vec<f64>) = ts
        .iter()
        .map(|&t| {
            let cj = c.checked_jet(t, &mut SpanHint::default()).unwrap();
            (cj.u / 6.5, cj.v / 6.5)
        })
        .unzip();
    let mut jets = vec![SurfaceJet::default(); n];
    let (_, a) = count(|| {
        let mut hs = SurfaceHint::default();
        for ((u, v), o) in us.chunks(64).zip(vs.chunks(64)).zip(jets.chunks_mut(64)) {
            patch
                .jets_in_domain_block(u, v, DerivOrder::Second, &mut hs, o)
                .unwrap();
        }
    });
    assert_eq!(a, 0, "NURBS block jets allocated {a} times");

    // The frame from jets, in a batch.
    let sj: Vec<SurfaceJet> = ts
        .iter()
        .map(|&t| {
            let cj = c.checked_jet(t, &mut SpanHint::default()).unwrap();
            s.checked_jet(cj.u, cj.v, DerivOrder::Second, &mut SurfaceHint::default())
                .unwrap()
        })
        .collect();
    let cj: Vec<CurveJet> = ts
        .iter()
        .map(|&t| c.checked_jet(t, &mut SpanHint::default()).unwrap())
        .collect();
    let scales = cs.scales();
    let (r, a) = count(|| darboux_frames(&sj, &cj, &ts, Orientation::Forward, &scales, &mut out));
    r.unwrap();
    assert_eq!(a, 0, "darboux_frames allocated {a} times");

    // The parallel batch: none on one thread; per call (thread handles) on two.
    let (r, a) = count(|| cs.frames_at_parallel(&ts, &mut out, 1));
    r.unwrap();
    assert_eq!(a, 0, "frames_at_parallel(1 thread) allocated {a} times");
    let ts2: Vec<f64> = (0..2 * n).map(|i| i as f64 / (2 * n - 1) as f64).collect();
    let mut out2 = vec![out[0]; 2 * n];
    let (r, a1) = count(|| cs.frames_at_parallel(&ts, &mut out, 2));
    r.unwrap();
    let (r, a2) = count(|| cs.frames_at_parallel(&ts2, &mut out2, 2));
    r.unwrap();
    assert_eq!(
        a1,
        a2,
        "frames_at_parallel(2 threads): {a1} allocations for {n} points, {a2} for {}",
        2 * n
    );

    // The C entry points, with a per-point callback, a batch callback and a native surface.
    c_abi(&ts, &ts2);
    rates_and_centre_path_do_not_allocate();
}

/// A bicubic rational NURBS patch over [0, 1]² (control net of a gently curved sheet).
fn nurbs_patch() -> NurbsSurface {
    let k = [0.0, 0.0, 0.0, 0.0, 0.3, 0.6, 1.0, 1.0, 1.0, 1.0];
    let mut pts = Vec::new();
    let mut ws = Vec::new();
    for i in 0..6 {
        for j in 0..6 {
            let (x, y) = (i as f64, j as f64);
            pts.push([x, y, 0.1 * (x * y).sin()]);
            ws.push(1.0 + 0.1 * ((i + j) % 3) as f64);
        }
    }
    NurbsSurface::new(&NurbsSurfaceData {
        degree_u: 3,
        degree_v: 3,
        count_u: 6,
        count_v: 6,
        knots_u: &k,
        knots_v: &k,
        points: &pts,
        weights: Some(&ws),
    })
    .unwrap()
}

unsafe extern "C" fn patch_point(
    ud: *mut c_void,
    u: f64,
    v: f64,
    _order: i32,
    out: *mut StrakeSurfaceJet,
) -> i32 {
    // SAFETY: user_data is the patch; out a valid jet.
    let (s, o) = unsafe { (&*(ud as *const NurbsSurface), &mut *out) };
    let j = s
        .jet(u, v, DerivOrder::Second, &mut SurfaceHint::default())
        .unwrap();
    let a = |v: &strake::Vec3| [v.x, v.y, v.z];
    (o.p, o.su, o.sv, o.suu, o.suv, o.svv) =
        (a(&j.p), a(&j.su), a(&j.sv), a(&j.suu), a(&j.suv), a(&j.svv));
    0
}

unsafe extern "C" fn patch_batch(
    ud: *mut c_void,
    u: *const f64,
    v: *const f64,
    count: usize,
    order: i32,
    out: *mut StrakeSurfaceJet,
) -> i32 {
    for i in 0..count {
        // SAFETY: strake passes `count` points and jets.
        unsafe { patch_point(ud, *u.add(i), *v.add(i), order, out.add(i)) };
    }
    0
}

fn c_abi(ts: &[f64], ts2: &[f64]) {
    let patch = nurbs_patch();
    let ud = &patch as *const NurbsSurface as *mut c_void;
    let mut point = std::ptr::null_mut();
    let mut batch = std::ptr::null_mut();
    let mut curve = std::ptr::null_mut();
    let knots = [0.0, 0.0, 0.0, 1.0, 1.0, 1.0];
    let uv = [0.05, 0.1, 0.5, 0.9, 0.95, 0.4];
    let k = [0.0, 0.0, 0.0, 0.0, 0.3, 0.6, 1.0, 1.0, 1.0, 1.0];
    let mut pts = Vec::new();
    for i in 0..6 {
        for j in 0..6 {
            pts.extend([i as f64, j as f64, 0.1 * ((i * j) as f64).sin()]);
        }
    }
    let data = StrakeNurbsSurfaceData {
        degree_u: 3,
        degree_v: 3,
        count_u: 6,
        count_v: 6,
        knots_u: k.as_ptr(),
        knot_count_u: k.len(),
        knots_v: k.as_ptr(),
        knot_count_v: k.len(),
        points: pts.as_ptr(),
        weights: std::ptr::null(),
    };
    let mut native = std::ptr::null_mut();
    // SAFETY: valid callbacks, data and output slots.
    unsafe {
        assert_eq!(
            strake_surface_from_callback(Some(patch_point), ud, 0.0, 1.0, 0.0, 1.0, 0, &mut point),
            StrakeStatus::Ok
        );
        assert_eq!(
            strake_surface_from_batch_callback(
                Some(patch_batch),
                ud,
                0.0,
                1.0,
                0.0,
                1.0,
                0,
                &mut batch
            ),
            StrakeStatus::Ok
        );
        assert_eq!(
            strake_surface_new_nurbs(&data, 0, &mut native),
            StrakeStatus::Ok
        );
        assert_eq!(
            strake_curve_new_nurbs(
                2,
                knots.as_ptr(),
                6,
                uv.as_ptr(),
                3,
                std::ptr::null(),
                &mut curve
            ),
            StrakeStatus::Ok
        );
    }
    let mut out = vec![StrakeFrame::default(); ts2.len()];
    for (name, s) in [
        ("callback", point),
        ("batch callback", batch),
        ("native", native),
    ] {
        let mut one = StrakeFrame::default();
        let (st, a) = count(|| {
            let mut st = StrakeStatus::Ok;
            for &t in ts {
                // SAFETY: live handles and a frame.
                st = unsafe { strake_frame_at(s, curve, t, &mut one) };
            }
            st
        });
        assert_eq!((st, a), (StrakeStatus::Ok, 0), "{name}: strake_frame_at");
        // Per call, not per point: the same count for n and 2n points.
        let mut per_call = |f: &dyn Fn(&[f64], &mut [StrakeFrame]) -> StrakeStatus| {
            let (st1, a1) = count(|| f(ts, &mut out[..ts.len()]));
            let (st2, a2) = count(|| f(ts2, &mut out));
            assert_eq!((st1, st2), (StrakeStatus::Ok, StrakeStatus::Ok));
            assert_eq!(
                a1,
                a2,
                "{name}: {a1} allocations for {} points, {a2} for {}",
                ts.len(),
                ts2.len()
            );
            a1
        };
        // SAFETY (each closure): live handles, `ts.len()` parameters and frames.
        let a = per_call(&|ts, o| unsafe {
            strake_frames_at(s, curve, ts.as_ptr(), ts.len(), o.as_mut_ptr())
        });
        assert_eq!(
            a, 1,
            "{name}: strake_frames_at allocates only its scratch buffer"
        );
        let a =
            per_call(&|ts, o| unsafe { strake_frames_even(s, curve, ts.len(), o.as_mut_ptr()) });
        assert_eq!(
            a, 1,
            "{name}: strake_frames_even allocates only its scratch buffer"
        );
        let a = per_call(&|ts, o| unsafe {
            strake_frames_at_parallel(s, curve, ts.as_ptr(), ts.len(), 1, o.as_mut_ptr())
        });
        assert_eq!(
            a, 1,
            "{name}: strake_frames_at_parallel(1) allocates only its scratch"
        );
        per_call(&|ts, o| unsafe {
            strake_frames_at_parallel(s, curve, ts.as_ptr(), ts.len(), 2, o.as_mut_ptr())
        });
    }
    // SAFETY: handles made above, freed once.
    unsafe {
        strake_curve_free(curve);
        strake_surface_free(point);
        strake_surface_free(batch);
        strake_surface_free(native);
    }
}

/// The rates of change and the tool-centre path on a rational bicubic NURBS patch allocate
/// nothing per point (third- and fourth-order partials live on the stack). Called from
/// `evaluation_paths_do_not_allocate` (the allocation counter is global: tests running at
/// once would count each other's allocations).
fn rates_and_centre_path_do_not_allocate() {
    use strake::checks::tool_axis::ToolAngles;
    use strake::checks::{Cutter, ToolSide};
    use strake::toolpath::{ToolSetup, centre_path_at};
    let s = nurbs_patch();
    let c = NurbsCurve::new(
        1,
        &[0.0, 0.0, 1.0, 1.0],
        &[[0.05, 0.04], [0.95, 0.92]],
        None,
    )
    .unwrap();
    let cs = CurveOnSurface::new(&s, &c);
    let setup = ToolSetup {
        cutter: Cutter::Toroidal {
            radius: 1.0,
            corner_radius: 0.3,
        },
        side: ToolSide::AlongNormal,
        angles: ToolAngles {
            lead: 0.1,
            tilt: 0.0,
        },
    };
    let run = |n: usize| {
        let ts: Vec<f64> = (0..n).map(|i| i as f64 / (n - 1) as f64).collect();
        let f0 = cs.frame(0.0, &mut Hints::default()).unwrap();
        let mut frames = vec![f0; n];
        let mut rates = vec![strake::InvariantRates::default(); n];
        let (r, a1) = count(|| cs.frames_with_rates_at(&ts, &mut frames, &mut rates));
        r.unwrap();
        let (_, sp, cp) = cs
            .frame_and_partials(0.0, 4, &mut Hints::default())
            .unwrap();
        let p0 = strake::centre_point(&f0, &sp, &cp, s.orientation(), &setup, 0.0).unwrap();
        let mut pts = vec![p0; n];
        let (r, a2) = count(|| centre_path_at(&cs, &ts, &setup, 4, &mut pts));
        r.unwrap();
        (a1, a2)
    };
    let (a1, a2) = run(100);
    let (b1, b2) = run(2000);
    assert_eq!(
        a1, b1,
        "frames_with_rates_at: {a1} allocations for 100 points, {b1} for 2000"
    );
    assert_eq!(
        (a2, b2),
        (0, 0),
        "centre_path_at allocated {a2} / {b2} times"
    );
}
