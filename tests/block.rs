//! The batch entry points (a block of points at a time, the frame math in structure-of-arrays
//! form) against the one-point path `CurveOnSurface::frame`, point by point with carried span
//! hints: the same frames bit for bit (the requirement is 1e-13 relative; every lane performs
//! the same IEEE operations in the same order, so the test demands equality), and the same
//! first failing sample with the same error, at every position inside a block.
//!
//! Common practice (no outside source needed): two evaluation orders of the same formulas must
//! agree; the surfaces below cover every branch of the frame math (umbilics, both signs of
//! (W11 − W22), flipped normals, refusals, non-finite jets, host failures, overflow).

use std::f64::consts::{PI, TAU};
use strake::analytic::{monge, plane, saddle, sphere, torus};
use strake::{
    CurveJet, CurveOnSurface, DarbouxFrame, DerivOrder, FnCurve, FnSurface, Hints, Interval,
    NurbsCurve, NurbsSurface, NurbsSurfaceData, Orientation, SampleError, StrakeError, SurfaceJet,
    SurfaceSource, UvCurve, Vec3,
};

#[path = "support/lcg.rs"]
mod lcg;
use lcg::Lcg;

/// The one-point path, sample after sample with carried hints (the loop the batch replaces).
fn reference<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    cs: &CurveOnSurface<'_, S, C>,
    ts: &[f64],
) -> (Vec<DarbouxFrame>, Option<SampleError>) {
    let mut hints = Hints::default();
    let mut out = Vec::new();
    for (index, &t) in ts.iter().enumerate() {
        match cs.frame(t, &mut hints) {
            Ok(f) => out.push(f),
            Err(error) => return (out, Some(SampleError { index, t, error })),
        }
    }
    (out, None)
}

/// Every f64 of a frame, for a bitwise comparison (PartialEq would let −0 equal +0).
fn bits(f: &DarbouxFrame) -> [u64; 30] {
    f.to_array().map(f64::to_bits)
}

/// Runs `frames_at` (and, without failures, the parallel batch) and compares with the one-point
/// path. Returns the number of frames compared.
#[track_caller]
fn same<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    cs: &CurveOnSurface<'_, S, C>,
    ts: &[f64],
) -> usize {
    let (want, want_err) = reference(cs, ts);
    let blank = want.first().copied().unwrap_or_else(|| {
        // Any frame will do as a placeholder.
        let s = plane((0.0, 1.0), (0.0, 1.0));
        let c = strake::uv_line(0.2, 0.2, 0.8, 0.3).unwrap();
        CurveOnSurface::new(&s, &c)
            .frame(0.5, &mut Hints::default())
            .unwrap()
    });
    let mut got = vec![blank; ts.len()];
    let r = cs.frames_at(ts, &mut got);
    match (&want_err, r) {
        (None, Ok(())) => {}
        (Some(w), Err(g)) => {
            assert_eq!(g.index, w.index, "first failing sample: {g} vs {w}");
            assert_eq!(g.t.to_bits(), w.t.to_bits());
            assert_eq!(g.to_string(), w.to_string());
        }
        (w, g) => panic!("one-point path {w:?}, batch {g:?}"),
    }
    for (i, (a, b)) in got.iter().zip(&want).enumerate() {
        assert_eq!(
            bits(a),
            bits(b),
            "sample {i} (t = {}): {a:?} vs {b:?}",
            ts[i]
        );
    }
    if want_err.is_none() {
        for threads in [2, 3] {
            let mut par = vec![blank; ts.len()];
            cs.frames_at_parallel(ts, &mut par, threads).unwrap();
            for (a, b) in par.iter().zip(&want) {
                assert_eq!(bits(a), bits(b), "parallel, {threads} threads");
            }
        }
    }
    want.len()
}

/// As [`same`], for inputs that must fail (so that the comparison covers an error); returns the
/// error's text.
#[track_caller]
fn fails<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    cs: &CurveOnSurface<'_, S, C>,
    ts: &[f64],
) -> String {
    let (_, err) = reference(cs, ts);
    let err = err.expect("these inputs must fail");
    same(cs, ts);
    err.to_string()
}

fn ts_even(n: usize) -> Vec<f64> {
    (0..n).map(|i| i as f64 / (n - 1) as f64).collect()
}

fn wing() -> NurbsSurface {
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
        weights: Some(&ws),
    })
    .unwrap()
}

fn cubic_path(pts: &[[f64; 2]; 7]) -> NurbsCurve<2> {
    let knots = [0.0, 0.0, 0.0, 0.0, 0.25, 0.5, 0.75, 1.0, 1.0, 1.0, 1.0];
    let w = [1.0, 0.8, 1.2, 1.0, 0.9, 1.1, 1.0];
    NurbsCurve::new(3, &knots, pts, Some(&w)).unwrap()
}

// Every variant of the batch kernels this processor supports (AVX-512F, AVX2, baseline), each
// forced through the process-wide limit; the only test of this file that sets the limit, so
// the variant asserted is the one that runs (the other tests may run under any variant: all
// give the same bits).
#[test]
fn batch_frames_are_the_bits_of_the_one_point_path() {
    use strake::{VectorKernels, limit_vector_kernels, supported_vector_kernels, vector_kernels};
    let mut ran = 0;
    for v in [
        VectorKernels::Avx512,
        VectorKernels::Avx2,
        VectorKernels::Baseline,
    ] {
        if v > supported_vector_kernels() {
            continue;
        }
        limit_vector_kernels(v);
        assert_eq!(vector_kernels(), v);
        batch_frames_in_the_active_variant();
        ran += 1;
    }
    limit_vector_kernels(VectorKernels::Avx512);
    assert!(ran >= 1);
}

fn batch_frames_in_the_active_variant() {
    let mut compared = 0;
    // A rational bicubic NURBS surface, both orientations, sample counts around the block size.
    let path = cubic_path(&[
        [0.03, 0.9],
        [0.2, 0.75],
        [0.35, 0.9],
        [0.5, 0.4],
        [0.7, 0.15],
        [0.85, 0.5],
        [0.97, 0.3],
    ]);
    for orientation in [Orientation::Forward, Orientation::Reversed] {
        let s = wing().with_orientation(orientation);
        let cs = CurveOnSurface::new(&s, &path);
        for n in [1, 2, 7, 8, 9, 15, 16, 17, 33, 1000] {
            let ts = if n == 1 { vec![0.37] } else { ts_even(n) };
            compared += same(&cs, &ts);
        }
        // Unordered parameters (no help from span hints).
        let mut rng = Lcg(3);
        let ts: Vec<f64> = (0..500).map(|_| rng.next()).collect();
        compared += same(&cs, &ts);
    }
    // Closed-form surfaces: a torus (both signs of W11 − W22 along a winding path), a sphere
    // (an umbilic everywhere), a plane (k1 = k2 = 0), a saddle.
    let winding = cubic_path(&[
        [0.1, 0.2],
        [1.0, 1.5],
        [2.0, 0.5],
        [3.0, 3.0],
        [4.0, 4.5],
        [5.0, 2.0],
        [6.0, 5.5],
    ]);
    let t = torus(5.0, 1.5);
    compared += same(&CurveOnSurface::new(&t, &winding), &ts_even(777));
    let sp = sphere(2.0);
    let lat = cubic_path(&[
        [0.1, 0.4],
        [1.0, 1.5],
        [2.0, 0.5],
        [3.0, 2.5],
        [4.0, 2.9],
        [5.0, 2.0],
        [6.0, 1.5],
    ]);
    compared += same(&CurveOnSurface::new(&sp, &lat), &ts_even(300));
    let pl = plane((-1.0, 1.0), (-1.0, 1.0));
    let sa = saddle((-1.0, 1.0), (-1.0, 1.0));
    let diag = cubic_path(&[
        [-0.9, -0.8],
        [-0.5, -0.9],
        [-0.2, 0.3],
        [0.0, 0.0],
        [0.3, -0.4],
        [0.6, 0.5],
        [0.9, 0.8],
    ]);
    compared += same(&CurveOnSurface::new(&pl, &diag), &ts_even(200));
    compared += same(&CurveOnSurface::new(&sa, &diag), &ts_even(200));
    // Random cubic Monge patches with random curve jets (closures), flipped or not.
    let mut rng = Lcg(17);
    for case in 0..40 {
        let c: Vec<f64> = (0..10).map(|_| 2.0 * rng.next() - 1.0).collect();
        let f = move |x: f64, y: f64| {
            [
                c[0] * x * x + c[1] * x * y + c[2] * y * y + c[3] * x * x * x + c[4] * y * y * y,
                2.0 * c[0] * x + c[1] * y + 3.0 * c[3] * x * x,
                c[1] * x + 2.0 * c[2] * y + 3.0 * c[4] * y * y,
                2.0 * c[0] + 6.0 * c[3] * x,
                c[1],
                2.0 * c[2] + 6.0 * c[4] * y,
            ]
        };
        let m = monge((-1.0, 1.0), (-1.0, 1.0), f);
        let k: Vec<f64> = (0..6).map(|_| 2.0 * rng.next() - 1.0).collect();
        let curve = FnCurve::new(Interval { lo: 0.0, hi: 1.0 }, move |t: f64| {
            Ok(CurveJet {
                u: 0.8 * (k[0] * t + 0.1 * (5.0 * t).sin()),
                v: 0.8 * (k[1] * t * t - 0.1),
                du: 0.8 * (k[0] + 0.5 * (5.0 * t).cos()),
                dv: 0.8 * 2.0 * k[1] * t + 0.3,
                ddu: k[2] * 3.0,
                ddv: k[3] + k[4] * t,
            })
        });
        if case % 2 == 0 {
            compared += same(&CurveOnSurface::new(&m, &curve), &ts_even(64 + case));
        } else {
            let flipped = FnSurface::new(
                m.u_domain(),
                m.v_domain(),
                Orientation::Reversed,
                |u, v, o| m.jet_in_domain(u, v, o, &mut Default::default()),
            );
            compared += same(&CurveOnSurface::new(&flipped, &curve), &ts_even(64 + case));
        }
    }
    assert!(compared > 7000, "{compared}");
}

/// A surface that misbehaves at chosen points: a NaN entry for u in a band, an error from the
/// evaluator in another band, and a huge curvature (an overflowing K) in a third.
fn faulty() -> impl SurfaceSource {
    FnSurface::new(
        Interval { lo: 0.0, hi: 1.0 },
        Interval { lo: 0.0, hi: 1.0 },
        Orientation::Forward,
        |u: f64, v: f64, _o: DerivOrder| {
            let mut j = SurfaceJet {
                p: Vec3::new(u, v, 0.5 * u * u),
                su: Vec3::new(1.0, 0.0, u),
                sv: Vec3::new(0.0, 1.0, 0.0),
                suu: Vec3::new(0.0, 0.0, 1.0),
                suv: Vec3::zeros(),
                svv: Vec3::new(0.0, 0.0, 0.3),
            };
            if (0.40..0.41).contains(&u) {
                j.suv.y = f64::NAN;
            }
            if (0.60..0.61).contains(&u) {
                return Err(StrakeError::InvalidArgument("host refused".into()));
            }
            if (0.80..0.81).contains(&u) {
                j.suu.z = 1e200;
                j.svv.z = 1e200;
            }
            Ok(j)
        },
    )
}

#[test]
fn batch_errors_are_those_of_the_one_point_path() {
    let s = faulty();
    let line = strake::uv_line(0.05, 0.5, 0.95, 0.5).unwrap();
    let cs = CurveOnSurface::new(&s, &line);
    // Parameters that hit each faulty band at every position inside a block.
    for band in [0.405, 0.605, 0.805] {
        let t_bad = (band - 0.05) / 0.9;
        // Positions inside the first blocks and around the end of the first chunk of 64.
        for pos in (0..17).chain([62, 63, 64, 65, 100]) {
            // Regular samples at u < 0.37, clear of the faulty bands.
            let mut ts: Vec<f64> = (0..140).map(|i| 0.0025 * i as f64).collect();
            ts[pos] = t_bad;
            ts[pos + 5] = t_bad; // a second failure later must not win
            let m = fails(&cs, &ts);
            assert!(m.contains(&format!("sample {pos} ")), "{m}");
        }
    }
    // Parameters out of the curve's domain, NaN, and a curve leaving the surface.
    let leaving = strake::uv_line(0.5, 0.5, 1.2, 0.5).unwrap();
    let cs_leaving = CurveOnSurface::new(&s, &leaving);
    for pos in [0, 3, 7, 8, 12] {
        let mut ts: Vec<f64> = (0..20).map(|i| 0.01 * i as f64).collect();
        ts[pos] = 1.5;
        assert!(fails(&cs, &ts).contains("t = 1.5 is outside"));
        ts[pos] = f64::NAN;
        assert!(fails(&cs, &ts).contains("non-finite"));
        let mut ts: Vec<f64> = (0..20).map(|i| 0.01 * i as f64).collect();
        ts[pos] = 0.9; // u = 1.13: outside the surface
        assert!(fails(&cs_leaving, &ts).contains("u = 1.13"));
    }
    // A curve that stalls at t = 0.5 (u' = v' = 0), and a sphere path through the pole
    // (a degenerate surface point, refused).
    let stalling = FnCurve::new(Interval { lo: 0.0, hi: 1.0 }, |t: f64| {
        Ok(CurveJet {
            u: 0.2 + 0.6 * t,
            v: 0.5,
            du: if t == 0.5 { 0.0 } else { 0.6 },
            dv: 0.0,
            ddu: 0.0,
            ddv: 0.0,
        })
    });
    let cs_stall = CurveOnSurface::new(&s, &stalling);
    for pos in [0, 5, 9] {
        let mut ts: Vec<f64> = (0..12).map(|i| 0.05 * i as f64).collect();
        ts[pos] = 0.5;
        assert!(fails(&cs_stall, &ts).contains("stalled curve"));
    }
    let sp = sphere(1.0);
    let meridian = strake::uv_line(1.0, 0.5, 1.0, 0.0).unwrap();
    let m = fails(&CurveOnSurface::new(&sp, &meridian), &ts_even(11));
    assert!(m.contains("sample 10") && m.contains("degenerate"), "{m}");
    let over = strake::uv_line(0.3, PI - 0.2, TAU - 0.3, 0.2).unwrap();
    same(&CurveOnSurface::new(&sp, &over), &ts_even(101));
}

#[test]
fn frames_from_jets_in_a_batch_are_those_of_darboux_frame() {
    use strake::{ParamScales, darboux_frame, darboux_frames};
    let t = torus(5.0, 1.5);
    let scales = ParamScales {
        u_extent: TAU,
        v_extent: TAU,
        t_extent: 1.0,
    };
    let mut rng = Lcg(8);
    let n = 203;
    let mut sj = Vec::new();
    let mut cj = Vec::new();
    let ts: Vec<f64> = (0..n).map(|i| i as f64 / n as f64).collect();
    for i in 0..n {
        let (u, v) = (TAU * rng.next(), TAU * rng.next());
        sj.push(
            t.checked_jet(u, v, DerivOrder::Second, &mut Default::default())
                .unwrap(),
        );
        cj.push(CurveJet {
            u,
            v,
            du: rng.next() - 0.5,
            dv: rng.next() - 0.5,
            ddu: rng.next() - 0.5,
            ddv: if i == 150 { 0.0 } else { rng.next() - 0.5 },
        });
    }
    for orientation in [Orientation::Forward, Orientation::Reversed] {
        let want: Vec<DarbouxFrame> = (0..n)
            .map(|i| darboux_frame(&sj[i], &cj[i], orientation, &scales, ts[i]).unwrap())
            .collect();
        let mut got = want.clone();
        got.iter_mut().for_each(|f| f.speed = -1.0);
        darboux_frames(&sj, &cj, &ts, orientation, &scales, &mut got).unwrap();
        for (a, b) in got.iter().zip(&want) {
            assert_eq!(bits(a), bits(b));
        }
    }
    // The first failure and its error: a stalled lane, then a NaN one later.
    cj[77].du = 0.0;
    cj[77].dv = 0.0;
    sj[120].suu.x = f64::NAN;
    let mut got =
        vec![darboux_frame(&sj[0], &cj[0], Orientation::Forward, &scales, 0.0).unwrap(); n];
    let e = darboux_frames(&sj, &cj, &ts, Orientation::Forward, &scales, &mut got).unwrap_err();
    let want = darboux_frame(&sj[77], &cj[77], Orientation::Forward, &scales, ts[77]).unwrap_err();
    assert_eq!((e.index, e.error.to_string()), (77, want.to_string()));
    cj[77].du = 0.3;
    let e = darboux_frames(&sj, &cj, &ts, Orientation::Forward, &scales, &mut got).unwrap_err();
    assert_eq!(e.index, 120);
    assert!(e.to_string().contains("Suu"), "{e}");
    let bad = ParamScales {
        u_extent: 0.0,
        ..scales
    };
    let e = darboux_frames(&sj, &cj, &ts, Orientation::Forward, &bad, &mut got).unwrap_err();
    assert_eq!(e.index, 0);
    assert!(e.to_string().contains("u_extent"), "{e}");
    assert!(darboux_frames(&sj[1..], &cj, &ts, Orientation::Forward, &scales, &mut got).is_err());
}
