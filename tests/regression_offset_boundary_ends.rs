//! Regression: offsets of a path whose ends lie exactly on the domain boundary went wrong at
//! the ends.
//!
//! The perpendicular of such an end runs along the boundary, but the path's frame tilts it out
//! of the domain by a rounding unit; the geodesic then started heading out (`LeavesSurface`),
//! the offset reported an exit at each end, bisected a boundary point 1e-11 of the path inward
//! that lay only a fraction of the distance away, and the fitted curve dipped toward the path
//! there. Seen on a plane over [0, 10] × [0, 4]: the parallel at 0.5 of the line v = 0.25,
//! offset again by 0.5, dipped to v = 0.815 at its ends instead of 1.25 (fit error 0.013), and
//! a constant step-over plan of 0.5 from that line made a second row 10.37 long with a
//! scallop of 4.1e-4 instead of 0.0318. A start direction that leaves a side it starts on by
//! less than the snap distance over the whole trace is now taken along the side.
//!
//! Sources: on a plane geodesics are straight lines, so the parallel at d of the line v = c is
//! the line v = c + d (exact geometry); a cylinder of radius R unrolls isometrically onto a
//! plane by (x, y) = (R u, v) (do Carmo §4-2), so the parallel of a circle v = c is the circle
//! v = c + d and that of a ruling u = c the ruling u = c + d/R; the scallop a ball of radius r
//! leaves between two parallel passes w apart on a plane is r − √(r² − w²/4) (two-circle
//! intersection, the flat case).

use std::f64::consts::TAU;
use strake::analytic::{cylinder, plane};
use strake::checks::ToolSide;
use strake::geodesics::offset::{OffsetDistance, OffsetOptions, OffsetSide, offset_path};
use strake::{
    CurveOnSurface, NurbsCurve, PassOptions, StepRule, SurfaceSource, UvCurve, arc_length,
    plan_passes, uv_line,
};

/// Offsets `first` five times in a row by `d` to `side`, each time the fitted piece of the one
/// before, and checks every kept sample and 101 points of each fitted curve against the exact
/// (u, v) given by `exact(k, u, v)` (k = 1..=5: how many offsets), which returns the error.
fn offset_five_times<S: SurfaceSource, C: UvCurve>(
    s: &S,
    first: &C,
    side: OffsetSide,
    d: f64,
    exact_length: f64,
    exact: impl Fn(usize, f64, f64) -> f64,
    ends: [(f64, f64); 2],
) {
    let opts = OffsetOptions::new(1e-6);
    let mut path: Option<NurbsCurve<2>> = None;
    for k in 1..=5 {
        let off = match &path {
            None => offset_path(s, first, side, &OffsetDistance::Constant(d), &opts),
            Some(p) => offset_path(s, p, side, &OffsetDistance::Constant(d), &opts),
        }
        .unwrap();
        assert!(off.exits.is_empty(), "offset {k}: exits {:?}", off.exits);
        assert!(off.loops.is_empty(), "offset {k}: loops {:?}", off.loops);
        assert_eq!(off.pieces.len(), 1, "offset {k}");
        assert!(
            off.fit_error < 1e-12,
            "offset {k}: fit error {:e}",
            off.fit_error
        );
        let piece = &off.pieces[0];
        let mut worst: f64 = 0.0;
        for smp in &piece.samples {
            assert_eq!(smp.distance, d, "offset {k} at t {}", smp.t);
            worst = worst.max(exact(k, smp.u, smp.v));
        }
        let c = &piece.curve;
        for i in 0..=100 {
            let j = c
                .checked_jet(c.domain().even(i, 101), &mut Default::default())
                .unwrap();
            worst = worst.max(exact(k, j.u, j.v));
        }
        println!(
            "offset {k}: worst error {worst:e}, fit error {:e}",
            off.fit_error
        );
        assert!(worst < 1e-12, "offset {k}: worst error {worst:e}");
        // The ends stay on the boundary (to the rounding of the fitted curve's evaluation at
        // its ends, an ulp or two).
        let (a, b) = (piece.samples[0], piece.samples[piece.samples.len() - 1]);
        for (smp, end) in [(a, ends[0]), (b, ends[1])] {
            let got = [smp.u, smp.v];
            let want = [end.0, end.1];
            for c in 0..2 {
                if want[c].is_finite() {
                    assert!(
                        (got[c] - want[c]).abs() < 1e-14,
                        "offset {k}: end ({}, {})",
                        smp.u,
                        smp.v
                    );
                }
            }
        }
        let len = arc_length(&CurveOnSurface::new(s, c), 0.0, 1.0, 1e-12).unwrap();
        assert!(
            (len - exact_length).abs() < 1e-10 * exact_length,
            "offset {k}: length {len} vs {exact_length}"
        );
        path = Some(piece.curve.clone());
    }
}

#[test]
fn offset_of_offset_of_an_edge_to_edge_line_on_a_plane_stays_exact() {
    let s = plane((0.0, 10.0), (0.0, 4.0));
    let first = uv_line(0.0, 0.25, 10.0, 0.25).unwrap();
    // T = +u, N = +z, so the left B = N × T = +v.
    offset_five_times(
        &s,
        &first,
        OffsetSide::Left,
        0.5,
        10.0,
        |k, _, v| (v - (0.25 + 0.5 * k as f64)).abs(),
        [(0.0, f64::NAN), (10.0, f64::NAN)],
    );
}

#[test]
fn offset_of_offset_of_edge_to_edge_circles_and_rulings_on_a_cylinder_stays_exact() {
    let r = 2.0;
    let s = cylinder(r, 0.0, 4.0);
    // A circle v = 0.25 all round: T = Su/|Su|, N outward, left B = N × T = +z = +v.
    let circle = uv_line(0.0, 0.25, TAU, 0.25).unwrap();
    offset_five_times(
        &s,
        &circle,
        OffsetSide::Left,
        0.5,
        TAU * r,
        |k, _, v| (v - (0.25 + 0.5 * k as f64)).abs(),
        [(0.0, f64::NAN), (TAU, f64::NAN)],
    );
    // A ruling u = 1 from edge to edge: T = +z, right −B = −(N × T) = +Su direction.
    let ruling = uv_line(1.0, 0.0, 1.0, 4.0).unwrap();
    offset_five_times(
        &s,
        &ruling,
        OffsetSide::Right,
        0.5,
        4.0,
        |k, u, _| r * (u - (1.0 + 0.5 * k as f64 / r)).abs(),
        [(f64::NAN, 0.0), (f64::NAN, 4.0)],
    );
}

#[test]
fn constant_step_over_rows_from_an_edge_to_edge_pass_are_exact() {
    let s = plane((0.0, 10.0), (0.0, 4.0));
    let first = uv_line(0.0, 0.25, 10.0, 0.25).unwrap();
    let (ball, w) = (1.0, 0.5);
    let mut opts =
        PassOptions::iso_scallop(ball, ToolSide::AlongNormal, 1.0, OffsetSide::Left, 1e-7);
    opts.rule = StepRule::ConstantStepOver { step_over: w };
    let plan = plan_passes(&s, &first, &opts).unwrap();
    // Rows at v = 0.75, 1.25, ..., 3.75: seven beside the first.
    assert_eq!(plan.count, 8, "{} passes", plan.count);
    assert!(plan.covered);
    let exact = ball - (ball * ball - 0.25 * w * w).sqrt();
    for p in &plan.passes {
        assert!(p.exits.is_empty(), "row {}: exits {:?}", p.row, p.exits);
        assert!(
            (p.length - 10.0).abs() < 1e-9,
            "row {}: length {}",
            p.row,
            p.length
        );
        assert!(
            (p.scallop_min - exact).abs() < 1e-9 && (p.scallop_max - exact).abs() < 1e-9,
            "row {}: scallop {:e}..{:e} vs {exact:e}",
            p.row,
            p.scallop_min,
            p.scallop_max
        );
    }
    assert!(
        (plan.total_length - 80.0).abs() < 1e-8,
        "{}",
        plan.total_length
    );
}
