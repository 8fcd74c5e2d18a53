//! strake installed like a C library, used as a new user would: `scripts/install.sh` into a
//! temporary prefix (it builds the release library once for every test here), then programs
//! built from **outside** the source tree against the installed files only:
//! - the README's C example through pkg-config, linked to the shared library and, separately,
//!   to the static one with the system libraries the .pc file lists;
//! - the README's C++ example through CMake (`find_package(strake)`, `strake::strake`), the
//!   C++ example of `examples/cpp`, and the wrapper's own checks (`tests/cpp/wrapper_check.cpp`)
//!   with `-std=c++17` and `-std=c++20`, `-Wall -Wextra -Werror -pedantic`;
//! - the Python package (`bindings/python`) installed with pip, its pytest suite, and the
//!   README's Python example.
//!
//! The snippets are taken from README.md's own text (the code block after each
//! `<!-- snippet: NAME -->` marker). Tools these tests need (cmake, pkg-config, a C++ compiler,
//! python3 with pip, numpy and pytest) must be present: `.ci/run` installs them; a missing one
//! fails the test with what to install, it never skips.

use std::path::{Path, PathBuf};
use std::process::Command;
use std::sync::OnceLock;

fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// A scratch directory outside the source tree, fresh for this run of the test binary.
fn scratch() -> &'static Path {
    static DIR: OnceLock<PathBuf> = OnceLock::new();
    DIR.get_or_init(|| {
        let base = std::env::temp_dir();
        // Leftovers of earlier runs whose process has ended.
        if let Ok(entries) = std::fs::read_dir(&base) {
            for e in entries.flatten() {
                let name = e.file_name().to_string_lossy().into_owned();
                if let Some(pid) = name.strip_prefix("strake-install-test-")
                    && !Path::new("/proc").join(pid).exists()
                {
                    let _ = std::fs::remove_dir_all(e.path());
                }
            }
        }
        let dir = base.join(format!("strake-install-test-{}", std::process::id()));
        let _ = std::fs::remove_dir_all(&dir);
        std::fs::create_dir_all(&dir).expect("create the scratch directory");
        assert!(
            !dir.starts_with(root()),
            "the scratch directory must lie outside the source tree"
        );
        dir
    })
}

/// Runs `cmd`, panicking with its command line and output when it fails; returns stdout.
#[track_caller]
fn run(cmd: &mut Command) -> String {
    let shown = format!("{cmd:?}");
    let out = cmd
        .output()
        .unwrap_or_else(|e| panic!("cannot run {shown}: {e} (is the tool installed? .ci/run installs cmake, pkg-config, g++, python3-pip)"));
    let stdout = String::from_utf8_lossy(&out.stdout).into_owned();
    assert!(
        out.status.success(),
        "{shown} failed ({}):\n{stdout}\n{}",
        out.status,
        String::from_utf8_lossy(&out.stderr)
    );
    stdout
}

/// The prefix strake is installed into (once per test binary).
fn prefix() -> &'static Path {
    static PREFIX: OnceLock<PathBuf> = OnceLock::new();
    PREFIX.get_or_init(|| {
        let prefix = scratch().join("prefix");
        run(Command::new("sh")
            .arg(root().join("scripts/install.sh"))
            .arg(&prefix)
            .env("CI", "1"));
        prefix
    })
}

/// The code block that follows `<!-- snippet: NAME -->` in README.md.
fn snippet(name: &str) -> String {
    let readme = std::fs::read_to_string(root().join("README.md")).expect("README.md");
    let marker = format!("<!-- snippet: {name} -->");
    let after = readme
        .split_once(&marker)
        .unwrap_or_else(|| panic!("README.md has no `{marker}`"))
        .1;
    let fence_start = after.find("```").expect("a code block after the marker");
    let body = &after[fence_start..];
    let body = &body[body.find('\n').unwrap() + 1..];
    let end = body.find("\n```").expect("the code block ends");
    body[..end + 1].to_string()
}

fn write(path: &Path, text: &str) {
    std::fs::create_dir_all(path.parent().unwrap()).unwrap();
    std::fs::write(path, text).unwrap();
}

fn pkg_config(args: &[&str]) -> Vec<String> {
    let out = run(Command::new("pkg-config")
        .args(args)
        .arg("strake")
        .env("PKG_CONFIG_PATH", prefix().join("lib/pkgconfig")));
    out.split_whitespace().map(str::to_string).collect()
}

/// Every kn printed by the README's C and C++ examples (the bowl: all positive, five lines).
fn check_bowl_output(out: &str) {
    let kns: Vec<f64> = out
        .lines()
        .filter_map(|l| l.split_whitespace().find_map(|w| w.strip_prefix("kn=")))
        .map(|k| k.parse().unwrap())
        .collect();
    assert_eq!(kns.len(), 5, "{out}");
    assert!(kns.iter().all(|&k| k > 0.0), "{out}");
}

#[test]
fn the_prefix_holds_a_c_library_layout() {
    let p = prefix();
    let version = env!("CARGO_PKG_VERSION");
    let major = env!("CARGO_PKG_VERSION_MAJOR");
    let lib = p.join("lib");
    for f in [
        "include/strake.h".to_string(),
        "include/strake.hpp".to_string(),
        format!("lib/libstrake.so.{version}"),
        "lib/libstrake.a".to_string(),
        "lib/pkgconfig/strake.pc".to_string(),
        "lib/cmake/strake/strakeConfig.cmake".to_string(),
        "lib/cmake/strake/strakeConfigVersion.cmake".to_string(),
    ] {
        assert!(p.join(&f).is_file(), "{f} missing from the prefix");
    }
    assert_eq!(
        std::fs::read_link(lib.join(format!("libstrake.so.{major}"))).unwrap(),
        PathBuf::from(format!("libstrake.so.{version}"))
    );
    assert_eq!(
        std::fs::read_link(lib.join("libstrake.so")).unwrap(),
        PathBuf::from(format!("libstrake.so.{major}"))
    );
    let dynamic = run(Command::new("readelf")
        .arg("-d")
        .arg(lib.join(format!("libstrake.so.{version}"))));
    assert!(
        dynamic.contains(&format!("Library soname: [libstrake.so.{major}]")),
        "{dynamic}"
    );
    // The release library is stripped: no symbol table beyond the dynamic one, no DWARF.
    let sections = run(Command::new("readelf")
        .arg("-S")
        .arg(lib.join(format!("libstrake.so.{version}"))));
    assert!(!sections.contains(".debug_info"), "{sections}");
    assert!(!sections.contains(" .symtab"), "{sections}");
    assert_eq!(pkg_config(&["--modversion"]), vec![version.to_string()]);
}

#[test]
fn readme_c_example_builds_through_pkg_config_shared_and_static() {
    let dir = scratch().join("c-client");
    let src = dir.join("bowl.c");
    write(&src, &snippet("readme.c"));
    // Shared, exactly the README's link line.
    let exe = dir.join("bowl");
    let mut cmd = Command::new("cc");
    cmd.args(["-std=c11", "-Wall", "-Wextra", "-Wpedantic", "-Werror"])
        .arg(&src)
        .arg("-o")
        .arg(&exe)
        .args(pkg_config(&["--cflags", "--libs"]))
        .arg(format!("-Wl,-rpath,{}", prefix().join("lib").display()));
    run(&mut cmd);
    let needed = run(Command::new("readelf").arg("-d").arg(&exe));
    assert!(
        needed.contains("Shared library: [libstrake.so.0]"),
        "{needed}"
    );
    assert!(
        !needed.contains(root().to_str().unwrap()),
        "the program must not name the build tree: {needed}"
    );
    check_bowl_output(&run(Command::new(&exe)
        .current_dir(&dir)
        .env_remove("LD_LIBRARY_PATH")));

    // Static: libstrake.a and the system libraries of Libs.private, nothing else.
    let exe = dir.join("bowl-static");
    let private: Vec<String> = pkg_config(&["--static", "--libs-only-l"])
        .into_iter()
        .filter(|f| f != "-lstrake")
        .collect();
    let mut cmd = Command::new("cc");
    cmd.args(["-std=c11", "-Wall", "-Wextra", "-Wpedantic", "-Werror"])
        .arg(&src)
        .arg("-o")
        .arg(&exe)
        .args(pkg_config(&["--cflags"]))
        .arg(prefix().join("lib/libstrake.a"))
        .args(&private);
    run(&mut cmd);
    let needed = run(Command::new("readelf").arg("-d").arg(&exe));
    assert!(!needed.contains("libstrake"), "{needed}");
    check_bowl_output(&run(Command::new(&exe).env_remove("LD_LIBRARY_PATH")));
}

fn cmake_build(name: &str, source_dir: &Path) -> PathBuf {
    let build = scratch().join(format!("cmake-{name}"));
    run(Command::new("cmake")
        .arg("-S")
        .arg(source_dir)
        .arg("-B")
        .arg(&build)
        .arg(format!("-DCMAKE_PREFIX_PATH={}", prefix().display()))
        .arg("-DCMAKE_CXX_FLAGS=-Wall -Wextra -Werror -pedantic")
        .arg("-DCMAKE_BUILD_TYPE=Release"));
    run(Command::new("cmake").arg("--build").arg(&build));
    build
}

#[test]
fn readme_cpp_example_builds_through_cmake() {
    let dir = scratch().join("cpp-client");
    write(&dir.join("CMakeLists.txt"), &snippet("CMakeLists.txt"));
    write(&dir.join("bowl.cpp"), &snippet("readme.cpp"));
    let build = cmake_build("readme", &dir);
    let out = run(Command::new(build.join("bowl")).env_remove("LD_LIBRARY_PATH"));
    check_bowl_output(&out);
    assert!(
        out.contains("refused: strake_frame_at") && out.contains("outside"),
        "{out}"
    );
}

#[test]
fn cpp_example_builds_through_cmake_and_runs() {
    // Copied out of the tree, as a user would start from it.
    let dir = scratch().join("cpp-example");
    for f in ["CMakeLists.txt", "boat_hull_pass.cpp"] {
        let text = std::fs::read_to_string(root().join("examples/cpp").join(f)).unwrap();
        write(&dir.join(f), &text);
    }
    let build = cmake_build("example", &dir);
    let out = run(Command::new(build.join("boat_hull_pass")).env_remove("LD_LIBRARY_PATH"));
    assert_eq!(out.lines().count(), 12, "{out}");
    assert!(
        out.contains("refused as expected")
            && out.contains("hull data ends at the transom (u > 0.8)"),
        "{out}"
    );
}

#[test]
fn cpp_wrapper_checks_pass_in_cpp17_and_cpp20() {
    let src = scratch().join("wrapper").join("wrapper_check.cpp");
    write(
        &src,
        &std::fs::read_to_string(root().join("tests/cpp/wrapper_check.cpp")).unwrap(),
    );
    for std in ["c++17", "c++20"] {
        let exe = src.with_file_name(format!("wrapper_check_{std}"));
        let mut cmd = Command::new("c++");
        cmd.arg(format!("-std={std}"))
            .args(["-Wall", "-Wextra", "-Werror", "-pedantic"])
            .args(pkg_config(&["--cflags"]))
            .arg(&src)
            .arg("-o")
            .arg(&exe)
            .args(pkg_config(&["--libs"]))
            .arg(format!("-Wl,-rpath,{}", prefix().join("lib").display()));
        run(&mut cmd);
        let out = run(&mut Command::new(&exe));
        assert!(out.contains(" passed, 0 failed"), "{out}");
        // The checks of every wrapper ran (71 when the whole C ABI was first wrapped).
        let passed: usize = out
            .split(" passed")
            .next()
            .and_then(|s| s.rsplit(' ').next())
            .and_then(|n| n.parse().ok())
            .unwrap_or(0);
        assert!(passed >= 71, "{out}");
    }
}

/// The directory the Python package is installed into with pip (once per test binary).
fn python_target() -> &'static Path {
    static TARGET: OnceLock<PathBuf> = OnceLock::new();
    TARGET.get_or_init(|| {
        prefix(); // the release library is built by then: pip's cargo call has nothing to do
        let target = scratch().join("python");
        run(Command::new("python3")
            .args(["-m", "pip", "install", "--quiet", "--no-deps"])
            .args(["--disable-pip-version-check", "--no-warn-script-location"])
            .arg("--target")
            .arg(&target)
            .arg(root().join("bindings/python"))
            .env("CI", "1")
            .env("PIP_ROOT_USER_ACTION", "ignore"));
        assert!(target.join("strake_darboux/libstrake.so").is_file());
        assert!(target.join("strake_darboux/py.typed").is_file());
        target
    })
}

fn python(script: &Path) -> Command {
    let mut cmd = Command::new("python3");
    cmd.arg(script)
        .env("PYTHONPATH", python_target())
        .env("PYTHONDONTWRITEBYTECODE", "1")
        .current_dir(scratch());
    cmd
}

#[test]
fn python_package_installs_with_pip_and_its_tests_pass() {
    let target = python_target();
    let out = run(Command::new("python3")
        .args(["-m", "pytest", "-q", "-p", "no:cacheprovider"])
        .arg(root().join("bindings/python/tests"))
        .env("PYTHONPATH", target)
        .env("PYTHONDONTWRITEBYTECODE", "1")
        .current_dir(scratch()));
    let summary = out.lines().last().unwrap_or_default();
    assert!(
        summary.contains(" passed") && !summary.contains("failed") && !summary.contains("skipped"),
        "{out}"
    );
    // Both test files ran (23 tests when the whole C ABI was first wrapped).
    let passed: usize = summary
        .split_whitespace()
        .next()
        .and_then(|n| n.parse().ok())
        .unwrap_or(0);
    assert!(passed >= 23, "{out}");
    eprintln!("pytest: {summary}");
}

#[test]
fn readme_python_example_evaluates_a_100k_point_path() {
    let script = scratch().join("readme_example.py");
    write(&script, &snippet("readme.py"));
    let out = run(&mut python(&script));
    assert!(out.starts_with("(100000,) "), "{out}");
}

#[test]
fn python_example_runs_without_matplotlib() {
    let out = run(&mut python(
        &root().join("examples/python/wing_skin_course.py"),
    ));
    assert!(
        out.contains("100000 samples") && out.contains("tightest steering radius"),
        "{out}"
    );
}
