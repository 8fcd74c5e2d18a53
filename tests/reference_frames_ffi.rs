//! The C ABI against the reference frames of `tests/reference/frames.txt` (issue 4): every
//! sample's jets go through `strake_frame_from_jets`, and every field of the C result must
//! agree with the reference as through the Rust API.
//!
//! Source of the expected values: `tests/reference/gen_frames.py` (sympy + mpmath; symbolic
//! derivatives of the space curve and the Darboux equations, do Carmo ch. 3), see
//! `tests/reference_frames.rs` for the route and the comparison rule.

#[path = "support/reference.rs"]
mod reference;

use reference::{ErrorLog, REFERENCE_TOL, load_reference, scalar_error, vector_error};
use strake::ffi::{
    StrakeCurveJet, StrakeFrame, StrakeParamScales, StrakeStatus, StrakeSurfaceJet,
    strake_frame_from_jets,
};

#[test]
fn c_abi_matches_reference() {
    let mut log = ErrorLog::default();
    let samples = load_reference();
    assert!(samples.len() >= 100);
    for s in &samples {
        let sj = StrakeSurfaceJet {
            p: s.jet[0],
            su: s.jet[1],
            sv: s.jet[2],
            suu: s.jet[3],
            suv: s.jet[4],
            svv: s.jet[5],
        };
        let c = s.curve;
        let cj = StrakeCurveJet {
            u: c[0],
            v: c[1],
            du: c[2],
            dv: c[3],
            ddu: c[4],
            ddv: c[5],
        };
        let scales = StrakeParamScales {
            u_extent: s.u_extent,
            v_extent: s.v_extent,
            t_extent: s.t_extent,
        };
        let mut f = StrakeFrame::default();
        // SAFETY: all pointers refer to live locals.
        let st = unsafe { strake_frame_from_jets(&sj, &cj, 0, &scales, &mut f) };
        assert_eq!(st, StrakeStatus::Ok, "{}", s.label());
        let label = s.label();
        let tol = REFERENCE_TOL;
        log.record(&label, "T", vector_error(f.tangent, s.tangent), tol);
        log.record(&label, "B", vector_error(f.side, s.binormal), tol);
        log.record(&label, "N", vector_error(f.normal, s.normal), tol);
        log.record(&label, "kn", scalar_error(f.normal_curvature, s.kn), tol);
        log.record(&label, "kg", scalar_error(f.geodesic_curvature, s.kg), tol);
        log.record(&label, "tg", scalar_error(f.geodesic_torsion, s.tg), tol);
        log.record(&label, "k1", scalar_error(f.k1, s.k1), tol);
        log.record(&label, "k2", scalar_error(f.k2, s.k2), tol);
        log.record(&label, "H", scalar_error(f.mean_curvature, s.mean), tol);
        log.record(
            &label,
            "K",
            scalar_error(f.gaussian_curvature, s.gaussian),
            tol,
        );
        log.record(
            &label,
            "conditioning.surface",
            scalar_error(f.surface_conditioning, s.cond_surface),
            tol,
        );
        log.record(
            &label,
            "conditioning.curve",
            scalar_error(f.curve_speed_figure, s.cond_curve),
            tol,
        );
        log.record(&label, "point", vector_error(f.point, s.jet[0]), tol);
    }
    log.finish("C ABI strake_frame_from_jets");
}
