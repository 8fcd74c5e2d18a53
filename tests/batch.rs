//! Batch and parallel entry points give the same frames as one-at-a-time evaluation, and report
//! the failing index.

use strake::analytic::torus;
use strake::{
    CurveJet, CurveOnSurface, DarbouxFrame, FnCurve, Hints, Interval, NurbsCurve, StrakeError,
};

fn curve() -> NurbsCurve<2> {
    // A cubic UV path winding around the torus.
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
    NurbsCurve::new(3, &knots, &pts, Some(&[1.0, 0.8, 1.2, 1.0, 0.9, 1.1, 1.0])).unwrap()
}

#[test]
fn serial_batch_even_and_parallel_agree_with_single_frames() {
    let s = torus(5.0, 1.5);
    let c = curve();
    let cs = CurveOnSurface::new(&s, &c);
    let n = 2000;
    let ts: Vec<f64> = (0..n).map(|i| i as f64 / (n - 1) as f64).collect();
    let mut single = Vec::with_capacity(n);
    for &t in &ts {
        // Fresh hints each time: no help from marching.
        single.push(cs.frame(t, &mut Hints::default()).unwrap());
    }
    let blank = single[0];
    let mut batch = vec![blank; n];
    cs.frames_at(&ts, &mut batch).unwrap();
    assert_eq!(batch, single);
    let mut even = vec![blank; n];
    cs.frames_even(&mut even).unwrap();
    assert_eq!(even, single);
    for threads in [1, 2, 3, 8] {
        let mut par = vec![blank; n];
        cs.frames_at_parallel(&ts, &mut par, threads).unwrap();
        assert_eq!(par, single, "threads = {threads}");
    }
}

#[test]
fn failures_report_the_lowest_index() {
    let s = torus(5.0, 1.5);
    let c = curve();
    let cs = CurveOnSurface::new(&s, &c);
    let n = 3000;
    let mut ts: Vec<f64> = (0..n).map(|i| i as f64 / (n - 1) as f64).collect();
    ts[2100] = 1.5;
    ts[2900] = f64::NAN;
    let mut out: Vec<DarbouxFrame> = vec![cs.frame(0.0, &mut Hints::default()).unwrap(); n];
    let e = cs.frames_at_parallel(&ts, &mut out, 2).unwrap_err();
    assert_eq!(e.index, 2100);
    assert!(matches!(
        e.error,
        StrakeError::OutOfDomain { name: "t", .. }
    ));
    let e = cs.frames_at(&ts, &mut out).unwrap_err();
    assert_eq!(e.index, 2100);
    assert!(e.to_string().contains("sample 2100"));
    assert!(cs.frames_at_parallel(&ts, &mut out, 0).is_err());
    assert!(cs.frames_at(&ts[..10], &mut out).is_err());
}

// Common practice for work handed out in pieces: however the pieces fall to the threads, the
// error reported is that of the lowest failing sample, and every sample before it is written
// as one at a time would write it. 40 000 samples make about 16 pieces per thread, so the
// three bad samples (in reverse order of index along the array) fall in different pieces.
#[test]
fn pieces_over_threads_report_the_lowest_failure() {
    let s = torus(5.0, 1.5);
    let c = curve();
    let cs = CurveOnSurface::new(&s, &c);
    let n = 40_000;
    let mut ts: Vec<f64> = (0..n).map(|i| i as f64 / (n - 1) as f64).collect();
    let good = ts.clone();
    for (at, bad) in [(31_000, 2.0), (17_500, -0.5), (9_100, f64::NAN)] {
        ts[at] = bad;
    }
    let blank = cs.frame(0.5, &mut Hints::default()).unwrap();
    let mut want = vec![blank; n];
    cs.frames_at(&good, &mut want).unwrap();
    for threads in [2, 3, 4] {
        for _ in 0..5 {
            let mut out = vec![blank; n];
            let e = cs.frames_at_parallel(&ts, &mut out, threads).unwrap_err();
            assert_eq!(e.index, 9_100, "threads = {threads}: {e}");
            assert!(matches!(e.error, StrakeError::NonFinite { .. }), "{e}");
            assert_eq!(out[..9_100], want[..9_100], "threads = {threads}");
        }
    }
}

// Common practice for scoped worker threads: a panic in any worker reaches the caller (and no
// worker is left waiting for the others), whichever chunk it happens in; with 2 threads and
// 2000 samples, t = 0.2 lies in the calling thread's chunk and t = 0.8 in the other one's.
#[test]
fn a_panic_in_any_worker_reaches_the_caller() {
    let s = torus(5.0, 1.5);
    let n = 2000;
    let ts: Vec<f64> = (0..n).map(|i| i as f64 / (n - 1) as f64).collect();
    for bad in [0.2, 0.8] {
        let c = FnCurve::new(Interval::new("t", 0.0, 1.0).unwrap(), move |t: f64| {
            assert!((t - bad).abs() > 1e-3, "host curve gave up at t = {t}");
            Ok(CurveJet {
                u: 6.0 * t,
                v: 1.0 + t,
                du: 6.0,
                dv: 1.0,
                ddu: 0.0,
                ddv: 0.0,
            })
        });
        let cs = CurveOnSurface::new(&s, &c);
        let blank = cs.frame(0.5, &mut Hints::default()).unwrap();
        let mut out = vec![blank; n];
        let r = std::panic::catch_unwind(std::panic::AssertUnwindSafe(|| {
            cs.frames_at_parallel(&ts, &mut out, 2)
        }));
        let payload = r.expect_err("the worker's panic must reach the caller");
        let text = payload
            .downcast_ref::<String>()
            .cloned()
            .unwrap_or_default();
        assert!(text.contains("host curve gave up"), "{text}");
    }
}
