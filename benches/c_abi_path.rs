//! A whole path through the C ABI (`strake_frames_at`, 1024 samples per call) with the three
//! kinds of surface handle, against the cost of the host's surface evaluation alone:
//! - `callback_alone` / `batch_callback_alone`: the host's evaluator called for the path's
//!   (u, v) points, one per call or 64 per call (what the host pays anyway);
//! - `frames_at_callback` / `frames_at_batch_callback`: the same evaluator behind
//!   `strake_surface_from_callback` / `strake_surface_from_batch_callback`, plus strake's curve
//!   jet, frame, and the copy of the results to the host's array;
//! - `frames_at_native`: the surface as a native NURBS handle (`strake_surface_new_nurbs`).
//!
//! The host's evaluator is strake's own bicubic rational NURBS evaluation (`benches/common`),
//! standing in for the host's kernel.

#[path = "common/mod.rs"]
mod common;

use common::*;
use criterion::{Criterion, Throughput, black_box, criterion_group, criterion_main};
use strake::ffi::{StrakeFrame, StrakeSurfaceJet};

fn bench(c: &mut Criterion) {
    let host = wing_skin(true);
    let curve = wing_path();
    let ts = path_ts(POINTS);
    let (us, vs) = path_uv(&curve, &ts);
    let ud = &host as *const strake::NurbsSurface as *mut std::ffi::c_void;
    let native = c_native_surface();
    let callback = c_callback_surface(&host);
    let batch = c_batch_callback_surface(&host);
    let path = c_path();
    let mut out = vec![StrakeFrame::default(); POINTS];
    let mut jets = vec![StrakeSurfaceJet::default(); POINTS];

    let mut g = c.benchmark_group("c_abi_path");
    g.throughput(Throughput::Elements(POINTS as u64));
    g.bench_function("callback_alone", |b| {
        b.iter(|| {
            for (j, (&u, &v)) in jets.iter_mut().zip(us.iter().zip(&vs)) {
                // SAFETY: the callback's contract: a live surface and a valid jet.
                assert_eq!(unsafe { host_surface(ud, u, v, 2, j) }, 0);
            }
            black_box(&mut jets);
        })
    });
    g.bench_function("batch_callback_alone", |b| {
        b.iter(|| {
            for (j, (u, v)) in jets.chunks_mut(64).zip(us.chunks(64).zip(vs.chunks(64))) {
                // SAFETY: as above, `u.len()` points and jets.
                let st = unsafe {
                    host_surface_batch(ud, u.as_ptr(), v.as_ptr(), u.len(), 2, j.as_mut_ptr())
                };
                assert_eq!(st, 0);
            }
            black_box(&mut jets);
        })
    });
    for (name, s) in [
        ("frames_at_callback", callback),
        ("frames_at_batch_callback", batch),
        ("frames_at_native", native),
    ] {
        g.bench_function(name, |b| {
            b.iter(|| {
                c_frames_at(s, path, black_box(&ts), &mut out);
                black_box(&mut out);
            })
        });
    }
    g.finish();
    // SAFETY: handles made above, freed once.
    unsafe {
        strake::ffi::strake_surface_free(native);
        strake::ffi::strake_surface_free(callback);
        strake::ffi::strake_surface_free(batch);
        strake::ffi::strake_curve_free(path);
    }
}

criterion_group!(benches, bench);
criterion_main!(benches);
