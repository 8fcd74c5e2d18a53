//! Hot path: the native path point, i.e. curve jet + surface jet + frame along a path
//! (`benches/common`: a rational cubic UV path on the bicubic rational 8 × 8 surface), one
//! point at a time with carried span hints (`CurveOnSurface::frame`), through the batch entry
//! point `CurveOnSurface::frames_at` (blocks of points, frame math in structure-of-arrays form)
//! marching along the path, and the batch at random parameters (fresh span searches).

#[path = "common/mod.rs"]
mod common;

use common::{POINTS, path_ts, random_ts, wing_path, wing_skin};
use criterion::{Criterion, Throughput, black_box, criterion_group, criterion_main};
use strake::{CurveOnSurface, Hints};

fn bench(c: &mut Criterion) {
    let surface = wing_skin(true);
    let curve = wing_path();
    let cs = CurveOnSurface::new(&surface, &curve);
    let ts = path_ts(POINTS);
    let random = random_ts(POINTS, 11);
    let mut out = vec![cs.frame(0.0, &mut Hints::default()).unwrap(); POINTS];
    let mut g = c.benchmark_group("path_point");
    g.throughput(Throughput::Elements(POINTS as u64));
    g.bench_function("one_at_a_time_marching", |b| {
        b.iter(|| {
            let mut h = Hints::default();
            for &t in &ts {
                black_box(cs.frame(black_box(t), &mut h).unwrap());
            }
        })
    });
    g.bench_function("frames_at_marching", |b| {
        b.iter(|| {
            cs.frames_at(black_box(&ts), &mut out).unwrap();
            black_box(&mut out);
        })
    });
    g.bench_function("frames_at_random", |b| {
        b.iter(|| {
            cs.frames_at(black_box(&random), &mut out).unwrap();
            black_box(&mut out);
        })
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
