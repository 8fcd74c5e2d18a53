//! Property tests of the Darboux frame over generated surfaces and curves: invariance under rigid
//! motions and reparametrisation, the documented sign flips, and the textbook identities.
//!
//! Surfaces: random Monge patches z = f(x, y) with quadratic and cubic f, and random polynomial
//! patches S(u, v) of total degree 3 in each coordinate, evaluated at a random (u, v) in [−1, 1]²
//! with exact (analytic) partial derivatives, then moved by a random rotation and translation.
//! Curves: random curve jets (u', v', u'', v''). Domains: u, v extents 2, t extent 1.
//!
//! Tolerances. docs/accuracy.md measures the error of κn, κg, τg, k1, k2 against exact values:
//! with jets that carry ε-sized rounding errors, at most about 7 ε / c² relative to the point's
//! curvature scale, c the surface conditioning figure (the curve term is negligible for the
//! speed figures generated here, ≥ 0.1). A property compares two evaluations (or one against an
//! identity assembled from several results), so each side contributes; the tolerance is
//! 64 ε / c² times the curvature scale max(|k1|, |k2|, κ): twice the measured bound for two
//! sides, with a further factor of about 4 for the spread of random inputs. Samples with
//! c < 0.05 are discarded with `prop_assume` (they would need a looser, still predictable,
//! tolerance: docs/accuracy.md). Unit vectors are compared componentwise with the same relative
//! tolerance (their scale is 1).

use proptest::prelude::*;
use proptest::test_runner::RngSeed;
use strake::geometry::math::vec3;
use strake::{
    CurveJet, DarbouxFrame, Orientation, ParamScales, SurfaceJet, Vec3, darboux_frame,
    principal_angle,
};

const EPS: f64 = f64::EPSILON;
const MIN_CONDITIONING: f64 = 0.05;
const SCALES: ParamScales = ParamScales {
    u_extent: 2.0,
    v_extent: 2.0,
    t_extent: 1.0,
};

/// A polynomial surface: each coordinate Σ c_k m_k(u, v) over the ten monomials of total degree
/// ≤ 3, in the order 1, u, v, u², uv, v², u³, u²v, uv², v³.
#[derive(Debug, Clone)]
struct PolySurface {
    c: [[f64; 10]; 3],
}

impl PolySurface {
    fn jet(&self, u: f64, v: f64) -> SurfaceJet {
        let m = [
            1.0,
            u,
            v,
            u * u,
            u * v,
            v * v,
            u * u * u,
            u * u * v,
            u * v * v,
            v * v * v,
        ];
        let mu = [
            0.0,
            1.0,
            0.0,
            2.0 * u,
            v,
            0.0,
            3.0 * u * u,
            2.0 * u * v,
            v * v,
            0.0,
        ];
        let mv = [
            0.0,
            0.0,
            1.0,
            0.0,
            u,
            2.0 * v,
            0.0,
            u * u,
            2.0 * u * v,
            3.0 * v * v,
        ];
        let muu = [0.0, 0.0, 0.0, 2.0, 0.0, 0.0, 6.0 * u, 2.0 * v, 0.0, 0.0];
        let muv = [0.0, 0.0, 0.0, 0.0, 1.0, 0.0, 0.0, 2.0 * u, 2.0 * v, 0.0];
        let mvv = [0.0, 0.0, 0.0, 0.0, 0.0, 2.0, 0.0, 0.0, 2.0 * u, 6.0 * v];
        let eval = |basis: &[f64; 10]| {
            let coord = |i: usize| self.c[i].iter().zip(basis).map(|(a, b)| a * b).sum::<f64>();
            vec3([coord(0), coord(1), coord(2)])
        };
        SurfaceJet {
            p: eval(&m),
            su: eval(&mu),
            sv: eval(&mv),
            suu: eval(&muu),
            suv: eval(&muv),
            svv: eval(&mvv),
        }
    }
}

/// A rigid motion x ↦ R x + d (R a rotation).
#[derive(Debug, Clone)]
struct Motion {
    r: nalgebra::Rotation3<f64>,
    d: Vec3,
}

impl Motion {
    fn apply(&self, j: &SurfaceJet) -> SurfaceJet {
        let r = &self.r;
        SurfaceJet {
            p: r * j.p + self.d,
            su: r * j.su,
            sv: r * j.sv,
            suu: r * j.suu,
            suv: r * j.suv,
            svv: r * j.svv,
        }
    }
}

fn coef() -> impl Strategy<Value = f64> {
    -1.0f64..1.0
}

/// Monge patch (u, v, f(u, v)) with f quadratic plus cubic, or a general cubic patch.
fn surface() -> impl Strategy<Value = PolySurface> {
    let monge = prop::array::uniform10(coef()).prop_map(|z| {
        let mut c = [[0.0; 10]; 3];
        c[0][1] = 1.0;
        c[1][2] = 1.0;
        c[2] = z;
        PolySurface { c }
    });
    let general =
        prop::array::uniform3(prop::array::uniform10(coef())).prop_map(|c| PolySurface { c });
    prop_oneof![monge, general]
}

fn motion() -> impl Strategy<Value = Motion> {
    (
        prop::array::uniform3(-1.0f64..1.0),
        -3.2f64..3.2,
        prop::array::uniform3(-10.0f64..10.0),
    )
        .prop_filter_map("rotation axis too short", |(axis, angle, d)| {
            let a = vec3(axis);
            (a.norm() > 0.1).then(|| Motion {
                r: nalgebra::Rotation3::from_axis_angle(&nalgebra::Unit::new_normalize(a), angle),
                d: vec3(d),
            })
        })
}

/// A point (u, v) and a curve jet through it with parameter speed hypot(u', v') ≥ 0.2.
fn curve() -> impl Strategy<Value = CurveJet> {
    (
        coef(),
        coef(),
        -2.0f64..2.0,
        -2.0f64..2.0,
        -3.0f64..3.0,
        -3.0f64..3.0,
    )
        .prop_filter_map("curve too slow", |(u, v, du, dv, ddu, ddv)| {
            (du.hypot(dv) >= 0.2).then_some(CurveJet {
                u,
                v,
                du,
                dv,
                ddu,
                ddv,
            })
        })
}

fn config() -> ProptestConfig {
    let base = ProptestConfig::default();
    // A fixed seed keeps `cargo test` reproducible; PROPTEST_RNG_SEED overrides it to explore.
    let seed = if std::env::var_os("PROPTEST_RNG_SEED").is_some() {
        base.rng_seed
    } else {
        RngSeed::Fixed(0x5742_4b45)
    };
    // PROPTEST_CASES overrides the number of cases.
    let cases = if std::env::var_os("PROPTEST_CASES").is_some() {
        base.cases
    } else {
        1000
    };
    ProptestConfig {
        cases,
        failure_persistence: None,
        rng_seed: seed,
        ..base
    }
}

/// Evaluates, discarding near-degenerate samples (see the module docs).
fn frame(
    jet: &SurfaceJet,
    cj: &CurveJet,
    o: Orientation,
    scales: &ParamScales,
) -> Result<DarbouxFrame, TestCaseError> {
    match darboux_frame(jet, cj, o, scales, 0.0) {
        Ok(f) if f.conditioning.surface >= MIN_CONDITIONING => Ok(f),
        Ok(_) | Err(strake::StrakeError::DegenerateSurface { .. }) => {
            Err(TestCaseError::reject("surface conditioning below 0.05"))
        }
        Err(e) => Err(TestCaseError::fail(format!("unexpected error: {e}"))),
    }
}

/// c' and c'' of the space curve, from the jets.
fn space_derivs(jet: &SurfaceJet, cj: &CurveJet) -> (Vec3, Vec3) {
    let c1 = jet.su * cj.du + jet.sv * cj.dv;
    let c2 = jet.suu * (cj.du * cj.du)
        + jet.suv * (2.0 * cj.du * cj.dv)
        + jet.svv * (cj.dv * cj.dv)
        + jet.su * cj.ddu
        + jet.sv * cj.ddv;
    (c1, c2)
}

/// Absolute tolerance for curvature-like results of `f`, evaluated from `jet` and `cj` (see the
/// module docs): 64 ε / c² times the curvature scale, plus the curve term of docs/accuracy.md,
/// an absolute error of about ε |c''| / |c'|² in κg where the tangential part of c'' cancels.
fn tol(f: &DarbouxFrame, jet: &SurfaceJet, cj: &CurveJet) -> f64 {
    let c = f.conditioning.surface;
    let kappa = f.normal_curvature.hypot(f.geodesic_curvature);
    let scale = f.principal.k1.abs().max(f.principal.k2.abs()).max(kappa);
    let (c1, c2) = space_derivs(jet, cj);
    64.0 * EPS / (c * c) * scale + 16.0 * EPS * c2.norm() / c1.norm_squared()
}

/// Relative tolerance for unit vectors of `f`.
fn vtol(f: &DarbouxFrame) -> f64 {
    let c = f.conditioning.surface;
    64.0 * EPS / (c * c)
}

macro_rules! close {
    ($a:expr, $b:expr, $tol:expr, $what:expr) => {{
        let (a, b, t): (f64, f64, f64) = ($a, $b, $tol);
        prop_assert!(
            (a - b).abs() <= t,
            "{}: {} vs {} (diff {:.3e}, tol {:.3e})",
            $what,
            a,
            b,
            (a - b).abs(),
            t
        );
    }};
}

macro_rules! close_vec {
    ($a:expr, $b:expr, $tol:expr, $what:expr) => {{
        let (a, b, t): (Vec3, Vec3, f64) = ($a, $b, $tol);
        let d = (a - b).amax();
        prop_assert!(
            d <= t,
            "{}: {:?} vs {:?} (diff {:.3e}, tol {:.3e})",
            $what,
            a,
            b,
            d,
            t
        );
    }};
}

/// (a, b) with x = a Su + b Sv for a tangent vector x, by Cramer's rule on the Gram system.
fn uv_components(jet: &SurfaceJet, x: &Vec3) -> (f64, f64) {
    let (e, f, g) = (
        jet.su.dot(&jet.su),
        jet.su.dot(&jet.sv),
        jet.sv.dot(&jet.sv),
    );
    let (p, q) = (x.dot(&jet.su), x.dot(&jet.sv));
    let det = e * g - f * f;
    ((g * p - f * q) / det, (e * q - f * p) / det)
}

proptest! {
    #![proptest_config(config())]

    /// A rigid motion of the surface leaves κn, κg, τg, k1, k2 unchanged and rotates T, B, N
    /// (they are invariants of the Euclidean geometry; do Carmo §3-2, §4-2 [memory]).
    #[test]
    fn rigid_motion_invariance(s in surface(), m in motion(), cj in curve()) {
        let jet = s.jet(cj.u, cj.v);
        let a = frame(&jet, &cj, Orientation::Forward, &SCALES)?;
        let moved = m.apply(&jet);
        let b = frame(&moved, &cj, Orientation::Forward, &SCALES)?;
        let t = tol(&a, &jet, &cj) + tol(&b, &moved, &cj);
        close!(a.normal_curvature, b.normal_curvature, t, "kn");
        close!(a.geodesic_curvature, b.geodesic_curvature, t, "kg");
        close!(a.geodesic_torsion, b.geodesic_torsion, t, "tg");
        close!(a.principal.k1, b.principal.k1, t, "k1");
        close!(a.principal.k2, b.principal.k2, t, "k2");
        let vt = vtol(&a) + vtol(&b);
        close_vec!(m.r * a.t, b.t, vt, "T");
        close_vec!(m.r * a.b, b.b, vt, "B");
        close_vec!(m.r * a.n, b.n, vt, "N");
        // The conditioning figures depend only on lengths and angles.
        close!(a.conditioning.surface, b.conditioning.surface, 1e-12 * a.conditioning.surface, "surface figure");
    }

    /// t ↦ a t + b (a > 0) scales (u', v') by a and (u'', v'') by a²; the frame and invariants do
    /// not change (they are functions of arc length; do Carmo §1-3, §3-2). With the t extent
    /// divided by a the speed figure does not change either.
    #[test]
    fn linear_reparametrisation_invariance(s in surface(), cj in curve(), a in 0.1f64..10.0) {
        let jet = s.jet(cj.u, cj.v);
        let f = frame(&jet, &cj, Orientation::Forward, &SCALES)?;
        let cj2 = CurveJet { du: a * cj.du, dv: a * cj.dv, ddu: a * a * cj.ddu, ddv: a * a * cj.ddv, ..cj };
        let scales2 = ParamScales { t_extent: SCALES.t_extent / a, ..SCALES };
        let g = frame(&jet, &cj2, Orientation::Forward, &scales2)?;
        let t = tol(&f, &jet, &cj) + tol(&g, &jet, &cj2);
        close!(f.normal_curvature, g.normal_curvature, t, "kn");
        close!(f.geodesic_curvature, g.geodesic_curvature, t, "kg");
        close!(f.geodesic_torsion, g.geodesic_torsion, t, "tg");
        let vt = vtol(&f) + vtol(&g);
        close_vec!(f.t, g.t, vt, "T");
        close_vec!(f.b, g.b, vt, "B");
        close!(f.speed * a, g.speed, 1e-14 * g.speed, "speed");
        close!(f.conditioning.curve, g.conditioning.curve, 1e-14 * f.conditioning.curve, "speed figure");
    }

    /// A local nonlinear reparametrisation t = s + c s² at s0 (orientation kept: 1 + 2 c s0 > 0):
    /// by the chain rule ũ' = u' σ, ũ'' = u'' σ² + u' · 2c with σ = 1 + 2 c s0. The added
    /// acceleration is tangent, so the invariants do not change (do Carmo §1-3, §3-2).
    #[test]
    fn quadratic_reparametrisation_invariance(
        s in surface(), cj in curve(), c in -1.0f64..1.0, s0 in -0.3f64..0.3
    ) {
        let jet = s.jet(cj.u, cj.v);
        let f = frame(&jet, &cj, Orientation::Forward, &SCALES)?;
        let sigma = 1.0 + 2.0 * c * s0;
        let cj2 = CurveJet {
            du: cj.du * sigma,
            dv: cj.dv * sigma,
            ddu: cj.ddu * sigma * sigma + cj.du * 2.0 * c,
            ddv: cj.ddv * sigma * sigma + cj.dv * 2.0 * c,
            ..cj
        };
        let g = frame(&jet, &cj2, Orientation::Forward, &SCALES)?;
        // The tangential term 2c u' enters κg through the cancellation covered by the curve
        // term of tol (ε |c''| / |c'|²).
        let t = tol(&f, &jet, &cj) + tol(&g, &jet, &cj2);
        close!(f.normal_curvature, g.normal_curvature, t, "kn");
        close!(f.geodesic_curvature, g.geodesic_curvature, t, "kg");
        close!(f.geodesic_torsion, g.geodesic_torsion, t, "tg");
        close_vec!(f.t, g.t, vtol(&f) + vtol(&g), "T");
    }

    /// Reversing the normal flips κn and κg, not τg; k1, k2 become −k2, −k1; N and B flip, T
    /// stays (REFERENCES.md "What flips"; do Carmo §3-2).
    #[test]
    fn reversed_normal_flips(s in surface(), cj in curve()) {
        let jet = s.jet(cj.u, cj.v);
        let f = frame(&jet, &cj, Orientation::Forward, &SCALES)?;
        let g = frame(&jet, &cj, Orientation::Reversed, &SCALES)?;
        let t = tol(&f, &jet, &cj) + tol(&g, &jet, &cj);
        close!(f.normal_curvature, -g.normal_curvature, t, "kn");
        close!(f.geodesic_curvature, -g.geodesic_curvature, t, "kg");
        close!(f.geodesic_torsion, g.geodesic_torsion, t, "tg");
        close!(f.principal.k1, -g.principal.k2, t, "k1");
        close!(f.principal.k2, -g.principal.k1, t, "k2");
        close!(f.principal.gaussian, g.principal.gaussian, t * f.principal.k1.abs().max(f.principal.k2.abs()) + 1e-300, "K");
        close_vec!(f.n, -g.n, 4.0 * EPS, "N");
        close_vec!(f.b, -g.b, 4.0 * EPS, "B");
        close_vec!(f.t, g.t, 0.0, "T");
    }

    /// Reversing the direction of travel (t ↦ −t: u' flips, u'' does not) flips κg only; T and
    /// B flip, N stays (REFERENCES.md "What flips"; do Carmo §3-2).
    #[test]
    fn reversed_travel_flips(s in surface(), cj in curve()) {
        let jet = s.jet(cj.u, cj.v);
        let f = frame(&jet, &cj, Orientation::Forward, &SCALES)?;
        let back = CurveJet { du: -cj.du, dv: -cj.dv, ..cj };
        let g = frame(&jet, &back, Orientation::Forward, &SCALES)?;
        let t = tol(&f, &jet, &cj) + tol(&g, &jet, &back);
        close!(f.normal_curvature, g.normal_curvature, t, "kn");
        close!(f.geodesic_curvature, -g.geodesic_curvature, t, "kg");
        close!(f.geodesic_torsion, g.geodesic_torsion, t, "tg");
        close_vec!(f.t, -g.t, 0.0, "T");
        close_vec!(f.b, -g.b, 0.0, "B");
        close_vec!(f.n, g.n, 0.0, "N");
    }

    /// κ² = κn² + κg², with κ = |c' × c''| / |c'|³ from the space curve (Frenet; do Carmo §1-5,
    /// §3-2), computed here from the jets without the library.
    #[test]
    fn curvature_splits_into_normal_and_geodesic(s in surface(), cj in curve()) {
        let jet = s.jet(cj.u, cj.v);
        let f = frame(&jet, &cj, Orientation::Forward, &SCALES)?;
        let (c1, c2) = space_derivs(&jet, &cj);
        let kappa = c1.cross(&c2).norm() / c1.norm().powi(3);
        let split = f.normal_curvature.hypot(f.geodesic_curvature);
        close!(kappa, split, 2.0 * tol(&f, &jet, &cj), "kappa");
    }

    /// Euler's formula with θ the angle from d1 to T: κn = k1 cos²θ + k2 sin²θ and
    /// τg = (k2 − k1) sin θ cos θ (do Carmo §3-2; REFERENCES.md).
    #[test]
    fn euler_formula(s in surface(), cj in curve()) {
        let jet = s.jet(cj.u, cj.v);
        let f = frame(&jet, &cj, Orientation::Forward, &SCALES)?;
        let (k1, k2) = (f.principal.k1, f.principal.k2);
        let (sn, cs) = principal_angle(&f).sin_cos();
        let t = tol(&f, &jet, &cj);
        close!(f.normal_curvature, k1 * cs * cs + k2 * sn * sn, t, "kn");
        close!(f.geodesic_torsion, (k2 - k1) * sn * cs, t, "tg");
    }

    /// κn(T) + κn(B) = k1 + k2 = 2H (do Carmo §3-2, exercise; REFERENCES.md), with κn(B) the
    /// normal curvature of a curve leaving the point along B.
    #[test]
    fn normal_curvatures_of_orthogonal_directions_sum_to_trace(s in surface(), cj in curve()) {
        let jet = s.jet(cj.u, cj.v);
        let f = frame(&jet, &cj, Orientation::Forward, &SCALES)?;
        let (bu, bv) = uv_components(&jet, &f.b);
        let along_b = CurveJet { du: bu, dv: bv, ddu: 0.0, ddv: 0.0, ..cj };
        let g = darboux_frame(&jet, &along_b, Orientation::Forward, &ParamScales { t_extent: 1e6, ..SCALES }, 0.0)
            .map_err(|e| TestCaseError::fail(format!("{e}")))?;
        let t = tol(&f, &jet, &cj) + tol(&g, &jet, &along_b);
        close!(f.normal_curvature + g.normal_curvature, f.principal.k1 + f.principal.k2, t, "kn(T) + kn(B)");
        close!(f.principal.mean * 2.0, f.principal.k1 + f.principal.k2, t, "2H");
    }

    /// Along a principal direction τg = 0 and κn is that principal curvature (Rodrigues; do
    /// Carmo §3-2).
    #[test]
    fn principal_directions_have_no_geodesic_torsion(s in surface(), cj in curve()) {
        let jet = s.jet(cj.u, cj.v);
        let f = frame(&jet, &cj, Orientation::Forward, &SCALES)?;
        let wide = ParamScales { t_extent: 1e6, ..SCALES };
        for (d, k, name) in [(f.principal.d1, f.principal.k1, "d1"), (f.principal.d2, f.principal.k2, "d2")] {
            let (du, dv) = uv_components(&jet, &d);
            let along = CurveJet { du, dv, ..cj };
            let g = darboux_frame(&jet, &along, Orientation::Forward, &wide, 0.0)
                .map_err(|e| TestCaseError::fail(format!("{e}")))?;
            let t = tol(&f, &jet, &cj) + tol(&g, &jet, &along);
            close!(g.geodesic_torsion, 0.0, t, format!("tg along {name}"));
            close!(g.normal_curvature, k, t, format!("kn along {name}"));
        }
    }

    /// (T, B, N) is orthonormal and right-handed (T × B = N), N = Su × Sv / |Su × Sv|, and the
    /// principal directions with N form a right-handed orthonormal frame too (DESIGN.md
    /// conventions; common practice).
    #[test]
    fn frame_is_orthonormal_and_right_handed(s in surface(), m in motion(), cj in curve()) {
        let jet = m.apply(&s.jet(cj.u, cj.v));
        let f = frame(&jet, &cj, Orientation::Forward, &SCALES)?;
        let e = 8.0 * EPS;
        for (v, name) in [(f.t, "T"), (f.b, "B"), (f.n, "N"), (f.principal.d1, "d1"), (f.principal.d2, "d2")] {
            close!(v.norm(), 1.0, e, format!("|{name}|"));
        }
        close!(f.t.dot(&f.b), 0.0, e, "T.B");
        close!(f.t.dot(&f.n), 0.0, vtol(&f), "T.N");
        close!(f.b.dot(&f.n), 0.0, e, "B.N");
        close_vec!(f.t.cross(&f.b), f.n, e, "T x B = N");
        close_vec!(f.principal.d1.cross(&f.principal.d2), f.n, e, "d1 x d2 = N");
        let cross = jet.su.cross(&jet.sv);
        close_vec!(cross / cross.norm(), f.n, e, "N = Su x Sv / |Su x Sv|");
    }
}
