//! The tool-side frame, the cutter's radii across and along the path, the width it cuts,
//! rear (heel) gouging, tow-edge strain, the path (array) versions of the checks, and the
//! extreme-scale regressions of the checks. Each check names its source beside it; the
//! brute-force constructions here are independent of the library's formulas.

use std::f64::consts::PI;
use strake::analytic::{cylinder, plane, sphere, torus};
use strake::checks::*;
use strake::nurbs::{CircleForm, conics};
use strake::{CurveOnSurface, DarbouxFrame, Hints, StrakeError, Vec3, uv_line};

fn rel(a: f64, b: f64) -> f64 {
    (a - b).abs() / b.abs().max(1e-300)
}

fn deg(x: f64) -> f64 {
    x.to_radians()
}

fn frame_on<S: strake::SurfaceSource>(s: &S, line: (f64, f64, f64, f64), t: f64) -> DarbouxFrame {
    let c = uv_line(line.0, line.1, line.2, line.3).unwrap();
    CurveOnSurface::new(s, &c)
        .frame(t, &mut Hints::default())
        .unwrap()
}

fn angles(lead: f64, tilt: f64) -> ToolAngles {
    ToolAngles { lead, tilt }
}

// ---------------------------------------------------------------- conventions

// The tool-side frame (T, b_t = n_t × T, n_t = s N) is right-handed on both sides, and a
// positive tilt leans the axis toward b_t, the left of travel seen from the tool, on both
// sides (our convention, src/checks/tool_axis.rs).
#[test]
fn positive_tilt_leans_left_of_travel_seen_from_the_tool_on_either_side() {
    let f = frame_on(&sphere(10.0), (0.1, 1.0, 1.0, 1.2), 0.3);
    for side in [ToolSide::AlongNormal, ToolSide::AgainstNormal] {
        let tf = ToolFrame::new(&f, side).unwrap();
        assert!((tf.n - f.n * side.sign()).norm() < 1e-15);
        assert!((tf.t.cross(&tf.b) - tf.n).norm() < 1e-15, "right-handed");
        assert!((tf.b - tf.n.cross(&tf.t)).norm() < 1e-15);
        let a = tool_axis(&f, side, &angles(0.0, 0.2)).unwrap();
        // Seen from the tool (looking down −n_t, T ahead), left is n_t × T.
        let left = tf.n.cross(&f.t);
        assert!((a.space.dot(&left) - 0.2f64.sin()).abs() < 1e-15);
        let (lead, tilt) = (0.3, -0.25);
        let a = tool_axis(&f, side, &angles(lead, tilt)).unwrap();
        let want = [lead.sin(), lead.cos() * tilt.sin(), lead.cos() * tilt.cos()];
        for (got, want) in a.local.iter().zip(want) {
            assert!((got - want).abs() < 1e-15);
        }
        assert!((a.space - tf.to_space(want)).norm() < 1e-15);
        assert!((a.space.norm() - 1.0).abs() < 1e-15);
    }
    // b_t is B on the N side and −B on the other.
    let tf = ToolFrame::new(&f, ToolSide::AgainstNormal).unwrap();
    assert!((tf.b + f.b).norm() < 1e-15);
}

// Issue 16: a tool axis from a frame that is not orthonormal was not unit. A frame slightly off
// (T·N = 1e-8) now gives a unit axis; one clearly off (T·N = 1e-3) is refused, naming it.
#[test]
fn tool_axis_from_a_non_orthonormal_frame_is_unit_or_refused() {
    let mut f = frame_on(&sphere(10.0), (0.1, 1.0, 1.0, 1.2), 0.3);
    let good = f;
    f.n = (good.n + good.t * 1e-8).normalize();
    let a = tool_axis(&f, ToolSide::AlongNormal, &angles(0.4, 0.3)).unwrap();
    assert!((a.space.norm() - 1.0).abs() < 4.0 * f64::EPSILON);
    f.n = (good.n + good.t * 1e-3).normalize();
    let e = tool_axis(&f, ToolSide::AlongNormal, &angles(0.4, 0.3)).unwrap_err();
    assert!(e.to_string().contains("not orthogonal"), "{e}");
    f.n = good.n * 1.1;
    assert!(tool_axis(&f, ToolSide::AlongNormal, &angles(0.0, 0.0)).is_err());
}

// ---------------------------------------------------------------- radii across the path

/// The cutter placed on the plane z = 0 (T = x, b_t = y, n_t = z) touching at the origin:
/// returns (corner-centre circle centre q0, e1, e2, axis). Brute-force geometry: the corner
/// circle's lowest tube touches with its lowest point.
fn placed(cutter: &Cutter, ang: &ToolAngles) -> (Vec3, Vec3, Vec3, Vec3) {
    let (big_r, r) = cutter.torus_radii();
    let [at, ab, an] = ang.local();
    let a = Vec3::new(at, ab, an);
    let n = Vec3::z();
    let radial = -(n - a * n.dot(&a));
    let e1 = if radial.norm() > 0.0 {
        radial.normalize()
    } else {
        Vec3::x()
    };
    let e2 = a.cross(&e1);
    (n * r - e1 * big_r, e1, e2, a)
}

/// Lower envelope z(y) of the cutter swept along x (its outline seen along T), at lateral y:
/// the minimum of z over the torus points with that y, by a scan of the torus angle ψ with the
/// tube circle cut exactly by the plane y = const, then a golden-section refinement.
fn envelope(cutter: &Cutter, ang: &ToolAngles, y: f64) -> f64 {
    let (big_r, r) = cutter.torus_radii();
    let (q0, e1, e2, a) = placed(cutter, ang);
    // The ring of the torus at tube angle χ: centre q0 + r sin χ a, radius R + r cos χ, in the
    // plane of e1 and e2; cut exactly by the plane y = const (A cos ψ + B sin ψ = C).
    let on_ring = |chi: f64| {
        let (s, c) = chi.sin_cos();
        let centre = q0 + a * (r * s);
        let rad = big_r + r * c;
        let (aa, bb) = (rad * e1.y, rad * e2.y);
        let m = aa.hypot(bb);
        let cc = (y - centre.y) / m;
        if cc.is_nan() || cc.abs() > 1.0 {
            return f64::INFINITY;
        }
        let phi0 = bb.atan2(aa);
        let d = cc.acos();
        [phi0 + d, phi0 - d]
            .iter()
            .map(|&psi| centre.z + rad * (psi.cos() * e1.z + psi.sin() * e2.z))
            .fold(f64::INFINITY, f64::min)
    };
    let n = 4000;
    let mut best = (f64::INFINITY, 0.0);
    for k in 0..n {
        let chi = 2.0 * PI * k as f64 / n as f64;
        let z = on_ring(chi);
        if z < best.0 {
            best = (z, chi);
        }
    }
    let step = 2.0 * PI / n as f64;
    let (mut lo, mut hi) = (best.1 - step, best.1 + step);
    let g = 0.5 * (5f64.sqrt() - 1.0);
    for _ in 0..80 {
        let (p, q) = (hi - g * (hi - lo), lo + g * (hi - lo));
        if on_ring(p) < on_ring(q) {
            hi = q;
        } else {
            lo = p;
        }
    }
    on_ring(0.5 * (lo + hi)).min(best.0)
}

/// Radius of curvature of the swept outline at the contact, from its second difference
/// (Richardson-extrapolated).
fn brute_across_radius(cutter: &Cutter, ang: &ToolAngles, scale: f64) -> f64 {
    let z0 = envelope(cutter, ang, 0.0);
    let k = |d: f64| (envelope(cutter, ang, d) + envelope(cutter, ang, -d) - 2.0 * z0) / (d * d);
    let d = 0.02 * scale;
    let kk = (4.0 * k(d / 2.0) - k(d)) / 3.0;
    1.0 / kk
}

// Issue 12 check value: a 5/1 mm toroidal cutter at 10° tilt: the radius normal to the
// inclination plane is 4/sin 10° + 1 = 24.0 mm, across the path the corner's 1 mm cuts. And
// the swept outline's radius r + R sin²λ/sin³β against the brute-force envelope of the
// sampled cutter, at lead only, tilt only and both.
#[test]
fn radius_across_the_path_matches_the_swept_outline_of_the_sampled_cutter() {
    let c = Cutter::Toroidal {
        radius: 5.0,
        corner_radius: 1.0,
    };
    let rr = cutter_radii(&c, &angles(0.0, deg(10.0))).unwrap();
    assert!(rel(rr.across_path, 1.0) < 1e-15);
    assert!(rel(rr.inclination_plane, 4.0 / deg(10.0).sin() + 1.0) < 1e-15);
    assert!((rr.inclination_plane - 24.03).abs() < 0.01);
    for (lead, tilt) in [
        (10.0, 0.0),
        (0.0, 10.0),
        (8.0, 6.0),
        (15.0, -20.0),
        (3.0, 25.0),
    ] {
        let ang = angles(deg(lead), deg(tilt));
        let rr = cutter_radii(&c, &ang).unwrap();
        let beta = ang.inclination();
        let want = 1.0 + 4.0 * deg(lead).sin().powi(2) / beta.sin().powi(3);
        assert!(rel(rr.across_path, want) < 1e-13);
        let brute = brute_across_radius(&c, &ang, rr.across_path.min(5.0));
        eprintln!(
            "across lead {lead} tilt {tilt}: {} brute {brute} section {}",
            rr.across_path, rr.across_section
        );
        assert!(
            rel(rr.across_path, brute) < 2e-4,
            "lead {lead} tilt {tilt}: {} vs brute {brute}",
            rr.across_path
        );
        // The normal section never exceeds the swept outline's radius (det K / K_TT ≤ K_bb).
        assert!(rr.across_section <= rr.across_path * (1.0 + 1e-12));
        if lead == 0.0 || tilt == 0.0 {
            assert!(rel(rr.across_section, rr.across_path) < 1e-12);
        }
    }
    // Upright: the flat bottom touches.
    let up = cutter_radii(&c, &angles(0.0, 0.0)).unwrap();
    assert!(up.flat_bottom_contact && up.across_path.is_infinite());
    let ball = cutter_radii(&Cutter::Ball { radius: 3.0 }, &angles(0.3, 0.2)).unwrap();
    assert_eq!((ball.across_path, ball.along_path), (3.0, 3.0));
    // A flat cutter tilted without lead: its sharp corner cuts across the path.
    let flat = cutter_radii(&Cutter::Flat { radius: 5.0 }, &angles(0.0, 0.1)).unwrap();
    assert_eq!(flat.across_path, 0.0);
}

/// Scallop height on a plane between two passes `w` apart, by direct intersection of the two
/// brute-force envelopes: the highest point of min(z(y), z(y − w)) over [0, w] (scan plus
/// golden refinement).
fn brute_scallop_plane(cutter: &Cutter, ang: &ToolAngles, w: f64) -> f64 {
    let z0 = envelope(cutter, ang, 0.0);
    let rest = |y: f64| envelope(cutter, ang, y).min(envelope(cutter, ang, y - w));
    let n = 60;
    let mut best = (f64::NEG_INFINITY, 0.0);
    for k in 0..=n {
        let y = w * k as f64 / n as f64;
        let z = rest(y);
        if z > best.0 {
            best = (z, y);
        }
    }
    let (mut lo, mut hi) = (
        (best.1 - w / n as f64).max(0.0),
        (best.1 + w / n as f64).min(w),
    );
    let g = 0.5 * (5f64.sqrt() - 1.0);
    for _ in 0..60 {
        let (p, q) = (hi - g * (hi - lo), lo + g * (hi - lo));
        if rest(p) > rest(q) {
            hi = q;
        } else {
            lo = p;
        }
    }
    rest(0.5 * (lo + hi)).max(best.0) - z0
}

// Scallop heights across the path for a tilted toroidal cutter against the direct intersection
// of two brute-force swept profiles (issue 12, "Checks"): the circle of radius `across_path`
// agrees to leading order (the outline is not a circle: third-order asymmetry), the
// inclination-plane radius is 20× off. The width the cutter cuts at height h is exactly the
// step-over whose brute-force scallop is h (two translated convex outlines meet where the
// outline is as wide as the translation).
#[test]
fn scallop_of_a_tilted_toroidal_cutter_matches_two_profile_intersection() {
    let c = Cutter::Toroidal {
        radius: 5.0,
        corner_radius: 1.0,
    };
    for (lead, tilt) in [(0.0, 10.0), (6.0, 8.0)] {
        let ang = angles(deg(lead), deg(tilt));
        let rr = cutter_radii(&c, &ang).unwrap();
        let w = 0.1 * rr.across_path;
        let brute = brute_scallop_plane(&c, &ang, w);
        let model = scallop_height(rr.across_path, w, 0.0).unwrap();
        eprintln!("scallop {lead}/{tilt} w {w}: model {model} brute {brute}");
        assert!(
            rel(model, brute) < 0.02,
            "{lead}/{tilt}: {model} vs {brute}"
        );
        let wrong = scallop_height(rr.inclination_plane, w, 0.0).unwrap();
        assert!(rel(wrong, brute) > 0.5, "{wrong} vs {brute}");
        for h in [0.01, 0.1, 0.5] {
            let width = cut_width(&c, &ang, h).unwrap();
            let back = brute_scallop_plane(&c, &ang, width);
            assert!(rel(back, h) < 1e-6, "{lead}/{tilt} h {h}: {back}");
        }
    }
}

// Issue 12: a flat 10 mm cutter at 5° lead was given 15–21 mm step-overs. The outline it sweeps
// is the tilted bottom seen along T: an ellipse 10 mm wide and 5 sin 5° = 0.436 mm deep, then
// the vertical flank, so at h = 0.5 mm it cuts exactly 10 mm; at h = 0.1 mm the ellipse's
// chord 2·5·√(1 − (1 − 0.1/0.436)²) (closed form of the ellipse).
#[test]
fn step_over_of_a_flat_cutter_is_limited_by_its_width() {
    let c = Cutter::Flat { radius: 5.0 };
    let ang = angles(deg(5.0), 0.0);
    let s = step_over_for_cutter(&c, &ang, 0.5, 0.0).unwrap();
    assert!(s.model > 15.0 && s.limited_by_width);
    assert!(rel(s.step_over, 10.0) < 1e-12, "{}", s.step_over);
    let depth = 5.0 * deg(5.0).sin();
    let want = 10.0 * (1.0 - (1.0 - 0.1 / depth).powi(2)).sqrt();
    let s = step_over_for_cutter(&c, &ang, 0.1, 0.0).unwrap();
    assert!(rel(s.step_over, want) < 1e-9, "{} vs {want}", s.step_over);
    // A ball: on a plane the model and the width agree (2 √(h (2r − h))).
    let b = step_over_for_cutter(&Cutter::Ball { radius: 3.0 }, &ang, 0.2, 0.0).unwrap();
    assert!(rel(b.model, b.width_limit) < 1e-9);
    // Upright flat bottom on a convex cross-section of radius 100: tangent lines of adjacent
    // passes meet at h = ρ (1/cos(θ/2) − 1) (circle geometry).
    let up = step_over_for_cutter(&c, &angles(0.0, 0.0), 0.01, -0.01).unwrap();
    let theta = up.model / 100.0;
    assert!(rel(100.0 * (1.0 / (theta / 2.0).cos() - 1.0), 0.01) < 1e-12);
    assert!(step_over_for_cutter(&c, &angles(0.0, 0.0), 0.01, 0.01).is_err());
}

// ---------------------------------------------------------------- rear gouging

/// Points of the cutter's cutting surface (bottom disc and the lower outer quarter of the
/// corner torus; not the flank, holder or shank), with the tool touching the surface at `p`
/// with tool-side normal `nt` and axis `a`. Brute-force geometry, independent of the library.
fn cutter_points(cutter: &Cutter, a: Vec3, p: Vec3, nt: Vec3) -> Vec<Vec3> {
    let (big_r, r) = cutter.torus_radii();
    let radial = -(nt - a * nt.dot(&a));
    let upright = radial.norm() < 1e-12;
    let e1 = if upright {
        let any = if a.x.abs() < 0.9 {
            Vec3::x()
        } else {
            Vec3::y()
        };
        (any - a * any.dot(&a)).normalize()
    } else {
        radial.normalize()
    };
    let e2 = a.cross(&e1);
    // Centre of the corner-centre circle.
    let q0 = if upright {
        p + nt * r
    } else {
        p + nt * r - e1 * big_r
    };
    let mut pts = Vec::new();
    let n_psi = 720;
    for i in 0..n_psi {
        let psi = 2.0 * PI * i as f64 / n_psi as f64;
        let u = e1 * psi.cos() + e2 * psi.sin();
        for j in 0..=24 {
            let chi = -0.5 * PI * j as f64 / 24.0;
            pts.push(q0 + u * (big_r + r * chi.cos()) + a * (r * chi.sin()));
        }
        for j in 1..12 {
            pts.push(q0 - a * r + u * (big_r * j as f64 / 12.0));
        }
    }
    pts
}

/// Deepest penetration of the sampled cutter into the material (`depth(X)` > 0 inside).
fn penetration(
    cutter: &Cutter,
    f: &DarbouxFrame,
    side: ToolSide,
    ang: &ToolAngles,
    depth: &dyn Fn(Vec3) -> f64,
) -> f64 {
    let a = tool_axis(f, side, ang).unwrap().space;
    cutter_points(cutter, a, f.point, f.n * side.sign())
        .into_iter()
        .map(depth)
        .fold(f64::NEG_INFINITY, f64::max)
}

/// Smallest lead (at tilt `tilt`) at which the sampled cutter stays out of the material to
/// `tol`, by bisection (penetration shrinks as the lead grows in these cases).
fn brute_min_lead(
    cutter: &Cutter,
    f: &DarbouxFrame,
    side: ToolSide,
    tilt: f64,
    tol: f64,
    depth: &dyn Fn(Vec3) -> f64,
) -> f64 {
    let gouges = |lead: f64| penetration(cutter, f, side, &angles(lead, tilt), depth) > tol;
    let (mut lo, mut hi) = (0.0, deg(80.0));
    assert!(gouges(lo) && !gouges(hi));
    for _ in 0..30 {
        let mid = 0.5 * (lo + hi);
        if gouges(mid) {
            lo = mid;
        } else {
            hi = mid;
        }
    }
    hi
}

// Issue 12 check value (closed form, circle geometry: the bottom's diameter 2R must fit in the
// chord 2ρ sin λ of the arc, REFERENCES.md): a flat cutter R = 5 feeding around a concave arc
// ρ = 20 needs asin(1/4) = 14.48° of lead; it was reported free of gouging at zero lead. A
// 5/1 toroidal cutter: asin(4/(20 − 1)). Both against the brute-force distance between the
// sampled cutter and the cylinder.
#[test]
fn flat_cutter_around_a_concave_arc_needs_the_chord_lead() {
    let rho = 20.0;
    let cyl = cylinder(rho, -50.0, 50.0); // N outward: the tool inside is against N.
    let f = frame_on(&cyl, (0.2, 0.0, 1.2, 0.0), 0.5);
    let side = ToolSide::AgainstNormal;
    let depth = |x: Vec3| x.x.hypot(x.y) - rho;
    for (cutter, want) in [
        (Cutter::Flat { radius: 5.0 }, (5.0f64 / 20.0).asin()),
        (
            Cutter::Toroidal {
                radius: 5.0,
                corner_radius: 1.0,
            },
            (4.0f64 / 19.0).asin(),
        ),
    ] {
        let up = gouge_state(&f, side, &cutter, &angles(0.0, 0.0)).unwrap();
        assert!(up.gouges && up.rear.gouges);
        let lead = up.min_lead.unwrap();
        assert!((lead - want).abs() < 1e-9, "{cutter:?}: {lead} vs {want}");
        let brute = brute_min_lead(&cutter, &f, side, 0.0, 1e-9, &depth);
        eprintln!("arc {cutter:?}: lib {lead} brute {brute} exact {want}");
        assert!(
            (brute - want).abs() < 2e-4,
            "{cutter:?}: brute {brute} vs {want}"
        );
        // Just below, the heel is in (the local check alone saw nothing).
        let below = gouge_state(&f, side, &cutter, &angles(want - deg(0.5), 0.0)).unwrap();
        assert!(!below.local_gouges && below.rear.gouges && below.gouges);
        assert!((below.rear.worst_angle - PI).abs() < 1e-6);
        let above = gouge_state(&f, side, &cutter, &angles(want + deg(0.5), 0.0)).unwrap();
        assert!(!above.gouges);
    }
    assert!((deg(14.48) - (0.25f64).asin()).abs() < deg(0.01));
}

// With the tool upright a flat or toroidal cutter touches with its flat bottom (issue 12): on
// a convex sphere seen from outside the bottom clears, on a plane it lies flat, inside a
// sphere it gouges; the brute-force distance agrees each time.
#[test]
fn upright_flat_bottom_contact() {
    let c = Cutter::Flat { radius: 5.0 };
    let up = angles(0.0, 0.0);
    let sph = sphere(30.0); // N inward.
    let f = frame_on(&sph, (0.3, 1.0, 1.2, 1.3), 0.5);
    let outside = |x: Vec3| 30.0 - x.norm();
    let g = gouge_state(&f, ToolSide::AgainstNormal, &c, &up).unwrap();
    assert!(g.radii.flat_bottom_contact && !g.gouges && g.min_lead == Some(0.0));
    assert!(penetration(&c, &f, ToolSide::AgainstNormal, &up, &outside) < 1e-9);
    let inside = |x: Vec3| x.norm() - 30.0;
    let g = gouge_state(&f, ToolSide::AlongNormal, &c, &up).unwrap();
    assert!(g.rear.gouges && g.gouges);
    assert!(penetration(&c, &f, ToolSide::AlongNormal, &up, &inside) > 0.1);
    // Exact: the flat disc's rim is R²/(2ρ) deep at second order (0.417 for R = 5, ρ = 30):
    // √(ρ² + R²) − ρ = 0.414 exactly.
    assert!((g.rear.depth - 0.417).abs() < 0.005, "{}", g.rear.depth);
    let pl = plane((-50.0, 50.0), (-50.0, 50.0));
    let fp = frame_on(&pl, (0.0, 0.0, 10.0, 3.0), 0.5);
    let g = gouge_state(&fp, ToolSide::AlongNormal, &c, &up).unwrap();
    assert!(!g.gouges && g.radii.flat_bottom_contact);
}

// Concave sphere (exact in the model: every normal section is a great circle) and a torus and
// a NURBS torus (not exact: the model is second order plus the arc): the smallest lead that
// avoids local and rear gouging against the brute-force distance between the sampled cutter
// and the surface. On the sphere they agree; elsewhere the library's answer must not be below
// the brute force's by more than the sampling (it may be a little above: conservative).
#[test]
fn smallest_safe_lead_against_brute_force_distance() {
    let c = Cutter::Toroidal {
        radius: 6.0,
        corner_radius: 1.0,
    };
    // Sphere of radius 40 from inside (N inward: along N).
    let sph = sphere(40.0);
    let f = frame_on(&sph, (0.3, 1.0, 1.2, 1.3), 0.5);
    let inside = |x: Vec3| x.norm() - 40.0;
    for tilt in [0.0, deg(5.0)] {
        let g = gouge_state(&f, ToolSide::AlongNormal, &c, &angles(0.0, tilt)).unwrap();
        let lib = g.min_lead.unwrap();
        let brute = brute_min_lead(&c, &f, ToolSide::AlongNormal, tilt, 1e-9, &inside);
        eprintln!("sphere tilt {tilt}: lib {lib} brute {brute}");
        assert!(
            (lib - brute).abs() < 5e-4,
            "sphere tilt {tilt}: {lib} vs {brute}"
        );
    }
    // Analytic torus R = 40, r = 15 from outside on its inner side (concave across), along a
    // slanted path.
    let (big, small) = (40.0, 15.0);
    let tor = torus(big, small);
    let f = frame_on(&tor, (0.2, 2.6, 0.35, 3.3), 0.5);
    let tdepth = |x: Vec3| small - (x.x.hypot(x.y) - big).hypot(x.z);
    for tilt in [0.0, deg(8.0)] {
        let lib = gouge_state(&f, ToolSide::AlongNormal, &c, &angles(0.0, tilt))
            .unwrap()
            .min_lead
            .unwrap();
        let brute = brute_min_lead(&c, &f, ToolSide::AlongNormal, tilt, 1e-9, &tdepth);
        eprintln!("torus tilt {tilt}: lib {lib} brute {brute}");
        assert!(
            lib >= brute - 5e-4 && lib - brute < deg(1.0),
            "torus tilt {tilt}: {lib} vs {brute}"
        );
    }
    // NURBS torus (rational quadratic circles, exact geometry), same torus: the frame comes
    // from the NURBS evaluation.
    let nt = conics::torus(big, small, CircleForm::NinePoint).unwrap();
    let f = frame_on(&nt, (0.05, 0.4, 0.1, 0.55), 0.5);
    // The tool outside the tube: on the side of the outward tube normal.
    let core = Vec3::new(f.point.x, f.point.y, 0.0).normalize() * big;
    let side = if f.n.dot(&(f.point - core)) > 0.0 {
        ToolSide::AlongNormal
    } else {
        ToolSide::AgainstNormal
    };
    let lib = gouge_state(&f, side, &c, &angles(0.0, 0.0)).unwrap();
    assert!(
        lib.gouges,
        "this sample of the NURBS torus is concave enough to gouge upright"
    );
    let lead = lib.min_lead.unwrap();
    let brute = brute_min_lead(&c, &f, side, 0.0, 1e-9, &tdepth);
    eprintln!("NURBS torus: lib {lead} brute {brute}");
    assert!(
        lead >= brute - 5e-4 && lead - brute < deg(1.0),
        "NURBS torus: {lead} vs {brute}"
    );
    // Concave cylinder of radius 20 from inside, fed at 30° to its circumference (the feed is
    // not a principal direction; the model is above the true cylinder off its principal
    // directions, so it may only be conservative).
    let cyl = cylinder(20.0, -50.0, 50.0);
    let f = frame_on(&cyl, (0.2, 0.0, 1.2, 20.0 * 30f64.to_radians().tan()), 0.5);
    let depth = |x: Vec3| x.x.hypot(x.y) - 20.0;
    for tilt in [0.0, deg(-6.0)] {
        let lib = gouge_state(&f, ToolSide::AgainstNormal, &c, &angles(0.0, tilt))
            .unwrap()
            .min_lead
            .unwrap();
        let brute = brute_min_lead(&c, &f, ToolSide::AgainstNormal, tilt, 1e-9, &depth);
        eprintln!("slanted cylinder tilt {tilt}: lib {lib} brute {brute}");
        assert!(
            lib >= brute - 5e-4 && lib - brute < deg(1.0),
            "slanted cylinder tilt {tilt}: {lib} vs {brute}"
        );
    }
}

// ---------------------------------------------------------------- tow edges

// A 150 mm tape along a great circle of a 1 m sphere: both edges at −0.28 % (issue 12). Exact:
// the parallel at geodesic distance y has length ratio cos(y/R) (spherical geometry); the
// second-order rule −K y²/2 agrees to y⁴/(24 R⁴).
#[test]
fn tape_along_a_great_circle_shortens_both_edges() {
    let big = 1000.0;
    let s = sphere(big);
    let f = frame_on(&s, (0.0, PI / 2.0, 1.0, PI / 2.0), 0.5); // the equator
    assert!(f.geodesic_curvature.abs() < 1e-12);
    let e = tow_edges(&f, 150.0).unwrap();
    let exact = (75.0f64 / big).cos() - 1.0;
    assert!((e.left - exact).abs() < 2e-6 && (e.right - exact).abs() < 2e-6);
    assert!((e.left * 100.0 + 0.28).abs() < 0.005);
    assert!(e.left_compressed && e.right_compressed);
    let st = fibre_state(
        &f,
        &FibreLimits {
            tow_width: 150.0,
            min_steering_radius: 500.0,
            max_twist_rate: 1.0,
        },
    )
    .unwrap();
    assert!((st.edge_strain - exact.abs()).abs() < 2e-6);
}

/// Exact relative length change of the edge at distance y to the left (B side) of a parallel
/// (a circle about the z axis), where the geodesic from the point in direction B is a circle
/// of radius `rc` about `centre` in the plane of B and the normal (a meridian): the edge is the
/// parallel through that geodesic's point at arc length y.
fn exact_edge(f: &DarbouxFrame, centre: Vec3, rc: f64, y: f64) -> f64 {
    let out = (f.point - centre) / rc;
    let p = centre + (out * (y / rc).cos() + f.b * (y / rc).sin()) * rc;
    p.x.hypot(p.y) / f.point.x.hypot(f.point.y) - 1.0
}

// Tape along a torus parallel and along a small circle of a sphere: each edge against the
// exact small-circle lengths (the meridians are geodesics, so the edges are parallels); the
// compressed edge is the one toward the axis of the tighter parallel. Error O(y³).
#[test]
fn tow_edges_on_torus_and_sphere_parallels_match_exact_circle_lengths() {
    let (big, small) = (400.0, 100.0);
    let tor = torus(big, small);
    for v in [0.6, 2.0, 3.6] {
        let f = frame_on(&tor, (0.1, v, 0.9, v), 0.5);
        let w = 6.0;
        let e = tow_edges(&f, w).unwrap();
        let core = Vec3::new(f.point.x, f.point.y, 0.0).normalize() * big;
        let left = exact_edge(&f, core, small, w / 2.0);
        let right = exact_edge(&f, core, small, -w / 2.0);
        let tol = 2.0 * (w / 2.0f64).powi(3) / small.powi(3);
        assert!((e.left - left).abs() < tol, "v {v}: {} vs {left}", e.left);
        assert!(
            (e.right - right).abs() < tol,
            "v {v}: {} vs {right}",
            e.right
        );
        assert_eq!(e.left_compressed, left < 0.0);
        assert_eq!(e.right_compressed, right < 0.0);
    }
    let s = sphere(200.0);
    let f = frame_on(&s, (0.1, 0.7, 0.9, 0.7), 0.5);
    let e = tow_edges(&f, 10.0).unwrap();
    let left = exact_edge(&f, Vec3::zeros(), 200.0, 5.0);
    let right = exact_edge(&f, Vec3::zeros(), 200.0, -5.0);
    let tol = 2.0 * (5.0f64 / 200.0).powi(3);
    assert!((e.left - left).abs() < tol && (e.right - right).abs() < tol);
    assert!(e.left_compressed != e.right_compressed);
}

// Issue 16: a tow width of 1e300 gave an infinite strain with OK; now a NonFinite error.
#[test]
fn tow_width_of_1e300_is_refused_not_infinite() {
    let f = frame_on(&sphere(10.0), (0.1, 1.0, 1.0, 1.2), 0.3);
    let e = tow_edges(&f, 1e300).unwrap_err();
    assert!(matches!(e, StrakeError::NonFinite { .. }), "{e}");
    let limits = FibreLimits {
        tow_width: 1e300,
        min_steering_radius: 1.0,
        max_twist_rate: 1.0,
    };
    assert!(fibre_state(&f, &limits).is_err());
}

// ---------------------------------------------------------------- extreme scales (issue 16)

// The exact scallop height lost its digits for large cutter radii (wrong from ~1e13: the two
// terms of the convex form cancelled; NaN from ~1e155: r² overflowed). Now: r = 1e13 on a convex
// cross-section agrees with the leading-order form (w²/8)(1/r − κ) (error O(w² κ²)), and the
// result scales exactly with the lengths from 1e-300 to 1e300.
#[test]
fn scallop_height_keeps_its_digits_for_huge_cutter_radii() {
    let h = scallop_height(1e13, 1.0, -1e-3).unwrap();
    let approx = (1.0 / 8.0) * (1e-13 + 1e-3);
    assert!(rel(h, approx) < 1e-6, "{h} vs {approx}");
    for (r, w, k) in [(5.0, 2.0, -0.01), (5.0, 2.0, 0.05), (5.0, 1.0, 0.0)] {
        let base = scallop_height(r, w, k).unwrap();
        for s in [1e-300, 1e-150, 1e13, 1e155, 1e300] {
            let got = scallop_height(r * s, w * s, k / s).unwrap();
            assert!(
                got.is_finite() && rel(got, base * s) < 1e-13,
                "{r} {w} {k} x {s:e}: {got:e} vs {:e}",
                base * s
            );
            let back = step_over_for_scallop(r * s, base * s, k / s).unwrap();
            assert!(rel(back, w * s) < 1e-9, "{s}: {back}");
            let a0 = scallop_height_approx(r, w, k).unwrap();
            let a = scallop_height_approx(r * s, w * s, k / s).unwrap();
            assert!(rel(a, a0 * s) < 1e-13, "approx {s}: {a}");
            let w0 = step_over_for_scallop_approx(r, a0, k).unwrap();
            let wa = step_over_for_scallop_approx(r * s, a0 * s, k / s).unwrap();
            assert!(rel(wa, w0 * s) < 1e-13, "approx {s}: {wa}");
        }
    }
}

// A cross-path curvature below ~1e-154 gave a step-over of 0 (d·rc overflowed); a denormal one
// gives the plane's answer.
#[test]
fn tiny_cross_path_curvature_gives_the_plane_step_over() {
    let plane_w = step_over_for_scallop(1.0, 0.01, 0.0).unwrap();
    for k in [1e-100, -1e-160, 1e-200, -1e-300, 5e-324] {
        let w = step_over_for_scallop(1.0, 0.01, k).unwrap();
        assert!(rel(w, plane_w) < 1e-12, "{k}: {w}");
        let h = scallop_height(1.0, plane_w, k).unwrap();
        assert!(rel(h, 0.01) < 1e-12, "{k}: {h}");
    }
}

// A denormal cutter radius gave a NaN margin; it is refused, naming the field.
#[test]
fn denormal_cutter_radius_is_refused_not_nan() {
    let f = frame_on(&sphere(10.0), (0.1, 1.0, 1.0, 1.2), 0.3);
    for c in [
        Cutter::Ball { radius: 5e-320 },
        Cutter::Toroidal {
            radius: 1.0,
            corner_radius: 1e-310,
        },
    ] {
        let e = gouge_state(&f, ToolSide::AlongNormal, &c, &angles(0.1, 0.0)).unwrap_err();
        assert!(e.to_string().contains("radius"), "{e}");
    }
    let g = gouge_state(
        &f,
        ToolSide::AlongNormal,
        &Cutter::Ball { radius: 1e-300 },
        &angles(0.1, 0.0),
    )
    .unwrap();
    assert!(g.margin.is_finite() && !g.gouges);
}

// ---------------------------------------------------------------- path versions

// Each path version gives, sample for sample, what the per-sample check gives, and a failure
// names the sample.
#[test]
fn path_versions_match_the_per_sample_checks_and_name_the_failing_sample() {
    let tor = torus(40.0, 15.0);
    let c = uv_line(0.2, 2.6, 0.35, 3.3).unwrap();
    let cos = CurveOnSurface::new(&tor, &c);
    let mut hints = Hints::default();
    let frames: Vec<DarbouxFrame> = (0..9)
        .map(|i| cos.frame(i as f64 / 8.0, &mut hints).unwrap())
        .collect();
    let side = ToolSide::AlongNormal;
    let cutter = Cutter::Toroidal {
        radius: 6.0,
        corner_radius: 1.0,
    };
    let ang = angles(0.05, 0.3);
    let mut g = Vec::new();
    gouge_path(&frames, side, &cutter, &ang, &mut g).unwrap();
    let mut rg = Vec::new();
    rear_gouge_path(&frames, side, &cutter, &ang, &mut rg).unwrap();
    let mut sc = Vec::new();
    scallop_path(&frames, side, 1.0, 0.5, &mut sc).unwrap();
    let mut so = Vec::new();
    step_over_path(&frames, side, &cutter, &ang, 0.01, &mut so).unwrap();
    let feed = FeedLimits {
        feed: 100.0,
        max_acceleration: 2000.0,
        max_jerk: Some(1e5),
    };
    let mut fd = Vec::new();
    feed_path(&frames, &feed, &mut fd).unwrap();
    let fl = FibreLimits {
        tow_width: 6.35,
        min_steering_radius: 600.0,
        max_twist_rate: 0.01,
    };
    let mut fb = Vec::new();
    fibre_path(&frames, &fl, &mut fb).unwrap();
    let mut te = Vec::new();
    tow_edges_path(&frames, 6.35, &mut te).unwrap();
    let mut ax = Vec::new();
    tool_axis_path(&frames, side, &ang, &mut ax).unwrap();
    for (i, f) in frames.iter().enumerate() {
        assert_eq!(g[i], gouge_state(f, side, &cutter, &ang).unwrap());
        assert_eq!(rg[i], rear_gouge(f, side, &cutter, &ang).unwrap());
        let k = cross_path_curvature(f, side);
        assert_eq!(sc[i].height, scallop_height(1.0, 0.5, k).unwrap());
        assert_eq!(so[i], step_over_for_cutter(&cutter, &ang, 0.01, k).unwrap());
        assert_eq!(fd[i], curvature_limited_feed(f, &feed).unwrap());
        assert_eq!(fb[i], fibre_state(f, &fl).unwrap());
        assert_eq!(te[i], tow_edges(f, 6.35).unwrap());
        assert_eq!(ax[i], tool_axis(f, side, &ang).unwrap());
    }
    // A frame that is not orthonormal at sample 5.
    let mut bad = frames.clone();
    bad[5].n = (bad[5].n + bad[5].t * 0.1).normalize();
    let e = tool_axis_path(&bad, side, &ang, &mut ax).unwrap_err();
    assert!(matches!(e, StrakeError::AtSample { index: 5, .. }), "{e}");
    assert!(e.to_string().starts_with("sample 5:"), "{e}");
    assert!(ax.is_empty());
    // A ball too large for the concavity at some sample: the scallop names it.
    let e = scallop_path(&frames, side, 36.5, 0.5, &mut sc).unwrap_err();
    assert!(matches!(e, StrakeError::AtSample { .. }), "{e}");
    assert!(gouge_path(&[], side, &cutter, &ang, &mut g).is_err());
}

// A flat cutter of radius R tilted by θ without lead: seen along T its bottom is a segment of
// length 2R inclined by θ, its flanks rise along the axis (sin θ, cos θ). Two passes w apart
// on a plane meet where the one's flank, z = y cot θ, crosses the other's bottom,
// z = (w − y) tan θ: at h = (w/2) sin 2θ, so the width cut at height h is w = 2h / sin 2θ
// while the cusp stays on the bottom (w cos²θ ≤ 2R cos θ) (plane geometry, derived here).
// The outline's support √(1 − (u·a)²) was computed by cancellation next to u = −a (the bottom
// seen edge-on), which left the width up to 4e-4 relative off (0.5° tilt, h = 8.7e-8 mm;
// measured on the old code); it is now |u × a|, exact to round-off.
#[test]
fn width_of_a_flat_cutter_tilted_without_lead_is_the_segment_closed_form() {
    let big_r = 5.0;
    let c = Cutter::Flat { radius: big_r };
    let mut worst = 0.0_f64;
    for tilt in [0.5, 2.0, 5.0, 10.0, 30.0, 60.0] {
        let th = deg(tilt);
        let ang = angles(0.0, th);
        for frac in [1e-6, 1e-3, 0.1, 0.5, 0.99] {
            // Heights up to the bottom's rise 2R sin θ (the cusp on the bottom).
            let h = frac * 2.0 * big_r * th.sin();
            let want = 2.0 * h / (2.0 * th).sin();
            let got = cut_width(&c, &ang, h).unwrap();
            // Round-off of coordinates of the size of R, and 1e-13 of the width.
            let allowed = 1e-13 * want + 4.0 * f64::EPSILON * big_r;
            worst = worst.max((got - want).abs() / allowed);
            assert!(
                (got - want).abs() <= allowed,
                "tilt {tilt} h {h}: {got} vs {want}"
            );
            for side in [1.0, -1.0] {
                // Negative tilt mirrors the outline: the same width.
                let m = cut_width(&c, &angles(0.0, side * th), h).unwrap();
                assert!(
                    (m - want).abs() <= allowed,
                    "tilt {} h {h}: {m}",
                    side * tilt
                );
            }
        }
    }
    eprintln!("flat cutter, tilt only: worst width error {worst:.3} of the allowance");
}
