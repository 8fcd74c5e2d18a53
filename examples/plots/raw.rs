//! What the pictures show, read from `mould_cavity --raw`: the numbers the C host got from
//! strake, so the pictures and the printed tables have one source.
//!
//! Lines whose first word is not one of ours are skipped (other sections of the demo print
//! their own lines).

/// One sample along a path: where it is and how the surface and the path bend there.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct Sample {
    /// Arc length from the start of the path (mm).
    pub s: f64,
    /// Surface parameters.
    pub u: f64,
    /// Surface parameters.
    pub v: f64,
    /// The point on the surface (mm).
    pub p: [f64; 3],
    /// The unit surface normal N (toward the tool for the cavity, out of the wing for the skin).
    pub n: [f64; 3],
    /// Normal curvature κn (1/mm).
    pub kn: f64,
    /// Geodesic curvature κg (1/mm).
    pub kg: f64,
    /// Geodesic torsion τg (rad/mm).
    pub tg: f64,
    /// Principal curvatures k1 >= k2 (1/mm).
    pub k1: f64,
    /// Principal curvatures k1 >= k2 (1/mm).
    pub k2: f64,
}

/// An interval along a path where a checked value exceeds its limit (as strake reported it).
#[derive(Debug, Clone, PartialEq)]
pub struct Stretch {
    /// What was checked: `gouge`, `scallop`, `feed`, `steering`, `twist`, ...
    pub kind: String,
    /// Arc length where it starts (mm).
    pub start: f64,
    /// Arc length where it ends (mm).
    pub end: f64,
}

/// A grid point of the cavity: parameters, point and curvatures.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct GridPoint {
    /// Parameters.
    pub u: f64,
    /// Parameters.
    pub v: f64,
    /// The point (mm).
    pub p: [f64; 3],
    /// Principal curvatures k1 >= k2 (1/mm), mean H and Gaussian K (1/mm², for K).
    pub k1: f64,
    /// See `k1`.
    pub k2: f64,
    /// See `k1`.
    pub h: f64,
    /// See `k1`.
    pub k: f64,
}

/// A surface on a grid, row-major by the first index: `points[i * nv + j]`.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Grid {
    /// Points along the first parameter.
    pub nu: usize,
    /// Points along the second parameter.
    pub nv: usize,
    /// The points.
    pub points: Vec<GridPoint>,
}

impl Grid {
    /// The point (i, j).
    pub fn at(&self, i: usize, j: usize) -> &GridPoint {
        &self.points[i * self.nv + j]
    }
}

/// The milling pass and its checks.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct MillPass {
    /// The samples (chordal sampling).
    pub samples: Vec<Sample>,
    /// Per sample: scallop height (mm; infinite where the ball does not fit).
    pub scallop: Vec<f64>,
    /// Per sample: the curvature-limited feed (mm/s).
    pub feed: Vec<f64>,
    /// Per sample, when the demo prints it: the feed of the tool centre (mm/s).
    pub centre_feed: Option<Vec<f64>>,
    /// Ball radius r (mm).
    pub ball_radius: f64,
    /// Scallop height limit (mm).
    pub scallop_limit: f64,
    /// The programmed feed (mm/s).
    pub programmed_feed: f64,
    /// Where the checks fail.
    pub stretches: Vec<Stretch>,
    /// Knot values of the surface (u, then v), for the parameter-plane map.
    pub knots_u: Vec<f64>,
    /// See `knots_u`.
    pub knots_v: Vec<f64>,
}

/// The fibre course and its checks.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Course {
    /// The samples (even in arc length).
    pub samples: Vec<Sample>,
    /// Tow width (mm).
    pub tow_width: f64,
    /// Smallest steering radius (mm).
    pub min_radius: f64,
    /// Largest twist rate (rad/mm).
    pub max_twist: f64,
    /// Where the limits are exceeded.
    pub stretches: Vec<Stretch>,
}

/// A point on a band edge of a planned course.
#[derive(Debug, Clone, Copy, Default, PartialEq)]
pub struct EdgePoint {
    /// Arc length along the course of the centre sample this edge point belongs to (mm).
    pub s: f64,
    /// Surface parameters of the edge point (for the wing skin: x and y in mm).
    pub u: f64,
    /// See `u`.
    pub v: f64,
    /// The edge point (mm).
    pub p: [f64; 3],
}

/// The band of tows a planned course lays: its two edges, each at the end of the geodesic of
/// half the band width across the course (right: along -B, left: along +B).
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Band {
    /// The right edge, in the course's order.
    pub right: Vec<EdgePoint>,
    /// The left edge (the side the next course lies on).
    pub left: Vec<EdgePoint>,
}

/// A gap or an overlap between course `course`'s left edge and course `course + 1`'s right
/// edge, as strake reported it.
#[derive(Debug, Clone, Copy, PartialEq)]
pub struct Seam {
    /// The first course of the pair.
    pub course: usize,
    /// Where it starts, arc length along `course` (mm).
    pub start: f64,
    /// Where it ends (mm).
    pub end: f64,
    /// An overlap (the bands cover each other), or a gap.
    pub overlap: bool,
    /// The largest edge-to-edge width inside (mm, >= 0).
    pub width: f64,
}

/// The planned courses side by side on the wing skin.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Courses {
    /// Band width w (mm).
    pub band_width: f64,
    /// Gaps and overlaps narrower than this are not reported (mm).
    pub tolerance: f64,
    /// The bands, course 0 first; each next course lies to the left of the one before.
    pub bands: Vec<Band>,
    /// The gaps and overlaps between neighbours.
    pub seams: Vec<Seam>,
}

/// Everything the pictures show.
#[derive(Debug, Clone, Default, PartialEq)]
pub struct Demo {
    /// The cavity on a grid.
    pub cavity: Grid,
    /// The pass.
    pub pass: MillPass,
    /// The wing skin on a grid (only `p` is set).
    pub wing: Grid,
    /// The course.
    pub course: Course,
    /// The planned courses with their band edges, gaps and overlaps (empty when the raw
    /// output has no `course_edge` lines).
    pub courses: Courses,
}

fn numbers(line: &str, rest: &[&str]) -> Result<Vec<f64>, String> {
    rest.iter()
        .map(|x| {
            x.parse::<f64>()
                .map_err(|_| format!("`{x}` is not a number in: {line}"))
        })
        .collect()
}

/// The numbers after the key, checking their count and (for indexed lines) the index.
fn fields(
    line: &str,
    rest: &[&str],
    count: usize,
    index: Option<usize>,
) -> Result<Vec<f64>, String> {
    let v = numbers(line, rest)?;
    let skip = usize::from(index.is_some());
    if v.len() != count + skip {
        return Err(format!(
            "expected {} numbers, found {}: {line}",
            count + skip,
            v.len()
        ));
    }
    if let Some(i) = index
        && v[0] != i as f64
    {
        return Err(format!("expected index {i}: {line}"));
    }
    Ok(v[skip..].to_vec())
}

/// `u v x y z Nx Ny Nz kn kg tg k1 k2`, the arc length set later.
fn sample(v: &[f64]) -> Sample {
    Sample {
        s: 0.0,
        u: v[0],
        v: v[1],
        p: [v[2], v[3], v[4]],
        n: [v[5], v[6], v[7]],
        kn: v[8],
        kg: v[9],
        tg: v[10],
        k1: v[11],
        k2: v[12],
    }
}

/// Reads the raw output. Errors name the line that is wrong or the section that is missing.
pub fn parse(text: &str) -> Result<Demo, String> {
    let mut d = Demo::default();
    let mut mill_s = Vec::new();
    let mut course_s = Vec::new();
    let mut centre = Vec::new();
    for line in text.lines() {
        let words: Vec<&str> = line.split_whitespace().collect();
        let Some((key, rest)) = words.split_first() else {
            continue;
        };
        match *key {
            "knots_u" => d.pass.knots_u = numbers(line, rest)?,
            "knots_v" => d.pass.knots_v = numbers(line, rest)?,
            "cavity_grid_size" => {
                let v = fields(line, rest, 2, None)?;
                d.cavity.nu = v[0] as usize;
                d.cavity.nv = v[1] as usize;
            }
            "cavity_grid" => {
                let v = numbers(line, rest)?;
                if v.len() != 11 || v[0] * d.cavity.nv as f64 + v[1] != d.cavity.points.len() as f64
                {
                    return Err(format!("a cavity grid line out of order: {line}"));
                }
                d.cavity.points.push(GridPoint {
                    u: v[2],
                    v: v[3],
                    p: [v[4], v[5], v[6]],
                    k1: v[7],
                    k2: v[8],
                    h: v[9],
                    k: v[10],
                });
            }
            "wing_grid_size" => {
                let v = fields(line, rest, 2, None)?;
                d.wing.nu = v[0] as usize;
                d.wing.nv = v[1] as usize;
            }
            "wing_grid" => {
                let v = numbers(line, rest)?;
                if v.len() != 5 || v[0] * d.wing.nv as f64 + v[1] != d.wing.points.len() as f64 {
                    return Err(format!("a wing grid line out of order: {line}"));
                }
                d.wing.points.push(GridPoint {
                    u: v[2],
                    v: v[3],
                    p: [v[2], v[3], v[4]],
                    ..GridPoint::default()
                });
            }
            "mill_setup" => {
                let v = fields(line, rest, 9, None)?;
                d.pass.ball_radius = v[0];
                d.pass.scallop_limit = v[2];
                d.pass.programmed_feed = v[3];
            }
            "mill_sample" => {
                let v = fields(line, rest, 5, Some(mill_s.len()))?;
                mill_s.push(v[1]);
                d.pass.scallop.push(v[3]);
                d.pass.feed.push(v[4]);
            }
            "mill_frame" => {
                let v = fields(line, rest, 13, Some(d.pass.samples.len()))?;
                d.pass.samples.push(sample(&v));
            }
            "centre_feed" => {
                let v = fields(line, rest, 1, Some(centre.len()))?;
                centre.push(v[0]);
            }
            "violation" => {
                let Some((kind, rest)) = rest.split_first() else {
                    return Err(format!("a violation line without its kind: {line}"));
                };
                let v = numbers(line, rest)?;
                if v.len() != 7 {
                    return Err(format!("expected 7 numbers: {line}"));
                }
                let stretch = Stretch {
                    kind: kind.to_string(),
                    start: v[0],
                    end: v[1],
                };
                match *kind {
                    "steering" | "twist" => d.course.stretches.push(stretch),
                    _ => d.pass.stretches.push(stretch),
                }
            }
            "course_setup" => {
                let v = fields(line, rest, 6, None)?;
                d.course.tow_width = v[3];
                d.course.min_radius = v[4];
                d.course.max_twist = v[5];
            }
            "course_sample" => {
                let v = fields(line, rest, 5, Some(course_s.len()))?;
                course_s.push(v[1]);
            }
            "course_frame" => {
                let v = fields(line, rest, 13, Some(d.course.samples.len()))?;
                d.course.samples.push(sample(&v));
            }
            "plan_setup" => {
                let v = fields(line, rest, 6, None)?;
                d.courses.band_width = v[0];
                d.courses.tolerance = v[5];
            }
            // course_edge K left|right I s u v x y z
            "course_edge" => {
                let (Some(k), Some(side), Some(i)) = (rest.first(), rest.get(1), rest.get(2))
                else {
                    return Err(format!(
                        "a course edge line without course, side, index: {line}"
                    ));
                };
                let k: usize = k
                    .parse()
                    .map_err(|_| format!("`{k}` is not a course index in: {line}"))?;
                if k > d.courses.bands.len() || k + 1 < d.courses.bands.len() {
                    return Err(format!("a course edge line out of order: {line}"));
                }
                if k == d.courses.bands.len() {
                    d.courses.bands.push(Band::default());
                }
                let band = &mut d.courses.bands[k];
                let edge = match *side {
                    "left" => &mut band.left,
                    "right" => &mut band.right,
                    _ => {
                        return Err(format!(
                            "side `{side}` is neither left nor right in: {line}"
                        ));
                    }
                };
                let i: f64 = i
                    .parse()
                    .map_err(|_| format!("`{i}` is not a sample index in: {line}"))?;
                let mut idx = vec![i.to_string()];
                idx.extend(rest[3..].iter().map(|x| x.to_string()));
                let refs: Vec<&str> = idx.iter().map(String::as_str).collect();
                let v = fields(line, &refs, 6, Some(edge.len()))?;
                edge.push(EdgePoint {
                    s: v[0],
                    u: v[1],
                    v: v[2],
                    p: [v[3], v[4], v[5]],
                });
            }
            // course_gap K s0 s1 width, course_overlap K s0 s1 width
            "course_gap" | "course_overlap" => {
                let v = fields(line, rest, 4, None)?;
                let ordered = v[1] <= v[2] && v[3] >= 0.0;
                if v[0] < 0.0 || v[0].fract() != 0.0 || !ordered {
                    return Err(format!(
                        "expected a course index, start <= end and a width >= 0: {line}"
                    ));
                }
                d.courses.seams.push(Seam {
                    course: v[0] as usize,
                    start: v[1],
                    end: v[2],
                    overlap: *key == "course_overlap",
                    width: v[3],
                });
            }
            _ => {}
        }
    }
    let complete = |what: &str, ok: bool| {
        if ok {
            Ok(())
        } else {
            Err(format!("the raw output lacks or cuts short its {what}"))
        }
    };
    complete(
        "cavity grid",
        d.cavity.nu >= 2 && d.cavity.nv >= 2 && d.cavity.points.len() == d.cavity.nu * d.cavity.nv,
    )?;
    complete(
        "wing grid",
        d.wing.nu >= 2 && d.wing.nv >= 2 && d.wing.points.len() == d.wing.nu * d.wing.nv,
    )?;
    complete(
        "milling samples",
        mill_s.len() >= 2 && d.pass.samples.len() == mill_s.len(),
    )?;
    complete(
        "course samples",
        course_s.len() >= 2 && d.course.samples.len() == course_s.len(),
    )?;
    complete("milling set-up", d.pass.ball_radius > 0.0)?;
    complete("course set-up", d.course.min_radius > 0.0)?;
    for (x, s) in d.pass.samples.iter_mut().zip(mill_s) {
        x.s = s;
    }
    for (x, s) in d.course.samples.iter_mut().zip(course_s) {
        x.s = s;
    }
    let bands = &d.courses.bands;
    if !bands.is_empty() {
        complete(
            "course band edges",
            bands
                .iter()
                .all(|b| b.left.len() >= 2 && b.left.len() == b.right.len()),
        )?;
    }
    if let Some(s) = d.courses.seams.iter().find(|s| s.course + 1 >= bands.len()) {
        return Err(format!(
            "a gap or overlap after course {} without the band edges of courses {} and {}",
            s.course,
            s.course,
            s.course + 1
        ));
    }
    if !centre.is_empty() {
        complete("centre feed", centre.len() == d.pass.samples.len())?;
        d.pass.centre_feed = Some(centre);
    }
    Ok(d)
}
