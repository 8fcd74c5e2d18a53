//! The demo's mould cavity (`examples/c/mould_cavity.c`, an invented scenario) in Rust: the
//! same bicubic B-spline patch over [0, 1]² (x = 160 u, y = 100 v, mm), evaluated natively but
//! behind a closure, as the demo's host callback is (no knot lines declared), and the host's
//! pass under the S-shaped drive curve y = 50 + 22 sin(2π (x − 4)/152), x from 4 to 156 mm.

#![allow(dead_code)]

use strake::{
    DerivOrder, FnSurface, Interval, NurbsCurve, NurbsSurface, NurbsSurfaceData, Orientation,
    Parametrization, SurfaceHint, SurfaceJet, SurfaceSource, interpolate,
};

const KNOTS_U: [f64; 15] = [
    0.0, 0.0, 0.0, 0.0, 0.025, 0.07, 0.22, 0.5, 0.78, 0.93, 0.975, 1.0, 1.0, 1.0, 1.0,
];
const KNOTS_V: [f64; 13] = [
    0.0, 0.0, 0.0, 0.0, 0.06, 0.2, 0.5, 0.8, 0.94, 1.0, 1.0, 1.0, 1.0,
];
const DEPTH: [[f64; 9]; 11] = [
    [0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0],
    [0.0, -5.0, -6.0, -6.0, -6.0, -6.0, -6.0, -5.0, 0.0],
    [0.0, -6.0, -11.0, -11.5, -11.5, -11.5, -11.0, -6.0, 0.0],
    [0.0, -6.0, -11.5, -13.0, -13.0, -13.0, -11.5, -6.0, 0.0],
    [0.0, -6.0, -11.5, -13.0, -12.0, -12.5, -11.5, -6.0, 0.0],
    [0.0, -6.0, -11.5, -11.0, -7.5, -11.0, -11.5, -6.0, 0.0],
    [0.0, -6.0, -11.5, -13.5, -13.0, -14.0, -12.0, -6.0, 0.0],
    [0.0, -6.0, -12.0, -14.5, -15.0, -14.5, -12.0, -6.0, 0.0],
    [0.0, -6.0, -11.5, -12.0, -12.0, -12.0, -11.5, -6.0, 0.0],
    [0.0, -5.0, -6.0, -6.0, -6.0, -6.0, -6.0, -5.0, 0.0],
    [0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0],
];

fn greville(k: &[f64], i: usize) -> f64 {
    (k[i + 1] + k[i + 2] + k[i + 3]) / 3.0
}

/// The cavity as a native NURBS surface (declares its knot lines).
pub fn cavity_nurbs() -> NurbsSurface {
    let mut pts = Vec::new();
    for (i, row) in DEPTH.iter().enumerate() {
        for (j, z) in row.iter().enumerate() {
            pts.push([
                160.0 * greville(&KNOTS_U, i),
                100.0 * greville(&KNOTS_V, j),
                *z,
            ]);
        }
    }
    NurbsSurface::new(&NurbsSurfaceData {
        degree_u: 3,
        degree_v: 3,
        count_u: 11,
        count_v: 9,
        knots_u: &KNOTS_U,
        knots_v: &KNOTS_V,
        points: &pts,
        weights: None,
    })
    .unwrap()
}

/// The type of [`cavity`].
pub type Cavity =
    FnSurface<Box<dyn Fn(f64, f64, DerivOrder) -> strake::Result<SurfaceJet> + Send + Sync>>;

/// The cavity as the demo's host hands it over: a callback, no knot lines declared.
pub fn cavity() -> Cavity {
    let s = cavity_nurbs();
    let d = Interval::new("u", 0.0, 1.0).unwrap();
    FnSurface::new(
        d,
        d,
        Orientation::Forward,
        Box::new(move |u, v, o| s.jet_in_domain(u, v, o, &mut SurfaceHint::default())),
    )
}

/// The host's pass: 41 points under the drive curve, interpolated in (u, v) by a cubic
/// (chord length), as the demo's pass (the demo projects the same points; x = 160 u and
/// y = 100 v exactly, so the feet are these (u, v)).
pub fn host_pass() -> NurbsCurve<2> {
    let uv: Vec<[f64; 2]> = (0..41)
        .map(|i| {
            let x = 4.0 + 152.0 * i as f64 / 40.0;
            let y = 50.0 + 22.0 * (2.0 * std::f64::consts::PI * (x - 4.0) / 152.0).sin();
            [x / 160.0, y / 100.0]
        })
        .collect();
    interpolate(&uv, 3, Parametrization::ChordLength, None).unwrap()
}
