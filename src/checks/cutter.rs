//! Cutter descriptions and the side of the surface the tool is on.

use super::tool_axis::ToolAngles;
use crate::error::{Result, StrakeError};

/// Which side of the surface the tool is on.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum ToolSide {
    /// On the side the surface normal N points to.
    AlongNormal,
    /// On the side opposite to N.
    AgainstNormal,
}

impl ToolSide {
    /// s = +1 for `AlongNormal`, −1 for `AgainstNormal`: multiply a normal curvature by s to
    /// get the curvature concave toward the tool.
    #[inline]
    pub fn sign(self) -> f64 {
        match self {
            ToolSide::AlongNormal => 1.0,
            ToolSide::AgainstNormal => -1.0,
        }
    }
}

/// A milling cutter's shape (lengths in the host's unit).
///
/// Every cutter is described as a torus swept about the tool axis: a corner circle of radius
/// `r` whose centre lies at distance `R` (the major radius) from the axis. A ball-end mill has
/// R = 0, r = radius; a flat-end mill R = radius, r = 0; a toroidal (bull-nose) mill
/// R = tool radius − corner radius.
#[derive(Debug, Clone, Copy, PartialEq)]
pub enum Cutter {
    /// Ball-end mill of the given radius.
    Ball {
        /// Ball radius (> 0).
        radius: f64,
    },
    /// Flat-end mill of the given radius.
    Flat {
        /// Tool radius (> 0).
        radius: f64,
    },
    /// Toroidal (bull-nose) mill.
    Toroidal {
        /// Tool radius (> 0), axis to the outermost point of the cutting edge.
        radius: f64,
        /// Corner radius, 0 < corner_radius ≤ radius.
        corner_radius: f64,
    },
}

impl Cutter {
    /// Checks the dimensions. Errors (`InvalidArgument`, naming the field): a radius that is not
    /// positive and finite or is subnormal (below `f64::MIN_POSITIVE`, whose curvature 1/r
    /// overflows), a corner radius likewise or above the tool radius.
    pub fn validate(&self) -> Result<()> {
        let positive = |name: &str, x: f64| {
            if x.is_finite() && x >= f64::MIN_POSITIVE {
                Ok(())
            } else {
                Err(StrakeError::InvalidArgument(format!(
                    "cutter {name} = {x} must be positive, finite and not subnormal (its \
                     curvature 1/{name} must be finite)",
                    x = crate::numfmt::Exact(x)
                )))
            }
        };
        match *self {
            Cutter::Ball { radius } | Cutter::Flat { radius } => positive("radius", radius),
            Cutter::Toroidal {
                radius,
                corner_radius,
            } => {
                positive("radius", radius)?;
                positive("corner_radius", corner_radius)?;
                if corner_radius > radius {
                    return Err(StrakeError::InvalidArgument(format!(
                        "cutter corner_radius = {} exceeds the tool radius {}",
                        crate::numfmt::Exact(corner_radius),
                        crate::numfmt::Exact(radius)
                    )));
                }
                Ok(())
            }
        }
    }

    /// (R, r): the major radius (axis to corner-circle centre) and the corner radius.
    #[inline]
    pub fn torus_radii(&self) -> (f64, f64) {
        match *self {
            Cutter::Ball { radius } => (0.0, radius),
            Cutter::Flat { radius } => (radius, 0.0),
            Cutter::Toroidal {
                radius,
                corner_radius,
            } => (radius - corner_radius, corner_radius),
        }
    }

    /// The effective cutting radius in the inclination plane's normal (the radius of the
    /// cutter's parallel through the contact point, seen along the inclination direction m),
    /// for an axis inclined by β from the surface normal: R/sin β + r (Vickers & Quan, J. Eng.
    /// Ind. 111(1) (1989) 22–26). Infinite for a flat or toroidal cutter at β = 0 (the flat
    /// bottom touches), and where R/sin β exceeds the largest f64 (a denormal β); r for a ball
    /// (independent of β).
    ///
    /// This is the radius across the path only when the axis is inclined by lead alone (m = T).
    /// With tilt it is not: use [`cutter_radii`] for the radii across and along the path (a
    /// 5/1 mm toroidal cutter at 10° tilt: 24.0 mm here, 1 mm across the path).
    ///
    /// Derivation (checked in the tests): the corner-circle centres form a circle of radius R in
    /// a plane inclined by β; seen along the inclination direction it is an ellipse with
    /// semi-axes R and R sin β whose radius of curvature at the contact end is R/sin β; the
    /// cutting edge is that curve offset by r.
    #[inline]
    pub fn effective_radius(&self, beta: f64) -> f64 {
        let (big_r, r) = self.torus_radii();
        if big_r == 0.0 {
            return r;
        }
        let s = beta.sin().abs();
        if s == 0.0 {
            f64::INFINITY
        } else {
            big_r / s + r
        }
    }
}

/// The cutter's radii of curvature at its contact point, for an axis set by lead and tilt
/// (host length unit). See [`cutter_radii`].
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct CutterRadii {
    /// Radius of the swept cutting profile across the path: the cutter moving along T leaves,
    /// in the plane across the path (spanned by b_t and n_t), the outline of its projection
    /// along T; this is that outline's radius of curvature at the contact point, the radius
    /// scallop heights and step-overs need: r + R sin²λ / sin³β (r for a ball; infinite for a
    /// flat or toroidal cutter with its axis along the normal, whose flat bottom touches; 0 for
    /// a flat cutter tilted with no lead, whose sharp corner cuts across the path).
    pub across_path: f64,
    /// Radius of the cutter's normal section in the direction b_t (the curve cut from the
    /// cutter by the plane through the contact point spanned by b_t and n_t), by Euler's
    /// formula on the torus's principal curvatures 1/r (along m) and sin β/(R + r sin β)
    /// (across m): 1/(m_b²/r + m_t² sin β/(R + r sin β)). Equals `across_path` when the lead or
    /// the tilt is zero; with both it is the smaller (the swept outline is what cuts).
    pub across_section: f64,
    /// Radius of the cutter's normal section along the path (direction T):
    /// 1/(m_t²/r + m_b² sin β/(R + r sin β)).
    pub along_path: f64,
    /// The radius R/sin β + r of [`Cutter::effective_radius`] (normal to the inclination
    /// plane): across the path only for pure lead.
    pub inclination_plane: f64,
    /// Inclination β of the axis from the tool-side normal (radians).
    pub inclination: f64,
    /// True when the flat bottom, not the corner circle, touches: a flat or toroidal cutter
    /// (R > 0) with its axis exactly along the normal (β = 0). The contact is then the bottom's
    /// centre on the axis, not a point of the corner.
    pub flat_bottom_contact: bool,
}

/// The radii of curvature of `cutter` at its contact point with the axis set by `angles`, in
/// the tool-side frame (T, b_t, n_t) of [`mod@super::tool_axis`].
///
/// Derivation (the tests check it against a sampled cutter): the cutter is the torus of major
/// radius R and corner radius r about the axis a. Its contact point with a surface of normal
/// n_t is where its own normal is −n_t; there its principal directions are m = (sin λ T +
/// cos λ sin θ b_t)/sin β (the meridian, curvature 1/r) and across m (the parallel, curvature
/// k_p = sin β/(R + r sin β) by Meusnier's theorem). In the basis (T, b_t) its second
/// fundamental form is K = (1/r) m mᵀ + k_p p pᵀ. Moving along T the cutter sweeps a profile
/// across the path whose curvature is the apparent curvature of its outline seen along T,
/// det K / K_TT (minimise ½ Xᵀ K X over the T component), which is k_p /(m_t² + r k_p m_b²),
/// radius m_t²/k_p + r m_b² = r + R m_t²/sin β. The normal sections are Euler's formula.
///
/// Errors: `InvalidArgument` for an invalid cutter or angles.
pub fn cutter_radii(cutter: &Cutter, angles: &ToolAngles) -> Result<CutterRadii> {
    cutter.validate()?;
    angles.validate()?;
    let (big_r, r) = cutter.torus_radii();
    let [at, ab, _] = angles.local();
    let sb = at.hypot(ab);
    let beta = angles.inclination();
    let inclination_plane = cutter.effective_radius(beta);
    if big_r == 0.0 {
        return Ok(CutterRadii {
            across_path: r,
            across_section: r,
            along_path: r,
            inclination_plane,
            inclination: beta,
            flat_bottom_contact: false,
        });
    }
    if sb == 0.0 {
        return Ok(CutterRadii {
            across_path: f64::INFINITY,
            across_section: f64::INFINITY,
            along_path: f64::INFINITY,
            inclination_plane,
            inclination: beta,
            flat_bottom_contact: true,
        });
    }
    let (mt, mb) = (at / sb, ab / sb);
    // 1/k_p = R/sin β + r.
    let inv_kp = big_r / sb + r;
    // Normal section radius in a direction whose component along m is c: 1/(c²/r + k_p (1 − c²))
    // = r/(c² + r k_p (1 − c²)), and with r = 0: 0 unless c = 0 (then 1/k_p).
    let section = |c: f64, q: f64| {
        if r == 0.0 {
            if c == 0.0 { inv_kp } else { 0.0 }
        } else {
            r / (c * c + (r / inv_kp) * q * q)
        }
    };
    Ok(CutterRadii {
        across_path: r + big_r * mt * mt / sb,
        across_section: section(mb, mt),
        along_path: section(mt, mb),
        inclination_plane,
        inclination: beta,
        flat_bottom_contact: false,
    })
}

/// The width across the path of the profile the cutter sweeps, at height `h` above its contact
/// point (host length unit): the chord, at that height, of the outline of the cutter projected
/// along T onto the plane across the path. On a plane it is exactly the step-over that leaves a
/// scallop of height h between two passes (two translated copies of a convex outline meet at
/// the height where the outline is as wide as the translation), so it is also the widest
/// step-over the cutter can cut at that scallop.
///
/// The cutter is taken as the solid swept by a disc of radius R (perpendicular to the axis)
/// and a ball of radius r, continued upward along the axis by its cylindrical flank (a convex
/// body); the holder and shank are not seen. Its outline is traced from its support function
/// R √(1 − (u·a)²) + r (u a unit direction across T) up to the flank, then along the flank;
/// the crossing of height h is found by bisection to round-off.
///
/// Errors: `InvalidArgument` for an invalid cutter or angles, or `h` not positive and finite.
pub fn cut_width(cutter: &Cutter, angles: &ToolAngles, h: f64) -> Result<f64> {
    cutter.validate()?;
    angles.validate()?;
    if !(h.is_finite() && h > 0.0) {
        return Err(StrakeError::InvalidArgument(format!(
            "scallop height = {h} must be positive and finite",
            h = crate::numfmt::Exact(h)
        )));
    }
    let outline = Outline::new(cutter, angles);
    let (ab, an) = (outline.ab, outline.an);
    let point = |phi: f64| outline.point(phi);
    let z0 = point(0.0).1;
    // Lateral position of the outline at height h on one side: phi_end is where the outline
    // meets the flank (g = 0), dir the side's sign.
    let side = |phi_end: f64| {
        let (y_end, z_end) = point(phi_end);
        if z_end - z0 <= h {
            // Along the flank, direction (a_b, a_n) projected (a_n > 0: it rises).
            return y_end + (h - (z_end - z0)) * ab / an;
        }
        let (mut lo, mut hi) = (0.0, phi_end);
        for _ in 0..200 {
            let mid = 0.5 * (lo + hi);
            if mid == lo || mid == hi {
                break;
            }
            if point(mid).1 - z0 < h {
                lo = mid;
            } else {
                hi = mid;
            }
        }
        // Linear interpolation between the bracketing outline points: to round-off where the
        // outline is smooth, and exact along the straight edge a flat bottom tilted without
        // lead shows (the outline then has a corner in φ at u = −a, and the bottom between).
        let ((y_lo, z_lo), (y_hi, z_hi)) = (point(lo), point(hi));
        if z_hi > z_lo {
            y_lo + (h - (z_lo - z0)) * (y_hi - y_lo) / (z_hi - z_lo)
        } else {
            y_lo
        }
    };
    let phi_plus = an.atan2(ab);
    let phi_minus = phi_plus - std::f64::consts::PI;
    Ok(side(phi_plus) - side(phi_minus))
}

/// The outline of a cutter seen along T (its projection onto the plane across the path,
/// spanned by b_t and n_t), parametrised by the angle φ of its outward normal
/// u(φ) = (sin φ, −cos φ) in (b_t, n_t): the support point X(φ) = h u + h′ u′ of the support
/// function h(φ) = R √(1 − (u·a)²) + r of the bottom disc (radius R, normal a) swept by the
/// ball of radius r, for the lower part u·a ≤ 0 (φ from `phi_minus` to `phi_plus`, where
/// u·a = 0 and the flank along the axis begins). Coordinates from the centre of the
/// corner-centre circle.
///
/// √(1 − (u·a)²) is computed as |u × a| = √((u′·a)² + a_T²), without the cancellation of
/// 1 − (u·a)² next to u = −a (the bottom disc seen edge-on, a flat cutter tilted without
/// lead), where that form lost up to half the digits of the support point.
#[derive(Debug, Clone, Copy, PartialEq)]
pub(crate) struct Outline {
    pub(crate) big_r: f64,
    pub(crate) r: f64,
    pub(crate) at: f64,
    pub(crate) ab: f64,
    pub(crate) an: f64,
}

impl Outline {
    /// The outline of `cutter` (validated by the caller) at `angles`.
    pub(crate) fn new(cutter: &Cutter, angles: &ToolAngles) -> Outline {
        let (big_r, r) = cutter.torus_radii();
        let [at, ab, an] = angles.local();
        Outline {
            big_r,
            r,
            at,
            ab,
            an,
        }
    }

    /// φ where the lower outline meets the flank on the +b_t side (u·a = 0); the −b_t side is
    /// this minus π.
    pub(crate) fn phi_plus(&self) -> f64 {
        self.an.atan2(self.ab)
    }

    /// The support point X(φ) (b_t, n_t components); beyond the flank (u·a > 0) the point
    /// where the flank begins.
    pub(crate) fn point(&self, phi: f64) -> (f64, f64) {
        let (s, c) = phi.sin_cos();
        let g = s * self.ab - c * self.an;
        let dg = c * self.ab + s * self.an;
        let (root, dh) = if g >= 0.0 {
            (1.0, 0.0)
        } else {
            let root = dg.hypot(self.at);
            let dh = if root > 0.0 {
                -self.big_r * g * dg / root
            } else {
                0.0
            };
            (root, dh)
        };
        let hv = self.big_r * root + self.r;
        (hv * s + dh * c, -hv * c + dh * s)
    }
}
