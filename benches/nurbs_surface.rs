//! Evaluation time per point of a bicubic rational NURBS surface (8 × 8 control net,
//! non-uniform knots and weights): the point and all partials to second order, at random
//! points (a fresh span search each time) and marching along a path with a carried span hint.
//!
//! Each benchmark evaluates `POINTS` points per iteration; criterion's throughput figure gives
//! points per second, and time / `POINTS` the time per point.

use criterion::{Criterion, Throughput, black_box, criterion_group, criterion_main};
use strake::jet::DerivOrder;
use strake::nurbs::{NurbsSurface, NurbsSurfaceData};
use strake::surface::SurfaceHint;

const POINTS: usize = 1024;

/// 64-bit LCG (Knuth's MMIX constants) for reproducible inputs without a crate.
struct Lcg(u64);

impl Lcg {
    fn next(&mut self) -> f64 {
        self.0 = self
            .0
            .wrapping_mul(6364136223846793005)
            .wrapping_add(1442695040888963407);
        (self.0 >> 11) as f64 / (1u64 << 53) as f64
    }
}

/// A bicubic 8 × 8 "wing skin": non-uniform knots, weights in [0.5, 2] (or none).
fn wing_skin(rational: bool) -> NurbsSurface {
    let ku = [0.0, 0.0, 0.0, 0.0, 0.1, 0.3, 0.45, 0.8, 1.0, 1.0, 1.0, 1.0];
    let kv = [0.0, 0.0, 0.0, 0.0, 0.2, 0.35, 0.6, 0.7, 1.0, 1.0, 1.0, 1.0];
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
    NurbsSurface::new(&NurbsSurfaceData {
        degree_u: 3,
        degree_v: 3,
        count_u: 8,
        count_v: 8,
        knots_u: &ku,
        knots_v: &kv,
        points: &pts,
        weights: if rational { Some(&ws) } else { None },
    })
    .unwrap()
}

fn bench(c: &mut Criterion) {
    let mut rng = Lcg(7);
    let random: Vec<(f64, f64)> = (0..POINTS).map(|_| (rng.next(), rng.next())).collect();
    // A slanted path across the whole surface, crossing every span in u and v.
    let path: Vec<(f64, f64)> = (0..POINTS)
        .map(|i| {
            let t = i as f64 / (POINTS - 1) as f64;
            (0.02 + 0.96 * t, 0.9 - 0.85 * t)
        })
        .collect();

    let mut g = c.benchmark_group("nurbs_surface_bicubic_8x8");
    g.throughput(Throughput::Elements(POINTS as u64));
    for (name, rational) in [("rational", true), ("nonrational", false)] {
        let s = wing_skin(rational);
        g.bench_function(format!("{name}/jet2_random_points"), |b| {
            b.iter(|| {
                let mut acc = 0.0;
                for &(u, v) in &random {
                    let mut hint = SurfaceHint::default();
                    let j = s
                        .jet(black_box(u), black_box(v), DerivOrder::Second, &mut hint)
                        .unwrap();
                    acc += j.svv.z;
                }
                acc
            })
        });
        g.bench_function(format!("{name}/jet2_marching_with_hint"), |b| {
            b.iter(|| {
                let mut acc = 0.0;
                let mut hint = SurfaceHint::default();
                for &(u, v) in &path {
                    let j = s
                        .jet(black_box(u), black_box(v), DerivOrder::Second, &mut hint)
                        .unwrap();
                    acc += j.svv.z;
                }
                acc
            })
        });
    }
    let s = wing_skin(true);
    g.bench_function("rational/position_only_marching", |b| {
        b.iter(|| {
            let mut acc = 0.0;
            let mut hint = SurfaceHint::default();
            for &(u, v) in &path {
                let j = s
                    .jet(black_box(u), black_box(v), DerivOrder::Position, &mut hint)
                    .unwrap();
                acc += j.p.z;
            }
            acc
        })
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
