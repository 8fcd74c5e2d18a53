//! The host wrappers cover the whole C ABI: every function `include/strake.h` exports is
//! called by the C++ wrapper (`include/strake.hpp`) and by the Python package
//! (`bindings/python/strake_darboux/__init__.py`), and every integer-coded field or argument
//! whose documentation names a family of constants (`STRAKE_FOO_...`) has those constants in
//! the header. A function added to `src/ffi` fails here until both wrappers call it
//! (DEVELOPERS.md "Installing, C++ and Python"). Reads files only: no build, no tools.

use std::collections::BTreeSet;
use std::path::PathBuf;

fn read(rel: &str) -> String {
    let path = PathBuf::from(env!("CARGO_MANIFEST_DIR")).join(rel);
    std::fs::read_to_string(&path).unwrap_or_else(|e| panic!("{}: {e}", path.display()))
}

/// The text without its `/* ... */` and `// ...` comments.
fn strip_comments(text: &str) -> String {
    let mut out = String::with_capacity(text.len());
    let mut rest = text;
    loop {
        let block = rest.find("/*");
        let line = rest.find("//");
        match (block, line) {
            (Some(b), l) if l.is_none_or(|l| b < l) => {
                out.push_str(&rest[..b]);
                let end = rest[b + 2..].find("*/").expect("an unterminated comment") + b + 4;
                rest = &rest[end..];
            }
            (_, Some(l)) => {
                out.push_str(&rest[..l]);
                rest = rest[l..].find('\n').map_or("", |n| &rest[l + n..]);
            }
            _ => {
                out.push_str(rest);
                return out;
            }
        }
    }
}

fn is_ident(c: char) -> bool {
    c.is_ascii_alphanumeric() || c == '_'
}

/// Every `strake_name(` declared in the header outside comments (the exported functions).
fn header_functions(header: &str) -> Vec<String> {
    let code = strip_comments(header);
    let mut names = Vec::new();
    for (i, _) in code.match_indices("strake_") {
        if i > 0 && is_ident(code[..i].chars().next_back().unwrap()) {
            continue;
        }
        let name: String = code[i..].chars().take_while(|&c| is_ident(c)).collect();
        if code[i + name.len()..].starts_with('(') && !names.contains(&name) {
            names.push(name);
        }
    }
    names
}

/// The names `strake_...` called in a wrapper's code (comments removed for C++).
fn called(code: &str) -> BTreeSet<String> {
    let mut out = BTreeSet::new();
    for (i, _) in code.match_indices("strake_") {
        if i > 0 && is_ident(code[..i].chars().next_back().unwrap()) {
            continue;
        }
        out.insert(code[i..].chars().take_while(|&c| is_ident(c)).collect());
    }
    out
}

#[test]
fn the_header_declares_the_functions_of_the_c_abi() {
    let functions = header_functions(&read("include/strake.h"));
    // 81 when this test was written; the count only grows (numbers are never withdrawn).
    assert!(functions.len() >= 81, "{functions:?}");
    assert!(functions.iter().any(|f| f == "strake_plan_passes"));
    assert!(functions.iter().any(|f| f == "strake_version"));
}

#[test]
fn every_c_function_has_a_cpp_wrapper() {
    let functions = header_functions(&read("include/strake.h"));
    let hpp = called(&strip_comments(&read("include/strake.hpp")));
    let missing: Vec<&String> = functions.iter().filter(|f| !hpp.contains(*f)).collect();
    assert!(
        missing.is_empty(),
        "C functions of include/strake.h that include/strake.hpp does not call: {missing:?}"
    );
}

#[test]
fn every_c_function_has_a_python_wrapper() {
    let functions = header_functions(&read("include/strake.h"));
    // The signatures are set from the shipped header in _lib.py; the calls are in __init__.py.
    let py = called(&read("bindings/python/strake_darboux/__init__.py"));
    let missing: Vec<&String> = functions.iter().filter(|f| !py.contains(*f)).collect();
    assert!(
        missing.is_empty(),
        "C functions of include/strake.h that bindings/python/strake_darboux/__init__.py does \
         not call: {missing:?}"
    );
}

#[test]
fn every_family_of_constants_the_header_names_is_defined() {
    let header = read("include/strake.h");
    let code = strip_comments(&header);
    // "One of the `STRAKE_CUTTER_KIND_...` values", "a `STRAKE_FEED_BOUND_...` value", ...
    let mut families = BTreeSet::new();
    for (i, _) in header.match_indices("`STRAKE_") {
        let name: String = header[i + 1..]
            .chars()
            .take_while(|&c| is_ident(c))
            .collect();
        if header[i + 1 + name.len()..].starts_with("...`") {
            families.insert(name);
        }
    }
    assert!(families.len() >= 7, "{families:?}");
    for prefix in &families {
        assert!(
            code.contains(&format!("  {prefix}")) && code.contains(" = "),
            "include/strake.h names the constants `{prefix}...` but defines none: export the \
             enum (cbindgen.toml [export] include)"
        );
    }
    // The integer-coded fields of the structs, each with its enum.
    for (field_doc, prefix) in [
        (
            "StrakePatternInterval",
            "STRAKE_PATTERN_INTERVAL_KIND_MISS = 0",
        ),
        (
            "StrakePassOptions",
            "STRAKE_STEP_RULE_CONSTANT_STEP_OVER = 1",
        ),
        ("StrakeCentreFeed", "STRAKE_FEED_BOUND_ANGULAR_SPEED = 3"),
        ("StrakeGeodesicInfo", "STRAKE_DOMAIN_SIDE_V_MAX = 4"),
    ] {
        assert!(
            code.contains(field_doc) && code.contains(prefix),
            "{prefix}"
        );
    }
}
