//! Feed judged on the path the machine runs: the tool-centre path.
//!
//! The feed v here is the speed of the cutter-location point (what a controller's programmed
//! feed means). Along the centre path, of curvature κc, torsion τc and curvature rate
//! κc' = dκc/ds_c, at constant speed v:
//!
//! - acceleration v² κc (centripetal; physics), so v ≤ √(a_max / κc);
//! - jerk v³ |d³CL/ds_c³| with d³CL/ds_c³ = κc' N_c + κc (−κc T_c + τc B_c) (Frenet; do Carmo
//!   §1-5), so v ≤ (j_max / √(κc'² + κc⁴ + κc² τc²))^{1/3}: the jerk rule with the curvature's
//!   rate of change (the contact-path rule of [`crate::checks::feed`] keeps κ² only);
//! - the axis turning at |da/ds_c| radians per unit length of the centre path
//!   ([`CentrePoint::axis_rate`]), so its angular speed v |da/ds_c| ≤ ω_max gives
//!   v ≤ ω_max / |da/ds_c|.
//!
//! Local rules at a sample at constant speed: the look-ahead of the host or controller must
//! still plan the speed changes between samples (tangential acceleration), and the rotary
//! axes of a machine may turn faster than the tool axis itself near a kinematic singularity.
//! One time unit throughout: feed in length/s with acceleration in length/s², jerk in
//! length/s³ and angular speed in rad/s (or all per minute).

use super::centre::CentrePoint;
use crate::error::{Result, StrakeError};
use crate::paths::curve_on_surface::SampleError;

/// Machine limits for the feed on the tool-centre path.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CentreFeedLimits {
    /// Programmed (largest) feed of the cutter-location point, > 0.
    pub feed: f64,
    /// Largest path acceleration, > 0.
    pub max_acceleration: f64,
    /// Largest jerk, > 0, or `None` to ignore jerk (the jerk rule needs fourth-order jets).
    pub max_jerk: Option<f64>,
    /// Largest angular speed of the tool axis (rad per time unit), > 0, or `None`.
    pub max_angular_speed: Option<f64>,
}

impl CentreFeedLimits {
    /// Errors (`InvalidArgument`, naming the field and value) unless every given limit is
    /// positive and finite.
    pub fn validate(&self) -> Result<()> {
        let fields = [
            ("feed", Some(self.feed)),
            ("max_acceleration", Some(self.max_acceleration)),
            ("max_jerk", self.max_jerk),
            ("max_angular_speed", self.max_angular_speed),
        ];
        for (name, x) in fields {
            if let Some(x) = x {
                if !(x.is_finite() && x > 0.0) {
                    return Err(StrakeError::InvalidArgument(format!(
                        "{name} = {x} must be positive and finite",
                        x = crate::numfmt::Exact(x)
                    )));
                }
            }
        }
        Ok(())
    }
}

/// Which limit decides the feed.
#[derive(Debug, Clone, Copy, PartialEq, Eq, Default)]
pub enum FeedBound {
    /// The programmed feed.
    #[default]
    Programmed = 0,
    /// The acceleration limit.
    Acceleration = 1,
    /// The jerk limit.
    Jerk = 2,
    /// The axis's angular speed limit.
    AngularSpeed = 3,
}

/// The feed allowed at a sample of the centre path, and what limits it. (`Default`: zeros, a
/// placeholder for output arrays.)
#[derive(Debug, Clone, Copy, PartialEq, Default)]
pub struct CentreFeed {
    /// The highest feed of the cutter-location point: the least of the bounds below.
    pub feed: f64,
    /// Which bound gives it (the first in the order programmed, acceleration, jerk,
    /// angular speed on a tie).
    pub bound: FeedBound,
    /// √(a_max / κc) (infinite where κc = 0).
    pub acceleration_feed: f64,
    /// The jerk bound (infinite without a jerk limit or where the jerk figure is 0).
    pub jerk_feed: f64,
    /// ω_max / |da/ds_c| (infinite without the limit or where the axis does not turn).
    pub angular_feed: f64,
    /// The same feed as the contact point moves: `feed / speed_ratio` (length of the contact
    /// path per time unit), for hosts that program the contact path.
    pub contact_feed: f64,
}

/// The feed allowed at the centre-path sample `p` under `limits`.
///
/// Errors: `InvalidArgument` naming a limit that is not positive and finite;
/// `OrderUnavailable` when a jerk limit is given but `p` was computed from third-order jets
/// (no curvature rate).
pub fn centre_feed(p: &CentrePoint, limits: &CentreFeedLimits) -> Result<CentreFeed> {
    limits.validate()?;
    let inf = f64::INFINITY;
    let acc = if p.curvature > 0.0 {
        (limits.max_acceleration / p.curvature).sqrt()
    } else {
        inf
    };
    let jerk = match limits.max_jerk {
        None => inf,
        Some(j) => {
            let fig = p.jerk_figure.ok_or(StrakeError::OrderUnavailable {
                which: "surface",
                needed: 4,
                available: 3,
            })?;
            if fig > 0.0 { (j / fig).cbrt() } else { inf }
        }
    };
    let ang = match limits.max_angular_speed {
        Some(w) if p.axis_rate > 0.0 => w / p.axis_rate,
        _ => inf,
    };
    let mut feed = limits.feed;
    let mut bound = FeedBound::Programmed;
    for (x, b) in [
        (acc, FeedBound::Acceleration),
        (jerk, FeedBound::Jerk),
        (ang, FeedBound::AngularSpeed),
    ] {
        if x < feed {
            feed = x;
            bound = b;
        }
    }
    Ok(CentreFeed {
        feed,
        bound,
        acceleration_feed: acc,
        jerk_feed: jerk,
        angular_feed: ang,
        contact_feed: feed / p.speed_ratio,
    })
}

/// [`centre_feed`] at every point of a centre path (`points`, e.g. from
/// [`super::centre::centre_path_at`] at the parameters `ts`) into `out` (same length).
///
/// Errors, naming the sample (index and its t from `ts`): those of [`centre_feed`]; lengths
/// that differ are refused (`InvalidArgument`, no sample). Stops at the first failing sample
/// (`out` is then partly written); the limits are checked before any sample.
pub fn centre_feed_path(
    points: &[CentrePoint],
    ts: &[f64],
    limits: &CentreFeedLimits,
    out: &mut [CentreFeed],
) -> std::result::Result<(), SampleError> {
    let whole = |error| SampleError {
        index: 0,
        t: f64::NAN,
        error,
    };
    if points.len() != out.len() || ts.len() != out.len() {
        return Err(whole(StrakeError::InvalidArgument(format!(
            "{} centre points, {} parameters, room for {} feeds: need equal counts",
            points.len(),
            ts.len(),
            out.len()
        ))));
    }
    limits.validate().map_err(whole)?;
    for (index, ((p, &t), o)) in points.iter().zip(ts).zip(out.iter_mut()).enumerate() {
        *o = centre_feed(p, limits).map_err(|error| SampleError { index, t, error })?;
    }
    Ok(())
}
