//! Samples along a curve on a surface: evenly in the curve parameter, evenly in arc length, or
//! adaptively to a chord tolerance. Every sample is a [`PathSample`]: curve parameter t,
//! cumulative arc length from the start of the curve, and the Darboux frame with (u, v), the
//! invariants and the principal curvatures.
//!
//! **Arc length** s(t) = ∫ |c'(τ)| dτ, c' = Su u' + Sv v', by adaptive Gauss–Legendre
//! quadrature: the 5-point rule ([`GL5_NODES`], [`GL5_WEIGHTS`]; exact for polynomials of
//! degree ≤ 9) on an interval is compared with the rule on its two halves; where they differ by
//! more than the interval's share of the tolerance, each half is treated the same way
//! (recursive bisection, tolerance halved with the interval, never below 16 ε_mach times the
//! interval's length estimate, at most [`MAX_QUADRATURE_DEPTH`] levels). The sum of the halves
//! is returned; its error is far below the difference used to accept it (the rule's error falls
//! by 2¹⁰ per halving on a smooth integrand), so the stated tolerance is a bound in practice:
//! the relative tolerance `arc_tolerance` applies to each interval's length. The integral is
//! first split at the curve's breakpoints ([`UvCurve::breakpoints`], a spline's interior knots),
//! where the speed is not smooth: a kink inside an interval can fool the halving estimate
//! (regression test `tests/regression_arc_length_across_knots.rs`). Each piece is split again
//! where the curve crosses a knot line of the surface ([`SurfaceSource::u_breaks`],
//! [`SurfaceSource::v_breaks`]; on a surface with repeated knots, such as the rational quadratic
//! conics, the speed has a kink there): the piece is scanned at 8 even steps of t and every sign
//! change of u(t) − k or v(t) − k is located by bisection. A knot line the curve only touches,
//! or crosses twice within one step, is not split at; surfaces that do not know their knot
//! lines (host callbacks) are not split at either.
//!
//! **Inverse** t(s): safeguarded Newton's method on f(t) = s(t) − s_target, f' = |c'(t)|, inside
//! a bracket [lo, hi] with f(lo) < 0 ≤ f(hi) that every iterate narrows; a Newton iterate that
//! leaves the bracket is replaced by its midpoint (bisection). f at a new iterate is f at the
//! previous one plus the integral between them, so each iteration integrates only over its own
//! step.
//!
//! **Chord tolerance**: a chord of length L on a circle of radius ρ deviates from the arc by
//! ρ − √(ρ² − L²/4), so a deviation of at most δ allows L ≤ 2√(2ρδ − δ²) (shared/REFERENCES.md;
//! for ρ ≤ δ, L ≤ 2ρ); ρ = 1/κ with κ = √(κn² + κg²) the space curvature. Each step is proposed
//! from the curvature extrapolated to the middle of the step (aiming at [`STEP_AIM`] δ), limited
//! by the maximum step, and then *verified*: the distance from the curve to the chord is
//! measured at t-quarters of the step, its peak estimated by a parabola through those three
//! values, and a step whose peak exceeds δ (or whose arc length exceeds the maximum step) is
//! shrunk by √(STEP_AIM δ/peak) (the deviation grows with the square of the step) and tried
//! again.
//!
//! **Output**: into any [`SampleSink`]: a caller slice (written up to its length; the functions
//! return the count the whole result needs, so a caller whose slice was too short can size one
//! and call again: the samples are deterministic), a `Vec` (pushed), or a closure. Nothing is
//! allocated per sample.

use crate::curve::UvCurve;
use crate::error::{Result, StrakeError};
use crate::geometry::frame::space_curvature;
use crate::geometry::jet::DerivOrder;
use crate::geometry::math::Vec3;
use crate::paths::curve_on_surface::{CurveOnSurface, Hints, PathSample, SampleError};
use crate::surface::SurfaceSource;

/// Abscissae of the 5-point Gauss–Legendre rule on [−1, 1]: 0, ±(1/3)√(5 − 2√(10/7)),
/// ±(1/3)√(5 + 2√(10/7)) (M. Abramowitz, I. A. Stegun, *Handbook of Mathematical Functions*,
/// Table 25.4 \[memory\]; checked against the closed forms and exactness in the tests).
pub const GL5_NODES: [f64; 5] = [
    -0.906_179_845_938_664,
    -0.538_469_310_105_683_1,
    0.0,
    0.538_469_310_105_683_1,
    0.906_179_845_938_664,
];

/// Weights of the 5-point Gauss–Legendre rule: (322 − 13√70)/900, (322 + 13√70)/900, 128/225
/// (A&S Table 25.4 \[memory\]).
pub const GL5_WEIGHTS: [f64; 5] = [
    0.236_926_885_056_189_1,
    0.478_628_670_499_366_47,
    0.568_888_888_888_888_9,
    0.478_628_670_499_366_47,
    0.236_926_885_056_189_1,
];

/// Most levels of bisection in the arc-length quadrature; an interval 2⁻⁶⁰ of the original
/// is accepted as it is.
pub const MAX_QUADRATURE_DEPTH: u32 = 60;

/// Most applications of the 5-point rule (pairs of halves compared) in one adaptive
/// quadrature over a smooth piece of the curve: 2¹⁵, about 330 000 evaluations of the speed.
/// A smooth integrand needs a few dozen at the default tolerance; one that does not settle
/// (a host evaluator whose results carry noise above the tolerance) would otherwise be split
/// to [`MAX_QUADRATURE_DEPTH`] everywhere. When the budget is spent the quadrature stops with
/// `NotConverged`, naming the interval where it stopped, the difference left there and the
/// estimate reached.
pub const MAX_QUADRATURE_RULES: usize = 1 << 15;

/// Chord-tolerance sampling aims each step at this fraction of the tolerance δ and accepts up
/// to δ itself: the margin absorbs the error of the estimated peak deviation, at a cost of
/// about 1/√0.97 − 1 ≈ 1.5 % more samples.
pub const STEP_AIM: f64 = 0.97;

/// Default relative tolerance of arc lengths.
pub const DEFAULT_ARC_TOLERANCE: f64 = 1e-10;

/// Where samples go. `index` runs 0, 1, 2, … without gaps.
pub trait SampleSink {
    /// Receives sample `index`.
    fn put(&mut self, index: usize, sample: &PathSample);
    /// How many samples the sink can hold, if limited (a slice); `None` for unlimited.
    fn capacity(&self) -> Option<usize> {
        None
    }
}

impl SampleSink for [PathSample] {
    #[inline]
    fn put(&mut self, index: usize, sample: &PathSample) {
        if let Some(slot) = self.get_mut(index) {
            *slot = *sample;
        }
    }
    fn capacity(&self) -> Option<usize> {
        Some(self.len())
    }
}

impl SampleSink for Vec<PathSample> {
    #[inline]
    fn put(&mut self, _index: usize, sample: &PathSample) {
        self.push(*sample);
    }
}

/// A sink that calls a closure `f(index, sample)`, e.g. to convert each sample into a host's
/// own record.
pub struct SinkFn<F>(pub F);

impl<F: FnMut(usize, &PathSample)> SampleSink for SinkFn<F> {
    #[inline]
    fn put(&mut self, index: usize, sample: &PathSample) {
        (self.0)(index, sample)
    }
}

pub(crate) fn check_arc_tolerance(tol: f64) -> Result<()> {
    if !(tol.is_finite() && tol > 0.0) {
        return Err(StrakeError::InvalidArgument(format!(
            "arc length tolerance = {tol}: it must be positive and finite",
            tol = crate::numfmt::Exact(tol)
        )));
    }
    Ok(())
}

/// The speed |c'(t)| = |Su u' + Sv v'| (length per unit t), at the point the frame is taken
/// at: (u, v) snapped onto the surface's edge and creases, Su and Sv of the side the curve
/// moves into on a crease (across a C0 knot line they differ between the sides).
#[inline]
fn speed<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    path: &CurveOnSurface<'_, S, C>,
    t: f64,
    hints: &mut Hints,
) -> Result<f64> {
    let (cj, flags, sides) = path.curve_point(t, hints)?;
    let sj = path.surface_jet_at(&cj, flags, sides, DerivOrder::First, hints)?;
    Ok((sj.su * cj.du + sj.sv * cj.dv).norm())
}

/// The point c(t) = S(u(t), v(t)).
#[inline]
fn position<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    path: &CurveOnSurface<'_, S, C>,
    t: f64,
    hints: &mut Hints,
) -> Result<Vec3> {
    let cj = path.curve().checked_jet(t, &mut hints.curve)?;
    Ok(path
        .surface()
        .checked_jet(cj.u, cj.v, DerivOrder::Position, &mut hints.surface)?
        .p)
}

fn gl5<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    path: &CurveOnSurface<'_, S, C>,
    a: f64,
    b: f64,
    hints: &mut Hints,
) -> Result<f64> {
    let (m, h) = (0.5 * (a + b), 0.5 * (b - a));
    let mut s = 0.0;
    for (x, w) in GL5_NODES.iter().zip(&GL5_WEIGHTS) {
        s += w * speed(path, m + h * x, hints)?;
    }
    Ok(s * h)
}

/// What one adaptive quadrature may still spend, and what it has reached (for the message
/// when it runs out).
struct Budget {
    /// Rule applications left.
    left: usize,
    /// Sum of the intervals accepted so far.
    accepted: f64,
}

#[allow(clippy::too_many_arguments)]
fn gl_recursive<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    path: &CurveOnSurface<'_, S, C>,
    a: f64,
    b: f64,
    whole: f64,
    tol: f64,
    floor: f64,
    depth: u32,
    hints: &mut Hints,
    budget: &mut Budget,
) -> Result<f64> {
    if budget.left == 0 {
        return Err(StrakeError::NotConverged {
            what: format!(
                "arc length: the adaptive quadrature spent its budget of {MAX_QUADRATURE_RULES} \
                 rule applications (the speed does not settle: a noisy evaluator?); it stopped \
                 on t in [{}, {}] with {} accepted so far, the tolerance there being {}",
                crate::numfmt::Exact(a),
                crate::numfmt::Exact(b),
                crate::numfmt::Num(budget.accepted),
                crate::numfmt::Num(tol.max(floor))
            ),
            iterations: MAX_QUADRATURE_RULES,
        });
    }
    budget.left -= 1;
    let m = 0.5 * (a + b);
    let left = gl5(path, a, m, hints)?;
    let right = gl5(path, m, b, hints)?;
    let both = left + right;
    if (both - whole).abs() <= tol.max(floor) || depth >= MAX_QUADRATURE_DEPTH || m <= a || m >= b {
        budget.accepted += both;
        return Ok(both);
    }
    let l = gl_recursive(path, a, m, left, 0.5 * tol, floor, depth + 1, hints, budget)?;
    let r = gl_recursive(
        path,
        m,
        b,
        right,
        0.5 * tol,
        floor,
        depth + 1,
        hints,
        budget,
    )?;
    Ok(l + r)
}

/// Signed arc length ∫_{t0}^{t1} |c'(t)| dt (negative when t1 < t0) to the relative tolerance
/// `rel_tol` (see the module docs).
fn integrate<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    path: &CurveOnSurface<'_, S, C>,
    t0: f64,
    t1: f64,
    rel_tol: f64,
    hints: &mut Hints,
) -> Result<f64> {
    if t0 == t1 {
        return Ok(0.0);
    }
    let (a, b, sign) = if t0 < t1 {
        (t0, t1, 1.0)
    } else {
        (t1, t0, -1.0)
    };
    // Split at the curve's breakpoints: across a knot the speed is only C^(p−2) or so, and a
    // kink between an interval's end and its first node fools the halving error estimate
    // (both halves then make the same error). Each piece gets the relative tolerance, so the
    // sum has it too.
    // Likewise where the curve crosses a knot line of the surface (found per piece by
    // `surface_crossings`).
    let breaks = path.curve().breakpoints();
    let first = breaks.partition_point(|&k| k <= a);
    let last = breaks.partition_point(|&k| k < b);
    let split = !(path.surface().u_breaks().is_empty() && path.surface().v_breaks().is_empty());
    let mut total = 0.0;
    let mut lo = a;
    for &k in breaks[first..last].iter().chain(std::iter::once(&b)) {
        let mut start = lo;
        if split {
            let mut crossings = [0.0; MAX_CROSSINGS];
            let n = surface_crossings(path, lo, k, hints, &mut crossings)?;
            for &c in &crossings[..n] {
                total += quadrature(path, start, c, rel_tol, hints)?;
                start = c;
            }
        }
        total += quadrature(path, start, k, rel_tol, hints)?;
        lo = k;
    }
    Ok(sign * total)
}

/// ∫_a^b |c'(t)| dt over one smooth piece, adaptively to the relative tolerance `rel_tol`.
fn quadrature<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    path: &CurveOnSurface<'_, S, C>,
    a: f64,
    b: f64,
    rel_tol: f64,
    hints: &mut Hints,
) -> Result<f64> {
    let whole = gl5(path, a, b, hints)?;
    let tol = rel_tol * whole.abs();
    let floor = 16.0 * f64::EPSILON * whole.abs();
    let mut budget = Budget {
        left: MAX_QUADRATURE_RULES,
        accepted: 0.0,
    };
    gl_recursive(path, a, b, whole, tol, floor, 0, hints, &mut budget)
}

/// Steps of the scan for knot-line crossings in one piece of the curve.
const CROSSING_SCAN_STEPS: usize = 8;

/// Most knot-line crossings split at in one piece of the curve (further ones are not split at;
/// the adaptive rule still integrates across them, less accurately).
const MAX_CROSSINGS: usize = 16;

/// The parameters t in (a, b), ascending, where u(t) or v(t) crosses one of the surface's
/// knot lines ([`SurfaceSource::u_breaks`], [`SurfaceSource::v_breaks`]), written to `out`;
/// returns how many. The piece is scanned at [`CROSSING_SCAN_STEPS`] even steps, and a sign
/// change of u(t) − k (or v(t) − k) within a step is located by bisection to a few units in
/// the last place of t. A line touched without being crossed, or crossed twice within one
/// step, is not found (the quadrature then integrates across it as before, less accurately).
fn surface_crossings<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    path: &CurveOnSurface<'_, S, C>,
    a: f64,
    b: f64,
    hints: &mut Hints,
    out: &mut [f64; MAX_CROSSINGS],
) -> Result<usize> {
    let curve = path.curve();
    let (ub, vb) = (path.surface().u_breaks(), path.surface().v_breaks());
    let mut n = 0;
    let at = |t: f64, hints: &mut Hints| -> Result<(f64, f64)> {
        let j = curve.checked_jet(t, &mut hints.curve)?;
        Ok((j.u, j.v))
    };
    let mut t0 = a;
    let mut p0 = at(a, hints)?;
    for i in 1..=CROSSING_SCAN_STEPS {
        let t1 = if i == CROSSING_SCAN_STEPS {
            b
        } else {
            a + (b - a) * (i as f64 / CROSSING_SCAN_STEPS as f64)
        };
        let p1 = at(t1, hints)?;
        for (breaks, x0, x1, pick) in [(ub, p0.0, p1.0, 0), (vb, p0.1, p1.1, 1)] {
            let (lo, hi) = (x0.min(x1), x0.max(x1));
            let first = breaks.partition_point(|&k| k <= lo);
            for &k in breaks[first..].iter().take_while(|&&k| k <= hi) {
                if n == MAX_CROSSINGS {
                    break;
                }
                if x1 == k {
                    // The scan point itself lies on the line (x0 == k was the previous step's).
                    if t1 < b {
                        out[n] = t1;
                        n += 1;
                    }
                    continue;
                }
                if x0 == k {
                    continue;
                }
                // x(t0) and x(t1) lie on either side of k: bisect x(t) − k.
                let (mut l, mut r, left_below) = (t0, t1, x0 < k);
                for _ in 0..64 {
                    let m = 0.5 * (l + r);
                    if m <= l || m >= r {
                        break;
                    }
                    let pm = at(m, hints)?;
                    let xm = if pick == 0 { pm.0 } else { pm.1 };
                    if (xm < k) == left_below {
                        l = m;
                    } else {
                        r = m;
                    }
                }
                let t = 0.5 * (l + r);
                if t > a && t < b {
                    out[n] = t;
                    n += 1;
                }
            }
        }
        t0 = t1;
        p0 = p1;
    }
    out[..n].sort_by(f64::total_cmp);
    Ok(n)
}

/// The arc length of the curve on the surface between parameters `t0` and `t1` (signed:
/// negative when t1 < t0), in the host's length unit, to the relative tolerance `rel_tol`
/// (e.g. [`DEFAULT_ARC_TOLERANCE`]).
///
/// Errors: `InvalidArgument` for a bad tolerance; every evaluation error of the path
/// (`OutOfDomain` for t outside the curve's domain, …).
pub fn arc_length<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    path: &CurveOnSurface<'_, S, C>,
    t0: f64,
    t1: f64,
    rel_tol: f64,
) -> Result<f64> {
    check_arc_tolerance(rel_tol)?;
    let dom = path.curve().domain();
    dom.check("t", t0)?;
    dom.check("t", t1)?;
    integrate(path, t0, t1, rel_tol, &mut Hints::default())
}

fn sample_at<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    path: &CurveOnSurface<'_, S, C>,
    index: usize,
    t: f64,
    arc_length: f64,
    hints: &mut Hints,
) -> std::result::Result<PathSample, SampleError> {
    let frame = path
        .frame(t, hints)
        .map_err(|error| SampleError { index, t, error })?;
    Ok(PathSample {
        t,
        arc_length,
        frame,
    })
}

fn whole_error(error: StrakeError) -> SampleError {
    SampleError {
        index: 0,
        t: f64::NAN,
        error,
    }
}

/// `n` samples at evenly spaced curve parameters from the start to the end of the curve's
/// domain (both included; `n = 1` gives the start), each with its cumulative arc length
/// (quadrature between consecutive samples to the relative tolerance `arc_tolerance`).
///
/// Returns `n`, the count the result needs. When `sink` holds fewer than `n` samples
/// ([`SampleSink::capacity`]), nothing is computed or written and `n` is returned.
///
/// Errors: `InvalidArgument` (index 0) for `n = 0` or a bad tolerance; the first sample whose
/// frame or arc length fails, with its index and t.
pub fn sample_even_t<S, C, K>(
    path: &CurveOnSurface<'_, S, C>,
    n: usize,
    arc_tolerance: f64,
    sink: &mut K,
) -> std::result::Result<usize, SampleError>
where
    S: SurfaceSource + ?Sized,
    C: UvCurve + ?Sized,
    K: SampleSink + ?Sized,
{
    if !fixed_count_fits(n, arc_tolerance, sink)? {
        return Ok(n);
    }
    let dom = path.curve().domain();
    let mut hints = Hints::default();
    let mut qh = Hints::default();
    let (mut s, mut prev) = (0.0, dom.lo);
    for index in 0..n {
        let t = dom.even(index, n);
        if index > 0 {
            s += integrate(path, prev, t, arc_tolerance, &mut qh).map_err(|error| SampleError {
                index,
                t,
                error,
            })?;
        }
        let smp = sample_at(path, index, t, s, &mut hints)?;
        sink.put(index, &smp);
        prev = t;
    }
    Ok(n)
}

/// The common start of the rules with a count known beforehand: `n` and the tolerance
/// checked (`InvalidArgument`, index 0); `false` when `sink` holds fewer than `n` samples
/// (nothing is then computed or written).
fn fixed_count_fits<K: SampleSink + ?Sized>(
    n: usize,
    arc_tolerance: f64,
    sink: &K,
) -> std::result::Result<bool, SampleError> {
    if n == 0 {
        return Err(whole_error(StrakeError::InvalidArgument(
            "a sample count of 0 was asked for; at least 1 is needed".into(),
        )));
    }
    check_arc_tolerance(arc_tolerance).map_err(whole_error)?;
    Ok(sink.capacity().is_none_or(|c| c >= n))
}

/// Solves s(t) − s(t_from) = `ds` for t in [t_from, t_hi] by safeguarded Newton's method (see
/// the module docs); `ds_hi` ≥ `ds` is the length of [t_from, t_hi]. Returns (t, the length
/// from t_from to t).
#[allow(clippy::too_many_arguments)]
fn invert_arc_length<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    path: &CurveOnSurface<'_, S, C>,
    t_from: f64,
    t_hi: f64,
    ds: f64,
    ds_hi: f64,
    abs_tol: f64,
    rel_tol: f64,
    hints: &mut Hints,
) -> Result<(f64, f64)> {
    let (mut lo, mut hi) = (t_from, t_hi);
    let (mut f_lo, mut f_hi) = (-ds, ds_hi - ds);
    if f_hi <= abs_tol {
        return Ok((t_hi, ds_hi));
    }
    let (mut t, mut f) = (t_from, -ds);
    for _ in 0..200 {
        let sp = speed(path, t, hints)?;
        let mut tn = if sp > 0.0 { t - f / sp } else { f64::NAN };
        if !(tn > lo && tn < hi) {
            // Bisection; the secant of the bracket is a better midpoint when f is nearly
            // linear, so use it while it stays inside the middle half.
            let sec = lo - f_lo * (hi - lo) / (f_hi - f_lo);
            let quarter = 0.25 * (hi - lo);
            tn = if sec > lo + quarter && sec < hi - quarter {
                sec
            } else {
                0.5 * (lo + hi)
            };
        }
        let fnew = f + integrate(path, t, tn, rel_tol, hints)?;
        t = tn;
        f = fnew;
        if f.abs() <= abs_tol {
            return Ok((t, ds + f));
        }
        if f < 0.0 {
            lo = t;
            f_lo = f;
        } else {
            hi = t;
            f_hi = f;
        }
        if hi - lo <= 4.0 * f64::EPSILON * t.abs().max(hi - lo) {
            return Ok((t, ds + f));
        }
    }
    Err(StrakeError::NotConverged {
        what: format!(
            "inverting arc length: s({t}) misses its target by {f} (tolerance {abs_tol})",
            f = crate::numfmt::Num(f),
            abs_tol = crate::numfmt::Num(abs_tol),
            t = crate::numfmt::Exact(t)
        ),
        iterations: 200,
    })
}

/// `n` samples evenly spaced in arc length from the start to the end of the curve (both
/// included; `n = 1` gives the start): sample i is at arc length i L/(n − 1), L the curve's
/// length, to the relative tolerance `arc_tolerance` of L (quadrature and inversion as in the
/// module docs).
///
/// Returns `n`; when `sink` holds fewer than `n` samples, nothing is computed or written.
///
/// Errors: as [`sample_even_t`]; `NotConverged` if the inversion fails (it does not on a
/// curve whose speed is positive), with the sample's index.
pub fn sample_even_arc<S, C, K>(
    path: &CurveOnSurface<'_, S, C>,
    n: usize,
    arc_tolerance: f64,
    sink: &mut K,
) -> std::result::Result<usize, SampleError>
where
    S: SurfaceSource + ?Sized,
    C: UvCurve + ?Sized,
    K: SampleSink + ?Sized,
{
    if !fixed_count_fits(n, arc_tolerance, sink)? {
        return Ok(n);
    }
    let dom = path.curve().domain();
    let mut hints = Hints::default();
    let mut qh = Hints::default();
    let total =
        integrate(path, dom.lo, dom.hi, arc_tolerance, &mut qh).map_err(|error| SampleError {
            index: 0,
            t: dom.lo,
            error,
        })?;
    let first = sample_at(path, 0, dom.lo, 0.0, &mut hints)?;
    sink.put(0, &first);
    let abs_tol = arc_tolerance * total;
    let (mut t, mut s) = (dom.lo, 0.0);
    for index in 1..n {
        let (tn, sn) = if index + 1 == n {
            (dom.hi, total)
        } else {
            let target = total * (index as f64 / (n - 1) as f64);
            let (tn, ds) = invert_arc_length(
                path,
                t,
                dom.hi,
                target - s,
                total - s,
                abs_tol,
                arc_tolerance,
                &mut qh,
            )
            .map_err(|error| SampleError { index, t, error })?;
            (tn, s + ds)
        };
        let smp = sample_at(path, index, tn, sn, &mut hints)?;
        sink.put(index, &smp);
        t = tn;
        s = sn;
    }
    Ok(n)
}

/// Options of chord-tolerance sampling.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ChordalOptions {
    /// δ: the largest distance between the curve and the chord joining consecutive samples
    /// (host length unit); positive and finite.
    pub chord_tolerance: f64,
    /// The largest arc length between consecutive samples (host length unit); positive, may be
    /// `f64::INFINITY` for no limit.
    pub max_step: f64,
    /// Relative tolerance of the arc lengths (default [`DEFAULT_ARC_TOLERANCE`]).
    pub arc_tolerance: f64,
    /// Most samples to produce before giving up with an error (default 10 000 000).
    pub max_samples: usize,
}

impl ChordalOptions {
    /// Options with chord tolerance `chord_tolerance`, maximum step `max_step` and the default
    /// arc tolerance and sample cap.
    pub fn new(chord_tolerance: f64, max_step: f64) -> Self {
        ChordalOptions {
            chord_tolerance,
            max_step,
            arc_tolerance: DEFAULT_ARC_TOLERANCE,
            max_samples: 10_000_000,
        }
    }

    /// Fails with `InvalidArgument` naming the field unless every option is in range.
    pub fn check(&self) -> Result<()> {
        if !(self.chord_tolerance.is_finite() && self.chord_tolerance > 0.0) {
            return Err(StrakeError::InvalidArgument(format!(
                "chord tolerance = {}: it must be positive and finite",
                crate::numfmt::Exact(self.chord_tolerance)
            )));
        }
        if self.max_step.is_nan() || self.max_step <= 0.0 {
            return Err(StrakeError::InvalidArgument(format!(
                "max step = {}: it must be positive (or infinite for no limit)",
                crate::numfmt::Exact(self.max_step)
            )));
        }
        if self.max_samples < 2 {
            return Err(StrakeError::InvalidArgument(format!(
                "max samples = {}: at least 2 are needed",
                self.max_samples
            )));
        }
        check_arc_tolerance(self.arc_tolerance)
    }
}

/// The longest chord whose deviation from a circle of radius 1/κ is δ: 2√(2ρδ − δ²) for ρ > δ,
/// 2ρ for ρ ≤ δ (the diameter: a half circle then lies within δ of its chord), infinite for
/// κ = 0 (shared/REFERENCES.md, chord error of linear interpolation).
pub fn chord_length_for(kappa: f64, delta: f64) -> f64 {
    if kappa <= 0.0 {
        return f64::INFINITY;
    }
    let rho = 1.0 / kappa;
    if rho <= delta {
        2.0 * rho
    } else {
        2.0 * (delta * (2.0 * rho - delta)).sqrt()
    }
}

/// Distance from `x` to the segment [a, b].
#[inline]
fn distance_to_segment(x: &Vec3, a: &Vec3, b: &Vec3) -> f64 {
    let ab = b - a;
    let len2 = ab.norm_squared();
    let ax = x - a;
    if len2 == 0.0 {
        return ax.norm();
    }
    let s = (ax.dot(&ab) / len2).clamp(0.0, 1.0);
    (ax - ab * s).norm()
}

/// Peak of a deviation profile that vanishes at both ends, from its values at τ = ¼, ½, ¾: the
/// vertex of the parabola through the three when it is concave and lies between ¼ and ¾,
/// never below the largest value measured.
#[inline]
fn peak_deviation(e1: f64, e2: f64, e3: f64) -> f64 {
    let measured = e1.max(e2).max(e3);
    let b = 2.0 * (e3 - e1); // slope at ½, per unit τ
    let c = 16.0 * (e3 - 2.0 * e2 + e1); // second derivative
    if c < 0.0 {
        let x = (-b / c).clamp(-0.25, 0.25);
        let v = e2 + b * x + 0.5 * c * x * x;
        return v.max(measured);
    }
    measured
}

/// How many units of round-off of the curve's coordinates a chord tolerance or a maximum step
/// must at least be: below `RESOLUTION_ULPS · ε · R` (R the largest coordinate magnitude of
/// the curve's start, middle and end points) a deviation or a step cannot be measured at all.
pub const RESOLUTION_ULPS: f64 = 64.0;

/// Refuses at once, naming the option, what chord-tolerance sampling could only refuse after
/// placing millions of samples: a chord tolerance or a maximum step below the resolution of
/// the curve's coordinates ([`RESOLUTION_ULPS`]), and a maximum step that would need more
/// than `max_samples` samples over the curve's length.
fn check_reachable<S: SurfaceSource + ?Sized, C: UvCurve + ?Sized>(
    path: &CurveOnSurface<'_, S, C>,
    opts: &ChordalOptions,
    hints: &mut Hints,
) -> std::result::Result<(), SampleError> {
    use crate::numfmt::Num;
    let dom = path.curve().domain();
    let mut size: f64 = 0.0;
    for t in [dom.lo, 0.5 * (dom.lo + dom.hi), dom.hi] {
        let p = position(path, t, hints).map_err(|error| SampleError { index: 0, t, error })?;
        size = size.max(p.amax());
    }
    let resolution = RESOLUTION_ULPS * f64::EPSILON * size;
    for (name, x) in [
        ("chord tolerance", opts.chord_tolerance),
        ("max step", opts.max_step),
    ] {
        if x < resolution {
            return Err(whole_error(StrakeError::InvalidArgument(format!(
                "{name} = {}: below what the curve's coordinates (up to {}) resolve in f64, \
                 {RESOLUTION_ULPS} ulps = {}; it cannot be met",
                Num(x),
                Num(size),
                Num(resolution)
            ))));
        }
    }
    if opts.max_step.is_finite() {
        let length =
            integrate(path, dom.lo, dom.hi, opts.arc_tolerance, hints).map_err(|error| {
                SampleError {
                    index: 0,
                    t: dom.lo,
                    error,
                }
            })?;
        let needed = (length / opts.max_step).ceil() + 1.0;
        if needed > opts.max_samples as f64 {
            return Err(whole_error(StrakeError::InvalidArgument(format!(
                "max step = {}: the curve's length {} needs at least {} samples, above max \
                 samples = {}",
                Num(opts.max_step),
                Num(length),
                Num(needed),
                opts.max_samples
            ))));
        }
    }
    Ok(())
}

/// Samples adaptively so that the chord between consecutive samples stays within
/// `opts.chord_tolerance` of the curve and their arc-length spacing within `opts.max_step`
/// (see the module docs for the step rule and its verification). The first sample is at the
/// start of the curve's domain, the last at its end.
///
/// Writes the samples into `sink` and returns their total count; a slice sink receives the
/// first `len` of them, and a caller whose slice was shorter than the count can call again
/// with a slice of that size (the result is deterministic).
///
/// Errors: `InvalidArgument` for bad options (index 0), a chord tolerance or maximum step
/// below the resolution of the curve's coordinates or a maximum step that would need more than
/// `max_samples` samples (index 0, refused before any sample is placed), or when the step needed falls below
/// 1e-13 of the curve's parameter range (a tolerance below round-off), or the count would
/// exceed `opts.max_samples`, with the index of the sample that could not be placed; every
/// evaluation error, with its sample's index and t.
pub fn sample_chordal<S, C, K>(
    path: &CurveOnSurface<'_, S, C>,
    opts: &ChordalOptions,
    sink: &mut K,
) -> std::result::Result<usize, SampleError>
where
    S: SurfaceSource + ?Sized,
    C: UvCurve + ?Sized,
    K: SampleSink + ?Sized,
{
    sample_chordal_on(path, opts, &ContactPath, sink)
}

/// The space curve whose chords chord-tolerance sampling judges, given by its points along the
/// contact path: the contact path itself ([`ContactPath`]) or a path the tool runs beside it
/// (the tool-centre path, `crate::toolpath::sample_chordal_centre`). The samples are always
/// those of the contact path (t, arc length, frame).
pub(crate) trait ChordTarget {
    /// The judged point at a sample already evaluated.
    fn sample_point<S, C>(
        &self,
        path: &CurveOnSurface<'_, S, C>,
        sample: &PathSample,
        hints: &mut Hints,
    ) -> Result<Vec3>
    where
        S: SurfaceSource + ?Sized,
        C: UvCurve + ?Sized;
    /// The judged point at curve parameter `t`.
    fn point<S, C>(
        &self,
        path: &CurveOnSurface<'_, S, C>,
        t: f64,
        hints: &mut Hints,
    ) -> Result<Vec3>
    where
        S: SurfaceSource + ?Sized,
        C: UvCurve + ?Sized;
    /// At a sample: the judged curve's curvature and its speed along t (d s_judged / dt), from
    /// which the next step is proposed.
    fn bend<S, C>(
        &self,
        path: &CurveOnSurface<'_, S, C>,
        sample: &PathSample,
        hints: &mut Hints,
    ) -> Result<(f64, f64)>
    where
        S: SurfaceSource + ?Sized,
        C: UvCurve + ?Sized;
}

/// Chords judged on the contact path: its points and space curvature κ = √(κn² + κg²).
pub(crate) struct ContactPath;

impl ChordTarget for ContactPath {
    #[inline]
    fn sample_point<S, C>(
        &self,
        _: &CurveOnSurface<'_, S, C>,
        sample: &PathSample,
        _: &mut Hints,
    ) -> Result<Vec3>
    where
        S: SurfaceSource + ?Sized,
        C: UvCurve + ?Sized,
    {
        Ok(sample.frame.point)
    }
    #[inline]
    fn point<S, C>(
        &self,
        path: &CurveOnSurface<'_, S, C>,
        t: f64,
        hints: &mut Hints,
    ) -> Result<Vec3>
    where
        S: SurfaceSource + ?Sized,
        C: UvCurve + ?Sized,
    {
        position(path, t, hints)
    }
    #[inline]
    fn bend<S, C>(
        &self,
        _: &CurveOnSurface<'_, S, C>,
        sample: &PathSample,
        _: &mut Hints,
    ) -> Result<(f64, f64)>
    where
        S: SurfaceSource + ?Sized,
        C: UvCurve + ?Sized,
    {
        Ok((space_curvature(&sample.frame), sample.frame.speed))
    }
}

/// [`sample_chordal`] with the chord error judged on `target` (the step rule and its
/// verification of the module docs, on the judged curve's points and curvature); the maximum
/// step stays one of contact-path arc length.
pub(crate) fn sample_chordal_on<S, C, K, J>(
    path: &CurveOnSurface<'_, S, C>,
    opts: &ChordalOptions,
    target: &J,
    sink: &mut K,
) -> std::result::Result<usize, SampleError>
where
    S: SurfaceSource + ?Sized,
    C: UvCurve + ?Sized,
    K: SampleSink + ?Sized,
    J: ChordTarget + ?Sized,
{
    opts.check().map_err(whole_error)?;
    let delta = opts.chord_tolerance;
    let dom = path.curve().domain();
    let min_dt = 1e-13 * dom.width();
    let mut hints = Hints::default();
    let mut qh = Hints::default();
    check_reachable(path, opts, &mut qh)?;
    let mut cur = sample_at(path, 0, dom.lo, 0.0, &mut hints)?;
    let (mut kappa, mut speed) =
        target
            .bend(path, &cur, &mut hints)
            .map_err(|error| SampleError {
                index: 0,
                t: dom.lo,
                error,
            })?;
    let mut a = target
        .sample_point(path, &cur, &mut hints)
        .map_err(|error| SampleError {
            index: 0,
            t: dom.lo,
            error,
        })?;
    sink.put(0, &cur);
    let mut count = 1;
    let mut kappa_prev = kappa;
    while cur.t < dom.hi {
        let index = count;
        let err = |t: f64, error| SampleError { index, t, error };
        if count >= opts.max_samples {
            return Err(err(
                cur.t,
                StrakeError::InvalidArgument(format!(
                    "more than max samples = {} would be needed",
                    opts.max_samples
                )),
            ));
        }
        // Curvature extrapolated to the middle of the next step, never below half the
        // present one.
        let kappa_mid = (kappa + 0.5 * (kappa - kappa_prev)).max(0.5 * kappa);
        let len = chord_length_for(kappa_mid, STEP_AIM * delta).min(opts.max_step);
        let remaining = dom.hi - cur.t;
        let mut dt = if len.is_finite() {
            (len / speed).min(remaining)
        } else {
            remaining
        };
        let next = loop {
            let t1 = if dt >= remaining { dom.hi } else { cur.t + dt };
            let ds =
                integrate(path, cur.t, t1, opts.arc_tolerance, &mut qh).map_err(|e| err(t1, e))?;
            let smp = sample_at(path, index, t1, cur.arc_length + ds, &mut hints)?;
            let b = target
                .sample_point(path, &smp, &mut hints)
                .map_err(|e| err(t1, e))?;
            let mut e = [0.0; 3];
            for (k, ek) in e.iter_mut().enumerate() {
                let tk = cur.t + (t1 - cur.t) * (k as f64 + 1.0) * 0.25;
                let x = target
                    .point(path, tk, &mut hints)
                    .map_err(|er| err(tk, er))?;
                *ek = distance_to_segment(&x, &a, &b);
            }
            let peak = peak_deviation(e[0], e[1], e[2]);
            let mut factor: f64 = 1.0;
            if peak > delta {
                factor = factor.min((STEP_AIM * delta / peak).sqrt());
            }
            if ds > opts.max_step {
                factor = factor.min(0.98 * opts.max_step / ds);
            }
            if factor >= 1.0 {
                break (smp, b);
            }
            dt = (t1 - cur.t) * factor.clamp(0.1, 0.95);
            if dt < min_dt {
                return Err(err(
                    cur.t,
                    StrakeError::InvalidArgument(format!(
                        "the chord tolerance {delta} cannot be met: the step fell below \
                         {min_dt} in t (deviation {peak} remains)",
                        delta = crate::numfmt::Num(delta),
                        min_dt = crate::numfmt::Num(min_dt),
                        peak = crate::numfmt::Num(peak)
                    )),
                ));
            }
        };
        let (next, b) = next;
        kappa_prev = kappa;
        // Also at the last sample: a judge may refuse a sample (a folding centre path).
        (kappa, speed) = target
            .bend(path, &next, &mut hints)
            .map_err(|e| err(next.t, e))?;
        a = b;
        sink.put(index, &next);
        count += 1;
        cur = next;
    }
    Ok(count)
}

#[cfg(test)]
mod tests {
    use super::*;

    // The nodes and weights against their closed forms (A&S 25.4, n = 5 [memory]).
    #[test]
    fn gauss_legendre_constants_match_their_closed_forms() {
        let r = (10.0_f64 / 7.0).sqrt();
        let x1 = (5.0 - 2.0 * r).sqrt() / 3.0;
        let x2 = (5.0 + 2.0 * r).sqrt() / 3.0;
        let s70 = 70.0_f64.sqrt();
        let w1 = (322.0 + 13.0 * s70) / 900.0;
        let w2 = (322.0 - 13.0 * s70) / 900.0;
        let expect_x = [-x2, -x1, 0.0, x1, x2];
        let expect_w = [w2, w1, 128.0 / 225.0, w1, w2];
        for k in 0..5 {
            assert!((GL5_NODES[k] - expect_x[k]).abs() < 2e-16, "node {k}");
            assert!((GL5_WEIGHTS[k] - expect_w[k]).abs() < 2e-16, "weight {k}");
        }
        // The nodes are the roots of P5(x) = (63x⁵ − 70x³ + 15x)/8.
        for x in GL5_NODES {
            let p5 = (63.0 * x.powi(5) - 70.0 * x.powi(3) + 15.0 * x) / 8.0;
            assert!(p5.abs() < 1e-15, "P5({x}) = {p5:e}");
        }
    }

    // An n-point Gauss–Legendre rule integrates polynomials of degree ≤ 2n − 1 exactly
    // (A&S 25.4.29 [memory]): ∫_{−1}^{1} x^k dx = 2/(k + 1) for even k, 0 for odd k; and not
    // x^10.
    #[test]
    fn gauss_legendre_is_exact_to_degree_nine() {
        for k in 0..=10 {
            let q: f64 = GL5_NODES
                .iter()
                .zip(&GL5_WEIGHTS)
                .map(|(x, w)| w * x.powi(k))
                .sum();
            let exact = if k % 2 == 0 {
                2.0 / (k as f64 + 1.0)
            } else {
                0.0
            };
            if k <= 9 {
                assert!((q - exact).abs() < 1e-15, "x^{k}: {q} vs {exact}");
            } else {
                assert!((q - exact).abs() > 1e-4, "x^10 should not be exact");
            }
        }
    }

    // Chord error (shared/REFERENCES.md): a chord of length L on radius ρ deviates by
    // ρ − √(ρ² − L²/4); the allowed length inverts it.
    #[test]
    fn chord_length_inverts_the_chord_error() {
        for (rho, delta) in [(1.0, 1e-3), (10.0, 0.5), (0.2, 1e-6), (2.0, 1.5)] {
            let l = chord_length_for(1.0 / rho, delta);
            let dev = rho - (rho * rho - l * l / 4.0).sqrt();
            assert!(
                (dev - delta).abs() < 1e-12 * rho.max(1.0),
                "ρ {rho}, δ {delta}: {dev}"
            );
        }
        assert_eq!(chord_length_for(1.0 / 0.5, 1.0), 1.0);
        assert!(chord_length_for(0.0, 1e-3).is_infinite());
    }

    // The parabola through (¼, e1), (½, e2), (¾, e3) recovers the vertex of a parabola.
    #[test]
    fn peak_of_a_parabola() {
        let f = |x: f64| 1.0 - 20.0 * (x - 0.4) * (x - 0.4);
        let p = peak_deviation(f(0.25), f(0.5), f(0.75));
        assert!((p - 1.0).abs() < 1e-14, "{p}");
        // Clamped to the measured interval when the vertex lies outside.
        assert_eq!(peak_deviation(3.0, 2.0, 1.0), 3.0);
    }
}
