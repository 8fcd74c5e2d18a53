//! The path the machine runs: the tool-centre (cutter-location) path of ball-end, flat-end and
//! toroidal cutters at a lead and tilt on either side of the surface ([`centre`]), and the
//! feed judged on it, with acceleration, jerk and orientation-rate limits ([`feed`]).
//!
//! The contact path c(s) with its Darboux frame (T, B, N) is what strake evaluates; the
//! machine's controller interpolates the cutter-location points. With the axis at constant
//! lead and tilt in the tool-side frame, the centre is a fixed offset in the frame,
//! CL = c + d_T T + d_B B + d_N N, so its derivatives follow from the Darboux equations:
//! its tangent from the frame, its curvature from third-order jets, the rate of change of
//! its curvature and its torsion from fourth-order jets (all exact, see [`centre`]).
//!
//! What this does not see: the holder and shank, interference of the whole cutter with the
//! surface away from the contact point (rear gouging and global collisions are other
//! checks), anything between samples, and the machine's kinematics (rotary-axis speeds
//! depend on the machine's structure; the orientation rate here is that of the axis
//! direction itself).

pub mod centre;
pub mod chordal;
pub mod feed;

pub use centre::centre_of_frame;
pub use centre::{CentrePoint, FOLD_LIMIT, ToolSetup, centre_path_at, centre_point};
pub use chordal::sample_chordal_centre;
pub use feed::{CentreFeed, CentreFeedLimits, FeedBound, centre_feed, centre_feed_path};
