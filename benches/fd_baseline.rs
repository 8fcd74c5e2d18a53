//! The yardstick strake replaces: the finite-difference frame a host programmer would write
//! (`benches/common::fd_frame`): the curve's own jet, nine position-only evaluations of the
//! surface on a 3 × 3 stencil of step h = 1e-4 (central differences for Su, Sv, Suu, Suv, Svv),
//! then the frame from those jets, one path point after the other; and the same with the nine
//! positions from a textbook evaluator (`common::TextbookSurface`: The NURBS Book A2.1, A2.2,
//! A4.3, no span hint, no reciprocal tables). Compare with `benches/path_point.rs` (same path,
//! same surface).

#[path = "common/mod.rs"]
mod common;

use common::{POINTS, TextbookSurface, fd_frame, fd_frame_textbook, path_ts, wing_path, wing_skin};
use criterion::{Criterion, Throughput, black_box, criterion_group, criterion_main};
use strake::nurbs::SpanHint;
use strake::surface::SurfaceHint;

fn bench(c: &mut Criterion) {
    let surface = wing_skin(true);
    let curve = wing_path();
    let ts = path_ts(POINTS);
    let mut g = c.benchmark_group("fd_baseline");
    g.throughput(Throughput::Elements(POINTS as u64));
    g.bench_function("nine_positions_and_frame_marching", |b| {
        b.iter(|| {
            let (mut hs, mut hc) = (SurfaceHint::default(), SpanHint::default());
            for &t in &ts {
                black_box(fd_frame(&surface, &curve, black_box(t), &mut hs, &mut hc).unwrap());
            }
        })
    });
    let textbook = TextbookSurface::wing_skin();
    g.bench_function("nine_textbook_positions_and_frame_marching", |b| {
        b.iter(|| {
            let mut hc = SpanHint::default();
            for &t in &ts {
                black_box(fd_frame_textbook(&textbook, &curve, black_box(t), &mut hc).unwrap());
            }
        })
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
