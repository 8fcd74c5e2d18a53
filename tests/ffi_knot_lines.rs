//! `strake_surface_set_knot_lines`: a host that evaluates a NURBS surface through a callback
//! declares its knot lines, and arc length splits its quadrature there. The surface is strake's
//! own nine-point NURBS cylinder behind a callback (double knots in u: a kink in the parametric
//! speed where the quarter arcs join); the curve u = t², v = 0.5 sweeps the whole circle, whose
//! length is the circumference 2πR of the exact circle the NURBS represents (The NURBS Book,
//! 2nd ed., §7.5).

#[path = "support/ffi_util.rs"]
mod ffi_util;

use ffi_util::{expect, nurbs_host};
use std::ffi::c_void;
use strake::SurfaceSource;
use strake::ffi::{
    StrakeCurve, StrakeStatus, StrakeSurface, strake_arc_length, strake_curve_free,
    strake_curve_new_nurbs, strake_surface_free, strake_surface_from_callback,
    strake_surface_set_knot_lines,
};
use strake::nurbs::conics::cylinder;
use strake::nurbs::{CircleForm, NurbsSurface};

fn arc(s: *const StrakeSurface, c: *const StrakeCurve, tol: f64) -> f64 {
    let mut len = f64::NAN;
    // SAFETY: live handles and a writable double.
    let st = unsafe { strake_arc_length(s, c, 0.0, 1.0, tol, &mut len) };
    assert_eq!(st, StrakeStatus::Ok);
    len
}

#[test]
fn declared_knot_lines_bring_arc_length_within_its_tolerance() {
    let r = 3.0;
    let nurbs = cylinder(r, 0.0, 2.0, CircleForm::NinePoint).unwrap();
    let (ud, vd) = (nurbs.u_domain(), nurbs.v_domain());
    let lines_u = nurbs.u_breaks().to_vec();
    assert_eq!(lines_u.len(), 3);
    let mut s = std::ptr::null_mut();
    let mut c = std::ptr::null_mut();
    let knots = [0.0, 0.0, 0.0, 1.0, 1.0, 1.0];
    let pts = [ud.lo, 0.5, ud.lo, 0.5, ud.hi, 0.5];
    // SAFETY: valid arrays and output slots; the NurbsSurface outlives the handle.
    unsafe {
        let ud_ptr = &nurbs as *const NurbsSurface as *mut c_void;
        let st = strake_surface_from_callback(
            Some(nurbs_host),
            ud_ptr,
            ud.lo,
            ud.hi,
            vd.lo,
            vd.hi,
            0,
            &mut s,
        );
        assert_eq!(st, StrakeStatus::Ok);
        let st = strake_curve_new_nurbs(
            2,
            knots.as_ptr(),
            6,
            pts.as_ptr(),
            3,
            std::ptr::null(),
            &mut c,
        );
        assert_eq!(st, StrakeStatus::Ok);
    }
    let exact = 2.0 * std::f64::consts::PI * r;
    let tol = 1e-11;
    // Without the lines the kinks are integrated across: short by ~2.4e-8 whatever the
    // tolerance (measured; the reason for this call).
    let before = (arc(s, c, tol) - exact).abs() / exact;
    assert!(
        before > 1e-9,
        "relative error {before:e} without knot lines"
    );
    // SAFETY: live handle, 3 readable doubles, no v lines.
    let st = unsafe { strake_surface_set_knot_lines(s, lines_u.as_ptr(), 3, std::ptr::null(), 0) };
    assert_eq!(st, StrakeStatus::Ok);
    let after = (arc(s, c, tol) - exact).abs() / exact;
    assert!(after <= tol, "relative error {after:e} with knot lines");

    // Refusals leave the handle as it was.
    let bad_order = [0.5, 0.25];
    let outside = [0.0];
    let nan = [f64::NAN];
    // SAFETY: as above; each list holds the count given.
    unsafe {
        expect(
            strake_surface_set_knot_lines(s, bad_order.as_ptr(), 2, std::ptr::null(), 0),
            StrakeStatus::InvalidArgument,
            &["u_lines[1] = 0.25", "strictly ascending"],
        );
        expect(
            strake_surface_set_knot_lines(s, std::ptr::null(), 0, outside.as_ptr(), 1),
            StrakeStatus::InvalidArgument,
            &["v_lines[0] = 0", "strictly inside the domain"],
        );
        expect(
            strake_surface_set_knot_lines(s, nan.as_ptr(), 1, std::ptr::null(), 0),
            StrakeStatus::NonFinite,
            &["u_lines"],
        );
        expect(
            strake_surface_set_knot_lines(s, std::ptr::null(), 2, std::ptr::null(), 0),
            StrakeStatus::NullPointer,
            &["u_lines"],
        );
        expect(
            strake_surface_set_knot_lines(
                std::ptr::null_mut(),
                std::ptr::null(),
                0,
                std::ptr::null(),
                0,
            ),
            StrakeStatus::NullPointer,
            &["surface"],
        );
    }
    let still = (arc(s, c, tol) - exact).abs() / exact;
    assert!(still <= tol, "the refusals changed the handle: {still:e}");
    // Counts of 0 go back to what the callback surface knows: nothing.
    // SAFETY: live handle, empty lists.
    let st = unsafe { strake_surface_set_knot_lines(s, std::ptr::null(), 0, std::ptr::null(), 0) };
    assert_eq!(st, StrakeStatus::Ok);
    let again = (arc(s, c, tol) - exact).abs() / exact;
    assert!(again > 1e-9);
    // SAFETY: handles made above, freed once.
    unsafe {
        strake_surface_free(s);
        strake_curve_free(c);
    }
}
