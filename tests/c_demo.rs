//! Builds the C host demo (`examples/c/mould_cavity.c`) and the C check program
//! (`tests/c/abi_check.c`) with the system C compiler and strict warnings, runs them, and checks
//! the demo's numbers (frames, milling checks, fibre course) against the Rust API evaluating the
//! same surfaces and paths and against the formulas they stand for. Also runs both under
//! AddressSanitizer/UBSan and valgrind when available.

#[path = "support/c_build.rs"]
mod c_build;

use std::path::PathBuf;
use std::process::Command;
use strake::checks::{
    Cutter, FeedLimits, ToolAngles, ToolSide, cross_path_curvature, curvature_limited_feed,
    gouge_state, scallop_height, violations,
};
use strake::nurbs::basis_rows;
use strake::{
    CurveOnSurface, DerivOrder, FitOptions, FnSurface, Hints, Interval, KnotVector, NurbsCurve,
    Orientation, PathSample, ProjectionOptions, SeamCurve, SpanHint, SurfaceJet, Vec3, arc_length,
    project_curve, uv_curve_through_points,
};

fn build(name: &str, sources: &[PathBuf], extra: &[&str]) -> PathBuf {
    let exe = c_build::build_dir().unwrap().join(name);
    if let Err(e) = c_build::compile(sources, &exe, extra) {
        panic!("{e}");
    }
    exe
}

fn run(exe: &PathBuf, args: &[&str]) -> String {
    let out = Command::new(exe)
        .args(args)
        .output()
        .expect("run the C program");
    let stdout = String::from_utf8(out.stdout).expect("UTF-8 output");
    assert!(
        out.status.success(),
        "{} {args:?} failed ({}):\n{stdout}\n{}",
        exe.display(),
        out.status,
        String::from_utf8_lossy(&out.stderr)
    );
    stdout
}

/// What `mould_cavity --raw` prints: the data it built, and every result it got from strake.
#[derive(Default)]
struct Raw {
    knots_u: Vec<f64>,
    knots_v: Vec<f64>,
    count_v: usize,
    net: Vec<Vec3>,
    /// The host's contact points of the pass.
    pass_points: Vec<[f64; 3]>,
    pass_tolerance: f64,
    /// Per contact point: u, v, distance, signed distance of its foot point.
    pass_feet: Vec<[f64; 4]>,
    /// Per sample: the 31 numbers of the frame in struct order, then the arc length.
    frames: Vec<Vec<f64>>,
    /// (field, "min"/"max", sample index).
    extremes: Vec<(String, String, usize)>,
    /// Ball radius, step-over, scallop limit, feed, max acceleration, max jerk, chord
    /// tolerance, max step, arc tolerance.
    mill_setup: Vec<f64>,
    /// Per sample: t, arc length, concave curvature, scallop height, feed.
    mill: Vec<[f64; 5]>,
    /// (kind, [start s, end s, start t, end t, first index, last index, worst]).
    violations: Vec<(String, [f64; 7])>,
    /// Span, chord, crown, taper, twist.
    wing: Vec<f64>,
    course_knots: Vec<f64>,
    course_points: Vec<[f64; 3]>,
    /// Projection tolerance, fit tolerance, length, tow width, min steering radius, max twist.
    course_setup: Vec<f64>,
    /// Per sample: t, arc length, steering curvature, edge strain, twist rate.
    course: Vec<[f64; 5]>,
    /// Per pass plan: rule, side, count, rows, first length, total length, scallop min,
    /// scallop max, offset points, trace jets, covered.
    plans: Vec<Vec<f64>>,
    /// Per pass of a plan: rule, side, index, row, has parent, parent, length, step-over min,
    /// max, scallop min, max.
    plan_passes: Vec<Vec<f64>>,
    /// Bull-nose radius, corner radius, lead, tilt, radius across the path, inclination-plane
    /// radius.
    rear_setup: Vec<f64>,
    /// Per sample: t, arc length, rear margin, depth, gouges, has min lead, min lead.
    rear: Vec<[f64; 7]>,
    /// Courses: band width, start u, v, angle, trace tolerance, gap tolerance.
    plan_setup: Vec<f64>,
    /// Per course: index, start u, v, length, end, side, end u, v.
    plan_courses: Vec<Vec<f64>>,
    /// Per course: index, largest |kg|, largest |tg|, steering and twist violations.
    plan_checks: Vec<Vec<f64>>,
    /// Per gap: pair index, index, t0, t1, overlap, worst.
    plan_gaps: Vec<Vec<f64>>,
    /// The parallel course: length, smallest steering radius, largest twist, violations.
    plan_parallel: Vec<f64>,
}

fn numbers(rest: &[&str]) -> Vec<f64> {
    rest.iter()
        .map(|x| {
            x.parse::<f64>()
                .unwrap_or_else(|_| panic!("not a number: {x}"))
        })
        .collect()
}

fn indexed<const N: usize>(line: &str, rest: &[&str], expected_index: usize) -> [f64; N] {
    let v = numbers(rest);
    assert_eq!(v.len(), N + 1, "{line}");
    assert_eq!(v[0] as usize, expected_index, "{line}");
    v[1..].try_into().unwrap()
}

fn parse_raw(text: &str) -> Raw {
    let mut r = Raw::default();
    let triples = |v: Vec<f64>| v.chunks(3).map(|c| [c[0], c[1], c[2]]).collect::<Vec<_>>();
    for line in text.lines() {
        let words: Vec<&str> = line.split_whitespace().collect();
        let (key, rest) = words.split_first().expect("non-empty line");
        match *key {
            "surface_degree" => assert_eq!(rest, ["3", "3"]),
            "surface_count" => r.count_v = rest[1].parse().unwrap(),
            "knots_u" => r.knots_u = numbers(rest),
            "knots_v" => r.knots_v = numbers(rest),
            "net" => {
                r.net = numbers(rest)
                    .chunks(3)
                    .map(|c| Vec3::new(c[0], c[1], c[2]))
                    .collect()
            }
            "pass_points" => r.pass_points = triples(numbers(rest)),
            "pass_tolerance" => r.pass_tolerance = numbers(rest)[0],
            "pass_foot" => r.pass_feet.push(indexed(line, rest, r.pass_feet.len())),
            "frame" => {
                let v = numbers(rest);
                assert_eq!(v.len(), 33, "{line}");
                assert_eq!(v[0] as usize, r.frames.len());
                r.frames.push(v[1..].to_vec());
            }
            "extreme" => r.extremes.push((
                rest[0].to_string(),
                rest[1].to_string(),
                rest[2].parse().unwrap(),
            )),
            "mill_setup" => r.mill_setup = numbers(rest),
            "mill_sample" => r.mill.push(indexed(line, rest, r.mill.len())),
            "violation" => r.violations.push((
                rest[0].to_string(),
                numbers(&rest[1..]).try_into().expect("7 numbers"),
            )),
            "wing" => r.wing = numbers(rest),
            "course_knots" => r.course_knots = numbers(rest),
            "course_points" => r.course_points = triples(numbers(rest)),
            "course_setup" => r.course_setup = numbers(rest),
            "course_sample" => r.course.push(indexed(line, rest, r.course.len())),
            "plan" => r.plans.push(numbers(rest)),
            "plan_pass" => r.plan_passes.push(numbers(rest)),
            "rear_setup" => r.rear_setup = numbers(rest),
            "rear_sample" => r.rear.push(indexed(line, rest, r.rear.len())),
            "plan_setup" => r.plan_setup = numbers(rest),
            "plan_course" => r.plan_courses.push(numbers(rest)),
            "plan_gap" => r.plan_gaps.push(numbers(rest)),
            "plan_check" => r.plan_checks.push(numbers(rest)),
            "plan_parallel" => r.plan_parallel = numbers(rest),
            // What the pictures need (examples/plots/raw.rs reads them; tests/pictures.rs
            // checks them against the lines above).
            "mill_frame" | "course_frame" | "cavity_grid_size" | "cavity_grid"
            | "wing_grid_size" | "wing_grid" | "centre_feed" | "course_edge" | "course_gap"
            | "course_overlap" => {}
            other => panic!("unexpected line `{other}` in the raw output"),
        }
    }
    r
}

/// The bicubic patch of the demo, evaluated in Rust: S^(k,l) = sum_r sum_s N^(k)_r(u) N^(l)_s(v) P_rs
/// (tensor product, The NURBS Book 2nd ed. eq. 3.17 [memory] and A3.6 p. 111), with strake's own
/// basis functions, written independently of the C evaluator.
fn rust_surface(raw: &Raw) -> impl strake::SurfaceSource + use<> {
    let count_u = raw.net.len() / raw.count_v;
    let ku = KnotVector::new("u", &raw.knots_u, 3, count_u).unwrap();
    let kv = KnotVector::new("v", &raw.knots_v, 3, raw.count_v).unwrap();
    let net = raw.net.clone();
    let cv = raw.count_v;
    let f = move |u: f64, v: f64, _order: DerivOrder| {
        let su = ku.find_span(u, &mut SpanHint::default());
        let sv = kv.find_span(v, &mut SpanHint::default());
        let bu = basis_rows(ku.knots(), 3, su, u, 2);
        let bv = basis_rows(kv.knots(), 3, sv, v, 2);
        let mut d = [[Vec3::zeros(); 3]; 3];
        for (k, row) in d.iter_mut().enumerate() {
            for (l, out) in row.iter_mut().enumerate().take(3 - k) {
                for r in 0..=3 {
                    for s in 0..=3 {
                        *out += net[(su - 3 + r) * cv + (sv - 3 + s)] * (bu.d[k][r] * bv.d[l][s]);
                    }
                }
            }
        }
        Ok(SurfaceJet {
            p: d[0][0],
            su: d[1][0],
            sv: d[0][1],
            suu: d[2][0],
            suv: d[1][1],
            svv: d[0][2],
        })
    };
    let unit = Interval::new("u", 0.0, 1.0).unwrap();
    FnSurface::new(unit, unit, Orientation::Forward, f)
}

/// The pass as the Rust API makes it from the host's contact points (projection, then a C2
/// cubic through the foot points with chord-length parameters: the options the demo passes).
fn rust_pass(raw: &Raw, surface: &impl strake::SurfaceSource) -> SeamCurve {
    uv_curve_through_points(
        surface,
        &raw.pass_points,
        &ProjectionOptions::new(raw.pass_tolerance),
        &FitOptions::default(),
    )
    .expect("the Rust API accepts the demo's contact points")
    .curve
}

/// The 31 numbers of a frame in the order the demo prints them.
fn flatten(t: f64, f: &strake::DarbouxFrame) -> Vec<f64> {
    let p = &f.principal;
    let mut v = vec![t, f.u, f.v];
    for w in [f.point, f.t, f.b, f.n] {
        v.extend_from_slice(w.as_slice());
    }
    v.extend_from_slice(&[
        f.normal_curvature,
        f.geodesic_curvature,
        f.geodesic_torsion,
        f.speed,
        p.k1,
        p.k2,
    ]);
    v.extend_from_slice(p.d1.as_slice());
    v.extend_from_slice(p.d2.as_slice());
    v.extend_from_slice(&[
        p.mean,
        p.gaussian,
        f.conditioning.surface,
        f.conditioning.curve,
    ]);
    v
}

const FIELD_NAMES: [&str; 31] = [
    "t",
    "u",
    "v",
    "x",
    "y",
    "z",
    "Tx",
    "Ty",
    "Tz",
    "Bx",
    "By",
    "Bz",
    "Nx",
    "Ny",
    "Nz",
    "kn",
    "kg",
    "tg",
    "speed",
    "k1",
    "k2",
    "d1x",
    "d1y",
    "d1z",
    "d2x",
    "d2y",
    "d2z",
    "H",
    "K",
    "surface_conditioning",
    "curve_speed_figure",
];

/// Relative agreement of two numbers on a given scale.
#[track_caller]
fn agree(what: &str, c: f64, rust: f64, rel: f64, scale: f64) {
    assert!(
        (c - rust).abs() <= rel * scale.max(rust.abs()),
        "{what}: C demo {c} vs Rust {rust} (relative tolerance {rel:e})"
    );
}

/// The demo's raw output (built once per test binary run is not worth the complexity: each
/// test builds its own copy under its own name).
fn raw_output(name: &str) -> Raw {
    let exe = build(name, &c_build::demo_sources(), &[]);
    parse_raw(&run(&exe, &["--raw"]))
}

// The C host's evaluator and strake's Rust API are two independent implementations of the same
// algorithms (The NURBS Book A2.3/A3.6 in C; A2.2 plus eq. 2.7 in strake). The host's contact
// points must project back onto its own surface (distance 0, x = 160 u and y = 100 v by the
// linear precision of B-splines at the Greville abscissae, The NURBS Book 2nd ed. ch. 2
// [memory]), and the frames the C demo gets through the C ABI must match what the Rust API
// computes for the same data. The pass is rebuilt in Rust from the same points, by projection
// onto the Rust evaluation of the surface, whose round-off differs from the C evaluator's, so
// the agreement is to 1e-9 of each field's scale rather than to the last bit.
#[test]
fn demo_numbers_match_the_rust_api() {
    let raw = raw_output("mould_cavity_check");
    assert_eq!(raw.frames.len(), 13);
    assert_eq!(raw.pass_feet.len(), raw.pass_points.len());
    for (p, foot) in raw.pass_points.iter().zip(&raw.pass_feet) {
        assert!(foot[2] < 1e-9 && foot[3].abs() < 1e-9, "{foot:?}");
        assert!((160.0 * foot[0] - p[0]).abs() < 1e-9 && (100.0 * foot[1] - p[1]).abs() < 1e-9);
    }
    let surface = rust_surface(&raw);
    let path = rust_pass(&raw, &surface);
    let pair = CurveOnSurface::new(&surface, &path);
    let mut hints = Hints::default();
    let mut rust_frames = Vec::new();
    // The largest magnitude of each field along the path sets its scale for the comparison.
    let mut scale = [0.0f64; 31];
    for c in &raw.frames {
        for (s, x) in scale.iter_mut().zip(c) {
            *s = s.max(x.abs());
        }
    }
    let length = raw.frames[12][31];
    let mut s = 0.0;
    for (i, c) in raw.frames.iter().enumerate() {
        let t = c[0];
        let f = pair.frame(t, &mut hints).unwrap();
        let r = flatten(t, &f);
        for k in 0..31 {
            agree(
                &format!("{} at t = {t}", FIELD_NAMES[k]),
                c[k],
                r[k],
                1e-9,
                scale[k],
            );
        }
        // Evenly spaced in arc length, and the arc length is the Rust quadrature's.
        if i > 0 {
            s += arc_length(&pair, raw.frames[i - 1][0], t, 1e-12).unwrap();
        }
        agree("arc length", c[31], s, 1e-9, length);
        agree(
            "even spacing",
            c[31],
            length * i as f64 / 12.0,
            1e-9,
            length,
        );
        rust_frames.push(r);
    }
    // The demo's summary names the samples where each quantity is smallest and largest.
    let column = |name: &str| match name {
        "kn" => 15,
        "kg" => 16,
        "tg" => 17,
        "k1" => 19,
        other => panic!("unknown field {other}"),
    };
    assert_eq!(raw.extremes.len(), 8);
    for (name, which, index) in &raw.extremes {
        let col = column(name);
        let values: Vec<f64> = rust_frames.iter().map(|r| r[col]).collect();
        let best = if which == "min" {
            values.iter().cloned().fold(f64::INFINITY, f64::min)
        } else {
            values.iter().cloned().fold(f64::NEG_INFINITY, f64::max)
        };
        assert!(
            (values[*index] - best).abs() <= 1e-9 * best.abs(),
            "{which} of {name}: sample {index}"
        );
    }
}

// Facts the demo's numbers must satisfy whatever the implementation: the frame is orthonormal
// and right-handed (T x B = N, DESIGN.md convention); Euler's formula kn = k1 cos^2 th +
// k2 sin^2 th and tg = (k2 - k1) sin th cos th with th the angle from dir1 to T (do Carmo §3-2;
// REFERENCES.md); H and K from k1, k2 (do Carmo §3-3); and x = 160 u, y = 100 v exactly because
// the control points sit at the Greville abscissae (linear precision of B-splines, The NURBS
// Book 2nd ed. ch. 2 [memory]).
#[test]
fn demo_numbers_satisfy_the_identities() {
    let raw = raw_output("mould_cavity_identities");
    let v3 = |c: &[f64], i: usize| Vec3::new(c[i], c[i + 1], c[i + 2]);
    for c in &raw.frames {
        let (t, b, n, d1, d2) = (v3(c, 6), v3(c, 9), v3(c, 12), v3(c, 21), v3(c, 24));
        let (kn, tg, k1, k2) = (c[15], c[17], c[19], c[20]);
        let kscale = k1.abs().max(k2.abs());
        for (name, x) in [("|T|", t.norm()), ("|B|", b.norm()), ("|N|", n.norm())] {
            assert!((x - 1.0).abs() < 1e-14, "{name} = {x}");
        }
        assert!(t.dot(&n).abs() < 1e-14 && t.dot(&b).abs() < 1e-14 && b.dot(&n).abs() < 1e-14);
        assert!((t.cross(&b) - n).norm() < 1e-14);
        let (cos, sin) = (t.dot(&d1), t.dot(&d2));
        assert!(
            (kn - (k1 * cos * cos + k2 * sin * sin)).abs() < 1e-13 * kscale,
            "Euler kn at t = {}",
            c[0]
        );
        assert!(
            (tg - (k2 - k1) * sin * cos).abs() < 1e-13 * kscale,
            "Euler tg at t = {}",
            c[0]
        );
        assert!((c[27] - 0.5 * (k1 + k2)).abs() < 1e-15 * kscale.max(1.0));
        assert!((c[28] - k1 * k2).abs() < 1e-15);
        assert!(k1 >= k2);
        assert!((c[3] - 160.0 * c[1]).abs() < 1e-12 && (c[4] - 100.0 * c[2]).abs() < 1e-12);
    }
}

/// The violation intervals of one kind that the demo printed.
fn printed(raw: &Raw, kind: &str) -> Vec<[f64; 7]> {
    raw.violations
        .iter()
        .filter(|(k, _)| k == kind)
        .map(|(_, v)| *v)
        .collect()
}

/// Compares the demo's intervals with the Rust summary of the same quantity.
#[track_caller]
fn same_intervals(kind: &str, c: &[[f64; 7]], rust: &[strake::checks::Violation], length: f64) {
    assert_eq!(c.len(), rust.len(), "{kind}: {c:?} vs {rust:?}");
    for (a, b) in c.iter().zip(rust) {
        agree(
            &format!("{kind} start"),
            a[0],
            b.start_arc_length,
            1e-7,
            length,
        );
        agree(&format!("{kind} end"), a[1], b.end_arc_length, 1e-7, length);
        assert_eq!(
            (a[4] as usize, a[5] as usize),
            (b.first_index, b.last_index),
            "{kind}"
        );
        agree(&format!("{kind} worst"), a[6], b.worst, 1e-8, 0.0);
    }
}

// The milling checks of the demo against the Rust API at the same samples, and against the
// formulas they stand for, computed here from the Rust frames: the largest curvature concave
// toward a tool on the N side is max(k1, k2) = k1 (common practice for ball-end gouging); the
// feed is min(F, sqrt(a/k), (j/k^2)^(1/3)) with k = sqrt(kn^2 + kg^2) (centripetal acceleration
// and jerk of circular motion: physics); the scallop height on the curvature across the path
// (k1 (B.d1)^2 + k2 (B.d2)^2, Euler's formula, do Carmo §3-2) is close to its approximation
// (w^2/8)(1/r - kappa) (REFERENCES.md, machining) for this small step-over. Arc lengths are
// compared step by step, the way the sampler accumulates them. The samples follow
// the chord rule's limits (first at t = 0, last at t = 1, steps within the maximum), and the
// intervals the demo printed are the Rust summaries of the same values.
#[test]
fn demo_milling_matches_the_rust_checks() {
    let raw = raw_output("mould_cavity_milling");
    let [r, w, h_max, feed, acc, jerk, _chord, max_step, _] = raw.mill_setup[..] else {
        panic!("mill_setup has 9 numbers")
    };
    let surface = rust_surface(&raw);
    let path = rust_pass(&raw, &surface);
    let pair = CurveOnSurface::new(&surface, &path);
    let limits = FeedLimits {
        feed,
        max_acceleration: acc,
        max_jerk: Some(jerk),
    };
    let ball = Cutter::Ball { radius: r };
    let upright = ToolAngles {
        lead: 0.0,
        tilt: 0.0,
    };
    let n = raw.mill.len();
    assert!(
        n > 64,
        "{n} samples: the demo's first buffer of 64 should have been too small"
    );
    assert_eq!((raw.mill[0][0], raw.mill[n - 1][0]), (0.0, 1.0));
    let length = raw.mill[n - 1][1];
    let mut samples = Vec::new();
    let (mut concave, mut scallop, mut cut) = (Vec::new(), Vec::new(), Vec::new());
    let mut hints = Hints::default();
    let mut rust_s = 0.0;
    for (i, m) in raw.mill.iter().enumerate() {
        let [t, s, c_concave, c_scallop, c_feed] = *m;
        if i > 0 {
            assert!(
                s - raw.mill[i - 1][1] <= max_step * (1.0 + 1e-9),
                "step before sample {i}"
            );
            rust_s += arc_length(&pair, raw.mill[i - 1][0], t, 1e-12).unwrap();
        }
        let f = pair.frame(t, &mut hints).unwrap();
        agree("arc length", s, rust_s, 1e-9, length);
        // Gouging.
        let g = gouge_state(&f, ToolSide::AlongNormal, &ball, &upright).unwrap();
        agree(
            "concave curvature",
            c_concave,
            g.concave_curvature,
            1e-9,
            0.1,
        );
        agree(
            "concave curvature = k1",
            c_concave,
            f.principal.k1,
            1e-9,
            0.1,
        );
        // Scallop.
        let kappa = cross_path_curvature(&f, ToolSide::AlongNormal);
        let (p, b) = (&f.principal, f.b);
        let euler = p.k1 * b.dot(&p.d1).powi(2) + p.k2 * b.dot(&p.d2).powi(2);
        agree("cross-path curvature", kappa, euler, 1e-12, 0.1);
        match scallop_height(r, w, kappa) {
            Ok(h) => {
                agree("scallop", c_scallop, h, 1e-9, 0.0);
                // On a plane the two differ by about w^2/(16 r^2) relative (expanding the
                // square root); allow twice that.
                let approx = w * w / 8.0 * (1.0 / r - kappa);
                agree(
                    "scallop approximation",
                    c_scallop,
                    approx,
                    w * w / (8.0 * r * r),
                    0.0,
                );
            }
            Err(_) => assert!(c_scallop.is_infinite() && g.gouges, "sample {i}"),
        }
        // Feed.
        agree(
            "feed",
            c_feed,
            curvature_limited_feed(&f, &limits).unwrap(),
            1e-9,
            feed,
        );
        let k = f.normal_curvature.hypot(f.geodesic_curvature);
        let physics = feed.min((acc / k).sqrt()).min((jerk / (k * k)).cbrt());
        agree("feed = physics", c_feed, physics, 1e-9, feed);
        samples.push(PathSample {
            t,
            arc_length: s,
            frame: f,
        });
        concave.push(g.concave_curvature);
        scallop.push(c_scallop);
        cut.push(feed - c_feed);
    }
    for (kind, values, limit) in [
        ("gouge", &concave, 1.0 / r),
        ("scallop", &scallop, h_max),
        ("feed", &cut, 0.0),
    ] {
        let mut rust = Vec::new();
        violations(&samples, values, limit, &mut rust).unwrap();
        assert!(
            !rust.is_empty(),
            "the demo's limits should be exceeded somewhere: {kind}"
        );
        same_intervals(kind, &printed(&raw, kind), &rust, length);
    }
}

/// The demo's wing skin, written again in Rust from its formula (wing_skin.h's comment):
/// z = h(x) 4 e (1 - e) + a(x) y, e = y/chord, h = crown (1 - taper x/span), a = twist x/span.
fn rust_wing(w: &[f64]) -> impl strake::SurfaceSource + use<> {
    let [span, chord, crown, taper, twist] = w[..] else {
        panic!("wing has 5 numbers")
    };
    strake::analytic::monge((0.0, span), (0.0, chord), move |x, y| {
        let e = y / chord;
        let h = crown * (1.0 - taper * x / span);
        let dh = -crown * taper / span;
        let (a, da) = (twist * x / span, twist / span);
        let bump = 4.0 * e * (1.0 - e);
        let dbump = 4.0 * (1.0 - 2.0 * e) / chord;
        [
            h * bump + a * y,
            dh * bump + da * y,
            h * dbump + a,
            0.0,
            dh * dbump + da,
            -8.0 * h / (chord * chord),
        ]
    })
}

// The fibre course of the demo against the Rust API (the course projected onto the Rust wing
// skin from the same NURBS data) and against the formulas of the composites trade
// (REFERENCES.md): steering radius 1/|kg|, tow-edge strain (w/2)|kg| plus the Gaussian term,
// twist rate tg. The
// samples are evenly spaced in arc length, and the printed intervals are the Rust summaries of
// the same values.
#[test]
fn demo_fibre_course_matches_the_rust_api() {
    let raw = raw_output("mould_cavity_course");
    let [tolerance, fit_tolerance, length, tow, min_radius, max_twist] = raw.course_setup[..]
    else {
        panic!("course_setup has 6 numbers")
    };
    let wing = rust_wing(&raw.wing);
    let space = NurbsCurve::<3>::new(3, &raw.course_knots, &raw.course_points, None).unwrap();
    let course = project_curve(
        &wing,
        &space,
        &ProjectionOptions::new(tolerance),
        &FitOptions::default(),
        fit_tolerance,
    )
    .unwrap()
    .curve;
    let pair = CurveOnSurface::new(&wing, &course);
    agree(
        "length",
        length,
        arc_length(&pair, 0.0, 1.0, 1e-12).unwrap(),
        1e-9,
        0.0,
    );
    let n = raw.course.len();
    let (mut samples, mut steer, mut twist) = (Vec::new(), Vec::new(), Vec::new());
    let mut hints = Hints::default();
    for (i, c) in raw.course.iter().enumerate() {
        let [t, s, c_steer, c_strain, c_twist] = *c;
        agree(
            "even spacing",
            s,
            length * i as f64 / (n - 1) as f64,
            1e-9,
            length,
        );
        let f = pair.frame(t, &mut hints).unwrap();
        let kg = f.geodesic_curvature.abs();
        agree("steering curvature", c_steer, kg, 1e-8, 1e-3);
        // Edge strain: the larger of |−kg y − K y²/2| at y = ±w/2 (geodesic parallels,
        // REFERENCES.md; the steering part alone is (w/2)|kg|).
        let (y, gauss) = (0.5 * tow, f.principal.k1 * f.principal.k2);
        let edge = |y: f64| -f.geodesic_curvature * y - 0.5 * gauss * y * y;
        agree(
            "edge strain",
            c_strain,
            edge(y).abs().max(edge(-y).abs()),
            1e-8,
            1e-3,
        );
        agree("twist rate", c_twist, f.geodesic_torsion, 1e-8, 1e-4);
        samples.push(PathSample {
            t,
            arc_length: s,
            frame: f,
        });
        steer.push(c_steer);
        twist.push(c_twist.abs());
    }
    for (kind, values, limit) in [
        ("steering", &steer, 1.0 / min_radius),
        ("twist", &twist, max_twist),
    ] {
        let mut rust = Vec::new();
        violations(&samples, values, limit, &mut rust).unwrap();
        assert!(
            !rust.is_empty(),
            "the demo's limits should be exceeded somewhere: {kind}"
        );
        same_intervals(kind, &printed(&raw, kind), &rust, length);
    }
}

/// The table rows of the demo's normal output: the 14 numbers of each row.
fn table_rows(text: &str) -> Vec<Vec<f64>> {
    text.lines()
        .filter(|l| {
            l.matches('|').count() == 4 && l.trim_start().starts_with(|c: char| c.is_ascii_digit())
        })
        .map(|l| {
            numbers(
                &l.split_whitespace()
                    .filter(|w| *w != "|")
                    .collect::<Vec<_>>(),
            )
        })
        .collect()
}

/// The (start, end) arc lengths of the violation lines of the demo's normal output.
fn printed_intervals(text: &str) -> Vec<(f64, f64)> {
    text.lines()
        .filter_map(|l| {
            let (_, rest) = l.split_once("s = ")?;
            let mut w = rest.split_whitespace();
            let a = w.next()?.parse().ok()?;
            (w.next()? == "..").then_some(())?;
            Some((a, w.next()?.parse().ok()?))
        })
        .collect()
}

// The readable output prints the same numbers, rounded to the printed decimals: the frame
// table, and every violation interval; the summaries and the refusals appear.
#[test]
fn demo_prints_tables_summaries_and_refusals() {
    let exe = build("mould_cavity_table", &c_build::demo_sources(), &[]);
    let text = run(&exe, &[]);
    let raw = parse_raw(&run(&exe, &["--raw"]));
    let rows = table_rows(&text);
    assert_eq!(rows.len(), raw.frames.len(), "{text}");
    // (column in the table, field in the raw frame, printed decimals)
    let columns = [
        (0, 31, 2),
        (1, 0, 3),
        (2, 1, 4),
        (3, 2, 4),
        (4, 3, 3),
        (5, 4, 3),
        (6, 5, 3),
        (7, 15, 6),
        (8, 16, 6),
        (9, 17, 6),
        (10, 19, 6),
        (11, 20, 6),
        (12, 8, 4),
        (13, 14, 4),
    ];
    for (row, frame) in rows.iter().zip(&raw.frames) {
        assert_eq!(row.len(), 14);
        for (col, field, decimals) in columns {
            let half_unit = 0.5 * 10f64.powi(-decimals) + 1e-12;
            assert!(
                (row[col] - frame[field]).abs() <= half_unit,
                "column {col}: {} vs {}",
                row[col],
                frame[field]
            );
        }
    }
    let intervals = printed_intervals(&text);
    assert_eq!(intervals.len(), raw.violations.len(), "{text}");
    for ((a, b), (kind, v)) in intervals.iter().zip(&raw.violations) {
        assert!(
            (a - v[0]).abs() <= 0.05 + 1e-9 && (b - v[1]).abs() <= 0.05 + 1e-9,
            "{kind}: printed {a} .. {b}, raw {} .. {}",
            v[0],
            v[1]
        );
    }
    for needle in [
        "normal curvature kn",
        "geodesic curvature kg",
        "geodesic torsion tg",
        "principal curvature k1",
        "41 contact points",
        "largest ball-end radius free of local gouging",
        "the first buffer of 64 samples was too small",
        "r = 10 mm ball gouges",
        "scallop above 0.020 mm",
        "feed held below 15000 mm/min",
        "Fibre course on a wing skin",
        "steering radius below 1350 mm",
        "twist rate above 0.100 rad/m",
        "STRAKE_STATUS_OUT_OF_DOMAIN",
        "t = 1.25 is outside [0, 1]",
        "STRAKE_STATUS_TOO_FAR_FROM_SURFACE",
        "point 17: too far from the surface",
    ] {
        assert!(text.contains(needle), "`{needle}` missing from:\n{text}");
    }
}

#[test]
fn c_abi_check_program_passes() {
    let exe = build(
        "abi_check",
        &[c_build::root().join("tests").join("c").join("abi_check.c")],
        &[],
    );
    let out = run(&exe, &[]);
    assert!(out.contains(", 0 failed"), "{out}");
}

// The same programs under AddressSanitizer and UndefinedBehaviorSanitizer (common practice for
// C ABIs): any invalid access or undefined behaviour on either side of the boundary aborts them.
#[test]
fn c_programs_under_sanitizers() {
    if !c_build::sanitizers_available() {
        eprintln!(
            "note: {} cannot build with {:?}; sanitizer run skipped",
            c_build::compiler(),
            c_build::SANITIZER_FLAGS
        );
        return;
    }
    let check = build(
        "abi_check_sanitized",
        &[c_build::root().join("tests").join("c").join("abi_check.c")],
        c_build::SANITIZER_FLAGS,
    );
    assert!(run(&check, &[]).contains(", 0 failed"));
    let demo = build(
        "mould_cavity_sanitized",
        &c_build::demo_sources(),
        c_build::SANITIZER_FLAGS,
    );
    let plain = build("mould_cavity_plain", &c_build::demo_sources(), &[]);
    assert_eq!(run(&demo, &["--raw"]), run(&plain, &["--raw"]));
    run(&demo, &[]);
}

// The header also compiles as C++ (hosts are often C++): the extern "C" block and the enum's
// underlying type. Skipped with a note when no C++ compiler is found.
#[test]
fn header_compiles_as_cpp() {
    let cxx = std::env::var("CXX").unwrap_or_else(|_| "c++".to_string());
    let dir = c_build::build_dir().unwrap();
    let src = dir.join("header_cpp_check.cpp");
    std::fs::write(
        &src,
        "#include \"strake.h\"\nstatic_assert(sizeof(StrakeStatus) == 4, \"status is 32-bit\");\n\
         int main() { return strake_status_name(STRAKE_STATUS_OK) == nullptr; }\n",
    )
    .unwrap();
    let out = Command::new(&cxx)
        .args([
            "-std=c++11",
            "-Wall",
            "-Wextra",
            "-Wpedantic",
            "-Werror",
            "-fsyntax-only",
            "-I",
        ])
        .arg(c_build::root().join("include"))
        .arg(&src)
        .output();
    match out {
        Err(e) => eprintln!("note: no C++ compiler `{cxx}` ({e}); C++ header check skipped"),
        Ok(o) => assert!(o.status.success(), "{}", String::from_utf8_lossy(&o.stderr)),
    }
}

// The same programs under valgrind's memcheck when it is installed: invalid reads or writes,
// uses of uninitialised memory and definite leaks on either side of the boundary fail the run
// (common practice for C ABIs). Skipped with a note when valgrind is absent.
#[test]
fn c_programs_under_valgrind() {
    if Command::new("valgrind").arg("--version").output().is_err() {
        eprintln!("note: valgrind not found; memcheck run skipped");
        return;
    }
    let check = build(
        "abi_check_memcheck",
        &[c_build::root().join("tests").join("c").join("abi_check.c")],
        &[],
    );
    let demo = build("mould_cavity_memcheck", &c_build::demo_sources(), &[]);
    // The demo once, plain: it makes every call the `--raw` run makes (the two differ in what
    // they print) and shows the refusals besides; memcheck multiplies a run's time many times.
    for (exe, args) in [(&check, Vec::<&str>::new()), (&demo, vec![])] {
        let out = Command::new("valgrind")
            .args([
                "-q",
                "--error-exitcode=99",
                "--leak-check=full",
                "--errors-for-leak-kinds=definite",
            ])
            .arg(exe)
            .args(&args)
            .output()
            .expect("run valgrind");
        assert!(
            out.status.success(),
            "valgrind {} {args:?} failed ({}):\n{}",
            exe.display(),
            out.status,
            String::from_utf8_lossy(&out.stderr)
        );
    }
}

// The README's C example compiles cleanly and runs. For the bowl z = (x^2 + y^2)/2 with the
// upward normal Su x Sv = (-u, -v, 1), the second fundamental form is (du^2 + dv^2)/sqrt(1 +
// u^2 + v^2), positive definite (do Carmo §3-3, graph of a function), so kn = II/I > 0 in
// every direction: every printed kn must be positive.
#[test]
fn readme_example_runs() {
    let exe = build(
        "readme_example",
        &[c_build::root()
            .join("tests")
            .join("c")
            .join("readme_example.c")],
        &[],
    );
    let out = run(&exe, &[]);
    let kns: Vec<f64> = out
        .lines()
        .map(|l| {
            let kn = l
                .split_whitespace()
                .find_map(|w| w.strip_prefix("kn="))
                .expect("kn= in each line");
            kn.parse().unwrap()
        })
        .collect();
    assert_eq!(kns.len(), 5, "{out}");
    assert!(kns.iter().all(|&k| k > 0.0), "{out}");
    // The README shows this program verbatim (without its first comment line).
    let root = c_build::root();
    let program = std::fs::read_to_string(root.join("tests/c/readme_example.c")).unwrap();
    let body = program.split_once('\n').unwrap().1.trim_end();
    let readme = std::fs::read_to_string(root.join("README.md")).unwrap();
    assert!(
        readme.contains(body),
        "README.md's C example differs from tests/c/readme_example.c"
    );
}

// The passes the demo plans across the cavity (iso-scallop and constant step-over, 8 rows to
// each side): the totals add up, and the iso-scallop plan to the left matches the Rust API
// planning from the same pass on the Rust evaluation of the same surface (round-off of the two
// evaluators differs, so the agreement is to 1e-6 rather than to the last bit).
#[test]
fn demo_pass_plans_add_up_and_match_the_rust_api() {
    use strake::{OffsetSide, PassOptions, plan_passes};
    let raw = raw_output("mould_cavity_plans");
    assert_eq!(raw.plans.len(), 4);
    for p in &raw.plans {
        let (rule, side) = (p[0], p[1]);
        assert_eq!((p[2], p[3], p[10]), (9.0, 9.0, 0.0), "{p:?}");
        let passes: Vec<&Vec<f64>> = raw
            .plan_passes
            .iter()
            .filter(|q| q[0] == rule && q[1] == side)
            .collect();
        assert_eq!(passes.len(), 8);
        let sum: f64 = p[4] + passes.iter().map(|q| q[6]).sum::<f64>();
        assert!((sum - p[5]).abs() < 1e-9 * p[5], "{sum} vs {}", p[5]);
        let hmax = passes.iter().map(|q| q[10]).fold(0.0, f64::max);
        let hmin = passes.iter().map(|q| q[9]).fold(f64::INFINITY, f64::min);
        assert_eq!((hmin, hmax), (p[6], p[7]));
    }
    let surface = rust_surface(&raw);
    let pass = rust_pass(&raw, &surface);
    let mut opts =
        PassOptions::iso_scallop(4.0, ToolSide::AlongNormal, 0.05, OffsetSide::Left, 0.01);
    opts.max_rows = Some(8);
    let plan = plan_passes(&surface, &pass, &opts).unwrap();
    let c = &raw.plans[0];
    assert_eq!((c[0], c[1]), (0.0, 0.0));
    assert_eq!(plan.count as f64, c[2]);
    assert!(
        (plan.total_length - c[5]).abs() < 1e-6 * c[5],
        "{} vs {}",
        plan.total_length,
        c[5]
    );
    assert!(
        (plan.scallop_max - c[7]).abs() < 1e-6,
        "{} vs {}",
        plan.scallop_max,
        c[7]
    );
    assert!(
        (plan.scallop_min - c[6]).abs() < 1e-6,
        "{} vs {}",
        plan.scallop_min,
        c[6]
    );
}

// The demo's bull-nose pass (rear gouging, through the _path functions) against the Rust API
// at the same samples: the rear margin, depth and smallest safe lead sample for sample, the
// radius across the path r + R sin²λ/sin³β (= r + R/sin λ for pure lead), and the printed
// heel intervals as the Rust summary of the same margins.
#[test]
fn demo_rear_gouge_pass_matches_the_rust_checks() {
    let raw = raw_output("mould_cavity_rear");
    let [big, corner, lead, tilt, across, incl] = raw.rear_setup[..] else {
        panic!("rear_setup has 6 numbers")
    };
    let cutter = Cutter::Toroidal {
        radius: big,
        corner_radius: corner,
    };
    let angles = ToolAngles { lead, tilt };
    let want_across = corner + (big - corner) / lead.sin();
    agree("radius across", across, want_across, 1e-12, 0.0);
    agree("inclination-plane radius", incl, want_across, 1e-12, 0.0);
    let surface = rust_surface(&raw);
    let path = rust_pass(&raw, &surface);
    let pair = CurveOnSurface::new(&surface, &path);
    let mut hints = Hints::default();
    let (mut samples, mut deficit) = (Vec::new(), Vec::new());
    let length = raw.rear.last().unwrap()[1];
    for r in &raw.rear {
        let [t, s, margin, depth, gouges, has_lead, min_lead] = *r;
        let f = pair.frame(t, &mut hints).unwrap();
        let g = gouge_state(&f, ToolSide::AlongNormal, &cutter, &angles).unwrap();
        agree("rear margin", margin, g.rear.margin, 1e-7, 1.0);
        agree("rear depth", depth, g.rear.depth, 1e-7, 1e-3);
        assert_eq!(gouges != 0.0, g.rear.gouges, "t = {t}");
        assert_eq!(has_lead != 0.0, g.min_lead.is_some());
        agree("min lead", min_lead, g.min_lead.unwrap_or(0.0), 1e-6, 1e-3);
        samples.push(PathSample {
            t,
            arc_length: s,
            frame: f,
        });
        deficit.push(-margin);
    }
    let mut rust = Vec::new();
    violations(&samples, &deficit, 0.0, &mut rust).unwrap();
    assert!(
        !rust.is_empty(),
        "the demo's bull-nose pass should rear-gouge somewhere"
    );
    same_intervals("rear", &printed(&raw, "rear"), &rust, length);
}
// The courses of the demo against the Rust API on the Rust wing skin: the natural courses
// (geodesics from the printed starts), the gaps and overlaps between neighbours, and the
// steering of the parallel course. The geodesics themselves are checked against closed forms
// in tests/geodesics.rs and tests/courses.rs; here the C host must get what Rust gets.
#[test]
fn demo_courses_match_the_rust_api() {
    use strake::{
        OffsetOptions, OffsetSide, StartDirection, TraceOptions, adjacent_course, course_check,
        course_gaps, trace_geodesic,
    };
    let raw = raw_output("mould_cavity_courses");
    let [band, u0, v0, angle, tol, gap_tol] = raw.plan_setup[..] else {
        panic!("plan_setup has 6 numbers")
    };
    let wing = rust_wing(&raw.wing);
    let o = TraceOptions::new(tol);
    assert_eq!(raw.plan_courses.len(), 4);
    let mut courses = Vec::new();
    for (k, c) in raw.plan_courses.iter().enumerate() {
        assert_eq!(c[0] as usize, k);
        let (u, v) = (c[1], c[2]);
        let g = if k == 0 {
            assert_eq!((u, v), (u0, v0));
            trace_geodesic(
                &wing,
                u,
                v,
                StartDirection::Angle(angle),
                4.0 * raw.wing[0],
                &o,
            )
            .unwrap()
        } else {
            // The start one band across the previous start, as the demo builds it.
            let prev: &strake::Geodesic = &courses[k - 1];
            let f = CurveOnSurface::new(&wing, &prev.curve)
                .frame(0.0, &mut Hints::default())
                .unwrap();
            let across =
                trace_geodesic(&wing, f.u, f.v, StartDirection::Space(f.b), band, &o).unwrap();
            let (au, av) = across.end_uv();
            assert!(
                (au - u).abs() < 1e-6 && (av - v).abs() < 1e-6,
                "course {k} start"
            );
            let carried = across.end_tangent.cross(&across.end_normal);
            trace_geodesic(
                &wing,
                au,
                av,
                StartDirection::Space(carried),
                4.0 * raw.wing[0],
                &o,
            )
            .unwrap()
        };
        assert!(
            (g.length - c[3]).abs() < 1e-5,
            "course {k}: length {} vs {}",
            g.length,
            c[3]
        );
        let (eu, ev) = g.end_uv();
        assert!(
            (eu - c[6]).abs() < 1e-5 && (ev - c[7]).abs() < 1e-5,
            "course {k} end"
        );
        courses.push(g);
    }
    let limits = strake::checks::fibre::FibreLimits {
        tow_width: raw.course_setup[3],
        min_steering_radius: raw.course_setup[4],
        max_twist_rate: raw.course_setup[5],
    };
    assert_eq!(raw.plan_checks.len(), 4);
    for (k, c) in raw.plan_checks.iter().enumerate() {
        let chk = course_check(&wing, &courses[k].curve, &limits, 101).unwrap();
        // A natural course is a geodesic: no steering (to the trace's accuracy).
        assert!(
            c[1] < 1e-6 && chk.max_steering_curvature < 1e-6,
            "course {k}: kg {}",
            c[1]
        );
        assert!(
            (c[2] - chk.max_twist_rate).abs() < 1e-9,
            "course {k}: twist"
        );
        assert_eq!(
            (c[3], c[4]),
            (chk.steering_violations as f64, chk.twist_violations as f64)
        );
    }
    for k in 1..4 {
        let gaps = course_gaps(
            &wing,
            &courses[k - 1].curve,
            &courses[k].curve,
            OffsetSide::Left,
            band,
            41,
            gap_tol,
            &o,
        )
        .unwrap();
        let printed: Vec<&Vec<f64>> = raw
            .plan_gaps
            .iter()
            .filter(|g| g[0] as usize == k)
            .collect();
        assert_eq!(printed.len(), gaps.intervals.len(), "pair {k}");
        for (p, g) in printed.iter().zip(&gaps.intervals) {
            assert!((p[2] - g.t0).abs() < 1e-6 && (p[3] - g.t1).abs() < 1e-6);
            assert_eq!(p[4] != 0.0, g.overlap);
            assert!(
                (p[5] - g.worst).abs() < 1e-6,
                "worst {} vs {}",
                p[5],
                g.worst
            );
        }
    }
    let par = adjacent_course(
        &wing,
        &courses[0].curve,
        band,
        OffsetSide::Left,
        &OffsetOptions::new(1e-3),
    )
    .unwrap();
    let chk = course_check(&wing, &par.pieces[0].curve, &limits, 101).unwrap();
    assert!((chk.length - raw.plan_parallel[0]).abs() < 1e-6 * chk.length);
    assert!(
        (chk.min_steering_radius - raw.plan_parallel[1]).abs() < 1e-6 * chk.min_steering_radius
    );
    assert_eq!(chk.steering_violations as f64, raw.plan_parallel[3]);
}
