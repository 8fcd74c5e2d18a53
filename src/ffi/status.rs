//! The status every C function returns, and the mapping from [`StrakeError`] to it.

use crate::error::StrakeError;

/// What a strake C function reports: `STRAKE_STATUS_OK` (0) on success, otherwise the kind of
/// failure. The details (which argument, index, value or sample) are in the thread-local
/// message, see `strake_last_error_message`.
///
/// ABI policy: every value keeps its number for the life of the library. Values are grouped by
/// area (1-9 arguments, 10-19 NURBS data, 20-29 evaluation, 30-39 host callbacks, 50-54
/// geodesics and offsets, 90-99 internal). New values take the next free number of their group; a retired value stays listed
/// here as a comment and its number is never given to anything else. Hosts should treat an
/// unknown non-zero value as a failure (a newer library may add values).
///
/// In C the type is a `uint32_t`; the values are the `STRAKE_STATUS_...` constants.
#[repr(u32)]
#[derive(Debug, Clone, Copy, PartialEq, Eq, Hash)]
pub enum StrakeStatus {
    /// 0: success; outputs were written.
    Ok = 0,
    /// 1: a pointer argument that must not be NULL was NULL (the message names it), or a
    /// pointer was not aligned for its type.
    NullPointer = 1,
    /// 2: an argument is invalid: a count of zero, a size that overflows, an empty or reversed
    /// parameter range, a flag other than 0 or 1, a weight count that differs from the point
    /// count.
    InvalidArgument = 2,
    /// 3: a value that must be finite is NaN or infinite: a parameter passed by the caller, or
    /// an entry of a jet filled by a host callback (the message names the entry, e.g. "Suv"
    /// or "ddv"), or a result that overflowed.
    NonFinite = 3,
    /// 4: the caller's buffer is too small for the result. The one failure that writes an
    /// output: the function's `*count` is set to the number of elements needed, and nothing
    /// is written to the buffer, so the caller can allocate that many and call again (the
    /// result is deterministic: the retry gives exactly what a large enough first call would
    /// have). Returned by the functions that fill a caller buffer (`buf`, `capacity`,
    /// `count`): sampling and violation intervals. (The message function reports its size
    /// through its return value instead.)
    BufferTooSmall = 4,
    /// 10: degree, control-point count and knot count do not fit together (degree 0, too few
    /// points, knot count other than points + degree + 1).
    InvalidDegree = 10,
    /// 11: a knot is not finite, knots decrease (the message names the index and value), a
    /// knot's multiplicity exceeds degree + 1, or the domain has zero length.
    InvalidKnots = 11,
    /// 12: a control point has a non-finite coordinate (the message names its index).
    InvalidControlPoint = 12,
    /// 13: a weight is not positive and finite (the message names its index and value).
    InvalidWeight = 13,
    /// 20: a parameter lies outside the domain of the curve (t) or the surface (u, v); strake
    /// never clamps silently.
    OutOfDomain = 20,
    /// 21: the surface is degenerate at the point: |Su x Sv| vanishes relative to |Su| and
    /// |Sv| (a pole, a collapsed edge); the normal is undefined there.
    DegenerateSurface = 21,
    /// 22: the curve stalls at the point: its parameter-plane velocity vanishes relative to
    /// the curve's scale; the tangent is undefined there.
    StalledCurve = 22,
    /// 23: a point given in space lies farther from the surface than the host's tolerance
    /// (the message names the point's index, the distance and the foot point's (u, v)).
    TooFarFromSurface = 23,
    /// 24: an iteration (point inversion, arc-length inversion) did not converge; the message
    /// names the point and what was left.
    NotConverged = 24,
    /// 30: the host's surface callback returned a non-zero code; the code is in the message
    /// and in `strake_last_callback_code`.
    SurfaceCallbackFailed = 30,
    /// 31: the host's curve callback returned a non-zero code; the code is in the message and
    /// in `strake_last_callback_code`.
    CurveCallbackFailed = 31,
    /// 32: the host's surface or curve does not provide the derivative order this call needs
    /// (rates of change of the invariants and the tool-centre path's curvature need third
    /// order, its rate of change fourth); the message names the source and both orders.
    OrderUnavailable = 32,
    /// 40: the tool-centre path folds back on itself at a sample (its speed relative to the
    /// contact path is zero or reversed: a cutter larger than a concave radius); the message
    /// names the first sample and how many fold. Nothing is written.
    CentrePathFolds = 40,
    /// 50: a geodesic trace could not go on: its error estimate stayed above the tolerance
    /// while the step shrank to its floor, or it used up its step cap (the message names the
    /// arc length and (u, v) reached).
    GeodesicIncomplete = 50,
    /// 51: no geodesic between the two points was found: shooting did not converge, or
    /// converged to a geodesic longer than the straight parameter line, which cannot be the
    /// shortest (the message names the residual and the length reached).
    GeodesicNotFound = 51,
    /// 52: the construction leaves the surface at once: a geodesic starting on the boundary
    /// heading out, or an offset of which no part lies on the surface (the message names the
    /// value).
    LeavesSurface = 52,
    /// 55: a cutter does not fit the surface's concave curvature across a pass (its radius
    /// across the path reaches the radius of curvature): no step-over bounds the scallop and
    /// the cutter gouges; the message names the radius, the radius of curvature and (u, v).
    CutterTooLarge = 55,
    /// 56: a plan of passes would need more passes than its cap (the surface is closed, or the
    /// step-over is too small for it); the message names the count and the cap.
    PassLimit = 56,
    /// 90: a bug in strake: a panic was caught at the C boundary. The message says where.
    /// Please report it; the handles passed in are still valid.
    InternalPanic = 90,
}

impl StrakeStatus {
    /// The status for an error of the Rust API. Exhaustive on purpose: a new error variant must
    /// be given its status here.
    pub fn of(error: &StrakeError) -> Self {
        match error {
            StrakeError::InvalidArgument(_) => StrakeStatus::InvalidArgument,
            StrakeError::NonFinite { .. } => StrakeStatus::NonFinite,
            StrakeError::InvalidKnots(_) => StrakeStatus::InvalidKnots,
            StrakeError::InvalidWeight { .. } => StrakeStatus::InvalidWeight,
            StrakeError::InvalidControlPoint { .. } => StrakeStatus::InvalidControlPoint,
            StrakeError::InvalidDegree(_) => StrakeStatus::InvalidDegree,
            StrakeError::OutOfDomain { .. } => StrakeStatus::OutOfDomain,
            StrakeError::DegenerateSurface { .. } => StrakeStatus::DegenerateSurface,
            StrakeError::StalledCurve { .. } => StrakeStatus::StalledCurve,
            StrakeError::TooFarFromSurface { .. } => StrakeStatus::TooFarFromSurface,
            StrakeError::NotConverged { .. } => StrakeStatus::NotConverged,
            StrakeError::AtPoint { error, .. } => StrakeStatus::of(error),
            StrakeError::CutterTooLarge { .. } => StrakeStatus::CutterTooLarge,
            StrakeError::PassLimit { .. } => StrakeStatus::PassLimit,
            StrakeError::Callback { which: "curve", .. } => StrakeStatus::CurveCallbackFailed,
            StrakeError::Callback { .. } => StrakeStatus::SurfaceCallbackFailed,
            StrakeError::AtSample { error, .. } => StrakeStatus::of(error),
            StrakeError::GeodesicIncomplete { .. } => StrakeStatus::GeodesicIncomplete,
            StrakeError::GeodesicNotFound { .. } => StrakeStatus::GeodesicNotFound,
            StrakeError::LeavesSurface { .. } => StrakeStatus::LeavesSurface,
            StrakeError::OrderUnavailable { .. } => StrakeStatus::OrderUnavailable,
            StrakeError::CentrePathFolds { .. } => StrakeStatus::CentrePathFolds,
        }
    }

    /// Every status, in numeric order.
    pub const ALL: [StrakeStatus; 24] = [
        StrakeStatus::Ok,
        StrakeStatus::NullPointer,
        StrakeStatus::InvalidArgument,
        StrakeStatus::NonFinite,
        StrakeStatus::BufferTooSmall,
        StrakeStatus::InvalidDegree,
        StrakeStatus::InvalidKnots,
        StrakeStatus::InvalidControlPoint,
        StrakeStatus::InvalidWeight,
        StrakeStatus::OutOfDomain,
        StrakeStatus::DegenerateSurface,
        StrakeStatus::StalledCurve,
        StrakeStatus::TooFarFromSurface,
        StrakeStatus::NotConverged,
        StrakeStatus::SurfaceCallbackFailed,
        StrakeStatus::CurveCallbackFailed,
        StrakeStatus::OrderUnavailable,
        StrakeStatus::CentrePathFolds,
        StrakeStatus::GeodesicIncomplete,
        StrakeStatus::GeodesicNotFound,
        StrakeStatus::LeavesSurface,
        StrakeStatus::CutterTooLarge,
        StrakeStatus::PassLimit,
        StrakeStatus::InternalPanic,
    ];

    /// The C name of the status (e.g. `"STRAKE_STATUS_OUT_OF_DOMAIN"`), NUL-terminated.
    pub fn c_name(self) -> &'static std::ffi::CStr {
        match self {
            StrakeStatus::Ok => c"STRAKE_STATUS_OK",
            StrakeStatus::NullPointer => c"STRAKE_STATUS_NULL_POINTER",
            StrakeStatus::InvalidArgument => c"STRAKE_STATUS_INVALID_ARGUMENT",
            StrakeStatus::NonFinite => c"STRAKE_STATUS_NON_FINITE",
            StrakeStatus::BufferTooSmall => c"STRAKE_STATUS_BUFFER_TOO_SMALL",
            StrakeStatus::InvalidDegree => c"STRAKE_STATUS_INVALID_DEGREE",
            StrakeStatus::InvalidKnots => c"STRAKE_STATUS_INVALID_KNOTS",
            StrakeStatus::InvalidControlPoint => c"STRAKE_STATUS_INVALID_CONTROL_POINT",
            StrakeStatus::InvalidWeight => c"STRAKE_STATUS_INVALID_WEIGHT",
            StrakeStatus::OutOfDomain => c"STRAKE_STATUS_OUT_OF_DOMAIN",
            StrakeStatus::DegenerateSurface => c"STRAKE_STATUS_DEGENERATE_SURFACE",
            StrakeStatus::StalledCurve => c"STRAKE_STATUS_STALLED_CURVE",
            StrakeStatus::TooFarFromSurface => c"STRAKE_STATUS_TOO_FAR_FROM_SURFACE",
            StrakeStatus::NotConverged => c"STRAKE_STATUS_NOT_CONVERGED",
            StrakeStatus::SurfaceCallbackFailed => c"STRAKE_STATUS_SURFACE_CALLBACK_FAILED",
            StrakeStatus::CurveCallbackFailed => c"STRAKE_STATUS_CURVE_CALLBACK_FAILED",
            StrakeStatus::GeodesicIncomplete => c"STRAKE_STATUS_GEODESIC_INCOMPLETE",
            StrakeStatus::GeodesicNotFound => c"STRAKE_STATUS_GEODESIC_NOT_FOUND",
            StrakeStatus::LeavesSurface => c"STRAKE_STATUS_LEAVES_SURFACE",
            StrakeStatus::OrderUnavailable => c"STRAKE_STATUS_ORDER_UNAVAILABLE",
            StrakeStatus::CentrePathFolds => c"STRAKE_STATUS_CENTRE_PATH_FOLDS",
            StrakeStatus::CutterTooLarge => c"STRAKE_STATUS_CUTTER_TOO_LARGE",
            StrakeStatus::PassLimit => c"STRAKE_STATUS_PASS_LIMIT",
            StrakeStatus::InternalPanic => c"STRAKE_STATUS_INTERNAL_PANIC",
        }
    }

    /// The status with number `code`, if there is one.
    pub fn from_code(code: u32) -> Option<Self> {
        Self::ALL.into_iter().find(|s| *s as u32 == code)
    }
}

/// The name of a status as a static NUL-terminated string, e.g. "STRAKE_STATUS_OUT_OF_DOMAIN",
/// for logs; "STRAKE_STATUS_UNKNOWN" for a number this version does not define. The string is
/// owned by the library and must not be freed. Never fails; thread-safe.
#[unsafe(no_mangle)]
pub extern "C" fn strake_status_name(status: u32) -> *const std::ffi::c_char {
    crate::ffi::guard::guard_value(c"STRAKE_STATUS_UNKNOWN".as_ptr(), || {
        StrakeStatus::from_code(status)
            .map_or(c"STRAKE_STATUS_UNKNOWN", StrakeStatus::c_name)
            .as_ptr()
    })
}
