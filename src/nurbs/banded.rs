//! LU factorisation with partial pivoting of a banded square matrix, and the solve that goes
//! with it. Used by global interpolation, whose collocation matrix has at most p + 1 non-zeros
//! a row, clustered about the diagonal (The NURBS Book, 2nd ed., §9.2.1).
//!
//! Storage: row i keeps the columns i − kl ..= i + ku + kl (kl sub-diagonals, ku
//! super-diagonals, and kl more for the fill that row exchanges bring into U), so the work is
//! O(n · kl · (kl + ku)) and the memory O(n · (2 kl + ku + 1)). This is the classical band
//! Gaussian elimination with partial pivoting (G. H. Golub, C. F. Van Loan, *Matrix
//! Computations*, 3rd ed., §4.3 \[memory\]): the row exchanges are applied to the right-hand side
//! in the same order as during the factorisation.

use crate::error::{Result, StrakeError};

/// A banded matrix being factorised in place.
#[derive(Debug, Clone)]
pub(crate) struct BandMatrix {
    n: usize,
    kl: usize,
    ku: usize,
    width: usize,
    data: Vec<f64>,
    pivots: Vec<usize>,
}

impl BandMatrix {
    /// An n × n zero matrix with `kl` sub- and `ku` super-diagonals.
    pub(crate) fn zeros(n: usize, kl: usize, ku: usize) -> Self {
        let width = 2 * kl + ku + 1;
        BandMatrix {
            n,
            kl,
            ku,
            width,
            data: vec![0.0; n * width],
            pivots: Vec::new(),
        }
    }

    #[inline]
    fn idx(&self, i: usize, j: usize) -> usize {
        debug_assert!(j + self.kl >= i && j <= i + self.ku + self.kl);
        i * self.width + (j + self.kl - i)
    }

    /// Sets entry (i, j), which must lie within the band (i − kl ≤ j ≤ i + ku).
    pub(crate) fn set(&mut self, i: usize, j: usize, x: f64) {
        let k = self.idx(i, j);
        self.data[k] = x;
    }

    /// Factorises in place (PA = LU). Fails with `InvalidArgument` naming the column when a
    /// pivot is below `pivot_floor` in magnitude (the matrix is singular to working precision).
    pub(crate) fn factorise(&mut self, pivot_floor: f64) -> Result<()> {
        let (n, kl, ku) = (self.n, self.kl, self.ku);
        self.pivots = Vec::with_capacity(n);
        for k in 0..n {
            let last_row = (k + kl).min(n - 1);
            let mut piv = k;
            let mut best = self.data[self.idx(k, k)].abs();
            for i in k + 1..=last_row {
                let a = self.data[self.idx(i, k)].abs();
                if a > best {
                    best = a;
                    piv = i;
                }
            }
            if best.is_nan() || best <= pivot_floor {
                return Err(StrakeError::InvalidArgument(format!(
                    "the interpolation system is singular at column {k} (largest pivot \
                     {best}); the parameters do not suit the degree",
                    best = crate::numfmt::Num(best)
                )));
            }
            let last_col = (k + kl + ku).min(n - 1);
            self.pivots.push(piv);
            if piv != k {
                for j in k..=last_col {
                    let (a, b) = (self.idx(k, j), self.idx(piv, j));
                    self.data.swap(a, b);
                }
            }
            let inv = 1.0 / self.data[self.idx(k, k)];
            for i in k + 1..=last_row {
                let ik = self.idx(i, k);
                let f = self.data[ik] * inv;
                self.data[ik] = f;
                if f != 0.0 {
                    for j in k + 1..=last_col {
                        let kj = self.data[self.idx(k, j)];
                        let ij = self.idx(i, j);
                        self.data[ij] -= f * kj;
                    }
                }
            }
        }
        Ok(())
    }

    /// Solves A x = b in place for D right-hand sides at once, after [`Self::factorise`].
    pub(crate) fn solve<const D: usize>(&self, b: &mut [[f64; D]]) {
        let (n, kl, ku) = (self.n, self.kl, self.ku);
        for k in 0..n {
            let piv = self.pivots[k];
            if piv != k {
                b.swap(k, piv);
            }
            let bk = b[k];
            let last = (k + kl).min(n - 1);
            for (i, bi) in b.iter_mut().enumerate().take(last + 1).skip(k + 1) {
                let f = self.data[self.idx(i, k)];
                for (x, y) in bi.iter_mut().zip(&bk) {
                    *x -= f * y;
                }
            }
        }
        for k in (0..n).rev() {
            let mut acc = b[k];
            let last = (k + kl + ku).min(n - 1);
            for (j, bj) in b.iter().enumerate().take(last + 1).skip(k + 1) {
                let a = self.data[self.idx(k, j)];
                for (x, y) in acc.iter_mut().zip(bj) {
                    *x -= a * y;
                }
            }
            let inv = 1.0 / self.data[self.idx(k, k)];
            b[k] = acc.map(|x| x * inv);
        }
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// Dense Gaussian elimination, the textbook reference (common practice).
    fn dense_solve(a: &[Vec<f64>], b: &[f64]) -> Vec<f64> {
        let n = b.len();
        let mut m: Vec<Vec<f64>> = a.to_vec();
        let mut x = b.to_vec();
        for k in 0..n {
            let p = (k..n)
                .max_by(|&i, &j| m[i][k].abs().total_cmp(&m[j][k].abs()))
                .unwrap();
            m.swap(k, p);
            x.swap(k, p);
            for i in k + 1..n {
                let f = m[i][k] / m[k][k];
                let (top, bottom) = m.split_at_mut(i);
                for (a, b) in bottom[0][k..].iter_mut().zip(&top[k][k..]) {
                    *a -= f * b;
                }
                x[i] -= f * x[k];
            }
        }
        for k in (0..n).rev() {
            let s: f64 = (k + 1..n).map(|j| m[k][j] * x[j]).sum();
            x[k] = (x[k] - s) / m[k][k];
        }
        x
    }

    // A banded system that needs row exchanges (small diagonal entries): the band solver must
    // agree with dense elimination with partial pivoting (common practice).
    #[test]
    fn agrees_with_dense_elimination_when_pivoting_is_needed() {
        let (n, kl, ku) = (12, 2, 1);
        let mut state = 0x9e37_79b9_u64;
        let mut rnd = || {
            state ^= state << 13;
            state ^= state >> 7;
            state ^= state << 17;
            (state % 2000) as f64 / 1000.0 - 1.0
        };
        let mut dense = vec![vec![0.0; n]; n];
        let mut band = BandMatrix::zeros(n, kl, ku);
        for (i, row) in dense.iter_mut().enumerate() {
            for (j, entry) in row
                .iter_mut()
                .enumerate()
                .take((i + ku).min(n - 1) + 1)
                .skip(i.saturating_sub(kl))
            {
                let x = if i == j { 1e-3 * rnd() } else { rnd() };
                *entry = x;
                band.set(i, j, x);
            }
        }
        let rhs: Vec<f64> = (0..n).map(|_| rnd()).collect();
        let expect = dense_solve(&dense, &rhs);
        band.factorise(1e-300).unwrap();
        let mut b: Vec<[f64; 1]> = rhs.iter().map(|&x| [x]).collect();
        band.solve(&mut b);
        for (x, e) in b.iter().zip(&expect) {
            assert!((x[0] - e).abs() <= 1e-10 * e.abs().max(1.0), "{x:?} vs {e}");
        }
        // And the residual of the original system is at round-off.
        for (i, row) in dense.iter().enumerate() {
            let r: f64 = row.iter().zip(&b).map(|(a, x)| a * x[0]).sum::<f64>() - rhs[i];
            assert!(r.abs() < 1e-10, "row {i} residual {r:e}");
        }
    }

    #[test]
    fn singular_matrix_is_refused_naming_the_column() {
        let mut band = BandMatrix::zeros(3, 1, 1);
        band.set(0, 0, 1.0);
        band.set(1, 1, 0.0);
        band.set(2, 2, 1.0);
        let err = band.factorise(1e-14).unwrap_err();
        assert!(err.to_string().contains("column 1"), "{err}");
    }
}
