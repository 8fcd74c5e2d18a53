//! Analytic surfaces with exact derivatives, for checks, examples and benchmarks: sphere,
//! cylinder, torus, plane and Monge patches. Each returns a [`FnSurface`].

use crate::error::Result;
use crate::geometry::jet::{DerivOrder, Interval, SurfaceJet};
use crate::geometry::math::Vec3;
use crate::geometry::principal::Orientation;
use crate::surface::FnSurface;
use std::f64::consts::{PI, TAU};

type JetFn = Box<dyn Fn(f64, f64, DerivOrder) -> Result<SurfaceJet> + Send + Sync>;

/// An analytic surface: a boxed closure behind [`FnSurface`].
pub type AnalyticSurface = FnSurface<JetFn>;

fn make(
    u: (f64, f64),
    v: (f64, f64),
    f: impl Fn(f64, f64) -> SurfaceJet + Send + Sync + 'static,
) -> AnalyticSurface {
    let boxed: JetFn = Box::new(move |a, b, _| Ok(f(a, b)));
    FnSurface::new(
        Interval { lo: u.0, hi: u.1 },
        Interval { lo: v.0, hi: v.1 },
        Orientation::Forward,
        boxed,
    )
}

/// Sphere of radius `r` centred at the origin: S(u, v) = r (sin v cos u, sin v sin u, cos v),
/// u = longitude in [0, 2π], v = colatitude in [0, π]. Su × Sv points inward, so with the
/// default orientation every normal curvature is +1/r.
pub fn sphere(r: f64) -> AnalyticSurface {
    make((0.0, TAU), (0.0, PI), move |u, v| {
        let (su, cu) = u.sin_cos();
        let (sv, cv) = v.sin_cos();
        SurfaceJet {
            p: Vec3::new(r * sv * cu, r * sv * su, r * cv),
            su: Vec3::new(-r * sv * su, r * sv * cu, 0.0),
            sv: Vec3::new(r * cv * cu, r * cv * su, -r * sv),
            suu: Vec3::new(-r * sv * cu, -r * sv * su, 0.0),
            suv: Vec3::new(-r * cv * su, r * cv * cu, 0.0),
            svv: Vec3::new(-r * sv * cu, -r * sv * su, -r * cv),
        }
    })
}

/// Circular cylinder of radius `r` about the z axis: S(u, v) = (r cos u, r sin u, v),
/// u in [0, 2π], v in [`v0`, `v1`]. Su × Sv points outward, so the circumferential normal
/// curvature is −1/r with the default orientation.
pub fn cylinder(r: f64, v0: f64, v1: f64) -> AnalyticSurface {
    make((0.0, TAU), (v0, v1), move |u, v| {
        let (s, c) = u.sin_cos();
        SurfaceJet {
            p: Vec3::new(r * c, r * s, v),
            su: Vec3::new(-r * s, r * c, 0.0),
            sv: Vec3::new(0.0, 0.0, 1.0),
            suu: Vec3::new(-r * c, -r * s, 0.0),
            suv: Vec3::zeros(),
            svv: Vec3::zeros(),
        }
    })
}

/// Torus with major radius `big_r` and minor radius `r` about the z axis:
/// S(u, v) = ((R + r cos v) cos u, (R + r cos v) sin u, r sin v), u, v in [0, 2π].
/// Su × Sv points outward (away from the tube's core circle).
pub fn torus(big_r: f64, r: f64) -> AnalyticSurface {
    make((0.0, TAU), (0.0, TAU), move |u, v| {
        let (su, cu) = u.sin_cos();
        let (sv, cv) = v.sin_cos();
        let w = big_r + r * cv;
        SurfaceJet {
            p: Vec3::new(w * cu, w * su, r * sv),
            su: Vec3::new(-w * su, w * cu, 0.0),
            sv: Vec3::new(-r * sv * cu, -r * sv * su, r * cv),
            suu: Vec3::new(-w * cu, -w * su, 0.0),
            suv: Vec3::new(r * sv * su, -r * sv * cu, 0.0),
            svv: Vec3::new(-r * cv * cu, -r * cv * su, -r * sv),
        }
    })
}

/// A Monge patch z = f(x, y) over [x0, x1] × [y0, y1]: S(u, v) = (u, v, f(u, v)); `f` returns
/// (f, fx, fy, fxx, fxy, fyy). Su × Sv = (−fx, −fy, 1) points up.
pub fn monge(
    x: (f64, f64),
    y: (f64, f64),
    f: impl Fn(f64, f64) -> [f64; 6] + Send + Sync + 'static,
) -> AnalyticSurface {
    make(x, y, move |u, v| {
        let [z, zx, zy, zxx, zxy, zyy] = f(u, v);
        SurfaceJet {
            p: Vec3::new(u, v, z),
            su: Vec3::new(1.0, 0.0, zx),
            sv: Vec3::new(0.0, 1.0, zy),
            suu: Vec3::new(0.0, 0.0, zxx),
            suv: Vec3::new(0.0, 0.0, zxy),
            svv: Vec3::new(0.0, 0.0, zyy),
        }
    })
}

/// The plane z = 0 over [x0, x1] × [y0, y1] (normal +z).
pub fn plane(x: (f64, f64), y: (f64, f64)) -> AnalyticSurface {
    monge(x, y, |_, _| [0.0; 6])
}

/// The hyperbolic paraboloid z = x y over [x0, x1] × [y0, y1] (normal up). At the origin
/// k1 = 1, k2 = −1, K = −1; the x and y axes are asymptotic lines.
pub fn saddle(x: (f64, f64), y: (f64, f64)) -> AnalyticSurface {
    monge(x, y, |u, v| [u * v, v, u, 0.0, 1.0, 0.0])
}
