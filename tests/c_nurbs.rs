//! Issue 3 from C: the native NURBS surface and the same surface through a host callback (the
//! host's own B-spline evaluator, examples/c/bspline_patch.h) agree to 1e-12 relative.

#[path = "support/c_build.rs"]
mod c_build;

use std::process::Command;

#[test]
fn native_and_callback_agree_from_c() {
    let root = c_build::root();
    let exe = c_build::build_dir().unwrap().join("nurbs_agree");
    let include = format!("-I{}", root.join("examples").join("c").display());
    c_build::compile(
        &[root.join("tests").join("c").join("nurbs_agree.c")],
        &exe,
        &[&include],
    )
    .unwrap_or_else(|e| panic!("{e}"));
    let out = Command::new(&exe).output().expect("run nurbs_agree");
    let text = String::from_utf8_lossy(&out.stdout);
    assert!(
        out.status.success(),
        "{text}\n{}",
        String::from_utf8_lossy(&out.stderr)
    );
    assert!(text.contains("0 above 1e-12"), "{text}");
}
