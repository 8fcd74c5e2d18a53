//! Exact conic curves and surfaces as NURBS: circles built from rational quadratic arcs, and the
//! cylinder, sphere and torus built from them by a linear sweep or a revolution (The NURBS
//! Book, 2nd ed., ch. 7 (§7.5, A7.1 MakeNurbsCircle, p. 308) and ch. 8 (§8.3 extruded
//! surfaces; §8.5, A8.1 MakeRevolvedSurf, p. 346); section numbers from memory).
//!
//! A circular arc of opening angle 2α is one rational quadratic Bézier segment with end points
//! on the circle, middle control point where the end tangents meet (at distance R/cos α from the
//! centre) and middle weight cos α. Within a segment with local parameter s ∈ [0, 1], the angle
//! from the arc's bisector is φ(s) = 2 atan(tan(α/2) (2s − 1)), so the parametrisation is exact
//! but not proportional to arc length.
//!
//! Two full-circle forms are offered ([`CircleForm`]):
//! - nine points: four 90° arcs, the control points are the corners and edge midpoints of the
//!   circumscribed square, weights 1, √2/2, 1, √2/2, …, knots {0,0,0,¼,¼,½,½,¾,¾,1,1,1};
//! - seven points: three 120° arcs, the control points are the corners and edge midpoints of the
//!   circumscribed equilateral triangle (corners at distance 2R), weights 1, ½, 1, ½, …, knots
//!   {0,0,0,⅓,⅓,⅔,⅔,1,1,1}.
//!
//! Both start at angle 0 (the point centre + R·x) and run counterclockwise (toward y); the
//! parameter domain is [0, 1]. Surfaces of revolution multiply the weights of the circle and the
//! profile (w_i · w_j). Every builder allocates once, at creation.

use super::curve::NurbsCurve;
use super::surface::{NurbsSurface, NurbsSurfaceData};
use crate::error::{Result, StrakeError};
use std::f64::consts::FRAC_1_SQRT_2;

/// Which rational quadratic representation of a full circle to use.
#[derive(Debug, Clone, Copy, PartialEq, Eq)]
pub enum CircleForm {
    /// Four 90° arcs on the circumscribed square: 9 control points, middle weights √2/2.
    NinePoint,
    /// Three 120° arcs on the circumscribed equilateral triangle: 7 control points, middle
    /// weights ½.
    SevenPoint,
}

/// A unit circle in the plane as rational quadratic NURBS data.
struct PlanarNurbs {
    knots: Vec<f64>,
    points: Vec<[f64; 2]>,
    weights: Vec<f64>,
}

fn unit_circle(form: CircleForm) -> PlanarNurbs {
    match form {
        CircleForm::NinePoint => {
            let h = FRAC_1_SQRT_2;
            PlanarNurbs {
                knots: vec![
                    0.0, 0.0, 0.0, 0.25, 0.25, 0.5, 0.5, 0.75, 0.75, 1.0, 1.0, 1.0,
                ],
                points: vec![
                    [1.0, 0.0],
                    [1.0, 1.0],
                    [0.0, 1.0],
                    [-1.0, 1.0],
                    [-1.0, 0.0],
                    [-1.0, -1.0],
                    [0.0, -1.0],
                    [1.0, -1.0],
                    [1.0, 0.0],
                ],
                weights: vec![1.0, h, 1.0, h, 1.0, h, 1.0, h, 1.0],
            }
        }
        CircleForm::SevenPoint => {
            let s3 = 3f64.sqrt();
            let (a, b) = (1.0 / 3.0, 2.0 / 3.0);
            PlanarNurbs {
                knots: vec![0.0, 0.0, 0.0, a, a, b, b, 1.0, 1.0, 1.0],
                // Tangent points at 0°, 120°, 240°; triangle corners at 60°, 180°, 300°,
                // distance 2 = 1/cos 60°.
                points: vec![
                    [1.0, 0.0],
                    [1.0, s3],
                    [-0.5, 0.5 * s3],
                    [-2.0, 0.0],
                    [-0.5, -0.5 * s3],
                    [1.0, -s3],
                    [1.0, 0.0],
                ],
                weights: vec![1.0, 0.5, 1.0, 0.5, 1.0, 0.5, 1.0],
            }
        }
    }
}

/// The unit half circle from (0, −1) through (1, 0) to (0, 1): two 90° arcs, knots
/// {0,0,0,½,½,1,1,1}, weights 1, √2/2, 1, √2/2, 1.
fn unit_half_circle() -> PlanarNurbs {
    let h = FRAC_1_SQRT_2;
    PlanarNurbs {
        knots: vec![0.0, 0.0, 0.0, 0.5, 0.5, 1.0, 1.0, 1.0],
        points: vec![[0.0, -1.0], [1.0, -1.0], [1.0, 0.0], [1.0, 1.0], [0.0, 1.0]],
        weights: vec![1.0, h, 1.0, h, 1.0],
    }
}

fn check_length(name: &str, x: f64) -> Result<()> {
    if !(x.is_finite() && x > 0.0) {
        return Err(StrakeError::InvalidArgument(format!(
            "{name} = {x} must be positive and finite",
            x = crate::numfmt::Exact(x)
        )));
    }
    Ok(())
}

fn check_point(name: &str, p: [f64; 3]) -> Result<()> {
    if let Some(&bad) = p.iter().find(|c| !c.is_finite()) {
        return Err(StrakeError::InvalidArgument(format!(
            "{name} {} has a non-finite coordinate {}",
            crate::numfmt::ExactVec(&p),
            crate::numfmt::Exact(bad)
        )));
    }
    Ok(())
}

/// A full circle in space as a rational quadratic NURBS curve on t ∈ [0, 1]:
/// C(t) = centre + radius (cos θ(t) X + sin θ(t) Y), θ(0) = 0, θ increasing to 2π.
///
/// X is `x_axis` normalised; Y is `y_axis` made orthogonal to X and normalised (Gram–Schmidt),
/// so the circle turns from X toward Y. Errors (`InvalidArgument`): a non-finite input, a
/// radius that is not positive, a zero `x_axis`, or a `y_axis` parallel to it.
pub fn circle(
    center: [f64; 3],
    x_axis: [f64; 3],
    y_axis: [f64; 3],
    radius: f64,
    form: CircleForm,
) -> Result<NurbsCurve<3>> {
    check_point("circle centre", center)?;
    check_point("circle x axis", x_axis)?;
    check_point("circle y axis", y_axis)?;
    check_length("circle radius", radius)?;
    let dot = |a: [f64; 3], b: [f64; 3]| a[0] * b[0] + a[1] * b[1] + a[2] * b[2];
    let xn = dot(x_axis, x_axis).sqrt();
    if !(xn > 0.0 && xn.is_finite()) {
        return Err(StrakeError::InvalidArgument(format!(
            "circle x axis {} has zero or infinite length",
            crate::numfmt::ExactVec(&x_axis)
        )));
    }
    let x = x_axis.map(|c| c / xn);
    let d = dot(y_axis, x);
    let y0 = [
        y_axis[0] - d * x[0],
        y_axis[1] - d * x[1],
        y_axis[2] - d * x[2],
    ];
    let yn = dot(y0, y0).sqrt();
    let ylen = dot(y_axis, y_axis).sqrt();
    if !(yn > 1e-12 * ylen && yn.is_finite()) {
        return Err(StrakeError::InvalidArgument(format!(
            "circle y axis {} is zero or parallel to the x axis {}",
            crate::numfmt::ExactVec(&y_axis),
            crate::numfmt::ExactVec(&x_axis)
        )));
    }
    let y = y0.map(|c| c / yn);
    let c = unit_circle(form);
    let points: Vec<[f64; 3]> = c
        .points
        .iter()
        .map(|&[a, b]| std::array::from_fn(|k| center[k] + radius * (a * x[k] + b * y[k])))
        .collect();
    NurbsCurve::new(2, &c.knots, &points, Some(&c.weights))
}

/// The surface swept by moving `curve` along the straight segment `offset`:
/// S(u, v) = C(u) + v · offset, u in the curve's domain, v ∈ [0, 1] (degree 1 in v, knots
/// {0, 0, 1, 1}). Control points P_{i0} = P_i, P_{i1} = P_i + offset, both with weight w_i.
///
/// Normal (Forward): Su × Sv = C'(u) × offset. Errors (`InvalidArgument`): a non-finite or
/// zero offset.
pub fn extrude(curve: &NurbsCurve<3>, offset: [f64; 3]) -> Result<NurbsSurface> {
    check_point("extrusion offset", offset)?;
    if offset.iter().all(|&c| c == 0.0) {
        return Err(StrakeError::InvalidArgument(
            "extrusion offset is zero".into(),
        ));
    }
    let cps = curve.control_points();
    let mut points = Vec::with_capacity(2 * cps.len());
    for p in &cps {
        points.push(*p);
        points.push([p[0] + offset[0], p[1] + offset[1], p[2] + offset[2]]);
    }
    let weights: Option<Vec<f64>> = curve
        .weights()
        .map(|w| w.iter().flat_map(|&wi| [wi, wi]).collect());
    NurbsSurface::new(&NurbsSurfaceData {
        degree_u: curve.degree(),
        degree_v: 1,
        count_u: cps.len(),
        count_v: 2,
        knots_u: curve.knot_vector().knots(),
        knots_v: &[0.0, 0.0, 1.0, 1.0],
        points: &points,
        weights: weights.as_deref(),
    })
}

/// The surface of revolution of a profile curve about the z axis.
///
/// The profile is given in a half-plane as (ρ(v), z(v)): distance from the axis and height.
/// S(u, v) = (ρ(v) cos θ(u), ρ(v) sin θ(u), z(v)), where θ(u) is the angle of the chosen circle
/// form (θ(0) = 0, counterclockwise seen from +z, u ∈ [0, 1]); v runs over the profile's
/// domain. Control points P_{ij} = (ρ_j a_i, ρ_j b_i, z_j) for the unit-circle control points
/// (a_i, b_i), weights W_i · w_j (A8.1 MakeRevolvedSurf).
///
/// Normal (Forward): Su × Sv = θ' ρ (z' cos θ, z' sin θ, −ρ'); where the profile runs toward
/// +z at positive ρ it points away from the axis. Points where the profile touches the axis
/// (ρ = 0) are poles, where the surface is degenerate.
pub fn revolve(profile: &NurbsCurve<2>, form: CircleForm) -> Result<NurbsSurface> {
    let circle = unit_circle(form);
    let prof = profile.control_points();
    let pw = profile.weights();
    let (count_u, count_v) = (circle.points.len(), prof.len());
    let mut points = Vec::with_capacity(count_u * count_v);
    let mut weights = Vec::with_capacity(count_u * count_v);
    for (&[a, b], &wi) in circle.points.iter().zip(&circle.weights) {
        for (j, &[rho, z]) in prof.iter().enumerate() {
            points.push([rho * a, rho * b, z]);
            weights.push(wi * pw.map_or(1.0, |w| w[j]));
        }
    }
    NurbsSurface::new(&NurbsSurfaceData {
        degree_u: 2,
        degree_v: profile.degree(),
        count_u,
        count_v,
        knots_u: &circle.knots,
        knots_v: profile.knot_vector().knots(),
        points: &points,
        weights: Some(&weights),
    })
}

fn planar_curve(c: &PlanarNurbs, map: impl Fn([f64; 2]) -> [f64; 2]) -> Result<NurbsCurve<2>> {
    let points: Vec<[f64; 2]> = c.points.iter().map(|&p| map(p)).collect();
    NurbsCurve::new(2, &c.knots, &points, Some(&c.weights))
}

/// Circular cylinder of radius `radius` about the z axis, from height `z0` to `z1` (z0 < z1):
/// the circle of the chosen form in the plane z = z0, swept linearly by (0, 0, z1 − z0).
/// Degree 2 × 1, u ∈ [0, 1] around (θ(0) = 0 on +x, counterclockwise seen from +z),
/// v ∈ [0, 1] along +z. The Forward normal points away from the axis.
///
/// Errors (`InvalidArgument`): a radius that is not positive and finite, non-finite heights,
/// z0 ≥ z1.
pub fn cylinder(radius: f64, z0: f64, z1: f64, form: CircleForm) -> Result<NurbsSurface> {
    check_length("cylinder radius", radius)?;
    if !(z0.is_finite() && z1.is_finite() && z0 < z1) {
        return Err(StrakeError::InvalidArgument(format!(
            "cylinder heights z0 = {}, z1 = {} must be finite with z0 < z1",
            crate::numfmt::Exact(z0),
            crate::numfmt::Exact(z1)
        )));
    }
    let c = circle(
        [0.0, 0.0, z0],
        [1.0, 0.0, 0.0],
        [0.0, 1.0, 0.0],
        radius,
        form,
    )?;
    extrude(&c, [0.0, 0.0, z1 - z0])
}

/// Sphere of radius `radius` centred at the origin: a meridian half circle from the south pole
/// (v = 0) through the equator (v = ½) to the north pole (v = 1), made of two 90° arcs, revolved
/// about z with the chosen circle form in u (so the parallels are circles of that form).
/// Degree 2 × 2. The Forward normal points outward. The poles (v = 0 and v = 1) are degenerate
/// points where the normal is undefined.
///
/// A half circle needs at least two rational quadratic arcs (a single one would need weight
/// cos 90° = 0), so the meridian is the same for both forms.
///
/// Errors (`InvalidArgument`): a radius that is not positive and finite.
pub fn sphere(radius: f64, form: CircleForm) -> Result<NurbsSurface> {
    check_length("sphere radius", radius)?;
    let profile = planar_curve(&unit_half_circle(), |[a, b]| [radius * a, radius * b])?;
    revolve(&profile, form)
}

/// Torus about the z axis with major radius `major` (R, distance from the axis to the tube's
/// core circle) and minor radius `minor` (r, the tube's radius).
///
/// The profile is the circle (R + r cos ψ(v), r sin ψ(v)) of the chosen form, starting at the
/// outer equator (ψ = 0) and going up first; it is revolved with the same circle form in u.
/// Degree 2 × 2, u, v ∈ [0, 1]. The Forward normal points away from the core circle.
/// With r ≥ R the surface reaches the axis and is degenerate there.
///
/// Errors (`InvalidArgument`): a radius that is not positive and finite.
pub fn torus(major: f64, minor: f64, form: CircleForm) -> Result<NurbsSurface> {
    check_length("torus major radius", major)?;
    check_length("torus minor radius", minor)?;
    let profile = planar_curve(&unit_circle(form), |[a, b]| [major + minor * a, minor * b])?;
    revolve(&profile, form)
}

#[cfg(test)]
mod tests {
    use super::*;

    // Issue 3 (validation): every builder refuses bad sizes with InvalidArgument naming the value.
    #[test]
    fn builders_refuse_bad_input() {
        let f = CircleForm::NinePoint;
        let msg = |r: Result<NurbsSurface>| match r {
            Err(StrakeError::InvalidArgument(m)) => m,
            other => panic!("expected InvalidArgument, got {other:?}"),
        };
        assert!(msg(sphere(0.0, f)).contains("sphere radius = 0"));
        assert!(msg(sphere(f64::NAN, f)).contains("sphere radius = NaN"));
        assert!(msg(torus(2.0, -1.0, f)).contains("torus minor radius = -1"));
        assert!(msg(torus(f64::INFINITY, 1.0, f)).contains("torus major radius = inf"));
        assert!(msg(cylinder(1.0, 2.0, 2.0, f)).contains("z0 = 2, z1 = 2"));
        assert!(msg(cylinder(-1.0, 0.0, 1.0, f)).contains("cylinder radius = -1"));
        let c = circle([0.0; 3], [1.0, 0.0, 0.0], [0.0, 1.0, 0.0], 1.0, f).unwrap();
        assert!(msg(extrude(&c, [0.0; 3])).contains("zero"));
        let bad = circle([0.0; 3], [1.0, 0.0, 0.0], [2.0, 0.0, 0.0], 1.0, f).unwrap_err();
        assert!(bad.to_string().contains("parallel"), "{bad}");
        let bad = circle([0.0; 3], [0.0; 3], [0.0, 1.0, 0.0], 1.0, f).unwrap_err();
        assert!(bad.to_string().contains("zero"), "{bad}");
    }

    // The NURBS Book §8.5 (A8.1): the weights of a surface of revolution are products w_i · w_j.
    #[test]
    fn revolved_weights_are_products() {
        for form in [CircleForm::NinePoint, CircleForm::SevenPoint] {
            let t = torus(3.0, 1.0, form).unwrap();
            let c = unit_circle(form);
            for i in 0..t.count_u() {
                for j in 0..t.count_v() {
                    assert_eq!(t.weight(i, j), Some(c.weights[i] * c.weights[j]));
                }
            }
        }
    }
}
