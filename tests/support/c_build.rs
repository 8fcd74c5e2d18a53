//! Compiling C programs against `include/strake.h` and the freshly built shared library.
//!
//! Shared by `examples/mould_cavity.rs` and `tests/c_demo.rs` (each includes this file with
//! `#[path]`), so the demo command and the test build the C code the same way. Uses the system
//! C compiler: `$CC` if set, else `cc`.

#![allow(dead_code)]

use std::path::{Path, PathBuf};
use std::process::Command;

/// The warning flags every C program of the project must compile cleanly with.
pub const STRICT_FLAGS: &[&str] = &["-std=c11", "-Wall", "-Wextra", "-Wpedantic", "-Werror"];

/// Sanitizer flags for the checked builds.
pub const SANITIZER_FLAGS: &[&str] = &[
    "-fsanitize=address,undefined",
    "-fno-sanitize-recover=all",
    "-g",
];

/// The crate's root directory.
pub fn root() -> PathBuf {
    PathBuf::from(env!("CARGO_MANIFEST_DIR"))
}

/// The C compiler: `$CC` or `cc`.
pub fn compiler() -> String {
    std::env::var("CC")
        .ok()
        .filter(|c| !c.is_empty())
        .unwrap_or_else(|| "cc".to_string())
}

fn library_file_name() -> String {
    format!(
        "{}strake{}",
        std::env::consts::DLL_PREFIX,
        std::env::consts::DLL_SUFFIX
    )
}

/// The directory holding the shared library built together with the running program:
/// `target/<profile>/deps`, found from the running executable (`target/<profile>/deps/...` for
/// tests, `target/<profile>/examples/...` for examples). cargo writes the cdylib there on every
/// build that needs the library; the copy directly in `target/<profile>/` is only refreshed by
/// `cargo build` and may be stale, so it is not used.
pub fn library_dir() -> Result<PathBuf, String> {
    let exe = std::env::current_exe()
        .map_err(|e| format!("cannot locate the running executable: {e}"))?;
    let name = library_file_name();
    exe.ancestors()
        .skip(1)
        .flat_map(|d| [d.to_path_buf(), d.join("deps")])
        .find(|d| d.file_name().is_some_and(|n| n == "deps") && d.join(&name).is_file())
        .ok_or_else(|| {
            format!(
                "{name} not found in the deps directory above {}",
                exe.display()
            )
        })
}

/// The shared library's SONAME (`libstrake.so.MAJOR`, set by `build.rs` on ELF systems): a
/// program linked against `libstrake.so` records this name and looks for it at run time.
pub fn soname() -> String {
    format!("libstrake.so.{}", env!("CARGO_PKG_VERSION_MAJOR"))
}

/// Makes the SONAME resolvable in the deps directory: a relative symbolic link
/// `libstrake.so.MAJOR -> libstrake.so` beside the library cargo built (on ELF systems).
pub fn link_soname(lib: &Path) -> Result<(), String> {
    #[cfg(all(unix, not(target_os = "macos")))]
    {
        let link = lib.join(soname());
        if std::fs::symlink_metadata(&link).is_err() {
            match std::os::unix::fs::symlink(library_file_name(), &link) {
                Ok(()) => {}
                // Another test made it at the same moment.
                Err(e) if e.kind() == std::io::ErrorKind::AlreadyExists => {}
                Err(e) => return Err(format!("cannot create {}: {e}", link.display())),
            }
        }
    }
    let _ = lib;
    Ok(())
}

/// A directory for compiled C programs, inside the target directory.
pub fn build_dir() -> Result<PathBuf, String> {
    let lib = library_dir()?;
    let dir = lib.parent().unwrap_or(&lib).join("strake-c");
    std::fs::create_dir_all(&dir).map_err(|e| format!("cannot create {}: {e}", dir.display()))?;
    Ok(dir)
}

/// Compiles `sources` into the executable `output`, with the strict warning flags, `extra`
/// flags, `include/` and the sources' own directories on the include path, and the shared
/// library linked with an rpath so that the program runs without any environment setup.
pub fn compile(sources: &[PathBuf], output: &Path, extra: &[&str]) -> Result<(), String> {
    let lib = library_dir()?;
    link_soname(&lib)?;
    let mut cmd = Command::new(compiler());
    cmd.args(STRICT_FLAGS).args(extra);
    cmd.arg("-I").arg(root().join("include"));
    for s in sources {
        if let Some(dir) = s.parent() {
            cmd.arg("-I").arg(dir);
        }
    }
    cmd.args(sources);
    cmd.arg("-o").arg(output);
    cmd.arg("-L").arg(&lib).arg("-lstrake").arg("-lm");
    if !cfg!(windows) {
        cmd.arg(format!("-Wl,-rpath,{}", lib.display()));
    }
    if cfg!(target_os = "linux") {
        // DT_RPATH rather than DT_RUNPATH: searched before LD_LIBRARY_PATH, which cargo sets to
        // include target/<profile>/, where a stale libstrake.so from an earlier `cargo build`
        // may lie.
        cmd.arg("-Wl,--disable-new-dtags");
    }
    let shown = format!("{cmd:?}");
    let out = cmd
        .output()
        .map_err(|e| format!("cannot run the C compiler `{}`: {e}", compiler()))?;
    if !out.status.success() {
        return Err(format!(
            "C compilation failed:\n{shown}\n{}{}",
            String::from_utf8_lossy(&out.stdout),
            String::from_utf8_lossy(&out.stderr)
        ));
    }
    Ok(())
}

/// True when the C compiler can build and run a program with [`SANITIZER_FLAGS`].
pub fn sanitizers_available() -> bool {
    let Ok(dir) = build_dir() else { return false };
    let src = dir.join("sanitizer_probe.c");
    let exe = dir.join("sanitizer_probe");
    if std::fs::write(&src, "int main(void) { return 0; }\n").is_err() {
        return false;
    }
    let built = Command::new(compiler())
        .args(SANITIZER_FLAGS)
        .arg(&src)
        .arg("-o")
        .arg(&exe)
        .output()
        .is_ok_and(|o| o.status.success());
    built
        && Command::new(&exe)
            .output()
            .is_ok_and(|o| o.status.success())
}

/// The C sources of the mould cavity demo.
pub fn demo_sources() -> Vec<PathBuf> {
    vec![root().join("examples").join("c").join("mould_cavity.c")]
}
