//! The one error type of the crate. Every failure names what was wrong (which input, which
//! index, which value); the C ABI maps each variant to a stable status number.

use crate::numfmt::{Exact, Num};
use std::fmt;

/// Which input held a value that was not finite (NaN or infinite).
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum NonFiniteSource {
    /// A surface jet (point or partial derivative) produced by the surface.
    SurfaceJet,
    /// A curve jet ((u, v) or their derivatives) produced by the curve.
    CurveJet,
    /// A parameter passed in by the caller.
    Parameter,
    /// A quantity computed from finite inputs that overflowed (e.g. a curvature of 1e300).
    Result,
    /// A coordinate of an input point (a point to interpolate or to project).
    InputPoint,
}

impl fmt::Display for NonFiniteSource {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        f.write_str(match self {
            NonFiniteSource::SurfaceJet => "surface jet",
            NonFiniteSource::CurveJet => "curve jet",
            NonFiniteSource::Parameter => "parameter",
            NonFiniteSource::Result => "computed result",
            NonFiniteSource::InputPoint => "input point",
        })
    }
}

/// Everything that can go wrong in strake. `Display` gives the detailed message that the C ABI
/// hands to the host.
#[derive(Debug, Clone, PartialEq)]
pub enum StrakeError {
    /// An argument is invalid (e.g. a count of zero, an empty array, mismatched lengths).
    InvalidArgument(String),
    /// A value that must be finite is NaN or infinite.
    NonFinite {
        /// Where the value came from.
        source: NonFiniteSource,
        /// Which component (e.g. `"Suv.y"` or `"t"`).
        what: &'static str,
        /// The offending value.
        value: f64,
    },
    /// The knot vector is invalid: decreasing, non-finite, wrong length, or a zero-length domain.
    InvalidKnots(String),
    /// A weight is not positive and finite.
    InvalidWeight {
        /// Index of the weight in the caller's array.
        index: usize,
        /// The offending value.
        value: f64,
    },
    /// A control point coordinate is not finite.
    InvalidControlPoint {
        /// Index of the control point in the caller's array.
        index: usize,
        /// The offending value.
        value: f64,
    },
    /// Degree, control-point count and knot count do not fit together.
    InvalidDegree(String),
    /// A parameter lies outside the domain of the surface or curve (no silent clamping).
    OutOfDomain {
        /// Name of the parameter (`"u"`, `"v"` or `"t"`).
        name: &'static str,
        /// The offending value.
        value: f64,
        /// Lower end of the domain.
        lo: f64,
        /// Upper end of the domain.
        hi: f64,
    },
    /// The surface is degenerate at this point: `|Su × Sv|` vanishes relative to the scale of
    /// `Su` and `Sv` (a pole, a collapsed edge, a fold). The normal is not defined.
    DegenerateSurface {
        /// Surface parameter u.
        u: f64,
        /// Surface parameter v.
        v: f64,
        /// The conditioning figure that fell below the threshold (see [`crate::geometry::frame`]).
        conditioning: f64,
    },
    /// The curve stalls at this parameter: its velocity vanishes relative to its scale, so
    /// the tangent is not defined.
    StalledCurve {
        /// Curve parameter t.
        t: f64,
        /// The speed figure that fell below the threshold (see [`crate::geometry::frame`]).
        speed_figure: f64,
    },
    /// An input point of a batch (points to interpolate, points to project) was refused;
    /// `error` says why (e.g. `NonFinite` for a coordinate, `InvalidArgument` for a point that
    /// repeats its predecessor, `TooFarFromSurface`, `NotConverged`). The C ABI takes the status
    /// from `error`.
    AtPoint {
        /// Index of the point in the caller's array.
        index: usize,
        /// What is wrong with it.
        error: Box<StrakeError>,
    },
    /// Point inversion found a foot point, but the given point is farther from the surface than
    /// the host's tolerance allows.
    TooFarFromSurface {
        /// Distance |S(u, v) − P| from the point to its foot point (host length unit).
        distance: f64,
        /// The host's tolerance.
        tolerance: f64,
        /// Surface parameter u of the foot point.
        u: f64,
        /// Surface parameter v of the foot point.
        v: f64,
    },
    /// An iteration (Newton's method in point inversion, the search for a sample spacing) did
    /// not meet its convergence tests within its iteration cap.
    NotConverged {
        /// What did not converge and how far it got.
        what: String,
        /// Iterations spent.
        iterations: usize,
    },
    /// A cutter does not fit the surface's concave curvature across a path: its radius (across
    /// the path) reaches the radius of curvature, so no step-over leaves a bounded scallop and
    /// the cutter gouges there.
    CutterTooLarge {
        /// The cutter's radius across the path (host length unit).
        radius: f64,
        /// The concave radius of curvature across the path, 1/κ (host length unit).
        curvature_radius: f64,
        /// Surface parameter u of the point.
        u: f64,
        /// Surface parameter v of the point.
        v: f64,
    },
    /// A plan of passes needs more passes than its cap allows (a closed surface, or a step-over
    /// too small for the surface).
    PassLimit {
        /// The number of passes reached.
        passes: usize,
        /// The cap.
        limit: usize,
    },
    /// A host callback returned a non-zero code.
    Callback {
        /// Which callback (`"surface"` or `"curve"`).
        which: &'static str,
        /// The host's own code, passed back unchanged.
        code: i32,
        /// The text the callback handed back before failing (`strake_callback_report`, e.g.
        /// the `what()` of a C++ exception), if any.
        message: Option<String>,
    },
    /// A check over a whole path failed at one sample; `error` says why. The C ABI takes the
    /// status from `error`.
    AtSample {
        /// Index of the sample in the caller's array.
        index: usize,
        /// What is wrong there.
        error: Box<StrakeError>,
    },
    /// A geodesic trace could not go on: its error estimate stayed above the tolerance while
    /// the step shrank to its floor, or it used up its step cap. Never a silent wrong curve.
    GeodesicIncomplete {
        /// What stopped it and the figures that did.
        what: String,
        /// Arc length reached (host length unit).
        arc_length: f64,
        /// Surface parameter u reached.
        u: f64,
        /// Surface parameter v reached.
        v: f64,
    },
    /// No geodesic between two points was found (shooting did not converge, or converged to
    /// a geodesic that cannot be the shortest one).
    GeodesicNotFound {
        /// What was reached: the residual, the length, the iteration.
        what: String,
    },
    /// A construction on the surface leaves the surface at once: a geodesic that starts on
    /// the boundary heading out, or an offset of which no part stays on the surface.
    LeavesSurface {
        /// What left, from where, and with which value.
        what: String,
    },
    /// A surface or curve does not provide the derivative order a computation needs (a host
    /// callback that gives second order where a rate of change needs third).
    OrderUnavailable {
        /// Which source (`"surface"` or `"curve"`).
        which: &'static str,
        /// The order the computation needs.
        needed: usize,
        /// The highest order the source provides.
        available: usize,
    },
    /// The tool-centre path folds back on itself: its speed relative to the contact path,
    /// d s_centre / d s, is zero or reversed (a ball-end mill larger than a concave radius of
    /// curvature along the path); its tangent and curvature are not defined there.
    CentrePathFolds {
        /// Index of the first such sample.
        index: usize,
        /// Its curve parameter.
        t: f64,
        /// The component of d(centre)/ds along the contact path's tangent (≤ 0 or tiny).
        speed_along: f64,
        /// How many samples of the call fold.
        count: usize,
    },
}

impl fmt::Display for StrakeError {
    fn fmt(&self, f: &mut fmt::Formatter<'_>) -> fmt::Result {
        match self {
            StrakeError::InvalidArgument(m) => write!(f, "invalid argument: {m}"),
            StrakeError::NonFinite {
                source,
                what,
                value,
            } => {
                write!(
                    f,
                    "non-finite value in {source}: {what} = {}",
                    Exact(*value)
                )
            }
            StrakeError::InvalidKnots(m) => write!(f, "invalid knot vector: {m}"),
            StrakeError::InvalidWeight { index, value } => write!(
                f,
                "invalid weight: weight[{index}] = {}; weights must be positive and finite",
                Exact(*value)
            ),
            StrakeError::InvalidControlPoint { index, value } => write!(
                f,
                "invalid control point: control point {index} has non-finite coordinate {}",
                Exact(*value)
            ),
            StrakeError::InvalidDegree(m) => write!(f, "invalid degree: {m}"),
            StrakeError::OutOfDomain {
                name,
                value,
                lo,
                hi,
            } => write!(
                f,
                "parameter out of domain: {name} = {} is outside [{}, {}]",
                Exact(*value),
                Exact(*lo),
                Exact(*hi)
            ),
            StrakeError::DegenerateSurface { u, v, conditioning } => write!(
                f,
                "degenerate surface point at (u, v) = ({}, {}): |Su x Sv| vanishes relative \
                 to the reference speeds of Su and Sv over the patch (conditioning {}); the \
                 normal is undefined",
                Exact(*u),
                Exact(*v),
                Num(*conditioning)
            ),
            StrakeError::StalledCurve { t, speed_figure } => write!(
                f,
                "stalled curve at t = {}: the parameter-plane velocity (u', v') vanishes \
                 relative to the curve's scale (speed figure {}); the tangent is undefined",
                Exact(*t),
                Num(*speed_figure)
            ),
            StrakeError::AtPoint { index, error } => write!(f, "point {index}: {error}"),
            StrakeError::TooFarFromSurface {
                distance,
                tolerance,
                u,
                v,
            } => write!(
                f,
                "too far from the surface: the nearest surface point found, at (u, v) = \
                 ({}, {}), is {} away, above the tolerance {}",
                Exact(*u),
                Exact(*v),
                Num(*distance),
                Num(*tolerance)
            ),
            StrakeError::NotConverged { what, iterations } => {
                write!(f, "not converged after {iterations} iterations: {what}")
            }
            StrakeError::CutterTooLarge {
                radius,
                curvature_radius,
                u,
                v,
            } => write!(
                f,
                "cutter too large: radius across the path {} reaches the concave radius \
                 of curvature {} at (u, v) = ({}, {}); the cutter gouges there",
                Num(*radius),
                Num(*curvature_radius),
                Exact(*u),
                Exact(*v)
            ),
            StrakeError::PassLimit { passes, limit } => write!(
                f,
                "pass limit: {passes} passes would be needed, above the cap max_passes = \
                 {limit}; the surface is closed or the step-over too small for it"
            ),
            StrakeError::Callback {
                which,
                code,
                message,
            } => {
                write!(f, "host {which} callback failed with code {code}")?;
                match message {
                    Some(m) => write!(f, ": {m}"),
                    None => Ok(()),
                }
            }
            StrakeError::AtSample { index, error } => write!(f, "sample {index}: {error}"),
            StrakeError::GeodesicIncomplete {
                what,
                arc_length,
                u,
                v,
            } => write!(
                f,
                "geodesic trace incomplete at arc length {}, (u, v) = ({}, {}): {what}",
                Num(*arc_length),
                Exact(*u),
                Exact(*v)
            ),
            StrakeError::GeodesicNotFound { what } => write!(f, "no geodesic found: {what}"),
            StrakeError::LeavesSurface { what } => write!(f, "leaves the surface: {what}"),
            StrakeError::OrderUnavailable {
                which,
                needed,
                available,
            } => write!(
                f,
                "derivative order unavailable: this call needs the {which}'s derivatives to \
                 order {needed}, the {which} provides order {available} at most"
            ),
            StrakeError::CentrePathFolds {
                index,
                t,
                speed_along,
                count,
            } => write!(
                f,
                "the tool-centre path folds back at sample {index} (t = {t}): d(centre)/ds \
                 along the contact tangent is {speed_along} (the cutter is larger than a \
                 concave radius there); {count} sample(s) of the call fold",
                speed_along = crate::numfmt::Num(*speed_along)
            ),
        }
    }
}

impl std::error::Error for StrakeError {}

/// Shorthand for results of this crate.
pub type Result<T> = std::result::Result<T, StrakeError>;
