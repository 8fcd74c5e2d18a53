//! First passes projected along a direction: closed forms on a plane, a cylinder and a sphere,
//! and a NURBS surface against a brute-force ray march.
//!
//! Sources of the expected values: elementary analytic geometry of a line meeting a plane, a
//! circular cylinder and a sphere (the ray P + λ d substituted in the surface's implicit
//! equation, a quadratic in λ whose smaller root is the first hit; the plane through a line and
//! a direction cuts a cylinder in an ellipse and a sphere in a circle: conic sections). The
//! NURBS check marches each ray in small steps and bisects the first sign change of its height
//! above the surface, independent of the Newton solver and its starts.

#[path = "support/lcg.rs"]
mod lcg;

use lcg::Lcg;
use strake::analytic::{cylinder, plane, sphere};
use strake::curve::UvCurve;
use strake::nurbs::SpanHint;
use strake::{
    ArchimedeanSpiral, DerivOrder, DriveOptions, DrivePlane, DriveProjection, NurbsSurface,
    NurbsSurfaceData, PatternIntervalKind, StrakeError, SurfaceHint, SurfaceSource, Vec3,
    parallel_lines, project_along, uv_line,
};

fn at<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(s: &S, c: &C, t: f64) -> Vec3 {
    let j = c.checked_jet(t, &mut SpanHint::default()).unwrap();
    s.checked_jet(j.u, j.v, DerivOrder::Position, &mut SurfaceHint::default())
        .unwrap()
        .p
}

/// Largest distance from points of the fitted pieces (dense in t) to `exact` (a function that
/// returns how far a point is from the exact curve).
fn worst_on_pieces<S: SurfaceSource>(s: &S, r: &DriveProjection, off: impl Fn(Vec3) -> f64) -> f64 {
    let mut worst = 0.0_f64;
    for p in &r.pieces {
        for k in 0..=400 {
            worst = worst.max(off(at(s, &p.curve, k as f64 / 400.0)));
        }
    }
    worst
}

// Plane z = 0, a spiral in a tilted plane projected along an oblique direction: each hit is
// P + λ d with λ = −P_z / d_z (a line meets a plane once).
#[test]
fn spiral_on_a_plane_lands_where_the_line_meets_the_plane() {
    let s = plane((-10.0, 10.0), (-10.0, 10.0));
    let dp = DrivePlane::new([0.5, -0.3, 6.0], [1.0, 0.0, 0.2], [0.0, 1.0, -0.1]).unwrap();
    let d = [0.2, -0.1, -1.0];
    let spiral = ArchimedeanSpiral::new([0.0, 0.0], 0.0, 4.0, 1.0).unwrap();
    let opts = DriveOptions::new(1e-9, 1e-6);
    let r = project_along(&s, &dp, d, &spiral, &opts).unwrap();
    assert_eq!(r.pieces.len(), 1);
    assert!(r.intervals.is_empty(), "{:?}", r.intervals);
    let dv = Vec3::new(d[0], d[1], d[2]).normalize();
    let p = &r.pieces[0];
    for (k, h) in p.hits.iter().enumerate() {
        let j = spiral
            .checked_jet(p.pattern_params[k], &mut SpanHint::default())
            .unwrap();
        let q = dp.point(j.u, j.v);
        let exact = q + dv * (-q.z / dv.z);
        assert!(
            (h.point - exact).norm() < 1e-12,
            "{k}: {:?} {exact:?}",
            h.point
        );
        assert!((h.ray_parameter - (-q.z / dv.z)).abs() < 1e-12);
        assert_eq!(h.hit_count, 1);
    }
    // The fitted curve stays on the projected spiral: the point of the spiral whose ray passes
    // through it, found by inverting the parallel projection (linear), lies on the pattern.
    let worst = worst_on_pieces(&s, &r, |x| x.z.abs());
    assert!(worst < 1e-12, "{worst}");
}

// A line in the plane x = 3r crossing a cylinder of radius r about z, projected along a
// direction tilted by a out of −x: the hits satisfy x = √(r² − y²) (first root), lie in the
// plane through the line along d (an ellipse), and the rays miss exactly where |y| > r.
#[test]
fn line_across_a_cylinder_is_an_ellipse_with_misses_at_the_silhouette() {
    let r0 = 2.0;
    let s = cylinder(r0, -20.0, 20.0);
    let dp = DrivePlane::new([3.0 * r0, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]).unwrap();
    let a: f64 = 0.3;
    let d = [-a.cos(), 0.0, -a.sin()];
    let z0 = 1.0;
    let line = uv_line(-1.5 * r0, z0, 1.5 * r0, z0).unwrap();
    let mut opts = DriveOptions::new(1e-9, 1e-7);
    opts.projection = opts.projection.periodic(true, false);
    let r = project_along(&s, &dp, d, &line, &opts).unwrap();
    assert_eq!(r.pieces.len(), 1, "{:?}", r.intervals);
    let misses: Vec<_> = r
        .intervals
        .iter()
        .filter(|i| i.kind == PatternIntervalKind::Miss)
        .collect();
    assert_eq!(misses.len(), 2, "{:?}", r.intervals);
    // y = −1.5 r + 3 r t: |y| = r at t = 1/6 and 5/6.
    assert_eq!(misses[0].start, 0.0);
    assert!((misses[0].end - 1.0 / 6.0).abs() < 1e-6, "{:?}", misses[0]);
    assert!(
        (misses[1].start - 5.0 / 6.0).abs() < 1e-6,
        "{:?}",
        misses[1]
    );
    assert_eq!(misses[1].end, 1.0);
    let several: Vec<_> = r
        .intervals
        .iter()
        .filter(|i| i.kind == PatternIntervalKind::SeveralHits)
        .collect();
    assert_eq!(several.len(), 1, "{:?}", r.intervals);
    assert_eq!(r.intervals.len(), 3, "{:?}", r.intervals);
    let p = &r.pieces[0];
    for (k, h) in p.hits.iter().enumerate() {
        let y = -1.5 * r0 + 3.0 * r0 * p.pattern_params[k];
        let x = (r0 * r0 - y * y).max(0.0).sqrt();
        let lam = (3.0 * r0 - x) / a.cos();
        let exact = Vec3::new(x, y, z0 - lam * a.sin());
        assert!(
            (h.point - exact).norm() < 1e-7,
            "{k}: {:?} {exact:?}",
            h.point
        );
        assert_eq!(
            h.hit_count, 2,
            "every ray through a whole cylinder hits it twice"
        );
    }
    // The curve crosses the seam u = 0 (x > 0): its continued u runs from −π/2 to π/2.
    let us: Vec<f64> = p.hits.iter().map(|h| h.u_path).collect();
    assert!(us.windows(2).all(|w| (w[1] - w[0]).abs() < 0.5), "{us:?}");
    // Dense points of the fitted curve: on the plane through the line along d (normal
    // (d_z, 0, −d_x)), within the fit tolerance.
    let n = Vec3::new(d[2], 0.0, -d[0]).normalize();
    let origin = Vec3::new(3.0 * r0, 0.0, z0);
    let worst = worst_on_pieces(&s, &r, |x| (x - origin).dot(&n).abs());
    assert!(worst < 1e-6, "off the cutting plane by {worst}");
}

// A line in the plane x = 2R at height z0 projected along −x onto a sphere of radius R: the
// first hits are the front half of the circle y² + z0² = R² − x² (x > 0), a circle of radius
// √(R² − z0²); every ray that hits meets the sphere twice (reported, the first taken).
#[test]
fn line_onto_a_sphere_is_a_circle_and_the_front_hit_is_taken() {
    let big_r = 3.0;
    let s = sphere(big_r);
    let dp = DrivePlane::new([2.0 * big_r, 0.0, 0.0], [0.0, 1.0, 0.0], [0.0, 0.0, 1.0]).unwrap();
    let z0 = 0.3 * big_r;
    let line = uv_line(-1.5 * big_r, z0, 1.5 * big_r, z0).unwrap();
    let mut opts = DriveOptions::new(1e-9, 1e-7);
    opts.projection = opts.projection.periodic(true, false);
    let r = project_along(&s, &dp, [-1.0, 0.0, 0.0], &line, &opts).unwrap();
    assert_eq!(r.pieces.len(), 1, "{:?}", r.intervals);
    let rho = (big_r * big_r - z0 * z0).sqrt();
    let t_in = (1.5 * big_r - rho) / (3.0 * big_r);
    let kinds: Vec<_> = r.intervals.iter().map(|i| i.kind).collect();
    assert_eq!(
        kinds,
        [
            PatternIntervalKind::Miss,
            PatternIntervalKind::SeveralHits,
            PatternIntervalKind::Miss
        ]
    );
    assert!(
        (r.intervals[0].end - t_in).abs() < 1e-6,
        "{:?}",
        r.intervals
    );
    assert!((r.intervals[2].start - (1.0 - t_in)).abs() < 1e-6);
    for (k, h) in r.pieces[0].hits.iter().enumerate() {
        let y = -1.5 * big_r + 3.0 * big_r * r.pieces[0].pattern_params[k];
        let x = (rho * rho - y * y).max(0.0).sqrt();
        assert!(
            (h.point - Vec3::new(x, y, z0)).norm() < 1e-7,
            "{k}: {:?}",
            h.point
        );
    }
    let worst = worst_on_pieces(&s, &r, |p| {
        ((p.z - z0).abs()).max((p.x * p.x + p.y * p.y).sqrt() - rho)
    });
    assert!(worst < 1e-6, "{worst}");
}

/// A bicubic height field z = f(u, v) over [0, 1]² whose x and y are exactly u and v (control
/// points at the Greville abscissae: linear precision, The NURBS Book §2.4 / §9 [memory]).
fn wavy_surface(seed: u64, amplitude: f64) -> NurbsSurface {
    let n = 8;
    let p = 3;
    let mut knots = vec![0.0; p + 1];
    for i in 1..n - p {
        knots.push(i as f64 / (n - p) as f64);
    }
    knots.extend([1.0; 4]);
    let greville: Vec<f64> = (0..n)
        .map(|i| (knots[i + 1] + knots[i + 2] + knots[i + 3]) / 3.0)
        .collect();
    let mut g = Lcg(seed);
    let mut pts = Vec::new();
    for &x in &greville {
        for &y in &greville {
            pts.push([x, y, amplitude * (g.next() - 0.5)]);
        }
    }
    NurbsSurface::new(&NurbsSurfaceData {
        degree_u: p,
        degree_v: p,
        count_u: n,
        count_v: n,
        knots_u: &knots,
        knots_v: &knots,
        points: &pts,
        weights: None,
    })
    .unwrap()
}

/// The first hit of the ray q + λ d found by marching λ in steps of `h` and bisecting the
/// first sign change of the height above the surface (either way: a ray that enters the patch
/// through its open edge below the sheet meets it from beneath).
fn march(s: &NurbsSurface, q: Vec3, d: Vec3, h: f64) -> Option<Vec3> {
    let height = |l: f64| -> Option<f64> {
        let x = q + d * l;
        if !(0.0..=1.0).contains(&x.x) || !(0.0..=1.0).contains(&x.y) {
            return None;
        }
        let sp = s
            .checked_jet(x.x, x.y, DerivOrder::Position, &mut SurfaceHint::default())
            .unwrap()
            .p;
        Some(x.z - sp.z)
    };
    let mut l = 0.0;
    let mut prev = height(l);
    while l < 5.0 {
        let mut ln = l + h;
        let mut cur = height(ln);
        if prev.is_some() && cur.is_none() {
            // Leaving the patch within this step: end the step on the edge.
            let (mut lo, mut hi) = (l, ln);
            for _ in 0..80 {
                let m = 0.5 * (lo + hi);
                if height(m).is_some() {
                    lo = m;
                } else {
                    hi = m;
                }
            }
            ln = lo;
            cur = height(ln);
        }
        if let (Some(a), Some(b)) = (prev, cur)
            && (a > 0.0) != (b > 0.0)
        {
            let (mut lo, mut hi) = (l, ln);
            for _ in 0..80 {
                let m = 0.5 * (lo + hi);
                if (height(m).unwrap() > 0.0) == (a > 0.0) {
                    lo = m;
                } else {
                    hi = m;
                }
            }
            return Some(q + d * (0.5 * (lo + hi)));
        }
        prev = height(l + h);
        l += h;
    }
    None
}

// A wavy NURBS surface seen along an oblique direction: crests hide the troughs behind them,
// so the first hit jumps (folds) and the pattern line runs off the patch (misses). Every hit,
// and dense points of the pattern, are checked against the brute-force march.
#[test]
fn wavy_nurbs_surface_against_a_brute_force_ray_march() {
    let s = wavy_surface(7, 0.8);
    for k in 0..=8 {
        let u = k as f64 / 8.0;
        let p = s
            .checked_jet(u, 0.37, DerivOrder::Position, &mut SurfaceHint::default())
            .unwrap()
            .p;
        assert!((p.x - u).abs() < 1e-14 && (p.y - 0.37).abs() < 1e-14);
    }
    let dp = DrivePlane::new([0.0, 0.0, 2.0], [1.0, 0.0, 0.0], [0.0, 1.0, 0.0]).unwrap();
    let dv = Vec3::new(1.0, 0.15, -0.9).normalize();
    let line = uv_line(-2.2, 0.45, -1.0, 0.55).unwrap();
    let mut opts = DriveOptions::new(1e-9, 1e-6);
    opts.projection.grid = 24;
    let r = project_along(&s, &dp, [dv.x, dv.y, dv.z], &line, &opts).unwrap();
    let folds = r
        .intervals
        .iter()
        .filter(|i| i.kind == PatternIntervalKind::Fold)
        .count();
    let misses = r
        .intervals
        .iter()
        .filter(|i| i.kind == PatternIntervalKind::Miss)
        .count();
    assert!(folds >= 1, "the test must see a fold: {:?}", r.intervals);
    assert!(misses >= 1, "the test must see a miss: {:?}", r.intervals);
    let pattern_point = |t: f64| {
        let j = line.checked_jet(t, &mut SpanHint::default()).unwrap();
        dp.point(j.u, j.v)
    };
    // Each hit is the first hit of the march.
    let mut grazing = 0;
    for p in &r.pieces {
        for (k, h) in p.hits.iter().enumerate() {
            let Some(b) = march(&s, pattern_point(p.pattern_params[k]), dv, 1e-3) else {
                // Only a grazing hit or one on the patch's edge escapes the march.
                let edge = [h.u, h.v, 1.0 - h.u, 1.0 - h.v]
                    .iter()
                    .any(|x| x.abs() < 1e-9);
                assert!(h.cosine.abs() < 1e-2 || edge, "the march misses {h:?}");
                grazing += 1;
                continue;
            };
            if (b - h.point).norm() >= 1e-9 {
                // A ray that grazes a crest touches it between two march steps (a double root):
                // the march cannot see it. Such a hit must be a true point of the ray, earlier
                // than the marched one, at a grazing angle.
                let q = pattern_point(p.pattern_params[k]);
                let on_ray = (q + dv * h.ray_parameter - h.point).norm();
                let earlier = h.ray_parameter < (b - q).dot(&dv);
                assert!(
                    on_ray < 1e-12 && earlier && h.cosine.abs() < 1e-2,
                    "{:?} vs the march {b:?}: {h:?}",
                    h.point
                );
                grazing += 1;
            }
        }
    }
    assert!(grazing <= 2 * (folds + misses), "{grazing} grazing hits");
    // Dense pattern parameters: inside a piece the marched hit is on the fitted curve (within
    // the fit tolerance); inside a miss (away from its ends) the march finds nothing.
    let mut checked = (0, 0);
    for k in 0..=150 {
        let t = k as f64 / 150.0;
        let marched = march(&s, pattern_point(t), dv, 1e-3);
        if let Some(p) = r
            .pieces
            .iter()
            .find(|p| p.pattern_params[0] <= t && t <= *p.pattern_params.last().unwrap())
        {
            let b = marched.expect("a hit inside a piece");
            // Nearest point of the fitted curve: a scan, then a ternary search around the
            // best scan point.
            let dist = |t: f64| (at(&s, &p.curve, t) - b).norm();
            let n = 200;
            let j = (0..=n)
                .min_by(|&i, &k| dist(i as f64 / n as f64).total_cmp(&dist(k as f64 / n as f64)))
                .unwrap();
            let (mut lo, mut hi) = (
                (j.max(1) - 1) as f64 / n as f64,
                ((j + 1).min(n)) as f64 / n as f64,
            );
            for _ in 0..100 {
                let (m1, m2) = (lo + (hi - lo) / 3.0, hi - (hi - lo) / 3.0);
                if dist(m1) < dist(m2) {
                    hi = m2;
                } else {
                    lo = m1;
                }
            }
            let best = dist(0.5 * (lo + hi));
            assert!(best < 1e-5, "t = {t}: {best}");
            checked.0 += 1;
        } else if let Some(i) = r
            .intervals
            .iter()
            .find(|i| i.kind == PatternIntervalKind::Miss && i.start + 1e-6 < t && t < i.end - 1e-6)
        {
            assert!(marched.is_none(), "t = {t} in {i:?}: {marched:?}");
            checked.1 += 1;
        }
    }
    assert!(checked.0 > 25 && checked.1 > 5, "{checked:?}");
    eprintln!(
        "intervals {:?}, pieces {}, grazing {grazing}, checked {checked:?}",
        r.intervals,
        r.pieces.len()
    );
}

#[test]
fn parallel_lines_cover_the_rectangle() {
    let lines = parallel_lines((0.0, 10.0), (0.0, 4.0), 1.0, 0.0, true).unwrap();
    // Offsets 0, 1, ..., 4 across a height of 4: the first and last run along the edges.
    assert_eq!(lines.len(), 5);
    let mut h = SpanHint::default();
    let j0 = lines[0].checked_jet(0.0, &mut h).unwrap();
    let j1 = lines[1].checked_jet(0.0, &mut h).unwrap();
    assert_eq!((j0.u, j0.v), (0.0, 0.0));
    assert_eq!(
        (j1.u, j1.v),
        (10.0, 1.0),
        "zigzag: the second line runs back"
    );
    let slanted = parallel_lines((0.0, 1.0), (0.0, 1.0), 0.1, 0.7, false).unwrap();
    for l in &slanted {
        for t in [0.0, 1.0] {
            let j = l.checked_jet(t, &mut h).unwrap();
            assert!((-1e-12..=1.0 + 1e-12).contains(&j.u) && (-1e-12..=1.0 + 1e-12).contains(&j.v));
        }
    }
    for (x, spacing, what) in [
        ((0.0, 0.0), 1.0, "empty"),
        ((0.0, 1.0), 0.0, "spacing = 0"),
        ((0.0, 1.0), f64::NAN, "spacing = NaN"),
        ((0.0, 1.0), 1e-9, "more than"),
    ] {
        let e = parallel_lines(x, (0.0, 1.0), spacing, 0.0, false).unwrap_err();
        assert!(e.to_string().contains(what), "{e}");
    }
}

#[test]
fn bad_input_is_refused_naming_the_value() {
    let s = plane((-1.0, 1.0), (-1.0, 1.0));
    let dp = DrivePlane::new([0.0, 0.0, 1.0], [1.0, 0.0, 0.0], [0.0, 1.0, 0.0]).unwrap();
    let line = uv_line(-0.5, 0.0, 0.5, 0.0).unwrap();
    let opts = DriveOptions::new(1e-9, 1e-6);
    let e = project_along(&s, &dp, [0.0, 0.0, 0.0], &line, &opts).unwrap_err();
    assert!(e.error.to_string().contains("zero length"), "{}", e.error);
    let e = project_along(&s, &dp, [0.0, f64::NAN, -1.0], &line, &opts).unwrap_err();
    assert!(matches!(
        e.error,
        StrakeError::NonFinite {
            what: "direction",
            ..
        }
    ));
    let mut bad = opts;
    bad.fit_tolerance = 0.0;
    let e = project_along(&s, &dp, [0.0, 0.0, -1.0], &line, &bad).unwrap_err();
    assert!(
        e.error.to_string().contains("fit_tolerance = 0"),
        "{}",
        e.error
    );
    let e = DrivePlane::new([0.0; 3], [1.0, 0.0, 0.0], [2.0, 0.0, 0.0]).unwrap_err();
    assert!(e.to_string().contains("parallel"), "{e}");
    // A direction in the surface's plane: every ray grazes, none hits.
    let r = project_along(&s, &dp, [1.0, 0.0, 0.0], &line, &opts).unwrap();
    assert!(r.pieces.is_empty());
    assert_eq!(r.intervals.len(), 1);
    assert_eq!(r.intervals[0].kind, PatternIntervalKind::Miss);
    let e = ArchimedeanSpiral::new([0.0, 0.0], 1.0, 0.5, 0.1).unwrap_err();
    assert!(e.to_string().contains("r_end = 0.5"), "{e}");
}
