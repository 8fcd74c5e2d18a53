//! The library version, as a string and (in the header) as macros.

use std::ffi::{CStr, c_char};

const VERSION: &CStr =
    match CStr::from_bytes_with_nul(concat!(env!("CARGO_PKG_VERSION"), "\0").as_bytes()) {
        Ok(v) => v,
        Err(_) => panic!("the package version contains a NUL byte"),
    };

/// The version of the library actually loaded, as "MAJOR.MINOR.PATCH" (a static NUL-terminated
/// string owned by the library; do not free it). Compare it with STRAKE_VERSION_STRING from the
/// header to detect a header/library mismatch. Never fails; thread-safe.
#[unsafe(no_mangle)]
pub extern "C" fn strake_version() -> *const c_char {
    super::guard::guard_value(VERSION.as_ptr(), || VERSION.as_ptr())
}
