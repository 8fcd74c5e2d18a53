//! Basis-function derivatives of any order, for the third- and fourth-order jets (The NURBS
//! Book, 2nd ed., A2.3 DersBasisFuns, p. 72). The second-order evaluation keeps its own
//! unrolled rows (`basis.rs`); this is a separate path, so its bits and speed are unchanged.

// The formulas index their rows and coefficients as the sources write them.
#![allow(clippy::needless_range_loop)]

use crate::geometry::jet::MAX_PARTIAL_ORDER;

/// Rows of derivatives: `ders[k][r]` = k-th derivative of N_{span−p+r, p}(u), k ≤ `n`
/// (rows above min(n, p) are zero: a degree-p polynomial has no derivative above p).
pub(crate) type DerRows<const N: usize> = [[f64; N]; MAX_PARTIAL_ORDER + 1];

/// A2.3 DersBasisFuns: the p + 1 non-zero basis functions of degree `p` on `span` at `u` and
/// their derivatives up to `n` (≤ [`MAX_PARTIAL_ORDER`]), in rows of `N` ≥ p + 1 entries, all
/// on the stack. `span` must be a non-empty span containing u (p ≤ span, span + p + 1 within
/// the knots), as from `KnotVector::find_span`.
#[inline]
pub(crate) fn ders_basis<const N: usize>(
    knots: &[f64],
    p: usize,
    span: usize,
    u: f64,
    n: usize,
) -> DerRows<N> {
    debug_assert!(p < N);
    let mut ders = [[0.0; N]; MAX_PARTIAL_ORDER + 1];
    let mut ndu = [[0.0; N]; N];
    let mut left = [0.0; N];
    let mut right = [0.0; N];
    ndu[0][0] = 1.0;
    for j in 1..=p {
        left[j] = u - knots[span + 1 - j];
        right[j] = knots[span + j] - u;
        let mut saved = 0.0;
        for r in 0..j {
            // Lower triangle: knot differences; upper: basis functions.
            ndu[j][r] = right[r + 1] + left[j - r];
            let temp = ndu[r][j - 1] / ndu[j][r];
            ndu[r][j] = saved + right[r + 1] * temp;
            saved = left[j - r] * temp;
        }
        ndu[j][j] = saved;
    }
    for j in 0..=p {
        ders[0][j] = ndu[j][p];
    }
    let n = n.min(p).min(MAX_PARTIAL_ORDER);
    let mut a = [[0.0; N]; 2];
    for r in 0..=p {
        let (mut s1, mut s2) = (0usize, 1usize);
        a[0][0] = 1.0;
        for k in 1..=n {
            let mut d = 0.0;
            let rk = r as isize - k as isize;
            let pk = p - k;
            if rk >= 0 {
                let rk = rk as usize;
                a[s2][0] = a[s1][0] / ndu[pk + 1][rk];
                d = a[s2][0] * ndu[rk][pk];
            }
            let j1: usize = if rk >= -1 { 1 } else { (-rk) as usize };
            let j2: usize = if r as isize - 1 <= pk as isize {
                k - 1
            } else {
                p - r
            };
            for j in j1..=j2 {
                let idx = (rk + j as isize) as usize;
                a[s2][j] = (a[s1][j] - a[s1][j - 1]) / ndu[pk + 1][idx];
                d += a[s2][j] * ndu[idx][pk];
            }
            if r <= pk {
                a[s2][k] = -a[s1][k - 1] / ndu[pk + 1][r];
                d += a[s2][k] * ndu[r][pk];
            }
            ders[k][r] = d;
            std::mem::swap(&mut s1, &mut s2);
        }
    }
    let mut factor = p as f64;
    for (k, row) in ders.iter_mut().enumerate().take(n + 1).skip(1) {
        for x in row.iter_mut().take(p + 1) {
            *x *= factor;
        }
        factor *= (p - k) as f64;
    }
    ders
}

/// Binomial coefficients C(k, i) for k, i ≤ [`MAX_PARTIAL_ORDER`].
pub(crate) const BINOMIAL: [[f64; MAX_PARTIAL_ORDER + 1]; MAX_PARTIAL_ORDER + 1] = [
    [1.0, 0.0, 0.0, 0.0, 0.0],
    [1.0, 1.0, 0.0, 0.0, 0.0],
    [1.0, 2.0, 1.0, 0.0, 0.0],
    [1.0, 3.0, 3.0, 1.0, 0.0],
    [1.0, 4.0, 6.0, 4.0, 1.0],
];

#[cfg(test)]
mod tests {
    use super::*;
    use crate::nurbs::basis_rows;

    /// The NURBS Book's example 2.4 (U = {0,0,0,1,2,3,4,4,5,5,5}, p = 2, u = 5/2, span 4):
    /// values 1/8, 6/8, 1/8; first derivatives −1/2, 0, 1/2; second 1, −2, 1 [example values
    /// from memory, recomputed here against the second-order rows]. Third derivatives of a
    /// quadratic are zero.
    #[test]
    fn agrees_with_the_second_order_rows_and_the_book_example() {
        let knots = [0.0, 0.0, 0.0, 1.0, 2.0, 3.0, 4.0, 4.0, 5.0, 5.0, 5.0];
        let d = ders_basis::<4>(&knots, 2, 4, 2.5, 4);
        let want = [[0.125, 0.75, 0.125], [-0.5, 0.0, 0.5], [1.0, -2.0, 1.0]];
        for k in 0..3 {
            for r in 0..3 {
                assert!((d[k][r] - want[k][r]).abs() < 1e-14, "k {k} r {r}");
            }
        }
        assert!(d[3].iter().chain(d[4].iter()).all(|&x| x == 0.0));
        // Cubic on non-uniform knots: against the second-order rows, and the third
        // derivative against a central difference of the second.
        let knots = [0.0, 0.0, 0.0, 0.0, 0.3, 0.5, 1.2, 2.0, 2.0, 2.0, 2.0];
        let u = 0.8;
        let span = 5;
        let d = ders_basis::<4>(&knots, 3, span, u, 4);
        let r2 = basis_rows(&knots, 3, span, u, 2);
        let h = 1e-5;
        let rp = basis_rows(&knots, 3, span, u + h, 2);
        let rm = basis_rows(&knots, 3, span, u - h, 2);
        for r in 0..4 {
            for k in 0..3 {
                assert!((d[k][r] - r2.d[k][r]).abs() < 1e-12);
            }
            let fd = (rp.d[2][r] - rm.d[2][r]) / (2.0 * h);
            assert!(
                (d[3][r] - fd).abs() < 1e-6 * (1.0 + fd.abs()),
                "{} {fd}",
                d[3][r]
            );
            assert_eq!(d[4][r], 0.0);
        }
        // Partition of unity: the derivatives of Σ N sum to zero.
        for row in &d[1..4] {
            assert!(row.iter().sum::<f64>().abs() < 1e-10);
        }
    }
}
