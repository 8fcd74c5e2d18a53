//! Fibre courses: fixed-angle courses against closed forms, gaps and overlaps between
//! neighbouring courses on a cone against a brute-force edge-distance computation, adjacent
//! courses (geodesic parallels) that leave no gap, and the steering and twist checks.
//!
//! Sources: a helix on a circular cylinder keeps a constant angle to the axis and is a
//! geodesic (do Carmo §4-4, the cylinder unrolled onto a plane); the brute-force reference
//! is computed here from first principles (edge points by perpendicular geodesics of length
//! w/2, nearest points by exhaustive search).

use std::f64::consts::TAU;
use strake::analytic::cylinder;
use strake::checks::fibre::FibreLimits;
use strake::{
    CurveOnSurface, FnSurface, GeodesicEnd, Hints, Interval, OffsetOptions, OffsetSide,
    Orientation, StartDirection, SurfaceJet, SurfaceSource, TraceOptions, UvCurve, Vec3,
    adjacent_course, course_check, course_gaps, fixed_angle_course, natural_course, trace_geodesic,
};

/// Cone S(u, v) = (v sin β cos u, v sin β sin u, v cos β), v ∈ [1, 4], half-angle β.
fn cone(beta: f64) -> impl SurfaceSource {
    let (sb, cb) = beta.sin_cos();
    FnSurface::new(
        Interval { lo: 0.0, hi: TAU },
        Interval { lo: 1.0, hi: 4.0 },
        Orientation::Forward,
        move |u: f64, v: f64, _| {
            let (su, cu) = u.sin_cos();
            Ok(SurfaceJet {
                p: Vec3::new(v * sb * cu, v * sb * su, v * cb),
                su: Vec3::new(-v * sb * su, v * sb * cu, 0.0),
                sv: Vec3::new(sb * cu, sb * su, cb),
                suu: Vec3::new(-v * sb * cu, -v * sb * su, 0.0),
                suv: Vec3::new(-sb * su, sb * cu, 0.0),
                svv: Vec3::zeros(),
            })
        },
    )
}

fn frames<S: SurfaceSource, C: UvCurve>(s: &S, c: &C, n: usize) -> Vec<strake::DarbouxFrame> {
    let p = CurveOnSurface::new(s, c);
    let d = c.domain();
    let mut h = Hints::default();
    (0..n)
        .map(|i| p.frame(d.even(i, n), &mut h).unwrap())
        .collect()
}

#[test]
fn fixed_angle_on_a_cylinder_is_a_helix_and_a_geodesic() {
    let s = cylinder(1.5, -10.0, 10.0);
    let alpha = 0.6;
    let c = fixed_angle_course(
        &s,
        5.0,
        0.0,
        Vec3::z(),
        alpha,
        5.0,
        &TraceOptions::new(1e-10),
    )
    .unwrap();
    assert_eq!(c.end, GeodesicEnd::Length);
    for f in frames(&s, &c.curve, 101) {
        assert!(
            (f.t.z - alpha.cos()).abs() < 1e-9,
            "angle to the axis: t.z = {}",
            f.t.z
        );
        assert!(
            f.geodesic_curvature.abs() < 1e-6,
            "kg {}",
            f.geodesic_curvature
        );
    }
}

#[test]
fn fixed_angle_on_a_cone_keeps_its_angle_and_is_steered() {
    let s = cone(0.4);
    let alpha = 0.8;
    let axis = Vec3::new(0.0, 0.0, 1.0);
    let c = fixed_angle_course(&s, 3.0, 1.2, axis, alpha, 3.0, &TraceOptions::new(1e-10)).unwrap();
    let fs = frames(&s, &c.curve, 101);
    for f in &fs {
        let e = (axis - f.n * axis.dot(&f.n)).normalize();
        assert!((f.t.dot(&e) - alpha.cos()).abs() < 1e-9);
    }
    // Steered: a loxodrome of the cone is no geodesic. The second derivatives of the course
    // are exact at the nodes: compare κg of the frame with a difference quotient of the
    // tangent direction along the course (dT/ds · B).
    let p = CurveOnSurface::new(&s, &c.curve);
    let mut h = Hints::default();
    for t in [0.5, 1.5, 2.5] {
        let f = p.frame(t, &mut h).unwrap();
        let (fa, fb) = (
            p.frame(t - 1e-5, &mut h).unwrap(),
            p.frame(t + 1e-5, &mut h).unwrap(),
        );
        let dt = (fb.t - fa.t) / 2e-5;
        assert!(
            (dt.dot(&f.b) - f.geodesic_curvature).abs() < 1e-6,
            "kg {} vs {}",
            f.geodesic_curvature,
            dt.dot(&f.b)
        );
        assert!(f.geodesic_curvature.abs() > 1e-3);
    }
    let limits = FibreLimits {
        tow_width: 0.01,
        min_steering_radius: 1000.0,
        max_twist_rate: 10.0,
    };
    let chk = course_check(&s, &c.curve, &limits, 50).unwrap();
    assert_eq!(chk.steering_violations, 50, "{chk:?}");
    assert!((chk.length - 3.0).abs() < 1e-8);
}

/// A natural course A on a cone and its copy B turned about the axis by Δu (the way courses
/// are often shifted on a part of revolution, common practice): the circumference grows along
/// the cone, so the bands overlap near the apex and open a gap farther out. Brute force: the
/// left edge of A and the right edge of B (perpendicular geodesics of length w/2, B's edge
/// as a dense polygon), and for each sample of A the nearest point of B's edge polygon.
#[test]
fn gaps_and_overlaps_on_a_cone_match_brute_force() {
    let s = cone(0.5);
    let o = TraceOptions::new(1e-11);
    let w = 0.15;
    let du = -0.12;
    let a = natural_course(&s, 1.0, 1.3, 1.35, 2.2, &o).unwrap();
    assert_eq!(a.end, GeodesicEnd::Length);
    let ac = a.curve.clone();
    let b = strake::FnCurve::new(ac.domain(), move |t| {
        let mut j = ac.checked_jet(t, &mut Default::default())?;
        j.u += du;
        Ok(j)
    });
    let n = 41;
    let gaps = course_gaps(&s, &a.curve, &b, OffsetSide::Left, w, n, 1e-4, &o).unwrap();
    let edge = |c: &dyn UvCurve, side: f64, m: usize| -> Vec<(Vec3, Vec3)> {
        let p = CurveOnSurface::new(&s, c);
        let d = c.domain();
        let mut h = Hints::default();
        (0..m)
            .map(|i| {
                let f = p.frame(d.even(i, m), &mut h).unwrap();
                let g =
                    trace_geodesic(&s, f.u, f.v, StartDirection::Space(f.b * side), w / 2.0, &o)
                        .unwrap();
                (g.end_point, g.end_tangent)
            })
            .collect()
    };
    let a_edge = edge(&a.curve, 1.0, n);
    let b_edge: Vec<Vec3> = edge(&b, -1.0, 2000).into_iter().map(|x| x.0).collect();
    let mut compared = 0;
    let mut worst: f64 = 0.0;
    for (i, (_, width)) in gaps.widths.iter().enumerate() {
        let Some(width) = width else { continue };
        let (p, dir) = a_edge[i];
        // Nearest point of the polygon through B's edge points.
        let mut best = (f64::INFINITY, p, Vec3::zeros());
        for seg in b_edge.windows(2) {
            let d = seg[1] - seg[0];
            let x = ((p - seg[0]).dot(&d) / d.norm_squared()).clamp(0.0, 1.0);
            let q = seg[0] + d * x;
            let dist = (q - p).norm();
            if dist < best.0 {
                best = (dist, q, d.normalize());
            }
        }
        let (dist, near, along) = best;
        if dist > 0.9 * w {
            continue;
        }
        let signed = if (near - p).dot(&dir) >= 0.0 {
            dist
        } else {
            -dist
        };
        // course_gaps measures across A (along `dir`); the nearest distance is across B's
        // edge, shorter by the cosine of the angle φ between the edges: cos φ = |B's edge
        // direction × dir| (both unit, in the tangent plane to first order).
        let cos_phi = along.cross(&dir).norm();
        worst = worst.max((signed - width * cos_phi).abs());
        compared += 1;
    }
    println!(
        "cone gaps: {:?}; {compared} samples compared, worst difference {worst:e}",
        gaps.intervals
    );
    assert!(compared > 30, "{compared}");
    // The cos φ conversion treats the edges as straight across the width (up to 0.08 here):
    // its error is of the order width² times the edges' curvature, a few 1e-5.
    assert!(
        worst < 5e-5,
        "course_gaps differs from brute force by {worst:e}"
    );
    assert!(
        gaps.intervals.iter().any(|g| g.overlap) && gaps.intervals.iter().any(|g| !g.overlap),
        "both an overlap and a gap expected: {:?}",
        gaps.intervals
    );
}

/// The adjacent course (geodesic parallel at one band width) leaves no gap and no overlap.
#[test]
fn adjacent_course_leaves_no_gap() {
    let s = cone(0.5);
    let o = TraceOptions::new(1e-11);
    let w = 0.15;
    let a = natural_course(&s, 1.0, 1.3, 1.2, 2.5, &o).unwrap();
    let adj =
        adjacent_course(&s, &a.curve, w, OffsetSide::Left, &OffsetOptions::new(1e-7)).unwrap();
    assert_eq!(adj.pieces.len(), 1);
    let gaps = course_gaps(
        &s,
        &a.curve,
        &adj.pieces[0].curve,
        OffsetSide::Left,
        w,
        31,
        1e-5,
        &o,
    )
    .unwrap();
    assert!(gaps.intervals.is_empty(), "{:?}", gaps.intervals);
    let worst = gaps
        .widths
        .iter()
        .filter_map(|x| x.1)
        .fold(0.0f64, |m, x| m.max(x.abs()));
    assert!(worst < 1e-6, "{worst:e}");
    // The natural course is not steered; on a cone (developable, K = 0) the parallel of a
    // geodesic is a geodesic too (straight lines of the development), up to the error of the
    // parallel's cubic fit.
    let limits = FibreLimits {
        tow_width: w,
        min_steering_radius: 5.0,
        max_twist_rate: 10.0,
    };
    let ca = course_check(&s, &a.curve, &limits, 40).unwrap();
    assert!(
        ca.max_steering_curvature < 1e-5 && ca.steering_violations == 0,
        "{ca:?}"
    );
    let cb = course_check(&s, &adj.pieces[0].curve, &limits, 40).unwrap();
    assert!(
        cb.max_steering_curvature < 1e-3 && cb.steering_violations == 0,
        "{cb:?}"
    );
}

#[test]
fn course_refusals_name_the_value() {
    let s = cone(0.5);
    let o = TraceOptions::new(1e-9);
    let e = fixed_angle_course(&s, 1.0, 2.0, Vec3::zeros(), 0.3, 1.0, &o).unwrap_err();
    assert!(e.to_string().contains("(0, 0, 0)"), "{e}");
    let a = natural_course(&s, 1.0, 1.3, 1.2, 1.0, &o).unwrap();
    let e = course_gaps(&s, &a.curve, &a.curve, OffsetSide::Left, 0.0, 10, 1e-4, &o).unwrap_err();
    assert!(e.to_string().contains("band_width = 0"), "{e}");
    let e = adjacent_course(
        &s,
        &a.curve,
        -1.0,
        OffsetSide::Left,
        &OffsetOptions::new(1e-6),
    )
    .unwrap_err();
    assert!(e.to_string().contains("-1"), "{e}");
}

/// Overlaps deeper than half the band: B is A turned about the cone's axis by so little that
/// B's edge facing A lies beyond A's centreline near the apex (and short of it farther out). Brute force in the cone's
/// development (the cone is developable: (u, v) ↦ polar (r, φ) = (v, u sin β) is an isometry
/// onto a plane sector, do Carmo §4-2, so the geodesic distance between nearby points is the
/// plane distance there and the geodesics A and B are straight lines): both band edges
/// sampled densely (A's at w/2 to its left, B's facing edge at w/2 to its right, B = N × T
/// being T turned clockwise in the development), the nearest point of B's edge polygon to
/// each of A's edge points, signed by the side of A's edge it lies on, and turned into the
/// width across A by the cosine of the angle between the two straight edges (exact for
/// straight lines).
#[test]
fn deep_overlaps_on_a_cone_match_the_development() {
    let beta: f64 = 0.5;
    let sb = beta.sin();
    let s = cone(beta);
    let o = TraceOptions::new(1e-11);
    let w = 0.15;
    let du = -0.06;
    let a = natural_course(&s, 1.0, 1.3, 1.35, 2.2, &o).unwrap();
    assert_eq!(a.end, GeodesicEnd::Length);
    let ac = a.curve.clone();
    let b = strake::FnCurve::new(ac.domain(), move |t| {
        let mut j = ac.checked_jet(t, &mut Default::default())?;
        j.u += du;
        Ok(j)
    });
    let n = 41;
    let gaps = course_gaps(&s, &a.curve, &b, OffsetSide::Left, w, n, 1e-5, &o).unwrap();
    // The development: point and unit tangent of a curve point.
    let develop = |j: &strake::CurveJet| {
        let (sf, cf) = (j.u * sb).sin_cos();
        let p = [j.v * cf, j.v * sf];
        let d = [
            j.dv * cf - j.v * sf * sb * j.du,
            j.dv * sf + j.v * cf * sb * j.du,
        ];
        let l = d[0].hypot(d[1]);
        (p, [d[0] / l, d[1] / l])
    };
    let left = |t: [f64; 2]| [t[1], -t[0]];
    let m = 20000;
    let bd = b.domain();
    let b_edge: Vec<[f64; 2]> = (0..m)
        .map(|i| {
            let j = b
                .checked_jet(bd.even(i, m), &mut Default::default())
                .unwrap();
            let (p, t) = develop(&j);
            let nb = left(t);
            [p[0] - 0.5 * w * nb[0], p[1] - 0.5 * w * nb[1]]
        })
        .collect();
    let mut worst: f64 = 0.0;
    let mut deepest: f64 = 0.0;
    let mut shallowest = f64::NEG_INFINITY;
    for &(t, width) in &gaps.widths {
        // B ends on the perpendicular of its own end, which A's last perpendicular misses
        // by the turn between them: that sample alone meets no edge.
        let Some(width) = width else {
            assert_eq!(t, a.curve.domain().hi, "unmatched at t = {t}");
            continue;
        };
        let j = a.curve.checked_jet(t, &mut Default::default()).unwrap();
        let (p, ta) = develop(&j);
        let na = left(ta);
        let e = [p[0] + 0.5 * w * na[0], p[1] + 0.5 * w * na[1]];
        let mut best = (f64::INFINITY, [0.0; 2], [0.0; 2]);
        for seg in b_edge.windows(2) {
            let d = [seg[1][0] - seg[0][0], seg[1][1] - seg[0][1]];
            let dd = d[0] * d[0] + d[1] * d[1];
            let x = (((e[0] - seg[0][0]) * d[0] + (e[1] - seg[0][1]) * d[1]) / dd).clamp(0.0, 1.0);
            let q = [seg[0][0] + d[0] * x, seg[0][1] + d[1] * x];
            let dist = (q[0] - e[0]).hypot(q[1] - e[1]);
            if dist < best.0 {
                best = (dist, q, [d[0] / dd.sqrt(), d[1] / dd.sqrt()]);
            }
        }
        let (dist, q, along) = best;
        let side = (q[0] - e[0]) * na[0] + (q[1] - e[1]) * na[1];
        let signed = if side >= 0.0 { dist } else { -dist };
        // |B's edge direction × A's normal| = cos of the angle between the edges.
        let cos_phi = (along[0] * na[1] - along[1] * na[0]).abs();
        worst = worst.max((signed / cos_phi - width).abs());
        deepest = deepest.min(width);
        shallowest = shallowest.max(width);
    }
    println!(
        "cone deep overlaps: widths {deepest}..{shallowest} (w/2 = {}), intervals {:?}, worst difference \
         {worst:e}",
        0.5 * w,
        gaps.intervals
    );
    assert!(gaps.unmatched <= 1, "{} unmatched", gaps.unmatched);
    // Both ways are exercised: overlaps deeper than w/2 near the apex (met the other way),
    // shallower ones farther out (met toward B).
    assert!(deepest < -0.5 * w, "no overlap deeper than w/2: {deepest}");
    assert!(
        shallowest > -0.5 * w,
        "no overlap shallower than w/2: {shallowest}"
    );
    // B's edge is fitted to a chord tolerance of 1e-2 × the gaps' tolerance, 1e-7.
    assert!(
        worst < 3e-7,
        "course_gaps differs from the development by {worst:e}"
    );
}
