//! Knot vectors: validation and span search (The NURBS Book, 2nd ed., A2.1 FindSpan, p. 68),
//! with a hint so that marching along a path does not search from scratch.

use crate::error::{Result, StrakeError};
use crate::geometry::jet::Interval;

/// Highest degree strake accepts. Basis functions live in fixed-size stack arrays of
/// `MAX_DEGREE + 1` entries so that evaluation never allocates.
pub const MAX_DEGREE: usize = 24;

/// A remembered knot span, to start the next span search from. A wrong or stale hint costs a
/// search, never a wrong answer. `SpanHint::default()` holds no hint.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub struct SpanHint(pub Option<usize>);

/// A validated knot vector U = {u₀, …, u_m} for degree p and n + 1 control points
/// (m = n + p + 1). Its domain is [u_p, u_{n+1}].
#[derive(Debug, Clone, PartialEq)]
pub struct KnotVector {
    knots: Vec<f64>,
    degree: usize,
    /// Number of control points n + 1.
    count: usize,
    /// The distinct knot values strictly inside the domain, ascending.
    breaks: Vec<f64>,
    /// The interior knots of multiplicity m ≥ p − 1 (a B-spline is at most C1 across them),
    /// ascending, with their continuity p − m.
    creases: Vec<KnotLine>,
    /// Every interior knot, ascending, with its continuity p − m.
    lines: Vec<KnotLine>,
}

/// An interior knot of multiplicity m for degree p, across which a B-spline of its knot vector
/// is only C^(p − m) (The NURBS Book, 2nd ed., ch. 2, the continuity of the basis functions at
/// a knot). A crease ([`KnotVector::creases`]) has m ≥ p − 1: the second derivatives, hence
/// the curvatures of a surface, may jump across it; with `continuity` ≤ 0 the first
/// derivatives, hence its normal, may jump too. Across any knot line the derivatives of order
/// above `continuity` may jump ([`KnotVector::knot_lines`]).
///
/// The continuity is that of the parametrisation: a rational conic with double knots (the
/// nine-point circle) is geometrically smooth across a line that is only C0 in its parameter.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct KnotLine {
    /// The knot value.
    pub at: f64,
    /// p − m: 1 (C1: curvatures may jump), 0 (C0: the normal may jump too), −1 (m = p + 1:
    /// the spline itself may be discontinuous there).
    pub continuity: i32,
}

impl KnotVector {
    /// Validates a knot vector for `degree` and `count` control points.
    ///
    /// `name` (e.g. `"u knots"`) prefixes the messages. Errors: `InvalidDegree` for a degree of 0
    /// or above [`MAX_DEGREE`], too few control points or a knot count other than
    /// count + degree + 1; `InvalidKnots` for a non-finite or decreasing knot (naming its index
    /// and value), a knot of multiplicity above degree + 1, a zero-length domain, or a domain whose
    /// width overflows.
    pub fn new(name: &str, knots: &[f64], degree: usize, count: usize) -> Result<Self> {
        if degree == 0 || degree > MAX_DEGREE {
            return Err(StrakeError::InvalidDegree(format!(
                "{name}: degree {degree} is outside 1..={MAX_DEGREE}"
            )));
        }
        if count < degree + 1 {
            return Err(StrakeError::InvalidDegree(format!(
                "{name}: degree {degree} needs at least {} control points, got {count}",
                degree + 1
            )));
        }
        // Checked: a count from the C ABI may be anything up to usize::MAX.
        if count.checked_add(degree + 1) != Some(knots.len()) {
            return Err(StrakeError::InvalidDegree(format!(
                "{name}: degree {degree} with {count} control points needs count + degree + 1 = {} knots, got {}",
                count as u128 + degree as u128 + 1,
                knots.len()
            )));
        }
        for (i, &k) in knots.iter().enumerate() {
            if !k.is_finite() {
                return Err(StrakeError::InvalidKnots(format!(
                    "{name}: knot[{i}] = {k} is not finite",
                    k = crate::numfmt::Exact(k)
                )));
            }
            if i > 0 && k < knots[i - 1] {
                return Err(StrakeError::InvalidKnots(format!(
                    "{name}: knot[{i}] = {k} is below knot[{}] = {}; knots must be non-decreasing",
                    i - 1,
                    crate::numfmt::Exact(knots[i - 1]),
                    k = crate::numfmt::Exact(k)
                )));
            }
        }
        let mut run_start = 0;
        for i in 1..=knots.len() {
            if i == knots.len() || knots[i] != knots[run_start] {
                let mult = i - run_start;
                if mult > degree + 1 {
                    return Err(StrakeError::InvalidKnots(format!(
                        "{name}: knot value {} at index {run_start} has multiplicity {mult}, \
                         above degree + 1 = {}",
                        crate::numfmt::Exact(knots[run_start]),
                        degree + 1
                    )));
                }
                run_start = i;
            }
        }
        let (lo, hi) = (knots[degree], knots[count]);
        if lo >= hi {
            return Err(StrakeError::InvalidKnots(format!(
                "{name}: the parameter domain [knot[{degree}], knot[{count}]] = [{}, {}] has zero length",
                crate::numfmt::Exact(lo),
                crate::numfmt::Exact(hi)
            )));
        }
        if !(hi - lo).is_finite() {
            return Err(StrakeError::InvalidKnots(format!(
                "{name}: the parameter domain [knot[{degree}], knot[{count}]] = [{}, {}] is too wide: its width overflows",
                crate::numfmt::Exact(lo),
                crate::numfmt::Exact(hi)
            )));
        }
        let mut breaks: Vec<f64> = knots[degree + 1..count]
            .iter()
            .copied()
            .filter(|&k| k > lo && k < hi)
            .collect();
        breaks.dedup();
        let lines: Vec<KnotLine> = breaks
            .iter()
            .map(|&at| {
                let m = knots.iter().filter(|&&k| k == at).count();
                KnotLine {
                    at,
                    continuity: degree as i32 - m as i32,
                }
            })
            .collect();
        let creases = lines
            .iter()
            .filter(|l| l.continuity <= 1)
            .copied()
            .collect();
        Ok(KnotVector {
            knots: knots.to_vec(),
            degree,
            count,
            breaks,
            creases,
            lines,
        })
    }

    /// The knots.
    #[inline]
    pub fn knots(&self) -> &[f64] {
        &self.knots
    }

    /// The distinct knot values strictly inside the domain, ascending: where a B-spline of this
    /// knot vector may lose smoothness (C^{p−m} at a knot of multiplicity m).
    #[inline]
    pub fn interior_breaks(&self) -> &[f64] {
        &self.breaks
    }

    /// The interior knots across which a B-spline of this knot vector is not C2 (multiplicity
    /// m ≥ p − 1; see [`KnotLine`]), ascending. For degrees 1 and 2 every interior knot.
    #[inline]
    pub fn creases(&self) -> &[KnotLine] {
        &self.creases
    }

    /// Every interior knot with its continuity p − m, ascending: the lines across which a
    /// derivative of order above the continuity may jump (the third derivatives across a
    /// simple knot of a cubic, which is C2 there).
    #[inline]
    pub fn knot_lines(&self) -> &[KnotLine] {
        &self.lines
    }

    /// The knot span below the knot `u` = u_i (i ≥ p + 1, u_i inside the domain): the span index
    /// j with u_j < u_j+1 = u, whose polynomial evaluated at u gives the limit from below (the
    /// left-continuous basis). `span` is the span [`Self::find_span`] returned for u (the last
    /// index with u_span ≤ u). When u is not a knot of `span` (u > u_span) or there is no span
    /// below inside the domain, `span` itself.
    #[inline]
    pub fn span_below(&self, u: f64, span: usize) -> usize {
        let k = &self.knots;
        if span > self.degree && k[span] == u {
            let mut j = span;
            while j > self.degree && k[j] == u {
                j -= 1;
            }
            // k[j] < u = k[j + 1] unless j reached the first span (u = the domain's start).
            if k[j] < u { j } else { span }
        } else {
            span
        }
    }

    /// The degree p.
    #[inline]
    pub fn degree(&self) -> usize {
        self.degree
    }

    /// The number of control points n + 1.
    #[inline]
    pub fn count(&self) -> usize {
        self.count
    }

    /// The parameter domain [u_p, u_{n+1}].
    #[inline]
    pub fn domain(&self) -> Interval {
        Interval {
            lo: self.knots[self.degree],
            hi: self.knots[self.count],
        }
    }

    /// The knot span index i with u_i ≤ u < u_{i+1} and u_i < u_{i+1}, p ≤ i ≤ n; at the upper
    /// end of the domain, the last non-empty span. `u` must lie in the domain (callers check).
    /// Tries `hint` and its right neighbour first, then binary search (A2.1), and stores the
    /// span found in `hint`.
    #[inline(always)]
    pub fn find_span(&self, u: f64, hint: &mut SpanHint) -> usize {
        let k = &self.knots;
        let n = self.count - 1;
        if let Some(h) = hint.0 {
            if u < k[n + 1] && h >= self.degree && h <= n && k[h] <= u {
                if u < k[h + 1] {
                    return h;
                }
                if h < n && u < k[h + 2] {
                    // k[h + 1] <= u < k[h + 2]: the next span, non-empty.
                    hint.0 = Some(h + 1);
                    return h + 1;
                }
            }
        }
        self.search_and_remember(u, hint)
    }

    /// The knot spans of a group of `L` parameters `x` (lanes from `len` on, `len` ≥ 1, repeat
    /// the last point's span) and whether they are all the same, with `hint` carried and left
    /// as by [`Self::find_span`] point after point. When every point lies in the hinted span
    /// (u_h ≤ x < u_{h+1}, the hint's first test in `find_span`, which then returns h and keeps
    /// the hint), one test per point and no search.
    #[inline(always)]
    pub(crate) fn group_spans<const L: usize>(
        &self,
        x: &[f64; L],
        len: usize,
        hint: &mut SpanHint,
    ) -> ([usize; L], bool) {
        debug_assert!((1..=L).contains(&len));
        if let Some(h) = hint.0 {
            // h ≤ n, so u_{h+1} ≤ u_{n+1}: x < u_{h+1} covers `find_span`'s test x < u_{n+1}.
            if h >= self.degree && h < self.count {
                let k = &self.knots;
                let (lo, hi) = (k[h], k[h + 1]);
                // Non-short-circuit `&`: one branch; a NaN fails the test and is searched.
                if x.iter().fold(true, |all, &x| all & (lo <= x) & (x < hi)) {
                    return ([h; L], true);
                }
            }
        }
        let mut spans = [0; L];
        for l in 0..L {
            spans[l] = if l < len {
                self.find_span(x[l], hint)
            } else {
                spans[len - 1]
            };
        }
        let same = spans.iter().fold(true, |all, &s| all & (s == spans[0]));
        (spans, same)
    }

    /// The search of [`Self::find_span`] when the hint misses. Left to the optimiser: kept out
    /// of line (`inline(never)`) it cost random-order evaluation 5–10 % (speed report, surface
    /// and curve jets at random parameters, three interleaved runs).
    #[inline]
    fn search_and_remember(&self, u: f64, hint: &mut SpanHint) -> usize {
        let span = self.search(u);
        hint.0 = Some(span);
        span
    }

    fn search(&self, u: f64) -> usize {
        let k = &self.knots;
        let p = self.degree;
        let n = self.count - 1;
        if u >= k[n + 1] {
            // Last non-empty span.
            let mut i = n;
            while k[i] >= k[n + 1] {
                i -= 1;
            }
            return i;
        }
        let (mut lo, mut hi) = (p, n + 1);
        // Invariant: k[lo] <= u < k[hi].
        while hi - lo > 1 {
            let mid = (lo + hi) / 2;
            if u < k[mid] {
                hi = mid;
            } else {
                lo = mid;
            }
        }
        lo
    }
}

/// A knot vector for unit tests: degree `deg`, `n` control points, clamped for odd degrees and
/// unclamped for even ones, random spacing from `crate::geometry::math::lcg`, a double interior knot.
#[cfg(test)]
pub(crate) fn random_test_knots(deg: usize, n: usize, st: &mut u64) -> Vec<f64> {
    let mut k: Vec<f64> = Vec::new();
    let mut x = 0.0;
    for i in 0..n + deg + 1 {
        let clamped = deg % 2 == 1 && (i <= deg || i > n);
        if !(clamped || i == deg + 2) {
            x += 0.05 + crate::geometry::math::lcg(st);
        }
        k.push(x);
    }
    k
}
