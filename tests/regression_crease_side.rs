//! Regression: creases decided by rounding.
//!
//! Where a NURBS surface is only C0/C1 across a knot line, a path on (or crossing) that line
//! got the normal and curvatures of whichever side a 1-ulp rounding of (u, v) landed on. A
//! (u, v) within round-off of such a knot is now snapped onto it and evaluated on the side the
//! curve moves into, and the result is flagged (`CreaseFlags`).
//!
//! The surface: the extrusion along y of a planar curve of degree 2 in the xz-plane made of two
//! parabolic arcs (Bézier pieces P0 P1 P2 and P2 P3 P4) joined at P2 by a double knot at u = 1,
//! so only C0 there (a roof ridge; invented data). The closed forms come from the end
//! derivatives of a quadratic Bézier piece: C'(end) = 2 (P2 − P1) on the left piece,
//! C'(start) = 2 (P3 − P2) on the right (knot spans of width 1; The NURBS Book, 2nd ed., §2.5
//! and §3.3, derivative of a B-spline curve), and the curvature at an end of a quadratic Bézier
//! piece, κ = ½ |(b1 − b0) × (b2 − b1)| / |b_end − b_adjacent|³ (a value recalled from memory,
//! rederived here: for b0 = 0, b1 = (1, 0), b2 = (1, 1) over [0, 1], c' (1) = (0, 2),
//! c'' = (−2, 2), κ = |c' × c''|/|c'|³ = 4/8 = ½ = ½ · 1/1³).
//!
//! - left piece P0 = (0, 0, 0), P1 = (1, 0, 0), P2 = (2, 0, 1): Su(1⁻) = (2, 0, 2), N = Su × Sv
//!   normalised = (−1, 0, 1)/√2, κ = ½ · 1 / (√2)³ = 1/(4√2), bending toward N (k1 = +1/(4√2),
//!   k2 = 0);
//! - right piece P2, P3 = (3, 0, 1), P4 = (4, 0, 0): Su(1⁺) = (2, 0, 0), N = (0, 0, 1),
//!   κ = ½, bending away from N (k1 = 0, k2 = −½).

#[path = "support/lcg.rs"]
mod lcg;

use lcg::Lcg;
use strake::{
    CreaseFlags, CurveJet, CurveOnSurface, DarbouxFrame, DerivOrder, FnCurve, Hints, Interval,
    NurbsCurve, NurbsSurface, NurbsSurfaceData, SurfaceHint, Vec3,
};

fn roof() -> NurbsSurface {
    let ku = [0.0, 0.0, 0.0, 1.0, 1.0, 2.0, 2.0, 2.0];
    let kv = [0.0, 0.0, 1.0, 1.0];
    let c = [
        [0.0, 0.0, 0.0],
        [1.0, 0.0, 0.0],
        [2.0, 0.0, 1.0],
        [3.0, 0.0, 1.0],
        [4.0, 0.0, 0.0],
    ];
    let mut pts = Vec::new();
    for p in c {
        pts.push(p);
        pts.push([p[0], 1.0, p[2]]);
    }
    NurbsSurface::new(&NurbsSurfaceData {
        degree_u: 2,
        degree_v: 1,
        count_u: 5,
        count_v: 2,
        knots_u: &ku,
        knots_v: &kv,
        points: &pts,
        weights: None,
    })
    .unwrap()
}

fn left_normal() -> Vec3 {
    Vec3::new(-1.0, 0.0, 1.0) / 2f64.sqrt()
}

fn right_normal() -> Vec3 {
    Vec3::new(0.0, 0.0, 1.0)
}

/// Checks a frame against the closed form of the left (`left`) or right side.
#[track_caller]
fn assert_side(f: &DarbouxFrame, left: bool) {
    assert_side_to(f, left, 1e-15);
}

/// As [`assert_side`], to `tol`.
#[track_caller]
fn assert_side_to(f: &DarbouxFrame, left: bool, tol: f64) {
    let (n, k1, k2) = if left {
        (left_normal(), 1.0 / (4.0 * 2f64.sqrt()), 0.0)
    } else {
        (right_normal(), 0.0, -0.5)
    };
    assert!((f.n - n).norm() < tol, "normal {:?}, want {n:?}", f.n);
    assert!((f.principal.k1 - k1).abs() < tol, "k1 {}", f.principal.k1);
    assert!((f.principal.k2 - k2).abs() < tol, "k2 {}", f.principal.k2);
}

/// A line through (1 + k ulps, v0) with velocity (du, dv) and acceleration (ddu, 0), t ∈ [0, 1]
/// at t = 0.5: the point a rounded evaluation lands on.
fn line_at(u: f64, v0: f64, du: f64, dv: f64, ddu: f64) -> impl UvLike {
    FnCurve::new(Interval { lo: 0.0, hi: 1.0 }, move |t: f64| {
        let s = t - 0.5;
        Ok(CurveJet {
            u: if s == 0.0 { u } else { u + du * s },
            v: v0 + dv * s,
            du,
            dv,
            ddu,
            ddv: 0.0,
        })
    })
}

trait UvLike: strake::UvCurve {}
impl<T: strake::UvCurve> UvLike for T {}

fn ulps(x: f64, k: i32) -> f64 {
    let mut y = x;
    for _ in 0..k.abs() {
        y = if k > 0 { y.next_up() } else { y.next_down() };
    }
    y
}

#[test]
fn a_rounded_u_would_pick_either_side() {
    // The defect itself: a plain evaluation one ulp below or above the knot gives the two
    // sides' normals, 0.77 apart.
    let s = roof();
    let n = |u: f64| {
        let j = s
            .jet(u, 0.5, DerivOrder::First, &mut SurfaceHint::default())
            .unwrap();
        j.su.cross(&j.sv).normalize()
    };
    assert!((n(1f64.next_down()) - left_normal()).norm() < 1e-15);
    assert!((n(1f64.next_up()) - right_normal()).norm() < 1e-15);
}

#[test]
fn samples_on_the_crease_take_the_side_of_travel_whatever_the_rounding() {
    let s = roof();
    let mut rng = Lcg(9);
    for _ in 0..200 {
        let k = rng.below(9) as i32 - 4;
        let u = ulps(1.0, k);
        let v0 = rng.range(0.1, 0.9);
        let du = rng.range(0.05, 2.0) * if rng.next() < 0.5 { -1.0 } else { 1.0 };
        let dv = rng.range(-1.0, 1.0);
        let c = line_at(u, v0, du, dv, rng.range(-1.0, 1.0));
        let cs = CurveOnSurface::new(&s, &c);
        let (f, flags) = cs.frame_flagged(0.5, &mut Hints::default()).unwrap();
        assert_eq!(f.u, 1.0, "snapped onto the knot");
        assert_eq!(flags.0, CreaseFlags::U_LINE | CreaseFlags::U_C0);
        assert_side(&f, du < 0.0);
        // The batch gives the same bits and the flags call the same flags.
        let mut batch = [f; 3];
        cs.frames_at(&[0.5, 0.5, 0.5], &mut batch).unwrap();
        for b in batch {
            assert_eq!(b.to_array(), f.to_array());
        }
        assert_eq!(cs.crease_flags(0.5, &mut Hints::default()).unwrap(), flags);
    }
}

#[test]
fn a_path_crossing_the_crease_changes_side_at_the_knot() {
    // A rational quadratic line in (u, v) through the knot at t = 1/2 (its middle control
    // point, by symmetry), traversed both ways: the frame at the knot is that of the side it
    // moves into, the frames 1e-9 before and after are those of their sides (to first order
    // in the distance from the knot).
    let s = roof();
    let mut rng = Lcg(4);
    for _ in 0..50 {
        let w = rng.range(0.3, 3.0);
        let (a, b) = (rng.range(0.1, 0.9), rng.range(0.1, 0.9));
        for forward in [true, false] {
            let (p0, p2) = if forward {
                ([0.4, a], [1.6, 2.0 * b - a])
            } else {
                ([1.6, a], [0.4, 2.0 * b - a])
            };
            let pts = [p0, [1.0, b], p2];
            let c = NurbsCurve::new(
                2,
                &[0.0, 0.0, 0.0, 1.0, 1.0, 1.0],
                &pts,
                Some(&[1.0, w, 1.0]),
            )
            .unwrap();
            let cs = CurveOnSurface::new(&s, &c);
            let ts = [0.5 - 1e-9, 0.5, 0.5 + 1e-9];
            let mut frames = [cs.frame(0.5, &mut Hints::default()).unwrap(); 3];
            cs.frames_at(&ts, &mut frames).unwrap();
            let (f, flags) = cs.frame_flagged(0.5, &mut Hints::default()).unwrap();
            assert_eq!(frames[1].to_array(), f.to_array(), "batch = one point");
            assert!(flags.has(CreaseFlags::U_LINE | CreaseFlags::U_C0));
            assert!(!flags.has(CreaseFlags::ALONG_U));
            assert_side(&f, !forward);
            assert_side_to(&frames[0], forward, 1e-7);
            assert_side_to(&frames[2], !forward, 1e-7);
        }
    }
}

#[test]
fn a_path_along_the_crease_takes_the_documented_side_and_says_so() {
    // u(t) = 1 (± a few ulps), v(t) = t: u' = 0, so the rule: the side u'' points to, above the
    // knot when u'' = 0.
    let s = roof();
    for k in -3..=3 {
        for (ddu, left) in [(0.0, false), (-1.0, true), (2.0, false)] {
            let c = line_at(ulps(1.0, k), 0.5, 0.0, 0.8, ddu);
            let cs = CurveOnSurface::new(&s, &c);
            let ts: Vec<f64> = (0..11).map(|i| i as f64 / 10.0).collect();
            let mut frames = vec![cs.frame(0.0, &mut Hints::default()).unwrap(); ts.len()];
            cs.frames_at(&ts, &mut frames).unwrap();
            for (&t, b) in ts.iter().zip(&frames) {
                let (f, flags) = cs.frame_flagged(t, &mut Hints::default()).unwrap();
                assert_eq!(
                    flags.0,
                    CreaseFlags::U_LINE | CreaseFlags::U_C0 | CreaseFlags::ALONG_U
                );
                assert_eq!(f.u, 1.0);
                assert_side(&f, left);
                assert_eq!(b.to_array(), f.to_array(), "batch = one point at t = {t}");
            }
        }
    }
}

#[test]
fn a_point_off_the_knot_is_not_flagged_nor_moved() {
    let s = roof();
    let u = 1.0 + 1e-9;
    let c = line_at(u, 0.5, -1.0, 0.3, 0.0);
    let cs = CurveOnSurface::new(&s, &c);
    let (f, flags) = cs.frame_flagged(0.5, &mut Hints::default()).unwrap();
    assert!(flags.is_smooth());
    assert_eq!(f.u, u);
    // The right piece's normal, to first order in the distance from the knot.
    assert!((f.n - right_normal()).norm() < 1e-8);
}
