//! Batch evaluation over several threads, on the host's terms: the host chooses the number of
//! threads (1 = serial, no thread is started); strake starts scoped threads for the call (the
//! calling thread works too) and joins them before returning, so no global thread pool is ever
//! created. Starting a thread costs tens of microseconds and one allocation (its handle), per
//! call, not per point.
//!
//! The samples are cut into pieces of a few hundred to a few thousand, handed out in order to
//! whichever thread is free (a counter behind a lock, taken once per piece). Contiguous halves,
//! one per thread, would leave the whole call waiting for the slower thread whenever the
//! operating system gives one of them less time (another program on the same core); with
//! pieces, the faster thread takes more of them.
//!
//! A thread that cannot be started (an address-space or thread-count limit, as batch
//! schedulers set) is not an error: the batch goes on with the threads that did start, down to
//! the calling thread alone, and gives the same results (regression tests in this module: a
//! spawn failure simulated at every position; `tests/regression_parallel_address_limit.rs`: a
//! real address-space limit, `setrlimit(RLIMIT_AS)`, in a child process).

use crate::curve::UvCurve;
use crate::engine::batch::{CHUNK, SinkSlice};
use crate::engine::batch::{Hints, SampleError};
use crate::geometry::frame::ParamScales;
use crate::surface::SurfaceSource;
use std::panic::{AssertUnwindSafe, catch_unwind};
use std::sync::atomic::{AtomicUsize, Ordering};
use std::sync::{Condvar, Mutex, PoisonError};

/// Below this many samples per thread, extra threads cost more than they save (thread start-up
/// is tens of microseconds; one frame is well under a microsecond).
pub const MIN_SAMPLES_PER_THREAD: usize = 256;

/// Pieces per thread the samples are cut into when there are enough of them: enough for the
/// threads to even out a difference in speed, few enough that taking a piece (a lock) and
/// starting it again without span hints cost nothing measurable.
const PIECES_PER_THREAD: usize = 16;

/// The largest piece, in samples (a few hundred microseconds of work).
const MAX_PIECE: usize = 4096;

/// Samples per piece for `n` samples over `threads` threads: about [`PIECES_PER_THREAD`]
/// pieces per thread, at least one chunk of the batch kernel ([`CHUNK`]) and at most
/// [`MAX_PIECE`], a whole number of chunks.
fn piece_len(n: usize, threads: usize) -> usize {
    let want = n.div_ceil(threads * PIECES_PER_THREAD);
    want.clamp(CHUNK, MAX_PIECE).div_ceil(CHUNK) * CHUNK
}

/// What a worker brings back: the first error of its pieces (its lowest failing index, pieces
/// being taken in increasing order), or the payload of a panic.
type WorkerEnd = std::thread::Result<Option<SampleError>>;

/// The engine of the parallel batches: sample i has parameter `t_of(i)` and its frame goes to
/// `out[i]` (written in place by the batch kernel through [`SinkSlice::sink`] of the piece it
/// lies in), i < `out.len()`; `threads` ≥ 1 (capped as
/// in [`crate::CurveOnSurface::frames_at_parallel`]). Pieces handed out in order to whichever thread is free; the
/// calling thread is one of the workers. Errors as in [`crate::CurveOnSurface::frames_at_parallel`].
///
/// When every piece has succeeded, `publish(first, piece)` is called once for each piece
/// (`first` the index of its first sample), by the worker threads, so that copying the results
/// to their final place runs in parallel too (the C calls write the host's array only on
/// success). It is not called at all when any sample fails or any worker panics.
pub(crate) fn frames_parallel_with<S, C, T, F, P>(
    surface: &S,
    curve: &C,
    scales: ParamScales,
    threads: usize,
    t_of: F,
    out: &mut [T],
    publish: P,
) -> Result<(), SampleError>
where
    S: SurfaceSource + ?Sized,
    C: UvCurve + ?Sized,
    T: SinkSlice + Send,
    F: Fn(usize) -> f64 + Sync,
    P: Fn(usize, &mut [T]) + Sync,
{
    let n = out.len();
    let threads = threads.min(n.div_ceil(MIN_SAMPLES_PER_THREAD)).max(1);
    let t_of = &t_of;
    let run = move |first: usize, oc: &mut [T]| {
        crate::engine::batch::frames_blocked_into(
            surface,
            curve,
            scales,
            oc.len(),
            &mut Hints::default(),
            |i| t_of(first + i),
            &mut T::sink(oc),
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
    let piece = piece_len(n, threads);
    // The pieces still to do, in order; the pieces done (for the publish step); the lowest
    // failing sample index seen so far (0 after a panic, usize::MAX while none): pieces that
    // start after it are skipped, those before it are still evaluated, so the lowest failing
    // index overall is found.
    let todo = Mutex::new(out.chunks_mut(piece).enumerate());
    let done = Mutex::new(Vec::with_capacity(n.div_ceil(piece)));
    let lowest_failure = AtomicUsize::new(usize::MAX);
    // Every worker reaches the gate, even after a failure or a panic (caught, resumed after
    // the join), so that none waits forever; the gate opens when all the workers that started
    // (known once the calling thread has tried to start them) have arrived.
    let barrier = Gate::default();
    let (todo, done, lowest_failure, barrier, publish) =
        (&todo, &done, &lowest_failure, &barrier, &publish);
    let work = move || -> WorkerEnd {
        let mut end: WorkerEnd = Ok(None);
        loop {
            let next = todo.lock().unwrap_or_else(PoisonError::into_inner).next();
            let Some((k, oc)) = next else { break };
            let first = k * piece;
            if first > lowest_failure.load(Ordering::Relaxed) {
                break;
            }
            match catch_unwind(AssertUnwindSafe(|| run(first, &mut *oc))) {
                Ok(Ok(())) => done
                    .lock()
                    .unwrap_or_else(PoisonError::into_inner)
                    .push((first, oc)),
                Ok(Err(e)) => {
                    lowest_failure.fetch_min(e.index, Ordering::Relaxed);
                    end = Ok(Some(e));
                    break;
                }
                Err(payload) => {
                    lowest_failure.store(0, Ordering::Relaxed);
                    end = Err(payload);
                    break;
                }
            }
        }
        barrier.wait();
        if lowest_failure.load(Ordering::Relaxed) == usize::MAX {
            loop {
                let next = done.lock().unwrap_or_else(PoisonError::into_inner).pop();
                let Some((first, oc)) = next else { break };
                publish(first, oc);
            }
        }
        end
    };
    std::thread::scope(|scope| {
        let mut handles = Vec::with_capacity(threads - 1);
        for k in 1..threads {
            match spawn_worker(scope, k, work) {
                Ok(h) => handles.push(h),
                // Could not start: go on with the threads that did (the calling thread works
                // in any case), never wait for one that does not exist.
                Err(_) => break,
            }
        }
        barrier.expect(handles.len() + 1);
        let mine = work();
        let ends: Vec<WorkerEnd> = std::iter::once(mine)
            .chain(handles.into_iter().map(|h| h.join().unwrap_or_else(Err)))
            .collect();
        // A panic anywhere is resumed here first; otherwise the error with the lowest index.
        let mut lowest: Option<SampleError> = None;
        for end in ends {
            match end {
                Err(payload) => std::panic::resume_unwind(payload),
                Ok(Some(e)) if lowest.as_ref().is_none_or(|l| e.index < l.index) => {
                    lowest = Some(e)
                }
                Ok(_) => {}
            }
        }
        lowest.map_or(Ok(()), Err)
    })
}

/// A barrier whose number of participants is known only after some of them have arrived:
/// [`Gate::wait`] returns once [`Gate::expect`] has been called and that many have arrived.
#[derive(Default)]
struct Gate {
    /// (arrived, expected).
    state: Mutex<(usize, Option<usize>)>,
    open: Condvar,
}

impl Gate {
    fn expect(&self, n: usize) {
        let mut s = self.state.lock().unwrap_or_else(PoisonError::into_inner);
        s.1 = Some(n);
        self.open.notify_all();
    }

    fn wait(&self) {
        let mut s = self.state.lock().unwrap_or_else(PoisonError::into_inner);
        s.0 += 1;
        self.open.notify_all();
        while s.1 != Some(s.0) {
            s = self.open.wait(s).unwrap_or_else(PoisonError::into_inner);
        }
    }
}

/// Starts worker `k` (1-based; the calling thread is worker 0) with
/// `std::thread::Builder::spawn_scoped`, which reports a thread that cannot be started instead
/// of panicking. In unit tests, [`tests::FAIL_SPAWN_FROM`] simulates the failure.
fn spawn_worker<'scope, 'env, F>(
    scope: &'scope std::thread::Scope<'scope, 'env>,
    k: usize,
    work: F,
) -> std::io::Result<std::thread::ScopedJoinHandle<'scope, WorkerEnd>>
where
    F: FnOnce() -> WorkerEnd + Send + 'scope,
{
    #[cfg(test)]
    if tests::FAIL_SPAWN_FROM.with(|f| f.get()) <= k {
        return Err(std::io::Error::other("simulated: thread cannot start"));
    }
    let _ = k;
    std::thread::Builder::new()
        .name("strake-batch".into())
        .spawn_scoped(scope, work)
}

#[cfg(test)]
mod tests {
    use super::*;
    use std::cell::Cell;

    thread_local! {
        /// Workers from this index on fail to start (simulated); `usize::MAX`: none fails.
        pub(super) static FAIL_SPAWN_FROM: Cell<usize> = const { Cell::new(usize::MAX) };
    }

    // Regression: a thread that could not start panicked inside the scope, and the started
    // threads waited at the barrier forever. Every position of the failure, and a failure
    // with samples that fail too, must finish with the serial results.
    #[test]
    fn parallel_batch_never_hangs_when_a_thread_cannot_start() {
        use crate::analytic::sphere;
        use crate::curve::uv_line;
        use crate::geometry::frame::DarbouxFrame;
        let s = sphere(2.0);
        let (ud, vd) = (s.u_domain(), s.v_domain());
        let c = uv_line(ud.lo + 0.1, vd.lo + 0.3, ud.hi - 0.2, vd.hi - 0.4).unwrap();
        let scales = ParamScales {
            u_extent: ud.width(),
            v_extent: vd.width(),
            t_extent: 1.0,
        };
        let n = 5000;
        let t_of = |i: usize| i as f64 / (n - 1) as f64;
        let blank: DarbouxFrame = crate::CurveOnSurface::new(&s, &c)
            .frame(0.5, &mut Default::default())
            .unwrap();
        let serial = {
            let mut out = vec![blank; n];
            frames_parallel_with(&s, &c, scales, 1, t_of, &mut out, |_, _| {}).unwrap();
            out
        };
        for threads in [2, 3, 4] {
            for fail_from in 1..threads {
                FAIL_SPAWN_FROM.with(|f| f.set(fail_from));
                let mut out = vec![blank; n];
                frames_parallel_with(&s, &c, scales, threads, t_of, &mut out, |_, _| {}).unwrap();
                assert!(
                    out.iter()
                        .zip(&serial)
                        .all(|(a, b)| a.to_array() == b.to_array())
                );
                // A failing sample is still reported, with the lowest index.
                let bad = |i: usize| if i == 3001 { 7.0 } else { t_of(i) };
                let e = frames_parallel_with(&s, &c, scales, threads, bad, &mut out, |_, _| {})
                    .unwrap_err();
                assert_eq!(e.index, 3001);
            }
        }
        FAIL_SPAWN_FROM.with(|f| f.set(usize::MAX));
    }

    // Common practice: pieces are whole chunks, cover the samples in about 16 per thread, and
    // stay within their bounds.
    #[test]
    fn pieces_are_whole_chunks_within_bounds() {
        assert_eq!(piece_len(512, 2), CHUNK);
        assert_eq!(piece_len(65536, 2), 2048);
        assert_eq!(piece_len(10_000_000, 2), MAX_PIECE);
        assert_eq!(piece_len(100_000, 3), 2112);
        for (n, threads) in [(300, 2), (5000, 2), (65536, 4), (1 << 24, 8)] {
            let p = piece_len(n, threads);
            assert_eq!(p % CHUNK, 0);
            assert!((CHUNK..=MAX_PIECE).contains(&p));
        }
    }
}
