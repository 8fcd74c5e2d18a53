//! The native NURBS surface as a surface source: agreement with the same surface through the
//! closure path, validation on creation, domain checks, and span hints.

use strake::geometry::jet::{DerivOrder, Interval, SurfaceJet};
use strake::nurbs::{MAX_DEGREE, NurbsSurface, NurbsSurfaceData, SpanHint};
use strake::paths::curve_on_surface::{CurveOnSurface, Hints};
use strake::surface::{FnSurface, SurfaceHint, SurfaceSource};
use strake::{Orientation, StrakeError, uv_line};

#[path = "support/lcg.rs"]
mod lcg;
use lcg::Lcg;

/// A bicubic rational 8 × 8 wavy sheet (a "wing skin") with non-uniform knots in u, a double
/// interior knot in v and weights in [0.5, 2].
fn wing_skin() -> (Vec<f64>, Vec<f64>, Vec<[f64; 3]>, Vec<f64>) {
    let ku = vec![0.0, 0.0, 0.0, 0.0, 0.1, 0.3, 0.45, 0.8, 1.0, 1.0, 1.0, 1.0];
    let kv = vec![
        -2.0, -2.0, -2.0, -2.0, -1.0, 0.5, 0.5, 1.5, 3.0, 3.0, 3.0, 3.0,
    ];
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
    (ku, kv, pts, ws)
}

fn build(
    ku: &[f64],
    kv: &[f64],
    pts: &[[f64; 3]],
    ws: Option<&[f64]>,
) -> strake::Result<NurbsSurface> {
    NurbsSurface::new(&NurbsSurfaceData {
        degree_u: 3,
        degree_v: 3,
        count_u: 8,
        count_v: 8,
        knots_u: ku,
        knots_v: kv,
        points: pts,
        weights: ws,
    })
}

fn skin() -> NurbsSurface {
    let (ku, kv, pts, ws) = wing_skin();
    build(&ku, &kv, &pts, Some(&ws)).unwrap()
}

// Common practice: the same surface evaluated natively and through the closure (callback) path
// gives the same frames, bit for bit, along slanted and iso lines.
#[test]
fn native_surface_agrees_with_closure_path() {
    for orientation in [Orientation::Forward, Orientation::Reversed] {
        let native = skin().with_orientation(orientation);
        let inner = native.clone();
        let via_closure = FnSurface::new(
            native.u_domain(),
            native.v_domain(),
            orientation,
            move |u, v, o| inner.jet(u, v, o, &mut SurfaceHint::default()),
        );
        let lines = [
            (0.0, -2.0, 1.0, 3.0),
            (0.95, -1.7, 0.05, 2.9),
            (0.3, -2.0, 0.3, 3.0),
            (0.0, 0.5, 1.0, 0.5),
        ];
        let mut n = 0;
        for (u0, v0, u1, v1) in lines {
            let line = uv_line(u0, v0, u1, v1).unwrap();
            let a = CurveOnSurface::new(&native, &line);
            let b = CurveOnSurface::new(&via_closure, &line);
            let (mut ha, mut hb) = (Hints::default(), Hints::default());
            for i in 0..=200 {
                let t = i as f64 / 200.0;
                let fa = a.frame(t, &mut ha).unwrap();
                let fb = b.frame(t, &mut hb).unwrap();
                assert_eq!(fa, fb, "t={t} on ({u0}, {v0})->({u1}, {v1})");
                n += 1;
            }
        }
        assert_eq!(n, 804);
    }
}

// REFERENCES.md ("what flips", do Carmo ch. 3): reversing N flips κn and κg, not τg.
#[test]
fn reversed_orientation_flips_kn_and_kg_only() {
    let fwd = skin();
    let rev = skin().with_orientation(Orientation::Reversed);
    let line = uv_line(0.1, -1.5, 0.9, 2.5).unwrap();
    let (a, b) = (
        CurveOnSurface::new(&fwd, &line),
        CurveOnSurface::new(&rev, &line),
    );
    for i in 0..=50 {
        let t = i as f64 / 50.0;
        let fa = a.frame(t, &mut Hints::default()).unwrap();
        let fb = b.frame(t, &mut Hints::default()).unwrap();
        assert_eq!(fa.normal_curvature, -fb.normal_curvature);
        assert_eq!(fa.geodesic_curvature, -fb.geodesic_curvature);
        assert!(
            (fa.geodesic_torsion - fb.geodesic_torsion).abs()
                <= 1e-12 * fa.principal.k1.abs().max(1.0)
        );
    }
}

// Common practice: entries above the requested order are zero; lower entries do not depend on
// the order asked for.
#[test]
fn lower_orders_are_prefixes_of_the_full_jet() {
    let s = skin();
    let mut h = SurfaceHint::default();
    let full = s.jet(0.37, 0.2, DerivOrder::Second, &mut h).unwrap();
    let first = s.jet(0.37, 0.2, DerivOrder::First, &mut h).unwrap();
    let pos = s.jet(0.37, 0.2, DerivOrder::Position, &mut h).unwrap();
    let z = strake::Vec3::zeros();
    assert_eq!(
        pos,
        SurfaceJet {
            p: full.p,
            ..SurfaceJet::default()
        }
    );
    assert_eq!(
        first,
        SurfaceJet {
            p: full.p,
            su: full.su,
            sv: full.sv,
            suu: z,
            suv: z,
            svv: z
        }
    );
}

// Common practice: a control point and weight read back as given (layout i * count_v + j).
#[test]
fn control_net_layout_is_v_fastest() {
    let (ku, kv, pts, ws) = wing_skin();
    let s = build(&ku, &kv, &pts, Some(&ws)).unwrap();
    for (i, j) in [(0, 0), (0, 7), (3, 5), (7, 0), (7, 7)] {
        let k = i * 8 + j;
        let p = s.control_point(i, j).unwrap();
        for c in 0..3 {
            assert!((p[c] - pts[k][c]).abs() <= 1e-15 * pts[k][c].abs().max(1.0));
        }
        assert_eq!(s.weight(i, j), Some(ws[k]));
    }
    assert_eq!(s.control_point(8, 0), None);
    assert_eq!(s.weight(0, 8), None);
    // The layout shows in the surface: at the corner (u, v) = (lo, hi) of a clamped surface
    // the point is P_{0, count_v − 1} (The NURBS Book ch. 3, endpoint interpolation of clamped
    // surfaces [section: memory]).
    let mut h = SurfaceHint::default();
    let corner = s.jet(0.0, 3.0, DerivOrder::Position, &mut h).unwrap().p;
    for c in 0..3 {
        assert!((corner[c] - pts[7][c]).abs() <= 1e-14);
    }
}

fn expect_err(r: strake::Result<NurbsSurface>) -> (StrakeError, String) {
    let e = r.unwrap_err();
    let msg = e.to_string();
    (e, msg)
}

fn data<'a>(
    ku: &'a [f64],
    kv: &'a [f64],
    pts: &'a [[f64; 3]],
    ws: Option<&'a [f64]>,
) -> NurbsSurfaceData<'a> {
    NurbsSurfaceData {
        degree_u: 3,
        degree_v: 3,
        count_u: 8,
        count_v: 8,
        knots_u: ku,
        knots_v: kv,
        points: pts,
        weights: ws,
    }
}

// Issue 3, validation on creation: each failure gives its variant and a message naming the
// direction, index and value.
#[test]
fn validation_failures_name_index_and_value() {
    let (ku, kv, pts, ws) = wing_skin();

    // Degree outside 1..=MAX_DEGREE.
    let (e, m) = expect_err(NurbsSurface::new(&NurbsSurfaceData {
        degree_u: 0,
        ..data(&ku, &kv, &pts, None)
    }));
    assert!(
        matches!(e, StrakeError::InvalidDegree(_))
            && m.contains("u knots")
            && m.contains("degree 0"),
        "{m}"
    );
    let big = MAX_DEGREE + 1;
    let (e, m) = expect_err(NurbsSurface::new(&NurbsSurfaceData {
        degree_v: big,
        ..data(&ku, &kv, &pts, None)
    }));
    assert!(
        matches!(e, StrakeError::InvalidDegree(_))
            && m.contains("v knots")
            && m.contains(&format!("degree {big}")),
        "{m}"
    );

    // Too few control points for the degree.
    let few_pts = &pts[..3 * 8];
    let (e, m) = expect_err(NurbsSurface::new(&NurbsSurfaceData {
        count_u: 3,
        knots_u: &[0.0, 0.0, 0.0, 0.0, 1.0, 1.0, 1.0],
        ..data(&ku, &kv, few_pts, None)
    }));
    assert!(
        matches!(e, StrakeError::InvalidDegree(_))
            && m.contains("at least 4 control points, got 3"),
        "{m}"
    );

    // Knot count does not fit degree and count.
    let (e, m) = expect_err(NurbsSurface::new(&data(&ku[..11], &kv, &pts, None)));
    assert!(
        matches!(e, StrakeError::InvalidDegree(_))
            && m.contains("u knots")
            && m.contains("12 knots, got 11"),
        "{m}"
    );
    // ... also with a count that would overflow count + degree + 1.
    let (e, m) = expect_err(NurbsSurface::new(&NurbsSurfaceData {
        count_v: usize::MAX,
        ..data(&ku, &kv, &pts, None)
    }));
    assert!(
        matches!(e, StrakeError::InvalidDegree(_)) && m.contains("v knots"),
        "{m}"
    );

    // Decreasing knot.
    let mut bad = kv.clone();
    bad[5] = -1.5;
    let (e, m) = expect_err(NurbsSurface::new(&data(&ku, &bad, &pts, None)));
    assert!(
        matches!(e, StrakeError::InvalidKnots(_))
            && m.contains("v knots: knot[5] = -1.5 is below knot[4] = -1"),
        "{m}"
    );

    // Non-finite knot.
    let mut bad = ku.clone();
    bad[6] = f64::NAN;
    let (e, m) = expect_err(NurbsSurface::new(&data(&bad, &kv, &pts, None)));
    assert!(
        matches!(e, StrakeError::InvalidKnots(_)) && m.contains("u knots: knot[6] = NaN"),
        "{m}"
    );

    // Multiplicity above degree + 1 inside the vector.
    let bad = [0.0, 0.0, 0.0, 0.0, 0.5, 0.5, 0.5, 0.5, 0.5, 1.0, 1.0, 1.0];
    let (e, m) = expect_err(NurbsSurface::new(&data(&bad, &kv, &pts, None)));
    assert!(
        matches!(e, StrakeError::InvalidKnots(_))
            && m.contains("knot value 0.5 at index 4 has multiplicity 5"),
        "{m}"
    );

    // Zero-length domain [knot[3], knot[4]] (unclamped, 4 control points in v).
    let bad = [-3.0, -2.0, -1.0, 0.0, 0.0, 1.0, 2.0, 3.0];
    let (e, m) = expect_err(NurbsSurface::new(&NurbsSurfaceData {
        count_v: 4,
        ..data(&ku, &bad, &pts[..32], None)
    }));
    assert!(
        matches!(e, StrakeError::InvalidKnots(_))
            && m.contains("v knots")
            && m.contains("zero length"),
        "{m}"
    );

    // Net size mismatch.
    let (e, m) = expect_err(NurbsSurface::new(&data(&ku, &kv, &pts[..63], None)));
    assert!(
        matches!(e, StrakeError::InvalidArgument(_))
            && m.contains("63 points")
            && m.contains("8 x 8 = 64"),
        "{m}"
    );

    // Non-finite coordinate.
    let mut bad = pts.clone();
    bad[13][2] = f64::INFINITY;
    let (e, m) = expect_err(NurbsSurface::new(&data(&ku, &kv, &bad, None)));
    assert_eq!(
        e,
        StrakeError::InvalidControlPoint {
            index: 13,
            value: f64::INFINITY
        }
    );
    assert!(m.contains("control point 13") && m.contains("inf"), "{m}");

    // Weights that are not positive and finite.
    for (index, value) in [
        (7usize, 0.0),
        (0, -1.0),
        (63, f64::NAN),
        (20, f64::INFINITY),
    ] {
        let mut bad = ws.clone();
        bad[index] = value;
        let (e, m) = expect_err(NurbsSurface::new(&data(&ku, &kv, &pts, Some(&bad))));
        match e {
            StrakeError::InvalidWeight { index: i, value: v } => {
                assert!(
                    i == index && (v == value || (v.is_nan() && value.is_nan())),
                    "{m}"
                )
            }
            other => panic!("expected InvalidWeight, got {other:?}"),
        }
        assert!(m.contains(&format!("weight[{index}] = {value}")), "{m}");
    }

    // Weight count mismatch.
    let (e, m) = expect_err(NurbsSurface::new(&data(&ku, &kv, &pts, Some(&ws[..60]))));
    assert!(
        matches!(e, StrakeError::InvalidArgument(_))
            && m.contains("60 weights")
            && m.contains("64"),
        "{m}"
    );
}

// Issue 3: evaluation outside the domain gives its status (no clamping); a non-finite parameter
// is NonFinite.
#[test]
fn evaluation_outside_the_domain_is_refused() {
    let s = skin();
    let mut h = SurfaceHint::default();
    let e = s.jet(-1e-12, 0.0, DerivOrder::Second, &mut h).unwrap_err();
    assert_eq!(
        e,
        StrakeError::OutOfDomain {
            name: "u",
            value: -1e-12,
            lo: 0.0,
            hi: 1.0
        }
    );
    let e = s
        .checked_jet(0.5, 3.5, DerivOrder::Second, &mut h)
        .unwrap_err();
    assert_eq!(
        e,
        StrakeError::OutOfDomain {
            name: "v",
            value: 3.5,
            lo: -2.0,
            hi: 3.0
        }
    );
    assert!(e.to_string().contains("v = 3.5 is outside [-2, 3]"));
    let e = s
        .checked_jet(f64::NAN, 0.0, DerivOrder::First, &mut h)
        .unwrap_err();
    assert!(matches!(e, StrakeError::NonFinite { what: "u", .. }), "{e}");
    // Both ends are inside.
    for (u, v) in [(0.0, -2.0), (1.0, 3.0), (0.0, 3.0), (1.0, -2.0)] {
        s.checked_jet(u, v, DerivOrder::Second, &mut h).unwrap();
    }
    assert_eq!(s.u_domain(), Interval { lo: 0.0, hi: 1.0 });
    assert_eq!(s.v_domain(), Interval { lo: -2.0, hi: 3.0 });
}

fn fresh(s: &NurbsSurface, u: f64, v: f64) -> SurfaceJet {
    s.jet(u, v, DerivOrder::Second, &mut SurfaceHint::default())
        .unwrap()
}

// The NURBS Book A2.1 (FindSpan) defines the span; a hint is only a starting guess (DESIGN.md):
// marching forward, backward, jumping, and stale or absurd hints give results identical (bit for
// bit) to a hint-free evaluation, and leave the hint on the span found.
#[test]
fn span_hints_never_change_the_answer() {
    let s = skin();
    let (ku, kv) = (s.u_knots().knots().to_vec(), s.v_knots().knots().to_vec());
    let n = 400;
    let us: Vec<f64> = (0..=n)
        .map(|i| i as f64 / n as f64)
        .chain(ku.iter().copied())
        .collect();
    let vs: Vec<f64> = (0..=n)
        .map(|i| -2.0 + 5.0 * i as f64 / n as f64)
        .chain(kv.iter().copied())
        .collect();
    // Forward and backward marching along a diagonal, with knots hit exactly.
    let mut h = SurfaceHint::default();
    let pairs: Vec<(f64, f64)> = us.iter().zip(&vs).map(|(&u, &v)| (u, v)).collect();
    for &(u, v) in pairs.iter().chain(pairs.iter().rev()) {
        assert_eq!(
            s.jet(u, v, DerivOrder::Second, &mut h).unwrap(),
            fresh(&s, u, v),
            "({u}, {v})"
        );
        assert_eq!(
            h.u.0,
            Some(s.u_knots().find_span(u, &mut SpanHint::default()))
        );
        assert_eq!(
            h.v.0,
            Some(s.v_knots().find_span(v, &mut SpanHint::default()))
        );
    }
    // Random jumps carrying the hint along.
    let mut rng = Lcg(7);
    for _ in 0..2000 {
        let (u, v) = (rng.next(), -2.0 + 5.0 * rng.next());
        assert_eq!(
            s.jet(u, v, DerivOrder::Second, &mut h).unwrap(),
            fresh(&s, u, v)
        );
    }
    // Stale and absurd hints.
    for stale in [0usize, 1, 2, 3, 4, 5, 6, 7, 8, 9, 11, 1000, usize::MAX] {
        for &(u, v) in &pairs {
            let mut h = SurfaceHint {
                u: SpanHint(Some(stale)),
                v: SpanHint(Some(stale)),
            };
            assert_eq!(
                s.jet(u, v, DerivOrder::Second, &mut h).unwrap(),
                fresh(&s, u, v),
                "hint {stale} ({u}, {v})"
            );
        }
    }
}
