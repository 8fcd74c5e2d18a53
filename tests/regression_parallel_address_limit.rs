//! Regression (issue 16, item 3): the parallel batch under a real address-space limit, as
//! batch schedulers set one. The test re-executes its own binary as a child process (selected
//! by an environment variable); the child computes the frames of a path serially, then lowers
//! its address-space limit (`setrlimit(RLIMIT_AS)`) to what it already uses plus 1 MiB, so that
//! no new thread can map its stack, checks that a thread really cannot start, and runs
//! `strake_frames_at_parallel` with 4 threads. The batch must finish with the serial results
//! (the calling thread does all the work) or with a status: never hang, never panic. The
//! parent kills a child that has not finished within 120 s, which fails the test.

#![cfg(target_os = "linux")]

#[path = "support/ffi_util.rs"]
mod ffi_util;

use ffi_util::*;
use std::io::Read;
use std::process::{Command, Stdio};
use std::time::{Duration, Instant};
use strake::ffi::*;

const CHILD: &str = "STRAKE_ADDRESS_LIMIT_CHILD";
const TEST: &str = "parallel_batch_finishes_under_an_address_space_limit";

/// The child's address space in use, from /proc/self/statm (pages).
fn address_space_bytes() -> u64 {
    let statm = std::fs::read_to_string("/proc/self/statm").expect("/proc/self/statm");
    let pages: u64 = statm.split_whitespace().next().unwrap().parse().unwrap();
    // SAFETY: sysconf has no preconditions.
    let page = unsafe { libc::sysconf(libc::_SC_PAGESIZE) } as u64;
    pages * page
}

fn child() {
    let mut r = 2.0f64;
    let s = surface(Some(sphere), (&raw mut r).cast(), (0.0, 6.0), (0.2, 2.9), 0);
    let c = uv_line([0.5, 0.4], [5.5, 2.7]);
    let n = 20_000;
    let ts: Vec<f64> = (0..n).map(|i| i as f64 / (n - 1) as f64).collect();
    let mut serial = vec![sentinel(); n];
    let mut parallel = vec![sentinel(); n];
    // SAFETY: live handles, buffers of n frames.
    let st = unsafe { strake_frames_at(s, c, ts.as_ptr(), n, serial.as_mut_ptr()) };
    assert_eq!(st, StrakeStatus::Ok, "{}", message());

    let limit = address_space_bytes() + (1 << 20);
    let rl = libc::rlimit {
        rlim_cur: limit,
        rlim_max: limit,
    };
    // SAFETY: a valid rlimit; lowering a limit needs no privilege.
    assert_eq!(unsafe { libc::setrlimit(libc::RLIMIT_AS, &rl) }, 0);
    let spawn = std::thread::Builder::new().spawn(|| ());
    assert!(
        spawn.is_err(),
        "a thread still starts under the limit: the test would not test anything"
    );
    println!("child: limit {limit} bytes, a thread cannot start");

    // SAFETY: as above.
    let st = unsafe { strake_frames_at_parallel(s, c, ts.as_ptr(), n, 4, parallel.as_mut_ptr()) };
    match st {
        StrakeStatus::Ok => {
            let same = serial.iter().zip(&parallel).all(|(a, b)| {
                a.point.map(f64::to_bits) == b.point.map(f64::to_bits)
                    && a.normal.map(f64::to_bits) == b.normal.map(f64::to_bits)
                    && a.geodesic_torsion.to_bits() == b.geodesic_torsion.to_bits()
                    && a.k1.to_bits() == b.k1.to_bits()
            });
            assert!(same, "the parallel frames differ from the serial ones");
            println!("child: STRAKE_STATUS_OK, {n} frames equal to the serial ones");
        }
        other => {
            assert_ne!(other, StrakeStatus::InternalPanic, "{}", message());
            println!("child: status {other:?}: {}", message());
        }
    }
    println!("child: finished");
}

#[test]
fn parallel_batch_finishes_under_an_address_space_limit() {
    if std::env::var_os(CHILD).is_some() {
        child();
        return;
    }
    let exe = std::env::current_exe().unwrap();
    let mut proc = Command::new(exe)
        .args(["--exact", TEST, "--nocapture", "--test-threads=1"])
        .env(CHILD, "1")
        .stdout(Stdio::piped())
        .stderr(Stdio::piped())
        .spawn()
        .expect("start the child");
    let start = Instant::now();
    let status = loop {
        if let Some(st) = proc.try_wait().unwrap() {
            break st;
        }
        if start.elapsed() > Duration::from_secs(120) {
            proc.kill().unwrap();
            proc.wait().unwrap();
            panic!("the parallel batch under an address-space limit hung (child killed)");
        }
        std::thread::sleep(Duration::from_millis(50));
    };
    let mut out = String::new();
    let mut err = String::new();
    proc.stdout
        .take()
        .unwrap()
        .read_to_string(&mut out)
        .unwrap();
    proc.stderr
        .take()
        .unwrap()
        .read_to_string(&mut err)
        .unwrap();
    assert!(status.success(), "child failed ({status}):\n{out}\n{err}");
    assert!(out.contains("a thread cannot start"), "{out}");
    assert!(out.contains("child: finished"), "{out}");
    assert!(
        out.contains("equal to the serial ones") || out.contains("child: status"),
        "{out}"
    );
}
