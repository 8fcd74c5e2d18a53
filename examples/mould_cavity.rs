//! Builds and runs the C host demo `examples/c/mould_cavity.c`: a finishing pass across a mould
//! cavity, with the host's own B-spline surface passed to strake as a callback, then a fibre
//! course on a wing skin. Then draws the demo's pictures as SVG files.
//!
//! `cargo run --example mould_cavity` compiles the C program with the system C compiler
//! (`$CC` or `cc`) against `include/strake.h` and the shared library cargo has just built, runs
//! it, runs it again with `--raw` to read the numbers it got from strake, draws them
//! (`examples/plots/`) and names the folder it wrote the pictures into. Options after `--`:
//!
//! - `--pictures DIR`: write the pictures into DIR (default: `pictures/mould_cavity` in cargo's
//!   target directory of this build, e.g. `target/debug/pictures/mould_cavity`);
//! - `--docs`: write them into `docs/pictures/`, the copies the README shows;
//! - `--shade k1|k2|mean|gaussian`: the curvature the cavity is shaded by (default `k1`, the
//!   largest curvature concave toward the tool);
//! - `--raw`: print the data and results at full precision instead (no pictures).

#[path = "../tests/support/c_build.rs"]
mod c_build;
#[path = "plots/mod.rs"]
mod plots;

use std::path::PathBuf;
use std::process::{Command, ExitCode};

struct Options {
    pictures: Option<PathBuf>,
    shade: plots::Shade,
    raw: bool,
    /// Arguments for the C program.
    passed_on: Vec<String>,
}

fn options() -> Result<Options, String> {
    let mut o = Options {
        pictures: None,
        shade: plots::Shade::Concave,
        raw: false,
        passed_on: Vec::new(),
    };
    let mut args = std::env::args().skip(1);
    while let Some(a) = args.next() {
        match a.as_str() {
            "--pictures" => {
                let dir = args.next().ok_or("--pictures needs a folder")?;
                o.pictures = Some(PathBuf::from(dir));
            }
            "--docs" => o.pictures = Some(c_build::root().join("docs").join("pictures")),
            "--shade" => {
                let word = args
                    .next()
                    .ok_or("--shade needs one of k1, k2, mean, gaussian")?;
                o.shade = plots::Shade::from_word(&word)?;
            }
            _ => {
                o.raw |= a == "--raw";
                o.passed_on.push(a);
            }
        }
    }
    Ok(o)
}

fn run() -> Result<i32, String> {
    let o = options()?;
    let build = c_build::build_dir()?;
    let exe = build.join("mould_cavity");
    c_build::compile(&c_build::demo_sources(), &exe, &["-O2"])?;
    let status = Command::new(&exe)
        .args(&o.passed_on)
        .status()
        .map_err(|e| format!("cannot run {}: {e}", exe.display()))?;
    if !status.success() || o.raw {
        return Ok(status.code().unwrap_or(1));
    }
    let out = Command::new(&exe)
        .arg("--raw")
        .output()
        .map_err(|e| format!("cannot run {} --raw: {e}", exe.display()))?;
    if !out.status.success() {
        return Err(format!(
            "{} --raw failed ({}): {}",
            exe.display(),
            out.status,
            String::from_utf8_lossy(&out.stderr)
        ));
    }
    let text = String::from_utf8(out.stdout).map_err(|e| format!("raw output: {e}"))?;
    let demo = plots::raw::parse(&text)?;
    let dir = o.pictures.unwrap_or_else(|| {
        build
            .parent()
            .unwrap_or(&build)
            .join("pictures")
            .join("mould_cavity")
    });
    let written = plots::write_all(&dir, &plots::all(&demo, o.shade)?)?;
    println!(
        "\nPictures ({} SVG files, the cavity shaded by {}): {}",
        written.len(),
        o.shade.short(),
        dir.display()
    );
    Ok(0)
}

fn main() -> ExitCode {
    match run() {
        Ok(0) => ExitCode::SUCCESS,
        Ok(code) => ExitCode::from(u8::try_from(code).unwrap_or(1)),
        Err(e) => {
            eprintln!("mould_cavity: {e}");
            ExitCode::FAILURE
        }
    }
}
