//! Lane-wide arithmetic: one f64 per point of a block ([`W`]), every operation a loop over the
//! lanes that the compiler vectorises. Code written with [`W`] reads like the scalar formulas and
//! performs, in each lane, exactly the scalar operations in the same order, so it gives the same
//! bits as the one-point path, while each step is done for all lanes before the next: the
//! latencies of the points overlap instead of adding up.

// Index loops over the lanes on purpose: iterators over arrays by value are not unrolled and
// vectorised as reliably.
#![allow(clippy::needless_range_loop)]

/// Points per block. Measured (`examples/speed_report.rs`): 16 lanes hide the latency of the
/// frame's square roots and divisions (8 leave some exposed; 32 spill too much).
pub const LANES: usize = 16;

/// One f64 per lane: the kernel's arithmetic type. Every operation is a loop over the lanes,
/// which the compiler vectorises; each step of the formulas is done for all lanes before the
/// next, so that the latencies of the lanes overlap.
#[derive(Clone, Copy)]
pub(crate) struct W(pub(crate) [f64; LANES]);

/// One flag per lane.
#[derive(Clone, Copy)]
pub(crate) struct Mask(pub(crate) [bool; LANES]);

/// A vector in space per lane.
pub(crate) type W3 = [W; 3];

impl W {
    /// The same value in every lane.
    #[inline(always)]
    pub(crate) fn splat(x: f64) -> W {
        W([x; LANES])
    }
    #[inline(always)]
    pub(crate) fn map(self, f: impl Fn(f64) -> f64) -> W {
        let mut r = [0.0; LANES];
        for i in 0..LANES {
            r[i] = f(self.0[i]);
        }
        W(r)
    }
    #[inline(always)]
    pub(crate) fn zip(self, o: W, f: impl Fn(f64, f64) -> f64) -> W {
        let mut r = [0.0; LANES];
        for i in 0..LANES {
            r[i] = f(self.0[i], o.0[i]);
        }
        W(r)
    }
    #[inline(always)]
    pub(crate) fn test(self, o: W, f: impl Fn(f64, f64) -> bool) -> Mask {
        let mut r = [false; LANES];
        for i in 0..LANES {
            r[i] = f(self.0[i], o.0[i]);
        }
        Mask(r)
    }
    #[inline(always)]
    pub(crate) fn sqrt(self) -> W {
        self.map(f64::sqrt)
    }
    #[inline(always)]
    pub(crate) fn abs(self) -> W {
        self.map(f64::abs)
    }
    /// `f64::max` per lane (a NaN loses).
    #[inline(always)]
    pub(crate) fn max(self, o: W) -> W {
        self.zip(o, f64::max)
    }
    #[inline(always)]
    pub(crate) fn finite(self) -> Mask {
        self.test(self, |x, _| x.is_finite())
    }
}

macro_rules! arith {
    ($tr:ident, $f:ident, $op:tt) => {
        impl std::ops::$tr for W {
            type Output = W;
            #[inline(always)]
            fn $f(self, o: W) -> W {
                self.zip(o, |x, y| x $op y)
            }
        }
        impl std::ops::$tr<f64> for W {
            type Output = W;
            #[inline(always)]
            fn $f(self, o: f64) -> W {
                self.map(|x| x $op o)
            }
        }
        impl std::ops::$tr<W> for f64 {
            type Output = W;
            #[inline(always)]
            fn $f(self, o: W) -> W {
                o.map(|y| self $op y)
            }
        }
    };
}
arith!(Add, add, +);
arith!(Sub, sub, -);
arith!(Mul, mul, *);
arith!(Div, div, /);

impl std::ops::BitAnd for Mask {
    type Output = Mask;
    #[inline(always)]
    fn bitand(self, o: Mask) -> Mask {
        let mut r = [false; LANES];
        for i in 0..LANES {
            r[i] = self.0[i] & o.0[i];
        }
        Mask(r)
    }
}

/// `a` where `m` holds, else `b`, per lane.
#[inline(always)]
pub(crate) fn select(m: Mask, a: W, b: W) -> W {
    let mut r = [0.0; LANES];
    for i in 0..LANES {
        r[i] = if m.0[i] { a.0[i] } else { b.0[i] };
    }
    W(r)
}
