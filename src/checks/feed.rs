//! Curvature-limited feed.
//!
//! Moving along a path of space curvature κ = √(κn² + κg²) at speed v takes a normal
//! acceleration v² κ, so v ≤ √(a_max / κ) (physics: centripetal acceleration). At constant speed
//! on the osculating circle the acceleration vector turns at rate v κ, so the jerk is v³ κ² and
//! v ≤ (j_max / κ²)^{1/3}. Changes of curvature along the path (dκ/ds) add jerk that this local
//! rule does not see; the host's look-ahead must still handle them.
//!
//! Units: any consistent set, e.g. lengths in mm, time in s: feed in mm/s, acceleration in
//! mm/s², jerk in mm/s³, curvature in 1/mm.

use crate::error::{Result, StrakeError};
use crate::geometry::frame::{DarbouxFrame, space_curvature};

/// Machine limits for the feed rule.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct FeedLimits {
    /// Programmed (maximum) feed, > 0.
    pub feed: f64,
    /// Largest acceleration normal to the path, > 0.
    pub max_acceleration: f64,
    /// Largest jerk, > 0, or `None` to ignore jerk.
    pub max_jerk: Option<f64>,
}

impl FeedLimits {
    /// Errors (`InvalidArgument`, naming the field) unless every given limit is positive and
    /// finite.
    pub fn validate(&self) -> Result<()> {
        let fields = [
            ("feed", Some(self.feed)),
            ("max_acceleration", Some(self.max_acceleration)),
            ("max_jerk", self.max_jerk),
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

/// The highest feed at frame `f`: min(feed, √(a_max/κ), (j_max/κ²)^{1/3}), with κ the space
/// curvature; the programmed feed where κ = 0.
pub fn curvature_limited_feed(f: &DarbouxFrame, limits: &FeedLimits) -> Result<f64> {
    limits.validate()?;
    let kappa = space_curvature(f);
    let mut v = limits.feed;
    if kappa > 0.0 {
        v = v.min((limits.max_acceleration / kappa).sqrt());
        if let Some(j) = limits.max_jerk {
            v = v.min((j / (kappa * kappa)).cbrt());
        }
    }
    Ok(v)
}
