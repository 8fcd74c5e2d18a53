//! Evaluation time per point of a bicubic rational NURBS surface (8 × 8 control net,
//! non-uniform knots and weights): the point and all partials to second order, at random
//! points (a fresh span search each time), marching along a path with a carried span hint, and
//! marching in blocks of 64 points (`SurfaceSource::jets_in_domain_block`, the batch path's call).
//!
//! The surface is `common::wing_skin`. Each benchmark evaluates `POINTS` points per iteration;
//! criterion's throughput figure gives points per second, and time / `POINTS` the time per
//! point.

#[path = "common/mod.rs"]
mod common;

use common::{Lcg, POINTS, wing_skin};
use criterion::{Criterion, Throughput, black_box, criterion_group, criterion_main};
use strake::geometry::jet::{DerivOrder, SurfaceJet};
use strake::surface::{SurfaceHint, SurfaceSource};

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
    let (path_u, path_v): (Vec<f64>, Vec<f64>) = path.iter().copied().unzip();

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
        g.bench_function(format!("{name}/jet2_marching_blocks_of_64"), |b| {
            let mut out = vec![SurfaceJet::default(); POINTS];
            b.iter(|| {
                let mut hint = SurfaceHint::default();
                for ((u, v), o) in path_u
                    .chunks(64)
                    .zip(path_v.chunks(64))
                    .zip(out.chunks_mut(64))
                {
                    s.jets_in_domain_block(
                        black_box(u),
                        black_box(v),
                        DerivOrder::Second,
                        &mut hint,
                        o,
                    )
                    .unwrap();
                }
                out[POINTS - 1].svv.z
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
