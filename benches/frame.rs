//! Hot path: the Darboux frame and invariants from given jets, i.e. the cost strake adds on top
//! of the host's surface evaluation: one point at a time (`darboux_frame`, bound by the latency
//! of its square roots and divisions) and a whole array at once (`darboux_frames`, the
//! structure-of-arrays kernel of the batch entry points).

use criterion::{Criterion, Throughput, black_box, criterion_group, criterion_main};
use strake::analytic::torus;
use strake::{
    CurveJet, DerivOrder, Orientation, ParamScales, SurfaceHint, SurfaceSource, darboux_frame,
    darboux_frames,
};

fn bench(c: &mut Criterion) {
    let s = torus(5.0, 1.5);
    let n = 1024;
    let (sj, cj): (Vec<_>, Vec<_>) = (0..n)
        .map(|i| {
            let (u, v) = (
                0.1 + 6.0 * i as f64 / n as f64,
                0.2 + 5.9 * ((i * 7) % n) as f64 / n as f64,
            );
            let sj = s
                .checked_jet(u, v, DerivOrder::Second, &mut SurfaceHint::default())
                .unwrap();
            let cj = CurveJet {
                u,
                v,
                du: 1.0,
                dv: 0.3 + (i % 5) as f64 * 0.1,
                ddu: 0.2,
                ddv: -0.1,
            };
            (sj, cj)
        })
        .unzip();
    let ts: Vec<f64> = (0..n).map(|i| i as f64 / n as f64).collect();
    let scales = ParamScales {
        u_extent: std::f64::consts::TAU,
        v_extent: std::f64::consts::TAU,
        t_extent: 1.0,
    };
    c.bench_function("frame_from_jets", |b| {
        let mut i = 0;
        b.iter(|| {
            let k = i % n;
            i += 1;
            black_box(
                darboux_frame(
                    black_box(&sj[k]),
                    black_box(&cj[k]),
                    Orientation::Forward,
                    &scales,
                    0.0,
                )
                .unwrap(),
            )
        })
    });
    let mut g = c.benchmark_group("frame_from_jets_batch");
    g.throughput(Throughput::Elements(n as u64));
    let first = darboux_frame(&sj[0], &cj[0], Orientation::Forward, &scales, 0.0).unwrap();
    let mut out = vec![first; n];
    g.bench_function("darboux_frames_1024", |b| {
        b.iter(|| {
            darboux_frames(&sj, &cj, &ts, Orientation::Forward, &scales, &mut out).unwrap();
            black_box(&mut out);
        })
    });
    g.finish();
}

criterion_group!(benches, bench);
criterion_main!(benches);
