//! A surface given by a Rust closure: analytic surfaces in tests and examples, or a Rust host's
//! own evaluator.

use super::{SurfaceHint, SurfaceSource};
use crate::error::Result;
use crate::geometry::jet::{DerivOrder, Interval, SurfaceJet};
use crate::geometry::principal::Orientation;

/// A surface whose jet comes from a closure `f(u, v, order)`.
pub struct FnSurface<F> {
    f: F,
    u: Interval,
    v: Interval,
    orientation: Orientation,
}

impl<F> FnSurface<F>
where
    F: Fn(f64, f64, DerivOrder) -> Result<SurfaceJet> + Send + Sync,
{
    /// A surface on `u_domain` × `v_domain` evaluated by `f`, with the given normal orientation.
    pub fn new(u_domain: Interval, v_domain: Interval, orientation: Orientation, f: F) -> Self {
        FnSurface {
            f,
            u: u_domain,
            v: v_domain,
            orientation,
        }
    }
}

impl<F> SurfaceSource for FnSurface<F>
where
    F: Fn(f64, f64, DerivOrder) -> Result<SurfaceJet> + Send + Sync,
{
    fn u_domain(&self) -> Interval {
        self.u
    }
    fn v_domain(&self) -> Interval {
        self.v
    }
    fn orientation(&self) -> Orientation {
        self.orientation
    }
    #[inline]
    fn jet_in_domain(
        &self,
        u: f64,
        v: f64,
        order: DerivOrder,
        _hint: &mut SurfaceHint,
    ) -> Result<SurfaceJet> {
        (self.f)(u, v, order)
    }
}
