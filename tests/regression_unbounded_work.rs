//! Regression: arc length and sampling did unbounded work, or refused late, on inputs that
//! cannot be met.
//!
//! - A host evaluator whose results carry noise above the tolerance made the adaptive
//!   quadrature split to its depth limit everywhere (1e-6 relative noise took ~45 s, 1e-4 did
//!   not return). The quadrature now has a budget (`MAX_QUADRATURE_RULES`) and stops with
//!   `NotConverged` naming where it stopped and what it reached.
//! - A chord tolerance of 1e-100 or a denormal maximum step placed ten million samples before
//!   refusing, naming a sample; both are now refused at once, naming the option.

#[path = "support/lcg.rs"]
mod lcg;

use std::sync::atomic::{AtomicU64, Ordering};
use strake::{
    ChordalOptions, CurveOnSurface, DerivOrder, FnSurface, Interval, MAX_QUADRATURE_RULES,
    Orientation, PathSample, StrakeError, SurfaceJet, Vec3, arc_length, sample_chordal, uv_line,
};

/// A plane z = 0 over [0, 1]² whose first derivatives carry relative noise `noise` (a host
/// evaluator gone wrong; the noise comes from a counter-driven generator, deterministic).
fn noisy_plane(noise: f64) -> impl strake::SurfaceSource {
    let state = AtomicU64::new(1);
    let d = Interval::new("u", 0.0, 1.0).unwrap();
    FnSurface::new(
        d,
        d,
        Orientation::Forward,
        move |u, v, _order: DerivOrder| {
            let mut g = lcg::Lcg(state.fetch_add(0x9e37_79b9, Ordering::Relaxed));
            let r = 1.0 + noise * (2.0 * g.next() - 1.0);
            Ok(SurfaceJet {
                p: Vec3::new(u, v, 0.0),
                su: Vec3::new(r, 0.0, 0.0),
                sv: Vec3::new(0.0, 1.0, 0.0),
                suu: Vec3::zeros(),
                suv: Vec3::zeros(),
                svv: Vec3::zeros(),
            })
        },
    )
}

#[test]
fn arc_length_on_a_noisy_evaluator_stops_with_not_converged() {
    let s = noisy_plane(1e-4);
    let c = uv_line(0.0, 0.2, 1.0, 0.7).unwrap();
    let cs = CurveOnSurface::new(&s, &c);
    let e = arc_length(&cs, 0.0, 1.0, 1e-12).unwrap_err();
    match &e {
        StrakeError::NotConverged { what, iterations } => {
            assert_eq!(*iterations, MAX_QUADRATURE_RULES);
            assert!(what.contains("t in ["), "names where: {what}");
            assert!(
                what.contains("accepted so far"),
                "names what was reached: {what}"
            );
        }
        other => panic!("{other}"),
    }
    // Without noise the same call converges at once.
    let quiet = noisy_plane(0.0);
    let cs = CurveOnSurface::new(&quiet, &c);
    let l = arc_length(&cs, 0.0, 1.0, 1e-12).unwrap();
    assert!((l - (1.0f64 + 0.25).sqrt()).abs() < 1e-14, "{l}");
}

fn chordal_error(tol: f64, step: f64) -> StrakeError {
    let s = strake::analytic::sphere(3.0);
    let (ud, vd) = (s.u_domain(), s.v_domain());
    use strake::SurfaceSource;
    let c = uv_line(ud.lo + 0.2, vd.lo + 0.5, ud.hi - 0.3, vd.hi - 0.6).unwrap();
    let cs = CurveOnSurface::new(&s, &c);
    let mut out: Vec<PathSample> = Vec::new();
    let e = sample_chordal(&cs, &ChordalOptions::new(tol, step), &mut out).unwrap_err();
    assert_eq!(e.index, 0);
    assert!(out.is_empty(), "refused before any sample is placed");
    e.error
}

#[test]
fn unreachable_chord_tolerance_is_refused_at_once_naming_it() {
    let e = chordal_error(1e-100, f64::INFINITY);
    assert!(matches!(e, StrakeError::InvalidArgument(_)));
    assert!(e.to_string().contains("chord tolerance = 1e-100"), "{e}");
}

#[test]
fn denormal_max_step_is_refused_at_once_naming_it() {
    let e = chordal_error(1e-3, 5e-324);
    assert!(e.to_string().contains("max step = 4.94066e-324"), "{e}");
    // A step that would need more than max_samples samples, too.
    let e = chordal_error(1e-3, 1e-9);
    assert!(e.to_string().contains("max step = 1e-09"), "{e}");
    assert!(e.to_string().contains("above max samples"), "{e}");
}
