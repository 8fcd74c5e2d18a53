//! Identities of curves on surfaces, checked on varied deterministic inputs (a torus, a cubic
//! Monge patch and a skewed parametrisation of a quadric, with pseudo-random curve jets).
//!
//! Sources: do Carmo, *Differential Geometry of Curves and Surfaces* (1976): §1-5 (Frenet
//! curvature κ = |c' × c''|/|c'|³), §3-2 (κn, Meusnier, κ² = κn² + κg² since the curvature
//! vector lies in the plane of B and N), §3-2 Euler's formula, §3-3 (k1 + k2 = 2H); geodesic
//! torsion: τg = (k2 − k1) sin θ cos θ and τg(B) = −τg(T) (REFERENCES.md). Flips under a reversed
//! normal and reversed travel: DESIGN.md conventions, derived from B = N × T.

use strake::analytic::{monge, torus};
use strake::{
    CurveJet, DarbouxFrame, DerivOrder, Orientation, ParamScales, SurfaceHint, SurfaceJet,
    SurfacePoint, SurfaceSource, darboux_frame, principal_angle,
};

#[path = "support/lcg.rs"]
mod lcg;
use lcg::Lcg;

/// (surface jet, scales) samples from three surfaces at pseudo-random points.
fn samples() -> Vec<(SurfaceJet, ParamScales, f64, f64)> {
    let mut rng = Lcg(12345);
    let mut out = Vec::new();
    let tor = torus(3.0, 1.1);
    let cubic = monge((-2.0, 2.0), (-2.0, 2.0), |x, y| {
        [
            0.3 * x * x * x - 0.4 * x * y * y + 0.2 * y * y + 0.1 * x * y,
            0.9 * x * x - 0.4 * y * y + 0.1 * y,
            -0.8 * x * y + 0.4 * y + 0.1 * x,
            1.8 * x,
            -0.8 * y + 0.1,
            -0.8 * x + 0.4,
        ]
    });
    // The paraboloid z = x² + y²/2 seen through the skewed parameters x = u + 0.7 v, y = 0.4 v.
    let skew = strake::FnSurface::new(
        strake::Interval::new("u", -2.0, 2.0).unwrap(),
        strake::Interval::new("v", -2.0, 2.0).unwrap(),
        Orientation::Forward,
        |u: f64, v: f64, _| {
            let (x, y) = (u + 0.7 * v, 0.4 * v);
            let (zx, zy) = (2.0 * x, y);
            let (zxx, zyy) = (2.0, 1.0);
            // Chain rule with x_u = 1, x_v = 0.7, y_u = 0, y_v = 0.4.
            let zu = zx;
            let zv = 0.7 * zx + 0.4 * zy;
            let zuu = zxx;
            let zuv = 0.7 * zxx;
            let zvv = 0.49 * zxx + 0.16 * zyy;
            Ok(SurfaceJet {
                p: strake::Vec3::new(x, y, x * x + 0.5 * y * y),
                su: strake::Vec3::new(1.0, 0.0, zu),
                sv: strake::Vec3::new(0.7, 0.4, zv),
                suu: strake::Vec3::new(0.0, 0.0, zuu),
                suv: strake::Vec3::new(0.0, 0.0, zuv),
                svv: strake::Vec3::new(0.0, 0.0, zvv),
            })
        },
    );
    let surfaces: [&dyn SurfaceSource; 3] = [&tor, &cubic, &skew];
    for s in surfaces {
        let (ud, vd) = (s.u_domain(), s.v_domain());
        let scales = ParamScales {
            u_extent: ud.width(),
            v_extent: vd.width(),
            t_extent: 1.0,
        };
        for _ in 0..40 {
            let u = rng.range(ud.lo, ud.hi);
            let v = rng.range(vd.lo, vd.hi);
            let jet = s
                .checked_jet(u, v, DerivOrder::Second, &mut SurfaceHint::default())
                .unwrap();
            out.push((jet, scales, u, v));
        }
    }
    out
}

fn curve_jets(u: f64, v: f64, rng: &mut Lcg) -> Vec<CurveJet> {
    (0..5)
        .map(|_| CurveJet {
            u,
            v,
            du: rng.range(-1.0, 1.0),
            dv: rng.range(-1.0, 1.0),
            ddu: rng.range(-2.0, 2.0),
            ddv: rng.range(-2.0, 2.0),
        })
        .filter(|j| j.du.hypot(j.dv) > 0.05)
        .collect()
}

fn frame(s: &SurfaceJet, c: &CurveJet, o: Orientation, sc: &ParamScales) -> DarbouxFrame {
    darboux_frame(s, c, o, sc, 0.0).unwrap()
}

/// Tolerance on a curvature-like quantity: 1e-12 of the largest curvature in play.
fn tol(f: &DarbouxFrame) -> f64 {
    let scale = [
        f.normal_curvature,
        f.geodesic_curvature,
        f.principal.k1,
        f.principal.k2,
    ]
    .iter()
    .fold(1e-3f64, |m, x| m.max(x.abs()));
    1e-12 * scale
}

#[test]
fn curvature_splits_into_normal_and_geodesic_parts() {
    let mut rng = Lcg(7);
    for (sj, sc, u, v) in samples() {
        for cj in curve_jets(u, v, &mut rng) {
            let f = frame(&sj, &cj, Orientation::Forward, &sc);
            // Frenet curvature of the space curve, do Carmo §1-5.
            let c1 = sj.su * cj.du + sj.sv * cj.dv;
            let c2 = sj.suu * (cj.du * cj.du)
                + sj.suv * (2.0 * cj.du * cj.dv)
                + sj.svv * (cj.dv * cj.dv)
                + sj.su * cj.ddu
                + sj.sv * cj.ddv;
            let kappa = c1.cross(&c2).norm() / c1.norm().powi(3);
            let split = f.normal_curvature.hypot(f.geodesic_curvature);
            assert!(
                (kappa - split).abs() <= 1e-12 * kappa.max(1e-3),
                "{kappa} vs {split}"
            );
        }
    }
}

#[test]
fn euler_formula_and_principal_sum() {
    let mut rng = Lcg(99);
    for (sj, sc, u, v) in samples() {
        let sp =
            SurfacePoint::new(&sj, Orientation::Forward, u, v, sc.u_extent, sc.v_extent).unwrap();
        for cj in curve_jets(u, v, &mut rng) {
            let f = frame(&sj, &cj, Orientation::Forward, &sc);
            let (k1, k2) = (f.principal.k1, f.principal.k2);
            let th = principal_angle(&f);
            let (s, c) = th.sin_cos();
            let t = tol(&f);
            assert!(
                (f.normal_curvature - (k1 * c * c + k2 * s * s)).abs() <= t,
                "Euler κn"
            );
            assert!(
                (f.geodesic_torsion - (k2 - k1) * s * c).abs() <= t,
                "Euler τg"
            );
            // κn(T) + κn(B) = k1 + k2 and τg(B) = −τg(T): a curve through the point along B.
            let (bu, bv) = sp.components(f.b.dot(&sj.su), f.b.dot(&sj.sv));
            let cb = CurveJet {
                u,
                v,
                du: bu,
                dv: bv,
                ddu: 0.0,
                ddv: 0.0,
            };
            let fb = frame(&sj, &cb, Orientation::Forward, &sc);
            assert!(
                (f.normal_curvature + fb.normal_curvature - (k1 + k2)).abs() <= t,
                "κn(T) + κn(B)"
            );
            assert!(
                (fb.geodesic_torsion + f.geodesic_torsion).abs() <= t,
                "τg(B) = −τg(T)"
            );
            // Along a principal direction τg = 0 (Rodrigues) and κn is that principal curvature.
            let (pu, pv) = sp.components(f.principal.d1.dot(&sj.su), f.principal.d1.dot(&sj.sv));
            let cp = CurveJet {
                u,
                v,
                du: pu,
                dv: pv,
                ddu: cj.ddu,
                ddv: cj.ddv,
            };
            let fp = frame(&sj, &cp, Orientation::Forward, &sc);
            assert!(
                fp.geodesic_torsion.abs() <= t,
                "τg along d1 = {}",
                fp.geodesic_torsion
            );
            assert!((fp.normal_curvature - k1).abs() <= t, "κn along d1");
        }
    }
}

#[test]
fn frame_is_orthonormal_and_right_handed() {
    let mut rng = Lcg(3);
    for (sj, sc, u, v) in samples() {
        for cj in curve_jets(u, v, &mut rng) {
            for o in [Orientation::Forward, Orientation::Reversed] {
                let f = frame(&sj, &cj, o, &sc);
                for (a, b, d) in [
                    (f.t, f.t, 1.0),
                    (f.b, f.b, 1.0),
                    (f.n, f.n, 1.0),
                    (f.t, f.b, 0.0),
                    (f.t, f.n, 0.0),
                    (f.b, f.n, 0.0),
                ] {
                    assert!((a.dot(&b) - d).abs() <= 4e-16 * 4.0);
                }
                assert!((f.t.cross(&f.b) - f.n).norm() <= 1e-15);
                assert!((f.principal.d1.cross(&f.principal.d2) - f.n).norm() <= 1e-15);
            }
        }
    }
}

#[test]
fn flips_under_reversed_normal_and_reversed_travel() {
    let mut rng = Lcg(11);
    for (sj, sc, u, v) in samples() {
        for cj in curve_jets(u, v, &mut rng) {
            let f = frame(&sj, &cj, Orientation::Forward, &sc);
            let t = tol(&f);
            // Reversed normal: κn and κg flip, τg does not; k1, k2 swap roles and flip sign.
            let r = frame(&sj, &cj, Orientation::Reversed, &sc);
            assert!((r.normal_curvature + f.normal_curvature).abs() <= t);
            assert!((r.geodesic_curvature + f.geodesic_curvature).abs() <= t);
            assert!((r.geodesic_torsion - f.geodesic_torsion).abs() <= t);
            assert!((r.principal.k1 + f.principal.k2).abs() <= t);
            assert!((r.principal.k2 + f.principal.k1).abs() <= t);
            assert!((r.n + f.n).norm() <= 1e-15 && (r.b + f.b).norm() <= 1e-15);
            // Reversed travel (t -> −t: first derivatives flip, second do not): κg flips only.
            let back = CurveJet {
                du: -cj.du,
                dv: -cj.dv,
                ..cj
            };
            let b = frame(&sj, &back, Orientation::Forward, &sc);
            assert!((b.normal_curvature - f.normal_curvature).abs() <= t);
            assert!((b.geodesic_curvature + f.geodesic_curvature).abs() <= t);
            assert!((b.geodesic_torsion - f.geodesic_torsion).abs() <= t);
            assert!((b.t + f.t).norm() <= 1e-15);
        }
    }
}
