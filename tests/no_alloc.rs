//! No heap allocation per evaluated point: a counting global allocator watches the evaluation
//! paths. This file holds a single test so that no other test thread allocates meanwhile.

use std::alloc::{GlobalAlloc, Layout, System};
use std::sync::atomic::{AtomicUsize, Ordering};
use strake::analytic::torus;
use strake::{CurveOnSurface, DarbouxFrame, Hints, NurbsCurve};

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

#[test]
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
}
