//! Build script: gives the shared library a SONAME on ELF systems, so that a program linked
//! against it records `libstrake.so.MAJOR` (the ABI version, see DEVELOPERS.md "Installing")
//! instead of the path of the build directory. `scripts/install.sh` installs the library as
//! `libstrake.so.MAJOR.MINOR.PATCH` with the `libstrake.so.MAJOR` and `libstrake.so` links.

fn main() {
    println!("cargo:rerun-if-changed=build.rs");
    let os = std::env::var("CARGO_CFG_TARGET_OS").unwrap_or_default();
    let elf = matches!(
        os.as_str(),
        "linux" | "android" | "freebsd" | "netbsd" | "openbsd" | "dragonfly" | "illumos"
    );
    if elf {
        let major = std::env::var("CARGO_PKG_VERSION_MAJOR").unwrap_or_else(|_| "0".into());
        println!("cargo:rustc-cdylib-link-arg=-Wl,-soname,libstrake.so.{major}");
    }
}
