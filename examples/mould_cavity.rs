//! Builds and runs the C host demo `examples/c/mould_cavity.c`: a finishing pass across a mould
//! cavity, with the host's own B-spline surface passed to strake as a callback.
//!
//! `cargo run --example mould_cavity` compiles the C program with the system C compiler
//! (`$CC` or `cc`) against `include/strake.h` and the shared library cargo has just built, then
//! runs it; arguments after `--` are passed on (e.g. `-- --raw`).

#[path = "../tests/support/c_build.rs"]
mod c_build;

use std::process::{Command, ExitCode};

fn main() -> ExitCode {
    let run = || -> Result<i32, String> {
        let exe = c_build::build_dir()?.join("mould_cavity");
        c_build::compile(&c_build::demo_sources(), &exe, &["-O2"])?;
        let status = Command::new(&exe)
            .args(std::env::args_os().skip(1))
            .status()
            .map_err(|e| format!("cannot run {}: {e}", exe.display()))?;
        Ok(status.code().unwrap_or(1))
    };
    match run() {
        Ok(0) => ExitCode::SUCCESS,
        Ok(code) => ExitCode::from(u8::try_from(code).unwrap_or(1)),
        Err(e) => {
            eprintln!("mould_cavity: {e}");
            ExitCode::FAILURE
        }
    }
}
