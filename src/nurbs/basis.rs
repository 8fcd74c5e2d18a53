//! B-spline basis functions and their first two derivatives.
//!
//! Values by the triangular Cox–de Boor recursion (The NURBS Book, 2nd ed., A2.2 BasisFuns,
//! p. 70). Derivatives by the derivative formula of §2.3 (eq. 2.7):
//! N'_{i,p} = p [N_{i,p−1}/(u_{i+p} − u_i) − N_{i+1,p−1}/(u_{i+p+1} − u_{i+1})], applied once to
//! the degree p − 1 functions and twice (through degree p − 2) for the second derivative. This
//! gives the same numbers as A2.3 DersBasisFuns; it keeps three rows of at most
//! `MAX_DEGREE + 1` entries on the stack instead of a square table. Within a non-empty span
//! every denominator is at least the span's length, so none is zero.

use super::knots::MAX_DEGREE;

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
        d: basis_rows_in::<MAX_ORDER>(knots, p, span, u, order),
    }
}

/// As [`basis_rows`], with rows of `N` entries (`p < N ≤ MAX_ORDER`): the same arithmetic, so
/// the same numbers bit for bit, in stack arrays sized for the degree at hand. Evaluators of
/// low-degree surfaces use a small `N` so that no time goes into clearing unused entries.
#[inline(always)]
pub(crate) fn basis_rows_in<const N: usize>(
    knots: &[f64],
    p: usize,
    span: usize,
    u: f64,
    order: usize,
) -> [[f64; N]; 3] {
    debug_assert!(p < N);
    let mut out = [[0.0; N]; 3];
    let mut left = [0.0; N];
    let mut right = [0.0; N];
    let mut deg_p1 = [0.0; N]; // degree p − 1 values
    let mut deg_p2 = [0.0; N]; // degree p − 2 values
    let row = &mut out[0];
    row[0] = 1.0;
    for j in 1..=p {
        if j == p {
            deg_p1[..p].copy_from_slice(&row[..p]);
        }
        if j + 1 == p {
            deg_p2[..p - 1].copy_from_slice(&row[..p - 1]);
        }
        left[j] = u - knots[span + 1 - j];
        right[j] = knots[span + j] - u;
        let mut saved = 0.0;
        for r in 0..j {
            let temp = row[r] / (right[r + 1] + left[j - r]);
            row[r] = saved + right[r + 1] * temp;
            saved = left[j - r] * temp;
        }
        row[j] = saved;
    }
    if order >= 1 {
        derivative_row(knots, p, span, &deg_p1, &mut out[1]);
    }
    if order >= 2 && p >= 2 {
        let mut der_p1 = [0.0; N];
        derivative_row(knots, p - 1, span, &deg_p2, &mut der_p1);
        derivative_row(knots, p, span, &der_p1, &mut out[2]);
    }
    out
}

/// Given `lower[q]` = (some derivative of) N_{span−(p−1)+q, p−1}, q = 0..p, writes
/// `out[r]` = p [lower[r−1]/(u_{span+r} − u_{span−p+r}) − lower[r]/(u_{span+r+1} − u_{span−p+r+1})]
/// for r = 0..=p (terms outside 0..p are zero): the next derivative at degree p.
#[inline(always)]
fn derivative_row<const N: usize>(
    knots: &[f64],
    p: usize,
    span: usize,
    lower: &[f64; N],
    out: &mut [f64; N],
) {
    let pf = p as f64;
    let mut carry = 0.0;
    for r in 0..p {
        // lower[r] appears with + in out[r + 1] and with − in out[r], over the same denominator
        // u_{span+r+1} − u_{span−p+r+1}.
        let term = lower[r] / (knots[span + r + 1] - knots[span + r + 1 - p]);
        out[r] = pf * (carry - term);
        carry = term;
    }
    out[p] = pf * carry;
}
