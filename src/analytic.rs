//! Analytic surfaces with exact derivatives, for checks, examples and benchmarks: sphere,
//! cylinder, torus, plane and Monge patches. Each returns an [`AnalyticSurface`] whose
//! partials are exact to fourth order ([`monge`] patches: second order).

use crate::error::{Result, StrakeError};
use crate::geometry::jet::{DerivOrder, Interval, MAX_PARTIAL_ORDER, SurfaceJet, SurfacePartials};
use crate::geometry::math::Vec3;
use crate::geometry::principal::Orientation;
use crate::surface::{SurfaceHint, SurfaceSource};
use std::f64::consts::{PI, TAU};

type PartialsFn = Box<dyn Fn(f64, f64) -> SurfacePartials + Send + Sync>;

/// An analytic surface: exact partials from a closure, to fourth order for the sphere,
/// cylinder, torus and [`monge_high`] patches (to second order for [`monge`] patches).
pub struct AnalyticSurface {
    u: Interval,
    v: Interval,
    max_order: usize,
    f: PartialsFn,
}

impl SurfaceSource for AnalyticSurface {
    fn u_domain(&self) -> Interval {
        self.u
    }
    fn v_domain(&self) -> Interval {
        self.v
    }
    fn orientation(&self) -> Orientation {
        Orientation::Forward
    }
    fn jet_in_domain(
        &self,
        u: f64,
        v: f64,
        _order: DerivOrder,
        _hint: &mut SurfaceHint,
    ) -> Result<SurfaceJet> {
        Ok((self.f)(u, v).jet())
    }
    fn max_order(&self) -> usize {
        self.max_order
    }
    fn partials_in_domain(
        &self,
        u: f64,
        v: f64,
        order: usize,
        _hint: &mut SurfaceHint,
    ) -> Result<SurfacePartials> {
        if order > self.max_order {
            return Err(StrakeError::OrderUnavailable {
                which: "surface",
                needed: order,
                available: self.max_order,
            });
        }
        let mut p = (self.f)(u, v);
        p.order = order;
        Ok(p)
    }
}

fn make(
    u: (f64, f64),
    v: (f64, f64),
    max_order: usize,
    f: impl Fn(f64, f64) -> SurfacePartials + Send + Sync + 'static,
) -> AnalyticSurface {
    AnalyticSurface {
        u: Interval { lo: u.0, hi: u.1 },
        v: Interval { lo: v.0, hi: v.1 },
        max_order,
        f: Box::new(f),
    }
}

/// d^k sin / dx^k and d^k cos / dx^k at x, from (sin x, cos x).
fn dsin(k: usize, (s, c): (f64, f64)) -> f64 {
    [s, c, -s, -c][k % 4]
}
fn dcos(k: usize, (s, c): (f64, f64)) -> f64 {
    [c, -s, -c, s][k % 4]
}

/// Fills every partial d[i][j], i + j ≤ 4, from `g(i, j)`.
fn all_partials(g: impl Fn(usize, usize) -> Vec3) -> SurfacePartials {
    let mut p = SurfacePartials {
        order: MAX_PARTIAL_ORDER,
        ..Default::default()
    };
    for i in 0..=MAX_PARTIAL_ORDER {
        for j in 0..=MAX_PARTIAL_ORDER - i {
            p.d[i][j] = g(i, j);
        }
    }
    p
}

/// Sphere of radius `r` centred at the origin: S(u, v) = r (sin v cos u, sin v sin u, cos v),
/// u = longitude in [0, 2π], v = colatitude in [0, π]. Su × Sv points inward, so with the
/// default orientation every normal curvature is +1/r.
pub fn sphere(r: f64) -> AnalyticSurface {
    make((0.0, TAU), (0.0, PI), MAX_PARTIAL_ORDER, move |u, v| {
        let (su, sv) = (u.sin_cos(), v.sin_cos());
        all_partials(|i, j| {
            let z = if i == 0 { r * dcos(j, sv) } else { 0.0 };
            Vec3::new(
                r * dsin(j, sv) * dcos(i, su),
                r * dsin(j, sv) * dsin(i, su),
                z,
            )
        })
    })
}

/// Circular cylinder of radius `r` about the z axis: S(u, v) = (r cos u, r sin u, v),
/// u in [0, 2π], v in [`v0`, `v1`]. Su × Sv points outward, so the circumferential normal
/// curvature is −1/r with the default orientation.
pub fn cylinder(r: f64, v0: f64, v1: f64) -> AnalyticSurface {
    make((0.0, TAU), (v0, v1), MAX_PARTIAL_ORDER, move |u, v| {
        let su = u.sin_cos();
        all_partials(|i, j| match (i, j) {
            (_, 0) => Vec3::new(
                r * dcos(i, su),
                r * dsin(i, su),
                if i == 0 { v } else { 0.0 },
            ),
            (0, 1) => Vec3::new(0.0, 0.0, 1.0),
            _ => Vec3::zeros(),
        })
    })
}

/// Torus with major radius `big_r` and minor radius `r` about the z axis:
/// S(u, v) = ((R + r cos v) cos u, (R + r cos v) sin u, r sin v), u, v in [0, 2π].
/// Su × Sv points outward (away from the tube's core circle).
pub fn torus(big_r: f64, r: f64) -> AnalyticSurface {
    make((0.0, TAU), (0.0, TAU), MAX_PARTIAL_ORDER, move |u, v| {
        let (su, sv) = (u.sin_cos(), v.sin_cos());
        all_partials(|i, j| {
            // w(v) = R + r cos v and its derivatives.
            let w = if j == 0 {
                big_r + r * sv.1
            } else {
                r * dcos(j, sv)
            };
            let z = if i == 0 { r * dsin(j, sv) } else { 0.0 };
            Vec3::new(w * dcos(i, su), w * dsin(i, su), z)
        })
    })
}

/// A Monge patch z = f(x, y) over [x0, x1] × [y0, y1]: S(u, v) = (u, v, f(u, v)); `f` returns
/// (f, fx, fy, fxx, fxy, fyy). Su × Sv = (−fx, −fy, 1) points up.
pub fn monge(
    x: (f64, f64),
    y: (f64, f64),
    f: impl Fn(f64, f64) -> [f64; 6] + Send + Sync + 'static,
) -> AnalyticSurface {
    make(x, y, 2, move |u, v| {
        let [z, zx, zy, zxx, zxy, zyy] = f(u, v);
        let mut p = SurfacePartials::from_jet(&SurfaceJet {
            p: Vec3::new(u, v, z),
            su: Vec3::new(1.0, 0.0, zx),
            sv: Vec3::new(0.0, 1.0, zy),
            suu: Vec3::new(0.0, 0.0, zxx),
            suv: Vec3::new(0.0, 0.0, zxy),
            svv: Vec3::new(0.0, 0.0, zyy),
        });
        p.order = 2;
        p
    })
}

/// A Monge patch z = f(x, y) with exact partials to fourth order: `f` returns `d` with
/// `d[i][j]` = ∂^(i+j) f / ∂x^i ∂y^j for i + j ≤ 4 (other entries ignored).
/// S(u, v) = (u, v, f(u, v)); Su × Sv = (−fx, −fy, 1) points up.
pub fn monge_high(
    x: (f64, f64),
    y: (f64, f64),
    f: impl Fn(f64, f64) -> [[f64; 5]; 5] + Send + Sync + 'static,
) -> AnalyticSurface {
    make(x, y, MAX_PARTIAL_ORDER, move |u, v| {
        let d = f(u, v);
        all_partials(|i, j| match (i, j) {
            (0, 0) => Vec3::new(u, v, d[0][0]),
            (1, 0) => Vec3::new(1.0, 0.0, d[1][0]),
            (0, 1) => Vec3::new(0.0, 1.0, d[0][1]),
            _ => Vec3::new(0.0, 0.0, d[i][j]),
        })
    })
}

/// The plane z = 0 over [x0, x1] × [y0, y1] (normal +z), exact to fourth order.
pub fn plane(x: (f64, f64), y: (f64, f64)) -> AnalyticSurface {
    monge_high(x, y, |_, _| [[0.0; 5]; 5])
}

/// The hyperbolic paraboloid z = x y over [x0, x1] × [y0, y1] (normal up). At the origin
/// k1 = 1, k2 = −1, K = −1; the x and y axes are asymptotic lines.
pub fn saddle(x: (f64, f64), y: (f64, f64)) -> AnalyticSurface {
    monge_high(x, y, |u, v| {
        let mut d = [[0.0; 5]; 5];
        (d[0][0], d[1][0], d[0][1], d[1][1]) = (u * v, v, u, 1.0);
        d
    })
}
