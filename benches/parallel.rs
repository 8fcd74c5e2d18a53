//! The parallel batch entry points on the host's number of threads: the same 65 536-sample path
//! (`benches/common`) through `CurveOnSurface::frames_at_parallel` and through the C ABI's
//! `strake_frames_at_parallel` with a native surface, on 1 thread (the serial batch) and on 2
//! (scoped threads started and joined within the call).

#[path = "common/mod.rs"]
mod common;

use common::*;
use criterion::{Criterion, Throughput, black_box, criterion_group, criterion_main};
use strake::ffi::StrakeFrame;
use strake::{CurveOnSurface, Hints};

const N: usize = 65536;

fn bench(c: &mut Criterion) {
    let surface = wing_skin(true);
    let curve = wing_path();
    let cs = CurveOnSurface::new(&surface, &curve);
    let ts = path_ts(N);
    let mut out = vec![cs.frame(0.0, &mut Hints::default()).unwrap(); N];
    let native = c_native_surface();
    let path = c_path();
    let mut out_c = vec![StrakeFrame::default(); N];
    let mut g = c.benchmark_group("parallel");
    g.throughput(Throughput::Elements(N as u64));
    g.sample_size(20);
    for threads in [1, 2] {
        g.bench_function(format!("frames_at_parallel_{threads}_threads"), |b| {
            b.iter(|| {
                cs.frames_at_parallel(black_box(&ts), &mut out, threads)
                    .unwrap();
                black_box(&mut out);
            })
        });
        g.bench_function(format!("c_frames_at_parallel_{threads}_threads"), |b| {
            b.iter(|| {
                c_frames_at_parallel(native, path, black_box(&ts), threads as u32, &mut out_c);
                black_box(&mut out_c);
            })
        });
    }
    g.finish();
    // SAFETY: handles made above, freed once.
    unsafe {
        strake::ffi::strake_surface_free(native);
        strake::ffi::strake_curve_free(path);
    }
}

criterion_group!(benches, bench);
criterion_main!(benches);
