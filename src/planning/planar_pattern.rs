//! Planar patterns to lay on a surface by [`super::drive_pattern::project_along`]: parallel
//! lines across a rectangle and an Archimedean spiral, as curves whose (u, v) are read as the
//! drive plane's (x, y). Any other [`UvCurve`] (a host's own 2D curve) serves as well.

use crate::curve::{UvCurve, uv_line};
use crate::error::{Result, StrakeError};
use crate::geometry::jet::{CurveJet, Interval};
use crate::nurbs::{NurbsCurve, SpanHint};

fn finite(name: &str, x: f64) -> Result<f64> {
    if x.is_finite() {
        Ok(x)
    } else {
        Err(StrakeError::InvalidArgument(format!(
            "{name} = {x}: it must be finite",
            x = crate::numfmt::Exact(x)
        )))
    }
}

/// Most lines [`parallel_lines`] makes.
pub const MAX_LINES: usize = 100_000;

/// Parallel lines across the rectangle [x0, x1] × [y0, y1] of the plane, at angle `angle`
/// (radians, from the x axis toward y), `spacing` apart (measured across the lines), the first
/// through the corner where the offset across the lines is smallest (plus half the rest, so
/// the lines are centred); each clipped to the rectangle, as a degree-1 curve on t in [0, 1].
/// With `zigzag` every second line runs the other way (back and forth), else all run along
/// (cos angle, sin angle). Lines that touch the rectangle in a single point are left out.
///
/// Errors (`InvalidArgument`, naming the value): a non-finite or empty range, a spacing that
/// is not positive and finite, a non-finite angle, more than [`MAX_LINES`] lines.
pub fn parallel_lines(
    x: (f64, f64),
    y: (f64, f64),
    spacing: f64,
    angle: f64,
    zigzag: bool,
) -> Result<Vec<NurbsCurve<2>>> {
    let xr = Interval::new("pattern x", x.0, x.1)?;
    let yr = Interval::new("pattern y", y.0, y.1)?;
    if !(spacing.is_finite() && spacing > 0.0) {
        return Err(StrakeError::InvalidArgument(format!(
            "line spacing = {spacing}: it must be positive and finite",
            spacing = crate::numfmt::Exact(spacing)
        )));
    }
    let angle = finite("line angle", angle)?;
    let (c, s) = (angle.cos(), angle.sin());
    // Offset across the lines: o = −s x + c y; along: a = c x + s y.
    let corners = [
        (xr.lo, yr.lo),
        (xr.hi, yr.lo),
        (xr.hi, yr.hi),
        (xr.lo, yr.hi),
    ];
    let across: Vec<f64> = corners.iter().map(|&(px, py)| -s * px + c * py).collect();
    let (olo, ohi) = across
        .iter()
        .fold((f64::INFINITY, f64::NEG_INFINITY), |(a, b), &o| {
            (a.min(o), b.max(o))
        });
    let count = ((ohi - olo) / spacing).floor();
    if count.is_nan() || count >= MAX_LINES as f64 {
        return Err(StrakeError::InvalidArgument(format!(
            "line spacing = {} gives more than {MAX_LINES} lines across the rectangle",
            crate::numfmt::Exact(spacing)
        )));
    }
    let count = count as usize + 1;
    let first = olo + 0.5 * ((ohi - olo) - (count - 1) as f64 * spacing);
    let mut lines = Vec::with_capacity(count);
    for k in 0..count {
        let o = first + k as f64 * spacing;
        // Clip the line {−s x + c y = o} to the rectangle: parameter a along (c, s) from the
        // foot point (−s o, c o).
        let (fx, fy) = (-s * o, c * o);
        let (mut a0, mut a1) = (f64::NEG_INFINITY, f64::INFINITY);
        for (f, dir, lo, hi) in [(fx, c, xr.lo, xr.hi), (fy, s, yr.lo, yr.hi)] {
            if dir.abs() < 1e-15 {
                if f < lo || f > hi {
                    a0 = f64::INFINITY;
                }
                continue;
            }
            let (t0, t1) = ((lo - f) / dir, (hi - f) / dir);
            a0 = a0.max(t0.min(t1));
            a1 = a1.min(t0.max(t1));
        }
        if a0.is_nan() || a1.is_nan() || a1 <= a0 + 1e-12 * spacing {
            continue;
        }
        let (p0, p1) = ([fx + c * a0, fy + s * a0], [fx + c * a1, fy + s * a1]);
        let (p0, p1) = if zigzag && lines.len() % 2 == 1 {
            (p1, p0)
        } else {
            (p0, p1)
        };
        lines.push(uv_line(p0[0], p0[1], p1[0], p1[1])?);
    }
    Ok(lines)
}

/// An Archimedean spiral in the plane: r(θ) = r_start + (pitch / 2π) θ about a centre, θ in
/// [0, Θ] with Θ = 2π (r_end − r_start) / pitch: the radius grows by `pitch` per turn (turning
/// counter-clockwise, from x toward y). Evaluated exactly: with c = cos θ, s = sin θ and
/// b = pitch / 2π, x = cx + r c, x' = b c − r s, x'' = −2 b s − r c (and y alike), t = θ.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct ArchimedeanSpiral {
    centre: [f64; 2],
    r_start: f64,
    b: f64,
    domain: Interval,
}

impl ArchimedeanSpiral {
    /// The spiral from radius `r_start` (≥ 0) out to `r_end` (> r_start), `pitch` (> 0) apart.
    ///
    /// Errors (`InvalidArgument`, naming the value): non-finite values, r_start < 0,
    /// r_end ≤ r_start, pitch not positive, more than 1e6 turns.
    pub fn new(centre: [f64; 2], r_start: f64, r_end: f64, pitch: f64) -> Result<Self> {
        finite("spiral centre x", centre[0])?;
        finite("spiral centre y", centre[1])?;
        finite("spiral r_start", r_start)?;
        finite("spiral r_end", r_end)?;
        if r_start < 0.0 || r_end <= r_start {
            return Err(StrakeError::InvalidArgument(format!(
                "spiral radii r_start = {r_start}, r_end = {r_end}: they must satisfy \
                 0 <= r_start < r_end",
                r_start = crate::numfmt::Exact(r_start),
                r_end = crate::numfmt::Exact(r_end)
            )));
        }
        if !(pitch.is_finite() && pitch > 0.0) {
            return Err(StrakeError::InvalidArgument(format!(
                "spiral pitch = {}: it must be positive and finite",
                crate::numfmt::Exact(pitch)
            )));
        }
        let turns = (r_end - r_start) / pitch;
        if turns.is_nan() || turns > 1e6 {
            return Err(StrakeError::InvalidArgument(format!(
                "spiral radii r_start = {} to r_end = {} at pitch = {}: {} turns, above the \
                 cap of 1e+06",
                crate::numfmt::Exact(r_start),
                crate::numfmt::Exact(r_end),
                crate::numfmt::Exact(pitch),
                crate::numfmt::Num(turns)
            )));
        }
        let b = pitch / std::f64::consts::TAU;
        Ok(ArchimedeanSpiral {
            centre,
            r_start,
            b,
            domain: Interval::new("spiral angle", 0.0, (r_end - r_start) / b)?,
        })
    }
}

impl UvCurve for ArchimedeanSpiral {
    fn domain(&self) -> Interval {
        self.domain
    }
    fn jet_in_domain(&self, t: f64, _hint: &mut SpanHint) -> Result<CurveJet> {
        let (s, c) = t.sin_cos();
        let r = self.r_start + self.b * t;
        Ok(CurveJet {
            u: self.centre[0] + r * c,
            v: self.centre[1] + r * s,
            du: self.b * c - r * s,
            dv: self.b * s + r * c,
            ddu: -2.0 * self.b * s - r * c,
            ddv: 2.0 * self.b * c - r * s,
        })
    }
}
