//! Batch evaluation over several threads, on the host's terms: the host chooses the number of
//! threads (1 = serial, no thread is started); strake starts scoped threads for the call (the
//! calling thread works on the first chunk) and joins them before returning, so no global
//! thread pool is ever created. Starting a thread costs tens of microseconds and one
//! allocation (its handle), per call, not per point.

use crate::curve::UvCurve;
use crate::error::StrakeError;
use crate::frame::DarbouxFrame;
use crate::path::{CurveOnSurface, Hints, SampleError};
use crate::surface::SurfaceSource;
use std::panic::{AssertUnwindSafe, catch_unwind};
use std::sync::Barrier;
use std::sync::atomic::{AtomicBool, Ordering};

/// Below this many samples per thread, extra threads cost more than they save (thread start-up
/// is tens of microseconds; one frame is well under a microsecond).
pub const MIN_SAMPLES_PER_THREAD: usize = 256;

/// Frames at each of `ts` into `out` (same length), split into contiguous chunks over at most
/// `threads` scoped threads (each with its own span hints), each chunk evaluated like
/// [`CurveOnSurface::frames_at`] (the same bits as one point at a time). `threads` = 0 is
/// refused; 1 runs on the calling thread. Fewer threads are started when there are fewer than
/// [`MIN_SAMPLES_PER_THREAD`] samples per thread. A panic in a worker (e.g. in a Rust closure
/// surface) is resumed on the calling thread. On failure the error of the lowest failing index
/// is returned; `out` is then partly written.
pub fn frames_at_parallel<S, C>(
    cs: &CurveOnSurface<'_, S, C>,
    ts: &[f64],
    out: &mut [DarbouxFrame],
    threads: usize,
) -> Result<(), SampleError>
where
    S: SurfaceSource + ?Sized,
    C: UvCurve + ?Sized,
{
    if threads == 0 || ts.len() != out.len() {
        return Err(SampleError {
            index: 0,
            t: f64::NAN,
            error: StrakeError::InvalidArgument(format!(
                "threads = {threads}, {} parameters, room for {} frames: need threads >= 1 and equal counts",
                ts.len(),
                out.len()
            )),
        });
    }
    frames_parallel_with(cs, threads, |i| ts[i], out, |o, _, f| *o = *f, |_, _| {})
}

/// The engine of the parallel batches: sample i has parameter `t_of(i)` and its frame goes to
/// `out[i]` through `write(&mut out[i], t, frame)`, i < `out.len()`; `threads` ≥ 1 (capped as
/// in [`frames_at_parallel`]). Contiguous chunks, one per scoped thread; the first chunk runs on
/// the calling thread. Errors as in [`frames_at_parallel`].
///
/// When every chunk has succeeded, `publish(first, chunk)` is called for each chunk (`first`
/// the index of its first sample) on the thread that computed it, so that copying the results
/// to their final place runs in parallel too (the C calls write the host's array only on
/// success). It is not called at all when any sample fails or any worker panics.
pub(crate) fn frames_parallel_with<S, C, T, F, W, P>(
    cs: &CurveOnSurface<'_, S, C>,
    threads: usize,
    t_of: F,
    out: &mut [T],
    write: W,
    publish: P,
) -> Result<(), SampleError>
where
    S: SurfaceSource + ?Sized,
    C: UvCurve + ?Sized,
    T: Send,
    F: Fn(usize) -> f64 + Sync,
    W: Fn(&mut T, f64, &DarbouxFrame) + Sync,
    P: Fn(usize, &mut [T]) + Sync,
{
    let n = out.len();
    let threads = threads.min(n.div_ceil(MIN_SAMPLES_PER_THREAD)).max(1);
    let chunk = n.div_ceil(threads).max(1);
    let (t_of, write) = (&t_of, &write);
    let run = move |k: usize, oc: &mut [T]| {
        let first = k * chunk;
        crate::batch::frames_blocked(
            cs,
            oc.len(),
            &mut Hints::default(),
            |i| t_of(first + i),
            |i, t, f| write(&mut oc[i], t, f),
        )
        .map_err(|e| SampleError {
            index: first + e.index,
            ..e
        })
    };
    if threads == 1 {
        run(0, out)?;
        publish(0, out);
        return Ok(());
    }
    let chunks_count = n.div_ceil(chunk);
    // Every worker reaches the barrier, even after a failure or a panic (caught, resumed after
    // the join), so that none waits forever; `failed` tells them whether to publish.
    let barrier = Barrier::new(chunks_count);
    let failed = AtomicBool::new(false);
    let (barrier, failed, publish) = (&barrier, &failed, &publish);
    let work = move |k: usize, oc: &mut [T]| -> std::thread::Result<Result<(), SampleError>> {
        let r = catch_unwind(AssertUnwindSafe(|| run(k, &mut *oc)));
        if !matches!(r, Ok(Ok(()))) {
            failed.store(true, Ordering::Relaxed);
        }
        barrier.wait();
        if !failed.load(Ordering::Relaxed) {
            publish(k * chunk, oc);
        }
        r
    };
    std::thread::scope(|scope| {
        let mut chunks = out.chunks_mut(chunk).enumerate();
        let Some((_, own)) = chunks.next() else {
            return Ok(());
        };
        let handles: Vec<_> = chunks
            .map(|(k, oc)| scope.spawn(move || work(k, oc)))
            .collect();
        let mine = work(0, own);
        let theirs: Vec<std::thread::Result<Result<(), SampleError>>> = handles
            .into_iter()
            .map(|h| h.join().unwrap_or_else(|p| std::panic::resume_unwind(p)))
            .collect();
        // A panic anywhere is resumed here first; then, chunks being in index order, the
        // first error is the lowest failing index.
        let results: Vec<Result<(), SampleError>> = std::iter::once(mine)
            .chain(theirs)
            .map(|r| r.unwrap_or_else(|p| std::panic::resume_unwind(p)))
            .collect();
        for r in results {
            r?;
        }
        Ok(())
    })
}
