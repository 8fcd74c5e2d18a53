//! Fuzz target `checks`: the invariants of `tests/fuzz_checks/mod.rs` (`run_checks`), shared with
//! the stable corpus replay `tests/fuzz_corpus.rs`.
#![no_main]

#[path = "../../tests/fuzz_checks/mod.rs"]
mod fuzz_checks;

libfuzzer_sys::fuzz_target!(|data: &[u8]| fuzz_checks::run_checks(data));
