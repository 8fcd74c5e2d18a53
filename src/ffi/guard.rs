//! The one panic boundary every exported function runs in, the failure type the bodies return,
//! and the checks that turn raw pointers into references.
//!
//! An exported function is written as
//! `guard("strake_x", || { let a = input(a_ptr, "a")?; ...; Ok(()) })`. The guard catches any
//! panic ([`std::panic::catch_unwind`]; the crate must keep the default `panic = "unwind"`),
//! turns a [`Failure`] into its status and the thread-local message (prefixed with the
//! function's name), and returns `STRAKE_STATUS_OK` otherwise.

use super::message;
use super::status::StrakeStatus;
use crate::error::StrakeError;
use crate::paths::curve_on_surface::SampleError;
use std::any::Any;
use std::mem::MaybeUninit;
use std::panic::{AssertUnwindSafe, catch_unwind};
use std::ptr::NonNull;

/// Why an exported function failed: the status to return and the message to leave.
#[derive(Debug, Clone, PartialEq)]
pub(crate) struct Failure {
    /// The status returned to the host.
    pub status: StrakeStatus,
    /// The message (without the function name, which the guard adds).
    pub message: String,
    /// The host's code when a callback failed.
    pub callback_code: Option<i32>,
}

impl Failure {
    /// A failure with a status and a message.
    pub fn new(status: StrakeStatus, message: String) -> Self {
        Failure {
            status,
            message,
            callback_code: None,
        }
    }

    /// `STRAKE_STATUS_NULL_POINTER` naming the argument.
    pub fn null(name: &str) -> Self {
        Failure::new(
            StrakeStatus::NullPointer,
            format!("argument `{name}` is NULL"),
        )
    }

    /// `STRAKE_STATUS_INVALID_ARGUMENT` with a message.
    pub fn invalid(message: String) -> Self {
        Failure::new(StrakeStatus::InvalidArgument, message)
    }
}

fn callback_code(e: &StrakeError) -> Option<i32> {
    match e {
        StrakeError::Callback { code, .. } => Some(*code),
        StrakeError::AtPoint { error, .. } => callback_code(error),
        _ => None,
    }
}

impl From<StrakeError> for Failure {
    fn from(e: StrakeError) -> Self {
        Failure {
            status: StrakeStatus::of(&e),
            message: e.to_string(),
            callback_code: callback_code(&e),
        }
    }
}

impl From<SampleError> for Failure {
    fn from(e: SampleError) -> Self {
        Failure {
            status: StrakeStatus::of(&e.error),
            // A failure of the whole call (bad options) carries no sample: t is NaN then. A
            // sample whose own t is NaN is a sample, and is named with its index.
            message: if e.t.is_nan()
                && !matches!(
                    e.error,
                    crate::error::StrakeError::NonFinite {
                        source: crate::error::NonFiniteSource::Parameter,
                        ..
                    }
                ) {
                e.error.to_string()
            } else {
                e.to_string()
            },
            callback_code: callback_code(&e.error),
        }
    }
}

fn panic_text(payload: &(dyn Any + Send)) -> &str {
    if let Some(s) = payload.downcast_ref::<&str>() {
        s
    } else if let Some(s) = payload.downcast_ref::<String>() {
        s
    } else {
        "(no message)"
    }
}

/// Runs the body of the exported function `func` behind the panic boundary and turns its
/// outcome into a status (and the thread-local message on failure).
pub(crate) fn guard(
    func: &'static str,
    body: impl FnOnce() -> Result<(), Failure>,
) -> StrakeStatus {
    // A report left by a callback in an earlier call must not be attached to this call's
    // failure.
    message::clear_callback_report();
    // Handles are immutable, so a panic cannot leave one half-changed: asserting unwind safety
    // is sound here.
    match catch_unwind(AssertUnwindSafe(body)) {
        Ok(Ok(())) => StrakeStatus::Ok,
        Ok(Err(f)) => {
            message::record(format!("{func}: {}", f.message), f.callback_code);
            f.status
        }
        Err(payload) => {
            message::record(
                format!(
                    "{func}: internal error (panic caught at the C boundary): {}",
                    panic_text(&*payload)
                ),
                None,
            );
            StrakeStatus::InternalPanic
        }
    }
}

/// The panic boundary for the few exported functions that return a value instead of a status
/// (version, message, names): a panic gives `fallback`.
pub(crate) fn guard_value<T>(fallback: T, body: impl FnOnce() -> T) -> T {
    catch_unwind(AssertUnwindSafe(body)).unwrap_or(fallback)
}

/// Checks a pointer that must not be NULL and must be aligned for `T`.
pub(crate) fn non_null<T>(p: *const T, name: &str) -> Result<NonNull<T>, Failure> {
    let nn = NonNull::new(p.cast_mut()).ok_or_else(|| Failure::null(name))?;
    if !p.is_aligned() {
        return Err(Failure::new(
            StrakeStatus::NullPointer,
            format!(
                "argument `{name}` = {p:p} is not aligned to {} bytes",
                std::mem::align_of::<T>()
            ),
        ));
    }
    Ok(nn)
}

/// A read-only reference from an input pointer (NULL and alignment checked).
///
/// # Safety
/// When not NULL, `p` must point to a valid `T` that is not written during the call.
pub(crate) unsafe fn input<'a, T>(p: *const T, name: &str) -> Result<&'a T, Failure> {
    // SAFETY: non-null and aligned checked; validity is the caller's contract.
    Ok(unsafe { non_null(p, name)?.as_ref() })
}

/// Checks that `count` elements of `T` fit in one allocation (at most `isize::MAX` bytes).
pub(crate) fn check_count<T>(count: usize, name: &str) -> Result<(), Failure> {
    if count == 0 {
        return Err(Failure::invalid(format!(
            "`{name}` is 0; at least one element is needed"
        )));
    }
    match count.checked_mul(std::mem::size_of::<T>()) {
        Some(bytes) if bytes <= isize::MAX as usize => Ok(()),
        _ => Err(Failure::invalid(format!(
            "`{name}` = {count} is too large: {count} elements of {} bytes do not fit in memory",
            std::mem::size_of::<T>()
        ))),
    }
}

/// A read-only slice of `len` elements from an input pointer (NULL, alignment, `len` > 0 and
/// size overflow checked; `len_name` names the count in messages).
///
/// # Safety
/// When not NULL, `p` must point to `len` valid elements not written during the call.
pub(crate) unsafe fn input_slice<'a, T>(
    p: *const T,
    len: usize,
    name: &str,
    len_name: &str,
) -> Result<&'a [T], Failure> {
    let nn = non_null(p, name)?;
    check_count::<T>(len, len_name)?;
    // SAFETY: non-null, aligned, size fits in isize; validity is the caller's contract.
    Ok(unsafe { std::slice::from_raw_parts(nn.as_ptr(), len) })
}

/// An output slot (NULL and alignment checked). Only written once everything has succeeded.
pub(crate) fn output<T>(p: *mut T, name: &str) -> Result<NonNull<MaybeUninit<T>>, Failure> {
    Ok(non_null(p.cast_const(), name)?.cast())
}

/// A caller buffer of the one buffer pattern of the ABI: `T *buf, size_t capacity,
/// size_t *count`. On success the result is copied to `buf` and `*count` is its length; when
/// the result does not fit, `*count` is set to the length needed, nothing is written to `buf`,
/// and the call fails with `STRAKE_STATUS_BUFFER_TOO_SMALL`. `buf` may be NULL when
/// `capacity` is 0 (a size query).
pub(crate) struct OutBuffer<T> {
    buf: *mut T,
    capacity: usize,
    count: NonNull<MaybeUninit<usize>>,
}

/// Checks a caller buffer: `count` must not be NULL; when `capacity` > 0, `buf` must not be
/// NULL, must be aligned, and `capacity` elements must fit in memory. Writes nothing.
pub(crate) fn out_buffer<T>(
    buf: *mut T,
    capacity: usize,
    count: *mut usize,
) -> Result<OutBuffer<T>, Failure> {
    let count = output(count, "count")?;
    if capacity > 0 {
        non_null(buf.cast_const(), "buf")?;
        check_count::<T>(capacity, "capacity")?;
    }
    Ok(OutBuffer {
        buf,
        capacity,
        count,
    })
}

impl<T: Copy> OutBuffer<T> {
    /// How many elements the caller's buffer holds.
    pub fn capacity(&self) -> usize {
        self.capacity
    }

    /// Writes `*count = needed` (the one output written on this failure) and returns the
    /// `STRAKE_STATUS_BUFFER_TOO_SMALL` failure; `what` names the elements ("samples").
    pub fn too_small(self, needed: usize, what: &str) -> Failure {
        // SAFETY: `count` was checked non-null and aligned; the caller provides a writable
        // size_t.
        unsafe { self.count.as_ptr().write(MaybeUninit::new(needed)) };
        Failure::new(
            StrakeStatus::BufferTooSmall,
            format!(
                "buffer too small: {needed} {what} needed, `capacity` = {}; `*count` now holds \
                 the number needed, nothing was written to `buf`",
                self.capacity
            ),
        )
    }

    /// Copies `items` to the caller's buffer and writes `*count`, or fails with
    /// [`OutBuffer::too_small`] when they do not fit.
    pub fn deliver(self, items: &[T], what: &str) -> Result<(), Failure> {
        let n = items.len();
        if n > self.capacity {
            return Err(self.too_small(n, what));
        }
        // SAFETY: when n > 0, capacity >= n > 0, so `buf` was checked non-null and aligned and
        // the caller provides room for `capacity` elements; `items` is our own buffer and
        // cannot overlap it. `count` was checked non-null and aligned.
        unsafe {
            if n > 0 {
                std::ptr::copy_nonoverlapping(items.as_ptr(), self.buf, n);
            }
            self.count.as_ptr().write(MaybeUninit::new(n));
        }
        Ok(())
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    // A panic inside a guarded body must come back as STRAKE_STATUS_INTERNAL_PANIC with a
    // message naming the function and the panic, and must not unwind into the caller
    // (common practice for C ABIs: unwinding across `extern "C"` aborts the host).
    #[test]
    fn a_panic_becomes_internal_panic_with_message() {
        let status = guard("strake_test_fn", || -> Result<(), Failure> {
            panic!("boom at index 7")
        });
        assert_eq!(status, StrakeStatus::InternalPanic);
        let m = message::last_message();
        assert!(m.starts_with("strake_test_fn: internal error"), "{m}");
        assert!(m.contains("boom at index 7"), "{m}");
        let v = guard_value(5u32, || panic!("formatted {}", 3));
        assert_eq!(v, 5);
    }

    #[test]
    fn failures_carry_status_message_and_callback_code() {
        let status = guard("strake_test_fn", || {
            Err(StrakeError::Callback {
                which: "curve",
                code: -12,
                message: None,
            }
            .into())
        });
        assert_eq!(status, StrakeStatus::CurveCallbackFailed);
        assert!(message::last_message().contains("code -12"));
        assert_eq!(crate::ffi::message::strake_last_callback_code(), -12);
        assert_eq!(guard("strake_test_fn", || Ok(())), StrakeStatus::Ok);
        // Success leaves the last failure's message in place.
        assert!(message::last_message().contains("code -12"));
    }

    #[test]
    fn pointer_checks_name_the_argument() {
        let e = non_null::<f64>(std::ptr::null(), "knots").unwrap_err();
        assert_eq!(e.status, StrakeStatus::NullPointer);
        assert!(e.message.contains("`knots`"));
        let buf = [0u64; 2];
        let misaligned = (buf.as_ptr() as *const u8).wrapping_add(1) as *const f64;
        let e = non_null(misaligned, "ts").unwrap_err();
        assert!(e.message.contains("not aligned"), "{}", e.message);
        let e = check_count::<[f64; 2]>(usize::MAX / 2 + 1, "point_count").unwrap_err();
        assert_eq!(e.status, StrakeStatus::InvalidArgument);
        assert!(e.message.contains("too large"));
        assert!(
            check_count::<f64>(0, "count")
                .unwrap_err()
                .message
                .contains("`count` is 0")
        );
    }
}
