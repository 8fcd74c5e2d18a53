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
    String::from_utf8(out).expect("the header is UTF-8")
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
