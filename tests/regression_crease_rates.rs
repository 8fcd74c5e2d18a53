//! Regression: on a crease, third-order results took the third partials of whichever side a
//! plain span search lands on.
//!
//! The frame on a knot line where the surface is not C2 was already taken on the side the curve
//! moves into (`tests/regression_crease_side.rs`), but the results that need third derivatives
//! (the rates dκn/ds, dκg/ds, dτg/ds, dκ/ds, one point and batch; the tool-centre path at order
//! 3 and 4) evaluated the surface's partials with a plain span search, the side above the knot,
//! so a curve moving into the side below got a frame of one side and rates of the other. Every
//! evaluation on a path now takes the sides of the frame (`SurfaceSource::partials_in_domain_sided`).
//! The same holds across a simple knot of a cubic, which is C2 (no crease, no flag) but whose
//! third partials jump: third-order results are those of the side the curve moves into
//! (`crease::sides_for_order`), checked there as the limit from that side.
//!
//! The surface: a cubic in u with a double knot at u = 1 (C1 across the line, so the curvatures
//! are continuous but the third partials jump), linear in v, its second row of control points
//! tilted so that the surface is curved in both directions (invented data). Its two sides are
//! the Bézier pieces of the u profile: inserting u = 1 once more (knot insertion, The NURBS
//! Book, 2nd ed., §5.2, eq. 5.15: α = (1 − u₃)/(u₆ − u₃) = ½) gives the control point
//! Q = (P₂ + P₃)/2 shared by the pieces P₀ P₁ P₂ Q over [0, 1] and Q P₃ P₄ P₅ over [1, 2].
//! Each piece, built as a surface of its own, has no knot inside its domain: its values at u = 1
//! are those of that side without any choice. The expected results are the same path's on the
//! piece the curve moves into (to round-off: a Bézier piece and the knot-vector basis round
//! differently); the other piece's differ by far more, so the test cannot pass by accident.

use strake::checks::{Cutter, ToolAngles, ToolSide};
use strake::{
    CentrePoint, CreaseFlags, CurveOnSurface, Hints, InvariantRates, NurbsCurve, NurbsSurface,
    NurbsSurfaceData, ToolSetup, centre_path_at,
};

/// The u profile's control points (x, z); the surface puts row v = 0 at y = 0 and row v = 1
/// at y = 1, z raised by 0.1 x.
const PROFILE: [[f64; 2]; 6] = [
    [0.0, 0.0],
    [1.0, 0.3],
    [2.0, 1.2],
    [3.0, 0.4],
    [4.0, 0.9],
    [5.0, -0.2],
];

fn surface_of(knots_u: &[f64], profile: &[[f64; 2]]) -> NurbsSurface {
    let mut pts = Vec::new();
    for p in profile {
        pts.push([p[0], 0.0, p[1]]);
        pts.push([p[0], 1.0, p[1] + 0.1 * p[0]]);
    }
    NurbsSurface::new(&NurbsSurfaceData {
        degree_u: 3,
        degree_v: 1,
        count_u: profile.len(),
        count_v: 2,
        knots_u,
        knots_v: &[0.0, 0.0, 1.0, 1.0],
        points: &pts,
        weights: None,
    })
    .unwrap()
}

/// The C1 surface over [0, 2] × [0, 1].
fn creased() -> NurbsSurface {
    surface_of(
        &[0.0, 0.0, 0.0, 0.0, 1.0, 1.0, 2.0, 2.0, 2.0, 2.0],
        &PROFILE,
    )
}

/// The Bézier piece below the knot (`left`) or above it.
fn piece(left: bool) -> NurbsSurface {
    let q = [
        0.5 * (PROFILE[2][0] + PROFILE[3][0]),
        0.5 * (PROFILE[2][1] + PROFILE[3][1]),
    ];
    if left {
        surface_of(
            &[0.0, 0.0, 0.0, 0.0, 1.0, 1.0, 1.0, 1.0],
            &[PROFILE[0], PROFILE[1], PROFILE[2], q],
        )
    } else {
        surface_of(
            &[1.0, 1.0, 1.0, 1.0, 2.0, 2.0, 2.0, 2.0],
            &[q, PROFILE[3], PROFILE[4], PROFILE[5]],
        )
    }
}

/// A quadratic Bézier curve in (u, v) over t ∈ [0, 1].
fn bezier(p: [[f64; 2]; 3]) -> NurbsCurve<2> {
    NurbsCurve::new(2, &[0.0, 0.0, 0.0, 1.0, 1.0, 1.0], &p, None).unwrap()
}

/// The paths, the t where each is on the knot line u = 1, whether the side it moves into is
/// the one below, and whether it runs along the line there.
fn paths() -> Vec<(&'static str, NurbsCurve<2>, f64, bool, bool)> {
    vec![
        // u = 0.4 + 1.2 t: crossing upwards at t = 1/2.
        (
            "crossing up",
            bezier([[0.4, 0.2], [1.0, 0.8], [1.6, 0.5]]),
            0.5,
            false,
            false,
        ),
        // u = 1.6 − 1.2 t: crossing downwards at t = 1/2.
        (
            "crossing down",
            bezier([[1.6, 0.3], [1.0, 0.9], [0.4, 0.6]]),
            0.5,
            true,
            false,
        ),
        // u = 1.1 − 0.4 t (1 − t): touching the line from above at t = 1/2 (u' = 0, u'' > 0).
        (
            "touching from above",
            bezier([[1.1, 0.1], [0.9, 0.5], [1.1, 0.9]]),
            0.5,
            false,
            true,
        ),
        // u = 0.9 + 0.4 t (1 − t): touching from below (u'' < 0).
        (
            "touching from below",
            bezier([[0.9, 0.9], [1.1, 0.5], [0.9, 0.1]]),
            0.5,
            true,
            true,
        ),
    ]
}

fn rates_of(r: &InvariantRates) -> [f64; 4] {
    [
        r.normal_curvature,
        r.geodesic_curvature,
        r.geodesic_torsion,
        r.space_curvature,
    ]
}

#[track_caller]
fn close(what: &str, got: f64, want: f64, other: f64) {
    let tol = 1e-11 * (1.0 + want.abs());
    assert!(
        (got - want).abs() <= tol,
        "{what}: {got:e}, the side moved into gives {want:e} (the other side {other:e})"
    );
}

fn setup() -> ToolSetup {
    ToolSetup {
        cutter: Cutter::Ball { radius: 0.05 },
        side: ToolSide::AlongNormal,
        angles: ToolAngles {
            lead: 0.1,
            tilt: 0.05,
        },
    }
}

fn centre_values(p: &CentrePoint) -> [f64; 5] {
    [
        p.curvature,
        p.speed_ratio,
        p.axis_rate,
        p.curvature_rate.unwrap_or(0.0),
        p.torsion.unwrap_or(0.0),
    ]
}

#[test]
fn the_two_sides_really_differ_in_their_rates() {
    // The defect's precondition: the pieces' rates at the knot differ (else nothing is tested).
    for (name, c, t, _, _) in paths() {
        let (l, r) = (piece(true), piece(false));
        let rl = CurveOnSurface::new(&l, &c)
            .frame_with_rates(t, &mut Hints::default())
            .unwrap()
            .1;
        let rr = CurveOnSurface::new(&r, &c)
            .frame_with_rates(t, &mut Hints::default())
            .unwrap()
            .1;
        let d = rates_of(&rl)
            .into_iter()
            .zip(rates_of(&rr))
            .map(|(a, b)| (a - b).abs())
            .fold(0.0, f64::max);
        assert!(d > 1e-2, "{name}: rates on the two sides {rl:?} {rr:?}");
    }
}

#[test]
fn rates_on_a_c1_crease_are_those_of_the_side_moved_into() {
    let s = creased();
    for (name, c, t, below, along) in paths() {
        let (want, other) = (piece(below), piece(!below));
        let path = CurveOnSurface::new(&s, &c);
        let (f, r) = path.frame_with_rates(t, &mut Hints::default()).unwrap();
        let flags = path.crease_flags(t, &mut Hints::default()).unwrap();
        assert!(flags.has(CreaseFlags::U_LINE), "{name}: flags {flags:?}");
        assert!(!flags.has(CreaseFlags::U_C0), "{name}: C1, not C0");
        assert_eq!(flags.has(CreaseFlags::ALONG_U), along, "{name}");
        let (fw, rw) = CurveOnSurface::new(&want, &c)
            .frame_with_rates(t, &mut Hints::default())
            .unwrap();
        let (_, ro) = CurveOnSurface::new(&other, &c)
            .frame_with_rates(t, &mut Hints::default())
            .unwrap();
        close(
            &format!("{name}: κn"),
            f.normal_curvature,
            fw.normal_curvature,
            f64::NAN,
        );
        for (k, ((g, w), o)) in rates_of(&r)
            .into_iter()
            .zip(rates_of(&rw))
            .zip(rates_of(&ro))
            .enumerate()
        {
            close(&format!("{name}: rate {k}"), g, w, o);
        }
        // The batch: a few samples with the crease sample inside, the same bits as one point.
        let ts = [0.0, 0.25, t, 0.75, 1.0];
        let mut frames = [f; 5];
        let mut rates = [r; 5];
        path.frames_with_rates_at(&ts, &mut frames, &mut rates)
            .unwrap();
        assert_eq!(
            rates_of(&rates[2]),
            rates_of(&r),
            "{name}: batch vs one point"
        );
        assert_eq!(frames[2], f, "{name}");
        // A batch of 40 with the crease sample among full lane blocks (the lane-wide closed
        // forms must leave it to the side-choosing one-point steps).
        let mut ts40: Vec<f64> = (0..40).map(|i| i as f64 / 39.0).collect();
        ts40[21] = t;
        let mut frames40 = vec![f; 40];
        let mut rates40 = vec![r; 40];
        path.frames_with_rates_at(&ts40, &mut frames40, &mut rates40)
            .unwrap();
        assert_eq!(
            rates_of(&rates40[21]),
            rates_of(&r),
            "{name}: batch of 40 vs one point"
        );
        // The partials a path evaluation uses are those of the side too.
        let (sp, _, pf) = path.partials_at(t, 4, &mut Hints::default()).unwrap();
        assert_eq!(pf, flags);
        let (spw, _, _) = CurveOnSurface::new(&want, &c)
            .partials_at(t, 4, &mut Hints::default())
            .unwrap();
        for (k, l) in [(3, 0), (2, 1), (4, 0), (3, 1)] {
            let e = (sp.d[k][l] - spw.d[k][l]).norm();
            assert!(e < 1e-10, "{name}: partial d[{k}][{l}] off by {e:e}");
        }
    }
}

#[test]
fn samples_within_round_off_of_the_crease_take_the_side_moved_into() {
    // t one or two ulps off the crossing: u lands within a few ulps of the knot on either side.
    let s = creased();
    for (name, c, t, below, _) in paths().into_iter().take(2) {
        let want = piece(below);
        for tt in [t.next_down().next_down(), t.next_down(), t.next_up()] {
            let path = CurveOnSurface::new(&s, &c);
            let flags = path.crease_flags(tt, &mut Hints::default()).unwrap();
            assert!(flags.has(CreaseFlags::U_LINE), "{name} at {tt}");
            let (_, r) = path.frame_with_rates(tt, &mut Hints::default()).unwrap();
            let (_, rw) = CurveOnSurface::new(&want, &c)
                .frame_with_rates(tt, &mut Hints::default())
                .unwrap();
            for (k, (g, w)) in rates_of(&r).into_iter().zip(rates_of(&rw)).enumerate() {
                close(&format!("{name} at t = {tt:e}: rate {k}"), g, w, f64::NAN);
            }
        }
    }
}

#[test]
fn the_tool_centre_path_on_a_c1_crease_is_that_of_the_side_moved_into() {
    let s = creased();
    let setup = setup();
    for (name, c, t, below, _) in paths() {
        let (want, other) = (piece(below), piece(!below));
        for order in [3, 4] {
            let at = |surface: &NurbsSurface| {
                let path = CurveOnSurface::new(surface, &c);
                let f = path.frame(t, &mut Hints::default()).unwrap();
                let p0 = CentrePoint {
                    centre: f.n,
                    tip: f.n,
                    axis: f.n,
                    tangent: f.t,
                    speed_ratio: 0.0,
                    curvature: 0.0,
                    curvature_rate: None,
                    torsion: None,
                    jerk_figure: None,
                    axis_rate: 0.0,
                };
                let mut out = [p0];
                centre_path_at(&path, &[t], &setup, order, &mut out).unwrap();
                out[0]
            };
            let (g, w, o) = (at(&s), at(&want), at(&other));
            let (gv, wv, ov) = (centre_values(&g), centre_values(&w), centre_values(&o));
            for k in 0..5 {
                close(
                    &format!("{name}, order {order}: value {k}"),
                    gv[k],
                    wv[k],
                    ov[k],
                );
            }
            assert!((g.centre - w.centre).norm() < 1e-12, "{name}");
        }
    }
}

/// The same profile's first five points as a cubic with a simple knot at u = 1: C2 across
/// the line (no crease, no flag), but its third partials jump there.
fn c2_surface() -> NurbsSurface {
    surface_of(
        &[0.0, 0.0, 0.0, 0.0, 1.0, 2.0, 2.0, 2.0, 2.0],
        &PROFILE[..5],
    )
}

#[test]
fn rates_on_a_c2_knot_line_are_the_limit_from_the_side_moved_into() {
    // Across a simple knot of a cubic the frame is continuous (C2) but the rates jump. The
    // side the curve moves into is where it is a moment later: the rates at the knot must be
    // the limit of the rates at t0 + h as h → 0⁺ (within one span they are smooth, so the
    // difference is O(h)), not that at t0 − h.
    let s = c2_surface();
    let h = 1e-7;
    for (name, c, t, _, along) in paths() {
        let path = CurveOnSurface::new(&s, &c);
        let flags = path.crease_flags(t, &mut Hints::default()).unwrap();
        assert!(
            flags.is_smooth(),
            "{name}: a C2 line is no crease: {flags:?}"
        );
        let at = |t: f64| rates_of(&path.frame_with_rates(t, &mut Hints::default()).unwrap().1);
        let (on, next, before) = (at(t), at(t + h), at(t - h));
        let jump = next
            .iter()
            .zip(&before)
            .map(|(a, b)| (a - b).abs())
            .fold(0.0, f64::max);
        // A crossing path meets both sides (a touching one stays on one: no jump there, and
        // the plain evaluation takes the side above, so the path touching from below shows
        // the defect).
        assert_eq!(jump > 1e-2, !along, "{name}: the rates jump by {jump:e}");
        for k in 0..4 {
            let tol = 1e-4 * (1.0 + next[k].abs());
            assert!(
                (on[k] - next[k]).abs() <= tol,
                "{name}: rate {k} at the knot {:e}, moving into {:e}, before {:e}",
                on[k],
                next[k],
                before[k]
            );
        }
        // The batch and the tool-centre path agree with the one-point rates.
        let ts = [0.0, t, 1.0];
        let f = path.frame(t, &mut Hints::default()).unwrap();
        let (mut frames, mut rates) = ([f; 3], [InvariantRates::default(); 3]);
        path.frames_with_rates_at(&ts, &mut frames, &mut rates)
            .unwrap();
        assert_eq!(rates_of(&rates[1]), on, "{name}: batch vs one point");
        let mut out = [CentrePoint::default(); 2];
        centre_path_at(&path, &[t, t + h], &setup(), 3, &mut out).unwrap();
        let d = (out[0].curvature - out[1].curvature).abs();
        assert!(d < 1e-4, "{name}: centre curvature {out:?}");
    }
}
