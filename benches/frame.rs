//! Hot path: the Darboux frame and invariants from given jets (`darboux_frame`), i.e. the cost
//! strake adds on top of the host's surface evaluation, one point at a time.

use criterion::{Criterion, black_box, criterion_group, criterion_main};
use strake::analytic::torus;
use strake::{
    CurveJet, DerivOrder, Orientation, ParamScales, SurfaceHint, SurfaceSource, darboux_frame,
};

fn bench(c: &mut Criterion) {
    let s = torus(5.0, 1.5);
    let n = 1024;
    let jets: Vec<_> = (0..n)
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
        .collect();
    let scales = ParamScales {
        u_extent: std::f64::consts::TAU,
        v_extent: std::f64::consts::TAU,
        t_extent: 1.0,
    };
    c.bench_function("frame_from_jets", |b| {
        let mut i = 0;
        b.iter(|| {
            let (sj, cj) = &jets[i % n];
            i += 1;
            black_box(
                darboux_frame(
                    black_box(sj),
                    black_box(cj),
                    Orientation::Forward,
                    &scales,
                    0.0,
                )
                .unwrap(),
            )
        })
    });
}

criterion_group!(benches, bench);
criterion_main!(benches);
