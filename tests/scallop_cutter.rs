//! The scallop between two passes of a flat-end, toroidal or ball-end cutter at lead and tilt
//! (`strake::planning::scallop_cutter`): against a direct two-profile intersection by brute
//! force (the sampled cutter's lower envelope, placed at both contacts on the cross-section,
//! the highest point under both), for a ball against the two-circle closed form, and its
//! inverse against the forward construction and the width the cutter cuts.

use std::f64::consts::PI;
use strake::checks::scallop::{scallop_height, step_over_for_scallop};
use strake::checks::{Cutter, ToolAngles, cut_width, cutter_radii};
use strake::{StrakeError, Vec3, scallop_between_cutters, step_over_for_cutter_scallop};

fn rel(a: f64, b: f64) -> f64 {
    (a - b).abs() / b.abs().max(1e-300)
}

fn deg(x: f64) -> f64 {
    x.to_radians()
}

fn angles(lead: f64, tilt: f64) -> ToolAngles {
    ToolAngles {
        lead: deg(lead),
        tilt: deg(tilt),
    }
}

/// The cutter touching the plane z = 0 at the origin (T = x, b_t = y, n_t = z): the centre of
/// its corner-centre circle, the circle's axes e1, e2 and the tool axis. Brute-force geometry:
/// the axis a = (sin λ, cos λ sin θ, cos λ cos θ), the lowest corner tube toward −n_t.
fn placed(cutter: &Cutter, ang: &ToolAngles) -> (Vec3, Vec3, Vec3, Vec3) {
    let (big_r, r) = cutter.torus_radii();
    let (sl, cl) = ang.lead.sin_cos();
    let (st, ct) = ang.tilt.sin_cos();
    let a = Vec3::new(sl, cl * st, cl * ct);
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

/// Lower envelope z(y) of the cutter swept along x (its outline seen along T) at lateral y:
/// the least z over the torus (rings of tube angle χ, each cut exactly by the plane y =
/// const), a scan of χ then golden-section refinement. The flank is not seen (the cases keep
/// the cusp on the corner and bottom). Beyond the cutter's lateral reach the value grows with
/// the miss (the penalty), instead of a point of the cutter.
fn envelope(cutter: &Cutter, ang: &ToolAngles, y: f64) -> f64 {
    let (big_r, r) = cutter.torus_radii();
    let (q0, e1, e2, a) = placed(cutter, ang);
    let on_ring = |chi: f64| {
        let (s, c) = chi.sin_cos();
        let centre = q0 + a * (r * s);
        let rad = big_r + r * c;
        let (aa, bb) = (rad * e1.y, rad * e2.y);
        let m = aa.hypot(bb);
        let cc = (y - centre.y) / m;
        if cc.is_nan() {
            return f64::INFINITY;
        }
        // A ring that does not reach the plane y = const: its nearest point, raised by a
        // penalty growing with the miss, so that the least z (often on a ring just reaching
        // the plane: the bottom seen edge-on) is approached continuously by the refinement.
        let miss = (cc.abs() - 1.0).max(0.0) * m;
        let phi0 = bb.atan2(aa);
        let d = cc.clamp(-1.0, 1.0).acos();
        [phi0 + d, phi0 - d]
            .iter()
            .map(|&psi| centre.z + rad * (psi.cos() * e1.z + psi.sin() * e2.z))
            .fold(f64::INFINITY, f64::min)
            + 1e3 * miss
    };
    // No ring reaches the plane: outside the cutter's lateral reach.
    let reach = (-1..=1).any(|k| {
        let chi = 0.5 * PI * k as f64;
        let centre = q0 + a * (r * chi.sin());
        let rad = big_r + r * chi.cos();
        ((y - centre.y) / (rad * e1.y).hypot(rad * e2.y)).abs() <= 1.0
    });
    if !reach {
        return f64::INFINITY;
    }
    if r == 0.0 {
        return on_ring(0.0);
    }
    let n = 180;
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
    for _ in 0..40 {
        let (p, q) = (hi - g * (hi - lo), lo + g * (hi - lo));
        if on_ring(p) < on_ring(q) {
            hi = q;
        } else {
            lo = p;
        }
    }
    on_ring(0.5 * (lo + hi)).min(best.0)
}

/// The cross-section: the circle of curvature κ through the origin tangent to y, bending
/// toward +z for κ > 0 (centre (0, 1/κ)); the plane z = 0 for κ = 0.
struct Circle {
    kappa: f64,
}

impl Circle {
    /// The contact point, b_t and n_t at arc length σ (circle geometry).
    fn at(&self, sigma: f64) -> ([f64; 2], [f64; 2], [f64; 2]) {
        let k = self.kappa;
        if k == 0.0 {
            return ([sigma, 0.0], [1.0, 0.0], [0.0, 1.0]);
        }
        let a = sigma * k;
        (
            [a.sin() / k, (1.0 - a.cos()) / k],
            [a.cos(), a.sin()],
            [-a.sin(), a.cos()],
        )
    }
    /// Angle of p about the centre, as arc length (the y coordinate for the plane).
    fn arc(&self, p: [f64; 2]) -> f64 {
        let k = self.kappa;
        if k == 0.0 {
            return p[0];
        }
        let c = [0.0, 1.0 / k];
        let (dy, dz) = (p[0] - c[0], p[1] - c[1]);
        // From the centre the contact at σ is at angle σ κ from −z (κ > 0) or +z (κ < 0).
        if k > 0.0 {
            dy.atan2(-dz) / k
        } else {
            (-dy).atan2(dz) / k
        }
    }
    /// Distance from the circle, positive on the tool side.
    fn height(&self, p: [f64; 2]) -> f64 {
        let k = self.kappa;
        if k == 0.0 {
            return p[1];
        }
        let d = (p[0]).hypot(p[1] - 1.0 / k);
        if k > 0.0 { 1.0 / k - d } else { d + 1.0 / k }
    }
}

/// Brute force: the highest point under both profiles. Each profile is the sampled cutter's
/// lower envelope placed at its contact (arc 0 and w) in that contact's frame; along each
/// radial line between the contacts (arc σ) each profile's height is where its envelope
/// crosses the line (bisection on the envelope's lateral coordinate); the scallop is the
/// largest over σ of the smaller of the two (scan, then golden section).
fn brute_scallop(cutter: &Cutter, ang: &ToolAngles, w: f64, kappa: f64) -> f64 {
    let circle = Circle { kappa };
    let z0 = envelope(cutter, ang, 0.0);
    let (big_r, r) = cutter.torus_radii();
    let span = 2.0 * (big_r + r);
    let profile_height = |origin: f64, sigma: f64| {
        let (c, b, n) = circle.at(origin);
        let point = |y: f64| {
            let z = envelope(cutter, ang, y) - z0;
            [c[0] + y * b[0] + z * n[0], c[1] + y * b[1] + z * n[1]]
        };
        let (mut lo, mut hi) = (-span, span);
        for _ in 0..44 {
            let mid = 0.5 * (lo + hi);
            let p = point(mid);
            if p[1].is_finite() && circle.arc(p) < sigma {
                lo = mid;
            } else if p[1].is_finite() {
                hi = mid;
            } else if mid < 0.0 {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        circle.height(point(0.5 * (lo + hi)))
    };
    let under = |sigma: f64| profile_height(0.0, sigma).min(profile_height(w, sigma));
    let n = 16;
    let mut best = (f64::NEG_INFINITY, 0.0);
    for k in 1..n {
        let s = w * k as f64 / n as f64;
        let h = under(s);
        if h > best.0 {
            best = (h, s);
        }
    }
    let (mut lo, mut hi) = (best.1 - w / n as f64, best.1 + w / n as f64);
    let g = 0.5 * (5f64.sqrt() - 1.0);
    for _ in 0..38 {
        let (p, q) = (hi - g * (hi - lo), lo + g * (hi - lo));
        if under(p) > under(q) {
            hi = q;
        } else {
            lo = p;
        }
    }
    under(0.5 * (lo + hi)).max(best.0)
}

/// The scallop against the brute force for tilted flat and toroidal cutters on the
/// cross-section of curvature `kappa`, their cusps on the corner or the bottom (the brute
/// force does not see the flank).
fn against_brute_force(kappa: f64) {
    let toroidal = Cutter::Toroidal {
        radius: 5.0,
        corner_radius: 1.0,
    };
    let flat = Cutter::Flat { radius: 5.0 };
    let cases = [
        (toroidal, angles(6.0, 8.0), 1.5),
        (toroidal, angles(0.0, 10.0), 0.8),
        (toroidal, angles(12.0, 0.0), 2.5),
        (flat, angles(5.0, 3.0), 3.0),
    ];
    for (cutter, ang, w) in cases {
        let got = scallop_between_cutters(&cutter, &ang, w, kappa).unwrap();
        assert!(
            !got.on_flank,
            "{cutter:?} {ang:?}: the case must keep off the flank"
        );
        let brute = brute_scallop(&cutter, &ang, w, kappa);
        eprintln!(
            "{cutter:?} lead {:.0} tilt {:.0} w {w} kappa {kappa:.4}: {:.9e} brute {brute:.9e}",
            ang.lead.to_degrees(),
            ang.tilt.to_degrees(),
            got.height
        );
        assert!(
            rel(got.height, brute) < 1e-7,
            "{cutter:?} {ang:?} w {w} kappa {kappa}: {} vs {brute}",
            got.height
        );
    }
}

// Issue 13 item 4 / issue 12 "Checks": the scallop of tilted flat and toroidal cutters against
// a direct two-profile intersection (brute force above, independent of the library), on a
// plane, a concave and a convex cross-section (one test each, so that they run side by side).
#[test]
fn cutter_scallop_matches_the_brute_force_on_a_plane() {
    against_brute_force(0.0);
}

#[test]
fn cutter_scallop_matches_the_brute_force_on_a_concave_section() {
    against_brute_force(1.0 / 60.0);
}

#[test]
fn cutter_scallop_matches_the_brute_force_on_a_convex_section() {
    against_brute_force(-1.0 / 30.0);
}

// A flat cutter tilted by θ without lead: its contact is the low corner, so one pass's flank
// (rising along the axis, z = y cot θ) meets the next pass's bottom (z = (w − y) tan θ) at
// h = (w/2) sin 2θ on a plane (plane geometry, derived here; the cusp on the flank).
#[test]
fn flat_cutter_tilted_without_lead_leaves_the_flank_and_bottom_closed_form() {
    let c = Cutter::Flat { radius: 5.0 };
    for tilt in [1.0, 4.0, 10.0] {
        let th = deg(tilt);
        for w in [0.1, 1.0, 5.0] {
            let got = scallop_between_cutters(&c, &angles(0.0, tilt), w, 0.0).unwrap();
            let want = 0.5 * w * (2.0 * th).sin();
            assert!(got.on_flank, "{got:?}");
            assert!(
                (got.height - want).abs() <= 1e-13 * want + 1e-15 * 5.0,
                "tilt {tilt} w {w}: {got:?} vs {want}"
            );
        }
    }
}

// A ball's profile is its circle at any lead and tilt: the cusp is the two-circle intersection
// of `scallop_height` (Suresh & Yang 1994; Lin & Koren 1996; circle geometry).
#[test]
fn ball_scallop_is_the_two_circle_closed_form() {
    let ball = Cutter::Ball { radius: 3.0 };
    for ang in [angles(0.0, 0.0), angles(15.0, -10.0)] {
        for (w, kappa) in [(0.9, 0.0), (1.5, 0.1), (0.6, 0.3), (2.0, -0.2), (1.2, -1.0)] {
            let got = scallop_between_cutters(&ball, &ang, w, kappa).unwrap();
            let want = scallop_height(3.0, w, kappa).unwrap();
            assert!(
                rel(got.height, want) < 1e-11,
                "w {w} kappa {kappa}: {got:?} vs {want}"
            );
            let back = step_over_for_cutter_scallop(&ball, &ang, want, kappa).unwrap();
            let w_exact = step_over_for_scallop(3.0, want, kappa).unwrap();
            assert!(
                rel(back.step_over, w_exact) < 1e-11,
                "{back:?} vs {w_exact}"
            );
        }
    }
}

// The inverse (the turning argument) against the forward cusp search, and on a plane against
// the width the cutter cuts at that height (`cut_width`: two translated outlines meet where
// the outline is as wide as the translation). Issue 12's flat 10 mm cutter at 5° lead and a
// 0.5 mm scallop: the model alone said 15.1 mm; it cuts 10 mm, its cusp on the flank.
#[test]
fn cutter_step_over_inverts_the_scallop_and_is_limited_by_the_width_cut() {
    let toroidal = Cutter::Toroidal {
        radius: 5.0,
        corner_radius: 1.0,
    };
    let flat = Cutter::Flat { radius: 5.0 };
    for (cutter, ang) in [
        (toroidal, angles(6.0, 8.0)),
        (toroidal, angles(0.0, 10.0)),
        (flat, angles(5.0, 3.0)),
        (flat, angles(0.0, 4.0)),
        (flat, angles(7.0, 0.0)),
    ] {
        for h in [0.002, 0.05, 0.3] {
            for kappa in [0.0, 0.01, -0.02] {
                let s = step_over_for_cutter_scallop(&cutter, &ang, h, kappa).unwrap();
                let fwd = scallop_between_cutters(&cutter, &ang, s.step_over, kappa).unwrap();
                assert!(
                    rel(fwd.height, h) < 1e-9,
                    "{cutter:?} {ang:?} h {h} kappa {kappa}: {s:?} gives {fwd:?}"
                );
                let plane = cut_width(&cutter, &ang, h).unwrap();
                assert_eq!(s.width_on_plane, plane);
                if kappa == 0.0 {
                    assert!(rel(s.step_over, plane) < 1e-12, "{s:?} vs {plane}");
                }
            }
        }
    }
    let c = Cutter::Flat { radius: 5.0 };
    let s = step_over_for_cutter_scallop(&c, &angles(5.0, 0.0), 0.5, 0.0).unwrap();
    assert!(rel(s.step_over, 10.0) < 1e-12 && s.on_flank, "{s:?}");
    // The circle model with the radius across the path is 15.1 mm there (issue 12).
    let rho = cutter_radii(&c, &angles(5.0, 0.0)).unwrap().across_path;
    assert!(step_over_for_scallop(rho, 0.5, 0.0).unwrap() > 15.0);
}

// Bad input: each a status naming the value.
#[test]
fn cutter_scallop_refuses_bad_input() {
    let c = Cutter::Toroidal {
        radius: 5.0,
        corner_radius: 1.0,
    };
    let ang = angles(6.0, 8.0);
    let msg = |e: StrakeError| e.to_string();
    for (w, kappa, text) in [
        (0.0, 0.0, "step-over = 0"),
        (f64::NAN, 0.0, "step-over = NaN"),
        (1.0, f64::INFINITY, "cross-path curvature = "),
        (1.0, 2.0, "gouges"),
        (40.0, 0.0, "too wide"),
        (20.0, -0.1, "quarter circle"),
    ] {
        let e = msg(scallop_between_cutters(&c, &ang, w, kappa).unwrap_err());
        assert!(e.contains(text), "{w} {kappa}: {e}");
    }
    for (h, text) in [(0.0, "height = 0"), (f64::NAN, "height = NaN")] {
        let e = msg(step_over_for_cutter_scallop(&c, &ang, h, 0.0).unwrap_err());
        assert!(e.contains(text), "{h}: {e}");
    }
    let bad = Cutter::Toroidal {
        radius: 1.0,
        corner_radius: 2.0,
    };
    assert!(scallop_between_cutters(&bad, &ang, 1.0, 0.0).is_err());
    let e = msg(scallop_between_cutters(
        &c,
        &ToolAngles {
            lead: 2.0,
            tilt: 0.0,
        },
        1.0,
        0.0,
    )
    .unwrap_err());
    assert!(e.contains("lead angle = 2"), "{e}");
}
