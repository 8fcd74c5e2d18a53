//! Cost per sample of each sampling mode, per projected point, and per interpolated point, on
//! an analytic torus (R = 3, r = 1) along a slanted parameter-plane curve interpolated through
//! points (the form in which a host hands over a path). Criterion reports time per element.

use criterion::{Criterion, Throughput, criterion_group, criterion_main};
use std::hint::black_box;
use strake::analytic::torus;
use strake::nurbs::interpolate::{Parametrization, interpolate};
use strake::paths::projection::{ProjectionOptions, project_points};
use strake::paths::sampling::{
    ChordalOptions, DEFAULT_ARC_TOLERANCE, sample_chordal, sample_even_arc, sample_even_t,
};
use strake::{CurveOnSurface, DerivOrder, SurfaceHint, SurfaceSource};

fn bench(c: &mut Criterion) {
    let t = torus(3.0, 1.0);
    let uv: Vec<[f64; 2]> = (0..=200)
        .map(|k| {
            let s = k as f64 / 200.0;
            [0.2 + 5.3 * s, 0.3 + 4.7 * s + 0.2 * (9.0 * s).sin()]
        })
        .collect();
    let curve = interpolate(&uv, 3, Parametrization::ChordLength, None).unwrap();
    let path = CurveOnSurface::new(&t, &curve);
    let n = 1000;

    let mut g = c.benchmark_group("sampling");
    g.throughput(Throughput::Elements(n as u64));
    let mut frames = vec![path.frame(0.0, &mut Default::default()).unwrap(); n];
    g.bench_function("frames_even (no arc length; baseline)", |b| {
        b.iter(|| path.frames_even(black_box(&mut frames[..])).unwrap())
    });
    let mut out = Vec::with_capacity(4 * n);
    g.bench_function("even_t", |b| {
        b.iter(|| {
            out.clear();
            sample_even_t(&path, n, DEFAULT_ARC_TOLERANCE, &mut out).unwrap()
        })
    });
    g.bench_function("even_arc", |b| {
        b.iter(|| {
            out.clear();
            sample_even_arc(&path, n, DEFAULT_ARC_TOLERANCE, &mut out).unwrap()
        })
    });
    // Pick the chord tolerance that gives about n samples, so the figure is per sample.
    let opts = ChordalOptions::new(2e-5, f64::INFINITY);
    out.clear();
    let count = sample_chordal(&path, &opts, &mut out).unwrap();
    g.throughput(Throughput::Elements(count as u64));
    g.bench_function(format!("chordal ({count} samples)"), |b| {
        b.iter(|| {
            out.clear();
            sample_chordal(&path, &opts, &mut out).unwrap()
        })
    });
    g.finish();

    let mut g = c.benchmark_group("curves");
    let pts: Vec<[f64; 3]> = (0..n)
        .map(|k| {
            let s = k as f64 / n as f64;
            let j = t
                .checked_jet(
                    0.2 + 5.3 * s,
                    0.3 + 4.7 * s,
                    DerivOrder::Position,
                    &mut SurfaceHint::default(),
                )
                .unwrap();
            [j.p.x, j.p.y, j.p.z]
        })
        .collect();
    g.throughput(Throughput::Elements(n as u64));
    let popts = ProjectionOptions::new(1e-6).periodic(true, true);
    g.bench_function("project_points (continuation)", |b| {
        b.iter(|| project_points(&t, black_box(&pts), &popts).unwrap())
    });
    let uvn: Vec<[f64; 2]> = (0..n)
        .map(|k| {
            let s = k as f64 / n as f64;
            [0.2 + 5.3 * s, 0.3 + 4.7 * s + 0.2 * (9.0 * s).sin()]
        })
        .collect();
    g.bench_function("interpolate (cubic, chord length)", |b| {
        b.iter(|| interpolate(black_box(&uvn), 3, Parametrization::ChordLength, None).unwrap())
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
