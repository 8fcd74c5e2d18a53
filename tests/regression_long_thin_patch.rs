//! Regression: long thin patches were refused as degenerate.
//!
//! The plane (u, v, 0) over [0, L] × [0, 1] is perfectly regular, yet the old conditioning
//! figure |Su × Sv| Δu Δv / max(|Su| Δu, |Sv| Δv)² = 1/L refused it for L > 1e4: a 1 mm fillet
//! strip 10 m long was refused. The figure now compares each tangent with its own reference
//! speed over the patch, so proportions do not matter, while a pole still drives it to 0.

use strake::analytic::{cylinder, plane, sphere};
use strake::geometry::principal::DEGENERATE_SURFACE_LIMIT;
use strake::{CurveOnSurface, Hints, StrakeError, SurfaceSource, uv_line};

#[test]
fn a_long_thin_plane_is_regular() {
    for l in [1.0, 1e4, 1e5, 1e8, 1e12] {
        let p = plane((0.0, l), (0.0, 1.0));
        let c = uv_line(0.1 * l, 0.2, 0.9 * l, 0.7).unwrap();
        let f = CurveOnSurface::new(&p, &c)
            .frame(0.5, &mut Hints::default())
            .unwrap_or_else(|e| panic!("L = {l}: {e}"));
        assert_eq!(f.conditioning.surface, 1.0, "L = {l}");
    }
}

#[test]
fn a_fillet_strip_one_mm_by_ten_m_is_regular() {
    // A cylinder of radius 1 mm (units: mm) 10 m long: u the angle, v along the axis.
    let s = cylinder(1.0, 0.0, 10_000.0);
    let (ud, vd) = (s.u_domain(), s.v_domain());
    let c = uv_line(ud.lo + 0.1, vd.lo + 1.0, ud.lo + 0.5, vd.hi - 1.0).unwrap();
    let f = CurveOnSurface::new(&s, &c)
        .frame(0.5, &mut Hints::default())
        .unwrap();
    assert!(f.conditioning.surface > 0.1, "{}", f.conditioning.surface);
    assert!((f.principal.k1.abs().max(f.principal.k2.abs()) - 1.0).abs() < 1e-14);
}

#[test]
fn a_pole_is_still_refused() {
    let s = sphere(1.0);
    let (ud, vd) = (s.u_domain(), s.v_domain());
    // Colatitude 1e-6 from the pole: figure about 1e-6 / 22, below the limit.
    let c = uv_line(ud.lo + 0.3, vd.lo + 1e-6, ud.lo + 0.6, vd.lo + 1e-6).unwrap();
    let e = CurveOnSurface::new(&s, &c)
        .frame(0.5, &mut Hints::default())
        .unwrap_err();
    match e {
        StrakeError::DegenerateSurface { conditioning, .. } => {
            assert!(conditioning < DEGENERATE_SURFACE_LIMIT, "{conditioning}")
        }
        other => panic!("{other}"),
    }
}
