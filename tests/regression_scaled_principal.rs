//! Regression: principal curvatures at extreme but finite scales under/overflowed inside the
//! eigen-solve: curvatures near 1e-170 squared to 0 (an umbilic reported where there is none),
//! near 1e155 the eigenvector's squared length overflowed (a zero principal direction under
//! OK). The solve now scales by a power of two first where the squares would leave the safe
//! range; the batch kernel sends such points to the one-point path, bit for bit the same.

use strake::geometry::frame::darboux_frame;
use strake::{CurveJet, Orientation, ParamScales, SurfaceJet, Vec3, darboux_frames};

/// z = (a x² + b y²)/2 at the origin: principal curvatures a and b (exact: do Carmo §3-3 with
/// E = G = 1, F = 0, L = a, N = b).
fn jet(a: f64, b: f64) -> SurfaceJet {
    SurfaceJet {
        p: Vec3::zeros(),
        su: Vec3::new(1.0, 0.0, 0.0),
        sv: Vec3::new(0.0, 1.0, 0.0),
        suu: Vec3::new(0.0, 0.0, a),
        suv: Vec3::zeros(),
        svv: Vec3::new(0.0, 0.0, b),
    }
}

#[test]
fn principal_curvatures_of_surfaces_scaled_by_1e150_are_exact_and_unit() {
    let cj = CurveJet {
        u: 0.0,
        v: 0.0,
        du: 0.6,
        dv: 0.8,
        ddu: 0.0,
        ddv: 0.0,
    };
    for s in [1e-170, 1e-160, 1e-150, 1.0, 1e150, 1e153] {
        let (a, b) = (2.0 * s, 0.5 * s);
        // A patch of size 1/s where the curvature is s > 1 (so that it is not nearly
        // collapsed relative to its own domain), of size 1 otherwise.
        let w = if s > 1.0 { 1.0 / s } else { 1.0 };
        let scales = ParamScales {
            u_extent: w,
            v_extent: w,
            t_extent: 1.0,
        };
        let f = darboux_frame(&jet(a, b), &cj, Orientation::Forward, &scales, 0.0)
            .unwrap_or_else(|e| panic!("scale {s:e}: {e}"));
        let p = f.principal;
        assert!(
            (p.k1 - a).abs() <= 4.0 * f64::EPSILON * a,
            "scale {s:e}: k1 {}",
            p.k1
        );
        assert!(
            (p.k2 - b).abs() <= 4.0 * f64::EPSILON * a,
            "scale {s:e}: k2 {}",
            p.k2
        );
        assert!(
            (p.d1.norm() - 1.0).abs() < 1e-15,
            "scale {s:e}: |d1| {}",
            p.d1.norm()
        );
        assert!(
            (p.d1.x.abs() - 1.0).abs() < 1e-15,
            "d1 along x at scale {s:e}"
        );
        // The batch path gives the same bits.
        let n = 5;
        let sj = vec![jet(a, b); n];
        let cjs = vec![cj; n];
        let mut out = vec![f; n];
        darboux_frames(
            &sj,
            &cjs,
            &[0.0; 5],
            Orientation::Forward,
            &scales,
            &mut out,
        )
        .unwrap();
        assert!(
            out.iter().all(|g| g.to_array() == f.to_array()),
            "scale {s:e}"
        );
    }
}
