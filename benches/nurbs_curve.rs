//! Evaluation time per point of a rational cubic NURBS curve in the parameter plane (the path of
//! `benches/common`, 7 control points): (u, v) and the first two derivatives, marching along the
//! curve with a carried span hint and at random parameters (a fresh span search each time).

#[path = "common/mod.rs"]
mod common;

use common::{POINTS, path_ts, random_ts, wing_path};
use criterion::{Criterion, Throughput, criterion_group, criterion_main};
use std::hint::black_box;
use strake::UvCurve;
use strake::nurbs::SpanHint;

fn bench(c: &mut Criterion) {
    let curve = wing_path();
    let marching = path_ts(POINTS);
    let random = random_ts(POINTS, 11);
    let mut g = c.benchmark_group("nurbs_curve_cubic_rational");
    g.throughput(Throughput::Elements(POINTS as u64));
    g.bench_function("jet2_marching_with_hint", |b| {
        b.iter(|| {
            let mut acc = 0.0;
            let mut hint = SpanHint::default();
            for &t in &marching {
                acc += curve.checked_jet(black_box(t), &mut hint).unwrap().ddv;
            }
            acc
        })
    });
    g.bench_function("jet2_random_points", |b| {
        b.iter(|| {
            let mut acc = 0.0;
            for &t in &random {
                let mut hint = SpanHint::default();
                acc += curve.checked_jet(black_box(t), &mut hint).unwrap().ddv;
            }
            acc
        })
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
