//! Research harness: how the error of κn, κg, τg, k1, k2 grows as the conditioning figures
//! shrink, measured against exact answers. Run with
//!
//! ```text
//! cargo run --release --example conditioning_sweep
//! ```
//!
//! The points come from `examples/data/conditioning_sweep.txt`, written by
//! `examples/data/conditioning_sweep.py` (mpmath at 100 digits, exact for the f64 inputs): the
//! pole of a parametrised sphere, a Monge patch and a plane whose Su and Sv become nearly
//! parallel, and curves that stall (while turning, and coming smoothly to rest). Each point is
//! evaluated twice:
//!
//! - **exact jets**: the surface jet as the host would deliver it at best (the sphere from
//!   `strake::analytic::sphere`, the other surfaces as the exact jets rounded to f64);
//! - **host-noise jets**: every jet entry also carries an error of ε = 2⁻⁵² times the largest
//!   entry of the same derivative order (|Su|, |Sv| for first derivatives; |Suu|, |Suv|, |Svv|
//!   for second), 16 draws, the worst kept. This is the error any evaluator that sums terms
//!   (NURBS, the quotient rule of a rational surface, a rotation of the surface) leaves, and it
//!   is what decides how far from a degeneracy a result can be trusted.
//!
//! Errors are relative to the size of the quantity's kind: κn, τg, k1, k2 against
//! max(|k1|, |k2|) (the space curvature κ on a plane), κg against κ = √(κn² + κg²). The tables
//! print the worst error over the curves of a level against the conditioning figure; then a
//! least-squares fit of log error against log figure (over errors between 1e-13 and 1e-2, above
//! round-off and below saturation) gives the exponent p in error ≈ C ε / figure^p, and the
//! largest figure at which some error exceeds 1e-6. `docs/accuracy.md` records the results.
//!
//! To evaluate below the refusal limits, the surface point is built with
//! [`SurfacePoint::new_with_limit`] (limit 0), and the speed figure, which is proportional to
//! the t extent and to nothing else, is kept above [`strake::geometry::frame::STALLED_CURVE_LIMIT`] by
//! passing a t extent of 1e30; the figures printed are those of the true extents.

use std::collections::HashMap;
use strake::geometry::frame::{curve_speed_figure, darboux_frame_at};
use strake::geometry::math::vec3;
use strake::geometry::principal::surface_conditioning;
use strake::{
    CurveJet, DerivOrder, Orientation, ParamScales, SurfaceJet, SurfacePoint, SurfaceSource,
    analytic,
};

const EPS: f64 = f64::EPSILON;
const DRAWS: usize = 16;
const TARGET: f64 = 1e-6;

struct Row {
    case: String,
    curve: String,
    level: u32,
    scales: ParamScales,
    jet: SurfaceJet,
    cj: CurveJet,
    /// kn, kg, tg, k1, k2.
    want: [f64; 5],
}

fn load() -> Vec<Row> {
    let path = std::path::Path::new(env!("CARGO_MANIFEST_DIR"))
        .join("examples/data/conditioning_sweep.txt");
    let text = std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("{}: {e}", path.display()));
    let mut lines = text.lines().filter(|l| !l.starts_with('#'));
    let header: Vec<&str> = lines.next().expect("header").split_whitespace().collect();
    let col: HashMap<&str, usize> = header.iter().enumerate().map(|(i, c)| (*c, i)).collect();
    lines
        .map(|line| {
            let tok: Vec<&str> = line.split_whitespace().collect();
            assert_eq!(tok.len(), header.len(), "bad line: {line}");
            let num = |name: &str| -> f64 {
                tok[col[name]]
                    .parse()
                    .unwrap_or_else(|_| panic!("{name}: {line}"))
            };
            let v3 = |name: &str| {
                vec3([
                    num(&format!("{name}.x")),
                    num(&format!("{name}.y")),
                    num(&format!("{name}.z")),
                ])
            };
            Row {
                case: tok[col["case"]].to_string(),
                curve: tok[col["curve"]].to_string(),
                level: tok[col["level"]].parse().unwrap(),
                scales: ParamScales {
                    u_extent: num("u_extent"),
                    v_extent: num("v_extent"),
                    t_extent: num("t_extent"),
                },
                jet: SurfaceJet {
                    p: v3("S"),
                    su: v3("Su"),
                    sv: v3("Sv"),
                    suu: v3("Suu"),
                    suv: v3("Suv"),
                    svv: v3("Svv"),
                },
                cj: CurveJet {
                    u: num("u"),
                    v: num("v"),
                    du: num("du"),
                    dv: num("dv"),
                    ddu: num("ddu"),
                    ddv: num("ddv"),
                },
                want: [num("kn"), num("kg"), num("tg"), num("k1"), num("k2")],
            }
        })
        .collect()
}

/// xorshift64*: a small deterministic generator for the noise draws.
struct Rng(u64);

impl Rng {
    /// Uniform in [−1, 1].
    fn next(&mut self) -> f64 {
        self.0 ^= self.0 >> 12;
        self.0 ^= self.0 << 25;
        self.0 ^= self.0 >> 27;
        let x = self.0.wrapping_mul(0x2545_F491_4F6C_DD1D) >> 11;
        (x as f64) / ((1u64 << 53) as f64) * 2.0 - 1.0
    }
}

fn noisy_jet(j: &SurfaceJet, rng: &mut Rng) -> SurfaceJet {
    let m1 = j.su.norm().max(j.sv.norm());
    let m2 = j.suu.norm().max(j.suv.norm()).max(j.svv.norm());
    let mut bump =
        |v: strake::Vec3, m: f64| v + vec3([rng.next(), rng.next(), rng.next()]) * (EPS * m);
    SurfaceJet {
        p: j.p,
        su: bump(j.su, m1),
        sv: bump(j.sv, m1),
        suu: bump(j.suu, m2),
        suv: bump(j.suv, m2),
        svv: bump(j.svv, m2),
    }
}

fn noisy_curve(c: &CurveJet, rng: &mut Rng) -> CurveJet {
    let m1 = c.du.abs().max(c.dv.abs());
    let m2 = c.ddu.abs().max(c.ddv.abs());
    CurveJet {
        du: c.du + rng.next() * EPS * m1,
        dv: c.dv + rng.next() * EPS * m1,
        ddu: c.ddu + rng.next() * EPS * m2,
        ddv: c.ddv + rng.next() * EPS * m2,
        ..*c
    }
}

/// Relative errors of kn, kg, tg, k1, k2 (see the module docs for the scales), or None when the
/// library refused (only possible for an exactly singular input).
fn errors(
    jet: &SurfaceJet,
    cj: &CurveJet,
    scales: &ParamScales,
    want: &[f64; 5],
) -> Option<[f64; 5]> {
    let sp = SurfacePoint::new_with_limit(
        jet,
        Orientation::Forward,
        cj.u,
        cj.v,
        scales.u_extent,
        scales.v_extent,
        0.0,
    )
    .ok()?;
    let wide = ParamScales {
        t_extent: 1e30,
        ..*scales
    };
    let f = darboux_frame_at(jet, &sp, cj, &wide, 0.0).ok()?;
    let kappa = want[0].hypot(want[1]);
    let surf_scale = {
        let s = want[3].abs().max(want[4].abs());
        if s > 0.0 { s } else { kappa }
    };
    let got = [
        f.normal_curvature,
        f.geodesic_curvature,
        f.geodesic_torsion,
        f.principal.k1,
        f.principal.k2,
    ];
    let scale = [surf_scale, kappa, surf_scale, surf_scale, surf_scale];
    let mut out = [0.0; 5];
    for i in 0..5 {
        out[i] = (got[i] - want[i]).abs() / scale[i];
    }
    Some(out)
}

fn fit(points: &[(f64, f64)]) -> Option<(f64, usize)> {
    let pts: Vec<(f64, f64)> = points
        .iter()
        .filter(|(_, e)| *e > 1e-13 && *e < 1e-2)
        .map(|(c, e)| (c.log10(), e.log10()))
        .collect();
    if pts.len() < 3 {
        return None;
    }
    let n = pts.len() as f64;
    let (sx, sy) = pts.iter().fold((0.0, 0.0), |a, p| (a.0 + p.0, a.1 + p.1));
    let (mx, my) = (sx / n, sy / n);
    let sxy: f64 = pts.iter().map(|p| (p.0 - mx) * (p.1 - my)).sum();
    let sxx: f64 = pts.iter().map(|p| (p.0 - mx) * (p.0 - mx)).sum();
    Some((-sxy / sxx, pts.len()))
}

/// The fitted exponent and the largest figure at which the error exceeds the target, as table
/// cells.
fn fit_row(s: &[(f64, f64)]) -> (String, String) {
    let p = fit(s).map_or("no growth above round-off".to_string(), |(p, n)| {
        format!("p = {p:.2} ({n} points)")
    });
    let cross = s
        .iter()
        .filter(|(_, e)| e.is_nan() || *e > TARGET)
        .map(|(c, _)| *c)
        .fold(0.0, f64::max);
    let cross = if cross > 0.0 {
        format!("{cross:.1e}")
    } else {
        "never".to_string()
    };
    (p, cross)
}

const NAMES: [&str; 5] = ["kn", "kg", "tg", "k1", "k2"];

fn main() {
    let rows = load();
    let sphere = analytic::sphere(1.0);
    let mut cases: Vec<String> = Vec::new();
    for r in &rows {
        if !cases.contains(&r.case) {
            cases.push(r.case.clone());
        }
    }
    println!(
        "Conditioning sweep: worst relative error over the curves of each level (ε = {EPS:.2e})."
    );
    println!("Scales: kn, tg, k1, k2 against max(|k1|, |k2|) (κ on a plane); kg against κ.\n");
    let mut summary = Vec::new();
    for case in &cases {
        let stall = case.starts_with("stall");
        let figure_name = if stall {
            "curve figure"
        } else {
            "surface figure"
        };
        println!("## {case}\n");
        println!(
            "| {figure_name} | exact jets: kn | kg | tg | k1 | k2 | host-noise jets: kn | kg | tg | k1 | k2 |"
        );
        println!("|---|---|---|---|---|---|---|---|---|---|---|");
        let mut levels: Vec<u32> = rows
            .iter()
            .filter(|r| &r.case == case)
            .map(|r| r.level)
            .collect();
        levels.dedup();
        let mut series: Vec<Vec<(f64, f64)>> = vec![Vec::new(); 10];
        for level in levels {
            let mut figure = f64::INFINITY;
            let mut worst = [0.0f64; 10];
            let mut refused = false;
            for (k, r) in rows
                .iter()
                .filter(|r| &r.case == case && r.level == level)
                .enumerate()
            {
                let jet = if case == "sphere-pole" {
                    sphere
                        .checked_jet(r.cj.u, r.cj.v, DerivOrder::Second, &mut Default::default())
                        .unwrap()
                } else {
                    r.jet
                };
                let cross = jet.su.cross(&jet.sv).norm();
                let fig = if stall {
                    curve_speed_figure(&r.cj, &r.scales)
                } else {
                    surface_conditioning(&jet, cross, r.scales.u_extent, r.scales.v_extent)
                };
                figure = figure.min(fig);
                match errors(&jet, &r.cj, &r.scales, &r.want) {
                    Some(e) => (0..5).for_each(|i| worst[i] = worst[i].max(e[i])),
                    None => refused = true,
                }
                let mut rng = Rng(0x9E37_79B9_7F4A_7C15 ^ ((level as u64) << 8) ^ k as u64);
                for _ in 0..DRAWS {
                    let (nj, nc) = (noisy_jet(&jet, &mut rng), noisy_curve(&r.cj, &mut rng));
                    match errors(&nj, &nc, &r.scales, &r.want) {
                        Some(e) => (0..5).for_each(|i| worst[5 + i] = worst[5 + i].max(e[i])),
                        None => refused = true,
                    }
                }
                let _ = &r.curve;
            }
            let cells: Vec<String> = worst.iter().map(|e| format!("{e:.1e}")).collect();
            println!(
                "| {figure:.1e} | {} |{}",
                cells.join(" | "),
                if refused { " (some refused)" } else { "" }
            );
            for i in 0..10 {
                series[i].push((figure, worst[i]));
            }
        }
        println!();
        for (i, s) in series.iter().enumerate() {
            let model = if i < 5 {
                "exact jets"
            } else {
                "host-noise jets"
            };
            let name = NAMES[i % 5];
            let (p, cross) = fit_row(s);
            summary.push(format!("| {case} | {model} | {name} | {p} | {cross} |"));
        }
    }
    nurbs_sphere_pole(&mut summary);
    println!(
        "## Fitted growth: error ≈ C ε / figure^p; largest figure with error > {TARGET:.0e}\n"
    );
    println!("| case | jets | quantity | exponent | error > {TARGET:.0e} at figure ≤ |");
    println!("|---|---|---|---|---|");
    for line in summary {
        println!("{line}");
    }
}

/// The pole of a NURBS sphere (radius 1, rational quadratic circles revolved, The NURBS Book
/// ch. 8, both circle forms): here the jets come from strake's own NURBS evaluator, so its
/// rounding is the host noise. Exact answers need no table: on a unit sphere with the outward
/// normal κn = k1 = k2 = −1 and τg = 0 for every curve, and a meridian (u = const, a great
/// circle) has κg = 0 (do Carmo ch. 3). Curves: the meridian, the parallel and two slanted
/// directions; κg is checked on the meridian only.
fn nurbs_sphere_pole(summary: &mut Vec<String>) {
    use strake::nurbs::conics::{CircleForm, sphere};
    for (form, name) in [
        (CircleForm::NinePoint, "9-point"),
        (CircleForm::SevenPoint, "7-point"),
    ] {
        let s = sphere(1.0, form).unwrap();
        let (ud, vd) = (s.u_domain(), s.v_domain());
        let scales = ParamScales {
            u_extent: ud.width(),
            v_extent: vd.width(),
            t_extent: 1e30,
        };
        println!("## NURBS sphere pole ({name} circle, jets from strake's NURBS evaluator)\n");
        println!("| surface figure | kn | kg (meridian) | tg | k1 | k2 |");
        println!("|---|---|---|---|---|---|");
        let mut series: Vec<Vec<(f64, f64)>> = vec![Vec::new(); 5];
        for k in 1..=28 {
            let dv = 10f64.powf(-0.5 * k as f64);
            let mut worst = [0.0f64; 5];
            let mut figure = f64::INFINITY;
            for &v in &[vd.lo + dv * vd.width(), vd.hi - dv * vd.width()] {
                for &u in &[0.13 * ud.width(), 0.61 * ud.width()] {
                    let jet = s
                        .checked_jet(u, v, DerivOrder::Second, &mut Default::default())
                        .unwrap();
                    let cross = jet.su.cross(&jet.sv).norm();
                    let fig = surface_conditioning(&jet, cross, scales.u_extent, scales.v_extent);
                    figure = figure.min(fig);
                    let Ok(sp) = SurfacePoint::new_with_limit(
                        &jet,
                        Orientation::Forward,
                        u,
                        v,
                        scales.u_extent,
                        scales.v_extent,
                        0.0,
                    ) else {
                        continue;
                    };
                    for (i, &(du, dvv)) in [(0.0, 1.0), (1.0, 0.0), (1.0, 1.0), (1.0, -0.3)]
                        .iter()
                        .enumerate()
                    {
                        let cj = CurveJet {
                            u,
                            v,
                            du,
                            dv: dvv,
                            ddu: 0.0,
                            ddv: 0.0,
                        };
                        let Ok(f) = darboux_frame_at(&jet, &sp, &cj, &scales, 0.0) else {
                            continue;
                        };
                        let e = [
                            (f.normal_curvature + 1.0).abs(),
                            if i == 0 {
                                f.geodesic_curvature.abs()
                            } else {
                                0.0
                            },
                            f.geodesic_torsion.abs(),
                            (f.principal.k1 + 1.0).abs(),
                            (f.principal.k2 + 1.0).abs(),
                        ];
                        (0..5).for_each(|q| worst[q] = worst[q].max(e[q]));
                    }
                }
            }
            let cells: Vec<String> = worst.iter().map(|e| format!("{e:.1e}")).collect();
            println!("| {figure:.1e} | {} |", cells.join(" | "));
            // Below ~1e-7 the errors saturate (and at times come out small by luck of the
            // rounding); the fit uses the regime above.
            if figure >= 1e-7 {
                for q in 0..5 {
                    series[q].push((figure, worst[q]));
                }
            }
        }
        println!();
        for (q, s) in series.iter().enumerate() {
            let (p, cross) = fit_row(s);
            summary.push(format!(
                "| nurbs-sphere-pole ({name}) | NURBS evaluator | {} | {p} | {cross} |",
                NAMES[q]
            ));
        }
    }
}
