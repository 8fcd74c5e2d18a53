//! Batch evaluation over several threads, on the host's terms: the host chooses the number of
//! threads (1 = serial, no thread is started); strake starts scoped threads for the call and
//! joins them before returning, so no global thread pool is ever created.

use crate::curve::UvCurve;
use crate::error::StrakeError;
use crate::frame::DarbouxFrame;
use crate::path::{CurveOnSurface, Hints, SampleError};
use crate::surface::SurfaceSource;

/// Below this many samples per thread, extra threads cost more than they save (thread start-up
/// is tens of microseconds; one frame is well under a microsecond).
pub const MIN_SAMPLES_PER_THREAD: usize = 256;

/// Frames at each of `ts` into `out` (same length), split into contiguous chunks over at most
/// `threads` scoped threads (each with its own span hints), each chunk evaluated like
/// [`CurveOnSurface::frames_at`] (the same bits as one point at a time). `threads` = 0 is refused; 1 runs
/// on the calling thread. A panic in a worker (e.g. in a Rust closure surface) is resumed on
/// the calling thread. On failure the error of the lowest failing index is returned; `out`
/// is then partly written.
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
    let n = ts.len();
    let threads = threads.min(n.div_ceil(MIN_SAMPLES_PER_THREAD)).max(1);
    if threads == 1 {
        return cs.frames_at(ts, out);
    }
    let chunk = n.div_ceil(threads);
    let results: Vec<Result<(), SampleError>> = std::thread::scope(|scope| {
        let handles: Vec<_> = ts
            .chunks(chunk)
            .zip(out.chunks_mut(chunk))
            .enumerate()
            .map(|(k, (tc, oc))| {
                scope.spawn(move || {
                    crate::batch::frames_blocked(
                        cs,
                        tc.len(),
                        &mut Hints::default(),
                        |i| tc[i],
                        |i, _, f| oc[i] = *f,
                    )
                    .map_err(|e| SampleError {
                        index: k * chunk + e.index,
                        ..e
                    })
                })
            })
            .collect();
        handles
            .into_iter()
            .map(|h| h.join().unwrap_or_else(|p| std::panic::resume_unwind(p)))
            .collect()
    });
    // Chunks are in index order, so the first error is the lowest failing index.
    results.into_iter().collect()
}
