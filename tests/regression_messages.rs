//! Regression: messages that did not say what was wrong, or said it in a form C users do not
//! read.
//!
//! - A NaN t in a batch was reported without its sample index (every other bad t had one).
//! - The size query (NULL buffer, capacity 0) of even-t and even-arc sampling answered
//!   BUFFER_TOO_SMALL for an invalid arc tolerance; chordal sampling validated first. All three
//!   validate first now.
//! - `strake_last_error_message` called from a thread-exit destructor returned 0 and wrote
//!   nothing; the header promises a size of at least 1 and a terminated buffer.
//! - Explanatory numbers printed with 17 digits and `0e0`; now C's `%g` layout (6 significant
//!   digits), exact values (parameters) with the shortest round-trip digits.
//! - Vectors and points were printed by Rust's `{:?}` (`[0.0, 0.0, 0.0]`) or by `{}` per
//!   component (`1e300` printed as 301 digits); they now print as `(x, y, z)` with each
//!   component as an exact number.

#[path = "support/ffi_util.rs"]
mod ffi_util;

use ffi_util::*;
use std::ptr;
use strake::ffi::*;

fn plane_pair() -> (*mut StrakeSurface, *mut StrakeCurve) {
    let s = surface(Some(plane), ptr::null_mut(), (0.0, 1.0), (0.0, 1.0), 0);
    let c = uv_line([0.1, 0.2], [0.9, 0.7]);
    (s, c)
}

#[test]
fn nan_t_in_a_batch_is_named_with_its_sample_index() {
    let (s, c) = plane_pair();
    let ts = [0.0, 0.25, 0.5, f64::NAN, 1.0];
    let mut out = [sentinel(); 5];
    // SAFETY: live handles, arrays of the stated length.
    let st = unsafe { strake_frames_at(s, c, ts.as_ptr(), ts.len(), out.as_mut_ptr()) };
    expect(st, StrakeStatus::NonFinite, &["sample 3", "t = NaN"]);
    assert!(out.iter().all(|f| f.u == sentinel().u), "outputs untouched");
    free(s, c);
}

#[test]
fn size_queries_validate_the_options_first() {
    let (s, c) = plane_pair();
    let mut n = 12345usize;
    // SAFETY: live handles; NULL buffer with capacity 0 is the size query.
    unsafe {
        for (name, st) in [
            (
                "even_t",
                strake_sample_even_t(s, c, 9, -1.0, ptr::null_mut(), 0, &mut n),
            ),
            (
                "even_arc",
                strake_sample_even_arc(s, c, 9, f64::NAN, ptr::null_mut(), 0, &mut n),
            ),
            (
                "chordal",
                strake_sample_chordal(s, c, 1e-3, 1.0, 0.0, ptr::null_mut(), 0, &mut n),
            ),
        ] {
            assert_eq!(st, StrakeStatus::InvalidArgument, "{name}: {}", message());
            assert!(
                message().contains("arc length tolerance"),
                "{name}: {}",
                message()
            );
            assert_eq!(n, 12345, "{name}: count untouched");
        }
        // A valid query still answers with the size.
        let st = strake_sample_even_t(s, c, 9, 1e-10, ptr::null_mut(), 0, &mut n);
        assert_eq!(st, StrakeStatus::BufferTooSmall);
        assert_eq!(n, 9);
    }
    free(s, c);
}

struct ReadsMessageOnExit(std::sync::mpsc::Sender<(usize, u8)>);

impl Drop for ReadsMessageOnExit {
    fn drop(&mut self) {
        let mut buf = [0x55u8; 8];
        // SAFETY: a buffer of 8 writable bytes.
        let n = unsafe { strake_last_error_message(buf.as_mut_ptr().cast(), buf.len()) };
        let _ = self.0.send((n, buf[0]));
    }
}

thread_local! {
    static ON_EXIT: std::cell::RefCell<Option<ReadsMessageOnExit>> =
        const { std::cell::RefCell::new(None) };
}

#[test]
fn last_error_message_from_a_thread_exit_destructor_writes_the_nul() {
    let (tx, rx) = std::sync::mpsc::channel();
    std::thread::spawn(move || {
        // Registered before the library's message, so destroyed after it.
        ON_EXIT.with(|o| *o.borrow_mut() = Some(ReadsMessageOnExit(tx)));
        let (s, c) = plane_pair();
        let mut f = sentinel();
        // SAFETY: live handles; a t outside the domain fails and sets the message.
        let st = unsafe { strake_frame_at(s, c, 7.0, &mut f) };
        assert_eq!(st, StrakeStatus::OutOfDomain);
        free(s, c);
    })
    .join()
    .unwrap();
    let (n, first) = rx.recv().unwrap();
    assert!(n >= 1, "size at least 1, got {n}");
    if n == 1 {
        assert_eq!(first, 0, "an empty message is the NUL alone");
    } else {
        assert_ne!(first, 0x55, "the buffer was written");
    }
}

#[test]
fn numbers_in_messages_read_as_c_prints_them() {
    let (s, c) = plane_pair();
    let mut f = sentinel();
    // SAFETY: live handles.
    unsafe {
        let st = strake_frame_at(s, c, 1.5, &mut f);
        expect(
            st,
            StrakeStatus::OutOfDomain,
            &["t = 1.5 is outside [0, 1]"],
        );
        let st = strake_frame_at(s, c, 1e300, &mut f);
        expect(
            st,
            StrakeStatus::OutOfDomain,
            &["t = 1e+300 is outside [0, 1]"],
        );
    }
    assert!(!message().contains("0e0"), "{}", message());
    free(s, c);
    let e = strake::StrakeError::DegenerateSurface {
        u: 0.0,
        v: 0.25,
        conditioning: 4.994_705_424_526_952e-7,
    };
    let m = e.to_string();
    assert!(m.contains("(u, v) = (0, 0.25)"), "{m}");
    assert!(m.contains("conditioning 4.99471e-07"), "{m}");
}

#[test]
fn vectors_in_messages_read_as_c_prints_them() {
    // The layout the C test of `tests/ffi_table.rs` checks: `%g` numbers, no `1.0`, no `{:e}`.
    let plane = strake::DrivePlane::new([0.0; 3], [1e300, 0.0, 0.0], [2e300, 0.0, 0.0])
        .err()
        .unwrap()
        .to_string();
    assert!(
        plane.contains("x = (1e+300, 0, 0) and y = (2e+300, 0, 0)"),
        "{plane}"
    );
    let circle = strake::nurbs::conics::circle(
        [0.0; 3],
        [0.0; 3],
        [0.0, 1.0, 0.0],
        1.0,
        strake::nurbs::CircleForm::NinePoint,
    )
    .err()
    .unwrap()
    .to_string();
    assert!(circle.contains("circle x axis (0, 0, 0)"), "{circle}");
    let line = strake::uv_line(0.5, f64::NAN, 1.0, 0.25)
        .err()
        .unwrap()
        .to_string();
    assert!(line.contains("(0.5, NaN) -> (1, 0.25)"), "{line}");
    for m in [&plane, &circle, &line] {
        assert!(
            !m.contains(".0,") && !m.contains(".0]") && !m.contains('['),
            "{m}"
        );
    }
}
