//! Builds `tests/c/batch_check.c` (the batched surface callback and the parallel batch used from
//! C) with strict warnings, runs it, and again under AddressSanitizer/UBSan when the compiler
//! supports them.

#[path = "support/c_build.rs"]
mod c_build;

use std::process::Command;

fn build_and_run(name: &str, extra: &[&str]) {
    let exe = c_build::build_dir().unwrap().join(name);
    let src = c_build::root()
        .join("tests")
        .join("c")
        .join("batch_check.c");
    c_build::compile(&[src], &exe, extra).unwrap_or_else(|e| panic!("{e}"));
    let out = Command::new(&exe).output().expect("run batch_check");
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        out.status.success() && text.contains(", 0 failed"),
        "{text}\n{}",
        String::from_utf8_lossy(&out.stderr)
    );
}

#[test]
fn batch_callback_and_parallel_batch_from_c() {
    build_and_run("batch_check", &[]);
    if c_build::sanitizers_available() {
        build_and_run("batch_check_sanitized", c_build::SANITIZER_FLAGS);
    } else {
        eprintln!("note: no sanitizer build available; skipped");
    }
}
