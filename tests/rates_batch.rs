//! The third-order batch (`CurveOnSurface::frames_with_rates_at`) against the one-point path
//! (`CurveOnSurface::frame_with_rates`): the same bits at every sample, on a native NURBS
//! surface (whose jets and third partials come from one block evaluation) and on an analytic
//! surface (third partials asked point by point), over several chunks of 64 samples, with
//! every vector-kernel variant this processor has; and the same first failure.

use strake::analytic;
use strake::isa::{VectorKernels, limit_vector_kernels, supported_vector_kernels};
use strake::{
    CurveOnSurface, Hints, InvariantRates, NurbsCurve, NurbsSurface, NurbsSurfaceData,
    SurfaceSource, UvCurve,
};

/// A rational bicubic "wing skin" of 7 × 6 control points over [0, 1]² with interior knots.
fn wing_skin() -> NurbsSurface {
    let (nu, nv) = (7, 6);
    let ku = [0.0, 0.0, 0.0, 0.0, 0.2, 0.45, 0.7, 1.0, 1.0, 1.0, 1.0];
    let kv = [0.0, 0.0, 0.0, 0.0, 0.35, 0.6, 1.0, 1.0, 1.0, 1.0];
    let mut pts = Vec::new();
    let mut ws = Vec::new();
    for i in 0..nu {
        for j in 0..nv {
            let (x, y) = (i as f64 / 6.0, j as f64 / 5.0);
            pts.push([
                3.0 * x + 0.1 * y,
                2.0 * y,
                0.4 * (2.1 * x).sin() * (1.0 + 0.3 * y) + 0.05 * ((i * j) % 3) as f64,
            ]);
            ws.push(0.6 + 0.1 * ((i + 2 * j) % 7) as f64);
        }
    }
    NurbsSurface::new(&NurbsSurfaceData {
        degree_u: 3,
        degree_v: 3,
        count_u: nu,
        count_v: nv,
        knots_u: &ku,
        knots_v: &kv,
        points: &pts,
        weights: Some(&ws),
    })
    .unwrap()
}

/// A rational cubic in the parameter plane crossing knot lines in u and v.
fn pass() -> NurbsCurve<2> {
    let knots = [0.0, 0.0, 0.0, 0.0, 0.3, 0.55, 0.8, 1.0, 1.0, 1.0, 1.0];
    let pts = [
        [0.05, 0.1],
        [0.25, 0.7],
        [0.4, 0.2],
        [0.6, 0.85],
        [0.75, 0.3],
        [0.85, 0.6],
        [0.95, 0.9],
    ];
    let ws = [1.0, 0.8, 1.3, 0.9, 1.2, 1.0, 0.95];
    NurbsCurve::new(3, &knots, &pts, Some(&ws)).unwrap()
}

fn bits(r: &InvariantRates) -> [u64; 4] {
    [
        r.normal_curvature.to_bits(),
        r.geodesic_curvature.to_bits(),
        r.geodesic_torsion.to_bits(),
        r.space_curvature.to_bits(),
    ]
}

fn check_path<S: SurfaceSource, C: UvCurve>(path: &CurveOnSurface<'_, S, C>) {
    let n = 203;
    let ts: Vec<f64> = (0..n).map(|i| i as f64 / (n - 1) as f64).collect();
    let f0 = path.frame(0.0, &mut Hints::default()).unwrap();
    let mut frames = vec![f0; n];
    let mut plain = vec![f0; n];
    let mut rates = vec![InvariantRates::default(); n];
    path.frames_with_rates_at(&ts, &mut frames, &mut rates)
        .unwrap();
    path.frames_at(&ts, &mut plain).unwrap();
    assert_eq!(frames, plain, "frames differ from frames_at");
    let mut hints = Hints::default();
    for (i, &t) in ts.iter().enumerate() {
        let (f, r) = path.frame_with_rates(t, &mut hints).unwrap();
        assert_eq!(f, frames[i], "frame at sample {i}");
        assert_eq!(
            bits(&r),
            bits(&rates[i]),
            "rates at sample {i}: {r:?} vs {:?}",
            rates[i]
        );
        // A fresh hint gives the same bits (hints only affect speed).
        let (_, r2) = path.frame_with_rates(t, &mut Hints::default()).unwrap();
        assert_eq!(bits(&r2), bits(&r));
    }
}

#[test]
fn batch_rates_are_the_bits_of_the_one_point_path() {
    let s = wing_skin();
    let c = pass();
    let a = analytic::torus(5.0, 1.5);
    let ct = NurbsCurve::new(
        3,
        &[0.0, 0.0, 0.0, 0.0, 0.5, 1.0, 1.0, 1.0, 1.0],
        &[[0.1, 0.2], [1.0, 1.5], [2.0, 0.5], [3.0, 3.0], [4.0, 4.5]],
        Some(&[1.0, 0.8, 1.2, 1.0, 0.9]),
    )
    .unwrap();
    let supported = supported_vector_kernels();
    for k in [
        VectorKernels::Baseline,
        VectorKernels::Avx2,
        VectorKernels::Avx512,
    ] {
        if k > supported {
            continue;
        }
        limit_vector_kernels(k);
        check_path(&CurveOnSurface::new(&s, &c));
        check_path(&CurveOnSurface::new(&a, &ct));
    }
    limit_vector_kernels(supported);
}

/// A sample outside the curve's domain stops both paths at the same index with the same
/// error, after the samples before it got their rates.
#[test]
fn the_first_failure_is_that_of_the_one_point_path() {
    let s = wing_skin();
    let c = pass();
    let path = CurveOnSurface::new(&s, &c);
    let mut ts: Vec<f64> = (0..150).map(|i| i as f64 / 149.0).collect();
    ts[97] = 1.5;
    let f0 = path.frame(0.0, &mut Hints::default()).unwrap();
    let mut frames = vec![f0; ts.len()];
    let mut rates = vec![InvariantRates::default(); ts.len()];
    let e = path
        .frames_with_rates_at(&ts, &mut frames, &mut rates)
        .unwrap_err();
    assert_eq!(e.index, 97);
    let one = path
        .frame_with_rates(1.5, &mut Hints::default())
        .unwrap_err();
    assert_eq!(e.error, one);
    for i in [0, 63, 64, 96] {
        let (_, r) = path.frame_with_rates(ts[i], &mut Hints::default()).unwrap();
        assert_eq!(bits(&r), bits(&rates[i]));
    }
}

/// The tool-centre path at order 3 (closed forms from the frame and the rates, by the
/// batch) against the series route (order 4, one sample at a time): the same centre,
/// tangent, speed ratio, curvature and axis rate to round-off, for a ball, a flat and a
/// toroidal cutter with lead and tilt.
#[test]
fn centre_path_third_order_agrees_with_the_series_route() {
    use strake::checks::tool_axis::ToolAngles;
    use strake::checks::{Cutter, ToolSide};
    use strake::toolpath::{ToolSetup, centre_path_at};
    let s = wing_skin();
    let c = pass();
    let path = CurveOnSurface::new(&s, &c);
    let n = 150;
    let ts: Vec<f64> = (0..n).map(|i| i as f64 / (n - 1) as f64).collect();
    let cutters = [
        Cutter::Ball { radius: 0.05 },
        Cutter::Flat { radius: 0.04 },
        Cutter::Toroidal {
            radius: 0.05,
            corner_radius: 0.01,
        },
    ];
    for cutter in cutters {
        let setup = ToolSetup {
            cutter,
            side: ToolSide::AlongNormal,
            angles: ToolAngles {
                lead: 0.1,
                tilt: 0.05,
            },
        };
        let f0 = path.frame(0.0, &mut Hints::default()).unwrap();
        let p0 = strake::centre_point(
            &f0,
            &s.checked_partials(f0.u, f0.v, 4, &mut Default::default())
                .unwrap(),
            &c.checked_partials(0.0, 4, &mut Default::default()).unwrap(),
            s.orientation(),
            &setup,
            0.0,
        )
        .unwrap();
        let (mut a, mut b) = (vec![p0; n], vec![p0; n]);
        centre_path_at(&path, &ts, &setup, 3, &mut a).unwrap();
        centre_path_at(&path, &ts, &setup, 4, &mut b).unwrap();
        for i in 0..n {
            let (x, y) = (&a[i], &b[i]);
            let close = |p: f64, q: f64, what: &str| {
                assert!(
                    (p - q).abs() <= 1e-9 * (1.0 + q.abs()),
                    "{cutter:?} sample {i} {what}: {p} vs {q}"
                )
            };
            close((x.centre - y.centre).norm(), 0.0, "centre");
            close((x.tangent - y.tangent).norm(), 0.0, "tangent");
            close(x.speed_ratio, y.speed_ratio, "speed ratio");
            close(x.curvature, y.curvature, "curvature");
            close(x.axis_rate, y.axis_rate, "axis rate");
            assert!(x.curvature_rate.is_none() && y.curvature_rate.is_some());
        }
    }
}
