//! The committed header `include/strake.h` must be exactly what cbindgen makes from `src/ffi`
//! and `cbindgen.toml` (plus the version macros from Cargo.toml). Refresh it with
//! `STRAKE_BLESS=1 cargo test --test header`.

use std::path::{Path, PathBuf};

const REFRESH: &str = "STRAKE_BLESS=1 cargo test --test header";

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// The version macros, from the crate's version (Cargo.toml).
fn version_macros() -> String {
    format!(
        "#define STRAKE_VERSION_MAJOR {}\n#define STRAKE_VERSION_MINOR {}\n#define STRAKE_VERSION_PATCH {}\n\
         #define STRAKE_VERSION_STRING \"{}\"",
        env!("CARGO_PKG_VERSION_MAJOR"),
        env!("CARGO_PKG_VERSION_MINOR"),
        env!("CARGO_PKG_VERSION_PATCH"),
        env!("CARGO_PKG_VERSION"),
    )
}

/// The groups of the header's functions, in the header's order: a title, a lead comment, and
/// the files of `src/ffi/` whose functions belong to it (in this order; within a file, the
/// order of the source). A new file of `src/ffi/` with C functions must be added to a group
/// here (the test says so); see DEVELOPERS.md "Adding a C function".
const GROUPS: &[(&str, &str, &[&str])] = &[
    (
        "Version and errors",
        "The library's version, the name of a status, and what the last failure on this thread\n \
         * was. Host callbacks hand their own failure text back with strake_callback_report.",
        &["version.rs", "status.rs", "message.rs"],
    ),
    (
        "Surfaces",
        "A surface strake holds: native NURBS data (copied), or the host's evaluator as a\n \
         * callback (one point or many points per call). Evaluating a surface handle gives the\n \
         * point and partial derivatives that the frame calls use.",
        &[
            "surface.rs",
            "nurbs_surface.rs",
            "batch_callback.rs",
            "surface_evaluate.rs",
            "high_callback.rs",
        ],
    ),
    (
        "Curves",
        "The path as a curve (u(t), v(t)) in the surface's parameter plane: NURBS data, the\n \
         * host's callback, a curve through points in (u, v) or in space, a NURBS curve in space\n \
         * projected onto the surface; and the projection of points onto a surface.",
        &["curve.rs", "path_curves.rs"],
    ),
    (
        "Frames",
        "The Darboux frame and its invariants (kn, kg, tg) with the principal curvatures: at one\n \
         * t, at the host's array of t, at even t, over several threads, or from two jets.",
        &["evaluate.rs", "parallel.rs"],
    ),
    (
        "Sampling",
        "Samples along a path with their arc length: at even t, even arc length, to a chord\n \
         * tolerance, or at the host's t; and the arc length between two parameters.",
        &["sampling.rs"],
    ),
    (
        "Checks",
        "What a machining or fibre-placement engineer asks of a sample or a whole path: local\n \
         * gouging, scallop height and step-over, curvature-limited feed, fibre steering and\n \
         * twist, the tool axis; and path summaries (extremes, intervals over a limit).",
        &["checks.rs"],
    ),
    (
        "Tool-centre path",
        "The path the machine runs: rates of change of the invariants along a path (third\n \
         * order), the tool-centre path of a cutter at lead and tilt, and the feed judged on it\n \
         * (acceleration, jerk with the curvature's rate of change, the axis's angular speed).",
        &["toolpath.rs"],
    ),
    (
        "Planning",
        "Making the next path: geodesics traced from a point or between two points, offsets of a\n \
         * path on the surface at a geodesic distance, fibre courses and the gaps and overlaps\n \
         * between neighbouring courses; first passes projected along a direction and iso-scallop\n \
         * or constant step-over passes across a surface.",
        &["geodesics.rs", "courses.rs", "planning.rs"],
    ),
];

/// Which file of `src/ffi/` defines each exported function.
fn function_files() -> std::collections::HashMap<String, String> {
    let mut map = std::collections::HashMap::new();
    let dir = root().join("src").join("ffi");
    for entry in std::fs::read_dir(&dir).expect("src/ffi") {
        let path = entry.unwrap().path();
        if path.extension().is_none_or(|e| e != "rs") {
            continue;
        }
        let file = path.file_name().unwrap().to_string_lossy().into_owned();
        let text = std::fs::read_to_string(&path).unwrap();
        for line in text.lines() {
            if let Some(rest) = line.split_once("extern \"C\" fn ").map(|x| x.1) {
                let name: String = rest
                    .chars()
                    .take_while(|c| c.is_alphanumeric() || *c == '_')
                    .collect();
                map.insert(name, file.clone());
            }
        }
    }
    map
}

/// Puts cbindgen's function declarations into the groups of [`GROUPS`], each group under a
/// lead comment.
fn group_functions(header: &str) -> String {
    const OPEN: &str = "extern \"C\" {\n#endif // __cplusplus\n\n";
    const CLOSE: &str = "\n#ifdef __cplusplus\n}  // extern \"C\"";
    let start = header.find(OPEN).expect("the extern \"C\" block opens") + OPEN.len();
    let end = header.find(CLOSE).expect("the extern \"C\" block closes");
    let files = function_files();
    let mut grouped: Vec<Vec<(usize, &str)>> = vec![Vec::new(); GROUPS.len()];
    for block in header[start..end]
        .split("\n\n")
        .filter(|b| !b.trim().is_empty())
    {
        let decl = block
            .lines()
            .find(|l| !l.starts_with("/**") && !l.starts_with(" *"))
            .expect("a declaration after the comment");
        let name = decl[..decl.find('(').expect("a function")]
            .rsplit([' ', '*'])
            .next()
            .unwrap();
        let file = files
            .get(name)
            .unwrap_or_else(|| panic!("{name}: no `extern \"C\" fn {name}` in src/ffi"));
        let (group, rank) = GROUPS
            .iter()
            .enumerate()
            .find_map(|(g, (_, _, fs))| fs.iter().position(|f| f == file).map(|r| (g, r)))
            .unwrap_or_else(|| {
                panic!(
                    "src/ffi/{file} (function {name}) is in no group of the header: add it to \
                     GROUPS in tests/header.rs"
                )
            });
        grouped[group].push((rank, block));
    }
    let mut out = String::from(&header[..start]);
    for (g, (title, lead, _)) in GROUPS.iter().enumerate() {
        // Stable: within a file, cbindgen's order (the order of the source).
        grouped[g].sort_by_key(|(rank, _)| *rank);
        out.push_str(&format!(
            "/* ==== {title} {}\n * {lead}\n */\n\n",
            "=".repeat(84 - title.len())
        ));
        for (_, block) in &grouped[g] {
            out.push_str(block.trim_end_matches('\n'));
            out.push_str("\n\n");
        }
    }
    out.truncate(out.trim_end().len());
    out.push('\n');
    out.push_str(&header[end..]);
    out
}

fn generate() -> String {
    let dir = root();
    let mut config =
        cbindgen::Config::from_file(dir.join("cbindgen.toml")).expect("cbindgen.toml parses");
    config.after_includes = Some(format!(
        "\n/** Version of this header (matches Cargo.toml). */\n{}",
        version_macros()
    ));
    let bindings = cbindgen::Builder::new()
        .with_crate(&dir)
        .with_config(config)
        .generate()
        .expect("cbindgen generates the header");
    let mut out = Vec::new();
    bindings.write(&mut out);
    group_functions(&String::from_utf8(out).expect("the header is UTF-8"))
}

fn header_path() -> PathBuf {
    root().join("include").join("strake.h")
}

fn first_difference(a: &str, b: &str) -> String {
    for (i, (x, y)) in a.lines().zip(b.lines()).enumerate() {
        if x != y {
            return format!("line {}:\n  committed: {x}\n  generated: {y}", i + 1);
        }
    }
    format!(
        "line counts differ: committed {}, generated {}",
        a.lines().count(),
        b.lines().count()
    )
}

#[test]
fn committed_header_matches_generated() {
    let generated = generate();
    let path = header_path();
    if std::env::var_os("STRAKE_BLESS").is_some() {
        std::fs::write(&path, &generated).expect("write include/strake.h");
        eprintln!("wrote {}", path.display());
        return;
    }
    let committed = std::fs::read_to_string(&path).unwrap_or_default();
    assert!(
        committed == generated,
        "include/strake.h is out of date ({}).\nRefresh it with:\n    {REFRESH}\nand commit it.",
        first_difference(&committed, &generated)
    );
}

fn header_text() -> String {
    std::fs::read_to_string(header_path()).expect("include/strake.h exists")
}

fn macro_value(header: &str, name: &str) -> String {
    let prefix = format!("#define {name} ");
    header
        .lines()
        .find_map(|l| l.strip_prefix(&prefix))
        .unwrap_or_else(|| panic!("{name} missing from include/strake.h; refresh with {REFRESH}"))
        .trim()
        .to_string()
}

// The header's version macros and strake_version() must match Cargo.toml (common practice
// for C libraries: a host compares the header it was built with against the loaded library).
#[test]
fn version_macros_and_function_match_cargo_toml() {
    let h = header_text();
    assert_eq!(
        macro_value(&h, "STRAKE_VERSION_MAJOR"),
        env!("CARGO_PKG_VERSION_MAJOR")
    );
    assert_eq!(
        macro_value(&h, "STRAKE_VERSION_MINOR"),
        env!("CARGO_PKG_VERSION_MINOR")
    );
    assert_eq!(
        macro_value(&h, "STRAKE_VERSION_PATCH"),
        env!("CARGO_PKG_VERSION_PATCH")
    );
    assert_eq!(
        macro_value(&h, "STRAKE_VERSION_STRING"),
        format!("\"{}\"", env!("CARGO_PKG_VERSION"))
    );
    // SAFETY: strake_version returns a static NUL-terminated string.
    let v = unsafe { std::ffi::CStr::from_ptr(strake::ffi::strake_version()) };
    assert_eq!(v.to_str().unwrap(), env!("CARGO_PKG_VERSION"));
}

// Every C name carries the one prefix, and every status value appears with its number.
#[test]
fn header_names_are_prefixed_and_statuses_numbered() {
    let h = header_text();
    assert!(h.contains("#ifndef STRAKE_H") && h.contains("#define STRAKE_H"));
    for line in h.lines() {
        let l = line.trim_start();
        if let Some(rest) = l.strip_prefix("typedef struct ") {
            assert!(rest.starts_with("Strake"), "unprefixed type: {line}");
        }
        if l.starts_with("#define ") {
            assert!(l.starts_with("#define STRAKE_"), "unprefixed macro: {line}");
        }
    }
    // Function declarations start at column 0 with a return type and an opening parenthesis.
    let functions: Vec<&str> = h
        .lines()
        .filter(|l| {
            !l.starts_with([' ', '/', '*', '#', '}', '{'])
                && !l.starts_with("typedef")
                && l.contains('(')
        })
        .map(|l| l[..l.find('(').unwrap()].rsplit([' ', '*']).next().unwrap())
        .collect();
    for name in &functions {
        assert!(name.starts_with("strake_"), "unprefixed function: {name}");
    }
    // The exported functions of this version; removing one breaks hosts (ABI policy).
    let mut expected = vec![
        "strake_arc_length",
        "strake_check_feed",
        "strake_check_fibre",
        "strake_check_gouge",
        "strake_check_scallop",
        "strake_check_step_over",
        "strake_curve_project_nurbs",
        "strake_curve_through_space_points",
        "strake_curve_through_uv_points",
        "strake_path_extremes",
        "strake_path_violations",
        "strake_sample_chordal",
        "strake_sample_even_arc",
        "strake_sample_even_t",
        "strake_surface_project_points",
        "strake_tool_axis",
        "strake_curve_free",
        "strake_curve_from_callback",
        "strake_curve_new_nurbs",
        "strake_frame_at",
        "strake_frame_from_jets",
        "strake_frames_at",
        "strake_frames_at_parallel",
        "strake_frames_even",
        "strake_last_callback_code",
        "strake_last_error_message",
        "strake_status_name",
        "strake_surface_free",
        "strake_surface_from_batch_callback",
        "strake_surface_new_nurbs",
        "strake_surface_from_callback",
        "strake_surface_set_knot_lines",
        "strake_version",
        "strake_callback_report",
        "strake_samples_at",
        "strake_surface_evaluate",
        "strake_curve_new_spiral",
        "strake_drive_project",
        "strake_drive_result_free",
        "strake_drive_result_intervals",
        "strake_drive_result_piece",
        "strake_drive_result_piece_count",
        "strake_pass_plan_curve",
        "strake_pass_plan_free",
        "strake_pass_plan_passes",
        "strake_pass_plan_summary",
        "strake_plan_passes",
        "strake_cutter_radii",
        "strake_check_rear_gouge",
        "strake_check_tow_edges",
        "strake_check_step_over_cutter",
        "strake_check_gouge_path",
        "strake_check_rear_gouge_path",
        "strake_check_scallop_path",
        "strake_check_step_over_cutter_path",
        "strake_check_feed_path",
        "strake_check_fibre_path",
        "strake_check_tow_edges_path",
        "strake_tool_axis_path",
        "strake_geodesic_trace",
        "strake_geodesic_between",
        "strake_offset_new",
        "strake_offset_free",
        "strake_offset_summary",
        "strake_offset_piece_curve",
        "strake_offset_piece_points",
        "strake_offset_exits",
        "strake_offset_loops",
        "strake_course_fixed_angle",
        "strake_course_adjacent",
        "strake_course_gaps",
        "strake_course_check",
        "strake_knot_line_flags",
        "strake_invariant_rates_at",
        "strake_invariant_rates_path",
        "strake_centre_point_at",
        "strake_centre_path_at",
        "strake_centre_feed",
        "strake_centre_feed_path",
        "strake_surface_from_high_callback",
        "strake_sample_chordal_centre",
        "strake_curve_from_high_callback",
    ];
    let mut found = functions.clone();
    found.sort_unstable();
    expected.sort_unstable();
    for name in &expected {
        assert!(found.contains(name), "{name} is no longer in the header");
    }
    for s in strake::ffi::StrakeStatus::ALL {
        let name = s.c_name().to_str().unwrap();
        assert!(
            h.contains(&format!("{name} = {},", s as u32)),
            "{name} missing or renumbered"
        );
    }
    assert!(Path::new(&header_path()).exists());
}
