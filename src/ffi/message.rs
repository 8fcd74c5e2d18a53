//! The thread-local message of the last failure, and the host callback code that went with it.
//!
//! Each thread has its own message: a failure on one thread never overwrites what another
//! thread is about to read. A successful call leaves the message alone, so it always describes
//! the last call on this thread that failed.

use std::cell::{Cell, RefCell};
use std::ffi::c_char;

thread_local! {
    static LAST_MESSAGE: RefCell<String> = const { RefCell::new(String::new()) };
    static LAST_CALLBACK_CODE: Cell<i32> = const { Cell::new(0) };
    static CALLBACK_REPORT: RefCell<Option<String>> = const { RefCell::new(None) };
}

/// The longest report kept from a host callback, in bytes (longer text is cut at a character
/// boundary and marked with "...").
pub const CALLBACK_REPORT_MAX: usize = 1024;

/// Forgets a report left by a host callback on this thread (each guarded call starts clean).
pub(crate) fn clear_callback_report() {
    let _ = CALLBACK_REPORT.try_with(|r| {
        if let Ok(mut r) = r.try_borrow_mut() {
            if r.is_some() {
                *r = None;
            }
        }
    });
}

/// The error for a host callback `which` that returned the non-zero `code`, carrying the text
/// the callback left with `strake_callback_report` on this thread (taken, so it is used once).
pub(crate) fn callback_error(which: &'static str, code: i32) -> crate::error::StrakeError {
    let message = CALLBACK_REPORT
        .try_with(|r| r.try_borrow_mut().ok().and_then(|mut r| r.take()))
        .ok()
        .flatten();
    crate::error::StrakeError::Callback {
        which,
        code,
        message,
    }
}

/// Stores `message` as this thread's last message (and `callback_code` when a host callback
/// failed). Silently does nothing while the thread is being torn down.
pub(crate) fn record(message: String, callback_code: Option<i32>) {
    let _ = LAST_MESSAGE.try_with(|m| {
        if let Ok(mut m) = m.try_borrow_mut() {
            *m = message;
        }
    });
    if let Some(code) = callback_code {
        let _ = LAST_CALLBACK_CODE.try_with(|c| c.set(code));
    }
}

/// A copy of this thread's last message (empty when nothing has failed on this thread).
pub fn last_message() -> String {
    LAST_MESSAGE
        .try_with(|m| m.borrow().clone())
        .unwrap_or_default()
}

/// Copies the message of the last failed call on this thread into `buf`.
///
/// Returns the size needed to hold the whole message including its terminating NUL (1 when
/// nothing has failed on this thread). When `buf` is NULL or `buf_len` is 0 nothing is written:
/// call it that way to learn the size, allocate, and call again. Otherwise at most
/// `buf_len - 1` bytes of the message are copied, cut at a UTF-8 character boundary, and a NUL
/// is written after them; so the message was cut exactly when the value returned is larger
/// than `buf_len`. The message is UTF-8 text (in practice ASCII) naming the function, what was
/// wrong, and the index, value or sample where it was found.
///
/// Successful calls do not clear the message; messages are per thread. Called from a
/// thread-exit destructor after the thread's message is gone, it behaves as on a thread on
/// which nothing has failed (returns 1, writes the NUL).
///
/// # Safety
/// `buf` must be NULL or point to at least `buf_len` writable bytes.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_last_error_message(buf: *mut c_char, buf_len: usize) -> usize {
    super::guard::guard_value(0, || {
        LAST_MESSAGE
            .try_with(|m| {
                let m = m.borrow();
                let needed = m.len() + 1;
                if buf.is_null() || buf_len == 0 {
                    return needed;
                }
                let mut n = m.len().min(buf_len - 1);
                while !m.is_char_boundary(n) {
                    n -= 1;
                }
                // SAFETY: the caller guarantees `buf_len` writable bytes at `buf`; we write
                // n + 1 <= buf_len of them. `m` is our own string and cannot overlap `buf`.
                unsafe {
                    std::ptr::copy_nonoverlapping(m.as_ptr(), buf.cast::<u8>(), n);
                    *buf.add(n) = 0;
                }
                needed
            })
            .unwrap_or_else(|_| {
                // The thread's message is already destroyed (a call from a thread-exit
                // destructor): no message, as the contract says for a thread on which nothing
                // has failed: the size 1 and, where there is room, the terminating NUL.
                if !buf.is_null() && buf_len > 0 {
                    // SAFETY: the caller guarantees `buf_len` ≥ 1 writable bytes at `buf`.
                    unsafe { *buf = 0 };
                }
                1
            })
    })
}

/// The code returned by the host callback in the last call on this thread that failed with
/// `STRAKE_STATUS_SURFACE_CALLBACK_FAILED` or `STRAKE_STATUS_CURVE_CALLBACK_FAILED`; 0 when
/// no callback has failed on this thread. Not cleared by later calls.
#[unsafe(no_mangle)]
pub extern "C" fn strake_last_callback_code() -> i32 {
    super::guard::guard_value(0, || LAST_CALLBACK_CODE.try_with(Cell::get).unwrap_or(0))
}

/// Lets a host callback say why it fails: call it from inside a surface or curve callback,
/// on the thread that runs the callback, right before returning a non-zero code. strake then
/// puts the text into its error message ("host surface callback failed with code 3: TEXT"),
/// which `strake_last_error_message` returns on the thread that made the failing call (also
/// when a parallel call ran the callback on a worker thread). The C++ and Python wrappers pass
/// an exception's text this way.
///
/// `message` is UTF-8 text (invalid bytes are replaced by U+FFFD), copied at once; text beyond
/// 1024 bytes is cut and marked with "...". NULL forgets a report made earlier. A report is
/// used by the next failing callback on this thread within the same strake call, then
/// forgotten; a report left by a callback that then returned 0 is dropped when the next strake
/// call starts. Cannot fail; never writes through `message`.
///
/// # Safety
/// `message` must be NULL or a NUL-terminated string.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_callback_report(message: *const c_char) {
    super::guard::guard_value((), || {
        let text = if message.is_null() {
            None
        } else {
            // SAFETY: the caller passes a NUL-terminated string.
            let raw = unsafe { std::ffi::CStr::from_ptr(message) };
            let mut text = String::from_utf8_lossy(raw.to_bytes()).into_owned();
            if text.len() > CALLBACK_REPORT_MAX {
                let mut n = CALLBACK_REPORT_MAX;
                while !text.is_char_boundary(n) {
                    n -= 1;
                }
                text.truncate(n);
                text.push_str("...");
            }
            Some(text)
        };
        let _ = CALLBACK_REPORT.try_with(|r| {
            if let Ok(mut r) = r.try_borrow_mut() {
                *r = text;
            }
        });
    })
}
