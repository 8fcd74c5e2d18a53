//! Truncated Taylor series in one variable, for the exact higher derivatives of the frame
//! along a path: every quantity (the point, the tangent, the normal, the invariants) is
//! carried as its coefficients f_k = f^(k)(t₀)/k!, k ≤ 4, and combined by the rules of
//! power-series arithmetic (Cauchy product, series division, square root). This is the chain
//! and quotient rules applied mechanically, so nothing is approximated: a result's
//! coefficient k is its k-th derivative / k! to rounding, as long as the inputs are valid to
//! degree k (the callers track how far each quantity is valid).

// The formulas index their rows and coefficients as the sources write them.
#![allow(clippy::needless_range_loop)]

use crate::geometry::math::Vec3;

/// The number of coefficients (degrees 0 ..= 4).
pub(crate) const LEN: usize = 5;

/// A truncated series: `0[k]` = f^(k)(t₀) / k!.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub(crate) struct Tay(pub(crate) [f64; LEN]);

impl Tay {
    pub(crate) fn constant(x: f64) -> Self {
        let mut a = [0.0; LEN];
        a[0] = x;
        Tay(a)
    }
    pub(crate) fn add(&self, o: &Tay) -> Tay {
        Tay(std::array::from_fn(|k| self.0[k] + o.0[k]))
    }
    pub(crate) fn sub(&self, o: &Tay) -> Tay {
        Tay(std::array::from_fn(|k| self.0[k] - o.0[k]))
    }
    pub(crate) fn scale(&self, s: f64) -> Tay {
        Tay(std::array::from_fn(|k| self.0[k] * s))
    }
    /// Cauchy product.
    pub(crate) fn mul(&self, o: &Tay) -> Tay {
        Tay(std::array::from_fn(|k| {
            (0..=k).map(|i| self.0[i] * o.0[k - i]).sum()
        }))
    }
    /// Series quotient (o.0[0] ≠ 0).
    pub(crate) fn div(&self, o: &Tay) -> Tay {
        let mut q = [0.0; LEN];
        for k in 0..LEN {
            let mut x = self.0[k];
            for i in 1..=k {
                x -= o.0[i] * q[k - i];
            }
            q[k] = x / o.0[0];
        }
        Tay(q)
    }
    /// Square root (self.0[0] > 0).
    pub(crate) fn sqrt(&self) -> Tay {
        let mut s = [0.0; LEN];
        s[0] = self.0[0].sqrt();
        for k in 1..LEN {
            let mut x = self.0[k];
            for i in 1..k {
                x -= s[i] * s[k - i];
            }
            s[k] = x / (2.0 * s[0]);
        }
        Tay(s)
    }
    /// The derivative: (f')_k = (k + 1) f_{k+1}; valid one degree less than f.
    pub(crate) fn deriv(&self) -> Tay {
        Tay(std::array::from_fn(|k| {
            if k + 1 < LEN {
                (k + 1) as f64 * self.0[k + 1]
            } else {
                0.0
            }
        }))
    }
    /// f^(k)(t₀) = k! f_k.
    #[cfg(test)]
    pub(crate) fn derivative(&self, k: usize) -> f64 {
        let fact = [1.0, 1.0, 2.0, 6.0, 24.0][k];
        self.0[k] * fact
    }
}

/// A vector-valued series, one [`Tay`] per component.
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub(crate) struct TVec(pub(crate) [Tay; 3]);

impl TVec {
    pub(crate) fn add(&self, o: &TVec) -> TVec {
        TVec(std::array::from_fn(|c| self.0[c].add(&o.0[c])))
    }
    pub(crate) fn scale(&self, s: f64) -> TVec {
        TVec(std::array::from_fn(|c| self.0[c].scale(s)))
    }
    pub(crate) fn scale_by(&self, s: &Tay) -> TVec {
        TVec(std::array::from_fn(|c| self.0[c].mul(s)))
    }
    pub(crate) fn add_scaled(&self, v: Vec3, s: &Tay) -> TVec {
        TVec(std::array::from_fn(|c| self.0[c].add(&s.scale(v[c]))))
    }
    pub(crate) fn dot(&self, o: &TVec) -> Tay {
        self.0[0]
            .mul(&o.0[0])
            .add(&self.0[1].mul(&o.0[1]))
            .add(&self.0[2].mul(&o.0[2]))
    }
    pub(crate) fn cross(&self, o: &TVec) -> TVec {
        let (a, b) = (&self.0, &o.0);
        TVec([
            a[1].mul(&b[2]).sub(&a[2].mul(&b[1])),
            a[2].mul(&b[0]).sub(&a[0].mul(&b[2])),
            a[0].mul(&b[1]).sub(&a[1].mul(&b[0])),
        ])
    }
    pub(crate) fn deriv(&self) -> TVec {
        TVec(std::array::from_fn(|c| self.0[c].deriv()))
    }
    /// The unit vector v/|v| (|v(t₀)| > 0) and |v|.
    pub(crate) fn normalized(&self) -> (TVec, Tay) {
        let len = self.dot(self).sqrt();
        let inv = Tay::constant(1.0).div(&len);
        (self.scale_by(&inv), len)
    }
    /// The coefficient vector of degree k.
    pub(crate) fn coef(&self, k: usize) -> Vec3 {
        Vec3::new(self.0[0].0[k], self.0[1].0[k], self.0[2].0[k])
    }
}

#[cfg(test)]
mod tests {
    use super::*;

    /// exp, 1/(1 − t), √(1 + t) and their products against their known series.
    #[test]
    fn series_rules() {
        let e = Tay([1.0, 1.0, 0.5, 1.0 / 6.0, 1.0 / 24.0]);
        let one_minus = Tay([1.0, -1.0, 0.0, 0.0, 0.0]);
        let geo = Tay::constant(1.0).div(&one_minus);
        assert_eq!(geo.0, [1.0; 5]);
        let s = Tay([1.0, 1.0, 0.0, 0.0, 0.0]).sqrt();
        let want = [1.0, 0.5, -0.125, 0.0625, -5.0 / 128.0];
        for k in 0..5 {
            assert!((s.0[k] - want[k]).abs() < 1e-15);
        }
        let e2 = e.mul(&e);
        let want = [1.0, 2.0, 2.0, 4.0 / 3.0, 2.0 / 3.0];
        for k in 0..5 {
            assert!((e2.0[k] - want[k]).abs() < 1e-15);
        }
        assert_eq!(e.deriv().0[..4], e.0[..4]);
        assert_eq!(e.derivative(4), 1.0);
    }
}
