//! Regression: points on the domain boundary were refused.
//!
//! A curve that ends on the surface's edge (or runs along it) computes its (u, v) by a rational
//! quotient, which lands a few ulps outside the domain about one time in ten; such samples were
//! refused with `OutOfDomain`. A parameter within `DOMAIN_SNAP_ULPS` ulps (of the larger end's
//! magnitude) of the domain is now taken as on its end and snapped onto it exactly; a point
//! truly outside is still refused. Each test first counts the raw (u, v) that fall outside, so
//! it cannot pass without exercising the defect.

#[path = "support/lcg.rs"]
mod lcg;

use lcg::Lcg;
use strake::{
    CurveOnSurface, DOMAIN_SNAP_ULPS, DarbouxFrame, Hints, Interval, NurbsCurve, NurbsSurface,
    NurbsSurfaceData, SpanHint, StrakeError, SurfaceSource,
};

const U: (f64, f64) = (0.1, 0.7);
const V: (f64, f64) = (0.3, 1.9);

/// A biquadratic wavy patch over U × V (invented data).
fn patch() -> NurbsSurface {
    let ku = [U.0, U.0, U.0, 0.35, U.1, U.1, U.1];
    let kv = [V.0, V.0, V.0, 1.2, V.1, V.1, V.1];
    let mut pts = Vec::new();
    let mut w = Vec::new();
    for i in 0..4 {
        for j in 0..4 {
            pts.push([i as f64, j as f64, ((i * 7 + j * 3) % 5) as f64 * 0.2]);
            w.push(1.0 + 0.1 * ((i + 2 * j) % 3) as f64);
        }
    }
    NurbsSurface::new(&NurbsSurfaceData {
        degree_u: 2,
        degree_v: 2,
        count_u: 4,
        count_v: 4,
        knots_u: &ku,
        knots_v: &kv,
        points: &pts,
        weights: Some(&w),
    })
    .unwrap()
}

/// Whether the raw (u, v) of `curve` at t lies outside U × V.
fn raw_outside(curve: &NurbsCurve<2>, t: f64) -> bool {
    let p = curve
        .derivs(t, strake::DerivOrder::Position, &mut SpanHint::default())
        .unwrap()
        .p;
    p[0] < U.0 || p[0] > U.1 || p[1] < V.0 || p[1] > V.1
}

fn inside(f: &DarbouxFrame) -> bool {
    (U.0..=U.1).contains(&f.u) && (V.0..=V.1).contains(&f.v)
}

#[test]
fn rational_corner_to_corner_curves_end_on_the_corner() {
    let s = patch();
    let mut rng = Lcg(16);
    let mut outside = 0;
    for _ in 0..200 {
        let (t0, t1) = (rng.range(-3.0, 3.0), rng.range(3.5, 9.0));
        let knots = [t0, t0, t0, t1, t1, t1];
        let mid = [rng.range(U.0, U.1), rng.range(V.0, V.1)];
        let pts = [[U.0, V.0], mid, [U.1, V.1]];
        let w = [
            rng.range(0.2, 5.0),
            rng.range(0.2, 5.0),
            rng.range(0.2, 5.0),
        ];
        let c = NurbsCurve::new(2, &knots, &pts, Some(&w)).unwrap();
        outside += raw_outside(&c, t0) as usize + raw_outside(&c, t1) as usize;
        let cs = CurveOnSurface::new(&s, &c);
        for t in [t0, t1] {
            let f = cs.frame(t, &mut Hints::default()).unwrap();
            assert!(inside(&f), "t = {t}: (u, v) = ({}, {})", f.u, f.v);
        }
        let end = cs.frame(t1, &mut Hints::default()).unwrap();
        if raw_outside(&c, t1) {
            assert!(
                end.u == U.1 || end.v == V.1,
                "an end outside is snapped onto the edge"
            );
        }
        let mut batch = [end; 9];
        cs.frames_even(&mut batch).unwrap();
        assert_eq!(
            batch[8].to_array(),
            end.to_array(),
            "batch and one point agree"
        );
    }
    assert!(
        outside > 0,
        "no raw end fell outside: the test exercises nothing"
    );
}

#[test]
fn a_pass_along_the_edge_u_max_is_accepted_whole() {
    let s = patch();
    let mut rng = Lcg(7);
    let mut outside = 0;
    for _ in 0..20 {
        // A rational quadratic running along u = u_max: u(t) = Σ N w u_max / Σ N w rounds off
        // the edge at some samples.
        let knots = [0.0, 0.0, 0.0, 1.0, 1.0, 1.0];
        let pts = [[U.1, V.0], [U.1, rng.range(V.0, V.1)], [U.1, V.1]];
        let w = [
            rng.range(0.3, 3.0),
            rng.range(0.3, 3.0),
            rng.range(0.3, 3.0),
        ];
        let c = NurbsCurve::new(2, &knots, &pts, Some(&w)).unwrap();
        outside += (0..101)
            .filter(|&i| raw_outside(&c, c.domain().even(i, 101)))
            .count();
        let cs = CurveOnSurface::new(&s, &c);
        let blank = cs.frame(0.5, &mut Hints::default()).unwrap();
        let mut frames = vec![blank; 101];
        cs.frames_even(&mut frames).unwrap();
        assert!(frames.iter().all(inside));
    }
    assert!(
        outside > 0,
        "no raw sample fell outside: the test exercises nothing"
    );
}

#[test]
fn a_point_truly_outside_is_still_refused() {
    let s = patch();
    let d = s.u_domain();
    let tol = d.snap_tolerance();
    assert_eq!(tol, DOMAIN_SNAP_ULPS * f64::EPSILON * 0.7);
    assert_eq!(d.snap("u", U.1 + 0.9 * tol).unwrap(), U.1);
    assert_eq!(d.snap("u", U.0 - 0.9 * tol).unwrap(), U.0);
    for bad in [U.1 + 1.2 * tol, U.1 + 1e-9, U.0 - 1.2 * tol] {
        let e = s
            .checked_jet(
                bad,
                1.0,
                strake::DerivOrder::Second,
                &mut Default::default(),
            )
            .unwrap_err();
        assert!(
            matches!(e, StrakeError::OutOfDomain { name: "u", .. }),
            "{e}"
        );
    }
    assert!(matches!(
        d.snap("u", f64::NAN),
        Err(StrakeError::NonFinite { .. })
    ));
}

#[test]
fn domains_whose_width_overflows_are_refused_at_creation() {
    let e = Interval::new("u", -1e300 * 1e8, 1e308).unwrap_err();
    assert!(e.to_string().contains("overflows"), "{e}");
    let e = Interval::new("t", -1e308, 1e308).unwrap_err();
    assert!(e.to_string().contains("too wide"), "{e}");
    assert!(Interval::new("t", -1e307, 1e307).is_ok());
    let e = NurbsCurve::<2>::new(
        1,
        &[-1e308, -1e308, 1e308, 1e308],
        &[[0.0, 0.0], [1.0, 1.0]],
        None,
    )
    .unwrap_err();
    assert!(matches!(e, StrakeError::InvalidKnots(_)), "{e}");
    assert!(e.to_string().contains("overflows"), "{e}");
}
