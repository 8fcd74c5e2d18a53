//! Builds the C host demo (`examples/c/mould_cavity.c`) and the C check program
//! (`tests/c/abi_check.c`) with the system C compiler and strict warnings, runs them, and checks
//! the demo's numbers against the Rust API evaluating the same surface and path. Also runs both
//! under AddressSanitizer/UBSan when the compiler supports it.

#[path = "support/c_build.rs"]
mod c_build;

use std::path::PathBuf;
use std::process::Command;
use strake::nurbs::basis_rows;
use strake::{
    CurveOnSurface, DerivOrder, FnSurface, Hints, Interval, KnotVector, NurbsCurve, Orientation,
    SpanHint, SurfaceJet, Vec3,
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

/// What `mould_cavity --raw` prints: the data it built, and every frame field.
struct Raw {
    knots_u: Vec<f64>,
    knots_v: Vec<f64>,
    count_v: usize,
    net: Vec<Vec3>,
    path_knots: Vec<f64>,
    path_uv: Vec<[f64; 2]>,
    /// Per sample: the 31 numbers of the frame in struct order.
    frames: Vec<Vec<f64>>,
    /// (field, "min"/"max", sample index).
    extremes: Vec<(String, String, usize)>,
}

fn numbers(rest: &[&str]) -> Vec<f64> {
    rest.iter()
        .map(|x| {
            x.parse::<f64>()
                .unwrap_or_else(|_| panic!("not a number: {x}"))
        })
        .collect()
}

fn parse_raw(text: &str) -> Raw {
    let mut r = Raw {
        knots_u: vec![],
        knots_v: vec![],
        count_v: 0,
        net: vec![],
        path_knots: vec![],
        path_uv: vec![],
        frames: vec![],
        extremes: vec![],
    };
    for line in text.lines() {
        let words: Vec<&str> = line.split_whitespace().collect();
        let (key, rest) = words.split_first().expect("non-empty line");
        match *key {
            "surface_degree" => assert_eq!(rest, ["3", "3"]),
            "path_degree" => assert_eq!(rest, ["3"]),
            "surface_count" => r.count_v = rest[1].parse().unwrap(),
            "knots_u" => r.knots_u = numbers(rest),
            "knots_v" => r.knots_v = numbers(rest),
            "net" => {
                r.net = numbers(rest)
                    .chunks(3)
                    .map(|c| Vec3::new(c[0], c[1], c[2]))
                    .collect()
            }
            "path_knots" => r.path_knots = numbers(rest),
            "path_uv" => r.path_uv = numbers(rest).chunks(2).map(|c| [c[0], c[1]]).collect(),
            "frame" => {
                let v = numbers(rest);
                assert_eq!(v.len(), 32, "{line}");
                assert_eq!(v[0] as usize, r.frames.len());
                r.frames.push(v[1..].to_vec());
            }
            "extreme" => r.extremes.push((
                rest[0].to_string(),
                rest[1].to_string(),
                rest[2].parse().unwrap(),
            )),
            other => panic!("unexpected line `{other}` in the raw output"),
        }
    }
    r
}

/// The bicubic patch of the demo, evaluated in Rust: S^(k,l) = sum_r sum_s N^(k)_r(u) N^(l)_s(v) P_rs
/// (tensor product, The NURBS Book 2nd ed. eq. 3.17 [memory] and A3.6 p. 111), with strake's own
/// basis functions, written independently of the C evaluator.
fn rust_surface(raw: &Raw) -> impl strake::SurfaceSource {
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

// The C host's evaluator and strake's Rust API are two independent implementations of the same
// algorithms (The NURBS Book A2.3/A3.6 in C; A2.2 plus eq. 2.7 in strake): the frames the C demo
// gets through the C ABI must match what the Rust API computes for the same data to round-off.
#[test]
fn demo_numbers_match_the_rust_api() {
    let exe = build("mould_cavity_check", &c_build::demo_sources(), &[]);
    let raw = parse_raw(&run(&exe, &["--raw"]));
    assert_eq!(raw.frames.len(), 25);
    let surface = rust_surface(&raw);
    let path = NurbsCurve::<2>::new(3, &raw.path_knots, &raw.path_uv, None).unwrap();
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
    for c in &raw.frames {
        let t = c[0];
        let f = pair.frame(t, &mut hints).unwrap();
        let r = flatten(t, &f);
        for i in 0..31 {
            let tol = 1e-12 * scale[i].max(1e-300) + 1e-15;
            assert!(
                (c[i] - r[i]).abs() <= tol,
                "{} at t = {t}: C demo {} vs Rust {} (tolerance {tol:e})",
                FIELD_NAMES[i],
                c[i],
                r[i]
            );
        }
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
            (values[*index] - best).abs() <= 1e-12 * best.abs(),
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
    let exe = build("mould_cavity_identities", &c_build::demo_sources(), &[]);
    let raw = parse_raw(&run(&exe, &["--raw"]));
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

/// The table rows of the demo's normal output: the 13 numbers of each row.
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

// The readable table prints the same frames, rounded to the printed decimals, and the summary
// and the refused parameter appear.
#[test]
fn demo_prints_table_summary_and_refusal() {
    let exe = build("mould_cavity_table", &c_build::demo_sources(), &[]);
    let text = run(&exe, &[]);
    let raw = parse_raw(&run(&exe, &["--raw"]));
    let rows = table_rows(&text);
    assert_eq!(rows.len(), raw.frames.len(), "{text}");
    // (column in the table, field in the raw frame, printed decimals)
    let columns = [
        (0, 0, 3),
        (1, 1, 4),
        (2, 2, 4),
        (3, 3, 3),
        (4, 4, 3),
        (5, 5, 3),
        (6, 15, 6),
        (7, 16, 6),
        (8, 17, 6),
        (9, 19, 6),
        (10, 20, 6),
        (11, 8, 4),
        (12, 14, 4),
    ];
    for (row, frame) in rows.iter().zip(&raw.frames) {
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
    for needle in [
        "normal curvature kn",
        "geodesic curvature kg",
        "geodesic torsion tg",
        "principal curvature k1",
        "largest ball-end radius",
        "STRAKE_STATUS_OUT_OF_DOMAIN",
        "t = 1.25 is outside [0, 1]",
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
    for (exe, args) in [(&check, vec![]), (&demo, vec![]), (&demo, vec!["--raw"])] {
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
