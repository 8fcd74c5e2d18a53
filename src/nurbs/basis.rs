//! B-spline basis functions and their first two derivatives.
//!
//! Values by the triangular Cox–de Boor recursion (The NURBS Book, 2nd ed., A2.2 BasisFuns,
//! p. 70). Derivatives by the derivative formula of §2.3 (eq. 2.7):
//! N'_{i,p} = p [N_{i,p−1}/(u_{i+p} − u_i) − N_{i+1,p−1}/(u_{i+p+1} − u_{i+1})], applied once to
//! the degree p − 1 functions and twice (through degree p − 2) for the second derivative. This
//! gives the same numbers as A2.3 DersBasisFuns; it keeps three rows of at most
//! `MAX_DEGREE + 1` entries on the stack instead of a square table. Within a non-empty span
//! every denominator is at least the span's length, so none is zero.

use super::knots::{KnotVector, MAX_DEGREE};

/// Room for the non-zero basis functions of one span.
pub const MAX_ORDER: usize = MAX_DEGREE + 1;

/// The non-zero basis functions N_{span−p+r, p}(u), r = 0..=p, and their derivatives.
/// Row `k` holds the k-th derivative; rows above the requested order are zero.
#[derive(Debug, Clone, Copy)]
pub struct BasisRows {
    /// `d[k][r]` = k-th derivative of N_{span−p+r, p} at u.
    pub d: [[f64; MAX_ORDER]; 3],
}

/// Computes the p + 1 non-zero basis functions of degree `p` on knot span `span` at `u`, and
/// their derivatives up to `order` (0, 1 or 2). `span` must be a non-empty span of `knots`
/// containing u (as returned by [`super::KnotVector::find_span`]), `p ≤ MAX_DEGREE`.
#[inline]
pub fn basis_rows(knots: &[f64], p: usize, span: usize, u: f64, order: usize) -> BasisRows {
    BasisRows {
        d: basis_rows_in::<MAX_ORDER, 0, _>(knots, p, span, u, order, &Direct),
    }
}

/// How a basis evaluation divides by knot differences.
///
/// [`Direct`] divides, exactly as [`basis_rows`] always has; [`Reciprocals`] multiplies by
/// reciprocals computed once per span (see [`span_reciprocals`]), which is faster and agrees to
/// a few units in the last place.
pub(crate) trait KnotDivisor {
    /// x / (u_{span+r+1} − u_{span+r+1−j}) in the Cox–de Boor step j, whose denominator is also
    /// `right_r1 + left_jr` = (u_{span+r+1} − u) + (u − u_{span+r+1−j}).
    fn cox(&self, x: f64, j: usize, r: usize, right_r1: f64, left_jr: f64) -> f64;
    /// x / (u_{span+r+1} − u_{span+r+1−p}) in the derivative formula at degree p.
    fn deriv(&self, x: f64, knots: &[f64], span: usize, p: usize, r: usize) -> f64;
}

/// Plain division (the reference arithmetic of [`basis_rows`]).
pub(crate) struct Direct;

impl KnotDivisor for Direct {
    #[inline(always)]
    fn cox(&self, x: f64, _j: usize, _r: usize, right_r1: f64, left_jr: f64) -> f64 {
        x / (right_r1 + left_jr)
    }
    #[inline(always)]
    fn deriv(&self, x: f64, knots: &[f64], span: usize, p: usize, r: usize) -> f64 {
        x / (knots[span + r + 1] - knots[span + r + 1 - p])
    }
}

/// Multiplication by the reciprocals of one span, laid out as by [`span_reciprocals`].
pub(crate) struct Reciprocals<'a>(pub(crate) &'a [f64]);

impl KnotDivisor for Reciprocals<'_> {
    #[inline(always)]
    fn cox(&self, x: f64, j: usize, r: usize, _right_r1: f64, _left_jr: f64) -> f64 {
        x * self.0[j * (j - 1) / 2 + r]
    }
    #[inline(always)]
    fn deriv(&self, x: f64, _knots: &[f64], _span: usize, p: usize, r: usize) -> f64 {
        x * self.0[p * (p - 1) / 2 + r]
    }
}

/// Number of reciprocals one span of degree p needs: p (p + 1) / 2.
pub(crate) fn reciprocals_per_span(p: usize) -> usize {
    p * (p + 1) / 2
}

/// Appends the reciprocals 1/(u_{span+r+1} − u_{span+r+1−j}) for j = 1..=p, r = 0..j (index
/// j (j − 1)/2 + r) of one span: every knot difference the basis functions and their
/// derivatives divide by on that span. On a non-empty span none of them is zero (each
/// difference spans the span itself); on an empty span they may be infinite and are never used.
pub(crate) fn span_reciprocals(knots: &[f64], p: usize, span: usize, out: &mut Vec<f64>) {
    for j in 1..=p {
        for r in 0..j {
            out.push(1.0 / (knots[span + r + 1] - knots[span + r + 1 - j]));
        }
    }
}

/// The reciprocal tables of every span p ..= n of a knot vector, `reciprocals_per_span(p)` per
/// span in span order (see [`span_reciprocals`]).
pub(crate) fn reciprocal_table(kv: &KnotVector) -> Vec<f64> {
    let p = kv.degree();
    let mut out = Vec::with_capacity((kv.count() - p) * reciprocals_per_span(p));
    for span in p..kv.count() {
        span_reciprocals(kv.knots(), p, span, &mut out);
    }
    out
}

/// As [`basis_rows`], with rows of `N` entries (`p < N ≤ MAX_ORDER`) and the divisions done by
/// `div`. With [`Direct`] it is the same arithmetic as [`basis_rows`], bit for bit. Evaluators
/// of low-degree surfaces use a small `N` so that no time goes into clearing unused entries.
///
/// `P` > 0 states the degree at compile time (then `p` must equal it): every loop has a
/// constant trip count, is unrolled, and the rows stay in registers. `P` = 0 takes the degree
/// `p` at run time. Both give the same bits.
#[inline(always)]
pub(crate) fn basis_rows_in<const N: usize, const P: usize, D: KnotDivisor>(
    knots: &[f64],
    p: usize,
    span: usize,
    u: f64,
    order: usize,
    div: &D,
) -> [[f64; N]; 3] {
    debug_assert!(P == 0 || P == p);
    let p = if P > 0 { P } else { p };
    debug_assert!(p < N);
    let mut out = [[0.0; N]; 3];
    let mut left = [0.0; N];
    let mut right = [0.0; N];
    let mut deg_p1 = [0.0; N]; // degree p − 1 values (entries 0..p)
    let mut deg_p2 = [0.0; N]; // degree p − 2 values (entries 0..p − 1)
    // The 2p knots u_{span+1−p} ..= u_{span+p} the recursion reads: u_{span+1−j} = kw[p − j],
    // u_{span+j} = kw[p − 1 + j]. One slice, so that the loops carry no bounds checks.
    let kw = &knots[span + 1 - p..span + p + 1];
    let row = &mut out[0];
    row[0] = 1.0;
    // Exclusive ranges: a `1..=p` loop is not unrolled as reliably.
    for j in 1..p + 1 {
        // Whole-array copies (entries j.. of the row are still zero here): a copy of the used
        // part only has a variable length and becomes a call to memcpy.
        if j == p {
            deg_p1 = *row;
        }
        if j + 1 == p {
            deg_p2 = *row;
        }
        left[j] = u - kw[p - j];
        right[j] = kw[p - 1 + j] - u;
        let mut saved = 0.0;
        for r in 0..j {
            let temp = div.cox(row[r], j, r, right[r + 1], left[j - r]);
            row[r] = saved + right[r + 1] * temp;
            saved = left[j - r] * temp;
        }
        row[j] = saved;
    }
    if order >= 1 {
        derivative_row(knots, p, span, &deg_p1, &mut out[1], div);
    }
    if order >= 2 && p >= 2 {
        let mut der_p1 = [0.0; N];
        derivative_row(knots, p - 1, span, &deg_p2, &mut der_p1, div);
        derivative_row(knots, p, span, &der_p1, &mut out[2], div);
    }
    out
}

/// Given `lower[q]` = (some derivative of) N_{span−(p−1)+q, p−1}, q = 0..p, writes
/// `out[r]` = p [lower[r−1]/(u_{span+r} − u_{span−p+r}) − lower[r]/(u_{span+r+1} − u_{span−p+r+1})]
/// for r = 0..=p (terms outside 0..p are zero): the next derivative at degree p.
#[inline(always)]
fn derivative_row<const N: usize, D: KnotDivisor>(
    knots: &[f64],
    p: usize,
    span: usize,
    lower: &[f64; N],
    out: &mut [f64; N],
    div: &D,
) {
    let pf = p as f64;
    let mut carry = 0.0;
    for r in 0..p {
        // lower[r] appears with + in out[r + 1] and with − in out[r], over the same denominator
        // u_{span+r+1} − u_{span−p+r+1}.
        let term = div.deriv(lower[r], knots, span, p, r);
        out[r] = pf * (carry - term);
        carry = term;
    }
    out[p] = pf * carry;
}

/// `L` values, one per point of a group of points evaluated together. Every operation is one
/// IEEE operation per lane, the one the scalar code performs, written as a loop over the lanes
/// that the compiler vectorises; so lane-wide code written like the scalar code gives, lane by
/// lane, the scalar code's bits.
#[derive(Debug, Clone, Copy)]
pub(crate) struct Lanes<const L: usize>(pub(crate) [f64; L]);

impl<const L: usize> Lanes<L> {
    /// The same value in every lane.
    #[inline(always)]
    pub(crate) fn splat(x: f64) -> Self {
        Lanes([x; L])
    }
    /// Lane i = `x[i][at]`; with `SAME`, `x[0][at]` in every lane.
    #[inline(always)]
    fn gather<const SAME: bool>(x: &[&[f64]; L], at: usize) -> Self {
        if SAME {
            return Self::splat(x[0][at]);
        }
        let mut r = [0.0; L];
        for (r, x) in r.iter_mut().zip(x) {
            *r = x[at];
        }
        Lanes(r)
    }
    /// Lane by lane `f(self, o)`.
    #[inline(always)]
    fn zip(self, o: Self, f: impl Fn(f64, f64) -> f64) -> Self {
        let mut r = [0.0; L];
        for (i, r) in r.iter_mut().enumerate() {
            *r = f(self.0[i], o.0[i]);
        }
        Lanes(r)
    }
}

macro_rules! lane_op {
    ($tr:ident, $f:ident, $op:tt) => {
        impl<const L: usize> std::ops::$tr for Lanes<L> {
            type Output = Self;
            #[inline(always)]
            fn $f(self, o: Self) -> Self {
                self.zip(o, |a, b| a $op b)
            }
        }
    };
}
lane_op!(Add, add, +);
lane_op!(Sub, sub, -);
lane_op!(Mul, mul, *);
lane_op!(Div, div, /);

/// [`basis_rows_in`] with [`Reciprocals`] and the degree `P` (> 0) known at compile time, for
/// `L` points at once: lane l evaluates at `x[l]` on span `spans[l]` of `knots`, with the
/// reciprocal table `recips` of every span (as made by [`reciprocal_table`]). Each lane performs
/// exactly the operations of [`basis_rows_in`] in the same order, so it gives the same bits;
/// the latencies of the lanes' recursions overlap. `d[k][r]` lane l is `d[k][r]` of
/// [`basis_rows_in`] at point l. Same preconditions per lane as [`basis_rows_in`].
///
/// `R` = 3 gives rows to the second derivative, `R` = 4 also the third (row 3, zero below
/// degree 3); rows 0..3 are the same bits either way.
///
/// With `SAME` the caller promises that every lane has the span of lane 0 (the common case on a
/// path, which crosses a knot line now and then): the knots and reciprocals are then read once
/// and broadcast instead of gathered lane by lane. The same values either way.
#[inline(always)]
pub(crate) fn basis_rows_lanes<
    const N: usize,
    const P: usize,
    const L: usize,
    const SAME: bool,
    const R: usize,
>(
    knots: &[f64],
    recips: &[f64],
    spans: &[usize; L],
    x: Lanes<L>,
    order: usize,
) -> [[Lanes<L>; N]; R] {
    const { assert!(P > 0 && P < N) };
    debug_assert!(!SAME || spans.iter().all(|&s| s == spans[0]));
    let per_span = reciprocals_per_span(P);
    // Per lane the knot window and the span's reciprocals, as in `basis_rows_in` and
    // `Reciprocals`; fixed lengths, so that the constant indices below carry no bounds checks.
    // Plain loops rather than `array::from_fn`, which is not reliably inlined. With `SAME` only
    // lane 0's are read.
    let mut kw: [&[f64]; L] = [&[]; L];
    let mut rc: [&[f64]; L] = [&[]; L];
    for l in 0..if SAME { 1 } else { L } {
        kw[l] = &knots[spans[l] + 1 - P..spans[l] + P + 1];
        rc[l] = &recips[(spans[l] - P) * per_span..][..per_span];
    }
    let zero = Lanes::splat(0.0);
    const { assert!(R == 3 || R == 4) };
    let mut out = [[zero; N]; R];
    let mut left = [zero; N];
    let mut right = [zero; N];
    let mut deg_p1 = [zero; N];
    let mut deg_p2 = [zero; N];
    let mut deg_p3 = [zero; N];
    let row = &mut out[0];
    row[0] = Lanes::splat(1.0);
    for j in 1..P + 1 {
        if j == P {
            deg_p1 = *row;
        }
        if j + 1 == P {
            deg_p2 = *row;
        }
        if R > 3 && j + 2 == P {
            deg_p3 = *row;
        }
        left[j] = x - Lanes::gather::<SAME>(&kw, P - j);
        right[j] = Lanes::gather::<SAME>(&kw, P - 1 + j) - x;
        let mut saved = zero;
        for r in 0..j {
            let temp = row[r] * Lanes::gather::<SAME>(&rc, j * (j - 1) / 2 + r);
            row[r] = saved + right[r + 1] * temp;
            saved = left[j - r] * temp;
        }
        row[j] = saved;
    }
    if order >= 1 {
        derivative_row_lanes::<N, L, SAME>(P, &rc, &deg_p1, &mut out[1]);
    }
    if order >= 2 && P >= 2 {
        let mut der_p1 = [zero; N];
        derivative_row_lanes::<N, L, SAME>(P - 1, &rc, &deg_p2, &mut der_p1);
        derivative_row_lanes::<N, L, SAME>(P, &rc, &der_p1, &mut out[2]);
    }
    // The third derivative (rows of four only): the derivative formula three times, through
    // degrees p − 2 and p − 1, as the second through degree p − 1.
    if R > 3 && order >= 3 && P >= 3 {
        let (mut d1, mut d2) = ([zero; N], [zero; N]);
        derivative_row_lanes::<N, L, SAME>(P - 2, &rc, &deg_p3, &mut d1);
        derivative_row_lanes::<N, L, SAME>(P - 1, &rc, &d1, &mut d2);
        derivative_row_lanes::<N, L, SAME>(P, &rc, &d2, &mut out[R - 1]);
    }
    out
}

/// [`derivative_row`] with [`Reciprocals`], lane-wide: lane l of `rc` is the reciprocal table of
/// lane l's span (with `SAME`, lane 0's table serves every lane).
#[inline(always)]
fn derivative_row_lanes<const N: usize, const L: usize, const SAME: bool>(
    p: usize,
    rc: &[&[f64]; L],
    lower: &[Lanes<L>; N],
    out: &mut [Lanes<L>; N],
) {
    let pf = Lanes::splat(p as f64);
    let mut carry = Lanes::splat(0.0);
    for r in 0..p {
        let term = lower[r] * Lanes::gather::<SAME>(rc, p * (p - 1) / 2 + r);
        out[r] = pf * (carry - term);
        carry = term;
    }
    out[p] = pf * carry;
}
