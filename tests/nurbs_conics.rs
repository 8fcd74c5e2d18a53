//! Exact conics: NURBS cylinders, spheres and tori built from rational quadratic circles (both
//! the 9-point and the 7-point form, The NURBS Book 2nd ed. §7.5 and A7.1 p. 308; surfaces by
//! extrusion §8.3 and revolution A8.1 p. 346) reproduce the closed-form curvatures of the exact
//! surfaces (do Carmo, Differential Geometry of Curves and Surfaces, ch. 3) along iso-curves and
//! slanted lines in the parameter plane. (Section numbers of The NURBS Book: [memory].)
//!
//! The NURBS parametrisation is not proportional to angle or arc length, so expected values
//! are derived from the geometry of the point reached and the direction of travel, not from
//! the parameter:
//!
//! - Angle map of a rational quadratic arc (The NURBS Book §7.5: a circular arc of opening 2α is
//!   a rational quadratic Bézier with middle weight cos α). In local parameter s ∈ [0, 1] the
//!   angle from the arc's bisector is φ(s) = 2 atan(tan(α/2)(2s − 1)): derived here from the
//!   tangent half-angle form of the circle (cos φ, sin φ) = ((1 − τ²), 2τ)/(1 + τ²), τ = tan(φ/2),
//!   which is rational quadratic in τ and therefore in s when τ is linear in s; the symmetric
//!   rational quadratic through the same three control points with end weights 1 is unique. The
//!   tests check every NURBS point against this map before using it.
//! - All three surfaces are surfaces of revolution about z with profile (ρ(v), z(v)) and
//!   outward unit normal N = cos ψ ρ̂ + sin ψ ẑ (ψ: elevation of the normal). With the NURBS
//!   orientation Forward (Su × Sv, pointing outward for these builders) and the crate's sign
//!   (a curvature is positive where the surface bends toward N), the parallels and meridians are
//!   the lines of curvature (do Carmo §3-3, surfaces of revolution) with
//!   k_par = −cos ψ / ρ (Meusnier's theorem, do Carmo §3-2: the parallel has curvature 1/ρ
//!   toward the axis, whose component along N is −cos ψ) and
//!   k_mer = −1/R (sphere), −1/r (torus), 0 (cylinder).
//!   (Sphere: every point umbilic, |κn| = 1/R; torus: principal curvatures cos v/(R + r cos v)
//!   and 1/r up to sign, K = cos v/(r(R + r cos v)); cylinder: 1/R and 0 — REFERENCES.md.)
//! - With e_par = unit vector along increasing longitude, e_mer = N × e_par (unit meridian
//!   tangent toward increasing ψ) and T = cos a e_par + sin a e_mer (a read off the direction
//!   of travel): Euler's formula (do Carmo §3-2) κn = k_par cos²a + k_mer sin²a and
//!   τg = (k_mer − k_par) sin a cos a (REFERENCES.md, Euler, with e1 = e_par, e2 = N × e1).
//! - Geodesic curvature: a parallel travelled toward increasing longitude has κg = sin ψ / ρ
//!   (its curvature vector −ρ̂/ρ projected on B = N × T = e_mer = −sin ψ ρ̂ + cos ψ ẑ; for the
//!   sphere this is |κg| = cot φ / R at colatitude φ, for the torus |sin v|/(R + r cos v),
//!   REFERENCES.md); a meridian is a geodesic, κg = 0 (do Carmo §4-4). Along a slanted line
//!   κg = c''·B/|c'|² with c'' from the exact parametrisation (the analytic surface composed with
//!   the angle maps, differentiated by the chain rule), independent of the NURBS evaluator.

use std::f64::consts::{FRAC_PI_2, TAU};
use strake::curve::uv_line;
use strake::geometry::jet::{DerivOrder, SurfaceJet};
use strake::geometry::math::Vec3;
use strake::nurbs::conics::{self, CircleForm};
use strake::nurbs::{NurbsCurve, NurbsSurface, SpanHint};
use strake::paths::curve_on_surface::{CurveOnSurface, Hints};
use strake::surface::{CreaseFlags, KnotSide, KnotSides, SurfaceHint};

/// Angle map of a circle or arc made of equal rational quadratic arcs.
struct ArcMap {
    /// Parameter values of the arc ends: the distinct knots, as f64, as the builder stores them.
    breaks: Vec<f64>,
    /// Angle at parameter `breaks[0]`.
    start: f64,
    /// Opening angle 2α of each arc.
    arc: f64,
}

impl ArcMap {
    fn circle(form: CircleForm) -> Self {
        match form {
            CircleForm::NinePoint => ArcMap {
                breaks: vec![0.0, 0.25, 0.5, 0.75, 1.0],
                start: 0.0,
                arc: FRAC_PI_2,
            },
            CircleForm::SevenPoint => ArcMap {
                breaks: vec![0.0, 1.0 / 3.0, 2.0 / 3.0, 1.0],
                start: 0.0,
                arc: TAU / 3.0,
            },
        }
    }

    /// Meridian of the sphere: from −π/2 to π/2 in two quarter arcs.
    fn half_circle() -> Self {
        ArcMap {
            breaks: vec![0.0, 0.5, 1.0],
            start: -FRAC_PI_2,
            arc: FRAC_PI_2,
        }
    }

    /// (angle, d angle/du, d² angle/du²), from the arc that the span search picks: the last
    /// arc whose start is ≤ u (right-sided at a break), the last arc at the upper end.
    fn angle(&self, u: f64) -> (f64, f64, f64) {
        self.angle_sided(u, false)
    }

    /// As [`Self::angle`]; with `below`, at a break the arc that ends there (the side a curve
    /// moving toward decreasing u enters, which the library evaluates on: `surface::crease`).
    fn angle_sided(&self, u: f64, below: bool) -> (f64, f64, f64) {
        let n = self.breaks.len() - 1;
        let mut k = (0..n).rev().find(|&k| self.breaks[k] <= u).unwrap();
        if below && k > 0 && self.breaks[k] == u {
            k -= 1;
        }
        let len = self.breaks[k + 1] - self.breaks[k];
        let s = (u - self.breaks[k]) / len;
        let alpha = 0.5 * self.arc;
        let a = (0.5 * alpha).tan();
        let sig = 2.0 * s - 1.0;
        let q = 1.0 + a * a * sig * sig;
        let phi = 2.0 * (a * sig).atan();
        let d1 = 4.0 * a / (len * q);
        let d2 = -16.0 * a * a * a * sig / (len * len * q * q);
        (self.start + k as f64 * self.arc + alpha + phi, d1, d2)
    }
}

/// The meridian (profile) of a surface of revolution.
enum Profile {
    Sphere { r: f64, lat: ArcMap },
    Torus { big: f64, r: f64, psi: ArcMap },
    Cylinder { r: f64, z0: f64, z1: f64 },
}

/// Exact parametrisation S(u, v) = (ρ(v) cos θ(u), ρ(v) sin θ(u), z(v)) of a NURBS surface of
/// revolution, with its closed-form curvatures.
struct Model {
    name: String,
    theta: ArcMap,
    profile: Profile,
}

struct ModelPoint {
    jet: SurfaceJet,
    /// Outward unit normal.
    n: Vec3,
    /// Unit vector toward increasing longitude.
    e_par: Vec3,
    /// N × e_par.
    e_mer: Vec3,
    k_par: f64,
    k_mer: f64,
    /// Geodesic curvature of the parallel travelled toward increasing longitude.
    kg_par: f64,
}

impl Model {
    /// (ρ, z, ρ', z', ρ'', z'', ψ, k_mer) at v.
    fn profile(&self, v: f64, below: bool) -> [f64; 8] {
        match &self.profile {
            Profile::Sphere { r, lat } => {
                let (b, b1, b2) = lat.angle_sided(v, below);
                let (s, c) = b.sin_cos();
                [
                    r * c,
                    r * s,
                    -r * s * b1,
                    r * c * b1,
                    -r * (c * b1 * b1 + s * b2),
                    r * (-s * b1 * b1 + c * b2),
                    b,
                    -1.0 / r,
                ]
            }
            Profile::Torus { big, r, psi } => {
                let (p, p1, p2) = psi.angle_sided(v, below);
                let (s, c) = p.sin_cos();
                [
                    big + r * c,
                    r * s,
                    -r * s * p1,
                    r * c * p1,
                    -r * (c * p1 * p1 + s * p2),
                    r * (-s * p1 * p1 + c * p2),
                    p,
                    -1.0 / r,
                ]
            }
            Profile::Cylinder { r, z0, z1 } => {
                [*r, z0 + v * (z1 - z0), 0.0, z1 - z0, 0.0, 0.0, 0.0, 0.0]
            }
        }
    }

    /// The model at (u, v), on the arcs below the breaks where `below` says so.
    fn at(&self, u: f64, v: f64, below: (bool, bool)) -> ModelPoint {
        let (th, t1, t2) = self.theta.angle_sided(u, below.0);
        let [rho, z, r1, z1, r2, z2, psi, k_mer] = self.profile(v, below.1);
        let (s, c) = th.sin_cos();
        let e_par = Vec3::new(-s, c, 0.0);
        let radial = Vec3::new(c, s, 0.0);
        let up = Vec3::new(0.0, 0.0, 1.0);
        let jet = SurfaceJet {
            p: radial * rho + up * z,
            su: e_par * (t1 * rho),
            sv: radial * r1 + up * z1,
            suu: (e_par * t2 - radial * (t1 * t1)) * rho,
            suv: e_par * (t1 * r1),
            svv: radial * r2 + up * z2,
        };
        let (sp, cp) = psi.sin_cos();
        let n = radial * cp + up * sp;
        ModelPoint {
            jet,
            n,
            e_par,
            e_mer: n.cross(&e_par),
            k_par: -cp / rho,
            k_mer,
            kg_par: sp / rho,
        }
    }
}

fn sphere(r: f64, form: CircleForm) -> (NurbsSurface, Model) {
    let model = Model {
        name: format!("sphere R={r} {form:?}"),
        theta: ArcMap::circle(form),
        profile: Profile::Sphere {
            r,
            lat: ArcMap::half_circle(),
        },
    };
    (conics::sphere(r, form).unwrap(), model)
}

fn torus(big: f64, r: f64, form: CircleForm) -> (NurbsSurface, Model) {
    let model = Model {
        name: format!("torus R={big} r={r} {form:?}"),
        theta: ArcMap::circle(form),
        profile: Profile::Torus {
            big,
            r,
            psi: ArcMap::circle(form),
        },
    };
    (conics::torus(big, r, form).unwrap(), model)
}

fn cylinder(r: f64, z0: f64, z1: f64, form: CircleForm) -> (NurbsSurface, Model) {
    let model = Model {
        name: format!("cylinder R={r} {form:?}"),
        theta: ArcMap::circle(form),
        profile: Profile::Cylinder { r, z0, z1 },
    };
    (conics::cylinder(r, z0, z1, form).unwrap(), model)
}

#[derive(Clone, Copy, Debug, PartialEq)]
enum Line {
    /// v fixed, u increasing: a parallel.
    Parallel,
    /// u fixed: a meridian (or a generator of the cylinder).
    Meridian,
    /// Anything else.
    Slanted,
}

/// Parameters along a line: 41 even steps plus the knots 1/3 and 2/3 of the 7-point circle.
fn samples() -> Vec<f64> {
    let mut t: Vec<f64> = (0..=40).map(|i| i as f64 / 40.0).collect();
    t.extend([1.0 / 3.0, 2.0 / 3.0]);
    t
}

fn assert_close(what: &str, got: f64, want: f64, scale: f64, tol: f64, ctx: &str) {
    let err = (got - want).abs() / scale;
    assert!(
        err <= tol,
        "{ctx}: {what} = {got:e}, expected {want:e} (error {err:e} relative to {scale:e})"
    );
}

fn assert_vec_close(what: &str, got: &Vec3, want: &Vec3, scale: f64, tol: f64, ctx: &str) {
    let err = (got - want).norm() / scale;
    assert!(
        err <= tol,
        "{ctx}: {what} = {got:?}, expected {want:?} (error {err:e} relative to {scale:e})"
    );
}

/// Checks every frame along the line (u0, v0) → (u1, v1) against the closed forms. Returns
/// the number of points checked.
fn check_line(
    surf: &NurbsSurface,
    model: &Model,
    (u0, v0, u1, v1): (f64, f64, f64, f64),
    kind: Line,
) -> usize {
    const TOL: f64 = 1e-12;
    let line = uv_line(u0, v0, u1, v1).unwrap();
    let cos = CurveOnSurface::new(surf, &line);
    let mut hints = Hints::default();
    let (du, dv) = (u1 - u0, v1 - v0);
    let mut n = 0;
    for t in samples() {
        let ctx = format!(
            "{} line {kind:?} ({u0}, {v0})->({u1}, {v1}) t={t}",
            model.name
        );
        let (f, flags) = cos
            .frame_flagged(t, &mut hints)
            .unwrap_or_else(|e| panic!("{ctx}: {e}"));
        // On a knot line (the arcs of a circle meet at double knots, C0 in the parameter) the
        // frame is that of the side the line moves into (`surface::crease`).
        let below = (
            flags.has(CreaseFlags::U_LINE) && du < 0.0,
            flags.has(CreaseFlags::V_LINE) && dv < 0.0,
        );
        let m = model.at(f.u, f.v, below);
        let size = m.jet.p.norm().max(1.0);
        // The NURBS point and partials are those of the exact parametrisation.
        let side = |b: bool| if b { KnotSide::Below } else { KnotSide::Above };
        let sides = KnotSides {
            u: side(below.0),
            v: side(below.1),
        };
        let j = surf.jet_sided_unchecked(
            f.u,
            f.v,
            sides,
            DerivOrder::Second,
            &mut SurfaceHint::default(),
        );
        assert_vec_close("S", &j.p, &m.jet.p, size, TOL, &ctx);
        for (name, a, b) in [
            ("Su", j.su, m.jet.su),
            ("Sv", j.sv, m.jet.sv),
            ("Suu", j.suu, m.jet.suu),
            ("Suv", j.suv, m.jet.suv),
            ("Svv", j.svv, m.jet.svv),
        ] {
            let scale = m.jet.su.norm().max(m.jet.sv.norm()).max(b.norm());
            assert_vec_close(name, &a, &b, scale, TOL, &ctx);
        }
        // Direction of travel and frame, from the exact parametrisation.
        let c1 = m.jet.su * du + m.jet.sv * dv;
        let c2 = m.jet.suu * (du * du) + m.jet.suv * (2.0 * du * dv) + m.jet.svv * (dv * dv);
        let tan = c1.normalize();
        let b = m.n.cross(&tan);
        assert_vec_close("N", &f.n, &m.n, 1.0, TOL, &ctx);
        assert_vec_close("T", &f.t, &tan, 1.0, TOL, &ctx);
        assert_vec_close("B", &f.b, &b, 1.0, TOL, &ctx);

        let (ca, sa) = (tan.dot(&m.e_par), tan.dot(&m.e_mer));
        let kscale = m.k_par.abs().max(m.k_mer.abs());
        let kn = m.k_par * ca * ca + m.k_mer * sa * sa;
        let tg = (m.k_mer - m.k_par) * sa * ca;
        assert_close("kn", f.normal_curvature, kn, kscale, TOL, &ctx);
        assert_close("tg", f.geodesic_torsion, tg, kscale, TOL, &ctx);
        let (k1, k2) = (m.k_par.max(m.k_mer), m.k_par.min(m.k_mer));
        assert_close("k1", f.principal.k1, k1, kscale, TOL, &ctx);
        assert_close("k2", f.principal.k2, k2, kscale, TOL, &ctx);
        assert_close(
            "K",
            f.principal.gaussian,
            m.k_par * m.k_mer,
            kscale * kscale,
            TOL,
            &ctx,
        );
        let kg = match kind {
            Line::Parallel => m.kg_par * du.signum(),
            Line::Meridian => 0.0,
            Line::Slanted => c2.dot(&b) / c1.norm_squared(),
        };
        assert_close(
            "kg",
            f.geodesic_curvature,
            kg,
            kscale.max(kg.abs()),
            TOL,
            &ctx,
        );
        n += 1;
    }
    n
}

fn lines_for(v_lo: f64, v_hi: f64) -> Vec<((f64, f64, f64, f64), Line)> {
    let mut out = Vec::new();
    for k in 0..=6 {
        let v = v_lo + (v_hi - v_lo) * k as f64 / 6.0;
        out.push(((0.0, v, 1.0, v), Line::Parallel));
        out.push(((1.0, v, 0.0, v), Line::Parallel));
    }
    for u in [0.0, 0.1, 0.25, 1.0 / 3.0, 0.62, 0.75, 1.0] {
        out.push(((u, v_lo, u, v_hi), Line::Meridian));
        out.push(((u, v_hi, u, v_lo), Line::Meridian));
    }
    let (a, b) = (v_lo, v_hi);
    out.push(((0.03, a, 0.97, b), Line::Slanted));
    out.push(((0.9, a + 0.01, 0.1, b - 0.02), Line::Slanted));
    out.push(((0.45, a, 0.55, b), Line::Slanted)); // steep
    out.push((
        (0.0, 0.5 * (a + b), 1.0, 0.5 * (a + b) + 0.05 * (b - a)),
        Line::Slanted,
    )); // shallow
    out.push(((1.0, b, 0.2, a), Line::Slanted));
    out
}

fn run(surf: &NurbsSurface, model: &Model, v_lo: f64, v_hi: f64) {
    let mut n = 0;
    for (l, kind) in lines_for(v_lo, v_hi) {
        n += check_line(surf, model, l, kind);
    }
    println!("{}: {n} frames checked", model.name);
    assert!(n > 1000);
}

// Sources: do Carmo §3-2, §3-3, §4-4; The NURBS Book §7.5, A7.1, A8.1 (see module docs).
// The poles (v = 0, 1) are excluded: v ∈ [0.04, 0.96].
#[test]
fn nurbs_sphere_nine_point_reproduces_closed_forms() {
    let (s, m) = sphere(2.5, CircleForm::NinePoint);
    run(&s, &m, 0.04, 0.96);
}

// Sources: as above.
#[test]
fn nurbs_sphere_seven_point_reproduces_closed_forms() {
    let (s, m) = sphere(0.8, CircleForm::SevenPoint);
    run(&s, &m, 0.04, 0.96);
}

// Sources: as above (cylinder: REFERENCES.md, helix at angle a: |κn| = cos²a/R,
// |τg| = sin a cos a/R, here through Euler's formula with k_mer = 0).
#[test]
fn nurbs_cylinder_nine_point_reproduces_closed_forms() {
    let (s, m) = cylinder(1.75, -1.0, 2.0, CircleForm::NinePoint);
    run(&s, &m, 0.0, 1.0);
}

// Sources: as above.
#[test]
fn nurbs_cylinder_seven_point_reproduces_closed_forms() {
    let (s, m) = cylinder(3.2, 0.5, 0.9, CircleForm::SevenPoint);
    run(&s, &m, 0.0, 1.0);
}

// Sources: as above (torus: REFERENCES.md principal curvatures, K, parallels).
#[test]
fn nurbs_torus_nine_point_reproduces_closed_forms() {
    let (s, m) = torus(3.0, 1.2, CircleForm::NinePoint);
    run(&s, &m, 0.0, 1.0);
}

// Sources: as above.
#[test]
fn nurbs_torus_seven_point_reproduces_closed_forms() {
    let (s, m) = torus(5.0, 0.7, CircleForm::SevenPoint);
    run(&s, &m, 0.0, 1.0);
}

/// A circle in a tilted plane: C(t) = c + R (cos θ X + sin θ Y) with θ from the angle map.
fn circle_model(c: Vec3, x: Vec3, y: Vec3, r: f64, map: &ArcMap, t: f64) -> [Vec3; 3] {
    let (th, d1, d2) = map.angle(t);
    let (s, co) = th.sin_cos();
    let radial = x * co + y * s;
    let along = y * co - x * s;
    [
        c + radial * r,
        along * (r * d1),
        along * (r * d2) - radial * (r * d1 * d1),
    ]
}

// Source: The NURBS Book §7.5 (9-point and 7-point circles) and A4.2 RatCurveDerivs p. 127 for
// what is computed; expected values from the exact circle composed with the angle map (module
// docs); curvature 1/R and a binormal along the plane normal (do Carmo §1-5, plane circle).
#[test]
fn rational_3d_circles_have_exact_derivatives() {
    let c = Vec3::new(0.3, -1.2, 2.0);
    let x = Vec3::new(1.0, 2.0, 2.0) / 3.0;
    let y0 = Vec3::new(-2.0, 0.5, 1.0);
    let y = (y0 - x * y0.dot(&x)).normalize();
    let r = 1.7;
    for form in [CircleForm::NinePoint, CircleForm::SevenPoint] {
        let curve: NurbsCurve<3> = conics::circle(
            [c.x, c.y, c.z],
            [3.0, 6.0, 6.0],
            [y0.x, y0.y, y0.z],
            r,
            form,
        )
        .unwrap();
        let map = ArcMap::circle(form);
        let mut hint = SpanHint::default();
        for t in samples() {
            let d = curve.derivs(t, DerivOrder::Second, &mut hint).unwrap();
            let [p, d1, d2] = circle_model(c, x, y, r, &map, t);
            let ctx = format!("{form:?} t={t}");
            let got = [Vec3::from(d.p), Vec3::from(d.d1), Vec3::from(d.d2)];
            assert_vec_close("C", &got[0], &p, p.norm(), 1e-13, &ctx);
            assert_vec_close("C'", &got[1], &d1, d1.norm(), 1e-12, &ctx);
            assert_vec_close("C''", &got[2], &d2, d2.norm(), 1e-12, &ctx);
            let cr = got[1].cross(&got[2]);
            let kappa = cr.norm() / got[1].norm().powi(3);
            assert_close("curvature", kappa, 1.0 / r, 1.0 / r, 1e-12, &ctx);
            assert_vec_close("binormal", &cr.normalize(), &x.cross(&y), 1.0, 1e-12, &ctx);
        }
    }
}

// Source: The NURBS Book §7.5 (circle control polygons): the 7-point circle's corner control
// points lie at distance 2R from the centre (1/cos 60°) with weight ½, the 9-point circle's at
// √2 R (1/cos 45°) with weight √2/2; the curve passes through the tangent points at t = k/3 and
// t = k/4. Common practice check of the builders' data, not of the evaluator.
#[test]
fn circle_builders_have_the_textbook_control_polygons() {
    let seven = conics::circle(
        [0.0; 3],
        [1.0, 0.0, 0.0],
        [0.0, 1.0, 0.0],
        2.0,
        CircleForm::SevenPoint,
    )
    .unwrap();
    let nine = conics::circle(
        [0.0; 3],
        [1.0, 0.0, 0.0],
        [0.0, 1.0, 0.0],
        2.0,
        CircleForm::NinePoint,
    )
    .unwrap();
    for (curve, count, corner, w) in [
        (&seven, 7, 4.0, 0.5),
        (&nine, 9, 2.0 * 2f64.sqrt(), 0.5f64.sqrt()),
    ] {
        let pts = curve.control_points();
        let ws = curve.weights().unwrap();
        assert_eq!(pts.len(), count);
        for (i, (p, &wi)) in pts.iter().zip(ws).enumerate() {
            let dist = p[0].hypot(p[1]);
            let (want_d, want_w) = if i % 2 == 1 { (corner, w) } else { (2.0, 1.0) };
            assert!(
                (dist - want_d).abs() < 1e-14 && (wi - want_w).abs() < 1e-15,
                "{count}-point control point {i}"
            );
        }
        let arcs = (count - 1) / 2;
        let mut hint = SpanHint::default();
        for k in 0..=arcs {
            let t = k as f64 / arcs as f64;
            let p = curve.derivs(t, DerivOrder::Position, &mut hint).unwrap().p;
            let ang = TAU * t;
            assert!(
                (p[0] - 2.0 * ang.cos()).abs() < 1e-14 && (p[1] - 2.0 * ang.sin()).abs() < 1e-14,
                "t={t}"
            );
        }
    }
    // The sphere's poles are degenerate points (zero |Su x Sv|): an error, not a NaN.
    let s = conics::sphere(1.0, CircleForm::NinePoint).unwrap();
    let line = uv_line(0.0, 1.0, 1.0, 1.0).unwrap();
    let err = CurveOnSurface::new(&s, &line)
        .frame(0.5, &mut Hints::default())
        .unwrap_err();
    assert!(
        matches!(err, strake::StrakeError::DegenerateSurface { .. }),
        "{err}"
    );
}
