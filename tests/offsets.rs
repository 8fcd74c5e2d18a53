//! Geodesic parallels (offsets) of paths on surfaces against exact constructions.
//!
//! Sources: on a sphere of radius R the geodesics perpendicular to the equator are meridians,
//! so the parallel of the equator at geodesic distance d is the latitude circle at angle d/R
//! (REFERENCES.md, geodesics; do Carmo §4-4: meridians are geodesics). On a plane geodesics
//! are straight lines, so the parallel of a curve is its planar offset (exact geometry), and
//! a cylinder unrolls isometrically onto a plane (do Carmo §4-2), so the parallel of a helix
//! is the parallel helix.

use std::f64::consts::{FRAC_PI_2, PI};
use strake::analytic::{cylinder, plane, sphere};
use strake::geodesics::offset::{
    OffsetDistance, OffsetOptions, OffsetSide, SurfaceOffset, offset_path,
};
use strake::{
    CurveJet, DerivOrder, FnCurve, Interval, StrakeError, SurfaceHint, SurfaceSource, UvCurve,
    uv_line,
};

fn curve_points<S: SurfaceSource>(
    s: &S,
    off: &SurfaceOffset,
    n: usize,
) -> Vec<(f64, f64, [f64; 3])> {
    let mut out = Vec::new();
    for piece in &off.pieces {
        for i in 0..n {
            let t = i as f64 / (n - 1) as f64;
            let j = piece.curve.checked_jet(t, &mut Default::default()).unwrap();
            let p = s
                .checked_jet(j.u, j.v, DerivOrder::Position, &mut SurfaceHint::default())
                .unwrap()
                .p;
            out.push((j.u, j.v, [p.x, p.y, p.z]));
        }
    }
    out
}

#[test]
fn sphere_equator_parallel_is_a_latitude_circle() {
    let r = 2.0;
    let s = sphere(r);
    let path = uv_line(0.5, FRAC_PI_2, 5.5, FRAC_PI_2).unwrap();
    for (side, d) in [(OffsetSide::Left, 0.6), (OffsetSide::Right, 1.1)] {
        let off = offset_path(
            &s,
            &path,
            side,
            &OffsetDistance::Constant(d),
            &OffsetOptions::new(1e-6),
        )
        .unwrap();
        assert_eq!(off.pieces.len(), 1);
        assert!(off.exits.is_empty() && off.loops.is_empty());
        // Every point at height |z| = R sin(d/R) on one side (the sign of the side follows B).
        let z_exact = r * (d / r).sin();
        let mut worst: f64 = 0.0;
        let mut sign = 0.0;
        for (_, _, p) in curve_points(&s, &off, 200) {
            if sign == 0.0 {
                sign = p[2].signum();
            }
            worst = worst.max((p[2] - sign * z_exact).abs());
        }
        for smp in &off.pieces[0].samples {
            assert!(
                (smp.v - (FRAC_PI_2 - sign * d / r)).abs() < 1e-9,
                "sample v {}",
                smp.v
            );
        }
        let points: usize = off.pieces.iter().map(|p| p.samples.len()).sum();
        println!(
            "sphere equator offset d {d}: worst |z - z_exact| {worst:e}, fit error {:e}, {points} \
             points kept, {} traces ({:.2} per point), {} jets ({:.1} per point, {:.1} per trace)",
            off.fit_error,
            off.traces,
            off.traces as f64 / points as f64,
            off.jets,
            off.jets as f64 / points as f64,
            off.jets as f64 / off.traces as f64
        );
        assert!(worst < 1e-6, "worst {worst:e}");
    }
}

#[test]
fn left_and_right_of_a_plane_line_and_a_cylinder_helix() {
    // Plane: a line from (1, 1) to (7, 3); left is +90° from its direction.
    let s = plane((0.0, 10.0), (0.0, 10.0));
    let path = uv_line(1.0, 1.0, 7.0, 3.0).unwrap();
    let dir = [6.0 / 40f64.sqrt(), 2.0 / 40f64.sqrt()];
    let left = [-dir[1], dir[0]];
    for (side, sgn) in [(OffsetSide::Left, 1.0), (OffsetSide::Right, -1.0)] {
        let off = offset_path(
            &s,
            &path,
            side,
            &OffsetDistance::Constant(0.5),
            &OffsetOptions::new(1e-7),
        )
        .unwrap();
        for (u, v, _) in curve_points(&s, &off, 50) {
            let dist = (u - 1.0) * left[0] + (v - 1.0) * left[1];
            assert!(
                (dist - sgn * 0.5).abs() < 1e-9,
                "{side:?}: signed distance {dist}"
            );
        }
    }
    // Cylinder of radius 2: unrolled coordinates (x, y) = (2u, v); a helix is a straight line.
    let c = cylinder(2.0, -5.0, 5.0);
    let path = uv_line(0.5, -1.0, 2.5, 1.0).unwrap(); // unrolled (1, -1) → (5, 1)
    let dir = [4.0 / 20f64.sqrt(), 2.0 / 20f64.sqrt()];
    let left = [-dir[1], dir[0]];
    let off = offset_path(
        &c,
        &path,
        OffsetSide::Left,
        &OffsetDistance::Constant(0.8),
        &OffsetOptions::new(1e-7),
    )
    .unwrap();
    let mut worst: f64 = 0.0;
    for (u, v, _) in curve_points(&c, &off, 50) {
        let (x, y) = (2.0 * u - 1.0, v + 1.0);
        let dist = x * left[0] + y * left[1];
        worst = worst.max((dist - 0.8).abs());
    }
    assert!(worst < 1e-8, "cylinder helix parallel off by {worst:e}");
}

/// A varying distance: on a plane the offset point of a line point is the point at d(t)
/// along the normal.
#[test]
fn varying_distance_follows_the_table() {
    let s = plane((0.0, 10.0), (0.0, 10.0));
    let path = uv_line(1.0, 2.0, 9.0, 2.0).unwrap();
    let table = OffsetDistance::Table {
        t: vec![0.0, 0.5, 1.0],
        d: vec![0.5, 1.5, 1.0],
    };
    let off = offset_path(
        &s,
        &path,
        OffsetSide::Left,
        &table,
        &OffsetOptions::new(1e-6),
    )
    .unwrap();
    for smp in &off.pieces[0].samples {
        let want = 2.0 + table.at(smp.t);
        assert!((smp.v - want).abs() < 1e-9 && (smp.u - (1.0 + 8.0 * smp.t)).abs() < 1e-9);
    }
}

/// A slanted line whose left offset crosses the domain side v = 4: the offset leaves where
/// the exact offset point reaches v = 4, and the piece ends exactly on it.
#[test]
fn exits_are_found_and_reported() {
    let s = plane((0.0, 10.0), (0.0, 4.0));
    let path = uv_line(1.0, 1.0, 9.0, 3.5).unwrap();
    let len = (64.0f64 + 6.25).sqrt();
    let nrm = [-2.5 / len, 8.0 / len];
    let d = 1.0;
    let off = offset_path(
        &s,
        &path,
        OffsetSide::Left,
        &OffsetDistance::Constant(d),
        &OffsetOptions::new(1e-7),
    )
    .unwrap();
    // Offset point: (1 + 8t, 1 + 2.5t) + d nrm reaches v = 4 at t = (3 − d nrm_v)/2.5.
    let t_exit = (3.0 - d * nrm[1]) / 2.5;
    assert_eq!(off.exits.len(), 1, "{:?}", off.exits);
    assert!(
        (off.exits[0].t0 - t_exit).abs() < 1e-9,
        "exit at {} vs {t_exit}",
        off.exits[0].t0
    );
    assert_eq!(off.exits[0].t1, 1.0);
    let last = off.pieces[0].samples.last().unwrap();
    assert_eq!(last.v, 4.0);
    // Far enough, it leaves at once: a status naming the distance.
    let e = offset_path(
        &s,
        &path,
        OffsetSide::Left,
        &OffsetDistance::Constant(5.0),
        &OffsetOptions::new(1e-6),
    )
    .unwrap_err();
    assert!(
        matches!(e, StrakeError::LeavesSurface { .. }) && e.to_string().contains("distance 5"),
        "{e}"
    );
    let e = offset_path(
        &s,
        &path,
        OffsetSide::Left,
        &OffsetDistance::Constant(-1.0),
        &OffsetOptions::new(1e-6),
    )
    .unwrap_err();
    assert!(e.to_string().contains("-1"), "{e}");
}

/// Concave side of a sine wave y = A sin x on a plane: radius of curvature 1/A at the crests,
/// so an offset by d > 1/A toward the centre of curvature forms swallowtails. The trimmed
/// offset must keep only points at distance d from the path (brute force: the nearest of
/// 20001 path points), and report one loop per crest on that side.
#[test]
fn loops_in_concave_regions_are_trimmed() {
    let s = plane((-1.0, 8.0), (-4.0, 4.0));
    let a = 1.0;
    let path = FnCurve::new(
        Interval {
            lo: 0.0,
            hi: 2.0 * PI,
        },
        move |t: f64| {
            Ok(CurveJet {
                u: t,
                v: a * t.sin(),
                du: 1.0,
                dv: a * t.cos(),
                ddu: 0.0,
                ddv: -a * t.sin(),
            })
        },
    );
    let d = 1.6; // > 1/A = 1
    // Right side (−B): B is the left normal; at the crest x = π/2 the centre of curvature is
    // below (−y), which is the right side.
    let off = offset_path(
        &s,
        &path,
        OffsetSide::Right,
        &OffsetDistance::Constant(d),
        &OffsetOptions::new(1e-6),
    )
    .unwrap();
    assert_eq!(off.loops.len(), 1, "{:?}", off.loops);
    let lp = off.loops[0];
    assert!(lp.t0 < FRAC_PI_2 && lp.t1 > FRAC_PI_2, "{lp:?}");
    // By symmetry about x = π/2 the branches cross on that line: the exact cut starts where
    // x(t) = t + d cos t / √(1 + cos² t) = π/2 (bisection here, to round-off).
    let x = |t: f64| t + d * t.cos() / (1.0 + t.cos() * t.cos()).sqrt() - FRAC_PI_2;
    let (mut lo, mut hi) = (0.0, FRAC_PI_2);
    for _ in 0..100 {
        let m = 0.5 * (lo + hi);
        if x(m) < 0.0 { lo = m } else { hi = m }
    }
    assert!(
        (lp.t0 - lo).abs() < 1e-4 && (lp.t1 - (PI - lo)).abs() < 1e-4,
        "{lp:?} vs {lo}"
    );
    let path_pts: Vec<[f64; 2]> = (0..=20000)
        .map(|i| {
            let t = 2.0 * PI * i as f64 / 20000.0;
            [t, a * t.sin()]
        })
        .collect();
    let mut worst: f64 = 0.0;
    for (u, v, _) in curve_points(&s, &off, 400) {
        let m = path_pts
            .iter()
            .map(|p| (p[0] - u).hypot(p[1] - v))
            .fold(f64::INFINITY, f64::min);
        worst = worst.max(d - m);
    }
    assert!(
        worst < 2e-3,
        "a kept point lies {worst:e} closer than d to the path"
    );
    println!(
        "sine loop: {:?}, pieces {}, closest approach below d {worst:e}",
        off.loops,
        off.pieces.len()
    );
}

/// A "leaning U" in plane coordinates (x, y): a right leg up along e₁ = (sin α, cos α), an arc
/// of radius ρ about C counter-clockwise from angle −α to π + α, a left leg down along
/// e₂ = (sin α, −cos α), arc length t throughout. Returns the point, unit tangent and
/// curvature vector at t, and the total length.
fn leaning_u(c: [f64; 2], rho: f64, alpha: f64, leg: f64) -> (impl Fn(f64) -> [[f64; 2]; 3], f64) {
    let (sa, ca) = alpha.sin_cos();
    let arc = rho * (PI + 2.0 * alpha);
    let total = 2.0 * leg + arc;
    let f = move |t: f64| {
        if t <= leg {
            let a = [c[0] + rho * ca, c[1] - rho * sa];
            let s = t - leg;
            [[a[0] + s * sa, a[1] + s * ca], [sa, ca], [0.0, 0.0]]
        } else if t <= leg + arc {
            let th = -alpha + (t - leg) / rho;
            let (st, ct) = th.sin_cos();
            [
                [c[0] + rho * ct, c[1] + rho * st],
                [-st, ct],
                [-ct / rho, -st / rho],
            ]
        } else {
            let b = [c[0] - rho * ca, c[1] - rho * sa];
            let s = t - leg - arc;
            [[b[0] + s * sa, b[1] - s * ca], [sa, -ca], [0.0, 0.0]]
        }
    };
    (f, total)
}

/// Non-local loops: the inner (left) offset of a leaning U at a distance d below the arc's
/// radius ρ has no backward run anywhere (no swallowtail), but its two legs cross below the
/// arc, and the ends beyond the crossing lie nearer the other leg than d. Exact planar
/// construction (the offset legs are tangent to the circle of radius ρ − d about C, so they
/// cross on the axis at X = C − (0, (ρ − d)/sin α), at arc length t_a = L − (ρ − d) cot α of
/// the path and symmetrically t_b = total − t_a); the cylinder of radius R is the same figure
/// unrolled, (u, v) = (x/R, y) (do Carmo §4-2: the cylinder is isometric to the plane).
#[test]
fn crossing_legs_of_a_leaning_u_are_cut_on_a_plane_and_a_cylinder() {
    let (c, rho, alpha, leg, d) = ([5.0, 4.0], 1.5, 0.3, 3.0, 1.0);
    let (shape, total) = leaning_u(c, rho, alpha, leg);
    let inner = rho - d;
    let x_cross = [c[0], c[1] - inner / alpha.sin()];
    let t_a = leg - inner / alpha.tan();
    let t_b = total - t_a;
    let exact = |t: f64| {
        let [p, tg, _] = shape(t);
        [p[0] - d * tg[1], p[1] + d * tg[0]]
    };
    for scale in [1.0, 2.0] {
        // scale 1: the plane itself; scale R = 2: the cylinder, u = x/R.
        let curve = FnCurve::new(Interval { lo: 0.0, hi: total }, {
            let shape = leaning_u(c, rho, alpha, leg).0;
            move |t: f64| {
                let [p, tg, k] = shape(t);
                Ok(CurveJet {
                    u: p[0] / scale,
                    v: p[1],
                    du: tg[0] / scale,
                    dv: tg[1],
                    ddu: k[0] / scale,
                    ddv: k[1],
                })
            }
        });
        let opts = OffsetOptions::new(1e-6);
        let dist = OffsetDistance::Constant(d);
        let off = if scale == 1.0 {
            offset_path(
                &plane((0.0, 10.0), (0.0, 6.0)),
                &curve,
                OffsetSide::Left,
                &dist,
                &opts,
            )
        } else {
            offset_path(
                &cylinder(scale, 0.0, 6.0),
                &curve,
                OffsetSide::Left,
                &dist,
                &opts,
            )
        }
        .unwrap();
        let what = if scale == 1.0 { "plane" } else { "cylinder" };
        assert!(off.exits.is_empty(), "{what}: {:?}", off.exits);
        assert_eq!(off.pieces.len(), 1, "{what}: {} pieces", off.pieces.len());
        assert_eq!(off.loops.len(), 2, "{what}: {:?}", off.loops);
        let (l0, l1) = (off.loops[0], off.loops[1]);
        assert!(
            l0.t0 == 0.0
                && (l0.t1 - t_a).abs() < 1e-12
                && (l1.t0 - t_b).abs() < 1e-12
                && l1.t1 == total,
            "{what}: loops {:?} vs (0, {t_a}), ({t_b}, {total})",
            off.loops
        );
        let smp = &off.pieces[0].samples;
        let mut worst: f64 = 0.0;
        for s in smp {
            let e = exact(s.t);
            worst = worst.max((s.u * scale - e[0]).hypot(s.v - e[1]));
        }
        for s in [smp[0], smp[smp.len() - 1]] {
            worst = worst.max((s.u * scale - x_cross[0]).hypot(s.v - x_cross[1]));
        }
        println!(
            "leaning U on the {what}: loops {:?}, {} samples, worst {worst:e}",
            off.loops,
            smp.len()
        );
        assert!(worst < 1e-12, "{what}: worst {worst:e}");
    }
}
