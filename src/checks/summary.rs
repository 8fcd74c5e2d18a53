//! Path summaries: the extreme values of a per-sample quantity and where they occur, and every
//! interval along the path where it exceeds a limit, so that the host can refine or re-plan
//! just those parts.
//!
//! Crossings of the limit between two samples are placed by linear interpolation of the
//! quantity in arc length (and in t); their accuracy is that of the sampling. A quantity that
//! must stay above a limit (e.g. a radius) is checked by passing its negation or its inverse
//! (e.g. a curvature against the inverse of the smallest radius).

use crate::error::{Result, StrakeError};
use crate::paths::curve_on_surface::PathSample;

/// Where a sample lies along a path: what the summaries need of it. Implemented by
/// [`PathSample`] (and by the C ABI's sample struct).
pub trait PathPosition {
    /// Curve parameter t.
    fn t(&self) -> f64;
    /// Arc length from the start of the path (host length unit).
    fn arc_length(&self) -> f64;
}

impl PathPosition for PathSample {
    #[inline]
    fn t(&self) -> f64 {
        self.t
    }
    #[inline]
    fn arc_length(&self) -> f64 {
        self.arc_length
    }
}

/// Where a quantity is smallest and largest along a path.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Extremes {
    /// Smallest value.
    pub min: f64,
    /// Index of the sample where it occurs (the first, on ties).
    pub min_index: usize,
    /// Arc length there.
    pub min_arc_length: f64,
    /// Curve parameter there.
    pub min_t: f64,
    /// Largest value.
    pub max: f64,
    /// Index of the sample where it occurs (the first, on ties).
    pub max_index: usize,
    /// Arc length there.
    pub max_arc_length: f64,
    /// Curve parameter there.
    pub max_t: f64,
}

/// An interval along the path where a quantity exceeds its limit.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Violation {
    /// Arc length where the violation starts (interpolated crossing, or the first sample).
    pub start_arc_length: f64,
    /// Arc length where it ends (interpolated crossing, or the last sample).
    pub end_arc_length: f64,
    /// Curve parameter where it starts.
    pub start_t: f64,
    /// Curve parameter where it ends.
    pub end_t: f64,
    /// First violating sample.
    pub first_index: usize,
    /// Last violating sample.
    pub last_index: usize,
    /// Largest value inside the interval.
    pub worst: f64,
}

fn check_lengths<P: PathPosition>(samples: &[P], values: &[f64]) -> Result<()> {
    if samples.is_empty() || samples.len() != values.len() {
        return Err(StrakeError::InvalidArgument(format!(
            "{} samples and {} values: need the same, non-zero count",
            samples.len(),
            values.len()
        )));
    }
    if let Some(i) = values.iter().position(|v| v.is_nan()) {
        return Err(StrakeError::InvalidArgument(format!("value[{i}] is NaN")));
    }
    for (i, p) in samples.iter().enumerate() {
        for (what, x) in [("t", p.t()), ("arc length", p.arc_length())] {
            if !x.is_finite() {
                return Err(StrakeError::InvalidArgument(format!(
                    "sample[{i}] has {what} = {}; it must be finite",
                    crate::numfmt::Exact(x)
                )));
            }
        }
    }
    Ok(())
}

/// The extremes of `values[i]` (the quantity at `samples[i]`). Values may be infinite (e.g. a
/// steering radius along a geodesic). Errors: `InvalidArgument` for empty or mismatched
/// arrays, a NaN value, or a sample whose t or arc length is not finite (naming its index).
pub fn extremes<P: PathPosition>(samples: &[P], values: &[f64]) -> Result<Extremes> {
    check_lengths(samples, values)?;
    let (mut lo, mut hi) = (0, 0);
    for (i, &v) in values.iter().enumerate() {
        if v < values[lo] {
            lo = i;
        }
        if v > values[hi] {
            hi = i;
        }
    }
    Ok(Extremes {
        min: values[lo],
        min_index: lo,
        min_arc_length: samples[lo].arc_length(),
        min_t: samples[lo].t(),
        max: values[hi],
        max_index: hi,
        max_arc_length: samples[hi].arc_length(),
        max_t: samples[hi].t(),
    })
}

/// The point a fraction `f` in [0, 1] of the way from `a` to `b`, without overflow for any
/// finite ends: (1 − f) a + f b never exceeds the larger end in magnitude (where b − a would
/// overflow for ends of opposite sign near ±DBL_MAX), kept between the ends against rounding.
fn lerp(a: f64, b: f64, f: f64) -> f64 {
    ((1.0 - f) * a + f * b).clamp(a.min(b), a.max(b))
}

/// Where the crossing of `limit` lies between samples a and b, as (arc length, t). The
/// fraction is computed on halved values when the differences overflow (values near
/// ±DBL_MAX), which changes nothing else: halving is exact there.
fn crossing<P: PathPosition>(a: &P, va: f64, b: &P, vb: f64, limit: f64) -> (f64, f64) {
    let f = if (vb - va).is_finite() && (limit - va).is_finite() {
        (limit - va) / (vb - va)
    } else {
        (0.5 * limit - 0.5 * va) / (0.5 * vb - 0.5 * va)
    };
    if !f.is_finite() {
        return (b.arc_length(), b.t());
    }
    let f = f.clamp(0.0, 1.0);
    (
        lerp(a.arc_length(), b.arc_length(), f),
        lerp(a.t(), b.t(), f),
    )
}

/// Every maximal run of samples with `values[i] > limit`, with interpolated ends, appended to
/// `out` in path order. Errors as for [`extremes`], and for a NaN limit.
pub fn violations<P: PathPosition>(
    samples: &[P],
    values: &[f64],
    limit: f64,
    out: &mut Vec<Violation>,
) -> Result<()> {
    check_lengths(samples, values)?;
    if limit.is_nan() {
        return Err(StrakeError::InvalidArgument("limit is NaN".into()));
    }
    let mut i = 0;
    let n = values.len();
    while i < n {
        if values[i] <= limit {
            i += 1;
            continue;
        }
        let first = i;
        let mut worst = values[i];
        while i + 1 < n && values[i + 1] > limit {
            i += 1;
            worst = worst.max(values[i]);
        }
        let last = i;
        let (s0, t0) = if first == 0 {
            (samples[0].arc_length(), samples[0].t())
        } else {
            crossing(
                &samples[first - 1],
                values[first - 1],
                &samples[first],
                values[first],
                limit,
            )
        };
        let (s1, t1) = if last + 1 == n {
            (samples[last].arc_length(), samples[last].t())
        } else {
            crossing(
                &samples[last],
                values[last],
                &samples[last + 1],
                values[last + 1],
                limit,
            )
        };
        out.push(Violation {
            start_arc_length: s0,
            end_arc_length: s1,
            start_t: t0,
            end_t: t1,
            first_index: first,
            last_index: last,
            worst,
        });
        i += 1;
    }
    Ok(())
}

#[cfg(test)]
mod tests {
    use super::*;

    struct At(f64, f64);
    impl PathPosition for At {
        fn t(&self) -> f64 {
            self.0
        }
        fn arc_length(&self) -> f64 {
            self.1
        }
    }

    fn one(samples: &[At], values: &[f64], limit: f64) -> Violation {
        let mut out = Vec::new();
        violations(samples, values, limit, &mut out).unwrap();
        assert_eq!(out.len(), 1, "{out:?}");
        out[0]
    }

    // Regression (issue 16, item 6): ends of a violation between samples at ±1.7e308 were
    // infinite (b − a overflowed). Exact expected values: the crossings lie half-way, and
    // half-way between −M and M is 0, between 0 and M is M/2 (all exact in binary).
    #[test]
    fn violation_ends_at_extreme_arc_lengths_and_values_are_finite_and_exact() {
        let m = 1.7e308;
        let v = one(&[At(-m, -m), At(0.0, 0.0), At(m, m)], &[0.0, 2.0, 0.0], 1.0);
        assert_eq!((v.start_arc_length, v.end_arc_length), (-0.5 * m, 0.5 * m));
        assert_eq!((v.start_t, v.end_t), (-0.5 * m, 0.5 * m));
        let v = one(&[At(-m, -m), At(m, m)], &[0.0, 2.0], 1.0);
        assert_eq!((v.start_arc_length, v.start_t), (0.0, 0.0));
        // Values at ±1.7e308: (limit − va)/(vb − va) overflowed to inf/inf.
        let v = one(
            &[At(0.0, 0.0), At(1.0, 1.0), At(2.0, 2.0)],
            &[-m, m, -m],
            0.0,
        );
        assert_eq!((v.start_arc_length, v.end_arc_length), (0.5, 1.5));
        assert_eq!(v.worst, m);
        // Ordinary values are unchanged: a quarter of the way.
        let v = one(&[At(0.0, 0.0), At(4.0, 8.0)], &[0.0, 4.0], 1.0);
        assert_eq!((v.start_t, v.start_arc_length), (1.0, 2.0));
    }
}
