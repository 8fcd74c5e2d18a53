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
    let mut out = BasisRows {
        d: [[0.0; MAX_ORDER]; 3],
    };
    let mut left = [0.0; MAX_ORDER];
    let mut right = [0.0; MAX_ORDER];
    let mut row = [0.0; MAX_ORDER];
    let mut deg_p1 = [0.0; MAX_ORDER]; // degree p − 1 values
    let mut deg_p2 = [0.0; MAX_ORDER]; // degree p − 2 values
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
    out.d[0][..=p].copy_from_slice(&row[..=p]);
    if order >= 1 {
        derivative_row(knots, p, span, &deg_p1, &mut out.d[1]);
    }
    if order >= 2 && p >= 2 {
        let mut der_p1 = [0.0; MAX_ORDER];
        derivative_row(knots, p - 1, span, &deg_p2, &mut der_p1);
        derivative_row(knots, p, span, &der_p1, &mut out.d[2]);
    }
    out
}

/// Given `lower[q]` = (some derivative of) N_{span−(p−1)+q, p−1}, q = 0..p, writes
/// `out[r]` = p [lower[r−1]/(u_{span+r} − u_{span−p+r}) − lower[r]/(u_{span+r+1} − u_{span−p+r+1})]
/// for r = 0..=p (terms outside 0..p are zero): the next derivative at degree p.
#[inline(always)]
fn derivative_row(
    knots: &[f64],
    p: usize,
    span: usize,
    lower: &[f64; MAX_ORDER],
    out: &mut [f64; MAX_ORDER],
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
