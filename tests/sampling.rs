//! Sampling along a curve on a surface: arc lengths against closed forms, evenly spaced
//! samples, and chord-tolerance sampling checked by dense evaluation.

use std::f64::consts::{PI, TAU};
use strake::analytic::{cylinder, plane, sphere, torus};
use strake::paths::sampling::{
    ChordalOptions, DEFAULT_ARC_TOLERANCE, SampleSink, SinkFn, arc_length, chord_length_for,
    sample_chordal, sample_even_arc, sample_even_t,
};
use strake::{
    CurveJet, CurveOnSurface, FnCurve, Hints, Interval, PathSample, StrakeError, SurfaceSource,
    UvCurve, space_curvature, uv_line,
};

/// θ(t) = a (t + 0.3 sin(πt)/π) on [0, 1]: a monotone, non-uniform reparametrisation, so that
/// the quadrature sees a varying speed (arc length does not depend on the parametrisation).
fn warp(a: f64) -> impl Fn(f64) -> (f64, f64, f64) {
    move |t: f64| {
        let (s, c) = (PI * t).sin_cos();
        (
            a * (t + 0.3 * s / PI),
            a * (1.0 + 0.3 * c),
            -a * 0.3 * PI * s,
        )
    }
}

/// The helix u = θ, v = v0 + hθ on a cylinder of radius R, θ = warp(a)(t).
fn helix(a: f64, v0: f64, h: f64) -> impl UvCurve {
    let w = warp(a);
    FnCurve::new(Interval::new("t", 0.0, 1.0).unwrap(), move |t| {
        let (th, d1, d2) = w(t);
        Ok(CurveJet {
            u: th,
            v: v0 + h * th,
            du: d1,
            dv: h * d1,
            ddu: d2,
            ddv: h * d2,
        })
    })
}

// Helix on the cylinder of radius R with pitch h per radian: c(θ) = (R cos θ, R sin θ, hθ),
// |c'| = √(R² + h²), so the length over θ ∈ [0, a] is a √(R² + h²) (elementary; do Carmo §1-5).
#[test]
fn helix_length_matches_the_closed_form_at_each_tolerance() {
    let (rr, h, a) = (2.0, 0.35, 5.5);
    let c = cylinder(rr, -1.0, 3.0);
    let curve = helix(a, -0.5, h);
    let path = CurveOnSurface::new(&c, &curve);
    let exact = a * (rr * rr + h * h).sqrt();
    for tol in [1e-4, 1e-8, 1e-12] {
        let l = arc_length(&path, 0.0, 1.0, tol).unwrap();
        assert!(
            (l - exact).abs() <= tol * exact,
            "tol {tol:e}: {l} vs {exact}"
        );
        // Reversed limits give the negative length.
        let back = arc_length(&path, 1.0, 0.0, tol).unwrap();
        assert!((back + l).abs() <= 1e-15 * exact);
    }
}

// A circle of latitude at colatitude φ on the sphere of radius R has radius R sin φ, so an arc
// of Δu radians has length R sin φ Δu (elementary).
#[test]
fn latitude_length_matches_the_closed_form() {
    let (rr, phi, du) = (1.7, 1.1, 4.0);
    let s = sphere(rr);
    let w = warp(du);
    let curve = FnCurve::new(Interval::new("t", 0.0, 1.0).unwrap(), move |t| {
        let (th, d1, d2) = w(t);
        Ok(CurveJet {
            u: 0.5 + th,
            v: phi,
            du: d1,
            dv: 0.0,
            ddu: d2,
            ddv: 0.0,
        })
    });
    let path = CurveOnSurface::new(&s, &curve);
    let exact = rr * phi.sin() * du;
    for tol in [1e-6, 1e-10, 1e-13] {
        let l = arc_length(&path, 0.0, 1.0, tol).unwrap();
        assert!(
            (l - exact).abs() <= tol * exact,
            "tol {tol:e}: {l} vs {exact}"
        );
    }
}

// Even in t: samples at t_i = i/(n − 1), each with the cumulative length s(t_i) =
// √(R² + h²) θ(t_i) (closed form as above). Even in arc length: sample i at s = i L/(n − 1),
// so θ(t_i) = i a/(n − 1).
#[test]
fn even_samples_in_t_and_in_arc_length() {
    let (rr, h, a) = (2.0, 0.35, 5.5);
    let c = cylinder(rr, -1.0, 3.0);
    let curve = helix(a, -0.5, h);
    let path = CurveOnSurface::new(&c, &curve);
    let speed = (rr * rr + h * h).sqrt();
    let n = 37;
    let tol = 1e-11;
    let mut out = Vec::new();
    assert_eq!(sample_even_t(&path, n, tol, &mut out).unwrap(), n);
    let w = warp(a);
    for (i, s) in out.iter().enumerate() {
        let t = i as f64 / (n - 1) as f64;
        assert!((s.t - t).abs() < 1e-15);
        let exact = speed * w(t).0;
        assert!((s.arc_length - exact).abs() <= 2.0 * tol * speed * a, "{i}");
        // (u, v) of the frame are those of the curve.
        let j = curve.checked_jet(s.t, &mut Default::default()).unwrap();
        assert_eq!((s.frame.u, s.frame.v), (j.u, j.v));
    }
    let mut out = Vec::new();
    assert_eq!(sample_even_arc(&path, n, tol, &mut out).unwrap(), n);
    assert_eq!(out.len(), n);
    for (i, s) in out.iter().enumerate() {
        let target = i as f64 / (n - 1) as f64;
        assert!(
            (w(s.t).0 / a - target).abs() <= 4.0 * tol,
            "{i}: θ {}",
            w(s.t).0
        );
        assert!((s.arc_length - target * speed * a).abs() <= 4.0 * tol * speed * a);
    }
    assert_eq!(out[n - 1].t, 1.0);
    // n = 1 is the start alone.
    let mut one = Vec::new();
    assert_eq!(sample_even_arc(&path, 1, tol, &mut one).unwrap(), 1);
    assert_eq!(one[0].t, 0.0);
}

/// Largest distance from the curve to the chord of each step, by dense evaluation (`dense`
/// points per step), and the largest arc length of a step.
fn check_chords<S: SurfaceSource, C: UvCurve>(
    path: &CurveOnSurface<'_, S, C>,
    samples: &[PathSample],
    dense: usize,
) -> (f64, f64) {
    let mut h = Hints::default();
    let (mut worst, mut longest) = (0.0_f64, 0.0_f64);
    for w in samples.windows(2) {
        let (a, b) = (w[0].frame.point, w[1].frame.point);
        let ab = b - a;
        for k in 1..dense {
            let t = w[0].t + (w[1].t - w[0].t) * k as f64 / dense as f64;
            let x = path.frame(t, &mut h).unwrap().point;
            let s = ((x - a).dot(&ab) / ab.norm_squared()).clamp(0.0, 1.0);
            worst = worst.max((x - a - ab * s).norm());
        }
        longest = longest.max(w[1].arc_length - w[0].arc_length);
    }
    (worst, longest)
}

/// The ideal number of steps ∫ ds / L(s), L = min(chord_length_for(κ(s), δ), max step), by the
/// composite midpoint rule on `m` pieces of t (common practice).
fn ideal_steps<S: SurfaceSource, C: UvCurve>(
    path: &CurveOnSurface<'_, S, C>,
    delta: f64,
    max_step: f64,
    m: usize,
) -> f64 {
    let mut h = Hints::default();
    let dom = path.curve().domain();
    let dt = dom.width() / m as f64;
    (0..m)
        .map(|i| {
            let t = dom.lo + (i as f64 + 0.5) * dt;
            let f = path.frame(t, &mut h).unwrap();
            f.speed * dt / chord_length_for(space_curvature(&f), delta).min(max_step)
        })
        .sum()
}

// Chord tolerance: every chord lies within δ of the curve when checked densely (the chord
// error rule of shared/REFERENCES.md is what is promised), and the count of steps stays within
// 1.2 times the ideal count ∫ ds / L(s) (plus the one partial step at the end).
#[test]
fn chordal_sampling_meets_its_tolerance_with_few_samples() {
    let t = torus(3.0, 1.0);
    // A slanted line in the parameter plane: a curve whose curvature varies along it.
    let curve = uv_line(0.2, 0.3, 5.5, 5.0).unwrap();
    let path = CurveOnSurface::new(&t, &curve);
    // The last case has both limits active: the maximum step on the flatter stretches.
    for (delta, max_step) in [
        (1e-2, f64::INFINITY),
        (1e-3, f64::INFINITY),
        (1e-4, f64::INFINITY),
        (1e-5, f64::INFINITY),
        (1e-4, 0.03),
    ] {
        let opts = ChordalOptions::new(delta, max_step);
        let mut out = Vec::new();
        let n = sample_chordal(&path, &opts, &mut out).unwrap();
        assert_eq!(n, out.len());
        let (worst, longest) = check_chords(&path, &out, 64);
        let ideal = ideal_steps(&path, delta, max_step, 20_000);
        let steps = (n - 1) as f64;
        eprintln!(
            "torus δ = {delta:e}, max step {max_step}: {n} samples, ideal steps {ideal:.1}, \
             ratio {:.3}, worst deviation/δ {:.4}",
            steps / ideal,
            worst / delta
        );
        assert!(longest <= max_step * (1.0 + 1e-9), "longest step {longest}");
        assert!(
            worst <= delta * (1.0 + 1e-9),
            "δ {delta:e}: worst {worst:e}"
        );
        assert!(
            steps <= 1.2 * ideal + 1.0,
            "δ {delta:e}: {steps} vs ideal {ideal}"
        );
        assert_eq!(out[0].t, 0.0);
        assert_eq!(out[n - 1].t, 1.0);
        for w in out.windows(2) {
            assert!(w[1].t > w[0].t && w[1].arc_length > w[0].arc_length);
        }
    }
}

// The maximum step governs on a straight line in a plane (κ = 0): steps of at most the
// maximum, ⌈L / max step⌉ of them (elementary).
#[test]
fn maximum_step_on_a_straight_line() {
    let p = plane((0.0, 10.0), (0.0, 10.0));
    let curve = uv_line(1.0, 1.0, 7.0, 9.0).unwrap(); // length 10
    let path = CurveOnSurface::new(&p, &curve);
    let opts = ChordalOptions::new(1e-3, 0.75);
    let mut out = Vec::new();
    let n = sample_chordal(&path, &opts, &mut out).unwrap();
    let (_, longest) = check_chords(&path, &out, 4);
    assert!(longest <= 0.75 * (1.0 + 1e-12), "{longest}");
    assert_eq!(n - 1, (10.0_f64 / 0.75).ceil() as usize, "{n}");
    assert!((out[n - 1].arc_length - 10.0).abs() < 1e-12);
}

// A circle of latitude on the sphere (a curve of constant space curvature 1/(R sin φ)):
// the ideal spacing is uniform, and the count must be within 1.2× of it; on the cylinder a
// helix, likewise (curvature cos²α / R, do Carmo §1-5 / shared/REFERENCES.md).
#[test]
fn chordal_sampling_of_constant_curvature_curves() {
    let s = sphere(2.0);
    let lat = uv_line(0.0, 1.0, TAU, 1.0).unwrap();
    let path = CurveOnSurface::new(&s, &lat);
    let delta = 1e-4;
    let mut out = Vec::new();
    let n = sample_chordal(&path, &ChordalOptions::new(delta, f64::INFINITY), &mut out).unwrap();
    let rho = 2.0 * 1.0_f64.sin();
    let ideal = TAU * rho / chord_length_for(1.0 / rho, delta);
    let (worst, _) = check_chords(&path, &out, 32);
    eprintln!(
        "latitude: {n} samples, ideal {ideal:.1}, worst/δ {:.4}",
        worst / delta
    );
    assert!(worst <= delta * (1.0 + 1e-9));
    assert!(((n - 1) as f64) <= 1.2 * ideal + 1.0);
}

// The caller-buffer protocol: a slice too short receives its first samples and learns the
// count needed; a slice of that size then receives exactly what a Vec receives.
#[test]
fn caller_buffer_reports_the_count_needed() {
    let t = torus(3.0, 1.0);
    let curve = uv_line(0.2, 0.3, 5.5, 5.0).unwrap();
    let path = CurveOnSurface::new(&t, &curve);
    let opts = ChordalOptions::new(1e-3, 0.5);
    let mut v = Vec::new();
    let need = sample_chordal(&path, &opts, &mut v).unwrap();
    let mut small = vec![v[0]; 5];
    assert_eq!(sample_chordal(&path, &opts, &mut small[..]).unwrap(), need);
    assert_eq!(&small[..], &v[..5]);
    let mut exact = vec![v[0]; need];
    assert_eq!(sample_chordal(&path, &opts, &mut exact[..]).unwrap(), need);
    assert_eq!(exact, v);
    // The even modes do no work when the slice is too short, and say how many are needed.
    let mut short = vec![v[0]; 3];
    assert_eq!(
        sample_even_arc(&path, 10, 1e-10, &mut short[..]).unwrap(),
        10
    );
    assert_eq!(short, vec![v[0]; 3]);
    // A closure sink sees the indices in order.
    let mut seen = Vec::new();
    let mut sink = SinkFn(|i: usize, s: &PathSample| seen.push((i, s.t)));
    assert_eq!(sample_even_t(&path, 4, 1e-10, &mut sink).unwrap(), 4);
    assert!(sink.capacity().is_none());
    assert_eq!(
        seen.iter().map(|x| x.0).collect::<Vec<_>>(),
        vec![0, 1, 2, 3]
    );
}

// Every refusal names what is wrong, and, for a sample, its index and t.
#[test]
fn refusals() {
    let t = torus(3.0, 1.0);
    let curve = uv_line(0.2, 0.3, 5.5, 5.0).unwrap();
    let path = CurveOnSurface::new(&t, &curve);
    let mut out = Vec::new();
    let e = sample_even_t(&path, 0, 1e-10, &mut out).unwrap_err();
    assert!(e.to_string().contains("sample count of 0"), "{e}");
    let e = sample_even_arc(&path, 5, 0.0, &mut out).unwrap_err();
    assert!(e.to_string().contains("arc length tolerance = 0"), "{e}");
    let e = sample_chordal(&path, &ChordalOptions::new(0.0, 1.0), &mut out).unwrap_err();
    assert!(e.to_string().contains("chord tolerance = 0"), "{e}");
    let e = sample_chordal(&path, &ChordalOptions::new(1e-3, -1.0), &mut out).unwrap_err();
    assert!(e.to_string().contains("max step = -1"), "{e}");
    let mut capped = ChordalOptions::new(1e-6, f64::INFINITY);
    capped.max_samples = 10;
    let e = sample_chordal(&path, &capped, &mut out).unwrap_err();
    assert_eq!(e.index, 10, "{e}");
    assert!(e.to_string().contains("more than max samples = 10"), "{e}");
    // A tolerance below round-off of the coordinates cannot be met: refused at once, naming
    // the option (tests/regression_unbounded_work.rs).
    let e =
        sample_chordal(&path, &ChordalOptions::new(1e-19, f64::INFINITY), &mut out).unwrap_err();
    assert!(e.to_string().contains("chord tolerance = 1e-19"), "{e}");
    assert!(e.to_string().contains("cannot be met"), "{e}");
    assert_eq!(e.index, 0);
    // A curve that leaves the surface's domain: the first sample outside is named.
    let p = plane((0.0, 1.0), (0.0, 1.0));
    let off = uv_line(0.5, 0.5, 1.5, 0.5).unwrap();
    let path = CurveOnSurface::new(&p, &off);
    let mut out = Vec::new();
    let e = sample_even_t(&path, 11, 1e-10, &mut out).unwrap_err();
    assert_eq!(e.index, 6, "{e}");
    assert!(
        matches!(e.error, StrakeError::OutOfDomain { name: "u", .. }),
        "{e}"
    );
    assert_eq!(out.len(), 6);
    let _ = DEFAULT_ARC_TOLERANCE;
}
