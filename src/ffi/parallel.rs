//! The batch over several threads, on the host's terms: the host passes the number of threads
//! for this call; strake starts that many scoped threads (the calling thread works too), joins
//! them before returning, and keeps no thread or pool between calls.

use super::curve::StrakeCurve;
use super::evaluate::{publish_frames, scratch};
use super::guard::{Failure, check_count, guard, input, input_slice, output};
use super::status::StrakeStatus;
use super::surface::StrakeSurface;
use super::types::StrakeFrame;
use crate::engine::parallel::frames_parallel_with;
use crate::paths::curve_on_surface::CurveOnSurface;
use std::mem::MaybeUninit;
use std::ptr::NonNull;

/// The host's output array, shared by the worker threads, each of which writes only the pieces
/// it publishes.
struct SharedOut(NonNull<MaybeUninit<StrakeFrame>>);

// SAFETY: the threads write disjoint ranges of the array (see `frames_parallel_with`'s publish
// step), and the array outlives the scoped threads.
unsafe impl Sync for SharedOut {}

impl SharedOut {
    /// The address of element `first`.
    ///
    /// # Safety
    /// `first` must lie within the array (or at its end).
    unsafe fn at(&self, first: usize) -> NonNull<MaybeUninit<StrakeFrame>> {
        // SAFETY: the caller's contract.
        unsafe { self.0.add(first) }
    }
}

/// As `strake_frames_at`, evaluated at once on `threads` threads: the calling thread and
/// `threads - 1` threads started for this call and joined before it returns (no thread pool,
/// nothing left running). The samples are cut into pieces (a few hundred to 4096 samples) that
/// go, in order, to whichever thread is free, so a thread the operating system slows down
/// takes fewer of them. `threads` = 1 is
/// the serial `strake_frames_at`; a host that wants no threads from strake passes 1. Fewer
/// threads are started when there are fewer than 256 samples per thread (starting a thread
/// costs tens of microseconds). The results are those of `strake_frames_at`, bit for bit,
/// whatever the number of threads.
///
/// Host callbacks (surface or curve) are then called from several threads at once: the
/// callback and its `user_data` must allow that. A panic in a worker is reported as
/// STRAKE_STATUS_INTERNAL_PANIC.
///
/// Returns `STRAKE_STATUS_OK` and writes `out[0..count]`; otherwise `out` is untouched and the
/// message names the failing sample with the lowest index, and its t. Errors: those of
/// `strake_frames_at`, plus INVALID_ARGUMENT for `threads` = 0.
///
/// # Safety
/// `ts` must point to `count` doubles and `out` to room for `count` frames (or be NULL); the
/// two must not overlap; handles as in `strake_frame_at`.
#[unsafe(no_mangle)]
pub unsafe extern "C" fn strake_frames_at_parallel(
    surface: *const StrakeSurface,
    curve: *const StrakeCurve,
    ts: *const f64,
    count: usize,
    threads: u32,
    out: *mut StrakeFrame,
) -> StrakeStatus {
    guard("strake_frames_at_parallel", || {
        // SAFETY: the caller passes live handles or NULL, and `count` readable doubles at `ts`.
        let (s, c) = unsafe { (input(surface, "surface")?, input(curve, "curve")?) };
        let ts = unsafe { input_slice(ts, count, "ts", "count")? };
        let slot = output(out, "out")?;
        check_count::<StrakeFrame>(count, "count")?;
        if threads == 0 {
            return Err(Failure::invalid(
                "`threads` is 0; pass 1 to evaluate on the calling thread only".to_string(),
            ));
        }
        let pair = CurveOnSurface::new(s.source(), c.curve());
        let mut buf = scratch(count)?;
        let dest = SharedOut(slot);
        frames_parallel_with(
            pair.surface(),
            pair.curve(),
            pair.scales(),
            threads as usize,
            |i| ts[i],
            &mut buf,
            // The threads copy the pieces, once every sample has succeeded.
            |first, piece: &mut [MaybeUninit<StrakeFrame>]| {
                // SAFETY: called only when every sample succeeded, so the piece is fully
                // written; `out` has room for `count` frames (checked above) and the pieces
                // [first, first + len) are disjoint and each published once, so no two
                // threads write the same element.
                unsafe { publish_frames(piece, dest.at(first)) }
            },
        )?;
        Ok(())
    })
}
