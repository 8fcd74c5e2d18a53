//! Replays the committed fuzz corpus (`fuzz/corpus/<target>/`) on stable through the same
//! invariant checks the cargo-fuzz targets assert (`tests/fuzz_checks/mod.rs`): no panic, every
//! failure a known status with a message, every OK result finite with unit vectors unit, batch
//! and one-point paths bit-identical, the C ABI and the Rust API in agreement. Each input that
//! once found a bug stays in the corpus as its regression test. No nightly toolchain needed.

mod fuzz_checks;

use std::path::Path;

#[test]
fn committed_fuzz_corpus_keeps_every_invariant() {
    let root = Path::new(env!("CARGO_MANIFEST_DIR")).join("fuzz/corpus");
    let mut replayed = 0;
    for (name, run) in fuzz_checks::TARGETS {
        let dir = root.join(name);
        let mut files: Vec<_> = std::fs::read_dir(&dir)
            .unwrap_or_else(|e| panic!("corpus {}: {e}", dir.display()))
            .map(|e| e.expect("corpus entry").path())
            .collect();
        files.sort();
        assert!(!files.is_empty(), "corpus {} is empty", dir.display());
        for file in files {
            let data = std::fs::read(&file).expect("corpus file");
            let outcome = std::panic::catch_unwind(|| run(&data));
            assert!(
                outcome.is_ok(),
                "corpus input {} broke an invariant",
                file.display()
            );
            replayed += 1;
        }
    }
    assert!(replayed > 0);
}

#[test]
fn empty_and_short_inputs_keep_every_invariant() {
    for (_, run) in fuzz_checks::TARGETS {
        run(&[]);
        for b in (0..=255u8).step_by(37) {
            run(&[b]);
            run(&[b; 64]);
        }
    }
}
